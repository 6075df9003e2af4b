// Package drift checks fresh production scores against a decision file:
// does production still behave like the validation set the cut was chosen
// on?
//
// Three checks, each a test at Level (1%), so that a scheduled job cries
// wolf on sampling noise alone about once in a hundred runs:
//
//   - the alert rate at the chosen cut, observed against the file's
//     projected alert rate (Compare, a two-sample test over both sizes);
//   - the score distribution, by the population stability index on the
//     file's histogram edges, read in the common bands (PSIModerate,
//     PSILarge); only a large shift counts as drift, and only when it is
//     beyond what sampling noise alone gives once in a hundred runs
//     (PSINoiseLevel), so that few new rows do not read as drift;
//   - with labels, the observed recall against the validation recall and
//     the observed precision against the projected precision (Compare).
//
// Which new cases the cut flags follows the cut rule in the doc of package
// scores, in the direction the file records (data.lower_is_riskier),
// whatever the direction the new set was read with. Weights are read as
// their kind says (package design): the validation side's as the
// decision file records, the new data's as Options.Sample gives
// (frequency weights when nil). Under sampling weights each share, and
// each class's score distribution, is tested at its effective sample
// size; when the decision file keeps its squared weights
// (data.squared_weights, decision.SquaredWeights) each bin of a
// validated class's scores counts at its own variance, and the PSI's
// validation side at Kish's effective size of its histogram.
package drift

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// Errors returned by Check.
var (
	ErrNoRows      = errors.New("the new data have no rows of weight")
	ErrTolerance   = errors.New("invalid tolerance")
	ErrNoCandidate = errors.New("the decision file names no chosen candidate")
)

// Options tune Check.
type Options struct {
	// Tolerance is a practical margin on every share, absolute (0.02 is
	// two percentage points): a share drifts only when it differs from the
	// file's by more than this beyond sampling noise. 0 tests equality.
	Tolerance float64
	// Labelled says the new set carries outcomes, so recall and precision
	// are checked as well.
	Labelled bool
	// IgnoreLabels names, in the caller's words, how labels are set aside
	// (the command line gives its flag), for the note that says why
	// recall and precision were not checked; "" leaves it out.
	IgnoreLabels string
	// Baseline names, in the caller's words, the way to judge batches
	// against a first production batch instead (the command line gives
	// its flag), for the note on a small validation set; "" leaves it
	// out.
	Baseline string
	// Redo, when set, gives the caller's command that writes the decision
	// re-projected at a base rate, for the next step of an assumption.
	Redo func(baseRate float64) string
	// Sample is how the new data were drawn (package design): with
	// sampling weights their shares are tested at their effective sample
	// sizes; nil reads their weights as frequency weights. The validation
	// side follows the decision file's weight kind, through the effective
	// trials of its candidates.
	Sample *design.Sample
}

// SquaresMissing is the warning for a decision file saved under sampling
// weights before data.squared_weights was recorded: each validated
// class's score bins, and the PSI's validation side, are then read at one
// effective size per class, a coarser reading of their noise. The rates
// are TestVerdictScoreThinnedValidationFalseAlarmRate's (4,000 seeded
// replicates each, validation set thinned by score).
const SquaresMissing = "the decision file was saved under sampling weights before the squared weights (data.squared_weights) were recorded, " +
	"so the validated classes' score bins are read at one effective size each, a coarser reading of their noise: " +
	"in a seeded simulation with a validation set thinned by score it raised findings on unchanged data in 2.9% (labelled) and 1.9% (no labels) of checks, " +
	"against about 1% with them; save the decision again with this version to record them"

// fileWarnings are the warnings f itself gives (Result.Warnings).
func fileWarnings(f *decision.File) []string {
	if f.Data.WeightColumn != "" && f.Data.WeightKind == design.Sampling && f.Data.Squares == nil {
		return []string{SquaresMissing}
	}
	return nil
}

