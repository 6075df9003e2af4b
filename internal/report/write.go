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
	if r.Warnings == nil {
		r.Warnings = []string{} // a list for scripts, empty rather than null
	}
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
	// wordsLast left-aligns the last column, which holds words rather
	// than figures (a note, a sentence in plain words).
	wordsLast bool
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
	add("cut (flag score "+r.comparison()+")", func(c cut, e evidence.Cut) string { return Score(e.Score) })
	add("cases flagged", func(c cut, e evidence.Cut) string { return Count(e.Flagged) + " (" + Percent(e.FlaggedShare) + ")" })
	add("hit share (recall)", func(c cut, e evidence.Cut) string { return Percent(e.Recall) })
	add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return Range(e.RecallCI) })
	add("  true cases found", func(c cut, e evidence.Cut) string { return Count(e.TP) + " of " + Count(e.TP+e.FN) })
	add("wrong-alert share (FDR)", func(c cut, e evidence.Cut) string { return Percent(e.FalseDiscoveryRate) })
	add("  "+conf+" interval", func(c cut, e evidence.Cut) string { return Range(e.FalseDiscoveryCI) })
	add("false positive rate", func(c cut, e evidence.Cut) string { return Percent(e.FalsePositiveRate) })
	if r.baseRateGiven {
		add("projected alert rate", func(c cut, e evidence.Cut) string { return Percent(e.Projected.AlertRate) })
		add("projected wrong-alert share", func(c cut, e evidence.Cut) string { return Percent(e.Projected.FalseDiscoveryRate()) })
	}
	if evidence.Defined(float64(r.Assumptions.Volume)) {
		add("queue per shift", func(c cut, e evidence.Cut) string { return Queue(e.Projected.QueuePerShift) })
		if cap := float64(r.Assumptions.Capacity); evidence.Defined(cap) {
			add("  against capacity "+asGiven(cap), func(c cut, e evidence.Cut) string { return Against(e.Projected.QueuePerShift, cap) })
		}
		if evidence.Defined(float64(r.Assumptions.CostFalseAlert)) {
			add("cost per shift", func(c cut, e evidence.Cut) string { return Money(e.Projected.CostPerShift) })
		}
	} else if evidence.Defined(float64(r.Assumptions.CostFalseAlert)) {
		add("cost per case", func(c cut, e evidence.Cut) string { return Money(e.Projected.CostPerCase) })
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
	fmt.Fprintf(&b, "%s · %s (base rate %s)", plural(r.Rows, "row", "rows"), amount(r.Positives, "true case", "true cases"), Percent(float64(r.BaseRate)))
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
	// One blank line before the caution, whatever came last.
	text := singleBlankLines(strings.TrimRight(b.String(), "\n")) + "\n\ncaution: " + r.Caution + "\n"
	_, err := io.WriteString(w, text)
	return err
}

// WriteMarkdown writes r for pasting into a review document.
func WriteMarkdown(w io.Writer, r *Report) error {
	var b strings.Builder
	fmt.Fprintf(&b, "## Operating cuts: %s\n\n", MarkdownEscape(r.Source))
	fmt.Fprintf(&b, "- %s, %s (base rate %s)%s\n", plural(r.Rows, "row", "rows"), amount(r.Positives, "true case", "true cases"), Percent(float64(r.BaseRate)), map[bool]string{true: ", weighted", false: ""}[r.Weighted])
	fmt.Fprintf(&b, "- ROC AUC %s, average precision %s", Fixed(float64(r.ROCAUC), 3), Fixed(float64(r.AveragePrecision), 3))
	if evidence.Defined(float64(r.Brier)) {
		fmt.Fprintf(&b, ", Brier score %s, log loss %s", Fixed(float64(r.Brier), 4), Fixed(float64(r.LogLoss), 4))
	}
	fmt.Fprintf(&b, "\n- Assumptions: %s\n\n", r.assumptionLine())
	t := figuresTable(r)
	b.WriteString("| " + strings.Join(mdEscapeAll(t.header), " | ") + " |\n")
	b.WriteString("|" + strings.Repeat(" --- |", len(t.header)) + "\n")
	for _, row := range t.rows {
		// Markdown drops leading spaces: mark the sub-rows instead.
		if strings.HasPrefix(row[0], "  ") {
			row[0] = "↳ " + strings.TrimSpace(row[0])
		}
		b.WriteString("| " + strings.Join(mdEscapeAll(row), " | ") + " |\n")
	}
	for _, c := range r.Cuts {
		if !c.Met {
			fmt.Fprintf(&b, "\n- `%s` unmet: %s", c.Spec, MarkdownEscape(*c.Reason))
		}
	}
	r.writeSectionsMarkdown(&b)
	for _, warning := range r.Warnings {
		fmt.Fprintf(&b, "\n- **Warning:** %s", MarkdownEscape(warning))
	}
	text := singleBlankLines(strings.TrimRight(b.String(), "\n")) + "\n\n> **Caution.** " + r.Caution + "\n"
	_, err := io.WriteString(w, text)
	return err
}

// singleBlankLines folds runs of blank lines into one, so that sections
// that each start with a blank line never leave two between them.
func singleBlankLines(text string) string {
	for strings.Contains(text, "\n\n\n") {
		text = strings.ReplaceAll(text, "\n\n\n", "\n\n")
	}
	return text
}

