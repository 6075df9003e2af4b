package projection

import (
	"math"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/interval"
)

// Counts are the effective counts of one cut on the validation set: the
// true cases flagged (TP) and missed (FN), the false cases flagged (FP)
// and left (TN). Weighted counts read as frequency weights are passed as
// they are; a design that needs other effective counts passes those.
// Counts must not be negative.
type Counts struct {
	TP, FP, FN, TN float64
}

// Intervals are the intervals of a cut's projected figures at one
// confidence level. They carry the validation set's sampling error of
// recall and the false positive rate only: production's base rate, volume
// and costs are taken as given. An interval that is undefined (its figure
// is undefined, or the assumption it needs was not given) is [NaN, NaN].
type Intervals struct {
	Precision     [2]float64
	AlertRate     [2]float64
	QueuePerShift [2]float64
	CostPerShift  [2]float64
	CostPerCase   [2]float64
}

// FalseDiscovery returns the interval of the projected wrong-alert share,
// the complement of precision's.
func (iv Intervals) FalseDiscovery() [2]float64 {
	return [2]float64{1 - iv.Precision[1], 1 - iv.Precision[0]}
}

// undefined is the interval of an undefined figure.
var undefined = [2]float64{math.NaN(), math.NaN()}

// IntervalsOf returns the intervals of the projected figures of a cut
// whose validation counts are c, under a (whose Confidence must lie in
// (0,1)): precision by PrecisionInterval, the alert rate by
// AlertRateInterval, the queue per shift as Volume times the alert rate's
// limits, the cost per case by LinearInterval and the cost per shift as
// Volume times its limits.
func IntervalsOf(c Counts, a Assumptions) Intervals {
	iv := Intervals{Precision: undefined, AlertRate: undefined, QueuePerShift: undefined, CostPerShift: undefined, CostPerCase: undefined}
	iv.Precision[0], iv.Precision[1] = PrecisionInterval(c, a.BaseRate, a.Confidence)
	iv.AlertRate[0], iv.AlertRate[1] = AlertRateInterval(c, a.BaseRate, a.Confidence)
	if costs := a.Costs; costs != nil {
		p := a.BaseRate
		// cost per case = p*miss + r*p*(hit-miss) + f*(1-p)*falseAlert
		iv.CostPerCase[0], iv.CostPerCase[1] = LinearInterval(c, p*(costs.Hit-costs.Miss), (1-p)*costs.FalseAlert, p*costs.Miss, a.Confidence)
	}
	if a.Volume > 0 {
		iv.QueuePerShift = scaled(iv.AlertRate, a.Volume)
		iv.CostPerShift = scaled(iv.CostPerCase, a.Volume)
	}
	// An interval is defined exactly where its figure is: Project takes a
	// rate as undefined wherever its class has no cases and the base rate
	// weighs it, even at a cost of 0.
	fig := Project(curve.Point{TP: c.TP, FP: c.FP, FN: c.FN, TN: c.TN}, a)
	for _, m := range []struct {
		v  float64
		ci *[2]float64
	}{{fig.Precision, &iv.Precision}, {fig.AlertRate, &iv.AlertRate}, {fig.QueuePerShift, &iv.QueuePerShift}, {fig.CostPerShift, &iv.CostPerShift}, {fig.CostPerCase, &iv.CostPerCase}} {
		if math.IsNaN(m.v) {
			*m.ci = undefined
		}
	}
	return iv
}

func scaled(ci [2]float64, by float64) [2]float64 { return [2]float64{by * ci[0], by * ci[1]} }

// PrecisionInterval returns the interval of the projected precision (the
// positive predictive value) at the base rate p, taken as known, from the
// counts c at the given confidence level (in (0,1); it panics outside).
//
// It is the adjusted logit interval of Mercaldo, Lau and Zhou (2007),
// "Confidence intervals for predictive values with an emphasis to
// case–control designs", Statistics in Medicine 26:2170–2183: with
// recall r (sensitivity) and false positive rate f (1 − specificity),
//
//	logit(precision) = log(p*r / ((1-p)*f))
//	var              = (1-r)/(r*n1) + (1-f)/(f*n0)
//
// (n1 = TP+FN true cases, n0 = FP+TN false cases), and the limits are
// expit(logit ± z*sqrt(var)). As the paper's adjusted interval does, z²/2
// is added to each of the four counts before r, f, n1 and n0 are taken,
// which keeps the interval defined when a count is 0. Two edges are
// exact, as Wilson's are: with no true case flagged the lower limit is 0
// (the precision itself), and with no false case flagged the upper limit
// is 1. Where the adjusted counts would leave the precision itself
// outside the interval (one or two cases flagged at a base rate near 0),
// the interval is stretched to hold it.
//
// At p = 0 the precision is 0 and at p = 1 it is 1 wherever a case is
// flagged, with no uncertainty left: the interval is that single value.
// It is [NaN, NaN] where the precision is undefined: a class with no
// cases whose rate the base rate needs, or nothing flagged.
func PrecisionInterval(c Counts, p, confidence float64) (lower, upper float64) {
	z := interval.Z(confidence)
	n1, n0 := c.TP+c.FN, c.FP+c.TN
	r, f := rate(c.TP, n1), rate(c.FP, n0)
	switch {
	case !(p >= 0 && p <= 1):
		return math.NaN(), math.NaN()
	case p == 0:
		if f > 0 {
			return 0, 0
		}
		return math.NaN(), math.NaN()
	case p == 1:
		if r > 0 {
			return 1, 1
		}
		return math.NaN(), math.NaN()
	case math.IsNaN(r) || math.IsNaN(f) || !(r > 0 || f > 0):
		return math.NaN(), math.NaN()
	}
	add := z * z / 2
	tp, fn, fp, tn := c.TP+add, c.FN+add, c.FP+add, c.TN+add
	ra, fa := tp/(tp+fn), fp/(fp+tn)
	logit := math.Log(p*ra) - math.Log((1-p)*fa)
	half := z * math.Sqrt(fn/(tp*(tp+fn))+tn/(fp*(fp+tn)))
	lower, upper = expit(logit-half), expit(logit+half)
	if c.TP == 0 {
		lower = 0
	}
	if c.FP == 0 {
		upper = 1
	}
	// The adjusted counts can pull the interval off the precision itself
	// where only a handful of cases are flagged at a very low base rate;
	// a figure is never shown outside its own interval.
	precision := p * r / (p*r + (1-p)*f)
	return min(lower, precision), max(upper, precision)
}

