package interval

import "math"

// AveragePrecision returns the logit interval of an average precision ap
// over positives true cases (weighted counts are frequency weights) at the
// given confidence: expit(logit(ap) ± z·τ) with τ = 1/√(positives·ap·(1−ap)),
// the interval that Boyd, Eng and Page (2013, "Area under the
// precision-recall curve: point estimates and confidence intervals")
// found to cover well for the area under the precision-recall curve. It
// treats ap like a share of the true cases, on the logit scale so that the
// ends stay inside (0,1).
//
// The interval is undefined (both ends NaN) when ap is NaN or not strictly
// between 0 and 1 (the logit is infinite: every true case ranked above
// every false one gives 1) and when positives is not above 0. It panics
// when confidence lies outside (0,1).
func AveragePrecision(ap, positives, confidence float64) (lower, upper float64) {
	z := Z(confidence)
	if !(ap > 0 && ap < 1) || !(positives > 0) {
		return math.NaN(), math.NaN()
	}
	logit := math.Log(ap / (1 - ap))
	tau := 1 / math.Sqrt(positives*ap*(1-ap))
	expit := func(x float64) float64 { return 1 / (1 + math.Exp(-x)) }
	return expit(logit - z*tau), expit(logit + z*tau)
}
