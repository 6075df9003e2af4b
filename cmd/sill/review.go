package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"strings"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"
	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/tui"
)

func newReviewCmd() *cobra.Command {
	var format string
	cmd := &cobra.Command{
		Use:   "review FILE.yaml",
		Short: "Compare the candidates of a decision file side by side, choose one and note why",
		Long: `review reads a decision file (written by sill report --save or the
explorer) and needs no data: every candidate cut side by side with the same
figures as the explorer's comparison strip, each with its difference from
the chosen one.

On a terminal it opens a screen where you move between candidates, mark one
as chosen, add a note to a candidate or to the file, and write the file back
(atomically; the evidence is kept as it was). With --format text or
markdown it prints the comparison instead, for a sign-off document; that is
also what it does when standard output is not a terminal.`,
		Example: `  sill review cut.yaml
  sill review cut.yaml --format markdown > sign-off.md`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			switch format {
			case "", "text", "markdown":
			default:
				return fmt.Errorf("--format %q: expected text or markdown", format)
			}
			var file *decision.File
			var err error
			if args[0] == "-" {
				file, err = decision.Read(cmd.InOrStdin(), "-")
				if format == "" {
					format = "text" // the screen writes back to a file
				}
			} else {
				file, err = decision.ReadFile(args[0])
			}
			if err != nil {
				return err
			}
			if format == "" {
				if isTerminal() && cmd.OutOrStdout() == os.Stdout {
					return runReviewScreen(file, args[0])
				}
				format = "text"
			}
			if format == "markdown" {
				return writeReviewMarkdown(cmd.OutOrStdout(), file, args[0])
			}
			return writeReviewText(cmd.OutOrStdout(), file, args[0])
		},
	}
	cmd.Flags().StringVar(&format, "format", "", "print instead of opening the screen: text or markdown")
	return cmd
}

// reviewTable lays out the file's candidates against the chosen one,
// which comes first; the others keep the file's order.
func reviewTable(f *decision.File) compare.Table {
	var columns []compare.Column
	for _, c := range f.Candidates {
		column := compare.Column{Name: c.Name, Rule: c.Rule, Cut: c.Cut}
		if c.Name == f.Chosen {
			columns = append([]compare.Column{column}, columns...)
		} else {
			columns = append(columns, column)
		}
	}
	return compare.New(columns, 0, compare.Options{
		Assumptions:     f.Assumptions,
		BaseRateChanged: baseRateChanged(f),
		LowerIsRiskier:  f.Data.LowerIsRiskier,
	})
}

// baseRateChanged reports whether the file's production base rate differs
// from its validation one.
func baseRateChanged(f *decision.File) bool {
	total := f.Data.Positives + f.Data.Negatives
	if math.IsNaN(total) || !(total > 0) {
		return true
	}
	return math.Abs(f.Assumptions.BaseRate-f.Data.Positives/total) > 1e-12
}

// reviewFacts are the lines above the table: what the file says about the
// data, the assumptions and the chosen cut.
func reviewFacts(f *decision.File) [][2]string {
	d, a := f.Data, f.Assumptions
	sign := ">="
	if d.LowerIsRiskier {
		sign = "<="
	}
	chosen, _ := f.ChosenCandidate()
	data := fmt.Sprintf("%s · %s rows, %s true cases · sha256 %s", d.Path, report.Count(float64(d.Rows)), report.Count(d.Positives), shortDigest(d.SHA256))
	columns := fmt.Sprintf("score %q, label %q", d.ScoreColumn, d.LabelColumn)
	if d.WeightColumn != "" {
		columns += fmt.Sprintf(", weight %q", d.WeightColumn)
	}
	assume := []string{"base rate " + report.Percent(a.BaseRate)}
	if !baseRateChanged(f) {
		assume[0] += " (the validation rate)"
	}
	if a.Volume > 0 {
		assume = append(assume, report.Count(a.Volume)+" cases per shift")
	}
	if a.Capacity > 0 {
		assume = append(assume, "capacity "+report.Count(a.Capacity)+" alerts per shift")
	}
	if c := a.Costs; c != nil {
		assume = append(assume, fmt.Sprintf("costs: wrong alert %s, miss %s, hit %s", report.Money(c.FalseAlert), report.Money(c.Miss), report.Money(c.Hit)))
	}
	assume = append(assume, fmt.Sprintf("intervals at %g%%", 100*a.Confidence))
	return [][2]string{
		{"data", data},
		{"columns", columns},
		{"assumptions", strings.Join(assume, " · ")},
		{"chosen", fmt.Sprintf("%s: flag a case when its score %s %s", chosen.Name, sign, report.Score(chosen.Cut.Score))},
		{"written", f.Created.UTC().Format("2006-01-02 15:04 MST") + " by sill " + f.ToolVersion},
	}
}

