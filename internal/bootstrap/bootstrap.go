// Package bootstrap measures how far a cut would move if the validation set
// were drawn again: a seeded bootstrap that resamples the cases as the set
// was drawn, re-applies each cut rule to every replicate, and reports
// percentiles of where the cut lands, of the hit share and wrong-alert
// share there, and of the hit-share and wrong-alert curves.
//
// The design (Options.Design) says how the set was drawn. Ordinary, the
// default, is a random sample: each replicate draws as many cases as the
// set holds from all of them, so the mix of true and false cases varies
// as it would between samples. WithinClass is for class sizes fixed by
// design: each replicate keeps each class's size and draws within it.
//
// A set whose false cases were downsampled from a random sample (keep 1
// in 10, weight 10: sampling weights alike within each class) is still a
// random sample, of the thinned cases: how many true and kept false cases
// it holds varies from set to set, and the weighted base rate, read from
// the set, varies with it. Ordinary resamples it so, each drawn row
// carrying its class weight; WithinClass holds the class sizes, drops
// that noise, and its 90% band of the wrong-alert share (which moves with
// the base rate) covers too seldom. TestSamplingWeightsCoverage measures
// it (-coverage.long: hit=0.8; sets of 3,000 cases at a base rate of 0.1,
// each false case kept with chance 0.1, weight 10; 2,000 sets of 200
// replicates, PCG(2026, 21)): the wrong-alert share where the rule lands
// was covered in 0.905 of the sets by Ordinary and 0.850 by WithinClass,
// at the population's own cut 0.882 and 0.790; the cut (0.886, 0.884) and
// the flagged share (0.911, 0.911) alike under both. When the class sizes
// are fixed instead (300 true cases and 270 false, weight 10, in every
// set: the weighted base rate is the population's), WithinClass is right
// (wrong-alert share 0.902, at the population's cut 0.889) and Ordinary
// too wide (0.945, 0.949). Callers pick WithinClass only when the class
// sizes, and so the base rate the weights give, were fixed by design.
//
// Cases, not rows, are drawn, and drawing cases only counts how many of
// each cell (one distinct score and label) were drawn: a set of rows is
// first collapsed into its cells, a counts table of the same cases, and a
// replicate is a count of drawn cases for each cell. A counts table gives
// the very same result as the raw rows it aggregates.
//
// A replicate is drawn lazily, only where a rule or the band asks. Each
// class's cells, in ranked order, are the leaves of an implicit binary
// tree; a node's drawn cases split between its two halves as a binomial
// draw whose chance is the stricter half's share of the node's cases.
// Splitting in turn from a class's total is a multinomial draw of that
// total over the class's cells, exactly in distribution. The totals are
// drawn first: under the ordinary design the true cases drawn are a
// binomial draw of all the set's cases at the set's share of true cases
// (the rest are false), so that all the cases together are a multinomial
// draw of the set's size over every cell, the case resampling of a random
// sample; within classes each class keeps its size. The cases drawn at
// or before a cut then take one path from the root per class, each split
// drawn the first time it is needed and kept for the rest of the
// replicate, so a replicate costs what its questions need (the cuts the
// searches look at times the depth of the tree, the logarithm of the
// cells), not the cells. The rules search the replicate's cuts through
// cutrule.Finder.Search, the same search and the same rules as on the set
// itself; a rule met where no case was drawn takes the cut of the last
// score at which one was, as on the replicate drawn in full
// (TestLazyMatchesDrawnInFull).
//
// The binomial draws are exact by inversion (one uniform draw against the
// running sum of the probabilities) when the smaller of the mean and the
// mean of failures is below 30, and otherwise come from the normal
// distribution of the same mean and variance with a continuity
// correction, which at such means differs from the binomial by far less
// than the bootstrap's own noise. The Poisson totals below are drawn the
// same way: by inversion below a mean of 30, else from the normal
// distribution, rounded.
//
// Weights are drawn as their kind says (Options.Sampling, package
// design). Frequency weights count cases: a row of weight 3 is three
// cases, so the cells of a weighted set count the weights, and a set of
// whole-number weights is resampled exactly as the same rows written out
// (a counts table). Frequency weights that are not whole numbers draw by
// the Poisson bootstrap, whatever the design: each cell's count a Poisson
// draw of mean its weight, which needs no whole numbers, drawn as each
// class's Poisson total split down the same tree (independent Poisson
// counts, exactly in distribution). Sampling weights make the rows the
// units drawn, each drawn row carrying its weight. When the weights are
// alike within each class (a class downsampled, under either design)
// the cells count rows and a replicate is drawn lazily as
// above, each drawn row of a class weighing the class's weight. Sampling
// weights that vary within a class keep the eager draw: rows drawn one by
// one from their own generator, seeded with (Seed, b), every replicate
// built and its cuts searched in full, so that work grows with the rows
// times the replicates; callers pick Ordinary for them.
//
// Which cases a cut flags follows the cut rule in the doc of package
// scores. Percentiles interpolate linearly between order statistics
// (numpy's default).
//
// Every draw of replicate b comes from its own generator: a split (and a
// total) from a splitmix64 stream seeded by a hash of (Seed, b, class,
// node), rows of sampling weights that vary within a class from a PCG
// seeded with (Seed, b). So no draw depends on the order in which the
// rules ask, and the result depends on Seed, Replicates and Design only,
// never on the number of workers or their timing.
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

	// CutScores names cuts (by score, see Result.BandAtCut) whose band
	// the run works out while it draws, for rows of sampling weights
	// that vary within a class, whose replicates cannot be drawn again
	// cheaply; every other run answers any cut afterwards and ignores it.
	CutScores []float64

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
	// design in sizes fixed in advance, the weighted class totals the
	// population's, so each replicate keeps each class's size and draws
	// within it. A class downsampled by a keep chance (keep 1 in 10) from
	// a random sample is not such a design: its class sizes vary, and
	// Ordinary resamples it (see the package doc).
	WithinClass
)

