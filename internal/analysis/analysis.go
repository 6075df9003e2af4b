// Package analysis turns a loaded set and the operating assumptions into
// every figure the views show: the summary, the cuts of the rules (or the
// starting points), the queues of the real shifts, the breakdown by
// segment, the reliability table with the cost threshold and net benefit,
// a second model's cuts with DeLong's paired test, and the bootstrap. The
// report and the explorer both call Run, so they cannot disagree; they
// only render the Result. Which cases a cut flags follows the cut rule in
// the doc of package scores.
//
// A new figure is computed here, once, and shown by each view that needs
// it.
package analysis

import (
	"context"
	"errors"
	"math"
	"slices"

	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/modelpair"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// DefaultCalibrationBins is the reliability table's number of bins when
// Options gives none.
const DefaultCalibrationBins = 10

// Options say what Run computes beyond the summary and the cuts.
type Options struct {
	// Rules are the cuts asked for; nil asks for the starting points
	// (Starts), which follow the assumptions.
	Rules []cutrule.Rule

	// Shifts is the crew shift schedule; with it the set's case times
	// place every row in a shift of the validation period, and each cut
	// gets the queues of the real shifts. nil: no shifts.
	Shifts *shift.Schedule

	// CalibrationBins (0: DefaultCalibrationBins) and CalibrationBinning
	// shape the reliability table, made when the scores are probabilities.
	CalibrationBins    int
	CalibrationBinning calibration.Binning

	// Resampling is the bootstrap; Run resamples when its Replicates is
	// above 0. The explorer leaves it zero and calls Resample on demand.
	Resampling Resampling

	// Cursor keeps the curve for random access and the running tallies
	// that follow a cursor from cut to cut (SegmentsAt, PeaksAt), as the
	// explorer needs. Without it the set is walked once and only the
	// summary is kept, in memory independent of the number of cuts.
	Cursor bool
}

// Resampling are the bootstrap's options.
type Resampling struct {
	Replicates int    // resampled sets; 0 means none
	Seed       uint64 // the same seed and Replicates give the same figures
	BandCuts   int    // cuts that carry the band of hit and wrong-alert share
	// Design is how the set was drawn (bootstrap.Ordinary, the default: a
	// random sample; bootstrap.WithinClass: class sizes fixed by design,
	// their weighted totals the population's). Sampling weights constant
	// within each class (a class downsampled, keep 1 in 10) stay Ordinary
	// unless asked: the kept rows are a random sample, each carrying its
	// class weight, and the class mix varies (package bootstrap).
	Design bootstrap.Design
	// Progress, when set, is called with the replicates done so far.
	Progress func(done int)
	// CutScores names more cuts (pins, say) whose redraws at the cut the
	// eager draw works out during the run (bootstrap.Options.CutScores);
	// the rules' own cuts are always among them.
	CutScores []float64
}

// Step names the part of Run that an error came from, so that each view
// can say which of its settings to check.
type Step string

// The steps of Run that can fail on the data or the options.
const (
	StepRules       Step = "rules"        // the rules do not suit the assumptions (cutrule errors)
	StepShifts      Step = "shifts"       // placing rows in shifts
	StepCalibration Step = "calibration"  // the reliability table
	StepSecond      Step = "second model" // the second model's ranking and shifts
	StepResampling  Step = "resampling"   // the bootstrap
)

// Error is an error of one step of Run.
type Error struct {
	Step Step
	Err  error
}

func (e *Error) Error() string { return string(e.Step) + ": " + e.Err.Error() }
func (e *Error) Unwrap() error { return e.Err }

func stepError(step Step, err error) error {
	if err == nil || errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
		return err
	}
	return &Error{Step: step, Err: err}
}

