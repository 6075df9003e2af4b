package scores

import (
	"bytes"
	"cmp"
	"compress/gzip"
	"errors"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// TestPlainFloatMatchesStrconv checks the hand-written number reader
// against strconv.ParseFloat, the reference, on seeded random plain
// numbers and on forms it must leave to strconv.
func TestPlainFloatMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	check := func(text string) {
		t.Helper()
		got, ok := plainFloat([]byte(text), '.')
		want, err := strconv.ParseFloat(text, 64)
		if !ok {
			return // left to strconv; nothing to compare
		}
		if err != nil || math.Float64bits(got) != math.Float64bits(want) {
			t.Fatalf("plainFloat(%q) = %v, strconv gives %v (%v)", text, got, want, err)
		}
	}
	for range 200000 {
		digits := 1 + rng.IntN(16)
		var sb strings.Builder
		if rng.IntN(5) == 0 {
			sb.WriteByte("+-"[rng.IntN(2)])
		}
		point := rng.IntN(digits + 1)
		for d := range digits {
			if d == point && rng.IntN(2) == 0 {
				sb.WriteByte('.')
			}
			sb.WriteByte(byte('0' + rng.IntN(10)))
		}
		check(sb.String())
		check(strconv.FormatFloat(rng.Float64(), 'f', rng.IntN(10), 64))
	}
	for _, text := range []string{"0", "-0", "+0", "1.", ".5", "-.5", "0.1", "0.123456", "999999999999999", "0.000000000000001", "123456789012345"} {
		check(text)
	}
	for _, text := range []string{"", ".", "-", "+", "1e5", " 1", "1 ", "1.2.3", "inf", "NaN", "0x1p-2", "1_000", "1234567890123456", "--1", "1,5"} {
		if _, ok := plainFloat([]byte(text), '.'); ok {
			t.Errorf("plainFloat(%q) took a form it must leave to strconv", text)
		}
	}
}

// loadBoth reads data with Read, the reference path, and with Load.
func loadBoth(t *testing.T, data []byte, opt Options) (want, got *Set, wantErr, gotErr error) {
	t.Helper()
	want, wantErr = Read(bytes.NewReader(data), "t.csv", opt)
	got, gotErr = Load(bytes.NewReader(data), "t.csv", opt)
	return
}

func sameResult(t *testing.T, name string, data []byte, opt Options) {
	t.Helper()
	want, got, wantErr, gotErr := loadBoth(t, data, opt)
	if (wantErr == nil) != (gotErr == nil) || (wantErr != nil && wantErr.Error() != gotErr.Error()) {
		t.Fatalf("%s: Read error %v, Load error %v\ninput %q", name, wantErr, gotErr, clip(data))
	}
	if wantErr != nil {
		return
	}
	if !reflect.DeepEqual(want, got) {
		t.Fatalf("%s: sets differ\nRead %+v\nLoad %+v\ninput %q", name, brief(want), brief(got), clip(data))
	}
}

func clip(data []byte) []byte {
	if len(data) > 400 {
		return data[:400]
	}
	return data
}

func brief(s *Set) string {
	n := min(len(s.scores), 8)
	return fmt.Sprintf("rows %d scores %v labels %v weights %v dropped %d %q sha %s", len(s.scores), s.scores[:n], s.labels[:n], s.weights[:min(len(s.weights), n)], s.dropped, s.droppedReasons, s.digest[:min(len(s.digest), 8)])
}

