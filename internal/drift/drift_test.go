package drift

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/quantile"
	"github.com/sill-tool/sill/internal/scores"
)

func TestPopulationStability(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name             string
		expected, actual []float64
		want             float64
		whereFrom        string
	}{
		{"two bins", []float64{50, 50}, []float64{60, 40}, 0.040546510810816436,
			"by hand: 0.1*ln(0.6/0.5) + (-0.1)*ln(0.4/0.5) = 0.1*0.18232 + 0.1*0.22314"},
		{"four bins", []float64{25, 25, 25, 25}, []float64{40, 30, 20, 10}, 0.22821740957339182,
			"by hand: 0.15 ln 1.6 + 0.05 ln 1.2 - 0.05 ln 0.8 - 0.15 ln 0.4 = 0.07050 + 0.00912 + 0.01116 + 0.13744"},
		{"weighted counts scale away", []float64{2.5, 2.5, 2.5, 2.5}, []float64{0.8, 0.6, 0.4, 0.2}, 0.22821740957339182,
			"only shares count: the four-bin case with other totals"},
		{"symmetric in its bins", []float64{25, 25, 25, 25}, []float64{10, 20, 30, 40}, 0.22821740957339182,
			"the four-bin case with the bins reversed"},
		{"empty bin floored", []float64{5, 5}, []float64{7, 0}, 4.60431846666895,
			"by hand with the 1e-4 floor: (1-0.5) ln(1/0.5) + (1e-4-0.5) ln(1e-4/0.5) = 0.34657 + 4.25774"},
		{"identical", []float64{3, 1, 6}, []float64{3, 1, 6}, 0, "no change, no index"},
		{"no bins", []float64{}, []float64{}, nan, "doc: NaN without bins"},
		{"empty actual", []float64{1, 2}, []float64{0, 0}, nan, "doc: NaN when a total is 0"},
	} {
		if got := PopulationStability(tc.expected, tc.actual); !floatcmp.Equal(got, tc.want) {
			t.Errorf("%s: PSI %v, want %v (%s)", tc.name, got, tc.want, tc.whereFrom)
		}
	}
}

func TestPSINoise(t *testing.T) {
	// By the formula: 19 * (1/4000 + 1/6000) = 19 * 0.000416667.
	if got := PSINoise(20, 4000, 6000); !floatcmp.Equal(got, 19*(1.0/4000+1.0/6000)) {
		t.Errorf("PSINoise %v", got)
	}
	if got := PSINoise(1, 10, 10); !math.IsNaN(got) {
		t.Errorf("one bin: %v, want NaN", got)
	}
}

func TestPSINoiseLevel(t *testing.T) {
	// Chi-square quantiles at 0.99 from the printed tables (any statistics
	// text's chi-square table, from memory): 19 degrees of freedom 36.191,
	// 9 degrees 21.666, 1 degree 6.635. Wilson-Hilferty is within 0.1 at 19
	// and 9 and within 0.3 at 1, where it is known to be weakest.
	for _, tc := range []struct {
		k, want, within float64
	}{{19, 36.191, 0.1}, {9, 21.666, 0.1}, {1, 6.635, 0.3}} {
		if got := quantile.ChiSquare(0.99, tc.k); math.Abs(got-tc.want) > tc.within {
			t.Errorf("chi-square 0.99 quantile, %v degrees: %v, want %v within %v", tc.k, got, tc.want, tc.within)
		}
	}
	even := make([]float64, 20)
	for i := range even {
		even[i] = 300
	}
	// 4000 new rows expect 200 in each bin: the chi-square reading.
	if got, want := PSINoiseLevel(even, 4000), quantile.ChiSquare(0.99, 19)*(1.0/4000+1.0/6000); !floatcmp.Equal(got, want) {
		t.Errorf("PSINoiseLevel %v, want %v", got, want)
	}
	// 50 new rows expect 2.5 a bin: drawn, and far above the chi-square
	// reading, since empty bins count at PSIFloor; the same every time.
	drawn := PSINoiseLevel(even, 50)
	if !(drawn > 2*quantile.ChiSquare(0.99, 19)*(1.0/50+1.0/6000)) || drawn != PSINoiseLevel(even, 50) {
		t.Errorf("50 rows: level %v, want well above the chi-square reading and the same on a second call", drawn)
	}
	for _, tc := range []struct {
		name       string
		validation []float64
		n          float64
	}{{"one bin", []float64{10}, 10}, {"no new weight", even, 0}, {"no validation weight", []float64{0, 0}, 10}} {
		if got := PSINoiseLevel(tc.validation, tc.n); !math.IsNaN(got) {
			t.Errorf("%s: %v, want NaN", tc.name, got)
		}
	}
}

