package scores

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestRankInPlaceMatchesPermutation checks the in-place key sort against the
// permutation sort on seeded random columns: ties, negative scores, minus
// zero, weights and segments, both directions, sizes around the parallel
// threshold.
func TestRankInPlaceMatchesPermutation(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 7))
	for _, n := range []int{2, 3, 100, 1500, parallelSortRows + 17, 200000} {
		for _, lower := range []bool{false, true} {
			for _, kind := range []string{"fine", "coarse", "mixed-sign", "sorted", "low-bits", "clustered"} {
				scores := make([]float64, n)
				labels := make([]bool, n)
				weights := make([]float64, n)
				for i := range scores {
					switch kind {
					case "fine":
						scores[i] = rng.Float64()
					case "coarse":
						scores[i] = float64(rng.IntN(50)) / 10 // many ties
					case "mixed-sign":
						scores[i] = math.Copysign(float64(rng.IntN(1000)), rng.Float64()-0.5) * 1e-3
						if rng.IntN(20) == 0 {
							scores[i] = math.Copysign(0, -1)
						}
					case "low-bits": // keys that differ only in their last 20 bits
						scores[i] = 0.5 + float64(rng.IntN(1<<20))*0x1p-53
					case "clustered": // a third of the rows on one score, the rest spread
						scores[i] = rng.Float64()
						if rng.IntN(3) == 0 {
							scores[i] = 0.25
						}
					case "sorted":
						scores[i] = float64(n - i)
						if lower {
							scores[i] = float64(i)
						}
					}
					labels[i] = rng.IntN(4) == 0
					weights[i] = float64(rng.IntN(5))
				}
				segments := make([]int32, n)
				for i := range segments {
					segments[i] = int32(rng.IntN(7))
				}
				order := rankOrder(scores, lower)
				wantScores, wantLabels, wantWeights, wantSegments := scores, labels, weights, segments
				if order != nil {
					wantScores = permute(scores, order)
					wantLabels = permute(labels, order)
					wantWeights = permute(weights, order)
					wantSegments = permute(segments, order)
				}
				wantSegments = append([]int32(nil), wantSegments...)
				wantScores = append([]float64(nil), wantScores...)
				wantLabels = append([]bool(nil), wantLabels...)
				wantWeights = append([]float64(nil), wantWeights...)
				for i, s := range wantScores {
					if s == 0 {
						wantScores[i] = 0 // the in-place sort returns minus zero as zero
					}
				}
				gotScores := append([]float64(nil), scores...)
				gotLabels := append([]bool(nil), labels...)
				gotWeights := append([]float64(nil), weights...)
				gotSegments := append([]int32(nil), segments...)
				rankInPlace(gotScores, gotLabels, gotWeights, gotSegments, lower)
				for i := range gotScores {
					if math.Float64bits(gotScores[i]) != math.Float64bits(wantScores[i]) || gotLabels[i] != wantLabels[i] || gotWeights[i] != wantWeights[i] || gotSegments[i] != wantSegments[i] {
						t.Fatalf("n=%d lower=%v %s: row %d: got (%v,%v,%v), want (%v,%v,%v)", n, lower, kind, i,
							gotScores[i], gotLabels[i], gotWeights[i], wantScores[i], wantLabels[i], wantWeights[i])
					}
				}
				// Without weights the labels still travel with their scores.
				gotScores = append(gotScores[:0], scores...)
				gotLabels = append(gotLabels[:0], labels...)
				rankInPlace(gotScores, gotLabels, nil, nil, lower)
				for i := range gotScores {
					if math.Float64bits(gotScores[i]) != math.Float64bits(wantScores[i]) || gotLabels[i] != wantLabels[i] {
						t.Fatalf("n=%d lower=%v %s unweighted: row %d differs", n, lower, kind, i)
					}
				}
			}
		}
	}
}

func TestScoreOfKeyInvertsRiskKey(t *testing.T) {
	for _, s := range []float64{0, 1, -1, 0.5, -0.25, math.MaxFloat64, -math.MaxFloat64, math.SmallestNonzeroFloat64, -math.SmallestNonzeroFloat64, 123456.789} {
		for _, lower := range []bool{false, true} {
			if got := scoreOfKey(riskKey(s, lower), lower); got != s {
				t.Errorf("scoreOfKey(riskKey(%v, %v)) = %v", s, lower, got)
			}
		}
	}
}
