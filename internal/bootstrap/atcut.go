package bootstrap

import (
	"math"
	"sort"
	"sync"

	"github.com/sill-tool/sill/internal/scores"
)

// atCut answers the band exactly at any cut of a run's set: the
// replicates are drawn again, from the same seeds, as far as the cut
// needs (each replicate's cases at or before a cut take one path down its
// class's tree of cells, see the package doc), so the band at a cut is
// the one the replicates drawn in full give there. Each cut is worked out
// once and kept. Rows of sampling weights that vary within a class (the
// eager draw) cannot be drawn again cheaply: only the cuts named in
// Options.CutScores are known, worked out during the run.
type atCut struct {
	tree       *cellTree // nil for the eager draw
	seed       uint64
	replicates int
	lower      bool      // lower scores are riskier
	cutScores  []float64 // the set's cut scores in ranked order (the eager draw)

	mu    sync.Mutex
	rep   *lazyReplicate
	cache map[int]BandPoint // by cut number of the set's cuts
}

// cutOf returns the cut number of the strictest cut of scores (in ranked
// order) that flags the cases score flags, and false when score flags
// none of them.
func cutOf(cutScores []float64, score float64, lower bool) (int, bool) {
	k := sort.Search(len(cutScores), func(i int) bool {
		if lower {
			return cutScores[i] > score
		}
		return cutScores[i] < score
	})
	return k - 1, k > 0
}

// BandAtCut returns the band exactly at the cut at score, the cut that
// flags the cases of score or riskier: the Low and High percentiles of
// the replicates' recall and false discovery rate there, equal to what
// the replicates drawn in full give at that cut (a percentile is NaN when
// the rate was undefined in over half the replicates). It reports false
// when the result has no replicates to draw again, when score flags no
// case of the set, and, for rows of sampling weights that vary within a
// class, for a cut not named in Options.CutScores. Safe for concurrent
// use; each cut is worked out once.
func (r Result) BandAtCut(score float64) (BandPoint, bool) {
	e := r.atCut
	if e == nil {
		return BandPoint{}, false
	}
	e.mu.Lock()
	defer e.mu.Unlock()
	if e.tree == nil {
		k, ok := cutOf(e.cutScores, score, e.lower)
		p, known := e.cache[k]
		return p, ok && known
	}
	k, ok := cutOf(e.tree.cutScore, score, e.lower)
	if !ok {
		return BandPoint{}, false
	}
	if p, known := e.cache[k]; known {
		return p, true
	}
	if e.rep == nil {
		e.rep = newLazyReplicate(e.tree)
	}
	recall, fdr := make([]float64, e.replicates), make([]float64, e.replicates)
	w := e.tree.classWeight
	for b := range e.replicates {
		e.rep.start(e.seed, uint64(b))
		e.rep.drawTotals()
		tp, fp := e.rep.classesAt(k)
		recall[b], fdr[b] = rates(float64(tp), float64(fp), float64(e.rep.total[0]), w)
	}
	p := BandPoint{Cut: k, Score: e.tree.cutScore[k]}
	p.Recall, _ = percentiles(recall, e.replicates/2)
	p.FalseDiscoveryRate, _ = percentiles(fdr, e.replicates/2)
	e.cache[k] = p
	return p, true
}

// rates returns the recall and the false discovery rate of tp true and
// fp false cases drawn at a cut of positives true cases drawn in all,
// each drawn case of class c weighing w[c]; NaN where undefined.
func rates(tp, fp, positives float64, w [2]float64) (recall, fdr float64) {
	recall, fdr = math.NaN(), math.NaN()
	if positives > 0 {
		recall = tp / positives
	}
	if tp+fp > 0 {
		fdr = w[1] * fp / (w[0]*tp + w[1]*fp)
	}
	return recall, fdr
}

// newAtCut returns the exact band of a run: drawn again from tree, or,
// for the eager draw (tree nil), the band at the given cuts of set worked
// out during the run.
func newAtCut(set *scores.Set, tree *cellTree, opt Options, cuts []bandCut, band []BandPoint) *atCut {
	e := &atCut{tree: tree, seed: opt.Seed, replicates: opt.Replicates, lower: set.LowerIsRiskier(), cache: map[int]BandPoint{}}
	if tree != nil {
		return e
	}
	e.cutScores = cutScores(set)
	for j, c := range cuts {
		e.cache[c.index] = band[j]
	}
	return e
}

// cutScores returns the distinct scores of set in ranked order.
func cutScores(set *scores.Set) []float64 {
	sc := set.Scores()
	var out []float64
	for i, s := range sc {
		if i == 0 || s != sc[i-1] {
			out = append(out, s)
		}
	}
	return out
}

// cutsAt returns the cuts of set at the given scores (each the cut that
// flags the cases of its score or riskier, see cutOf), in ranked order,
// each once; scores that flag no case are left out.
func cutsAt(set *scores.Set, at []float64) []bandCut {
	if len(at) == 0 {
		return nil
	}
	all := cutScores(set)
	ends := make([]int, len(all)) // rows at or before each cut
	sc := set.Scores()
	k := 0
	for i := range sc {
		if i+1 == len(sc) || sc[i+1] != sc[i] {
			ends[k] = i + 1
			k++
		}
	}
	seen := map[int]bool{}
	var out []bandCut
	for _, s := range at {
		if k, ok := cutOf(all, s, set.LowerIsRiskier()); ok && !seen[k] {
			seen[k] = true
			out = append(out, bandCut{index: k, score: all[k], rows: ends[k]})
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].index < out[j].index })
	return out
}
