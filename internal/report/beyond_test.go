package report_test

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/modelpair"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

// beyondSet is a small set with two groups; cut 0.8 flags the first three
// rows (see internal/segment's hand-worked test for the figures).
const beyondSet = "score,label,seg\n" +
	"0.9,1,A\n0.8,1,B\n0.8,0,A\n0.7,0,B\n0.6,1,A\n0.5,0,A\n0.4,1,B\n0.3,0,B\n"

// beyondResult analyses beyondSet at the cuts of specs under a (base rate
// 0.5, confidence 0.95, when a is nil), with two calibration bins.
func beyondResult(t *testing.T, a *projection.Assumptions, specs ...string) *analysis.Result {
	t.Helper()
	set, err := scores.Read(strings.NewReader(beyondSet), "t.csv", scores.Options{SegmentColumn: "seg"})
	if err != nil {
		t.Fatal(err)
	}
	if a == nil {
		a = &projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}
	}
	var rules []cutrule.Rule
	for _, s := range specs {
		r, err := cutrule.Parse(s)
		if err != nil {
			t.Fatal(err)
		}
		rules = append(rules, r)
	}
	res, err := analysis.Run(context.Background(), set, *a, analysis.Options{Rules: rules, CalibrationBins: 2})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// decode writes r as JSON and reads it back as generic values.
func decode(t *testing.T, r *report.Report) map[string]any {
	t.Helper()
	var buf bytes.Buffer
	if err := report.WriteJSON(&buf, r, nil); err != nil {
		t.Fatal(err)
	}
	var out map[string]any
	if err := json.Unmarshal(buf.Bytes(), &out); err != nil {
		t.Fatalf("%v\n%s", err, buf.String())
	}
	return out
}

func TestSegmentsInJSONAndText(t *testing.T) {
	r := report.New(beyondResult(t, nil, "score=0.8", "score=5"), report.Options{SegmentOrder: segment.ByName})
	cuts := decode(t, r)["cuts"].([]any)
	segs := cuts[0].(map[string]any)["segments"].([]any)
	if len(segs) != 2 {
		t.Fatalf("segments %v", segs)
	}
	a := segs[0].(map[string]any)
	for _, key := range []string{"segment", "rows", "positives", "flagged", "recall", "recall_ci", "precision", "precision_ci", "outlier"} {
		if _, ok := a[key]; !ok {
			t.Errorf("segment lacks key %q: %v", key, a)
		}
	}
	// A at cut 0.8: 1 of 2 true cases caught, 1 of 2 alerts right (hand-worked).
	if a["segment"] != "A" || a["recall"] != 0.5 || a["precision"] != 0.5 || a["outlier"] != false {
		t.Errorf("segment A %v", a)
	}
	// Against the rest (B: 1 of 2 true cases caught, 0 of 1 alert wrong):
	// recall gap 0, wrong-alert gap 0.5 - 0 = +0.5; base rates 2 of 4 in
	// each; four tests (two per group), none flagged. Hand-worked.
	rg, fg := a["recall_gap"].(map[string]any), a["false_discovery_rate_gap"].(map[string]any)
	if rg["gap"] != 0.0 || fg["gap"] != 0.5 || fg["rest"] != 0.0 || a["base_rate"] != 0.5 || a["rest_base_rate"] != 0.5 {
		t.Errorf("segment A gaps %v %v", rg, fg)
	}
	for _, key := range []string{"rest", "gap", "gap_ci", "p", "adjusted_p"} {
		if _, ok := fg[key]; !ok {
			t.Errorf("gap lacks key %q: %v", key, fg)
		}
	}
	if tests := cuts[0].(map[string]any)["segment_tests"].(map[string]any); tests["tests"] != 4.0 || tests["adjustment"] != "holm" || !floatcmp.Equal(tests["level"].(float64), 0.05) {
		t.Errorf("segment tests %v", tests)
	}
	if _, ok := cuts[1].(map[string]any)["segments"]; ok {
		t.Errorf("an unmet cut has no segments: %v", cuts[1])
	}
	var text bytes.Buffer
	if err := report.WriteText(&text, r); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(text.String(), "segments (seg) at score=0.8, cut 0.8") {
		t.Errorf("text lacks the segment section:\n%s", text.String())
	}
	// The text section fits 80 columns: each group on its own line, its
	// counts and base rates (A: 2 true of 4, the rest 2 of 4) below, then
	// its two figures with their gaps (A's hit share 50.0%, gap 0).
	section := text.String()[strings.Index(text.String(), "segments (seg)"):]
	section = section[:strings.Index(section, "\n\n")]
	for _, want := range []string{"\nA\n  4 rows · 2 true cases · 50.0% flagged · base rate 50.0% (rest 50.0%)\n  hit share", "\nB\n"} {
		if !strings.Contains(section, want) {
			t.Errorf("segment section lacks %q:\n%s", want, section)
		}
	}
	for _, line := range strings.Split(section, "\n") {
		if n := len([]rune(line)); n > 80 {
			t.Errorf("segment section line of %d columns, want at most 80: %q", n, line)
		}
	}
	// Showing one segment names the other as not shown.
	r2 := report.New(beyondResult(t, nil, "score=0.8"), report.Options{SegmentOrder: segment.ByName, SegmentsShown: 1})
	text.Reset()
	report.WriteText(&text, r2)
	folded := strings.Join(strings.Fields(text.String()), " ")
	if !strings.Contains(folded, "1 more segment not shown (0 of them differ)") || !strings.Contains(text.String(), "\nA\n") || strings.Contains(text.String(), "\nB\n") {
		t.Errorf("limited text:\n%s", text.String())
	}
	if segs := decode(t, r2)["cuts"].([]any)[0].(map[string]any)["segments"].([]any); len(segs) != 2 {
		t.Errorf("JSON lists %d segments, want all 2", len(segs))
	}
}

