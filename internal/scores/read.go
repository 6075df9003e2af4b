package scores

import (
	"bufio"
	"bytes"
	stdgzip "compress/gzip"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/klauspost/compress/flate"
	"github.com/klauspost/compress/gzip"
)

// Input formats for Options.Input.
const (
	InputAuto  = ""      // JSON Lines when the first non-blank character is '{', else delimited text
	InputCSV   = "csv"   // delimited text with a header line
	InputJSONL = "jsonl" // one JSON object per line
)

// Default column names, tried in order when a column is not named.
var (
	DefaultScoreColumns = []string{"score", "probability", "prob", "p", "pred", "prediction"}
	DefaultLabelColumns = []string{"label", "y", "target", "outcome", "actual"}
)

// progressEvery is how many rows pass between calls of Options.Progress.
const progressEvery = 1 << 16

// maxDroppedReasons bounds Set.DroppedReasons.
const maxDroppedReasons = 5

// Options says how to read a table. The zero value reads CSV, TSV or JSON
// Lines with the default column names and label values.
type Options struct {
	Input     string // InputAuto, InputCSV or InputJSONL
	Delimiter rune   // 0 detects ',', '\t', ';' or '|' from the header line

	ScoreColumn   string // "" tries DefaultScoreColumns
	LabelColumn   string // "" tries DefaultLabelColumns
	WeightColumn  string // "" means unweighted
	SegmentColumn string // "" means no segments
	IDColumn      string // "" means no ids

	// TimeColumn names an optional column of case times, read into
	// Set.Times. TimeLayout is its layout in the form of package time
	// ("" means RFC 3339); a layout without a zone reads its times in
	// TimeLocation (nil means UTC).
	TimeColumn   string
	TimeLayout   string
	TimeLocation *time.Location

	// CompareColumn names an optional second score column, a second model
	// scored on the same cases, read into Set.CompareScores. It follows the
	// score column's rules (finite numbers; DropInvalid drops the row).
	CompareColumn string

	// NoLabels allows a table without a label column: every label reads as
	// false. Used for fresh production scores whose outcomes are unknown.
	NoLabels bool

	// IgnoreLabels reads no label column even where one is present: every
	// label reads as false and Set.LabelColumn is "". For production scores
	// whose outcome column is still blank.
	IgnoreLabels bool

	// Positive, when set, is the only label value read as a true case;
	// every other value is a false case. When empty the labels
	// 1/true/yes/y/t/positive/pos and 0/false/no/n/f/negative/neg are
	// recognised, case-insensitively, and anything else is an error.
	Positive string

	LowerIsRiskier bool

	// DecimalComma reads numbers (scores, weights, counts) written with a
	// decimal comma, 0,25, as European spreadsheets export them. Without
	// it decimal commas are read in text delimited by semicolons whose
	// first data row's score has one. Either way a file has one decimal
	// mark, and separators between thousands are not read: in a file
	// with decimal commas a number holding a point (1.234,5) is an error.
	DecimalComma bool

	// DropInvalid skips rows whose score is missing or not a finite number
	// instead of failing; the Set counts them.
	DropInvalid bool

	// Progress, when set, is called every so often with the rows read so far.
	Progress func(rows int)
}

// Read reads a whole table from r and returns it ranked (see Set). source
// names the input in errors. Gzip-compressed input is recognised by its
// magic bytes and a leading UTF-8 byte-order mark is skipped. All input
// errors are *ParseError values.
func Read(r io.Reader, source string, opt Options) (*Set, error) {
	digest := sha256.New()
	hashed := io.TeeReader(r, digest)
	in, err := openInput(hashed, source)
	if err != nil {
		return nil, err
	}
	b := &builder{opt: opt, source: source}
	if err := b.readAll(in); err != nil {
		return nil, err
	}
	// Read what the parser left (such as bytes after a gzip stream) so
	// that the digest covers the whole input.
	if _, err := io.Copy(io.Discard, hashed); err != nil {
		return nil, &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
	}
	return b.finish(hex.EncodeToString(digest.Sum(nil)))
}

