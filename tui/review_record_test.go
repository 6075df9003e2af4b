package tui

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/decision"
)

// signReview passes one message to Update and runs the sign-off command
// it returns, feeding its message back.
func signReview(t *testing.T, r Review, msg tea.Msg) Review {
	t.Helper()
	next, cmd := r.Update(msg)
	r = next.(Review)
	if cmd != nil {
		switch out := cmd().(type) {
		case reviewSignedMsg, reviewSignFailedMsg:
			next, _ = r.Update(out)
			r = next.(Review)
		}
	}
	return r
}

// TestReviewSignForm: S opens the form; an unknown verdict is refused in
// the form; a good one is appended to the file on disk at once and shows
// in the notes pane; the file's later write still goes through.
func TestReviewSignForm(t *testing.T) {
	r, path := newTestReview(t, 120, 32)
	if !strings.Contains(r.View(), "sign-offs: none yet; S signs off") {
		t.Fatalf("no hint to sign:\n%s", r.View())
	}
	r, _ = sendReview(t, r, keyPress("S"))
	r = typeNote(t, r, "Ada Quist")
	r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyTab})
	r = typeNote(t, r, "operations lead")
	r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyTab})
	r = typeNote(t, r, "maybe")
	before, _ := os.ReadFile(path)
	r = signReview(t, r, keyPress("enter"))
	if !strings.Contains(r.View(), "the verdict is approve, revise or reject") || len(r.overlays) != 1 {
		t.Fatalf("a bad verdict was not refused in the form:\n%s", r.View())
	}
	if after, _ := os.ReadFile(path); string(after) != string(before) {
		t.Fatal("a refused sign-off changed the file")
	}
	for range "maybe" {
		r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyBackspace})
	}
	r = typeNote(t, r, "approve")
	r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyTab})
	r = typeNote(t, r, "fits the night crew")
	r = signReview(t, r, keyPress("enter"))
	if len(r.overlays) != 0 || !strings.Contains(r.status, "signed: approve by Ada Quist") {
		t.Fatalf("status %q, %d overlays", r.status, len(r.overlays))
	}
	f, err := decision.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(f.SignOffs) != 1 || f.SignOffs[0].Name != "Ada Quist" || f.SignOffs[0].Role != "operations lead" ||
		f.SignOffs[0].Note != "fits the night crew" || f.SignOffs[0].Chosen != "queue=90" {
		t.Fatalf("sign-offs on disk %+v", f.SignOffs)
	}
	if v := r.View(); !strings.Contains(v, "approve  Ada Quist, operations lead: fits the night crew") {
		t.Errorf("the sign-off is not on screen:\n%s", v)
	}
	// The screen expects the file as signed: a change written now lands
	// and keeps the sign-off.
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("w"))
	back, err := decision.ReadFile(path)
	if err != nil || back.Chosen == "queue=90" || len(back.SignOffs) != 1 {
		t.Fatalf("after writing: %v, chosen %q, %d sign-offs (status %q)", err, back.Chosen, len(back.SignOffs), r.status)
	}
	// With the choice changed and not written, the form refuses to sign.
	r, _ = sendReview(t, r, keyPress("left"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("S"))
	r = typeNote(t, r, "Bo")
	r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyTab})
	r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyTab})
	r = typeNote(t, r, "reject")
	r = signReview(t, r, keyPress("enter"))
	if !strings.Contains(r.View(), "write the changes first") {
		t.Errorf("signed a choice not written (changed %v, status %q):\n%s", r.changed, r.status, r.View())
	}
}

