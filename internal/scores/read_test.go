package scores_test

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
)

// gzipped returns text compressed with gzip.
func gzipped(t testing.TB, text string) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := gzip.NewWriter(&buf)
	if _, err := w.Write([]byte(text)); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// TestReadErrors checks each reader error of issue 2: the exact one-line
// message (file, 1-based physical line, column where it applies, and what
// was expected) and the sentinel that errors.Is finds. The messages were
// written out by hand from the format in STYLE.md
// ("file:line: column "name": what, expected what").
func TestReadErrors(t *testing.T) {
	cases := []struct {
		name     string
		input    string
		opt      scores.Options
		sentinel error // nil: no sentinel, the message alone is checked
		message  string
	}{
		{
			name:     "named column absent",
			input:    "score,label\n0.1,1\n",
			opt:      scores.Options{ScoreColumn: "prob"},
			sentinel: scores.ErrMissingColumn,
			message:  `f.csv:1: column "prob": column not found in header ["score", "label"]`,
		},
		{
			name:     "no default score column",
			input:    "x,label\n0.1,1\n",
			sentinel: scores.ErrMissingColumn,
			message:  `f.csv:1: column not found: no score column among ["x", "label"], expected one of ["score", "probability", "prob", "p", "pred", "prediction"] (or name it with --score)`,
		},
		{
			name:     "no default label column",
			input:    "score\n0.5\n",
			sentinel: scores.ErrMissingColumn,
			message:  `f.csv:1: column not found: no label column among ["score"], expected one of ["label", "y", "target", "outcome", "actual"] (or name it with --label)`,
		},
		{
			name:     "weight column absent",
			input:    "score,label\n0.5,1\n",
			opt:      scores.Options{WeightColumn: "w"},
			sentinel: scores.ErrMissingColumn,
			message:  `f.csv:1: column "w": column not found in header ["score", "label"]`,
		},
		{
			name:     "missing column in a header after blank lines",
			input:    "\n\r\nx,label\n0.1,1\n",
			sentinel: scores.ErrMissingColumn,
			message:  `f.csv:3: column not found: no score column among ["x", "label"], expected one of ["score", "probability", "prob", "p", "pred", "prediction"] (or name it with --score)`,
		},
		{
			name:     "ragged row, too many fields",
			input:    "score,label\n0.1,1\n0.2,0,3\n",
			sentinel: scores.ErrRagged,
			message:  `f.csv:3: wrong number of fields: row has 3, header has 2`,
		},
		{
			name:     "ragged row, too few fields",
			input:    "score,label,w\n0.1,1,1\n0.2,0\n",
			sentinel: scores.ErrRagged,
			message:  `f.csv:3: wrong number of fields: row has 2, header has 3`,
		},
		{
			name:     "unparseable score",
			input:    "score,label\n0.1,1\nabc,0\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:3: column "score": invalid score "abc", expected a finite number`,
		},
		{
			name:     "NaN score",
			input:    "score,label\n0.1,1\nNaN,0\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:3: column "score": invalid score "NaN", expected a finite number`,
		},
		{
			name:     "infinite score",
			input:    "score,label\n0.1,1\n+Inf,0\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:3: column "score": invalid score "+Inf", expected a finite number`,
		},
		{
			name:     "score out of float range",
			input:    "score,label\n1e400,1\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:2: column "score": invalid score "1e400", expected a finite number`,
		},
		{
			name:     "empty score",
			input:    "score,label\n0.1,1\n,0\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:3: column "score": invalid score "", expected a number, found an empty cell`,
		},
		{
			name:     "unknown label",
			input:    "score,label\n0.1,maybe\n",
			sentinel: scores.ErrBadLabel,
			message:  `f.csv:2: column "label": unrecognised label "maybe", expected 1/true/yes/positive or 0/false/no/negative`,
		},
		{
			name:     "label 2 is not a class",
			input:    "score,label\n0.1,2\n",
			sentinel: scores.ErrBadLabel,
			message:  `f.csv:2: column "label": unrecognised label "2", expected 1/true/yes/positive or 0/false/no/negative`,
		},
		{
			name:     "negative weight",
			input:    "score,label,w\n0.1,1,-1\n",
			opt:      scores.Options{WeightColumn: "w"},
			sentinel: scores.ErrBadWeight,
			message:  `f.csv:2: column "w": invalid weight "-1", expected a finite number >= 0`,
		},
		{
			name:     "empty weight",
			input:    "score,label,w\n0.1,1,2\n0.2,0,\n",
			opt:      scores.Options{WeightColumn: "w"},
			sentinel: scores.ErrBadWeight,
			message:  `f.csv:3: column "w": invalid weight "", expected a finite number >= 0`,
		},
		{
			name:     "empty file",
			input:    "",
			sentinel: scores.ErrEmpty,
			message:  `f.csv: empty input, expected a header line`,
		},
		{
			name:     "blank lines only",
			input:    "\n\n",
			sentinel: scores.ErrEmpty,
			message:  `f.csv: empty input, expected a header line`,
		},
		{
			name:     "header only",
			input:    "score,label\n",
			sentinel: scores.ErrNoRows,
			message:  `f.csv: no data rows after the header`,
		},
		{
			name:     "header and blank lines",
			input:    "score,label\r\n\r\n\r\n",
			sentinel: scores.ErrNoRows,
			message:  `f.csv: no data rows after the header`,
		},
		{
			name:     "corrupt gzip",
			input:    "\x1f\x8bthis is not a deflate stream",
			sentinel: scores.ErrCorruptGzip,
			message:  `f.csv: corrupt gzip data: gzip: invalid header`,
		},
		{
			name:     "bad row after a quoted field with an embedded newline",
			input:    "id,score,label\n\"AX-1\nsecond line\",0.1,1\nAX-2,bad,1\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:4: column "score": invalid score "bad", expected a finite number`,
		},
		{
			name:     "bad row after CRLF lines",
			input:    "score,label\r\n0.1,1\r\n0.2,x\r\n",
			sentinel: scores.ErrBadLabel,
			message:  `f.csv:3: column "label": unrecognised label "x", expected 1/true/yes/positive or 0/false/no/negative`,
		},
		{
			name:     "bad row after blank lines counts them",
			input:    "score,label\n\n0.1,1\n\n0.2,x\n",
			sentinel: scores.ErrBadLabel,
			message:  `f.csv:5: column "label": unrecognised label "x", expected 1/true/yes/positive or 0/false/no/negative`,
		},
		{
			name:    "unclosed quote",
			input:   "score,label\n0.1,\"1\n",
			message: `f.csv:2: quoted field not closed: a quoted field opens on this line and the input ends inside it, expected a closing " on this line`,
		},
		{
			name:     "jsonl null score",
			input:    "{\"score\": 0.1, \"label\": 1}\n{\"score\": null, \"label\": 1}\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:2: column "score": invalid score "", expected a number, found an empty cell`,
		},
		{
			name:     "jsonl boolean score",
			input:    "{\"score\": true, \"label\": 1}\n",
			sentinel: scores.ErrBadScore,
			message:  `f.csv:1: column "score": invalid score "true", expected a finite number`,
		},
		{
			name:     "jsonl key missing",
			input:    "{\"score\": 0.1, \"label\": 1}\n\n{\"score\": 0.2}\n",
			sentinel: scores.ErrMissingColumn,
			message:  `f.csv:3: column "label": column not found: key missing from this object`,
		},
		{
			name:     "jsonl unknown label",
			input:    "{\"score\": 0.1, \"label\": \"maybe\"}\n",
			sentinel: scores.ErrBadLabel,
			message:  `f.csv:1: column "label": unrecognised label "maybe", expected 1/true/yes/positive or 0/false/no/negative`,
		},
		{
			name:     "jsonl array value",
			input:    "{\"score\": 0.1, \"label\": [1]}\n",
			sentinel: scores.ErrBadJSON,
			message:  `f.csv:1: malformed JSON: key "label": expected a string, number, boolean or null`,
		},
		{
			name:     "jsonl object cut short",
			input:    "{\"score\": 0.1, \"label\": 1}\n{\"score\": 0.2, \n",
			sentinel: scores.ErrBadJSON,
			message:  `f.csv:2: malformed JSON: EOF`,
		},
		{
			name:     "jsonl forced on csv",
			input:    "score,label\n0.1,1\n",
			opt:      scores.Options{Input: scores.InputJSONL},
			sentinel: scores.ErrBadJSON,
			message:  `f.csv:1: malformed JSON: invalid character 's' looking for beginning of value`,
		},
		{
			name:    "unknown input format",
			input:   "score,label\n0.1,1\n",
			opt:     scores.Options{Input: "xml"},
			message: `f.csv: unknown input format "xml", expected csv or jsonl`,
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			set, err := scores.Read(strings.NewReader(tc.input), "f.csv", tc.opt)
			if err == nil {
				t.Fatalf("got a set of %d rows, want error %s", set.Len(), tc.message)
			}
			var pe *scores.ParseError
			if !errors.As(err, &pe) {
				t.Errorf("error %T is not a *ParseError", err)
			}
			if got := err.Error(); got != tc.message {
				t.Errorf("message\n got %s\nwant %s", got, tc.message)
			}
			if strings.Contains(err.Error(), "\n") {
				t.Errorf("message spans lines: %q", err.Error())
			}
			if tc.sentinel != nil && !errors.Is(err, tc.sentinel) {
				t.Errorf("errors.Is(err, %v) = false", tc.sentinel)
			}
		})
	}
}

