package bootstrap

import (
	"math"
	"math/rand/v2"
	"sort"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// cellTree holds the cells of a set for drawing replicates lazily (see
// the package doc): per class, the class's cells in ranked order and the
// cases before each, and per cut of the cells' curve the cells of each
// class at or before it. It is read only once built, shared by workers.
type cellTree struct {
	cells *scores.Set
	// classes[0] is the true cases', classes[1] the false cases'.
	classes [2]classCells
	// cutScore is the score of each cut; cutCells[c][k] the number of
	// class c's cells at or before cut k.
	cutScore []float64
	cutCells [2][]int32
	design   Design
	// poisson: the cells count frequency weights that are not whole
	// numbers, and each class's total is a Poisson draw of mean its
	// weight.
	poisson bool
	// sampling: the cells count rows of sampling weights, each row of
	// class c weighing classWeight[c] (1 for every other set).
	sampling    bool
	classWeight [2]float64
}

// classCells is one class's cells: before[j] the cases of its cells
// 0..j-1 (before[len] the class's cases).
type classCells struct {
	before []float64
}

// cases returns the cases of cells [lo, hi) of the class.
func (c *classCells) cases(lo, hi int) float64 { return c.before[hi] - c.before[lo] }

// cellCount is the number of the class's cells.
func (c *classCells) cellCount() int { return len(c.before) - 1 }

// newCellTree returns the tree of cells, a counts table or the weighted
// cells of cellsOf, in ranked order.
func newCellTree(cells *scores.Set, design Design, poisson bool) *cellTree {
	t := &cellTree{cells: cells, design: design, poisson: poisson, classWeight: [2]float64{1, 1}, cutScore: make([]float64, 0, cells.Len())}
	for c := range t.classes {
		t.classes[c].before = append(make([]float64, 0, cells.Len()+1), 0)
		t.cutCells[c] = make([]int32, 0, cells.Len())
	}
	sc, labels := cells.Scores(), cells.Labels()
	for i := range cells.Len() {
		c := 1
		if labels[i] {
			c = 0
		}
		b := &t.classes[c].before
		*b = append(*b, (*b)[len(*b)-1]+cells.Weight(i))
		if i+1 == cells.Len() || sc[i+1] != sc[i] {
			t.cutScore = append(t.cutScore, sc[i])
			for k := range t.cutCells {
				t.cutCells[k] = append(t.cutCells[k], int32(t.classes[k].cellCount()))
			}
		}
	}
	return t
}

// lazyReplicate is one worker's replicate of a cellTree, drawn as it is
// asked for: a node's split is drawn the first time a count below it is
// needed, from a generator seeded by (seed, replicate, class, node), and
// kept for the rest of the replicate. It implements cutrule.Points over
// the cuts of the cells from the strictest at which a case was drawn.
type lazyReplicate struct {
	tree    *cellTree
	seed, b uint64
	total   [2]int // cases drawn of each class
	// left[c][mid] is the cases drawn in the stricter half of class c's
	// node that splits at cell mid (every node of at least two cells has
	// its own middle cell, see count), valid when stamp[c][mid] is gen.
	left  [2][]int
	stamp [2][]uint32
	gen   uint32
	first int // the strictest cut at which a case was drawn
	src   nodeSource
	rng   *rand.Rand
}

func newLazyReplicate(t *cellTree) *lazyReplicate {
	r := &lazyReplicate{tree: t}
	for c := range r.left {
		r.left[c] = make([]int, t.classes[c].cellCount()+1)
		r.stamp[c] = make([]uint32, t.classes[c].cellCount()+1)
	}
	r.rng = rand.New(&r.src)
	return r
}

// Node numbers of the draws that are not a node's split.
const (
	rootNode  = math.MaxUint32     // a class's total, Poisson
	classNode = math.MaxUint32 - 1 // the split of all cases between the classes
)

// generator returns the random generator of one draw of replicate r.b:
// the draw at node of class c, seeded by a hash of (seed, replicate, c,
// node), so that no draw depends on which was asked for first.
func (r *lazyReplicate) generator(c int, node uint64) *rand.Rand {
	h := mix(r.seed ^ 0x5851f42d4c957f2d)
	h = mix(h ^ r.b)
	r.src.state = mix(h ^ (uint64(c)<<40 | node))
	return r.rng
}

// draw starts replicate b: it forgets the draws of the last one and
// draws each class's total.
func (r *lazyReplicate) draw(seed, b uint64) {
	r.start(seed, b)
	r.drawTotals()
	t := r.tree
	r.first = sort.Search(len(t.cutScore), func(k int) bool { return r.casesAt(k) > 0 })
}

// start forgets the draws of the last replicate and starts replicate b.
func (r *lazyReplicate) start(seed, b uint64) {
	r.seed, r.b = seed, b
	r.gen++
	if r.gen == 0 { // wrapped: every stamp may look current
		for c := range r.stamp {
			clear(r.stamp[c])
		}
		r.gen = 1
	}
}

// drawTotals draws each class's total of the replicate begun by start.
func (r *lazyReplicate) drawTotals() {
	t := r.tree
	positives, negatives := t.classes[0].cases(0, t.classes[0].cellCount()), t.classes[1].cases(0, t.classes[1].cellCount())
	switch {
	case t.poisson:
		r.total[0] = poisson(r.generator(0, rootNode), positives)
		r.total[1] = poisson(r.generator(1, rootNode), negatives)
	case t.design == WithinClass:
		r.total[0], r.total[1] = int(positives), int(negatives)
	default:
		all := int(positives + negatives)
		r.total[0] = binomial(r.generator(0, classNode), all, positives/(positives+negatives))
		r.total[1] = all - r.total[0]
	}
}

// count returns the cases drawn of class c's cells [0, j). The cells of
// a class form an implicit binary tree: the node of cells [lo, hi) splits
// at mid = (lo+hi)/2 into [lo, mid) and [mid, hi), and no two nodes of two
// or more cells split at the same cell, so mid names the node. A node's
// cases split between its halves as a binomial draw of chance the
// stricter half's share of the node's cases: splitting in turn from the
// class's total is a multinomial draw of the total over the cells (or,
// from a Poisson total, independent Poisson counts of each cell), exactly
// in distribution.
func (r *lazyReplicate) count(c, j int) int {
	cells := &r.tree.classes[c]
	lo, hi, n, before := 0, cells.cellCount(), r.total[c], 0
	for {
		switch {
		case j <= lo || n == 0:
			return before
		case j >= hi:
			return before + n
		}
		mid := (lo + hi) / 2
		left := r.split(c, lo, mid, hi, n)
		if j <= mid {
			hi, n = mid, left
		} else {
			lo, n, before = mid, n-left, before+left
		}
	}
}

// split returns the cases drawn in cells [lo, mid) of the n drawn in
// class c's cells [lo, hi).
func (r *lazyReplicate) split(c, lo, mid, hi, n int) int {
	if r.stamp[c][mid] == r.gen {
		return r.left[c][mid]
	}
	cells := &r.tree.classes[c]
	left := binomial(r.generator(c, uint64(mid)), n, cells.cases(lo, mid)/cells.cases(lo, hi))
	r.left[c][mid], r.stamp[c][mid] = left, r.gen
	return left
}

// classesAt returns the cases drawn of each class at or before cut k.
func (r *lazyReplicate) classesAt(k int) (positives, negatives int) {
	return r.count(0, int(r.tree.cutCells[0][k])), r.count(1, int(r.tree.cutCells[1][k]))
}

// casesAt returns the cases drawn at or before cut k.
func (r *lazyReplicate) casesAt(k int) int {
	tp, fp := r.classesAt(k)
	return tp + fp
}

// Len returns the cuts from the strictest at which a case was drawn.
func (r *lazyReplicate) Len() int { return len(r.tree.cutScore) - r.first }

// At returns the replicate's point at cut i counted from the strictest at
// which a case was drawn. A cut at which no case was drawn has the point
// of the last cut before it at which one was, under its own score; Rows
// counts the cells at or before the cut.
func (r *lazyReplicate) At(i int) curve.Point {
	k := r.first + i
	tp, fp := r.classesAt(k)
	w := r.tree.classWeight
	p := curve.Point{Index: i, Score: r.tree.cutScore[k], Rows: int(r.tree.cutCells[0][k] + r.tree.cutCells[1][k]), Cases: tp + fp,
		TP: w[0] * float64(tp), FP: w[1] * float64(fp), FN: w[0] * float64(r.total[0]-tp), TN: w[1] * float64(r.total[1]-fp)}
	p.Squares = [4]float64{w[0] * p.TP, w[1] * p.FP, w[0] * p.FN, w[1] * p.TN}
	return p
}

// drawnCut returns the point of the strictest cut at or before cut i (of
// At) with as many cases drawn as at i: the cut of the replicate drawn in
// full (which has no cut where no case was drawn) with i's figures.
func (r *lazyReplicate) drawnCut(p curve.Point) curve.Point {
	if p.Index == 0 || r.casesAt(r.first+p.Index-1) < p.Cases {
		return p // a case was drawn at p's own score
	}
	j := sort.Search(p.Index, func(j int) bool { return r.casesAt(r.first+j) >= p.Cases })
	if j == p.Index {
		return p
	}
	return r.At(j)
}

// fill sets drawn[i] to the cases drawn of each cell i of the tree's
// cells (a replicate drawn in full, for tests), drawing every node.
func (r *lazyReplicate) fill(drawn []float64) {
	clear(drawn)
	labels := r.tree.cells.Labels()
	var rows [2][]int
	for i, positive := range labels {
		c := 1
		if positive {
			c = 0
		}
		rows[c] = append(rows[c], i)
	}
	for c := range rows {
		for j, i := range rows[c] {
			drawn[i] = float64(r.count(c, j+1) - r.count(c, j))
		}
	}
}

// nodeSource is a splitmix64 generator (Steele, Lea and Flood 2014,
// "Fast splittable pseudorandom number generators"), cheap to seed anew
// for every draw.
type nodeSource struct{ state uint64 }

// Uint64 returns the next number of the stream.
func (s *nodeSource) Uint64() uint64 {
	s.state += 0x9e3779b97f4a7c15
	return mix(s.state)
}

// mix is splitmix64's finaliser, a bijection of 64-bit numbers that
// scatters nearby inputs.
func mix(z uint64) uint64 {
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// outcomes draws replicate b and returns each rule's outcome on it,
// found by cutrule.Finder.Search on its points as they are drawn; a rule
// met at a cut where no case was drawn takes the cut where its cases were.
func (r *lazyReplicate) outcomes(seed, b uint64, rules []cutrule.Rule, a projection.Assumptions) ([]cutrule.Outcome, error) {
	r.draw(seed, b)
	w := r.tree.classWeight
	finder, err := cutrule.NewTotalsFinder(rules, w[0]*float64(r.total[0]), w[1]*float64(r.total[1]), r.tree.cells.LowerIsRiskier(), r.tree.sampling, a)
	if err != nil {
		return nil, err
	}
	finder.Search(r)
	out := finder.Outcomes()
	for i := range out {
		if out[i].Met {
			out[i].Point = r.drawnCut(out[i].Point)
		}
	}
	return out, nil
}

// band records the replicate's recall and false discovery rate at the
// band cuts.
func (r *lazyReplicate) band(cuts []bandCut, b int, recallAt, fdrAt [][]float64) {
	for j, cut := range cuts {
		tp, fp := r.classesAt(cut.index)
		recallAt[j][b], fdrAt[j][b] = math.NaN(), math.NaN()
		if r.total[0] > 0 {
			recallAt[j][b] = float64(tp) / float64(r.total[0])
		}
		if tp+fp > 0 {
			w := r.tree.classWeight
			fdrAt[j][b] = w[1] * float64(fp) / (w[0]*float64(tp) + w[1]*float64(fp))
		}
	}
}
