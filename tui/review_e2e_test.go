package tui

import (
	"bytes"
	"path/filepath"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/exp/teatest"

	"github.com/sill-tool/sill/internal/decision"
)

// TestFlowReviewChooseNoteWrite runs the review screen as a program: a
// lead moves to the least-cost candidate, chooses it, notes why and writes
// the file. It waits for text on screen before the next key, never for a
// time, and asserts on the final model and the written file.
func TestFlowReviewChooseNoteWrite(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	f, stamp := reviewFile(t, path)
	tm := teatest.NewTestModel(t, NewReview(ReviewConfig{File: f, Path: path, Stamp: stamp}), teatest.WithInitialTermSize(120, 32))
	waitReview(t, tm, "comparison strip")
	tm.Type("l")
	waitReview(t, tm, "note on cost")
	tm.Type("c")
	waitReview(t, tm, "chosen: cost")
	tm.Type("n")
	waitReview(t, tm, "characters")
	tm.Type("least cost per shift")
	tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
	waitReview(t, tm, "note on cost set")
	tm.Type("w")
	waitReview(t, tm, "written to")
	tm.Type("q")
	m := tm.FinalModel(t, teatest.WithFinalTimeout(10*time.Second)).(Review)
	if !m.Written() || m.Changed() {
		t.Fatalf("written %v, changed %v", m.Written(), m.Changed())
	}
	back, err := decision.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if back.Chosen != "cost" || back.Candidates[3].Note != "least cost per shift" {
		t.Errorf("file chose %q with note %q", back.Chosen, back.Candidates[3].Note)
	}
}

func waitReview(t *testing.T, tm *teatest.TestModel, text string) {
	t.Helper()
	teatest.WaitFor(t, tm.Output(), func(out []byte) bool { return bytes.Contains(out, []byte(text)) },
		teatest.WithDuration(10*time.Second), teatest.WithCheckInterval(20*time.Millisecond))
}
