package decision

import (
	"context"
	"math"
	"slices"
	"time"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/segment"
)

// Pick is one candidate to record: a named cut of the result's curve.
type Pick struct {
	Name  string
	Rule  string // the cut spec it came from; "" for a cut picked by hand
	Note  string
	Point curve.Point // a point of the result's curve
}

// Record is what New records beside the figures: who and what made the
// file.
type Record struct {
	ToolVersion string // as sill --version prints it
	Model       Model
	ChosenBy    string // "" when not given; never guessed
	Note        string
}

// MaxSegmentGroups is the most groups a candidate's segments keep: the
// outliers first, then the largest groups; Segments.LeftOut counts the
// rest.
const MaxSegmentGroups = 100

// New builds the File of res, the figures of package analysis, with the
// candidates picked on its curve. chosen names the chosen candidate; ""
// chooses the first. Everything recorded comes from res: the candidates'
// figures under res.Assume, their breakdown by segment and shift queues
// (when res has segments or shifts), the spread of the rule a candidate
// came from (when res.Stability holds a bootstrap and the rule was one of
// res.Rules at the same cut), the reliability table and the curve,
// thinned to at most MaxCurvePoints with both ends and every candidate's
// cut. Created is the current time in UTC, to the second.
//
// It returns an error wrapping ErrInvalid when there is no candidate, a
// name is empty or repeated, a candidate score is not finite, chosen names
// no candidate or the assumptions are out of range.
func New(res *analysis.Result, picks []Pick, chosen string, rec Record) (*File, error) {
	set, a := res.Set, res.Assume
	positives, negatives := set.Totals()
	f := &File{
		Format:      Format,
		Created:     time.Now().UTC().Truncate(time.Second),
		ToolVersion: rec.ToolVersion,
		Model:       rec.Model,
		ChosenBy:    rec.ChosenBy,
		Data: Data{
			Path:           set.Source(),
			SHA256:         set.SHA256(),
			Rows:           set.Cases(), // cases: the summed counts of a counts table
			Positives:      positives,
			Negatives:      negatives,
			ScoreColumn:    set.ScoreColumn(),
			LabelColumn:    set.LabelColumn(),
			WeightColumn:   set.WeightColumn(),
			WeightKind:     kindOf(a.Sample),
			LowerIsRiskier: set.LowerIsRiskier(),
			Histogram:      NewHistogram(set),
			Ranking: &Ranking{
				ROCAUC: res.Summary.ROCAUC, ROCAUCCI: res.Ranking.ROCAUC.Interval,
				AveragePrecision: res.Summary.AveragePrecision, AveragePrecisionCI: res.Ranking.AveragePrecision,
			},
		},
		Assumptions: a,
		Chosen:      chosen,
		Note:        rec.Note,
		Caution:     evidence.Caution,
	}
	if f.Chosen == "" && len(picks) > 0 {
		f.Chosen = picks[0].Name
	}
	checks, err := ruleChecks(res, picks)
	if err != nil {
		return nil, err
	}
	cuts := make([]float64, 0, len(picks))
	for i, p := range picks {
		c := Candidate{Name: p.Name, Rule: p.Rule, Note: p.Note, Cut: evidence.Of(p.Point, a), RuleCheck: checks[i]}
		c.Promise = PromiseOf(p.Rule)
		c.Optimism = optimismOf(res, p.Rule, checks[i], c.Cut)
		c.Stability = stabilityOf(res, p)
		if b, ok := res.SegmentsAt(p.Point, a.Confidence); ok {
			c.Segments = segmentsOf(set.SegmentColumn(), b)
		}
		if peaks, ok := res.PeaksAt(p.Point, a.Capacity); ok {
			c.Shifts = &Shifts{Count: peaks.Shifts, Mean: peaks.Mean, P90: peaks.P90, Max: peaks.Max, OverCapacity: peaks.OverCapacity,
				SampleP90: peaks.Sample.P90, Spread: peaks.Model.Spread, Basis: peaks.Model.Basis()}
			if peaks.Busiest >= 0 && res.Shifts != nil {
				c.Shifts.Busiest = res.Shifts.Assigned.Start(peaks.Busiest)
			}
		}
		f.Candidates = append(f.Candidates, c)
		cuts = append(cuts, p.Point.Score)
	}
	if res.Shifts != nil {
		s := res.Shifts.Assigned.Schedule
		f.ShiftSchedule = &ShiftSchedule{Zone: s.Location.String(), TimeColumn: set.TimeColumn(), TimeLayout: set.TimeLayout()}
		for _, m := range s.Starts {
			f.ShiftSchedule.Starts = append(f.ShiftSchedule.Starts, clock(m))
		}
	}
	if c := res.Calibration; c != nil {
		f.Calibration = calibrationOf(c)
	}
	var curveSquares [][2]float64
	f.Curve, curveSquares = thin(res, cuts)
	if f.Data.WeightColumn != "" && f.Data.WeightKind == design.Sampling {
		f.Data.Squares = &SquaredWeights{
			Positives: res.Summary.PositiveSquares, Negatives: res.Summary.NegativeSquares,
			Curve: curveSquares, Histogram: f.Data.Histogram.FillSquares(set),
		}
	}
	if err := f.Validate(); err != nil {
		return nil, err
	}
	return f, nil
}

