package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/demo"
)

// TestSaveFullDemo saves the demo with everything the file can record
// (yards, shifts, a bootstrap, probabilities, the model and who chose):
// every part is there and the file stays in the tens of kilobytes.
func TestSaveFullDemo(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(demo.DefaultRows, demo.DefaultSeed))
	cutPath := filepath.Join(dir, "cut.yaml")
	args := append([]string{"report", scoresPath, "--save", cutPath, "--segment", "yard", "--bootstrap", "50",
		"--model-name", "bearing-wear", "--model-version", "14", "--chosen-by", "Ines Varga"}, demoAssumptions()...)
	args = append(args, demoShifts...)
	if r := runSill(t, "", args...); r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	info, err := os.Stat(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	// "Tens of kilobytes": 10 to 100 kB (21 kB when written).
	if size := info.Size(); size < 10_000 || size > 100_000 {
		t.Errorf("the demo's decision file has %d bytes, want tens of kilobytes", size)
	}
	f, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	if f.Model != (decision.Model{Name: "bearing-wear", Version: "14"}) || f.ChosenBy != "Ines Varga" || f.ShiftSchedule == nil ||
		f.Calibration == nil || len(f.Curve) == 0 || len(f.Curve) > decision.MaxCurvePoints || len(f.Candidates) < 4 {
		t.Fatalf("model %+v chosen_by %q schedule %v calibration %v, %d curve points, %d candidates",
			f.Model, f.ChosenBy, f.ShiftSchedule, f.Calibration, len(f.Curve), len(f.Candidates))
	}
	for _, c := range f.Candidates {
		if c.Segments == nil || c.Shifts == nil || (c.Stability == nil && c.Rule != "queue90=90") {
			t.Errorf("%s: segments %v shifts %v stability %v", c.Name, c.Segments, c.Shifts, c.Stability)
		}
	}
}

// TestRecordFlags: the model and who chose go with --save only, on one
// line; explore refuses a line break before it needs a terminal.
func TestRecordFlags(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(500, 3))
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"report", scoresPath, "--chosen-by", "Ines"}, "go with --save"},
		{[]string{"report", scoresPath, "--save", filepath.Join(dir, "c.yaml"), "--model-name", "a\nb"}, `--model-name "a\nb": a line break`},
		{[]string{"explore", scoresPath, "--chosen-by", "x\ry"}, `--chosen-by "x\ry": a line break`},
	} {
		r := runSill(t, "", tc.args...)
		if r.code != 2 || !strings.Contains(r.stderr, tc.want) {
			t.Errorf("%q: exit %d, stderr %q, want 2 and %q", tc.args, r.code, r.stderr, tc.want)
		}
	}
	if _, err := os.Stat(filepath.Join(dir, "c.yaml")); err == nil {
		t.Error("a refused save wrote the file")
	}
}
