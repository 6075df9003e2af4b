// Package evidence gathers the figures that justify one cut: its
// validation counts and rates with their intervals, and its projected
// production figures. Reports, the explorer and decision files all show
// these same figures.
package evidence

import (
	"math"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/projection"
)

// Cut holds the figures of one cut. Rates that are undefined are NaN (see
// curve.Point); an interval of an undefined rate is [NaN, NaN].
//
// Intervals are at the assumptions' confidence level and follow how the
// set was drawn (Assumptions.Sample, package design). With frequency
// weights (or none) they are Wilson intervals of the weighted counts:
// recall's interval is TP out of TP+FN, precision's is TP out of TP+FP,
// the false positive rate's is FP out of FP+TN, the flagged share's TP+FP
// out of all. With sampling weights they are the design's intervals.
// Trials holds the effective number of trials each interval rests on.
// The false discovery rate's interval is the complement of precision's.
// These are measured figures; Projected and ProjectedCI are projected
// ones (see package projection).
type Cut struct {
	Score        float64
	Rows         int     // validation rows flagged
	Flagged      float64 // weighted TP+FP
	FlaggedShare float64
	TP, FP       float64
	FN, TN       float64

	Recall             float64
	RecallCI           [2]float64
	Precision          float64
	PrecisionCI        [2]float64
	FalseDiscoveryRate float64
	FalseDiscoveryCI   [2]float64
	FalsePositiveRate  float64
	FalsePositiveCI    [2]float64 // Wilson, of the false cases flagged among all false cases
	FlaggedShareCI     [2]float64

	// Trials are the effective numbers of trials behind the intervals:
	// the weighted counts for frequency weights, the design's effective
	// sample sizes for sampling weights.
	Trials Trials

	Projected projection.Figures
	// ProjectedCI are the intervals of Projected at the same confidence
	// (projection.IntervalsOf): production's base rate, volume and costs
	// taken as given, the validation counts as the effective counts.
	ProjectedCI projection.Intervals
}

// Of returns the figures of point p under assumptions a, whose Confidence
// must lie in (0,1).
func Of(p curve.Point, a projection.Assumptions) Cut {
	c := Cut{
		Score:              p.Score,
		Rows:               p.Cases,
		Flagged:            p.Flagged(),
		FlaggedShare:       p.FlaggedShare(),
		TP:                 p.TP,
		FP:                 p.FP,
		FN:                 p.FN,
		TN:                 p.TN,
		Recall:             p.Recall(),
		Precision:          p.Precision(),
		FalseDiscoveryRate: p.FalseDiscoveryRate(),
		FalsePositiveRate:  p.FalsePositiveRate(),
		Projected:          projection.Project(p, a),
	}
	s := a.Sample
	// The projected intervals read recall and the false positive rate at
	// the design's effective counts (the weighted counts for frequency
	// weights).
	var counts projection.Counts
	counts.TP, counts.FP, counts.FN, counts.TN = s.Effective(p)
	c.ProjectedCI = projection.IntervalsOf(counts, a)
	c.RecallCI, c.Trials.Recall = s.Interval(design.Recall, p, a.Confidence)
	c.PrecisionCI, c.Trials.Precision = s.Interval(design.Precision, p, a.Confidence)
	c.FalseDiscoveryCI = [2]float64{1 - c.PrecisionCI[1], 1 - c.PrecisionCI[0]}
	c.FalsePositiveCI, c.Trials.FalsePositiveRate = s.Interval(design.FalsePositiveRate, p, a.Confidence)
	c.FlaggedShareCI, c.Trials.FlaggedShare = s.Interval(design.FlaggedShare, p, a.Confidence)
	c.Trials.BaseRate = s.BaseRateTrials(p)
	return c
}

// Trials are the effective numbers of trials behind a cut's intervals
// (design.Sample.Interval), and behind the set's share of true cases.
type Trials struct {
	Recall, FalsePositiveRate, Precision, FlaggedShare float64
	BaseRate                                           float64
}

// FrequencyTrials returns the trials of frequency weights at p: the
// weighted counts of each figure's denominator, as a file that names no
// weight kind is read.
func FrequencyTrials(p curve.Point) Trials {
	return Trials{Recall: p.TP + p.FN, FalsePositiveRate: p.FP + p.TN, Precision: p.TP + p.FP,
		FlaggedShare: p.TP + p.FP + p.FN + p.TN, BaseRate: p.TP + p.FP + p.FN + p.TN}
}

// Defined reports whether v is a number rather than NaN or an infinity.
func Defined(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// ShortCaution is Caution in one line, for screens.
const ShortCaution = "a cut supports a decision: validate prospectively; follow local governance"

// Caution is the standing caution that every output carries.
const Caution = "sill supports a decision; it does not make one. A cut chosen on a validation set " +
	"must be validated prospectively before it is relied on, and where it affects people " +
	"(clinical triage, safety, credit) follow local governance and licensed practice."
