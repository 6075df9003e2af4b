package decision

import (
	"bytes"
	"errors"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/floatcmp"
)

// costFile is the demo decision file with a third candidate, the cut the
// cost rule picks under the demo's costs (false alert 120, miss 1200,
// volume 1500), which carries the least-cost figure's optimism.
func costFile(t *testing.T) *File {
	t.Helper()
	res, err := demoResult(50)
	if err != nil {
		t.Fatal(err)
	}
	if res.Calibration == nil || res.Calibration.Cost == nil || !res.Calibration.Cost.LeastCost.Met {
		t.Fatal("the demo result has no least-cost cut")
	}
	var picks []Pick
	for _, o := range res.Outcomes {
		picks = append(picks, Pick{Name: o.Rule.String(), Rule: o.Rule.String(), Point: o.Point})
	}
	picks = append(picks, Pick{Name: "least cost", Rule: "cost", Point: res.Calibration.Cost.LeastCost.Point})
	f, err := New(res, picks, "base", Record{ToolVersion: "1.2.3"})
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// TestPromiseAndOptimismRecorded: New records each rule's promise and the
// cost rule's optimism, they read back as written, and a file without the
// keys (written before them) reads with the promise taken from the rule
// and no optimism.
func TestPromiseAndOptimismRecorded(t *testing.T) {
	f := costFile(t)
	// Promises: cutrule.Rule.Promise's words for hit=0.8 (format.Share
	// writes 0.8 as 80.0%); base and cost promise nothing.
	wantPromise := []string{"hit share about 80.0% on this set only: below it about half the time in production", "", ""}
	for i, c := range f.Candidates {
		if c.Promise != wantPromise[i] {
			t.Errorf("candidate %q promise %q, want %q", c.Name, c.Promise, wantPromise[i])
		}
		if (c.Optimism != nil) != (c.Rule == "cost") {
			t.Errorf("candidate %q optimism %+v, want one only for the cost rule", c.Name, c.Optimism)
		}
	}
	o := f.Candidates[2].Optimism
	e := f.Candidates[2].Cut.Projected
	// The corrected figures are the projected ones plus the optimism; the
	// per-shift ones are per case times the demo's volume, 1500.
	if !(o.PerCase > 0) || !floatcmp.Equal(o.CorrectedPerCase, e.CostPerCase+o.PerCase) ||
		!floatcmp.Equal(o.PerShift, 1500*o.PerCase) || !floatcmp.Equal(o.CorrectedPerShift, e.CostPerShift+o.PerShift) ||
		o.Folds != analysis.OptimismFolds || o.Seed != analysis.OptimismSeed || !strings.Contains(o.Method, "Tibshirani") {
		t.Errorf("optimism %+v beside projected cost per case %v, per shift %v", o, e.CostPerCase, e.CostPerShift)
	}
	text, err := Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	back, err := Read(bytes.NewReader(text), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range back.Candidates {
		if c.Promise != f.Candidates[i].Promise || !reflect.DeepEqual(c.Optimism, f.Candidates[i].Optimism) {
			t.Errorf("candidate %d read back promise %q optimism %+v, want %q %+v", i, c.Promise, c.Optimism, f.Candidates[i].Promise, f.Candidates[i].Optimism)
		}
	}
	// Written before the keys: the promise comes from the rule, no
	// optimism.
	old := regexp.MustCompile(`\n    promise: [^\n]*`).ReplaceAllString(string(text), "")
	old = regexp.MustCompile(`(?s)\n    cost_optimism:[^\n]*\n(      [^\n]*\n)*`).ReplaceAllString(old, "\n")
	if strings.Contains(old, "promise") || strings.Contains(old, "cost_optimism") {
		t.Fatal("the keys were not removed")
	}
	back, err = Read(strings.NewReader(old), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range back.Candidates {
		if c.Promise != wantPromise[i] || c.Optimism != nil {
			t.Errorf("file without the keys: candidate %d promise %q optimism %+v, want %q and none", i, c.Promise, c.Optimism, wantPromise[i])
		}
	}
	// sill-cut/1: the promise of its hit=0.8 candidate comes from the rule.
	v1, err := ReadFile("testdata/v1/demo.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if got := v1.Candidates[0].Promise; got != wantPromise[0] {
		t.Errorf("sill-cut/1 hit=0.8 promise %q, want %q", got, wantPromise[0])
	}
}

// TestReadRejectsBrokenPromiseAndOptimism: one strict-reader error for
// each way the two keys can be wrong, with its key path.
func TestReadRejectsBrokenPromiseAndOptimism(t *testing.T) {
	valid, err := Marshal(costFile(t))
	if err != nil {
		t.Fatal(err)
	}
	text := string(valid)
	if _, err := Read(strings.NewReader(text), "cut.yaml"); err != nil {
		t.Fatalf("the unbroken file: %v", err)
	}
	const opt = "candidates[2].cost_optimism"
	for _, tc := range []struct {
		name     string
		broken   string
		sentinel error
		path     string
	}{
		{"promise a number", replaceNth(t, text, `promise: "[^"]*"`, 0, `promise: 80`), ErrType, "candidates[0].promise"},
		{"promise a list", replaceNth(t, text, `promise: "[^"]*"`, 0, `promise: [a, b]`), ErrType, "candidates[0].promise"},
		{"promise null for a rule that makes one", replaceNth(t, text, `promise: "[^"]*"`, 0, `promise: null`), ErrInvalid, "candidates[0].promise"},
		{"promise for a rule that makes none", replaceNth(t, text, `promise: null`, 0, `promise: "always right"`), ErrInvalid, "candidates[1].promise"},
		{"optimism on another rule", replaceNth(t, text, `cost_optimism: null`, 0, "cost_optimism: {per_case: 1, per_shift: 1500, corrected_cost_per_case: 1, corrected_cost_per_shift: 1, folds: 10, seed: 16, method: x}"), ErrInvalid, "candidates[0].cost_optimism"},
		{"optimism a number", replaceNth(t, text, `cost_optimism: #[^\n]*\n(      [^\n]*\n)*`, 0, "cost_optimism: 3\n"), ErrType, opt},
		{"optimism key missing", replaceNth(t, text, `\n      method: [^\n]*`, 0, ""), ErrMissingKey, opt + ".method"},
		{"optimism unknown key", replaceNth(t, text, `\n      method: `, 0, "\n      bias: 2\n      method: "), ErrUnknownKey, opt + ".bias"},
		{"per case null", replaceNth(t, text, `\n      per_case: [-0-9.e]+`, 0, "\n      per_case: null"), ErrNotFinite, opt + ".per_case"},
		{"per case text", replaceNth(t, text, `\n      per_case: [-0-9.e]+`, 0, "\n      per_case: some"), ErrType, opt + ".per_case"},
		{"corrected per case edited", replaceNth(t, text, `corrected_cost_per_case: [-0-9.e]+`, 0, `corrected_cost_per_case: 1`), ErrInvalid, opt + ".corrected_cost_per_case"},
		{"per shift not per case times volume", replaceNth(t, text, `\n      per_shift: [-0-9.e]+`, 0, "\n      per_shift: 1"), ErrInvalid, opt + ".per_shift"},
		{"per shift null with a volume", replaceNth(t, text, `\n      per_shift: [-0-9.e]+`, 0, "\n      per_shift: null"), ErrInvalid, opt + ".per_shift"},
		{"corrected per shift edited", replaceNth(t, text, `corrected_cost_per_shift: [-0-9.e]+`, 0, `corrected_cost_per_shift: 1`), ErrInvalid, opt + ".corrected_cost_per_shift"},
		{"one fold", replaceNth(t, text, `folds: 10`, 0, `folds: 1`), ErrInvalid, opt + ".folds"},
		{"folds fractional", replaceNth(t, text, `folds: 10`, 0, `folds: 2.5`), ErrType, opt + ".folds"},
		{"seed negative", replaceNth(t, text, `\n      seed: 16`, 0, "\n      seed: -16"), ErrInvalid, opt + ".seed"},
		{"method empty", replaceNth(t, text, `\n      method: "[^"]*"`, 0, "\n      method: \" \""), ErrInvalid, opt + ".method"},
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
	// A promise on a candidate picked by hand.
	f := costFile(t)
	f.Candidates[1].Rule, f.Candidates[1].RuleCheck, f.Candidates[1].Promise = "", nil, "always right"
	var pe *ParseError
	if err := f.Validate(); !errors.Is(err, ErrInvalid) || !errors.As(err, &pe) || pe.Path != "candidates[1].promise" {
		t.Errorf("a promise without a rule: %v, want invalid value at candidates[1].promise", err)
	}
}
