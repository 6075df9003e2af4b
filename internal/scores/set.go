package scores

import (
	"fmt"
	"math"
	"sort"
)

// Set is a scored validation set held column-wise and ranked riskiest
// first: row 0 is the case that every cut flags first. Rows tied at one
// score keep the order in which they were read.
//
// Scores and Labels always have one entry per row. Weights, IDs and
// SegmentOf are nil when the input had no such column.
type Set struct {
	scores  []float64
	labels  []bool    // true for a true (positive) case
	weights []float64 // frequency weights; nil means every row weighs 1

	// casesBefore is set for a counts table (NewCounts, ReadCounts), whose
	// row i stands for Weights[i] cases of one label at one score:
	// casesBefore[r] holds the cases of ranked rows [0, r). It is nil for a
	// set of rows, each of which is one case. See CasesAt and CasesFlagged.
	casesBefore []float64

	ids          []string // case identifiers; nil without an id column
	segmentOf    []int32  // index into SegmentNames; nil without a segment column
	segmentNames []string

	// Times holds each case's time in unix seconds; nil without a time
	// column (Options.TimeColumn).
	times []int64

	// CompareScores holds a second model's score of each case, riskier in
	// the same direction as Scores; nil without a compare column
	// (Options.CompareColumn). The rows are ranked by Scores, not by these.
	compareScores []float64

	// LowerIsRiskier reports whether small scores mean positive; see the
	// package doc for how it turns the cut rule round.
	lowerIsRiskier bool

	source        string // the file name as given, "-" for standard input
	digest        string // hex digest of the bytes read, before decompression
	scoreColumn   string
	labelColumn   string
	weightColumn  string
	segmentColumn string
	idColumn      string
	timeColumn    string
	compareColumn string
	// timeLayout is the layout the case times were read with
	// (Options.TimeLayout), "" for the forms read without one.
	timeLayout string

	dropped        int      // rows skipped by DropInvalid (cases for a counts table), and a counts table's cases with no score
	droppedReasons []string // the first few reasons, for reporting

	// NoScore counts by label the cases of Dropped whose score was missing
	// where the input gives their labels: a counts table's rows with no
	// score (see ReadCounts). It is nil when there were none; rows dropped
	// by DropInvalid are not in it.
	noScore *LabelCounts

	// Outside counts the rows whose score lies outside [0, 1], which stop
	// the scores from reading as probabilities; zero when there are none.
	outside OutsideRows
}

// Scores returns the scores of the ranked rows, riskiest first. The
// returned slices of Set's columns are the set's own: read them, never
// change them.
func (s *Set) Scores() []float64 { return s.scores }

// Labels returns the labels of the ranked rows, true for a true (positive)
// case.
func (s *Set) Labels() []bool { return s.labels }

// Weights returns the rows' frequency weights (a counts table's counts);
// nil means every row weighs 1. See Weight.
func (s *Set) Weights() []float64 { return s.weights }

// IDs returns the case identifiers; nil without an id column. See ID.
func (s *Set) IDs() []string { return s.ids }

// SegmentOf returns each row's index into SegmentNames; nil without a
// segment column. See Segment.
func (s *Set) SegmentOf() []int32 { return s.segmentOf }

// SegmentNames returns the segment names that SegmentOf indexes.
func (s *Set) SegmentNames() []string { return s.segmentNames }

// Times returns each case's time in unix seconds; nil without a time
// column (Options.TimeColumn).
func (s *Set) Times() []int64 { return s.times }

// CompareScores returns a second model's score of each case, riskier in
// the same direction as Scores; nil without a compare column
// (Options.CompareColumn). The rows are ranked by Scores, not by these.
func (s *Set) CompareScores() []float64 { return s.compareScores }

// LowerIsRiskier reports whether small scores mean positive; see the
// package doc for how it turns the cut rule round.
func (s *Set) LowerIsRiskier() bool { return s.lowerIsRiskier }

// Source returns the file name as given, "-" for standard input.
func (s *Set) Source() string { return s.source }

// SHA256 returns the hex digest of the bytes read, before decompression.
func (s *Set) SHA256() string { return s.digest }

// ScoreColumn returns the name of the score column read.
func (s *Set) ScoreColumn() string { return s.scoreColumn }

// LabelColumn returns the name of the label column read; "" without one.
func (s *Set) LabelColumn() string { return s.labelColumn }

