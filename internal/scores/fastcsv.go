package scores

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"runtime"
	"runtime/debug"
	"sync"
)

// Load reads a table exactly as Read does, from an input that can seek
// back to where it started, such as an open file. It returns the same Set
// and the same errors as Read for the same bytes, only faster: it reads the
// decompressed text in large blocks, parses the blocks on every core and
// parses plain numbers from the bytes without allocating. Gzip input of
// at most heldGzipBytes is read into memory whole before it is
// decompressed, which the decoder reads faster than a stream, and hashed
// beside the decompression.
//
// Load handles delimited text with every column Read takes, dropped rows
// included. For anything else it seeks back and calls Read: JSON Lines, a
// header or a first line it cannot take at a glance, a quoted field that does not close
// on its own line, and errors in reading or decompressing the input.
func Load(r io.ReadSeeker, source string, opt Options) (*Set, error) {
	start, err := r.Seek(0, io.SeekCurrent)
	if err != nil {
		return Read(r, source, opt)
	}
	// The size of plain text tells how many rows to make room for.
	size := int64(-1)
	if end, err := r.Seek(0, io.SeekEnd); err == nil {
		size = end - start
	}
	var magic [2]byte
	if _, err := r.Seek(start, io.SeekStart); err != nil {
		return nil, &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
	}
	var held []byte
	if n, _ := io.ReadFull(r, magic[:]); n == 2 && magic == [2]byte{0x1f, 0x8b} {
		if size <= heldGzipBytes {
			held = make([]byte, size)
		}
		size = -1 // gzip: the size says little about the rows
	}
	if _, err := r.Seek(start, io.SeekStart); err != nil {
		return nil, &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
	}
	if held != nil {
		if _, err := io.ReadFull(r, held); err != nil {
			held = nil // the file changed size: read it as a stream
			if _, err := r.Seek(start, io.SeekStart); err != nil {
				return nil, &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
			}
		}
	}
	set, err := loadBlocks(r, held, source, opt, size)
	if !errors.Is(err, errDecline) {
		return set, err
	}
	if _, err := r.Seek(start, io.SeekStart); err != nil {
		return nil, &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
	}
	return Read(r, source, opt)
}

// inputEnded is called by the block reader when it has read the last
// byte of its (decompressed) input; a variable so that a benchmark can
// time what is left after that.
var inputEnded = func() {}

// errDecline tells Load to read the input with Read instead.
var errDecline = errors.New("scores: input left to the line reader")

// blockSize is the size of the blocks of text parsed at once.
var blockSize = 2 << 20 // a variable so that tests can cross block edges often

// returnMemoryRows is the size from which Load hands the memory of its
// parsed blocks back to the system before the set is sorted, so that the
// sort's second copy does not come on top of it.
const returnMemoryRows = 1 << 20

// block is a run of whole lines and, once parsed, what they held.
type block struct {
	data []byte
	seq  int // the block's place in the input, from 0
	done chan struct{}

	scores       []float64
	labels       []bool
	weights      []float64
	segments     []int32          // codes into segNames, the block's own numbering
	ids          []string         // case ids
	times        []int64          // case times, unix seconds
	compare      []float64        // second model's scores
	segNames     []string         // segment names in the order they first appear in the block
	segIndex     map[string]int32 // code of each name in segNames
	size         int              // bytes in data
	newlines     int              // line feeds in data
	dropped      int              // rows skipped by DropInvalid
	reasons      []rowEvent       // the first few of them
	outside      int              // rows whose score lies outside [0, 1]
	outsideLines []int            // the first few of them, from 0 at the block's first line
	event        *rowEvent        // the first error, or a reason to decline
	starts       []int32          // where each bucket begins, once bucketed (see bucketBlock)
}

// rowEvent is something found at a line of a block; line counts from 0 at
// the block's first line.
type rowEvent struct {
	line    int
	column  string
	err     error
	decline bool
}

// heldGzipBytes is the largest gzip input Load reads into memory whole:
// about twenty million rows of a score and a label.
const heldGzipBytes = 64 << 20

