// Package decision holds the decision file: the chosen cut of a scored
// validation set, the candidates it was chosen among and their evidence,
// saved as one YAML document (format sill-cut/2) for the lead who signs it
// off, the deployment that reads its threshold and the monitoring that
// checks fresh scores against it. Files of the earlier format sill-cut/1
// still read (without the keys sill-cut/2 added) and are written back as
// sill-cut/2.
//
// Which cases a cut flags follows the cut rule in the doc of package
// scores: a case is flagged when its score is >= the candidate's score, or
// <= it when lower scores are riskier; ties at the cut are flagged.
//
// Undefined figures (NaN, such as precision where nothing is flagged) are
// written as null and read back as NaN. Assumptions that were not given
// (zero volume or capacity, nil costs) are written as null as well.
//
// Use New to build a File from the figures of package analysis, Write to
// save it, Read or ReadFile to load one, AppendSignOff to sign one off and
// Rewrite to write back a file read earlier, keeping sign-offs given since.
package decision

import (
	"fmt"
	"math"
	"strings"
	"time"

	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/projection"
)

// Format is the value of the format key this package writes; it reads
// FormatV1 too.
const Format = "sill-cut/2"

// FormatV1 is the earlier format, read and upgraded to Format on writing.
const FormatV1 = "sill-cut/1"

// File is one decision file. The fields after Data are new in sill-cut/2
// and zero in a file read from sill-cut/1 (Upgraded reports such a file).
type File struct {
	// Format is Format, or FormatV1 for a file read from the earlier
	// format; Marshal always writes Format.
	Format      string
	Created     time.Time // when the file was made, written in RFC 3339
	ToolVersion string    // the build that wrote the file, such as "sill 1.2.0"; see WrittenBy
	Model       Model     // key model; zero when not given
	ChosenBy    string    // key chosen_by: who chose the cut; "" (null) when not given, never guessed
	Data        Data
	Assumptions projection.Assumptions

	// ShiftSchedule is the crew shift schedule the shift figures were
	// counted with (key shift_schedule); nil without one.
	ShiftSchedule *ShiftSchedule
	// Calibration is the reliability table of scores that are
	// probabilities (key calibration); nil otherwise.
	Calibration *Calibration
	// Curve is the trade-off thinned to at most MaxCurvePoints, strictest
	// cut first (key curve); nil in a file read from sill-cut/1.
	Curve []CurvePoint

	Chosen     string // Name of the chosen candidate
	Candidates []Candidate
	Note       string // "" is written as null
	Caution    string // the standing caution, evidence.Caution

	// SignOffs are the sign-offs in the order given (key sign_offs);
	// AppendSignOff adds one and nothing rewrites them.
	SignOffs []SignOff
}

// Upgraded reports whether f was read from a sill-cut/1 file, so that
// writing it back changes its format to sill-cut/2.
func (f *File) Upgraded() bool { return f.Format == FormatV1 }

// Data describes the validation set the cut was chosen on.
type Data struct {
	Path         string  // as given to the command
	SHA256       string  // hex digest of the bytes read
	Rows         int     // rows, zero-weight rows included
	Positives    float64 // weighted true cases
	Negatives    float64 // weighted false cases; key "negatives", optional on read
	ScoreColumn  string
	LabelColumn  string
	WeightColumn string // "" is written as null; optional on read
	// WeightKind is what the weights are (key weight_kind, written with a
	// weight column, null without one); a file without the key reads as
	// frequency weights, as every file was before the key.
	WeightKind     design.Kind
	LowerIsRiskier bool
	Histogram      Histogram // key score_histogram

	// Ranking is how well the scores rank the cases, with intervals at the
	// assumptions' confidence (key ranking); nil in a file written before
	// it was recorded.
	Ranking *Ranking

	// Squares are the validation set's sums of squared weights (key
	// squared_weights), written for sampling weights only, so that check
	// reads each class's score bins at their own noise (package drift);
	// nil for frequency weights, no weight column and files written
	// before the key.
	Squares *SquaredWeights
}

// SquaredWeights are sums of squared weights of the validation set, beside
// the weighted counts of Data and Curve: with them each count's variance
// under sampling weights is known (Kish's effective size of a class is
// Positives²/SquaredWeights.Positives). Every figure is finite and >= 0.
type SquaredWeights struct {
	Positives float64 // key positives: of the true cases
	Negatives float64 // key negatives: of the false cases
	// Curve holds, for each point of File.Curve in its order, the squared
	// weights of the true and false cases its cut flags (key curve, one
	// [tp, fp] a point), growing as the cut loosens and within Positives
	// and Negatives.
	Curve [][2]float64
	// Histogram holds the squared weights in each bin of
	// Data.Histogram (key score_histogram), one per count.
	Histogram []float64
}

