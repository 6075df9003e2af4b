// Package bootstrap measures how far a cut would move if the validation set
// were drawn again: a seeded bootstrap that resamples the cases as the set
// was drawn, re-applies each cut rule to every replicate, and reports
// percentiles of where the cut lands, of the hit share and wrong-alert
// share there, and of the hit-share and wrong-alert curves.
//
// The design (Options.Design) says how the set was drawn. Ordinary, the
// default, is a random sample: each replicate draws as many cases as the
// set holds from all of them, so the mix of true and false cases varies
// as it would between samples. WithinClass is for classes sampled apart
// by design (one class downsampled): each replicate keeps each class's
// size and draws within it.
//
// Cases, not rows, are drawn, and drawing cases only counts how many of
// each cell (one distinct score and label) were drawn: a set of rows is
// first collapsed into its cells, a counts table of the same cases, and a
// replicate is a counts table over the same cells. The work of a replicate
// therefore grows with the distinct scores, not the rows, and a counts
// table gives the very same result as the raw rows it aggregates. A group
// of up to MaxCaseDraws cases is drawn case by case, exactly. A larger one
// is drawn, under the ordinary design, by the Poisson bootstrap (each
// cell's count a Poisson draw of mean its cases, so the total varies a
// little, about its square root), and within classes as sequential binomial
// counts of its cells (an exact multinomial draw of the same distribution): a binomial of mean below 30 by inversion,
// exactly, and a larger one by the normal distribution with continuity
// correction, which at such means differs from it by far less than the
// bootstrap's own noise.
//
// Weights are drawn as their kind says (Options.Sampling, package
// design). Frequency weights count cases: a row of weight 3 is three
// cases, so the cells of a weighted set count the weights, and a set of
// whole-number weights is resampled exactly as the same rows written out
// (a counts table); weights that are not whole numbers draw each cell's
// count as a Poisson draw of mean its weight (the Poisson bootstrap,
// which needs no whole numbers). Sampling weights make the rows the units
// drawn: rows are drawn row by row and carry their weights along, so
// their work grows with the rows; callers pick WithinClass when the
// weights are constant within each class (a class downsampled) and
// Ordinary otherwise.
//
// Which cases a cut flags follows the cut rule in the doc of package
// scores. Percentiles interpolate linearly between order statistics
// (numpy's default).
//
// Replicate b draws from its own generator, seeded with (Seed, b), so the
// result depends on Seed, Replicates and Design only, never on the number
// of workers or their timing.
package bootstrap