// openInput returns a buffered reader of the decompressed bytes as UTF-8
// text: a UTF-8 byte-order mark is skipped and UTF-16 text that begins
// with its byte-order mark (either byte order) is decoded; UTF-16 without
// one is ErrEncoding. Gzip data is read member by member, so that
// bytes after the last member that are not another one are an error
// saying so, and gzip data inside gzip data is refused. Gzip data held
// whole in memory (a *bytes.Reader) is given to the decoder as it is,
// which reads it faster than through a buffer.
func openInput(r io.Reader, source string) (*bufio.Reader, error) {
	var buffered *bufio.Reader
	var members *gzipMembers
	if held, ok := r.(*bytes.Reader); ok && isGzipHeld(held) {
		members = &gzipMembers{src: held, peek: func(n int) []byte { return peekHeld(held, n) }}
	} else {
		raw := bufio.NewReaderSize(r, 1<<20)
		buffered = raw
		if isGzip(raw) {
			members = &gzipMembers{src: raw, peek: func(n int) []byte { b, _ := raw.Peek(n); return b }}
		}
	}
	if members != nil {
		z, err := gzip.NewReader(members.src)
		if err != nil {
			return nil, &ParseError{File: source, Err: fmt.Errorf("%w: %v", ErrCorruptGzip, err)}
		}
		z.Multistream(false)
		members.z = z
		buffered = bufio.NewReaderSize(members, 1<<20)
		if isGzip(buffered) {
			return nil, &ParseError{File: source, Err: fmt.Errorf("%w: the decompressed bytes begin with gzip's magic again, expected text; decompress the file once before reading it", ErrGzipTwice)}
		}
	}
	if bigEndian, ok := utf16Order(buffered); ok {
		buffered.Discard(2)
		return bufio.NewReaderSize(newUTF16Reader(buffered, source, bigEndian), 1<<20), nil
	}
	if looksUTF16(buffered) {
		return nil, &ParseError{File: source, Err: fmt.Errorf("%w: UTF-16 without a byte-order mark, expected UTF-8, or UTF-16 that begins with its byte-order mark as spreadsheets write it", ErrEncoding)}
	}
	if bom, _ := buffered.Peek(3); bytes.Equal(bom, []byte("\xef\xbb\xbf")) {
		buffered.Discard(3)
	}
	return buffered, nil
}

// isGzip reports whether in begins with gzip's magic bytes.
func isGzip(in *bufio.Reader) bool {
	magic, _ := in.Peek(2)
	return isGzipMagic(magic)
}

// isGzipHeld reports whether the unread bytes of held begin with gzip's
// magic bytes.
func isGzipHeld(held *bytes.Reader) bool { return isGzipMagic(peekHeld(held, 2)) }

func isGzipMagic(b []byte) bool { return len(b) == 2 && b[0] == 0x1f && b[1] == 0x8b }

// peekHeld returns the next n unread bytes of held, fewer at its end,
// without reading them.
func peekHeld(held *bytes.Reader, n int) []byte {
	b := make([]byte, n)
	m, _ := held.ReadAt(b, held.Size()-int64(held.Len()))
	return b[:m]
}

// errGzipTrailing is the error of bytes after a gzip member that do not
// begin another.
var errGzipTrailing = fmt.Errorf("%w: bytes after the end of the compressed data that do not begin another gzip member, expected the file to end there", ErrCorruptGzip)

// gzipMembers reads the members of a gzip file one after the other, as
// gzip tools do, and refuses other bytes after the last. peek returns the
// next n unread bytes of src (fewer at its end) without reading them.
type gzipMembers struct {
	src  flate.Reader
	peek func(n int) []byte
	z    *gzip.Reader
}

func (g *gzipMembers) Read(p []byte) (int, error) {
	n, err := g.z.Read(p)
	if err != io.EOF {
		return n, err
	}
	if len(g.peek(1)) == 0 {
		return n, io.EOF // the end of the file
	}
	if !isGzipMagic(g.peek(2)) {
		return n, errGzipTrailing
	}
	if err := g.z.Reset(g.src); err != nil {
		return n, err
	}
	g.z.Multistream(false)
	return n, nil
}

