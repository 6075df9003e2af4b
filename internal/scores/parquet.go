package scores

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"math/big"
	"runtime"
	"runtime/debug"
	"slices"
	"strconv"
	"strings"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/format"
)

// InputParquet is the Options.Input value for Parquet files; ReadParquet
// reads them.
const InputParquet = "parquet"

// ParquetMagic is how a Parquet file begins (and ends).
var ParquetMagic = []byte("PAR1")

// ErrBadParquet is the sentinel of a Parquet file that cannot be read, or
// whose columns cannot hold what sill needs.
var ErrBadParquet = errors.New("unreadable parquet")

// ReadParquet reads a Parquet file of size bytes, as Spark, pandas and
// most tools write them, and returns it ranked, as Read does for text.
//
// Columns are found by name as Read finds them, with the same defaults; a
// column inside a group is named by its path joined with dots. Scores and
// weights may be float, double or integer columns, decimals (stored as
// integers or as byte arrays) or
// text holding numbers; a 32-bit float is read as its shortest decimal
// text, as a CSV export of the column would show it; labels may be boolean, integer or float columns
// (1 and 0) or text read as Read reads it, --positive included. A null
// reads like an empty cell: a null score is an invalid score (dropped with
// DropInvalid), a null label an unrecognised one. Repeated columns and the
// time and second score columns are not read from Parquet.
//
// Errors are *ParseError values; their Line is the 1-based row of the
// data (there is no header line), 0 when the error concerns the file.
func ReadParquet(r io.ReaderAt, size int64, source string, opt Options) (*Set, error) {
	return ReadParquetFiles([]ParquetFile{{Data: r, Size: size, Name: source}}, source, opt)
}

// ParquetFile is one file of a Parquet data set.
type ParquetFile struct {
	Data io.ReaderAt
	Size int64
	Name string // names the file in errors
}

// ReadParquetFiles reads the files of one Parquet data set, such as the
// part files Spark writes into a folder, as one set, in the order given;
// source names the whole set (Set.Source). Every file must have the
// columns of the first, in the same order. Errors name the file and its
// 1-based row; the digest covers the files' bytes one after the other.
// See ReadParquet for the columns.
func ReadParquetFiles(files []ParquetFile, source string, opt Options) (*Set, error) {
	if opt.TimeColumn != "" || opt.CompareColumn != "" {
		return nil, &ParseError{File: source, Err: fmt.Errorf("%w: time and second score columns are read from CSV and JSON Lines only", ErrBadParquet)}
	}
	if len(files) == 0 {
		return nil, &ParseError{File: source, Err: fmt.Errorf("%w: no parquet files", ErrBadParquet)}
	}
	b := &builder{opt: opt, source: source}
	digest := sha256.New()
	for i, pf := range files {
		if err := b.readParquetFile(pf, i == 0, digest); err != nil {
			return nil, err
		}
	}
	b.source = source
	if len(b.scores) == 0 {
		if b.dropped == 0 {
			return nil, &ParseError{File: source, Err: ErrNoRows}
		}
		b.scores, b.labels = nil, nil // as Read leaves them
	}
	if len(b.scores) >= returnMemoryRows {
		debug.FreeOSMemory() // the decoded row groups, before the sort's copy
	}
	return b.finish(hex.EncodeToString(digest.Sum(nil)))
}

