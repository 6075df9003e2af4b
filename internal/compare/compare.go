// Package compare lays out candidate cuts side by side: one column per
// candidate, one row per figure, each figure with its difference from a
// reference candidate. It builds the cells of the explorer's comparison
// strip and of the review screen; it does no rendering of its own.
//
// The figures are those of package evidence, in this order: the cut score;
// under a heading row naming them measured on the validation set, cases
// flagged, hit share (recall) with its interval and "x of y" true cases
// found, wrong-alert share (false discovery rate) with its interval, false
// positive rate; under a heading row naming them projected to production,
// the alert rate, the wrong-alert share (only when the production base
// rate differs from the validation one), queue per shift and its standing
// against capacity (when a volume, and a capacity, are given) and cost per
// shift (when a volume and costs are given), each with its interval. Which cases a cut flags follows the cut rule in the doc of
// package scores.
package compare

import (
	"fmt"
	"math"
	"strconv"

	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
)

// Column is one candidate: a name, the cut spec it came from ("" for a cut
// picked by hand) and the figures of its cut.
type Column struct {
	Name string
	Rule string
	Cut  evidence.Cut
	// Capacity is the capacity this column's queue is held against when
	// Options.OwnCapacity is set (0: none given); otherwise unused.
	Capacity float64
	// RuleNow, when not nil, says whether Rule still picks this cut under
	// the assumptions: a candidate pinned under earlier assumptions may
	// no longer be what its rule picks. nil: not checked (a cut picked by
	// hand, a file written before the check).
	RuleNow *RuleNow
	// RecallRedraws, when not nil, is the range (5th to 95th percentile)
	// of the column's measured hit share across the bootstrap's
	// resampled sets at the column's cut (RedrawsLabel): shown beside the
	// hit share it belongs to. nil: not resampled, or not known at the
	// cut.
	RecallRedraws *[2]float64
	// RecallLands, when not nil and RecallRedraws is nil, is the hit
	// share where the column's rule lands in the resampled sets (a
	// decision file written before it recorded the range at the cut),
	// shown under its own label (LandsLabel).
	RecallLands *[2]float64
	// WrongRedraws, when not nil, is the range of the column's measured
	// wrong-alert share across the resampled sets at the column's cut
	// (RedrawsLabel), shown beside the wrong-alert share. nil: not
	// resampled, or not known at the cut.
	WrongRedraws *[2]float64
	// CorrectedCostPerShift, when not nil, is the column's projected cost
	// per shift corrected for the least-cost figure's optimism (the cost
	// rule picks the cut on the cases its cost is counted on, so that cost
	// is too low; analysis.CostOptimism): shown under the cost per shift
	// with its difference from it. nil: no such estimate.
	CorrectedCostPerShift *float64
}

// CorrectedRow is the label of the detail row of the least-cost cut's
// cost per shift corrected for its optimism.
const CorrectedRow = "  out of sample (est.)"

// RuleNow is whether a column's rule picks its cut under the assumptions.
type RuleNow struct {
	Holds bool
	// Picks is the score of the cut the rule picks now; NaN when no cut
	// meets it.
	Picks float64
}

// Earlier is the mark after the rule of a candidate whose rule no longer
// picks its cut: it was pinned under earlier assumptions.
const Earlier = " (earlier)"

// RuleNowRow is the label of the detail row that says what each rule
// picks under the assumptions, shown when a rule no longer picks its cut.
const RuleNowRow = "  its rule now"

// Better says which direction of a figure is the better one, so that a
// renderer can mark a difference as a gain or a loss.
type Better int

// The directions of Better.
const (
	Neither Better = iota // a trade-off, not a gain or a loss (e.g. cases flagged)
	Higher                // more is better (hit share)
	Lower                 // less is better (wrong-alert share, cost)
)

