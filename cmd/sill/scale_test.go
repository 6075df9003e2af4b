package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
)

// TestReportParquetFolderAndCounts runs report on the DuckDB-written
// Parquet file of internal/scores, on a Spark-style folder holding it twice
// (two parts and a _SUCCESS marker), and on the counts table of the same
// rows, and on the file through standard input (a pipe, and redirected
// from the file), and checks the row counts and ROC AUC in JSON. The file's 8 scored
// rows, worked out by hand from testdata/parquet/other-writer.csv: 4 true,
// 4 false; ROC AUC 0.78125: of the 16 true-false pairs the true 0.91 and
// 0.75 outrank all 4 falses, 0.57 outranks 3 and ties 1 (half), 0.0625
// outranks only 0.003: (4 + 4 + 3.5 + 1) / 16.
func TestReportParquetFolderAndCounts(t *testing.T) {
	data, err := os.ReadFile("../../internal/scores/testdata/parquet/other-writer.parquet")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	file := writeFile(t, dir, "cases.parquet", data)
	folder := filepath.Join(dir, "table")
	os.Mkdir(folder, 0o755)
	writeFile(t, folder, "part-00000.parquet", data)
	writeFile(t, folder, "part-00001.parquet", data)
	writeFile(t, folder, "_SUCCESS", nil)
	// The same 8 scored rows as a counts table.
	counts := writeFile(t, dir, "counts.csv", []byte("score,positives,negatives\n0.91,1,0\n0.12,0,1\n0.57,1,1\n0.003,0,1\n0.75,1,0\n0.3333,0,1\n0.0625,1,0\n"))
	type reportCase struct {
		name      string
		args      []string
		rows      int
		positives float64
	}
	cases := []reportCase{
		{"file", []string{"report", file, "--label", "failed", "--drop-invalid", "--format", "json"}, 8, 4},
		{"folder", []string{"report", folder, "--label", "failed", "--drop-invalid", "--format", "json"}, 16, 8},
		{"counts", []string{"report", counts, "--counts", "--format", "json"}, 8, 4},
	}
	// The file on standard input, through a pipe and redirected from the
	// file: recognised by its magic bytes either way.
	piped := []string{"report", "-", "--label", "failed", "--drop-invalid", "--format", "json"}
	redirected, err := os.Open(file)
	if err != nil {
		t.Fatal(err)
	}
	defer redirected.Close()
	var stdout, stderr strings.Builder
	code := run(piped, redirected, &stdout, &stderr)
	redirectedRun := sillResult{code, stdout.String(), stderr.String()}
	for _, c := range append(cases, reportCase{"pipe", piped, 8, 4}, reportCase{"redirected", nil, 8, 4}) {
		var res sillResult
		switch c.name {
		case "pipe":
			res = runSill(t, string(data), c.args...)
		case "redirected":
			res = redirectedRun
		default:
			res = runSill(t, "", c.args...)
		}
		if res.code != 0 {
			t.Fatalf("%s: exit %d: %s", c.name, res.code, res.stderr)
		}
		var got struct {
			Rows      int     `json:"rows"`
			Positives float64 `json:"positives"`
			ROCAUC    float64 `json:"roc_auc"`
		}
		if err := json.Unmarshal([]byte(res.stdout), &got); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if got.Rows != c.rows || got.Positives != c.positives || got.ROCAUC != 0.78125 {
			t.Errorf("%s: rows %d, positives %v, ROC AUC %v; want %d, %v, 0.78125", c.name, got.Rows, got.Positives, got.ROCAUC, c.rows, c.positives)
		}
	}
}