// readParquetFile adds the rows of one file; the first file's columns
// settle the builder's. The library that decodes Parquet trusts the
// file's metadata: checkParquetLayout checks first what it does not, and a
// panic that a damaged page still causes in it, here or in a row group's
// goroutine, becomes an error naming the file, row group and column.
func (b *builder) readParquetFile(pf ParquetFile, first bool, digest io.Writer) (err error) {
	source := pf.Name
	b.source = source
	fail := func(format string, args ...any) error {
		return &ParseError{File: source, Err: fmt.Errorf("%w: "+format, append([]any{ErrBadParquet}, args...)...)}
	}
	if err := checkParquetEnds(pf); err != nil {
		return fail("%v", err)
	}
	stage := "the footer does not decode, expected Parquet file metadata"
	defer func() {
		if p := recover(); p != nil {
			err = fail("%s", stage)
		}
	}()
	file, err := parquet.OpenFile(pf.Data, pf.Size, parquet.SkipPageIndex(true), parquet.SkipBloomFilters(true))
	if err != nil {
		return fail("%s", stage)
	}
	if err := checkParquetLayout(file.Metadata(), pf.Size); err != nil {
		return fail("%v", err)
	}
	stage = "the schema does not describe the columns, expected a valid Parquet schema"
	if _, err := io.Copy(digest, io.NewSectionReader(pf.Data, 0, pf.Size)); err != nil {
		return &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
	}

	// The leaf columns, named by their paths, are the header.
	schema := file.Schema()
	paths := schema.Columns()
	header := make([]string, len(paths))
	for i, p := range paths {
		header[i] = strings.Join(p, ".")
	}
	if first {
		if err := b.resolve(header, 0); err != nil {
			return err
		}
	} else if strings.Join(header, "\x00") != strings.Join(b.header, "\x00") {
		return fail("columns %s, expected those of the first file, %s", quoteList(header), quoteList(b.header))
	}
	if groups := file.Metadata().RowGroups; len(groups) > 0 && len(groups[0].Columns) != len(paths) {
		return fail("%d column chunks in a row group, expected one for each of the schema's %d columns", len(groups[0].Columns), len(paths))
	}
	columns := []wantedColumn{{b.scoreCol, "score"}, {b.labelCol, "label"}, {b.weightCol, "weight"}, {b.segmentCol, "segment"}, {b.idCol, "id"}}
	leaves := make([]parquet.LeafColumn, len(columns))
	for i, c := range columns {
		if c.col < 0 {
			continue
		}
		leaf, ok := schema.Lookup(paths[c.col]...)
		if !ok {
			return fail("column %q is in the schema but cannot be looked up", header[c.col])
		}
		if leaf.MaxRepetitionLevel > 0 {
			return &ParseError{File: source, Column: header[c.col], Err: fmt.Errorf("%w: a repeated column, expected one %s per row", ErrBadParquet, c.kind)}
		}
		leaves[i] = leaf
	}

	// Make room for the file's rows at once rather than growing by appends,
	// up to a bound: the row count is the file's word, not yet its data.
	rows := int(min(file.NumRows(), parquetReserveRows))
	b.scores = slices.Grow(b.scores, rows)
	b.labels = slices.Grow(b.labels, rows)
	if b.weightCol >= 0 {
		b.weights = slices.Grow(b.weights, rows)
	}
	if b.segmentCol >= 0 {
		b.segments = slices.Grow(b.segments, rows)
	}
	// Row groups are decoded on every core, a few ahead, and added in
	// order; decoding only reads the builder.
	stage = "the row groups do not decode, expected row groups as the footer describes them"
	groups := file.RowGroups()
	type decoded struct {
		g    *decodedGroup
		err  error
		done chan struct{}
	}
	ahead := max(1, runtime.GOMAXPROCS(0))
	pending := make(chan *decoded, ahead)
	stop := make(chan struct{})
	defer close(stop)
	go func() {
		defer close(pending)
		first := 0 // the first row of the group, 0-based
		for index, group := range groups {
			d := &decoded{done: make(chan struct{})}
			select {
			case pending <- d:
			case <-stop:
				return
			}
			n := int(group.NumRows())
			go func(group parquet.RowGroup, index, first int) {
				defer close(d.done)
				place := rowGroupPlace{index: index, count: len(groups), first: first, data: pf.Data, chunks: file.Metadata().RowGroups[index].Columns}
				d.g, d.err = b.decodeRowGroup(group, n, columns, leaves, place)
			}(group, index, first)
			first += n
		}
	}()
	row := 0 // rows before the current row group
	for d := range pending {
		<-d.done
		if d.err != nil {
			return d.err
		}
		n := len(d.g.scores)
		for i := range n {
			if err := b.addDecoded(row+i+1, d.g, i); err != nil {
				return err
			}
		}
		row += n
	}
	return nil
}

// parquetReserveRows bounds the rows made room for before a file's row
// groups are read; beyond it the columns grow as rows are added.
const parquetReserveRows = 1 << 22

// parquetTail is the bytes after the footer: its length and the magic.
const parquetTail = 8