// ruleChecks says, for each pick with a rule, whether the rule picks its
// cut under res.Assume (analysis.CheckRules); nil for a pick by hand or a
// rule that does not parse.
func ruleChecks(res *analysis.Result, picks []Pick) ([]*RuleCheck, error) {
	out := make([]*RuleCheck, len(picks))
	var rules []cutrule.Rule
	var scores []float64
	var at []int
	for i, p := range picks {
		if r, err := cutrule.Parse(p.Rule); err == nil {
			rules, scores, at = append(rules, r), append(scores, p.Point.Score), append(at, i)
		}
	}
	if len(rules) == 0 {
		return out, nil
	}
	checks, err := res.CheckRules(context.Background(), rules, scores)
	if err != nil {
		return nil, err
	}
	for k, c := range checks {
		picked := math.NaN()
		if c.Now.Met {
			picked = c.Now.Point.Score
		}
		out[at[k]] = &RuleCheck{Holds: c.Holds, Picks: picked}
	}
	return out, nil
}

// PromiseOf is what the cut spec rule promises about production
// (cutrule.Rule.Promise); "" for no rule, a rule that does not parse and a
// rule that promises nothing.
func PromiseOf(rule string) string {
	r, err := cutrule.Parse(rule)
	if rule == "" || err != nil {
		return ""
	}
	return r.Promise()
}

// optimismOf is the optimism of the least-cost figure (analysis.CostOptimism)
// for a candidate whose rule is the cost rule and picks its cut under
// res.Assume (check holds); nil otherwise, or when it cannot be estimated.
func optimismOf(res *analysis.Result, rule string, check *RuleCheck, e evidence.Cut) *CostOptimism {
	r, err := cutrule.Parse(rule)
	if rule == "" || err != nil || r.Kind != cutrule.Cost || check == nil || !check.Holds {
		return nil
	}
	perCase := res.CostOptimism
	if math.IsNaN(perCase) {
		// res found no cost rule among its own rules.
		perCase = analysis.CostOptimism(res.Set, res.Assume)
	}
	if math.IsNaN(perCase) {
		return nil
	}
	return newCostOptimism(perCase, e, res.Assume.Volume)
}

