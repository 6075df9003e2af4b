package modelpair

import (
	"math"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/interval"
)

// Single is DeLong's variance of one model's ROC AUC (the diagonal of the
// paired test's covariance, see Paired), taken from the cuts of a ranked
// set as curve.Walk or curve.Curve.Points give them: pass Visit as (or
// inside) the visitor, strictest cut first, then read Estimate. Every case
// tied on one score has the same placement, so the work grows with the
// distinct scores, not the rows, and the memory is constant.
//
// At a cut whose tie group holds t true and f false cases (weighted), a
// true case's placement is (false cases below + f/2) / N and a false
// case's is (true cases above + t/2) / P, with P and N the class weights;
// the variance is S10/P + S01/N, S10 and S01 the weighted variances of
// the placements over the true and the false cases divided by the class
// weight less 1. Weights are frequency weights: a weight of 2 gives the
// variance of the row written twice.
//
// With Sampling set the weights are sampling weights (package design)
// and the variance is that of the weighted placements by linearisation
// (see SamplingPaired): a weight of 10 on every row leaves it as it is,
// where frequency weights would divide it by 10.
//
// The zero Single is ready to use; it must not be reused for another walk.
type Single struct {
	Sampling bool

	tp, fp                float64 // cumulative at the last cut visited
	tpSquares, fpSquares  float64
	trueCases, falseCases moments
}

// Visit takes the next cut, strictest first.
func (s *Single) Visit(p curve.Point) {
	groupTP, groupFP := p.TP-s.tp, p.FP-s.fp
	groupTPSquares, groupFPSquares := p.Squares[0]-s.tpSquares, p.Squares[1]-s.fpSquares
	if groupTP > 0 && p.Negatives() > 0 {
		v := (p.TN + groupFP/2) / p.Negatives()
		s.trueCases.add(groupTP, v, v)
		s.trueCases.addSquares(groupTPSquares, v, v)
	}
	if groupFP > 0 && p.Positives() > 0 {
		v := (s.tp + groupTP/2) / p.Positives()
		s.falseCases.add(groupFP, v, v)
		s.falseCases.addSquares(groupFPSquares, v, v)
	}
	s.tp, s.fp = p.TP, p.FP
	s.tpSquares, s.fpSquares = p.Squares[0], p.Squares[1]
}

// AUCEstimate is one model's ROC AUC with DeLong's variance and the normal
// interval it gives.
type AUCEstimate struct {
	AUC      float64
	Variance float64
	StdError float64
	// Interval is AUC ± z·StdError at the confidence asked, clipped to
	// [0,1] as R's pROC ci.auc(method = "delong") clips it.
	Interval [2]float64
}

// Estimate returns the AUC of the cuts visited, its variance and the
// normal interval at confidence (in (0,1); it panics outside). The AUC is
// NaN when a class weighs nothing; the variance, standard error and
// interval are NaN as well when a class weighs 1 or less (a variance
// needs two). A variance of 0 (the classes apart, AUC 0 or 1) gives the
// interval [AUC, AUC].
func (s *Single) Estimate(confidence float64) AUCEstimate {
	interval.Z(confidence) // panics outside (0,1), whatever the data
	positives, negatives := s.trueCases.weight, s.falseCases.weight
	nan := math.NaN()
	e := AUCEstimate{AUC: nan, Variance: nan, StdError: nan, Interval: [2]float64{nan, nan}}
	if !(positives > 0) || !(negatives > 0) {
		return e
	}
	// The placements' weighted mean is the AUC.
	e.AUC = s.trueCases.meanX
	e.Variance = s.trueCases.covariance(positives)/positives + s.falseCases.covariance(negatives)/negatives
	if s.Sampling {
		e.Variance = s.trueCases.samplingCovariance() + s.falseCases.samplingCovariance()
	}
	if math.IsNaN(e.Variance) {
		return e
	}
	e.Variance = max(e.Variance, 0)
	e.StdError = math.Sqrt(e.Variance)
	e.Interval = NormalInterval(e.AUC, e.StdError, confidence)
	return e
}

// NormalInterval returns auc ± z·stdError at confidence (in (0,1); it
// panics outside), clipped to [0,1] as R's pROC ci.auc(method = "delong")
// clips it; both ends NaN when either figure is. Estimate uses it; a
// caller holding the same AUC summed another way (package curve's, equal
// to the last digits or so) centres the interval on that one with it.
func NormalInterval(auc, stdError, confidence float64) [2]float64 {
	z := interval.Z(confidence)
	if math.IsNaN(auc) || math.IsNaN(stdError) {
		return [2]float64{math.NaN(), math.NaN()}
	}
	return [2]float64{max(auc-z*stdError, 0), min(auc+z*stdError, 1)}
}
