package tui

import (
	"bytes"
	"errors"
	"path/filepath"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/exp/teatest"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/scores"
)

// These flows run the explorer as a program, keys in and the final model
// and the written file out. They wait for text on screen before the next
// key (the scores load in the background), never for a time.

func startProgram(t *testing.T, cfg Config, width, height int) *teatest.TestModel {
	t.Helper()
	tm := teatest.NewTestModel(t, New(cfg), teatest.WithInitialTermSize(width, height))
	waitText(t, tm, "flag score")
	return tm
}

func waitText(t *testing.T, tm *teatest.TestModel, text string) {
	t.Helper()
	teatest.WaitFor(t, tm.Output(), func(out []byte) bool { return bytes.Contains(out, []byte(text)) },
		teatest.WithDuration(10*time.Second), teatest.WithCheckInterval(20*time.Millisecond))
}

func finalModel(t *testing.T, tm *teatest.TestModel) Model {
	t.Helper()
	return tm.FinalModel(t, teatest.WithFinalTimeout(10*time.Second)).(Model)
}

// TestFlowPinCompareWrite: a modeller pins the 80% hit share and the
// capacity cuts, chooses the capacity one in the strip and writes the file.
func TestFlowPinCompareWrite(t *testing.T) {
	set := demoSet(t)
	out := filepath.Join(t.TempDir(), "cut.yaml")
	tm := startProgram(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions, Out: out}, 100, 30)
	tm.Type("2p4p")
	tm.Send(tea.KeyMsg{Type: tea.KeyTab})
	tm.Type("cw")
	waitText(t, tm, "wrote")
	tm.Type("q")
	m := finalModel(t, tm)

	if got := m.Pins(); len(got) != 2 || got[0] != "hit=0.8" || got[1] != "queue=90" {
		t.Errorf("pins %v, want hit=0.8 and queue=90", got)
	}
	if m.Written() != out {
		t.Fatalf("written %q, want %q", m.Written(), out)
	}
	f, err := decision.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	// The cuts the rules pick, found here straight from the engine.
	a, _ := demoAssumptions(set)
	outcomes, err := cutrule.Find([]cutrule.Rule{{Kind: cutrule.Hit, Value: 0.8}, {Kind: cutrule.Queue, Value: 90}}, curve.New(set), a)
	if err != nil {
		t.Fatal(err)
	}
	if f.Chosen != "queue=90" || len(f.Candidates) != 2 {
		t.Fatalf("file chose %q among %d candidates", f.Chosen, len(f.Candidates))
	}
	for i, o := range outcomes {
		if got := f.Candidates[i].Cut.Score; got != o.Point.Score {
			t.Errorf("candidate %d score %v, want %v", i, got, o.Point.Score)
		}
		if got := f.Candidates[i].Rule; got != o.Rule.String() {
			t.Errorf("candidate %d rule %q, want %q", i, got, o.Rule.String())
		}
	}
	if f.Data.SHA256 != set.SHA256() || f.Data.Rows != set.Len() {
		t.Errorf("file data %+v does not describe the set", f.Data)
	}
}

// TestFlowAssumptionsThenWrite changes the base rate in the form and writes:
// the file carries the new assumption.
func TestFlowAssumptionsThenWrite(t *testing.T) {
	out := filepath.Join(t.TempDir(), "cut.yaml")
	tm := startProgram(t, Config{Load: func(func(int)) (*scores.Set, error) { return tenRows(t), nil }, Assume: tenAssumptions, Out: out}, 100, 30)
	tm.Type("a")
	waitText(t, tm, "assumptions")
	tm.Send(tea.KeyMsg{Type: tea.KeyCtrlU})
	tm.Type("10%")
	tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
	waitText(t, tm, "assumptions changed")
	tm.Type("w")
	waitText(t, tm, "wrote")
	tm.Type("q")
	m := finalModel(t, tm)
	f, err := decision.ReadFile(m.Written())
	if err != nil {
		t.Fatal(err)
	}
	if !floatcmp.Equal(f.Assumptions.BaseRate, 0.1) || f.Assumptions.Volume != 100 {
		t.Errorf("file assumptions %+v, want base rate 0.1 and volume 100", f.Assumptions)
	}
}

// TestFlowLoadError: a file that does not read ends the program by itself,
// and the final model carries the error for the command to print.
func TestFlowLoadError(t *testing.T) {
	bad := &scores.ParseError{File: "scores.csv", Line: 3, Column: "score", Err: scores.ErrBadScore}
	tm := teatest.NewTestModel(t, New(Config{
		Load:   func(func(int)) (*scores.Set, error) { return nil, bad },
		Assume: tenAssumptions,
	}), teatest.WithInitialTermSize(80, 24))
	m := finalModel(t, tm)
	var pe *scores.ParseError
	if !errors.As(m.Err(), &pe) || pe.Line != 3 {
		t.Errorf("final error %v, want the parse error of line 3", m.Err())
	}
}