// TestReadGzipBroken checks truncated and corrupted gzip streams of a
// table whose rows are all valid, so that only the compression can fail.
func TestReadGzipBroken(t *testing.T) {
	var text strings.Builder
	text.WriteString("score,label\n")
	for i := range 2000 {
		// Distinct rows compress poorly, so a cut stream stops mid-table.
		text.WriteString(strings.Repeat("0", i%7) + "0." + strings.Repeat("7", 1+i%13) + ",1\n")
	}
	whole := gzipped(t, text.String())
	// A stream cut at a flush point decompresses to whole lines, so only
	// the missing end of the stream says that rows are lost.
	var flushed bytes.Buffer
	zw := gzip.NewWriter(&flushed)
	zw.Write([]byte(text.String()[:strings.Index(text.String(), "\n")+1] + "0.5,1\n0.25,0\n"))
	zw.Flush()
	atLineEnd := slices.Clone(flushed.Bytes())
	corruptTail := slices.Clone(whole)
	corruptTail[len(corruptTail)-5] ^= 0xff // the stored CRC-32 no longer matches
	cases := []struct {
		name string
		data []byte
	}{
		{"header only", whole[:10]},
		{"cut in the middle", whole[:len(whole)/2]},
		{"cut before the trailer", whole[:len(whole)-4]},
		{"checksum mismatch", corruptTail},
		{"cut at a line end", atLineEnd},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := scores.Read(bytes.NewReader(tc.data), "f.csv.gz", scores.Options{})
			if !errors.Is(err, scores.ErrCorruptGzip) {
				t.Fatalf("got %v, want ErrCorruptGzip", err)
			}
			// Load, the block reader used for files, must agree.
			if _, loadErr := scores.Load(bytes.NewReader(tc.data), "f.csv.gz", scores.Options{}); loadErr == nil || loadErr.Error() != err.Error() {
				t.Errorf("Load: %v, want %v", loadErr, err)
			}
			var pe *scores.ParseError
			if !errors.As(err, &pe) || pe.File != "f.csv.gz" {
				t.Errorf("error %v is not a *ParseError naming f.csv.gz", err)
			}
			if !strings.HasPrefix(err.Error(), "f.csv.gz") || !strings.Contains(err.Error(), "corrupt gzip data") {
				t.Errorf("message %q should name the file and say the gzip data is corrupt", err)
			}
		})
	}
	if _, err := scores.Read(bytes.NewReader(whole), "f.csv.gz", scores.Options{}); err != nil {
		t.Fatalf("the whole stream: %v", err)
	}
}

