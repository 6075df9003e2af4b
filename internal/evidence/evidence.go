// Package evidence gathers the figures that justify one cut: its
// validation counts and rates with their intervals, and its projected
// production figures. Reports, the explorer and decision files all show
// these same figures.
package evidence

import (
	"math"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/projection"
)

// Cut holds the figures of one cut. Rates that are undefined are NaN (see
// curve.Point); an interval of an undefined rate is [NaN, NaN].
//
// Intervals are Wilson intervals at the assumptions' confidence level. The
// effective counts are the weighted counts read as frequency weights:
// recall's interval is TP out of TP+FN, precision's is TP out of TP+FP,
// the false positive rate's is FP out of FP+TN.
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
		ProjectedCI:        projection.IntervalsOf(projection.Counts{TP: p.TP, FP: p.FP, FN: p.FN, TN: p.TN}, a),
	}
	c.RecallCI[0], c.RecallCI[1] = interval.Wilson(p.TP, p.TP+p.FN, a.Confidence)
	c.PrecisionCI[0], c.PrecisionCI[1] = interval.Wilson(p.TP, p.TP+p.FP, a.Confidence)
	c.FalseDiscoveryCI = [2]float64{1 - c.PrecisionCI[1], 1 - c.PrecisionCI[0]}
	c.FalsePositiveCI[0], c.FalsePositiveCI[1] = interval.Wilson(p.FP, p.FP+p.TN, a.Confidence)
	return c
}

// Defined reports whether v is a number rather than NaN or an infinity.
func Defined(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// ShortCaution is Caution in one line, for screens.
const ShortCaution = "a cut supports a decision: validate prospectively; follow local governance"

// Caution is the standing caution that every output carries.
const Caution = "sill supports a decision; it does not make one. A cut chosen on a validation set " +
	"must be validated prospectively before it is relied on, and where it affects people " +
	"(clinical triage, safety, credit) follow local governance and licensed practice."