// WeightColumn returns the name of the weight column read; "" without one.
func (s *Set) WeightColumn() string { return s.weightColumn }

// SegmentColumn returns the name of the segment column read; "" without one.
func (s *Set) SegmentColumn() string { return s.segmentColumn }

// IDColumn returns the name of the id column read; "" without one.
func (s *Set) IDColumn() string { return s.idColumn }

// TimeColumn returns the name of the time column read; "" without one.
func (s *Set) TimeColumn() string { return s.timeColumn }

// TimeLayout returns the layout the case times were read with, in the form
// of package time (Options.TimeLayout); "" without times or when they were
// read in the forms read without a layout.
func (s *Set) TimeLayout() string { return s.timeLayout }

// CompareColumn returns the name of the second score column; "" without one.
func (s *Set) CompareColumn() string { return s.compareColumn }

// Dropped returns the rows skipped by DropInvalid (cases for a counts
// table), and a counts table's cases with no score.
func (s *Set) Dropped() int { return s.dropped }

// DroppedReasons returns the first few reasons rows were dropped, for
// reporting.
func (s *Set) DroppedReasons() []string { return s.droppedReasons }

// NoScore counts by label the cases of Dropped whose score was missing
// where the input gives their labels: a counts table's rows with no score
// (see ReadCounts). It is nil when there were none; rows dropped by
// DropInvalid are not in it.
func (s *Set) NoScore() *LabelCounts { return s.noScore }

// Outside counts the rows whose score lies outside [0, 1], which stop the
// scores from reading as probabilities; zero when there are none.
func (s *Set) Outside() OutsideRows { return s.outside }

// OutsideRows counts the rows of a set whose score lies outside [0, 1]
// and gives the lines of the first few (at most MaxOutsideLines), in
// input order, numbered as ParseError numbers them. Dropped rows are not
// counted; a counts table's row counts once whatever its cases.
type OutsideRows struct {
	Rows  int
	Lines []int
}

// MaxOutsideLines bounds OutsideRows.Lines.
const MaxOutsideLines = 3

// LabelCounts counts cases by label: true, false, and those whose label
// was neither.
type LabelCounts struct {
	Positives, Negatives, Neither int
}

// Total returns the number of cases counted.
func (c LabelCounts) Total() int { return c.Positives + c.Negatives + c.Neither }

// New builds a ranked Set from parallel columns. weights may be nil. It
// panics when the slices differ in length, and returns an error for a
// non-finite score or a negative or non-finite weight. New takes ownership
// of the slices and reorders them.
func New(scores []float64, labels []bool, weights []float64, lowerIsRiskier bool) (*Set, error) {
	s, err := newUnranked(scores, labels, weights, lowerIsRiskier)
	if err != nil {
		return nil, err
	}
	s.rank()
	return s, nil
}

// newUnranked checks New's columns and holds them in a Set not yet ranked.
func newUnranked(scores []float64, labels []bool, weights []float64, lowerIsRiskier bool) (*Set, error) {
	if len(scores) != len(labels) || (weights != nil && len(weights) != len(scores)) {
		panic(fmt.Sprintf("scores: New got %d scores, %d labels and %d weights", len(scores), len(labels), len(weights)))
	}
	for i, s := range scores {
		if math.IsNaN(s) || math.IsInf(s, 0) {
			return nil, fmt.Errorf("row %d: %w %v, expected a finite number", i+1, ErrBadScore, s)
		}
		if s == 0 {
			scores[i] = 0 // fold -0 into +0, as the reader does
		}
		if weights != nil {
			if w := weights[i]; w < 0 || math.IsNaN(w) || math.IsInf(w, 0) {
				return nil, fmt.Errorf("row %d: %w %v, expected a finite number >= 0", i+1, ErrBadWeight, w)
			}
		}
	}
	if err := checkWeightTotal(weights, false); err != nil {
		return nil, err
	}
	return &Set{scores: scores, labels: labels, weights: weights, lowerIsRiskier: lowerIsRiskier}, nil
}

// Columns are a set's parallel columns, in any order, with the names
// they were read under, for NewSet. Scores and Labels are required; every
// other column may be nil (Weights nil means every row weighs 1), and
// SegmentOf indexes SegmentNames.
type Columns struct {
	Scores        []float64
	Labels        []bool
	Weights       []float64
	IDs           []string
	SegmentOf     []int32
	SegmentNames  []string
	Times         []int64
	CompareScores []float64

	LowerIsRiskier bool

	Source        string // the file name as given
	SHA256        string // hex digest of the bytes read
	ScoreColumn   string
	LabelColumn   string
	WeightColumn  string
	SegmentColumn string
	IDColumn      string
	TimeColumn    string
	CompareColumn string
	TimeLayout    string // the layout Times were read with; "" for the forms read without one
}