// Result is the outcome of Check.
type Result struct {
	Chosen         string  // the chosen candidate's name
	Cut            float64 // its score
	LowerIsRiskier bool
	Rows           int     // new rows, zero-weight rows included
	Weight         float64 // total weight of the new rows
	Flagged        float64 // weight the cut flags
	Weighted       bool    // the new set has a weight column
	// Weights names the new data's weights in words ("frequency weights",
	// or sampling weights and their design, package design) and
	// ValidationWeights the decision file's; "" where there are none.
	Weights, ValidationWeights string
	// WeightKind and ValidationWeightKind are the kinds' names
	// ("frequency" or "sampling"); "" where there are no weights.
	WeightKind, ValidationWeightKind string
	Labelled                         bool
	Tolerance                        float64
	Confidence                       float64 // of the observed shares' intervals, from the file

	BaseRate           float64 // the production base rate the file projects to
	BaseRateValidation bool    // it is the validation set's own rate
	ValidationRows     int     // rows of the validation set
	ValidationPath     string  // the validation set as the file names it

	AlertRate Test
	Recall    Test // Defined false without labels or true cases
	Precision Test // Defined false without labels or flagged cases

	PSI      float64 // NaN when the file has no histogram
	PSIBand  string  // "stable", "moderate" or "large"; "" when PSI is NaN
	PSINoise float64 // about the PSI sampling noise alone gives (PSINoise)
	// PSINoiseLevel is the PSI noise alone exceeds about once in 1/Level
	// runs (PSINoiseLevel); PSIDrift says the band is large and the PSI
	// beyond this level.
	PSINoiseLevel float64
	PSIDrift      bool
	Bins          int

	// What does not depend on the base rate, with labels.
	FalsePositiveRate Test      // against the validation false positive rate
	ScoresPositive    ScoreTest // the scores of true cases against the validated ones
	ScoresNegative    ScoreTest // the scores of false cases against the validated ones

	// The base rate seen (labelled share) or estimated (Mixture) in the new
	// data, its interval at Confidence and how it was found; NaN when
	// neither could be.
	BaseRateObserved float64
	BaseRateCI       [2]float64
	BaseRateMethod   string
	BaseRateTest     Test     // with labels: the labelled share against the assumed rate
	BaseRateP        float64  // without labels: the fitted rate against the assumed one (Mixture.Against)
	Mixture          *Mixture // without labels, when the file keeps its curve
	ValidationWeight float64  // the validation set's total weight

	// Family are the tests the verdict rests on, adjusted together by
	// Holm's procedure so that any finding on noise alone keeps Level.
	Family []Judged
	// Verdict is StatusOK, StatusDrift or StatusAssumption.
	Verdict string
	// Reprojected are the chosen cut's figures at the observed base rate
	// (the file's other assumptions kept), with the file's Volume and
	// Capacity; zero when no base rate was observed.
	Reprojected      projection.Figures
	Volume, Capacity float64

	Drift    bool     // the model drifted (Status is StatusDrift)
	Findings []string // one line per finding, then notes

	// Redo is the line that writes the decision re-projected at the
	// observed base rate (Options.Redo), when the status is
	// StatusAssumption; "" otherwise.
	Redo string

	// Warnings say what makes the check itself less exact than stated,
	// with the fix: a file saved under sampling weights before
	// data.squared_weights was recorded (SquaresMissing).
	Warnings []string

	ignoreLabels string // Options.IgnoreLabels, for the notes
	baselineHint string // Options.Baseline, for the note on a small validation set
	byCurve      bool   // the file keeps the curve the class bins come from
}

// Check applies the chosen cut of f to set and runs the checks of the
// package doc. f must have passed decision's Validate (Read and New
// ensure it). set may be in any order; its weights are read as
// opt.Sample says (frequency weights when nil).
// A set of no weight gives ErrNoRows and a tolerance outside [0,1)
// ErrTolerance. With labels but no true case in set, recall is not tested
// (Recall.Defined is false, and a finding says so); likewise precision
// when the cut flags nothing.
func Check(f *decision.File, set *scores.Set, opt Options) (*Result, error) {
	if math.IsNaN(opt.Tolerance) || opt.Tolerance < 0 || opt.Tolerance >= 1 {
		return nil, fmt.Errorf("%w %v: expected an absolute margin on shares in [0,1), such as 0.02", ErrTolerance, opt.Tolerance)
	}
	chosen, ok := f.ChosenCandidate()
	if !ok {
		return nil, fmt.Errorf("%w (%q)", ErrNoCandidate, f.Chosen)
	}
	counts := tally{rows: set.Cases(), weighted: set.Weighted()} // a counts table: cases, not table rows
	for i, s := range set.Scores() {
		w := set.Weight(i)
		flagged := s >= chosen.Cut.Score
		if f.Data.LowerIsRiskier {
			flagged = s <= chosen.Cut.Score
		}
		counts.weight += w
		positive := opt.Labelled && set.Labels()[i]
		if flagged {
			counts.flagged += w
		}
		if positive {
			counts.positives += w
			if flagged {
				counts.tp += w
			}
		}
		cell := 3 // tn
		switch {
		case positive && flagged:
			cell = 0
		case flagged:
			cell = 1
		case positive:
			cell = 2
		}
		counts.squares[cell] += w * w
	}
	if !(counts.weight > 0) {
		return nil, ErrNoRows
	}
	if len(f.Data.Histogram.Counts) > 0 {
		counts.bins = f.Data.Histogram.Fill(set)
	}
	counts.fillClasses(f, set, opt.Labelled)
	return check(f, chosen, counts, opt), nil
}

