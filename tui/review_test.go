package tui

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// reviewFile saves four cuts of the demo data, as sill report --save does,
// at path, with a fixed creation time.
func reviewFile(t *testing.T, path string) (*decision.File, sharedfile.Stamp) {
	t.Helper()
	set := demoSet(t)
	a, _ := demoAssumptions(set)
	rules := []cutrule.Rule{{Kind: cutrule.Hit, Value: 0.8}, {Kind: cutrule.Base}, {Kind: cutrule.Queue, Value: 90}, {Kind: cutrule.Cost}}
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{Rules: rules})
	if err != nil {
		t.Fatal(err)
	}
	var picks []decision.Pick
	for _, o := range res.Outcomes {
		picks = append(picks, decision.Pick{Name: o.Rule.String(), Rule: o.Rule.String(), Point: o.Point})
	}
	f, err := decision.New(res, picks, "queue=90", decision.Record{ToolVersion: "sill 1.2.0"})
	if err != nil {
		t.Fatal(err)
	}
	f.Created = time.Date(2026, 9, 29, 14, 5, 0, 0, time.UTC)
	f.Candidates[2].Note = "one crew shift works it"
	if _, err := decision.Write(context.Background(), path, f, decision.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	back, stamp, err := decision.ReadFileStamped(path)
	if err != nil {
		t.Fatal(err)
	}
	return back, stamp
}

// sendReview passes one message to Update and runs a write command it
// returns, feeding its message back.
func sendReview(t *testing.T, r Review, msg tea.Msg) (Review, tea.Cmd) {
	t.Helper()
	next, cmd := r.Update(msg)
	r = next.(Review)
	if cmd != nil {
		switch out := cmd().(type) {
		case reviewWrittenMsg, reviewWriteFailedMsg:
			next, _ = r.Update(out)
			return next.(Review), nil
		}
	}
	return r, cmd
}

func keyPress(s string) tea.KeyMsg {
	switch s {
	case "enter":
		return tea.KeyMsg{Type: tea.KeyEnter}
	case "esc":
		return tea.KeyMsg{Type: tea.KeyEsc}
	case "right":
		return tea.KeyMsg{Type: tea.KeyRight}
	case "left":
		return tea.KeyMsg{Type: tea.KeyLeft}
	case "down":
		return tea.KeyMsg{Type: tea.KeyDown}
	case "up":
		return tea.KeyMsg{Type: tea.KeyUp}
	}
	return tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(s)}
}

func typeNote(t *testing.T, r Review, text string) Review {
	for _, c := range text {
		if c == ' ' {
			r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeySpace})
			continue
		}
		r, _ = sendReview(t, r, keyPress(string(c)))
	}
	return r
}

func newTestReview(t *testing.T, width, height int) (Review, string) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "cut.yaml")
	f, stamp := reviewFile(t, path)
	r := NewReview(ReviewConfig{File: f, Path: "cut.yaml", Stamp: stamp})
	r.saveTo = path // the frames show the path as typed
	r, _ = sendReview(t, r, tea.WindowSizeMsg{Width: width, Height: height})
	return r, path
}

// view draws r.
func view(r Review, _ string) string { return r.View() }

