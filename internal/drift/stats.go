package drift

import (
	"math"
	"math/rand/v2"
	"slices"

	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/quantile"
)

// Level is the significance level of every test in this package: a check
// drifts on sampling noise alone in about 1 run in 100.
const Level = 0.01

// Test compares a share seen in the new data with the share the decision
// file expects. The shares are weighted counts read as frequency weights.
type Test struct {
	Observed   float64    // Successes / Trials; NaN with no trials
	Successes  float64    // in the new data
	Trials     float64    // in the new data
	ObservedCI [2]float64 // Wilson interval of Observed at the file's confidence
	Expected   float64    // from the decision file
	ExpectedSE float64    // standard error of Expected from the validation counts
	Difference float64    // Observed - Expected
	Z          float64    // (|Difference| - tolerance) / standard error of the difference
	PValue     float64    // two-sided; 1 when |Difference| is within the tolerance
	Drift      bool       // PValue < Level
	Defined    bool       // false when either share is undefined: nothing was tested
}

// Complement is the same test read as the share of the other outcome:
// 1 - the share observed and expected, the interval turned round, the
// difference negated; the p-value and verdict are t's. Check shows the
// precision test as the wrong-alert share (false discovery rate), the
// term every view uses.
func (t Test) Complement() Test {
	c := t
	c.Observed, c.Expected = 1-t.Observed, 1-t.Expected
	c.Successes = t.Trials - t.Successes
	c.ObservedCI = [2]float64{1 - t.ObservedCI[1], 1 - t.ObservedCI[0]}
	c.Difference = -t.Difference
	return c
}

// Compare tests whether a share of successes out of trials differs from
// expected by more than tolerance (an absolute margin on shares, >= 0),
// where expected was estimated with variance expectedVariance.
//
// The test is a two-sample z test that accounts for both sample sizes:
// the variance of the difference is the variance of the new share under
// the null, q(1-q)/trials, plus expectedVariance. q is expected shrunk by
// one success and one failure, (expected*trials+1)/(trials+2), after
// Agresti and Caffo (2000, "Simple and effective confidence intervals for
// proportions and differences of proportions result from adding two
// successes and two failures", The American Statistician; from memory),
// so that an expected share of 0 or 1 does not claim zero variance.
// Callers shrink expectedVariance the same way (see shrunkVariance).
//
// The null is |true new share - expected| <= tolerance; the statistic is
// (|Difference| - tolerance) / standard error and the test drifts when its
// two-sided p-value is below Level. With no trials, or an undefined
// expected share, Defined is false and the test never drifts. confidence
// sets the observed share's Wilson interval and must lie in (0,1).
func Compare(successes, trials, expected, expectedVariance, tolerance, confidence float64) Test {
	t := Test{Successes: successes, Trials: trials, Expected: expected, ExpectedSE: math.Sqrt(expectedVariance),
		Observed: math.NaN(), ObservedCI: [2]float64{math.NaN(), math.NaN()}, Difference: math.NaN(), Z: math.NaN(), PValue: math.NaN()}
	if trials > 0 {
		t.Observed = successes / trials
		t.ObservedCI[0], t.ObservedCI[1] = interval.Wilson(successes, trials, confidence)
	}
	if !(trials > 0) || math.IsNaN(expected) || math.IsNaN(expectedVariance) {
		return t
	}
	t.Defined = true
	t.Difference = t.Observed - expected
	q := (expected*trials + 1) / (trials + 2)
	se := math.Sqrt(q*(1-q)/trials + expectedVariance)
	excess := math.Abs(t.Difference) - tolerance
	if excess <= 0 {
		t.Z, t.PValue = math.Min(0, excess/se), 1
		return t
	}
	t.Z = excess / se
	t.PValue = math.Min(1, math.Erfc(t.Z/math.Sqrt2)) // 2 * (1 - Phi(z))
	t.Drift = t.PValue < Level
	return t
}

// shrunkVariance returns the variance of a share of successes out of
// trials, with the share shrunk by one success and one failure as in
// Compare: p(1-p)/(trials+2) with p = (successes+1)/(trials+2). It is 0
// when trials is 0.
func shrunkVariance(successes, trials float64) float64 {
	if !(trials > 0) {
		return 0
	}
	p := (successes + 1) / (trials + 2)
	return p * (1 - p) / (trials + 2)
}

// shrunk returns successes/trials shrunk by one success and one failure.
func shrunk(successes, trials float64) float64 { return (successes + 1) / (trials + 2) }

// PSI bands, common practice with no single source: below 0.1 the score
// distribution is stable, from 0.1 to 0.25 it has moved moderately, above
// 0.25 it has moved a lot.
const (
	PSIModerate = 0.1
	PSILarge    = 0.25
)

