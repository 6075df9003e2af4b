package drift

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/scores"
)

// A baseline check judges a sequence of production batches against a
// first production batch (the baseline) instead of the validation set: a
// two-sided CUSUM (Page 1954, "Continuous inspection schemes",
// Biometrika 41) on the alert rate at the chosen cut. It suits the case
// where the validation set is small beside the batches, so that a check
// against it mostly tests the validation set's own noise.
//
// Each batch i gives the standardised difference of its alert rate from
// the baseline's on the angular scale, where the binomial variance is
// about 1/n whatever the rate (Anscombe 1948, "The transformation of
// Poisson, binomial and negative-binomial data", Biometrika 35),
//
//	z_i = (A(x_i, n_i) − A(x_0, n_0)) / √(1/n_i + 1/n_0),
//	A(x, n) = 2·asin √((x + 3/8)/(n + 3/4)),
//
// with x flagged of n cases. n is the batch's effective number of cases
// (Batch.Trials): its weighted cases for frequency weights; under
// sampling weights the effective size of Korn and Graubard (1998) of the
// weighted alert rate (package design), and x the alert rate times n, so
// that a batch of 1,000 rows weighted 10 counts as the rows it holds, not
// as 10,000 cases. Two sums accumulate them, S⁺_i = max(0, S⁺_{i−1} + z_i − k) for a
// rise and S⁻_i = max(0, S⁻_{i−1} − z_i − k) for a fall, with the
// reference value k = ½ (tuned to a shift of one standard error, common
// practice); the rule signals at the first batch where either exceeds the
// decision interval h.
//
// Every z_i shares the baseline's own noise, so the z_i are correlated and
// the usual tables of average run length (for a known in-control mean) do
// not apply. h is set instead by simulation, so that on noise alone, the
// baseline's included, the rule signals within the K batches judged in
// BaselineLevel of runs: with u_0, u_1, … standard normal, z_i = a_i u_i −
// b_i u_0 where a_i² = (1/n_i)/(1/n_i + 1/n_0) and b_i² = 1 − a_i², h is
// the 1 − BaselineLevel quantile of the largest sum over the K batches in
// BaselineReplicates runs of a fixed seed, so that the same batches give
// the same h. The normal approximation to the binomial counts is the
// method's one assumption; TestBaselineFalseAlarms measures the rate on
// binomial draws.

// Baseline levels and simulation sizes.
const (
	// BaselineLevel is the chance, on noise alone, of a signal within
	// the batches judged.
	BaselineLevel = 0.01
	// BaselineReference is the CUSUM's reference value k, in standard
	// errors.
	BaselineReference = 0.5
	// BaselineReplicates is the number of simulated runs that set h and
	// the detection figures.
	BaselineReplicates = 20000
	// BaselineSeed seeds those runs.
	BaselineSeed = 1954
	// BaselineShift is the relative change of the alert rate whose
	// detection the output states (a rise of a fifth).
	BaselineShift = 0.2
)

// ErrBaselineEmpty says the baseline batch has no cases of weight.
var ErrBaselineEmpty = errors.New("the baseline batch has no rows of weight")

// Batch is one batch of production scores at the chosen cut.
type Batch struct {
	Name    string
	Cases   float64 // cases of weight
	Flagged float64 // cases the chosen cut flags
	// Trials is the effective number of cases behind the alert rate:
	// Cases for frequency weights, less under sampling weights (Count).
	Trials float64
}

// AlertRate is the batch's share flagged; NaN for an empty batch.
func (b Batch) AlertRate() float64 {
	if !(b.Cases > 0) {
		return math.NaN()
	}
	return b.Flagged / b.Cases
}