import (
	"context"
	"errors"
	"fmt"
	"github.com/sill-tool/sill/internal/quantile"
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"sync"
	"sync/atomic"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// Low and High are the percentiles reported: together a 90% band.
const (
	Low  = 0.05
	High = 0.95
)

// Options control a bootstrap run.
type Options struct {
	Replicates int    // number of resampled sets, at least 1
	Seed       uint64 // the same seed and Replicates give the same result
	Workers    int    // goroutines; 0 means runtime.GOMAXPROCS(0)

	// BandCuts is how many of the set's cuts, spread evenly over the
	// ranked rows, carry a band of hit share and wrong-alert share; 0
	// means no band.
	BandCuts int

	// Progress, when set, is called with the number of replicates done so
	// far, from the workers but never two calls at once.
	Progress func(done int)

	// Design is how the set was drawn, and so how it is drawn again:
	// Ordinary (the zero value) or WithinClass.
	Design Design

	// Sampling says the set's weights are sampling weights (see the
	// package doc); false reads them as frequency weights.
	Sampling bool

	// FinderOptions are passed to the cut finder of the set itself, to
	// check the rules (queue90=K needs cutrule.WithShifts); replicates do
	// not use them, since queue90=K is not resampled (see Spread).
	FinderOptions []cutrule.Option
}

// Design is how the validation set was drawn from the cases it stands
// for, which the bootstrap repeats.
type Design int

const (
	// Ordinary: a random sample of cases. Each replicate draws as many
	// cases as the set holds from all of them, so the mix of true and
	// false cases varies between replicates as it would between samples.
	Ordinary Design = iota
	// WithinClass: the true and the false cases were sampled apart by
	// design (say the false cases were downsampled, their rows weighted
	// alike), so each replicate keeps each class's size and draws within
	// it.
	WithinClass
)

// String names the design in words.
func (d Design) String() string {
	if d == WithinClass {
		return "within classes"
	}
	return "ordinary"
}

// MaxCaseDraws is the most cases of one group that are drawn one by one;
// a larger group is drawn as sequential binomial counts of its cells (see
// the package doc).
const MaxCaseDraws = 1 << 16

// Errors of Run.
var (
	ErrReplicates = errors.New("bootstrap needs at least 1 replicate")
	ErrNoClass    = errors.New("bootstrap needs at least one true case and one false case")
)

// Spread is where one rule's cut lands across the replicates. Score and
// FlaggedShare (and Recall) hold the Low and High percentiles over the replicates in
// which the rule was met; they are NaN when it never was.
//
// queue90=K is not resampled and has Skipped set: drawing rows with
// replacement piles repeated cases into the same shifts, which widens the
// spread between shifts and would push the cut towards stricter values.
type Spread struct {
	Rule         cutrule.Rule
	Met          int // replicates in which the rule was met
	Score        [2]float64
	FlaggedShare [2]float64
	Recall       [2]float64 // hit share at the replicate's cut
	// FalseDiscoveryRate is the wrong-alert share at the replicate's cut.
	FalseDiscoveryRate [2]float64
	Skipped            string // why the rule was not resampled; "" when it was
}

// BandPoint is the band at one of the set's cuts: the Low and High
// percentiles of the replicates' recall and false discovery rate at the
// same cut score. A percentile is NaN when the rate was undefined in over
// half the replicates.
type BandPoint struct {
	Cut                int     // cut number on the set's curve
	Score              float64 // the cut
	Recall             [2]float64
	FalseDiscoveryRate [2]float64
}

// Result is the outcome of a bootstrap run.
type Result struct {
	Replicates int
	Seed       uint64
	Design     Design
	Spreads    []Spread // one per rule, in the order given
	Band       []BandPoint
}

// Run resamples set opt.Replicates times and applies rules under a to each
// replicate. set must be ranked (every scores.Set is). It returns
// ErrNoClass when set lacks a class with weight in its rows' draws (no
// true-case row or no false-case row), ErrReplicates for fewer than 1
// replicate, the Finder's error for rules that do not suit a, and ctx's
// error when cancelled.
func Run(ctx context.Context, set *scores.Set, rules []cutrule.Rule, a projection.Assumptions, opt Options) (Result, error) {
	if opt.Replicates < 1 {
		return Result{}, fmt.Errorf("%w, got %d", ErrReplicates, opt.Replicates)
	}
	if positives, negatives := set.Totals(); !(positives > 0) || !(negatives > 0) {
		return Result{}, ErrNoClass
	}
	if _, err := cutrule.NewFinder(rules, set, a, opt.FinderOptions...); err != nil {
		return Result{}, err
	}
	all := rules
	rules = nil
	for _, r := range all {
		if r.Kind != cutrule.Queue90 {
			rules = append(rules, r)
		}
	}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, opt.Replicates)
	base, poissonCells, err := cellsOf(set, opt.Sampling)
	if err != nil {
		return Result{}, err
	}
	if base == nil {
		base = set
	}
	band := bandCuts(base, opt.BandCuts)

	// [rule][replicate], NaN when unmet
	scoresAt, sharesAt, recallsAt, fdrsAt := grid(len(rules), opt.Replicates), grid(len(rules), opt.Replicates), grid(len(rules), opt.Replicates), grid(len(rules), opt.Replicates)
	recallAt, fdrAt := grid(len(band), opt.Replicates), grid(len(band), opt.Replicates) // [band cut][replicate]

	var (
		next     atomic.Int64
		done     atomic.Int64
		progress sync.Mutex
		failure  error
		failOnce sync.Once
		wg       sync.WaitGroup
	)
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			r := newReplicator(base, opt.Design, poissonCells)
			var cuts curve.Curve // refilled for each replicate
			for {
				b := int(next.Add(1) - 1)
				if b >= opt.Replicates || ctx.Err() != nil {
					return
				}
				rep := r.draw(opt.Seed, uint64(b))
				finder, err := cutrule.NewFinder(rules, rep, a)
				if err != nil {
					failOnce.Do(func() { failure = err })
					return
				}
				// The replicate's cuts, each rule found by binary search
				// or a scan of them (cutrule.Finder.Search): the same cut
				// as visiting each, at a fraction of the projections.
				cuts.Refill(rep)
				finder.Search(&cuts)
				for i, o := range finder.Outcomes() {
					scoresAt[i][b], sharesAt[i][b], recallsAt[i][b], fdrsAt[i][b] = math.NaN(), math.NaN(), math.NaN(), math.NaN()
					if o.Met {
						scoresAt[i][b], sharesAt[i][b], recallsAt[i][b], fdrsAt[i][b] = o.Point.Score, o.Point.FlaggedShare(), o.Point.Recall(), o.Point.FalseDiscoveryRate()
					}
				}
				r.band(band, b, recallAt, fdrAt)
				if opt.Progress != nil {
					n := int(done.Add(1))
					progress.Lock()
					opt.Progress(n)
					progress.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return Result{}, err
	}
	if failure != nil {
		return Result{}, failure
	}
	res := Result{Replicates: opt.Replicates, Seed: opt.Seed, Design: opt.Design}
	i := 0
	for _, rule := range all {
		s := Spread{Rule: rule}
		if rule.Kind == cutrule.Queue90 {
			s.Skipped = "not resampled: drawing cases with replacement piles repeats into the same shifts and overstates the spread between shifts"
			none := [2]float64{math.NaN(), math.NaN()}
			s.Score, s.FlaggedShare, s.Recall, s.FalseDiscoveryRate = none, none, none, none
			res.Spreads = append(res.Spreads, s)
			continue
		}
		s.Score, s.Met = percentiles(scoresAt[i], 0)
		s.FlaggedShare, _ = percentiles(sharesAt[i], 0)
		s.Recall, _ = percentiles(recallsAt[i], 0)
		s.FalseDiscoveryRate, _ = percentiles(fdrsAt[i], 0)
		res.Spreads = append(res.Spreads, s)
		i++
	}
	for j, cut := range band {
		p := BandPoint{Cut: cut.index, Score: cut.score}
		p.Recall, _ = percentiles(recallAt[j], opt.Replicates/2)
		p.FalseDiscoveryRate, _ = percentiles(fdrAt[j], opt.Replicates/2)
		res.Band = append(res.Band, p)
	}
	return res, nil
}

// grid returns rows slices of cols values each.
func grid(rows, cols int) [][]float64 {
	g := make([][]float64, rows)
	for i := range g {
		g[i] = make([]float64, cols)
	}
	return g
}

// percentiles returns the Low and High percentiles of the defined values
// and how many there were; both are NaN when there are no more than
// atLeast of them (or none).
func percentiles(values []float64, atLeast int) ([2]float64, int) {
	defined := make([]float64, 0, len(values))
	for _, v := range values {
		if !math.IsNaN(v) {
			defined = append(defined, v)
		}
	}
	if len(defined) == 0 || len(defined) <= atLeast {
		return [2]float64{math.NaN(), math.NaN()}, len(defined)
	}
	sort.Float64s(defined)
	return [2]float64{quantile.Linear(defined, Low), quantile.Linear(defined, High)}, len(defined)
}

type bandCut struct {
	index int
	score float64
	rows  int // rows flagged at the cut in the set
}

// bandCuts picks up to k cuts spread evenly over the ranked rows.
func bandCuts(set *scores.Set, k int) []bandCut {
	n := set.Len()
	if k <= 0 || n == 0 {
		return nil
	}
	c := curve.New(set)
	var out []bandCut
	last := -1
	// The cuts are spread over the cases (a counts table's rows stand for
	// several).
	cases := set.Cases()
	if cases == 0 {
		return nil
	}
	for j := 1; j <= k; j++ {
		row := set.RowOfCase(max(int(math.Ceil(float64(j)*float64(cases)/float64(k)))-1, 0))
		cut := c.CutOfRow(row)
		if cut == last {
			continue
		}
		last = cut
		p := c.At(cut)
		out = append(out, bandCut{index: cut, score: p.Score, rows: p.Rows})
	}
	return out
}

// replicator draws replicates of one set, reusing its buffers.
//
// A set of unweighted rows or a counts table is first collapsed into its
// cells: one row per distinct score and label holding how many cases it
// has (a counts table of the same cases, see cellsOf). A replicate is a
// counts table over the same cells holding how many of each cell's cases
// were drawn, so its cost grows with the cells, not the cases. Drawing
// cases uniformly and counting them per cell is the same distribution as
// drawing rows, and a rule's cut, the band and every figure depend on the
// cases at each score only.
//
// Weighted rows are drawn row by row (their weights differ within a
// cell) and carry their weights along.
type replicator struct {
	set    *scores.Set // the cells, or the weighted rows
	groups []group     // drawn apart: all cases, or each class
	rep    scores.Set

	counts []int32   // weighted rows: times each row was drawn
	drawn  []float64 // cells: cases of each cell drawn

	// poisson: set is the cells of frequency weights that are not whole
	// numbers, each cell's cases a Poisson draw of mean its weight.
	poisson bool
}

// group is a part of the set drawn apart: its rows and, for cells, the
// cases of the group's rows before each of them.
type group struct {
	rows   []int
	before []float64
	cases  int
}

func newReplicator(set *scores.Set, design Design, poisson bool) *replicator {
	r := &replicator{set: set, poisson: poisson}
	if poisson {
		r.drawn = make([]float64, set.Len())
		return r
	}
	var positiveRows, negativeRows, all []int
	for i, positive := range set.Labels() {
		all = append(all, i)
		if positive {
			positiveRows = append(positiveRows, i)
		} else {
			negativeRows = append(negativeRows, i)
		}
	}
	parts := [][]int{all}
	if design == WithinClass {
		parts = [][]int{positiveRows, negativeRows}
	}
	for _, rows := range parts {
		g := group{rows: rows}
		if set.CountsTable() {
			g.before, g.cases = casesBefore(set, rows)
		}
		r.groups = append(r.groups, g)
	}
	if set.CountsTable() {
		r.drawn = make([]float64, set.Len())
	} else {
		r.counts = make([]int32, set.Len())
	}
	return r
}

// cellsOf returns set's cells: a counts table with one row per distinct
// score and label, in ranked order, counting its cases (the summed
// frequency weights of a weighted set). Rows of sampling weights have no
// cells (nil). Frequency weights that do not add up to whole numbers in
// every cell give a weighted set of the cells instead, and poisson set:
// each cell's cases are then drawn as a Poisson count.
func cellsOf(set *scores.Set, sampling bool) (cells *scores.Set, poisson bool, err error) {
	if set.Weighted() && sampling {
		return nil, false, nil
	}
	var sc, counts []float64
	var labels []bool
	for i := 0; i < set.Len(); {
		j := i
		var positives, negatives float64
		for ; j < set.Len() && set.Scores()[j] == set.Scores()[i]; j++ {
			cases := float64(set.CasesAt(j))
			if set.Weighted() {
				cases = set.Weight(j)
			}
			if set.Labels()[j] {
				positives += cases
			} else {
				negatives += cases
			}
		}
		for _, c := range []struct {
			label bool
			n     float64
		}{{true, positives}, {false, negatives}} {
			if c.n > 0 {
				sc, labels, counts = append(sc, set.Scores()[i]), append(labels, c.label), append(counts, c.n)
			}
		}
		i = j
	}
	for _, c := range counts {
		if c != math.Trunc(c) {
			cells, err = scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: counts, LowerIsRiskier: set.LowerIsRiskier()})
			return cells, true, err
		}
	}
	cells, err = scores.NewCounts(sc, labels, counts, set.LowerIsRiskier())
	return cells, false, err
}