// Row is one figure across every column. Cells and Values hold one entry
// per column; Diffs and Deltas hold the difference of each column from the
// reference column (column minus reference), of the figures as the cells
// show them (see package format), so that a difference always agrees with
// the two cells beside it. The reference column's Diff is "" and its Delta
// is 0; a difference involving an undefined figure is "n/a" and NaN. Detail rows (an interval, a count of true cases found)
// carry no differences: their Diffs are all "" and Deltas NaN.
type Row struct {
	Figure string // the label, e.g. "hit share (recall)"
	Detail bool   // a sub-row of the figure above it
	// Heading marks a row that names the kind of the figures below it
	// (format.MeasuredHeading, format.ProjectedHeading) and holds no
	// figure: its cells are "", and it counts as a Detail, so that a
	// renderer that draws it as a detail row draws no difference.
	Heading bool
	Better  Better

	Cells  []string
	Values []float64 // NaN where the figure is undefined or not a number
	Diffs  []string
	Deltas []float64
}

// Table is the comparison of a list of candidates.
type Table struct {
	Names     []string // column headings, the candidate names
	Rules     []string // each candidate's rule, "" when picked by hand
	Reference int      // index of the reference column
	Rows      []Row
}

// Options say which figures apply. The assumptions decide the projected
// rows; BaseRateChanged adds the projected wrong-alert share;
// LowerIsRiskier only changes the label of the cut row.
type Options struct {
	Assumptions     projection.Assumptions
	BaseRateChanged bool
	LowerIsRiskier  bool
	// OwnCapacity holds each column's queue against its own
	// Column.Capacity instead of the assumptions' capacity, for columns
	// projected under assumptions of their own (two decision files).
	OwnCapacity bool
}

