package drift

import (
	"flag"
	"fmt"
	"math"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

var longSimulations = flag.Bool("drift-long", false, "run the verdict simulations with ten times the replicates")

// quickFile is the decision file sill report --save writes for the hit=0.8
// cut of set, built without the analysis (the simulations make thousands):
// the full curve, the totals and the cut's evidence. base 0 takes the
// validation base rate.
func quickFile(t testing.TB, set *scores.Set, base float64) *decision.File {
	t.Helper()
	return quickFileWith(t, set, base, nil)
}

// quickFileWith is quickFile with the weights read by sample's design.
func quickFileWith(t testing.TB, set *scores.Set, base float64, sample *design.Sample) *decision.File {
	t.Helper()
	positives, negatives := set.Totals()
	a := projection.Assumptions{BaseRate: positives / (positives + negatives), Volume: 1500, Capacity: 400, Confidence: 0.95, Sample: sample}
	if base > 0 {
		a.BaseRate = base
	}
	var points []decision.CurvePoint
	var curveSquares [][2]float64
	var chosen curve.Point
	found := false
	curve.Walk(set, func(p curve.Point) {
		points = append(points, decision.CurvePoint{Score: p.Score, TP: p.TP, FP: p.FP})
		curveSquares = append(curveSquares, [2]float64{p.Squares[0], p.Squares[1]})
		if !found && p.TP >= 0.8*positives {
			chosen, found = p, true
		}
	})
	if !found {
		t.Fatal("no cut reaches hit=0.8")
	}
	f := &decision.File{
		Format: decision.Format, Assumptions: a, Curve: points, Chosen: "hit=0.8",
		Data:       decision.Data{Path: "validation.csv", Rows: set.Len(), Positives: positives, Negatives: negatives, LowerIsRiskier: set.LowerIsRiskier(), Histogram: decision.NewHistogram(set)},
		Candidates: []decision.Candidate{{Name: "hit=0.8", Rule: "hit=0.8", Cut: evidence.Of(chosen, a)}},
	}
	if sample.Sampling() {
		// As decision.New writes data.squared_weights for sampling weights.
		f.Data.WeightColumn, f.Data.WeightKind = set.WeightColumn(), design.Sampling
		q := &decision.SquaredWeights{Curve: curveSquares, Histogram: f.Data.Histogram.FillSquares(set)}
		for i := range set.Len() {
			w := set.Weight(i)
			if set.Labels()[i] {
				q.Positives += w * w
			} else {
				q.Negatives += w * w
			}
		}
		f.Data.Squares = q
	}
	return f
}

// verdictRates checks replicates fresh pairs of a validation set and a
// batch and counts each status.
func verdictRates(t *testing.T, replicates int, seed uint64, nValidation, nNew int, validationBase, assumed, newBase, shift float64, labelled bool) map[string]int {
	t.Helper()
	counts := map[string]int{}
	for i := 0; i < replicates; i++ {
		file := quickFile(t, bearingSet(t, seed+uint64(2*i), nValidation, validationBase, 0), assumed)
		res, err := Check(file, bearingSet(t, seed+uint64(2*i+1), nNew, newBase, shift), Options{Labelled: labelled})
		if err != nil {
			t.Fatal(err)
		}
		counts[res.Status()]++
	}
	return counts
}

// TestVerdictFalseAlarmRate: validation and batch from one process
// (bearings: base rate 7%, no shift), the hit=0.8 cut, the check repeated
// on fresh pairs. Any status but ok is a false alarm; the family keeps
// Level (1%) by Holm's procedure. 400 replicates at 1% give at most 11
// alarms with probability 0.999 (exact Binomial(400, 0.01) quantile, as
// in TestFalseAlarmRateEndToEnd). With -drift-long, 6000 replicates, seen
// on 2026-12-02 (alarms of 6000, in the order of the cases below): 71
// (1.18%), 67 (1.12%), 40 (0.67%), 40 (0.67%), 91 (1.52%), 42 (0.70%);
// before the mixture's allowance for the validated classes' noise went
// bin by bin (mixtureInflation) the cases without labels gave 38, 39, 33.
// The labelled case with a batch five times the validation set runs about
// half as high again as stated: the two-sample tests' normal and
// chi-square readings are looser when the smaller sample is the
// validation set. The long run asserts at most 2% (120 of 6000) and says
// so rather than the 1% the short run's band checks.
func TestVerdictFalseAlarmRate(t *testing.T) {
	replicates, bound := 400, 11
	if *longSimulations {
		replicates, bound = 6000, 120 // 2%: see the doc comment
	}
	for _, tc := range []struct {
		name              string
		nValidation, nNew int
		assumed           float64 // 0: the validation base rate
		labelled          bool
	}{
		{"labelled, base rate from validation", 6000, 4000, 0, true},
		{"labelled, base rate given", 6000, 4000, 0.07, true},
		{"no labels, base rate from validation", 6000, 4000, 0, false},
		{"no labels, base rate given", 6000, 4000, 0.07, false},
		{"labelled, batch five times the validation set", 2000, 10000, 0, true},
		{"no labels, batch five times the validation set", 2000, 10000, 0, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := verdictRates(t, replicates, 7000, tc.nValidation, tc.nNew, 0.07, tc.assumed, 0.07, 0, tc.labelled)
			alarms := replicates - c[StatusOK]
			t.Logf("%d replicates: ok %d, assumption %d, drift %d (alarms %.2f%%)", replicates, c[StatusOK], c[StatusAssumption], c[StatusDrift], 100*float64(alarms)/float64(replicates))
			if alarms > bound {
				t.Errorf("%d alarms in %d replicates under no change, want at most %d (about %v)", alarms, replicates, bound, Level)
			}
		})
	}
}