// Count applies the chosen cut of f to set (the cut rule in the doc of
// package scores, in the direction the file records) and returns the
// batch's weighted cases and flagged cases, with the effective cases
// behind its alert rate under sample's design (nil: frequency weights,
// the weighted cases themselves; see the package's baseline doc).
func Count(f *decision.File, set *scores.Set, name string, sample *design.Sample) (Batch, error) {
	chosen, ok := f.ChosenCandidate()
	if !ok {
		return Batch{}, fmt.Errorf("%w (%q)", ErrNoCandidate, f.Chosen)
	}
	b := Batch{Name: name}
	var p curve.Point // every case read as a false one: the alert rate mixes the classes alike
	for i, s := range set.Scores() {
		w := set.Weight(i)
		b.Cases += w
		if s >= chosen.Cut.Score && !f.Data.LowerIsRiskier || s <= chosen.Cut.Score && f.Data.LowerIsRiskier {
			b.Flagged += w
			p.FP, p.Squares[1] = p.FP+w, p.Squares[1]+w*w
		} else {
			p.TN, p.Squares[3] = p.TN+w, p.Squares[3]+w*w
		}
	}
	_, b.Trials = sample.Interval(design.FlaggedShare, p, 0.95) // the level does not change the trials
	return b, nil
}

// scaled returns the batch's flagged cases and cases at its effective
// size.
func (b Batch) scaled() (flagged, cases float64) {
	if b.Trials == b.Cases || !(b.Cases > 0) {
		return b.Flagged, b.Cases
	}
	return b.Flagged / b.Cases * b.Trials, b.Trials
}

// BatchStep is one batch's reading in the sequence.
type BatchStep struct {
	Batch
	Z          float64 // standardised difference from the baseline's alert rate
	Up, Down   float64 // the two sums after this batch
	Signalled  bool    // this batch is the first at which a sum exceeds h
	AfterAlarm bool    // a signal came at an earlier batch
}

// Sequence is the judgement of batches against a baseline.
type Sequence struct {
	Baseline  Batch
	Steps     []BatchStep
	Reference float64 // k
	Threshold float64 // h
	Level     float64 // the chance of a false signal within the batches, by design
	// Replicates and Seed are the simulation that set h.
	Replicates int
	Seed       uint64
	// Signal is the index of the first batch that signalled, -1 for none;
	// Rise says its direction.
	Signal int
	Rise   bool
	// Shift is the relative change of the alert rate whose detection is
	// stated; Detected the share of simulated runs in which a change of
	// that size from the first batch on signals within the batches, and
	// MeanDelay the mean batch (1 for the first) at which it does, among
	// those runs.
	Shift     float64
	Detected  float64
	MeanDelay float64
}

// Status is StatusDrift when the sequence signalled, else StatusOK.
func (s *Sequence) Status() string {
	if s.Signal >= 0 {
		return StatusDrift
	}
	return StatusOK
}

// JudgeBaseline runs the CUSUM of the package's baseline check over
// batches, in order, against baseline. Batches of no weight are skipped
// (Z NaN). It returns ErrBaselineEmpty when the baseline has no weight,
// and an error when no batch is given.
func JudgeBaseline(baseline Batch, batches []Batch) (*Sequence, error) {
	if !(baseline.Cases > 0) || !(baseline.Trials > 0) {
		return nil, ErrBaselineEmpty
	}
	if len(batches) == 0 {
		return nil, errors.New("no batch to judge against the baseline")
	}
	sizes := sizesOf(batches)
	s := judge(baseline, batches, threshold(baseline.Trials, sizes, BaselineReference, BaselineLevel, BaselineReplicates, BaselineSeed))
	// Detection of a rise by Shift of the baseline's rate from the first
	// batch on, in standard errors of each batch.
	p0 := math.Min(baseline.AlertRate(), 1/(1+s.Shift))
	moved := 2 * (math.Asin(math.Sqrt(p0*(1+s.Shift))) - math.Asin(math.Sqrt(p0)))
	shifts := make([]float64, len(sizes))
	for i, n := range sizes {
		shifts[i] = moved / math.Sqrt(1/n+1/baseline.Trials)
	}
	s.Detected, s.MeanDelay = detection(baseline.Trials, sizes, shifts, s.Reference, s.Threshold, s.Replicates, s.Seed+1)
	return s, nil
}

// sizesOf lists the effective cases of the batches of weight.
func sizesOf(batches []Batch) []float64 {
	sizes := make([]float64, 0, len(batches))
	for _, b := range batches {
		if b.Cases > 0 && b.Trials > 0 {
			sizes = append(sizes, b.Trials)
		}
	}
	return sizes
}

