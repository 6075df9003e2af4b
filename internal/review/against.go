package review

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
)

// Change is what changes between the cut in production (Old) and a
// proposed one (New), as two decision files record them: the facts side
// by side, the assumptions that changed, both chosen cuts' figures with
// the proposed minus the production one, and the change per shift in
// plain words. Each figure is the one its own file records, projected
// under its own assumptions.
type Change struct {
	OldPath, NewPath string
	Old, New         *decision.File
	// Facts are rows of [what, in production, proposed].
	Facts [][3]string
	// Assumptions are the assumptions that differ, as [what, in
	// production, proposed]; empty when they are the same.
	Assumptions [][3]string
	// Table has two columns, production (the reference) and proposed.
	Table compare.Table
	// PerShift says in plain words what changes in a shift: alerts, wrong
	// alerts, true cases caught and cost; empty without a volume in both.
	PerShift []string
}

// Against returns the change from old, the decision in production, to
// new, the proposed one.
func Against(newFile *decision.File, newPath string, old *decision.File, oldPath string) Change {
	c := Change{OldPath: oldPath, NewPath: newPath, Old: old, New: newFile}
	oc, _ := old.ChosenCandidate()
	nc, _ := newFile.ChosenCandidate()
	data := func(f *decision.File) string {
		return fmt.Sprintf("%s · %s rows · sha256 %s", format.Printable(f.Data.Path), format.Count(float64(f.Data.Rows)), shortDigest(f.Data.SHA256))
	}
	chosen := func(f *decision.File, cand decision.Candidate) string {
		sign := format.CutSign(f.Data.LowerIsRiskier)
		return fmt.Sprintf("%s: score %s %s", format.Printable(cand.Name), sign, format.Score(cand.Cut.Score))
	}
	by := func(f *decision.File) string {
		if f.ChosenBy == "" {
			return "not recorded"
		}
		return format.Printable(f.ChosenBy)
	}
	signed := func(f *decision.File) string {
		n, approvals := 0, 0
		for _, s := range f.SignOffs {
			if f.ForCurrentChoice(s) {
				n++
				if s.Verdict == decision.Approve {
					approvals++
				}
			}
		}
		return fmt.Sprintf("%d for this choice, %d approving", n, approvals)
	}
	c.Facts = [][3]string{
		{"model", ModelName(old.Model), ModelName(newFile.Model)},
		{"data", data(old), data(newFile)},
		{"base rate of the data", format.Share(old.Data.Positives / (old.Data.Positives + old.Data.Negatives)),
			format.Share(newFile.Data.Positives / (newFile.Data.Positives + newFile.Data.Negatives))},
		{"chosen cut", chosen(old, oc), chosen(newFile, nc)},
		{"chosen by", by(old), by(newFile)},
		{"written", old.Created.UTC().Format("2006-01-02 15:04 MST"), newFile.Created.UTC().Format("2006-01-02 15:04 MST")},
		{"sign-offs", signed(old), signed(newFile)},
	}
	if old.Data.SHA256 == newFile.Data.SHA256 && old.Data.SHA256 != "" {
		c.Facts[1][2] += " (the same data)"
	}
	c.Assumptions = changedAssumptions(old.Assumptions, newFile.Assumptions)
	c.Table = compare.New([]compare.Column{
		{Name: "in production", Rule: oc.Rule, Cut: oc.Cut, Capacity: old.Assumptions.Capacity},
		{Name: "proposed", Rule: nc.Rule, Cut: nc.Cut, Capacity: newFile.Assumptions.Capacity},
	}, 0, compare.Options{Assumptions: newFile.Assumptions, BaseRateChanged: newFile.BaseRateChanged() || old.BaseRateChanged(),
		LowerIsRiskier: newFile.Data.LowerIsRiskier, OwnCapacity: true})
	c.PerShift = perShift(oc.Cut, nc.Cut, old.Assumptions, newFile.Assumptions)
	return c
}

