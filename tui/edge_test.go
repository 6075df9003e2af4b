package tui

import (
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"unicode"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// TestOddSets drives every key over sets at the edges: one row, one class
// only, every row tied, lower scores riskier, zero weights. Nothing may
// panic and every frame must keep its size.
func TestOddSets(t *testing.T) {
	build := func(values []float64, labels []bool, weights []float64, lower bool) *scores.Set {
		set, err := scores.NewSet(scores.Columns{Scores: values, Labels: labels, Weights: weights, LowerIsRiskier: lower, Source: "odd.csv"})
		if err != nil {
			t.Fatal(err)
		}
		return set
	}
	sets := map[string]*scores.Set{
		"one-row":       build([]float64{0.5}, []bool{true}, nil, false),
		"no-true-case":  build([]float64{0.9, 0.5, 0.1}, []bool{false, false, false}, nil, false),
		"no-false-case": build([]float64{0.9, 0.5, 0.1}, []bool{true, true, true}, nil, false),
		"all-tied":      build([]float64{0.5, 0.5, 0.5, 0.5}, []bool{true, false, true, false}, nil, false),
		"lower-riskier": build([]float64{-3, -1, 0, 2, 5}, []bool{true, true, false, true, false}, nil, true),
		"zero-weights":  build([]float64{0.9, 0.7, 0.3}, []bool{true, false, true}, []float64{0, 2, 0}, false),
		"wide-scores":   build([]float64{123456.789012, 1e-9, -42.5}, []bool{true, false, false}, nil, false),
	}
	assume := func(set *scores.Set) (projection.Assumptions, error) {
		positives, negatives := set.Totals()
		base := 0.0
		if positives+negatives > 0 {
			base = positives / (positives + negatives)
		}
		return projection.Assumptions{BaseRate: base, Volume: 50, Capacity: 5, Confidence: 0.9,
			Costs: &projection.Costs{FalseAlert: 1, Miss: 10, Hit: -2}}, nil
	}
	script := []string{"j", "k", "G", "g", "pgdown", "pgup", "1", "2", "3", "4", "5", "v", "p", "j", "p", "v",
		"tab", "left", "right", "enter", "c", ">", "<", "r", "esc", "x", "tab", "p", "a", "tab", "enter", "?", "?", "w"}
	for name, set := range sets {
		t.Run(name, func(t *testing.T) {
			for _, size := range [][2]int{{80, 24}, {80, 22}, {130, 40}} {
				m := loaded(t, set, assume, filepath.Join(t.TempDir(), "cut.yaml"), size[0], size[1])
				for _, k := range script {
					m = keys(m, k)
					checkSize(t, m.View(), size[0], size[1])
				}
				if name == "lower-riskier" && !strings.Contains(m.View(), "<=") {
					t.Errorf("lower scores riskier, but the screen never says <=")
				}
				m = send(m, tea.WindowSizeMsg{Width: 40, Height: 10})
				checkSize(t, m.View(), 40, 10)
			}
		})
	}
}

// TestCutLineCounts checks what the cut line counts: cases, and with
// weights the ranked rows above it (the figures pane weighs them).
func TestCutLineCounts(t *testing.T) {
	assume := func(set *scores.Set) (projection.Assumptions, error) {
		return projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}, nil
	}
	for _, tc := range []struct {
		name    string
		weights []float64
		want    string
	}{
		// Four rows 0.9 > 0.7 > 0.3 > 0.1; the first starting point
		// (base) flags half the weight: two rows unweighted, and with
		// weights 3, 1, 1, 1 the first row alone (3 of 6).
		{"unweighted", nil, "━━ cut >= 0.7 ━ 2 flagged ━"},
		{"weighted", []float64{3, 1, 1, 1}, "━━ cut >= 0.9 ━ 1 rows flagged ━"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			set, err := scores.NewSet(scores.Columns{Scores: []float64{0.9, 0.7, 0.3, 0.1}, Labels: []bool{true, false, true, false}, Weights: tc.weights, Source: "four.csv"})
			if err != nil {
				t.Fatal(err)
			}
			m := loaded(t, set, assume, filepath.Join(t.TempDir(), "cut.yaml"), 80, 24)
			view := m.View()
			if !strings.Contains(view, tc.want) {
				t.Errorf("no %q in\n%s", tc.want, view)
			}
			if strings.Contains(view, "━…") {
				t.Errorf("the cut line ends in an ellipsis:\n%s", view)
			}
		})
	}
}

