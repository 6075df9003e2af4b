package decision

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/sharedfile"
	"github.com/sill-tool/sill/internal/shift"
)

// identical reports whether a and b are the same float64 or both NaN: the
// round trip must keep every bit of a figure, not merely come close.
func identical(a, b float64) bool {
	return a == b || (math.IsNaN(a) && math.IsNaN(b))
}

// demoFile builds a decision file from the demo data with two candidates
// found by cut rules, as `sill report --save` does.
func demoFile(t *testing.T) *File {
	t.Helper()
	f, err := buildDemoFile()
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// buildDemoFile is demoFile for callers without a *testing.T: the demo
// data with its yards as segments, its readings in three crew shifts, a
// bootstrap and (the scores being probabilities) the reliability table.
func buildDemoFile() (*File, error) {
	res, err := demoResult(50)
	if err != nil {
		return nil, err
	}
	return demoFileOf(res)
}

// demoFileOf is the demo decision file of res.
func demoFileOf(res *analysis.Result) (*File, error) {
	var picks []Pick
	for _, o := range res.Outcomes {
		if !o.Met {
			return nil, fmt.Errorf("rule %s not met on the demo data", o.Rule)
		}
		picks = append(picks, Pick{Name: o.Rule.String(), Rule: o.Rule.String(), Point: o.Point})
	}
	picks[1].Note = "fits one crew: 90 alerts a shift"
	f, err := New(res, picks, "base", Record{ToolVersion: "1.2.3", Model: Model{Name: "bearing-wear", Version: "14"},
		ChosenBy: "Ines Varga", Note: "chosen at the September review"})
	if err != nil {
		return nil, err
	}
	s, err := f.NewSignOff("Tomas Reiner", "operations lead", Approve, "fits the night crew", time.Date(2026, 9, 15, 8, 30, 0, 0, time.UTC))
	if err != nil {
		return nil, err
	}
	f.SignOffs = append(f.SignOffs, s)
	return f, nil
}

// demoResult is the analysis of the demo data (6000 readings) under the
// demo's assumptions with replicates bootstrap replicates.
func demoResult(replicates int) (*analysis.Result, error) {
	demoOnce.Do(func() { demoRes, demoErr = runDemo(replicates) })
	return demoRes, demoErr
}

var (
	demoOnce sync.Once
	demoRes  *analysis.Result
	demoErr  error
)

func runDemo(replicates int) (*analysis.Result, error) {
	set, err := scores.Read(bytes.NewReader(demo.CSV(2000, 7)), "bearings.csv",
		scores.Options{SegmentColumn: "yard", TimeColumn: "read_at"})
	if err != nil {
		return nil, err
	}
	positives, negatives := set.Totals()
	a := projection.Assumptions{BaseRate: positives / (positives + negatives), Volume: 1500, Capacity: 90, Confidence: 0.95,
		Costs: &projection.Costs{FalseAlert: 120, Miss: 1200}}
	schedule, err := shift.ParseSchedule("06:00,14:00,22:00", time.UTC)
	if err != nil {
		return nil, err
	}
	rules := []cutrule.Rule{{Kind: cutrule.Hit, Value: 0.8}, {Kind: cutrule.Base}}
	return analysis.Run(context.Background(), set, a, analysis.Options{Rules: rules, Shifts: &schedule,
		Resampling: analysis.Resampling{Replicates: replicates, Seed: 1}})
}

// oddFile is a hand-made file with the awkward values: undefined rates,
// no volume, no costs, weights, lower-is-riskier, a tiny and a huge score,
// names that look like numbers.
func oddFile() *File {
	nan := math.NaN()
	return &File{
		Format:      Format,
		Created:     time.Date(2026, 9, 14, 6, 0, 0, 0, time.UTC),
		ToolVersion: "sill (commit abc1234, modified)",
		Data: Data{Path: "nightly 2026-09.csv.gz", SHA256: "", Rows: 3, Positives: 0, Negatives: 2.5,
			ScoreColumn: "risk", LabelColumn: "y", WeightColumn: "w", LowerIsRiskier: true,
			Histogram: Histogram{Edges: []float64{-2.5e-300, 1e-7, 3e21}, Counts: []float64{0.5, 2}}},
		Assumptions: projection.Assumptions{BaseRate: 0, Confidence: 0.9},
		Chosen:      "0.5",
		Caution:     evidence.Caution, // Marshal writes the standing caution whatever Caution holds; TestWriteStandingCaution
		Candidates: []Candidate{{
			Name: "0.5",
			Cut: evidence.Cut{Score: -2.5e-300, Rows: 1, Flagged: 0, FlaggedShare: 0, TP: 0, FP: 0, FN: 0, TN: 2.5,
				Recall: nan, RecallCI: [2]float64{nan, nan}, Precision: nan, PrecisionCI: [2]float64{nan, nan},
				FalseDiscoveryRate: nan, FalseDiscoveryCI: [2]float64{nan, nan}, FalsePositiveRate: 0,
				Projected: projection.Figures{AlertRate: 0, Precision: nan, QueuePerShift: nan, CostPerShift: nan, CostPerCase: nan}},
		}},
	}
}

func assertSameFile(t *testing.T, got, want *File) {
	t.Helper()
	if got.Format != want.Format || !got.Created.Equal(want.Created) || got.ToolVersion != want.ToolVersion ||
		got.Chosen != want.Chosen || got.Note != want.Note || got.Caution != want.Caution {
		t.Errorf("header: got %q %v %q %q %q, want %q %v %q %q %q", got.Format, got.Created, got.ToolVersion, got.Chosen, got.Note,
			want.Format, want.Created, want.ToolVersion, want.Chosen, want.Note)
	}
	gd, wd := got.Data, want.Data
	if gd.Path != wd.Path || gd.SHA256 != wd.SHA256 || gd.Rows != wd.Rows || !identical(gd.Positives, wd.Positives) ||
		!identical(gd.Negatives, wd.Negatives) || gd.ScoreColumn != wd.ScoreColumn || gd.LabelColumn != wd.LabelColumn ||
		gd.WeightColumn != wd.WeightColumn || gd.LowerIsRiskier != wd.LowerIsRiskier {
		t.Errorf("data: got %+v, want %+v", gd, wd)
	}
	assertFloats(t, "edges", gd.Histogram.Edges, wd.Histogram.Edges)
	assertFloats(t, "counts", gd.Histogram.Counts, wd.Histogram.Counts)
	ga, wa := got.Assumptions, want.Assumptions
	if !identical(ga.BaseRate, wa.BaseRate) || ga.Volume != wa.Volume || ga.Capacity != wa.Capacity || ga.Confidence != wa.Confidence ||
		(ga.Costs == nil) != (wa.Costs == nil) || (ga.Costs != nil && *ga.Costs != *wa.Costs) {
		t.Errorf("assumptions: got %+v, want %+v", ga, wa)
	}
	if len(got.Candidates) != len(want.Candidates) {
		t.Fatalf("%d candidates, want %d", len(got.Candidates), len(want.Candidates))
	}
	for i := range want.Candidates {
		g, w := got.Candidates[i], want.Candidates[i]
		if g.Name != w.Name || g.Rule != w.Rule || g.Note != w.Note || g.Cut.Rows != w.Cut.Rows {
			t.Errorf("candidate %d: got %q %q %q rows %d, want %q %q %q rows %d", i, g.Name, g.Rule, g.Note, g.Cut.Rows, w.Name, w.Rule, w.Note, w.Cut.Rows)
		}
		assertFloats(t, w.Name, cutFigures(g.Cut), cutFigures(w.Cut))
	}
}

// cutFigures lists every float of a Cut.
func cutFigures(c evidence.Cut) []float64 {
	p := c.Projected
	return []float64{c.Score, c.Flagged, c.FlaggedShare, c.TP, c.FP, c.FN, c.TN,
		c.Recall, c.RecallCI[0], c.RecallCI[1], c.Precision, c.PrecisionCI[0], c.PrecisionCI[1],
		c.FalseDiscoveryRate, c.FalseDiscoveryCI[0], c.FalseDiscoveryCI[1], c.FalsePositiveRate,
		p.AlertRate, p.Precision, p.QueuePerShift, p.CostPerShift, p.CostPerCase}
}

func assertFloats(t *testing.T, what string, got, want []float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: %d values, want %d", what, len(got), len(want))
		return
	}
	for i := range want {
		if !identical(got[i], want[i]) {
			t.Errorf("%s[%d] = %v, want exactly %v", what, i, got[i], want[i])
		}
	}
}