// PrecisionLowerCeiling returns a number no lower than the lower limit of
// PrecisionInterval(c, p, confidence) for every c of the same class
// totals as stricter and looser whose TP lies between theirs and whose FP
// lies between theirs (stricter's TP and FP at most looser's): the cuts
// between two cuts of one ranking. A search uses it to skip such a run
// where no lower limit can reach a value. The limit's logit,
// log(p*r/((1-p)*f)) - z*sqrt(var), grows with TP and falls with FP in
// its first term, and the variance's adjusted terms FN/(TP*n1) and
// TN/(FP*n0) fall as TP and as FP grow, so the ceiling takes the first
// term at looser's TP and stricter's FP and the variance at looser's TP
// and FP, and is widened by a relative 1e-12 against rounding. It is NaN where p is not strictly between 0 and 1 or a class
// has no cases, and is not a limit of any interval itself.
func PrecisionLowerCeiling(stricter, looser Counts, p, confidence float64) float64 {
	n1, n0 := looser.TP+looser.FN, looser.FP+looser.TN
	if !(p > 0 && p < 1) || !(n1 > 0) || !(n0 > 0) {
		return math.NaN()
	}
	z := interval.Z(confidence)
	add := z * z / 2
	n1, n0 = n1+2*add, n0+2*add
	tp, fn := looser.TP+add, looser.FN+add
	fewestFP, mostFP, tn := stricter.FP+add, looser.FP+add, looser.TN+add
	logit := math.Log(p*tp/n1) - math.Log((1-p)*fewestFP/n0)
	half := z * math.Sqrt(fn/(tp*n1)+tn/(mostFP*n0))
	return expit(logit-half) * (1 + 1e-12) // above the rounding of either computation
}

// AlertRateInterval returns the interval of the projected alert rate
// r*p + f*(1-p) at the base rate p, taken as known, from the counts c at
// the given confidence level: LinearInterval with coefficients p and 1-p.
// Its limits lie in [0,1].
func AlertRateInterval(c Counts, p, confidence float64) (lower, upper float64) {
	if !(p >= 0 && p <= 1) {
		return math.NaN(), math.NaN()
	}
	return LinearInterval(c, p, 1-p, 0, confidence)
}

// LinearInterval returns the interval of a*r + b*f + k, where r is the
// recall TP/(TP+FN) and f the false positive rate FP/(FP+TN) of the
// counts c, at the given confidence level (in (0,1); it panics outside).
//
// It is the MOVER of Zou and Donner (2008), "Construction of confidence
// limits about effect measures: a general approach", Statistics in
// Medicine 27:1693–1702, applied to a linear function of independent
// binomial proportions as in Zou, Huang and Zhang (2009), "A note on
// confidence interval estimation for a linear function of binomial
// proportions", Computational Statistics & Data Analysis 53:1080–1085:
// with Wilson limits [l_r, u_r] and [l_f, u_f] of r and f (recall and the
// false positive rate come from disjoint cases, so they are independent),
//
//	lower = θ - sqrt(Σ (c_i·θ_i - min(c_i·l_i, c_i·u_i))²)
//	upper = θ + sqrt(Σ (max(c_i·l_i, c_i·u_i) - c_i·θ_i)²)
//
// for θ = Σ c_i·θ_i + k. A term whose coefficient is 0 drops out, even
// where its rate is undefined; otherwise an undefined rate makes the
// interval [NaN, NaN].
func LinearInterval(c Counts, a, b, k, confidence float64) (lower, upper float64) {
	estimate, below, above := k, 0.0, 0.0
	for _, term := range []struct{ coef, hits, trials float64 }{{a, c.TP, c.TP + c.FN}, {b, c.FP, c.FP + c.TN}} {
		if term.coef == 0 {
			continue
		}
		if !(term.trials > 0) {
			return math.NaN(), math.NaN()
		}
		share := min(max(term.hits/term.trials, 0), 1)
		lo, hi := interval.Wilson(term.hits, term.trials, confidence)
		lo, hi = term.coef*lo, term.coef*hi
		if lo > hi {
			lo, hi = hi, lo
		}
		v := term.coef * share
		estimate += v
		below += (v - lo) * (v - lo)
		above += (hi - v) * (hi - v)
	}
	if math.IsNaN(estimate) || math.IsInf(estimate, 0) {
		return math.NaN(), math.NaN()
	}
	return estimate - math.Sqrt(below), estimate + math.Sqrt(above)
}

// rate is hits/trials, NaN without trials.
func rate(hits, trials float64) float64 {
	if !(trials > 0) {
		return math.NaN()
	}
	return hits / trials
}

func expit(x float64) float64 { return 1 / (1 + math.Exp(-x)) }
