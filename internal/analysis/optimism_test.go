package analysis

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// TestFoldOptimism works the fold arithmetic by hand on four rows in two
// folds.
func TestFoldOptimism(t *testing.T) {
	// Rows ranked riskiest first: 0.9 true (fold 0), 0.8 false (fold 1),
	// 0.7 true (fold 1), 0.6 false (fold 0). Costs: false alert 1, miss 3,
	// hit 0; base rate 0.5, so cost per case = 1.5(1-recall) + 0.5 fpr.
	//
	// Fold 0 held out, chosen on fold 1 (one true, one false): nothing
	// flagged 1.5; after 0.9 still 1.5 (a tie keeps the stricter); after 0.8
	// 2.0; after 0.7 0.5; after 0.6 0.5 (tie). θ₋₀ flags the top three,
	// cost 0.5 there; on fold 0 it flags 0.9 (true) and not 0.6: cost 0.
	// Gap 0 - 0.5 = -0.5.
	// Fold 1 held out, chosen on fold 0: after 0.9 cost 0, never beaten.
	// On fold 1 that cut flags nothing: cost 1.5. Gap 1.5 - 0 = 1.5.
	// Mean (-0.5 + 1.5) / 2 = 0.5.
	a := projection.Assumptions{BaseRate: 0.5, Costs: &projection.Costs{FalseAlert: 1, Miss: 3}}
	one := func(int) float64 { return 1 }
	cases := []struct {
		name  string
		fold  []uint8
		costs projection.Costs
		want  float64
	}{
		{"two folds, hand-worked above", []uint8{0, 1, 1, 0}, projection.Costs{FalseAlert: 1, Miss: 3}, 0.5},
		// Folds swapped on the false rows: fold 0 = {0.9 T, 0.8 F}, fold 1 =
		// {0.7 T, 0.6 F}. Held out 0: chosen on fold 1, nothing 1.5, after
		// 0.7 0 (best, flags top three); on fold 0 it flags both: recall 1,
		// fpr 1, cost 0.5; gap 0.5. Held out 1: chosen on fold 0, after 0.9
		// 0; on fold 1 nothing flagged, 1.5; gap 1.5. Mean 1.
		{"two folds, false rows swapped", []uint8{0, 0, 1, 1}, projection.Costs{FalseAlert: 1, Miss: 3}, 1},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			a.Costs = &tc.costs
			got := foldOptimism([]float64{0.9, 0.8, 0.7, 0.6}, []bool{true, false, true, false}, one, tc.fold, 2, a)
			if !floatcmp.Equal(got, tc.want) {
				t.Errorf("optimism %v, want %v", got, tc.want)
			}
		})
	}
	if got := CostOptimism(mustSet(t, []float64{0.9, 0.1}, []bool{true, false}), a); !math.IsNaN(got) {
		t.Errorf("two rows: optimism %v, want NaN (fewer rows than two per fold)", got)
	}
	a.Costs = nil
	if got := CostOptimism(mustSet(t, make([]float64, 40), make([]bool, 40)), a); !math.IsNaN(got) {
		t.Errorf("no costs: optimism %v, want NaN", got)
	}
}

func mustSet(t *testing.T, sc []float64, labels []bool) *scores.Set {
	t.Helper()
	set, err := scores.New(sc, labels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// TestCostOptimismSimulation checks that the naive least-cost figure plus
// the optimism estimate is nearer the chosen cut's true expected cost than
// the naive figure alone.
//
// Setup: 300 seeded sets of 500 cases, base rate 0.2 (validation and
// production), false cases' scores N(0,1), true cases' N(1.5,1); costs
// false alert 1, miss 5, hit 0. The cut the cost rule picks flags scores
// >= its score s, so its true expected cost per case is
// 0.2·5·Φ(s-1.5) + 0.8·(1-Φ(s)). Asserted: the mean absolute error of
// naive+optimism is below that of naive, and its mean error (bias) is
// nearer 0. Seen (0.1 s): mean optimism 0.0351 per case; naive bias
// -0.0342, mean |error| 0.0422; corrected bias +0.0009, mean |error|
// 0.0397.
func TestCostOptimismSimulation(t *testing.T) {
	const (
		sets, n = 300, 500
		p       = 0.2
	)
	c := projection.Costs{FalseAlert: 1, Miss: 5}
	a := projection.Assumptions{BaseRate: p, Costs: &c, Confidence: 0.95}
	phi := func(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }
	rng := rand.New(rand.NewPCG(2009, 16))
	var naiveErr, fixedErr, naiveBias, fixedBias, meanOpt float64
	for range sets {
		sc, labels := make([]float64, n), make([]bool, n)
		for i := range n {
			labels[i] = rng.Float64() < p
			sc[i] = rng.NormFloat64()
			if labels[i] {
				sc[i] += 1.5
			}
		}
		set := mustSet(t, sc, labels)
		// The least-cost cut on the whole set, strictest among equals.
		best, bestScore := math.Inf(1), math.Inf(1)
		curve.Walk(set, func(pt curve.Point) {
			if cost := projection.Project(pt, a).CostPerCase; math.IsInf(best, 1) || cost < best-1e-12*math.Abs(best) {
				best, bestScore = cost, pt.Score
			}
		})
		truth := p*c.Miss*phi(bestScore-1.5) + (1-p)*c.FalseAlert*(1-phi(bestScore))
		opt := CostOptimism(set, a)
		if math.IsNaN(opt) {
			t.Fatal("optimism NaN on a set with both classes")
		}
		meanOpt += opt / sets
		naiveErr += math.Abs(best-truth) / sets
		fixedErr += math.Abs(best+opt-truth) / sets
		naiveBias += (best - truth) / sets
		fixedBias += (best + opt - truth) / sets
	}
	t.Logf("mean optimism %.4f; naive: bias %.4f, mean |error| %.4f; corrected: bias %.4f, mean |error| %.4f", meanOpt, naiveBias, naiveErr, fixedBias, fixedErr)
	if !(fixedErr < naiveErr) {
		t.Errorf("corrected mean |error| %.4f not below naive %.4f", fixedErr, naiveErr)
	}
	if !(math.Abs(fixedBias) < math.Abs(naiveBias)) {
		t.Errorf("corrected bias %.4f not nearer 0 than naive %.4f", fixedBias, naiveBias)
	}
}
