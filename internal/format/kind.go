package format

import "math"

// The two kinds of figure, named alike in every view (report, explorer,
// decision file, review, sign-off page, help and README's glossary):
// a figure is either counted on the validation set or carried to
// production under the assumed base rate, volume and costs.
const (
	// Measured marks a figure counted on the validation set: cases
	// flagged, hit share, wrong-alert share, false positive rate, and
	// the bootstrap's resampled ranges of them.
	Measured = "measured"
	// Projected marks a figure carried to production: the alert rate,
	// wrong-alert share and precision at the production base rate, the
	// queue and cost per shift.
	Projected = "projected"
	// MeasuredWhere and ProjectedWhere complete the two words where a
	// heading has room: "measured on the validation set", "projected to
	// production".
	MeasuredWhere  = "on the validation set"
	ProjectedWhere = "to production"
	// ProjectedGiven says what the intervals of projected figures take
	// for granted, wherever those intervals are shown.
	ProjectedGiven = "intervals of projected figures take production's base rate, volume and costs as given: they carry only the validation set's sampling error"
)

// MeasuredHeading and ProjectedHeading head the two groups of figures.
const (
	MeasuredHeading  = Measured + " " + MeasuredWhere
	ProjectedHeading = Projected + " " + ProjectedWhere
)

// QueueInterval formats the interval of a queue per shift in the queue's
// one decimal, "98.2–130.5". It reads "n/a" when either end is undefined.
func QueueInterval(ci [2]float64) string {
	if !defined(ci[0]) || !defined(ci[1]) {
		return NA
	}
	return Queue(ci[0]) + "–" + Queue(ci[1])
}

// MoneyInterval formats the interval of a cost as Money formats its ends,
// both with the fewer decimals either would have ("35–143", not
// "34.92–143"), and "-291 to 782" when an end is negative, so that a
// minus sign never reads as the dash between the ends. It reads "n/a"
// when either end is undefined.
func MoneyInterval(ci [2]float64) string {
	if !defined(ci[0]) || !defined(ci[1]) {
		return NA
	}
	decimals := min(amountDecimals(ci[0]), amountDecimals(ci[1]))
	end := func(v float64) string {
		if math.Abs(v) >= huge {
			return amount(v)
		}
		return fixed(v, decimals)
	}
	low, high := end(ci[0]), end(ci[1])
	if low[0] == '-' || high[0] == '-' {
		return low + " to " + high
	}
	return low + "–" + high
}