// changedAssumptions lists the assumptions that differ between a and b.
func changedAssumptions(a, b projection.Assumptions) [][3]string {
	var out [][3]string
	given := func(v float64) string {
		if v == 0 {
			return "not given"
		}
		return format.Count(v)
	}
	add := func(what, x, y string) {
		if x != y {
			out = append(out, [3]string{what, x, y})
		}
	}
	add("base rate in production", format.Share(a.BaseRate), format.Share(b.BaseRate))
	add("cases per shift", given(a.Volume), given(b.Volume))
	add("capacity (alerts per shift)", given(a.Capacity), given(b.Capacity))
	costs := func(c *projection.Costs) string {
		if c == nil {
			return "not given"
		}
		return fmt.Sprintf("wrong alert %s, miss %s, hit %s", format.Money(c.FalseAlert), format.Money(c.Miss), format.Money(c.Hit))
	}
	add("costs", costs(a.Costs), costs(b.Costs))
	add("interval level", fmt.Sprintf("%g%%", 100*a.Confidence), fmt.Sprintf("%g%%", 100*b.Confidence))
	return out
}

// perShift says in plain words what changes in a shift when the proposed
// cut replaces the one in production, each under its own assumptions.
func perShift(old, proposed evidence.Cut, a, b projection.Assumptions) []string {
	if !(a.Volume > 0 && b.Volume > 0) {
		return nil
	}
	op, np := old.Projected, proposed.Projected
	wrong := func(p projection.Figures) float64 { return p.QueuePerShift * (1 - p.Precision) }
	caught := func(p projection.Figures) float64 { return p.QueuePerShift * p.Precision }
	out := []string{
		sentence("alerts", op.QueuePerShift, np.QueuePerShift),
		sentence("wrong alerts", wrong(op), wrong(np)),
		sentence("true cases caught", caught(op), caught(np)),
		fmt.Sprintf("share of true cases caught: %s in 10 now, %s in 10 with the proposed cut", inTen(old.Recall), inTen(proposed.Recall)),
	}
	if a.Costs != nil && b.Costs != nil {
		out = append(out, moneySentence(op.CostPerShift, np.CostPerShift))
	}
	return out
}

// sentence reads "alerts: about 108 a shift now, about 90 with the
// proposed cut (18 fewer)", the change agreeing with the rounded figures.
func sentence(what string, now, proposed float64) string {
	if !evidence.Defined(now) || !evidence.Defined(proposed) {
		return what + ": not known for both cuts"
	}
	n, p := math.Round(now), math.Round(proposed)
	change := "the same"
	switch d := p - n; {
	case d > 0:
		change = format.Count(d) + " more"
	case d < 0:
		change = format.Count(-d) + " fewer"
	}
	return fmt.Sprintf("%s: about %s a shift now, about %s with the proposed cut (%s)", what, format.Count(n), format.Count(p), change)
}

func moneySentence(now, proposed float64) string {
	if !evidence.Defined(now) || !evidence.Defined(proposed) {
		return "cost: not known for both cuts"
	}
	change := "the same"
	switch d := format.MoneyDiff(proposed, now); {
	case d.Value > 0:
		change = strings.TrimPrefix(d.Text, "+") + " more"
	case d.Value < 0:
		change = strings.TrimPrefix(d.Text, "-") + " less"
	}
	return fmt.Sprintf("cost: %s a shift now, %s with the proposed cut (%s)", format.Money(now), format.Money(proposed), change)
}

// inTen says a share as "about 8" (of every 10), or "n/a".
func inTen(share float64) string {
	if !evidence.Defined(share) {
		return "n/a"
	}
	return "about " + format.Count(math.Round(10*share))
}

