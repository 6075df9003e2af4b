package scores

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
)

// Column names of a counts table, matched without regard to case.
const (
	PositivesColumn    = "positives"
	NegativesColumn    = "negatives"
	UnrecognisedColumn = "unrecognised" // optional
)

// ErrBadCount is the sentinel of a count that is not a whole number >= 0,
// and of cases whose label was neither positive nor negative.
var ErrBadCount = errors.New("invalid count")

// maxCount is the largest count read: float64 holds every whole number up
// to it, so sums of counts stay exact.
const maxCount = 1 << 53

// ReadCounts reads a counts table: delimited text with a header line and
// one row per score (and segment, when Options.SegmentColumn is set) giving
// how many true and false cases have that score. The score column is found
// as Read finds it; the counts are the columns "positives" and "negatives",
// and an optional column "unrecognised" counts cases whose label was
// neither, which is an error when it is not zero, as such a label is in
// Read. Counts must be whole numbers >= 0 (12 and 12.0 are both read).
// A score may appear on several rows; its counts add up. A row whose score
// is empty, \N or NULL (in any case), as engines export NULL, counts cases
// whose score was NULL or not a number where they were counted (the
// warehouse query's rows of such cases): they are dropped, with or without
// DropInvalid; Set.Dropped counts them and Set.NoScore by label. The
// unrecognised column of such a row is not refused.
//
// The Set holds one row per score and label with a non-zero count, weighted
// by that count and marked a counts table (Set.CountsTable), so that every
// figure of the curve, the cut rules and the intervals comes out as from
// the raw rows the table counts, in memory proportional to the rows of the
// table. The read order
// of a score's rows is positives first, then negatives.
//
// Options.Input, Delimiter, ScoreColumn, SegmentColumn, LowerIsRiskier and
// DropInvalid apply; a dropped score drops the cases of its row, which
// Set.Dropped counts. Options.LabelColumn, WeightColumn, IDColumn, Positive
// and NoLabels must be empty: a counts table has no such columns. Errors
// are *ParseError values with 1-based physical lines, as in Read.
func ReadCounts(r io.Reader, source string, opt Options) (*Set, error) {
	if err := checkCountsOptions(opt, source); err != nil {
		return nil, err
	}
	digest := sha256.New()
	hashed := io.TeeReader(r, digest)
	in, err := openInput(hashed, source)
	if err != nil {
		return nil, err
	}
	if opt.Input == InputAuto && sniff(in) == InputJSONL {
		return nil, &ParseError{File: source, Err: errors.New(`JSON Lines (the first line begins with "{"), expected a counts table: delimited text with a header line naming score, positives and negatives`)}
	}
	b := &builder{opt: opt, source: source}
	cr, header, err := b.readHeader(in)
	if err != nil {
		return nil, err
	}
	// The score and segment columns as Read finds them; the counts by name.
	b.opt.NoLabels = true
	if err := b.resolve(header, 1); err != nil {
		return nil, err
	}
	if err := b.useDecimalComma(b.delim, b.firstRow); err != nil {
		return nil, err
	}
	t, err := newCountsTable(b, header)
	if err != nil {
		return nil, err
	}
	for {
		record, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, b.csvError(err)
		}
		line, _ := cr.FieldPos(0)
		if len(record) == 1 && strings.TrimSpace(record[0]) == "" {
			continue // a blank line
		}
		if err := t.add(record, line); err != nil {
			return nil, err
		}
	}
	if _, err := io.Copy(io.Discard, hashed); err != nil {
		return nil, &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
	}
	if len(b.scores) == 0 && b.dropped == 0 {
		return nil, &ParseError{File: source, Err: ErrNoRows}
	}
	if len(b.scores) == 0 && t.sawNoScore {
		// Every case on the warehouse query's row of no score: a report
		// of nothing would follow (as when the score column holds text).
		n := t.noScore
		return nil, &ParseError{File: source, Column: header[b.scoreCol], Err: fmt.Errorf("%w: all %d cases are on rows with no score (%d true, %d false, %d with neither label), where it was NULL or not a number when they were counted (a score column the engine stores as text counts as not a number), expected at least one row with a score",
			ErrNoScoredRows, n.Positives+n.Negatives+n.Neither, n.Positives, n.Negatives, n.Neither)}
	}
	if b.weights == nil {
		b.weights = []float64{}
	}
	set, err := b.finish(hex.EncodeToString(digest.Sum(nil)))
	if err != nil {
		return nil, err
	}
	set.countCases()
	if t.sawNoScore {
		set.noScore = &t.noScore
	}
	set.labelColumn = header[t.positivesCol] + "/" + header[t.negativesCol]
	return set, nil
}

// checkCountsOptions refuses the options that do not apply to a counts
// table.
func checkCountsOptions(opt Options, source string) error {
	switch {
	case opt.LabelColumn != "" || opt.WeightColumn != "" || opt.IDColumn != "" || opt.TimeColumn != "" || opt.CompareColumn != "":
		return &ParseError{File: source, Err: errors.New("a counts table has score, positives and negatives columns (and a segment column): label, weight, id, time and compare columns do not apply")}
	case opt.Positive != "":
		return &ParseError{File: source, Err: ErrPositiveInCounts}
	case opt.NoLabels:
		return &ParseError{File: source, Err: errors.New("a counts table counts the labels already: it is not read without labels")}
	case opt.Input == InputJSONL:
		return &ParseError{File: source, Err: errors.New("a counts table is read as delimited text, not JSON Lines")}
	}
	return nil
}

