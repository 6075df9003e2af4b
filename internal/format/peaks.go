package format

import "math"

// PeakBasis says in plain words what a modelled p90 queue per shift rests
// on (package shift's model): volume is the cases of a production shift,
// flagged the set's own flagged cases per shift, spread the relative
// spread of the expected queue between shifts that the model takes (0:
// none), cases and rate the spreads of the cases per shift and of the
// alert rate, and distinct whether the set's shifts differ beyond its
// sampling noise at all.
func PeakBasis(volume, flagged, spread, cases, rate float64, distinct bool) string {
	own := "production's own counting noise at " + Count(volume) + " cases a shift"
	if !(spread > 0) {
		words := "the p90 is " + own + ", with no real difference between shifts taken: "
		if distinct {
			return words + "the set's shifts differ beyond its sampling noise, but not in a way the queue would follow"
		}
		return words + "with about " + Significant(flagged, 2) + " flagged " + plural(flagged, "case", "cases") +
			" a shift in the set, its shifts differ no more than sampling alone makes them, so real differences between shifts cannot be told from noise"
	}
	words := "the p90 is " + own + " plus real differences between shifts of about " + Share(spread) + " of the expected queue (one standard deviation"
	switch {
	case cases > 0 && rate > 0:
		words += "; cases per shift " + Share(cases) + ", alert rate " + Share(rate)
	case cases > 0:
		words += ", from the cases per shift"
	default:
		words += ", from the alert rate"
	}
	return words + "), beyond what the set's own sampling noise makes"
}

func plural(v float64, one, many string) string {
	if math.Abs(v-1) < 0.05 {
		return one
	}
	return many
}