// NewSet builds a ranked Set from c's columns, as New does from scores,
// labels and weights, carrying every other column along. It panics when
// a non-nil column differs in length from Scores or a segment index is
// outside SegmentNames, and returns New's errors. NewSet takes ownership
// of the slices and reorders them.
func NewSet(c Columns) (*Set, error) {
	n := len(c.Scores)
	if (c.IDs != nil && len(c.IDs) != n) || (c.SegmentOf != nil && len(c.SegmentOf) != n) ||
		(c.Times != nil && len(c.Times) != n) || (c.CompareScores != nil && len(c.CompareScores) != n) {
		panic(fmt.Sprintf("scores: NewSet got %d scores, %d ids, %d segments, %d times and %d second scores",
			n, len(c.IDs), len(c.SegmentOf), len(c.Times), len(c.CompareScores)))
	}
	for _, seg := range c.SegmentOf {
		if seg < 0 || int(seg) >= len(c.SegmentNames) {
			panic(fmt.Sprintf("scores: NewSet got segment %d of %d names", seg, len(c.SegmentNames)))
		}
	}
	s, err := newUnranked(c.Scores, c.Labels, c.Weights, c.LowerIsRiskier)
	if err != nil {
		return nil, err
	}
	s.ids, s.segmentOf, s.segmentNames, s.times, s.compareScores = c.IDs, c.SegmentOf, c.SegmentNames, c.Times, c.CompareScores
	s.source, s.digest = c.Source, c.SHA256
	s.scoreColumn, s.labelColumn, s.weightColumn, s.segmentColumn, s.idColumn, s.timeColumn, s.compareColumn =
		c.ScoreColumn, c.LabelColumn, c.WeightColumn, c.SegmentColumn, c.IDColumn, c.TimeColumn, c.CompareColumn
	s.timeLayout = c.TimeLayout
	s.rank()
	return s, nil
}

// Columns returns s's columns in ranked order with their names, so that
// NewSet(s.Columns()) builds a set ranked as s is: a test adds a column to
// a set this way. The slices are s's own; a counts table comes back as a
// weighted set (build one with NewCounts), and the counts of dropped and
// outside rows are not carried.
func (s *Set) Columns() Columns {
	return Columns{
		Scores: s.scores, Labels: s.labels, Weights: s.weights, IDs: s.ids,
		SegmentOf: s.segmentOf, SegmentNames: s.segmentNames, Times: s.times, CompareScores: s.compareScores,
		LowerIsRiskier: s.lowerIsRiskier,
		Source:         s.source, SHA256: s.digest,
		ScoreColumn: s.scoreColumn, LabelColumn: s.labelColumn, WeightColumn: s.weightColumn,
		SegmentColumn: s.segmentColumn, IDColumn: s.idColumn, TimeColumn: s.timeColumn, CompareColumn: s.compareColumn,
		TimeLayout: s.timeLayout,
	}
}

// WithCompare returns a copy of s that carries compare, a second model's
// score of each ranked row of s, as its second score column under the
// given name. s itself is left as it was. It panics unless compare has one
// entry per row.
func (s *Set) WithCompare(compare []float64, column string) *Set {
	if len(compare) != s.Len() {
		panic(fmt.Sprintf("scores: WithCompare got %d scores for %d rows", len(compare), s.Len()))
	}
	out := *s
	out.compareScores, out.compareColumn = compare, column
	return &out
}

// NewCounts builds a ranked counts table from parallel columns: row i
// stands for counts[i] cases of label labels[i] at score scores[i], as
// ReadCounts reads them. It panics when the slices differ in length, and
// returns an error for a non-finite score or a count that is not a whole
// number >= 0. NewCounts takes ownership of the slices and reorders them.
func NewCounts(scores []float64, labels []bool, counts []float64, lowerIsRiskier bool) (*Set, error) {
	if counts == nil {
		counts = []float64{}
	}
	if len(counts) != len(scores) {
		panic(fmt.Sprintf("scores: NewCounts got %d scores and %d counts", len(scores), len(counts)))
	}
	for i, c := range counts {
		if !(c >= 0 && c <= maxCount) || c != math.Trunc(c) {
			return nil, fmt.Errorf("row %d: %w %v, expected a whole number of cases >= 0", i+1, ErrBadCount, c)
		}
	}
	if err := checkWeightTotal(counts, true); err != nil {
		return nil, err
	}
	s, err := New(scores, labels, counts, lowerIsRiskier)
	if err != nil {
		return nil, err
	}
	s.countCases()
	return s, nil
}

