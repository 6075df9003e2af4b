// Package floatcmp compares floats for the tests: one tolerance for every
// package, NaN equal to NaN. Only tests import it.
package floatcmp

import "math"

// Tolerance is the difference accepted between a figure and its expected
// value: absolute up to 1, relative (Tolerance times |want|) above.
const Tolerance = 1e-9

// Equal reports whether got agrees with want within Tolerance. NaN equals
// NaN; an infinity equals only the same infinity.
func Equal(got, want float64) bool { return Within(got, want, Tolerance) }

// Within is Equal with another tolerance, for a figure that agrees only
// to a looser band (a simulation's); the caller names the band in a
// constant and says why.
func Within(got, want, tolerance float64) bool {
	if math.IsNaN(got) || math.IsNaN(want) {
		return math.IsNaN(got) && math.IsNaN(want)
	}
	if got == want {
		return true
	}
	if math.IsInf(got, 0) || math.IsInf(want, 0) {
		return false
	}
	return math.Abs(got-want) <= tolerance*max(1, math.Abs(want))
}
