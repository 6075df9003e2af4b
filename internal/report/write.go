package report

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
)

// Points streams a curve's points, strictest first, to visit. A nil Points
// means the report has no curve.
type Points func(visit func(curve.Point))

// WriteJSON writes r as one JSON object. When points is not nil the object
// gains a "curve" array, streamed so that a curve of millions of cuts is
// never held as JSON in memory.
func WriteJSON(w io.Writer, r *Report, points Points) error {
	if r.Warnings == nil {
		r.Warnings = []string{} // a list for scripts, empty rather than null
	}
	head, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		return fmt.Errorf("report: %w", err)
	}
	head = format.JSON(head) // names and values from the data, safe on a terminal
	bw := bufio.NewWriterSize(w, 1<<16)
	if points == nil {
		bw.Write(head)
		bw.WriteString("\n")
		return bw.Flush()
	}
	bw.Write(head[:bytes.LastIndexByte(head, '}')])
	bw.WriteString(",\n  \"curve\": [")
	first := true
	var line []byte
	points(func(p curve.Point) {
		if !first {
			bw.WriteString(",")
		}
		first = false
		line, _ = json.Marshal(newPoint(p))
		bw.WriteString("\n    ")
		bw.Write(line)
	})
	bw.WriteString("\n  ]\n}\n")
	return bw.Flush()
}

// WriteCurveCSV writes the curve alone as CSV, strictest cut first.
// Undefined rates are empty cells.
func WriteCurveCSV(w io.Writer, points Points) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	bw.WriteString("score,flagged,tp,fp,fn,tn,recall,precision,false_positive_rate\n")
	var row []byte
	points(func(p curve.Point) {
		row = row[:0]
		for i, v := range []float64{p.Score, p.Flagged(), p.TP, p.FP, p.FN, p.TN, p.Recall(), p.Precision(), p.FalsePositiveRate()} {
			if i > 0 {
				row = append(row, ',')
			}
			if evidence.Defined(v) {
				row = strconv.AppendFloat(row, v, 'g', -1, 64)
			}
		}
		row = append(row, '\n')
		bw.Write(row)
	})
	return bw.Flush()
}

// CutsCSVHeader names the columns of WriteCutsCSV, in order. README
// explains each.
var CutsCSVHeader = []string{
	"spec", "met", "reason", "score", "flagged", "flagged_share", "tp", "fp", "fn", "tn",
	"recall", "recall_low", "recall_high",
	"precision", "precision_low", "precision_high",
	"false_discovery_rate", "false_discovery_rate_low", "false_discovery_rate_high",
	"false_positive_rate", "false_positive_rate_low", "false_positive_rate_high",
	"confidence",
	"projected_alert_rate", "projected_precision", "projected_false_discovery_rate",
	"queue_per_shift", "cost_per_shift", "cost_per_case",
	"projected_precision_low", "projected_precision_high",
	"projected_false_discovery_rate_low", "projected_false_discovery_rate_high",
	"projected_alert_rate_low", "projected_alert_rate_high",
	"queue_per_shift_low", "queue_per_shift_high",
	"cost_per_shift_low", "cost_per_shift_high",
	"cost_per_case_low", "cost_per_case_high",
	"recall_at_cut_p05", "recall_at_cut_p95", "false_discovery_rate_at_cut_p05", "false_discovery_rate_at_cut_p95",
}

