// Package interval computes confidence intervals for proportions.
package interval

import (
	"fmt"
	"math"
)

// Z returns the two-sided standard normal quantile for a confidence level
// in (0,1): Z(0.95) is about 1.96. It panics outside (0,1).
func Z(confidence float64) float64 {
	if !(confidence > 0 && confidence < 1) {
		panic(fmt.Sprintf("interval: confidence %v outside (0,1)", confidence))
	}
	return math.Sqrt2 * math.Erfinv(confidence)
}

// Wilson returns the Wilson score interval (Wilson 1927, "Probable
// inference, the law of succession, and statistical inference") for
// successes out of trials at the given confidence level.
//
// successes and trials may be non-integer (weighted counts are read as
// frequency weights), with 0 <= successes <= trials; values outside that
// are clamped. With no trials the interval is undefined and both ends are
// NaN. It panics when confidence lies outside (0,1).
func Wilson(successes, trials, confidence float64) (lower, upper float64) {
	z := Z(confidence)
	if !(trials > 0) {
		return math.NaN(), math.NaN()
	}
	return wilsonAtZ(successes, trials, z)
}