// builder collects rows column-wise.
type builder struct {
	opt    Options
	source string

	header                                           []string // column names as found
	scoreCol, labelCol, weightCol, segmentCol, idCol int
	timeCol, compareCol                              int

	scores   []float64
	labels   []bool
	weights  []float64
	ids      []string
	segments []int32
	segIndex map[string]int32
	segNames []string
	times    []int64
	compare  []float64

	dropped        int
	droppedReasons []string

	outside  OutsideRows // rows whose score lies outside [0, 1]
	comma    bool        // numbers have a decimal comma (see useDecimalComma)
	delim    rune        // the delimiter of delimited text
	firstRow []byte      // the first data row of delimited text, for useDecimalComma
	ranked   bool        // the columns are in rank order already (the block reader ranked bucketed blocks)
}

func (b *builder) readAll(in *bufio.Reader) error {
	format := b.opt.Input
	if format == InputAuto || format == InputJSONL {
		if err := b.jsonArray(in, format == InputJSONL); err != nil {
			return err
		}
	}
	if format == InputAuto {
		format = sniff(in)
	}
	var err error
	switch format {
	case InputJSONL:
		err = b.readJSONL(in)
	case InputCSV:
		err = b.readDelimited(in)
	default:
		return &ParseError{File: b.source, Err: fmt.Errorf("unknown input format %q, expected csv or jsonl", format)}
	}
	if err != nil {
		return err
	}
	if len(b.scores) == 0 && b.dropped == 0 {
		return &ParseError{File: b.source, Err: ErrNoRows}
	}
	return nil
}

// sniff guesses the format from the first non-blank byte.
func sniff(in *bufio.Reader) string {
	if c, _ := firstNonBlank(in, 0); c == '{' {
		return InputJSONL
	}
	return InputCSV
}

// firstNonBlank returns the first byte of in from offset on that is not a
// space, tab or line end, and its offset, peeking at most 4096 bytes; 0
// when there is none.
func firstNonBlank(in *bufio.Reader, offset int) (byte, int) {
	for n := offset + 1; n <= offset+4096; n++ {
		peek, _ := in.Peek(n)
		if len(peek) < n {
			return 0, n
		}
		if c := peek[n-1]; c != ' ' && c != '\t' && c != '\r' && c != '\n' {
			return c, n - 1
		}
	}
	return 0, offset + 4096
}

// jsonArray returns an error when in holds a JSON array of objects, as
// many tools write JSON, rather than JSON Lines; explicit is whether JSON
// Lines was asked for, when any array is that error.
func (b *builder) jsonArray(in *bufio.Reader, explicit bool) error {
	c, at := firstNonBlank(in, 0)
	if c != '[' {
		return nil
	}
	if next, _ := firstNonBlank(in, at+1); !explicit && next != '{' && next != ']' {
		return nil // a header that begins with [
	}
	peek, _ := in.Peek(at)
	return &ParseError{File: b.source, Line: bytes.Count(peek, []byte{'\n'}) + 1, Err: fmt.Errorf("%w: a JSON array, expected JSON Lines: one object per line, without the enclosing [ ] and the commas between objects", ErrBadJSON)}
}

