package drift

import (
	"math"

	"github.com/sill-tool/sill/internal/design"
)

// Sampling weights on the new data: the score tests read each bin's
// weighted share with its linearised (Taylor) variance, the with-
// replacement form of package design (Woodruff 1971),
//
//	var(b_j) = (s_j (1 − 2 b_j) + b_j² S) / W²,
//
// where b_j is bin j's weighted share, W the total weight, s_j the bin's
// sum of squared weights and S their total; for weights of 1 it is the
// multinomial b_j (1 − b_j) / n (package design multiplies its
// variances by n/(n−1) for n rows as well; left out here, where n runs to
// thousands). A single scale for the whole histogram
// (such as the effective size of the alert rate) cannot stand for weights
// that differ between bins (cases sampled by score), where it overstated
// the rows behind the thinned bins and alarmed on noise.

// binShares returns the weighted shares of counts and each share's
// linearised variance from the bins' squared weights; nil when the
// counts have no weight.
func binShares(counts, squares []float64) (shares, variances []float64) {
	w, s := sum(counts), sum(squares)
	if !(w > 0) || !(s > 0) {
		return nil, nil
	}
	shares, variances = make([]float64, len(counts)), make([]float64, len(counts))
	for j, c := range counts {
		b := c / w
		shares[j] = b
		variances[j] = math.Max(0, squares[j]*(1-2*b)+b*b*s) / (w * w)
	}
	return shares, variances
}

// kishSize returns Kish's effective size of counts with squared weights
// squares (design.Kish); 0 without weight.
func kishSize(counts, squares []float64) float64 {
	return design.Kish(sum(counts), sum(squares))
}

// designHomogeneity compares the weighted counts of two samples over the
// same bins, each with its bins' squared weights (validation and
// validationSquares, fresh and freshSquares; counts as their own squares
// read a side as a multinomial sample of its total, as frequency weights
// or a side already at its effective size), by Pearson's statistic on
// the shares with the first-order correction of Rao and Scott (1981,
// "The analysis of categorical data from complex sample surveys:
// chi-squared tests for goodness of fit and independence in two-way
// tables", Journal of the American Statistical Association 76; from
// memory): the statistic sum_j (a_j − b_j)² / p_j, with p_j the shares
// pooled at the two sides' Kish sizes, is divided by its expectation
// under no change, sum_j (var a_j + var b_j) / p_j (binShares), and
// multiplied by the degrees of freedom (bins in use less one), so that
// it reads against the chi-square distribution. For weights of 1 it is
// close to Pearson's test of HomogeneityTest. The slices have one length
// (a panic otherwise); with either side empty or fewer than two bins in
// use every figure is NaN (freedom 0).
func designHomogeneity(validation, validationSquares, fresh, freshSquares []float64) (statistic float64, freedom int, p float64) {
	if len(validation) != len(fresh) || len(fresh) != len(freshSquares) || len(validation) != len(validationSquares) {
		panic("drift: designHomogeneity got slices of different lengths")
	}
	a, va := binShares(validation, validationSquares)
	b, vb := binShares(fresh, freshSquares)
	if a == nil || b == nil {
		return math.NaN(), 0, math.NaN()
	}
	na, nb := kishSize(validation, validationSquares), kishSize(fresh, freshSquares)
	var gap, noise float64
	used := 0
	for j := range validation {
		pooled := (na*a[j] + nb*b[j]) / (na + nb)
		if !(pooled > 0) {
			continue
		}
		used++
		gap += (a[j] - b[j]) * (a[j] - b[j]) / pooled
		noise += (va[j] + vb[j]) / pooled
	}
	freedom = used - 1
	if freedom < 1 || !(noise > 0) {
		return math.NaN(), 0, math.NaN()
	}
	statistic = float64(freedom) * gap / noise
	return statistic, freedom, ChiSquareSurvival(statistic, float64(freedom))
}

// designEffect returns the mean design effect of the bins' weighted
// shares against a multinomial sample of Kish's effective size n:
// n sum_j var(b_j)/b_j over the bins in use less one (the first-order
// factor of Rao and Scott, 1981), and n; 1 and the total for weights of
// 1. NaN and 0 without weight.
func designEffect(counts, squares []float64) (effect, n float64) {
	b, vb := binShares(counts, squares)
	if b == nil {
		return math.NaN(), 0
	}
	n = kishSize(counts, squares)
	var ratio float64
	used := 0
	for j := range b {
		if b[j] > 0 {
			used++
			ratio += vb[j] / b[j]
		}
	}
	if used < 2 {
		return 1, n
	}
	return n * ratio / float64(used-1), n
}
