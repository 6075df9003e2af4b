package analysis

import (
	"math"
	"math/rand/v2"
	"strconv"

	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// OptimismFolds is the number of folds of CostOptimism, and OptimismSeed
// the seed of its fold assignment.
const (
	OptimismFolds = 10
	OptimismSeed  = 16
)

// OptimismMethod says in words what CostOptimism rests on, for every view
// that shows the estimate beside the least-cost figure.
func OptimismMethod() string {
	return "Tibshirani and Tibshirani 2009: the cut chosen on all but one of " + strconv.Itoa(OptimismFolds) +
		" seeded folds stratified by class, its cost on the fold left out less its cost where chosen, averaged over the folds"
}

// CostOptimism estimates by how much the least-cost cut's cost per case on
// the validation set understates its cost out of sample: the cost rule
// picks the cut of least cost on the same cases it then reports that cost
// on, so the figure is optimistic.
//
// The rows are split into OptimismFolds folds, stratified by class (each
// class's rows are shuffled with a rand/v2 PCG seeded with OptimismSeed
// and dealt out in turn). For each fold k the least-cost cut θ₋ₖ is
// chosen on the other folds (strictest among equals, as the cost rule),
// and the estimate is the mean over folds of
//
//	cost of θ₋ₖ on fold k − cost of θ₋ₖ on the other folds,
//
// what choosing the cut on (K−1)/K of the cases loses when it meets cases
// it was not chosen on. Costs are projected at production's base rate
// (projection.Project), as the cost rule's.
//
// This follows the idea of Tibshirani and Tibshirani (2009), "A bias
// correction for the minimum error rate in cross-validation", Annals of
// Applied Statistics. From memory, their estimate is the mean over folds
// of e_k(θ̂) − e_k(θ̂_k), with e_k the held-out error curve of fold k, θ̂ the
// minimiser of the cross-validated curve and θ̂_k that of fold k's own
// curve. A cut has nothing trained on the data besides the cut itself, so
// that form here measures the optimism of a choice made on n/K cases, which
// for a least-cost choice is several times the optimism at n; the form
// above, the same held-out-minus-chosen-on gap with the choice made on the
// other folds, measures it at (K−1)/K of the cases.
//
// The work is one pass over the ranked rows plus K steps per distinct
// score. It returns NaN without costs, for a counts table (its rows stand
// for many cases and cannot be split into folds row by row), or when some
// fold or its complement lacks a class and the base rate needs it.
func CostOptimism(set *scores.Set, a projection.Assumptions) float64 {
	const k = OptimismFolds
	if a.Costs == nil || set.CountsTable() || set.Len() < 2*k {
		return math.NaN()
	}
	labels, scoreList := set.Labels(), set.Scores()
	n := len(labels)
	fold := make([]uint8, n)
	rng := rand.New(rand.NewPCG(OptimismSeed, 0))
	var byClass [2][]int32
	for i, l := range labels {
		c := 0
		if l {
			c = 1
		}
		byClass[c] = append(byClass[c], int32(i))
	}
	for _, rows := range byClass {
		rng.Shuffle(len(rows), func(i, j int) { rows[i], rows[j] = rows[j], rows[i] })
		for j, i := range rows {
			fold[i] = uint8(j % k)
		}
	}
	return foldOptimism(scoreList, labels, set.Weight, fold, k, a)
}

// foldOptimism is CostOptimism's arithmetic on rows ranked riskiest first,
// given each row's fold (in [0, k)) and weight.
func foldOptimism(scoreList []float64, labels []bool, weight func(int) float64, fold []uint8, k int, a projection.Assumptions) float64 {
	n := len(scoreList)
	// Fold totals of true and false cases.
	pos, neg := make([]float64, k), make([]float64, k)
	for i, l := range labels {
		if l {
			pos[fold[i]] += weight(i)
		} else {
			neg[fold[i]] += weight(i)
		}
	}
	var allPos, allNeg float64
	for f := range k {
		allPos += pos[f]
		allNeg += neg[f]
	}
	// Cost per case is linear in the flagged counts (projection.Project):
	// p·H·tp/P + (1−p)·A·fp/N + p·M·(P−tp)/P, undefined when a class the
	// base rate needs is missing.
	base, c := a.BaseRate, *a.Costs
	costOf := func(tp, fp, positives, negatives float64) float64 {
		var cost float64
		if base > 0 {
			if !(positives > 0) {
				return math.NaN()
			}
			cost += base * (c.Hit*tp + c.Miss*(positives-tp)) / positives
		}
		if base < 1 {
			if !(negatives > 0) {
				return math.NaN()
			}
			cost += (1 - base) * c.FalseAlert * fp / negatives
		}
		return cost
	}
	// Running flagged counts per fold; for each fold the best cut so far
	// on the other folds, its cost there and on the fold itself.
	tp, fp := make([]float64, k), make([]float64, k)
	best, bestOut := make([]float64, k), make([]float64, k)
	found := make([]bool, k)
	var allTP, allFP float64
	visit := func() {
		for f := range k {
			in := costOf(allTP-tp[f], allFP-fp[f], allPos-pos[f], allNeg-neg[f])
			if math.IsNaN(in) {
				continue
			}
			if !found[f] || in < best[f]-1e-12*math.Abs(best[f]) {
				found[f], best[f] = true, in
				bestOut[f] = costOf(tp[f], fp[f], pos[f], neg[f])
			}
		}
	}
	visit() // the cut that flags nothing
	for start := 0; start < n; {
		end := start
		for ; end < n && scoreList[end] == scoreList[start]; end++ {
			w := weight(end)
			if labels[end] {
				tp[fold[end]] += w
				allTP += w
			} else {
				fp[fold[end]] += w
				allFP += w
			}
		}
		start = end
		visit()
	}
	var sum float64
	for f := range k {
		if !found[f] || math.IsNaN(bestOut[f]) {
			return math.NaN()
		}
		sum += bestOut[f] - best[f]
	}
	return sum / float64(k)
}
