// Package calibration asks whether a model's scores can be read as
// probabilities: a reliability table of mean score against observed rate,
// the expected calibration error, the cost-optimal threshold that
// calibrated probabilities imply, and the net benefit of decision-curve
// analysis.
//
// Everything here needs probabilities: every score in [0,1] with higher
// scores riskier (curve.Summary.Probabilities). Which cases a cut flags
// follows the cut rule in the doc of package scores. Weights are frequency
// weights (see the scores package doc): a weight of 2 counts as the row
// written twice.
package calibration

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"

	"github.com/sill-tool/sill/internal/quantile"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// Binning says how Reliability places its bin edges.
type Binning int

// The binnings Reliability knows.
const (
	// FixedWidth splits [0,1] into bins of equal width.
	FixedWidth Binning = iota
	// Quantile puts the edges at the quantiles of the scores, so that bins
	// hold about equal numbers of rows.
	Quantile
)

// ParseBinning reads "width" or "quantile".
func ParseBinning(text string) (Binning, error) {
	switch text {
	case "width", "fixed":
		return FixedWidth, nil
	case "quantile":
		return Quantile, nil
	}
	return 0, fmt.Errorf("%w %q, expected width or quantile", ErrBinning, text)
}

// Errors of this package.
var (
	ErrNotProbabilities = errors.New("scores are not probabilities: they need to lie in [0,1] with higher scores riskier")
	ErrBins             = errors.New("number of bins must be at least 1")
	ErrBinning          = errors.New("unknown binning")
)

// Bin is one row of a reliability table: the cases whose score lies in
// (Lower, Upper], the first bin also taking a score equal to its Lower.
// MeanScore and ObservedRate are NaN in a bin of no weight.
type Bin struct {
	Lower, Upper float64
	MeanScore    float64 // weighted mean score
	ObservedRate float64 // weighted share of true cases
	Count        int     // rows, whatever their weight; cases for a counts table
	Weight       float64 // summed weight
}

// Table is a reliability table.
type Table struct {
	Binning Binning
	Bins    []Bin
	// ECE is the expected calibration error: the weight-averaged absolute
	// gap between a bin's observed rate and its mean score (Naeini, Cooper
	// and Hauskrecht 2015 name it so). NaN when the set weighs nothing.
	ECE float64
	// Noise is the ECE's noise level at this set's size: the ECE that 9
	// sets in 10 of perfectly calibrated scores would stay at or below,
	// with the same scores in the same bins and labels drawn as
	// Bernoulli(score) (NoiseLevel). NoiseMean is their mean ECE. Both NaN
	// when ECE is.
	Noise, NoiseMean float64
}