// TestPSINoiseLevelRate: a validation set of 6000 seeded draws, binned at
// its own 20 quantiles as the decision file bins it, and new rows drawn
// from the same distribution pass PSINoiseLevel about once in a hundred
// runs (Level), for few new rows and for many. The bound of 3% leaves room
// for the approximations and for the runs' own noise (a 1% rate over 500
// runs has a standard error of 0.45 points).
func TestPSINoiseLevelRate(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 3))
	const m, bins, runs = 6000, 20, 500
	for _, n := range []int{30, 50, 200, 400, 4000} {
		over, level := 0, math.NaN()
		for run := 0; run < runs; run++ {
			validation := make([]float64, m)
			for i := range validation {
				validation[i] = rng.Float64()
			}
			slices.Sort(validation)
			edges := make([]float64, bins-1) // upper edges of the first 19 bins
			for i := range edges {
				edges[i] = validation[(i+1)*m/bins]
			}
			counts, fresh := make([]float64, bins), make([]float64, bins)
			bin := func(v float64) int { i, _ := slices.BinarySearch(edges, v); return i }
			for _, v := range validation {
				counts[bin(v)]++
			}
			for j := 0; j < n; j++ {
				fresh[bin(rng.Float64())]++
			}
			if run == 0 {
				// Quantile bins hold 300 rows each, give or take the one
				// at an edge: the level of the first run serves them all.
				level = PSINoiseLevel(counts, float64(n))
			}
			if PopulationStability(counts, fresh) > level {
				over++
			}
		}
		if rate := float64(over) / runs; rate > 0.03 {
			t.Errorf("%d new rows: noise alone passed the level in %.1f%% of runs, want about 1%%", n, 100*rate)
		} else {
			t.Logf("%d new rows: %.1f%% of runs over the level", n, 100*rate)
		}
	}
}

func TestCompare(t *testing.T) {
	// Hand-worked: 30 of 100 against 0.2. q = (0.2*100+1)/102 = 0.2058824,
	// se = sqrt(q(1-q)/100) = 0.0404345, z = 0.1/se = 2.47314, p = erfc(z/sqrt2).
	for _, tc := range []struct {
		name                        string
		successes, trials, expected float64
		variance, tolerance         float64
		z, p                        float64
		drift, defined              bool
	}{
		{"one sample", 30, 100, 0.2, 0, 0, 2.473136089341247, 0.013393313038997712, false, true},
		{"validation variance widens", 30, 100, 0.2, 0.0004, 0, 2.216783762561764, 0.026637871619533023, false, true},
		{"twice the gap drifts", 40, 100, 0.2, 0, 0, 4.946272178682494, 7.564816800405639e-07, true, true},
		{"tolerance half the gap", 30, 100, 0.2, 0, 0.05, 1.2365680446706235, 0.2162474894889226, false, true},
		{"within tolerance", 30, 100, 0.2, 0, 0.1, 0, 1, false, true},
		{"lower side", 10, 100, 0.2, 0, 0, 2.473136089341247, 0.013393313038997712, false, true},
		{"no trials", 0, 0, 0.2, 0, 0, math.NaN(), math.NaN(), false, false},
		{"undefined expected", 3, 10, math.NaN(), 0, 0, math.NaN(), math.NaN(), false, false},
	} {
		got := Compare(tc.successes, tc.trials, tc.expected, tc.variance, tc.tolerance, 0.95)
		if !floatcmp.Equal(got.Z, tc.z) || !floatcmp.Equal(got.PValue, tc.p) || got.Drift != tc.drift || got.Defined != tc.defined {
			t.Errorf("%s: z %v p %v drift %v defined %v, want %v %v %v %v", tc.name, got.Z, got.PValue, got.Drift, got.Defined, tc.z, tc.p, tc.drift, tc.defined)
		}
	}
	// "lower side": 10 of 100 is the same distance below; z is taken on
	// |difference|, so the figures match the 30-of-100 case.
}