// TestReadDropInvalid checks that --drop-invalid skips rows with a bad
// score, counts them and keeps the first reasons; other errors still fail.
func TestReadDropInvalid(t *testing.T) {
	in := "score,label\n0.9,1\nabc,0\nNaN,1\n0.3,0\n,1\nInf,0\n-Inf,0\n0.5,1\n"
	set, err := scores.Read(strings.NewReader(in), "f.csv", scores.Options{DropInvalid: true})
	if err != nil {
		t.Fatal(err)
	}
	// Rows kept by hand: 0.9, 0.3, 0.5 (lines 2, 5, 9); dropped: lines
	// 3, 4, 6, 7, 8.
	if set.Len() != 3 || set.Dropped() != 5 {
		t.Errorf("kept %d, dropped %d; want 3 and 5", set.Len(), set.Dropped())
	}
	if want := []float64{0.9, 0.5, 0.3}; !slices.Equal(set.Scores(), want) {
		t.Errorf("scores %v, want %v", set.Scores(), want)
	}
	wantReasons := []string{
		`f.csv:3: column "score": invalid score "abc", expected a finite number`,
		`f.csv:4: column "score": invalid score "NaN", expected a finite number`,
		`f.csv:6: column "score": invalid score "", expected a number, found an empty cell`,
		`f.csv:7: column "score": invalid score "Inf", expected a finite number`,
		`f.csv:8: column "score": invalid score "-Inf", expected a finite number`,
	}
	if !slices.Equal(set.DroppedReasons(), wantReasons) {
		t.Errorf("reasons\n got %q\nwant %q", set.DroppedReasons(), wantReasons)
	}

	// Every row dropped is not an error: the set is empty and says so.
	set, err = scores.Read(strings.NewReader("score,label\nx,1\ny,0\n"), "f.csv", scores.Options{DropInvalid: true})
	if err != nil {
		t.Fatal(err)
	}
	if set.Len() != 0 || set.Dropped() != 2 {
		t.Errorf("all bad: kept %d, dropped %d; want 0 and 2", set.Len(), set.Dropped())
	}

	// A bad label is not a bad score: it still fails.
	_, err = scores.Read(strings.NewReader("score,label\n0.1,maybe\n"), "f.csv", scores.Options{DropInvalid: true})
	if !errors.Is(err, scores.ErrBadLabel) {
		t.Errorf("bad label with DropInvalid: got %v, want ErrBadLabel", err)
	}
}

