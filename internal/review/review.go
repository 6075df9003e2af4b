// Package review prints the candidates of a decision file side by side,
// for a lead who signs off a cut without the data.
package review

import (
	"fmt"
	"io"
	"strings"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
)

// table lays out the file's candidates against the chosen one,
// which comes first; the others keep the file's order.
func table(f *decision.File) compare.Table {
	var columns []compare.Column
	for _, c := range f.Candidates {
		column := Column(c)
		if c.Name == f.Chosen {
			columns = append([]compare.Column{column}, columns...)
		} else {
			columns = append(columns, column)
		}
	}
	return compare.New(columns, 0, compare.Options{
		Assumptions:     f.Assumptions,
		BaseRateChanged: f.BaseRateChanged(),
		LowerIsRiskier:  f.Data.LowerIsRiskier,
	})
}

// Column is c as a column of package compare, with what the file records
// of its rule, its redraws and its corrected cost.
func Column(c decision.Candidate) compare.Column {
	column := compare.Column{Name: c.Name, Rule: c.Rule, Cut: c.Cut, RuleNow: RuleNow(c), RecallRedraws: RecallRedraws(c), RecallLands: RecallLands(c), WrongRedraws: WrongRedraws(c)}
	if o := c.Optimism; o != nil && evidence.Defined(o.CorrectedPerShift) {
		corrected := o.CorrectedPerShift
		column.CorrectedCostPerShift = &corrected
	}
	return column
}

// RuleNow is what the file records of whether c's rule picks its cut
// under the file's assumptions, for package compare; nil when not
// recorded.
func RuleNow(c decision.Candidate) *compare.RuleNow {
	if c.RuleCheck == nil {
		return nil
	}
	return &compare.RuleNow{Holds: c.RuleCheck.Holds, Picks: c.RuleCheck.Picks}
}

// RecallRedraws is the range of the measured hit share at c's cut
// across the bootstrap's resampled sets (the redraws at this cut), as the
// file records it, for package compare; nil when the file does not
// record it (written before the key, or the run could not say).
func RecallRedraws(c decision.Candidate) *[2]float64 {
	if st := c.Stability; st != nil && evidence.Defined(st.RecallAtCut[0]) && evidence.Defined(st.RecallAtCut[1]) {
		r := st.RecallAtCut
		return &r
	}
	return nil
}

// WrongRedraws is the range of the measured wrong-alert share at c's
// cut across the bootstrap's resampled sets, as the file records it, for
// package compare; nil when the file does not record it.
func WrongRedraws(c decision.Candidate) *[2]float64 {
	if st := c.Stability; st != nil && evidence.Defined(st.FalseDiscoveryRateAtCut[0]) && evidence.Defined(st.FalseDiscoveryRateAtCut[1]) {
		r := st.FalseDiscoveryRateAtCut
		return &r
	}
	return nil
}

// RecallLands is the range of the measured hit share where c's rule
// lands in the bootstrap's resampled sets, as the file records it, for
// package compare; nil when c was not resampled.
func RecallLands(c decision.Candidate) *[2]float64 {
	if st := c.Stability; st != nil && st.Skipped == "" {
		r := st.Recall
		return &r
	}
	return nil
}

// RulesMoved says in words which candidates were pinned under earlier
// assumptions (their rule picks another cut under the file's), or ""
// when every recorded rule holds.
func RulesMoved(f *decision.File) string {
	var moved []string
	for _, c := range f.Candidates {
		if k := c.RuleCheck; k != nil && !k.Holds && c.Rule != "" {
			now := "no cut meets it"
			if evidence.Defined(k.Picks) {
				now = "it picks " + format.Score(k.Picks)
			}
			moved = append(moved, fmt.Sprintf("%s (rule %s: %s)", format.Printable(c.Name), format.Printable(c.Rule), now))
		}
	}
	if len(moved) == 0 {
		return ""
	}
	return "pinned under earlier assumptions, not what the rule picks under these: " + strings.Join(moved, "; ")
}

