package main

import (
	"strings"
	"testing"
)

// TestExploreWithoutTerminal: the tests run without a terminal, so explore
// refuses with a way forward instead of drawing into a pipe, and standard
// input cannot be both the scores and the keys.
func TestExploreWithoutTerminal(t *testing.T) {
	path := writeFile(t, t.TempDir(), "scores.csv", []byte("score,label\n0.9,1\n0.2,0\n"))
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"explore", path}, "sill report " + path},
		{[]string{"explore", "-"}, "cannot read scores from standard input"},
		{[]string{"explore"}, "explore takes one argument, FILE"},
		{[]string{"explore", path, "--volume", "x"}, "invalid argument"},
		// The flags of the figures beyond the averages are checked before
		// the terminal.
		{[]string{"explore", path, "--shifts", "06:00,14:00"}, "--shifts needs --time"},
		{[]string{"explore", path, "--time", "at"}, "--time needs --shifts"},
		{[]string{"explore", path, "--time", "at", "--shifts", "25:00"}, "--shifts"},
		{[]string{"explore", path, "--compare", "other.csv"}, "--compare needs --id"},
		{[]string{"explore", path, "--segment-order", "colour"}, "--segment-order"},
		{[]string{"explore", path, "--bootstrap", "-3"}, "--bootstrap -3"},
		{[]string{"explore", path, "--time", "at", "--shifts", "06:00", "--tz", "Nowhere/Atlantis"}, "--tz"},
		{[]string{"explore", path, "--segment", "yard", "--time", "read_at", "--shifts", "06:00,14:00,22:00", "--bootstrap", "500", "--seed", "3"}, "sill report " + path},
	}
	for _, tc := range cases {
		r := runSill(t, "", tc.args...)
		if r.code != 2 || !strings.Contains(r.stderr, tc.want) {
			t.Errorf("sill %s: status %d, stderr %q; want 2 and %q", strings.Join(tc.args, " "), r.code, r.stderr, tc.want)
		}
		if r.stdout != "" {
			t.Errorf("sill %s wrote to stdout: %q", strings.Join(tc.args, " "), r.stdout)
		}
	}
}

// TestDemoConfig: sill with no arguments opens the demo with its yards as
// segments, its reading times in the three crew shifts and the demo
// assumptions.
func TestDemoConfig(t *testing.T) {
	cfg, err := demoConfig()
	if err != nil {
		t.Fatal(err)
	}
	shifts := cfg.Analysis.Shifts
	if shifts == nil || shifts.String() != "06:00,14:00,22:00" || cfg.Out != "cut.yaml" {
		t.Fatalf("shifts %v, out %q", shifts, cfg.Out)
	}
	// --bootstrap 0 means none, in explore as in report; the b key
	// resamples 200 times unless told otherwise.
	if r := cfg.Analysis.Resampling; r.Replicates != 200 || r.Seed != 1 {
		t.Errorf("resampling %+v, want 200 sets, seed 1", r)
	}
	set, err := cfg.Load(nil)
	if err != nil {
		t.Fatal(err)
	}
	if set.Times == nil || set.TimeColumn != "read_at" || set.SegmentColumn != "yard" || set.IDColumn != "id" {
		t.Errorf("demo set: times %v, time %q, segment %q, id %q", set.Times != nil, set.TimeColumn, set.SegmentColumn, set.IDColumn)
	}
	a, err := cfg.Assume(set)
	if err != nil || a.Volume != 1500 || a.Capacity != 90 || a.Costs == nil {
		t.Errorf("demo assumptions %+v, %v", a, err)
	}
}