// Result is every figure of a set under one set of assumptions. Its
// slices indexed by cut hold one entry per rule, in the order of Rules.
type Result struct {
	Set     *scores.Set
	Assume  projection.Assumptions
	Summary curve.Summary
	// Ranking is the uncertainty of the summary's ROC AUC and average
	// precision at the assumptions' confidence.
	Ranking Ranking
	// Warnings are what a reader of any output should know about the
	// data (warningsOf).
	Warnings []Warning
	// Curve is every cut, kept for random access; nil unless
	// Options.Cursor.
	Curve *curve.Curve

	Rules    []cutrule.Rule
	Outcomes []cutrule.Outcome
	// CostOptimism is how much more a cost rule's cut costs per case out
	// of sample than on the validation set (CostOptimism); NaN without a
	// met cost rule. Times the volume it is per shift.
	CostOptimism float64

	// Segments is the breakdown by segment at each met cut, in the order
	// of the set's segment names (a zero Breakdown for an unmet rule); nil
	// without a segment column.
	Segments []segment.Breakdown

	// Shifts are the queues of the real shifts; nil without Options.Shifts.
	Shifts *Shifts

	// Calibration is the reliability table and what follows from it; nil
	// when the scores are not probabilities.
	Calibration *Calibration

	// Second is the second model of the same cases; nil without a second
	// score column.
	Second *Second

	// Stability is the bootstrap; nil until one has run.
	Stability *bootstrap.Result

	opts     Options
	segments *segment.Running // follows the cursor; with Options.Cursor
	peaks    *shift.Running   // follows the cursor at Shifts.Scale; with Options.Cursor
	optimism *optimismMemo    // the last CostOptimism computed, kept by Reassume
}

// Ranking is the uncertainty of the summary's ranking figures at a
// confidence level: the ROC AUC with DeLong's variance and its normal
// interval clipped to [0,1] (modelpair.Single), and the average precision's
// logit interval over the true cases (interval.AveragePrecision). With
// frequency weights both count the weighted cases; with sampling weights
// DeLong's variance is that of the weighted placements by linearisation
// (modelpair.SamplingPaired) and the average precision's interval counts
// Kish's effective number of true cases. Undefined ends are NaN.
type Ranking struct {
	ROCAUC modelpair.AUCEstimate
	// AveragePrecision is the interval of Summary.AveragePrecision.
	AveragePrecision [2]float64
}

// rankingOf returns the ranking's uncertainty from DeLong's tally of the
// walked cuts and the summary, at confidence (NaN outside (0,1)).
func rankingOf(delong *modelpair.Single, sum curve.Summary, confidence float64) Ranking {
	nan := math.NaN()
	if !(confidence > 0 && confidence < 1) {
		return Ranking{ROCAUC: modelpair.AUCEstimate{AUC: sum.ROCAUC, Variance: nan, StdError: nan, Interval: [2]float64{nan, nan}},
			AveragePrecision: [2]float64{nan, nan}}
	}
	r := Ranking{ROCAUC: delong.Estimate(confidence)}
	// Centred on the summary's AUC, which DeLong's equals but for the
	// last digits of a sum taken in another order.
	if !math.IsNaN(r.ROCAUC.AUC) {
		r.ROCAUC.AUC = sum.ROCAUC
		r.ROCAUC.Interval = modelpair.NormalInterval(sum.ROCAUC, r.ROCAUC.StdError, confidence)
	}
	positives := sum.Positives
	if delong.Sampling && sum.PositiveSquares > 0 {
		positives = sum.Positives * sum.Positives / sum.PositiveSquares
	}
	r.AveragePrecision[0], r.AveragePrecision[1] = interval.AveragePrecision(sum.AveragePrecision, positives, confidence)
	return r
}

// Shifts are the rows placed in the shifts of the validation period.
type Shifts struct {
	Assigned shift.Assignment
	// Scale turns a flagged case into alerts of a production shift under
	// the assumptions (see package shift).
	Scale shift.Scale
	// Peaks are the queues at each met cut (zero Peaks for an unmet rule).
	Peaks []shift.Peaks
}

