package report

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/evidence"
)

// Points streams a curve's points, strictest first, to visit. A nil Points
// means the report has no curve.
type Points func(visit func(curve.Point))

// WriteJSON writes r as one JSON object. When points is not nil the object
// gains a "curve" array, streamed so that a curve of millions of cuts is
// never held as JSON in memory.
func WriteJSON(w io.Writer, r *Report, points Points) error {
	head, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		return fmt.Errorf("report: %w", err)
	}
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

func formatJSONFloat(v float64) []byte {
	b, _ := json.Marshal(v)
	return b
}

// table is a grid of figures: one row per figure, one column per cut.
type table struct {
	header []string
	rows   [][]string
}

// figuresTable lays out the met and unmet cuts of r side by side.
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
				row = append(row, "unmet")
				continue
			}
			row = append(row, value(c, r.cutsEvidence[i]))
		}
		t.rows = append(t.rows, row)
	}
	add("cut (flag score "+r.comparison()+")", func(c cut, e evidence.Cut) string { return Score(e.Score) })
	add("cases flagged", func(c cut, e evidence.Cut) string { return Count(e.Flagged) + " (" + Percent(e.FlaggedShare) + ")" })
	add("hit share (recall)", func(c cut, e evidence.Cut) string { return Percent(e.Recall) })
	add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return Range(e.RecallCI) })
	add("  true cases caught", func(c cut, e evidence.Cut) string { return Count(e.TP) + " of " + Count(e.TP+e.FN) })
	add("wrong-alert share (FDR)", func(c cut, e evidence.Cut) string { return Percent(e.FalseDiscoveryRate) })
	add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return Range(e.FalseDiscoveryCI) })
	add("false positive rate", func(c cut, e evidence.Cut) string { return Percent(e.FalsePositiveRate) })
	if r.baseRateGiven {
		add("projected alert rate", func(c cut, e evidence.Cut) string { return Percent(e.Projected.AlertRate) })
		add("projected wrong-alert share", func(c cut, e evidence.Cut) string { return Percent(e.Projected.FalseDiscoveryRate()) })
	}
	if evidence.Defined(float64(r.Assumptions.Volume)) {
		add("queue per shift", func(c cut, e evidence.Cut) string { return Count(e.Projected.QueuePerShift) })
		if cap := float64(r.Assumptions.Capacity); evidence.Defined(cap) {
			add("  against capacity "+Count(cap), func(c cut, e evidence.Cut) string { return Against(e.Projected.QueuePerShift, cap) })
		}
		if evidence.Defined(float64(r.Assumptions.CostFalseAlert)) {
			add("cost per shift", func(c cut, e evidence.Cut) string { return Money(e.Projected.CostPerShift) })
		}
	}
	return t
}

func (r *Report) comparison() string {
	if r.LowerIsRiskier {
		return "<="
	}
	return ">="
}

// WriteText writes r as a readable report.
func WriteText(w io.Writer, r *Report) error {
	var b strings.Builder
	fmt.Fprintf(&b, "sill report: %s\n\n", r.Source)
	fmt.Fprintf(&b, "%s · %s true cases (base rate %s)", plural(r.Rows, "row", "rows"), Count(r.Positives), Percent(float64(r.BaseRate)))
	if r.Weighted {
		fmt.Fprintf(&b, " · weighted")
	}
	b.WriteString("\n")
	fmt.Fprintf(&b, "ROC AUC %s · average precision %s", Fixed(float64(r.ROCAUC), 3), Fixed(float64(r.AveragePrecision), 3))
	if evidence.Defined(float64(r.Brier)) {
		fmt.Fprintf(&b, " · Brier score %s · log loss %s", Fixed(float64(r.Brier), 4), Fixed(float64(r.LogLoss), 4))
	}
	b.WriteString("\n\n")
	b.WriteString("assumptions: " + r.assumptionLine() + "\n\n")
	writeGrid(&b, figuresTable(r))
	for _, c := range r.Cuts {
		if !c.Met {
			fmt.Fprintf(&b, "\n%s unmet: %s", c.Spec, *c.Reason)
		}
	}
	r.writeSections(&b)
	for _, warning := range r.Warnings {
		fmt.Fprintf(&b, "\nwarning: %s", warning)
	}
	fmt.Fprintf(&b, "\n\ncaution: %s\n", r.Caution)
	_, err := io.WriteString(w, b.String())
	return err
}

