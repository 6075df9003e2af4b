// Package segment breaks the figures of one cut down by a group column
// (site, yard, product line), so that a cut that looks right overall can be
// seen to fail one group.
//
// Which cases a cut flags follows the cut rule in the doc of package
// scores. Counts are weighted sums (see the scores package doc on
// weights); Rows alone counts rows. Intervals are Wilson intervals (package
// interval) of the weighted counts read as frequency weights: recall's is
// TP out of TP+FN, precision's is TP out of TP+FP.
//
// Each group is tested against the rest of the set (every other group
// together), for recall and for the wrong-alert share: the gap between
// the group's figure and the rest's, with Newcombe's hybrid score interval
// of a difference of independent proportions (package interval,
// Difference) and the two-sided p-value that agrees with it. The p-values
// of every defined test of a breakdown (two per group) are adjusted
// together by Holm's step-down method (Holm 1979, "A simple sequentially
// rejective multiple test procedure", Scandinavian Journal of
// Statistics), which keeps the chance of any flag at all, when no group
// truly differs, at about 1 - confidence whatever the number of groups:
// Holm holds it at or below that level for exact tests, and these are
// large-sample ones (in seeded simulations at 95%, cases drawn at random,
// 4.8-5.4% with 5 to 50 groups; see test_sim_test.go). The tests read the
// cases as drawn at random: given a group's true cases its hits are
// binomial, and given its flagged cases its wrong alerts are. Where each
// group's class counts were fixed by design, the wrong-alert test is
// conservative (its share varies less than the binomial says) and any
// flag at all comes in about 3% at 95%. A group is flagged (Outlier) when
// either of its adjusted p-values is below 1 - confidence. The interval
// shown with a gap is at the breakdown's confidence, not adjusted: it
// leaves out 0 exactly when the unadjusted P is below 1 - confidence
// (DifferenceP inverts Difference), and the flag asks more, the adjusted
// p below it. Holm rather than Benjamini–Hochberg's false
// discovery rate: a flag sends someone to look at a group, and the promise
// the screen states is about any flag at all.
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

	// RecallTest and FalseDiscoveryTest set the group's recall and
	// wrong-alert share against the rest of the set's (see the package
	// doc). The overall figures' tests are undefined.
	RecallTest         Test
	FalseDiscoveryTest Test

	// Outlier reports whether the group differs from the rest of the set
	// in recall or in wrong-alert share: either test's Holm-adjusted
	// p-value is below 1 - confidence. A group whose tests are undefined
	// is never an outlier.
	Outlier bool
}

// Test is one figure of a group against the same figure of the rest of
// the set. Every field is NaN where the figure is undefined on either side
// (no true case, or nothing flagged, in the group or in the rest).
type Test struct {
	Rest      float64    // the rest of the set's figure
	Gap       float64    // the group's figure minus the rest's
	GapCI     [2]float64 // Newcombe's hybrid score interval of Gap at the breakdown's confidence
	P         float64    // two-sided p-value of no gap, agreeing with GapCI
	AdjustedP float64    // P adjusted by Holm over every defined test of the breakdown
}

// Defined reports whether the test could be made.
func (t Test) Defined() bool { return !math.IsNaN(t.P) }

// BaseRate returns the group's share of true cases (weighted), NaN for no
// cases: wrong-alert shares of groups with different base rates differ
// even where the model ranks as well in each.
func (f Figures) BaseRate() float64 { return ratio(f.Positives, f.Positives+f.Negatives) }

// LargestGap returns the larger of the group's gaps from the rest of the
// set in recall and in wrong-alert share, in absolute value, counting an
// undefined test as no gap.
func (f Figures) LargestGap() float64 {
	gap := 0.0
	for _, t := range []Test{f.RecallTest, f.FalseDiscoveryTest} {
		if d := math.Abs(t.Gap); !math.IsNaN(d) {
			gap = max(gap, d)
		}
	}
	return gap
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

	// Confidence is the level of the intervals; a group is flagged when
	// an adjusted p-value is below 1 - Confidence.
	Confidence float64
	// Tests is how many defined tests the Holm adjustment covered (two
	// per group at most).
	Tests int
}

// Order says how Sort arranges the groups.
type Order int