// WriteCutsCSV writes the figures of r's cuts as CSV: a header row
// (CutsCSVHeader), then one row per cut in the report's order. Numbers are
// in their shortest exact form ('g' of strconv, shares as fractions, no
// thousands separators); an undefined figure, a projection without the
// assumption it needs and every figure of an unmet cut are empty cells.
// Intervals of measured figures are Wilson intervals at the confidence of
// the row; those of projected figures are projection.IntervalsOf's, with
// production's base rate and volume taken as given.
func WriteCutsCSV(w io.Writer, r *Report) error {
	cw := csv.NewWriter(w)
	cw.Write(CutsCSVHeader)
	conf := float64(r.Assumptions.Confidence)
	num := func(v float64) string {
		if !evidence.Defined(v) {
			return ""
		}
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	for i, c := range r.Cuts {
		if !c.Met {
			row := make([]string, len(CutsCSVHeader))
			row[0], row[1], row[2] = c.Spec, "false", *c.Reason
			cw.Write(row)
			continue
		}
		e := r.cutsEvidence[i]
		row := []string{c.Spec, "true", ""}
		for _, v := range []float64{e.Score, e.Flagged, e.FlaggedShare, e.TP, e.FP, e.FN, e.TN,
			e.Recall, e.RecallCI[0], e.RecallCI[1],
			e.Precision, e.PrecisionCI[0], e.PrecisionCI[1],
			e.FalseDiscoveryRate, e.FalseDiscoveryCI[0], e.FalseDiscoveryCI[1],
			e.FalsePositiveRate, e.FalsePositiveCI[0], e.FalsePositiveCI[1],
			conf,
			e.Projected.AlertRate, e.Projected.Precision, e.Projected.FalseDiscoveryRate(),
			e.Projected.QueuePerShift, e.Projected.CostPerShift, e.Projected.CostPerCase,
			e.ProjectedCI.Precision[0], e.ProjectedCI.Precision[1],
			e.ProjectedCI.FalseDiscovery()[0], e.ProjectedCI.FalseDiscovery()[1],
			e.ProjectedCI.AlertRate[0], e.ProjectedCI.AlertRate[1],
			e.ProjectedCI.QueuePerShift[0], e.ProjectedCI.QueuePerShift[1],
			e.ProjectedCI.CostPerShift[0], e.ProjectedCI.CostPerShift[1],
			e.ProjectedCI.CostPerCase[0], e.ProjectedCI.CostPerCase[1]} {
			row = append(row, num(v))
		}
		redraws := []number{null, null, null, null}
		if s := c.Stability; s != nil {
			redraws = []number{s.RecallAtCutP05, s.RecallAtCutP95, s.FalseDiscoveryRateAtCutP05, s.FalseDiscoveryRateAtCutP95}
		}
		for _, v := range redraws {
			row = append(row, num(float64(v)))
		}
		cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

func formatJSONFloat(v float64) []byte {
	b, _ := json.Marshal(v)
	return b
}

// table is a grid of figures: one row per figure, one column per cut.
type table struct {
	header []string
	rows   [][]string
	// wordsLast left-aligns the last column, which holds words rather
	// than figures (a note, a sentence in plain words).
	wordsLast bool
}

// figuresTable lays out the met and unmet cuts of r side by side: the
// measured figures under one heading row, the projected ones under
// another (format.MeasuredHeading, format.ProjectedHeading), each with
// its interval and, after a bootstrap, the measured shares' resampled
// range beside them.
func figuresTable(r *Report) table {
	t := table{header: []string{"figure"}}
	for _, c := range r.Cuts {
		t.header = append(t.header, c.Spec)
	}
	conf := strconv.FormatFloat(100*float64(r.Assumptions.Confidence), 'g', -1, 64) + "%"
	add := func(name string, value func(c cut, e evidence.Cut) string) {
		row := []string{name}
		for i, c := range r.Cuts {
			if !c.Met {
				// "unmet" once, at the top of the column; the reason
				// follows the table.
				if len(t.rows) == 0 {
					row = append(row, "unmet")
				} else {
					row = append(row, "–")
				}
				continue
			}
			row = append(row, value(c, r.cutsEvidence[i]))
		}
		t.rows = append(t.rows, row)
	}
	heading := func(name string) {
		t.rows = append(t.rows, append([]string{name}, make([]string, len(r.Cuts))...))
	}
	resampled := func(share func(s *stability) [2]float64) {
		if r.Bootstrap == nil {
			return
		}
		add("  "+redrawsLabel, func(c cut, e evidence.Cut) string {
			if c.Stability == nil {
				return format.NA
			}
			return format.Interval(share(c.Stability))
		})
	}
	add("cut (flag score "+r.comparison()+")", func(c cut, e evidence.Cut) string { return format.Score(e.Score) })
	heading(format.MeasuredHeading)
	add("cases flagged", func(c cut, e evidence.Cut) string {
		return format.Count(e.Flagged) + " (" + format.Share(e.FlaggedShare) + ")"
	})
	add("  "+conf+" interval of the share", func(c cut, e evidence.Cut) string { return format.Interval(e.FlaggedShareCI) })
	add("hit share (recall)", func(c cut, e evidence.Cut) string { return format.Share(e.Recall) })
	add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return format.Interval(e.RecallCI) })
	resampled(func(s *stability) [2]float64 { return [2]float64{float64(s.RecallAtCutP05), float64(s.RecallAtCutP95)} })
	add("  true cases found", func(c cut, e evidence.Cut) string { return format.Count(e.TP) + " of " + format.Count(e.TP+e.FN) })
	add("wrong-alert share (FDR)", func(c cut, e evidence.Cut) string { return format.Share(e.FalseDiscoveryRate) })
	add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return format.Interval(e.FalseDiscoveryCI) })
	resampled(func(s *stability) [2]float64 {
		return [2]float64{float64(s.FalseDiscoveryRateAtCutP05), float64(s.FalseDiscoveryRateAtCutP95)}
	})
	add("false positive rate", func(c cut, e evidence.Cut) string { return format.Share(e.FalsePositiveRate) })
	if !r.projects() {
		return t
	}
	heading(format.ProjectedHeading)
	if r.baseRateGiven {
		add("alert rate", func(c cut, e evidence.Cut) string { return format.Share(e.Projected.AlertRate) })
		add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return format.Interval(e.ProjectedCI.AlertRate) })
		add("wrong-alert share", func(c cut, e evidence.Cut) string { return format.Share(e.Projected.FalseDiscoveryRate()) })
		add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return format.Interval(e.ProjectedCI.FalseDiscovery()) })
	}
	if evidence.Defined(float64(r.Assumptions.Volume)) {
		add("queue per shift", func(c cut, e evidence.Cut) string { return format.Queue(e.Projected.QueuePerShift) })
		add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return format.QueueInterval(e.ProjectedCI.QueuePerShift) })
		if cap := float64(r.Assumptions.Capacity); evidence.Defined(cap) {
			add("  against capacity "+format.Given(cap), func(c cut, e evidence.Cut) string { return format.Against(e.Projected.QueuePerShift, cap) })
		}
		if evidence.Defined(float64(r.Assumptions.CostFalseAlert)) {
			add("cost per shift", func(c cut, e evidence.Cut) string { return format.Money(e.Projected.CostPerShift) })
			add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return format.MoneyInterval(e.ProjectedCI.CostPerShift) })
		}
	} else if evidence.Defined(float64(r.Assumptions.CostFalseAlert)) {
		add("cost per case", func(c cut, e evidence.Cut) string { return format.Money(e.Projected.CostPerCase) })
		add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return format.MoneyInterval(e.ProjectedCI.CostPerCase) })
	}
	return t
}