func TestRoundTrip(t *testing.T) {
	for name, f := range map[string]*File{"demo": demoFile(t), "odd": oddFile()} {
		t.Run(name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "cut.yaml")
			if err := save(path, f, false); err != nil {
				t.Fatal(err)
			}
			back, err := ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			assertSameFile(t, back, f)
			// Writing what was read gives the same bytes.
			first, _ := os.ReadFile(path)
			again, err := Marshal(back)
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(first, again) {
				t.Errorf("marshal after read differs:\n%s\n---\n%s", first, again)
			}
		})
	}
}

func TestNewChoosesFirstAndChecks(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.2}, []bool{true, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	a := projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{Rules: []cutrule.Rule{{Kind: cutrule.Score, Value: 0.9}}})
	if err != nil {
		t.Fatal(err)
	}
	point := res.Outcomes[0].Point
	f, err := New(res, []Pick{{Name: "a", Point: point}, {Name: "b", Point: point}}, "", Record{ToolVersion: "sill 1.2.0"})
	if err != nil {
		t.Fatal(err)
	}
	if f.Chosen != "a" {
		t.Errorf("chosen %q, want the first candidate", f.Chosen)
	}
	if c, ok := f.ChosenCandidate(); !ok || c.Name != "a" {
		t.Errorf("ChosenCandidate = %q, %v", c.Name, ok)
	}
	infinite := point
	infinite.Score = math.Inf(1)
	for _, tc := range []struct {
		name     string
		picks    []Pick
		chosen   string
		sentinel error
		path     string
	}{
		{"no candidate", nil, "", ErrInvalid, "candidates"},
		{"empty name", []Pick{{Name: "", Point: point}}, "x", ErrInvalid, "candidates[0].name"},
		{"repeated name", []Pick{{Name: "a", Point: point}, {Name: "a", Point: point}}, "", ErrInvalid, "candidates[1].name"},
		{"infinite score", []Pick{{Name: "a", Point: infinite}}, "", ErrNotFinite, "candidates[0].score"},
		{"unknown chosen", []Pick{{Name: "a", Point: point}}, "b", ErrUnknownChosen, "chosen"},
	} {
		_, err := New(res, tc.picks, tc.chosen, Record{ToolVersion: "sill 1.2.0"})
		var pe *ParseError
		if !errors.Is(err, tc.sentinel) || !errors.As(err, &pe) || pe.Path != tc.path {
			t.Errorf("%s: error %v, want %v at %s", tc.name, err, tc.sentinel, tc.path)
		}
	}
}

