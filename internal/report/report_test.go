package report_test

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/")

// handTable is the ten-case example of package cutrule's tests, P = 4,
// N = 6, base rate 0.4:
//
//	cut  score  rows  tp fp fn tn
//	c0   0.95    1    1  0  3  6
//	c1   0.90    2    2  0  2  6
//	c2   0.80    3    2  1  2  5
//	c3   0.70    5    3  2  1  4   (tie)
//	c4   0.60    6    3  3  1  3
//	c5   0.50    7    4  3  0  3
//	c6   0.40    8    4  4  0  2
//	c7   0.30    9    4  5  0  1
//	c8   0.20   10    4  6  0  0
const handTable = "id,score,label,w\n" +
	"AX-1,0.30,0,1\nAX-2,0.95,1,2\nAX-3,0.70,0,1\nAX-4,0.20,0,0\nAX-5,0.90,1,1\n" +
	"AX-6,0.60,0,3\nAX-7,0.70,1,1\nAX-8,0.40,0,1\nAX-9,0.80,0,1\nAX-10,0.50,1,0.5\n"

// scenario is one report as the report command builds it.
type scenario struct {
	name  string
	table string
	opt   scores.Options
	a     func(set *scores.Set) projection.Assumptions // nil: validation base rate, 95%
	specs []string                                     // nil: the starting points
}

func validation(set *scores.Set) projection.Assumptions {
	p, n := set.Totals()
	rate := p / (p + n)
	if math.IsNaN(rate) {
		rate = 0
	}
	return projection.Assumptions{BaseRate: rate, Confidence: projection.DefaultConfidence}
}

// build reads the table and makes the report the way cmd/sill does,
// through package analysis.
func (s scenario) build(t *testing.T) (*report.Report, *scores.Set) {
	t.Helper()
	set, err := scores.Read(strings.NewReader(s.table), s.name+".csv", s.opt)
	if err != nil {
		t.Fatal(err)
	}
	a := validation(set)
	if s.a != nil {
		a = s.a(set)
	}
	if err := a.Validate(); err != nil {
		t.Fatal(err)
	}
	var rules []cutrule.Rule // nil: the starting points
	for _, text := range s.specs {
		r, err := cutrule.Parse(text)
		if err != nil {
			t.Fatal(err)
		}
		rules = append(rules, r)
	}
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{Rules: rules})
	if err != nil {
		t.Fatal(err)
	}
	// These scenarios are about the summary and the cuts; the figures
	// beyond them have their own tests in beyond_test.go.
	res.Calibration, res.Segments = nil, nil
	return report.New(res, report.Options{}), set
}

func points(set *scores.Set) report.Points {
	return func(visit func(curve.Point)) { curve.Walk(set, visit) }
}

var scenarios = []scenario{
	{
		// The starting points plus queue= and cost, on the unweighted
		// hand table with 100 cases per shift.
		name:  "starting-points",
		table: handTable,
		a: func(set *scores.Set) projection.Assumptions {
			a := validation(set)
			a.Volume, a.Capacity = 100, 25
			a.Costs = &projection.Costs{FalseAlert: 2, Miss: 3}
			return a
		},
	},
	{
		// A production base rate of 10%, unmet cuts, fractional queues.
		name:  "base-rate-and-unmet",
		table: handTable,
		a: func(set *scores.Set) projection.Assumptions {
			a := validation(set)
			a.BaseRate, a.Volume, a.Capacity = 0.1, 250, 37.5
			return a
		},
		specs: []string{"score=0.99", "top=5%", "hit=0.5", "queue=37.5", "wrong=0.2"},
	},
	{
		// Weighted counts, costs without a volume (cost per case), 90%.
		name:  "weighted",
		table: handTable,
		opt:   scores.Options{WeightColumn: "w", IDColumn: "id"},
		a: func(set *scores.Set) projection.Assumptions {
			a := validation(set)
			a.Confidence = 0.9
			a.Costs = &projection.Costs{FalseAlert: 1.5, Miss: 10, Hit: -2}
			return a
		},
		specs: []string{"base", "hit=0.8", "cost", "top=3"},
	},
	{
		// Logits, lower riskier: no Brier score or log loss.
		name:  "lower-is-riskier",
		table: "score,label\n-2.5,1\n-1,1\n-1,0\n0.5,0\n3,0\n1.25,1\n",
		opt:   scores.Options{LowerIsRiskier: true},
	},
	{
		// No true case: warnings and undefined figures.
		name:  "one-class",
		table: "score,label\n0.9,0\n0.4,0\n0.4,0\n0.1,0\n",
	},
	{
		// One true case and nothing else, projected to a base rate of 0:
		// every projected figure needs the undefined false positive rate.
		name:  "single-true-case",
		table: "score,label\n0.5,1\n",
		a: func(set *scores.Set) projection.Assumptions {
			return projection.Assumptions{BaseRate: 0, Volume: 10, Capacity: 1, Confidence: 0.95, Costs: &projection.Costs{Miss: 1}}
		},
	},
	{
		// Dropped rows are counted and warned about.
		name:  "dropped-rows",
		table: "score,label\n0.9,1\nNaN,0\n0.4,0\n,1\n0.2,0\n0.7,1\n",
		opt:   scores.Options{DropInvalid: true},
		specs: []string{"hit=1"},
	},
}