// facts are the lines above the table: what the file says about the
// data, the assumptions and the chosen cut.
func facts(f *decision.File) [][2]string {
	d, a := f.Data, f.Assumptions
	sign := format.CutSign(d.LowerIsRiskier)
	chosen, _ := f.ChosenCandidate()
	data := fmt.Sprintf("%s · %s rows, %s true cases · sha256 %s", d.Path, format.Count(float64(d.Rows)), format.Count(d.Positives), shortDigest(d.SHA256))
	columns := fmt.Sprintf("score %q, label %q", d.ScoreColumn, d.LabelColumn)
	if d.WeightColumn != "" {
		columns += fmt.Sprintf(", weight %q", d.WeightColumn)
	}
	assume := []string{"base rate " + format.Share(a.BaseRate)}
	if !f.BaseRateChanged() {
		assume[0] += " (the validation rate)"
	}
	if a.Volume > 0 {
		assume = append(assume, format.Count(a.Volume)+" cases per shift")
	}
	if a.Capacity > 0 {
		assume = append(assume, "capacity "+format.Count(a.Capacity)+" alerts per shift")
	}
	if c := a.Costs; c != nil {
		assume = append(assume, fmt.Sprintf("costs: wrong alert %s, miss %s, hit %s", format.Money(c.FalseAlert), format.Money(c.Miss), format.Money(c.Hit)))
	}
	assume = append(assume, fmt.Sprintf("intervals at %g%%", 100*a.Confidence))
	chosenBy := "not recorded"
	if f.ChosenBy != "" {
		chosenBy = format.Printable(f.ChosenBy)
	}
	out := [][2]string{
		{"model", ModelName(f.Model)},
		{"data", data},
		{"columns", columns},
	}
	if line := RankingLine(d.Ranking); line != "" {
		out = append(out, [2]string{"ranking", line})
	}
	out = append(out, [][2]string{
		{"assumptions", strings.Join(assume, " · ")},
		{"chosen", fmt.Sprintf("%s: flag a case when its score %s %s", format.Printable(chosen.Name), sign, format.Score(chosen.Cut.Score))},
		{"chosen by", chosenBy},
		{"written", f.Created.UTC().Format("2006-01-02 15:04 MST") + " by " + f.WrittenBy()},
	}...)
	if moved := RulesMoved(f); moved != "" {
		out = append(out, [2]string{"rules", moved})
	}
	if line := PeaksLine(chosen.Shifts); line != "" {
		out = append(out, [2]string{"shift peaks", line})
	}
	return out
}

// PeaksLine says the chosen cut's busy shifts and what the figure rests
// on: "9 in 10 shifts at most 151 alerts (the sample's busiest real shift,
// scaled: 252); the p90 is ..."; "" when the file records none.
func PeaksLine(sh *decision.Shifts) string {
	if sh == nil || !evidence.Defined(sh.P90) {
		return ""
	}
	line := "9 in 10 shifts at most " + format.Number(sh.P90, 0) + " alerts (the sample's busiest real shift, scaled: " + format.Queue(sh.Max) + ")"
	if sh.Basis != "" {
		return line + "; " + format.Printable(sh.Basis)
	}
	return line + "; written before the shift-peak model: the figure is the sample's own scaled count, mostly its sampling noise when it holds few cases a shift"
}

// RankingLine is the file's ranking figures with their intervals, at the
// level the assumptions state: "ROC AUC 0.899 (0.872–0.926) · average
// precision 0.614 (0.534–0.689)"; "" for a file that records none.
func RankingLine(r *decision.Ranking) string {
	if r == nil {
		return ""
	}
	return "ROC AUC " + format.NumberWithInterval(r.ROCAUC, r.ROCAUCCI, 3) +
		" · average precision " + format.NumberWithInterval(r.AveragePrecision, r.AveragePrecisionCI, 3)
}

// ModelName names the model as the file records it: "bearing-wear
// version 14", either part alone, or "not recorded".
func ModelName(m decision.Model) string {
	switch {
	case m.Name != "" && m.Version != "":
		return format.Printable(m.Name) + " version " + format.Printable(m.Version)
	case m.Name != "":
		return format.Printable(m.Name) + " (version not recorded)"
	case m.Version != "":
		return "version " + format.Printable(m.Version) + " (name not recorded)"
	}
	return "not recorded"
}