// newCostOptimism is the optimism perCase of a candidate of figures e,
// with the per-shift figures at volume (NaN when volume is 0).
func newCostOptimism(perCase float64, e evidence.Cut, volume float64) *CostOptimism {
	o := &CostOptimism{PerCase: perCase, PerShift: math.NaN(), CorrectedPerShift: math.NaN(),
		CorrectedPerCase: e.Projected.CostPerCase + perCase,
		Folds:            analysis.OptimismFolds, Seed: analysis.OptimismSeed, Method: analysis.OptimismMethod()}
	if volume > 0 {
		o.PerShift = volume * perCase
		o.CorrectedPerShift = e.Projected.CostPerShift + o.PerShift
	}
	return o
}

func clock(minutes int) string {
	return string([]byte{byte('0' + minutes/600), byte('0' + minutes/60%10), ':', byte('0' + minutes%60/10), byte('0' + minutes%10)})
}

// stabilityOf is the bootstrap spread of the rule p came from, or of the
// first rule met at p's cut when p was picked by hand, with the redraws at
// p's cut. A pick no resampled rule lands on (picked by hand, or by a rule
// not among res.Rules) keeps the redraws at its cut alone, its Skipped
// saying why; nil without a bootstrap, or when the bootstrap has no band
// at p's cut either.
func stabilityOf(res *analysis.Result, p Pick) *Stability {
	b := res.Stability
	if b == nil {
		return nil
	}
	var found *bootstrap.Spread
	for i, o := range res.Outcomes {
		if i >= len(b.Spreads) || !o.Met || o.Point.Index != p.Point.Index || b.Spreads[i].Rule != o.Rule {
			continue
		}
		if o.Rule.String() == p.Rule {
			found = &b.Spreads[i]
			break
		}
		if p.Rule == "" && found == nil {
			found = &b.Spreads[i]
		}
	}
	band, banded := b.BandAtCut(p.Point.Score)
	if found == nil && !banded {
		return nil
	}
	nan := [2]float64{math.NaN(), math.NaN()}
	s := &Stability{Replicates: b.Replicates, Seed: b.Seed, Score: nan, FlaggedShare: nan, Recall: nan, Skipped: SkippedByHand,
		RecallAtCut: nan, FalseDiscoveryRateAtCut: nan}
	if found != nil {
		s.Met, s.Score, s.FlaggedShare, s.Recall, s.Skipped = found.Met, found.Score, found.FlaggedShare, found.Recall, found.Skipped
	}
	if banded {
		s.RecallAtCut, s.FalseDiscoveryRateAtCut = band.Recall, band.FalseDiscoveryRate
	}
	return s
}

// SkippedByHand is Stability.Skipped of a candidate no resampled rule
// lands on: only the redraws at its cut are recorded.
const SkippedByHand = "picked by hand, no rule applied again to the resampled sets: only the redraws at its cut are recorded"

func segmentsOf(column string, b segment.Breakdown) *Segments {
	groups := slices.Clone(b.Segments)
	s := &Segments{Column: column, Tests: b.Tests}
	if len(groups) > MaxSegmentGroups {
		// Outliers first, then the largest; the kept ones back in the
		// data's order.
		order := make([]int, len(groups))
		for i := range order {
			order[i] = i
		}
		slices.SortStableFunc(order, func(i, j int) int {
			gi, gj := groups[i], groups[j]
			switch {
			case gi.Outlier != gj.Outlier:
				if gi.Outlier {
					return -1
				}
				return 1
			case gi.Rows != gj.Rows:
				return gj.Rows - gi.Rows
			}
			return 0
		})
		kept := order[:MaxSegmentGroups]
		slices.Sort(kept)
		var trimmed []segment.Figures
		for _, i := range kept {
			trimmed = append(trimmed, groups[i])
		}
		s.LeftOut = len(groups) - MaxSegmentGroups
		groups = trimmed
	}
	for _, g := range groups {
		s.Groups = append(s.Groups, SegmentGroup{
			Name: g.Segment, Rows: g.Rows, Positives: g.Positives, Negatives: g.Negatives, TP: g.TP, FP: g.FP,
			Recall: g.Recall, RecallCI: g.RecallCI, Precision: g.Precision, PrecisionCI: g.PrecisionCI, Outlier: g.Outlier,
			RecallGap: g.RecallTest.Gap, RecallGapCI: g.RecallTest.GapCI, RecallAdjustedP: g.RecallTest.AdjustedP,
			FalseDiscoveryGap: g.FalseDiscoveryTest.Gap, FalseDiscoveryGapCI: g.FalseDiscoveryTest.GapCI,
			FalseDiscoveryAdjustedP: g.FalseDiscoveryTest.AdjustedP,
		})
	}
	return s
}

