package main

import (
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"
)

// timedTable has case times over two days, two models' scores and a yard.
const timedTable = "id,score,other,label,yard,read_at\n" +
	"AX-1,0.91,0.70,1,north,2026-09-01T06:30:00Z\n" +
	"AX-2,0.85,0.20,0,north,2026-09-01T07:00:00Z\n" +
	"AX-3,0.85,0.90,1,quay,2026-09-01T15:00:00Z\n" +
	"AX-4,0.60,0.40,0,quay,2026-09-01T23:30:00Z\n" +
	"AX-5,0.42,0.60,1,north,2026-09-02T02:00:00Z\n" +
	"AX-6,0.30,0.10,0,north,2026-09-02T08:00:00Z\n" +
	"AX-7,0.12,0.30,0,quay,2026-09-02T16:00:00Z\n" +
	"AX-8,0.05,0.05,0,north,2026-09-02T21:59:00Z\n"

// TestReportBeyondFlagErrors: every misuse of the new flags exits 2 with
// one line on stderr and nothing on stdout.
func TestReportBeyondFlagErrors(t *testing.T) {
	path := writeFile(t, t.TempDir(), "timed.csv", []byte(timedTable))
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"--time", "read_at"}, "--time needs --shifts"},
		{[]string{"--shifts", "06:00"}, "--shifts needs --time"},
		{[]string{"--time", "read_at", "--shifts", "6am"}, "--shifts: malformed shift schedule"},
		{[]string{"--time", "read_at", "--shifts", "06:00", "--tz", "Mars/Olympus"}, `--tz "Mars/Olympus"`},
		{[]string{"--time", "yard", "--shifts", "06:00"}, `column "yard": invalid time "north"`},
		{[]string{"--cut", "queue90=2"}, "cut queue90=2 needs case times and a shift schedule (--time and --shifts)"},
		{[]string{"--cut", "queue=2"}, "cut queue=2 needs a volume per shift (--volume)"},
		{[]string{"--cut", "cost"}, "cut cost needs at least one cost (--cost-false-alert, --cost-miss or --cost-hit)"},
		{[]string{"--cut", "queue=2", "--volume", "10", "--bootstrap", "5", "--time", "read_at", "--shifts", "06:00", "--calibration-bins", "0"}, "--calibration-bins 0"},
		{[]string{"--bootstrap", "-3"}, "--bootstrap -3"},
		{[]string{"--calibration-binning", "even"}, "--calibration-binning"},
		{[]string{"--segment", "yard", "--segment-order", "biggest"}, "--segment-order"},
		{[]string{"--score", "score", "--score", "score"}, "given twice"},
		{[]string{"--score", "a", "--score", "b", "--score", "c"}, "given 3 times"},
	}
	for _, c := range cases {
		res := runSill(t, "", append([]string{"report", path}, c.args...)...)
		if res.code != 2 || res.stdout != "" || strings.Count(res.stderr, "\n") != 1 || !strings.Contains(res.stderr, c.want) {
			t.Errorf("%v: code %d, stdout %q, stderr %q; want %q", c.args, res.code, res.stdout, res.stderr, c.want)
		}
	}
}

// TestReportBeyondJSON: the keys of issue 6 appear in the JSON report.
func TestReportBeyondJSON(t *testing.T) {
	path := writeFile(t, t.TempDir(), "timed.csv", []byte(timedTable))
	args := []string{"report", path, "--format", "json", "--segment", "yard", "--time", "read_at", "--shifts", "06:00,14:00,22:00",
		"--score", "score", "--score", "other", "--bootstrap", "50", "--seed", "7", "--cut", "top=3", "--cut", "queue90=2"}
	res := runSill(t, "", args...)
	if res.code != 0 {
		t.Fatalf("code %d: %s", res.code, res.stderr)
	}
	var out map[string]any
	if err := json.Unmarshal([]byte(res.stdout), &out); err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{"calibration", "comparison", "shift_schedule", "bootstrap"} {
		if out[key] == nil {
			t.Errorf("no top-level %q", key)
		}
	}
	cut := out["cuts"].([]any)[0].(map[string]any)
	for _, key := range []string{"segments", "stability", "net_benefit", "queue_by_shift", "second_model"} {
		if cut[key] == nil {
			t.Errorf("cut lacks %q: %v", key, cut)
		}
	}
	projected := cut["projected"].(map[string]any)
	// top=3 flags AX-1, AX-2, AX-3: shifts of 1 Sep 06:00 (two alerts) and
	// 14:00 (one). The period has five shifts, 1 Sep 06:00 to 2 Sep 14:00
	// (AX-8 at 21:59 is still in the 14:00 shift), so the sample's busiest
	// shift queues 2. Five shifts of a few cases cannot tell a spread from
	// noise: the p90 is the model's, counting noise alone, in words.
	shifts := cut["queue_by_shift"].(map[string]any)
	if projected["queue_per_shift_max"] != 2.0 || projected["queue_per_shift_p90"] != shifts["p90"] || shifts["model_spread"] != 0.0 ||
		!strings.Contains(shifts["basis"].(string), "cannot be told from noise") || shifts["sample_p90"] == nil {
		t.Errorf("projected %v, queue by shift %v", projected, shifts)
	}
	if n := out["shift_schedule"].(map[string]any)["shifts"]; n != 5.0 {
		t.Errorf("shifts %v, want 5", n)
	}
	// The same seed gives the same bytes.
	again := runSill(t, "", args...)
	if again.stdout != res.stdout {
		t.Error("the same --seed gave another report")
	}
	text := runSill(t, "", append(args[:2], args[4:]...)...)
	for _, want := range []string{"queue per real shift", "how stable each cut is", "two models on the same cases: score and other", "segments (yard)", "calibration: reliability table"} {
		if !strings.Contains(text.stdout, want) {
			t.Errorf("text lacks %q", want)
		}
	}
}

