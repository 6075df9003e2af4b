// Package segment breaks the figures of one cut down by a group column
// (site, yard, product line), so that a cut that looks right overall can be
// seen to fail one group.
//
// Which cases a cut flags follows the cut rule in the doc of package
// scores. Counts are weighted sums (see the scores package doc on
// weights); Rows alone counts rows. Intervals are Wilson intervals (package
// interval) of the weighted counts read as frequency weights: recall's is
// TP out of TP+FN, precision's is TP out of TP+FP.
package segment

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/scores"
)

// Figures are one group's figures at a cut. Rates that are undefined are
// NaN (recall without a true case, precision with nothing flagged), and so
// are both ends of their intervals.
type Figures struct {
	Segment   string
	Rows      int     // rows in the group, whatever their weight; cases for a counts table
	Positives float64 // weighted true cases in the group
	Negatives float64 // weighted false cases in the group

	Flagged      float64 // weighted TP+FP
	FlaggedShare float64 // Flagged over the group's weight
	TP, FP       float64

	Recall      float64
	RecallCI    [2]float64
	Precision   float64
	PrecisionCI [2]float64

	// Outlier reports whether the group's recall or precision interval
	// lies wholly outside the overall figure's interval (no overlap at
	// all). A group whose interval is undefined is never an outlier.
	Outlier bool
}

// FalseDiscoveryRate returns the group's wrong-alert share, 1 - Precision
// (NaN where precision is undefined).
func (f Figures) FalseDiscoveryRate() float64 { return 1 - f.Precision }

// FalseDiscoveryCI returns the interval of FalseDiscoveryRate: the
// complement of PrecisionCI, as package evidence gives it for a cut.
func (f Figures) FalseDiscoveryCI() [2]float64 {
	return [2]float64{1 - f.PrecisionCI[1], 1 - f.PrecisionCI[0]}
}

// Gap returns the larger of the group's distances from the overall recall
// and precision, counting an undefined figure as no distance.
func (f Figures) Gap(overall Figures) float64 {
	gap := 0.0
	if d := math.Abs(f.Recall - overall.Recall); !math.IsNaN(d) {
		gap = max(gap, d)
	}
	if d := math.Abs(f.Precision - overall.Precision); !math.IsNaN(d) {
		gap = max(gap, d)
	}
	return gap
}

// Breakdown is every group's figures at one cut, beside the overall ones.
type Breakdown struct {
	Overall  Figures // Segment is ""
	Segments []Figures
}

// Order says how Sort arranges the groups.
type Order int

// The orders Sort knows.
const (
	BySize Order = iota // most rows first
	ByGap               // largest Gap first
	ByName              // by name, byte-wise
)

// ParseOrder reads "size", "gap" or "name".
func ParseOrder(text string) (Order, error) {
	switch text {
	case "size":
		return BySize, nil
	case "gap":
		return ByGap, nil
	case "name":
		return ByName, nil
	}
	return 0, fmt.Errorf("%w %q, expected size, gap or name", ErrOrder, text)
}

// ErrOrder marks an unknown sort order.
var ErrOrder = errors.New("unknown segment order")

// At returns the breakdown of set at point p, a point of set's curve: the
// first p.Rows ranked rows are the flagged ones. confidence is the level of
// the intervals, in (0,1). Groups come in the order of set.SegmentNames
// (the order first read); groups with no rows are left out. A set without
// a segment column gives a breakdown with no groups; an empty set gives
// one whose figures are zeros and NaNs. It panics when p.Rows is outside
// [0, set.Len()].
func At(set *scores.Set, p curve.Point, confidence float64) Breakdown {
	if p.Rows < 0 || p.Rows > set.Len() {
		panic(fmt.Sprintf("segment: point flags %d rows of a set of %d", p.Rows, set.Len()))
	}
	var b Breakdown
	total := tally{}
	var groups []tally
	if set.SegmentOf() != nil {
		groups = make([]tally, len(set.SegmentNames()))
	}
	for i := range set.Len() {
		w := set.Weight(i)
		flagged := i < p.Rows
		total.add(set.Labels()[i], flagged, w, set.CasesAt(i))
		if groups != nil {
			groups[set.SegmentOf()[i]].add(set.Labels()[i], flagged, w, set.CasesAt(i))
		}
	}
	b.Overall = total.figures("", confidence)
	for code, g := range groups {
		if g.rows == 0 {
			continue
		}
		f := g.figures(set.SegmentNames()[code], confidence)
		f.Outlier = apart(f.RecallCI, b.Overall.RecallCI) || apart(f.PrecisionCI, b.Overall.PrecisionCI)
		b.Segments = append(b.Segments, f)
	}
	return b
}

// Sort arranges the groups of b in the given order; ties in size or gap
// fall back to the name.
func (b *Breakdown) Sort(order Order) {
	slices.SortStableFunc(b.Segments, func(x, y Figures) int {
		switch order {
		case BySize:
			if c := cmp.Compare(y.Rows, x.Rows); c != 0 {
				return c
			}
		case ByGap:
			if c := cmp.Compare(y.Gap(b.Overall), x.Gap(b.Overall)); c != 0 {
				return c
			}
		}
		return cmp.Compare(x.Segment, y.Segment)
	})
}

// Outliers returns how many groups are flagged as outliers.
func (b Breakdown) Outliers() int {
	n := 0
	for _, f := range b.Segments {
		if f.Outlier {
			n++
		}
	}
	return n
}

type tally struct {
	rows                        int // table rows, to skip empty segments
	cases                       int // the cases they stand for (scores.Set.CasesAt)
	positives, negatives        float64
	truePositive, falsePositive float64
}

func (t *tally) add(positive, flagged bool, w float64, cases int) {
	t.rows++
	t.cases += cases
	switch {
	case positive && flagged:
		t.positives += w
		t.truePositive += w
	case positive:
		t.positives += w
	case flagged:
		t.negatives += w
		t.falsePositive += w
	default:
		t.negatives += w
	}
}

func (t tally) figures(name string, confidence float64) Figures {
	f := Figures{
		Segment:      name,
		Rows:         t.cases,
		Positives:    t.positives,
		Negatives:    t.negatives,
		TP:           t.truePositive,
		FP:           t.falsePositive,
		Flagged:      t.truePositive + t.falsePositive,
		FlaggedShare: ratio(t.truePositive+t.falsePositive, t.positives+t.negatives),
		Recall:       ratio(t.truePositive, t.positives),
		Precision:    ratio(t.truePositive, t.truePositive+t.falsePositive),
	}
	f.RecallCI[0], f.RecallCI[1] = interval.Wilson(t.truePositive, t.positives, confidence)
	f.PrecisionCI[0], f.PrecisionCI[1] = interval.Wilson(t.truePositive, t.truePositive+t.falsePositive, confidence)
	return f
}

// apart reports whether two intervals are both defined and do not overlap.
func apart(a, b [2]float64) bool {
	for _, v := range []float64{a[0], a[1], b[0], b[1]} {
		if math.IsNaN(v) {
			return false
		}
	}
	return a[1] < b[0] || a[0] > b[1]
}

func ratio(num, den float64) float64 {
	if den == 0 {
		return math.NaN()
	}
	return num / den
}
