package main

import (
	"bytes"
	"compress/gzip"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
)

// damagedParquet are Parquet files, each one byte away from a valid file,
// on which report and check once panicked inside the Parquet library (in
// the calling goroutine or a row group's); they live beside the reader's
// tests.
var damagedParquet = []string{
	"decimal-no-length", "decimal-type-unknown", "gzip-page-eof", "gzip-page-header",
	"makeslice", "nil-pointer", "values-out-of-range", "values-out-of-range-double",
}

// TestRunDamagedParquet: report and check read each damaged Parquet file
// without a panic; where the damage is in what they read they refuse it
// with one line naming it, exit status 2 and nothing on standard output
// (one of the files, whose damage only told the old reader to make room
// for too many rows, now reads).
func TestRunDamagedParquet(t *testing.T) {
	dir := t.TempDir()
	validation := writeFile(t, dir, "validation.csv", []byte(goodTable))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", validation, "--cut", "base", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	refused := 0
	for _, name := range damagedParquet {
		data, err := os.ReadFile(filepath.Join("..", "..", "internal", "scores", "testdata", "parquet", "damaged", name+".parquet"))
		if err != nil {
			t.Fatal(err)
		}
		path := writeFile(t, dir, name+".parquet", data)
		for _, args := range [][]string{
			{"report", path, "--weight", "w", "--segment", "seg", "--id", "id", "--drop-invalid"},
			{"report", path, "--format", "json"},
			{"check", cutPath, path, "--drop-invalid"},
		} {
			r := runSill(t, "", args...)
			if r.code == 2 && (r.stdout != "" || strings.Count(r.stderr, "\n") != 1 || !strings.HasPrefix(r.stderr, "sill: "+path+":")) {
				t.Errorf("sill %s: exit 2, stdout %q, stderr %q; want nothing and one line naming the file", strings.Join(args, " "), r.stdout, r.stderr)
			}
			if r.code == 2 {
				refused++
			}
		}
	}
	if refused < 3*(len(damagedParquet)-1) {
		t.Errorf("%d of %d runs refused the damaged files, want all but those of one file", refused, 3*len(damagedParquet))
	}
}