// resolve finds the wanted columns in the header.
func (b *builder) resolve(header []string, line int) error {
	b.header = header
	first := make(map[string]int, len(header))
	for i, h := range header {
		if h == "" {
			continue // unnamed, as an index column often is: never looked up
		}
		if j, seen := first[h]; seen {
			return &ParseError{File: b.source, Line: line, Column: h, Err: fmt.Errorf("%w: the name of columns %d and %d, expected each name once", ErrDuplicateColumn, j+1, i+1)}
		}
		first[h] = i
	}
	find := func(name string, defaults []string, required bool, what string) (int, error) {
		if name != "" {
			for i, h := range header {
				if h == name {
					return i, nil
				}
			}
			return -1, &ParseError{File: b.source, Line: line, Column: name, Err: fmt.Errorf("%w in header %s", ErrMissingColumn, quoteList(header))}
		}
		for _, d := range defaults {
			for i, h := range header {
				if strings.EqualFold(h, d) {
					return i, nil
				}
			}
		}
		if required {
			return -1, &ParseError{File: b.source, Line: line, Err: fmt.Errorf("%w: no %s column among %s, expected one of %s (or name it with --%s)", ErrMissingColumn, what, quoteList(header), quoteList(defaults), what)}
		}
		return -1, nil
	}
	var err error
	if b.scoreCol, err = find(b.opt.ScoreColumn, DefaultScoreColumns, true, "score"); err != nil {
		return err
	}
	if b.opt.IgnoreLabels {
		b.labelCol = -1
	} else if b.labelCol, err = find(b.opt.LabelColumn, DefaultLabelColumns, !b.opt.NoLabels, "label"); err != nil {
		return err
	}
	if b.weightCol, err = find(b.opt.WeightColumn, nil, false, "weight"); err != nil {
		return err
	}
	if b.segmentCol, err = find(b.opt.SegmentColumn, nil, false, "segment"); err != nil {
		return err
	}
	if b.idCol, err = find(b.opt.IDColumn, nil, false, "id"); err != nil {
		return err
	}
	if b.timeCol, err = find(b.opt.TimeColumn, nil, false, "time"); err != nil {
		return err
	}
	if b.compareCol, err = find(b.opt.CompareColumn, nil, false, "score"); err != nil {
		return err
	}
	if b.timeCol >= 0 {
		b.times = []int64{}
	}
	if b.compareCol >= 0 {
		b.compare = []float64{}
	}
	if b.weightCol >= 0 {
		b.weights = []float64{}
	}
	if b.segmentCol >= 0 {
		b.segments = []int32{}
		b.segIndex = map[string]int32{}
	}
	if b.idCol >= 0 {
		b.ids = []string{}
	}
	return nil
}

// noteOutside counts a row kept at line whose score lies outside [0, 1].
func (b *builder) noteOutside(line int, score float64) {
	if score >= 0 && score <= 1 {
		return
	}
	b.outside.Rows++
	if len(b.outside.Lines) < MaxOutsideLines {
		b.outside.Lines = append(b.outside.Lines, line)
	}
}

// segmentCode returns the code of a segment name, giving a new name the
// next code.
func (b *builder) segmentCode(name string) int32 {
	code, ok := b.segIndex[name]
	if !ok {
		code = int32(len(b.segNames))
		b.segIndex[name] = code
		b.segNames = append(b.segNames, name)
	}
	return code
}

// wanted returns the indices of the columns in use.
func (b *builder) wanted() []int {
	var cols []int
	for _, c := range []int{b.scoreCol, b.labelCol, b.weightCol, b.segmentCol, b.idCol, b.timeCol, b.compareCol} {
		if c >= 0 {
			cols = append(cols, c)
		}
	}
	return cols
}

// Limits of quoteList, so that a garbled header (a binary file read as
// text) gives an error of a few lines, not a screenful.
const (
	quoteListNames = 12  // names shown at most
	quoteListWidth = 200 // characters of the list at most, before "…"
)

// quoteList quotes names as a bracketed list. Past quoteListNames names or
// quoteListWidth characters it stops and says how many more there are.
func quoteList(names []string) string {
	var b strings.Builder
	b.WriteString("[")
	for i, n := range names {
		q := strconv.Quote(n)
		sep := ""
		if i > 0 {
			sep = ", "
		}
		if i == quoteListNames || len([]rune(b.String()))+len(sep)+len([]rune(q)) > quoteListWidth {
			if i == 0 {
				// One name longer than the whole list may be: cut it.
				b.WriteString(string([]rune(q)[:quoteListWidth-1]) + "…")
				if len(names) > 1 {
					fmt.Fprintf(&b, " and %d more", len(names)-1)
				}
				return b.String() + "]"
			}
			fmt.Fprintf(&b, ", … and %d more", len(names)-i)
			return b.String() + "]"
		}
		b.WriteString(sep + q)
	}
	return b.String() + "]"
}