// Calibration is the reliability table of scores that are probabilities,
// the cost threshold they imply and the net benefit of each cut.
type Calibration struct {
	Table calibration.Table
	Bins  int
	// Cost is the cost threshold; nil without costs.
	Cost *CostThreshold
	// Threshold is the threshold probability of net benefit, the same for
	// every cut: from the costs when ThresholdFromCosts, else production's
	// base rate (calibration.NetBenefitThreshold).
	Threshold          float64
	ThresholdFromCosts bool
	// NetBenefit is the net benefit at each met cut at production's base
	// rate and Threshold, and NetBenefitAll that of flagging every case
	// (NaN for an unmet rule).
	NetBenefit    []float64
	NetBenefitAll []float64
}

// CostThreshold is the threshold at which calibrated probabilities make
// flagging a case cheaper than leaving it (calibration.CostThreshold),
// beside the empirical least-cost cut.
type CostThreshold struct {
	// Probability is the threshold as a probability at production's base
	// rate; Score the same on the validation scores' scale
	// (calibration.ShiftThreshold).
	Probability float64
	Score       float64
	// LeastCost is the cut the cost rule picks on the validation set.
	LeastCost cutrule.Outcome
}

// Second is the second model's figures: its own ranked set with the same
// rules applied, and DeLong's paired test of the two.
type Second struct {
	Set      *scores.Set
	Summary  curve.Summary
	Curve    *curve.Curve      // nil unless Options.Cursor
	Assigned *shift.Assignment // with Options.Shifts
	Outcomes []cutrule.Outcome
	// Test is DeLong's paired test; TestErr why it has no figures.
	Test    modelpair.Test
	TestErr error
}

// Starts returns the starting points under a: cutrule.Defaults and, when
// rows are placed in shifts and a capacity is given, queue90 at the
// capacity, before the promised ones (cutrule.Promised), which come last.
func Starts(a projection.Assumptions, shifts bool) []cutrule.Rule {
	rules := cutrule.Defaults(a)
	if shifts && a.Capacity > 0 {
		promised := len(cutrule.Promised())
		plain := rules[:len(rules)-promised]
		rules = append(append(slices.Clone(plain), cutrule.Rule{Kind: cutrule.Queue90, Value: a.Capacity}), rules[len(rules)-promised:]...)
	}
	return rules
}

