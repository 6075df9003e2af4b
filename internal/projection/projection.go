// Package projection carries the figures measured on a validation set over
// to production, with its own base rate, volume and costs.
//
// With recall r and false positive rate f measured at a cut and a
// production base rate p:
//
//	alert rate      = r*p + f*(1-p)
//	precision       = r*p / alert rate
//	queue per shift = volume * alert rate
//	cost per shift  = volume * (p*r*hit + (1-p)*f*falseAlert + p*(1-r)*miss)
//
// Recall and false positive rate do not depend on the base rate, so they
// carry over unchanged; precision and everything counted per shift do not.
//
// # Measured and projected
//
// A figure counted on the validation set is measured; one carried to
// production with the assumptions above is projected. Every output says
// which a figure is, in the words of package format.
//
// # Intervals of projected figures
//
// IntervalsOf gives each projected figure an interval at the assumptions'
// confidence level. The intervals carry the validation set's sampling
// error of r and f only: production's base rate, volume and costs are
// taken as given, exactly as stated, so an interval says how far the
// figure could move were the assumptions right, not how far production
// could stray from them. r is estimated from the true cases and f from
// the false ones, so the two are independent binomial shares, counted
// with the effective counts (Counts) a caller passes: weighted counts read
// as frequency weights, as the measured figures' Wilson intervals use.
//
//   - Precision (and the wrong-alert share, its complement): the adjusted
//     logit interval of Mercaldo, Lau and Zhou (2007) for a predictive
//     value at a known prevalence (PrecisionInterval). It is built for
//     just this case: sensitivity and specificity estimated from samples
//     of each class, the prevalence supplied from elsewhere.
//   - Alert rate r*p + f*(1-p), and the cost per case, which is linear in
//     r and f once p and the costs are fixed: the MOVER of Zou and Donner
//     (2008) over the Wilson limits of r and f (LinearInterval), as Zou,
//     Huang and Zhang (2009) apply it to linear functions of binomial
//     shares. It is chosen over a Wald interval on the sum because it
//     keeps the Wilson limits' good coverage at small counts and their
//     asymmetry near 0 and 1, and for the alert rate (coefficients p and
//     1-p, both in [0,1] and summing to 1) its limits lie between p*l_r +
//     (1-p)*l_f and p*u_r + (1-p)*u_f, so inside [0,1]. A negative
//     coefficient (a hit that saves more than a miss costs) swaps the
//     limits of its term.
//   - Queue and cost per shift: the volume times the limits of the alert
//     rate and of the cost per case. The queue's interval is that of the
//     mean queue over many shifts; how far one shift strays from the mean
//     is a separate question (package shift).
//
// A seeded simulation in the tests checks coverage at 90% and 95%.
package projection

import (
	"errors"
	"fmt"
	"math"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/design"
)

// DefaultConfidence is the confidence level of intervals unless set.
const DefaultConfidence = 0.95

// Costs are the money figures of one case's outcome. A negative value is a
// benefit.
type Costs struct {
	FalseAlert float64 // a flagged false case
	Miss       float64 // an unflagged true case
	Hit        float64 // a flagged true case
}

// Assumptions describe production. Zero Volume or Capacity means not given;
// nil Costs means no cost was given (once any is given the rest count as 0).
type Assumptions struct {
	BaseRate   float64 // production share of true cases, in [0,1]
	Volume     float64 // cases scored per shift; 0 when not given
	Capacity   float64 // alerts one shift can work; 0 when not given
	Costs      *Costs
	Confidence float64 // level of every interval, in (0,1)

	// Sample is how the validation set was drawn, which the intervals
	// follow (package design); nil reads its weights as frequency weights.
	Sample *design.Sample
}

// ErrAssumption marks an assumption outside its allowed range.
var ErrAssumption = errors.New("invalid assumption")

// MaxAmount bounds the volume per shift, the capacity, every cost, and
// the cost per shift a volume and a cost make: past it the figures of a
// shift, their differences and their sums over many shifts could overflow
// float64 and be shown as infinities or NaN rather than refused.
const MaxAmount = 1e150

// Amounts named by an AmountError.
const (
	AmountVolume       = "volume per shift"
	AmountCapacity     = "capacity"
	AmountCost         = "cost"
	AmountCostPerShift = "cost per shift"
)