// loadBlocks is Load without the fallback; it returns errDecline for input
// that Read must take. held, when not nil, is the whole input, and r is
// not read. size is the number of bytes of plain text to read, -1 when
// unknown.
func loadBlocks(r io.Reader, held []byte, source string, opt Options, size int64) (*Set, error) {
	if opt.Input != InputAuto && opt.Input != InputCSV {
		return nil, errDecline
	}
	hashed, digest := digestInput(r, held)
	in, err := openInput(hashed, source)
	if err != nil {
		return nil, errDecline
	}
	header, delim, ok := blockHeader(in, opt)
	if !ok {
		return nil, errDecline
	}
	b := &builder{opt: opt, source: source}
	if err := b.resolve(header, 1); err != nil {
		return nil, err
	}
	b.delim = delim
	if delim == decimalCommaDelimiter && !opt.DecimalComma {
		b.firstRow = firstRowAhead(in, 0)
	}
	if err := b.useDecimalComma(delim, b.firstRow); err != nil {
		return nil, err
	}
	p := &blockParser{b: b, delim: byte(delim), mark: '.', fields: len(header), spare: make(chan blockColumns, 8)}
	if b.comma {
		p.mark = ','
	}
	// Input of unknown size (gzip) is read by one goroutine, which leaves
	// the others time to spare: they bucket each block as they parse it
	// (see bucketBlock), so that after the last block only each bucket's
	// own sort is left, on both cores, instead of the whole sort. Weights
	// stay out of it, because their total is checked in input order; the
	// columns rankInPlace does not carry likewise.
	sink := &blockSink{b: b, p: p, size: size}
	if size < 0 && b.weightCol < 0 && b.idCol < 0 && b.timeCol < 0 && b.compareCol < 0 {
		p.digit = newBlockDigit()
		sink.bucketed = true
	}

	blocks, readErr, stop := p.produce(in)
	var (
		rows   int
		line   = 2 // the first data line
		failed error
	)
	for blk := range blocks {
		<-blk.done
		if failed != nil {
			continue // drain
		}
		if ev := blk.event; ev != nil {
			close(stop)
			if ev.decline {
				failed = errDecline
			} else {
				failed = &ParseError{File: source, Line: line + ev.line, Column: ev.column, Err: ev.err}
			}
			continue
		}
		b.noteBlock(blk, line)
		line += blk.newlines
		rows += len(blk.scores)
		sink.take(blk)
		if opt.Progress != nil {
			opt.Progress(rows)
		}
	}
	if failed != nil {
		return nil, failed
	}
	if *readErr != nil {
		return nil, errDecline
	}
	if _, err := io.Copy(io.Discard, hashed); err != nil {
		return nil, errDecline
	}
	if rows == 0 && b.dropped == 0 {
		return nil, &ParseError{File: source, Err: ErrNoRows}
	}
	sink.fill(rows)
	return b.finish(digest())
}

// digestInput returns a reader of the input, r or else held when not nil,
// and a function that gives the hex SHA-256 of every byte read from it,
// to be called after the last read. held is hashed on a goroutine of its
// own, beside the reading, and read as a *bytes.Reader, which openInput
// gives the gzip decoder as it is; r is hashed as it is read.
func digestInput(r io.Reader, held []byte) (io.Reader, func() string) {
	if held != nil {
		sum := make(chan [sha256.Size]byte, 1)
		go func() { sum <- sha256.Sum256(held) }()
		return bytes.NewReader(held), func() string {
			s := <-sum
			return hex.EncodeToString(s[:])
		}
	}
	digest := sha256.New()
	return io.TeeReader(r, digest), func() string { return hex.EncodeToString(digest.Sum(nil)) }
}

// blockSink takes each parsed block's rows as it arrives, in input order:
// copied into place at once when the size of plain text tells how many
// rows to make room for, kept bucketed when blocks are bucketed as they
// are read (see bucketBlock), or else kept until every block is in.
type blockSink struct {
	b        *builder
	p        *blockParser
	size     int64           // bytes of plain text, -1 when unknown
	bucketed bool            // the blocks are bucketed as they are read
	buckets  []bucketedBlock // the bucketed blocks kept for the end
	parsed   []*block        // blocks kept for the end
}

