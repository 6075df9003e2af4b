package drift

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/scores"
)

// downsampled returns a bearings validation set of n cases with the
// false cases kept 1 in 10 (seeded by seed), each kept one weighted 10.
func downsampled(t testing.TB, seed uint64, n int) *scores.Set {
	t.Helper()
	sc, labels := bearings(seed, n, 0.07, 0)
	return keepOneIn(t, seed, sc, labels, 10, true)
}

// keepOneIn keeps the false cases (labels as given) one in every (seeded
// by seed) and weights each kept one every; the true cases are all kept,
// weighted 1. withLabels false drops the label column from the set.
func keepOneIn(t testing.TB, seed uint64, sc []float64, labels []bool, every int, withLabels bool) *scores.Set {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 99))
	var keptScores, weights []float64
	var keptLabels []bool
	for i := range sc {
		w := 1.0
		if !labels[i] {
			if rng.Float64() >= 1/float64(every) {
				continue
			}
			w = float64(every)
		}
		keptScores, keptLabels, weights = append(keptScores, sc[i]), append(keptLabels, labels[i]), append(weights, w)
	}
	if !withLabels {
		keptLabels = make([]bool, len(keptScores)) // as a set read without a label column
	}
	set, err := scores.NewSet(scores.Columns{Scores: keptScores, Labels: keptLabels, Weights: weights, WeightColumn: "w"})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// downsampledRun is one set-up of the downsampled simulations: batches of
// 4,000 bearings cases at newBase, every case's latent moved by shift and
// the true cases' by shiftPositives as well, checked with or without labels against a decision
// saved from a downsampled validation set (20,000 cases, false cases kept
// 1 in 10 and weighted 10).
type downsampledRun struct {
	labelled       bool
	newBase        float64
	shift          float64
	shiftPositives float64
}

// rates counts each status over replicates, seeds from seed, for the
// validation weights read as sampling weights and as frequency weights.
func (d downsampledRun) rates(t *testing.T, replicates int, seed uint64) (sampling, frequency map[string]int) {
	t.Helper()
	sampling, frequency = map[string]int{}, map[string]int{}
	for i := range replicates {
		set := downsampled(t, seed+uint64(2*i), 20000)
		sc, labels := bearingsMoved(seed+uint64(2*i+1), 4000, d.newBase, d.shift, d.shiftPositives)
		batch, err := scores.New(sc, labels, nil, false)
		if err != nil {
			t.Fatal(err)
		}
		for kind, counts := range map[bool]map[string]int{true: sampling, false: frequency} {
			res, err := Check(quickFileDesign(t, set, kind), batch, Options{Labelled: d.labelled})
			if err != nil {
				t.Fatal(err)
			}
			counts[res.Status()]++
		}
	}
	return sampling, frequency
}

// TestVerdictDownsampledFalseAlarmRate: a decision chosen on a validation
// set whose false cases were downsampled (kept 1 in 10, weighted 10),
// checked against unweighted batches of the same process. With the
// weights declared as sampling weights the check's any-finding rate stays
// about its stated level (1%); read as frequency weights it does not.
//
// Set-up: bearings (base rate 7%, no shift); validation 20,000 cases
// before downsampling (about 1,400 true and 1,860 false rows); batches of
// 4,000; the hit=0.8 cut, base rate from the validation set; seeds from
// 9000. 400 replicates in CI (at most 11 alarms at 1%, as in
// TestVerdictFalseAlarmRate); 4,000 with -drift-long (at most 2%, 80, as
// there). The frequency reading must alarm in over 4% of the runs, so the
// simulation tells the two readings apart.
//
// Measured on 2026-12-02, alarms under sampling weights (read as
// frequency weights): 400 replicates, labelled 4 (137), no labels 3
// (110); 4,000 with -drift-long, labelled 34, 0.85% (1,367), no labels
// 35, 0.88% (1,191). Before the mixture read each validated class at its
// own effective size (its unweighted rows here) the no-labels case
// alarmed in 81 of 400: the weighted class totals scaled to the base
// rate's effective size (about 12,300) gave the false cases about 11,400
// effective rows where 1,860 were drawn, so the noise of their score
// distribution was underrated by a factor of six. With that mended but
// one allowance for all bins, 1 + n(p^2/P + (1-p)^2/N), set by the false
// cases' noise, the no-labels case alarmed in only 12 of 4,000 (0.30%):
// the bins of true cases were charged the false cases' noise; the
// allowance now goes bin by bin (mixtureInflation).
func TestVerdictDownsampledFalseAlarmRate(t *testing.T) {
	replicates, bound := 400, 11
	if *longSimulations {
		replicates, bound = 4000, 80
	}
	for _, labelled := range []bool{true, false} {
		t.Run(fmt.Sprint("labelled=", labelled), func(t *testing.T) {
			sampling, frequency := downsampledRun{labelled: labelled, newBase: 0.07}.rates(t, replicates, 9000)
			alarms, frequencyAlarms := replicates-sampling[StatusOK], replicates-frequency[StatusOK]
			t.Logf("%d replicates: alarms %d (sampling weights: assumption %d, drift %d), %d (read as frequency weights)", replicates, alarms, sampling[StatusAssumption], sampling[StatusDrift], frequencyAlarms)
			if alarms > bound {
				t.Errorf("%d alarms of %d under sampling weights, want at most %d (about %v)", alarms, replicates, bound, Level)
			}
			if frequencyAlarms <= replicates/25 {
				t.Errorf("the frequency reading alarmed %d of %d, want over 4%% (else the simulation does not tell the readings apart)", frequencyAlarms, replicates)
			}
		})
	}
}

