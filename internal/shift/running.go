package shift

import (
	"fmt"
	"math"
	"slices"

	"github.com/sill-tool/sill/internal/scores"
)

// Running gives the peaks at cut after cut of one set, as a screen needs
// them while a cursor moves: it keeps the shift queues of the last cut and
// moves them by the rows between that cut and the next, so a step costs
// the rows of one tie group and a sort of the shifts, not the size of the
// set. Its peaks equal At's up to rounding in the scaled sums (a move
// that is farther than none or every row flagged starts again from there,
// so errors do not build up over long walks and a jump costs at most half
// the set).
type Running struct {
	set    *scores.Set
	a      Assignment
	scale  Scale
	queues []float64
	sorted []float64
	full   []float64 // the queues with every row flagged
	rows   int
}

// NewRunning returns a Running of set's rows, assigned to shifts by a
// (from set), at scale, with no row flagged. It panics when a was not
// assigned from a set of set's length.
func NewRunning(set *scores.Set, a Assignment, scale Scale) *Running {
	if len(a.Of) != set.Len() {
		panic(fmt.Sprintf("shift: %d rows assigned for a set of %d", len(a.Of), set.Len()))
	}
	r := &Running{set: set, a: a, scale: scale, queues: make([]float64, a.Count), sorted: make([]float64, a.Count), full: make([]float64, a.Count)}
	for i := range set.Len() {
		r.full[a.Of[i]] += r.alerts(i)
	}
	return r
}

// alerts is what ranked row i adds to its shift's queue.
func (r *Running) alerts(i int) float64 {
	if r.set.Labels()[i] {
		return r.set.Weight(i) * r.scale.Positive
	}
	return r.set.Weight(i) * r.scale.Negative
}

// At returns the peaks when the first rows ranked rows are flagged, as
// Assignment.At does; capacity 0 means none given. It panics when rows is
// outside [0, set.Len()].
func (r *Running) At(rows int, capacity float64) Peaks {
	if rows < 0 || rows > r.set.Len() {
		panic(fmt.Sprintf("shift: %d flagged rows of a set of %d", rows, r.set.Len()))
	}
	p := Peaks{Shifts: r.a.Count, Mean: math.NaN(), P90: math.NaN(), Max: math.NaN(), Busiest: -1, OverCapacity: math.NaN()}
	if r.a.Count == 0 {
		return p
	}
	r.move(rows)
	sum, over := 0.0, 0
	p.Busiest = 0
	for i, q := range r.queues {
		sum += q
		if q > r.queues[p.Busiest] {
			p.Busiest = i
		}
		if capacity > 0 && q > capacity {
			over++
		}
	}
	p.Mean = sum / float64(r.a.Count)
	p.Max = r.queues[p.Busiest]
	copy(r.sorted, r.queues)
	slices.Sort(r.sorted)
	p.P90 = r.sorted[P90Rank(r.a.Count)-1]
	if capacity > 0 {
		p.OverCapacity = float64(over) / float64(r.a.Count)
	}
	return p
}

// move brings the queues to the first rows ranked rows flagged.
func (r *Running) move(rows int) {
	n := r.set.Len()
	distance := max(rows-r.rows, r.rows-rows)
	switch {
	case rows == 0 || rows < distance:
		clear(r.queues)
		r.rows = 0
	case rows == n || n-rows < distance:
		copy(r.queues, r.full)
		r.rows = n
	}
	sign, from, to := 1.0, r.rows, rows
	if rows < r.rows {
		sign, from, to = -1, rows, r.rows
	}
	for i := from; i < to; i++ {
		r.queues[r.a.Of[i]] += sign * r.alerts(i)
	}
	r.rows = rows
}