// randomTable writes a seeded random table with the oddities that delimited
// files carry: ties, weights, CRLF, a byte-order mark, quoted cells, blank
// and space-only lines, unusual number forms and label words, and, when
// bad is set, an occasional bad row (bad score, label or weight, a ragged
// row, a quote that stays open).
func randomTable(rng *rand.Rand, rows int, weighted, bad bool) []byte {
	var sb strings.Builder
	delim := []string{",", "\t", ";", "|"}[rng.IntN(4)]
	newline := "\n"
	if rng.IntN(3) == 0 {
		newline = "\r\n"
	}
	if rng.IntN(4) == 0 {
		sb.WriteString("\xef\xbb\xbf")
	}
	header := []string{"id_unused", "score", "label"}
	if weighted {
		header = append(header, "weight")
	}
	if rng.IntN(3) == 0 {
		header = append(header, "yard")
	}
	if rng.IntN(4) == 0 {
		header = append(header, "at", "other")
	}
	if rng.IntN(3) == 0 {
		header = []string{"score", "label"}
		if weighted {
			header = append(header, "weight")
		}
	}
	sb.WriteString(strings.Join(header, delim) + newline)
	coarse := rng.IntN(2) == 0
	for r := range rows {
		switch rng.IntN(60) {
		case 0:
			sb.WriteString(newline) // blank line
			continue
		case 1:
			sb.WriteString("   " + newline)
			continue
		}
		var score string
		switch {
		case coarse:
			score = strconv.FormatFloat(float64(rng.IntN(20))/10, 'f', -1, 64)
		default:
			score = strconv.FormatFloat(rng.Float64(), 'f', 6, 64)
		}
		switch rng.IntN(40) {
		case 0:
			score = " " + score + " "
		case 1:
			score = strconv.FormatFloat(rng.Float64(), 'e', 3, 64)
		case 2:
			score = "-0"
		case 3:
			score = strconv.FormatFloat(rng.Float64(), 'g', -1, 64) // up to 17 digits
		case 4:
			score = `"` + score + `"`
		}
		label := []string{"0", "1", "0", "0", "1"}[rng.IntN(5)]
		switch rng.IntN(40) {
		case 0:
			label = "yes"
		case 1:
			label = " 0 "
		case 2:
			label = "1.0"
		case 3:
			label = `"1"`
		}
		cells := []string{}
		for _, h := range header {
			switch h {
			case "id_unused":
				cells = append(cells, fmt.Sprintf("case-%d", r))
				if rng.IntN(30) == 0 {
					cells[len(cells)-1] = `"case, quoted ""` + strconv.Itoa(r) + `"""`
				}
			case "score":
				cells = append(cells, score)
			case "label":
				cells = append(cells, label)
			case "weight":
				cells = append(cells, strconv.Itoa(rng.IntN(4)))
			case "at":
				at := []string{"2026-09-01T06:30:00Z", "2026-09-01T07:30:00+01:00", " 2026-09-02T22:15:30Z ", "2026-09-03T00:00:00Z"}[rng.IntN(4)]
				if bad && rng.IntN(rows) == 0 {
					at = "yesterday"
				}
				cells = append(cells, at)
			case "other":
				other := strconv.FormatFloat(rng.Float64(), 'f', 4, 64)
				if bad && rng.IntN(rows) == 0 {
					other = "n/a"
				}
				cells = append(cells, other)
			case "yard":
				cells = append(cells, []string{"north", "east", " south ", "", `"west, far"`, "north"}[rng.IntN(6)])
			}
		}
		if bad && rng.IntN(rows) == 0 {
			switch rng.IntN(6) {
			case 0:
				cells[len(cells)-2+boolInt(!weighted)-boolInt(weighted)] = "abc"
			case 1:
				cells = cells[:len(cells)-1]
			case 2:
				cells = append(cells, "extra")
			case 3:
				cells[0] = `"open` + newline + `still open"`
			case 4:
				for i, h := range header {
					if h == "label" {
						cells[i] = "maybe"
					}
					if h == "weight" {
						cells[i] = "-2"
					}
				}
			case 5:
				for i, h := range header {
					if h == "score" {
						cells[i] = ""
					}
				}
			}
		}
		sb.WriteString(strings.Join(cells, delim))
		if r < rows-1 || rng.IntN(2) == 0 {
			sb.WriteString(newline)
		}
	}
	return []byte(sb.String())
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// TestLoadMatchesRead checks Load against Read, the reference path, on
// seeded random tables: the same Set to the last bit, or the same error
// message with the same line, with blocks small enough that rows cross
// block edges.
func TestLoadMatchesRead(t *testing.T) {
	defer func(size int) { blockSize = size }(blockSize)
	rng := rand.New(rand.NewPCG(3, 4))
	handled := 0 // trials the block reader took itself rather than leave to Read
	for trial := range 400 {
		blockSize = []int{16, 64, 1000, 1 << 20}[trial%4]
		rows := []int{1, 5, 200, 3000}[rng.IntN(4)]
		weighted := rng.IntN(3) == 0
		bad := rng.IntN(2) == 0
		data := randomTable(rng, rows, weighted, bad)
		opt := Options{LowerIsRiskier: rng.IntN(4) == 0, DropInvalid: rng.IntN(3) == 0}
		if weighted {
			opt.WeightColumn = "weight"
		}
		if rng.IntN(6) == 0 {
			opt.Positive = "1"
		}
		if strings.Contains(string(data[:min(len(data), 60)]), "yard") {
			opt.SegmentColumn = "yard"
		}
		if strings.Contains(string(data[:min(len(data), 60)]), "id_unused") && rng.IntN(2) == 0 {
			opt.IDColumn = "id_unused"
		}
		if strings.Contains(string(data[:min(len(data), 80)]), "other") {
			opt.TimeColumn, opt.CompareColumn = "at", "other"
		}
		if header, _, _ := bytes.Cut(data, []byte("\n")); bytes.Contains(header, []byte(";")) && rng.IntN(2) == 0 {
			// The same table with decimal commas, found from the first
			// row or given.
			data = bytes.ReplaceAll(data, []byte("."), []byte(","))
			opt.DecimalComma = rng.IntN(3) == 0
		}
		name := fmt.Sprintf("trial %d (block %d, rows %d)", trial, blockSize, rows)
		sameResult(t, name, data, opt)
		if _, err := loadBlocks(bytes.NewReader(data), nil, "t.csv", opt, int64(len(data))); err != errDecline {
			handled++
		}
		if trial%10 == 0 {
			var z bytes.Buffer
			w := gzip.NewWriter(&z)
			w.Write(data)
			w.Close()
			sameResult(t, name+" gzip", z.Bytes(), opt)
		}
	}
	// The tables are built so that most stay on the block reader; were it
	// to decline them all, the comparison above would test nothing.
	if handled < 200 {
		t.Errorf("the block reader took only %d of 400 tables itself", handled)
	}
	t.Logf("the block reader took %d of 400 tables itself", handled)
}

// TestLoadCases checks Load against Read on hand-picked inputs, each with
// the line the error must name worked out by hand.
func TestLoadCases(t *testing.T) {
	defer func(size int) { blockSize = size }(blockSize)
	cases := []struct {
		name  string
		input string
		opt   Options
		want  string // the error, "" for none; written out by hand
	}{
		{"plain", "score,label\n0.5,1\n0.2,0\n", Options{}, ""},
		{"no newline at the end, CR", "score,label\r\n0.5,1\r\n0.2,0\r", Options{}, ""},
		{"bad score line 3", "score,label\n0.5,1\nx,0\n", Options{}, `t.csv:3: column "score": invalid score "x", expected a finite number`},
		{"bad label after blank lines", "score,label\n\n0.5,1\n\n0.2,maybe\n", Options{}, `t.csv:5: column "label": unrecognised label "maybe", expected 1/true/yes/positive or 0/false/no/negative`},
		{"ragged", "score,label\n0.5,1\n0.2\n", Options{}, `t.csv:3: wrong number of fields: row has 1, header has 2`},
		{"only header", "score,label\n", Options{}, `t.csv: no data rows after the header`},
		{"empty", "", Options{}, `t.csv: empty input, expected a header line`},
		{"json lines", "{\"score\":0.5,\"label\":1}\n", Options{}, ""},
		{"multi-line quoted id", "id,score,label\n\"a\nb\",0.5,1\n", Options{}, ""},
		{"open quote", "score,label\n\"0.5,1\n", Options{}, `t.csv:2: quoted field not closed: a quoted field opens on this line and the input ends inside it, expected a closing " on this line`},
		{"dropped rows", "score,label\n,1\nnan,0\n0.4,1\n", Options{DropInvalid: true}, ""},
		{"segment column", "score,label,g\n0.5,1,a\n0.4,0,b\n", Options{SegmentColumn: "g"}, ""},
		{"score and label the same column", "v\n1\n0\n", Options{ScoreColumn: "v", LabelColumn: "v"}, ""},
		{"labels ignored", "score,label\n0.5,\n0.2,1\n0.7,maybe\n", Options{IgnoreLabels: true}, ""},
		// A column of the two-column table named again as another column:
		// the fast path for score,label rows must not skip it (it once
		// left the weights short and Load panicked).
		{"weight column is the label column", "score,label\n0.5,1\n0.25,0\n0.75,1\n", Options{WeightColumn: "label"}, ""},
		{"segment column is the label column", "score,label\n0.5,1\n0.25,0\n", Options{SegmentColumn: "label"}, ""},
		{"id and time-free second score on the score column", "score,label\n0.5,1\n0.25,0\n", Options{IDColumn: "score", CompareColumn: "score"}, ""},
		{"decimal commas found", "id;score;label;weight\n7;0,107681;1;2,5\n8;0,25;0;1\n", Options{WeightColumn: "weight"}, ""},
		{"decimal commas given", "score\tlabel\n0,5\t1\n", Options{DecimalComma: true}, ""},
		{"decimal commas with commas between cells", "score,label\n0,5\n", Options{DecimalComma: true}, `t.csv:1: a decimal comma: numbers with decimal commas in text delimited by commas, expected semicolons or tabs between the cells`},
		{"decimal point in a file of decimal commas", "score;label\n0,5;1\n0.25;0\n", Options{}, `t.csv:3: column "score": invalid score "0.25", a point in a file read with decimal commas, expected a decimal comma such as 0,25 and no separator between thousands`},
		{"thousands separator refused", "score;label;weight\n0,5;1;1.234,5\n", Options{WeightColumn: "weight"}, `t.csv:2: column "weight": invalid weight "1.234,5", a point in a file read with decimal commas, expected a decimal comma such as 0,25 and no separator between thousands`},
		{"decimal comma after a first row without one", "score;label\n1;1\n0,25;0\n", Options{}, `t.csv:3: column "score": invalid score "0,25", a number with a decimal comma, expected a decimal point (or the file read with decimal commas)`},
		{"decimal comma in a file delimited by tabs", "score\tlabel\n0,25\t0\n", Options{}, `t.csv:2: column "score": invalid score "0,25", a number with a decimal comma, expected a decimal point (or the file read with decimal commas)`},
	}
	for _, size := range []int{8, 1 << 20} {
		blockSize = size
		for _, c := range cases {
			want, got, wantErr, gotErr := loadBoth(t, []byte(c.input), c.opt)
			msg := ""
			if gotErr != nil {
				msg = gotErr.Error()
			}
			if msg != c.want {
				t.Errorf("%s (block %d): Load error %q, want %q", c.name, size, msg, c.want)
			}
			if (wantErr == nil) != (gotErr == nil) || (wantErr != nil && wantErr.Error() != msg) {
				t.Errorf("%s (block %d): Read error %v, Load error %v", c.name, size, wantErr, gotErr)
			}
			if wantErr == nil && !reflect.DeepEqual(want, got) {
				t.Errorf("%s (block %d): sets differ\nRead %+v\nLoad %+v", c.name, size, brief(want), brief(got))
			}
		}
	}
}

// TestLoadKnowsEveryOption fails when Options gains a field, so that
// whoever adds one decides how the block reader treats it (reads it, or
// leaves such input to Read) before Load can silently ignore it.
func TestLoadKnowsEveryOption(t *testing.T) {
	known := map[string]bool{
		"Input": true, "Delimiter": true, "ScoreColumn": true, "LabelColumn": true, "WeightColumn": true,
		"SegmentColumn": true, "IDColumn": true, "TimeColumn": true, "TimeLayout": true, "TimeLocation": true,
		"CompareColumn": true, "NoLabels": true, "Positive": true, "LowerIsRiskier": true, "DropInvalid": true,
		"Progress": true, "DecimalComma": true,
		"IgnoreLabels": true, // resolve leaves no label column, which the block reader follows
	}
	typ := reflect.TypeOf(Options{})
	for i := range typ.NumField() {
		if name := typ.Field(i).Name; !known[name] {
			t.Errorf("Options.%s is new: make the block reader (fastcsv.go) read it or decline input that uses it, then add it here", name)
		}
	}
}

// TestHeaderAcrossGzipFlush: a gzip stream flushed inside the header line
// (as a writer that flushes as it goes may leave it) hands the reader the
// header in two pieces. The delimiter is still found from the whole line,
// by Read and ReadCounts as by Load; Read once guessed it from "score"
// alone, took ',' and reported no score column in ["score;label"].
func TestHeaderAcrossGzipFlush(t *testing.T) {
	gzipped := func(parts ...string) []byte {
		var z bytes.Buffer
		w := gzip.NewWriter(&z)
		for _, p := range parts {
			w.Write([]byte(p))
			w.Flush()
		}
		w.Close()
		return z.Bytes()
	}
	data := gzipped("sco", "re;label\n0.5;1\n0.2;0\n")
	for name, read := range map[string]func(io.Reader) (*Set, error){
		"Read": func(r io.Reader) (*Set, error) { return Read(r, "t.csv.gz", Options{}) },
		"Load": func(r io.Reader) (*Set, error) { return Load(r.(io.ReadSeeker), "t.csv.gz", Options{}) },
	} {
		set, err := read(bytes.NewReader(data))
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if set.Len() != 2 || set.labelColumn != "label" {
			t.Errorf("%s: %d rows, label column %q; want 2 rows and \"label\"", name, set.Len(), set.labelColumn)
		}
	}
	counts := gzipped("\nscore\tposi", "tives\tnegatives\n0.5\t2\t1\n")
	set, err := ReadCounts(bytes.NewReader(counts), "c.tsv.gz", Options{})
	if err != nil {
		t.Fatalf("ReadCounts: %v", err)
	}
	if p, n := set.Totals(); p != 2 || n != 1 {
		t.Errorf("ReadCounts: %v positives, %v negatives; want 2 and 1", p, n)
	}
}

// TestGzipRankedWhileRead checks the gzip path, where each block is
// bucketed as it is parsed on a digit the first block fixes and the
// buckets are sorted after the last block, against Read: seeded tables
// with many ties across blocks (scores from a handful of values, minus
// zero among them), with and without segments, either direction, blocks
// small enough to make hundreds of them, and rows in three orders: shuffled;
// rising and falling scores, so that the first block's range is narrow and
// most later rows fall below or above its prefix; and with DropInvalid a
// first block of nothing but dropped rows, which leaves the digit to the
// keys' top bits. Half the trials rank every large bucket on its own
// (bigBucketRows small).
func TestGzipRankedWhileRead(t *testing.T) {
	defer func(size, big int) { blockSize, bigBucketRows = size, big }(blockSize, bigBucketRows)
	rng := rand.New(rand.NewPCG(14, 1))
	values := []string{"0.5", "0.25", "-0", "0", "1", "0.125", "0.75", "1e-3", "0.3333", "-2.5", "1e300"}
	for trial := range 90 {
		blockSize = []int{40, 300, 4096, 1 << 20}[trial%4]
		bigBucketRows = []int{1 << 16, 8}[trial%2]
		rows := []int{1, 2, 50, 2000, 20000}[rng.IntN(5)]
		segmented := rng.IntN(2) == 0
		order := trial % 3 // 0 shuffled, 1 rising, 2 falling
		scores := make([]string, rows)
		for i := range scores {
			scores[i] = values[rng.IntN(len(values))]
			if rng.IntN(3) == 0 {
				scores[i] = strconv.FormatFloat(rng.Float64(), 'g', 3, 64)
			}
		}
		if order > 0 {
			slices.SortStableFunc(scores, func(a, b string) int {
				x, _ := strconv.ParseFloat(a, 64)
				y, _ := strconv.ParseFloat(b, 64)
				if order == 2 {
					x, y = y, x
				}
				return cmp.Compare(x, y)
			})
		}
		opt := Options{LowerIsRiskier: rng.IntN(2) == 0, DropInvalid: rng.IntN(4) == 0}
		var sb strings.Builder
		sb.WriteString("score,label")
		if segmented {
			sb.WriteString(",yard")
			opt.SegmentColumn = "yard"
		}
		sb.WriteString("\n")
		if opt.DropInvalid {
			for range rng.IntN(100) {
				if segmented {
					sb.WriteString("none,1,north\n")
				} else {
					sb.WriteString("none,1\n")
				}
			}
		}
		for _, score := range scores {
			fmt.Fprintf(&sb, "%s,%d", score, rng.IntN(2))
			if segmented {
				fmt.Fprintf(&sb, ",%s", []string{"north", "east", "south"}[rng.IntN(3)])
			}
			sb.WriteString("\n")
		}
		var z bytes.Buffer
		w := gzip.NewWriter(&z)
		w.Write([]byte(sb.String()))
		w.Close()
		name := fmt.Sprintf("trial %d (block %d, rows %d, order %d, segments %v, drop %v)", trial, blockSize, rows, order, segmented, opt.DropInvalid)
		want, wantErr := Read(bytes.NewReader(z.Bytes()), "t.csv", opt)
		got, gotErr := loadBlocks(bytes.NewReader(z.Bytes()), nil, "t.csv", opt, -1)
		if wantErr != nil || gotErr != nil {
			t.Fatalf("%s: Read error %v, block reader error %v", name, wantErr, gotErr)
		}
		if !reflect.DeepEqual(want, got) {
			t.Fatalf("%s: sets differ\nRead %+v\nLoad %+v", name, brief(want), brief(got))
		}
		sameResult(t, name, z.Bytes(), opt)
	}
}

// TestBlockDigit fixes the digit from a first block's smallest and largest
// keys and buckets keys by it, worked out by hand: keys 0x1230 and 0x2ff0
// differ first at bit 13 (0x1230^0x2ff0 = 0x3dc0: 14 varying bits), so
// the digit is bits 2 to 13 (shift 2) under the prefix key>>14 = 0.
func TestBlockDigit(t *testing.T) {
	d := newBlockDigit()
	d.fix(0x1230, 0x2ff0, 2)
	if d.shift != 2 || d.prefix != 0 {
		t.Fatalf("shift %d prefix %#x, want 2 and 0", d.shift, d.prefix)
	}
	cases := []struct {
		key  uint64
		want int
	}{
		{0x1230, 1 + 0x48c},                // 0x1230>>2 = 0x48c
		{0x0001, 1 + 0},                    // under the same prefix, digit 0
		{0x3fff, bucketCount},              // the largest digit, 0xfff
		{0x4000, blockBuckets - 1},         // prefix 1: above
		{math.MaxUint64, blockBuckets - 1}, // above
	}
	for _, c := range cases {
		if got := d.bucket(c.key); got != c.want {
			t.Errorf("bucket(%#x) = %d, want %d", c.key, got, c.want)
		}
	}
	// A prefix above zero puts smaller keys below.
	d = newBlockDigit()
	d.fix(0x5_0000, 0x5_0fff, 7) // 12 varying bits: shift 0, prefix 0x50
	if d.shift != 0 || d.prefix != 0x50 || d.bucket(0x4_ffff) != 0 || d.bucket(0x5_0fff) != bucketCount || d.bucket(0x5_1000) != blockBuckets-1 {
		t.Errorf("shift %d prefix %#x buckets %d %d %d, want 0, 0x50, 0, %d, %d", d.shift, d.prefix, d.bucket(0x4_ffff), d.bucket(0x5_0fff), d.bucket(0x5_1000), bucketCount, blockBuckets-1)
	}
	// A first block of no rows leaves the digit to the top bits: every
	// key falls within it.
	d = newBlockDigit()
	d.fix(0, 0, 0)
	if d.bucket(0) != 1 || d.bucket(math.MaxUint64) != bucketCount {
		t.Errorf("empty first block: buckets %d and %d, want 1 and %d", d.bucket(0), d.bucket(math.MaxUint64), bucketCount)
	}
}

// TestLoadHeldGzipMembers checks Load, which reads gzip files whole into
// memory, against Read, which reads them as a stream, on the ends of a
// gzip file: two members one after the other (read as one text), bytes
// after the last member that do not begin another (an error), a lone
// first magic byte after it (an error) and an empty member at the end.
// Each is also read by the block reader as a stream, which must agree
// or leave the input to Read (as it does on errors in reading).
func TestLoadHeldGzipMembers(t *testing.T) {
	member := func(text string) []byte {
		var z bytes.Buffer
		w := gzip.NewWriter(&z)
		w.Write([]byte(text))
		w.Close()
		return z.Bytes()
	}
	two := append(member("score,label\n0.5,1\n0.25,0\n"), member("0.75,1\n0.125,0\n")...)
	cases := []struct {
		name    string
		data    []byte
		corrupt bool
	}{
		{"two members", two, false},
		{"bytes after the last member", append(slices.Clone(two), "left over\n"...), true},
		{"a magic byte after the last member", append(slices.Clone(two), 0x1f), true},
		{"an empty member at the end", append(slices.Clone(two), member("")...), false},
	}
	for _, tc := range cases {
		sameResult(t, tc.name, tc.data, Options{})
		set, err := Load(bytes.NewReader(tc.data), "t.csv", Options{})
		if tc.corrupt != errors.Is(err, ErrCorruptGzip) {
			t.Errorf("%s: error %v, corrupt gzip expected %v", tc.name, err, tc.corrupt)
		}
		if err == nil && set.Len() != 4 {
			t.Errorf("%s: %d rows, want the 4 of both members", tc.name, set.Len())
		}
		streamed, streamErr := loadBlocks(bytes.NewReader(tc.data), nil, "t.csv", Options{}, -1)
		if streamErr != errDecline && ((err == nil) != (streamErr == nil) || (err != nil && err.Error() != streamErr.Error())) {
			t.Errorf("%s: Load error %v, streamed %v", tc.name, err, streamErr)
		}
		if err == nil && !reflect.DeepEqual(set, streamed) {
			t.Errorf("%s: sets differ\nLoad %+v\nstreamed %+v", tc.name, brief(set), brief(streamed))
		}
	}
}