func TestReviewView(t *testing.T) {
	for _, size := range [][2]int{{120, 32}, {80, 24}, {60, 16}} {
		w, h := size[0], size[1]
		r, path := newTestReview(t, w, h)
		name := func(state string) string { return "review-" + strconv.Itoa(w) + "x" + strconv.Itoa(h) + "-" + state }
		checkFrame(t, name("opened"), view(r, path), w, h)
		if w == 80 {
			// The rows below scroll into view, each interval under its
			// figure, the section's heading kept on top.
			for range 10 {
				r, _ = sendReview(t, r, keyPress("j"))
			}
			checkFrame(t, name("scrolled-to-the-end"), view(r, path), w, h)
		}
		if w != 120 {
			continue
		}
		r, _ = sendReview(t, r, keyPress("right"))
		checkFrame(t, name("selected-cost"), view(r, path), w, h)
		r, _ = sendReview(t, r, keyPress("c"))
		checkFrame(t, name("chose-cost"), view(r, path), w, h)
		r, _ = sendReview(t, r, keyPress("n"))
		r = typeNote(t, r, "cheapest; lead prefers it")
		checkFrame(t, name("editing-note"), view(r, path), w, h)
		r, _ = sendReview(t, r, keyPress("enter"))
		r, _ = sendReview(t, r, keyPress("?"))
		checkFrame(t, name("help"), view(r, path), w, h)
		r, _ = sendReview(t, r, keyPress("esc"))
		r, _ = sendReview(t, r, keyPress("q"))
		checkFrame(t, name("quit-unsaved"), view(r, path), w, h)
	}
	// Taller: the notes pane has room for what the selected candidate's
	// rule promises (none for queue=90, the least-cost figure's optimism
	// for cost, "on this set only" for hit=0.8).
	r, path := newTestReview(t, 120, 40)
	checkFrame(t, "review-120x40-opened", view(r, path), 120, 40)
	r, _ = sendReview(t, r, keyPress("right"))
	checkFrame(t, "review-120x40-selected-cost", view(r, path), 120, 40)
	for range 3 {
		r, _ = sendReview(t, r, keyPress("left"))
	}
	checkFrame(t, "review-120x40-selected-hit", view(r, path), 120, 40)
	r, path = newTestReview(t, 50, 12)
	checkFrame(t, "review-50x12-too-small", view(r, path), 50, 12)
}

func TestReviewChooseNoteWrite(t *testing.T) {
	r, path := newTestReview(t, 120, 32)
	before, _ := os.ReadFile(path)
	original, _ := decision.ReadFile(path)

	// Select the last candidate (cost), choose it, note on it and on the file.
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("right")) // already the last: stays
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("n"))
	r = typeNote(t, r, "cheapest")
	r, _ = sendReview(t, r, keyPress("enter"))
	r, _ = sendReview(t, r, keyPress("N"))
	r = typeNote(t, r, "signed off at the October review")
	r, _ = sendReview(t, r, keyPress("enter"))
	// A note opened and left with esc changes nothing.
	r, _ = sendReview(t, r, keyPress("left"))
	r, _ = sendReview(t, r, keyPress("n"))
	r = typeNote(t, r, " and more")
	r, _ = sendReview(t, r, keyPress("esc"))
	if !r.Changed() {
		t.Fatal("no change recorded")
	}
	if got, _ := os.ReadFile(path); string(got) != string(before) {
		t.Fatal("the file changed before w")
	}

	r, _ = sendReview(t, r, keyPress("w"))
	if r.Changed() || !r.Written() || !strings.Contains(r.status, "written to") {
		t.Fatalf("after w: changed %v written %v status %q", r.Changed(), r.Written(), r.status)
	}
	back, err := decision.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if back.Chosen != "cost" || back.Note != "signed off at the October review" ||
		back.Candidates[3].Note != "cheapest" || back.Candidates[2].Note != "one crew shift works it" {
		t.Errorf("written: chosen %q note %q notes %q / %q", back.Chosen, back.Note, back.Candidates[3].Note, back.Candidates[2].Note)
	}
	// The evidence is untouched.
	for i := range original.Candidates {
		if back.Candidates[i].Cut != original.Candidates[i].Cut && !sameCut(back.Candidates[i].Cut, original.Candidates[i].Cut) {
			t.Errorf("candidate %d figures changed", i)
		}
	}
	if back.Data.SHA256 != original.Data.SHA256 || !back.Created.Equal(original.Created) {
		t.Error("the data or creation time changed")
	}
	// Nothing changed now: q quits at once.
	if _, cmd := r.Update(keyPress("q")); cmd == nil {
		t.Error("q with nothing to write did not quit")
	}
}