// save is Write with only the force option.
func save(path string, f *File, force bool) error {
	_, err := Write(context.Background(), path, f, WriteOptions{Force: force})
	return err
}

func TestWriteRefusesDifferentData(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "cut.yaml")
	f := demoFile(t)
	if err := save(path, f, false); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(path)

	// The same data: replaced without asking.
	f.Chosen = "hit=0.8"
	if err := save(path, f, false); err != nil {
		t.Fatalf("rewrite on the same data: %v", err)
	}
	sameData, _ := os.ReadFile(path)
	if bytes.Equal(before, sameData) {
		t.Fatal("the file was not replaced")
	}

	// Other data: refused, untouched, then replaced when forced.
	other := *f
	other.Data.SHA256 = strings.Repeat("ab", 32)
	err := save(path, &other, false)
	if !errors.Is(err, ErrDifferentData) {
		t.Fatalf("error %v, want ErrDifferentData", err)
	}
	if got, _ := os.ReadFile(path); !bytes.Equal(got, sameData) {
		t.Fatal("a refused write changed the file")
	}
	if err := save(path, &other, true); err != nil {
		t.Fatalf("forced write: %v", err)
	}
	if back, err := ReadFile(path); err != nil || back.Data.SHA256 != other.Data.SHA256 {
		t.Fatalf("after forced write: %v, sha %q", err, back.Data.SHA256)
	}

	// A file that is not a decision file: refused unless forced.
	scoresPath := filepath.Join(dir, "bearings.csv")
	os.WriteFile(scoresPath, []byte("score,label\n0.5,1\n"), 0o644)
	if err := save(scoresPath, f, false); !errors.Is(err, ErrNotDecisionFile) {
		t.Fatalf("error %v, want ErrNotDecisionFile", err)
	}
	if got, _ := os.ReadFile(scoresPath); string(got) != "score,label\n0.5,1\n" {
		t.Fatal("a refused write changed the scores file")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 2 {
		t.Fatalf("%d files in the folder, want 2 (no temporary file left)", len(entries))
	}
}

