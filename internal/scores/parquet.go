package scores

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
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
// weights may be float, double or integer columns (decimals included) or
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
	if len(b.scores) == 0 && b.dropped == 0 {
		return nil, &ParseError{File: source, Err: ErrNoRows}
	}
	return b.finish(hex.EncodeToString(digest.Sum(nil)))
}

// readParquetFile adds the rows of one file; the first file's columns
// settle the builder's.
func (b *builder) readParquetFile(pf ParquetFile, first bool, digest io.Writer) error {
	source := pf.Name
	b.source = source
	fail := func(format string, args ...any) error {
		return &ParseError{File: source, Err: fmt.Errorf("%w: "+format, append([]any{ErrBadParquet}, args...)...)}
	}
	file, err := parquet.OpenFile(pf.Data, pf.Size)
	if err != nil {
		return fail("%v", err)
	}
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
	type wanted struct {
		col  int // index into header, -1 when not in use
		kind string
	}
	columns := []wanted{{b.scoreCol, "score"}, {b.labelCol, "label"}, {b.weightCol, "weight"}, {b.segmentCol, "segment"}, {b.idCol, "id"}}
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

	row := 0 // rows before the current row group
	for _, group := range file.RowGroups() {
		n := int(group.NumRows())
		chunks := group.ColumnChunks()
		values := make([][]parquet.Value, len(columns))
		for i, c := range columns {
			if c.col < 0 {
				continue
			}
			if values[i], err = readColumn(chunks[leaves[i].ColumnIndex], n); err != nil {
				return &ParseError{File: source, Column: header[c.col], Err: fmt.Errorf("%w: %v", ErrBadParquet, err)}
			}
		}
		for i := range n {
			line := row + i + 1
			at := func(col int) parquet.Value { return values[col][i] }
			if err := b.addParquet(line, leaves, at); err != nil {
				return err
			}
		}
		row += n
	}
	return nil
}

// readColumn reads the n values of one column chunk, nulls included.
func readColumn(chunk parquet.ColumnChunk, n int) ([]parquet.Value, error) {
	out := make([]parquet.Value, 0, n)
	pages := chunk.Pages()
	defer pages.Close()
	buf := make([]parquet.Value, 1024)
	for {
		page, err := pages.ReadPage()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		reader := page.Values()
		for {
			k, err := reader.ReadValues(buf)
			for _, v := range buf[:k] {
				out = append(out, v.Clone())
			}
			if err == io.EOF {
				break
			}
			if err != nil {
				parquet.Release(page)
				return nil, err
			}
		}
		parquet.Release(page)
	}
	if len(out) != n {
		return nil, fmt.Errorf("%d values in a row group of %d rows", len(out), n)
	}
	return out, nil
}

// addParquet reads one row as builder.add reads one of text; at returns
// the value of columns[i] (score, label, weight, segment, id).
func (b *builder) addParquet(line int, leaves []parquet.LeafColumn, at func(int) parquet.Value) error {
	column := func(col int) string { return b.header[col] }
	score, err := parquetNumber(at(0), leaves[0], parseScore)
	if err != nil {
		pe := &ParseError{File: b.source, Line: line, Column: column(b.scoreCol), Err: err}
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
	if b.labelCol >= 0 {
		if positive, err = b.parquetLabel(at(1), leaves[1]); err != nil {
			return &ParseError{File: b.source, Line: line, Column: column(b.labelCol), Err: err}
		}
	}
	if b.weightCol >= 0 {
		w, err := parquetNumber(at(2), leaves[2], parseWeight)
		if err != nil {
			return &ParseError{File: b.source, Line: line, Column: column(b.weightCol), Err: err}
		}
		b.weights = append(b.weights, w)
	}
	if b.segmentCol >= 0 {
		name := parquetText(at(3), leaves[3])
		code, ok := b.segIndex[name]
		if !ok {
			code = int32(len(b.segNames))
			b.segIndex[name] = code
			b.segNames = append(b.segNames, name)
		}
		b.segments = append(b.segments, code)
	}
	if b.idCol >= 0 {
		b.ids = append(b.ids, parquetText(at(4), leaves[4]))
	}
	b.scores = append(b.scores, score)
	b.labels = append(b.labels, positive)
	if b.opt.Progress != nil && len(b.scores)%progressEvery == 0 {
		b.opt.Progress(len(b.scores))
	}
	return nil
}

// parquetNumber reads a score or weight; parse is parseScore or
// parseWeight, which also judges numbers from numeric columns, so that the
// checks and messages are those of text.
func parquetNumber(v parquet.Value, leaf parquet.LeafColumn, parse func(string) (float64, error)) (float64, error) {
	if v.IsNull() {
		return parse("")
	}
	switch v.Kind() {
	case parquet.Float, parquet.Double, parquet.Int32, parquet.Int64:
		x, ok := numericValue(v, leaf)
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
		return parse(string(v.ByteArray()))
	}
	return 0, &valueError{sentinel: ErrBadParquet, value: v.Kind().String(), hint: "expected a number or text column"}
}

// numericValue returns a numeric value as float64, applying the scale of a
// decimal column and the sign of an unsigned one.
func numericValue(v parquet.Value, leaf parquet.LeafColumn) (float64, bool) {
	var lt *format.LogicalType
	if leaf.Node != nil {
		lt = leaf.Node.Type().LogicalType()
	}
	var unsigned bool
	scale := 0
	if lt != nil {
		switch t := lt.Value.(type) {
		case *format.DecimalType:
			scale = int(t.Scale)
		case *format.IntType:
			unsigned = !t.IsSigned
		}
	}
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

// parquetLabel reads a label: booleans as they are, numbers 1 and 0, text
// as Read reads it.
func (b *builder) parquetLabel(v parquet.Value, leaf parquet.LeafColumn) (bool, error) {
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
		return b.parseLabel(string(v.ByteArray()))
	}
	x, ok := numericValue(v, leaf)
	if !ok {
		return b.parseLabel(v.String())
	}
	return b.parseLabel(strconv.FormatFloat(x, 'g', -1, 64))
}

// parquetText returns a segment or id value as text; null is "".
func parquetText(v parquet.Value, leaf parquet.LeafColumn) string {
	if v.IsNull() {
		return ""
	}
	switch v.Kind() {
	case parquet.ByteArray, parquet.FixedLenByteArray:
		return string(bytes.Clone(v.ByteArray()))
	case parquet.Boolean:
		return strconv.FormatBool(v.Boolean())
	}
	if x, ok := numericValue(v, leaf); ok {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	return v.String()
}