// Reliability returns the reliability table of set in bins bins.
//
// Fixed-width edges are k/bins computed as numpy's linspace does (k times
// 1/bins), the last edge 1. Quantile edges are the quantiles of the rows'
// scores (rows, not weight; for a counts table its cases, so that the
// edges are those of the raw rows it counts) at k/bins, interpolated
// linearly between order statistics as numpy's percentile does by default. A score on an inner
// edge falls in the lower bin. These choices match scikit-learn's
// calibration_curve, whose output is Bins with a Count above zero. With
// tied quantile edges some bins are empty; they are kept, with Count 0.
//
// An empty set returns a table of empty bins and ECE NaN. One class only is
// no error (every observed rate is then 0 or 1). It returns
// ErrNotProbabilities when set's scores are not probabilities and ErrBins
// when bins < 1.
func Reliability(set *scores.Set, bins int, binning Binning) (Table, error) {
	if bins < 1 {
		return Table{}, fmt.Errorf("%w, got %d", ErrBins, bins)
	}
	if !Probabilities(set) {
		return Table{}, ErrNotProbabilities
	}
	edges := make([]float64, bins+1)
	switch binning {
	case Quantile:
		ascending := make([]float64, set.Len())
		for i, s := range set.Scores() {
			ascending[set.Len()-1-i] = s // ranked riskiest first, so descending
		}
		var casesBefore []float64 // for a counts table: cases of the ascending rows before each
		if set.CountsTable() {
			casesBefore = make([]float64, set.Len()+1)
			for k := range ascending {
				casesBefore[k+1] = casesBefore[k] + float64(set.CasesAt(set.Len()-1-k))
			}
		}
		for k := range edges {
			// As numpy: linspace(0, 1, bins+1) * 100, divided back by 100.
			q := float64(k) * (1 / float64(bins))
			if k == bins {
				q = 1
			}
			q = float64(q*100) / 100
			if casesBefore != nil {
				edges[k] = casesQuantile(ascending, casesBefore, q)
			} else {
				edges[k] = quantile.Linear(ascending, q)
			}
		}
		if set.Len() == 0 || (casesBefore != nil && !(casesBefore[set.Len()] > 0)) {
			for k := range edges {
				edges[k] = float64(k) * (1 / float64(bins))
			}
		}
	default:
		step := 1 / float64(bins)
		for k := range edges {
			edges[k] = float64(k) * step
		}
		edges[bins] = 1
	}
	t := Table{Binning: binning, Bins: make([]Bin, bins)}
	sums := make([]float64, bins)
	trues := make([]float64, bins)
	inner := edges[1:bins]
	for i, s := range set.Scores() {
		b := sort.SearchFloat64s(inner, s) // the number of inner edges < s
		w := set.Weight(i)
		t.Bins[b].Count += set.CasesAt(i) // a counts table's row stands for its cases
		t.Bins[b].Weight += w
		sums[b] += w * s
		if set.Labels()[i] {
			trues[b] += w
		}
	}
	total, gap := 0.0, 0.0
	for b := range t.Bins {
		bin := &t.Bins[b]
		bin.Lower, bin.Upper = edges[b], edges[b+1]
		bin.MeanScore, bin.ObservedRate = math.NaN(), math.NaN()
		if bin.Weight > 0 {
			bin.MeanScore = sums[b] / bin.Weight
			bin.ObservedRate = trues[b] / bin.Weight
			gap += bin.Weight * math.Abs(bin.ObservedRate-bin.MeanScore)
		}
		total += bin.Weight
	}
	t.ECE = math.NaN()
	if total > 0 {
		t.ECE = gap / total
	}
	t.Noise, t.NoiseMean = NoiseLevel(set, t, NoiseReplicates, NoiseSeed)
	return t, nil
}

// NoiseReplicates and NoiseSeed are the simulation behind Table.Noise:
// the same set always gets the same noise level.
const (
	NoiseReplicates = 1000
	NoiseSeed       = 20261202
)

// exactCases is the largest bin, in cases, whose labels NoiseLevel draws
// one by one; larger bins draw their count of true cases from the normal
// distribution of the same mean and variance.
const exactCases = 200