// add parses one row; cell returns the text of a column index.
func (b *builder) add(line int, cell func(col int) string) error {
	scoreText := cell(b.scoreCol)
	score, err := parseScore(scoreText, b.comma)
	if err != nil {
		if b.opt.DropInvalid {
			b.dropped++
			if len(b.droppedReasons) < maxDroppedReasons {
				b.droppedReasons = append(b.droppedReasons, (&ParseError{File: b.source, Line: line, Column: b.header[b.scoreCol], Err: err}).Error())
			}
			return nil
		}
		return &ParseError{File: b.source, Line: line, Column: b.header[b.scoreCol], Err: err}
	}
	var compare float64
	if b.compareCol >= 0 {
		if compare, err = parseScore(cell(b.compareCol), b.comma); err != nil {
			if b.opt.DropInvalid {
				b.dropped++
				if len(b.droppedReasons) < maxDroppedReasons {
					b.droppedReasons = append(b.droppedReasons, (&ParseError{File: b.source, Line: line, Column: b.header[b.compareCol], Err: err}).Error())
				}
				return nil
			}
			return &ParseError{File: b.source, Line: line, Column: b.header[b.compareCol], Err: err}
		}
	}
	var when int64
	if b.timeCol >= 0 {
		if when, err = parseTime(cell(b.timeCol), b.opt.TimeLayout, b.opt.TimeLocation); err != nil {
			return &ParseError{File: b.source, Line: line, Column: b.header[b.timeCol], Err: err}
		}
	}
	positive := false
	if b.labelCol >= 0 {
		if positive, err = b.parseLabel(cell(b.labelCol)); err != nil {
			return &ParseError{File: b.source, Line: line, Column: b.header[b.labelCol], Err: err}
		}
	}
	if b.weightCol >= 0 {
		w, err := parseWeight(cell(b.weightCol), b.comma)
		if err != nil {
			return &ParseError{File: b.source, Line: line, Column: b.header[b.weightCol], Err: err}
		}
		b.weights = append(b.weights, w)
	}
	if b.segmentCol >= 0 {
		b.segments = append(b.segments, b.segmentCode(cell(b.segmentCol)))
	}
	if b.idCol >= 0 {
		b.ids = append(b.ids, cell(b.idCol))
	}
	if b.timeCol >= 0 {
		b.times = append(b.times, when)
	}
	if b.compareCol >= 0 {
		b.compare = append(b.compare, compare)
	}
	b.noteOutside(line, score)
	b.scores = append(b.scores, score)
	b.labels = append(b.labels, positive)
	if b.opt.Progress != nil && len(b.scores)%progressEvery == 0 {
		b.opt.Progress(len(b.scores))
	}
	return nil
}

func (b *builder) finish(digest string) (*Set, error) {
	if b.weights != nil {
		counts := b.weightCol < 0 // a counts table's weights are its counts
		if err := checkWeightTotal(b.weights, counts); err != nil {
			column := ""
			if !counts {
				column = b.header[b.weightCol]
			}
			return nil, &ParseError{File: b.source, Column: column, Err: err}
		}
	}
	s := &Set{
		scores:         b.scores,
		labels:         b.labels,
		weights:        b.weights,
		ids:            b.ids,
		segmentOf:      b.segments,
		segmentNames:   b.segNames,
		times:          b.times,
		compareScores:  b.compare,
		lowerIsRiskier: b.opt.LowerIsRiskier,
		source:         b.source,
		digest:         digest,
		scoreColumn:    b.header[b.scoreCol],
		dropped:        b.dropped,
		droppedReasons: b.droppedReasons,
		outside:        b.outside,
	}
	if b.labelCol >= 0 {
		s.labelColumn = b.header[b.labelCol]
	}
	if b.weightCol >= 0 {
		s.weightColumn = b.header[b.weightCol]
	}
	if b.segmentCol >= 0 {
		s.segmentColumn = b.header[b.segmentCol]
	}
	if b.idCol >= 0 {
		s.idColumn = b.header[b.idCol]
	}
	if b.timeCol >= 0 {
		s.timeColumn, s.timeLayout = b.header[b.timeCol], b.opt.TimeLayout
	}
	if b.compareCol >= 0 {
		s.compareColumn = b.header[b.compareCol]
	}
	if b.opt.Progress != nil {
		b.opt.Progress(len(b.scores))
	}
	if !b.ranked {
		s.rank()
	}
	return s, nil
}