// sameCut compares two cuts figure by figure, NaN equal to NaN.
func sameCut(a, b evidence.Cut) bool {
	fa := []float64{a.Score, a.Flagged, a.TP, a.FP, a.FN, a.TN, a.Recall, a.Precision, a.FalsePositiveRate, a.Projected.AlertRate, a.Projected.CostPerShift}
	fb := []float64{b.Score, b.Flagged, b.TP, b.FP, b.FN, b.TN, b.Recall, b.Precision, b.FalsePositiveRate, b.Projected.AlertRate, b.Projected.CostPerShift}
	for i := range fa {
		if fa[i] != fb[i] && !(fa[i] != fa[i] && fb[i] != fb[i]) {
			return false
		}
	}
	return a.Rows == b.Rows
}

func TestReviewQuitAsks(t *testing.T) {
	r, path := newTestReview(t, 100, 30)
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, cmd := sendReview(t, r, keyPress("q"))
	if q, ok := r.overlays[0].(*question[*Review]); cmd != nil || len(r.overlays) != 1 || !ok || q.title != "changes not written" {
		t.Fatalf("q with changes: cmd %v overlays %v", cmd != nil, r.overlays)
	}
	r, _ = sendReview(t, r, keyPress("esc"))
	if len(r.overlays) != 0 {
		t.Fatal("esc did not close the question")
	}
	r, _ = sendReview(t, r, keyPress("q"))
	_, cmd = r.Update(keyPress("q"))
	if cmd == nil {
		t.Fatal("q q did not quit")
	}
	if back, _ := decision.ReadFile(path); back.Chosen != "queue=90" {
		t.Errorf("quitting without writing wrote the file: chosen %q", back.Chosen)
	}
}

// A save made after the screen read the file is never written over: w
// is refused, the other's save stays (a lost update before) and the
// screen asks: r reloads the file, o writes the changes to another file.
func TestReviewRefusesLostUpdate(t *testing.T) {
	for _, tc := range []struct {
		name  string
		other func(f *decision.File)
	}{
		{"another note on the same data", func(f *decision.File) { f.Note = "approved at the October review" }},
		{"other data", func(f *decision.File) { f.Data.SHA256 = strings.Repeat("0", 64) }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r, path := newTestReview(t, 100, 30)
			// Someone else saves the file after this screen read it.
			other, _ := decision.ReadFile(path)
			tc.other(other)
			if _, err := decision.Write(context.Background(), path, other, decision.WriteOptions{Force: true}); err != nil {
				t.Fatal(err)
			}
			saved, _ := os.ReadFile(path)
			r, _ = sendReview(t, r, keyPress("right"))
			r, _ = sendReview(t, r, keyPress("c"))
			r, _ = sendReview(t, r, keyPress("w"))
			if got, _ := os.ReadFile(path); !bytes.Equal(got, saved) {
				t.Fatal("w wrote over the other's save")
			}
			if r.Written() || !r.Changed() || !errors.Is(r.WriteErr(), sharedfile.ErrChanged) {
				t.Fatalf("written %v, changed %v, write error %v", r.Written(), r.Changed(), r.WriteErr())
			}
			if len(r.overlays) != 1 || !strings.Contains(r.overlays[0].View(), "cut.yaml changed on disk since this screen read or wrote it") {
				t.Fatalf("no question after the refused write: %d overlays", len(r.overlays))
			}

			// o: the changes go to another file, which w writes from then on.
			elsewhere := filepath.Join(filepath.Dir(path), "mine.yaml")
			r, _ = sendReview(t, r, keyPress("o"))
			r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyCtrlU}) // clears the field
			r = typeNote(t, r, elsewhere)
			r, _ = sendReview(t, r, keyPress("enter"))
			if back, err := decision.ReadFile(elsewhere); err != nil || back.Chosen != "cost" || !r.Written() || r.WriteErr() != nil || r.path != elsewhere {
				t.Fatalf("write elsewhere: %v, written %v, error %v, path %q", err, r.Written(), r.WriteErr(), r.path)
			}
			if got, _ := os.ReadFile(path); !bytes.Equal(got, saved) {
				t.Fatal("writing elsewhere touched the other's save")
			}
		})
	}
	// r: the screen reloads the file as the other saved it.
	r, path := newTestReview(t, 100, 30)
	other, _ := decision.ReadFile(path)
	other.Note = "approved at the October review"
	if _, err := decision.Write(context.Background(), path, other, decision.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("w"))
	r, _ = sendReview(t, r, keyPress("r"))
	if r.file.Note != other.Note || r.file.Chosen != "queue=90" || r.Changed() || r.WriteErr() != nil || len(r.overlays) != 0 {
		t.Fatalf("after reload: note %q, chosen %q, changed %v, error %v", r.file.Note, r.file.Chosen, r.Changed(), r.WriteErr())
	}
	// And w now writes over the reloaded file, which is still as read.
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("w"))
	if back, _ := decision.ReadFile(path); back.Note != other.Note || back.Chosen == "queue=90" || !r.Written() {
		t.Fatalf("w after reload: note %q, chosen %q", back.Note, back.Chosen)
	}
}

