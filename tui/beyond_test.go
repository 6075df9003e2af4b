package tui

import (
	"path/filepath"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

// demoTimedSet reads the built-in demo data with its reading times, as
// sill with no arguments does.
func demoTimedSet(t testing.TB) *scores.Set {
	t.Helper()
	set, err := scores.Read(strings.NewReader(string(demo.CSV(demo.DefaultRows, demo.DefaultSeed))), demo.Source,
		scores.Options{SegmentColumn: "yard", IDColumn: "id", TimeColumn: "read_at"})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// threeShifts is the demo's schedule.
func threeShifts(t testing.TB) *shift.Schedule {
	t.Helper()
	sched, err := shift.ParseSchedule("06:00,14:00,22:00", time.UTC)
	if err != nil {
		t.Fatal(err)
	}
	return &sched
}

// loadedWith is loaded with a Config of the caller's beyond the basics.
func loadedWith(t testing.TB, cfg Config, width, height int) Model {
	t.Helper()
	if cfg.Out == "" {
		cfg.Out = filepath.Join(t.TempDir(), "cut.yaml")
	}
	m := New(cfg)
	m = send(m, tea.WindowSizeMsg{Width: width, Height: height})
	msg := m.loadCmd()()
	if _, ok := msg.(scoresLoadedMsg); !ok {
		t.Fatalf("load gave %#v", msg)
	}
	return send(m, msg)
}

// demoBeyond is the demo as sill with no arguments opens it: yards,
// reading times and the three crew shifts.
func demoBeyond(t testing.TB, width, height int) Model {
	t.Helper()
	set := demoTimedSet(t)
	return loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions,
		Shifts: threeShifts(t), Replicates: 100, Seed: 1}, width, height)
}

// resample presses the stability key and runs the bootstrap it starts to
// the end, in the test's goroutine.
func resample(t testing.TB, m Model) Model {
	t.Helper()
	next, cmd := m.Update(keyMsg("b"))
	m = next.(Model)
	if cmd == nil {
		t.Fatal("b started nothing")
	}
	batch, ok := cmd().(tea.BatchMsg)
	if !ok || len(batch) == 0 {
		t.Fatalf("b gave %T", cmd())
	}
	msg := batch[0]()
	if _, ok := msg.(resampledMsg); !ok {
		t.Fatalf("the bootstrap gave %#v", msg)
	}
	next, _ = m.Update(msg)
	return next.(Model)
}