// casesBefore returns the cases of a counts table's rows before each of
// rows, and their total.
func casesBefore(set *scores.Set, rows []int) ([]float64, int) {
	before := make([]float64, len(rows)+1)
	for k, i := range rows {
		before[k+1] = before[k] + set.Weight(i)
	}
	return before, int(before[len(rows)])
}

// drawCase returns the row of rows that holds case number c of a counts
// table's group, counted from 0 in ranked order.
func drawCase(rows []int, before []float64, c int) int {
	k := sort.Search(len(rows), func(k int) bool { return before[k+1] > float64(c) })
	return rows[k]
}

// draw builds replicate b: each group's cases drawn with replacement, as
// many as the group holds.
func (r *replicator) draw(seed, b uint64) *scores.Set {
	rng := rand.New(rand.NewPCG(seed, b))
	if r.poisson {
		return r.drawPoisson(rng)
	}
	if r.set.CountsTable() {
		clear(r.drawn)
		for _, g := range r.groups {
			switch {
			case g.cases <= MaxCaseDraws:
				for range g.cases {
					r.drawn[drawCase(g.rows, g.before, rng.IntN(g.cases))]++
				}
			case len(r.groups) == 1:
				// Ordinary design: the Poisson bootstrap, each cell's
				// count drawn apart; a cell of a whole number of cases
				// below 30 (the usual one) from 32 random bits.
				var whole wholeMeanDraws
				for _, i := range g.rows {
					if m := r.set.Weight(i); m < 30 && m == math.Trunc(m) && m > 0 {
						r.drawn[i] = float64(whole.draw(rng, int(m)))
					} else {
						r.drawn[i] = float64(poisson(rng, m))
					}
				}
			default:
				r.multinomial(rng, g.rows, g.before, g.cases)
			}
		}
		scores.Replicate(&r.rep, r.set, r.drawn)
		return &r.rep
	}
	clear(r.counts)
	for _, g := range r.groups {
		for range g.rows {
			r.counts[g.rows[rng.IntN(len(g.rows))]]++
		}
	}
	scores.Replicate(&r.rep, r.set, r.counts)
	return &r.rep
}