// WriteMarkdown writes r for pasting into a review document.
func WriteMarkdown(w io.Writer, r *Report) error {
	var b strings.Builder
	fmt.Fprintf(&b, "## Operating cuts: %s\n\n", mdEscape(r.Source))
	fmt.Fprintf(&b, "- %s, %s true cases (base rate %s)%s\n", plural(r.Rows, "row", "rows"), Count(r.Positives), Percent(float64(r.BaseRate)), map[bool]string{true: ", weighted", false: ""}[r.Weighted])
	fmt.Fprintf(&b, "- ROC AUC %s, average precision %s", Fixed(float64(r.ROCAUC), 3), Fixed(float64(r.AveragePrecision), 3))
	if evidence.Defined(float64(r.Brier)) {
		fmt.Fprintf(&b, ", Brier score %s, log loss %s", Fixed(float64(r.Brier), 4), Fixed(float64(r.LogLoss), 4))
	}
	fmt.Fprintf(&b, "\n- Assumptions: %s\n\n", r.assumptionLine())
	t := figuresTable(r)
	b.WriteString("| " + strings.Join(mdEscapeAll(t.header), " | ") + " |\n")
	b.WriteString("|" + strings.Repeat(" --- |", len(t.header)) + "\n")
	for _, row := range t.rows {
		row[0] = strings.TrimSpace(row[0])
		b.WriteString("| " + strings.Join(mdEscapeAll(row), " | ") + " |\n")
	}
	for _, c := range r.Cuts {
		if !c.Met {
			fmt.Fprintf(&b, "\n- `%s` unmet: %s", c.Spec, mdEscape(*c.Reason))
		}
	}
	r.writeSectionsMarkdown(&b)
	for _, warning := range r.Warnings {
		fmt.Fprintf(&b, "\n- **Warning:** %s", mdEscape(warning))
	}
	fmt.Fprintf(&b, "\n\n> **Caution.** %s\n", r.Caution)
	_, err := io.WriteString(w, b.String())
	return err
}

func (r *Report) assumptionLine() string {
	a := r.Assumptions
	parts := []string{"base rate " + Percent(float64(a.BaseRate))}
	if !r.baseRateGiven {
		parts[0] += " (the validation rate)"
	}
	if evidence.Defined(float64(a.Volume)) {
		parts = append(parts, Count(float64(a.Volume))+" cases per shift")
	}
	if evidence.Defined(float64(a.Capacity)) {
		parts = append(parts, "capacity "+Count(float64(a.Capacity))+" alerts per shift")
	}
	if evidence.Defined(float64(a.CostFalseAlert)) {
		parts = append(parts, fmt.Sprintf("costs: wrong alert %s, miss %s, hit %s", Money(float64(a.CostFalseAlert)), Money(float64(a.CostMiss)), Money(float64(a.CostHit))))
	}
	parts = append(parts, "intervals at "+strconv.FormatFloat(100*float64(a.Confidence), 'g', -1, 64)+"%")
	return strings.Join(parts, " · ")
}

// writeGrid writes t with columns padded to their widest cell.
func writeGrid(b *strings.Builder, t table) {
	widths := make([]int, len(t.header))
	measure := func(row []string) {
		for i, cell := range row {
			widths[i] = max(widths[i], len([]rune(cell)))
		}
	}
	measure(t.header)
	for _, row := range t.rows {
		measure(row)
	}
	line := func(row []string) {
		for i, cell := range row {
			pad := strings.Repeat(" ", widths[i]-len([]rune(cell)))
			if i == 0 {
				b.WriteString(cell + pad)
			} else {
				b.WriteString("  " + pad + cell)
			}
		}
		b.WriteString("\n")
	}
	line(t.header)
	for _, row := range t.rows {
		line(row)
	}
}

func mdEscape(s string) string {
	return strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`").Replace(s)
}

func mdEscapeAll(cells []string) []string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = mdEscape(c)
	}
	return out
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// Percent formats a share as a percentage with one decimal, "n/a" when
// undefined.
func Percent(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	return strconv.FormatFloat(100*v, 'f', 1, 64) + "%"
}

// Range formats an interval of shares as "a–b%".
func Range(ci [2]float64) string {
	if !evidence.Defined(ci[0]) || !evidence.Defined(ci[1]) {
		return "n/a"
	}
	return strconv.FormatFloat(100*ci[0], 'f', 1, 64) + "–" + strconv.FormatFloat(100*ci[1], 'f', 1, 64) + "%"
}

// Count formats a count: whole numbers plainly, weighted counts with up to
// two decimals.
func Count(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	if v == math.Trunc(v) && math.Abs(v) < 1e15 {
		return strconv.FormatFloat(v, 'f', 0, 64)
	}
	if math.Abs(v) >= 100 {
		return strconv.FormatFloat(v, 'f', 0, 64)
	}
	return strconv.FormatFloat(v, 'f', 2, 64)
}

// Money formats a cost with no decimals past the hundreds.
func Money(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	if math.Abs(v) >= 100 {
		return strconv.FormatFloat(v, 'f', 0, 64)
	}
	return strconv.FormatFloat(v, 'f', 2, 64)
}

// Fixed formats v with the given decimals, "n/a" when undefined.
func Fixed(v float64, decimals int) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	return strconv.FormatFloat(v, 'f', decimals, 64)
}

// Score formats a cut exactly, in the shortest form that reads back equal.
func Score(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// Against says how a queue stands against capacity, as "12 under" or
// "30 over".
func Against(queue, capacity float64) string {
	if !evidence.Defined(queue) {
		return "n/a"
	}
	switch d := queue - capacity; {
	case d > 0:
		return Count(math.Round(d)) + " over"
	case d < 0:
		return Count(math.Round(-d)) + " under"
	}
	return "at capacity"
}