func TestLayoutReview(t *testing.T) {
	frame := frameSize{W: 2, H: 2}
	for _, tc := range []struct {
		w, h, stripLines int
		want             reviewLayout
	}{
		// 30 lines: header 2, strip 16 (14 lines + frame, all it needs),
		// notes the other 30-2-1-16 = 11, footer at line 29.
		{100, 30, 14, reviewLayout{header: rect{0, 0, 100, 2}, strip: rect{0, 2, 100, 16}, notes: rect{0, 18, 100, 11}, footer: rect{0, 29, 100, 1}}},
		// 16 lines: the strip gets what is left, 16-2-1-5 = 8.
		{60, 16, 14, reviewLayout{header: rect{0, 0, 60, 2}, strip: rect{0, 2, 60, 8}, notes: rect{0, 10, 60, 5}, footer: rect{0, 15, 60, 1}}},
		{59, 30, 14, reviewLayout{tooSmall: true}},
		{100, 15, 14, reviewLayout{tooSmall: true}},
	} {
		if got := layoutReview(tc.w, tc.h, tc.stripLines, frame); got != tc.want {
			t.Errorf("%dx%d: %+v, want %+v", tc.w, tc.h, got, tc.want)
		}
	}
}

// drawReviewLayout draws each rectangle of l as a labelled ASCII box.
func drawReviewLayout(l reviewLayout, width, height int) string {
	if l.tooSmall {
		return "too small\n"
	}
	grid := make([][]rune, height)
	for y := range grid {
		grid[y] = []rune(strings.Repeat(" ", width))
	}
	box := func(r rect, label string) {
		for x := r.X; x < r.X+r.W; x++ {
			grid[r.Y][x], grid[r.Y+r.H-1][x] = '-', '-'
		}
		for y := r.Y; y < r.Y+r.H; y++ {
			grid[y][r.X], grid[y][r.X+r.W-1] = '|', '|'
		}
		for _, c := range [][2]int{{r.X, r.Y}, {r.X + r.W - 1, r.Y}, {r.X, r.Y + r.H - 1}, {r.X + r.W - 1, r.Y + r.H - 1}} {
			grid[c[1]][c[0]] = '+'
		}
		if r.H == 1 {
			for x := r.X; x < r.X+r.W; x++ {
				grid[r.Y][x] = '='
			}
		}
		for i, ch := range label {
			if x := r.X + 2 + i; x < r.X+r.W-1 {
				grid[r.Y+r.H/2][x] = ch
			}
		}
	}
	box(l.header, "header")
	box(l.strip, "strip")
	box(l.notes, "notes")
	box(l.footer, "footer")
	var b strings.Builder
	for _, row := range grid {
		b.WriteString(string(row) + "\n")
	}
	return b.String()
}