func (s *blockSink) take(blk *block) {
	b := s.b
	switch {
	case s.size > 0 && len(blk.scores) > 0:
		// Copy the rows into place now, while later blocks are parsed,
		// making room at the first rows for as many as the size says.
		if b.scores == nil {
			b.reserve(int(float64(s.size)*float64(len(blk.scores))/float64(blk.size)*1.02) + 1024)
		}
		b.appendBlock(blk)
		select {
		case s.p.spare <- blockColumns{blk.scores[:0], blk.labels[:0], blkWeights(blk)}:
		default:
		}
		blk.scores, blk.labels, blk.weights, blk.segments, blk.ids, blk.times, blk.compare = nil, nil, nil, nil, nil, nil, nil
	case s.bucketed:
		if len(blk.scores) > 0 {
			s.buckets = append(s.buckets, bucketedBlock{bucketColumns{keys: blk.scores, labels: blk.labels, segments: blk.segments}, blk.starts})
		}
		blk.scores, blk.labels, blk.segments, blk.starts = nil, nil, nil, nil
	default:
		s.parsed = append(s.parsed, blk)
	}
}

// fill leaves the builder's columns holding every row read: the
// bucketed blocks ranked, or the blocks kept, appended in input order.
func (s *blockSink) fill(rows int) {
	b := s.b
	if rows == 0 {
		return // with no rows the columns stay as Read leaves them
	}
	if s.bucketed {
		ranked := rankBuckets(s.buckets, rows, s.p.digit, b.opt.LowerIsRiskier)
		s.buckets = nil
		b.scores, b.labels, b.segments = ranked.keys, ranked.labels, ranked.segments
		b.ranked = true
		return
	}
	if b.scores == nil {
		b.reserve(rows)
	}
	for i, blk := range s.parsed {
		if len(blk.scores) == 0 {
			continue
		}
		b.appendBlock(blk)
		s.parsed[i] = nil
	}
	if rows >= returnMemoryRows {
		debug.FreeOSMemory()
	}
}

// blockHeader reads and splits the header line for loadBlocks, detecting
// the delimiter unless opt gives it; ok is false for input that Read must
// take.
func blockHeader(in *bufio.Reader, opt Options) (header []string, delim rune, ok bool) {
	headerLine, err := in.ReadSlice('\n')
	if err != nil && err != io.EOF {
		return nil, 0, false // a read error, or a header longer than the buffer
	}
	headerLine = append([]byte(nil), headerLine...)
	if len(bytes.TrimSpace(headerLine)) == 0 || isSpaceByte(headerLine[0]) || (opt.Input == InputAuto && (headerLine[0] == '{' || headerLine[0] == '[')) {
		return nil, 0, false
	}
	delim = opt.Delimiter
	if delim == 0 {
		delim = detectDelimiter(bytes.TrimSuffix(headerLine, []byte("\n")))
	}
	if delim >= 0x80 || delim == '"' || delim == '\r' || delim == '\n' || delim == 0 {
		return nil, 0, false
	}
	headerReader := csv.NewReader(bytes.NewReader(headerLine))
	headerReader.Comma = delim
	headerReader.FieldsPerRecord = -1
	header, err = headerReader.Read()
	if err != nil {
		return nil, 0, false
	}
	header = trimAll(header)
	if len(header) == 1 && header[0] == "" {
		return nil, 0, false
	}
	return header, delim, true
}

// noteBlock adds a parsed block's dropped and outside rows, their reasons
// and lines, to the builder, and renumbers the block's segment codes as
// the set's, in the order the names first appear, as Read numbers them.
// line is the physical line of the block's first row.
func (b *builder) noteBlock(blk *block, line int) {
	b.dropped += blk.dropped
	b.outside.Rows += blk.outside
	for _, at := range blk.outsideLines {
		if len(b.outside.Lines) < MaxOutsideLines {
			b.outside.Lines = append(b.outside.Lines, line+at)
		}
	}
	for _, ev := range blk.reasons {
		if len(b.droppedReasons) < maxDroppedReasons {
			b.droppedReasons = append(b.droppedReasons, (&ParseError{File: b.source, Line: line + ev.line, Column: ev.column, Err: ev.err}).Error())
		}
	}
	if b.segmentCol >= 0 {
		remap := make([]int32, len(blk.segNames))
		for local, name := range blk.segNames {
			remap[local] = b.segmentCode(name)
		}
		for i, local := range blk.segments {
			blk.segments[i] = remap[local]
		}
	}
}