// tally holds the weighted counts of the new data at the chosen cut, and
// their histogram on the file's bins (nil without one).
type tally struct {
	rows                           int
	weighted                       bool
	weight, flagged, positives, tp float64
	squares                        [4]float64 // squared weights of TP, FP, FN, TN (all cases negative without labels)
	bins                           []float64

	// Bins cut from the file's curve (nil without one): even in true
	// cases, in false cases and in both, with the new data's counts on
	// them (true cases, false cases, all cases).
	byPositives, byNegatives, mixture *classBins
	newPositives, newNegatives, mixed []float64
	// The squared weights of the new data on the same bins, for the
	// design-based variances of sampling weights.
	newPositiveSquares, newNegativeSquares, mixedSquares []float64
}

// fillClasses cuts the file's curve into bins and counts the new data on
// them: per class with labels, all cases without.
func (t *tally) fillClasses(f *decision.File, set *scores.Set, labelled bool) {
	if labelled {
		pos, okP := newClassBins(f, maxClassBins, func(tp, _ float64) float64 { return tp })
		neg, okN := newClassBins(f, maxClassBins, func(_, fp float64) float64 { return fp })
		if !okP || !okN {
			return
		}
		t.byPositives, t.byNegatives = &pos, &neg
		t.newPositives, t.newNegatives = make([]float64, len(pos.ends)), make([]float64, len(neg.ends))
		t.newPositiveSquares, t.newNegativeSquares = make([]float64, len(pos.ends)), make([]float64, len(neg.ends))
		for i, s := range set.Scores() {
			w := set.Weight(i)
			if set.Labels()[i] {
				t.newPositives[pos.bin(s)] += w
				t.newPositiveSquares[pos.bin(s)] += w * w
			} else {
				t.newNegatives[neg.bin(s)] += w
				t.newNegativeSquares[neg.bin(s)] += w * w
			}
		}
		return
	}
	P, N := f.Data.Positives, f.Data.Negatives
	if !(P > 0) || !(N > 0) {
		return
	}
	mix, ok := newClassBins(f, maxClassBins, func(tp, fp float64) float64 { return tp/P + fp/N })
	if !ok {
		return
	}
	t.mixture = &mix
	t.mixed, t.mixedSquares = make([]float64, len(mix.ends)), make([]float64, len(mix.ends))
	for i, s := range set.Scores() {
		w := set.Weight(i)
		t.mixed[mix.bin(s)] += w
		t.mixedSquares[mix.bin(s)] += w * w
	}
}