// parseScore reads a score cell: a finite number in decimal notation,
// with a decimal comma instead of a point when comma is set (see
// numberText).
func parseScore(text string, comma bool) (float64, error) {
	text = strings.TrimSpace(text)
	if text == "" {
		return 0, &valueError{sentinel: ErrBadScore, value: text, hint: "expected a number, found an empty cell"}
	}
	number, err := numberText(text, comma)
	if err != nil {
		return 0, markError(ErrBadScore, text, err, "expected a finite number")
	}
	v, err := parseDecimal(number)
	if err == errGoNotation {
		return 0, &valueError{sentinel: ErrBadScore, value: text, hint: goNotationHint}
	}
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, &valueError{sentinel: ErrBadScore, value: text, hint: "expected a finite number"}
	}
	if v == 0 {
		v = 0 // fold -0 into +0
	}
	return v, nil
}

// parseWeight reads a weight cell as parseScore reads a score, refusing
// a negative weight.
func parseWeight(text string, comma bool) (float64, error) {
	text = strings.TrimSpace(text)
	number, err := numberText(text, comma)
	if err != nil {
		return 0, markError(ErrBadWeight, text, err, "expected a finite number >= 0")
	}
	v, err := parseDecimal(number)
	if err == errGoNotation {
		return 0, &valueError{sentinel: ErrBadWeight, value: text, hint: goNotationHint}
	}
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
		return 0, &valueError{sentinel: ErrBadWeight, value: text, hint: "expected a finite number >= 0"}
	}
	return v, nil
}

var positiveWords = map[string]bool{"1": true, "true": true, "yes": true, "y": true, "t": true, "positive": true, "pos": true}
var negativeWords = map[string]bool{"0": true, "false": true, "no": true, "n": true, "f": true, "negative": true, "neg": true}

func (b *builder) parseLabel(text string) (bool, error) {
	text = strings.TrimSpace(text)
	if b.opt.Positive != "" {
		return text == b.opt.Positive, nil
	}
	word := strings.ToLower(text)
	switch {
	case positiveWords[word]:
		return true, nil
	case negativeWords[word]:
		return false, nil
	}
	// Numeric spellings such as 1.0 or 0.0, as written by float columns.
	if number, err := numberText(word, b.comma); err == nil {
		word = number
	}
	if v, err := parseDecimal(word); err == nil && (v == 0 || v == 1) {
		return v == 1, nil
	}
	return false, &valueError{sentinel: ErrBadLabel, value: text, hint: "expected 1/true/yes/positive or 0/false/no/negative"}
}

// readHeader opens a CSV reader on in, with the delimiter detected from
// the header line unless Options.Delimiter sets it, and reads the header,
// its names trimmed. An empty input or a blank header is ErrEmpty.
func (b *builder) readHeader(in *bufio.Reader) (*recordReader, []string, error) {
	peeked, err := peekHeader(in)
	if len(peeked) == 0 {
		if err != nil && err != io.EOF {
			return nil, nil, b.readError(0, err)
		}
		return nil, nil, &ParseError{File: b.source, Err: ErrEmpty}
	}
	headerLine := bytes.TrimLeft(peeked, "\r\n") // blank lines before the header
	line := 1 + bytes.Count(peeked[:len(peeked)-len(headerLine)], []byte{'\n'})
	if i := bytes.IndexByte(headerLine, '\n'); i >= 0 {
		headerLine = headerLine[:i]
	}
	if len(headerLine) > 0 && len(bytes.TrimSpace(headerLine)) == 0 {
		return nil, nil, &ParseError{File: b.source, Line: line, Err: fmt.Errorf("%w before the header, expected the header line", ErrBlankLine)}
	}
	delim := b.opt.Delimiter
	if delim == 0 {
		delim = detectDelimiter(headerLine)
	}
	b.delim = delim
	if delim == decimalCommaDelimiter && !b.opt.DecimalComma {
		headerStart := len(peeked) - len(bytes.TrimLeft(peeked, "\r\n"))
		b.firstRow = firstRowAhead(in, headerStart+len(headerLine)+1)
	}
	r := newRecordReader(in, b.source, delim)
	header, err := r.Read()
	if err == io.EOF {
		return nil, nil, &ParseError{File: b.source, Err: ErrEmpty}
	}
	if err != nil {
		return nil, nil, b.csvError(err)
	}
	header = trimAll(append([]string(nil), header...))
	if len(header) == 1 && header[0] == "" {
		return nil, nil, &ParseError{File: b.source, Line: 1, Err: ErrEmpty}
	}
	return r, header, nil
}