// PSIFloor is the share that stands in for an empty bin in
// PopulationStability, whose logarithm would otherwise be infinite
// (common practice, no source).
const PSIFloor = 1e-4

// PopulationStability returns the population stability index of actual
// counts against expected counts over the same bins:
//
//	PSI = sum over bins of (a_i - e_i) * ln(a_i / e_i)
//
// where a_i and e_i are the bins' shares of their totals, each share at
// least PSIFloor. Counts may be weighted and must be >= 0; the order of
// bins does not matter. It is NaN when either total is 0 or there are no
// bins, and it panics when the slices differ in length.
func PopulationStability(expected, actual []float64) float64 {
	if len(expected) != len(actual) {
		panic("drift: PopulationStability got slices of different lengths")
	}
	var eTotal, aTotal float64
	for i := range expected {
		eTotal += expected[i]
		aTotal += actual[i]
	}
	if len(expected) == 0 || !(eTotal > 0) || !(aTotal > 0) {
		return math.NaN()
	}
	psi := 0.0
	for i := range expected {
		e := math.Max(expected[i]/eTotal, PSIFloor)
		a := math.Max(actual[i]/aTotal, PSIFloor)
		psi += (a - e) * math.Log(a/e)
	}
	return psi
}

// PSINoise returns about how large the PSI of two samples from one
// distribution is through sampling alone: (bins-1) * (1/n + 1/m), from
// reading PSI as a symmetric chi-square statistic (for shares near each
// other (a-e)ln(a/e) is close to (a-e)^2/e). n and m are the two sample
// sizes. A derivation, no source.
func PSINoise(bins int, n, m float64) float64 {
	if bins < 2 || !(n > 0) || !(m > 0) {
		return math.NaN()
	}
	return float64(bins-1) * (1/n + 1/m)
}

// PSINoiseLevel returns the PSI that n new rows drawn from the very
// distribution of the validation counts exceed through sampling alone
// about once in 1/Level runs. validation holds the counts of the file's
// bins (weighted or not; their total is m), n the new rows' total weight.
//
// When every bin expects at least minExpectedRows new rows, PSI * nm/(n+m) is about
// chi-square with bins-1 degrees of freedom (the reading of PSINoise), and
// the level is that chi-square's 1-Level quantile, by Wilson and
// Hilferty's cube-root approximation (Wilson and Hilferty 1931, "The
// distribution of chi-square", from memory), times 1/n + 1/m. With fewer
// expected rows, where empty bins make the PSI far larger than that, it is
// the 1-Level quantile of the PSI of psiDraws seeded draws of round(n)
// rows from the validation shares (the validation set's own noise left
// out, which few new rows dwarf). NaN with fewer than 2 bins or a total
// that is not positive.
func PSINoiseLevel(validation []float64, n float64) float64 {
	var m, least float64
	least = math.Inf(1)
	for _, c := range validation {
		m += c
	}
	if len(validation) < 2 || !(n > 0) || !(m > 0) {
		return math.NaN()
	}
	for _, c := range validation {
		least = math.Min(least, c/m)
	}
	if n*least >= minExpectedRows || n > maxDrawnRows {
		return quantile.ChiSquare(1-Level, float64(len(validation)-1)) * (1/n + 1/m)
	}
	rows := max(1, int(math.Round(n)))
	cumulative := make([]float64, len(validation))
	total := 0.0
	for i, c := range validation {
		total += c / m
		cumulative[i] = total
	}
	rng := rand.New(rand.NewPCG(psiSeed, psiSeed))
	psi := make([]float64, psiDraws)
	fresh := make([]float64, len(validation))
	for d := range psi {
		clear(fresh)
		for range rows {
			i, _ := slices.BinarySearch(cumulative, rng.Float64()*total)
			fresh[min(i, len(fresh)-1)]++
		}
		psi[d] = PopulationStability(validation, fresh)
	}
	slices.Sort(psi)
	return psi[int(math.Ceil((1-Level)*psiDraws))-1]
}

// psiDraws, psiSeed and maxDrawnRows govern PSINoiseLevel's draws: 2000
// draws put its 99th percentile between the 1980th and 1981st, and the
// fixed seed gives the same level for the same input. minExpectedRows is
// where the chi-square reading takes over: with 10 expected rows a bin it
// let 2.8% of noise-only runs through (1000 runs of the kind in
// TestPSINoiseLevelRate), with 20 1.9%, and the draws below that 1.2% to
// 1.8%; above 20 it tends to the 1% it stands for.
const (
	minExpectedRows = 20
	psiDraws        = 2000
	psiSeed         = 20260901
	maxDrawnRows    = 100000
)