// basisLines say, one line per cut rule but score=, which figure the
// rule picks its cut on.
func (r *Report) basisLines() []string {
	var lines []string
	for _, c := range r.Cuts {
		if c.Basis == "" || strings.HasPrefix(c.Spec, "score=") {
			continue
		}
		line := c.Spec + " picks on " + c.Basis
		if c.Promise != "" {
			line += "; " + c.Promise
		}
		if c.optimism != "" {
			line += "; " + c.optimism
		}
		lines = append(lines, line)
	}
	return lines
}

// redrawsLabel names the bootstrap's resampled range of a measured share
// at the cut itself, in the figures table beside the share, as in every
// view.
const redrawsLabel = compare.RedrawsLabel

// projects reports whether the figures table has projected figures: a
// production base rate other than the validation one, a volume or costs.
func (r *Report) projects() bool {
	return r.baseRateGiven || evidence.Defined(float64(r.Assumptions.Volume)) || evidence.Defined(float64(r.Assumptions.CostFalseAlert))
}

// isHeading reports whether row is a heading row of the figures table:
// a name and no cells.
func isHeading(row []string) bool {
	for _, cell := range row[1:] {
		if cell != "" {
			return false
		}
	}
	return len(row) > 1
}

func (r *Report) comparison() string { return format.CutSign(r.LowerIsRiskier) }

// withInterval is a ranking figure with its interval in brackets, at the
// level the assumptions line states ("0.896 (0.881–0.912)"), or alone when
// the interval is undefined.
func (r *Report) withInterval(v number, ci *interval) string {
	ends := [2]float64{math.NaN(), math.NaN()}
	if ci != nil {
		ends = [2]float64{float64(ci[0]), float64(ci[1])}
	}
	return format.NumberWithInterval(float64(v), ends, 3)
}

// WriteText writes r as a readable report.
func WriteText(w io.Writer, r *Report) error {
	return WriteTextCurve(w, r, nil)
}