// readDelimited reads CSV or TSV with a header line.
func (b *builder) readDelimited(in *bufio.Reader) error {
	r, header, err := b.readHeader(in)
	if err != nil {
		return err
	}
	headerLine, _ := r.FieldPos(0) // 1 unless blank lines come first
	if err := b.resolve(header, headerLine); err != nil {
		return err
	}
	if err := b.useDecimalComma(b.delim, b.firstRow); err != nil {
		return err
	}
	for {
		record, err := r.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return b.csvError(err)
		}
		line, _ := r.FieldPos(0)
		if len(record) == 1 && strings.TrimSpace(record[0]) == "" {
			continue // a blank line
		}
		if len(record) != len(header) {
			return &ParseError{File: b.source, Line: line, Err: fmt.Errorf("%w: row has %d, header has %d", ErrRagged, len(record), len(header))}
		}
		if err := b.add(line, func(col int) string { return record[col] }); err != nil {
			return err
		}
	}
}

// peekHeader returns the input's first bytes without consuming them: at
// least the first line after any blank lines, unless the input ends first
// or the line is longer than in's buffer. It reads more than is buffered
// where it must, as when a gzip stream was flushed within the header.
func peekHeader(in *bufio.Reader) ([]byte, error) {
	n := min(max(in.Buffered(), 1), in.Size())
	for {
		data, err := in.Peek(n)
		if err != nil || bytes.IndexByte(bytes.TrimLeft(data, "\r\n"), '\n') >= 0 || n == in.Size() {
			if err == bufio.ErrBufferFull {
				err = nil
			}
			return data, err
		}
		n = min(max(2*n, in.Buffered()+1), in.Size())
	}
}

func trimAll(fields []string) []string {
	for i, f := range fields {
		fields[i] = strings.TrimSpace(f)
	}
	return fields
}

// detectDelimiter picks the separator that occurs most in the header line.
func detectDelimiter(header []byte) rune {
	best, bestCount := ',', 0
	for _, d := range []rune{',', '\t', ';', '|'} {
		if n := bytes.Count(header, []byte(string(d))); n > bestCount {
			best, bestCount = d, n
		}
	}
	return best
}

func (b *builder) csvError(err error) error {
	var pe *csv.ParseError
	if own, ok := err.(*ParseError); ok {
		return own
	}
	if errors.As(err, &pe) {
		if errors.Is(pe.Err, csv.ErrFieldCount) {
			return &ParseError{File: b.source, Line: pe.Line, Err: ErrRagged}
		}
		return &ParseError{File: b.source, Line: pe.Line, Err: pe.Err}
	}
	return b.readError(0, err)
}

// readError wraps an error from the underlying stream, recognising broken
// gzip data.
func (b *builder) readError(line int, err error) error {
	var own *ParseError
	if errors.As(err, &own) {
		return own
	}
	if errors.Is(err, ErrCorruptGzip) {
		return &ParseError{File: b.source, Line: line, Err: err}
	}
	var corrupt flate.CorruptInputError
	if errors.Is(err, gzip.ErrChecksum) || errors.Is(err, gzip.ErrHeader) || errors.Is(err, io.ErrUnexpectedEOF) || errors.As(err, &corrupt) {
		return &ParseError{File: b.source, Line: line, Err: fmt.Errorf("%w: %v", ErrCorruptGzip, err)}
	}
	return &ParseError{File: b.source, Line: line, Err: fmt.Errorf("read: %w", err)}
}