// checkParquetEnds checks what OpenFile reads first, so that a file too
// short or a footer length pointing outside the file is said so in words:
// the magic at both ends and a footer that fits between them.
func checkParquetEnds(pf ParquetFile) error {
	magic := len(ParquetMagic)
	if pf.Size < int64(magic+parquetTail) {
		return fmt.Errorf("%d bytes, expected at least %d: the magic %q at both ends and a footer", pf.Size, magic+parquetTail, ParquetMagic)
	}
	head := make([]byte, magic)
	if _, err := pf.Data.ReadAt(head, 0); err != nil {
		return fmt.Errorf("read the first bytes: %w", err)
	}
	if !bytes.Equal(head, ParquetMagic) {
		return fmt.Errorf("begins with %q, expected the magic %q", head, ParquetMagic)
	}
	tail := make([]byte, parquetTail)
	if _, err := pf.Data.ReadAt(tail, pf.Size-parquetTail); err != nil && err != io.EOF {
		return fmt.Errorf("read the last bytes: %w", err)
	}
	if !bytes.Equal(tail[4:], ParquetMagic) {
		return fmt.Errorf("ends with %q, expected the magic %q (a file cut short?)", tail[4:], ParquetMagic)
	}
	footer := int64(binary.LittleEndian.Uint32(tail[:4]))
	if room := pf.Size - int64(magic+parquetTail); footer > room || footer == 0 {
		return fmt.Errorf("footer length %d, expected 1 to %d for a file of %d bytes", footer, room, pf.Size)
	}
	return nil
}

// checkParquetLayout checks the footer's account of the data, which the
// decoding library takes on trust: row counts that are not negative and
// add up, and every column chunk inside the file's data, between the
// leading magic and the footer, with a value count that is not negative.
func checkParquetLayout(meta *format.FileMetaData, size int64) error {
	dataEnd := size - parquetTail // the footer's start is checked below, per chunk
	if meta.NumRows < 0 {
		return fmt.Errorf("footer gives %d rows, expected a count >= 0", meta.NumRows)
	}
	var rows int64
	for g, group := range meta.RowGroups {
		if group.NumRows < 0 || group.NumRows > meta.NumRows-rows {
			return fmt.Errorf("row group %d gives %d rows, expected 0 to %d of the file's %d", g+1, group.NumRows, meta.NumRows-rows, meta.NumRows)
		}
		rows += group.NumRows
		if len(group.Columns) != len(meta.RowGroups[0].Columns) {
			return fmt.Errorf("row group %d has %d column chunks, expected %d as the first", g+1, len(group.Columns), len(meta.RowGroups[0].Columns))
		}
		for c, chunk := range group.Columns {
			m := chunk.MetaData
			name := strings.Join(m.PathInSchema, ".")
			if name == "" {
				name = fmt.Sprintf("number %d", c+1)
			}
			if chunk.FilePath != "" {
				return fmt.Errorf("row group %d, column %q: data in another file %q, expected it in this one", g+1, name, chunk.FilePath)
			}
			start := m.DataPageOffset
			if m.DictionaryPageOffset != 0 {
				start = m.DictionaryPageOffset
			}
			switch {
			case m.NumValues < 0:
				return fmt.Errorf("row group %d, column %q: %d values, expected a count >= 0", g+1, name, m.NumValues)
			case start < int64(len(ParquetMagic)) || start > dataEnd:
				return fmt.Errorf("row group %d, column %q: data at byte %d, expected %d to %d", g+1, name, start, len(ParquetMagic), dataEnd)
			case m.TotalCompressedSize < 0 || m.TotalCompressedSize > dataEnd-start:
				return fmt.Errorf("row group %d, column %q: %d bytes of data from byte %d, expected 0 to %d within the file", g+1, name, m.TotalCompressedSize, start, dataEnd-start)
			}
		}
	}
	if rows != meta.NumRows {
		return fmt.Errorf("footer gives %d rows, its row groups %d", meta.NumRows, rows)
	}
	return nil
}

// rowGroupPlace says where a row group is, for errors.
type rowGroupPlace struct {
	index, count, first int // 0-based group, groups in the file, 0-based first row

	data   io.ReaderAt          // the file
	chunks []format.ColumnChunk // the group's column chunks, from the footer
}

func (p rowGroupPlace) String() string {
	return fmt.Sprintf("row group %d of %d", p.index+1, p.count)
}

// wantedColumn is a column the set needs: col indexes the header, -1 when
// the column is not in use.
type wantedColumn struct {
	col  int
	kind string
}

// decodedGroup holds the columns in use of one row group, converted as
// they are read; a value that does not convert leaves its error instead.
type decodedGroup struct {
	scores, weights         []float64
	labels                  []bool
	segments, ids           []string
	scoreErr, labelErr      map[int]error
	weightErr               map[int]error
	hasWeights, hasSegments bool
}

