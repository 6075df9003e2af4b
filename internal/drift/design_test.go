package drift

import (
	"math"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
)

// TestDesignHomogeneity: validation 50/50 (100 cases) against a batch
// whose shares are 0.3/0.7. Reference values worked by hand (and checked
// with a five-line Python transcription of the formula):
//   - weights of 1 (30 and 70 rows): pooled shares 0.4/0.6, gap
//     0.04/0.4 + 0.04/0.6 = 0.16667, noise (0.0025 + 0.0021)(1/0.4 +
//     1/0.6) = 0.019167, statistic 8.6957 (Pearson's on the same table is
//     8.3333: the two agree to first order);
//   - every weight 2: the same shares and variances, so the same 8.6957
//     (sampling weights are read up to a common factor);
//   - bin 1 ten rows of weight 3, bin 2 seventy of weight 1: Kish's size
//     100²/160 = 62.5, each share's variance 0.00504, pooled 0.42308 /
//     0.57692, statistic 5.3050.
func TestDesignHomogeneity(t *testing.T) {
	tests := []struct {
		name                  string
		validation, fresh, sq []float64
		statistic             float64
		freedom               int
	}{
		{"weights of 1", []float64{50, 50}, []float64{30, 70}, []float64{30, 70}, 8.695652, 1},
		{"every weight 2", []float64{50, 50}, []float64{60, 140}, []float64{120, 280}, 8.695652, 1},
		{"weights differ between bins", []float64{50, 50}, []float64{30, 70}, []float64{90, 70}, 5.305040, 1},
		{"an empty batch", []float64{50, 50}, []float64{0, 0}, []float64{0, 0}, math.NaN(), 0},
		{"one bin in use", []float64{100, 0}, []float64{30, 0}, []float64{30, 0}, math.NaN(), 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s, k, p := designHomogeneity(tt.validation, tt.validation, tt.fresh, tt.sq)
			if !floatcmp.Within(s, tt.statistic, 1e-5) || k != tt.freedom {
				t.Errorf("statistic %v on %d, want %v on %d", s, k, tt.statistic, tt.freedom)
			}
			if k > 0 && !floatcmp.Within(p, ChiSquareSurvival(s, float64(k)), 1e-12) {
				t.Errorf("p %v, want the chi-square survival of the statistic", p)
			}
		})
	}
}

// TestDesignEffect: the mean design effect is 1 for weights of 1 and for
// weights all 2; with bin 1 ten rows of weight 3 (30 of 100) and bin 2
// seventy of weight 1 it is 62.5 (0.00504/0.3 + 0.00504/0.7) = 1.5 (by
// hand, the variances as in TestDesignHomogeneity).
func TestDesignEffect(t *testing.T) {
	tests := []struct {
		counts, squares []float64
		effect, n       float64
	}{
		{[]float64{30, 70}, []float64{30, 70}, 1, 100},
		{[]float64{60, 140}, []float64{120, 280}, 1, 100},
		{[]float64{30, 70}, []float64{90, 70}, 1.5, 62.5},
		{[]float64{0, 0}, []float64{0, 0}, math.NaN(), 0},
	}
	for _, tt := range tests {
		effect, n := designEffect(tt.counts, tt.squares)
		if !floatcmp.Within(effect, tt.effect, 1e-9) || !floatcmp.Within(n, tt.n, 1e-9) {
			t.Errorf("designEffect(%v, %v) = %v, %v; want %v, %v", tt.counts, tt.squares, effect, n, tt.effect, tt.n)
		}
	}
}

// TestDesignHomogeneityValidationSquares: the validation side's squared
// weights count as the new data's do; the formula is symmetric in the two
// sides, so the weighted case of TestDesignHomogeneity with the sides
// swapped gives its 5.3050 (by hand there), and with the validation's
// squares equal to its counts it is the weights-of-1 case, 8.6957.
func TestDesignHomogeneityValidationSquares(t *testing.T) {
	for _, tt := range []struct {
		squares   []float64
		statistic float64
	}{
		{[]float64{90, 70}, 5.305040},
		{[]float64{30, 70}, 8.695652},
	} {
		s, k, _ := designHomogeneity([]float64{30, 70}, tt.squares, []float64{50, 50}, []float64{50, 50})
		if !floatcmp.Within(s, tt.statistic, 1e-5) || k != 1 {
			t.Errorf("validation squares %v: statistic %v on %d, want %v on 1", tt.squares, s, k, tt.statistic)
		}
	}
}