// readJSONL reads one JSON object per line. The columns are taken from the
// keys of the first object.
func (b *builder) readJSONL(in *bufio.Reader) error {
	line := 0
	var keys []string
	for {
		text, err := readLine(in)
		if err == ErrTooLong {
			return &ParseError{File: b.source, Line: line + 1, Err: fmt.Errorf("%w, expected one JSON object per line", ErrTooLong)}
		}
		if len(text) > 0 {
			line++
			if trimmed := bytes.TrimSpace(text); len(trimmed) > 0 {
				values, order, perr := decodeObject(trimmed)
				if perr != nil {
					return &ParseError{File: b.source, Line: line, Err: fmt.Errorf("%w: %v", ErrBadJSON, perr)}
				}
				if keys == nil {
					keys = order
					if err := b.resolve(keys, line); err != nil {
						return err
					}
				}
				for _, col := range b.wanted() {
					if _, ok := values[keys[col]]; !ok {
						return &ParseError{File: b.source, Line: line, Column: keys[col], Err: fmt.Errorf("%w: key missing from this object", ErrMissingColumn)}
					}
				}
				if err := b.add(line, func(col int) string { return values[keys[col]] }); err != nil {
					return err
				}
			}
		}
		if err == io.EOF {
			if keys == nil {
				return &ParseError{File: b.source, Err: ErrEmpty}
			}
			return nil
		}
		if err != nil {
			return b.readError(line, err)
		}
	}
}

// decodeObject decodes one JSON object into the text of its scalar values
// (null becomes ""), with the keys in document order.
func decodeObject(data []byte) (map[string]string, []string, error) {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	tok, err := dec.Token()
	if err != nil {
		return nil, nil, err
	}
	if tok != json.Delim('{') {
		return nil, nil, fmt.Errorf("expected an object")
	}
	values := map[string]string{}
	var order []string
	for dec.More() {
		tok, err := dec.Token()
		if err != nil {
			return nil, nil, err
		}
		key, _ := tok.(string)
		var raw json.RawMessage
		if err := dec.Decode(&raw); err != nil {
			return nil, nil, err
		}
		text, err := scalarText(raw)
		if err != nil {
			return nil, nil, fmt.Errorf("key %q: %v", key, err)
		}
		if _, dup := values[key]; dup {
			return nil, nil, fmt.Errorf("%w: key %q is both key %d and key %d of the object, expected each key once", ErrDuplicateColumn, key, slices.Index(order, key)+1, len(order)+1)
		}
		order = append(order, key)
		values[key] = text
	}
	if _, err := dec.Token(); err != nil {
		return nil, nil, err
	}
	if dec.More() {
		return nil, nil, fmt.Errorf("trailing data after the object")
	}
	if _, err := dec.Token(); err != io.EOF {
		return nil, nil, fmt.Errorf("trailing data after the object")
	}
	return values, order, nil
}

func scalarText(raw json.RawMessage) (string, error) {
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.UseNumber()
	var v any
	if err := dec.Decode(&v); err != nil {
		return "", err
	}
	switch v := v.(type) {
	case nil:
		return "", nil
	case string:
		return v, nil
	case bool:
		return strconv.FormatBool(v), nil
	case json.Number:
		return v.String(), nil
	default:
		return "", fmt.Errorf("expected a string, number, boolean or null")
	}
}

// Decompress writes the decompressed bytes of gzip data r to w and
// returns how many it wrote, with the standard library's decoder
// (compress/gzip), as a program that only decompresses would: the readers
// are measured against it (bench/RESULTS.md). The readers themselves use
// a faster decoder of the same format.
func Decompress(r io.Reader, w io.Writer) (int64, error) {
	z, err := stdgzip.NewReader(r)
	if err != nil {
		return 0, err
	}
	return io.Copy(w, z)
}