func TestLayoutReviewDrawn(t *testing.T) {
	frame := frameSize{W: 2, H: 2}
	for _, tc := range []struct{ w, h, stripLines int }{{60, 16, 16}, {80, 24, 16}, {80, 40, 16}, {40, 20, 16}} {
		name := strconv.Itoa(tc.w) + "x" + strconv.Itoa(tc.h) + "-strip-" + strconv.Itoa(tc.stripLines) + "-lines"
		checkGolden(t, name, drawReviewLayout(layoutReview(tc.w, tc.h, tc.stripLines, frame), tc.w, tc.h))
	}
}

// TestReviewWriteAndQuit checks the question's w: the screen quits once
// the file is written, and stays, with the reason, when it is not.
func TestReviewWriteAndQuit(t *testing.T) {
	r, path := newTestReview(t, 100, 30)
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("q"))
	next, cmd := r.Update(keyPress("w"))
	r = next.(Review)
	if cmd == nil {
		t.Fatal("w in the question wrote nothing")
	}
	next, cmd = r.Update(cmd())
	r = next.(Review)
	if cmd == nil {
		t.Fatal("no quit after the write")
	}
	if _, ok := cmd().(tea.QuitMsg); !ok {
		t.Error("the command after the write is not quit")
	}
	if back, _ := decision.ReadFile(path); back.Chosen == "queue=90" || !r.Written() {
		t.Errorf("the file was not written: chosen %q", back.Chosen)
	}

	// A write that fails keeps the screen open with its reason.
	r, _ = newTestReview(t, 100, 30)
	r.saveTo = filepath.Join(t.TempDir(), "no such folder", "cut.yaml")
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("q"))
	next, cmd = r.Update(keyPress("w"))
	r = next.(Review)
	next, cmd = r.Update(cmd())
	r = next.(Review)
	if cmd != nil {
		t.Error("the screen quit although the write failed")
	}
	if !strings.HasPrefix(r.status, "not written: ") || !r.Changed() {
		t.Errorf("status %q, changed %v after a failed write", r.status, r.Changed())
	}
}

// TestReviewNoteCutShort checks that a note longer than the notes pane
// ends in … where it is cut, and shows whole where there is room.
func TestReviewNoteCutShort(t *testing.T) {
	note := "Signed off by the depot lead after the trial; revisit when the harbour sheds get their new sensors next spring."
	for _, tc := range []struct {
		w, h int
		cut  bool
	}{{80, 24, true}, {120, 40, false}} {
		r, _ := newTestReview(t, tc.w, tc.h)
		r.file.Note = note
		v := r.View()
		checkSize(t, v, tc.w, tc.h)
		var noteLine string
		for _, line := range strings.Split(v, "\n") {
			if strings.Contains(line, "file note: ") {
				noteLine = line
			}
		}
		if got := strings.Contains(noteLine, "…"); got != tc.cut {
			t.Errorf("%dx%d: file note line %q, cut mark %v, want %v", tc.w, tc.h, noteLine, got, tc.cut)
		}
		if !tc.cut && !strings.Contains(v, "spring.") {
			t.Errorf("%dx%d: the note's end is missing:\n%s", tc.w, tc.h, v)
		}
	}
}

// TestReviewChooseChosen checks that c on the chosen candidate changes
// nothing and says so.
func TestReviewChooseChosen(t *testing.T) {
	r, _ := newTestReview(t, 100, 30)
	r, _ = sendReview(t, r, keyPress("c"))
	if r.Changed() || r.status != "queue=90 is already the chosen one" {
		t.Errorf("c on the chosen one: changed %v, status %q", r.Changed(), r.status)
	}
}

// TestReviewEscThenKey checks that esc and a key read together as alt+key
// act as the two keys: the help closes and the selection moves.
func TestReviewEscThenKey(t *testing.T) {
	r, _ := newTestReview(t, 100, 30)
	before := r.selected
	r, _ = sendReview(t, r, keyPress("?"))
	r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyRight, Alt: true})
	if len(r.overlays) != 0 || r.selected != before+1 {
		t.Errorf("alt+right over the help: overlays %v, selected %d, want none and %d", r.overlays, r.selected, before+1)
	}
}

