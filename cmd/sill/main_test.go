package main

import (
	"bytes"
	"compress/gzip"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/report"
)

// sillResult is what one run of the command line left behind.
type sillResult struct {
	code           int
	stdout, stderr string
}

// runSill runs the command line in-process with the given standard input.
func runSill(t *testing.T, stdin string, args ...string) sillResult {
	t.Helper()
	var stdout, stderr bytes.Buffer
	code := run(args, strings.NewReader(stdin), &stdout, &stderr)
	return sillResult{code, stdout.String(), stderr.String()}
}

// writeFile writes data to name in a fresh temporary directory and
// returns its path.
func writeFile(t *testing.T, dir, name string, data []byte) string {
	t.Helper()
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func gzipBytes(t *testing.T, text string) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := gzip.NewWriter(&buf)
	w.Write([]byte(text))
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// truncatedGzip is a gzip stream of whole rows cut before its end, so that
// the rows read up to the cut are valid and only the missing end of the
// stream is wrong.
func truncatedGzip(t *testing.T) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := gzip.NewWriter(&buf)
	w.Write([]byte(goodTable))
	if err := w.Flush(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// goodTable has both classes, ties and a segment column.
const goodTable = "id,score,label,yard\n" +
	"AX-1,0.91,1,north\nAX-2,0.85,0,north\nAX-3,0.85,1,quay\nAX-4,0.60,0,quay\n" +
	"AX-5,0.42,1,north\nAX-6,0.30,0,north\nAX-7,0.12,0,quay\nAX-8,0.05,0,north\n"

// TestRunBadInput checks every bad input of issue 2: exit status 2, one
// line on stderr naming what is wrong (the file and line where there is
// one), and nothing on stdout.
func TestRunBadInput(t *testing.T) {
	dir := t.TempDir()
	good := writeFile(t, dir, "good.csv", []byte(goodTable))
	path := func(name, content string) string { return writeFile(t, dir, name, []byte(content)) }
	cases := []struct {
		name string
		args []string
		want string // the whole stderr line, without its newline
	}{
		{"missing file", []string{"report", filepath.Join(dir, "absent.csv")},
			"sill: read scores: open " + filepath.Join(dir, "absent.csv") + ": no such file or directory"},
		{"a directory", []string{"report", dir},
			"sill: read scores: " + dir + " is a directory, expected a file"},
		{"empty file", []string{"report", path("empty.csv", "")},
			"sill: " + filepath.Join(dir, "empty.csv") + ": empty input, expected a header line"},
		{"header only", []string{"report", path("header.csv", "score,label\n")},
			"sill: " + filepath.Join(dir, "header.csv") + ": no data rows after the header"},
		{"ragged row", []string{"report", path("ragged.csv", "score,label\n0.5,1\n0.4,0,7\n")},
			"sill: " + filepath.Join(dir, "ragged.csv") + ":3: wrong number of fields: row has 3, header has 2"},
		{"bad label", []string{"report", path("label.csv", "score,label\n0.5,1\n0.4,maybe\n")},
			"sill: " + filepath.Join(dir, "label.csv") + `:3: column "label": unrecognised label "maybe", expected 1/true/yes/positive or 0/false/no/negative (or set --positive)`},
		// The engine names no flags: these hints are cmd's (readFlagHint).
		{"counts with a label neither", []string{"report", "--counts", path("neither.csv", "score,positives,negatives,unrecognised\n0.5,1,2,3\n")},
			"sill: " + filepath.Join(dir, "neither.csv") + `:2: column "unrecognised": invalid count: 3 case(s) with a label that is neither a true nor a false case, expected none (set --positive in the query)`},
		{"counts with a positive label", []string{"report", "--counts", "--positive", "yes", path("counted.csv", "score,positives,negatives\n0.5,1,2\n")},
			"sill: " + filepath.Join(dir, "counted.csv") + ": a counts table counts the labels already: a positive label does not apply; drop --positive"},
		{"NaN score", []string{"report", path("nan.csv", "score,label\nNaN,1\n0.4,0\n")},
			"sill: " + filepath.Join(dir, "nan.csv") + `:2: column "score": invalid score "NaN", expected a finite number`},
		{"negative weight", []string{"report", path("weight.csv", "score,label,w\n0.5,1,1\n0.4,0,-2\n"), "--weight", "w"},
			"sill: " + filepath.Join(dir, "weight.csv") + `:3: column "w": invalid weight "-2", expected a finite number >= 0`},
		{"named column absent", []string{"report", good, "--score", "prob"},
			"sill: " + good + `:1: column "prob": column not found in header ["id", "score", "label", "yard"]`},
		{"corrupt gzip", []string{"report", path("broken.csv.gz", "\x1f\x8bnot really gzip")},
			"sill: " + filepath.Join(dir, "broken.csv.gz") + ": corrupt gzip data: gzip: invalid header"},
		{"truncated gzip", []string{"report", writeFile(t, dir, "cut.csv.gz", truncatedGzip(t))},
			"sill: " + filepath.Join(dir, "cut.csv.gz") + ": corrupt gzip data: unexpected EOF"},
		{"malformed cut", []string{"report", good, "--cut", "hit=2"},
			`sill: --cut: malformed cut spec "hit=2": "2" is more than 1, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"unknown cut", []string{"report", good, "--cut", "recall=0.8"},
			`sill: --cut: malformed cut spec "recall=0.8": expected one of score=V, top=N, top=P%, hit=R, hitNN=R, wrong=F, wrongNN=F, base, queue=K, queue90=K, cost (R and F shares such as 0.8 or 80%, NN a one-sided level in percent above 50 and below 100, as in hit95=0.8)`},
		{"queue without volume", []string{"report", good, "--cut", "queue=10"},
			"sill: cut queue=10 needs a volume per shift (--volume)"},
		{"cost without costs", []string{"report", good, "--cut", "cost"},
			"sill: cut cost needs at least one cost (--cost-false-alert, --cost-miss or --cost-hit)"},
		{"capacity without volume", []string{"report", good, "--capacity", "90"},
			"sill: --capacity needs --volume: the queue per shift is projected from the volume"},
		{"bad format", []string{"report", good, "--format", "xml"},
			`sill: --format "xml": expected text, json, markdown, html or csv`},
		{"bad input format", []string{"report", good, "--input", "xml"},
			`sill: --input "xml": expected csv, jsonl or parquet`},
		{"bad delimiter", []string{"report", good, "--delim", "ab"},
			`sill: --delim "ab": expected one character such as , or ; or \t`},
		{"base rate above 1", []string{"report", good, "--base-rate", "2"},
			`sill: --base-rate: "2" is more than 1, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"base rate above 100%", []string{"report", good, "--base-rate", "105%"},
			`sill: --base-rate: "105%" is more than 100%, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"negative base rate", []string{"report", good, "--base-rate=-5%"},
			`sill: --base-rate: "-5%" is negative, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"two percent signs", []string{"report", good, "--base-rate", "5%%"},
			`sill: --base-rate: "5%%" has more than one percent sign, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"confidence 95", []string{"report", good, "--confidence", "95"},
			`sill: --confidence: "95" is more than 1, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"confidence 100%", []string{"report", good, "--confidence", "100%"},
			`sill: --confidence: "100%": expected a level above 0 and below 1, such as 0.95 or 95%`},
		{"explore's base rate", []string{"explore", good, "--base-rate", "5 %%"},
			`sill: --base-rate: "5 %%" has more than one percent sign, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"hit share above 100%", []string{"report", good, "--cut", "hit=105%"},
			`sill: --cut: malformed cut spec "hit=105%": "105%" is more than 100%, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"negative volume", []string{"report", good, "--volume", "-5"},
			"sill: --volume -5: expected a positive number of cases per shift"},
		{"no file", []string{"report"},
			"sill: report takes one argument, FILE (the validation set, or - for standard input); got 0 (see sill report --help)"},
		{"save to a folder", []string{"report", good, "--cut", "base", "--save", dir},
			"sill: --save " + dir + ": a folder, expected a file name such as " + filepath.Join(dir, "cut.yaml")},
		{"save to a missing folder", []string{"report", good, "--cut", "base", "--save", filepath.Join(dir, "none", "cut.yaml")},
			"sill: --save " + filepath.Join(dir, "none", "cut.yaml") + ": the folder " + filepath.Join(dir, "none") + " does not exist"},
		{"bad demo rows", []string{"demo", "--rows", "0"},
			"sill: --rows 0: expected at least 1"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := runSill(t, "", tc.args...)
			if got.code != 2 {
				t.Errorf("exit status %d, want 2", got.code)
			}
			if got.stdout != "" {
				t.Errorf("stdout not empty:\n%s", got.stdout)
			}
			if got.stderr != tc.want+"\n" {
				t.Errorf("stderr\n got %q\nwant %q", got.stderr, tc.want+"\n")
			}
		})
	}
}

// TestRunBadStdin checks a bad table on standard input: the error names "-".
func TestRunBadStdin(t *testing.T) {
	got := runSill(t, "score,label\n0.2,1\n0.1\n", "report", "-")
	if want := "sill: -:3: wrong number of fields: row has 1, header has 2\n"; got.code != 2 || got.stdout != "" || got.stderr != want {
		t.Errorf("exit %d, stdout %q, stderr %q; want 2, nothing, %q", got.code, got.stdout, got.stderr, want)
	}
}

// TestRunGoodInput checks that a good table in every input form and every
// output format exits 0 with output on stdout and nothing on stderr.
func TestRunGoodInput(t *testing.T) {
	dir := t.TempDir()
	tsv := strings.NewReplacer(",", "\t").Replace(goodTable)
	var jsonl strings.Builder
	for i, line := range strings.Split(strings.TrimSpace(goodTable), "\n")[1:] {
		f := strings.Split(line, ",")
		jsonl.WriteString(`{"id": "` + f[0] + `", "score": ` + f[1] + `, "label": ` + map[string]string{"1": "true", "0": "false"}[f[2]] + `, "yard": "` + f[3] + `"}`)
		if i%2 == 0 {
			jsonl.WriteString("\r")
		}
		jsonl.WriteString("\n")
	}
	inputs := map[string]string{
		"csv":     writeFile(t, dir, "good.csv", []byte(goodTable)),
		"bom":     writeFile(t, dir, "bom.csv", []byte("\ufeff"+strings.ReplaceAll(goodTable, "\n", "\r\n"))),
		"tsv":     writeFile(t, dir, "good.tsv", []byte(tsv)),
		"jsonl":   writeFile(t, dir, "good.jsonl", []byte(jsonl.String())),
		"gzip":    writeFile(t, dir, "good.data", gzipBytes(t, goodTable)),
		"gz-json": writeFile(t, dir, "good.jsonl.gz", gzipBytes(t, jsonl.String())),
	}
	var firstJSON map[string]any
	for name, file := range inputs {
		for _, format := range []string{"text", "json", "markdown", "csv"} {
			for _, withCurve := range []bool{false, true} {
				args := []string{"report", file, "--format", format, "--segment", "yard", "--id", "id"}
				if withCurve {
					args = append(args, "--curve")
				}
				got := runSill(t, "", args...)
				if got.code != 0 || got.stderr != "" || got.stdout == "" {
					t.Errorf("%s %v: exit %d, stderr %q, %d bytes out", name, args[2:], got.code, got.stderr, len(got.stdout))
					continue
				}
				switch format {
				case "json":
					var out map[string]any
					if err := json.Unmarshal([]byte(got.stdout), &out); err != nil {
						t.Errorf("%s: JSON does not decode: %v", name, err)
						continue
					}
					if _, has := out["curve"]; has != withCurve {
						t.Errorf("%s: curve present %v with --curve %v", name, has, withCurve)
					}
					if out["rows"] != 8.0 || out["positives"] != 3.0 {
						t.Errorf("%s: rows %v positives %v, want 8 and 3", name, out["rows"], out["positives"])
					}
					// Every input form gives the same figures.
					delete(out, "source")
					if !withCurve {
						if firstJSON == nil {
							firstJSON = out
						} else if a, b := mustJSON(t, firstJSON), mustJSON(t, out); a != b {
							t.Errorf("%s: JSON differs from another input form:\n%s\n%s", name, a, b)
						}
					}
				case "csv":
					// With --curve the curve alone: a header and one line
					// per distinct score (7 in goodTable); without, a
					// header and one line per cut (the 5 starting points).
					want := 6
					if withCurve {
						want = 8
					}
					if lines := strings.Count(got.stdout, "\n"); lines != want {
						t.Errorf("%s --curve %v: CSV has %d lines, want %d", name, withCurve, lines, want)
					}
				case "text":
					if !strings.Contains(got.stdout, "caution:") || !strings.Contains(got.stdout, "hit share (recall)") {
						t.Errorf("%s: text report lacks the table or the caution:\n%s", name, got.stdout)
					}
				}
			}
		}
	}
	// Standard input.
	got := runSill(t, goodTable, "report", "-", "--format", "json")
	if got.code != 0 || got.stderr != "" || !strings.Contains(got.stdout, `"source": "-"`) {
		t.Errorf("stdin: exit %d stderr %q\n%s", got.code, got.stderr, got.stdout)
	}
}

func mustJSON(t *testing.T, v any) string {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestRunOneClass checks that a set with one class is no error: exit 0, a
// warning on stderr, and the undefined figures null in JSON.
func TestRunOneClass(t *testing.T) {
	file := writeFile(t, t.TempDir(), "quiet.csv", []byte("score,label\n0.8,0\n0.3,0\n0.3,no\n"))
	for _, format := range []string{"json", "text"} {
		got := runSill(t, "", "report", file, "--format", format)
		if got.code != 0 {
			t.Fatalf("%s: exit %d, stderr %s", format, got.code, got.stderr)
		}
		want := "sill: warning: the validation set has no true cases: hit share, AUC and average precision are undefined\n"
		if got.stderr != want {
			t.Errorf("%s: stderr %q, want %q", format, got.stderr, want)
		}
		if format != "json" {
			continue
		}
		var out map[string]any
		if err := json.Unmarshal([]byte(got.stdout), &out); err != nil {
			t.Fatal(err)
		}
		if out["roc_auc"] != nil || out["average_precision"] != nil || out["positives"] != 0.0 || out["negatives"] != 3.0 {
			t.Errorf("roc_auc %v average_precision %v positives %v negatives %v", out["roc_auc"], out["average_precision"], out["positives"], out["negatives"])
		}
		for _, raw := range out["cuts"].([]any) {
			c := raw.(map[string]any)
			if c["recall"] != nil || c["recall_ci"] != nil {
				t.Errorf("cut %v: recall %v interval %v, want null", c["spec"], c["recall"], c["recall_ci"])
			}
		}
	}
}

// TestRunDropInvalid checks that --drop-invalid turns bad scores into a
// count and a warning instead of an error. The false case at 0.6 above
// the true one at 0.5 keeps the classes from being completely separated,
// which would add a warning of its own.
func TestRunDropInvalid(t *testing.T) {
	file := writeFile(t, t.TempDir(), "gaps.csv", []byte("score,label\n0.9,1\nNaN,0\n0.6,0\n,1\n0.5,1\n0.1,0\n"))
	got := runSill(t, "", "report", file, "--drop-invalid", "--format", "json")
	if got.code != 0 || got.stderr != "sill: warning: 2 rows were dropped for an invalid score\n" {
		t.Fatalf("exit %d, stderr %q", got.code, got.stderr)
	}
	var out map[string]any
	if err := json.Unmarshal([]byte(got.stdout), &out); err != nil {
		t.Fatal(err)
	}
	if out["rows"] != 4.0 || out["dropped_rows"] != 2.0 {
		t.Errorf("rows %v dropped %v, want 4 and 2", out["rows"], out["dropped_rows"])
	}
}

// TestRunCuts checks the --cut flags end to end on goodTable: ranked
// 0.91 T, 0.85 T, 0.85 F, 0.60 F, 0.42 T, 0.30 F, 0.12 F, 0.05 F, so by
// hand top=3 flags the first three rows (cut 0.85), hit=1 needs cut 0.42,
// and score=0.5 is the smallest data score >= 0.5, 0.60.
func TestRunCuts(t *testing.T) {
	file := writeFile(t, t.TempDir(), "good.csv", []byte(goodTable))
	got := runSill(t, "", "report", file, "--format", "json", "--cut", "top=3", "--cut", "hit=1", "--cut", "score=0.5", "--cut", "score=0.95")
	if got.code != 0 {
		t.Fatalf("exit %d: %s", got.code, got.stderr)
	}
	var out struct {
		Cuts []struct {
			Spec   string   `json:"spec"`
			Met    bool     `json:"met"`
			Score  *float64 `json:"score"`
			Reason *string  `json:"reason"`
		} `json:"cuts"`
	}
	if err := json.Unmarshal([]byte(got.stdout), &out); err != nil {
		t.Fatal(err)
	}
	want := []struct {
		spec  string
		score float64
	}{{"top=3", 0.85}, {"hit=1", 0.42}, {"score=0.5", 0.60}, {"score=0.95", -1}}
	if len(out.Cuts) != len(want) {
		t.Fatalf("%d cuts, want %d", len(out.Cuts), len(want))
	}
	for i, w := range want {
		c := out.Cuts[i]
		if c.Spec != w.spec {
			t.Errorf("cut %d spec %q, want %q", i, c.Spec, w.spec)
		}
		if w.score < 0 {
			if c.Met || c.Score != nil || c.Reason == nil || *c.Reason == "" {
				t.Errorf("%s: want unmet with a reason, got met %v score %v", c.Spec, c.Met, c.Score)
			}
			continue
		}
		if !c.Met || c.Score == nil || *c.Score != w.score {
			t.Errorf("%s: met %v score %v, want %v", c.Spec, c.Met, c.Score, w.score)
		}
	}
}

// TestRunPercentages checks that every share the command line takes reads
// a percentage as the fraction it stands for: the JSON report with
// --base-rate 5%, --confidence 90%, --cut hit=80%, wrong=33.3% and top=10%
// is the report with 0.05, 0.9, hit=0.8, wrong=0.333 and top=10%, and the
// cut specs are named the same.
func TestRunPercentages(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "bearings.csv", demo.CSV(2000, 5))
	percent := runSill(t, "", "report", file, "--format", "json", "--base-rate", "5%", "--confidence", " 90 % ",
		"--cut", "hit=80%", "--cut", "wrong=33.3%", "--cut", "top=10%")
	fraction := runSill(t, "", "report", file, "--format", "json", "--base-rate", "0.05", "--confidence", "0.9",
		"--cut", "hit=0.8", "--cut", "wrong=0.333", "--cut", "top=10%")
	if percent.code != 0 || fraction.code != 0 {
		t.Fatalf("exit %d (%s) and %d (%s)", percent.code, percent.stderr, fraction.code, fraction.stderr)
	}
	if percent.stdout != fraction.stdout {
		t.Errorf("percentages and fractions differ:\n%s\n%s", percent.stdout, fraction.stdout)
	}
	for _, want := range []string{`"spec": "hit=0.8"`, `"spec": "wrong=0.333"`, `"base_rate": 0.05`, `"confidence": 0.9`} {
		if !strings.Contains(percent.stdout, want) {
			t.Errorf("the report lacks %s", want)
		}
	}
	// --choose names a cut the way --cut did.
	saved := runSill(t, "", "report", file, "--cut", "base", "--cut", "hit=80%", "--choose", "hit=80%", "--save", filepath.Join(dir, "cut.yaml"))
	if saved.code != 0 || !strings.Contains(saved.stderr, "chosen hit=0.8") {
		t.Errorf("--choose hit=80%%: exit %d, %s", saved.code, saved.stderr)
	}
	// The help of both commands says so.
	for _, command := range []string{"report", "explore"} {
		help := runSill(t, "", command, "--help")
		if !strings.Contains(help.stdout, "--base-rate share") || !strings.Contains(help.stdout, "0.05 or 5%") || !strings.Contains(help.stdout, "0.9 or 90%") {
			t.Errorf("%s --help does not say that shares take percentages:\n%s", command, help.stdout)
		}
	}
}

// TestRunDemo checks that the demo data is the same for the same rows and
// seed, differs for another seed, and that --out writes the file.
func TestRunDemo(t *testing.T) {
	first := runSill(t, "", "demo", "--rows", "50", "--seed", "3")
	second := runSill(t, "", "demo", "--rows", "50", "--seed", "3")
	other := runSill(t, "", "demo", "--rows", "50", "--seed", "4")
	if first.code != 0 || first.stderr != "" {
		t.Fatalf("exit %d, stderr %q", first.code, first.stderr)
	}
	if first.stdout != second.stdout {
		t.Error("the same rows and seed gave different data")
	}
	if first.stdout == other.stdout {
		t.Error("seeds 3 and 4 gave the same data")
	}
	lines := strings.Split(strings.TrimSuffix(first.stdout, "\n"), "\n")
	if len(lines) != 51 || lines[0] != "id,yard,read_at,score,label" {
		t.Errorf("%d lines, header %q; want 51 and id,yard,read_at,score,label", len(lines), lines[0])
	}

	out := filepath.Join(t.TempDir(), "bearings.csv")
	got := runSill(t, "", "demo", "--rows", "50", "--seed", "3", "--out", out)
	if got.code != 0 || got.stdout != "" || got.stderr != "sill: wrote 50 rows to "+out+"\n" {
		t.Errorf("--out: exit %d stdout %q stderr %q", got.code, got.stdout, got.stderr)
	}
	if data, err := os.ReadFile(out); err != nil || string(data) != first.stdout {
		t.Errorf("--out file differs from standard output (%v)", err)
	}

	// The demo file reads back as a report.
	got = runSill(t, "", "report", out, "--format", "json")
	if got.code != 0 || !strings.Contains(got.stdout, `"rows": 50`) {
		t.Errorf("report of the demo file: exit %d stderr %q", got.code, got.stderr)
	}
}

// TestRunNoArguments checks that sill alone, away from a terminal, prints
// the report of the built-in data.
func TestRunNoArguments(t *testing.T) {
	got := runSill(t, "")
	if got.code != 0 {
		t.Fatalf("exit %d: %s", got.code, got.stderr)
	}
	if !strings.Contains(got.stdout, "Veldmoor Freight") || !strings.Contains(got.stdout, "queue per shift") {
		t.Errorf("no report of the built-in data:\n%s", got.stdout)
	}
	// As on the screen, the demo's readings fall in its three crew shifts.
	if !strings.Contains(got.stdout, "queue per real shift") || !strings.Contains(got.stdout, "queue90=90") {
		t.Errorf("the report of the built-in data lacks the real shifts:\n%s", got.stdout)
	}
}

// TestReportCSVCuts: --format csv prints one row per cut under a header
// row, every figure in plain machine form and equal to the JSON report's;
// the columns are those README documents; an unmet cut keeps its spec and
// reason with empty figures. With --curve it prints the curve table
// alone, and refuses --cut, which would be left out.
func TestReportCSVCuts(t *testing.T) {
	file := writeFile(t, t.TempDir(), "good.csv", []byte(goodTable))
	args := []string{"report", file, "--volume", "1000", "--capacity", "50", "--cost-false-alert", "10", "--cost-miss", "100",
		"--cut", "hit=0.8", "--cut", "top=2", "--cut", "score=5"}
	got := runSill(t, "", append(args, "--format", "csv")...)
	if got.code != 0 || got.stderr != "" {
		t.Fatalf("exit %d, stderr %q", got.code, got.stderr)
	}
	rows, err := csv.NewReader(strings.NewReader(got.stdout)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	readme, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 4 || strings.Join(rows[0], ",") != strings.Join(report.CutsCSVHeader, ",") {
		t.Fatalf("%d rows, header %v", len(rows), rows[0])
	}
	explained := map[string]bool{}
	for _, line := range strings.Split(string(readme), "\n") {
		if first, _, ok := strings.Cut(strings.TrimPrefix(line, "| "), " |"); ok && strings.HasPrefix(line, "| `") {
			for _, name := range strings.Split(first, ", ") {
				explained[strings.Trim(name, "`")] = true
			}
		}
	}
	for _, column := range rows[0] {
		if !explained[column] {
			t.Errorf("README does not explain the CSV column %s", column)
		}
	}
	jsonOut := runSill(t, "", append(args, "--format", "json")...)
	var fromJSON struct {
		Cuts []map[string]any `json:"cuts"`
	}
	if err := json.Unmarshal([]byte(jsonOut.stdout), &fromJSON); err != nil {
		t.Fatal(err)
	}
	cell := func(row []string, column string) string {
		for i, c := range rows[0] {
			if c == column {
				return row[i]
			}
		}
		t.Fatalf("no column %s", column)
		return ""
	}
	for i, row := range rows[1:] {
		want := fromJSON.Cuts[i]
		if cell(row, "spec") != want["spec"] || cell(row, "met") != fmt.Sprint(want["met"]) {
			t.Errorf("row %d: spec %s met %s, want %v %v", i, cell(row, "spec"), cell(row, "met"), want["spec"], want["met"])
		}
		for column, key := range map[string]string{"score": "score", "flagged": "flagged", "tp": "tp", "fp": "fp", "fn": "fn", "tn": "tn",
			"recall": "recall", "precision": "precision", "false_discovery_rate": "false_discovery_rate", "false_positive_rate": "false_positive_rate"} {
			text := cell(row, column)
			if want["met"] == false {
				if text != "" {
					t.Errorf("unmet %s: %s %q, want empty", want["spec"], column, text)
				}
				continue
			}
			v, err := strconv.ParseFloat(text, 64)
			if err != nil || v != want[key].(float64) {
				t.Errorf("%s: %s %q, want %v as in JSON", want["spec"], column, text, want[key])
			}
		}
		if want["met"] == false {
			if cell(row, "reason") != want["reason"] {
				t.Errorf("unmet %s: reason %q, want %q", want["spec"], cell(row, "reason"), want["reason"])
			}
			continue
		}
		ci := want["recall_ci"].([]any)
		if cell(row, "recall_low") != strconv.FormatFloat(ci[0].(float64), 'g', -1, 64) || cell(row, "recall_high") != strconv.FormatFloat(ci[1].(float64), 'g', -1, 64) {
			t.Errorf("%s: recall interval %s–%s, want %v", want["spec"], cell(row, "recall_low"), cell(row, "recall_high"), ci)
		}
		projected := want["projected"].(map[string]any)
		if q, _ := strconv.ParseFloat(cell(row, "queue_per_shift"), 64); q != projected["queue_per_shift"].(float64) {
			t.Errorf("%s: queue %s, want %v", want["spec"], cell(row, "queue_per_shift"), projected["queue_per_shift"])
		}
		if cell(row, "confidence") != "0.95" {
			t.Errorf("%s: confidence %s", want["spec"], cell(row, "confidence"))
		}
	}
	// top=2 flags the two riskiest rows of goodTable, 0.91 (true) and the
	// tie at 0.85 would make three, so the cut is 0.91: tp 1, fp 0 (by hand).
	if top := rows[2]; cell(top, "tp") != "1" || cell(top, "fp") != "0" || cell(top, "flagged_share") != "0.125" {
		t.Errorf("top=2: tp %s fp %s flagged share %s, want 1, 0, 0.125", cell(top, "tp"), cell(top, "fp"), cell(top, "flagged_share"))
	}

	curve := runSill(t, "", "report", file, "--format", "csv", "--curve")
	if curve.code != 0 || !strings.HasPrefix(curve.stdout, "score,flagged,tp,fp,fn,tn,recall,precision,false_positive_rate\n") {
		t.Errorf("--curve: exit %d, stdout %q", curve.code, curve.stdout)
	}
	refused := runSill(t, "", "report", file, "--format", "csv", "--curve", "--cut", "base")
	if refused.code != 2 || refused.stdout != "" || !strings.Contains(refused.stderr, "--cut and --save go with --format csv without --curve") {
		t.Errorf("--curve --cut: exit %d, stderr %q", refused.code, refused.stderr)
	}
}

// TestReportMarkdownCurve: --curve in Markdown is a table under its own
// heading, one row per cut, before the caution (it was a block of CSV
// lines after it).
func TestReportMarkdownCurve(t *testing.T) {
	file := writeFile(t, t.TempDir(), "good.csv", []byte(goodTable))
	got := runSill(t, "", "report", file, "--format", "markdown", "--curve")
	if got.code != 0 {
		t.Fatalf("exit %d, stderr %q", got.code, got.stderr)
	}
	heading := strings.Index(got.stdout, "\n### Every cut\n\n| cut (flag score >=) |")
	caution := strings.Index(got.stdout, "> **Caution.**")
	if heading < 0 || caution < heading {
		t.Fatalf("no curve heading before the caution:\n%s", got.stdout)
	}
	table := strings.Split(strings.TrimSpace(got.stdout[heading:caution]), "\n")[2:]
	// A header, the alignment row and one row per distinct score (7).
	if len(table) != 9 || !strings.HasPrefix(table[2], "| 0.91 | 1 | 1 | 0 | 2 | 5 | 33.3% | 0.0% | 0.0% |") {
		t.Errorf("curve table:\n%s", strings.Join(table, "\n"))
	}
	if strings.Contains(got.stdout, "score,flagged,tp") {
		t.Errorf("the CSV block is still there:\n%s", got.stdout)
	}
}

// TestReportTextCurve: --curve in text is an aligned table under its own
// heading, one row per distinct score, before the caution (it was CSV
// lines after it); --format csv --curve stays CSV. The rows were worked
// out by hand from goodTable (3 true cases, 5 false): at 0.85 three cases
// are flagged, two of them true, so recall 2/3, wrong-alert share 1/3 and
// false positive rate 1/5.
func TestReportTextCurve(t *testing.T) {
	file := writeFile(t, t.TempDir(), "good.csv", []byte(goodTable))
	got := runSill(t, "", "report", file, "--curve")
	if got.code != 0 {
		t.Fatalf("exit %d, stderr %q", got.code, got.stderr)
	}
	want := "\nevery cut, strictest first\n" +
		"cut (flag score >=)  cases flagged  true cases found (tp)  wrong alerts (fp)  misses (fn)  false cases left (tn)  hit share (recall)  wrong-alert share (FDR)  false positive rate\n" +
		"0.91                             1                      1                  0            2                      5               33.3%                     0.0%                 0.0%\n" +
		"0.85                             3                      2                  1            1                      4               66.7%                    33.3%                20.0%\n" +
		"0.6                              4                      2                  2            1                      3               66.7%                    50.0%                40.0%\n" +
		"0.42                             5                      3                  2            0                      3              100.0%                    40.0%                40.0%\n" +
		"0.3                              6                      3                  3            0                      2              100.0%                    50.0%                60.0%\n" +
		"0.12                             7                      3                  4            0                      1              100.0%                    57.1%                80.0%\n" +
		"0.05                             8                      3                  5            0                      0              100.0%                    62.5%               100.0%\n" +
		"\ncaution: "
	if !strings.Contains(got.stdout, want) {
		t.Errorf("no aligned table of every cut before the caution:\n%s", got.stdout)
	}
	if strings.Contains(got.stdout, "score,flagged,tp") {
		t.Errorf("the CSV lines are still there:\n%s", got.stdout)
	}
	plain := runSill(t, "", "report", file)
	if before, _, _ := strings.Cut(got.stdout, "\nevery cut"); before+"\ncaution: "+strings.SplitN(got.stdout, "\ncaution: ", 2)[1] != plain.stdout {
		t.Errorf("the report above the table differs from the report without --curve:\n%s\n---\n%s", got.stdout, plain.stdout)
	}
	csvCurve := runSill(t, "", "report", file, "--format", "csv", "--curve")
	if !strings.HasPrefix(csvCurve.stdout, "score,flagged,tp,fp,fn,tn,recall,precision,false_positive_rate\n0.91,1,1,0,2,5,") {
		t.Errorf("--format csv --curve is no longer CSV:\n%s", csvCurve.stdout)
	}
}

// TestReportCountsWithNoScores: a counts table from the warehouse query
// whose every case had no score (a SQLite table imported with its score
// column as text) is refused with one line, exit 2, instead of a report
// of nothing with exit 0.
func TestReportCountsWithNoScores(t *testing.T) {
	file := writeFile(t, t.TempDir(), "counts.csv", []byte("score,positives,negatives,unrecognised\n,434,5566,0\n"))
	got := runSill(t, "", "report", file, "--counts")
	want := "sill: " + file + `: column "score": no row with a score: all 6000 cases are on rows with no score (434 true, 5566 false, 0 with neither label), where it was NULL or not a number when they were counted (a score column the engine stores as text counts as not a number), expected at least one row with a score` + "\n"
	if got.code != 2 || got.stdout != "" || got.stderr != want {
		t.Errorf("exit %d, stdout %q, stderr\n got %q\nwant %q", got.code, got.stdout, got.stderr, want)
	}
}
