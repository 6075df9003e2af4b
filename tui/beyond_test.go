package tui

import (
	"fmt"
	"math"
	"math/rand/v2"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/analysis"
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
		Analysis: analysis.Options{Shifts: threeShifts(t), Resampling: analysis.Resampling{Replicates: 100, Seed: 1}}}, width, height)
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

// twoModels is the demo with a second model's scores: a noisier reading of
// the same log-odds, seeded, so that the first model ranks better.
func twoModels(t testing.TB) *scores.Set {
	t.Helper()
	set := demoSet(t)
	rng := rand.New(rand.NewPCG(11, 12))
	return withColumns(t, set, func(c *scores.Columns) {
		c.CompareScores = make([]float64, set.Len())
		for i, s := range set.Scores() {
			s = min(max(s, 1e-6), 1-1e-6)
			logit := 0.8*math.Log(s/(1-s)) + 0.9*rng.NormFloat64()
			c.CompareScores[i] = math.Round(1000/(1+math.Exp(-logit))) / 1000
		}
		c.CompareColumn = "score_b"
	})
}

// manySegments is a seeded set of 2000 rows in 40 depots, one of which
// catches far fewer of its true cases than the rest.
func manySegments(t testing.TB) *scores.Set {
	t.Helper()
	rng := rand.New(rand.NewPCG(21, 22))
	n := 2000
	values, labels := make([]float64, n), make([]bool, n)
	depot := make([]int32, n)
	for i := range n {
		depot[i] = int32(rng.IntN(40))
		labels[i] = rng.Float64() < 0.1
		latent := rng.NormFloat64()
		if labels[i] && depot[i] != 7 {
			latent += 2
		}
		values[i] = math.Round(1000/(1+math.Exp(-(latent-2)))) / 1000
	}
	names := make([]string, 40)
	for i := range names {
		names[i] = fmt.Sprintf("depot-%02d", i)
	}
	set, err := scores.NewSet(scores.Columns{
		Scores: values, Labels: labels, SegmentOf: depot, SegmentNames: names,
		SegmentColumn: "depot", Source: "depots.csv",
	})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// TestBeyondView draws the screens of issue 6 at fixed sizes with colour
// off: the demo as sill with no arguments opens it (yards, reading times,
// three crew shifts), its overlays, the bootstrap's band and spread, and
// two models.
func TestBeyondView(t *testing.T) {
	demoTimed := demoTimedSet(t)
	two := twoModels(t)
	depots := manySegments(t)
	scaled := withColumns(t, tenRows(t), func(c *scores.Columns) {
		c.Scores = slices.Clone(c.Scores)
		for i := range c.Scores {
			c.Scores[i] *= 10 // not probabilities
		}
	})
	cases := []struct {
		name          string
		set           *scores.Set
		width, height int
		keys          []string
		resample      bool     // run the bootstrap after keys, then press after
		after         []string // keys after the bootstrap
	}{
		{name: "demo-100x30", set: demoTimed, width: 100, height: 30},
		{name: "demo-80x24-queue90", set: demoTimed, width: 80, height: 24, keys: []string{"6"}},
		{name: "segments-80x24", set: demoTimed, width: 80, height: 24, keys: []string{"s"}},
		{name: "segments-100x30-by-gap-two-down", set: demoTimed, width: 100, height: 30, keys: []string{"s", "o", "j", "j"}},
		{name: "segments-many-80x24-page-down", set: depots, width: 80, height: 24, keys: []string{"2", "s", "pgdown"}},
		{name: "segments-many-120x40-by-gap", set: depots, width: 120, height: 40, keys: []string{"2", "s", "o"}},
		{name: "segments-gaps-100x30", set: demoTimed, width: 100, height: 30, keys: []string{"s", "v"}},
		{name: "segments-many-gaps-80x24-by-gap", set: depots, width: 80, height: 24, keys: []string{"2", "s", "o", "v"}},
		{name: "segments-many-gaps-80x24-adjusted-p", set: depots, width: 80, height: 24, keys: []string{"2", "s", "o", "v", "v"}},
		{name: "segments-gaps-80x24", set: demoTimed, width: 80, height: 24, keys: []string{"s", "v"}},
		{name: "segments-gaps-80x24-adjusted-p", set: demoTimed, width: 80, height: 24, keys: []string{"s", "v", "v"}},
		{name: "segments-gaps-80x24-back-to-figures", set: demoTimed, width: 80, height: 24, keys: []string{"s", "v", "v", "v"}},
		{name: "segments-many-gaps-140x40", set: depots, width: 140, height: 40, keys: []string{"2", "s", "v"}},
		{name: "calibration-80x24", set: demoTimed, width: 80, height: 24, keys: []string{"e"}},
		{name: "calibration-100x30-resampled-cost", set: demoTimed, width: 100, height: 30, resample: true, after: []string{"5", "e"}},
		{name: "calibration-80x24-not-probabilities", set: scaled, width: 80, height: 24, keys: []string{"e"}},
		{name: "resampling-80x24", set: demoTimed, width: 80, height: 24, keys: []string{"b"}},
		{name: "stability-100x30-hit", set: demoTimed, width: 100, height: 30, resample: true, after: []string{"2"}},
		{name: "stability-80x24-base", set: demoTimed, width: 80, height: 24, resample: true},
		{name: "stability-100x30-queue90", set: demoTimed, width: 100, height: 30, resample: true, after: []string{"6"}},
		{name: "stability-100x30-all-chart", set: demoTimed, width: 100, height: 30, resample: true, after: []string{"v", "j"}},
		// Each pin's redraws sit under its hit share, within 80 columns.
		{name: "strip-80x24-resampled-pins", set: demoTimed, width: 80, height: 24, keys: []string{"1", "p", "2", "p"}, resample: true, after: []string{"tab"}},
		{name: "strip-100x30-resampled-pins", set: demoTimed, width: 100, height: 30, keys: []string{"1", "p", "2", "p", "end", "p"}, resample: true, after: []string{"tab"}},
		{name: "two-models-100x30", set: two, width: 100, height: 30},
		{name: "two-models-100x30-roc", set: two, width: 100, height: 30, keys: []string{"v", "v"}},
		{name: "two-models-100x30-overlay", set: two, width: 100, height: 30, keys: []string{"2", "m"}},
		{name: "help-80x24-demo", set: demoTimed, width: 80, height: 24, keys: []string{"?"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			set := tc.set
			cfg := Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions, Analysis: analysis.Options{Resampling: analysis.Resampling{Replicates: 100, Seed: 1}}}
			if set.Times() != nil {
				cfg.Analysis.Shifts = threeShifts(t)
			}
			if set == scaled {
				cfg.Assume = tenAssumptions
			}
			m := loadedWith(t, cfg, tc.width, tc.height)
			if tc.keys != nil && tc.keys[len(tc.keys)-1] == "b" {
				// Press b without running the work: the frame shows the
				// progress at its start.
				next, _ := m.Update(keyMsg("b"))
				m = next.(Model)
			} else {
				m = keys(m, tc.keys...)
			}
			if tc.resample {
				m = resample(t, m)
				m = keys(m, tc.after...)
			}
			checkFrame(t, tc.name, m.View(), tc.width, tc.height)
		})
	}
}
