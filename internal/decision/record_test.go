package decision

import (
	"bytes"
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// TestDemoRecordsWhatWasComputed: the demo's file, made with segments,
// shifts, a bootstrap and probabilities, holds every part of sill-cut/2,
// each equal to the analysis it came from.
func TestDemoRecordsWhatWasComputed(t *testing.T) {
	res, err := demoResult(50)
	if err != nil {
		t.Fatal(err)
	}
	f := demoFile(t)
	if f.Format != Format || f.Model.Name != "bearing-wear" || f.ChosenBy != "Ines Varga" {
		t.Errorf("format %q model %+v chosen_by %q", f.Format, f.Model, f.ChosenBy)
	}
	if s := f.ShiftSchedule; s == nil || strings.Join(s.Starts, ",") != "06:00,14:00,22:00" || s.Zone != "UTC" || s.TimeColumn != "read_at" {
		t.Errorf("shift schedule %+v", s)
	}
	c := f.Calibration
	if c == nil || len(c.Bins) != len(res.Calibration.Table.Bins) || c.ECE != res.Calibration.Table.ECE || c.CostThreshold == nil ||
		c.CostThreshold.Probability != res.Calibration.Cost.Probability {
		t.Fatalf("calibration %+v", c)
	}
	// The cost threshold 120/(120+1200) = 1/11 (calibration.CostThreshold,
	// worked by hand: flag when p*miss > (1-p)*false alert).
	if !floatcmp.Equal(c.CostThreshold.Probability, 1.0/11) {
		t.Errorf("cost threshold %v, want 1/11", c.CostThreshold.Probability)
	}
	for i, cand := range f.Candidates {
		o := res.Outcomes[i]
		sp := res.Stability.Spreads[i]
		if s := cand.Stability; s == nil || s.Replicates != 50 || s.Seed != 1 || s.Met != sp.Met || s.Score != sp.Score {
			t.Errorf("%s: stability %+v, want the spread %+v", cand.Name, s, sp)
		}
		b, _ := res.SegmentsAt(o.Point, 0.95)
		if g := cand.Segments; g == nil || g.Column != "yard" || len(g.Groups) != len(b.Segments) {
			t.Fatalf("%s: segments %+v", cand.Name, g)
		}
		for k, g := range cand.Segments.Groups {
			w := b.Segments[k]
			if g.Name != w.Segment || g.Rows != w.Rows || g.TP != w.TP || !identical(g.Recall, w.Recall) || g.RecallCI != w.RecallCI || g.Outlier != w.Outlier {
				t.Errorf("%s group %d: %+v, want %+v", cand.Name, k, g, w)
			}
			if !identical(g.RecallGap, w.RecallTest.Gap) || !identical(g.RecallGapCI[0], w.RecallTest.GapCI[0]) || !identical(g.RecallAdjustedP, w.RecallTest.AdjustedP) ||
				!identical(g.FalseDiscoveryGap, w.FalseDiscoveryTest.Gap) || !identical(g.FalseDiscoveryGapCI[1], w.FalseDiscoveryTest.GapCI[1]) ||
				!identical(g.FalseDiscoveryAdjustedP, w.FalseDiscoveryTest.AdjustedP) {
				t.Errorf("%s group %d: tests %+v, want %+v and %+v", cand.Name, k, g, w.RecallTest, w.FalseDiscoveryTest)
			}
		}
		if cand.Segments.Tests != b.Tests || b.Tests == 0 {
			t.Errorf("%s: %d tests, want %d", cand.Name, cand.Segments.Tests, b.Tests)
		}
		peaks, _ := res.PeaksAt(o.Point, 90)
		if s := cand.Shifts; s == nil || s.Count != peaks.Shifts || s.P90 != peaks.P90 || s.Max != peaks.Max ||
			!identical(s.OverCapacity, peaks.OverCapacity) || !s.Busiest.Equal(res.Shifts.Assigned.Start(peaks.Busiest)) {
			t.Errorf("%s: shifts %+v, want %+v", cand.Name, s, peaks)
		}
	}
}

// TestCurveThinned: at most MaxCurvePoints, strictest first, both ends and
// every candidate's cut, each point the curve's own counts; a short curve
// is kept whole.
func TestCurveThinned(t *testing.T) {
	res, err := demoResult(50)
	if err != nil {
		t.Fatal(err)
	}
	f := demoFile(t)
	// The demo's 2000 readings at three decimals have fewer than 512
	// distinct scores: the curve is kept whole.
	positives, negatives := res.Set.Totals()
	if n := len(f.Curve); n == 0 || n > MaxCurvePoints {
		t.Fatalf("%d points", n)
	}
	first, last := f.Curve[0], f.Curve[len(f.Curve)-1]
	if last.TP != positives || last.FP != negatives {
		t.Errorf("last point %+v, want every case flagged (%v, %v)", last, positives, negatives)
	}
	if first.Score != 0.927 {
		t.Errorf("first point %+v, want the highest score 0.927", first)
	}
	for _, c := range f.Candidates {
		if !onCurve(f.Curve, c.Cut.Score) {
			t.Errorf("candidate %s at %v is not on the curve", c.Name, c.Cut.Score)
		}
	}

	// A set of 20000 distinct scores is thinned.
	big := bigResult(t, 20000)
	picks := []Pick{{Name: "a", Point: big.Outcomes[0].Point}, {Name: "b", Point: big.Outcomes[1].Point}}
	g, err := New(big, picks, "", Record{})
	if err != nil {
		t.Fatal(err)
	}
	if n := len(g.Curve); n > MaxCurvePoints || n < MaxCurvePoints/2 {
		t.Errorf("%d points of 20000 cuts, want between %d and %d", n, MaxCurvePoints/2, MaxCurvePoints)
	}
	for i := 1; i < len(g.Curve); i++ {
		if !(g.Curve[i].Score < g.Curve[i-1].Score) || g.Curve[i].TP < g.Curve[i-1].TP || g.Curve[i].FP < g.Curve[i-1].FP {
			t.Fatalf("point %d %+v after %+v: not strictest first", i, g.Curve[i], g.Curve[i-1])
		}
	}
	p, n := big.Set.Totals()
	if end := g.Curve[len(g.Curve)-1]; end.TP != p || end.FP != n {
		t.Errorf("last point %+v, want (%v, %v)", end, p, n)
	}
	for _, pk := range picks {
		if !onCurve(g.Curve, pk.Point.Score) {
			t.Errorf("candidate %s at %v left out", pk.Name, pk.Point.Score)
		}
	}
	// Every kept point is the curve's own: the counts at its score.
	for _, cp := range g.Curve[:20] {
		tp, fp := 0.0, 0.0
		for i, s := range big.Set.Scores() {
			if s >= cp.Score {
				if big.Set.Labels()[i] {
					tp++
				} else {
					fp++
				}
			}
		}
		if tp != cp.TP || fp != cp.FP {
			t.Errorf("point %+v, counted %v %v", cp, tp, fp)
		}
	}
	// The file reads back.
	text, err := Marshal(g)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Read(bytes.NewReader(text), "big.yaml"); err != nil {
		t.Fatal(err)
	}
}

// TestReadRejectsBrokenNewKeys: one strict-reader error for each key
// sill-cut/2 added, with its key path.
func TestReadRejectsBrokenNewKeys(t *testing.T) {
	valid, err := Marshal(demoFile(t))
	if err != nil {
		t.Fatal(err)
	}
	text := string(valid)
	for _, tc := range []struct {
		name     string
		broken   string
		sentinel error
		path     string
	}{
		{"model missing", replaceNth(t, text, `(?s)\nmodel:\n.*?\nchosen_by:`, 0, "\nchosen_by:"), ErrMissingKey, "model"},
		{"model name a number", replaceNth(t, text, `name: "bearing-wear"`, 0, `name: 7`), ErrType, "model.name"},
		{"model version missing", replaceNth(t, text, `\n  version: "14"`, 0, ``), ErrMissingKey, "model.version"},
		{"chosen_by a list", replaceNth(t, text, `chosen_by: "Ines Varga"`, 0, `chosen_by: [Ines]`), ErrType, "chosen_by"},
		{"curve missing", replaceNth(t, text, `(?s)\ncurve:\n.*`, 0, "\n"), ErrMissingKey, "curve"},
		{"curve point short", replaceNth(t, text, `\n  - \[0\.927, 1, 0\]`, 0, "\n  - [0.927, 1]"), ErrInvalid, "curve[0]"},
		{"curve unordered", replaceNth(t, text, `\n  - \[0\.912, `, 0, "\n  - [0.95, "), ErrInvalid, "curve[1][0]"},
		{"curve tp above positives", replaceNth(t, text, `\n  - \[0\.927, 1, 0\]`, 0, "\n  - [0.927, 150, 0]"), ErrInvalid, "curve[0][1]"},
		{"curve counts fall", replaceNth(t, text, `\n  - \[0\.912, 2, 0\]`, 0, "\n  - [0.912, 0, 0]"), ErrInvalid, "curve[1]"},
		{"candidate off the curve", replaceNth(t, text, `\n  - \[0\.304, [^\]]*\]`, 0, ""), ErrInvalid, "candidates[1].score"},
		{"schedule start", replaceNth(t, text, `starts: \["06:00"`, 0, `starts: ["6am"`), ErrInvalid, "shift_schedule.starts[0]"},
		{"schedule zone", replaceNth(t, text, `zone: "UTC"`, 0, `zone: "Nowhere/Else"`), ErrInvalid, "shift_schedule.zone"},
		{"calibration ece", replaceNth(t, text, `ece: [0-9.e-]+`, 0, `ece: 2`), ErrInvalid, "calibration.ece"},
		{"calibration binning", replaceNth(t, text, `binning: "width"`, 0, `binning: "even"`), ErrInvalid, "calibration.binning"},
		{"calibration bin", replaceNth(t, text, `\{lower: 0, upper: [0-9.]+`, 0, `{lower: 0.5, upper: 0.1`), ErrInvalid, "calibration.bins[0]"},
		{"cost threshold", replaceNth(t, text, `probability: [0-9.]+`, 0, `probability: -1`), ErrInvalid, "calibration.cost_threshold.probability"},
		{"stability seed", replaceNth(t, text, `seed: 1\n`, 0, "seed: -1\n"), ErrInvalid, "candidates[0].stability.seed"},
		{"stability met", replaceNth(t, text, `met: 50`, 0, `met: 51`), ErrInvalid, "candidates[0].stability.met"},
		{"stability recall at cut reversed", replaceNth(t, text, `recall_at_cut: \[[^\]]*\]`, 0, `recall_at_cut: [0.9, 0.1]`), ErrInvalid, "candidates[0].stability.recall_at_cut"},
		{"stability wrong-alert share at cut above 1", replaceNth(t, text, `false_discovery_rate_at_cut: \[[^\]]*\]`, 0, `false_discovery_rate_at_cut: [0.2, 1.5]`), ErrInvalid, "candidates[0].stability.false_discovery_rate_at_cut[1]"},
		{"stability recall at cut a word", replaceNth(t, text, `recall_at_cut: \[[^\]]*\]`, 0, `recall_at_cut: wide`), ErrType, "candidates[0].stability.recall_at_cut"},
		{"segments outlier", replaceNth(t, text, `outlier: (true|false)`, 0, `outlier: maybe`), ErrType, "candidates[0].segments.groups[0].outlier"},
		{"segments recall gap", replaceNth(t, text, `recall_gap: [-0-9.e]+`, 0, `recall_gap: 1.5`), ErrInvalid, "candidates[0].segments.groups[0].recall_gap"},
		{"segments gap interval", replaceNth(t, text, `false_discovery_gap_ci: \[[^\]]*\]`, 0, `false_discovery_gap_ci: [0.2, -0.1]`), ErrInvalid, "candidates[0].segments.groups[0].false_discovery_gap_ci"},
		{"segments adjusted p", replaceNth(t, text, `recall_adjusted_p: [-0-9.e]+`, 0, `recall_adjusted_p: 2`), ErrInvalid, "candidates[0].segments.groups[0].recall_adjusted_p"},
		{"segments tests", replaceNth(t, text, `\n      tests: \d+`, 0, "\n      tests: many"), ErrType, "candidates[0].segments.tests"},
		{"segments tp", replaceNth(t, text, `, tp: \d+, fp:`, 0, `, tp: 99999, fp:`), ErrInvalid, "candidates[0].segments.groups[0].tp"},
		{"shifts busiest", replaceNth(t, text, `busiest: "[^"]*"`, 0, `busiest: "monday"`), ErrInvalid, "candidates[0].shifts.busiest"},
		{"shifts sample p90 above max", replaceNth(t, text, `sample_p90: [0-9.]+`, 0, `sample_p90: 99999`), ErrInvalid, "candidates[0].shifts.sample_p90"},
		{"sign-off verdict", replaceNth(t, text, `verdict: approve`, 0, `verdict: maybe`), ErrVerdict, "sign_offs[0].verdict"},
		{"sign-off at", replaceNth(t, text, `at: "2026-09-15T08:30:00Z"`, 0, `at: "tuesday"`), ErrInvalid, "sign_offs[0].at"},
		{"sign-off name", replaceNth(t, text, `name: "Tomas Reiner"`, 0, `name: ""`), ErrInvalid, "sign_offs[0].name"},
		{"sign-off key", replaceNth(t, text, `chosen_score: 0.304\n`, 0, "chosen_score: 0.304\n    key: \"MD5:aa\"\n"), ErrInvalid, "sign_offs[0].key"},
		{"sign-off unknown key", replaceNth(t, text, `chosen_score: 0.304\n`, 0, "chosen_score: 0.304\n    mood: glad\n"), ErrUnknownKey, "sign_offs[0].mood"},
		{"sign-offs missing", replaceNth(t, text, `(?s)\nsign_offs:\n.*?\ncurve:`, 0, "\ncurve:"), ErrMissingKey, "sign_offs"},
		{"rule_holds not a boolean", replaceNth(t, text, `rule_holds: true`, 0, `rule_holds: "often"`), ErrType, "candidates[0].rule_holds"},
		{"rule_picks not the score of a rule that holds", replaceNth(t, text, `rule_picks: [0-9.e-]+`, 0, `rule_picks: 0.5`), ErrInvalid, "candidates[0].rule_picks"},
		{"rule_picks without rule_holds", replaceNth(t, text, `rule_holds: true[^\n]*`, 0, `rule_holds: null`), ErrInvalid, "candidates[0].rule_picks"},
		{"rule_holds without a rule", replaceNth(t, text, `\n    rule: "hit=0.8"`, 0, "\n    rule: null"), ErrInvalid, "candidates[0].rule_holds"},
		{"a sill-cut/2 key in a sill-cut/1 file", replaceNth(t, text, `format: sill-cut/2`, 0, `format: sill-cut/1`), ErrUnknownKey, "model"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f, err := Read(strings.NewReader(tc.broken), "cut.yaml")
			if err == nil {
				t.Fatalf("no error; read %+v", f)
			}
			var pe *ParseError
			if !errors.Is(err, tc.sentinel) || !errors.As(err, &pe) || pe.Path != tc.path {
				t.Fatalf("error %q, want %v at path %q", err, tc.sentinel, tc.path)
			}
			if msg := err.Error(); strings.Contains(msg, "\n") || !strings.HasPrefix(msg, "cut.yaml:") || !strings.Contains(msg, ": "+tc.path+": ") {
				t.Errorf("message %q, want one line with the file, line and path %s", msg, tc.path)
			}
		})
	}
}