// Len returns the number of rows, zero-weight rows included.
func (s *Set) Len() int { return len(s.scores) }

// Weight returns the weight of row i: 1 when the set has no weights.
func (s *Set) Weight(i int) float64 {
	if s.weights == nil {
		return 1
	}
	return s.weights[i]
}

// Weighted reports whether the rows carry frequency weights from a weight
// column. A counts table's weights are its counts, whole cases, so it is
// not weighted in this sense.
func (s *Set) Weighted() bool { return s.weights != nil && s.casesBefore == nil }

// CountsTable reports whether the set was built from a counts table
// (NewCounts, ReadCounts): each row stands for CasesAt(i) cases of one
// label at one score. Most figures need not ask, as CasesAt, CasesFlagged
// and Cases count cases either way; a resample must, as it draws cases
// rather than rows.
func (s *Set) CountsTable() bool { return s.casesBefore != nil }

// CasesAt returns the number of cases ranked row i stands for: 1 for a
// scored case, its count for a row of a counts table.
func (s *Set) CasesAt(i int) int {
	if s.casesBefore == nil {
		return 1
	}
	return int(s.weights[i])
}

// CasesFlagged returns the number of cases in ranked rows [0, rows), the
// cases a cut flags when it flags those rows: rows itself for a set of
// scored cases, their summed counts for a counts table.
// 0 <= rows <= Len().
func (s *Set) CasesFlagged(rows int) int {
	if s.casesBefore == nil {
		return rows
	}
	return int(s.casesBefore[rows])
}

// Cases returns the number of validation cases: Len() for a set of scored
// cases, the summed counts for a counts table.
func (s *Set) Cases() int { return s.CasesFlagged(s.Len()) }

// RowOfCase returns the ranked row that holds case c, counting cases from
// 0 in ranked order; 0 <= c < Cases(). For a set of scored cases it is c.
func (s *Set) RowOfCase(c int) int {
	if s.casesBefore == nil {
		return c
	}
	return sort.Search(s.Len(), func(i int) bool { return s.casesBefore[i+1] > float64(c) })
}

// countCases marks a ranked set whose weights are counts as a counts table.
func (s *Set) countCases() {
	before := s.casesBefore[:0]
	if cap(before) < s.Len()+1 {
		before = make([]float64, 0, s.Len()+1)
	}
	before = append(before, 0)
	total := 0.0
	for _, cases := range s.weights {
		total += cases
		before = append(before, total)
	}
	s.casesBefore = before
}

// Segment returns the segment name of row i, or "" without a segment column.
func (s *Set) Segment(i int) string {
	if s.segmentOf == nil {
		return ""
	}
	return s.segmentNames[s.segmentOf[i]]
}

// ID returns the id of row i, or "" without an id column.
func (s *Set) ID(i int) string {
	if s.ids == nil {
		return ""
	}
	return s.ids[i]
}

// Totals returns the weighted number of true and false cases. Weights are
// summed tie group by tie group in ranked order, as a sweep of the cuts
// adds them up (package curve), so that the loosest cut's cumulative
// counts equal the totals exactly and leave no rounding residue in its
// false negatives and true negatives.
func (s *Set) Totals() (positives, negatives float64) {
	if s.weights == nil {
		for _, positive := range s.labels {
			if positive {
				positives++
			} else {
				negatives++
			}
		}
		return positives, negatives
	}
	for start, n := 0, len(s.scores); start < n; {
		var groupPositives, groupNegatives float64
		end := start
		for ; end < n && s.scores[end] == s.scores[start]; end++ {
			if s.labels[end] {
				groupPositives += s.weights[end]
			} else {
				groupNegatives += s.weights[end]
			}
		}
		positives += groupPositives
		negatives += groupNegatives
		start = end
	}
	return positives, negatives
}