// quickFileDesign is quickFile with the set's weights read as sampling
// weights (sampling) or frequency weights.
func quickFileDesign(t testing.TB, set *scores.Set, sampling bool) *decision.File {
	t.Helper()
	kind := design.Frequency
	if sampling {
		kind = design.Sampling
	}
	return quickFileWith(t, set, 0, design.New(set, kind))
}

// TestVerdictDownsampledBaseRateAlone: as TestVerdictDownsampledFalseAlarmRate,
// but the batches' base rate is 14% against the 7% assumed (taken from the
// downsampled validation set), the model unchanged. Drift must stay at
// the false-alarm level (at most 11 of 400; with -drift-long at most 80
// of 4,000) and the status read assumption in at least 90% of runs.
// Seeds from 19000. Measured on 2026-12-02 with -drift-long (4,000
// replicates; ok, assumption, drift): labelled 0, 3963, 37 (drift
// 0.93%); no labels 3, 3951, 46 (1.15%).
func TestVerdictDownsampledBaseRateAlone(t *testing.T) {
	replicates, bound := 400, 11
	if *longSimulations {
		replicates, bound = 4000, 80
	}
	for _, labelled := range []bool{true, false} {
		t.Run(fmt.Sprint("labelled=", labelled), func(t *testing.T) {
			c, _ := downsampledRun{labelled: labelled, newBase: 0.14}.rates(t, replicates, 19000)
			t.Logf("%d replicates: ok %d, assumption %d, drift %d", replicates, c[StatusOK], c[StatusAssumption], c[StatusDrift])
			if c[StatusDrift] > bound {
				t.Errorf("drift in %d of %d replicates when only the base rate moved, want at most %d", c[StatusDrift], replicates, bound)
			}
			if c[StatusAssumption] < replicates*9/10 {
				t.Errorf("assumption in %d of %d replicates, want at least 90%%", c[StatusAssumption], replicates)
			}
		})
	}
}

// TestVerdictDownsampledPower: as TestVerdictDownsampledFalseAlarmRate,
// but the model moved in the batches, the base rate unchanged. 200
// replicates each, seeds from 29000; measured on 2026-12-02 (ok,
// assumption, drift):
//
//   - labelled, the true cases' latent 0.5 lower (recall at the cut falls
//     from about 0.80 to 0.63, from the generating model: the cut sits
//     0.84 below the true cases' latent mean of 1.9, and P(Z > -0.34) =
//     0.63): 0, 0, 200; asserted drift in at least 190;
//   - no labels, every case's latent 0.3 higher: 0, 0, 200; asserted
//     drift in at least 190;
//   - no labels, the true cases' latent 1.0 lower: the scores still fit a
//     mix of the validated classes at a lower base rate, so without
//     labels this reads as a change of base rate (assumption), as it
//     does on an unweighted validation set (100 runs on 20,000 unweighted
//     rows: 89 assumption, 11 drift): 2, 190, 8. The 0.5 shift above
//     reads 138, 60, 2 without labels. Asserted: any alarm in at least
//     180.
func TestVerdictDownsampledPower(t *testing.T) {
	for _, tc := range []struct {
		name         string
		run          downsampledRun
		leastDrift   int
		leastAlarmed int
	}{
		{"labelled, true cases lower", downsampledRun{labelled: true, newBase: 0.07, shiftPositives: -0.5}, 190, 190},
		{"no labels, every case higher", downsampledRun{newBase: 0.07, shift: 0.3}, 190, 190},
		{"no labels, true cases far lower", downsampledRun{newBase: 0.07, shiftPositives: -1}, 0, 180},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, _ := tc.run.rates(t, 200, 29000)
			t.Logf("200 replicates: ok %d, assumption %d, drift %d", c[StatusOK], c[StatusAssumption], c[StatusDrift])
			if c[StatusDrift] < tc.leastDrift || 200-c[StatusOK] < tc.leastAlarmed {
				t.Errorf("drift in %d and any alarm in %d of 200 replicates of a real shift, want at least %d and %d", c[StatusDrift], 200-c[StatusOK], tc.leastDrift, tc.leastAlarmed)
			}
		})
	}
}