// WriteAgainstText writes the change as plain text.
func WriteAgainstText(w io.Writer, c Change) error {
	var b strings.Builder
	fmt.Fprintf(&b, "What changes: %s (proposed) against %s (in production)\n\n", format.Printable(c.NewPath), format.Printable(c.OldPath))
	pairs := func(rows [][3]string, indent string) {
		width := 0
		for _, r := range rows {
			width = max(width, len([]rune(r[0])))
		}
		for _, r := range rows {
			pad := strings.Repeat(" ", width-len([]rune(r[0])))
			fmt.Fprintf(&b, "%s%s%s  in production  %s\n", indent, r[0], pad, r[1])
			fmt.Fprintf(&b, "%s%s  proposed       %s\n", indent, strings.Repeat(" ", width), r[2])
		}
	}
	pairs(c.Facts, "")
	b.WriteString("\n")
	if len(c.Assumptions) == 0 {
		b.WriteString("assumptions: the same in both\n")
	} else {
		b.WriteString("assumptions that changed:\n")
		pairs(c.Assumptions, "  ")
	}
	b.WriteString("\n")
	b.WriteString(format.Grid(changeGrid(c.Table)))
	b.WriteString(format.ProjectedGiven + "\n")
	if len(c.PerShift) > 0 {
		b.WriteString("\nper shift, in plain words:\n")
		for _, s := range c.PerShift {
			b.WriteString("  " + s + "\n")
		}
	}
	b.WriteString("\ncaution: " + evidence.Caution + "\n")
	_, err := io.WriteString(w, format.PrintableText(b.String()))
	return err
}

// changeGrid lays out the two chosen cuts with the change between them.
func changeGrid(t compare.Table) (header []string, rows [][]string, wordsLast bool) {
	header = []string{"figure", "in production", "proposed", "change"}
	for _, r := range t.Rows {
		rows = append(rows, []string{r.Figure, r.Cells[0], r.Cells[1], r.Diffs[1]})
	}
	return header, rows, false
}

// WriteAgainstMarkdown writes the change as Markdown.
func WriteAgainstMarkdown(w io.Writer, c Change) error {
	var b strings.Builder
	fmt.Fprintf(&b, "# What changes: %s against %s\n\n", format.Markdown(c.NewPath), format.Markdown(c.OldPath))
	table := func(header []string, rows [][]string) {
		b.WriteString("| " + strings.Join(format.MarkdownCells(header), " | ") + " |\n")
		align := []string{"---"}
		for range header[1:] {
			align = append(align, "---:")
		}
		b.WriteString("| " + strings.Join(align, " | ") + " |\n")
		for _, r := range rows {
			if r[0] == format.MeasuredHeading || r[0] == format.ProjectedHeading { // a heading row, as the other Markdown forms mark one
				b.WriteString("| **" + format.Markdown(r[0]) + "** |" + strings.Repeat(" |", len(r)-1) + "\n")
				continue
			}
			if strings.HasPrefix(r[0], "  ") {
				r = append([]string{"↳ " + strings.TrimSpace(r[0])}, r[1:]...)
			}
			b.WriteString("| " + strings.Join(format.MarkdownCells(r), " | ") + " |\n")
		}
	}
	var rows [][]string
	for _, f := range c.Facts {
		rows = append(rows, []string{f[0], f[1], f[2]})
	}
	table([]string{"", "in production", "proposed"}, rows)
	b.WriteString("\n## Assumptions\n\n")
	if len(c.Assumptions) == 0 {
		b.WriteString("The same in both.\n")
	} else {
		rows = rows[:0]
		for _, a := range c.Assumptions {
			rows = append(rows, []string{a[0], a[1], a[2]})
		}
		table([]string{"changed", "in production", "proposed"}, rows)
	}
	b.WriteString("\n## The chosen cuts\n\n")
	header, figures, _ := changeGrid(c.Table)
	table(header, figures)
	b.WriteString("\n- " + format.Markdown(format.ProjectedGiven) + "\n")
	if len(c.PerShift) > 0 {
		b.WriteString("\n## Per shift\n\n")
		for _, s := range c.PerShift {
			b.WriteString("- " + format.Markdown(s) + "\n")
		}
	}
	b.WriteString("\n> **Caution.** " + format.Markdown(evidence.Caution) + "\n")
	_, err := io.WriteString(w, format.PrintableText(b.String()))
	return err
}