// check runs the checks on the tallies of the new data.
func check(f *decision.File, chosen decision.Candidate, t tally, opt Options) *Result {
	a := f.Assumptions
	res := &Result{
		Chosen: chosen.Name, Cut: chosen.Cut.Score, LowerIsRiskier: f.Data.LowerIsRiskier,
		Rows: t.rows, Weight: t.weight, Flagged: t.flagged, Weighted: t.weighted, Labelled: opt.Labelled, Tolerance: opt.Tolerance, Confidence: a.Confidence, ignoreLabels: opt.IgnoreLabels, baselineHint: opt.Baseline,
		PSI: math.NaN(), PSINoise: math.NaN(), PSINoiseLevel: math.NaN(), Warnings: fileWarnings(f),
	}
	if t.weighted {
		res.Weights, res.WeightKind = opt.Sample.String(), design.Frequency.String()
		if opt.Sample.Sampling() {
			res.WeightKind = design.Sampling.String()
		}
	}
	if f.Data.WeightColumn != "" {
		res.ValidationWeightKind = f.Data.WeightKind.String()
		res.ValidationWeights = f.Data.WeightKind.String() + " weights"
	}

	v := chosen.Cut
	base := a.BaseRate
	valPositives, valNegatives := v.TP+v.FN, v.FP+v.TN
	// The projection treats the base rate as known. When it was taken from
	// the validation set it was estimated there too, and its sampling
	// variance belongs to the expected alert rate.
	baseFromValidation := valPositives+valNegatives > 0 &&
		math.Abs(base-valPositives/(valPositives+valNegatives)) <= 1e-9
	// The validation counts as the file's intervals counted them: the
	// weighted counts for frequency weights, the effective trials of
	// sampling weights (evidence.Trials).
	val := validationTrials(v)
	r, fpr := shrunk(val.tp, val.positives), shrunk(val.fp, val.negatives)
	recallVariance, fprVariance := shrunkVariance(val.tp, val.positives), shrunkVariance(val.fp, val.negatives)
	alertVariance := weighted(base*base, recallVariance) + weighted((1-base)*(1-base), fprVariance)
	res.BaseRate, res.BaseRateValidation = base, baseFromValidation
	res.ValidationRows, res.ValidationPath = f.Data.Rows, f.Data.Path
	if baseFromValidation {
		alertVariance += base * (1 - base) * (r - fpr) * (r - fpr) / val.cases
	}
	fresh := t.effective(opt.Sample)
	res.AlertRate = Compare(fresh.flagged, fresh.all, v.Projected.AlertRate, alertVariance, opt.Tolerance, a.Confidence)

	if opt.Labelled {
		res.Recall = Compare(fresh.tp, fresh.positives, v.Recall, recallVariance, opt.Tolerance, a.Confidence)
		var precisionVariance float64
		if baseFromValidation {
			precisionVariance = shrunkVariance(val.precisionHits, val.precisionTrials)
		} else {
			// Delta method on precision = p*r / (p*r + (1-p)*f).
			alert := base*r + (1-base)*fpr
			scale := base * (1 - base) / (alert * alert)
			precisionVariance = scale * scale * (fpr*fpr*recallVariance + r*r*fprVariance)
		}
		res.Precision = Compare(fresh.precisionHits, fresh.precisionTrials, v.Projected.Precision, precisionVariance, opt.Tolerance, a.Confidence)
	} else {
		res.Recall = Compare(0, 0, v.Recall, math.NaN(), opt.Tolerance, a.Confidence)
		res.Precision = Compare(0, 0, v.Projected.Precision, math.NaN(), opt.Tolerance, a.Confidence)
	}

	h := f.Data.Histogram
	if len(h.Counts) > 0 && t.bins != nil {
		res.Bins = len(h.Counts)
		res.PSI = PopulationStability(h.Counts, t.bins)
		var validationWeight float64
		for _, c := range h.Counts {
			validationWeight += c
		}
		// At the effective sizes of both sides (the weights themselves
		// with frequency weights): the validation side's is Kish's size
		// of its histogram when the file keeps the squared weights, else
		// the base rate's effective trials (which for downsampled false
		// cases count them at their weight, several times the rows).
		size := val.cases
		if q := f.Data.Squares; q != nil && len(q.Histogram) == len(h.Counts) && sum(q.Histogram) > 0 {
			size = kishSize(h.Counts, q.Histogram)
		}
		counts := h.Counts
		if size != validationWeight && validationWeight > 0 {
			counts = scaled(h.Counts, size/validationWeight)
			validationWeight = size
		}
		res.PSINoise = PSINoise(res.Bins, fresh.all, validationWeight)
		res.PSINoiseLevel = PSINoiseLevel(counts, fresh.all)
		switch {
		case math.IsNaN(res.PSI):
		case res.PSI > PSILarge:
			res.PSIBand = "large"
			res.PSIDrift = !(res.PSI <= res.PSINoiseLevel)
		case res.PSI >= PSIModerate:
			res.PSIBand = "moderate"
		default:
			res.PSIBand = "stable"
		}
	}
	res.BaseRateObserved, res.BaseRateCI, res.BaseRateP = math.NaN(), [2]float64{math.NaN(), math.NaN()}, math.NaN()
	res.FalsePositiveRate = Compare(0, 0, ratioOrNaN(v.FP, valNegatives), math.NaN(), opt.Tolerance, a.Confidence)
	res.ScoresPositive, res.ScoresNegative = ScoreTest{PValue: math.NaN(), Statistic: math.NaN()}, ScoreTest{PValue: math.NaN(), Statistic: math.NaN()}
	res.BaseRateTest = Compare(0, 0, base, math.NaN(), opt.Tolerance, a.Confidence)
	res.ValidationWeight = valPositives + valNegatives
	switch {
	case opt.Labelled:
		judgeLabelled(res, f, chosen, t, opt)
	case t.mixture != nil:
		judgeUnlabelled(res, f, t, opt)
	default:
		// Without labels or a stored curve the base rate cannot be told
		// from drift: the alert rate and the scores of all cases judge.
		res.Family = []Judged{{Name: "alert rate", PValue: definedP(res.AlertRate), Model: true}}
	}
	res.byCurve = len(f.Curve) >= 2
	decide(res, f, chosen)
	if res.Verdict == StatusAssumption && opt.Redo != nil {
		res.Redo = opt.Redo(res.BaseRateObserved)
	}
	if res.PSIDrift && !opt.Labelled && t.mixture == nil {
		res.Verdict, res.Drift = StatusDrift, true
	}
	res.findings()
	return res
}