// TestReviewTypedAhead checks that keys typed ahead over a slow link and
// read as one message of several runes act one by one, as in the
// explorer: "lc" selects the next candidate and chooses it, "nok" opens
// the note box and types "ok" into it.
func TestReviewTypedAhead(t *testing.T) {
	r, _ := newTestReview(t, 100, 30)
	next := r.file.Candidates[r.selected+1].Name
	r, _ = sendReview(t, r, keyPress("lc"))
	if r.file.Chosen != next || !r.Changed() {
		t.Fatalf("lc: chosen %q changed %v, want %q chosen", r.file.Chosen, r.Changed(), next)
	}
	r, _ = sendReview(t, r, keyPress("nok"))
	r, _ = sendReview(t, r, keyPress("enter"))
	if got := r.file.Candidates[r.selected].Note; got != "ok" {
		t.Errorf("nok then enter: note %q, want \"ok\"", got)
	}
}

// TestReviewHeaderBaseRate checks that the header names the validation
// base rate beside production's when they differ (434 of 6000 cases in
// the demo: 7.2%), and only then.
func TestReviewHeaderBaseRate(t *testing.T) {
	r, _ := newTestReview(t, 120, 32)
	if h := r.header(120); strings.Contains(h, "validation") {
		t.Errorf("same base rate, header %q names the validation rate", h)
	}
	r.file.Assumptions.BaseRate = 0.01
	if h := r.header(120); !strings.Contains(h, "base rate 1.0% (validation 7.2%)") {
		t.Errorf("header %q does not name the validation rate", h)
	}
}

// TestReviewScrollsRows: at 80x24 the strip has 12 lines for the 17 rows
// it keeps (every interval among them and the least-cost cut's cost out
// of sample; only the share of all cases and the true cases found give
// way); j and k scroll them, stopping at either end,
// with the heading of the section in view on top; where every row fits
// the keys do nothing and the footer offers none.
func TestReviewScrollsRows(t *testing.T) {
	r, _ := newTestReview(t, 80, 24)
	if !r.strip.Scrollable() || !strings.Contains(r.footer(), "↑↓ more rows") {
		t.Fatalf("80x24: scrollable %v, footer %q", r.strip.Scrollable(), r.footer())
	}
	if got := strings.Count(ansi.Strip(r.View()), "95% interval"); got != 3 {
		t.Errorf("80x24 opened: %d interval rows in view, want 3 (hit share, wrong-alert share, alert rate)", got)
	}
	r, _ = sendReview(t, r, keyPress("k"))
	if w := r.strip.window(r.strip.rowLines()); w.first != 0 {
		t.Errorf("k at the top: first row %d", w.first)
	}
	for range 20 {
		r, _ = sendReview(t, r, keyPress("down"))
	}
	w := r.strip.window(r.strip.rowLines())
	if w.last != w.total || w.total != 17 || w.heading == nil || len(w.inView()) != 12 {
		t.Errorf("scrolled down: rows %d–%d of %d, heading %v, %d lines", w.first, w.last, w.total, w.heading != nil, len(w.inView()))
	}
	frame := ansi.Strip(r.View())
	if got := strings.Count(frame, "95% interval"); got != 4 || !strings.Contains(frame, "cost per shift") {
		t.Errorf("scrolled down: %d interval rows in view, want 4 with the cost:\n%s", got, frame)
	}
	r, _ = sendReview(t, r, keyPress("up"))
	if w2 := r.strip.window(r.strip.rowLines()); w2.first != w.first-1 {
		t.Errorf("up: first row %d, want %d", w2.first, w.first-1)
	}

	big, _ := newTestReview(t, 120, 32)
	big, _ = sendReview(t, big, keyPress("j"))
	if big.strip.Scrollable() || strings.Contains(big.footer(), "more rows") || big.strip.window(big.strip.rowLines()).first != 0 {
		t.Error("120x32: every row fits, yet the strip scrolls")
	}
}
