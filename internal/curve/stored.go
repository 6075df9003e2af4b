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
}

// New computes the curve of a ranked set (see scores.Set).
func New(set *scores.Set) *Curve {
	c := &Curve{Set: set}
	c.Summary = Walk(set, func(p Point) {
		c.end = append(c.end, p.Rows)
		c.tp = append(c.tp, p.TP)
		c.fp = append(c.fp, p.FP)
	})
	return c
}

// Len returns the number of cuts, the number of distinct scores.
func (c *Curve) Len() int { return len(c.end) }

// At returns the point at cut i, 0 <= i < Len().
func (c *Curve) At(i int) Point {
	return Point{
		Index: i,
		Score: c.Set.Scores()[c.end[i]-1],
		Rows:  c.end[i],
		Cases: c.Set.CasesFlagged(c.end[i]),
		TP:    c.tp[i],
		FP:    c.fp[i],
		FN:    c.Summary.Positives - c.tp[i],
		TN:    c.Summary.Negatives - c.fp[i],
	}
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