// judge runs the two sums over batches against baseline with decision
// interval h.
func judge(baseline Batch, batches []Batch, h float64) *Sequence {
	s := &Sequence{Baseline: baseline, Reference: BaselineReference, Level: BaselineLevel, Threshold: h,
		Replicates: BaselineReplicates, Seed: BaselineSeed, Signal: -1, Shift: BaselineShift}
	var up, down float64
	for _, b := range batches {
		step := BatchStep{Batch: b, Z: math.NaN(), AfterAlarm: s.Signal >= 0}
		if b.Cases > 0 && b.Trials > 0 {
			x, n := b.scaled()
			x0, n0 := baseline.scaled()
			step.Z = (angle(x, n) - angle(x0, n0)) / math.Sqrt(1/n+1/n0)
			up = math.Max(0, up+step.Z-s.Reference)
			down = math.Max(0, down-step.Z-s.Reference)
		}
		step.Up, step.Down = up, down
		if s.Signal < 0 && (up > s.Threshold || down > s.Threshold) {
			step.Signalled = true
			s.Signal = len(s.Steps)
			s.Rise = up > s.Threshold
		}
		s.Steps = append(s.Steps, step)
	}
	return s
}

// weightsOf returns a_i and b_i of the package's simulation.
func weightsOf(n0 float64, sizes []float64) (a, b []float64) {
	a, b = make([]float64, len(sizes)), make([]float64, len(sizes))
	for i, n := range sizes {
		share := (1 / n) / (1/n + 1/n0)
		a[i], b[i] = math.Sqrt(share), math.Sqrt(1-share)
	}
	return a, b
}

// threshold is h: the 1 − level quantile of the largest CUSUM sum over
// the batches in replicates runs of noise alone.
func threshold(n0 float64, sizes []float64, k, level float64, replicates int, seed uint64) float64 {
	if len(sizes) == 0 {
		return math.Inf(1)
	}
	a, b := weightsOf(n0, sizes)
	rng := rand.New(rand.NewPCG(seed, 0x5ca1ab1e))
	peaks := make([]float64, replicates)
	for r := range peaks {
		u0 := rng.NormFloat64()
		var up, down, peak float64
		for i := range sizes {
			z := a[i]*rng.NormFloat64() - b[i]*u0
			up = math.Max(0, up+z-k)
			down = math.Max(0, down-z-k)
			peak = math.Max(peak, math.Max(up, down))
		}
		peaks[r] = peak
	}
	slices.Sort(peaks)
	at := int(math.Ceil((1-level)*float64(replicates))) - 1
	return peaks[min(max(at, 0), replicates-1)]
}

// detection simulates a change of shifts[i] standard errors at every
// batch and returns the share of runs that signal within the batches and
// the mean batch of the signal among them.
func detection(n0 float64, sizes, shifts []float64, k, h float64, replicates int, seed uint64) (share, meanDelay float64) {
	if len(sizes) == 0 {
		return math.NaN(), math.NaN()
	}
	a, b := weightsOf(n0, sizes)
	rng := rand.New(rand.NewPCG(seed, 0x5ca1ab1e))
	found, delays := 0, 0
	for range replicates {
		u0 := rng.NormFloat64()
		var up, down float64
		for i := range sizes {
			z := shifts[i] + a[i]*rng.NormFloat64() - b[i]*u0
			up = math.Max(0, up+z-k)
			down = math.Max(0, down-z-k)
			if up > h || down > h {
				found++
				delays += i + 1
				break
			}
		}
	}
	if found == 0 {
		return 0, math.NaN()
	}
	return float64(found) / float64(replicates), float64(delays) / float64(found)
}

// angle is the variance-stabilising transform of x flagged of n, 2·asin√p
// with Anscombe's (1948) 3/8 corrections, whose variance is about 1/n
// whatever p, so that rates near 0 read as near-normal as rates near ½.
func angle(x, n float64) float64 {
	return 2 * math.Asin(math.Sqrt((x+0.375)/(n+0.75)))
}