// golden compares got with testdata/<test>/<name>.golden, rewriting the
// file under -update.
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", strings.Split(t.Name(), "/")[0], name+".golden")
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./internal/report/ -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("output differs from %s (rerun with -update and read the diff):\n%s", path, got)
	}
}

// TestWriteTextGolden checks the text report of every scenario against its
// golden file.
func TestWriteTextGolden(t *testing.T) {
	for _, s := range scenarios {
		t.Run(s.name, func(t *testing.T) {
			r, _ := s.build(t)
			var buf bytes.Buffer
			if err := report.WriteText(&buf, r); err != nil {
				t.Fatal(err)
			}
			checkReadable(t, buf.String())
			golden(t, s.name, buf.Bytes())
		})
	}
}

// TestWriteMarkdownGolden checks the Markdown report of every scenario
// against its golden file.
func TestWriteMarkdownGolden(t *testing.T) {
	for _, s := range scenarios {
		t.Run(s.name, func(t *testing.T) {
			r, _ := s.build(t)
			var buf bytes.Buffer
			if err := report.WriteMarkdown(&buf, r, nil); err != nil {
				t.Fatal(err)
			}
			checkReadable(t, buf.String())
			// Every table row has as many cells as its header.
			var cells int
			for _, line := range strings.Split(buf.String(), "\n") {
				if !strings.HasPrefix(line, "|") {
					cells = 0
					continue
				}
				n := strings.Count(strings.ReplaceAll(line, `\|`, ""), "|")
				if cells == 0 {
					cells = n
				} else if n != cells {
					t.Errorf("table row with %d bars under a header with %d: %s", n, cells, line)
				}
			}
			golden(t, s.name, buf.Bytes())
		})
	}
}

// checkReadable checks what a reader of any text form relies on: no NaN
// or Inf leaks, the caution closes the report, one blank line at most.
func checkReadable(t *testing.T, text string) {
	t.Helper()
	for _, bad := range []string{"NaN", "Inf", "\n\n\n"} {
		if strings.Contains(text, bad) {
			t.Errorf("output contains %q:\n%s", bad, text)
		}
	}
	for _, line := range strings.Split(text, "\n") {
		if strings.HasSuffix(line, " ") {
			t.Errorf("line ends with a space: %q", line)
		}
	}
	if !strings.Contains(text, "it does not make one") || !strings.HasSuffix(text, "licensed practice.\n") {
		t.Errorf("output does not end with the caution:\n%s", text)
	}
}

