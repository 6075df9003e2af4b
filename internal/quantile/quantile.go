// Package quantile computes sample quantiles, and the quantiles of
// chi-square that the tests of drift and of shift spreads compare with.
package quantile

import (
	"fmt"
	"math"
)

// Linear returns the q-quantile of values sorted in ascending order,
// interpolating linearly between order statistics at position q*(n-1)
// (the default of numpy's percentile, with its interpolation that is exact
// at both ends). It returns NaN for no values and panics when q lies
// outside [0,1].
func Linear(ascending []float64, q float64) float64 {
	if !(q >= 0 && q <= 1) {
		panic(fmt.Sprintf("quantile: q %v outside [0,1]", q))
	}
	n := len(ascending)
	if n == 0 {
		return math.NaN()
	}
	h := q * float64(n-1)
	j := int(math.Floor(h))
	if j >= n-1 {
		return ascending[n-1]
	}
	t := h - float64(j)
	a, b := ascending[j], ascending[j+1]
	if t >= 0.5 {
		return b - (b-a)*(1-t)
	}
	return a + (b-a)*t
}

// ChiSquare returns the p quantile of chi-square with k degrees of freedom
// by Wilson and Hilferty's (1931) cube-root normal approximation, within
// about 0.1 of the printed tables at 0.99 from 9 degrees of freedom up and
// weakest at 1 degree. It returns NaN for p outside (0, 1) or k <= 0.
func ChiSquare(p, k float64) float64 {
	if !(p > 0 && p < 1) || !(k > 0) {
		return math.NaN()
	}
	z := math.Sqrt2 * math.Erfinv(2*p-1) // the standard normal p quantile
	c := 1 - 2/(9*k) + z*math.Sqrt(2/(9*k))
	return k * c * c * c
}
