package scores

import (
	"bytes"
	"errors"
	"strings"
	"testing"
)

// readBoth reads input with Read and Load and fails the test when they
// differ in result or message; it returns Read's.
func readBoth(t *testing.T, input string, opt Options) (*Set, error) {
	t.Helper()
	set, err := Read(strings.NewReader(input), "t", opt)
	loaded, loadErr := Load(bytes.NewReader([]byte(input)), "t", opt)
	if (err == nil) != (loadErr == nil) || (err != nil && err.Error() != loadErr.Error()) {
		t.Fatalf("%q: Read error %v, Load error %v", input, err, loadErr)
	}
	if err == nil && (set.Len() != loaded.Len() || !slicesEqual(set.scores, loaded.scores)) {
		t.Fatalf("%q: Read and Load differ", input)
	}
	return set, err
}

func slicesEqual(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestDecimalNotationOnly: numbers are read as CSV practice writes them
// (sign, digits, point, exponent); Go's hexadecimal floats and digits
// separated by underscores, which strconv.ParseFloat takes, are refused in
// scores, weights, labels and counts. The words inf and nan read as before:
// numbers that are not finite, refused. Common practice, no source.
func TestDecimalNotationOnly(t *testing.T) {
	for _, text := range []string{"0.25", "+0.25", "-3", ".5", "5.", "1.5e-3", "2E+2", "007"} {
		if _, err := readBoth(t, "score,label\n"+text+",1\n0.1,0\n", Options{}); err != nil {
			t.Errorf("score %q: %v", text, err)
		}
	}
	const goHint = "expected a number in decimal notation such as 0.25 or 1.5e-3 (hexadecimal and digits separated by _ are not read)"
	cases := []struct{ input, want string }{
		{"score,label\n0x1p-2,1\n", `t:2: column "score": invalid score "0x1p-2", ` + goHint},
		{"score,label\n1_000,1\n", `t:2: column "score": invalid score "1_000", ` + goHint},
		{"score,label\n0X1P2,1\n", `t:2: column "score": invalid score "0X1P2", ` + goHint},
		{"score,label\n0.5,0x1p0\n", `t:2: column "label": unrecognised label "0x1p0", expected 1/true/yes/positive or 0/false/no/negative`},
		{"score,label,w\n0.5,1,1_0\n", `t:2: column "w": invalid weight "1_0", ` + goHint},
		{"score,label\ninf,1\n", `t:2: column "score": invalid score "inf", expected a finite number`},
		{"score,label\n-Infinity,1\n", `t:2: column "score": invalid score "-Infinity", expected a finite number`},
		{"score,label\nnan,1\n", `t:2: column "score": invalid score "nan", expected a finite number`},
		{"score,label\n1e400,1\n", `t:2: column "score": invalid score "1e400", expected a finite number`},
		{"score,label\n1e,1\n", `t:2: column "score": invalid score "1e", expected a finite number`},
		{`{"score":"0x1p-2","label":1}` + "\n", `t:1: column "score": invalid score "0x1p-2", ` + goHint},
	}
	for _, tc := range cases {
		opt := Options{}
		if strings.Contains(tc.input, ",w\n") {
			opt.WeightColumn = "w"
		}
		if _, err := readBoth(t, tc.input, opt); err == nil || err.Error() != tc.want {
			t.Errorf("%q: error %v\nwant %s", tc.input, err, tc.want)
		}
	}
	if _, err := ReadCounts(strings.NewReader("score,positives,negatives\n0.5,1_000,2\n"), "t", Options{}); err == nil || !strings.Contains(err.Error(), `invalid count "1_000"`) {
		t.Errorf("count 1_000: %v", err)
	}
}

// TestDuplicateColumnNames: a header or a JSON object that gives one name
// twice is refused, naming both places; once CSV read the first and JSON
// Lines the last. Unnamed columns may repeat.
func TestDuplicateColumnNames(t *testing.T) {
	cases := []struct{ input, want string }{
		{"score,label,score\n0.1,1,0.9\n", `t:1: column "score": duplicate column name: the name of columns 1 and 3, expected each name once`},
		{"id,label,w,label,score\na,1,1,0,0.5\n", `t:1: column "label": duplicate column name: the name of columns 2 and 4, expected each name once`},
		{`{"score":0.1,"label":1,"score":0.9}` + "\n", `t:1: malformed JSON: duplicate column name: key "score" is both key 1 and key 3 of the object, expected each key once`},
		{`{"score":0.1,"label":1}` + "\n" + `{"label":0,"score":0.2,"label":1}` + "\n", `t:2: malformed JSON: duplicate column name: key "label" is both key 1 and key 3 of the object, expected each key once`},
	}
	for _, tc := range cases {
		if _, err := readBoth(t, tc.input, Options{}); err == nil || err.Error() != tc.want {
			t.Errorf("%q: error %v\nwant %s", tc.input, err, tc.want)
		}
	}
	_, err := readBoth(t, "score,label,score\n0.1,1,0.9\n", Options{})
	if !errors.Is(err, ErrDuplicateColumn) {
		t.Errorf("error %v does not wrap ErrDuplicateColumn", err)
	}
	if _, err := ReadCounts(strings.NewReader("score,positives,negatives,score\n0.5,1,2,0.5\n"), "t", Options{}); err == nil || !errors.Is(err, ErrDuplicateColumn) {
		t.Errorf("counts: %v", err)
	}
	if _, err := readBoth(t, ",score,,label\n1,0.5,x,1\n", Options{}); err != nil {
		t.Errorf("unnamed columns: %v", err)
	}
}

// TestQuoteErrors: a quoted field that never closes is reported at the
// line where it opens, not where the input ends; a closing quote followed
// by other text at its own line and column.
func TestQuoteErrors(t *testing.T) {
	cases := []struct{ input, want string }{
		{"score,label\n0.1,1\n\"0.2,1\n0.3,0\n0.4,1\n",
			`t:3: quoted field not closed: a quoted field opens on this line and the input ends inside it at line 5, expected a closing " on this line`},
		{"score,label\n0.3,0\n\"0.1,1",
			`t:3: quoted field not closed: a quoted field opens on this line and the input ends inside it, expected a closing " on this line`},
		{"score,label\n\"0.1\"x,1\n0.3,0\n",
			`t:2: quoted field not closed: a " at column 5 is followed by other text, expected a closing " followed by a delimiter or the end of the line (a quote inside a quoted field is written "")`},
		{"score,label\n0.1,\"a\nb\"c\n0.3,0\n",
			`t:2: quoted field not closed: a quoted field opens on this line and runs on to line 3, where a " is followed by other text, expected a closing " on this line followed by a delimiter or the end of the line`},
		{"\"score,label\n0.1,1\n",
			`t:1: quoted field not closed: a quoted field opens on this line and the input ends inside it at line 2, expected a closing " on this line`},
	}
	for _, tc := range cases {
		_, err := readBoth(t, tc.input, Options{})
		if err == nil || err.Error() != tc.want {
			t.Errorf("%q: error %v\nwant %s", tc.input, err, tc.want)
		}
		if err != nil && !errors.Is(err, ErrQuote) {
			t.Errorf("%q: error %v does not wrap ErrQuote", tc.input, err)
		}
	}
}

// TestWeightTotals: weights whose sum overflows, passes MaxWeightTotal or
// swallows the smallest weight, and counts whose sum passes 2^53, are
// refused naming the weight column; once weights of 1e308 read and every
// figure came out infinite or undefined. By both readers, by New and by
// NewCounts. Common practice, no source: float64 holds 2^53 exactly and
// about 16 significant digits.
func TestWeightTotals(t *testing.T) {
	cases := []struct{ input, want string }{
		{"score,label,w\n0.9,1,1e308\n0.8,0,1e308\n",
			`t: column "w": sum out of range: the weights add up to more than float64 holds (about 1.8e308), expected at most 1e+150 so that the figures stay finite`},
		{"score,label,w\n0.9,1,1e150\n0.8,0,1e150\n",
			`t: column "w": sum out of range: the weights add up to 2e+150, expected at most 1e+150 so that the figures stay finite`},
		{"score,label,w\n0.9,1,1e20\n0.8,0,1\n",
			`t: column "w": sum out of range: the weights add up to 1e+20, beside which the smallest, 1, adds nothing (float64 keeps about 16 digits), expected a total below 2^53 times the smallest weight`},
	}
	for _, tc := range cases {
		_, err := readBoth(t, tc.input, Options{WeightColumn: "w"})
		if err == nil || err.Error() != tc.want || !errors.Is(err, ErrWeightTotal) {
			t.Errorf("%q: error %v\nwant %s", tc.input, err, tc.want)
		}
	}
	// At the edges: a total of 1e150 and a ratio just under 2^53 read.
	for _, input := range []string{"score,label,w\n0.9,1,5e149\n0.8,0,5e149\n", "score,label,w\n0.9,1,4503599627370495\n0.8,0,1\n"} {
		if _, err := readBoth(t, input, Options{WeightColumn: "w"}); err != nil {
			t.Errorf("%q: %v", input, err)
		}
	}
	_, err := ReadCounts(strings.NewReader("score,positives,negatives\n0.9,9007199254740992,0\n0.1,1,1\n"), "t", Options{})
	if want := "t: sum out of range: the counts add up to 9007199254740992 cases or more, expected fewer than 9007199254740992, which float64 counts exactly"; err == nil || err.Error() != want {
		t.Errorf("counts: %v\nwant %s", err, want)
	}
	if _, err := New([]float64{0.9, 0.8}, []bool{true, false}, []float64{1e308, 1e308}, false); !errors.Is(err, ErrWeightTotal) {
		t.Errorf("New: %v", err)
	}
	if _, err := NewCounts([]float64{0.9, 0.8}, []bool{true, false}, []float64{1 << 52, 1 << 52}, false); !errors.Is(err, ErrWeightTotal) {
		t.Errorf("NewCounts: %v", err)
	}
}