// weighted returns share*variance, 0 when share is 0 even if the variance
// is undefined.
func weighted(share, variance float64) float64 {
	if share == 0 {
		return 0
	}
	return share * variance
}

func (r *Result) findings() {
	var found []string
	margin := ""
	if r.Tolerance > 0 {
		margin = fmt.Sprintf(", beyond the tolerance of %s points", format.Number(100*r.Tolerance, 1))
	}
	// moved words the change of a share as shown beside it.
	moved := func(t Test, against, up, down string) string {
		shown := format.ShareDiff(t.Observed, t.Expected).Value
		direction, what := "higher", up
		if shown < 0 || shown == 0 && t.Difference < 0 {
			direction, what = "lower", down
		}
		return fmt.Sprintf("%s observed against %s %s, %s points %s%s (p %s): %s",
			format.Share(t.Observed), format.Share(t.Expected), against, format.Number(100*math.Abs(shown), 1), direction, margin, format.PValue(t.PValue), what)
	}
	scoreLine := func(name string, s ScoreTest) string {
		return fmt.Sprintf("the scores of %s moved: chi-square %s on %d degrees of freedom over %d bins (p %s)", name, format.Number(s.Statistic, 1), s.Freedom, s.Bins, format.PValue(s.PValue))
	}
	for _, j := range r.Family {
		if !j.Rejected {
			continue
		}
		switch j.Name {
		case "recall":
			found = append(found, "hit share (recall) drifted: "+moved(r.Recall, "on validation", "the model catches more true cases than validated", "the model misses more true cases than validated"))
		case "false positive rate":
			found = append(found, "false positive rate drifted: "+moved(r.FalsePositiveRate, "on validation", "the model flags more false cases than validated", "the model flags fewer false cases than validated"))
		case "scores of true cases":
			found = append(found, scoreLine("true cases", r.ScoresPositive))
		case "scores of false cases":
			found = append(found, scoreLine("false cases", r.ScoresNegative))
		case "scores fit a mixture of the validated classes":
			m := r.Mixture
			found = append(found, fmt.Sprintf("no mix of the validated true and false cases explains the new scores (chi-square %s on %d degrees of freedom, p %s): the scores moved, not only the base rate",
				format.Number(m.Fit, 1), m.Freedom, format.PValue(m.FitP)))
		case "alert rate":
			found = append(found, "alert rate drifted: "+moved(r.AlertRate, "projected", "more cases are flagged than projected", "fewer cases are flagged than projected"))
		case "base rate":
			line := r.baseRateLine() + margin
			switch {
			case r.Verdict == StatusAssumption:
				line += ": the model behaves as validated, the base rate assumed is wrong"
			case r.Mixture != nil:
				line += "; no mix fits the new scores, so this estimate is not to be relied on"
			}
			found = append(found, line)
		}
	}
	if r.PSIDrift && r.Mixture == nil && !r.Labelled {
		found = append(found, fmt.Sprintf("score distribution drifted: PSI %s, above %v (a large shift)", format.Number(r.PSI, 3), PSILarge))
	}
	if r.Verdict == StatusAssumption {
		found = append(found, r.reprojectedLine())
	}
	r.Findings = append(found, r.notes()...)
}