// TestVerdictBaseRateAlone: the batch's base rate differs from the one
// assumed, the model is the same. Drift must stay at the false-alarm
// level (at most 11 of 400, as above), and a large change (7% to 14%)
// reads as assumption in most runs (at least 90%); a small one (7% to 8%)
// is not required to be seen. With -drift-long (6000 replicates, seen on
// 2026-12-02 after the mixture's allowance for the validated classes'
// noise went bin by bin, mixtureInflation), drift/assumption: 67/5933
// and 80/5920 for 7% to 14% with and without labels, 52/802 and 27/201
// for 7% to 8%: drift at 0.45-1.33% (96 of 6000 without labels before),
// so the long run asserts at most 2% (120), as above.
func TestVerdictBaseRateAlone(t *testing.T) {
	replicates, bound := 400, 11
	if *longSimulations {
		replicates, bound = 6000, 120
	}
	for _, tc := range []struct {
		name           string
		newBase        float64
		labelled       bool
		leastAssumtion float64
	}{
		{"labelled, 7% to 14%", 0.14, true, 0.9},
		{"no labels, 7% to 14%", 0.14, false, 0.9},
		{"labelled, 7% to 8%", 0.08, true, 0},
		{"no labels, 7% to 8%", 0.08, false, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := verdictRates(t, replicates, 9000, 6000, 4000, 0.07, 0, tc.newBase, 0, tc.labelled)
			t.Logf("%d replicates: ok %d, assumption %d, drift %d", replicates, c[StatusOK], c[StatusAssumption], c[StatusDrift])
			if c[StatusDrift] > bound {
				t.Errorf("drift in %d of %d replicates when only the base rate moved, want at most %d", c[StatusDrift], replicates, bound)
			}
			if share := float64(c[StatusAssumption]) / float64(replicates); share < tc.leastAssumtion {
				t.Errorf("assumption in %.1f%% of replicates, want at least %.0f%%", 100*share, 100*tc.leastAssumtion)
			}
		})
	}
}

// TestVerdictPower: the scores moved (a shift of 0.5 in the latent score
// of every case): drift in nearly every run, with labels and without.
func TestVerdictPower(t *testing.T) {
	for _, labelled := range []bool{true, false} {
		t.Run(fmt.Sprint("labelled=", labelled), func(t *testing.T) {
			c := verdictRates(t, 100, 11000, 6000, 4000, 0.07, 0, 0.07, 0.5, labelled)
			t.Logf("100 replicates: ok %d, assumption %d, drift %d", c[StatusOK], c[StatusAssumption], c[StatusDrift])
			if c[StatusDrift] < 95 {
				t.Errorf("drift in %d of 100 replicates of a real shift, want at least 95", c[StatusDrift])
			}
		})
	}
}