// Riskier reports whether score a lies strictly on the risky side of b.
func (s *Set) Riskier(a, b float64) bool {
	if s.lowerIsRiskier {
		return a < b
	}
	return a > b
}

// Flags reports whether a case with the given score is flagged at cut,
// following the cut rule in the package doc.
func (s *Set) Flags(cut, score float64) bool {
	if s.lowerIsRiskier {
		return score <= cut
	}
	return score >= cut
}

// Replicate fills rep with a resample of s, reusing rep's memory (rep may
// be a zero Set): ranked row i of s drawn[i] times, in s's ranked order. A
// scored case is repeated drawn[i] times and keeps its weight; a row of a
// counts table appears once, holding the drawn[i] cases drawn from it, when
// drawn[i] > 0, so that rep is a counts table too. rep carries the scores,
// labels, weights and direction, what a curve needs. It panics unless drawn
// has one entry per row of s.
func Replicate[Times int32 | float64](rep, s *Set, drawn []Times) {
	if len(drawn) != s.Len() {
		panic(fmt.Sprintf("scores: Replicate got %d draws for %d rows", len(drawn), s.Len()))
	}
	rep.scores, rep.labels, rep.lowerIsRiskier = rep.scores[:0], rep.labels[:0], s.lowerIsRiskier
	if s.weights == nil {
		rep.weights = nil
	} else {
		rep.weights = rep.weights[:0]
		if rep.weights == nil {
			rep.weights = make([]float64, 0, s.Len())
		}
	}
	if s.casesBefore != nil {
		for i, m := range drawn {
			if m > 0 {
				rep.scores = append(rep.scores, s.scores[i])
				rep.labels = append(rep.labels, s.labels[i])
				rep.weights = append(rep.weights, float64(m))
			}
		}
		rep.countCases()
		return
	}
	rep.casesBefore = nil
	for i, m := range drawn {
		for range int(m) {
			rep.scores = append(rep.scores, s.scores[i])
			rep.labels = append(rep.labels, s.labels[i])
			if rep.weights != nil {
				rep.weights = append(rep.weights, s.weights[i])
			}
		}
	}
}

// smallRankRows is the size below which rank sorts a permutation: the
// in-place sort's digit tables would cost more than they save.
const smallRankRows = 1024

// rank sorts every column riskiest first, keeping the read order of ties.
// Without other columns than scores, labels, weights and segments it sorts them in place (see rankInPlace);
// otherwise it sorts a permutation and applies it to every column.
func (s *Set) rank() {
	if s.onlySortedColumns() && len(s.scores) >= smallRankRows {
		rankInPlace(s.scores, s.labels, s.weights, s.segmentOf, s.lowerIsRiskier)
		return
	}
	order := rankOrder(s.scores, s.lowerIsRiskier)
	if order == nil {
		return
	}
	s.scores = permute(s.scores, order)
	s.labels = permute(s.labels, order)
	if s.weights != nil {
		s.weights = permute(s.weights, order)
	}
	if s.ids != nil {
		s.ids = permute(s.ids, order)
	}
	if s.segmentOf != nil {
		s.segmentOf = permute(s.segmentOf, order)
	}
	if s.times != nil {
		s.times = permute(s.times, order)
	}
	if s.compareScores != nil {
		s.compareScores = permute(s.compareScores, order)
	}
}

// SwapScores returns a copy of s ranked by its second score column:
// CompareScores becomes Scores and Scores becomes CompareScores (their
// column names likewise), every other column is carried along, and rows
// tied on the second score keep s's order. s itself is left as it was. It
// returns nil when s has no second score column.
func (s *Set) SwapScores() *Set {
	if s.compareScores == nil {
		return nil
	}
	out := *s
	out.scores, out.compareScores = s.compareScores, s.scores
	out.scoreColumn, out.compareColumn = s.compareColumn, s.scoreColumn
	// With a second score column rank permutes into new slices (see
	// onlySortedColumns), so the columns shared with s are never sorted
	// in place.
	out.rank()
	return &out
}

// onlySortedColumns reports whether the set has no column besides scores,
// labels, weights and segments, the ones rankInPlace carries. A new column
// must be added here as well as to the permutation in rank.
func (s *Set) onlySortedColumns() bool {
	return s.ids == nil && s.times == nil && s.compareScores == nil
}

func permute[T any](column []T, order []uint32) []T {
	out := make([]T, len(column))
	for i, from := range order {
		out[i] = column[from]
	}
	return out
}
