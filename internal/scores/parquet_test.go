package scores

import (
	"bytes"
	"fmt"

	"math/rand/v2"
	"os"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
)

// parquetRow is a row of the test files the Go library writes: the score
// as double, float and integer columns, the label as boolean, integer,
// double and text columns, with nulls.
type parquetRow struct {
	Score      *float64 `parquet:"score,optional"`
	ScoreFloat float32  `parquet:"score_float"`
	ScoreInt   int64    `parquet:"score_int"`
	Failed     *bool    `parquet:"failed,optional"`
	FailedInt  int32    `parquet:"failed_int"`
	FailedDbl  float64  `parquet:"failed_double"`
	Outcome    string   `parquet:"outcome"`
	Weight     float64  `parquet:"weight"`
	Yard       string   `parquet:"yard"`
	Wagon      string   `parquet:"wagon"`
}

func writeParquet(t *testing.T, rows []parquetRow, rowGroup int) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := parquet.NewGenericWriter[parquetRow](&buf, parquet.MaxRowsPerRowGroup(int64(rowGroup)))
	if _, err := w.Write(rows); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// asCSV writes the same rows as text, a null as an empty cell, so that
// Read gives the reference set.
func asCSV(rows []parquetRow) string {
	var b strings.Builder
	b.WriteString("score,score_float,score_int,failed,failed_int,failed_double,outcome,weight,yard,wagon\n")
	for _, r := range rows {
		score, failed := "", ""
		if r.Score != nil {
			score = strconv.FormatFloat(*r.Score, 'g', -1, 64)
		}
		if r.Failed != nil {
			failed = strconv.FormatBool(*r.Failed)
		}
		fmt.Fprintf(&b, "%s,%s,%d,%s,%d,%s,%s,%s,%s,%s\n", score, strconv.FormatFloat(float64(r.ScoreFloat), 'g', -1, 32), r.ScoreInt,
			failed, r.FailedInt, strconv.FormatFloat(r.FailedDbl, 'g', -1, 64), r.Outcome, strconv.FormatFloat(r.Weight, 'g', -1, 64), r.Yard, r.Wagon)
	}
	return b.String()
}

func randomParquetRows(rng *rand.Rand, n int, nulls bool) []parquetRow {
	rows := make([]parquetRow, n)
	for i := range rows {
		score := float64(rng.IntN(1000)) / 1000
		positive := rng.IntN(5) == 0
		r := parquetRow{
			Score: &score, ScoreFloat: float32(score), ScoreInt: int64(rng.IntN(20)),
			Failed: &positive, Outcome: map[bool]string{true: "failed", false: "ok"}[positive],
			Weight: float64(rng.IntN(4)), Yard: []string{"Halvermoor", "Coldmere", "Bellrow"}[rng.IntN(3)],
			Wagon: fmt.Sprintf("VF-%05d", i),
		}
		if positive {
			r.FailedInt, r.FailedDbl = 1, 1
		}
		if nulls && rng.IntN(50) == 0 {
			r.Score = nil
		}
		if nulls && rng.IntN(80) == 0 {
			r.Failed = nil
		}
		rows[i] = r
	}
	return rows
}

// TestReadParquetMatchesRead checks ReadParquet against Read on the same
// rows written as Parquet (by github.com/parquet-go/parquet-go, several row
// groups) and as CSV: the same Set but for the digest and the format, or
// the same error but for the line, which for Parquet is the row (the CSV
// line less one, the header).
func TestReadParquetMatchesRead(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	options := []Options{
		{ScoreColumn: "score", LabelColumn: "failed"},
		{ScoreColumn: "score", LabelColumn: "failed", DropInvalid: true, WeightColumn: "weight", SegmentColumn: "yard", IDColumn: "wagon"},
		{ScoreColumn: "score_float", LabelColumn: "failed_int"},
		{ScoreColumn: "score_int", LabelColumn: "failed_double", LowerIsRiskier: true},
		{ScoreColumn: "score_float", LabelColumn: "outcome", Positive: "failed"},
		{ScoreColumn: "score_int", LabelColumn: "outcome"}, // "ok" is no label word: an error
	}
	for trial := range 24 {
		rows := randomParquetRows(rng, 1+rng.IntN(600), trial%2 == 1)
		data := writeParquet(t, rows, 1+rng.IntN(200))
		text := asCSV(rows)
		for _, opt := range options {
			want, wantErr := Read(strings.NewReader(text), "t", opt)
			got, gotErr := ReadParquet(bytes.NewReader(data), int64(len(data)), "t", opt)
			if (wantErr == nil) != (gotErr == nil) {
				t.Fatalf("trial %d %+v: Read error %v, ReadParquet error %v", trial, opt, wantErr, gotErr)
			}
			if wantErr != nil {
				pe := wantErr.(*ParseError)
				pe.Line--
				if pe.Error() != gotErr.Error() {
					t.Fatalf("trial %d %+v: errors differ\nRead (row) %v\nParquet    %v", trial, opt, pe, gotErr)
				}
				continue
			}
			for i := range want.droppedReasons {
				want.droppedReasons[i] = shiftLine(want.droppedReasons[i])
			}
			for i := range want.outside.Lines {
				want.outside.Lines[i]-- // a Parquet row is the line after the header
			}
			want.digest, got.digest = "", ""
			if !reflect.DeepEqual(want, got) {
				t.Fatalf("trial %d %+v: sets differ\nRead    %+v\nParquet %+v", trial, opt, brief(want), brief(got))
			}
		}
	}
}