func TestCalibrationInJSON(t *testing.T) {
	a := projection.Assumptions{BaseRate: 0.5, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 1, Miss: 4}}
	out := decode(t, report.New(beyondResult(t, &a, "score=0.8", "score=5"), report.Options{}))
	cal := out["calibration"].(map[string]any)
	bins := cal["bins"].([]any)
	// Two bins: [0,0.5] holds 0.5,0.4,0.3 (1 true of 3, mean 0.4); (0.5,1]
	// holds 0.9,0.8,0.8,0.7,0.6 (3 true of 5, mean 0.76). ECE =
	// (3*|1/3-0.4| + 5*|0.6-0.76|)/8 = (0.2+0.8)/8 = 0.125. Hand-worked.
	if len(bins) != 2 || bins[0].(map[string]any)["count"] != 3.0 {
		t.Fatalf("bins %v", bins)
	}
	for _, key := range []string{"lower", "upper", "mean_score", "observed_rate", "count"} {
		if _, ok := bins[1].(map[string]any)[key]; !ok {
			t.Errorf("bin lacks %q", key)
		}
	}
	if ece := cal["ece"].(float64); !floatcmp.Equal(ece, 0.125) {
		t.Errorf("ece %v, want 0.125", ece)
	}
	// Elkan: 1/(1+4) = 0.2, at the validation base rate 0.5 as production's.
	if ct := cal["cost_threshold"].(float64); !floatcmp.Equal(ct, 0.2) {
		t.Errorf("cost threshold %v, want 0.2", ct)
	}
	cuts := out["cuts"].([]any)
	// Net benefit at cut 0.8: TP 2 of 4 true (recall 0.5), FP 1 of 4
	// false (FPR 0.25), threshold probability from the costs 0.2 (odds
	// 0.25), production's base rate 0.5: 0.5*0.5 - 0.25*0.5*0.25 =
	// 0.21875. Hand-worked.
	if nb := cuts[0].(map[string]any)["net_benefit"].(float64); !floatcmp.Equal(nb, 0.21875) {
		t.Errorf("net benefit %v, want 0.21875", nb)
	}
	if th, from := cal["net_benefit_threshold"].(float64), cal["net_benefit_threshold_from"]; !floatcmp.Equal(th, 0.2) || from != "costs" {
		t.Errorf("net benefit threshold %v from %v, want 0.2 from costs", th, from)
	}
	if noise, ok := cal["ece_noise"].(float64); !ok || !(noise > 0) {
		t.Errorf("ece_noise %v", cal["ece_noise"])
	}
	if nb, ok := cuts[1].(map[string]any)["net_benefit"]; !ok || nb != nil {
		t.Errorf("unmet cut net benefit %v %v, want null", nb, ok)
	}
}

func TestComparisonWithoutTest(t *testing.T) {
	res := beyondResult(t, nil, "score=0.8")
	cols := res.Set.Columns()
	cols.ScoreColumn, cols.CompareColumn = "a", "b"
	set, err := scores.NewSet(cols)
	if err != nil {
		t.Fatal(err)
	}
	res.Set = set
	res.Second = &analysis.Second{Outcomes: res.Outcomes, TestErr: modelpair.ErrNoClass}
	out := decode(t, report.New(res, report.Options{}))
	c := out["comparison"].(map[string]any)
	if c["score_a"] != "a" || c["auc_a"] != nil || c["delong_p"] != nil {
		t.Errorf("comparison %v", c)
	}
	if w := out["warnings"].([]any); len(w) == 0 || !strings.Contains(w[len(w)-1].(string), "no paired AUC test") {
		t.Errorf("warnings %v", w)
	}
	second := out["cuts"].([]any)[0].(map[string]any)["second_model"].(map[string]any)
	if second["met"] != true || second["score"] != 0.8 {
		t.Errorf("second model %v", second)
	}
}

// TestStabilityWarnsOnCostThreshold: a cost threshold (1/(1+4) = 0.2)
// outside the least-cost cut's bootstrap range (0.5 to 0.8) warns; one
// inside does not.
func TestStabilityWarnsOnCostThreshold(t *testing.T) {
	for _, c := range []struct {
		lo, hi float64
		warns  bool
	}{{0.5, 0.8, true}, {0.1, 0.8, false}} {
		// The cut is score=0.8 (the helper has no costs); the spread is
		// labelled as the cost rule's, which is what the warning looks at.
		a := projection.Assumptions{BaseRate: 0.5, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 1, Miss: 4}}
		res := beyondResult(t, &a, "score=0.8")
		before := len(report.New(res, report.Options{}).Warnings)
		res.Stability = &bootstrap.Result{Replicates: 10, Seed: 3, Spreads: []bootstrap.Spread{{
			Rule: cutrule.Rule{Kind: cutrule.Cost}, Met: 10, Score: [2]float64{c.lo, c.hi},
			FlaggedShare: [2]float64{0.2, 0.3}, Recall: [2]float64{0.5, 0.7},
		}}}
		r := report.New(res, report.Options{})
		if warned := len(r.Warnings) > before; warned != c.warns {
			t.Errorf("range %v-%v: warned %v, want %v (%v)", c.lo, c.hi, warned, c.warns, r.Warnings)
		}
		st := decode(t, r)["cuts"].([]any)[0].(map[string]any)["stability"].(map[string]any)
		if st["score_p05"] != c.lo || st["flagged_share_p95"] != 0.3 || st["met_in"] != 10.0 {
			t.Errorf("stability %v", st)
		}
	}
}