// The orders Sort knows.
const (
	BySize Order = iota // most rows first
	ByGap               // largest LargestGap first
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
	return breakdown(total, groups, set.SegmentNames(), confidence)
}

// breakdown makes the breakdown of the tallies: total over the whole set,
// groups by segment code (those without rows left out).
func breakdown(total tally, groups []tally, names []string, confidence float64) Breakdown {
	b := Breakdown{Overall: total.figures("", confidence), Confidence: confidence}
	b.Overall.RecallTest, b.Overall.FalseDiscoveryTest = undefinedTest(), undefinedTest()
	var ps []*Test
	for code, g := range groups {
		if g.rows == 0 {
			continue
		}
		f := g.figures(names[code], confidence)
		rest := total.minus(g)
		f.RecallTest = newTest(g.truePositive, g.positives, rest.truePositive, rest.positives, confidence)
		f.FalseDiscoveryTest = newTest(g.falsePositive, g.truePositive+g.falsePositive,
			rest.falsePositive, rest.truePositive+rest.falsePositive, confidence)
		b.Segments = append(b.Segments, f)
	}
	for i := range b.Segments {
		for _, t := range []*Test{&b.Segments[i].RecallTest, &b.Segments[i].FalseDiscoveryTest} {
			if t.Defined() {
				ps = append(ps, t)
			}
		}
	}
	holm(ps)
	b.Tests = len(ps)
	alpha := 1 - confidence
	for i := range b.Segments {
		f := &b.Segments[i]
		f.Outlier = f.RecallTest.AdjustedP < alpha || f.FalseDiscoveryTest.AdjustedP < alpha
	}
	return b
}

func undefinedTest() Test {
	nan := math.NaN()
	return Test{Rest: nan, Gap: nan, GapCI: [2]float64{nan, nan}, P: nan, AdjustedP: nan}
}

// newTest sets s1 of n1 (the group) against s2 of n2 (the rest).
func newTest(s1, n1, s2, n2, confidence float64) Test {
	if !(n1 > 0 && n2 > 0) {
		return undefinedTest()
	}
	t := Test{Rest: s2 / n2, Gap: s1/n1 - s2/n2, P: interval.DifferenceP(s1, n1, s2, n2)}
	t.GapCI[0], t.GapCI[1] = interval.Difference(s1, n1, s2, n2, confidence)
	t.AdjustedP = t.P
	return t
}

// holm replaces each test's AdjustedP by Holm's step-down adjustment over
// all of them: with the p-values in rising order p(1) <= ... <= p(m), the
// j-th adjusted value is the largest of min(1, (m-i+1)·p(i)) for i <= j.
func holm(tests []*Test) {
	slices.SortStableFunc(tests, func(a, b *Test) int { return cmp.Compare(a.P, b.P) })
	m := len(tests)
	running := 0.0
	for i, t := range tests {
		running = max(running, min(1, float64(m-i)*t.P))
		t.AdjustedP = running
	}
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
			if c := cmp.Compare(y.LargestGap(), x.LargestGap()); c != 0 {
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

// minus is the tally of the rest of the set when t is the whole of it and
// g one group. Weighted sums taken apart leave rounding residue: a rest
// within a billionth of the whole's weight of nothing counts as nothing.
func (t tally) minus(g tally) tally {
	nothing := 1e-9 * max(t.positives+t.negatives, 1)
	less := func(a, b float64) float64 {
		if d := a - b; d > nothing {
			return d
		}
		return 0
	}
	return tally{
		rows: t.rows - g.rows, cases: t.cases - g.cases,
		positives: less(t.positives, g.positives), negatives: less(t.negatives, g.negatives),
		truePositive: less(t.truePositive, g.truePositive), falsePositive: less(t.falsePositive, g.falsePositive),
	}
}

func ratio(num, den float64) float64 {
	if den == 0 {
		return math.NaN()
	}
	return num / den
}

// RestBaseRate returns the share of true cases (weighted) in the rest of
// the set beside group f, NaN when the rest has no cases: set beside
// f.BaseRate wherever a gap in wrong-alert share is shown.
func (b Breakdown) RestBaseRate(f Figures) float64 {
	return ratio(b.Overall.Positives-f.Positives, b.Overall.Positives+b.Overall.Negatives-f.Positives-f.Negatives)
}