// drawPoisson builds a replicate of cells of frequency weights that are
// not whole numbers: each cell's cases a Poisson draw of mean its weight,
// as a counts table of the cells drawn.
func (r *replicator) drawPoisson(rng *rand.Rand) *scores.Set {
	var sc, counts []float64
	var labels []bool
	for i := range r.set.Len() {
		r.drawn[i] = float64(poisson(rng, r.set.Weight(i)))
		if r.drawn[i] > 0 {
			sc, labels, counts = append(sc, r.set.Scores()[i]), append(labels, r.set.Labels()[i]), append(counts, r.drawn[i])
		}
	}
	rep, err := scores.NewCounts(sc, labels, counts, r.set.LowerIsRiskier())
	if err != nil {
		panic("bootstrap: a Poisson replicate's counts: " + err.Error()) // whole, finite and >= 0 by construction
	}
	return rep
}

// multinomial draws cases of one group of a counts table into r.drawn:
// each row's share of the cases left, from the cases that the rows after
// it hold, in turn.
func (r *replicator) multinomial(rng *rand.Rand, rows []int, before []float64, cases int) {
	left := cases
	for k, i := range rows {
		if left == 0 {
			return
		}
		if k == len(rows)-1 {
			r.drawn[i] += float64(left)
			return
		}
		rest := before[len(rows)] - before[k] // cases of this row and those after it
		x := binomial(rng, left, r.set.Weight(i)/rest)
		r.drawn[i] += float64(x)
		left -= x
	}
}

