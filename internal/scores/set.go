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
	Scores  []float64
	Labels  []bool    // true for a true (positive) case
	Weights []float64 // frequency weights; nil means every row weighs 1

	// casesBefore is set for a counts table (NewCounts, ReadCounts), whose
	// row i stands for Weights[i] cases of one label at one score:
	// casesBefore[r] holds the cases of ranked rows [0, r). It is nil for a
	// set of rows, each of which is one case. See CasesAt and CasesFlagged.
	casesBefore []float64

	IDs          []string // case identifiers; nil without an id column
	SegmentOf    []int32  // index into SegmentNames; nil without a segment column
	SegmentNames []string

	// Times holds each case's time in unix seconds; nil without a time
	// column (Options.TimeColumn).
	Times []int64

	// CompareScores holds a second model's score of each case, riskier in
	// the same direction as Scores; nil without a compare column
	// (Options.CompareColumn). The rows are ranked by Scores, not by these.
	CompareScores []float64

	// LowerIsRiskier reports whether small scores mean positive; see the
	// package doc for how it turns the cut rule round.
	LowerIsRiskier bool

	Source        string // the file name as given, "-" for standard input
	SHA256        string // hex digest of the bytes read, before decompression
	ScoreColumn   string
	LabelColumn   string
	WeightColumn  string
	SegmentColumn string
	IDColumn      string
	TimeColumn    string
	CompareColumn string

	Dropped        int      // rows skipped by DropInvalid (cases for a counts table), and a counts table's cases with no score
	DroppedReasons []string // the first few reasons, for reporting

	// NoScore counts by label the cases of Dropped whose score was missing
	// where the input gives their labels: a counts table's rows with no
	// score (see ReadCounts). It is nil when there were none; rows dropped
	// by DropInvalid are not in it.
	NoScore *LabelCounts

	// Outside counts the rows whose score lies outside [0, 1], which stop
	// the scores from reading as probabilities; zero when there are none.
	Outside OutsideRows
}

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
	s := &Set{Scores: scores, Labels: labels, Weights: weights, LowerIsRiskier: lowerIsRiskier}
	s.rank()
	return s, nil
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
func (s *Set) Len() int { return len(s.Scores) }

// Weight returns the weight of row i: 1 when the set has no weights.
func (s *Set) Weight(i int) float64 {
	if s.Weights == nil {
		return 1
	}
	return s.Weights[i]
}

// Weighted reports whether the rows carry frequency weights from a weight
// column. A counts table's weights are its counts, whole cases, so it is
// not weighted in this sense.
func (s *Set) Weighted() bool { return s.Weights != nil && s.casesBefore == nil }

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
	return int(s.Weights[i])
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
	for _, cases := range s.Weights {
		total += cases
		before = append(before, total)
	}
	s.casesBefore = before
}

// Segment returns the segment name of row i, or "" without a segment column.
func (s *Set) Segment(i int) string {
	if s.SegmentOf == nil {
		return ""
	}
	return s.SegmentNames[s.SegmentOf[i]]
}

// ID returns the id of row i, or "" without an id column.
func (s *Set) ID(i int) string {
	if s.IDs == nil {
		return ""
	}
	return s.IDs[i]
}

// Totals returns the weighted number of true and false cases. Weights are
// summed tie group by tie group in ranked order, as a sweep of the cuts
// adds them up (package curve), so that the loosest cut's cumulative
// counts equal the totals exactly and leave no rounding residue in its
// false negatives and true negatives.
func (s *Set) Totals() (positives, negatives float64) {
	if s.Weights == nil {
		for _, positive := range s.Labels {
			if positive {
				positives++
			} else {
				negatives++
			}
		}
		return positives, negatives
	}
	for start, n := 0, len(s.Scores); start < n; {
		var groupPositives, groupNegatives float64
		end := start
		for ; end < n && s.Scores[end] == s.Scores[start]; end++ {
			if s.Labels[end] {
				groupPositives += s.Weights[end]
			} else {
				groupNegatives += s.Weights[end]
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
	if s.LowerIsRiskier {
		return a < b
	}
	return a > b
}

// Flags reports whether a case with the given score is flagged at cut,
// following the cut rule in the package doc.
func (s *Set) Flags(cut, score float64) bool {
	if s.LowerIsRiskier {
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
	rep.Scores, rep.Labels, rep.LowerIsRiskier = rep.Scores[:0], rep.Labels[:0], s.LowerIsRiskier
	if s.Weights == nil {
		rep.Weights = nil
	} else {
		rep.Weights = rep.Weights[:0]
		if rep.Weights == nil {
			rep.Weights = make([]float64, 0, s.Len())
		}
	}
	if s.casesBefore != nil {
		for i, m := range drawn {
			if m > 0 {
				rep.Scores = append(rep.Scores, s.Scores[i])
				rep.Labels = append(rep.Labels, s.Labels[i])
				rep.Weights = append(rep.Weights, float64(m))
			}
		}
		rep.countCases()
		return
	}
	rep.casesBefore = nil
	for i, m := range drawn {
		for range int(m) {
			rep.Scores = append(rep.Scores, s.Scores[i])
			rep.Labels = append(rep.Labels, s.Labels[i])
			if rep.Weights != nil {
				rep.Weights = append(rep.Weights, s.Weights[i])
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
	if s.onlySortedColumns() && len(s.Scores) >= smallRankRows {
		rankInPlace(s.Scores, s.Labels, s.Weights, s.SegmentOf, s.LowerIsRiskier)
		return
	}
	order := rankOrder(s.Scores, s.LowerIsRiskier)
	if order == nil {
		return
	}
	s.Scores = permute(s.Scores, order)
	s.Labels = permute(s.Labels, order)
	if s.Weights != nil {
		s.Weights = permute(s.Weights, order)
	}
	if s.IDs != nil {
		s.IDs = permute(s.IDs, order)
	}
	if s.SegmentOf != nil {
		s.SegmentOf = permute(s.SegmentOf, order)
	}
	if s.Times != nil {
		s.Times = permute(s.Times, order)
	}
	if s.CompareScores != nil {
		s.CompareScores = permute(s.CompareScores, order)
	}
}

// SwapScores returns a copy of s ranked by its second score column:
// CompareScores becomes Scores and Scores becomes CompareScores (their
// column names likewise), every other column is carried along, and rows
// tied on the second score keep s's order. s itself is left as it was. It
// returns nil when s has no second score column.
func (s *Set) SwapScores() *Set {
	if s.CompareScores == nil {
		return nil
	}
	out := *s
	out.Scores, out.CompareScores = s.CompareScores, s.Scores
	out.ScoreColumn, out.CompareColumn = s.CompareColumn, s.ScoreColumn
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
	return s.IDs == nil && s.Times == nil && s.CompareScores == nil
}

func permute[T any](column []T, order []uint32) []T {
	out := make([]T, len(column))
	for i, from := range order {
		out[i] = column[from]
	}
	return out
}