// TestReadV1: a sill-cut/1 file as an earlier build saved it reads, says
// it will be upgraded, and writes back as sill-cut/2 with its figures and
// an empty curve and sign-off list.
func TestReadV1(t *testing.T) {
	f, err := ReadFile(filepath.Join("testdata", "v1", "demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	if f.Format != FormatV1 || !f.Upgraded() || f.Chosen != "queue=90" || len(f.Candidates) != 3 || f.Curve != nil || f.SignOffs != nil {
		t.Fatalf("read %q upgraded %v chosen %q, %d candidates", f.Format, f.Upgraded(), f.Chosen, len(f.Candidates))
	}
	out, err := Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(out, []byte("format: sill-cut/2\n")) || !bytes.Contains(out, []byte("sign_offs: []\n")) {
		t.Errorf("written back:\n%s", out)
	}
	back, err := Read(bytes.NewReader(out), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if back.Upgraded() {
		t.Error("written back still reads as sill-cut/1")
	}
	assertFloats(t, "queue=90", cutFigures(back.Candidates[2].Cut), cutFigures(f.Candidates[2].Cut))
}

// TestSignOffs: appended with the choice they were given for; one given
// before the choice changed stays and is marked as for the earlier one; a
// bad verdict changes nothing.
func TestSignOffs(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	f := demoFile(t)
	f.SignOffs = nil
	if err := save(path, f, false); err != nil {
		t.Fatal(err)
	}
	at := time.Date(2026, 9, 16, 9, 0, 0, 0, time.FixedZone("plus two", 2*3600))
	s, err := f.NewSignOff(" Ada Quist ", "risk owner", Revise, "ask the night crew", at)
	if err != nil {
		t.Fatal(err)
	}
	s.Key = "SHA256:uNiVztksCsDhcc0u9e8BujQXVUpKZIDTMczCvj3tD2s"
	got, _, err := AppendSignOff(context.Background(), path, s)
	if err != nil {
		t.Fatal(err)
	}
	if len(got.SignOffs) != 1 || got.SignOffs[0].Name != "Ada Quist" || !got.SignOffs[0].At.Equal(at) || got.SignOffs[0].At.Location() != time.UTC {
		t.Fatalf("sign-offs %+v", got.SignOffs)
	}
	// The chosen cut changes: the earlier sign-off stays, for "base".
	back, stamp, err := ReadFileStamped(path)
	if err != nil {
		t.Fatal(err)
	}
	back.Chosen = "hit=0.8"
	if _, err := Write(context.Background(), path, back, WriteOptions{Expect: &stamp}); err != nil {
		t.Fatal(err)
	}
	s2, _ := back.NewSignOff("Ben Oduya", "", Approve, "", at.Add(time.Hour))
	got, _, err = AppendSignOff(context.Background(), path, s2)
	if err != nil {
		t.Fatal(err)
	}
	if len(got.SignOffs) != 2 || got.ForCurrentChoice(got.SignOffs[0]) || !got.ForCurrentChoice(got.SignOffs[1]) ||
		got.SignOffs[0].Chosen != "base" || got.SignOffs[0].ChosenScore != 0.304 || got.SignOffs[0].Key != s.Key {
		t.Fatalf("after the choice changed: %+v", got.SignOffs)
	}
	before, _ := os.ReadFile(path)
	for _, bad := range []SignOff{{Name: "x", Verdict: "ok", At: at}, {Name: "", Verdict: Approve, At: at}, {Name: "a\nb", Verdict: Approve, At: at}} {
		if _, _, err := AppendSignOff(context.Background(), path, bad); err == nil {
			t.Errorf("%+v accepted", bad)
		}
	}
	if after, _ := os.ReadFile(path); !bytes.Equal(before, after) {
		t.Error("a refused sign-off changed the file")
	}
	if _, err := ParseVerdict("Approve"); !errors.Is(err, ErrVerdict) {
		t.Errorf("ParseVerdict(Approve): %v, want ErrVerdict (verdicts are lower case)", err)
	}
	if _, _, err := AppendSignOff(context.Background(), filepath.Join(t.TempDir(), "none.yaml"), s2); err == nil {
		t.Error("a sign-off of no file was accepted")
	}
	if math.IsNaN(got.SignOffs[1].ChosenScore) {
		t.Error("no chosen score")
	}
}

// bigResult is the analysis of n rows of distinct scores, about one in ten
// true, with the rules hit=0.8 and base.
func bigResult(t *testing.T, n int) *analysis.Result {
	t.Helper()
	rng := rand.New(rand.NewPCG(3, 5))
	sc := make([]float64, n)
	labels := make([]bool, n)
	for i := range sc {
		labels[i] = rng.Float64() < 0.1
		sc[i] = rng.Float64()
		if labels[i] {
			sc[i] = math.Sqrt(sc[i])
		}
	}
	set, err := scores.New(sc, labels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	res, err := analysis.Run(context.Background(), set, projection.Assumptions{BaseRate: 0.1, Confidence: 0.95},
		analysis.Options{Rules: []cutrule.Rule{{Kind: cutrule.Hit, Value: 0.8}, {Kind: cutrule.Base}}})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// TestRewriteKeepsSignOffs: a screen's write over the file it read keeps
// the sign-offs appended since, and is refused when anything else
// changed, so that no one's write is lost.
func TestRewriteKeepsSignOffs(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	if err := save(path, demoFile(t), false); err != nil {
		t.Fatal(err)
	}
	mine, stamp, err := ReadFileStamped(path)
	if err != nil {
		t.Fatal(err)
	}
	// Two sign-offs land while the screen is open.
	for _, name := range []string{"Ana", "Bo"} {
		if _, _, err := AppendSignOff(context.Background(), path, SignOff{Name: name, Verdict: Approve, At: time.Now()}); err != nil {
			t.Fatal(err)
		}
	}
	mine.Chosen = "hit=0.8"
	stamp, kept, err := Rewrite(context.Background(), path, mine, stamp, false)
	if err != nil {
		t.Fatal(err)
	}
	back, err := ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if back.Chosen != "hit=0.8" || len(back.SignOffs) != 3 || len(kept) != 3 || back.SignOffs[2].Name != "Bo" {
		t.Fatalf("chosen %q, %d sign-offs on disk, %d returned", back.Chosen, len(back.SignOffs), len(kept))
	}
	// The stamp returned is the file written: the next write goes through.
	mine.SignOffs = kept
	mine.Note = "second thoughts"
	if stamp, _, err = Rewrite(context.Background(), path, mine, stamp, false); err != nil {
		t.Fatal(err)
	}
	// Any other change refuses the write and leaves the file as it is.
	other, _ := ReadFile(path)
	other.Note = "someone else's note"
	if err := save(path, other, false); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(path)
	mine.Chosen = "base"
	if _, _, err := Rewrite(context.Background(), path, mine, stamp, false); !errors.Is(err, sharedfile.ErrChanged) {
		t.Fatalf("error %v, want ErrChanged", err)
	}
	if after, _ := os.ReadFile(path); !bytes.Equal(before, after) {
		t.Fatal("a refused write changed the file")
	}
}

// TestReadSegmentsBeforeTests: a sill-cut/2 file written before groups
// were tested against the rest (no gap keys, no tests count) reads, its
// gaps undefined.
func TestReadSegmentsBeforeTests(t *testing.T) {
	valid, err := Marshal(demoFile(t))
	if err != nil {
		t.Fatal(err)
	}
	old := regexp.MustCompile(`, recall_gap: .*?false_discovery_adjusted_p: [-0-9.e]+\}`).ReplaceAllString(string(valid), "}")
	old = regexp.MustCompile(`\n      tests: \d+`).ReplaceAllString(old, "")
	if old == string(valid) || strings.Contains(old, "recall_gap") {
		t.Fatal("the gap keys were not taken out")
	}
	f, err := Read(strings.NewReader(old), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	s := f.Candidates[0].Segments
	if g := s.Groups[0]; !math.IsNaN(g.RecallGap) || !math.IsNaN(g.FalseDiscoveryGapCI[0]) || !math.IsNaN(g.RecallAdjustedP) || s.Tests != 0 {
		t.Errorf("groups without tests read %+v, tests %d", g, s.Tests)
	}
}

// TestRuleChecks: the decision file records whether each candidate's rule
// picks its cut under the file's assumptions, and reads it back. The
// candidates are picked at the demo's own base rate (about 7%); written
// again at a production base rate of 2%, hit=0.8 (recall alone) still
// picks its cut while base flags fewer cases (the deepest cut whose
// projected alert rate is at most 2%), and a cut picked by hand has no
// check.
func TestRuleChecks(t *testing.T) {
	res, err := demoResult(50)
	if err != nil {
		t.Fatal(err)
	}
	var picks []Pick
	for _, o := range res.Outcomes {
		picks = append(picks, Pick{Name: o.Rule.String(), Rule: o.Rule.String(), Point: o.Point})
	}
	var byHand curve.Point
	n := 0
	res.Points(func(p curve.Point) {
		if n++; n == 10 {
			byHand = p
		}
	})
	picks = append(picks, Pick{Name: "by hand", Point: byHand})
	a := res.Assume
	a.BaseRate = 0.02
	later, err := res.Reassume(context.Background(), a)
	if err != nil {
		t.Fatal(err)
	}
	baseNow := later.Outcomes[1].Point.Score // base under a 2% base rate
	for _, tc := range []struct {
		name  string
		res   *analysis.Result
		holds []bool
		picks []float64
	}{
		{"as pinned", res, []bool{true, true}, []float64{picks[0].Point.Score, picks[1].Point.Score}},
		{"base rate 2%", later, []bool{true, false}, []float64{picks[0].Point.Score, baseNow}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f, err := New(tc.res, picks, "base", Record{})
			if err != nil {
				t.Fatal(err)
			}
			out, err := Marshal(f)
			if err != nil {
				t.Fatal(err)
			}
			back, err := Read(bytes.NewReader(out), "cut.yaml")
			if err != nil {
				t.Fatal(err)
			}
			for i := range tc.holds {
				k := back.Candidates[i].RuleCheck
				if k == nil || k.Holds != tc.holds[i] || k.Picks != tc.picks[i] {
					t.Errorf("%s: check %+v, want holds %v picks %v", back.Candidates[i].Name, k, tc.holds[i], tc.picks[i])
				}
			}
			if k := back.Candidates[2].RuleCheck; k != nil {
				t.Errorf("a cut picked by hand has a rule check %+v", k)
			}
		})
	}
	if baseNow == picks[1].Point.Score {
		t.Fatal("base picks the same cut at 2%: the test checks nothing")
	}
}

// TestStabilityAtCut: a file records each resampled candidate's redraws
// at its cut, the bootstrap's band exactly at the candidate's score
// (bootstrap.Result.BandAtCut), and reads them back; a file written
// before the keys (both removed) reads as before, the ranges NaN.
func TestStabilityAtCut(t *testing.T) {
	f := demoFile(t)
	st := f.Candidates[0].Stability
	if st == nil || !(st.RecallAtCut[0] <= st.RecallAtCut[1]) || !(st.FalseDiscoveryRateAtCut[0] <= st.FalseDiscoveryRateAtCut[1]) {
		t.Fatalf("candidate 0's stability %+v, want its ranges at the cut", st)
	}
	text, err := Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	back, err := Read(bytes.NewReader(text), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if got := back.Candidates[0].Stability; got.RecallAtCut != st.RecallAtCut || got.FalseDiscoveryRateAtCut != st.FalseDiscoveryRateAtCut {
		t.Errorf("read back %v %v, wrote %v %v", got.RecallAtCut, got.FalseDiscoveryRateAtCut, st.RecallAtCut, st.FalseDiscoveryRateAtCut)
	}
	older := regexp.MustCompile(`\n +(recall|false_discovery_rate)_at_cut: [^\n]*`).ReplaceAllString(string(text), "")
	old, err := Read(strings.NewReader(older), "old.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if got := old.Candidates[0].Stability; !math.IsNaN(got.RecallAtCut[0]) || !math.IsNaN(got.FalseDiscoveryRateAtCut[1]) || got.Recall != st.Recall {
		t.Errorf("a file without the keys reads %+v", got)
	}
}

// TestStabilityByHand: a candidate picked by hand at a cut no resampled
// rule lands on (a pin with no rule, and one named score=V that is not
// among the rules) records its redraws at its cut, the bootstrap's band
// exactly there (bootstrap.Result.BandAtCut), with where a rule lands
// null and Skipped saying why; the file reads back the same.
func TestStabilityByHand(t *testing.T) {
	res, err := demoResult(50)
	if err != nil {
		t.Fatal(err)
	}
	ruled := map[int]bool{}
	for _, o := range res.Outcomes {
		ruled[o.Point.Index] = true
	}
	var points, hand []curve.Point
	res.Points(func(p curve.Point) { points = append(points, p) })
	for _, p := range points[len(points)/3:] {
		if !ruled[p.Index] && len(hand) < 2 {
			hand = append(hand, p)
		}
	}
	first := res.Outcomes[0]
	picks := []Pick{{Name: "base", Rule: first.Rule.String(), Point: first.Point}, {Name: "pinned", Point: hand[0]},
		{Name: "score", Rule: "score=" + strconv.FormatFloat(hand[1].Score, 'g', -1, 64), Point: hand[1]}}
	f, err := New(res, picks, "base", Record{ToolVersion: "1.2.3"})
	if err != nil {
		t.Fatal(err)
	}
	text, err := Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	back, err := Read(bytes.NewReader(text), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range hand {
		c := back.Candidates[i+1]
		band, ok := res.Stability.BandAtCut(p.Score)
		if !ok {
			t.Fatalf("%s: no band at %v", c.Name, p.Score)
		}
		st := c.Stability
		if st == nil || st.Replicates != 50 || st.Seed != res.Stability.Seed || st.Skipped != SkippedByHand || st.Met != 0 {
			t.Fatalf("%s: stability %+v, want the redraws at its cut alone", c.Name, st)
		}
		if st.RecallAtCut != band.Recall || st.FalseDiscoveryRateAtCut != band.FalseDiscoveryRate {
			t.Errorf("%s: redraws %v %v, band at the cut %v %v", c.Name, st.RecallAtCut, st.FalseDiscoveryRateAtCut, band.Recall, band.FalseDiscoveryRate)
		}
		if !math.IsNaN(st.Score[0]) || !math.IsNaN(st.Recall[1]) || !math.IsNaN(st.FlaggedShare[0]) {
			t.Errorf("%s: where a rule lands %v %v %v, want null", c.Name, st.Score, st.FlaggedShare, st.Recall)
		}
	}
	if st := back.Candidates[0].Stability; st == nil || st.Skipped != "" || st.Met == 0 {
		t.Errorf("%s: stability %+v, want its rule's spread", first.Rule, st)
	}
}