// shiftLine turns "t:N: ..." into "t:N-1: ...".
func shiftLine(reason string) string {
	rest := strings.TrimPrefix(reason, "t:")
	colon := strings.IndexByte(rest, ':')
	n, _ := strconv.Atoi(rest[:colon])
	return "t:" + strconv.Itoa(n-1) + rest[colon:]
}

// TestReadParquetOtherWriter reads a file written by another Parquet
// implementation (testdata/parquet/README.md says which and how) and
// checks it against the same rows as CSV, written out by hand beside it.
func TestReadParquetOtherWriter(t *testing.T) {
	data, err := os.ReadFile("testdata/parquet/other-writer.parquet")
	if err != nil {
		t.Fatal(err)
	}
	text, err := os.ReadFile("testdata/parquet/other-writer.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, opt := range []Options{
		{LabelColumn: "failed", DropInvalid: true, SegmentColumn: "yard", IDColumn: "wagon", WeightColumn: "checks"},
		{LabelColumn: "failed", DropInvalid: true, ScoreColumn: "score_decimal"},
		{LabelColumn: "failed_int", DropInvalid: true, ScoreColumn: "score_float"},
	} {
		want, err := Read(bytes.NewReader(text), "t", opt)
		if err != nil {
			t.Fatal(err)
		}
		got, err := ReadParquet(bytes.NewReader(data), int64(len(data)), "t", opt)
		if err != nil {
			t.Fatal(err)
		}
		for i := range want.droppedReasons {
			want.droppedReasons[i] = shiftLine(want.droppedReasons[i])
		}
		for i := range want.outside.Lines {
			want.outside.Lines[i]-- // a Parquet row is the line after the header
		}
		want.digest, got.digest = "", ""
		if !reflect.DeepEqual(want, got) {
			t.Fatalf("%+v: sets differ\nCSV     %+v\nParquet %+v", opt, brief(want), brief(got))
		}
	}
	// Without DropInvalid the null score is an error at its row.
	_, err = ReadParquet(bytes.NewReader(data), int64(len(data)), "t", Options{LabelColumn: "failed"})
	if want := `t:8: column "score": invalid score "", expected a number, found an empty cell`; err == nil || err.Error() != want {
		t.Errorf("null score: %v, want %s", err, want)
	}
}

func TestReadParquetErrors(t *testing.T) {
	if _, err := ReadParquet(bytes.NewReader([]byte("PAR1 not really")), 15, "t", Options{}); err == nil || !strings.HasPrefix(err.Error(), "t: unreadable parquet: ") {
		t.Errorf("garbage: %v", err)
	}
	rows := randomParquetRows(rand.New(rand.NewPCG(1, 1)), 3, false)
	data := writeParquet(t, rows, 10)
	_, err := ReadParquet(bytes.NewReader(data), int64(len(data)), "t", Options{ScoreColumn: "nope"})
	if err == nil || !strings.Contains(err.Error(), `column "nope": column not found in header ["score", "score_float"`) {
		t.Errorf("missing column: %v", err)
	}
}