// decodeRowGroup reads and converts the columns of a row group; columns
// and leaves are score, label, weight, segment and id, col -1 when unused.
// A panic of the decoding library on a damaged page becomes an error
// naming the group and column: it may run on a goroutine of its own.
func (b *builder) decodeRowGroup(group parquet.RowGroup, n int, columns []wantedColumn, leaves []parquet.LeafColumn, place rowGroupPlace) (g *decodedGroup, err error) {
	column := ""
	defer func() {
		if p := recover(); p != nil {
			g, err = nil, &ParseError{File: b.source, Column: column, Err: fmt.Errorf("%w: %v (rows %d to %d): a page does not decode, expected pages as the column chunk's metadata describes them", ErrBadParquet, place, place.first+1, place.first+n)}
		}
	}()
	// The columns grow as values come rather than being made n long at
	// once: n is the footer's word, the values are the data.
	reserve := min(n, parquetReserveRows)
	g = &decodedGroup{scores: make([]float64, 0, reserve)}
	chunks := group.ColumnChunks()
	note := func(m *map[int]error, row int, err error) {
		if *m == nil {
			*m = map[int]error{}
		}
		(*m)[row] = err
	}
	for i, c := range columns {
		if c.col < 0 {
			continue
		}
		column = b.header[c.col]
		leaf := leaves[i]
		kind := kindOf(leaf)
		var visit func(row int, v parquet.Value)
		switch i {
		case 0:
			visit = func(row int, v parquet.Value) {
				x, err := parquetNumber(v, kind, parquetScore)
				if err != nil {
					note(&g.scoreErr, row, err)
				}
				g.scores = append(g.scores, x)
			}
		case 1:
			g.labels = make([]bool, 0, reserve)
			visit = func(row int, v parquet.Value) {
				positive, err := b.parquetLabel(v, kind)
				if err != nil {
					note(&g.labelErr, row, err)
				}
				g.labels = append(g.labels, positive)
			}
		case 2:
			g.weights, g.hasWeights = make([]float64, 0, reserve), true
			visit = func(row int, v parquet.Value) {
				w, err := parquetNumber(v, kind, parquetWeight)
				if err != nil {
					note(&g.weightErr, row, err)
				}
				g.weights = append(g.weights, w)
			}
		case 3:
			g.segments, g.hasSegments = make([]string, 0, reserve), true
			visit = func(row int, v parquet.Value) { g.segments = append(g.segments, parquetText(v, kind)) }
		case 4:
			g.ids = make([]string, 0, reserve)
			visit = func(row int, v parquet.Value) { g.ids = append(g.ids, parquetText(v, kind)) }
		}
		if leaf.ColumnIndex < 0 || leaf.ColumnIndex >= len(chunks) {
			return nil, &ParseError{File: b.source, Column: column, Err: fmt.Errorf("%w: %v has no chunk for the column, expected one for every column", ErrBadParquet, place)}
		}
		if leaf.ColumnIndex < len(place.chunks) {
			if err := checkPages(place.data, place.chunks[leaf.ColumnIndex].MetaData, int64(n)); err != nil {
				return nil, &ParseError{File: b.source, Column: column, Err: fmt.Errorf("%w: %v (rows %d to %d): %v", ErrBadParquet, place, place.first+1, place.first+n, err)}
			}
		}
		if err := eachValue(chunks[leaf.ColumnIndex], n, visit); err != nil {
			return nil, &ParseError{File: b.source, Column: column, Err: fmt.Errorf("%w: %v (rows %d to %d): %v", ErrBadParquet, place, place.first+1, place.first+n, err)}
		}
	}
	return g, nil
}

// eachValue calls visit with every value of a column chunk, nulls
// included, in row order; the chunk must hold n values.
func eachValue(chunk parquet.ColumnChunk, n int, visit func(row int, v parquet.Value)) error {
	pages := chunk.Pages()
	defer pages.Close()
	buf := make([]parquet.Value, 1024)
	row := 0
	for number := 1; ; number++ {
		page, err := pages.ReadPage()
		if err == io.EOF {
			break
		}
		if err != nil {
			return fmt.Errorf("page %d does not decode, expected pages as the column chunk's metadata describes them", number)
		}
		reader := page.Values()
		for {
			k, err := reader.ReadValues(buf)
			for _, v := range buf[:k] {
				if row >= n {
					parquet.Release(page)
					return fmt.Errorf("page %d goes past the group's %d rows, expected one value per row", number, n)
				}
				visit(row, v)
				row++
			}
			if err == io.EOF {
				break
			}
			if err != nil {
				parquet.Release(page)
				return fmt.Errorf("the values of page %d do not decode, expected values as its header describes them", number)
			}
		}
		parquet.Release(page)
	}
	if row != n {
		return fmt.Errorf("%d values for %d rows, expected one value per row", row, n)
	}
	return nil
}