// countsTable reads the rows of a counts table into its builder.
type countsTable struct {
	b                                           *builder
	header                                      []string
	positivesCol, negativesCol, unrecognisedCol int
	noScore                                     LabelCounts // cases with no score, by label
	sawNoScore                                  bool
}

// newCountsTable finds the count columns in header.
func newCountsTable(b *builder, header []string) (*countsTable, error) {
	t := &countsTable{b: b, header: header, positivesCol: -1, negativesCol: -1, unrecognisedCol: -1}
	for i, h := range header {
		switch {
		case strings.EqualFold(h, PositivesColumn):
			t.positivesCol = i
		case strings.EqualFold(h, NegativesColumn):
			t.negativesCol = i
		case strings.EqualFold(h, UnrecognisedColumn):
			t.unrecognisedCol = i
		}
	}
	for _, need := range []struct {
		col  int
		name string
	}{{t.positivesCol, PositivesColumn}, {t.negativesCol, NegativesColumn}} {
		if need.col < 0 {
			return nil, &ParseError{File: b.source, Line: 1, Column: need.name, Err: fmt.Errorf("%w in header %s, expected score, %s and %s columns", ErrMissingColumn, quoteList(header), PositivesColumn, NegativesColumn)}
		}
	}
	return t, nil
}

// count reads the count in column col of a row.
func (t *countsTable) count(record []string, col, line int) (float64, error) {
	text := strings.TrimSpace(record[col])
	number, err := numberText(text, t.b.comma)
	if err != nil {
		return 0, &ParseError{File: t.b.source, Line: line, Column: t.header[col], Err: markError(ErrBadCount, text, err, "expected a whole number of cases >= 0")}
	}
	v, err := parseDecimal(number)
	if err != nil || !(v >= 0 && v <= maxCount) || v != math.Trunc(v) {
		return 0, &ParseError{File: t.b.source, Line: line, Column: t.header[col], Err: &valueError{sentinel: ErrBadCount, value: text, hint: "expected a whole number of cases >= 0"}}
	}
	return v, nil
}

// add reads one row of the table, at physical line line.
func (t *countsTable) add(record []string, line int) error {
	b, header, source := t.b, t.header, t.b.source
	if len(record) != len(header) {
		return &ParseError{File: source, Line: line, Err: fmt.Errorf("%w: row has %d, header has %d", ErrRagged, len(record), len(header))}
	}
	positives, err := t.count(record, t.positivesCol, line)
	if err != nil {
		return err
	}
	negatives, err := t.count(record, t.negativesCol, line)
	if err != nil {
		return err
	}
	other := 0.0
	if t.unrecognisedCol >= 0 {
		if other, err = t.count(record, t.unrecognisedCol, line); err != nil {
			return err
		}
	}
	if isNull(record[b.scoreCol]) {
		// The warehouse query's row of cases whose score was NULL or
		// not a number: dropped, whatever their labels.
		b.dropped += int(positives + negatives + other)
		t.noScore.Positives += int(positives)
		t.noScore.Negatives += int(negatives)
		t.noScore.Neither += int(other)
		t.sawNoScore = true
		if len(b.droppedReasons) < maxDroppedReasons {
			pe := &ParseError{File: source, Line: line, Column: header[b.scoreCol], Err: fmt.Errorf("%v case(s) with no score (NULL or not a number where they were counted): %v true, %v false, %v with neither label", positives+negatives+other, positives, negatives, other)}
			b.droppedReasons = append(b.droppedReasons, pe.Error())
		}
		return nil
	}
	if other > 0 {
		return &ParseError{File: source, Line: line, Column: header[t.unrecognisedCol], Err: fmt.Errorf("%w: %v case(s) with %w, expected none", ErrBadCount, other, ErrNeitherLabel)}
	}
	score, err := parseScore(record[b.scoreCol], b.comma)
	if err != nil {
		pe := &ParseError{File: source, Line: line, Column: header[b.scoreCol], Err: err}
		if !b.opt.DropInvalid {
			return pe
		}
		b.dropped += int(positives + negatives)
		if len(b.droppedReasons) < maxDroppedReasons {
			b.droppedReasons = append(b.droppedReasons, pe.Error())
		}
		return nil
	}
	segment := int32(-1)
	if b.segmentCol >= 0 {
		segment = b.segmentCode(record[b.segmentCol])
	}
	if positives+negatives > 0 {
		b.noteOutside(line, score)
	}
	for _, part := range [2]struct {
		positive bool
		cases    float64
	}{{true, positives}, {false, negatives}} {
		if part.cases == 0 {
			continue
		}
		b.scores = append(b.scores, score)
		b.labels = append(b.labels, part.positive)
		b.weights = append(b.weights, part.cases)
		if segment >= 0 {
			b.segments = append(b.segments, segment)
		}
	}
	return nil
}

// isNull reports whether a counts table's score cell holds NULL as engines
// export it: empty, \N or the word NULL.
func isNull(text string) bool {
	text = strings.TrimSpace(text)
	return text == "" || text == `\N` || strings.EqualFold(text, "null")
}