func (r *Report) assumptionLine() string {
	a := r.Assumptions
	parts := []string{"base rate " + Percent(float64(a.BaseRate))}
	if !r.baseRateGiven {
		parts[0] += " (the validation rate)"
	}
	if evidence.Defined(float64(a.Volume)) {
		parts = append(parts, asGiven(float64(a.Volume))+" "+noun(float64(a.Volume), "case", "cases")+" per shift")
	}
	if evidence.Defined(float64(a.Capacity)) {
		parts = append(parts, "capacity "+asGiven(float64(a.Capacity))+" "+noun(float64(a.Capacity), "alert", "alerts")+" per shift")
	}
	if evidence.Defined(float64(a.CostFalseAlert)) {
		parts = append(parts, fmt.Sprintf("costs: wrong alert %s, miss %s, hit %s", Money(float64(a.CostFalseAlert)), Money(float64(a.CostMiss)), Money(float64(a.CostHit))))
	}
	parts = append(parts, "intervals at "+strconv.FormatFloat(100*float64(a.Confidence), 'g', -1, 64)+"%")
	return strings.Join(parts, " · ")
}

// writeGrid writes t with columns padded to their widest cell.
func writeGrid(b *strings.Builder, t table) {
	b.WriteString(grid(t.header, t.rows, t.wordsLast))
}

// Grid lays out a heading and rows as text columns padded to their widest
// cell: the first column left-aligned, the others right-aligned, two
// spaces apart, with no trailing spaces.
func Grid(header []string, rows [][]string) string {
	return grid(header, rows, false)
}

// grid is Grid, with the last column left-aligned when wordsLast is set.
func grid(header []string, rows [][]string, wordsLast bool) string {
	widths := make([]int, len(header))
	for _, row := range append([][]string{header}, rows...) {
		for i, cell := range row {
			widths[i] = max(widths[i], len([]rune(cell)))
		}
	}
	var b strings.Builder
	for _, row := range append([][]string{header}, rows...) {
		var l strings.Builder
		for i, cell := range row {
			pad := strings.Repeat(" ", widths[i]-len([]rune(cell)))
			if i == 0 {
				l.WriteString(cell + pad)
			} else if wordsLast && i == len(header)-1 {
				l.WriteString("  " + cell + pad)
			} else {
				l.WriteString("  " + pad + cell)
			}
		}
		b.WriteString(strings.TrimRight(l.String(), " ") + "\n") // no trailing spaces after an empty last cell
	}
	return b.String()
}

// MarkdownEscape escapes the characters that Markdown tables, emphasis and
// inline HTML read (so that a note such as "<night> shift" shows as
// written), and folds line breaks into spaces.
func MarkdownEscape(s string) string {
	s = strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`", "\r\n", " ", "\n", " ").Replace(s)
	// A "<" opens inline HTML only before a letter, "/", "!" or "?"; a
	// figure's "<=" is left as it is.
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		if s[i] == '<' && i+1 < len(s) && (isASCIILetter(s[i+1]) || strings.IndexByte("/!?", s[i+1]) >= 0) {
			b.WriteByte('\\')
		}
		b.WriteByte(s[i])
	}
	return b.String()
}

func isASCIILetter(c byte) bool { return 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' }

func mdEscapeAll(cells []string) []string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = MarkdownEscape(c)
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
// undefined. A share that is not 0 (or 1) but rounds to it reads "<0.1%"
// (or ">99.9%"), so that a rounded figure never looks exact.
func Percent(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	switch {
	case v > 0 && v < 0.0005:
		return "<0.1%"
	case v < 1 && v >= 0.9995:
		return ">99.9%"
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

// Count formats a count: whole numbers plainly, weighted counts below 100
// with two decimals, larger ones rounded to whole numbers.
func Count(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	if math.Abs(v) >= 100 {
		return wholeOrTwo(v, 0)
	}
	return wholeOrTwo(v, 2)
}

// wholeOrTwo formats v with the given decimals, dropping ".00" so that an
// amount that rounds to a whole number (such as 60.00000000000001, the sum
// of rounded shares) reads as one, and never writing "-0".
func wholeOrTwo(v float64, decimals int) string {
	text := strings.TrimSuffix(strconv.FormatFloat(v, 'f', decimals, 64), ".00")
	if text == "-0" {
		return "0"
	}
	return text
}

// amount writes a (possibly weighted) count with its noun: "1 true
// case", "4.50 true cases".
func amount(v float64, one, many string) string { return Count(v) + " " + noun(v, one, many) }

// noun is one when v is exactly 1, else many.
func noun(v float64, one, many string) string {
	if v == 1 {
		return one
	}
	return many
}

// asGiven formats an assumption the way a person types it: 1500, 37.5.
func asGiven(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

// Money formats a cost: amounts of 100 or more and whole amounts with no
// decimals, smaller fractional amounts with two.
func Money(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	if math.Abs(v) >= 100 {
		return wholeOrTwo(v, 0)
	}
	return wholeOrTwo(v, 2)
}

// Queue formats a projected number of alerts per shift, an expectation
// rather than a count, always with one decimal so that a column of queues
// reads alike.
func Queue(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	return strconv.FormatFloat(v, 'f', 1, 64)
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

// Against says how a queue stands against capacity, as "12.5 under" or
// "30.0 over", in the queue's own one decimal; a difference that rounds
// to 0.0 is "at capacity".
func Against(queue, capacity float64) string {
	if !evidence.Defined(queue) {
		return "n/a"
	}
	d := queue - capacity
	switch rounded := math.Round(10*math.Abs(d)) / 10; {
	case rounded == 0:
		return "at capacity"
	case d > 0:
		return Queue(rounded) + " over"
	default:
		return Queue(rounded) + " under"
	}
}