// TestFooterKeepsHelpAndQuit checks that a status too long for the line
// is cut before the help and quit keys are.
func TestFooterKeepsHelpAndQuit(t *testing.T) {
	set := demoSet(t)
	m := loaded(t, set, demoAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 80, 24)
	m.status = strings.Repeat("a long status ", 20)
	footer := m.footer()
	if !strings.HasSuffix(strings.TrimRight(footer, " "), "? all keys · q quit") {
		t.Errorf("footer %q does not end with the help and quit keys", footer)
	}
	if !strings.HasPrefix(footer, "a long status a long status") || !strings.Contains(footer, "…  │ ") {
		t.Errorf("footer %q does not show the start of the status", footer)
	}
}

// TestFiguresSayWhatIsMissing checks that at 80 columns the figures pane
// says in full words why the queue and the cost per shift are missing:
// without a volume, and with costs but no volume.
func TestFiguresSayWhatIsMissing(t *testing.T) {
	set, err := scores.NewSet(scores.Columns{Scores: []float64{0.9, 0.7, 0.3, 0.1}, Labels: []bool{true, false, true, false}, Source: "four.csv"})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name  string
		costs *projection.Costs
		want  []string
	}{
		{"nothing", nil, []string{"queue per shift: needs a volume (a)", "cost per shift: needs costs (a"}},
		{"costs", &projection.Costs{FalseAlert: 1, Miss: 10}, []string{"queue per shift: needs a volume (a)", "(per shift: a volume)"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			assume := func(*scores.Set) (projection.Assumptions, error) {
				return projection.Assumptions{BaseRate: 0.5, Confidence: 0.95, Costs: tc.costs}, nil
			}
			m := loaded(t, set, assume, filepath.Join(t.TempDir(), "cut.yaml"), 80, 24)
			view := m.figures.View()
			for _, want := range tc.want {
				if !strings.Contains(view, want) {
					t.Errorf("no %q in\n%s", want, view)
				}
			}
			for _, line := range strings.Split(view, "\n") {
				if strings.Contains(line, "…") {
					t.Errorf("a line is cut: %q", line)
				}
			}
		})
	}
}

// TestTooSmallNoticeFits draws both screens below their minimum size, from
// 20 to 50 columns and 1 to 12 lines: the notice fills the terminal
// exactly, is never cut short (no …), names the size needed and says how
// to quit.
func TestTooSmallNoticeFits(t *testing.T) {
	quitKey := regexp.MustCompile(`(^|\s)q(\s|$)`)
	m := loaded(t, tenRows(t), tenAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 100, 30)
	r, _ := newTestReview(t, 120, 32)
	for width := 20; width <= 50; width++ {
		for height := 1; height <= 12; height++ {
			m = send(m, tea.WindowSizeMsg{Width: width, Height: height})
			r, _ = sendReview(t, r, tea.WindowSizeMsg{Width: width, Height: height})
			for _, screen := range []struct {
				name, frame, needs string
			}{{"explorer", m.View(), "80×22"}, {"review", r.View(), "60×16"}} {
				checkSize(t, screen.frame, width, height)
				if strings.Contains(screen.frame, "…") || !strings.Contains(screen.frame, screen.needs) || !quitKey.MatchString(screen.frame) {
					t.Errorf("%s at %d×%d: the notice is cut or does not say what it needs and how to quit:\n%s", screen.name, width, height, screen.frame)
				}
			}
		}
	}
	// With a form or a note open, q would go to the field: the notice
	// names ctrl+c, and ctrl+c quits.
	form := keys(m, "a")
	note, _ := sendReview(t, r, keyPress("n"))
	for width := 20; width <= 50; width++ {
		for height := 2; height <= 12; height++ {
			form = send(form, tea.WindowSizeMsg{Width: width, Height: height})
			note, _ = sendReview(t, note, tea.WindowSizeMsg{Width: width, Height: height})
			for _, screen := range []struct{ name, frame string }{{"explorer's form", form.View()}, {"review's note", note.View()}} {
				checkSize(t, screen.frame, width, height)
				if !strings.Contains(screen.frame, "ctrl+c") || quitKey.MatchString(screen.frame) {
					t.Errorf("%s at %d×%d: the notice does not name ctrl+c, or names q:\n%s", screen.name, width, height, screen.frame)
				}
			}
		}
	}
	if _, cmd := form.Update(keyMsg("ctrl+c")); cmd == nil {
		t.Errorf("ctrl+c in the form on a small terminal did not quit")
	}
	if _, cmd := note.Update(keyMsg("ctrl+c")); cmd == nil {
		t.Errorf("ctrl+c in the note box on a small terminal did not quit")
	}
}

