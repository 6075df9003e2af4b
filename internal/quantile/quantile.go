// Package quantile computes sample quantiles.
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
