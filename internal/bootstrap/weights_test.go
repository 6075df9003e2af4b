package bootstrap_test

import (
	"context"
	"math"
	"math/rand/v2"
	"reflect"
	"testing"

	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/scores"
)

// TestFrequencyWeightsAsCases: frequency weights are resampled as the
// cases they count, so a set of whole-number weights gives exactly the
// result of the same rows written out (weight 3: the row three times),
// under the same seed. Weights that are not whole numbers are drawn as
// Poisson counts: the result is reproducible, and the rule is met.
func TestFrequencyWeightsAsCases(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	var sc, weights, written []float64
	var labels, writtenLabels []bool
	for range 120 {
		positive := rng.IntN(3) == 0
		s := math.Round((rng.NormFloat64()+map[bool]float64{true: 1, false: 0}[positive])*20) / 20
		w := float64(1 + rng.IntN(4))
		sc, labels, weights = append(sc, s), append(labels, positive), append(weights, w)
		for range int(w) {
			written, writtenLabels = append(written, s), append(writtenLabels, positive)
		}
	}
	weighted, err := scores.NewSet(scores.Columns{Scores: append([]float64(nil), sc...), Labels: append([]bool(nil), labels...), Weights: append([]float64(nil), weights...), WeightColumn: "w"})
	if err != nil {
		t.Fatal(err)
	}
	rows, err := scores.New(written, writtenLabels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	opt := bootstrap.Options{Replicates: 150, Seed: 7, BandCuts: 10}
	got, err := bootstrap.Run(context.Background(), weighted, rules(t, "hit=0.8", "base"), assume, opt)
	if err != nil {
		t.Fatal(err)
	}
	want, err := bootstrap.Run(context.Background(), rows, rules(t, "hit=0.8", "base"), assume, opt)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("whole-number frequency weights:\n%+v\nthe rows written out:\n%+v", got, want)
	}

	halves := make([]float64, len(weights))
	for i, w := range weights {
		halves[i] = w / 2
	}
	half, err := scores.NewSet(scores.Columns{Scores: append([]float64(nil), sc...), Labels: append([]bool(nil), labels...), Weights: halves, WeightColumn: "w"})
	if err != nil {
		t.Fatal(err)
	}
	first, err := bootstrap.Run(context.Background(), half, rules(t, "hit=0.8"), assume, opt)
	if err != nil {
		t.Fatal(err)
	}
	again, err := bootstrap.Run(context.Background(), half, rules(t, "hit=0.8"), assume, bootstrap.Options{Replicates: 150, Seed: 7, BandCuts: 10, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(first, again) || first.Spreads[0].Met < 140 {
		t.Errorf("non-whole frequency weights: met %d of 150, or not reproducible", first.Spreads[0].Met)
	}
}

// TestSamplingWeightsCoverage: under downsampled false cases (sampling
// weights, constant within each class) the bootstrap that draws rows
// within classes, each carrying its weight, gives 90% bands of the
// hit=0.8 rule that cover the population's figures about 90% of the time.
//
// Population: 10% true cases with scores N(1.5, 1), false cases N(0, 1).
// Its cut for a hit share of 0.8 is c = 1.5 + Φ⁻¹(0.2); the flagged share
// there is 0.08 + 0.9·(1 - Φ(c)) and the wrong-alert share 0.9·(1 - Φ(c))
// divided by that (textbook normal figures, common practice, no source).
// Each sample draws 3,000 cases and keeps every true case and 1 false
// case in 10, weighted 10 (about 570 rows). Seeded PCG(2026, 21): 120
// samples of 150 replicates in CI, asserted in [0.82, 0.98] (about three
// binomial SDs of 2.7 points). With -coverage.long: 400 samples of 200
// replicates, each also read as frequency weights (each kept false case
// drawn as ten cases), for comparison only.
//
// Results: CI (120 x 150): cut 0.883, flagged share 0.883, wrong-alert
// share 0.833 (near its bound: the percentile band of a share at a cut
// the data choose runs a little short, as TestCoverage's cut score does).
// A first run of 200 samples x 200 replicates: sampling cut 0.890,
// flagged share 0.910, wrong-alert share 0.860; read as frequency
// weights 0.895, 0.790, 0.765.
func TestSamplingWeightsCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	phi := func(x float64) float64 { return 0.5 * (1 + math.Erf(x/math.Sqrt2)) }
	trueCut := 1.5 + math.Sqrt2*math.Erfinv(2*0.2-1)
	falseFlagged := 0.9 * (1 - phi(trueCut))
	trueShare := 0.08 + falseFlagged
	trueWrong := falseFlagged / trueShare
	rng := rand.New(rand.NewPCG(2026, 21))
	samples, replicates, readings := 120, 150, []bool{true}
	if *longCoverage {
		samples, replicates, readings = 400, 200, []bool{true, false}
	}
	covered := map[bool]map[string]int{true: {}, false: {}}
	for s := range samples {
		var sc, weights []float64
		var labels []bool
		for range 3000 {
			positive := rng.Float64() < 0.1
			x := rng.NormFloat64()
			w := 1.0
			if positive {
				x += 1.5
			} else {
				if rng.Float64() >= 0.1 {
					continue
				}
				w = 10
			}
			sc, labels, weights = append(sc, x), append(labels, positive), append(weights, w)
		}
		set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: weights, WeightColumn: "w"})
		if err != nil {
			t.Fatal(err)
		}
		for _, sampling := range readings {
			opt := bootstrap.Options{Replicates: replicates, Seed: uint64(s), Sampling: sampling}
			if sampling {
				opt.Design = bootstrap.WithinClass
			}
			res, err := bootstrap.Run(context.Background(), set, rules(t, "hit=0.8"), assume, opt)
			if err != nil {
				t.Fatal(err)
			}
			sp := res.Spreads[0]
			for name, c := range map[string]struct {
				band  [2]float64
				truth float64
			}{"cut": {sp.Score, trueCut}, "flagged share": {sp.FlaggedShare, trueShare}, "wrong-alert share": {sp.FalseDiscoveryRate, trueWrong}} {
				if c.band[0] <= c.truth && c.truth <= c.band[1] {
					covered[sampling][name]++
				}
			}
		}
	}
	for _, name := range []string{"cut", "flagged share", "wrong-alert share"} {
		rate, frequency := float64(covered[true][name])/float64(samples), float64(covered[false][name])/float64(samples)
		t.Logf("%s: coverage %.3f (sampling weights), %.3f (read as frequency weights; long run only) over %d samples, nominal 0.90", name, rate, frequency, samples)
		if rate < 0.82 || rate > 0.98 {
			t.Errorf("%s: sampling coverage %.3f, expected near 0.90", name, rate)
		}
	}
}