// byScore keeps the cases scoring below low one in every (seeded by
// seed) and weights each kept one every; the others are all kept,
// weighted 1: production logs thinned where the scores are low.
// withLabels false drops the labels, as keepOneIn.
func byScore(t testing.TB, seed uint64, sc []float64, labels []bool, low float64, every int, withLabels bool) *scores.Set {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 7))
	var keptScores, weights []float64
	var keptLabels []bool
	for i := range sc {
		w := 1.0
		if sc[i] < low {
			if rng.Float64() >= 1/float64(every) {
				continue
			}
			w = float64(every)
		}
		keptScores, keptLabels, weights = append(keptScores, sc[i]), append(keptLabels, labels[i] && withLabels), append(weights, w)
	}
	set, err := scores.NewSet(scores.Columns{Scores: keptScores, Labels: keptLabels, Weights: weights, WeightColumn: "w"})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// TestVerdictWeightedBatchFalseAlarmRate: batches that carry sampling
// weights, checked against a decision saved from an unweighted validation
// set of the same process (bearings, base rate 7%, no shift; 6,000 cases;
// the hit=0.8 cut, base rate from the validation set). Each batch is
// 20,000 cases before thinning, thinned one of two ways: the false cases
// kept 1 in 10 and weighted 10 (about 3,260 rows), or the cases scoring
// below 0.05 kept 1 in 5 and weighted 5 (about 10,700 rows); each with
// labels and without (the labels dropped). The batch's weights are read
// as sampling weights (design.New) and, to show the simulation tells the
// readings apart, as frequency weights. Seeds from 5000; 400 replicates,
// at most 11 alarms under sampling weights (1%, as in
// TestVerdictFalseAlarmRate); with -drift-long 4,000, at most 80 (2%).
//
// Measured on 2026-12-02 before the score tests read the batch's bins at
// their own variances: the batch thinned by score, labelled, alarmed in
// 18 of 400 (13 of them the scores of false cases, whose bins were all
// read at the effective size of the false positive rate, near the
// weighted total, though the low bins hold a fifth of that in rows). Now
// (2026-12-02), alarms under sampling weights (read as frequency
// weights), in the order of the cases below: 400 replicates 2 (204), 5
// (191), 5 (27), 2 (17); 4,000 with -drift-long 45, 1.13% (2,050), 33,
// 0.83% (1,802), 54, 1.35% (270), 50, 1.25% (173).
func TestVerdictWeightedBatchFalseAlarmRate(t *testing.T) {
	replicates, bound := 400, 11
	if *longSimulations {
		replicates, bound = 4000, 80
	}
	for _, tc := range []struct {
		name     string
		byScore  bool
		labelled bool
	}{
		{"false cases kept 1 in 10, labelled", false, true},
		{"false cases kept 1 in 10, no labels", false, false},
		{"low scores kept 1 in 5, labelled", true, true},
		{"low scores kept 1 in 5, no labels", true, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			counts := map[design.Kind]map[string]int{design.Sampling: {}, design.Frequency: {}}
			for i := range replicates {
				file := quickFile(t, bearingSet(t, 5000+uint64(2*i), 6000, 0.07, 0), 0)
				sc, labels := bearings(5000+uint64(2*i+1), 20000, 0.07, 0)
				batch := keepOneIn(t, uint64(i)+77, sc, labels, 10, tc.labelled)
				if tc.byScore {
					batch = byScore(t, uint64(i), sc, labels, 0.05, 5, tc.labelled)
				}
				for kind, c := range counts {
					res, err := Check(file, batch, Options{Labelled: tc.labelled, Sample: design.New(batch, kind)})
					if err != nil {
						t.Fatal(err)
					}
					c[res.Status()]++
				}
			}
			s := counts[design.Sampling]
			alarms := replicates - s[StatusOK]
			t.Logf("%d replicates: alarms %d (sampling weights: assumption %d, drift %d), %d (read as frequency weights)", replicates, alarms, s[StatusAssumption], s[StatusDrift], replicates-counts[design.Frequency][StatusOK])
			if alarms > bound {
				t.Errorf("%d alarms of %d under sampling weights, want at most %d (about %v)", alarms, replicates, bound, Level)
			}
		})
	}
}