// TestReadLabels checks the default label words, case-insensitively, the
// numeric spellings 1.0 and 0.0, and --positive.
func TestReadLabels(t *testing.T) {
	words := []struct {
		text     string
		positive bool
	}{
		{"1", true}, {"true", true}, {"TRUE", true}, {"yes", true}, {"Y", true}, {"t", true},
		{"positive", true}, {"Pos", true}, {"1.0", true}, {" yes ", true},
		{"0", false}, {"false", false}, {"No", false}, {"n", false}, {"F", false},
		{"negative", false}, {"NEG", false}, {"0.0", false}, {"-0", false},
	}
	for _, w := range words {
		set, err := scores.Read(strings.NewReader("score,label\n0.5,"+w.text+"\n"), "f.csv", scores.Options{})
		if err != nil {
			t.Errorf("label %q: %v", w.text, err)
			continue
		}
		if set.Labels()[0] != w.positive {
			t.Errorf("label %q read as %v, want %v", w.text, set.Labels()[0], w.positive)
		}
	}

	// --positive fault: only "fault" is positive, every other value
	// (including "1" and "yes") is negative and nothing is an error.
	in := "score,label\n0.1,fault\n0.2,ok\n0.3,1\n0.4,yes\n0.5,Fault\n"
	set, err := scores.Read(strings.NewReader(in), "f.csv", scores.Options{Positive: "fault"})
	if err != nil {
		t.Fatal(err)
	}
	// Ranked riskiest first: 0.5 Fault, 0.4 yes, 0.3 1, 0.2 ok, 0.1 fault.
	if want := []bool{false, false, false, false, true}; !slices.Equal(set.Labels(), want) {
		t.Errorf("labels with --positive fault: %v, want %v", set.Labels(), want)
	}
}

