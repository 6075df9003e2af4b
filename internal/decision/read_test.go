package decision

import (
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/format"

	"bytes"
	"errors"
	"math"
	"regexp"
	"strings"
	"testing"
)

// replaceNth replaces the n-th (0-based) match of pattern in text; the
// test fails when there is no such match, so a broken case cannot pass by
// leaving the file valid.
func replaceNth(t *testing.T, text, pattern string, n int, replacement string) string {
	t.Helper()
	matches := regexp.MustCompile(pattern).FindAllStringIndex(text, -1)
	if n >= len(matches) {
		t.Fatalf("pattern %q has %d matches, want a match number %d", pattern, len(matches), n)
	}
	m := matches[n]
	return text[:m[0]] + replacement + text[m[1]:]
}

func TestReadRejectsBrokenKeys(t *testing.T) {
	valid, err := Marshal(demoFile(t))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Read(bytes.NewReader(valid), "cut.yaml"); err != nil {
		t.Fatalf("the unbroken file: %v", err)
	}
	text := string(valid)
	for _, tc := range []struct {
		name     string
		broken   string
		sentinel error
		path     string
	}{
		{"other format", replaceNth(t, text, `format: sill-cut/2`, 0, `format: sill-cut/3`), ErrFormat, "format"},
		{"format not text", replaceNth(t, text, `format: sill-cut/2`, 0, `format: 2`), ErrType, "format"},
		{"missing chosen", replaceNth(t, text, `chosen: "base"\n`, 0, ``), ErrMissingKey, "chosen"},
		{"missing data", replaceNth(t, text, `(?s)data:.*?\nassumptions:`, 0, `assumptions:`), ErrMissingKey, "data"},
		{"missing tp", replaceNth(t, text, `\n      tp: \d+`, 1, ``), ErrMissingKey, "candidates[1].validation.tp"},
		{"missing score", replaceNth(t, text, `\n    score: [^\n]*# flag[^\n]*`, 0, ``), ErrMissingKey, "candidates[0].score"},
		{"unknown top key", replaceNth(t, text, `\nnote:`, 0, "\napproved_by: lead\nnote:"), ErrUnknownKey, "approved_by"},
		{"unknown candidate key", replaceNth(t, text, `\n    rule:`, 1, "\n    threshold: 0.5\n    rule:"), ErrUnknownKey, "candidates[1].threshold"},
		{"digest cut short", replaceNth(t, text, `sha256: "[0-9a-f]{64}"`, 0, `sha256: "051e0bf4"`), ErrInvalid, "data.sha256"},
		{"rows as text", replaceNth(t, text, `rows: 2000`, 0, `rows: "2000"`), ErrType, "data.rows"},
		{"rows fractional", replaceNth(t, text, `rows: 2000`, 0, `rows: 2000.5`), ErrType, "data.rows"},
		{"bool not bool", replaceNth(t, text, `lower_is_riskier: false`, 0, `lower_is_riskier: maybe`), ErrType, "data.lower_is_riskier"},
		{"score nan", replaceNth(t, text, `\n    score: [0-9.]+ #`, 1, "\n    score: .nan #"), ErrNotFinite, "candidates[1].score"},
		{"score inf", replaceNth(t, text, `\n    score: [0-9.]+ #`, 0, "\n    score: -.inf #"), ErrNotFinite, "candidates[0].score"},
		{"score null", replaceNth(t, text, `\n    score: [0-9.]+ #`, 0, "\n    score: null #"), ErrNotFinite, "candidates[0].score"},
		{"score text", replaceNth(t, text, `\n    score: [0-9.]+ #`, 0, "\n    score: high #"), ErrType, "candidates[0].score"},
		{"score list", replaceNth(t, text, `\n    score: [0-9.]+ #`, 0, "\n    score: [0.5] #"), ErrType, "candidates[0].score"},
		{"chosen names none", replaceNth(t, text, `chosen: "base"`, 0, `chosen: "hit=0.9"`), ErrUnknownChosen, "chosen"},
		{"no candidates", replaceNth(t, text, `(?s)candidates:\n.*?\nnote:`, 0, "candidates: []\nnote:"), ErrInvalid, "candidates"},
		{"candidates not a list", replaceNth(t, text, `(?s)candidates:\n.*?\nnote:`, 0, "candidates: base\nnote:"), ErrType, "candidates"},
		{"repeated name", replaceNth(t, text, `name: "base"`, 0, `name: "hit=0.8"`), ErrInvalid, "candidates[1].name"},
		{"repeated chosen name", replaceNth(t, text, `name: "hit=0.8"`, 0, `name: "base"`), ErrInvalid, "candidates[1].name"},
		// A hand edit of one count leaves the four counts disagreeing with
		// the data's totals (tp + fn = positives, fp + tn = negatives) or
		// with the cases flagged (tp + fp); 99999 is more than the file's
		// 2000 rows, so no valid file has it.
		{"tp edited", replaceNth(t, text, `\n      tp: \d+`, 1, "\n      tp: 99999"), ErrInvalid, "candidates[1].validation.tp"},
		{"fp edited", replaceNth(t, text, `\n      fp: \d+`, 0, "\n      fp: 99999"), ErrInvalid, "candidates[0].validation.fp"},
		{"flagged edited", replaceNth(t, text, `\n      flagged: \d+`, 0, "\n      flagged: 99999"), ErrInvalid, "candidates[0].validation.flagged"},
		{"name a number", replaceNth(t, text, `name: "base"`, 0, `name: 12`), ErrType, "candidates[1].name"},
		{"negative count", replaceNth(t, text, `tp: \d+`, 0, `tp: -1`), ErrInvalid, "candidates[0].validation.tp"},
		{"recall above 1", replaceNth(t, text, `recall: [0-9.]+`, 0, `recall: 1.5`), ErrInvalid, "candidates[0].validation.recall"},
		{"interval of one", replaceNth(t, text, `recall_ci: \[[^\]]*\]`, 0, `recall_ci: [0.1]`), ErrInvalid, "candidates[0].validation.recall_ci"},
		{"interval reversed", replaceNth(t, text, `\n      recall_ci: \[[^\]]*\]`, 1, "\n      recall_ci: [0.9, 0.1]"), ErrInvalid, "candidates[1].validation.recall_ci"},
		{"weight kind unknown", replaceNth(t, text, `weight_kind: null`, 0, `weight_kind: survey`), ErrInvalid, "data.weight_kind"},
		{"weight kind a number", replaceNth(t, text, `weight_kind: null`, 0, `weight_kind: 3`), ErrType, "data.weight_kind"},
		{"effective trials text", replaceNth(t, text, `\n    projected:`, 0, "\n      effective_trials: many\n    projected:"), ErrType, "candidates[0].validation.effective_trials"},
		{"effective trials negative", replaceNth(t, text, `\n    projected:`, 0, "\n      effective_trials: {recall: -1, false_positive_rate: 1, precision: 1, flagged_share: 1, base_rate: 1}\n    projected:"), ErrInvalid, "candidates[0].validation.effective_trials.recall"},
		{"effective trials short", replaceNth(t, text, `\n    projected:`, 0, "\n      effective_trials: {recall: 1}\n    projected:"), ErrMissingKey, "candidates[0].validation.effective_trials.false_positive_rate"},
		// The ranking: shares in [0,1] or null, intervals of two ends in
		// order that hold their figure, no other key.
		{"auc above 1", replaceNth(t, text, `roc_auc: [0-9.]+`, 0, `roc_auc: 1.2`), ErrInvalid, "data.ranking.roc_auc"},
		{"auc interval reversed", replaceNth(t, text, `roc_auc_ci: \[[^\]]*\]`, 0, `roc_auc_ci: [0.95, 0.85]`), ErrInvalid, "data.ranking.roc_auc_ci"},
		{"auc outside its interval", replaceNth(t, text, `roc_auc_ci: \[[^\]]*\]`, 0, `roc_auc_ci: [0.1, 0.2]`), ErrInvalid, "data.ranking.roc_auc_ci"},
		{"ap outside its interval", replaceNth(t, text, `average_precision_ci: \[[^\]]*\]`, 0, `average_precision_ci: [0.9, 0.95]`), ErrInvalid, "data.ranking.average_precision_ci"},
		{"ap missing", replaceNth(t, text, `\n    average_precision: [0-9.]+`, 0, ``), ErrMissingKey, "data.ranking.average_precision"},
		{"ranking unknown key", replaceNth(t, text, `\n    roc_auc: `, 0, "\n    gini: 0.8\n    roc_auc: "), ErrUnknownKey, "data.ranking.gini"},
		{"ranking a number", replaceNth(t, text, `(?s)ranking:\n.*?\nassumptions:`, 0, "ranking: 0.9\nassumptions:"), ErrType, "data.ranking"},
		{"bad created", replaceNth(t, text, `created: "[^"]*"`, 0, `created: "yesterday"`), ErrInvalid, "created"},
		{"base rate above 1", replaceNth(t, text, `base_rate: [0-9.]+`, 0, `base_rate: 2`), ErrInvalid, "assumptions.base_rate"},
		{"confidence 1", replaceNth(t, text, `confidence: [0-9.]+`, 0, `confidence: 1`), ErrInvalid, "assumptions.confidence"},
		{"volume 0", replaceNth(t, text, `volume_per_shift: \d+`, 0, `volume_per_shift: 0`), ErrInvalid, "assumptions.volume_per_shift"},
		{"cost text", replaceNth(t, text, `cost_miss: \d+`, 0, `cost_miss: lots`), ErrType, "assumptions.cost_miss"},
		{"edges unordered", replaceNth(t, text, `edges: \[0, `, 0, `edges: [0.5, `), ErrInvalid, "data.score_histogram.edges[1]"},
		{"edge nan", replaceNth(t, text, `edges: \[0, `, 0, `edges: [.nan, `), ErrNotFinite, "data.score_histogram.edges[0]"},
		{"counts short", replaceNth(t, text, `counts: \[\d+, `, 0, `counts: [`), ErrInvalid, "data.score_histogram.edges"},
		{"chosen score disagrees", replaceNth(t, text, `chosen_score: [0-9.]+`, 0, `chosen_score: 0.5`), ErrInvalid, "chosen_score"},
		{"chosen moved, score not", replaceNth(t, text, `chosen: "base"`, 0, `chosen: "hit=0.8"`), ErrInvalid, "chosen_score"},
		{"chosen score text", replaceNth(t, text, `chosen_score: [0-9.]+`, 0, `chosen_score: "0.5"`), ErrType, "chosen_score"},
		{"duplicate key", replaceNth(t, text, `\nnote:`, 0, "\ncaution: again\nnote:"), ErrInvalid, "caution"},
		{"projected interval reversed", replaceNth(t, text, `queue_per_shift_ci: \[[^\]]*\]`, 1, `queue_per_shift_ci: [90, 40]`), ErrInvalid, "candidates[1].projected.queue_per_shift_ci"},
		{"projected interval of one", replaceNth(t, text, `alert_rate_ci: \[[^\]]*\]`, 0, `alert_rate_ci: [0.1]`), ErrInvalid, "candidates[0].projected.alert_rate_ci"},
		{"projected precision interval above 1", replaceNth(t, text, `\n      precision_ci: \[[^\]]*\]`, 1, "\n      precision_ci: [0.2, 1.5]"), ErrInvalid, "candidates[0].projected.precision_ci[1]"},
		{"projected cost interval text", replaceNth(t, text, `cost_per_shift_ci: \[[^\]]*\]`, 0, `cost_per_shift_ci: [low, high]`), ErrType, "candidates[0].projected.cost_per_shift_ci[0]"},
		{"not a mapping", "- format\n- sill-cut/1\n", ErrType, ""},
		{"empty", "", ErrSyntax, ""},
		{"only a comment", "# nothing here\n", ErrSyntax, ""},
		{"malformed yaml", "format: [sill-cut/1\n", ErrSyntax, ""},
		{"tab indent", replaceNth(t, text, `\n  path:`, 0, "\n\tpath:"), ErrSyntax, ""},
		{"two documents", text + "---\nformat: sill-cut/1\n", ErrSyntax, ""},
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
			msg := err.Error()
			t.Log(msg)
			if strings.Contains(msg, "\n") || !strings.HasPrefix(msg, "cut.yaml") {
				t.Errorf("message %q, want one line starting with the file name", msg)
			}
			if tc.path != "" && !strings.Contains(msg, ": "+tc.path+": ") {
				t.Errorf("message %q does not name the path %s", msg, tc.path)
			}
		})
	}
}