// TestRunHostileInput: each input that once gave a message that did not
// say what was wrong, or a result it should not have, now stops with one
// line on stderr naming the place and what was expected, exit status 2,
// nothing on stdout.
func TestRunHostileInput(t *testing.T) {
	dir := t.TempDir()
	path := func(name string, content []byte) string { return writeFile(t, dir, name, content) }
	text := func(name, content string) string { return path(name, []byte(content)) }
	parquetData, err := os.ReadFile("../../internal/scores/testdata/parquet/other-writer.parquet")
	if err != nil {
		t.Fatal(err)
	}
	parquetFile := path("cases.parquet", parquetData)
	plain := "score,label\n0.5,1\n0.2,0\n"
	var twice bytes.Buffer
	z := gzip.NewWriter(&twice)
	z.Write(gzipBytes(t, plain))
	z.Close()
	trailing := append(gzipBytes(t, plain), "left over\n"...)
	cases := []struct {
		name string
		args []string
		want string
	}{
		{"--input csv on parquet", []string{"report", parquetFile, "--input", "csv"},
			parquetFile + `: --input csv, but the file begins with Parquet's magic bytes "PAR1", expected delimited text (leave out --input, or give --input parquet)`},
		{"--input jsonl on parquet", []string{"report", parquetFile, "--input", "jsonl"},
			parquetFile + `: --input jsonl, but the file begins with Parquet's magic bytes "PAR1", expected JSON Lines text (leave out --input, or give --input parquet)`},
		{"unclosed quote", []string{"report", text("quote.csv", "score,label\n0.9,1\n\"0.5,1\n0.2,0\n0.1,0\n")},
			filepath.Join(dir, "quote.csv") + `:3: quoted field not closed: a quoted field opens on this line and the input ends inside it at line 5, expected a closing " on this line`},
		{"JSON array", []string{"report", text("array.json", `[{"score":0.5,"label":1},{"score":0.2,"label":0}]`+"\n")},
			filepath.Join(dir, "array.json") + ":1: malformed JSON: a JSON array, expected JSON Lines: one object per line, without the enclosing [ ] and the commas between objects"},
		{"gzip in gzip", []string{"report", path("twice.csv.gz", twice.Bytes())},
			filepath.Join(dir, "twice.csv.gz") + ": gzip data inside gzip data: the decompressed bytes begin with gzip's magic again, expected text; decompress the file once before reading it"},
		{"gzip with trailing bytes", []string{"report", path("trailing.csv.gz", trailing)},
			filepath.Join(dir, "trailing.csv.gz") + ": corrupt gzip data: bytes after the end of the compressed data that do not begin another gzip member, expected the file to end there"},
		{"spaces before the header", []string{"report", text("spaces.csv", "\n \t \nscore,label\n0.5,1\n")},
			filepath.Join(dir, "spaces.csv") + ":2: a line of only spaces or tabs before the header, expected the header line"},
		{"JSON Lines as counts", []string{"report", "--counts", text("counts.jsonl", `{"score":0.5,"positives":1,"negatives":2}`+"\n")},
			filepath.Join(dir, "counts.jsonl") + `: JSON Lines (the first line begins with "{"), expected a counts table: delimited text with a header line naming score, positives and negatives`},
		{"duplicate column", []string{"report", text("dup.csv", "score,label,score\n0.5,1,0.1\n")},
			filepath.Join(dir, "dup.csv") + `:1: column "score": duplicate column name: the name of columns 1 and 3, expected each name once`},
		{"hexadecimal score", []string{"report", text("hex.csv", "score,label\n0x1p-2,1\n0.2,0\n")},
			filepath.Join(dir, "hex.csv") + `:2: column "score": invalid score "0x1p-2", expected a number in decimal notation such as 0.25 or 1.5e-3 (hexadecimal and digits separated by _ are not read)`},
		{"underscores in a weight", []string{"report", text("under.csv", "score,label,w\n0.5,1,1_000\n0.2,0,1\n"), "--weight", "w"},
			filepath.Join(dir, "under.csv") + `:2: column "w": invalid weight "1_000", expected a number in decimal notation such as 0.25 or 1.5e-3 (hexadecimal and digits separated by _ are not read)`},
		{"a line past the limit", []string{"report", text("long.csv", "score,label\n0.5,1\n0."+strings.Repeat("3", 17<<20)+",0\n")},
			filepath.Join(dir, "long.csv") + ":3: line longer than the limit of 16 MiB, expected lines of delimited text (is this a table of scores?)"},
	}
	if _, err := os.Stat("/dev/zero"); err == nil {
		cases = append(cases, struct {
			name string
			args []string
			want string
		}{"a device of zeros", []string{"report", "/dev/zero"}, "/dev/zero:1: line longer than the limit of 16 MiB, expected lines of delimited text (is this a table of scores?)"})
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r := runSill(t, "", tc.args...)
			if r.code != 2 || r.stdout != "" || r.stderr != "sill: "+tc.want+"\n" {
				t.Errorf("exit %d, stdout %q\nstderr %q\nwant   %q", r.code, r.stdout, r.stderr, "sill: "+tc.want+"\n")
			}
		})
	}
}

// nonFinite matches a NaN or an infinity as Go, JSON encoders and YAML
// print them.
var nonFinite = regexp.MustCompile(`(?i)(^|[^a-z])[+-]?\.?(nan|inf)([^a-z]|$)`)

