package main

import (
	"context"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/tui"
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
		{[]string{"explore", path, "--volume", "x"}, `--volume "x": expected a number of cases per shift`},
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
	if set.Times() == nil || set.TimeColumn() != "read_at" || set.SegmentColumn() != "yard" || set.IDColumn() != "id" {
		t.Errorf("demo set: times %v, time %q, segment %q, id %q", set.Times() != nil, set.TimeColumn(), set.SegmentColumn(), set.IDColumn())
	}
	a, err := cfg.Assume(set)
	if err != nil || a.Volume != 1500 || a.Capacity != 90 || a.Costs == nil {
		t.Errorf("demo assumptions %+v, %v", a, err)
	}
}

// TestExploreChecksOut: explore refuses an --out it could not write before
// the screen opens (and so before the terminal is looked at), with one
// line naming the folder or the file, exit status 2 and nothing on stdout.
func TestExploreChecksOut(t *testing.T) {
	dir := t.TempDir()
	path := writeFile(t, dir, "scores.csv", []byte("score,label\n0.9,1\n0.2,0\n"))
	missing := filepath.Join(dir, "no such folder")
	cases := []struct {
		out, want string
	}{
		{filepath.Join(missing, "cut.yaml"), "sill: --out " + filepath.Join(missing, "cut.yaml") + ": the folder " + missing + " does not exist\n"},
		{dir, "sill: --out " + dir + ": " + dir + " is a folder, expected a file name\n"},
		{filepath.Join(path, "cut.yaml"), "sill: --out " + filepath.Join(path, "cut.yaml") + ": " + path + " is not a folder\n"},
		{path, "sill: --out " + path + ": the existing file is not a readable decision file, so the write key would not replace it; name a new file or a decision file\n"},
	}
	for _, tc := range cases {
		r := runSill(t, "", "explore", path, "--out", tc.out)
		if r.code != 2 || r.stderr != tc.want || r.stdout != "" {
			t.Errorf("--out %s: status %d, stderr %q, stdout %q; want 2 and %q", tc.out, r.code, r.stderr, r.stdout, tc.want)
		}
	}
	// A folder that takes no new files; root writes anywhere, so this case
	// can only be seen by another user.
	if os.Geteuid() != 0 {
		locked := filepath.Join(dir, "locked")
		if err := os.Mkdir(locked, 0o555); err != nil {
			t.Fatal(err)
		}
		r := runSill(t, "", "explore", path, "--out", filepath.Join(locked, "cut.yaml"))
		if want := "the folder " + locked + " does not take new files"; r.code != 2 || !strings.Contains(r.stderr, want) {
			t.Errorf("read-only folder: status %d, stderr %q; want 2 and %q", r.code, r.stderr, want)
		}
	}
	// A decision file, or a new file in a folder that exists, passes the
	// check and the explorer then asks for a terminal.
	_, cut := savedDemo(t, dir)
	for _, out := range []string{cut, filepath.Join(dir, "new.yaml")} {
		r := runSill(t, "", "explore", path, "--out", out)
		if r.code != 2 || !strings.Contains(r.stderr, "explore needs a terminal") {
			t.Errorf("--out %s: status %d, stderr %q; want the terminal refusal", out, r.code, r.stderr)
		}
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.Contains(e.Name(), ".probe-") || strings.HasSuffix(e.Name(), ".lock") {
			t.Errorf("the check left %s behind", e.Name())
		}
	}
}

// TestOneClassRefused: a set with one outcome class cannot have a cut
// chosen on it, so explore (once loaded, which ends the screen with exit
// status 2) and report --save refuse it with one line saying what was
// found and what was expected; report alone warns (TestRunOneClass).
func TestOneClassRefused(t *testing.T) {
	dir := t.TempDir()
	onlyTrue := writeFile(t, dir, "alarms.csv", []byte("score,label\n0.9,1\n0.2,1\n0.5,1\n"))
	onlyFalse := writeFile(t, dir, "quiet.csv", []byte("score,outcome\n0.8,0\n0.3,0\n"))
	weighted := writeFile(t, dir, "weighted.csv", []byte("score,label,w\n0.8,0,2\n0.3,1,0\n"))

	out := filepath.Join(dir, "cut.yaml")
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"report", onlyTrue, "--save", out}, "sill: --save: " + onlyTrue + ` has 3 true and 0 false cases in column "label"; choosing a cut needs both classes, expected at least one true and one false case` + "\n"},
		{[]string{"report", onlyFalse, "--save", out, "--label", "outcome"}, "sill: --save: " + onlyFalse + ` has 0 true and 2 false cases in column "outcome"; choosing a cut needs both classes, expected at least one true and one false case` + "\n"},
		{[]string{"report", weighted, "--save", out, "--weight", "w"}, "sill: --save: " + weighted + ` has true cases weighing 0 and false cases weighing 2 in column "label"; choosing a cut needs both classes, expected at least one true and one false case` + "\n"},
	}
	for _, tc := range cases {
		r := runSill(t, "", tc.args...)
		if r.code != 2 || r.stderr != tc.want || r.stdout != "" {
			t.Errorf("sill %s: status %d, stderr %q, stdout %q; want 2 and %q", strings.Join(tc.args, " "), r.code, r.stderr, r.stdout, tc.want)
		}
	}
	if _, err := os.Stat(out); err == nil {
		t.Errorf("%s was written", out)
	}

	// explore: the screen's load fails, the screen ends, and the error
	// is what sill prints with status 2.
	o := &exploreOptions{}
	fs := pflag.NewFlagSet("explore", pflag.ContinueOnError)
	o.input.register(fs)
	if err := o.beyond.prepare(&o.input); err != nil {
		t.Fatal(err)
	}
	var m tea.Model = tui.New(tui.Config{
		Load: func(func(int)) (*scores.Set, error) { return o.load(context.Background(), onlyTrue, nil) },
		Assume: func(*scores.Set) (projection.Assumptions, error) {
			return projection.Assumptions{Confidence: 0.95}, nil
		},
		Out: out,
	})
	m, _ = m.Update(tea.WindowSizeMsg{Width: 100, Height: 30})
	msg := m.Init()().(tea.BatchMsg)[0]()
	m, cmd := m.Update(msg)
	if cmd == nil {
		t.Fatal("the screen stays open on a set with one class")
	}
	if _, quits := cmd().(tea.QuitMsg); !quits {
		t.Fatal("the screen stays open on a set with one class")
	}
	err := exploreOutcome(m.(tui.Model), out, io.Discard)
	want := "explore: " + onlyTrue + ` has 3 true and 0 false cases in column "label"; choosing a cut needs both classes, expected at least one true and one false case`
	if err == nil || err.Error() != want {
		t.Errorf("explore: error %v, want %q", err, want)
	}
}