// addDecoded adds row i of a decoded row group as builder.add adds a row
// of text: the score first (dropped with DropInvalid), then the label and
// the weight. line is the row's 1-based number in the file.
func (b *builder) addDecoded(line int, g *decodedGroup, i int) error {
	if err, bad := g.scoreErr[i]; bad {
		pe := &ParseError{File: b.source, Line: line, Column: b.header[b.scoreCol], Err: err}
		if b.opt.DropInvalid {
			b.dropped++
			if len(b.droppedReasons) < maxDroppedReasons {
				b.droppedReasons = append(b.droppedReasons, pe.Error())
			}
			return nil
		}
		return pe
	}
	positive := false
	if g.labels != nil {
		if err, bad := g.labelErr[i]; bad {
			return &ParseError{File: b.source, Line: line, Column: b.header[b.labelCol], Err: err}
		}
		positive = g.labels[i]
	}
	if g.hasWeights {
		if err, bad := g.weightErr[i]; bad {
			return &ParseError{File: b.source, Line: line, Column: b.header[b.weightCol], Err: err}
		}
		b.weights = append(b.weights, g.weights[i])
	}
	if g.hasSegments {
		b.segments = append(b.segments, b.segmentCode(g.segments[i]))
	}
	if g.ids != nil {
		b.ids = append(b.ids, g.ids[i])
	}
	b.noteOutside(line, g.scores[i])
	b.scores = append(b.scores, g.scores[i])
	b.labels = append(b.labels, positive)
	if b.opt.Progress != nil && len(b.scores)%progressEvery == 0 {
		b.opt.Progress(len(b.scores))
	}
	return nil
}

// parquetScore and parquetWeight read the text of a Parquet value as a
// score or a weight, always with a decimal point.
func parquetScore(text string) (float64, error)  { return parseScore(text, false) }
func parquetWeight(text string) (float64, error) { return parseWeight(text, false) }

// parquetNumber reads a score or weight; parse is parquetScore or
// parquetWeight, which also judges numbers from numeric columns, so that the
// checks and messages are those of text.
func parquetNumber(v parquet.Value, kind numberKind, parse func(string) (float64, error)) (float64, error) {
	if v.IsNull() {
		return parse("")
	}
	switch v.Kind() {
	case parquet.Float, parquet.Double, parquet.Int32, parquet.Int64:
		x, ok := numericValue(v, kind)
		if !ok {
			return parse(v.String())
		}
		if math.IsNaN(x) || math.IsInf(x, 0) || x < 0 {
			// Let the text reader word the error (and accept -0 as text does).
			return parse(strconv.FormatFloat(x, 'g', -1, 64))
		}
		if x == 0 {
			x = 0 // fold -0 into +0, as parseScore does
		}
		return x, nil
	case parquet.ByteArray, parquet.FixedLenByteArray:
		if kind.decimal {
			x, _ := decimalBytes(v.ByteArray(), kind.scale)
			return parse(strconv.FormatFloat(x, 'g', -1, 64))
		}
		return parse(string(v.ByteArray()))
	}
	return 0, &valueError{sentinel: ErrBadParquet, value: v.Kind().String(), hint: "expected a number or text column"}
}

// numberKind is what a numeric column's logical type says about its
// values: the scale of a decimal, and whether an integer is unsigned.
type numberKind struct {
	scale    int
	unsigned bool
	decimal  bool // a decimal column, whose byte arrays hold unscaled integers
}

// kindOf reads the numberKind of a leaf column once.
func kindOf(leaf parquet.LeafColumn) numberKind {
	var k numberKind
	if leaf.Node == nil {
		return k
	}
	if lt := leaf.Node.Type().LogicalType(); lt != nil {
		switch t := lt.Value.(type) {
		case *format.DecimalType:
			k.scale, k.decimal = int(t.Scale), true
		case *format.IntType:
			k.unsigned = !t.IsSigned
		}
	}
	return k
}