// SignOffLines are the file's sign-offs, one line each in the order
// given: when, verdict, who in what role, through which SSH key, the note,
// and for a sign-off given before the chosen cut changed, which choice it
// was given for. Names and notes are made printable.
func SignOffLines(f *decision.File) []string {
	var out []string
	for _, s := range f.SignOffs {
		line := fmt.Sprintf("%s  %-7s  %s", s.At.UTC().Format("2006-01-02 15:04 MST"), s.Verdict, format.Printable(s.Name))
		if s.Role != "" {
			line += ", " + format.Printable(s.Role)
		}
		if s.Key != "" {
			line += " (key " + format.Printable(s.Key) + ")"
		}
		if s.Note != "" {
			line += ": " + format.Printable(oneLine(s.Note))
		}
		if !f.ForCurrentChoice(s) {
			line += fmt.Sprintf(" [given for the earlier choice %s at score %s]", format.Printable(s.Chosen), format.Score(s.ChosenScore))
		}
		out = append(out, line)
	}
	return out
}

// belowTable are the lines under the comparison: what the projected
// intervals take as given, and which figure each candidate's rule picks
// its cut on (cutrule.Rule.Basis), measured or projected.
func belowTable(f *decision.File) []string {
	lines := []string{format.ProjectedGiven}
	for _, c := range f.Candidates {
		rule, err := cutrule.Parse(c.Rule)
		if c.Rule == "" || err != nil || rule.Kind == cutrule.Score {
			continue
		}
		if basis := rule.Basis(f.BaseRateChanged()); basis != "" {
			name := format.Printable(c.Name)
			if c.Name != rule.String() {
				name += " (" + rule.String() + ")"
			}
			lines = append(lines, name+" picks on "+basis)
		}
	}
	return lines
}

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

func shortDigest(d string) string {
	if len(d) > 12 {
		return d[:12]
	}
	return d
}

// allNotes lists the file's note and the candidates' notes, made safe
// for a terminal (a note may hold control sequences).
func allNotes(f *decision.File) [][2]string {
	var notes [][2]string
	// oneLine: a hand-edited note may hold line breaks.
	if f.Note != "" {
		notes = append(notes, [2]string{"file", format.Printable(oneLine(f.Note))})
	}
	for _, c := range f.Candidates {
		if c.Note != "" {
			notes = append(notes, [2]string{format.Printable(c.Name), format.Printable(oneLine(c.Note))})
		}
	}
	return notes
}

// grid returns the table's heading and rows as cells: the figure,
// then each candidate's value and (except the chosen one) its difference.
func grid(t compare.Table) (header []string, rows [][]string) {
	header = []string{"figure"}
	for c, name := range t.Names {
		if c == t.Reference {
			header = append(header, name+" (chosen)")
			continue
		}
		header = append(header, name, "vs chosen")
	}
	ruleRow := []string{"rule"}
	rulesDiffer := false
	for c, rule := range t.Rules {
		rulesDiffer = rulesDiffer || rule != t.Names[c]
		if rule == "" {
			rule = "by hand"
		}
		ruleRow = append(ruleRow, rule)
		if c != t.Reference {
			ruleRow = append(ruleRow, "")
		}
	}
	if rulesDiffer { // names are the rules when saved by sill report
		rows = append(rows, ruleRow)
	}
	for _, r := range t.Rows {
		row := []string{r.Figure}
		for c := range t.Names {
			row = append(row, r.Cells[c])
			if c != t.Reference {
				row = append(row, r.Diffs[c])
			}
		}
		rows = append(rows, row)
	}
	return header, rows
}