// notes are the findings' lines that judge nothing: what was not checked
// and why, and the figures shown without a verdict.
func (r *Result) notes() []string {
	var notes []string
	if !r.AlertRate.Defined {
		notes = append(notes, "the file's projected alert rate is undefined, so the alert rate was not checked")
	}
	judgedByMixture := r.Labelled || r.Mixture != nil
	switch {
	case r.PSIBand == "":
		notes = append(notes, "the file has no score histogram, so the PSI of all scores was not computed")
	case judgedByMixture:
		notes = append(notes, fmt.Sprintf("PSI of all scores %s (%s): it moves with the base rate too, so it is shown and not judged", format.Number(r.PSI, 3), r.PSIBand))
	case r.PSIBand == "large" && !r.PSIDrift:
		notes = append(notes, fmt.Sprintf("score distribution: PSI %s is in the large band, but sampling noise alone passes %s once in a hundred runs on so few rows; not counted as drift", format.Number(r.PSI, 3), format.Number(r.PSINoiseLevel, 3)))
	case r.PSIBand == "moderate":
		notes = append(notes, fmt.Sprintf("score distribution moved moderately: PSI %s, between %v and %v; watch it, not counted as drift", format.Number(r.PSI, 3), PSIModerate, PSILarge))
	}
	if r.Labelled {
		if !r.Recall.Defined {
			notes = append(notes, "the new data have no true cases, so the hit share was not checked")
		}
		if !r.FalsePositiveRate.Defined {
			notes = append(notes, "the new data have no false cases, so the false positive rate was not checked")
		}
		if !r.ScoresPositive.Defined || !r.ScoresNegative.Defined {
			notes = append(notes, r.classNote())
		}
		if wrong := r.Precision.Complement(); r.Precision.Defined && r.Verdict != StatusDrift {
			shown := format.ShareDiff(wrong.Observed, wrong.Expected).Value
			switch {
			case shown < 0:
				notes = append(notes, fmt.Sprintf("wrong-alert share in the new data %s against %s projected: fewer of the alerts are wrong, which follows the base rate and is no failure", format.Share(wrong.Observed), format.Share(wrong.Expected)))
			case shown > 0:
				notes = append(notes, fmt.Sprintf("wrong-alert share in the new data %s against %s projected: more of the alerts are wrong, which follows the base rate", format.Share(wrong.Observed), format.Share(wrong.Expected)))
			}
		}
		if !r.Precision.Defined {
			notes = append(notes, "the cut flags nothing in the new data, so the wrong-alert share was not measured")
		}
	} else {
		why := "no label column"
		if r.ignoreLabels != "" {
			why += ", or " + r.ignoreLabels
		}
		line := "no labels were read from the new data (" + why + "), so the hit share and the wrong-alert share were not measured"
		if r.Mixture == nil {
			line += "; the file keeps no curve (a sill-cut/1 file), so a change of base rate cannot be told from drift and the alert rate and scores of all cases judge"
		} else {
			line += "; the base rate was estimated from the scores alone"
		}
		notes = append(notes, line)
	}
	if r.PSINoise >= PSIModerate && !judgedByMixture {
		notes = append(notes, fmt.Sprintf("the new data are few: sampling noise alone gives a PSI of about %s, so its bands read high", format.Number(r.PSINoise, 3)))
	}
	if r.SmallValidation() {
		line := fmt.Sprintf("the validation set (%s) is smaller than the new data (%s): the check's power and false alarms rest mostly on the validation set, so a small change may go unseen and the verdict reads the validation set's own noise as much as production's",
			format.Count(r.ValidationWeight), format.Count(r.Weight))
		if r.baselineHint != "" {
			line += "; to watch production over time, judge later batches against a first production batch (" + r.baselineHint + ")"
		}
		notes = append(notes, line)
	}
	return notes
}

// classNote says why the scores within a class were not judged.
func (r *Result) classNote() string {
	if r.byCurve {
		return "too few cases of a class in the new data to compare its scores (fewer than two bins expect five or more), so they were not judged"
	}
	return "the file keeps no curve (a sill-cut/1 file), so the scores within each class were not judged; the hit share and the false positive rate still were"
}