// String names the design in words.
func (d Design) String() string {
	if d == WithinClass {
		return "within classes"
	}
	return "ordinary"
}

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

	atCut *atCut // the band exactly at any cut, see BandAtCut
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
	var tree *cellTree
	if base == nil {
		base = set
	} else {
		tree = newCellTree(base, opt.Design, poissonCells)
		if opt.Sampling && set.Weighted() {
			// Rows of sampling weights alike within each class: the
			// cells count rows, each drawn row weighing its class's weight.
			tree.classWeight, _ = classWeights(set)
			tree.sampling = true
		}
	}
	band := bandCuts(base, opt.BandCuts)

	// [rule][replicate], NaN when unmet
	scoresAt, sharesAt, recallsAt, fdrsAt := grid(len(rules), opt.Replicates), grid(len(rules), opt.Replicates), grid(len(rules), opt.Replicates), grid(len(rules), opt.Replicates)
	var exact []bandCut // the eager draw's cuts of opt.CutScores
	if tree == nil {
		exact = cutsAt(base, opt.CutScores)
	}
	recallAt, fdrAt := grid(len(band), opt.Replicates), grid(len(band), opt.Replicates) // [band cut][replicate]
	exactRecall, exactFDR := grid(len(exact), opt.Replicates), grid(len(exact), opt.Replicates)

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
			r := newDrawer(base, opt.Design, tree)
			for {
				b := int(next.Add(1) - 1)
				if b >= opt.Replicates || ctx.Err() != nil {
					return
				}
				outcomes, err := r.outcomes(opt.Seed, uint64(b), rules, a)
				if err != nil {
					failOnce.Do(func() { failure = err })
					return
				}
				for i, o := range outcomes {
					scoresAt[i][b], sharesAt[i][b], recallsAt[i][b], fdrsAt[i][b] = math.NaN(), math.NaN(), math.NaN(), math.NaN()
					if o.Met {
						scoresAt[i][b], sharesAt[i][b], recallsAt[i][b], fdrsAt[i][b] = o.Point.Score, o.Point.FlaggedShare(), o.Point.Recall(), o.Point.FalseDiscoveryRate()
					}
				}
				r.band(band, b, recallAt, fdrAt)
				if len(exact) > 0 {
					r.band(exact, b, exactRecall, exactFDR)
				}
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
	res.Band = bandPoints(band, recallAt, fdrAt, opt.Replicates)
	res.atCut = newAtCut(base, tree, opt, exact, bandPoints(exact, exactRecall, exactFDR, opt.Replicates))
	return res, nil
}

