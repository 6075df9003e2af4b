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
// whatever the direction the new set was read with. Weights are frequency
// weights throughout.
package drift

import (
	"errors"
	"fmt"
	"math"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
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
	Labelled       bool
	Tolerance      float64
	Confidence     float64 // of the observed shares' intervals, from the file

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

	Drift    bool     // any check drifted
	Findings []string // one line per drift, then notes

	ignoreLabels string // Options.IgnoreLabels, for the notes
}

// Check applies the chosen cut of f to set and runs the checks of the
// package doc. f must have passed decision's Validate (Read and New
// ensure it). set may be in any order; its weights are frequency weights.
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
	for i, s := range set.Scores {
		w := set.Weight(i)
		flagged := s >= chosen.Cut.Score
		if f.Data.LowerIsRiskier {
			flagged = s <= chosen.Cut.Score
		}
		counts.weight += w
		if flagged {
			counts.flagged += w
		}
		if opt.Labelled && set.Labels[i] {
			counts.positives += w
			if flagged {
				counts.tp += w
			}
		}
	}
	if !(counts.weight > 0) {
		return nil, ErrNoRows
	}
	if len(f.Data.Histogram.Counts) > 0 {
		counts.bins = f.Data.Histogram.Fill(set)
	}
	return check(f, chosen, counts, opt), nil
}

// tally holds the weighted counts of the new data at the chosen cut, and
// their histogram on the file's bins (nil without one).
type tally struct {
	rows                           int
	weighted                       bool
	weight, flagged, positives, tp float64
	bins                           []float64
}

// check runs the checks on the tallies of the new data.
func check(f *decision.File, chosen decision.Candidate, t tally, opt Options) *Result {
	a := f.Assumptions
	res := &Result{
		Chosen: chosen.Name, Cut: chosen.Cut.Score, LowerIsRiskier: f.Data.LowerIsRiskier,
		Rows: t.rows, Weight: t.weight, Flagged: t.flagged, Weighted: t.weighted, Labelled: opt.Labelled, Tolerance: opt.Tolerance, Confidence: a.Confidence, ignoreLabels: opt.IgnoreLabels,
		PSI: math.NaN(), PSINoise: math.NaN(), PSINoiseLevel: math.NaN(),
	}
	tp, positives := t.tp, t.positives

	v := chosen.Cut
	base := a.BaseRate
	valPositives, valNegatives := v.TP+v.FN, v.FP+v.TN
	// The projection treats the base rate as known. When it was taken from
	// the validation set it was estimated there too, and its sampling
	// variance belongs to the expected alert rate.
	baseFromValidation := valPositives+valNegatives > 0 &&
		math.Abs(base-valPositives/(valPositives+valNegatives)) <= 1e-9
	r, fpr := shrunk(v.TP, valPositives), shrunk(v.FP, valNegatives)
	alertVariance := weighted(base*base, shrunkVariance(v.TP, valPositives)) + weighted((1-base)*(1-base), shrunkVariance(v.FP, valNegatives))
	res.BaseRate, res.BaseRateValidation = base, baseFromValidation
	res.ValidationRows, res.ValidationPath = f.Data.Rows, f.Data.Path
	if baseFromValidation {
		alertVariance += base * (1 - base) * (r - fpr) * (r - fpr) / (valPositives + valNegatives)
	}
	res.AlertRate = Compare(res.Flagged, res.Weight, v.Projected.AlertRate, alertVariance, opt.Tolerance, a.Confidence)

	if opt.Labelled {
		res.Recall = Compare(tp, positives, v.Recall, shrunkVariance(v.TP, valPositives), opt.Tolerance, a.Confidence)
		var precisionVariance float64
		if baseFromValidation {
			precisionVariance = shrunkVariance(v.TP, v.TP+v.FP)
		} else {
			// Delta method on precision = p*r / (p*r + (1-p)*f).
			alert := base*r + (1-base)*fpr
			scale := base * (1 - base) / (alert * alert)
			precisionVariance = scale * scale * (fpr*fpr*shrunkVariance(v.TP, valPositives) + r*r*shrunkVariance(v.FP, valNegatives))
		}
		res.Precision = Compare(tp, res.Flagged, v.Projected.Precision, precisionVariance, opt.Tolerance, a.Confidence)
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
		res.PSINoise = PSINoise(res.Bins, res.Weight, validationWeight)
		res.PSINoiseLevel = PSINoiseLevel(h.Counts, res.Weight)
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
	var drift, notes []string
	margin := ""
	if r.Tolerance > 0 {
		margin = fmt.Sprintf(", beyond the tolerance of %s points", format.Number(100*r.Tolerance, 1))
	}
	test := func(name, against string, t Test) {
		if !t.Drift {
			return
		}
		// The difference of the shares as shown beside it.
		shown := format.ShareDiff(t.Observed, t.Expected).Value
		direction := "higher"
		if shown < 0 || shown == 0 && t.Difference < 0 {
			direction = "lower"
		}
		drift = append(drift, fmt.Sprintf("%s drifted: %s observed against %s %s, %s points %s%s (%s)",
			name, format.Share(t.Observed), format.Share(t.Expected), against, format.Number(100*math.Abs(shown), 1), direction, margin, "p "+format.PValue(t.PValue)))
	}
	test("alert rate", "projected", r.AlertRate)
	if !r.AlertRate.Defined {
		notes = append(notes, "the file's projected alert rate is undefined, so the alert rate was not checked")
	}
	switch r.PSIBand {
	case "large":
		if r.PSIDrift {
			drift = append(drift, fmt.Sprintf("score distribution drifted: PSI %s, above %v (a large shift)", format.Number(r.PSI, 3), PSILarge))
		} else {
			notes = append(notes, fmt.Sprintf("score distribution: PSI %s is in the large band, but sampling noise alone passes %s once in a hundred runs on so few rows; not counted as drift", format.Number(r.PSI, 3), format.Number(r.PSINoiseLevel, 3)))
		}
	case "moderate":
		notes = append(notes, fmt.Sprintf("score distribution moved moderately: PSI %s, between %v and %v; watch it, not counted as drift", format.Number(r.PSI, 3), PSIModerate, PSILarge))
	case "":
		notes = append(notes, "the file has no score histogram, so the score distribution was not checked")
	}
	if r.PSINoise >= PSIModerate {
		notes = append(notes, fmt.Sprintf("the new data are few: sampling noise alone gives a PSI of about %s, so its bands read high", format.Number(r.PSINoise, 3)))
	}
	if r.Labelled {
		test("recall", "on validation", r.Recall)
		test("precision", "projected", r.Precision)
		if !r.Recall.Defined {
			notes = append(notes, "the new data have no true cases, so recall was not checked")
		}
		if !r.Precision.Defined {
			notes = append(notes, "the cut flags nothing in the new data, so precision was not checked")
		}
	} else {
		why := "no label column"
		if r.ignoreLabels != "" {
			why += ", or " + r.ignoreLabels
		}
		notes = append(notes, "no labels were read from the new data ("+why+"), so recall and precision were not checked")
	}
	r.Drift = len(drift) > 0
	r.Findings = append(drift, notes...)
}