// Ranking is the validation set's ROC AUC and average precision, each with
// its interval at the assumptions' confidence: DeLong's normal interval
// clipped to [0,1] and the logit interval over the true cases (see
// analysis.Ranking). Undefined figures and ends are NaN (null).
type Ranking struct {
	ROCAUC             float64    // key roc_auc
	ROCAUCCI           [2]float64 // key roc_auc_ci
	AveragePrecision   float64    // key average_precision
	AveragePrecisionCI [2]float64 // key average_precision_ci
}

// Candidate is one cut the modeller pinned, with its figures on the
// validation set and projected to production.
type Candidate struct {
	Name string
	Rule string       // the cut spec it came from; "" is written as null
	Cut  evidence.Cut // Cut.Score is the candidate's score
	Note string       // "" is written as null

	// What was computed beyond the cut's own figures; nil when it was not
	// (and always in a file read from sill-cut/1).
	Stability *Stability // key stability: the bootstrap's spread (--bootstrap)
	Segments  *Segments  // key segments: the breakdown by group (--segment)
	Shifts    *Shifts    // key shifts: the queues of the real shifts (--time)

	// RuleCheck says whether Rule still picks this cut under the file's
	// assumptions (keys rule_holds and rule_picks); nil for a cut picked
	// by hand, a rule that does not parse, and files written before it.
	RuleCheck *RuleCheck

	// Promise is what Rule promises about production (key promise,
	// cutrule.Rule.Promise): hit= and wrong= meet their figure on this set
	// only, hitNN= and wrongNN= with their level. "" (null) for a cut
	// picked by hand and a rule that promises nothing; a file written
	// before the key gets it from the rule.
	Promise string

	// Optimism is how much the least-cost figure understates its own
	// cost, for a candidate the cost rule picks under the file's
	// assumptions (key cost_optimism); nil for any other candidate, when
	// it could not be estimated, and in files written before it.
	Optimism *CostOptimism
}

// CostOptimism is the optimism of the least-cost cut's projected cost
// (analysis.CostOptimism): the cost rule picks the cut of least cost on
// the cases it then reports that cost on, so the figure is too low. Every
// figure is projected to production (at the assumptions' base rate and
// costs); the per-shift ones are NaN (null) without a volume.
type CostOptimism struct {
	PerCase           float64 // key per_case: how much more per case out of sample
	PerShift          float64 // key per_shift: PerCase times the volume
	CorrectedPerCase  float64 // key corrected_cost_per_case: the projected cost per case plus PerCase
	CorrectedPerShift float64 // key corrected_cost_per_shift: the projected cost per shift plus PerShift
	Folds             int     // key folds: the folds of the estimate
	Seed              uint64  // key seed: the seed of the fold assignment
	Method            string  // key method: the method the estimate rests on, in words
}

// RuleCheck is whether a candidate's rule picks its cut under the file's
// assumptions. A candidate pinned under earlier assumptions (a base rate,
// volume, capacity or costs changed since) may no longer be what its rule
// picks: Holds is then false and Picks is the score the rule picks now.
type RuleCheck struct {
	Holds bool
	// Picks is the score of the cut the rule picks under the assumptions:
	// the candidate's own score when Holds; NaN (null) when no cut meets
	// the rule or the rule does not suit the assumptions.
	Picks float64
}

// ChosenCandidate returns the chosen candidate, or false when Chosen names
// none (Read and New never return such a File).
func (f *File) ChosenCandidate() (Candidate, bool) {
	for _, c := range f.Candidates {
		if c.Name == f.Chosen {
			return c, true
		}
	}
	return Candidate{}, false
}

// BaseRateChanged reports whether the production base rate in the
// assumptions differs from the validation set's own, so that projected
// figures differ from the validation ones. A set of no weight counts as
// changed.
func (f *File) BaseRateChanged() bool {
	total := f.Data.Positives + f.Data.Negatives
	if !(total > 0) {
		return true
	}
	return math.Abs(f.Assumptions.BaseRate-f.Data.Positives/total) > 1e-12
}

// WrittenBy names the build of sill that wrote the file, as its
// tool_version says: "sill 1.2.0" or "sill (commit abc1234, modified)".
// Files from earlier builds kept the bare version ("1.2.0"); it gets
// "sill " in front. An empty tool_version reads "sill (unknown build)".
func (f *File) WrittenBy() string {
	switch v := f.ToolVersion; {
	case v == "":
		return "sill (unknown build)"
	case v == "sill" || strings.HasPrefix(v, "sill "):
		return v
	default:
		return "sill " + v
	}
}