// poissonTerms holds, for each whole mean k below 30, the chances of 0, 1,
// 2... events of a Poisson draw of mean k as the inversion in poisson
// computes them (e^-k, then each times k/x), up to poissonTermsKept of them:
// a cell of k cases then draws by table lookups, with the same result as
// computing the terms.
var poissonTerms = func() (t [30][poissonTermsKept]float64) {
	for k := range t {
		f := math.Exp(-float64(k))
		for x := range poissonTermsKept {
			if x > 0 {
				f *= float64(k) / float64(x)
			}
			t[k][x] = f
		}
	}
	return t
}()

// poissonTermsKept is how many chances poissonTerms keeps per mean: enough
// that a draw of mean 1 (a cell of one case, the usual) almost never runs
// past them (the chance of 24 or more events is below 1e-23).
const poissonTermsKept = 24

// poissonBelow holds, for each whole mean m from 1 to 29 and x = 0, 1,
// 2..., the chance that a Poisson draw of mean m is at most x, times 2^32
// and rounded down: a uniform 32-bit number below entry x and at or above
// entry x-1 draws x. Each chance is off by less than 2^-32 (2.3e-10), far
// below the bootstrap's own noise; a table ends where the chances left
// round to nothing (its last entry stands for that many or more, a chance
// below 2.3e-10).
var poissonBelow = func() (t [30][]uint32) {
	for m := 1; m < 30; m++ {
		f, cumulative := math.Exp(-float64(m)), 0.0
		for x := 0; ; x++ {
			if x > 0 {
				f *= float64(m) / float64(x)
			}
			cumulative += f
			below := min(math.Floor(cumulative*(1<<32)), math.MaxUint32)
			t[m] = append(t[m], uint32(below))
			if below == math.MaxUint32 {
				break
			}
		}
	}
	return t
}()

