package curve

import (
	"sort"

	"github.com/sill-tool/sill/internal/scores"
)

// Curve is every cut of a ranked set, kept for random access. It holds the
// set it was built from; the set must not change afterwards.
type Curve struct {
	Set     *scores.Set
	Summary Summary

	end    []int     // end[i]: rows flagged at cut i
	tp, fp []float64 // cumulative weighted counts at cut i

	// squares are the cumulative squared weights of the flagged true and
	// false cases at cut i; nil without a weight column (Point.Squares
	// then equals the counts).
	squares [2][]float64
}

// New computes the curve of a ranked set (see scores.Set).
func New(set *scores.Set) *Curve {
	c := &Curve{Set: set}
	weighted := set.Weighted()
	c.Summary = Walk(set, func(p Point) {
		c.end = append(c.end, p.Rows)
		c.tp = append(c.tp, p.TP)
		c.fp = append(c.fp, p.FP)
		if weighted {
			c.squares[0] = append(c.squares[0], p.Squares[0])
			c.squares[1] = append(c.squares[1], p.Squares[1])
		}
	})
	return c
}

// Refill makes c the curve of another ranked set, reusing c's memory,
// without the summary (c.Summary is zeroed, but for the class totals and
// squared weights that At needs): the cuts alone, for callers that only read points, such as
// each resampled set of package bootstrap. The cuts are the same as New
// would give.
func (c *Curve) Refill(set *scores.Set) {
	c.Set, c.Summary = set, Summary{}
	c.end, c.tp, c.fp = c.end[:0], c.tp[:0], c.fp[:0]
	c.squares[0], c.squares[1] = c.squares[0][:0], c.squares[1][:0]
	weighted := set.Weighted()
	scores, labels, n := set.Scores(), set.Labels(), set.Len()
	var tp, fp, tpSquares, fpSquares float64
	for start := 0; start < n; {
		score := scores[start]
		// Summed as Walk sums them, so that the points are the same.
		var groupTP, groupFP, groupTPSquares, groupFPSquares float64
		end := start
		for ; end < n && scores[end] == score; end++ {
			w := set.Weight(end)
			if labels[end] {
				groupTP += w
				groupTPSquares += w * w
			} else {
				groupFP += w
				groupFPSquares += w * w
			}
		}
		tp += groupTP
		fp += groupFP
		c.end, c.tp, c.fp = append(c.end, end), append(c.tp, tp), append(c.fp, fp)
		if weighted {
			tpSquares += groupTPSquares
			fpSquares += groupFPSquares
			c.squares[0], c.squares[1] = append(c.squares[0], tpSquares), append(c.squares[1], fpSquares)
		}
		start = end
	}
	if !weighted {
		c.squares = [2][]float64{}
	}
	c.Summary.Positives, c.Summary.Negatives = set.Totals()
	c.Summary.PositiveSquares, c.Summary.NegativeSquares = c.Summary.Positives, c.Summary.Negatives
	if weighted {
		c.Summary.PositiveSquares, c.Summary.NegativeSquares = squaredWeights(set)
	}
}

// Len returns the number of cuts, the number of distinct scores.
func (c *Curve) Len() int { return len(c.end) }

// At returns the point at cut i, 0 <= i < Len().
func (c *Curve) At(i int) Point {
	p := Point{
		Index: i,
		Score: c.Set.Scores()[c.end[i]-1],
		Rows:  c.end[i],
		Cases: c.Set.CasesFlagged(c.end[i]),
		TP:    c.tp[i],
		FP:    c.fp[i],
		FN:    c.Summary.Positives - c.tp[i],
		TN:    c.Summary.Negatives - c.fp[i],
	}
	p.Squares = [4]float64{p.TP, p.FP, p.FN, p.TN}
	if c.squares[0] != nil {
		tp, fp := c.squares[0][i], c.squares[1][i]
		p.Squares = [4]float64{tp, fp, c.Summary.PositiveSquares - tp, c.Summary.NegativeSquares - fp}
	}
	return p
}

// Points calls visit with every point, strictest first.
func (c *Curve) Points(visit func(Point)) {
	for i := range c.end {
		visit(c.At(i))
	}
}

// CutOfRow returns the cut at which ranked row r is first flagged.
func (c *Curve) CutOfRow(r int) int {
	return sort.SearchInts(c.end, r+1)
}

// FirstRow returns the ranked row at which cut i's tie group starts.
func (c *Curve) FirstRow(i int) int {
	if i == 0 {
		return 0
	}
	return c.end[i-1]
}