// numericValue returns a numeric value as float64, applying the scale of a
// decimal column and the sign of an unsigned one.
func numericValue(v parquet.Value, kind numberKind) (float64, bool) {
	scale, unsigned := kind.scale, kind.unsigned
	var x float64
	switch v.Kind() {
	case parquet.Float:
		// The float64 of the float's shortest decimal text, as a CSV
		// export of the column would give: 0.1 rather than 0.100000001.
		x, err := strconv.ParseFloat(strconv.FormatFloat(float64(v.Float()), 'g', -1, 32), 64)
		return x, err == nil
	case parquet.Double:
		return v.Double(), true
	case parquet.Int32:
		x = float64(v.Int32())
		if unsigned {
			x = float64(v.Uint32())
		}
	case parquet.Int64:
		x = float64(v.Int64())
		if unsigned {
			x = float64(v.Uint64())
		}
	case parquet.ByteArray, parquet.FixedLenByteArray:
		if !kind.decimal {
			return 0, false
		}
		return decimalBytes(v.ByteArray(), scale)
	default:
		return 0, false
	}
	if scale > 0 {
		// The text of the decimal, read as text is, so that 0.15 stored as
		// 15 with scale 2 gives the float64 nearest 0.15.
		return decimalValue(v, scale, unsigned)
	}
	return x, true
}

// decimalValue reads an unscaled integer with a scale as its decimal text.
func decimalValue(v parquet.Value, scale int, unsigned bool) (float64, bool) {
	var digits string
	switch {
	case v.Kind() == parquet.Int32 && unsigned:
		digits = strconv.FormatUint(uint64(v.Uint32()), 10)
	case v.Kind() == parquet.Int32:
		digits = strconv.FormatInt(int64(v.Int32()), 10)
	case unsigned:
		digits = strconv.FormatUint(v.Uint64(), 10)
	default:
		digits = strconv.FormatInt(v.Int64(), 10)
	}
	sign := ""
	if strings.HasPrefix(digits, "-") {
		sign, digits = "-", digits[1:]
	}
	if len(digits) <= scale {
		digits = strings.Repeat("0", scale-len(digits)+1) + digits
	}
	text := sign + digits[:len(digits)-scale] + "." + digits[len(digits)-scale:]
	x, err := strconv.ParseFloat(text, 64)
	return x, err == nil
}

// decimalBytes reads a decimal stored as a byte array, as writers store
// decimals of more than 18 digits: a big-endian two's complement unscaled
// integer, read through its decimal text with the scale as decimalValue
// reads one. ok is false for an empty array.
func decimalBytes(data []byte, scale int) (float64, bool) {
	if len(data) == 0 {
		return 0, false
	}
	unscaled := new(big.Int).SetBytes(data)
	if data[0]&0x80 != 0 {
		unscaled.Sub(unscaled, new(big.Int).Lsh(big.NewInt(1), uint(8*len(data))))
	}
	digits := unscaled.String()
	if scale <= 0 {
		x, err := strconv.ParseFloat(digits, 64)
		return x, err == nil
	}
	sign := ""
	if strings.HasPrefix(digits, "-") {
		sign, digits = "-", digits[1:]
	}
	if len(digits) <= scale {
		digits = strings.Repeat("0", scale-len(digits)+1) + digits
	}
	x, err := strconv.ParseFloat(sign+digits[:len(digits)-scale]+"."+digits[len(digits)-scale:], 64)
	return x, err == nil
}

// parquetLabel reads a label: booleans as they are, numbers 1 and 0, text
// as Read reads it.
func (b *builder) parquetLabel(v parquet.Value, kind numberKind) (bool, error) {
	if v.IsNull() {
		return b.parseLabel("")
	}
	switch v.Kind() {
	case parquet.Boolean:
		if b.opt.Positive != "" {
			return b.parseLabel(strconv.FormatBool(v.Boolean()))
		}
		return v.Boolean(), nil
	case parquet.ByteArray, parquet.FixedLenByteArray:
		if !kind.decimal {
			return b.parseLabel(string(v.ByteArray()))
		}
	}
	x, ok := numericValue(v, kind)
	if !ok {
		return b.parseLabel(v.String())
	}
	if b.opt.Positive == "" && (x == 0 || x == 1) {
		return x == 1, nil // what parseLabel gives for "0" and "1"
	}
	return b.parseLabel(strconv.FormatFloat(x, 'g', -1, 64))
}

// parquetText returns a segment or id value as text; null is "".
func parquetText(v parquet.Value, kind numberKind) string {
	if v.IsNull() {
		return ""
	}
	switch v.Kind() {
	case parquet.ByteArray, parquet.FixedLenByteArray:
		if !kind.decimal {
			return string(bytes.Clone(v.ByteArray()))
		}
	case parquet.Boolean:
		return strconv.FormatBool(v.Boolean())
	}
	if x, ok := numericValue(v, kind); ok {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	return v.String()
}