// New returns the comparison of columns against columns[reference]. With no
// columns it returns a Table with no names and no rows, whatever the
// reference. It panics when reference is outside [0, len(columns)) for a
// non-empty list. Undefined figures (see evidence.Cut) read "n/a".
func New(columns []Column, reference int, opt Options) Table {
	if len(columns) == 0 {
		return Table{}
	}
	if reference < 0 || reference >= len(columns) {
		panic(fmt.Sprintf("compare: reference %d outside the %d columns", reference, len(columns)))
	}
	t := Table{Reference: reference}
	moved := false
	for _, c := range columns {
		t.Names = append(t.Names, c.Name)
		rule := c.Rule
		if c.RuleNow != nil && !c.RuleNow.Holds && rule != "" {
			rule += Earlier
			moved = true
		}
		t.Rules = append(t.Rules, rule)
	}
	a := opt.Assumptions
	conf := strconv.FormatFloat(100*a.Confidence, 'g', -1, 64) + "% interval"
	comparison := format.CutSign(opt.LowerIsRiskier)

	// main adds a figure with differences; value gives the number and
	// cell formats it, diff formats a difference.
	main := func(figure string, better Better, value func(evidence.Cut) float64, cell func(float64) string, diff func(v, ref float64) format.Difference) {
		row := Row{Figure: figure, Better: better}
		ref := value(columns[reference].Cut)
		for i, c := range columns {
			v := value(c.Cut)
			row.Values = append(row.Values, v)
			row.Cells = append(row.Cells, cell(v))
			switch {
			case i == reference:
				row.Diffs = append(row.Diffs, "")
				row.Deltas = append(row.Deltas, 0)
			case !evidence.Defined(v) || !evidence.Defined(ref):
				row.Diffs = append(row.Diffs, "n/a")
				row.Deltas = append(row.Deltas, math.NaN())
			default:
				d := diff(v, ref)
				row.Diffs = append(row.Diffs, d.Text)
				row.Deltas = append(row.Deltas, d.Value)
			}
		}
		t.Rows = append(t.Rows, row)
	}
	// detail adds a sub-row without differences.
	detail := func(figure string, cell func(evidence.Cut) string) {
		row := Row{Figure: figure, Detail: true}
		for _, c := range columns {
			row.Cells = append(row.Cells, cell(c.Cut))
			row.Values = append(row.Values, math.NaN())
			row.Diffs = append(row.Diffs, "")
			row.Deltas = append(row.Deltas, math.NaN())
		}
		t.Rows = append(t.Rows, row)
	}

	// heading adds the row that names the kind of the figures below it.
	heading := func(name string) {
		row := Row{Figure: name, Detail: true, Heading: true}
		for range columns {
			row.Cells = append(row.Cells, "")
			row.Values = append(row.Values, math.NaN())
			row.Diffs = append(row.Diffs, "")
			row.Deltas = append(row.Deltas, math.NaN())
		}
		t.Rows = append(t.Rows, row)
	}

	main("cut (flag score "+comparison+")", Neither, func(c evidence.Cut) float64 { return c.Score }, format.Score, format.ScoreDiff)
	if moved {
		ruleNow(&t, columns)
	}
	heading(format.MeasuredHeading)
	main("cases flagged", Neither, func(c evidence.Cut) float64 { return c.Flagged }, format.Count, format.CountDiff)
	detail("  share of all cases", func(c evidence.Cut) string { return format.Share(c.FlaggedShare) })
	main("hit share (recall)", Higher, func(c evidence.Cut) float64 { return c.Recall }, format.Share, format.ShareDiff)
	detail("  "+conf, func(c evidence.Cut) string { return format.Interval(c.RecallCI) })
	redraws(&t, columns)
	detail("  true cases found", func(c evidence.Cut) string { return format.Count(c.TP) + " of " + format.Count(c.TP+c.FN) })
	main("wrong-alert share (FDR)", Lower, func(c evidence.Cut) float64 { return c.FalseDiscoveryRate }, format.Share, format.ShareDiff)
	detail("  "+conf, func(c evidence.Cut) string { return format.Interval(c.FalseDiscoveryCI) })
	rangeRow(&t, columns, RedrawsLabel, func(c Column) *[2]float64 { return c.WrongRedraws })
	main("false positive rate", Lower, func(c evidence.Cut) float64 { return c.FalsePositiveRate }, format.Share, format.ShareDiff)
	heading(format.ProjectedHeading)
	main("alert rate", Neither, func(c evidence.Cut) float64 { return c.Projected.AlertRate }, format.Share, format.ShareDiff)
	detail("  "+conf, func(c evidence.Cut) string { return format.Interval(c.ProjectedCI.AlertRate) })
	if opt.BaseRateChanged {
		main("wrong-alert share", Lower, func(c evidence.Cut) float64 { return c.Projected.FalseDiscoveryRate() }, format.Share, format.ShareDiff)
		detail("  "+conf, func(c evidence.Cut) string { return format.Interval(c.ProjectedCI.FalseDiscovery()) })
	}
	if a.Volume > 0 {
		main("queue per shift", Neither, func(c evidence.Cut) float64 { return c.Projected.QueuePerShift }, format.Queue, format.QueueDiff)
		detail("  "+conf, func(c evidence.Cut) string { return format.QueueInterval(c.ProjectedCI.QueuePerShift) })
		switch {
		case opt.OwnCapacity:
			ownCapacity(&t, columns)
		case a.Capacity > 0:
			detail("  against capacity "+format.Count(a.Capacity), func(c evidence.Cut) string {
				return format.Against(c.Projected.QueuePerShift, a.Capacity)
			})
		}
		if a.Costs != nil {
			main("cost per shift", Lower, func(c evidence.Cut) float64 { return c.Projected.CostPerShift }, format.Money, format.MoneyDiff)
			detail("  "+conf, func(c evidence.Cut) string { return format.MoneyInterval(c.ProjectedCI.CostPerShift) })
			corrected(&t, columns)
		}
	}
	return t
}

// RedrawsLabel names the bootstrap's range of a measured share at the
// cut itself (held fixed in every resampled set), the row under the share
// it belongs to, in every view.
const RedrawsLabel = "redraws at this cut 5–95%"

// LandsWords names a range where the rule lands: the rule re-applied to
// each resampled set, its cut moving with it, which says how stable the
// rule is, not how precise the share at this cut is.
const LandsWords = "where the rule lands 5–95%"

// LandsLabel names the row of the hit share where the rule lands, shown
// under the hit share only when the range at the cut is not known.
const LandsLabel = "hit share " + LandsWords

// LandsNote explains the two ranges, for the stability section.
const LandsNote = "where the rule lands: the rule applied again to each resampled set, the cut moving with it (a rule that fixes the hit share, hit=R, keeps it near R by construction); the redraws at this cut, under each measured share in the figures, hold the cut fixed"