// bearings draws n rows after the demo's process: a true case with
// probability base; a standard normal latent, plus 1.9 for a true case,
// plus shift for every case; score 1/(1+exp(-(1.3*latent-3.2))) rounded
// to 3 decimals, so that scores tie.
func bearings(seed uint64, n int, base, shift float64) (scoresOut []float64, labels []bool) {
	return bearingsMoved(seed, n, base, shift, 0)
}

// bearingsMoved is bearings with the latent of true cases alone moved
// by shiftPositives as well (the same draws for the same seed).
func bearingsMoved(seed uint64, n int, base, shift, shiftPositives float64) (scoresOut []float64, labels []bool) {
	rng := rand.New(rand.NewPCG(seed, 99))
	for i := 0; i < n; i++ {
		positive := rng.Float64() < base
		latent := rng.NormFloat64() + shift
		if positive {
			latent += 1.9 + shiftPositives
		}
		s := 1 / (1 + math.Exp(-(1.3*latent - 3.2)))
		scoresOut = append(scoresOut, math.Round(s*1000)/1000)
		labels = append(labels, positive)
	}
	return scoresOut, labels
}

func bearingSet(t testing.TB, seed uint64, n int, base, shift float64) *scores.Set {
	t.Helper()
	sc, labels := bearings(seed, n, base, shift)
	set, err := scores.New(sc, labels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// decisionOf saves the hit=0.8 cut of set, as sill report --save does.
func decisionOf(t testing.TB, set *scores.Set) *decision.File {
	t.Helper()
	positives, negatives := set.Totals()
	a := projection.Assumptions{BaseRate: positives / (positives + negatives), Volume: 1500, Confidence: 0.95}
	rules := []cutrule.Rule{{Kind: cutrule.Hit, Value: 0.8}}
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{Rules: rules})
	if err != nil {
		t.Fatal(err)
	}
	o := res.Outcomes[0]
	f, err := decision.New(res, []decision.Pick{{Name: "hit=0.8", Rule: "hit=0.8", Point: o.Point}}, "", decision.Record{ToolVersion: "test"})
	if err != nil {
		t.Fatal(err)
	}
	// Through the file's own reader, as sill check sees it.
	data, err := decision.Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	back, err := decision.Read(bytes.NewReader(data), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	return back
}

func TestCheckScenarios(t *testing.T) {
	validation := bearingSet(t, 1, 6000, 0.07, 0)
	file := decisionOf(t, validation)
	for _, tc := range []struct {
		name     string
		set      *scores.Set
		labelled bool
		status   string
		psiBelow float64 // PSI must be below this
		psiAbove float64 // and above this
		findings []string
	}{
		{"the validation set itself", validation, true, StatusOK, 1e-12, -1, nil},
		{"a fresh draw of the same process", bearingSet(t, 2, 4000, 0.07, 0), true, StatusOK, PSIModerate, -1, nil},
		{"a fresh draw without labels", bearingSet(t, 3, 4000, 0.07, 0), false, StatusOK, PSIModerate, -1,
			[]string{"so the hit share and the wrong-alert share were not measured", "estimated from the scores alone"}},
		// The base rate alone moved: the model behaves as validated, and a
		// lower wrong-alert share (a higher precision) is no failure.
		{"base rate tripled", bearingSet(t, 4, 4000, 0.21, 0), true, StatusAssumption, math.Inf(1), -1,
			[]string{"the base rate is 20.9%", "higher beyond noise", "the base rate assumed is wrong", "fewer of the alerts are wrong, which follows the base rate and is no failure", "alerts per shift"}},
		{"base rate tripled, no labels", bearingSet(t, 4, 4000, 0.21, 0), false, StatusAssumption, math.Inf(1), -1,
			[]string{"the base rate is", "the base rate assumed is wrong"}},
		{"scores shifted up", bearingSet(t, 5, 4000, 0.07, 0.8), true, StatusDrift, math.Inf(1), PSILarge,
			[]string{"hit share (recall) drifted", "false positive rate drifted: 41.3% observed against 15.7% on validation, 25.6 points higher", "the scores of false cases moved"}},
		{"scores shifted up, no labels", bearingSet(t, 6, 4000, 0.07, 0.8), false, StatusDrift, math.Inf(1), PSILarge,
			[]string{"no mix of the validated true and false cases explains the new scores"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Check(file, tc.set, Options{Labelled: tc.labelled})
			if err != nil {
				t.Fatal(err)
			}
			if res.Status() != tc.status || res.Drift != (tc.status == StatusDrift) {
				t.Errorf("status %v (drift %v), want %v; findings %q", res.Status(), res.Drift, tc.status, res.Findings)
			}
			if !(res.PSI < tc.psiBelow) || !(res.PSI > tc.psiAbove) {
				t.Errorf("PSI %v, want in (%v, %v)", res.PSI, tc.psiAbove, tc.psiBelow)
			}
			all := strings.Join(res.Findings, "\n")
			for _, want := range tc.findings {
				if !strings.Contains(all, want) {
					t.Errorf("findings %q lack %q", res.Findings, want)
				}
			}
			if !tc.labelled && (res.Recall.Defined || res.Precision.Defined) {
				t.Error("recall or precision tested without labels")
			}
		})
	}
}

func TestCheckOnValidationMatchesFile(t *testing.T) {
	validation := bearingSet(t, 1, 3000, 0.07, 0)
	file := decisionOf(t, validation)
	res, err := Check(file, validation, Options{Labelled: true})
	if err != nil {
		t.Fatal(err)
	}
	c, _ := file.ChosenCandidate()
	// On its own validation data every observed share is the file's.
	if !floatcmp.Equal(res.AlertRate.Observed, c.Cut.FlaggedShare) || !floatcmp.Equal(res.Recall.Observed, c.Cut.Recall) ||
		!floatcmp.Equal(res.Precision.Observed, c.Cut.Precision) || res.PSI != 0 {
		t.Errorf("observed %v %v %v psi %v, file %v %v %v", res.AlertRate.Observed, res.Recall.Observed, res.Precision.Observed, res.PSI,
			c.Cut.FlaggedShare, c.Cut.Recall, c.Cut.Precision)
	}
	if res.AlertRate.PValue < 0.999 || res.Recall.PValue < 0.999 || res.Precision.PValue < 0.999 { // precision: the projection rounds differently
		t.Errorf("p-values %v %v %v, want 1", res.AlertRate.PValue, res.Recall.PValue, res.Precision.PValue)
	}
}

func TestCheckLowerIsRiskierAndTolerance(t *testing.T) {
	sc, labels := bearings(7, 4000, 0.07, 0)
	for i := range sc {
		sc[i] = -sc[i]
	}
	validation, _ := scores.New(sc, labels, nil, true)
	file := decisionOf(t, validation)
	if !file.Data.LowerIsRiskier {
		t.Fatal("the file lost the direction")
	}
	sc2, labels2 := bearings(8, 4000, 0.14, 0)
	for i := range sc2 {
		sc2[i] = -sc2[i]
	}
	// Read in the other direction on purpose: the file's direction rules.
	fresh, _ := scores.New(sc2, labels2, nil, false)
	res, err := Check(file, fresh, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !res.AlertRate.Drift || res.AlertRate.Difference <= 0 {
		t.Fatalf("doubled base rate, lower riskier: alert rate %+v", res.AlertRate)
	}
	// A tolerance wider than the gap silences it.
	wide, _ := Check(file, fresh, Options{Tolerance: math.Abs(res.AlertRate.Difference) + 0.01})
	if wide.AlertRate.Drift || wide.AlertRate.PValue != 1 {
		t.Errorf("within tolerance: %+v", wide.AlertRate)
	}
	if _, err := Check(file, fresh, Options{Tolerance: -0.1}); err == nil {
		t.Error("a negative tolerance was accepted")
	}
	empty, _ := scores.New([]float64{0.5}, []bool{false}, []float64{0}, false)
	if _, err := Check(file, empty, Options{}); err == nil {
		t.Error("data of no weight were accepted")
	}
}

// TestFalseAlarmRate draws validation and new data from one process, many
// times, and counts how often each test drifts: it must stay near Level.
// With 2000 replicates at a true rate of 1% the count lies in [7, 36]
// with probability 0.999 (exact binomial quantiles 0.0005 and 0.9995 of
// Binomial(2000, 0.01), worked out once with a short script).
func TestFalseAlarmRate(t *testing.T) {
	const replicates = 2000
	for _, tc := range []struct {
		name               string
		nValidation, nNew  int
		base, recall, rate float64 // true base rate, recall and false positive rate at the cut
		productionBase     float64 // 0: take the base rate from validation
	}{
		{"base rate from validation", 6000, 4000, 0.07, 0.8, 0.18, 0},
		{"base rate given", 6000, 4000, 0.07, 0.8, 0.18, 0.07},
		{"production base rate differs and is known", 6000, 4000, 0.07, 0.8, 0.18, 0.15},
		{"small sets, rare alerts", 800, 300, 0.1, 0.7, 0.05, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(2026, 9))
			binomial := func(n int, p float64) float64 {
				k := 0
				for i := 0; i < n; i++ {
					if rng.Float64() < p {
						k++
					}
				}
				return float64(k)
			}
			var alerts, recalls, precisions int
			for rep := 0; rep < replicates; rep++ {
				positives := binomial(tc.nValidation, tc.base)
				negatives := float64(tc.nValidation) - positives
				tp, fp := binomial(int(positives), tc.recall), binomial(int(negatives), tc.rate)
				p := curve.Point{TP: tp, FP: fp, FN: positives - tp, TN: negatives - fp}
				a := projection.Assumptions{BaseRate: positives / float64(tc.nValidation), Confidence: 0.95}
				newBase := tc.base
				if tc.productionBase > 0 {
					a.BaseRate, newBase = tc.productionBase, tc.productionBase
				}
				cand := decision.Candidate{Name: "c", Cut: evidence.Of(p, a)}
				file := &decision.File{Assumptions: a, Chosen: "c", Candidates: []decision.Candidate{cand}}
				newPositives := binomial(tc.nNew, newBase)
				newTP := binomial(int(newPositives), tc.recall)
				newFP := binomial(tc.nNew-int(newPositives), tc.rate)
				res := check(file, cand, tally{rows: tc.nNew, weight: float64(tc.nNew), flagged: newTP + newFP, positives: newPositives, tp: newTP}, Options{Labelled: true})
				if res.AlertRate.Drift {
					alerts++
				}
				if res.Recall.Drift {
					recalls++
				}
				if res.Precision.Drift {
					precisions++
				}
			}
			t.Logf("drifts in %d replicates: alert rate %d, recall %d, precision %d", replicates, alerts, recalls, precisions)
			for name, n := range map[string]int{"alert rate": alerts, "recall": recalls, "precision": precisions} {
				if n < 7 || n > 36 {
					t.Errorf("%s drifted in %d of %d replicates, want 7 to 36 (about 1%%)", name, n, replicates)
				}
			}
		})
	}
}

func TestWriteJSONKeys(t *testing.T) {
	validation := bearingSet(t, 1, 2000, 0.07, 0)
	file := decisionOf(t, validation)
	res, err := Check(file, bearingSet(t, 9, 2000, 0.07, 0), Options{})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteJSON(&buf, res, "cut.yaml", "new.csv"); err != nil {
		t.Fatal(err)
	}
	var got map[string]any
	if err := json.Unmarshal(buf.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{"alert_rate_observed", "alert_rate_projected", "alert_rate_ci", "psi", "status", "findings",
		"base_rate_observed", "base_rate_ci", "base_rate_method", "tests", "level_method", "reprojected", "next_step"} {
		if got[key] == nil {
			t.Errorf("key %s missing or null", key)
		}
	}
	for _, key := range []string{"recall_observed", "precision_observed", "false_positive_rate_observed"} {
		if v, ok := got[key]; !ok || v != nil {
			t.Errorf("key %s = %v, want null without labels", key, v)
		}
	}
	if got["status"] != "ok" {
		t.Errorf("status %v", got["status"])
	}
}

// TestFalseAlarmRateEndToEnd runs the whole chain on many pairs of data
// sets drawn from one process: choose hit=0.8 on the validation set, save
// and read the file, check a fresh set. The cut is chosen on the data it
// is then judged against, so this also catches a selection effect the
// count-level simulation cannot. 400 replicates at 1% drift 11 times or
// fewer with probability 0.999 (exact Binomial(400, 0.01) quantile).
func TestFalseAlarmRateEndToEnd(t *testing.T) {
	if testing.Short() {
		t.Skip("400 replicates of the whole chain")
	}
	const replicates = 400
	var alerts, recalls, precisions int
	for i := 0; i < replicates; i++ {
		file := decisionOf(t, bearingSet(t, uint64(1000+i), 6000, 0.07, 0))
		res, err := Check(file, bearingSet(t, uint64(5000+i), 4000, 0.07, 0), Options{Labelled: true})
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range []struct {
			drift bool
			n     *int
		}{{res.AlertRate.Drift, &alerts}, {res.Recall.Drift, &recalls}, {res.Precision.Drift, &precisions}} {
			if c.drift {
				*c.n++
			}
		}
	}
	t.Logf("drifts in %d replicates: alert rate %d, recall %d, precision %d", replicates, alerts, recalls, precisions)
	for name, n := range map[string]int{"alert rate": alerts, "recall": recalls, "precision": precisions} {
		if n > 11 {
			t.Errorf("%s drifted in %d of %d replicates, want at most 11 (about 1%%)", name, n, replicates)
		}
	}
}

func ExamplePopulationStability() {
	// Validation shares 25% in each of four bins; production 40/30/20/10.
	psi := PopulationStability([]float64{25, 25, 25, 25}, []float64{40, 30, 20, 10})
	fmt.Printf("PSI %.3f\n", psi)
	// Output: PSI 0.228
}

// BenchmarkCheck checks a million fresh rows against a decision file: one
// pass over the rows and a binary search of the 20 bins per row.
func BenchmarkCheck(b *testing.B) {
	file := decisionOf(b, bearingSet(b, 1, 6000, 0.07, 0))
	fresh := bearingSet(b, 2, 1_000_000, 0.07, 0)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Check(file, fresh, Options{Labelled: true}); err != nil {
			b.Fatal(err)
		}
	}
}

func TestCheckOneClassNewData(t *testing.T) {
	file := decisionOf(t, bearingSet(t, 1, 4000, 0.07, 0))
	// Labelled fresh data with no true case at all: recall is undefined and
	// not tested; every alert is wrong, so precision drifts to 0.
	sc, _ := bearings(21, 2000, 0, 0)
	set, _ := scores.New(sc, make([]bool, len(sc)), nil, false)
	res, err := Check(file, set, Options{Labelled: true})
	if err != nil {
		t.Fatal(err)
	}
	if res.Recall.Defined || !math.IsNaN(res.Recall.Observed) {
		t.Errorf("recall %+v, want undefined", res.Recall)
	}
	if !res.Precision.Defined || res.Precision.Observed != 0 || !res.Precision.Drift {
		t.Errorf("precision %+v, want 0 and drift", res.Precision)
	}
	if !strings.Contains(strings.Join(res.Findings, "\n"), "no true cases, so the hit share was not checked") {
		t.Errorf("findings %q", res.Findings)
	}
	// Weighted fresh data: a weight of 2 counts as the row twice.
	weights := make([]float64, len(sc))
	var doubled []float64
	for i := range weights {
		weights[i] = float64(1 + i%2)
		doubled = append(doubled, sc[i])
		if i%2 == 1 {
			doubled = append(doubled, sc[i])
		}
	}
	w, _ := scores.New(append([]float64(nil), sc...), make([]bool, len(sc)), weights, false)
	d, _ := scores.New(doubled, make([]bool, len(doubled)), nil, false)
	rw, _ := Check(file, w, Options{})
	rd, _ := Check(file, d, Options{})
	if !floatcmp.Equal(rw.AlertRate.Observed, rd.AlertRate.Observed) || !floatcmp.Equal(rw.AlertRate.PValue, rd.AlertRate.PValue) || !floatcmp.Equal(rw.PSI, rd.PSI) {
		t.Errorf("weighted %v %v %v, doubled %v %v %v", rw.AlertRate.Observed, rw.AlertRate.PValue, rw.PSI, rd.AlertRate.Observed, rd.AlertRate.PValue, rd.PSI)
	}
}
