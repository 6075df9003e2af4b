package main

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

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

// TestReviewSign: --sign appends one sign-off and prints nothing on
// standard output; a bad verdict, a missing name or standard input exits
// 2 and leaves the file as it was; the sign-off shows in every output.
func TestReviewSign(t *testing.T) {
	dir := t.TempDir()
	_, cutPath := savedDemo(t, dir)
	before, _ := os.ReadFile(cutPath)
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"--sign", "Bo", "--verdict", "maybe"}, `--verdict: unknown verdict "maybe", expected approve, revise or reject`},
		{[]string{"--sign", "Bo", "--verdict", "Approve"}, `unknown verdict "Approve"`},
		{[]string{"--sign", "Bo"}, `unknown verdict ""`},
		{[]string{"--verdict", "approve"}, "go with --sign NAME"},
		{[]string{"--sign", "Bo", "--verdict", "approve", "--format", "text"}, "run --format or --against apart"},
		{[]string{"--sign", "Bo\nB", "--verdict", "approve"}, "a line break"},
	} {
		r := runSill(t, "", append([]string{"review", cutPath}, tc.args...)...)
		if r.code != 2 || !strings.Contains(r.stderr, tc.want) || r.stdout != "" {
			t.Errorf("%q: exit %d, stderr %q, want 2 and %q", tc.args, r.code, r.stderr, tc.want)
		}
	}
	if r := runSill(t, string(before), "review", "-", "--sign", "Bo", "--verdict", "approve"); r.code != 2 || !strings.Contains(r.stderr, "not standard input") {
		t.Errorf("signing standard input: exit %d, %q", r.code, r.stderr)
	}
	if after, _ := os.ReadFile(cutPath); !bytes.Equal(before, after) {
		t.Fatal("a refused sign-off changed the file")
	}
	r := runSill(t, "", "review", cutPath, "--sign", " Ada Quist ", "--role", "operations lead", "--verdict", "revise", "--note", "ask the <night> crew | twice")
	if r.code != 0 || r.stdout != "" || !strings.Contains(r.stderr, "signed "+cutPath+": revise by Ada Quist for the chosen queue=90 (score 0.36); 1 sign-off in the file") {
		t.Fatalf("exit %d, stdout %q, stderr %q", r.code, r.stdout, r.stderr)
	}
	f, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	if len(f.SignOffs) != 1 || f.SignOffs[0].Name != "Ada Quist" || f.SignOffs[0].Verdict != decision.Revise || time.Since(f.SignOffs[0].At) > time.Minute {
		t.Fatalf("sign-offs %+v", f.SignOffs)
	}
	text := runSill(t, "", "review", cutPath, "--format", "text").stdout
	markdown := runSill(t, "", "review", cutPath, "--format", "markdown").stdout
	if !strings.Contains(text, "revise   Ada Quist, operations lead: ask the <night> crew | twice") ||
		!strings.Contains(markdown, `revise   Ada Quist, operations lead: ask the \<night> crew \| twice`) {
		t.Errorf("the sign-off is missing from the outputs:\n%s\n%s", text, markdown)
	}
}

// TestReviewAgainst: the change from the cut in production to a proposed
// one, as text and Markdown (golden files), and the errors of --against.
func TestReviewAgainst(t *testing.T) {
	dir := t.TempDir()
	scoresPath, newPath := savedDemo(t, dir)
	oldPath := filepath.Join(dir, "old.yaml")
	args := []string{"report", scoresPath, "--cut", "base", "--cut", "hit=0.8", "--save", oldPath, "--model-name", "bearing-wear",
		"--model-version", "13", "--chosen-by", "Ines Varga", "--volume", "1200", "--capacity", "120", "--cost-false-alert", "120", "--cost-miss", "1200"}
	if r := runSill(t, "", args...); r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	old, err := decision.ReadFile(oldPath)
	if err != nil {
		t.Fatal(err)
	}
	old.Created = time.Date(2026, 6, 2, 9, 0, 0, 0, time.UTC)
	old.ToolVersion = "sill 1.1.0"
	old.Data.Path = "bearings-june.csv"
	s, _ := old.NewSignOff("Tomas Reiner", "operations lead", decision.Approve, "", time.Date(2026, 6, 3, 10, 0, 0, 0, time.UTC))
	old.SignOffs = append(old.SignOffs, s)
	if _, err := decision.Write(context.Background(), oldPath, old, decision.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	for _, format := range []string{"text", "markdown"} {
		r := runSill(t, "", "review", newPath, "--against", oldPath, "--format", format)
		if r.code != 0 || r.stderr != "" {
			t.Fatalf("%s: exit %d, %s", format, r.code, r.stderr)
		}
		got := strings.NewReplacer(newPath, "cut.yaml", oldPath, "old.yaml").Replace(r.stdout)
		checkGolden(t, "against-"+format, got)
	}
	// Each file's queue stands against its own capacity (120 in
	// production, 90 proposed) on the page as in the text above.
	page := runSill(t, "", "review", newPath, "--against", oldPath, "--format", "html")
	for _, want := range []string{"against its own capacity", "33.4 under 120", "0.2 under 90"} {
		if page.code != 0 || !strings.Contains(page.stdout, want) {
			t.Errorf("html: exit %d, no %q on the page", page.code, want)
		}
	}
	r := runSill(t, "", "review", newPath, "--against", filepath.Join(dir, "none.yaml"))
	if r.code != 2 || !strings.Contains(r.stderr, "--against: read decision file") {
		t.Errorf("missing --against file: exit %d, %q", r.code, r.stderr)
	}
}

// TestV1FileReadsEverywhere: a sill-cut/1 file as an earlier build saved
// it reads in review (text and Markdown) and check, and a sign-off
// upgrades it to sill-cut/2.
func TestV1FileReadsEverywhere(t *testing.T) {
	dir := t.TempDir()
	v1, err := os.ReadFile(filepath.Join("..", "..", "internal", "decision", "testdata", "v1", "demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	cutPath := writeFile(t, dir, "cut.yaml", v1)
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(demo.DefaultRows, demo.DefaultSeed))
	for _, args := range [][]string{{"review", cutPath}, {"review", cutPath, "--format", "markdown"}, {"check", cutPath, scoresPath}} {
		if r := runSill(t, "", args...); r.code != 0 || !strings.Contains(r.stdout, "queue=90") {
			t.Errorf("%q: exit %d, %s", args, r.code, r.stderr)
		}
	}
	if r := runSill(t, "", "review", cutPath, "--sign", "Ada Quist", "--verdict", "approve"); r.code != 0 {
		t.Fatalf("sign: exit %d, %s", r.code, r.stderr)
	}
	f, err := decision.ReadFile(cutPath)
	if err != nil || f.Upgraded() || len(f.SignOffs) != 1 {
		t.Fatalf("after signing: %v, upgraded %v, %d sign-offs", err, f.Upgraded(), len(f.SignOffs))
	}
}