func TestWriteSurvivesCrashBeforeRename(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "cut.yaml")
	f := demoFile(t)
	if err := save(path, f, false); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(path)
	crash := errors.New("simulated crash between write and rename")
	sawTemp := false
	restore := sharedfile.HookBeforeRename(func(tmp string) error {
		// The new content is complete in the temporary file beside the target.
		data, err := os.ReadFile(tmp)
		sawTemp = err == nil && filepath.Dir(tmp) == dir && bytes.Contains(data, []byte(`chosen: "hit=0.8"`))
		return crash
	})
	defer restore()
	f.Chosen = "hit=0.8"
	if err := save(path, f, false); !errors.Is(err, crash) {
		t.Fatalf("error %v, want the simulated crash", err)
	}
	if !sawTemp {
		t.Error("the hook did not see the complete temporary file in the same folder")
	}
	if got, _ := os.ReadFile(path); !bytes.Equal(got, before) {
		t.Fatal("the old file changed")
	}
	if back, err := ReadFile(path); err != nil || back.Chosen != "base" {
		t.Fatalf("old file after crash: %v, chosen %q", err, back.Chosen)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Fatalf("%d files in the folder after the crash, want only cut.yaml", len(entries))
	}
}

func TestFormatNumber(t *testing.T) {
	// Expected texts worked by hand from the doc's rule: plain decimals in
	// [1e-6, 1e15), else an exponent with a point in the mantissa.
	for _, tc := range []struct {
		v    float64
		want string
	}{
		{0, "0"}, {6000, "6000"}, {0.000125, "0.000125"}, {-0.5, "-0.5"},
		{1e-7, "1.0e-07"}, {1.5e-9, "1.5e-09"}, {2e21, "2.0e+21"}, {math.Nextafter(0.3, 1), "0.30000000000000004"},
	} {
		if got := FormatNumber(tc.v); got != tc.want {
			t.Errorf("FormatNumber(%v) = %q, want %q", tc.v, got, tc.want)
		}
	}
}

func nan() float64 { return math.NaN() }

// TestWriteStandingCaution: a file whose caution was edited away (or left
// empty) is written with the standing caution, so that a sign-off never
// goes out without it.
func TestWriteStandingCaution(t *testing.T) {
	for _, caution := range []string{"", "trust me"} {
		f := demoFile(t)
		f.Caution = caution
		text, err := Marshal(f)
		if err != nil {
			t.Fatal(err)
		}
		back, err := Read(bytes.NewReader(text), "cut.yaml")
		if err != nil {
			t.Fatal(err)
		}
		if back.Caution != evidence.Caution {
			t.Errorf("caution %q written back as %q, want the standing caution", caution, back.Caution)
		}
	}
}

// TestWrittenBy checks the name of the build that wrote a file, from what
// this build writes and from the bare versions of earlier ones.
func TestWrittenBy(t *testing.T) {
	for _, tc := range []struct{ toolVersion, want string }{
		{"sill 1.2.0", "sill 1.2.0"},
		{"sill (commit abc1234, modified)", "sill (commit abc1234, modified)"},
		{"1.2.3", "sill 1.2.3"}, // files of earlier builds
		{"dev", "sill dev"},     // as earlier builds from a checkout wrote it
		{"", "sill (unknown build)"},
		{"sillier 2", "sill sillier 2"}, // only "sill" as a word counts as the name
	} {
		f := &File{ToolVersion: tc.toolVersion}
		if got := f.WrittenBy(); got != tc.want {
			t.Errorf("WrittenBy of tool_version %q = %q, want %q", tc.toolVersion, got, tc.want)
		}
	}
}