// TestReportTimeLayout reads times in a layout without a zone, in --tz.
func TestReportTimeLayout(t *testing.T) {
	table := "score,label,when\n0.9,1,01.09.2026 06:30\n0.2,0,01.09.2026 21:00\n0.7,0,02.09.2026 05:00\n"
	path := writeFile(t, t.TempDir(), filepath.Base("layout.csv"), []byte(table))
	res := runSill(t, "", "report", path, "--format", "json", "--time", "when", "--time-layout", "02.01.2006 15:04", "--tz", "Europe/Amsterdam", "--shifts", "06:00,18:00", "--cut", "top=1")
	if res.code != 0 {
		t.Fatalf("code %d: %s", res.code, res.stderr)
	}
	var out map[string]any
	json.Unmarshal([]byte(res.stdout), &out)
	s := out["shift_schedule"].(map[string]any)
	// Local 06:30, 21:00 and 05:00 next day: shifts 1 Sep 06:00, 1 Sep 18:00
	// (the 05:00 case belongs to it too), so two shifts.
	if s["shifts"] != 2.0 || s["time_zone"] != "Europe/Amsterdam" || s["first_shift"] != "2026-09-01T06:00:00+02:00" {
		t.Errorf("schedule %v", s)
	}
}

// TestReportCompareFile joins a second model's file on --id; the result
// equals the comparison of two columns of one file.
func TestReportCompareFile(t *testing.T) {
	dir := t.TempDir()
	first := writeFile(t, dir, "a.csv", []byte(timedTable))
	second := writeFile(t, dir, "b.csv", []byte("id,model_b\nAX-8,0.05\nAX-7,0.30\nAX-6,0.10\nAX-5,0.60\nAX-4,0.40\nAX-3,0.90\nAX-2,0.20\nAX-1,0.70\nAX-9,0.5\n"))
	joined := runSill(t, "", "report", first, "--format", "json", "--id", "id", "--compare", second, "--score", "score", "--score", "model_b")
	columns := runSill(t, "", "report", first, "--format", "json", "--score", "score", "--score", "other")
	if joined.code != 0 || columns.code != 0 {
		t.Fatalf("codes %d %d: %s %s", joined.code, columns.code, joined.stderr, columns.stderr)
	}
	var a, b map[string]any
	json.Unmarshal([]byte(joined.stdout), &a)
	json.Unmarshal([]byte(columns.stdout), &b)
	ca, cb := a["comparison"].(map[string]any), b["comparison"].(map[string]any)
	for _, key := range []string{"auc_a", "auc_b", "delong_z", "delong_p"} {
		if ca[key] != cb[key] {
			t.Errorf("%s: joined %v, one file %v", key, ca[key], cb[key])
		}
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--compare", second}, "--compare needs --id"},
		{[]string{"--compare", "-", "--id", "id"}, "--compare -"},
		{[]string{"--compare", first, "--id", "yard"}, "duplicate id"},
		{[]string{"--compare", filepath.Join(dir, "none.csv"), "--id", "id"}, "--compare: read scores"},
	} {
		res := runSill(t, "", append([]string{"report", first}, c.args...)...)
		if res.code != 2 || res.stdout != "" || !strings.Contains(res.stderr, c.want) {
			t.Errorf("%v: code %d stderr %q, want %q", c.args, res.code, res.stderr, c.want)
		}
	}
}

// TestReportHints: the report's notes and warnings name the flags that
// change them, which cmd gives to package report (the engine names none).
func TestReportHints(t *testing.T) {
	dir := t.TempDir()
	path := writeFile(t, dir, "timed.csv", []byte(timedTable))
	// The same cases with the scores turned round: the false cases rank
	// first more often than not.
	reversed := strings.NewReplacer(",0.91,", ",0.09,", ",0.85,", ",0.15,", ",0.60,", ",0.40,", ",0.42,", ",0.58,", ",0.30,", ",0.70,", ",0.12,", ",0.88,", ",0.05,", ",0.95,").Replace(timedTable)
	reversedPath := writeFile(t, dir, "reversed.csv", []byte(reversed))
	for _, c := range []struct {
		args   []string
		stream string
		want   string
	}{
		{[]string{path, "--segment", "yard", "--segments-shown", "1"}, "stdout", "1 more segment not shown (0 of them differ); --segments-shown 0 shows all, --format json lists all"},
		{[]string{path, "--time", "read_at", "--shifts", "06:00,14:00,22:00"}, "stdout", "the validation set's own counts per shift (give --volume to scale them to production)"},
		{[]string{path, "--cost-miss", "10"}, "stdout", "on the validation set; with --bootstrap, a warning says when the cost threshold lies outside"},
		{[]string{reversedPath}, "stderr", "is below 0.5: the scores rank false cases above true ones more often than not; if lower scores mean likely true cases, add --lower-is-riskier"},
		{[]string{reversedPath, "--score", "other", "--lower-is-riskier"}, "stderr", "if higher scores mean likely true cases, drop --lower-is-riskier"},
	} {
		res := runSill(t, "", append([]string{"report"}, c.args...)...)
		got := res.stdout
		if c.stream == "stderr" {
			got = res.stderr
		}
		// Notes may be wrapped to the terminal's 80 columns (the
		// segments'): read them with the breaks and indents folded.
		if res.code != 0 || !strings.Contains(strings.Join(strings.Fields(got), " "), c.want) {
			t.Errorf("%v: code %d, %s lacks %q:\n%s", c.args, res.code, c.stream, c.want, got)
		}
	}
}