// decodeJSON writes r as JSON (with the curve when points is not nil) and
// reads it back as generic values, refusing NaN and Inf.
func decodeJSON(t *testing.T, r *report.Report, points report.Points) map[string]any {
	t.Helper()
	var buf bytes.Buffer
	if err := report.WriteJSON(&buf, r, points); err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(buf.Bytes(), []byte("NaN")) || bytes.Contains(buf.Bytes(), []byte("Inf")) {
		t.Fatalf("JSON holds NaN or Inf:\n%s", buf.String())
	}
	var out map[string]any
	dec := json.NewDecoder(&buf)
	if err := dec.Decode(&out); err != nil {
		t.Fatalf("%v\n%s", err, buf.String())
	}
	if dec.More() {
		t.Fatal("more than one JSON value")
	}
	return out
}

// kind names the JSON type of v: "null", "num", "bool", "str", "array" or
// "object".
func kind(v any) string {
	switch v.(type) {
	case nil:
		return "null"
	case float64:
		return "num"
	case bool:
		return "bool"
	case string:
		return "str"
	case []any:
		return "array"
	case map[string]any:
		return "object"
	}
	return "?"
}

// checkKeys checks that every contract key is present with an allowed
// type ("num|null" allows both; "pair" is a two-number array).
func checkKeys(t *testing.T, where string, obj map[string]any, contract map[string]string) {
	t.Helper()
	for key, allowed := range contract {
		v, ok := obj[key]
		if !ok {
			t.Errorf("%s: key %q missing", where, key)
			continue
		}
		k := kind(v)
		if k == "array" {
			if a := v.([]any); len(a) == 2 && kind(a[0]) == "num" && kind(a[1]) == "num" {
				k = "pair"
			}
		}
		if !slices.Contains(strings.Split(allowed, "|"), k) {
			t.Errorf("%s: key %q is %s (%v), want %s", where, key, k, v, allowed)
		}
	}
}

// The JSON contract of issue 2: keys and the types they may take.
var (
	topContract = map[string]string{
		"rows": "num", "dropped_rows": "num", "positives": "num", "negatives": "num", "base_rate": "num", "weighted": "bool", "weight_kind": "str|null",
		"roc_auc": "num|null", "average_precision": "num|null", "brier": "num|null", "log_loss": "num|null",
		"roc_auc_ci": "pair|null", "roc_auc_std_error": "num|null", "average_precision_ci": "pair|null",
		"assumptions": "object", "cuts": "array",
	}
	assumptionsContract = map[string]string{
		"base_rate": "num", "volume_per_shift": "num|null", "cost_false_alert": "num|null",
		"cost_miss": "num|null", "cost_hit": "num|null", "capacity": "num|null", "confidence": "num",
		"intervals_take_as_given": "array",
	}
	cutContract = map[string]string{
		"spec": "str", "basis": "str", "met": "bool", "reason": "str|null", "score": "num|null", "flagged": "num", "flagged_share": "num", "flagged_share_ci": "pair|null",
		"tp": "num", "fp": "num", "fn": "num", "tn": "num",
		"recall": "num|null", "recall_ci": "pair|null", "precision": "num|null", "precision_ci": "pair|null",
		"false_discovery_rate": "num|null", "false_positive_rate": "num|null", "projected": "object",
	}
	projectedContract = map[string]string{"alert_rate": "num|null", "precision": "num|null", "queue_per_shift": "num|null", "cost_per_shift": "num|null",
		"precision_ci": "pair|null", "alert_rate_ci": "pair|null", "queue_per_shift_ci": "pair|null", "cost_per_shift_ci": "pair|null"}
	curveContract = map[string]string{
		"score": "num", "flagged": "num", "tp": "num", "fp": "num", "fn": "num", "tn": "num",
		"recall": "num|null", "precision": "num|null", "false_positive_rate": "num|null",
	}
)