// TestFitMixtureTwoBins: two bins where true cases fall 80/20 and false
// cases 20/80; 40 and 60 new cases. The mixture share of the first bin is
// 0.2 + 0.6p, and with two bins the fit is exact: 0.2 + 0.6p = 0.4, p =
// 1/3 (by hand). The profile-likelihood interval is the binomial
// likelihood-ratio interval of 40/100, 0.30741 to 0.49765 at 95% (a short
// bisection script on 2[40 ln(0.4/m) + 60 ln(0.6/(1-m))] = 3.8415),
// mapped through p = (m - 0.2)/0.6: 0.17902 to 0.49609. Two bins leave no
// degree of freedom for the fit, so it is NaN.
func TestFitMixtureTwoBins(t *testing.T) {
	m := FitMixture([]float64{40, 60}, []float64{0.8, 0.2}, []float64{0.2, 0.8}, 0.95, nil)
	if !floatcmp.Equal(m.BaseRate, 1.0/3) {
		t.Errorf("base rate %v, want 1/3", m.BaseRate)
	}
	const bisection = 1e-6 // sill and the reference script both find the ends by bisection
	if !floatcmp.Within(m.CI[0], 0.17901841876142105, bisection) || !floatcmp.Within(m.CI[1], 0.4960865008056156, bisection) {
		t.Errorf("interval %v, want [0.17902, 0.49609]", m.CI)
	}
	if !math.IsNaN(m.Fit) || m.Freedom != 0 {
		t.Errorf("fit %v on %d degrees, want NaN on 0", m.Fit, m.Freedom)
	}
	// Inflating the deviance by 4 doubles the interval's half-widths about
	// the estimate, to first order: wider on both sides.
	wide := FitMixture([]float64{40, 60}, []float64{0.8, 0.2}, []float64{0.2, 0.8}, 0.95, func(float64) float64 { return 4 })
	if !(wide.CI[0] < m.CI[0]) || !(wide.CI[1] > m.CI[1]) || !floatcmp.Equal(wide.BaseRate, m.BaseRate) {
		t.Errorf("inflated: %v %v, want the same estimate and a wider interval than %v", wide.BaseRate, wide.CI, m.CI)
	}
	// All new cases in the bin of false cases: the estimate sits at 0.
	zero := FitMixture([]float64{0, 50}, []float64{1, 0}, []float64{0, 1}, 0.95, nil)
	if zero.BaseRate != 0 || zero.CI[0] != 0 || !(zero.CI[1] > 0 && zero.CI[1] < 0.1) {
		t.Errorf("at the edge: %v %v", zero.BaseRate, zero.CI)
	}
	// Against the assumed rate: within the tolerance, p 1; far off, tiny.
	if got := m.Against(0.3, 0, 0.05); got != 1 {
		t.Errorf("within tolerance: p %v, want 1", got)
	}
	if got := m.Against(0.9, 0, 0); !(got < 1e-6) {
		t.Errorf("far off: p %v, want tiny", got)
	}
	if empty := FitMixture([]float64{0, 0}, []float64{0.5, 0.5}, []float64{0.5, 0.5}, 0.95, nil); !math.IsNaN(empty.BaseRate) {
		t.Errorf("no counts: %v, want NaN", empty.BaseRate)
	}
}

// TestChiSquareSurvival against printed quantiles (any statistics text's
// chi-square table, from memory): 36.191 on 19 degrees of freedom and
// 21.666 on 9 leave 1% above, 3.841 on 1 leaves 5%; and a 2 x 2 table by
// hand: (10, 20) against (20, 10) expects 15 in every cell, so X^2 =
// 4 * 25/15 = 6.667 on 1 degree, p = erfc(sqrt(6.667/2)) = 0.0098233.
func TestChiSquareSurvival(t *testing.T) {
	for _, tc := range []struct{ x, k, want, within float64 }{
		{36.191, 19, 0.01, 1e-4}, {21.666, 9, 0.01, 1e-4}, {3.841, 1, 0.05, 1e-4}, {0, 3, 1, 0}, {1e4, 2, 0, 1e-300},
	} {
		if got := ChiSquareSurvival(tc.x, tc.k); math.Abs(got-tc.want) > tc.within {
			t.Errorf("Q(%v; %v) = %v, want %v", tc.x, tc.k, got, tc.want)
		}
	}
	s, k, p := HomogeneityTest([]float64{10, 20}, []float64{20, 10})
	if !floatcmp.Equal(s, 20.0/3) || k != 1 || !floatcmp.Equal(p, 0.009823274507519245) {
		t.Errorf("2 x 2: %v on %d, p %v", s, k, p)
	}
	if _, _, p := HomogeneityTest([]float64{5, 0}, []float64{0, 0}); !math.IsNaN(p) {
		t.Errorf("empty sample: p %v, want NaN", p)
	}
}

// TestHolm: p-values 0.004, 0.03 and 0.012 at 0.05 are all rejected
// (0.004 < 0.05/3, 0.012 < 0.05/2, 0.03 < 0.05); at 0.02 the step-down
// stops at 0.012 > 0.02/2 and rejects only the first (by hand, after
// Holm 1979).
func TestHolm(t *testing.T) {
	family := func() []Judged {
		return []Judged{{Name: "a", PValue: 0.004}, {Name: "b", PValue: 0.03}, {Name: "c", PValue: 0.012}, {Name: "undefined", PValue: math.NaN()}}
	}
	all := family()
	holm(all, 0.05)
	if !all[0].Rejected || !all[1].Rejected || !all[2].Rejected || all[3].Rejected {
		t.Errorf("at 0.05: %+v", all)
	}
	one := family()
	holm(one, 0.02)
	if !one[0].Rejected || one[1].Rejected || one[2].Rejected {
		t.Errorf("at 0.02: %+v", one)
	}
}
