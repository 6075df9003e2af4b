package scores_test

import (
	"bytes"
	"errors"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/sill-tool/sill/internal/scores"
)

// utf16Bytes writes text as UTF-16 with a byte-order mark, as a
// spreadsheet's "Unicode text" export does (little-endian there).
func utf16Bytes(text string, bigEndian bool) []byte {
	var out []byte
	if bigEndian {
		out = []byte{0xfe, 0xff}
	} else {
		out = []byte{0xff, 0xfe}
	}
	for _, u := range utf16.Encode([]rune(text)) {
		if bigEndian {
			out = append(out, byte(u>>8), byte(u))
		} else {
			out = append(out, byte(u), byte(u>>8))
		}
	}
	return out
}

// TestUTF16 reads tab-separated UTF-16 text in both byte orders, a
// segment name outside ASCII included, and refuses UTF-16 without a
// byte-order mark and text cut within a code unit. Expected values by
// hand from the rows written.
func TestUTF16(t *testing.T) {
	text := "crate\tscore\tlabel\tdepot\r\nV-17\t0.75\t1\tVeldmoor Süd\r\nV-18\t0.25\t0\tVeldmoor Nord\r\n"
	for _, bigEndian := range []bool{false, true} {
		data := utf16Bytes(text, bigEndian)
		for name, load := range loaders {
			set, err := load(data, "u.txt", scores.Options{SegmentColumn: "depot"})
			if err != nil {
				t.Fatalf("%s big-endian %v: %v", name, bigEndian, err)
			}
			if set.Len() != 2 || set.Scores()[0] != 0.75 || !set.Labels()[0] || set.SegmentNames()[set.SegmentOf()[0]] != "Veldmoor Süd" {
				t.Errorf("%s big-endian %v: scores %v labels %v segments %q", name, bigEndian, set.Scores(), set.Labels(), set.SegmentNames())
			}
		}
	}
	bad := []struct {
		name string
		data []byte
		want string
	}{
		{"no byte-order mark", utf16Bytes(text, false)[2:], "u.txt: text encoding not read: UTF-16 without a byte-order mark, expected UTF-8, or UTF-16 that begins with its byte-order mark as spreadsheets write it"},
		{"odd byte count", append(utf16Bytes(text, false), 'x'), "u.txt:4: text encoding not read: the text ends within a UTF-16 code unit (an odd number of bytes), expected two bytes per unit"},
		{"lone surrogate", append(utf16Bytes("score\tlabel\n0.5\t1\n", false), 0x00, 0xdc, '\n', 0), "u.txt:3: text encoding not read: a lone UTF-16 surrogate, expected a pair"},
	}
	for _, c := range bad {
		for name, load := range loaders {
			_, err := load(c.data, "u.txt", scores.Options{})
			if err == nil || err.Error() != c.want || !errors.Is(err, scores.ErrEncoding) {
				t.Errorf("%s, %s: error %v, want %q", c.name, name, err, c.want)
			}
		}
	}
}

// loaders are the two readers of delimited text, which must agree.
var loaders = map[string]func(data []byte, source string, opt scores.Options) (*scores.Set, error){
	"Read": func(data []byte, source string, opt scores.Options) (*scores.Set, error) {
		return scores.Read(bytes.NewReader(data), source, opt)
	},
	"Load": func(data []byte, source string, opt scores.Options) (*scores.Set, error) {
		return scores.Load(bytes.NewReader(data), source, opt)
	},
}

// TestDecimalComma reads the usual European export (semicolons, decimal
// commas) and checks the values, worked out by hand from the cells: the
// weight 2,5 counts as 2.5 cases.
func TestDecimalComma(t *testing.T) {
	in := "crate;score;label;weight\n" +
		"V-1;0,107681;0;2,5\n" +
		"V-2;0,9;1;1\n" +
		"V-3;-1,5e-1;0;0\n"
	for name, load := range loaders {
		set, err := load([]byte(in), "eu.csv", scores.Options{WeightColumn: "weight"})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if want := []float64{0.9, 0.107681, -0.15}; !equalFloats(set.Scores(), want) {
			t.Errorf("%s: scores %v, want %v", name, set.Scores(), want)
		}
		if want := []float64{1, 2.5, 0}; !equalFloats(set.Weights(), want) {
			t.Errorf("%s: weights %v, want %v", name, set.Weights(), want)
		}
	}
	// Without semicolons a decimal comma is not guessed; the error says
	// what it is, and cmd adds the flag.
	_, err := scores.Read(strings.NewReader("score\tlabel\n0,5\t1\n"), "t.tsv", scores.Options{})
	if !errors.Is(err, scores.ErrDecimalComma) || !errors.Is(err, scores.ErrBadScore) {
		t.Errorf("tab-separated decimal comma: %v, want ErrDecimalComma and ErrBadScore", err)
	}
}

func equalFloats(a, b []float64) bool {
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
