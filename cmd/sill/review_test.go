package main

import (
	"context"
	"flag"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/golden"
)

// The -update flag, which golden.Check reads by name.
var _ = flag.Bool("update", false, "rewrite the golden files under testdata")

// checkGolden compares got with testdata/<Test>/<name>.golden, rewriting
// the file under -update.
func checkGolden(t *testing.T, name, got string) {
	t.Helper()
	golden.Check(t, "testdata", name, got)
}

// savedDemo saves four cuts of the demo data with --save, then fixes the
// file's creation time so that outputs are the same on every run.
func savedDemo(t *testing.T, dir string) (scoresPath, cutPath string) {
	t.Helper()
	scoresPath = writeFile(t, dir, "bearings.csv", demo.CSV(demo.DefaultRows, demo.DefaultSeed))
	cutPath = filepath.Join(dir, "cut.yaml")
	args := append([]string{"report", scoresPath, "--cut", "hit=0.8", "--cut", "base", "--cut", "queue=90", "--cut", "cost",
		"--save", cutPath, "--choose", "queue=90"}, demoAssumptions()...)
	if r := runSill(t, "", args...); r.code != 0 {
		t.Fatalf("report --save: exit %d, %s", r.code, r.stderr)
	}
	f, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	f.Created = time.Date(2026, 9, 29, 14, 5, 0, 0, time.UTC)
	f.ToolVersion = "sill 1.2.0" // what a release writes, whatever built the tests
	f.Data.Path = "bearings.csv"
	f.Candidates[2].Note = "one crew shift works it | nothing left over"
	f.Note = "for the October review"
	if _, err := decision.Write(context.Background(), cutPath, f, decision.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	return scoresPath, cutPath
}

func TestReviewPrint(t *testing.T) {
	dir := t.TempDir()
	_, cutPath := savedDemo(t, dir)
	for _, format := range []string{"markdown", "text"} {
		t.Run(format, func(t *testing.T) {
			r := runSill(t, "", "review", cutPath, "--format", format)
			if r.code != 0 || r.stderr != "" {
				t.Fatalf("exit %d, stderr %q", r.code, r.stderr)
			}
			checkGolden(t, "demo-four-cuts-"+format, strings.ReplaceAll(r.stdout, cutPath, "cut.yaml"))
		})
	}
	// From standard input.
	data, _ := os.ReadFile(cutPath)
	if r := runSill(t, string(data), "review", "-"); r.code != 0 || !strings.Contains(r.stdout, "Review of -") {
		t.Errorf("review from stdin: exit %d, %s", r.code, r.stderr)
	}
	// Not a terminal and no --format: the text form.
	if r := runSill(t, "", "review", cutPath); r.code != 0 || !strings.Contains(r.stdout, "queue=90 (chosen)") {
		t.Errorf("review without --format off a terminal: exit %d, %q", r.code, r.stdout)
	}
}

func TestSaveThenReadBack(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(2000, 3))
	cutPath := filepath.Join(dir, "cut.yaml")
	r := runSill(t, "", "report", scoresPath, "--cut", "hit=.8", "--cut", "top=5%", "--save", cutPath, "--format", "json")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	f, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	if f.Chosen != "hit=0.8" || len(f.Candidates) != 2 || f.Candidates[1].Rule != "top=5%" || f.Data.Rows != 2000 {
		t.Errorf("chosen %q, %d candidates, rule %q, rows %d", f.Chosen, len(f.Candidates), f.Candidates[1].Rule, f.Data.Rows)
	}
	// The report's JSON and the file carry the same figures.
	if !strings.Contains(r.stdout, `"score": `+decision.FormatNumber(f.Candidates[0].Cut.Score)) {
		t.Errorf("the JSON report lacks the saved score %v", f.Candidates[0].Cut.Score)
	}
}

func TestSaveErrors(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(2000, 3))
	otherPath := writeFile(t, dir, "other.csv", demo.CSV(2000, 4))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", scoresPath, "--cut", "hit=0.8", "--save", cutPath); r.code != 0 {
		t.Fatalf("first save: exit %d, %s", r.code, r.stderr)
	}
	before, _ := os.ReadFile(cutPath)
	for _, tc := range []struct {
		name string
		args []string
		want string
	}{
		{"other data", []string{"report", otherPath, "--cut", "hit=0.8", "--save", cutPath}, "made from different data"},
		{"over a scores file", []string{"report", otherPath, "--cut", "hit=0.8", "--save", scoresPath}, "not a readable decision file"},
		{"unmet cut", []string{"report", otherPath, "--cut", "score=5", "--save", filepath.Join(dir, "x.yaml")}, "cut score=5 is not met"},
		{"unknown choice", []string{"report", otherPath, "--cut", "hit=0.8", "--choose", "base", "--save", filepath.Join(dir, "x.yaml")}, `--choose "base": expected one of the cuts hit=0.8`},
		{"repeated cut", []string{"report", otherPath, "--cut", "base", "--cut", "base", "--save", filepath.Join(dir, "x.yaml")}, "cut base is given twice"},
		{"choose without save", []string{"report", otherPath, "--cut", "base", "--choose", "base"}, "go with --save"},
		{"save with the curve's csv", []string{"report", otherPath, "--cut", "base", "--save", filepath.Join(dir, "x.yaml"), "--format", "csv", "--curve"}, "--cut and --save go with --format csv without --curve"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := runSill(t, "", tc.args...)
			if r.code != 2 || !strings.Contains(r.stderr, tc.want) || strings.Count(strings.TrimSpace(r.stderr), "\n") != 0 {
				t.Errorf("exit %d, stderr %q; want 2 and one line with %q", r.code, r.stderr, tc.want)
			}
		})
	}
	if r := runSill(t, "", "report", otherPath, "--cut", "hit=0.8", "--save", cutPath); !strings.Contains(r.stderr, "add --force to replace it") {
		t.Errorf("the refusal does not say how to replace: %q", r.stderr)
	}
	if after, _ := os.ReadFile(cutPath); string(after) != string(before) {
		t.Error("a refused save changed the file")
	}
	if r := runSill(t, "", "report", otherPath, "--cut", "hit=0.8", "--save", cutPath, "--force"); r.code != 0 {
		t.Errorf("--force: exit %d, %s", r.code, r.stderr)
	}
	if _, err := os.Stat(filepath.Join(dir, "x.yaml")); err == nil {
		t.Error("a failed save left a file")
	}
}

// bearingsCSV draws rows like the demo with a chosen base rate and a shift
// of every latent score, as CSV with score and label columns (and no label
// column when labels is false).
func bearingsCSV(seed uint64, n int, base, shift float64, labels bool) []byte {
	rng := rand.New(rand.NewPCG(seed, 5))
	var b strings.Builder
	if labels {
		b.WriteString("score,label\n")
	} else {
		b.WriteString("score\n")
	}
	for i := 0; i < n; i++ {
		positive := rng.Float64() < base
		latent := rng.NormFloat64() + shift
		if positive {
			latent += 1.9
		}
		s := math.Round(1000/(1+math.Exp(-(1.3*latent-3.2)))) / 1000
		b.WriteString(strconv.FormatFloat(s, 'f', 3, 64))
		if labels {
			if positive {
				b.WriteString(",1")
			} else {
				b.WriteString(",0")
			}
		}
		b.WriteString("\n")
	}
	return []byte(b.String())
}