// WriteText writes the side-by-side comparison of f's candidates, the
// chosen one first, for a terminal or a plain-text sign-off. path names the
// file in the heading; signHint, in the caller's words, says how to sign a
// file with no sign-off yet (left out when "").
func WriteText(w io.Writer, f *decision.File, path, signHint string) error {
	var b strings.Builder
	noun := "candidates"
	if len(f.Candidates) == 1 {
		noun = "candidate"
	}
	fmt.Fprintf(&b, "Review of %s: %d %s\n\n", path, len(f.Candidates), noun)
	for _, fact := range facts(f) {
		fmt.Fprintf(&b, "%-12s %s\n", fact[0], fact[1])
	}
	b.WriteString("\n")
	header, rows := grid(table(f))
	b.WriteString(format.Grid(header, rows, false))
	for _, line := range belowTable(f) {
		b.WriteString(line + "\n")
	}
	if lines := PromiseLines(f); len(lines) > 0 {
		b.WriteString("\nwhat each rule promises\n")
		for _, line := range lines {
			b.WriteString("  " + line + "\n")
		}
	}
	if lines := SegmentLines(f); len(lines) > 0 {
		b.WriteString("\ngroups\n")
		for _, line := range lines {
			b.WriteString("  " + line + "\n")
		}
	}
	if notes := allNotes(f); len(notes) > 0 {
		b.WriteString("\nnotes\n")
		for _, n := range notes {
			fmt.Fprintf(&b, "  %s: %s\n", n[0], n[1])
		}
	}
	b.WriteString("\nsign-offs\n")
	lines := SignOffLines(f)
	if len(lines) == 0 {
		lines = []string{"none yet"}
		if signHint != "" {
			lines[0] += " (" + signHint + ")"
		}
	}
	for _, line := range lines {
		b.WriteString("  " + line + "\n")
	}
	b.WriteString("\ncaution: " + evidence.Caution + "\n")        // the standing caution, not a hand-edited one
	_, err := io.WriteString(w, format.PrintableText(b.String())) // names and notes from the file are untrusted
	return err
}

// WriteMarkdown writes the same comparison as WriteText as Markdown, with
// a sign-off block, for pasting into a review document.
func WriteMarkdown(w io.Writer, f *decision.File, path string) error {
	var b strings.Builder
	fmt.Fprintf(&b, "# Cut review: %s\n\n", format.Markdown(path))
	for _, fact := range facts(f) {
		fmt.Fprintf(&b, "- **%s:** %s\n", fact[0], format.Markdown(fact[1]))
	}
	b.WriteString("\n")
	header, rows := grid(table(f))
	row := func(cells []string) {
		escaped := make([]string, len(cells))
		for i, c := range cells {
			escaped[i] = format.Markdown(c)
		}
		b.WriteString("| " + strings.Join(escaped, " | ") + " |\n")
	}
	row(header)
	align := []string{"---"}
	for range header[1:] {
		align = append(align, "---:")
	}
	b.WriteString("| " + strings.Join(align, " | ") + " |\n")
	for _, r := range rows {
		if r[0] == format.MeasuredHeading || r[0] == format.ProjectedHeading { // a heading row, as report's Markdown marks one
			b.WriteString("| **" + format.Markdown(r[0]) + "** |" + strings.Repeat(" |", len(r)-1) + "\n")
			continue
		}
		if strings.HasPrefix(r[0], "  ") { // a detail row, whose indent Markdown drops
			r = append([]string{"↳ " + strings.TrimSpace(r[0])}, r[1:]...) // as report's Markdown marks a detail row
		}
		row(r)
	}
	if lines := belowTable(f); len(lines) > 0 {
		b.WriteString("\n")
		for _, line := range lines {
			b.WriteString("- " + format.Markdown(line) + "\n")
		}
	}
	markdownSection(&b, "What each rule promises", PromiseLines(f))
	markdownSection(&b, "Groups", SegmentLines(f))
	if notes := allNotes(f); len(notes) > 0 {
		b.WriteString("\n## Notes\n\n")
		for _, n := range notes {
			fmt.Fprintf(&b, "- **%s:** %s\n", format.Markdown(n[0]), format.Markdown(n[1]))
		}
	}
	b.WriteString("\n## Sign-offs\n\n")
	for _, line := range SignOffLines(f) {
		b.WriteString("- " + format.Markdown(line) + "\n")
	}
	if len(f.SignOffs) == 0 {
		b.WriteString("None recorded yet.\n")
	}
	b.WriteString("\nOn paper:\n\n- Reviewed by: \n- Role: \n- Date: \n- Decision (approve, revise, reject): \n")
	b.WriteString("\n> **Caution.** " + format.Markdown(evidence.Caution) + "\n")
	_, err := io.WriteString(w, format.PrintableText(b.String())) // names and notes from the file are untrusted
	return err
}

// markdownSection writes lines as a bulleted section under heading, or
// nothing when there are none.
func markdownSection(b *strings.Builder, heading string, lines []string) {
	if len(lines) == 0 {
		return
	}
	b.WriteString("\n## " + heading + "\n\n")
	for _, line := range lines {
		b.WriteString("- " + format.Markdown(line) + "\n")
	}
}