// AmountError reports an assumption too large for the figures to stay
// finite: Amount is one of the Amount constants, Value the value given
// (for AmountCostPerShift, the volume times the largest cost). It wraps
// ErrAssumption.
type AmountError struct {
	Amount string
	Value  float64
}

func (e *AmountError) Error() string {
	return fmt.Sprintf("%v: %s %g is too large, expected at most %g so that the figures stay finite", ErrAssumption, e.Amount, e.Value, MaxAmount)
}

func (e *AmountError) Unwrap() error { return ErrAssumption }

// Validate reports the first assumption outside its range.
func (a Assumptions) Validate() error {
	switch {
	case !(a.BaseRate >= 0 && a.BaseRate <= 1):
		return fmt.Errorf("%w: base rate %v, expected a share in [0,1]", ErrAssumption, a.BaseRate)
	case !(a.Volume >= 0) || math.IsInf(a.Volume, 0):
		return fmt.Errorf("%w: volume per shift %v, expected a positive number", ErrAssumption, a.Volume)
	case !(a.Capacity >= 0) || math.IsInf(a.Capacity, 0):
		return fmt.Errorf("%w: capacity %v, expected a positive number", ErrAssumption, a.Capacity)
	case !(a.Confidence > 0 && a.Confidence < 1):
		return fmt.Errorf("%w: confidence %v, expected a level in (0,1) such as 0.95", ErrAssumption, a.Confidence)
	}
	if c := a.Costs; c != nil {
		for _, v := range []float64{c.FalseAlert, c.Miss, c.Hit} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("%w: cost %v, expected a finite number", ErrAssumption, v)
			}
		}
	}
	switch {
	case a.Volume > MaxAmount:
		return &AmountError{Amount: AmountVolume, Value: a.Volume}
	case a.Capacity > MaxAmount:
		return &AmountError{Amount: AmountCapacity, Value: a.Capacity}
	}
	if c := a.Costs; c != nil {
		largest := max(math.Abs(c.FalseAlert), math.Abs(c.Miss), math.Abs(c.Hit))
		if largest > MaxAmount {
			return &AmountError{Amount: AmountCost, Value: largest}
		}
		if perShift := a.Volume * largest; perShift > MaxAmount {
			return &AmountError{Amount: AmountCostPerShift, Value: perShift}
		}
	}
	return nil
}

// Figures are a cut's projected production figures. A figure is NaN when
// undefined (for example precision where nothing would be flagged) or when
// the assumption it needs was not given.
type Figures struct {
	AlertRate     float64
	Precision     float64
	QueuePerShift float64
	CostPerShift  float64
	CostPerCase   float64 // expected cost of one scored case; needs Costs only
}

// FalseDiscoveryRate returns the projected wrong-alert share.
func (f Figures) FalseDiscoveryRate() float64 { return 1 - f.Precision }

// Project returns the production figures of a validation point under a.
// The set behind p must hold both classes for most figures to be defined:
// with no true case recall is undefined, and so is everything that needs
// it unless the base rate is 0 (and likewise for false cases).
func Project(p curve.Point, a Assumptions) Figures {
	r, f, base := p.Recall(), p.FalsePositiveRate(), a.BaseRate
	hitRate := weighted(base, r)     // p*r
	falseRate := weighted(1-base, f) // (1-p)*f
	missRate := weighted(base, 1-r)  // p*(1-r)
	alert := hitRate + falseRate
	out := Figures{AlertRate: alert, Precision: math.NaN(), QueuePerShift: math.NaN(), CostPerShift: math.NaN(), CostPerCase: math.NaN()}
	if alert > 0 {
		out.Precision = hitRate / alert
	}
	if c := a.Costs; c != nil {
		out.CostPerCase = hitRate*c.Hit + falseRate*c.FalseAlert + missRate*c.Miss
	}
	if a.Volume > 0 {
		out.QueuePerShift = a.Volume * alert
		out.CostPerShift = a.Volume * out.CostPerCase
	}
	return out
}

// weighted returns share*rate, taking it as 0 when share is 0 even where
// the rate is undefined.
func weighted(share, rate float64) float64 {
	if share == 0 {
		return 0
	}
	return share * rate
}