// TestReviewChart: t draws the stored curve with the explorer's chart,
// every candidate marked and the chosen one as the cursor; a sill-cut/1
// file has no curve, so the key is off and the screen says the file will
// be upgraded.
func TestReviewChart(t *testing.T) {
	r, _ := newTestReview(t, 100, 30)
	r, _ = sendReview(t, r, keyPress("t"))
	o, ok := r.overlays[len(r.overlays)-1].(*chartOverlay)
	if !ok {
		t.Fatal("t opened no chart")
	}
	s := o.pane.s
	if s.curve.Len() != len(r.file.Curve) || len(s.pins) != len(r.file.Candidates) {
		t.Fatalf("%d cuts for %d stored, %d pins for %d candidates", s.curve.Len(), len(r.file.Curve), len(s.pins), len(r.file.Candidates))
	}
	// The rebuilt curve is the stored one, cut for cut.
	for i, p := range r.file.Curve {
		q := s.curve.At(i)
		if q.Score != p.Score || q.TP != p.TP || q.FP != p.FP { // whole counts: sums of their differences are exact
			t.Fatalf("cut %d: %+v, stored %+v", i, q, p)
		}
	}
	chosen, _ := r.file.ChosenCandidate()
	if s.point().Score != chosen.Cut.Score {
		t.Errorf("cursor at %v, want the chosen %v", s.point().Score, chosen.Cut.Score)
	}
	v := r.View()
	checkSize(t, v, 100, 30)
	if !strings.Contains(v, "hit share ─") || !strings.Contains(v, "◇") || !strings.Contains(v, "▲") {
		t.Errorf("no chart with the candidates marked:\n%s", v)
	}

	v1, err := decision.ReadFile(filepath.Join("..", "internal", "decision", "testdata", "v1", "demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	old := NewReview(ReviewConfig{File: v1, Path: "demo.yaml"})
	if old.keys.Chart.Enabled() || !strings.Contains(old.status, "a sill-cut/1 file: writing it (w) or signing it (S) writes it as sill-cut/2") {
		t.Errorf("chart key %v, status %q", old.keys.Chart.Enabled(), old.status)
	}
}

// TestReviewAgainstPane: with the cut in production, d shows what
// changes, the change per shift first.
func TestReviewAgainstPane(t *testing.T) {
	r, _ := newTestReview(t, 100, 30)
	if r.keys.Against.Enabled() {
		t.Error("d is on without --against")
	}
	old := *r.file
	old.Candidates = append([]decision.Candidate(nil), r.file.Candidates...)
	old.Chosen = "base"
	r = NewReview(ReviewConfig{File: r.file, Path: "cut.yaml", Against: &old, AgainstPath: "old.yaml"})
	r, _ = sendReview(t, r, tea.WindowSizeMsg{Width: 100, Height: 30})
	r, _ = sendReview(t, r, keyPress("d"))
	v := r.View()
	checkSize(t, v, 100, 30)
	for _, want := range []string{"against the cut in production", "alerts: about 108 a shift now, about 90 with the proposed cut (18 fewer)", "figure                          in production     proposed   change", "measured on the validation set", "projected to production"} {
		if !strings.Contains(v, want) {
			t.Errorf("%q missing:\n%s", want, v)
		}
	}
}

// TestExplorerRecordForm: i sets the model and who chose; w writes them
// into the decision file with the stored curve and the candidates' shift
// queues; a file written without the form records neither.
func TestExplorerRecordForm(t *testing.T) {
	out := filepath.Join(t.TempDir(), "cut.yaml")
	m := loaded(t, demoSet(t), demoAssumptions, out, 120, 36)
	m = keys(m, "p", "i")
	if len(m.overlays) != 1 {
		t.Fatal("i opened no form")
	}
	m = typeText(m, "bearing-wear")
	m = keys(m, "tab")
	m = typeText(m, "14")
	m = keys(m, "tab")
	m = typeText(m, "Ines Varga")
	m = keys(m, "enter")
	if len(m.overlays) != 0 || !strings.Contains(m.status, "model and who chose set") {
		t.Fatalf("status %q", m.status)
	}
	m = keys(m, "w")
	f, err := decision.ReadFile(out)
	if err != nil {
		t.Fatalf("%v (status %q)", err, m.status)
	}
	if f.Model != (decision.Model{Name: "bearing-wear", Version: "14"}) || f.ChosenBy != "Ines Varga" || len(f.Curve) == 0 {
		t.Errorf("model %+v chosen by %q, %d curve points", f.Model, f.ChosenBy, len(f.Curve))
	}
	// esc leaves them as they were.
	m = keys(m, "i", "ctrl+u")
	m = typeText(m, "other")
	m = keys(m, "esc")
	if m.record.model.Name != "bearing-wear" {
		t.Errorf("esc changed the model to %q", m.record.model.Name)
	}
}

// TestReviewWriteKeepsSignOffs: a sign-off given while the screen is open
// (sill review --sign elsewhere) is kept when the screen writes its
// choice, and shows on screen after.
func TestReviewWriteKeepsSignOffs(t *testing.T) {
	r, path := newTestReview(t, 120, 32)
	if _, _, err := decision.AppendSignOff(context.Background(), path, decision.SignOff{Name: "Tomas Reiner", Verdict: decision.Approve, At: time.Now()}); err != nil {
		t.Fatal(err)
	}
	r, _ = sendReview(t, r, keyPress("right"))
	r, _ = sendReview(t, r, keyPress("c"))
	r, _ = sendReview(t, r, keyPress("w"))
	back, err := decision.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if back.Chosen != "cost" || len(back.SignOffs) != 1 || !r.Written() || !strings.Contains(r.status, "kept 1 sign-off(s) given meanwhile") {
		t.Fatalf("chosen %q, %d sign-offs, written %v, status %q", back.Chosen, len(back.SignOffs), r.Written(), r.status)
	}
	if back.ForCurrentChoice(back.SignOffs[0]) {
		t.Error("the sign-off for queue=90 reads as for the new choice")
	}
	if v := r.View(); !strings.Contains(v, "[given for the earlier choice queue=90 at score 0.36]") {
		t.Errorf("the earlier sign-off is not marked on screen:\n%s", v)
	}
}