// TestVerdictScoreThinnedValidationFalseAlarmRate: a decision chosen on a
// validation set thinned by score (bearings, base rate 7%, 20,000 cases
// before thinning, those scoring below 0.05 kept 1 in 5 and weighted 5:
// about 7,700 rows; sampling weights), checked against unweighted
// batches of 4,000 cases of the same process, with labels and without;
// the hit=0.8 cut, base rate from the validation set; seeds from 39000.
// Each file is checked as written (with data.squared_weights) and with
// the key taken out, as a file written before it reads: its class score
// bins then count at one size per class. 400 replicates, at most 11
// alarms with the key (1%, as in TestVerdictFalseAlarmRate); 4,000 with
// -drift-long, at most 80 (2%).
//
// Measured on 2026-12-02, alarms with data.squared_weights (without the
// key): 400 replicates, labelled 5 (7), no labels 5 (10); 4,000 with
// -drift-long, labelled 51, 1.28% (116, 2.90%: drift 39 against 104), no
// labels 40, 1.00% (77, 1.93%). Without the key each class's bins are
// read at one size, that of its share's effective trials (for the false
// cases near their weighted total), though the thinned low bins hold a
// fifth of that in rows; with it each bin counts at its own variance
// (designHomogeneity, mixtureInflation). For a class downsampled as a
// whole (TestVerdictDownsampledFalseAlarmRate) the two readings agree:
// the same alarms with the key as before it.
func TestVerdictScoreThinnedValidationFalseAlarmRate(t *testing.T) {
	replicates, bound := 400, 11
	if *longSimulations {
		replicates, bound = 4000, 80
	}
	for _, labelled := range []bool{true, false} {
		t.Run(fmt.Sprint("labelled=", labelled), func(t *testing.T) {
			with, without := map[string]int{}, map[string]int{}
			for i := range replicates {
				sc, labels := bearings(39000+uint64(2*i), 20000, 0.07, 0)
				file := quickFileDesign(t, byScore(t, 39000+uint64(2*i), sc, labels, 0.05, 5, true), true)
				newScores, newLabels := bearings(39000+uint64(2*i+1), 4000, 0.07, 0)
				batch, err := scores.New(newScores, newLabels, nil, false)
				if err != nil {
					t.Fatal(err)
				}
				for _, c := range []map[string]int{with, without} {
					res, err := Check(file, batch, Options{Labelled: labelled})
					if err != nil {
						t.Fatal(err)
					}
					c[res.Status()]++
					file.Data.Squares = nil // the second pass: a file without the key
				}
			}
			alarms := replicates - with[StatusOK]
			t.Logf("%d replicates: alarms %d (assumption %d, drift %d), %d without data.squared_weights (assumption %d, drift %d)",
				replicates, alarms, with[StatusAssumption], with[StatusDrift], replicates-without[StatusOK], without[StatusAssumption], without[StatusDrift])
			if alarms > bound {
				t.Errorf("%d alarms of %d, want at most %d (about %v)", alarms, replicates, bound, Level)
			}
		})
	}
}

// TestPSIValidationAtKishSize: against a decision from a downsampled
// validation set (20,000 bearings cases, false cases kept 1 in 10 and
// weighted 10, seed 41000) the PSI's validation side sits at Kish's
// effective size of its histogram, (sum w)²/(sum w²): about 20,000² /
// (1,400 + 18,600 × 10) = 2,130 by the generating model, where the base
// rate's effective trials count the false cases at their weight (about
// 12,300 here). Fewer cases make more noise, so the PSI's noise level is
// higher with data.squared_weights than without.
func TestPSIValidationAtKishSize(t *testing.T) {
	file := quickFileDesign(t, downsampled(t, 41000, 20000), true)
	batch := bearingSet(t, 41001, 4000, 0.07, 0)
	h, q := file.Data.Histogram, file.Data.Squares
	kish := kishSize(h.Counts, q.Histogram)
	if kish < 1900 || kish > 2400 {
		t.Fatalf("Kish size of the histogram %v, want about 2,130", kish)
	}
	res, err := Check(file, batch, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if want := PSINoiseLevel(scaled(h.Counts, kish/sum(h.Counts)), 4000); !floatcmp.Within(res.PSINoiseLevel, want, 1e-12) {
		t.Errorf("PSI noise level %v, want %v (the validation side at Kish's size)", res.PSINoiseLevel, want)
	}
	file.Data.Squares = nil
	before, err := Check(file, batch, Options{})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("PSI noise level %.4f at Kish's size %.0f, %.4f without data.squared_weights", res.PSINoiseLevel, kish, before.PSINoiseLevel)
	if !(res.PSINoiseLevel > before.PSINoiseLevel) {
		t.Errorf("PSI noise level %v with the key, %v without; want it higher at the smaller Kish size", res.PSINoiseLevel, before.PSINoiseLevel)
	}
}