// TestFooterOffersNoSwallowedKey opens every box with a text field (the
// assumptions form, renaming, a note on the review screen): the footer
// offers no key that the field would take as typed text (q, ?, a letter),
// and every key it offers does what it says there.
func TestFooterOffersNoSwallowedKey(t *testing.T) {
	printable := func(b key.Binding) bool {
		for _, k := range b.Keys() {
			if r := []rune(k); len(r) == 1 && unicode.IsPrint(r[0]) {
				return true
			}
		}
		return false
	}
	m := loaded(t, tenRows(t), tenAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 100, 30)
	form := keys(m, "a")
	rename := keys(m, "p", "tab", "r")
	r, _ := newTestReview(t, 120, 32)
	note, _ := sendReview(t, r, keyPress("n"))
	for _, tc := range []struct {
		name   string
		footer string
		hints  []key.Binding
	}{
		{"assumptions form", form.footer(), form.overlays[len(form.overlays)-1].ShortHelp()},
		{"rename box", rename.footer(), rename.overlays[len(rename.overlays)-1].ShortHelp()},
		{"note box", note.footer(), note.overlays[len(note.overlays)-1].ShortHelp()},
	} {
		for _, b := range tc.hints {
			if printable(b) {
				t.Errorf("%s: the footer offers %q, which the field takes as text", tc.name, b.Help().Key)
			}
		}
		if strings.Contains(tc.footer, "q quit") || strings.Contains(tc.footer, "? all keys") || !strings.Contains(tc.footer, "ctrl+c quit") {
			t.Errorf("%s: footer %q offers q or ?, or not ctrl+c", tc.name, tc.footer)
		}
	}
	// ctrl+c quits from the note box, as q does without it: at once
	// with nothing changed, after asking with a note not written.
	if _, cmd := note.Update(keyMsg("ctrl+c")); cmd == nil {
		t.Errorf("ctrl+c in the note box did not quit")
	}
	changed, _ := sendReview(t, typeNote(t, note, "quick note"), keyPress("enter"))
	changed, _ = sendReview(t, changed, keyPress("n"))
	asked, cmd := sendReview(t, changed, keyMsg("ctrl+c"))
	if q, ok := asked.overlays[len(asked.overlays)-1].(*question[*Review]); cmd != nil || !ok || q.title != quitTitle {
		t.Fatalf("ctrl+c with a note not written: cmd %v, overlays %v, want the question", cmd != nil, asked.overlays)
	}
	if _, cmd := asked.Update(keyMsg("ctrl+c")); cmd == nil {
		t.Errorf("ctrl+c at the question did not quit")
	}
}

// TestFitStatus: a line too long for its room keeps whole clauses, or a
// whole first part at a word, and never cuts a figure inside ("miss 1…").
func TestFitStatus(t *testing.T) {
	for _, tc := range []struct {
		status string
		width  int
		want   string
	}{
		{"fits as it is", 20, "fits as it is"},
		{"base rate 7.2% · costs: wrong alert 120, miss 1200, hit 0 · 95% intervals", 60, "base rate 7.2% · costs: wrong alert 120, miss 1200, hit 0 …"},
		{"base rate 7.2% · costs: wrong alert 120, miss 1200, hit 0 · 95% intervals", 50, "base rate 7.2% …"},
		{"resampled 100 times; warning: the scores are not calibrated", 30, "resampled 100 times …"},
		{"no clause boundary in this rather long line of words", 30, "no clause boundary in this …"},
		{"Unbreakablewordthatislongerthanthespace", 20, "Unbreakablewordthat…"},
	} {
		got := fitStatus(tc.status, tc.width)
		if got != tc.want || ansi.StringWidth(got) > tc.width {
			t.Errorf("fitStatus(%q, %d) = %q, want %q", tc.status, tc.width, got, tc.want)
		}
	}
}

// TestLongStatusWraps: at 80 columns a status longer than the footer's
// room starts on a line of its own above the keys, whole, and the screen
// keeps its size; the review screen's lines keep whole figures.
func TestLongStatusWraps(t *testing.T) {
	set := demoSet(t)
	m := loaded(t, set, demoAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 80, 24)
	m.status = "resampled 100 times · warning: the scores are not calibrated for costing (e)"
	v := ansi.Strip(m.View())
	checkSize(t, v, 80, 24)
	lines := strings.Split(v, "\n")
	if got := strings.TrimRight(lines[22], " "); got != m.status {
		t.Errorf("line 23 %q, want the whole status", got)
	}
	if !strings.HasSuffix(strings.TrimRight(lines[23], " "), "? all keys · q quit") {
		t.Errorf("last line %q, want the keys", lines[23])
	}

	r, _ := newTestReview(t, 80, 24)
	rv := ansi.Strip(r.View())
	checkSize(t, rv, 80, 24)
	for _, line := range strings.Split(rv, "\n") {
		for _, cut := range []string{"miss 1…", "miss 12…", "miss 120…", "written 20…"} {
			if strings.Contains(line, cut) {
				t.Errorf("a figure cut inside: %q", line)
			}
		}
	}
	if !strings.Contains(rv, "base rate 7.2% · 1500 per shift · capacity 90 …") {
		t.Errorf("the assumptions line does not keep whole clauses:\n%s", rv)
	}
}