func TestReadErrorLine(t *testing.T) {
	valid, _ := Marshal(demoFile(t))
	lines := strings.Split(string(valid), "\n")
	want := 0
	for i, l := range lines {
		if strings.HasPrefix(l, "chosen:") {
			lines[i] = `chosen: "nobody"`
			want = i + 1
		}
	}
	_, err := Read(strings.NewReader(strings.Join(lines, "\n")), "cut.yaml")
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Line != want {
		t.Fatalf("error %v, want line %d", err, want)
	}
	if got, wantPrefix := err.Error(), "cut.yaml:"; !strings.HasPrefix(got, wantPrefix) || !strings.Contains(got, `chosen: names no candidate: "nobody", expected one of ["hit=0.8", "base"]`) {
		t.Errorf("message %q", got)
	}
}

func TestReadOptionalKeysDerived(t *testing.T) {
	f := demoFile(t)
	// Only the keys of sill-cut/1 that may be left out: the sign-offs'
	// notes and the stability's flagged_share are required.
	f.SignOffs = nil
	for i := range f.Candidates {
		f.Candidates[i].Stability = nil
	}
	valid, _ := Marshal(f)
	text := string(valid)
	text = regexp.MustCompile(`\n      rows: [^\n]*`).ReplaceAllString(text, "") // validation.rows, not data.rows
	for _, key := range []string{"chosen_score", "flagged_share", "false_discovery_rate", "false_discovery_ci", "cost_per_case", "negatives", "weight_column", "note", "rule_holds", "rule_picks", "promise", "rule"} {
		text = regexp.MustCompile(`\n *`+key+`: [^\n]*`).ReplaceAllString(text, "")
	}
	if strings.Contains(text, "flagged_share") || strings.Contains(text, "rule:") {
		t.Fatal("the optional keys were not removed")
	}
	back, err := Read(strings.NewReader(text), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range back.Candidates {
		w := f.Candidates[i].Cut
		g := c.Cut
		if g.Rows != w.Rows || !floatcmp.Equal(g.FlaggedShare, w.FlaggedShare) || !floatcmp.Equal(g.FalseDiscoveryRate, w.FalseDiscoveryRate) ||
			!floatcmp.Equal(g.FalseDiscoveryCI[0], w.FalseDiscoveryCI[0]) || !floatcmp.Equal(g.FalseDiscoveryCI[1], w.FalseDiscoveryCI[1]) ||
			!floatcmp.Equal(g.Projected.CostPerCase, w.Projected.CostPerCase) {
			t.Errorf("candidate %d derived %+v, want %+v", i, g, w)
		}
		if c.Rule != "" || c.Note != "" {
			t.Errorf("candidate %d rule %q note %q, want empty", i, c.Rule, c.Note)
		}
	}
	if back.Note != "" || back.Data.WeightColumn != "" || !floatcmp.Equal(back.Data.Negatives, nan()) {
		t.Errorf("note %q weight column %q negatives %v", back.Note, back.Data.WeightColumn, back.Data.Negatives)
	}
}

// TestReadProjectedIntervals checks that the projected figures' intervals
// read back as written, and that a file written before they were recorded
// still reads, with the intervals its counts and assumptions give.
func TestReadProjectedIntervals(t *testing.T) {
	f := demoFile(t)
	valid, err := Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	text := string(valid)
	if !strings.Contains(text, "projected: # "+format.ProjectedHeading) || !strings.Contains(text, "validation: # "+format.MeasuredHeading) {
		t.Errorf("the file does not say which figures are measured and which projected")
	}
	old := text
	for _, key := range []string{"precision_ci", "alert_rate_ci", "queue_per_shift_ci", "cost_per_shift_ci", "cost_per_case_ci"} {
		// precision_ci is also a validation key, six spaces in as well:
		// drop only the one under projected, which follows cost_per_case.
		if key == "precision_ci" {
			old = regexp.MustCompile(`(cost_per_case: [^\n]*)\n *precision_ci: [^\n]*`).ReplaceAllString(old, "$1")
			continue
		}
		old = regexp.MustCompile(`\n *`+key+`: [^\n]*`).ReplaceAllString(old, "")
	}
	if regexp.MustCompile(`cost_per_case: [^\n]*\n *precision_ci`).MatchString(old) || strings.Contains(old, "alert_rate_ci") || !strings.Contains(old, "recall_ci") {
		t.Fatalf("the projected intervals were not all removed")
	}
	for name, in := range map[string]string{"as written": text, "without the keys": old} {
		back, err := Read(strings.NewReader(in), "cut.yaml")
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for i, c := range back.Candidates {
			w := f.Candidates[i].Cut.ProjectedCI
			g := c.Cut.ProjectedCI
			for _, pair := range [][2][2]float64{{g.Precision, w.Precision}, {g.AlertRate, w.AlertRate}, {g.QueuePerShift, w.QueuePerShift}, {g.CostPerShift, w.CostPerShift}, {g.CostPerCase, w.CostPerCase}} {
				if !floatcmp.Equal(pair[0][0], pair[1][0]) || !floatcmp.Equal(pair[0][1], pair[1][1]) {
					t.Errorf("%s: candidate %d intervals %+v, want %+v", name, i, g, w)
					break
				}
			}
			if !evidence.Defined(g.QueuePerShift[0]) || !(g.QueuePerShift[0] < c.Cut.Projected.QueuePerShift) {
				t.Errorf("%s: candidate %d queue interval %v around %v", name, i, g.QueuePerShift, c.Cut.Projected.QueuePerShift)
			}
		}
	}
}

// TestRankingRoundTrip: the data's ranking reads back as written; a file
// without the key (written before it was recorded) or with null reads a
// nil Ranking; undefined figures and ends are null and read back NaN.
func TestRankingRoundTrip(t *testing.T) {
	f := demoFile(t)
	if f.Data.Ranking == nil {
		t.Fatal("New recorded no ranking")
	}
	text, err := Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	back, err := Read(bytes.NewReader(text), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if got, want := *back.Data.Ranking, *f.Data.Ranking; got != want {
		t.Errorf("ranking read back %+v, wrote %+v", got, want)
	}
	for name, replacement := range map[string]string{"absent": "assumptions:", "null": "  ranking: null\nassumptions:"} {
		old := replaceNth(t, string(text), `(?s)  ranking:\n.*?\nassumptions:`, 0, replacement)
		back, err := Read(strings.NewReader(old), "cut.yaml")
		if err != nil || back.Data.Ranking != nil {
			t.Errorf("%s: ranking %+v, error %v", name, back.Data.Ranking, err)
		}
	}
	nan := math.NaN()
	f.Data.Ranking = &Ranking{ROCAUC: nan, ROCAUCCI: [2]float64{nan, nan}, AveragePrecision: 0.5, AveragePrecisionCI: [2]float64{nan, nan}}
	text, err = Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(text), "roc_auc: null\n    roc_auc_ci: [null, null]") {
		t.Errorf("undefined ranking written as\n%s", text)
	}
	back, err = Read(bytes.NewReader(text), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if r := back.Data.Ranking; !math.IsNaN(r.ROCAUC) || !math.IsNaN(r.ROCAUCCI[1]) || r.AveragePrecision != 0.5 || !math.IsNaN(r.AveragePrecisionCI[0]) {
		t.Errorf("undefined ranking read back %+v", r)
	}
}