// TestSQLCommand checks the wiring of sill sql: the query on standard
// output, --dialect and --text-type, a missing flag refused, and the
// query's errors with the flag that sets the part named (messages written
// out by hand).
func TestSQLCommand(t *testing.T) {
	res := runSill(t, "", "sql", "--table", "analytics.scored", "--score", "p", "--label", "failed", "--digits", "2")
	if res.code != 0 || !strings.Contains(res.stdout, `FLOOR("p" * 100 + 0.5) / 100 END AS sill_score`) || !strings.Contains(res.stdout, `FROM "analytics"."scored"`) ||
		!strings.Contains(res.stdout, `TRIM(CAST("failed" AS VARCHAR(255)))`) {
		t.Errorf("exit %d\n%s%s", res.code, res.stdout, res.stderr)
	}
	res = runSill(t, "", "sql", "--table", "t", "--score", "p", "--label", "failed", "--dialect", "clickhouse")
	if res.code != 0 || !strings.Contains(res.stdout, `replaceRegexpAll(CAST("failed" AS Nullable(String)), '^ +| +$', '')`) {
		t.Errorf("--dialect clickhouse: exit %d\n%s%s", res.code, res.stdout, res.stderr)
	}
	res = runSill(t, "", "sql", "--table", "t", "--score", "p", "--label", "failed", "--dialect", "clickhouse", "--text-type", "String")
	if res.code != 0 || !strings.Contains(res.stdout, `CAST("failed" AS String)`) {
		t.Errorf("--text-type with --dialect clickhouse: exit %d\n%s%s", res.code, res.stdout, res.stderr)
	}
	if res := runSill(t, "", "sql", "--table", "t", "--score", "p"); res.code == 0 || !strings.Contains(res.stderr, "label") {
		t.Errorf("without --label: exit %d, %q", res.code, res.stderr)
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--table", "t.", "--score", "p", "--label", "l"}, `sill: --table: empty name in "t.": a dot must separate two names`},
		{[]string{"--table", "t", "--score", " ", "--label", "l"}, `sill: --score: empty name`},
		{[]string{"--table", "t", "--score", "p", "--label", "l", "--digits", "13"}, `sill: --digits 13: digits out of range, expected 0 to 12, or -1 to keep every score as it is`},
		{[]string{"--table", "t", "--score", "p", "--label", "l", "--text-type", "a;b"}, `sill: --text-type "a;b": not a type name, expected one such as VARCHAR(255) or STRING`},
		{[]string{"--table", "t", "--score", "p", "--label", "l", "--dialect", "spark"}, `sill: --dialect "spark": unknown dialect, expected one of standard, clickhouse`},
	} {
		res := runSill(t, "", append([]string{"sql"}, c.args...)...)
		if res.code != 2 || res.stdout != "" || strings.TrimSpace(res.stderr) != c.want {
			t.Errorf("%v: exit %d, stdout %q, stderr %q; want 2 and %s", c.args, res.code, res.stdout, res.stderr, c.want)
		}
	}
}

// TestCountsNoScore checks that report --counts drops the rows of cases
// with no score (as sill sql counts NULL and non-numeric scores: empty
// from most engines, \N from ClickHouse) and says how many were true and
// false, in the warning and in JSON; sums worked by hand: 3+0 true, 4+2
// false, 1 with neither label.
func TestCountsNoScore(t *testing.T) {
	path := filepath.Join(t.TempDir(), "counts.csv")
	table := "score,positives,negatives,unrecognised\n0.9,5,1,0\n0.5,2,6,0\n,3,4,1\n\\N,0,2,0\n"
	if err := os.WriteFile(path, []byte(table), 0o644); err != nil {
		t.Fatal(err)
	}
	res := runSill(t, "", "report", path, "--counts", "--format", "json")
	var got struct {
		Rows           int                                               `json:"rows"`
		DroppedRows    int                                               `json:"dropped_rows"`
		DroppedNoScore struct{ Rows, Positives, Negatives, Neither int } `json:"dropped_no_score"`
		Warnings       []string                                          `json:"warnings"`
	}
	if err := json.Unmarshal([]byte(res.stdout), &got); err != nil {
		t.Fatalf("exit %d: %v\n%s", res.code, err, res.stderr)
	}
	want := "10 rows were dropped for a score that was missing or not a number (3 true cases, 6 false, 1 with neither label)"
	if res.code != 0 || got.Rows != 14 || got.DroppedRows != 10 || got.DroppedNoScore != (struct{ Rows, Positives, Negatives, Neither int }{10, 3, 6, 1}) ||
		len(got.Warnings) != 1 || got.Warnings[0] != want || !strings.Contains(res.stderr, want) {
		t.Errorf("exit %d: %+v\n%s", res.code, got, res.stderr)
	}
}

// TestLoadPiped checks that standard input from a pipe, copied aside and
// read by the block reader, gives what the line reader gives: the same set,
// the same error for a bad row, and the same error when the stream itself
// fails part way.
func TestLoadPiped(t *testing.T) {
	good := "score,label\n0.9,1\n0.4,0\n0.4,1\n0.1,0\n"
	bad := "score,label\n0.9,1\n0.4,maybe\n"
	for _, text := range []string{good, bad} {
		want, wantErr := scores.Read(strings.NewReader(text), "-", scores.Options{})
		got, gotErr := loadPiped(strings.NewReader(text), scores.Options{})
		if fmt.Sprint(wantErr) != fmt.Sprint(gotErr) || (wantErr == nil && !reflect.DeepEqual(want, got)) {
			t.Errorf("%q: line reader %v %v, piped %v %v", text, want, wantErr, got, gotErr)
		}
	}
	broken := errors.New("connection reset")
	stream := func() io.Reader { return io.MultiReader(strings.NewReader(good), errorReader{broken}) }
	_, wantErr := scores.Read(stream(), "-", scores.Options{})
	_, gotErr := loadPiped(stream(), scores.Options{})
	if wantErr == nil || fmt.Sprint(wantErr) != fmt.Sprint(gotErr) || !errors.Is(gotErr, broken) {
		t.Errorf("failing stream: line reader %v, piped %v", wantErr, gotErr)
	}
}