// TestReadFormats checks that every accepted form of one small table reads
// to the same ranked set: BOM and CRLF, TSV, semicolons, pipes, a forced
// delimiter, JSON Lines (detected and forced; numbers, strings, booleans),
// and gzip recognised by its magic bytes whatever the file is called.
func TestReadFormats(t *testing.T) {
	// The table: scores 0.2 (false), 0.9 (true), 0.4 (true); ranked
	// riskiest first that is 0.9 true, 0.4 true, 0.2 false.
	wantScores := []float64{0.9, 0.4, 0.2}
	wantLabels := []bool{true, true, false}
	csvText := "score,label\n0.2,0\n0.9,1\n0.4,1\n"
	cases := []struct {
		name   string
		source string
		data   []byte
		opt    scores.Options
	}{
		{"csv", "f.csv", []byte(csvText), scores.Options{}},
		{"bom and crlf", "f.csv", []byte("\ufeffscore,label\r\n0.2,0\r\n0.9,1\r\n0.4,1\r\n"), scores.Options{}},
		{"no final newline", "f.csv", []byte("score,label\n0.2,0\n0.9,1\n0.4,1"), scores.Options{}},
		{"spaces around cells", "f.csv", []byte(" score , label \n 0.2 , 0 \n0.9,1\n0.4 ,1\n"), scores.Options{}},
		{"tsv", "f.tsv", []byte("score\tlabel\n0.2\t0\n0.9\t1\n0.4\t1\n"), scores.Options{}},
		{"tsv after blank lines", "f.tsv", []byte("\r\n\nscore\tlabel\n0.2\t0\n0.9\t1\n0.4\t1\n"), scores.Options{}},
		{"semicolon", "f.csv", []byte("score;label\n0.2;0\n0.9;1\n0.4;1\n"), scores.Options{}},
		{"pipe", "f.txt", []byte("score|label\n0.2|0\n0.9|1\n0.4|1\n"), scores.Options{}},
		// The header holds two commas inside one name and one semicolon,
		// so detection alone would pick ','; forcing ';' reads it right.
		{"forced delimiter", "f.csv", []byte("score;label;note,a,b\n0.2;0;x\n0.9;1;y\n0.4;1;z\n"), scores.Options{Delimiter: ';'}},
		{"quoted cells", "f.csv", []byte("\"score\",\"label\"\n\"0.2\",\"0\"\n\"0.9\",\"1\"\n\"0.4\",\"1\"\n"), scores.Options{}},
		{"jsonl numbers", "f.jsonl", []byte("{\"score\": 0.2, \"label\": 0}\n{\"score\": 0.9, \"label\": 1}\n{\"score\": 0.4, \"label\": 1}\n"), scores.Options{}},
		{"jsonl strings and booleans", "f.json", []byte("{\"label\": false, \"score\": \"0.2\"}\n{\"label\": \"yes\", \"score\": \"0.9\"}\n{\"label\": true, \"score\": 4e-1}\n"), scores.Options{}},
		{"jsonl leading blank lines and crlf", "f", []byte("\r\n  \r\n{\"score\": 0.2, \"label\": 0}\r\n\r\n{\"score\": 0.9, \"label\": 1}\r\n{\"score\": 0.4, \"label\": 1}"), scores.Options{}},
		{"jsonl extra keys and null", "f", []byte("{\"score\": 0.2, \"label\": 0, \"note\": null}\n{\"score\": 0.9, \"label\": 1, \"note\": \"x\"}\n{\"score\": 0.4, \"label\": 1}\n"), scores.Options{}},
		{"jsonl forced", "f.csv", []byte("{\"score\": 0.2, \"label\": 0}\n{\"score\": 0.9, \"label\": 1}\n{\"score\": 0.4, \"label\": 1}\n"), scores.Options{Input: scores.InputJSONL}},
		{"jsonl with bom", "f", []byte("\ufeff{\"score\": 0.2, \"label\": 0}\n{\"score\": 0.9, \"label\": 1}\n{\"score\": 0.4, \"label\": 1}\n"), scores.Options{}},
		{"gzip named .csv", "f.csv", gzipped(t, csvText), scores.Options{}},
		{"gzip with no extension", "scores", gzipped(t, csvText), scores.Options{}},
		{"gzip of bom and tsv", "f.tsv.gz", gzipped(t, "\ufeffscore\tlabel\r\n0.2\t0\r\n0.9\t1\r\n0.4\t1\r\n"), scores.Options{}},
		{"gzip of jsonl", "f.jsonl.gz", gzipped(t, "{\"score\": 0.2, \"label\": 0}\n{\"score\": 0.9, \"label\": 1}\n{\"score\": 0.4, \"label\": 1}\n"), scores.Options{}},
		{"plain text named .gz", "f.csv.gz", []byte(csvText), scores.Options{}},
		{"forced csv", "f", []byte(csvText), scores.Options{Input: scores.InputCSV}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			set, err := scores.Read(bytes.NewReader(tc.data), tc.source, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(set.Scores(), wantScores) || !slices.Equal(set.Labels(), wantLabels) {
				t.Errorf("got scores %v labels %v, want %v %v", set.Scores(), set.Labels(), wantScores, wantLabels)
			}
			if set.ScoreColumn() != "score" || set.LabelColumn() != "label" {
				t.Errorf("columns %q and %q, want score and label", set.ScoreColumn(), set.LabelColumn())
			}
			if set.Source() != tc.source {
				t.Errorf("source %q, want %q", set.Source(), tc.source)
			}
		})
	}
}