// NoiseLevel returns the ECE that perfectly calibrated scores would show
// in table t of set: the 90th percentile (nearest rank) and the mean of
// the ECE over replicates simulated sets, each with set's scores, weights
// and bins and every label drawn anew as Bernoulli(score), seeded by seed.
// A row stands for CasesAt(i) cases that draw their labels apart and
// carries its weight spread over them. A bin of at most exactCases cases
// draws each case's label; a larger bin draws its
// weighted count of true cases from the normal distribution with the
// same mean and variance (sum of w*s and of w*w/cases*s*(1-s)), clipped to
// [0, the bin's weight). An ECE below the 90th percentile cannot be told
// from the noise of a set of this size; the mean is what a calibrated
// model scores on average (ECE is biased upward: Kumar, Liang and Ma
// 2019, "Verified uncertainty calibration", from memory). Both are NaN
// when t.ECE is NaN or replicates < 1.
func NoiseLevel(set *scores.Set, t Table, replicates int, seed uint64) (p90, mean float64) {
	if math.IsNaN(t.ECE) || replicates < 1 || len(t.Bins) == 0 {
		return math.NaN(), math.NaN()
	}
	nb := len(t.Bins)
	inner := make([]float64, nb-1)
	for b := range nb - 1 {
		inner[b] = t.Bins[b].Upper
	}
	meanTrue := make([]float64, nb) // expected weight of true cases per bin
	variance := make([]float64, nb)
	exact := make([][]row, nb)
	binOf := func(s float64) int { return sort.SearchFloat64s(inner, s) }
	total := 0.0
	for i, s := range set.Scores() {
		b := binOf(s)
		w, n := set.Weight(i), float64(set.CasesAt(i))
		total += w
		if t.Bins[b].Count <= exactCases {
			exact[b] = append(exact[b], row{score: s, weight: w, cases: set.CasesAt(i)})
			continue
		}
		meanTrue[b] += w * s
		if n > 0 {
			variance[b] += w * w / n * s * (1 - s)
		}
	}
	if !(total > 0) {
		return math.NaN(), math.NaN()
	}
	rng := rand.New(rand.NewPCG(seed, seed^0x5eed))
	eces := make([]float64, replicates)
	for r := range eces {
		sum := 0.0
		for b, bin := range t.Bins {
			if !(bin.Weight > 0) {
				continue
			}
			trues := 0.0
			if exact[b] != nil {
				for _, x := range exact[b] {
					hits := 0
					for range x.cases {
						if rng.Float64() < x.score {
							hits++
						}
					}
					trues += x.weight * float64(hits) / float64(max(x.cases, 1))
				}
			} else {
				trues = min(max(meanTrue[b]+math.Sqrt(variance[b])*rng.NormFloat64(), 0), bin.Weight)
			}
			sum += math.Abs(trues - bin.MeanScore*bin.Weight)
		}
		eces[r] = sum / total
	}
	for _, e := range eces {
		mean += e
	}
	mean /= float64(replicates)
	slices.Sort(eces)
	rank := max(int(math.Ceil(0.9*float64(replicates)-1e-9)), 1)
	return eces[rank-1], mean
}

// row is one row of a bin whose labels NoiseLevel draws one by one.
type row struct {
	score, weight float64
	cases         int
}

// casesQuantile is quantile.Linear of the cases that a counts table's
// ascending rows stand for: row k holds casesBefore[k+1]-casesBefore[k]
// cases of score ascending[k]. It interpolates between the same two order
// statistics as quantile.Linear of the cases written out, with the same
// arithmetic, so the two agree to the bit. NaN when there are no cases.
func casesQuantile(ascending, casesBefore []float64, q float64) float64 {
	n := casesBefore[len(ascending)]
	if !(n > 0) {
		return math.NaN()
	}
	// caseScore is the score of case c, counted from 0 in ascending order.
	caseScore := func(c int) float64 {
		k := sort.Search(len(ascending), func(k int) bool { return casesBefore[k+1] > float64(c) })
		return ascending[min(k, len(ascending)-1)]
	}
	h := q * (n - 1)
	j := int(math.Floor(h))
	if j >= int(n)-1 {
		return caseScore(int(n) - 1)
	}
	t := h - float64(j)
	a, b := caseScore(j), caseScore(j+1)
	if t >= 0.5 {
		return b - (b-a)*(1-t)
	}
	return a + (b-a)*t
}

// Probabilities reports whether set's scores can be read as probabilities
// of a true case: every score in [0,1] and higher scores riskier. An empty
// set counts as probabilities.
func Probabilities(set *scores.Set) bool {
	if set.LowerIsRiskier() {
		return false
	}
	for _, s := range set.Scores() {
		if s < 0 || s > 1 {
			return false
		}
	}
	return true
}

// CostThreshold returns the probability above which flagging a case costs
// less on average than leaving it, for calibrated probabilities (Elkan
// 2001, "The foundations of cost-sensitive learning", theorem 1): a case
// of probability p is flagged when p*Hit + (1-p)*FalseAlert <= p*Miss, so
// the threshold is FalseAlert / (FalseAlert + Miss - Hit), which is
// FalseAlert / (FalseAlert + Miss) when a hit costs nothing. A case left
// unflagged and false costs 0.
//
// It returns NaN when FalseAlert + Miss - Hit <= 0, where no threshold
// separates the two choices. A result below 0 means flag every case, above
// 1 flag none.
func CostThreshold(c projection.Costs) float64 {
	den := c.FalseAlert + c.Miss - c.Hit
	if !(den > 0) {
		return math.NaN()
	}
	return c.FalseAlert / den
}

