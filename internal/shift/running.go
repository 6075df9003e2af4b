package shift

import (
	"fmt"

	"github.com/sill-tool/sill/internal/scores"
)

// Running gives the peaks at cut after cut of one set, as a screen needs
// them while a cursor moves: it keeps the shift queues of the last cut and
// moves them by the rows between that cut and the next, so a step costs
// the rows of one tie group and the shifts' figures, not the size of the
// set. Its peaks equal At's up to rounding in the scaled sums (a move
// that is farther than none or every row flagged starts again from there,
// so errors do not build up over long walks and a jump costs at most half
// the set).
type Running struct {
	set    *scores.Set
	a      Assignment
	scale  Scale
	cases  Spread
	queues []float64
	full   []float64 // the queues with every row flagged
	// The squared alerts and the weight of the flagged rows, and with
	// every row flagged.
	sumSq, flagged, fullSumSq, fullFlagged float64
	rows                                   int
}

// NewRunning returns a Running of set's rows, assigned to shifts by a
// (from set), at scale, with no row flagged. It panics when a was not
// assigned from a set of set's length.
func NewRunning(set *scores.Set, a Assignment, scale Scale) *Running {
	if len(a.Of) != set.Len() {
		panic(fmt.Sprintf("shift: %d rows assigned for a set of %d", len(a.Of), set.Len()))
	}
	r := &Running{set: set, a: a, scale: scale, queues: make([]float64, a.Count), full: make([]float64, a.Count)}
	for i := range set.Len() {
		x := alertsOf(set, i, scale)
		r.full[a.Of[i]] += x
		r.fullSumSq += x * x
		r.fullFlagged += set.Weight(i)
	}
	r.cases = dispersion(r.full, a.Cover, r.fullSumSq)
	return r
}

// At returns the peaks when the first rows ranked rows are flagged, as
// Assignment.At does; capacity 0 means none given. It panics when rows is
// outside [0, set.Len()].
func (r *Running) At(rows int, capacity float64) Peaks {
	if rows < 0 || rows > r.set.Len() {
		panic(fmt.Sprintf("shift: %d flagged rows of a set of %d", rows, r.set.Len()))
	}
	r.move(rows)
	return r.a.peaks(r.queues, r.sumSq, r.flagged, r.cases, r.scale, capacity)
}

// move brings the queues to the first rows ranked rows flagged.
func (r *Running) move(rows int) {
	n := r.set.Len()
	distance := max(rows-r.rows, r.rows-rows)
	switch {
	case rows == 0 || rows < distance:
		clear(r.queues)
		r.sumSq, r.flagged, r.rows = 0, 0, 0
	case rows == n || n-rows < distance:
		copy(r.queues, r.full)
		r.sumSq, r.flagged, r.rows = r.fullSumSq, r.fullFlagged, n
	}
	sign, from, to := 1.0, r.rows, rows
	if rows < r.rows {
		sign, from, to = -1, rows, r.rows
	}
	for i := from; i < to; i++ {
		x := alertsOf(r.set, i, r.scale)
		r.queues[r.a.Of[i]] += sign * x
		r.sumSq += sign * x * x
		r.flagged += sign * r.set.Weight(i)
	}
	r.rows = rows
}