// reserve makes the builder's columns empty with room for n rows.
func (b *builder) reserve(n int) {
	b.scores = make([]float64, 0, n)
	b.labels = make([]bool, 0, n)
	if b.weightCol >= 0 {
		b.weights = make([]float64, 0, n)
	}
	if b.segmentCol >= 0 {
		b.segments = make([]int32, 0, n)
	}
	if b.idCol >= 0 {
		b.ids = make([]string, 0, n)
	}
	if b.timeCol >= 0 {
		b.times = make([]int64, 0, n)
	}
	if b.compareCol >= 0 {
		b.compare = make([]float64, 0, n)
	}
}

// appendBlock appends a parsed block's rows to the builder's columns.
func (b *builder) appendBlock(blk *block) {
	b.scores = append(b.scores, blk.scores...)
	b.labels = append(b.labels, blk.labels...)
	if b.weightCol >= 0 {
		b.weights = append(b.weights, blk.weights...)
	}
	if b.segmentCol >= 0 {
		b.segments = append(b.segments, blk.segments...)
	}
	if b.idCol >= 0 {
		b.ids = append(b.ids, blk.ids...)
	}
	if b.timeCol >= 0 {
		b.times = append(b.times, blk.times...)
	}
	if b.compareCol >= 0 {
		b.compare = append(b.compare, blk.compare...)
	}
}

func isSpaceByte(c byte) bool { return c == ' ' || c == '\t' || c == '\r' || c == '\n' }

// blockParser parses blocks of lines for one builder; its methods may run
// on several goroutines at once and only read the builder.
type blockParser struct {
	b      *builder
	delim  byte
	mark   byte              // the decimal mark, '.' or ','
	fields int               // fields in the header
	spare  chan blockColumns // parsed columns already copied into place, for reuse
	// digit, when not nil, is what each block is bucketed on as soon as
	// it is parsed, its scores left as keys (see bucketBlock).
	digit *blockDigit
}

// blockColumns are the columns parsed from one block.
type blockColumns struct {
	scores  []float64
	labels  []bool
	weights []float64
}

func blkWeights(blk *block) []float64 {
	if blk.weights == nil {
		return nil
	}
	return blk.weights[:0]
}

// produce reads in as blocks of whole lines and parses them on every core.
// It returns the blocks in input order; each is parsed once its done
// channel is closed. Closing stop ends the reading early. After the
// channel closes, *readErr holds the error that ended the reading, if any
// besides the end of the input.
func (p *blockParser) produce(in io.Reader) (<-chan *block, *error, chan struct{}) {
	workers := max(1, runtime.GOMAXPROCS(0))
	ordered := make(chan *block, workers+1)
	work := make(chan *block, workers+1)
	stop := make(chan struct{})
	readErr := new(error)
	// free holds parsed blocks' buffers for reuse, so that reading makes
	// no garbage.
	free := make(chan []byte, 2*workers+2)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for blk := range work {
				p.parse(blk)
				if p.digit != nil {
					p.bucketBlock(blk)
				}
				buf := blk.data[:cap(blk.data)]
				blk.data = nil
				close(blk.done)
				select {
				case free <- buf:
				default:
				}
			}
		}()
	}
	go func() {
		defer close(ordered)
		defer func() { close(work); wg.Wait() }()
		var carry []byte
		seq := 0
		for {
			var buf []byte
			select {
			case buf = <-free:
			default:
			}
			if want := max(blockSize, 2*len(carry)); cap(buf) < want {
				buf = make([]byte, want)
			}
			buf = buf[:cap(buf)]
			n := copy(buf, carry)
			m, err := fill(in, buf[n:])
			buf = buf[:n+m]
			end := err == io.EOF
			if end {
				inputEnded()
			}
			if err != nil && !end {
				*readErr = err
				return
			}
			data := buf
			if !end {
				cut := bytes.LastIndexByte(buf, '\n')
				if cut < 0 {
					if len(buf) > MaxLine {
						*readErr = ErrTooLong // Read says where
						return
					}
					carry = append(carry[:0], buf...) // a line longer than a block
					continue
				}
				data = buf[:cut+1]
				carry = append(carry[:0], buf[cut+1:]...)
			}
			if len(data) > 0 {
				blk := &block{data: data, seq: seq, done: make(chan struct{})}
				seq++
				select {
				case ordered <- blk:
				case <-stop:
					return
				}
				work <- blk
			}
			if end {
				return
			}
		}
	}()
	return ordered, readErr, stop
}