func calibrationOf(c *analysis.Calibration) *Calibration {
	out := &Calibration{Binning: "width", ECE: c.Table.ECE, ECENoise: c.Table.Noise}
	if c.Table.Binning == calibration.Quantile {
		out.Binning = "quantile"
	}
	for _, b := range c.Table.Bins {
		out.Bins = append(out.Bins, CalibrationBin{Lower: b.Lower, Upper: b.Upper, MeanScore: b.MeanScore,
			ObservedRate: b.ObservedRate, Rows: b.Count, Weight: b.Weight})
	}
	if c.Cost != nil {
		out.CostThreshold = &CostThreshold{Probability: c.Cost.Probability, Score: c.Cost.Score}
	}
	return out
}

// thin returns res's curve, strictest cut first, thinned to at most
// MaxCurvePoints: the first and last cut, every cut whose score is in
// keep and, between them, a cut wherever the summed change in flagged
// share, hit share and false-positive rate since the last kept cut reaches
// a step. The three shares each run from 0 to 1, so their summed change
// along the curve is at most 3 and the steps keep at most 3/step cuts.
// squares are the squared weights of the true and false cases each kept
// cut flags (SquaredWeights.Curve).
func thin(res *analysis.Result, keep []float64) (out []CurvePoint, squares [][2]float64) {
	if len(keep) > MaxCurvePoints-2 {
		keep = keep[:MaxCurvePoints-2]
	}
	step := 3 / float64(MaxCurvePoints-2-len(keep)-1)
	positives, negatives := res.Set.Totals()
	var last, previous curve.Point
	have := false
	position := func(p curve.Point) [3]float64 {
		return [3]float64{p.FlaggedShare(), ratio(p.TP, positives), ratio(p.FP, negatives)}
	}
	visit := func(p curve.Point) {
		point := CurvePoint{Score: p.Score, TP: p.TP, FP: p.FP}
		switch {
		case !have, slices.Contains(keep, p.Score):
			out, squares = append(out, point), append(squares, [2]float64{p.Squares[0], p.Squares[1]})
			last = p
		default:
			a, b := position(last), position(p)
			moved := 0.0
			for i := range a {
				if d := math.Abs(b[i] - a[i]); !math.IsNaN(d) {
					moved += d
				}
			}
			if moved >= step {
				out, squares = append(out, point), append(squares, [2]float64{p.Squares[0], p.Squares[1]})
				last = p
			}
		}
		previous, have = p, true
	}
	res.Points(visit)
	if have && (len(out) == 0 || out[len(out)-1].Score != previous.Score) {
		out = append(out, CurvePoint{Score: previous.Score, TP: previous.TP, FP: previous.FP})
		squares = append(squares, [2]float64{previous.Squares[0], previous.Squares[1]})
	}
	if len(out) > MaxCurvePoints {
		// Not reached by the bound above; kept so that no input can
		// break the format's limit.
		out = append(out[:MaxCurvePoints-1], out[len(out)-1])
		squares = append(squares[:MaxCurvePoints-1], squares[len(squares)-1])
	}
	return out, squares
}

func ratio(num, den float64) float64 {
	if !(den > 0) {
		return 0
	}
	return num / den
}

// kindOf is the kind of weights of a design (frequency for nil).
func kindOf(s *design.Sample) design.Kind {
	if s.Sampling() {
		return design.Sampling
	}
	return design.Frequency
}