// ShiftThreshold carries a probability threshold over to the scale of
// scores calibrated at another base rate: a score s calibrated where the
// base rate was validationBase reads in production (base rate
// productionBase) as the probability whose odds are odds(s) *
// odds(productionBase) / odds(validationBase) (Elkan 2001, theorem 2, from
// memory; the usual prior-shift correction). ShiftThreshold returns the
// score at which that production probability equals threshold, so a case
// is flagged when its score is >= the result. Equal base rates return
// threshold unchanged. It returns NaN when a base rate is 0 or 1 or the
// threshold lies outside [0,1].
func ShiftThreshold(threshold, validationBase, productionBase float64) float64 {
	if validationBase == productionBase {
		return threshold
	}
	if !(threshold >= 0 && threshold <= 1) || !inside(validationBase) || !inside(productionBase) {
		return math.NaN()
	}
	if threshold == 0 || threshold == 1 {
		return threshold
	}
	odds := threshold / (1 - threshold) * (validationBase / (1 - validationBase)) / (productionBase / (1 - productionBase))
	return odds / (1 + odds)
}

func inside(p float64) bool { return p > 0 && p < 1 }

// NetBenefitThreshold returns the threshold probability at which net
// benefit weighs a wrong alert against a true case caught, the same for
// every cut: with costs, CostThreshold (Vickers and Elkin 2006 take the
// threshold probability as the reader's exchange rate between a miss and
// a wrong alert, which costs state outright); without costs, the base rate
// base, at which flagging every case and flagging none are worth the same
// (net benefit is then base*(recall - false positive rate), the base rate
// times Youden's J). fromCosts says which was used. The threshold is NaN
// where CostThreshold is, or when base is NaN.
func NetBenefitThreshold(c *projection.Costs, base float64) (threshold float64, fromCosts bool) {
	if c != nil {
		return CostThreshold(*c), true
	}
	return base, false
}

// NetBenefit returns the net benefit per case of flagging at point p in a
// population whose base rate is base, when the threshold probability is
// threshold (Vickers and Elkin 2006, "Decision curve analysis: a novel
// method for evaluating prediction models"):
//
//	recall*base - FPR*(1-base) * threshold/(1-threshold)
//
// which at base equal to the set's own base rate is TP/n - FP/n *
// threshold/(1-threshold). It is the true cases caught per case scored,
// less the wrong alerts weighed at the odds of the threshold. With the
// threshold from costs (NetBenefitThreshold), the cost per case is
// base*Miss - (Miss-Hit)*NetBenefit, so net benefit ranks cuts as the cost
// does. A class of zero share in base needs no rate of that class. NaN
// when a rate it needs is undefined, base is outside [0,1] or threshold is
// outside [0,1).
func NetBenefit(p curve.Point, base, threshold float64) float64 {
	if !(base >= 0 && base <= 1) || !(threshold >= 0 && threshold < 1) {
		return math.NaN()
	}
	caught, wrong := 0.0, 0.0
	if base > 0 {
		caught = p.Recall() * base
	}
	if base < 1 {
		wrong = p.FalsePositiveRate() * (1 - base)
	}
	return caught - wrong*threshold/(1-threshold)
}

// NetBenefitAll returns the net benefit of flagging every case at the
// threshold probability, the reference line of a decision curve:
// base - (1-base) * threshold/(1-threshold). NaN where NetBenefit is.
func NetBenefitAll(base, threshold float64) float64 {
	if !(base >= 0 && base <= 1) || !(threshold >= 0 && threshold < 1) {
		return math.NaN()
	}
	return base - (1-base)*threshold/(1-threshold)
}