// makeColumns gives blk room for rowsAtMost rows in each column read,
// reusing a spare block's scores, labels and weights when one is big
// enough.
func (p *blockParser) makeColumns(blk *block, rowsAtMost int) {
	b := p.b
	var spare blockColumns
	select {
	case spare = <-p.spare:
	default:
	}
	if b.segmentCol >= 0 {
		blk.segments = make([]int32, 0, rowsAtMost)
	}
	if b.idCol >= 0 {
		blk.ids = make([]string, 0, rowsAtMost)
	}
	if b.timeCol >= 0 {
		blk.times = make([]int64, 0, rowsAtMost)
	}
	if b.compareCol >= 0 {
		blk.compare = make([]float64, 0, rowsAtMost)
	}
	if cap(spare.scores) >= rowsAtMost && (b.weightCol < 0 || cap(spare.weights) >= rowsAtMost) {
		blk.scores, blk.labels, blk.weights = spare.scores, spare.labels, spare.weights
	} else {
		blk.scores = make([]float64, 0, rowsAtMost)
		blk.labels = make([]bool, 0, rowsAtMost)
		if b.weightCol >= 0 {
			blk.weights = make([]float64, 0, rowsAtMost)
		}
	}
}

// parse parses the lines of blk into its columns, stopping at the first
// error or at a line that Read must take.
func (p *blockParser) parse(blk *block) {
	b := p.b
	data := blk.data
	rowsAtMost := bytes.Count(data, []byte{'\n'}) + 1
	blk.size = len(data)
	p.makeColumns(blk, rowsAtMost)
	blk.newlines = rowsAtMost - 1
	quotes := bytes.IndexByte(data, '"') >= 0
	delim := p.delim
	// The commonest table, score then a 0/1 label, has a path of its own;
	// it reads no other column, so it is off when one of the two is also
	// named as a weight, segment, id, time or second score column.
	twoColumns := p.fields == 2 && b.scoreCol == 0 && b.labelCol == 1 && b.opt.Positive == "" &&
		b.weightCol < 0 && b.segmentCol < 0 && b.idCol < 0 && b.timeCol < 0 && b.compareCol < 0
	var cells [7][]byte // score, label, weight, segment, id, time, compare
	for line := 0; len(data) > 0; line++ {
		if twoColumns {
			if rest, ok := p.plainRow(blk, data); ok {
				data = rest
				if blk.scores[len(blk.scores)-1] > 1 { // plainRow reads no sign
					blk.noteOutside(line)
				}
				continue
			}
		}
		// One pass over the row finds its end and its cells.
		field, start, end := 0, 0, 0
		cells = [7][]byte{}
		for ; end < len(data); end++ {
			c := data[end]
			if c == '\n' {
				break
			}
			if c == delim {
				p.keep(&cells, field, data[start:end])
				field++
				start = end + 1
			}
		}
		if end > MaxLine {
			blk.event = &rowEvent{decline: true} // Read says where
			return
		}
		row := data[:end]
		if end < len(data) {
			data = data[end+1:]
		} else {
			data = nil
		}
		if n := len(row); n > 0 && row[n-1] == '\r' {
			row = row[:n-1]
		}
		p.keep(&cells, field, row[start:])
		field++
		if quotes && bytes.IndexByte(row, '"') >= 0 {
			if ev := p.quotedRow(blk, line, row); ev != nil {
				blk.event = ev
				return
			}
			continue
		}
		if field == 1 && len(bytes.TrimSpace(row)) == 0 {
			continue // a blank line
		}
		if field != p.fields {
			blk.event = &rowEvent{line: line, err: fmt.Errorf("%w: row has %d, header has %d", ErrRagged, field, p.fields)}
			return
		}
		if ev := p.addRow(blk, line, cells); ev != nil {
			blk.event = ev
			return
		}
	}
}