// TestReadDefaultColumns checks the default column names: the first
// present of the list wins, matched case-insensitively.
func TestReadDefaultColumns(t *testing.T) {
	cases := []struct {
		header, score, label string
	}{
		{"p,y", "p", "y"},
		{"prediction,pred,actual,outcome", "pred", "outcome"}, // pred comes before prediction in the list
		{"Probability,Target", "Probability", "Target"},
		{"prob,score,label", "score", "label"}, // score comes first in the list
	}
	for _, tc := range cases {
		n := strings.Count(tc.header, ",") + 1
		row := strings.TrimSuffix(strings.Repeat("1,", n), ",")
		set, err := scores.Read(strings.NewReader(tc.header+"\n"+row+"\n"), "f.csv", scores.Options{})
		if err != nil {
			t.Errorf("%s: %v", tc.header, err)
			continue
		}
		if set.ScoreColumn() != tc.score || set.LabelColumn() != tc.label {
			t.Errorf("%s: columns %q, %q; want %q, %q", tc.header, set.ScoreColumn(), set.LabelColumn(), tc.score, tc.label)
		}
	}
}

// TestReadSHA256 checks that the digest covers the bytes read: the file
// as stored, so the compressed bytes for gzip, and the BOM included.
func TestReadSHA256(t *testing.T) {
	plain := []byte("\ufeffscore,label\r\n0.2,0\r\n0.9,1\r\n")
	packed := gzipped(t, string(plain))
	for _, data := range [][]byte{plain, packed} {
		set, err := scores.Read(bytes.NewReader(data), "f", scores.Options{})
		if err != nil {
			t.Fatal(err)
		}
		sum := sha256.Sum256(data)
		if want := hex.EncodeToString(sum[:]); set.SHA256() != want {
			t.Errorf("digest %s, want %s (sha256 of the %d bytes given)", set.SHA256(), want, len(data))
		}
	}
	// Reference: sha256 of "score,label\n1,1\n" computed with coreutils
	// sha256sum 9.x on this machine (printf 'score,label\n1,1\n' | sha256sum).
	set, err := scores.Read(strings.NewReader("score,label\n1,1\n"), "f", scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if want := sha256sumOfSmallTable; set.SHA256() != want {
		t.Errorf("digest %s, want %s", set.SHA256(), want)
	}
}

// TestReadColumnsCarried checks that weights, segments and ids are ranked
// with their rows, ties keeping the order read.
func TestReadColumnsCarried(t *testing.T) {
	in := "id,score,label,w,yard\n" +
		"a,0.2,0,1,north\n" +
		"b,0.9,1,2,south\n" +
		"c,0.5,0,0,north\n" +
		"d,0.9,0,0.5,quay\n" +
		"e,0.2,1,3,south\n"
	opt := scores.Options{WeightColumn: "w", SegmentColumn: "yard", IDColumn: "id"}
	set, err := scores.Read(strings.NewReader(in), "f.csv", opt)
	if err != nil {
		t.Fatal(err)
	}
	// By hand, riskiest first with ties in read order: b, d (0.9), c (0.5),
	// a, e (0.2). Segment codes follow first appearance: north 0, south 1,
	// quay 2.
	checks := []struct {
		what      string
		got, want any
	}{
		{"ids", set.IDs(), []string{"b", "d", "c", "a", "e"}},
		{"scores", set.Scores(), []float64{0.9, 0.9, 0.5, 0.2, 0.2}},
		{"labels", set.Labels(), []bool{true, false, false, false, true}},
		{"weights", set.Weights(), []float64{2, 0.5, 0, 1, 3}},
		{"segment names", set.SegmentNames(), []string{"north", "south", "quay"}},
		{"segment codes", set.SegmentOf(), []int32{1, 2, 0, 0, 1}},
	}
	for _, c := range checks {
		if !equalAny(c.got, c.want) {
			t.Errorf("%s: got %v, want %v", c.what, c.got, c.want)
		}
	}
	if set.Segment(1) != "quay" || set.ID(4) != "e" || set.Weight(2) != 0 {
		t.Errorf("accessors: Segment(1)=%q ID(4)=%q Weight(2)=%v", set.Segment(1), set.ID(4), set.Weight(2))
	}
	if !set.Weighted() || set.WeightColumn() != "w" || set.SegmentColumn() != "yard" || set.IDColumn() != "id" {
		t.Errorf("column names %q %q %q, weighted %v", set.WeightColumn(), set.SegmentColumn(), set.IDColumn(), set.Weighted())
	}
	// Totals by hand: positives b 2 + e 3 = 5; negatives d 0.5 + c 0 + a 1 = 1.5.
	if p, n := set.Totals(); p != 5 || n != 1.5 {
		t.Errorf("totals %v, %v; want 5, 1.5", p, n)
	}

	// The same table lower-is-riskier: a, e (0.2), c, b, d.
	opt.LowerIsRiskier = true
	set, err = scores.Read(strings.NewReader(in), "f.csv", opt)
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"a", "e", "c", "b", "d"}; !slices.Equal(set.IDs(), want) {
		t.Errorf("lower is riskier: ids %v, want %v", set.IDs(), want)
	}
	if !set.LowerIsRiskier() {
		t.Error("LowerIsRiskier not carried to the set")
	}

	// Without the optional columns their slices are nil and the accessors
	// give the defaults.
	set, err = scores.Read(strings.NewReader(in), "f.csv", scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if set.Weights() != nil || set.IDs() != nil || set.SegmentOf() != nil || set.Weighted() || set.Weight(0) != 1 || set.ID(0) != "" || set.Segment(0) != "" {
		t.Errorf("unasked columns should be nil: weights %v ids %v segments %v", set.Weights(), set.IDs(), set.SegmentOf())
	}
}

// TestReadSignedZero checks that -0 and +0 are one score: read as +0 and
// tied, in the order read.
func TestReadSignedZero(t *testing.T) {
	in := "id,score,label\na,-0,1\nb,0,0\nc,-0.0,1\nd,-1.5,0\ne,2,1\n"
	set, err := scores.Read(strings.NewReader(in), "f.csv", scores.Options{IDColumn: "id"})
	if err != nil {
		t.Fatal(err)
	}
	// By hand: e (2), then a, b, c tied at zero in read order, then d.
	if want := []string{"e", "a", "b", "c", "d"}; !slices.Equal(set.IDs(), want) {
		t.Errorf("ids %v, want %v", set.IDs(), want)
	}
	for i, s := range set.Scores() {
		if s == 0 && math.Signbit(s) {
			t.Errorf("row %d kept the score -0; want +0", i)
		}
	}
}

// sha256sumOfSmallTable is the digest of the bytes "score,label\n1,1\n".
const sha256sumOfSmallTable = "b2b0810a9813ca21109e29e74f8af6636c95651d7738cc8cf1b61281d090eed7"

// equalAny compares two slices of the same comparable element type.
func equalAny(a, b any) bool {
	switch a := a.(type) {
	case []string:
		return slices.Equal(a, b.([]string))
	case []float64:
		return slices.Equal(a, b.([]float64))
	case []bool:
		return slices.Equal(a, b.([]bool))
	case []int32:
		return slices.Equal(a, b.([]int32))
	}
	panic("equalAny: unsupported type")
}

// TestReadProgress checks that Progress hears the final number of rows.
func TestReadProgress(t *testing.T) {
	var seen []int
	set, err := scores.Read(strings.NewReader("score,label\n0.1,1\n0.2,0\nx,1\n"), "f.csv", scores.Options{DropInvalid: true, Progress: func(rows int) { seen = append(seen, rows) }})
	if err != nil {
		t.Fatal(err)
	}
	if len(seen) == 0 || seen[len(seen)-1] != set.Len() || set.Len() != 2 {
		t.Errorf("progress %v for %d rows, want it to end at 2", seen, set.Len())
	}
}