// baseRateLine words the base rate seen against the one assumed.
func (r *Result) baseRateLine() string {
	direction := "higher"
	if format.ShareDiff(r.BaseRateObserved, r.BaseRate).Value < 0 {
		direction = "lower"
	}
	return fmt.Sprintf("the base rate is %s (%s) against %s assumed, %s beyond noise", format.Share(r.BaseRateObserved), format.Interval(r.BaseRateCI), format.Share(r.BaseRate), direction)
}

// reprojectedLine gives the chosen cut's figures at the observed base rate.
func (r *Result) reprojectedLine() string {
	f := r.Reprojected
	line := fmt.Sprintf("re-projected at the observed base rate from the validated hit share and false positive rate, the cut flags %s of cases (projected %s) with a wrong-alert share of %s (projected %s)",
		format.Share(f.AlertRate), format.Share(r.AlertRate.Expected), format.Share(1-f.Precision), format.Share(r.Precision.Complement().Expected))
	if r.Volume > 0 {
		line += fmt.Sprintf("; %s alerts per shift of %s cases (projected %s)", format.Queue(f.QueuePerShift), format.Count(r.Volume), format.Queue(r.Volume*r.AlertRate.Expected))
		if r.Capacity > 0 {
			if f.QueuePerShift > r.Capacity {
				line += fmt.Sprintf(", over the capacity of %s by %s", format.Count(r.Capacity), strings.TrimPrefix(format.QueueDiff(f.QueuePerShift, r.Capacity).Text, "+"))
			} else {
				line += fmt.Sprintf(", within the capacity of %s", format.Count(r.Capacity))
			}
		}
	}
	return line
}

// trials are the counts behind a side's shares as its tests read them:
// weighted counts for frequency weights, effective ones for sampling
// weights. precisionHits of precisionTrials is precision's share.
type trials struct {
	tp, positives, fp, negatives   float64
	precisionHits, precisionTrials float64
	cases                          float64 // behind the share of true cases
	flagged, all                   float64 // behind the flagged share
}

// validationTrials returns the trials of the validation side of cut v:
// each share at the effective trials the file gives (evidence.Trials),
// which for frequency weights are the weighted counts themselves, taken
// as they are so that those files are tested exactly as before.
func validationTrials(v evidence.Cut) trials {
	at := func(successes, total, n float64) float64 {
		if n == total || !(total > 0) {
			return successes
		}
		return successes / total * n
	}
	t := v.Trials
	return trials{
		tp: at(v.TP, v.TP+v.FN, t.Recall), positives: t.Recall,
		fp: at(v.FP, v.FP+v.TN, t.FalsePositiveRate), negatives: t.FalsePositiveRate,
		precisionHits: at(v.TP, v.TP+v.FP, t.Precision), precisionTrials: t.Precision,
		cases: t.BaseRate,
	}
}

// effective returns the trials of the new data: their weighted counts
// read as frequency weights (s nil), or their design's effective trials
// for sampling weights.
func (t tally) effective(s *design.Sample) trials {
	out := trials{tp: t.tp, positives: t.positives, fp: t.flagged - t.tp, negatives: t.weight - t.positives,
		precisionHits: t.tp, precisionTrials: t.flagged, cases: t.weight, flagged: t.flagged, all: t.weight}
	if !s.Sampling() {
		return out
	}
	p := curve.Point{TP: t.tp, FP: t.flagged - t.tp, FN: t.positives - t.tp, Squares: t.squares}
	p.TN = t.weight - t.positives - p.FP
	at := func(f design.Figure, successes, total float64) (float64, float64) {
		_, n := s.Interval(f, p, 0.95) // the level does not change the trials
		if !(total > 0) {
			return successes, total
		}
		return successes / total * n, n
	}
	out.tp, out.positives = at(design.Recall, out.tp, out.positives)
	out.fp, out.negatives = at(design.FalsePositiveRate, out.fp, out.negatives)
	out.precisionHits, out.precisionTrials = at(design.Precision, out.precisionHits, out.precisionTrials)
	out.flagged, out.all = at(design.FlaggedShare, out.flagged, out.all)
	if t.weight > 0 {
		out.cases = s.BaseRateTrials(p)
	}
	return out
}

// scaled returns counts times factor.
func scaled(counts []float64, factor float64) []float64 {
	out := make([]float64, len(counts))
	for i, c := range counts {
		out[i] = c * factor
	}
	return out
}
