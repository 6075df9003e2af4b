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
	successes = min(max(successes, 0), trials)
	p := successes / trials
	z2 := z * z
	centre := (p + z2/(2*trials)) / (1 + z2/trials)
	half := z / (1 + z2/trials) * math.Sqrt(p*(1-p)/trials+z2/(4*trials*trials))
	lower, upper = centre-half, centre+half
	// The bounds are exact at the edges; keep rounding from leaving [0,1].
	if successes == 0 {
		lower = 0
	}
	if successes == trials {
		upper = 1
	}
	return max(lower, 0), min(upper, 1)
}