// TestReadParquetFiles reads a set split into two part files, as Spark
// writes a folder, and checks it against Read on the rows as one CSV; an
// error names the part file and its row, and a part with other columns is
// refused.
func TestReadParquetFiles(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 32))
	rows := randomParquetRows(rng, 300, true)
	first, second := writeParquet(t, rows[:120], 50), writeParquet(t, rows[120:], 50)
	files := []ParquetFile{
		{Data: bytes.NewReader(first), Size: int64(len(first)), Name: "part-0.parquet"},
		{Data: bytes.NewReader(second), Size: int64(len(second)), Name: "part-1.parquet"},
	}
	opt := Options{ScoreColumn: "score", LabelColumn: "outcome", Positive: "failed", DropInvalid: true, SegmentColumn: "yard"}
	want, err := Read(strings.NewReader(asCSV(rows)), "scored", opt)
	if err != nil {
		t.Fatal(err)
	}
	got, err := ReadParquetFiles(files, "scored", opt)
	if err != nil {
		t.Fatal(err)
	}
	want.digest, got.digest = "", ""
	want.droppedReasons, got.droppedReasons = nil, nil
	if !reflect.DeepEqual(want, got) {
		t.Fatalf("sets differ\nRead    %+v\nParquet %+v", brief(want), brief(got))
	}
	// Row 5 of the second part has no score, and the first part none
	// missing; without DropInvalid that is the error.
	broken := append([]parquetRow(nil), rows[120:]...)
	broken[4].Score = nil
	data := writeParquet(t, broken, 50)
	files[1] = ParquetFile{Data: bytes.NewReader(data), Size: int64(len(data)), Name: "part-1.parquet"}
	opt.DropInvalid = false
	for i := range broken[:4] {
		if broken[i].Score == nil {
			t.Skip("the seed put an earlier null score in the second part")
		}
	}
	firstOK := writeParquet(t, withScores(rows[:120]), 50)
	files[0] = ParquetFile{Data: bytes.NewReader(firstOK), Size: int64(len(firstOK)), Name: "part-0.parquet"}
	_, err = ReadParquetFiles(files, "scored", opt)
	if want := `part-1.parquet:5: column "score": invalid score "", expected a number, found an empty cell`; err == nil || err.Error() != want {
		t.Errorf("error %v, want %s", err, want)
	}
	// A part with other columns.
	type otherRow struct {
		Score float64 `parquet:"score"`
	}
	var buf bytes.Buffer
	w := parquet.NewGenericWriter[otherRow](&buf)
	w.Write([]otherRow{{0.5}})
	w.Close()
	files[1] = ParquetFile{Data: bytes.NewReader(buf.Bytes()), Size: int64(buf.Len()), Name: "part-1.parquet"}
	if _, err := ReadParquetFiles(files, "scored", opt); err == nil || !strings.HasPrefix(err.Error(), `part-1.parquet: unreadable parquet: columns ["score"], expected those of the first file`) {
		t.Errorf("other columns: %v", err)
	}
}

// withScores returns rows with every null score set to 0.5.
func withScores(rows []parquetRow) []parquetRow {
	out := append([]parquetRow(nil), rows...)
	for i := range out {
		if out[i].Score == nil {
			half := 0.5
			out[i].Score = &half
		}
	}
	return out
}

// decimalRow has a score stored as a decimal of 38 digits, which writers
// keep in a 16-byte array rather than an integer column.
type decimalRow struct {
	Score  [16]byte `parquet:"score,decimal(3:38)"`
	Label  int32    `parquet:"label"`
	Weight [16]byte `parquet:"weight,decimal(1:38)"`
}

// decimal16 stores v as a 16-byte big-endian two's complement integer.
func decimal16(v int64) [16]byte {
	var out [16]byte
	for i := range 8 {
		out[15-i] = byte(v >> (8 * i))
	}
	if v < 0 {
		for i := range 8 {
			out[i] = 0xff
		}
	}
	return out
}

// TestReadParquetDecimalBytes: decimals stored as byte arrays read as the
// numbers they hold, scale applied. Hand-worked: unscaled 150, -25 and
// 999 at scale 3 are 0.15, -0.025 and 0.999; weights 15 and 20 at scale 1
// are 1.5 and 2. The reference is Read of the same numbers as text. Once
// the bytes were read as text and every row was an invalid score.
func TestReadParquetDecimalBytes(t *testing.T) {
	var buf bytes.Buffer
	w := parquet.NewGenericWriter[decimalRow](&buf)
	if _, err := w.Write([]decimalRow{{decimal16(150), 1, decimal16(15)}, {decimal16(-25), 0, decimal16(20)}, {decimal16(999), 1, decimal16(0)}}); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	opt := Options{WeightColumn: "weight"}
	got, err := ReadParquet(bytes.NewReader(buf.Bytes()), int64(buf.Len()), "d.parquet", opt)
	if err != nil {
		t.Fatal(err)
	}
	want, err := Read(strings.NewReader("score,label,weight\n0.15,1,1.5\n-0.025,0,2\n0.999,1,0\n"), "d.parquet", opt)
	if err != nil {
		t.Fatal(err)
	}
	if want.outside.Rows != 1 || got.outside.Rows != 1 {
		t.Errorf("scores outside [0, 1]: CSV %+v, Parquet %+v, want 1 each", want.outside, got.outside)
	}
	want.outside.Lines, got.outside.Lines = nil, nil // rows in another order
	want.digest, got.digest = "", ""
	if !reflect.DeepEqual(want, got) {
		t.Errorf("sets differ\nCSV     %+v\nParquet %+v", brief(want), brief(got))
	}
}