func shortDigest(d string) string {
	if len(d) > 12 {
		return d[:12]
	}
	return d
}

// reviewNotes lists the file's note and the candidates' notes.
func reviewNotes(f *decision.File) [][2]string {
	var notes [][2]string
	oneLine := func(s string) string { return strings.Join(strings.Fields(s), " ") } // a hand-edited note may hold line breaks
	if f.Note != "" {
		notes = append(notes, [2]string{"file", oneLine(f.Note)})
	}
	for _, c := range f.Candidates {
		if c.Note != "" {
			notes = append(notes, [2]string{c.Name, oneLine(c.Note)})
		}
	}
	return notes
}

// reviewGrid returns the table's heading and rows as cells: the figure,
// then each candidate's value and (except the chosen one) its difference.
func reviewGrid(t compare.Table) (header []string, rows [][]string) {
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

func writeReviewText(w io.Writer, f *decision.File, path string) error {
	var b strings.Builder
	fmt.Fprintf(&b, "Review of %s: %d %s\n\n", path, len(f.Candidates), pluralWord(len(f.Candidates), "candidate", "candidates"))
	for _, fact := range reviewFacts(f) {
		fmt.Fprintf(&b, "%-12s %s\n", fact[0], fact[1])
	}
	b.WriteString("\n")
	header, rows := reviewGrid(reviewTable(f))
	widths := make([]int, len(header))
	for _, row := range append([][]string{header}, rows...) {
		for i, cell := range row {
			widths[i] = max(widths[i], len([]rune(cell)))
		}
	}
	for _, row := range append([][]string{header}, rows...) {
		var line strings.Builder
		for i, cell := range row {
			space := strings.Repeat(" ", widths[i]-len([]rune(cell)))
			if i == 0 {
				line.WriteString(cell + space)
			} else {
				line.WriteString("  " + space + cell)
			}
		}
		b.WriteString(strings.TrimRight(line.String(), " ") + "\n")
	}
	if notes := reviewNotes(f); len(notes) > 0 {
		b.WriteString("\nnotes\n")
		for _, n := range notes {
			fmt.Fprintf(&b, "  %s: %s\n", n[0], n[1])
		}
	}
	b.WriteString("\n" + f.Caution + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

func writeReviewMarkdown(w io.Writer, f *decision.File, path string) error {
	var b strings.Builder
	fmt.Fprintf(&b, "# Cut review: %s\n\n", mdText(path))
	for _, fact := range reviewFacts(f) {
		fmt.Fprintf(&b, "- **%s:** %s\n", fact[0], mdText(fact[1]))
	}
	b.WriteString("\n")
	header, rows := reviewGrid(reviewTable(f))
	row := func(cells []string) {
		escaped := make([]string, len(cells))
		for i, c := range cells {
			escaped[i] = mdText(c)
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
		if strings.HasPrefix(r[0], "  ") { // a detail row, whose indent Markdown drops
			r = append([]string{"· " + strings.TrimSpace(r[0])}, r[1:]...)
		}
		row(r)
	}
	if notes := reviewNotes(f); len(notes) > 0 {
		b.WriteString("\n## Notes\n\n")
		for _, n := range notes {
			fmt.Fprintf(&b, "- **%s:** %s\n", mdText(n[0]), mdText(n[1]))
		}
	}
	b.WriteString("\n## Sign-off\n\n")
	b.WriteString("- Reviewed by: \n- Date: \n- Decision: \n")
	b.WriteString("\n> **Caution.** " + mdText(f.Caution) + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// mdText escapes the characters that Markdown tables and emphasis read.
func mdText(s string) string {
	return strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`", "\n", " ").Replace(s)
}

// runReviewScreen opens the review screen on file until the user quits.
func runReviewScreen(file *decision.File, path string) error {
	renderer := lipgloss.NewRenderer(os.Stdout)
	if os.Getenv("NO_COLOR") != "" {
		renderer.SetColorProfile(termenv.Ascii)
	}
	styles := tui.DefaultStyles(renderer)
	final, err := tea.NewProgram(tui.NewReview(tui.ReviewConfig{File: file, Path: path, Styles: &styles}), tea.WithAltScreen()).Run()
	if err != nil {
		return fmt.Errorf("review: %w", err)
	}
	r := final.(tui.Review)
	switch {
	case r.Written() && !r.Changed():
		fmt.Fprintf(os.Stderr, "sill: wrote %s; chosen %s\n", path, r.File().Chosen)
	case r.Changed():
		fmt.Fprintf(os.Stderr, "sill: %s left as it was; the changes on screen were not written\n", path)
	}
	return nil
}