// TestWriteJSONContract checks every scenario's JSON against the keys and
// types of the contract, unmet cuts included, and the curve's presence
// and order.
func TestWriteJSONContract(t *testing.T) {
	for _, s := range scenarios {
		t.Run(s.name, func(t *testing.T) {
			r, set := s.build(t)
			for _, withCurve := range []bool{false, true} {
				var pts report.Points
				if withCurve {
					pts = points(set)
				}
				out := decodeJSON(t, r, pts)
				checkKeys(t, "report", out, topContract)
				checkKeys(t, "assumptions", out["assumptions"].(map[string]any), assumptionsContract)
				checkTakenAsGiven(t, out["assumptions"].(map[string]any))
				for _, raw := range out["cuts"].([]any) {
					c := raw.(map[string]any)
					where := "cut " + c["spec"].(string)
					checkKeys(t, where, c, cutContract)
					checkKeys(t, where+" projected", c["projected"].(map[string]any), projectedContract)
					if c["met"] == false {
						checkUnmet(t, where, c)
					} else if c["reason"] != nil {
						t.Errorf("%s: met with a reason %v", where, c["reason"])
					}
				}
				curveValue, has := out["curve"]
				if has != withCurve {
					t.Fatalf("curve present %v, want %v", has, withCurve)
				}
				if !withCurve {
					continue
				}
				previous := math.NaN()
				entries := curveValue.([]any)
				if len(entries) != curve.New(set).Len() {
					t.Errorf("curve has %d entries, want one per cut, %d", len(entries), curve.New(set).Len())
				}
				for i, raw := range entries {
					p := raw.(map[string]any)
					checkKeys(t, "curve entry", p, curveContract)
					score := p["score"].(float64)
					// Strictest first: riskier scores come earlier.
					if i > 0 && (set.LowerIsRiskier() && score <= previous || !set.LowerIsRiskier() && score >= previous) {
						t.Errorf("curve entry %d score %v after %v: not strictest first", i, score, previous)
					}
					previous = score
				}
			}
		})
	}
}

// checkTakenAsGiven checks assumptions.intervals_take_as_given: it names
// production's base rate, volume and the three costs, each a key of the
// assumptions themselves, as the README's Output section says.
func checkTakenAsGiven(t *testing.T, a map[string]any) {
	t.Helper()
	want := []string{"base_rate", "volume_per_shift", "cost_false_alert", "cost_miss", "cost_hit"}
	raw, _ := a["intervals_take_as_given"].([]any)
	var got []string
	for _, v := range raw {
		name, _ := v.(string)
		got = append(got, name)
		if _, ok := a[name]; !ok {
			t.Errorf("intervals_take_as_given names %q, no key of the assumptions", name)
		}
	}
	if !slices.Equal(got, want) {
		t.Errorf("intervals_take_as_given %v, want %v", got, want)
	}
}

func checkUnmet(t *testing.T, where string, c map[string]any) {
	t.Helper()
	if reason, _ := c["reason"].(string); reason == "" {
		t.Errorf("%s: unmet with an empty reason", where)
	}
	for _, key := range []string{"score", "recall", "recall_ci", "precision", "precision_ci", "false_discovery_rate", "false_positive_rate", "flagged_share_ci"} {
		if c[key] != nil {
			t.Errorf("%s: unmet but %s = %v, want null", where, key, c[key])
		}
	}
	for _, key := range []string{"flagged", "flagged_share", "tp", "fp", "fn", "tn"} {
		if c[key] != 0.0 {
			t.Errorf("%s: unmet but %s = %v, want 0", where, key, c[key])
		}
	}
	for key, v := range c["projected"].(map[string]any) {
		if v != nil {
			t.Errorf("%s: unmet but projected %s = %v, want null", where, key, v)
		}
	}
}