// WriteTextCurve is WriteText followed, when points is not nil, by a
// table of every cut under its own heading, before the caution.
func WriteTextCurve(w io.Writer, r *Report, points Points) error {
	var b strings.Builder
	fmt.Fprintf(&b, "sill report: %s\n\n", r.Source)
	fmt.Fprintf(&b, "%s · %s (base rate %s)", format.Plural(r.Rows, "row", "rows"), amount(r.Positives, "true case", "true cases"), format.Share(float64(r.BaseRate)))
	if r.Weighted {
		fmt.Fprintf(&b, " · %s", r.weights)
	}
	b.WriteString("\n")
	fmt.Fprintf(&b, "ROC AUC %s · average precision %s", r.withInterval(r.ROCAUC, r.ROCAUCCI), r.withInterval(r.AveragePrecision, r.AveragePrecisionCI))
	if evidence.Defined(float64(r.Brier)) {
		fmt.Fprintf(&b, " · Brier score %s · log loss %s", format.Number(float64(r.Brier), 4), format.Number(float64(r.LogLoss), 4))
	}
	b.WriteString("\n\n")
	b.WriteString("assumptions: " + r.assumptionLine() + "\n\n")
	writeGrid(&b, figuresTable(r))
	if r.projects() {
		b.WriteString(format.ProjectedGiven + "\n")
	}
	b.WriteString("\n")
	for _, line := range r.basisLines() {
		b.WriteString(line + "\n")
	}
	for _, c := range r.Cuts {
		if !c.Met {
			fmt.Fprintf(&b, "\n%s unmet: %s", c.Spec, *c.Reason)
		}
	}
	r.writeSections(&b)
	for _, warning := range r.Warnings {
		fmt.Fprintf(&b, "\nwarning: %s", warning)
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	bw.WriteString(format.PrintableText(singleBlankLines(strings.TrimRight(b.String(), "\n"))) + "\n") // names and values from the data are untrusted
	if points != nil {
		writeCurveText(bw, points, r.comparison())
	}
	// One blank line before the caution, whatever came last.
	bw.WriteString("\ncaution: " + r.Caution + "\n")
	return bw.Flush()
}

// WriteMarkdown writes r for pasting into a review document. When points
// is not nil, a table of every cut follows under its own heading, before
// the caution.
func WriteMarkdown(w io.Writer, r *Report, points Points) error {
	var b strings.Builder
	fmt.Fprintf(&b, "## Operating cuts: %s\n\n", format.Markdown(r.Source))
	fmt.Fprintf(&b, "- %s, %s (base rate %s)%s\n", format.Plural(r.Rows, "row", "rows"), amount(r.Positives, "true case", "true cases"), format.Share(float64(r.BaseRate)), map[bool]string{true: ", " + r.weights, false: ""}[r.Weighted])
	fmt.Fprintf(&b, "- ROC AUC %s, average precision %s", r.withInterval(r.ROCAUC, r.ROCAUCCI), r.withInterval(r.AveragePrecision, r.AveragePrecisionCI))
	if evidence.Defined(float64(r.Brier)) {
		fmt.Fprintf(&b, ", Brier score %s, log loss %s", format.Number(float64(r.Brier), 4), format.Number(float64(r.LogLoss), 4))
	}
	fmt.Fprintf(&b, "\n- Assumptions: %s\n\n", r.assumptionLine())
	t := figuresTable(r)
	b.WriteString("| " + strings.Join(format.MarkdownCells(t.header), " | ") + " |\n")
	b.WriteString("|" + strings.Repeat(" --- |", len(t.header)) + "\n")
	for _, row := range t.rows {
		if isHeading(row) {
			b.WriteString("| **" + format.Markdown(row[0]) + "** |" + strings.Repeat(" |", len(row)-1) + "\n")
			continue
		}
		// Markdown drops leading spaces: mark the sub-rows instead.
		if strings.HasPrefix(row[0], "  ") {
			row[0] = "↳ " + strings.TrimSpace(row[0])
		}
		b.WriteString("| " + strings.Join(format.MarkdownCells(row), " | ") + " |\n")
	}
	if r.projects() {
		b.WriteString("\n- " + format.Markdown(format.ProjectedGiven) + "\n")
	}
	for _, line := range r.basisLines() {
		b.WriteString("- " + format.Markdown(line) + "\n")
	}
	for _, c := range r.Cuts {
		if !c.Met {
			fmt.Fprintf(&b, "\n- `%s` unmet: %s", c.Spec, format.Markdown(*c.Reason))
		}
	}
	r.writeSectionsMarkdown(&b)
	for _, warning := range r.Warnings {
		fmt.Fprintf(&b, "\n- **Warning:** %s", format.Markdown(warning))
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	bw.WriteString(format.PrintableText(singleBlankLines(strings.TrimRight(b.String(), "\n"))) + "\n") // names and values from the data are untrusted
	if points != nil {
		writeCurveMarkdown(bw, points, r.comparison())
	}
	bw.WriteString("\n> **Caution.** " + r.Caution + "\n")
	return bw.Flush()
}

// writeCurveMarkdown writes every cut of points, strictest first, as a
// Markdown table under its own heading, in the figures' screen forms.
func writeCurveMarkdown(bw *bufio.Writer, points Points, comparison string) {
	bw.WriteString("\n### Every cut\n\n")
	bw.WriteString("| " + strings.Join(curveHeader(comparison), " | ") + " |\n")
	bw.WriteString("|" + strings.Repeat(" ---: |", len(curveHeader(comparison))) + "\n")
	points(func(p curve.Point) {
		bw.WriteString("| " + strings.Join(curveCells(p), " | ") + " |\n")
	})
}

// writeCurveText writes every cut of points, strictest first, as a text
// grid under its own heading, in the figures' screen forms. The columns
// are measured in a first pass over the points and the rows written in a
// second, so that a curve of millions of cuts is never held as text.
func writeCurveText(bw *bufio.Writer, points Points, comparison string) {
	header := curveHeader(comparison)
	widths := make([]int, len(header))
	for i, cell := range header {
		widths[i] = format.CellWidth(cell)
	}
	points(func(p curve.Point) {
		for i, cell := range curveCells(p) {
			widths[i] = max(widths[i], format.CellWidth(cell))
		}
	})
	bw.WriteString("\nevery cut, strictest first\n")
	bw.WriteString(format.GridRow(header, widths, false))
	points(func(p curve.Point) {
		bw.WriteString(format.GridRow(curveCells(p), widths, false))
	})
}

// curveHeader names the columns of the table of every cut.
func curveHeader(comparison string) []string {
	return []string{"cut (flag score " + comparison + ")", "cases flagged", "true cases found (tp)", "wrong alerts (fp)", "misses (fn)", "false cases left (tn)",
		"hit share (recall)", "wrong-alert share (FDR)", "false positive rate"}
}

// curveCells are one cut's cells in the table of every cut.
func curveCells(p curve.Point) []string {
	return []string{format.Score(p.Score), format.Count(p.Flagged()), format.Count(p.TP), format.Count(p.FP), format.Count(p.FN), format.Count(p.TN),
		format.Share(p.Recall()), format.Share(p.FalseDiscoveryRate()), format.Share(p.FalsePositiveRate())}
}

// singleBlankLines folds runs of blank lines into one, so that sections
// that each start with a blank line never leave two between them.
func singleBlankLines(text string) string {
	for strings.Contains(text, "\n\n\n") {
		text = strings.ReplaceAll(text, "\n\n\n", "\n\n")
	}
	return text
}

// undefinedBaseRate says why a set with every row weighing 0 has no base
// rate.
const undefinedBaseRate = "undefined (no weighted cases)"

func (r *Report) assumptionLine() string {
	a := r.Assumptions
	parts := []string{"base rate " + format.Share(float64(a.BaseRate))}
	switch {
	case r.baseRateUndefined:
		parts[0] = "base rate " + undefinedBaseRate
	case !r.baseRateGiven:
		parts[0] += " (the validation rate)"
	}
	if evidence.Defined(float64(a.Volume)) {
		parts = append(parts, format.Given(float64(a.Volume))+" "+noun(float64(a.Volume), "case", "cases")+" per shift")
	}
	if evidence.Defined(float64(a.Capacity)) {
		parts = append(parts, "capacity "+format.Given(float64(a.Capacity))+" "+noun(float64(a.Capacity), "alert", "alerts")+" per shift")
	}
	if evidence.Defined(float64(a.CostFalseAlert)) {
		parts = append(parts, fmt.Sprintf("costs: wrong alert %s, miss %s, hit %s", format.Money(float64(a.CostFalseAlert)), format.Money(float64(a.CostMiss)), format.Money(float64(a.CostHit))))
	}
	parts = append(parts, "intervals at "+strconv.FormatFloat(100*float64(a.Confidence), 'g', -1, 64)+"%")
	return strings.Join(parts, " · ")
}

// writeGrid writes t with columns padded to their widest cell.
func writeGrid(b *strings.Builder, t table) {
	b.WriteString(format.Grid(t.header, t.rows, t.wordsLast))
}

// amount writes a (possibly weighted) count with its noun: "1 true
// case", "4.50 true cases".
func amount(v float64, one, many string) string { return format.Count(v) + " " + noun(v, one, many) }

// noun is one when v is exactly 1, else many.
func noun(v float64, one, many string) string {
	if v == 1 {
		return one
	}
	return many
}
