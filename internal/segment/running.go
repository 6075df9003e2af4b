package segment

import (
	"fmt"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/scores"
)

// Running gives the breakdown at cut after cut of one set, as a screen
// needs it while a cursor moves: it keeps the groups' flagged counts of the
// last cut and moves them by the rows between that cut and the next, so a
// step of one cut costs the rows of one tie group and the number of
// groups, not the size of the set.
//
// Its breakdowns equal At's up to rounding in the weighted sums (counts
// are added and taken away as the cut moves back and forth; a move that
// is farther than none or every row flagged starts again from there, so
// errors do not build up over long walks and a jump costs at most half
// the set).
type Running struct {
	set    *scores.Set
	groups []tally // every row counted, none flagged yet
	total  tally
	tp, fp []float64 // flagged weight per group at rows
	allTP  float64
	allFP  float64
	rows   int
}

// NewRunning returns a Running of set with no row flagged. It reads set
// once. A set without a segment column gives breakdowns with no groups.
func NewRunning(set *scores.Set) *Running {
	r := &Running{set: set}
	if set.SegmentOf() != nil {
		r.groups = make([]tally, len(set.SegmentNames()))
		r.tp = make([]float64, len(set.SegmentNames()))
		r.fp = make([]float64, len(set.SegmentNames()))
	}
	for i := range set.Len() {
		w := set.Weight(i)
		r.total.add(set.Labels()[i], false, w, set.CasesAt(i))
		if r.groups != nil {
			r.groups[set.SegmentOf()[i]].add(set.Labels()[i], false, w, set.CasesAt(i))
		}
	}
	return r
}

// At returns the breakdown at point p of the set's curve, as At does. It
// panics when p.Rows is outside [0, set.Len()].
func (r *Running) At(p curve.Point, confidence float64) Breakdown {
	if p.Rows < 0 || p.Rows > r.set.Len() {
		panic(fmt.Sprintf("segment: point flags %d rows of a set of %d", p.Rows, r.set.Len()))
	}
	r.move(p.Rows)
	groups := make([]tally, len(r.groups))
	for code, g := range r.groups {
		groups[code] = r.flagged(g, r.tp[code], r.fp[code])
	}
	return breakdown(r.flagged(r.total, r.allTP, r.allFP), groups, r.set.SegmentNames(), confidence)
}

// flagged is the tally t with tp and fp flagged.
func (r *Running) flagged(t tally, tp, fp float64) tally {
	t.truePositive, t.falsePositive = tp, fp
	return t
}

// move brings the flagged counts to the first rows ranked rows.
func (r *Running) move(rows int) {
	n := r.set.Len()
	distance := max(rows-r.rows, r.rows-rows)
	switch {
	case rows == 0 || rows < distance:
		// Nearer to none flagged than to the last cut: start again.
		clear(r.tp)
		clear(r.fp)
		r.allTP, r.allFP, r.rows = 0, 0, 0
	case rows == n || n-rows < distance:
		// Nearer to every row flagged: start from there.
		for code, g := range r.groups {
			r.tp[code], r.fp[code] = g.positives, g.negatives
		}
		r.allTP, r.allFP, r.rows = r.total.positives, r.total.negatives, n
	}
	sign, from, to := 1.0, r.rows, rows
	if rows < r.rows {
		sign, from, to = -1, rows, r.rows
	}
	for i := from; i < to; i++ {
		w := sign * r.set.Weight(i)
		if r.set.Labels()[i] {
			r.allTP += w
			if r.groups != nil {
				r.tp[r.set.SegmentOf()[i]] += w
			}
		} else {
			r.allFP += w
			if r.groups != nil {
				r.fp[r.set.SegmentOf()[i]] += w
			}
		}
	}
	r.rows = rows
}
