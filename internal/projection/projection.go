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
package projection

import (
	"errors"
	"fmt"
	"math"

	"github.com/sill-tool/sill/internal/curve"
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
