package modelpair_test

import (
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/modelpair"
)

// BenchmarkPaired1M runs DeLong's test on a million cases with scores
// rounded to 3 decimals (many ties); the work is O(n log n).
func BenchmarkPaired1M(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	n := 1_000_000
	x, y, labels := make([]float64, n), make([]float64, n), make([]bool, n)
	for i := range n {
		labels[i] = rng.Float64() < 0.07
		shift := 0.0
		if labels[i] {
			shift = 1.5
		}
		x[i] = float64(int((rng.NormFloat64()+shift)*1000)) / 1000
		y[i] = float64(int((rng.NormFloat64()+0.8*shift)*1000)) / 1000
	}
	for b.Loop() {
		if _, err := modelpair.Paired(x, y, labels, nil, false); err != nil {
			b.Fatal(err)
		}
	}
}