// plainRow reads one row of the form digits[.digits] delimiter 0|1, then
// an optional carriage return and a line feed or the end of the block, in
// a single pass over its bytes. ok is false, and nothing is read, for a
// row of any other form, which the general path then reads.
func (p *blockParser) plainRow(blk *block, data []byte) (rest []byte, ok bool) {
	var mantissa uint64
	digits, fraction, i := 0, -1, 0
	for ; i < len(data); i++ {
		c := data[i]
		if c >= '0' && c <= '9' {
			mantissa = mantissa*10 + uint64(c-'0')
			digits++
			if fraction >= 0 {
				fraction++
			}
			continue
		}
		if c == p.mark && fraction < 0 {
			fraction = 0
			continue
		}
		break
	}
	if digits == 0 || digits > 15 || i+1 >= len(data) || data[i] != p.delim || (data[i+1] != '0' && data[i+1] != '1') {
		return nil, false
	}
	end := i + 2
	if end < len(data) && data[end] == '\r' {
		end++
	}
	if end < len(data) {
		if data[end] != '\n' {
			return nil, false
		}
		end++
	}
	score := float64(mantissa)
	if fraction > 0 {
		score /= pow10[fraction] // exact as in plainFloat
	}
	blk.scores = append(blk.scores, score)
	blk.labels = append(blk.labels, data[i+1] == '1')
	return data[end:], true
}

// keep puts the text of a field into cells when it is a column in use.
func (p *blockParser) keep(cells *[7][]byte, field int, text []byte) {
	b := p.b
	if field == b.scoreCol {
		cells[0] = text
	}
	if field == b.labelCol {
		cells[1] = text
	}
	if field == b.weightCol {
		cells[2] = text
	}
	if field == b.segmentCol {
		cells[3] = text
	}
	if field == b.idCol {
		cells[4] = text
	}
	if field == b.timeCol {
		cells[5] = text
	}
	if field == b.compareCol {
		cells[6] = text
	}
}

// quotedRow parses a row holding a quote with encoding/csv, as Read does;
// a row that does not parse on its own is left to Read.
func (p *blockParser) quotedRow(blk *block, line int, row []byte) *rowEvent {
	r := csv.NewReader(bytes.NewReader(row))
	r.Comma = rune(p.delim)
	r.FieldsPerRecord = -1
	record, err := r.Read()
	if err != nil {
		return &rowEvent{decline: true}
	}
	if _, err := r.Read(); err != io.EOF {
		return &rowEvent{decline: true}
	}
	if len(record) == 1 && len(bytes.TrimSpace([]byte(record[0]))) == 0 {
		return nil // a blank line
	}
	if len(record) != p.fields {
		return &rowEvent{line: line, err: fmt.Errorf("%w: row has %d, header has %d", ErrRagged, len(record), p.fields)}
	}
	var cells [7][]byte
	cells[0] = []byte(record[p.b.scoreCol])
	if p.b.labelCol >= 0 {
		cells[1] = []byte(record[p.b.labelCol])
	}
	if p.b.weightCol >= 0 {
		cells[2] = []byte(record[p.b.weightCol])
	}
	if p.b.segmentCol >= 0 {
		cells[3] = []byte(record[p.b.segmentCol])
	}
	if p.b.idCol >= 0 {
		cells[4] = []byte(record[p.b.idCol])
	}
	if p.b.timeCol >= 0 {
		cells[5] = []byte(record[p.b.timeCol])
	}
	if p.b.compareCol >= 0 {
		cells[6] = []byte(record[p.b.compareCol])
	}
	return p.addRow(blk, line, cells)
}

// scoreCell parses a score cell as parseScore does, trying the fast
// parser first; mark is the decimal mark.
func scoreCell(cell []byte, mark byte) (float64, error) {
	if v, ok := plainFloat(cell, mark); ok {
		if v == 0 {
			v = 0 // fold -0 into +0, as parseScore does
		}
		return v, nil
	}
	return parseScore(string(cell), mark == ',')
}

// invalidScore handles a bad score cell in column col: the row is dropped
// and counted under DropInvalid (nil is returned), else it is an error.
func (p *blockParser) invalidScore(blk *block, line, col int, err error) *rowEvent {
	event := rowEvent{line: line, column: p.b.header[col], err: err}
	if !p.b.opt.DropInvalid {
		return &event
	}
	blk.dropped++
	if len(blk.reasons) < maxDroppedReasons {
		blk.reasons = append(blk.reasons, event)
	}
	return nil
}