// TestWriteJSONValues checks the values of the starting-points scenario
// against the hand table (see handTable).
func TestWriteJSONValues(t *testing.T) {
	r, set := scenarios[0].build(t)
	out := decodeJSON(t, r, points(set))
	// No warning is an empty list, not null.
	if w, ok := out["warnings"].([]any); !ok || len(w) != 0 {
		t.Errorf("warnings %#v, want []", out["warnings"])
	}
	num := func(obj map[string]any, key string) float64 {
		v, ok := obj[key].(float64)
		if !ok {
			return math.NaN()
		}
		return v
	}
	// AUC by pairs, ties half: the positives at 0.95 and 0.90 outrank all
	// 6 negatives (12), the one at 0.70 outranks 4 and ties 1 (4.5), the
	// one at 0.50 outranks 3: 19.5 / 24 = 0.8125.
	// AP: recall steps of 0.25 at precision 1, 1, 3/5 and 4/7.
	// Brier: true (0.0025 + 0.01 + 0.09 + 0.25) + false (0.64 + 0.49 +
	// 0.36 + 0.16 + 0.09 + 0.04) = 2.1325, over 10.
	for _, c := range []struct {
		key  string
		want float64
	}{
		{"rows", 10}, {"dropped_rows", 0}, {"positives", 4}, {"negatives", 6}, {"base_rate", 0.4},
		{"roc_auc", 0.8125}, {"average_precision", 0.25 + 0.25 + 0.25*0.6 + 0.25*4/7}, {"brier", 0.21325},
		{"log_loss", -(math.Log(0.95) + math.Log(0.9) + 2*math.Log(0.7) + math.Log(0.5) + math.Log(0.2) + math.Log(0.3) + math.Log(0.4) + math.Log(0.6) + math.Log(0.8)) / 10},
	} {
		if got := num(out, c.key); !floatcmp.Equal(got, c.want) {
			t.Errorf("%s = %v, want %v", c.key, got, c.want)
		}
	}
	if out["weighted"] != false {
		t.Errorf("weighted = %v", out["weighted"])
	}
	// The ranking's intervals at 95% (z 1.959964), by hand. DeLong: the
	// true cases' placements (share of false cases below, ties half) 1, 1,
	// 0.75, 0.5 and the false cases' (share of true cases above) 0.5,
	// 0.625, 0.75, 1, 1, 1; S10 = 0.171875/3, S01 = 0.2421875/5, variance
	// S10/4 + S01/6 = 0.0223958, standard error 0.149652, interval 0.8125 ±
	// 0.293313 clipped to [0.519187, 1]. AP 0.792857 over 4 true cases:
	// logit 1.340, τ = 1/√(4·0.792857·0.207143) = 1.098, interval
	// [0.254277, 0.977255].
	const handRounded = 1e-6
	pair := func(key string) [2]float64 {
		v, ok := out[key].([]any)
		if !ok || len(v) != 2 {
			return [2]float64{math.NaN(), math.NaN()}
		}
		return [2]float64{v[0].(float64), v[1].(float64)}
	}
	for _, c := range []struct {
		key  string
		want [2]float64
	}{{"roc_auc_ci", [2]float64{0.519187, 1}}, {"average_precision_ci", [2]float64{0.254277, 0.977255}}} {
		if got := pair(c.key); !floatcmp.Within(got[0], c.want[0], handRounded) || !floatcmp.Within(got[1], c.want[1], handRounded) {
			t.Errorf("%s = %v, want %v", c.key, got, c.want)
		}
	}
	if got := num(out, "roc_auc_std_error"); !floatcmp.Within(got, 0.149652, handRounded) {
		t.Errorf("roc_auc_std_error = %v, want 0.149652", got)
	}
	a := out["assumptions"].(map[string]any)
	for key, want := range map[string]float64{"base_rate": 0.4, "volume_per_shift": 100, "capacity": 25, "cost_false_alert": 2, "cost_miss": 3, "cost_hit": 0, "confidence": 0.95} {
		if got := num(a, key); got != want {
			t.Errorf("assumptions.%s = %v, want %v", key, got, want)
		}
	}

	// The cuts: base c2, hit=0.8 c5, wrong=0.333 c1, queue=25 c1 (c2
	// queues 30), cost c1 (2*fp + 3*fn over 10: c1 0.6 ties c5, the
	// strictest wins).
	cuts := out["cuts"].([]any)
	wantSpecs := []string{"base", "hit=0.8", "wrong=0.333", "queue=25", "cost"}
	wantScores := []float64{0.80, 0.50, 0.90, 0.90, 0.90}
	// Then hit95=0.8 and wrong95=0.333, neither met on so few cases (the
	// weight column is not read here): all 4 true cases flagged give a
	// one-sided 95% lower bound of 1/(1+z²/4) = 0.5965 (z² 2.705543),
	// below 0.8; the most flagged with no false case is 2 (0.95 and 0.90),
	// whose upper bound z²/(2+z²) = 0.575 is above 0.333, and every deeper
	// cut has a wrong alert among few.
	if len(cuts) != 7 {
		t.Fatalf("%d cuts, want 7", len(cuts))
	}
	for i, spec := range []string{"hit95=0.8", "wrong95=0.333"} {
		c := cuts[5+i].(map[string]any)
		if c["spec"] != spec || c["met"] != false || c["reason"] == "" {
			t.Errorf("cut %d: %v met %v (%v), want %s unmet with a reason", 5+i, c["spec"], c["met"], c["reason"], spec)
		}
	}
	cuts = cuts[:5]
	for i, raw := range cuts {
		c := raw.(map[string]any)
		if c["spec"] != wantSpecs[i] || num(c, "score") != wantScores[i] {
			t.Errorf("cut %d: %v at %v, want %s at %v", i, c["spec"], c["score"], wantSpecs[i], wantScores[i])
		}
	}
	// base at c2: tp 2, fp 1, fn 2, tn 5; recall 1/2 with Wilson(2, 4),
	// precision 2/3 with Wilson(2, 3); projected at the validation rate:
	// alert rate 0.3, queue 30, cost (2*1 + 3*2)/10 * 100 = 80.
	base := cuts[0].(map[string]any)
	for _, c := range []struct {
		key  string
		want float64
	}{
		{"flagged", 3}, {"flagged_share", 0.3}, {"tp", 2}, {"fp", 1}, {"fn", 2}, {"tn", 5},
		{"recall", 0.5}, {"precision", 2.0 / 3}, {"false_discovery_rate", 1.0 / 3}, {"false_positive_rate", 1.0 / 6},
	} {
		if got := num(base, c.key); !floatcmp.Equal(got, c.want) {
			t.Errorf("base %s = %v, want %v", c.key, got, c.want)
		}
	}
	lo, hi := interval.Wilson(2, 4, 0.95)
	if ci := base["recall_ci"].([]any); !floatcmp.Equal(ci[0].(float64), lo) || !floatcmp.Equal(ci[1].(float64), hi) {
		t.Errorf("base recall_ci %v, want [%v, %v]", ci, lo, hi)
	}
	lo, hi = interval.Wilson(2, 3, 0.95)
	if ci := base["precision_ci"].([]any); !floatcmp.Equal(ci[0].(float64), lo) || !floatcmp.Equal(ci[1].(float64), hi) {
		t.Errorf("base precision_ci %v, want [%v, %v]", ci, lo, hi)
	}
	proj := base["projected"].(map[string]any)
	for key, want := range map[string]float64{"alert_rate": 0.3, "precision": 2.0 / 3, "queue_per_shift": 30, "cost_per_shift": 80} {
		if got := num(proj, key); !floatcmp.Equal(got, want) {
			t.Errorf("base projected %s = %v, want %v", key, got, want)
		}
	}

	// The projected figures' intervals are projection.IntervalsOf's at
	// base's counts (tp 2, fp 1, fn 2, tn 5) under the assumptions, with
	// production's base rate and volume taken as given: the queue's is the
	// volume, 100, times the alert rate's, the cost's 100 times the cost
	// per case's. package projection tests the intervals themselves.
	iv := projection.IntervalsOf(projection.Counts{TP: 2, FP: 1, FN: 2, TN: 5},
		projection.Assumptions{BaseRate: 0.4, Volume: 100, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 2, Miss: 3}})
	for key, want := range map[string][2]float64{"precision_ci": iv.Precision, "alert_rate_ci": iv.AlertRate, "queue_per_shift_ci": iv.QueuePerShift, "cost_per_shift_ci": iv.CostPerShift} {
		ci, ok := proj[key].([]any)
		if !ok || !floatcmp.Equal(ci[0].(float64), want[0]) || !floatcmp.Equal(ci[1].(float64), want[1]) {
			t.Errorf("base projected %s = %v, want %v", key, proj[key], want)
		}
	}
	if ar := iv.AlertRate; !floatcmp.Equal(100*ar[0], iv.QueuePerShift[0]) || !(ar[0] < 0.3 && 0.3 < ar[1]) {
		t.Errorf("alert rate interval %v: want the queue's over 100, around 0.3", ar)
	}
	if base["basis"] != "the projected alert rate against the base rate" {
		t.Errorf("base basis %q", base["basis"])
	}

	// The curve, strictest first, with the table's counts.
	wantCurve := [][5]float64{ // score, tp, fp, fn, tn
		{0.95, 1, 0, 3, 6}, {0.90, 2, 0, 2, 6}, {0.80, 2, 1, 2, 5}, {0.70, 3, 2, 1, 4}, {0.60, 3, 3, 1, 3},
		{0.50, 4, 3, 0, 3}, {0.40, 4, 4, 0, 2}, {0.30, 4, 5, 0, 1}, {0.20, 4, 6, 0, 0},
	}
	entries := out["curve"].([]any)
	if len(entries) != len(wantCurve) {
		t.Fatalf("curve has %d entries, want %d", len(entries), len(wantCurve))
	}
	for i, w := range wantCurve {
		p := entries[i].(map[string]any)
		got := [5]float64{num(p, "score"), num(p, "tp"), num(p, "fp"), num(p, "fn"), num(p, "tn")}
		if got != w || num(p, "flagged") != w[1]+w[2] {
			t.Errorf("curve entry %d: %v flagged %v, want %v", i, got, p["flagged"], w)
		}
	}
}

