package cutrule

import "github.com/sill-tool/sill/internal/format"

// Basis names the figure r picks its cut on, with its kind in the words
// of package format ("measured", "projected"), for every view to say
// beside the rule: "the projected wrong-alert share". baseRateGiven says
// whether production's base rate differs from the validation set's: then
// wrong= reads the projected wrong-alert share, otherwise the two are the
// same figure and it reads as measured. A kind without a basis here gives
// "".
func (r Rule) Basis(baseRateGiven bool) string {
	switch r.Kind {
	case Score:
		return "the score itself"
	case Top:
		return "the " + format.Measured + " rows flagged"
	case Hit:
		return "the " + format.Measured + " hit share (production keeps it)"
	case Wrong:
		if baseRateGiven {
			return "the " + format.Projected + " wrong-alert share"
		}
		return "the " + format.Measured + " wrong-alert share"
	case Base:
		return "the " + format.Projected + " alert rate against the base rate"
	case Queue:
		return "the " + format.Projected + " queue per shift"
	case Cost:
		return "the " + format.Projected + " cost per shift"
	case Queue90:
		return "the real shifts' 9-in-10 queue, " + format.Projected + " to production's volume"
	case HitBound:
		return "the one-sided " + format.Level(r.Confidence()) + " lower bound of the " + format.Measured + " hit share (Wilson)"
	case WrongBound:
		if baseRateGiven {
			return "the one-sided " + format.Level(r.Confidence()) + " upper bound of the " + format.Projected + " wrong-alert share"
		}
		return "the one-sided " + format.Level(r.Confidence()) + " upper bound of the " + format.Measured + " wrong-alert share (Wilson)"
	}
	return ""
}

// Promise says what r's cut promises about production, for every view to
// show beside the rule: hit= and wrong= meet their figure on the
// validation set only, hitNN= and wrongNN= with their level. Other rules
// give "".
func (r Rule) Promise() string {
	switch r.Kind {
	case Hit:
		return "hit share about " + format.Share(r.Value) + " on this set only: below it about half the time in production"
	case Wrong:
		return "wrong-alert share about " + format.Share(r.Value) + " on this set only: above it about half the time in production"
	case HitBound:
		return "hit share at least " + format.Share(r.Value) + " with " + format.Level(r.Confidence()) + " confidence: below it in about " + format.Level(1-r.Confidence()) + " of validation sets"
	case WrongBound:
		return "wrong-alert share at most " + format.Share(r.Value) + " with " + format.Level(r.Confidence()) + " confidence: above it in about " + format.Level(1-r.Confidence()) + " of validation sets"
	}
	return ""
}
