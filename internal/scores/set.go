package scores

import (
	"fmt"
	"math"
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

	// Counts reports that the set comes from a counts table (ReadCounts):
	// each row stands for Weights[i] cases of one label at one score, and
	// figures that count rows count those cases instead (see Cases).
	Counts bool

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

	Dropped        int      // rows skipped by DropInvalid
	DroppedReasons []string // the first few reasons, for reporting
}

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
	s := &Set{Scores: scores, Labels: labels, Weights: weights, LowerIsRiskier: lowerIsRiskier}
	s.rank()
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

// Weighted reports whether the set carries a weight column.
func (s *Set) Weighted() bool { return s.Weights != nil }

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