// TestRunNoNaNOrInf: sums that would overflow are refused with one line
// naming the column or the flag (once weights of 1e308 gave "n/a true
// cases" and exit 0, JSON failed on +Inf and check printed "+NaN pt" and
// "status: ok"); and at the edge of what is read (weights adding up to
// nearly MaxWeightTotal, a cost per shift of nearly MaxAmount) no NaN or
// infinity reaches any output: report as text, JSON, Markdown and CSV,
// the decision file, and check's verdict as text and JSON.
func TestRunNoNaNOrInf(t *testing.T) {
	dir := t.TempDir()
	good := writeFile(t, dir, "good.csv", []byte(goodTable))
	huge := writeFile(t, dir, "huge.csv", []byte("score,label,w\n0.9,1,1e308\n0.8,0,1e308\n0.1,0,1\n"))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", good, "--cut", "base", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	refusals := []struct {
		args []string
		want string
	}{
		{[]string{"report", huge, "--weight", "w"}, huge + `: column "w": sum out of range: the weights add up to more than float64 holds (about 1.8e308), expected at most 1e+150 so that the figures stay finite`},
		{[]string{"report", huge, "--weight", "w", "--format", "json"}, huge + `: column "w": sum out of range: the weights add up to more than float64 holds (about 1.8e308), expected at most 1e+150 so that the figures stay finite`},
		{[]string{"check", cutPath, huge, "--weight", "w"}, huge + `: column "w": sum out of range: the weights add up to more than float64 holds (about 1.8e308), expected at most 1e+150 so that the figures stay finite`},
		{[]string{"report", good, "--volume", "1e200"}, "--volume: invalid assumption: volume per shift 1e+200 is too large, expected at most 1e+150 so that the figures stay finite"},
		{[]string{"report", good, "--volume", "1e100", "--cost-miss", "1e100"}, "--volume times the largest of --cost-false-alert, --cost-miss and --cost-hit: invalid assumption: cost per shift 1e+200 is too large, expected at most 1e+150 so that the figures stay finite"},
		{[]string{"report", good, "--cost-hit", "-1e300"}, "--cost-false-alert, --cost-miss or --cost-hit: invalid assumption: cost 1e+300 is too large, expected at most 1e+150 so that the figures stay finite"},
		{[]string{"demo", "--rows", "1000000000000"}, "--rows 1000000000000: expected at most 1000000 (the demo set is made in memory)"},
	}
	for _, tc := range refusals {
		r := runSill(t, "", tc.args...)
		if r.code != 2 || r.stdout != "" || r.stderr != "sill: "+tc.want+"\n" {
			t.Errorf("sill %s: exit %d, stdout %q\nstderr %q\nwant   %q", strings.Join(tc.args, " "), r.code, r.stdout, r.stderr, "sill: "+tc.want+"\n")
		}
	}

	edge := writeFile(t, dir, "edge.csv", []byte("score,label,w\n0.9,1,3e148\n0.8,0,2e148\n0.7,1,1e148\n0.4,0,3e148\n0.2,1,5e147\n0.1,0,2e148\n"))
	flags := []string{"--weight", "w", "--volume", "1e100", "--capacity", "1e99", "--cost-miss", "1e49", "--cost-false-alert", "1e48", "--cost-hit", "-1e47"}
	edgeCut := filepath.Join(dir, "edge-cut.yaml")
	outputs := [][]string{
		{"report", edge, "--format", "text", "--curve"},
		{"report", edge, "--format", "json", "--curve"},
		{"report", edge, "--format", "markdown", "--curve"},
		{"report", edge, "--format", "csv", "--cut", "base", "--cut", "cost"},
		{"report", edge, "--cut", "base", "--cut", "cost", "--cut", "queue=5e99", "--save", edgeCut},
	}
	for _, args := range outputs {
		r := runSill(t, "", append(args, flags...)...)
		if r.code != 0 {
			t.Fatalf("sill %s: exit %d, %s", strings.Join(args, " "), r.code, r.stderr)
		}
		if m := nonFinite.FindString(r.stdout + r.stderr); m != "" {
			t.Errorf("sill %s: %q in the output:\n%s", strings.Join(args, " "), m, r.stdout)
		}
		if args[3] == "json" && !json.Valid([]byte(r.stdout)) {
			t.Errorf("sill %s: output is not JSON", strings.Join(args, " "))
		}
	}
	saved, err := os.ReadFile(edgeCut)
	if err != nil {
		t.Fatal(err)
	}
	if m := nonFinite.FindString(string(saved)); m != "" {
		t.Errorf("decision file holds %q:\n%s", m, saved)
	}
	for _, format := range []string{"text", "json"} {
		r := runSill(t, "", "check", edgeCut, edge, "--weight", "w", "--format", format)
		if r.code != 0 && r.code != 1 {
			t.Fatalf("check --format %s: exit %d, %s", format, r.code, r.stderr)
		}
		if m := nonFinite.FindString(r.stdout + r.stderr); m != "" {
			t.Errorf("check --format %s: %q in the verdict:\n%s", format, m, r.stdout)
		}
	}
}

// endlessZeros is a pipe of zeros that never ends, counting what is read.
type endlessZeros struct{ read int64 }

func (z *endlessZeros) Read(p []byte) (int, error) {
	clear(p)
	z.read += int64(len(p))
	return len(p), nil
}

// TestLoadPipedNeverEnding: a pipe of zeros that never ends is refused at
// line 1 once a line passes the reader's limit; once it was copied into
// the temporary file until the disk was full.
func TestLoadPipedNeverEnding(t *testing.T) {
	z := &endlessZeros{}
	_, err := loadPiped(z, scores.Options{})
	if want := "-:1: line longer than the limit of 16 MiB, expected lines of delimited text (is this a table of scores?)"; err == nil || err.Error() != want {
		t.Errorf("error %v, want %s", err, want)
	}
	if z.read > 2*scores.MaxLine+4*spoolChunk {
		t.Errorf("read %d bytes of the pipe before refusing it", z.read)
	}
}
