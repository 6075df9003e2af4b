package modelpair_test

import (
	"flag"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/modelpair"
	"github.com/sill-tool/sill/internal/scores"
)

var longSampling = flag.Bool("sampling-long", false, "run the sampling-weight DeLong simulation at its long size")

// pairedSample draws n cases: a true case with chance base, model a's
// score normal about 1 (true) or 0 (false), model b's a noisier copy.
func pairedSample(rng *rand.Rand, n int, base float64) (a, b []float64, labels []bool) {
	for range n {
		positive := rng.Float64() < base
		mean := 0.0
		if positive {
			mean = 1
		}
		x := mean + rng.NormFloat64()
		a, b, labels = append(a, x), append(b, x+0.8*rng.NormFloat64()), append(labels, positive)
	}
	return a, b, labels
}

// TestSamplingPairedUnitWeights: with every weight 1 the sampling
// variance is DeLong's exactly (sum (x - mean)^2 / m^2 * m/(m-1) is
// S10/m), and weighting every row 10 leaves it unchanged, where the
// frequency reading divides it by about 10.
func TestSamplingPairedUnitWeights(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	a, b, labels := pairedSample(rng, 300, 0.3)
	plain, err := modelpair.Paired(a, b, labels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	ones := make([]float64, len(a))
	tens := make([]float64, len(a))
	for i := range ones {
		ones[i], tens[i] = 1, 10
	}
	for _, tc := range []struct {
		name    string
		weights []float64
	}{{"weights 1", ones}, {"weights 10", tens}} {
		got, err := modelpair.SamplingPaired(a, b, labels, tc.weights, false)
		if err != nil {
			t.Fatal(err)
		}
		if !floatcmp.Equal(got.Variance[0], plain.Variance[0]) || !floatcmp.Equal(got.Variance[1], plain.Variance[1]) ||
			!floatcmp.Equal(got.Covariance, plain.Covariance) || !floatcmp.Equal(got.StdError, plain.StdError) {
			t.Errorf("%s: sampling %+v, DeLong %+v", tc.name, got, plain)
		}
	}
	frequency, err := modelpair.Paired(a, b, labels, tens, false)
	if err != nil {
		t.Fatal(err)
	}
	// The frequency reading: each class counts ten times the rows, so the
	// variance falls to about a tenth (S10/(10m) with 10m-1 in S10).
	if ratio := frequency.Variance[0] / plain.Variance[0]; !(ratio > 0.09 && ratio < 0.11) {
		t.Errorf("frequency weights 10: variance ratio %v, want about 0.1", ratio)
	}
}

// TestSingleSampling: the one-model tally under sampling weights agrees
// with the paired test's diagonal on the same weighted cases (ties
// included: scores rounded to one decimal).
func TestSingleSampling(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	a, b, labels := pairedSample(rng, 400, 0.2)
	weights := make([]float64, len(a))
	for i := range a {
		a[i] = math.Round(a[i]*10) / 10
		weights[i] = 1 + float64(rng.IntN(5))
	}
	test, err := modelpair.SamplingPaired(a, b, labels, weights, false)
	if err != nil {
		t.Fatal(err)
	}
	set, err := scores.NewSet(scores.Columns{Scores: append([]float64(nil), a...), Labels: append([]bool(nil), labels...), Weights: append([]float64(nil), weights...), WeightColumn: "w"})
	if err != nil {
		t.Fatal(err)
	}
	single := modelpair.Single{Sampling: true}
	curve.Walk(set, single.Visit)
	e := single.Estimate(0.95)
	if !floatcmp.Equal(e.AUC, test.AUC[0]) || !floatcmp.Equal(e.Variance, test.Variance[0]) {
		t.Errorf("single: AUC %v variance %v; paired: AUC %v variance %v", e.AUC, e.Variance, test.AUC[0], test.Variance[0])
	}
}

// TestSamplingDeLongSimulation checks that DeLong's standard error under
// sampling weights measures how far the weighted AUC moves between
// samples, and does not shrink by the square root of the weight.
//
// Set-up (seeded, PCG(16, 1)): each replicate draws 4,000 cases at base
// rate 20% (model a's score normal about 1 for true cases, 0 for false;
// b = a plus normal noise of SD 0.8), keeps every true case and 1 false
// case in 10, weighted 10 (about 1,100 rows). 300 replicates in CI, 2,000
// with -sampling-long. Asserted: the mean sampling-weight SE of a's AUC
// and of the difference lie within 15% of the SD of the estimates across
// replicates (the SD of an SD from 300 draws is about 4%), and the
// frequency reading's SE of a's AUC lies below 70% of that SD.
//
// Results: 300 replicates: SE/SD 1.017 (AUC), 1.046 (difference),
// frequency 0.609; 2,000 replicates (-sampling-long): 1.029, 1.026,
// 0.615. (The frequency reading shrinks the false cases' part of the
// variance by 10; the true cases, of weight 1, keep theirs.)
func TestSamplingDeLongSimulation(t *testing.T) {
	replicates := 300
	if *longSampling {
		replicates = 2000
	}
	rng := rand.New(rand.NewPCG(16, 1))
	var aucs, differences, samplingSE, differenceSE, frequencySE []float64
	for range replicates {
		a, b, labels := pairedSample(rng, 4000, 0.2)
		var ka, kb []float64
		var kl []bool
		var weights []float64
		for i := range a {
			w := 1.0
			if !labels[i] {
				if rng.Float64() >= 0.1 {
					continue
				}
				w = 10
			}
			ka, kb, kl, weights = append(ka, a[i]), append(kb, b[i]), append(kl, labels[i]), append(weights, w)
		}
		s, err := modelpair.SamplingPaired(ka, kb, kl, weights, false)
		if err != nil {
			t.Fatal(err)
		}
		f, err := modelpair.Paired(ka, kb, kl, weights, false)
		if err != nil {
			t.Fatal(err)
		}
		aucs = append(aucs, s.AUC[0])
		differences = append(differences, s.Difference)
		samplingSE = append(samplingSE, math.Sqrt(s.Variance[0]))
		differenceSE = append(differenceSE, s.StdError)
		frequencySE = append(frequencySE, math.Sqrt(f.Variance[0]))
	}
	sdAUC, sdDifference := sd(aucs), sd(differences)
	ratio, diffRatio, freqRatio := mean(samplingSE)/sdAUC, mean(differenceSE)/sdDifference, mean(frequencySE)/sdAUC
	t.Logf("%d replicates: SE/SD %.3f (AUC), %.3f (difference), frequency %.3f", replicates, ratio, diffRatio, freqRatio)
	const band = 0.15
	if math.Abs(ratio-1) > band || math.Abs(diffRatio-1) > band {
		t.Errorf("sampling SE over the SD of the estimates: %.3f (AUC), %.3f (difference), want within %v of 1", ratio, diffRatio, band)
	}
	if freqRatio > 0.7 {
		t.Errorf("frequency SE over SD %.3f, want below 0.7 (it shrinks with the weight)", freqRatio)
	}
}

func mean(v []float64) float64 {
	total := 0.0
	for _, x := range v {
		total += x
	}
	return total / float64(len(v))
}

func sd(v []float64) float64 {
	m, total := mean(v), 0.0
	for _, x := range v {
		total += (x - m) * (x - m)
	}
	return math.Sqrt(total / float64(len(v)-1))
}