// addRow reads the cells of one row as builder.add does.
func (p *blockParser) addRow(blk *block, line int, cells [7][]byte) *rowEvent {
	b := p.b
	score, err := scoreCell(cells[0], p.mark)
	if err != nil {
		return p.invalidScore(blk, line, b.scoreCol, err)
	}
	var compare float64
	if b.compareCol >= 0 {
		if compare, err = scoreCell(cells[6], p.mark); err != nil {
			return p.invalidScore(blk, line, b.compareCol, err)
		}
	}
	var when int64
	if b.timeCol >= 0 {
		var err error
		if when, err = parseTime(string(cells[5]), b.opt.TimeLayout, b.opt.TimeLocation); err != nil {
			return &rowEvent{line: line, column: b.header[b.timeCol], err: err}
		}
	}
	positive := false
	if b.labelCol >= 0 {
		cell := cells[1]
		switch {
		case b.opt.Positive == "" && len(cell) == 1 && cell[0] == '1':
			positive = true
		case b.opt.Positive == "" && len(cell) == 1 && cell[0] == '0':
		default:
			var err error
			if positive, err = b.parseLabel(string(cell)); err != nil {
				return &rowEvent{line: line, column: b.header[b.labelCol], err: err}
			}
		}
	}
	if b.weightCol >= 0 {
		w, ok := plainFloat(cells[2], p.mark)
		if !ok || w < 0 {
			var err error
			if w, err = parseWeight(string(cells[2]), p.mark == ','); err != nil {
				return &rowEvent{line: line, column: b.header[b.weightCol], err: err}
			}
		}
		blk.weights = append(blk.weights, w)
	}
	if b.segmentCol >= 0 {
		code, ok := blk.segIndex[string(cells[3])]
		if !ok {
			if blk.segIndex == nil {
				blk.segIndex = map[string]int32{}
			}
			name := string(cells[3])
			code = int32(len(blk.segNames))
			blk.segIndex[name] = code
			blk.segNames = append(blk.segNames, name)
		}
		blk.segments = append(blk.segments, code)
	}
	if b.idCol >= 0 {
		blk.ids = append(blk.ids, string(cells[4]))
	}
	if b.timeCol >= 0 {
		blk.times = append(blk.times, when)
	}
	if b.compareCol >= 0 {
		blk.compare = append(blk.compare, compare)
	}
	if !(score >= 0 && score <= 1) {
		blk.noteOutside(line)
	}
	blk.scores = append(blk.scores, score)
	blk.labels = append(blk.labels, positive)
	return nil
}

// noteOutside counts a row at line whose score lies outside [0, 1].
func (blk *block) noteOutside(line int) {
	blk.outside++
	if len(blk.outsideLines) < MaxOutsideLines {
		blk.outsideLines = append(blk.outsideLines, line)
	}
}

// pow10 holds the powers of ten that float64 represents exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// plainFloat reads a number written as an optional sign, digits and an
// optional fraction after the decimal mark ('.' or ','), nothing else, with at most 15 digits in all. Such a
// number is an integer below 2^53 divided by a power of ten at most 1e22,
// both exact in float64, so the one correctly rounded division gives the
// same float64 as strconv.ParseFloat. ok is false for every other form
// (spaces, exponents, more digits, words), which the caller then reads with
// strconv.
func plainFloat(text []byte, mark byte) (value float64, ok bool) {
	i, negative := 0, false
	if len(text) > 0 && (text[0] == '-' || text[0] == '+') {
		negative = text[0] == '-'
		i = 1
	}
	var mantissa uint64
	digits, fraction := 0, -1
	for ; i < len(text); i++ {
		c := text[i]
		switch {
		case c >= '0' && c <= '9':
			mantissa = mantissa*10 + uint64(c-'0')
			digits++
			if fraction >= 0 {
				fraction++
			}
		case c == mark && fraction < 0:
			fraction = 0
		default:
			return 0, false
		}
	}
	if digits == 0 || digits > 15 {
		return 0, false
	}
	value = float64(mantissa)
	if fraction > 0 {
		value /= pow10[fraction]
	}
	if negative {
		value = -value
	}
	return value, true
}

// fill reads into buf until it is full or the reader fails, and returns
// io.EOF at the end of the input. Unlike io.ReadFull it passes on an
// io.ErrUnexpectedEOF of the reader itself, which is how a truncated gzip
// stream ends, instead of taking it for the end of the input.
func fill(r io.Reader, buf []byte) (int, error) {
	n := 0
	for n < len(buf) {
		m, err := r.Read(buf[n:])
		n += m
		if err != nil {
			return n, err
		}
	}
	return n, nil
}