// bandPoints returns the band at each of cuts from the replicates'
// recall and false discovery rate there ([cut][replicate]).
func bandPoints(cuts []bandCut, recallAt, fdrAt [][]float64, replicates int) []BandPoint {
	var out []BandPoint
	for j, cut := range cuts {
		p := BandPoint{Cut: cut.index, Score: cut.score}
		p.Recall, _ = percentiles(recallAt[j], replicates/2)
		p.FalseDiscoveryRate, _ = percentiles(fdrAt[j], replicates/2)
		out = append(out, p)
	}
	return out
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

// bandCuts picks up to k cuts spread evenly over the ranked rows: the
// cut (tie group) holding the row of each k-th share of the cases (a
// counts table's rows stand for several), each cut once. It walks the
// scores once and keeps no curve.
func bandCuts(set *scores.Set, k int) []bandCut {
	n, cases := set.Len(), set.Cases()
	if k <= 0 || n == 0 || cases == 0 {
		return nil
	}
	sc := set.Scores()
	var out []bandCut
	cut, end := -1, 0 // the cut whose tie group ends before row end
	for j := 1; j <= k; j++ {
		row := set.RowOfCase(max(int(math.Ceil(float64(j)*float64(cases)/float64(k)))-1, 0))
		for end <= row {
			start := end
			for end < n && sc[end] == sc[start] {
				end++
			}
			cut++
		}
		if len(out) > 0 && out[len(out)-1].index == cut {
			continue
		}
		out = append(out, bandCut{index: cut, score: sc[end-1], rows: end})
	}
	return out
}

// drawer draws replicates and applies the rules to them: a
// lazyReplicate for cells, a replicator for rows of sampling weights that
// vary within a class.
type drawer interface {
	// outcomes draws replicate b and returns each rule's outcome on it.
	outcomes(seed, b uint64, rules []cutrule.Rule, a projection.Assumptions) ([]cutrule.Outcome, error)
	// band records replicate b's recall and false discovery rate at
	// the band cuts.
	band(cuts []bandCut, b int, recallAt, fdrAt [][]float64)
}

// newDrawer returns one worker's drawer: of the cells' tree when there is
// one, else of set's rows.
func newDrawer(set *scores.Set, design Design, tree *cellTree) drawer {
	if tree != nil {
		return newLazyReplicate(tree)
	}
	return newReplicator(set, design)
}

// replicator draws replicates of a set of rows of sampling weights that
// vary within a class, reusing its buffers: each group's rows (all of them, or each class)
// drawn with replacement, as many as the group has, the drawn rows
// carrying their weights along. Its work grows with the rows.
type replicator struct {
	set    *scores.Set
	groups [][]int // the rows of each group drawn apart
	rep    scores.Set
	counts []int32     // times each row was drawn
	cuts   curve.Curve // refilled for each replicate
}

func newReplicator(set *scores.Set, design Design) *replicator {
	r := &replicator{set: set, counts: make([]int32, set.Len())}
	var positiveRows, negativeRows, all []int
	for i, positive := range set.Labels() {
		all = append(all, i)
		if positive {
			positiveRows = append(positiveRows, i)
		} else {
			negativeRows = append(negativeRows, i)
		}
	}
	r.groups = [][]int{all}
	if design == WithinClass {
		r.groups = [][]int{positiveRows, negativeRows}
	}
	return r
}

// outcomes draws replicate b, from its own generator seeded with (seed,
// b), and returns each rule's outcome on it, found by
// cutrule.Finder.Search over its cuts.
func (r *replicator) outcomes(seed, b uint64, rules []cutrule.Rule, a projection.Assumptions) ([]cutrule.Outcome, error) {
	rng := rand.New(rand.NewPCG(seed, b))
	clear(r.counts)
	for _, rows := range r.groups {
		for range rows {
			r.counts[rows[rng.IntN(len(rows))]]++
		}
	}
	scores.Replicate(&r.rep, r.set, r.counts)
	finder, err := cutrule.NewFinder(rules, &r.rep, a)
	if err != nil {
		return nil, err
	}
	r.cuts.Refill(&r.rep)
	finder.Search(&r.cuts)
	return finder.Outcomes(), nil
}

// cellsOf returns set's cells: a counts table with one row per distinct
// score and label, in ranked order, counting its cases (the summed
// frequency weights of a weighted set). Rows of sampling weights, the
// units drawn, count as one case each when the weights are constant
// within each class (classWeights), and otherwise have no cells (nil).
// Frequency weights that do not add up to whole numbers in every cell
// give a weighted set of the cells instead, and poisson set: each cell's
// cases are then drawn as a Poisson count.
func cellsOf(set *scores.Set, sampling bool) (cells *scores.Set, poisson bool, err error) {
	countRows := set.Weighted() && sampling
	if _, constant := classWeights(set); countRows && !constant {
		return nil, false, nil
	}
	var sc, counts []float64
	var labels []bool
	for i := 0; i < set.Len(); {
		j := i
		var positives, negatives float64
		for ; j < set.Len() && set.Scores()[j] == set.Scores()[i]; j++ {
			cases := float64(set.CasesAt(j))
			if set.Weighted() && !countRows {
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

// classWeights returns the weight of every true row and of every false
// row of a weighted set when each class's rows weigh alike, more than 0.
func classWeights(set *scores.Set) (weights [2]float64, constant bool) {
	if !set.Weighted() {
		return [2]float64{1, 1}, true
	}
	seen := [2]bool{}
	for i, positive := range set.Labels() {
		c := 1
		if positive {
			c = 0
		}
		w := set.Weight(i)
		if seen[c] && w != weights[c] || !(w > 0) {
			return [2]float64{}, false
		}
		weights[c], seen[c] = w, true
	}
	return weights, true
}

// poisson draws from the Poisson distribution of mean m: by inversion
// (one uniform draw against the running sum of the probabilities) when m
// is below 30, else from the normal distribution of the same mean and
// variance, rounded and kept at 0 or more.
func poisson(rng *rand.Rand, m float64) int {
	if !(m > 0) {
		return 0
	}
	if m >= 30 {
		return max(int(math.Floor(m+math.Sqrt(m)*rng.NormFloat64()+0.5)), 0)
	}
	u, x, f := rng.Float64(), 0, math.Exp(-m)
	for u > f && f > 0 {
		u -= f
		x++
		f *= m / float64(x)
	}
	return x
}

// binomial draws from the binomial distribution of n trials of chance p:
// by inversion (one uniform draw against the running sum of the
// probabilities) when the mean of the rarer outcome is below 30, else
// from the normal distribution of the same mean and variance, rounded to
// the nearest whole number (the continuity correction) and kept within
// [0, n].
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
	drawnWeight := func(i int) float64 { return float64(r.counts[i]) * r.set.Weight(i) }
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