// TestWriteJSONNulls checks that undefined figures are null: a set with no
// true case has no AUC, AP, recall or recall interval, and assumptions not
// given are null; scores that are not probabilities have no Brier score.
func TestWriteJSONNulls(t *testing.T) {
	byName := map[string]scenario{}
	for _, s := range scenarios {
		byName[s.name] = s
	}
	r, _ := byName["one-class"].build(t)
	out := decodeJSON(t, r, nil)
	for _, key := range []string{"roc_auc", "average_precision", "roc_auc_ci", "roc_auc_std_error", "average_precision_ci"} {
		if out[key] != nil {
			t.Errorf("one class: %s = %v, want null", key, out[key])
		}
	}
	if out["brier"] == nil {
		t.Error("one class: the Brier score is defined on probabilities of one class")
	}
	a := out["assumptions"].(map[string]any)
	for _, key := range []string{"volume_per_shift", "capacity", "cost_false_alert", "cost_miss", "cost_hit"} {
		if a[key] != nil {
			t.Errorf("assumptions.%s = %v, want null when not given", key, a[key])
		}
	}
	for _, raw := range out["cuts"].([]any) {
		c := raw.(map[string]any)
		if c["met"] == true && (c["recall"] != nil || c["recall_ci"] != nil) {
			t.Errorf("cut %v: recall %v interval %v, want null", c["spec"], c["recall"], c["recall_ci"])
		}
	}
	if w, _ := out["warnings"].([]any); len(w) == 0 {
		t.Error("one class: no warning")
	}

	r, _ = byName["lower-is-riskier"].build(t)
	out = decodeJSON(t, r, nil)
	if out["brier"] != nil || out["log_loss"] != nil {
		t.Errorf("lower is riskier: brier %v log loss %v, want null", out["brier"], out["log_loss"])
	}

	r, _ = byName["dropped-rows"].build(t)
	out = decodeJSON(t, r, nil)
	if out["dropped_rows"] != 2.0 || out["rows"] != 4.0 {
		t.Errorf("dropped rows %v of %v, want 2 dropped and 4 kept", out["dropped_rows"], out["rows"])
	}
}

// TestWriteCurveCSV checks the CSV curve: a header, one line per cut
// strictest first, undefined rates as empty cells.
func TestWriteCurveCSV(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.4}, []bool{false, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := report.WriteCurveCSV(&buf, points(set)); err != nil {
		t.Fatal(err)
	}
	// By hand: no true case, so recall is empty; precision 0; fpr 1/2, 1.
	want := "score,flagged,tp,fp,fn,tn,recall,precision,false_positive_rate\n" +
		"0.9,1,0,1,0,1,,0,0.5\n" +
		"0.4,2,0,2,0,0,,0,1\n"
	if buf.String() != want {
		t.Errorf("got\n%s\nwant\n%s", buf.String(), want)
	}
}