// redraws adds the detail row of each column's recall range at its cut
// across the resampled sets ("n/a" for a column not resampled), and for
// columns that know only where their rule lands, a row of that under its
// own label; no row when no column has one.
func redraws(t *Table, columns []Column) {
	rangeRow(t, columns, RedrawsLabel, func(c Column) *[2]float64 { return c.RecallRedraws })
	rangeRow(t, columns, LandsLabel, func(c Column) *[2]float64 {
		if c.RecallRedraws != nil {
			return nil
		}
		return c.RecallLands
	})
}

// rangeRow adds the detail row label of each column's range of ("n/a"
// when nil); no row when every column's is nil.
func rangeRow(t *Table, columns []Column, label string, of func(Column) *[2]float64) {
	detailRow(t, columns, "  "+label, func(c Column) (string, bool) {
		if r := of(c); r != nil {
			return format.Interval(*r), true
		}
		return format.NA, false
	})
}

// detailRow adds a detail row named figure whose cells cell gives, with
// whether the column has a value; no row when no column has one.
func detailRow(t *Table, columns []Column, figure string, cell func(Column) (string, bool)) {
	row := Row{Figure: figure, Detail: true}
	any := false
	for _, c := range columns {
		text, has := cell(c)
		any = any || has
		row.Cells = append(row.Cells, text)
		row.Values = append(row.Values, math.NaN())
		row.Diffs = append(row.Diffs, "")
		row.Deltas = append(row.Deltas, math.NaN())
	}
	if any {
		t.Rows = append(t.Rows, row)
	}
}

// corrected adds the detail row of each column's cost per shift
// corrected for its optimism, with how much more it is ("55970 (+2600)");
// "" for a column without one, and no row when no column has one.
func corrected(t *Table, columns []Column) {
	detailRow(t, columns, CorrectedRow, func(c Column) (string, bool) {
		v := c.CorrectedCostPerShift
		if v == nil {
			return "", false
		}
		return format.Money(*v) + " (" + format.MoneyDiff(*v, c.Cut.Projected.CostPerShift).Text + ")", true
	})
}

// ownCapacity adds the detail row of each column's queue against its own
// capacity: labelled with the capacity when all columns share it, else
// "against its own capacity" with each cell naming its capacity ("3.4
// under 120", "no capacity given"). No row when no column has a capacity.
func ownCapacity(t *Table, columns []Column) {
	same, any := true, false
	for _, c := range columns {
		same = same && c.Capacity == columns[0].Capacity
		any = any || c.Capacity > 0
	}
	if !any {
		return
	}
	row := Row{Figure: "  against its own capacity", Detail: true}
	if same {
		row.Figure = "  against capacity " + format.Count(columns[0].Capacity)
	}
	for _, c := range columns {
		cell := "no capacity given"
		if c.Capacity > 0 {
			cell = format.Against(c.Cut.Projected.QueuePerShift, c.Capacity)
			if !same {
				cell += " " + format.Count(c.Capacity)
			}
		}
		row.Cells = append(row.Cells, cell)
		row.Values = append(row.Values, math.NaN())
		row.Diffs = append(row.Diffs, "")
		row.Deltas = append(row.Deltas, math.NaN())
	}
	t.Rows = append(t.Rows, row)
}

// ruleNow adds the detail row of what each column's rule picks under the
// assumptions: "holds" where it still picks the column's cut, "picks S"
// where it picks another, "meets no cut" where none meets it, and nothing
// for a cut picked by hand or not checked.
func ruleNow(t *Table, columns []Column) {
	row := Row{Figure: RuleNowRow, Detail: true}
	for _, c := range columns {
		cell := ""
		switch k := c.RuleNow; {
		case k == nil || c.Rule == "":
		case k.Holds:
			cell = "holds"
		case evidence.Defined(k.Picks):
			cell = "picks " + format.Score(k.Picks)
		default:
			cell = "meets no cut"
		}
		row.Cells = append(row.Cells, cell)
		row.Values = append(row.Values, math.NaN())
		row.Diffs = append(row.Diffs, "")
		row.Deltas = append(row.Deltas, math.NaN())
	}
	t.Rows = append(t.Rows, row)
}