// Run computes the figures of set under a that opts asks for. It returns
// an *Error naming the step that failed, or ctx's error when cancelled.
func Run(ctx context.Context, set *scores.Set, a projection.Assumptions, opts Options) (*Result, error) {
	r := &Result{Set: set, opts: opts}
	if opts.Shifts != nil {
		assigned, err := shift.Assign(set, *opts.Shifts)
		if err != nil {
			return nil, stepError(StepShifts, err)
		}
		r.Shifts = &Shifts{Assigned: assigned}
	}
	if set.SegmentOf() != nil && opts.Cursor {
		r.segments = segment.NewRunning(set)
	}
	if opts.Cursor {
		r.Curve = curve.New(set)
	}
	if calibration.Probabilities(set) {
		bins := opts.CalibrationBins
		if bins == 0 {
			bins = DefaultCalibrationBins
		}
		table, err := calibration.Reliability(set, bins, opts.CalibrationBinning)
		if err != nil {
			return nil, stepError(StepCalibration, err)
		}
		r.Calibration = &Calibration{Table: table, Bins: bins}
	}
	if set.CompareScores() != nil {
		second, err := newSecond(set, opts, a.Sample.Sampling())
		if err != nil {
			return nil, stepError(StepSecond, err)
		}
		r.Second = second
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if err := r.assume(a, nil); err != nil {
		return nil, err
	}
	if opts.Resampling.Replicates > 0 {
		res, err := r.Resample(ctx, opts.Resampling)
		if err != nil {
			return nil, err
		}
		r.Stability = &res
	}
	return r, nil
}

// newSecond ranks the second model's scores and places them in shifts.
func newSecond(set *scores.Set, opts Options, sampling bool) (*Second, error) {
	s := &Second{}
	if sampling {
		s.Test, s.TestErr = modelpair.CompareSampling(set)
	} else {
		s.Test, s.TestErr = modelpair.Compare(set)
	}
	second, err := modelpair.Second(set)
	if err != nil {
		return nil, err
	}
	s.Set = second
	if opts.Cursor {
		s.Curve = curve.New(second)
	}
	if opts.Shifts != nil {
		assigned, err := shift.Assign(second, *opts.Shifts)
		if err != nil {
			return nil, err
		}
		s.Assigned = &assigned
	}
	return s, nil
}

// optimismMemo is CostOptimism's value under the base rate and costs it
// was computed with: the only assumptions it depends on, so that a change
// of volume, capacity or confidence reuses it.
type optimismMemo struct {
	baseRate float64
	costs    projection.Costs
	value    float64
}

// costOptimism is CostOptimism(r.Set, a), computed again only when the
// base rate or the costs differ from the last computed (r.optimism, kept
// from the result Reassume started from).
func (r *Result) costOptimism(a projection.Assumptions) float64 {
	if a.Costs == nil {
		return math.NaN()
	}
	if m := r.optimism; m != nil && m.baseRate == a.BaseRate && m.costs == *a.Costs {
		return m.value
	}
	r.optimism = &optimismMemo{baseRate: a.BaseRate, costs: *a.Costs, value: CostOptimism(r.Set, a)}
	return r.optimism.value
}

// Reassume returns the figures of the same set under new assumptions: the
// cuts of the rules (the starting points under a when Options.Rules is
// nil), the shift queues at the new scale, the cost threshold and the
// second model's cuts. What does not depend on the assumptions (the
// curve, the shifts of the rows, the reliability table, the paired test)
// is shared with r, and so is the least-cost figure's optimism while the
// base rate and costs stay the same (it depends on no other assumption);
// a bootstrap is dropped, since it ran under the old assumptions. r
// itself is not changed, so Reassume may run while r is shown, except that
// their cursor tallies are shared.
func (r *Result) Reassume(ctx context.Context, a projection.Assumptions) (*Result, error) {
	next := &Result{Set: r.Set, Curve: r.Curve, opts: r.opts, segments: r.segments}
	if r.Shifts != nil {
		next.Shifts = &Shifts{Assigned: r.Shifts.Assigned}
	}
	if r.Calibration != nil {
		next.Calibration = &Calibration{Table: r.Calibration.Table, Bins: r.Calibration.Bins}
	}
	if r.Second != nil {
		second := *r.Second
		next.Second = &second
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if err := next.assume(a, r); err != nil {
		return nil, err
	}
	return next, nil
}

// assume computes everything that depends on the assumptions. prev, when
// not nil, is the result under earlier assumptions, whose cursor tally of
// the shift queues is kept when the scale has not changed.
func (r *Result) assume(a projection.Assumptions, prev *Result) error {
	r.Assume = a
	r.Rules = r.opts.Rules
	if r.Rules == nil {
		r.Rules = Starts(a, r.Shifts != nil)
	}
	var finderOptions []cutrule.Option
	if r.Shifts != nil {
		r.Shifts.Scale = shift.ScaleFor(r.Set, r.Shifts.Assigned, a)
		finderOptions = append(finderOptions, cutrule.WithShifts(r.Shifts.Assigned, r.Shifts.Scale))
		if r.opts.Cursor {
			if prev != nil && prev.peaks != nil && prev.Shifts.Scale == r.Shifts.Scale {
				r.peaks = prev.peaks
			} else {
				r.peaks = shift.NewRunning(r.Set, r.Shifts.Assigned, r.Shifts.Scale)
			}
		}
	}
	finder, err := cutrule.NewFinder(r.Rules, r.Set, a, finderOptions...)
	if err != nil {
		return stepError(StepRules, err)
	}
	// DeLong's variance of the AUC, tallied on the same walk.
	delong := modelpair.Single{Sampling: a.Sample.Sampling()}
	visit := func(p curve.Point) { finder.Visit(p); delong.Visit(p) }
	// The least-cost cut beside the cost threshold, found on the same
	// walk.
	var leastCost *cutrule.Finder
	if r.Calibration != nil && a.Costs != nil {
		leastCost, err = cutrule.NewFinder([]cutrule.Rule{{Kind: cutrule.Cost}}, r.Set, a)
		if err != nil {
			return stepError(StepRules, err)
		}
		visit = func(p curve.Point) { finder.Visit(p); leastCost.Visit(p); delong.Visit(p) }
	}
	if r.Curve != nil {
		r.Curve.Points(visit)
		r.Summary = r.Curve.Summary
	} else {
		r.Summary = curve.Walk(r.Set, visit)
	}
	r.Outcomes = finder.Outcomes()
	r.CostOptimism = math.NaN()
	if prev != nil {
		r.optimism = prev.optimism
	}
	for i, o := range r.Outcomes {
		if o.Met && r.Rules[i].Kind == cutrule.Cost {
			r.CostOptimism = r.costOptimism(a)
			break
		}
	}
	r.Warnings = warningsOf(r.Set, r.Summary)
	r.Ranking = rankingOf(&delong, r.Summary, a.Confidence)
	if w, ok := separatedWarning(r.Summary, r.Ranking); ok {
		r.Warnings = append(r.Warnings, w)
	}

	if r.Set.SegmentOf() != nil {
		r.Segments = make([]segment.Breakdown, len(r.Outcomes))
		for i, o := range r.Outcomes {
			if o.Met {
				r.Segments[i] = segment.At(r.Set, o.Point, a.Confidence)
			}
		}
	}
	if r.Shifts != nil {
		r.Shifts.Peaks = make([]shift.Peaks, len(r.Outcomes))
		for i, o := range r.Outcomes {
			if o.Met {
				r.Shifts.Peaks[i] = r.Shifts.Assigned.At(r.Set, o.Point.Rows, r.Shifts.Scale, capacityOf(a))
			}
		}
	}
	if c := r.Calibration; c != nil {
		c.Cost = nil
		if a.Costs != nil {
			p := calibration.CostThreshold(*a.Costs)
			c.Cost = &CostThreshold{Probability: p, Score: calibration.ShiftThreshold(p, r.Summary.BaseRate, a.BaseRate),
				LeastCost: leastCost.Outcomes()[0]}
		}
		c.Threshold, c.ThresholdFromCosts = calibration.NetBenefitThreshold(a.Costs, a.BaseRate)
		c.NetBenefit = make([]float64, len(r.Outcomes))
		c.NetBenefitAll = make([]float64, len(r.Outcomes))
		for i, o := range r.Outcomes {
			c.NetBenefit[i], c.NetBenefitAll[i] = r.NetBenefitAt(o.Point)
			if !o.Met {
				c.NetBenefit[i], c.NetBenefitAll[i] = math.NaN(), math.NaN()
			}
		}
	}
	if s := r.Second; s != nil {
		if err := s.assume(r.Rules, a); err != nil {
			return err
		}
	}
	return nil
}

// assume applies rules to the second model under a.
func (s *Second) assume(rules []cutrule.Rule, a projection.Assumptions) error {
	var opts []cutrule.Option
	if s.Assigned != nil {
		opts = append(opts, cutrule.WithShifts(*s.Assigned, shift.ScaleFor(s.Set, *s.Assigned, a)))
	}
	finder, err := cutrule.NewFinder(rules, s.Set, a, opts...)
	if err != nil {
		return stepError(StepRules, err)
	}
	if s.Curve != nil {
		s.Curve.Points(finder.Visit)
		s.Summary = s.Curve.Summary
	} else {
		s.Summary = curve.Walk(s.Set, finder.Visit)
	}
	s.Outcomes = finder.Outcomes()
	return nil
}

// capacityOf is the capacity the shift queues are held against, 0 when
// none is given.
func capacityOf(a projection.Assumptions) float64 {
	if !(a.Capacity > 0) {
		return 0
	}
	return a.Capacity
}

// NetBenefitAt returns the net benefit of flagging at p and that of
// flagging every case, both at production's base rate and the threshold
// probability of r.Calibration (Vickers and Elkin 2006; see
// calibration.NetBenefit); NaN when the scores are not probabilities
// or when no case of the set has any weight.
func (r *Result) NetBenefitAt(p curve.Point) (cut, all float64) {
	c := r.Calibration
	// The summary's totals, as the set's are (Set.Totals walks every row:
	// too slow for each keystroke of the explorer on a large set).
	if sum := r.Summary; c == nil || !(sum.Positives+sum.Negatives > 0) {
		// Without a case of weight the base rate is undefined (the 0
		// assumed in its place must not read as flagging every case
		// being worth 0).
		return math.NaN(), math.NaN()
	}
	return calibration.NetBenefit(p, r.Assume.BaseRate, c.Threshold), calibration.NetBenefitAll(r.Assume.BaseRate, c.Threshold)
}

// Points calls visit with every cut of the set, strictest first: from the
// kept curve with Options.Cursor, else by walking the set again.
func (r *Result) Points(visit func(curve.Point)) {
	if r.Curve != nil {
		r.Curve.Points(visit)
		return
	}
	curve.Walk(r.Set, visit)
}

// Resample runs the bootstrap of r's rules under r's assumptions with opt
// (package bootstrap); it does not change r. It returns ctx's error when
// cancelled.
func (r *Result) Resample(ctx context.Context, opt Resampling) (bootstrap.Result, error) {
	b := bootstrap.Options{Replicates: opt.Replicates, Seed: opt.Seed, BandCuts: opt.BandCuts, Progress: opt.Progress, Design: opt.Design,
		Sampling: r.Assume.Sample.Sampling()}
	if r.Shifts != nil {
		b.FinderOptions = []cutrule.Option{cutrule.WithShifts(r.Shifts.Assigned, r.Shifts.Scale)}
	}
	for _, o := range r.Outcomes { // the redraws at each rule's cut (needed by the eager draw)
		if o.Met {
			b.CutScores = append(b.CutScores, o.Point.Score)
		}
	}
	b.CutScores = append(b.CutScores, opt.CutScores...)
	res, err := bootstrap.Run(ctx, r.Set, r.Rules, r.Assume, b)
	return res, stepError(StepResampling, err)
}

// CostCheck sets the cost threshold that calibrated probabilities imply
// beside where the least-cost cut lands in resampled sets: a threshold
// outside that range says the scores are probably not calibrated.
type CostCheck struct {
	// Spread is where the least-cost cut lands in the resampled sets.
	Spread bootstrap.Spread
	// Judged says the two can be compared: the scores are probabilities,
	// costs are given, the threshold is defined, the least-cost cut is met
	// on the set and in some resampled set.
	Judged bool
	// Outside says, when judged, that the threshold lies outside the
	// Spread's range of scores.
	Outside bool
}

// CheckCost compares r's cost threshold with the least-cost rule's spread
// in stability, a bootstrap of r's rules (nil: not judged).
func (r *Result) CheckCost(stability *bootstrap.Result) CostCheck {
	var c CostCheck
	cal := r.Calibration
	if stability == nil || cal == nil || cal.Cost == nil || !cal.Cost.LeastCost.Met || math.IsNaN(cal.Cost.Score) {
		return c
	}
	for _, sp := range stability.Spreads {
		if sp.Rule.Kind == cutrule.Cost && sp.Met > 0 && !math.IsNaN(sp.Score[0]) {
			c.Spread, c.Judged = sp, true
			c.Outside = cal.Cost.Score < sp.Score[0] || cal.Cost.Score > sp.Score[1]
			break
		}
	}
	return c
}

// SegmentsAt returns the breakdown by segment at point p of the curve, with
// intervals at confidence, in the order of the set's segment names; ok is
// false without a segment column. With Options.Cursor it follows the
// cursor from the last point asked (not safe for concurrent use);
// otherwise it reads the set. The confidence is given, not taken from
// r.Assume, so that a screen can show a new level at once.
func (r *Result) SegmentsAt(p curve.Point, confidence float64) (b segment.Breakdown, ok bool) {
	switch {
	case r.Set.SegmentOf() == nil:
		return segment.Breakdown{}, false
	case r.segments != nil:
		return r.segments.At(p, confidence), true
	}
	return segment.At(r.Set, p, confidence), true
}

// PeaksAt returns the queues of the real shifts at point p at r's scale,
// held against capacity (0 or less: none); ok is false without shifts.
// With Options.Cursor it follows the cursor from the last point asked
// (not safe for concurrent use); otherwise it reads the set.
func (r *Result) PeaksAt(p curve.Point, capacity float64) (peaks shift.Peaks, ok bool) {
	if !(capacity > 0) {
		capacity = 0
	}
	switch {
	case r.Shifts == nil:
		return shift.Peaks{}, false
	case r.peaks != nil:
		return r.peaks.At(p.Rows, capacity), true
	}
	return r.Shifts.Assigned.At(r.Set, p.Rows, r.Shifts.Scale, capacity), true
}

// RuleCheck says whether a rule picks a given cut under r's assumptions:
// the check of a candidate pinned under earlier assumptions.
type RuleCheck struct {
	Rule cutrule.Rule
	// Now is the cut the rule picks under r.Assume; Now.Met is false when
	// no cut meets it (Now.Reason says why) or the rule does not suit the
	// assumptions (a queue= rule without a volume, say).
	Now cutrule.Outcome
	// Holds reports whether the rule picks the cut it was checked for.
	Holds bool
}

// CheckRules returns, for each rule with the score of the cut it was
// pinned at, whether the rule still picks that cut under r.Assume, and
// which cut it picks if not. Rules among r.Rules reuse their outcomes;
// the others are applied on one walk of the cuts, each on its own so that
// one that does not suit the assumptions leaves the others checked (it
// holds nowhere; Now.Reason says why). rules and scores have the same
// length; it returns ctx's error when cancelled.
func (r *Result) CheckRules(ctx context.Context, rules []cutrule.Rule, scores []float64) ([]RuleCheck, error) {
	if len(rules) != len(scores) {
		panic("analysis: CheckRules with rules and scores of different lengths")
	}
	out := make([]RuleCheck, len(rules))
	var finders []*cutrule.Finder
	var walked []int
	var opts []cutrule.Option
	if r.Shifts != nil {
		opts = append(opts, cutrule.WithShifts(r.Shifts.Assigned, r.Shifts.Scale))
	}
	for i, rule := range rules {
		out[i].Rule = rule
		if j := slices.Index(r.Rules, rule); j >= 0 && j < len(r.Outcomes) {
			out[i].Now = r.Outcomes[j]
			continue
		}
		f, err := cutrule.NewFinder([]cutrule.Rule{rule}, r.Set, r.Assume, opts...)
		if err != nil {
			out[i].Now = cutrule.Outcome{Rule: rule, Reason: err.Error()}
			continue
		}
		finders = append(finders, f)
		walked = append(walked, i)
	}
	if len(finders) > 0 {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		r.Points(func(p curve.Point) {
			for _, f := range finders {
				f.Visit(p)
			}
		})
		for k, f := range finders {
			out[walked[k]].Now = f.Outcomes()[0]
		}
	}
	for i := range out {
		out[i].Holds = out[i].Now.Met && out[i].Now.Point.Score == scores[i]
	}
	return out, nil
}