// wholeMeanDraws draws Poisson counts of a whole mean below 30 (a cell of
// that many cases) from half a 64-bit random number each, by inversion
// against poissonBelow (a binary search of its table). The zero value is
// ready; it holds the unused half.
type wholeMeanDraws struct {
	bits uint64
	kept bool
}

func (o *wholeMeanDraws) draw(rng *rand.Rand, m int) int {
	var u uint32
	if o.kept {
		u, o.kept = uint32(o.bits>>32), false
	} else {
		o.bits, o.kept = rng.Uint64(), true
		u = uint32(o.bits)
	}
	below := poissonBelow[m]
	lo, hi := 0, len(below)
	for lo < hi {
		mid := (lo + hi) / 2
		if u >= below[mid] {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	return lo
}

// poisson draws from the Poisson distribution of mean m: by inversion
// when m is below 30, else from the normal distribution of the same mean
// and variance, rounded and kept at 0 or more.
func poisson(rng *rand.Rand, m float64) int {
	if !(m > 0) {
		return 0
	}
	if m >= 30 {
		return max(int(math.Floor(m+math.Sqrt(m)*rng.NormFloat64()+0.5)), 0)
	}
	return poissonFromUniform(rng.Float64(), m)
}

// poissonFromUniform is the inversion of poisson for a mean m in (0, 30)
// and one uniform draw u: the number of events x at which the chances of
// 0..x first pass u.
func poissonFromUniform(u, m float64) int {
	x := 0
	var f float64
	if k := int(m); float64(k) == m {
		// A cell's whole number of cases: the chances from the table.
		terms := &poissonTerms[k]
		for f = terms[0]; u > f && f > 0; f = terms[x] {
			u -= f
			x++
			if x == poissonTermsKept {
				f = terms[x-1] * (m / float64(x))
				break
			}
		}
		if x < poissonTermsKept {
			return x
		}
	} else {
		f = math.Exp(-m)
	}
	for u > f && f > 0 {
		u -= f
		x++
		f *= m / float64(x)
	}
	return x
}

// binomial draws from the binomial distribution of n trials of chance p:
// by inversion (one uniform draw against the running sum of the
// probabilities) when the mean is below 30, else from the normal distribution of the same mean and
// variance, rounded and kept within [0, n].
func binomial(rng *rand.Rand, n int, p float64) int {
	switch {
	case n <= 0 || !(p > 0):
		return 0
	case p >= 1:
		return n
	}
	flip := p > 0.5
	if flip {
		p = 1 - p
	}
	x := 0
	if mean := float64(n) * p; mean < 30 {
		// Inversion: walk up the probabilities of 0, 1, 2... successes
		// until they pass one uniform draw; P(0) = (1-p)^n is at least
		// e^-30 here, far above underflow.
		u := rng.Float64()
		f := math.Exp(float64(n) * math.Log1p(-p))
		odds := p / (1 - p)
		for u > f && x < n {
			u -= f
			f *= odds * float64(n-x) / float64(x+1)
			x++
		}
	} else {
		x = int(math.Floor(mean + math.Sqrt(mean*(1-p))*rng.NormFloat64() + 0.5))
		x = min(max(x, 0), n)
	}
	if flip {
		x = n - x
	}
	return x
}

// band records the replicate's recall and false discovery rate at the
// band cuts: the replicate's rows drawn from set rows before cut.rows.
func (r *replicator) band(cuts []bandCut, b int, recallAt, fdrAt [][]float64) {
	if len(cuts) == 0 {
		return
	}
	// drawnWeight is the weight that row i adds to the replicate: a row of
	// a counts table weighs one case per case drawn.
	drawnWeight := func(i int) float64 { return float64(r.counts[i]) * r.set.Weight(i) }
	if r.set.CountsTable() || r.poisson {
		drawnWeight = func(i int) float64 { return r.drawn[i] }
	}
	var positives float64
	for i, positive := range r.set.Labels() {
		if positive {
			positives += drawnWeight(i)
		}
	}
	var tp, fp float64
	row := 0
	for j, cut := range cuts {
		for ; row < cut.rows; row++ {
			w := drawnWeight(row)
			if r.set.Labels()[row] {
				tp += w
			} else {
				fp += w
			}
		}
		recallAt[j][b], fdrAt[j][b] = math.NaN(), math.NaN()
		if positives > 0 {
			recallAt[j][b] = tp / positives
		}
		if tp+fp > 0 {
			fdrAt[j][b] = fp / (tp + fp)
		}
	}
}

// Describe says in plain words how far a rule's cut moves across the
// replicates. Rules pin one figure (hit=R the hit share, base or queue=K
// the workload), so it judges by whichever of the flagged share (the
// workload) and the hit share moves more, as the ratio of its 95th to its
// 5th percentile: "steady" under 1.25, "fairly steady" under 1.6, else
// "unsteady" (thresholds of this tool's own convention, with no published
// source: WordsConvention says so wherever the words show; the ratio
// itself is always given). A rule met in under 95% of the replicates is
// "often unmet" whatever its spread.
func Describe(s Spread, replicates int) string {
	switch {
	case s.Skipped != "":
		return s.Skipped
	case s.Met == 0:
		return "never met in the resampled sets"
	case float64(s.Met) < 0.95*float64(replicates):
		return fmt.Sprintf("often unmet: met in %d of %d resampled sets", s.Met, replicates)
	}
	what, ratio := "", 0.0
	for _, f := range []struct {
		name   string
		lo, hi float64
	}{{"workload", s.FlaggedShare[0], s.FlaggedShare[1]}, {"hit share", s.Recall[0], s.Recall[1]}} {
		switch {
		case math.IsNaN(f.lo) || math.IsNaN(f.hi):
			continue
		case f.lo <= 0 && f.hi > 0:
			return "unsteady: in some resampled sets the " + f.name + " is nil"
		case f.lo <= 0:
			continue
		}
		if r := f.hi / f.lo; r > ratio {
			what, ratio = f.name, r
		}
	}
	switch {
	case what == "":
		return "spread undefined"
	case ratio == 1:
		return "steady: neither workload nor hit share moves"
	case ratio < 1.25:
		return fmt.Sprintf("steady: the %s varies by a factor of %.2f between the 5th and 95th percentile", what, ratio)
	case ratio < 1.6:
		return fmt.Sprintf("fairly steady: the %s varies by a factor of %.2f between the 5th and 95th percentile", what, ratio)
	}
	return fmt.Sprintf("unsteady: the %s varies by a factor of %.2f between the 5th and 95th percentile", what, ratio)
}

// WordsConvention states the thresholds of Describe's words, for every
// view that shows them.
const WordsConvention = "steady, fairly steady, unsteady: the larger of the workload's and the hit share's 95th-to-5th percentile ratio is below 1.25, below 1.6, or more; thresholds of this tool's own convention, with no published source, so read the ratio itself"

// BandAt returns the band point nearest to cut number cut of the set's
// curve: the band cut at the same place or, between two, the stricter
// one, whose figures hold at least as strict a cut. It reports false when
// the result has no band.
func (r Result) BandAt(cut int) (BandPoint, bool) {
	if len(r.Band) == 0 {
		return BandPoint{}, false
	}
	i := sort.Search(len(r.Band), func(k int) bool { return r.Band[k].Cut > cut })
	if i == 0 {
		return r.Band[0], true
	}
	return r.Band[i-1], true
}

// DescribeBand says in plain words how wide the uncertainty is at a band
// point: the 5th to 95th percentile of the hit share and of the
// wrong-alert share across the resampled sets, as percentages.
func DescribeBand(p BandPoint) string {
	within := func(name string, v [2]float64) string {
		if math.IsNaN(v[0]) || math.IsNaN(v[1]) {
			return "the " + name + " is undefined"
		}
		return fmt.Sprintf("the %s lies within %.1f–%.1f%%", name, 100*v[0], 100*v[1])
	}
	return "in 9 resampled sets of 10 " + within("hit share", p.Recall) + " and " + within("wrong-alert share", p.FalseDiscoveryRate)
}