// Validate reports the first rule of the format that f breaks, as a
// *ParseError with an empty File and Line 0: the format, the assumptions'
// ranges, at least one candidate, unique non-empty names, finite candidate
// scores, a Chosen that names a candidate, a well-formed histogram, at most
// MaxCurvePoints in the curve and well-formed sign-offs.
func (f *File) Validate() error {
	bad := func(path string, format string, args ...any) error {
		return &ParseError{Path: path, Err: fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)}
	}
	if f.Format != Format && f.Format != FormatV1 {
		return &ParseError{Path: "format", Err: fmt.Errorf("%w %q, expected %q", ErrFormat, f.Format, Format)}
	}
	if len(f.Curve) > MaxCurvePoints {
		return bad("curve", "%d points, expected at most %d", len(f.Curve), MaxCurvePoints)
	}
	for i, s := range f.SignOffs {
		if err := s.validate(fmt.Sprintf("sign_offs[%d]", i)); err != nil {
			return err
		}
	}
	if err := f.Assumptions.Validate(); err != nil {
		return &ParseError{Path: "assumptions", Err: fmt.Errorf("%w: %v", ErrInvalid, err)}
	}
	if err := f.Data.Histogram.validate(); err != nil {
		return err
	}
	if err := f.validateSquares(); err != nil {
		return err
	}
	if len(f.Candidates) == 0 {
		return bad("candidates", "expected at least one candidate")
	}
	seen := map[string]bool{}
	for i, c := range f.Candidates {
		path := fmt.Sprintf("candidates[%d]", i)
		if c.Name == "" {
			return bad(path+".name", "expected a non-empty name")
		}
		if seen[c.Name] {
			return bad(path+".name", "%q is used by an earlier candidate, expected unique names", c.Name)
		}
		seen[c.Name] = true
		if math.IsNaN(c.Cut.Score) || math.IsInf(c.Cut.Score, 0) {
			return &ParseError{Path: path + ".score", Err: fmt.Errorf("%w, found %v", ErrNotFinite, c.Cut.Score)}
		}
		if k := c.RuleCheck; k != nil {
			switch {
			case c.Rule == "":
				return bad(path+".rule_holds", "a rule check of a candidate without a rule, expected null")
			case k.Holds && k.Picks != c.Cut.Score:
				return bad(path+".rule_picks", "%v, but the rule holds at the candidate's score %v; make them agree", k.Picks, c.Cut.Score)
			case !k.Holds && k.Picks == c.Cut.Score:
				return bad(path+".rule_holds", "false, but the rule picks the candidate's score %v; expected true", c.Cut.Score)
			}
		}
		if err := c.validatePromise(path + ".promise"); err != nil {
			return err
		}
	}
	if !seen[f.Chosen] {
		return &ParseError{Path: "chosen", Err: fmt.Errorf("%w: %q, expected one of %s", ErrUnknownChosen, f.Chosen, f.names())}
	}
	return nil
}

// validateSquares reports squared weights without sampling weights, or
// whose curve or histogram does not match the file's one for one.
func (f *File) validateSquares() error {
	q := f.Data.Squares
	bad := func(format string, args ...any) error {
		return &ParseError{Path: "data.squared_weights", Err: fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)}
	}
	switch {
	case q == nil:
		return nil
	case f.Data.WeightColumn == "" || f.Data.WeightKind != design.Sampling:
		return bad("squared weights with no sampling weights, expected none")
	case len(q.Curve) != len(f.Curve):
		return bad("%d curve pairs for %d points of the curve, expected one a point", len(q.Curve), len(f.Curve))
	case len(q.Histogram) != len(f.Data.Histogram.Counts):
		return bad("%d histogram values for %d bins, expected one a bin", len(q.Histogram), len(f.Data.Histogram.Counts))
	}
	return nil
}

// validatePromise reports a promise on a candidate without a rule or
// whose rule promises nothing, and no promise for a rule that makes one;
// a rule this build does not parse may carry any promise.
func (c Candidate) validatePromise(path string) error {
	bad := func(format string, args ...any) error {
		return &ParseError{Path: path, Err: fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)}
	}
	r, err := cutrule.Parse(c.Rule)
	switch {
	case c.Promise != "" && c.Rule == "":
		return bad("a promise of a candidate without a rule, expected null")
	case c.Rule == "" || err != nil:
		return nil
	case c.Promise != "" && r.Promise() == "":
		return bad("a promise for the rule %q, which promises nothing; expected null", c.Rule)
	case c.Promise == "" && r.Promise() != "":
		return bad("null, but the rule %q promises %q; expected its promise", c.Rule, r.Promise())
	}
	return nil
}

func (f *File) names() string {
	out := "["
	for i, c := range f.Candidates {
		if i > 0 {
			out += ", "
		}
		out += fmt.Sprintf("%q", c.Name)
	}
	return out + "]"
}
