package decision

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"go.yaml.in/yaml/v3"

	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
)

// The readers of the keys sill-cut/2 added. Each returns nil for an
// absent or null optional key.

// timestamp reads an RFC 3339 time.
func (r *reader) timestamp(n *yaml.Node, path string) time.Time {
	n = deref(n)
	if r.err != nil {
		return time.Time{}
	}
	if n == nil || n.Kind != yaml.ScalarNode || (n.ShortTag() != "!!str" && n.ShortTag() != "!!timestamp") {
		r.fail(n, path, fmt.Errorf("%w: expected an RFC 3339 timestamp, found %s", ErrType, describe(n)))
		return time.Time{}
	}
	t, err := time.Parse(time.RFC3339, n.Value)
	if err != nil {
		r.fail(n, path, fmt.Errorf("%w: %q, expected an RFC 3339 timestamp such as 2026-09-01T06:00:00Z", ErrInvalid, n.Value))
	}
	return t
}

func (r *reader) schedule(n *yaml.Node) *ShiftSchedule {
	if isNull(n) || r.err != nil {
		return nil
	}
	const path = "shift_schedule"
	m := r.fields(n, path, []string{"starts", "zone"}, []string{"time_column", "time_layout"})
	s := &ShiftSchedule{Zone: r.str(m["zone"], path+".zone"), TimeColumn: r.optionalStr(m["time_column"], path+".time_column"),
		TimeLayout: r.optionalStr(m["time_layout"], path+".time_layout")}
	for i, item := range r.list(m["starts"], path+".starts") {
		p := fmt.Sprintf("%s.starts[%d]", path, i)
		start := r.str(item, p)
		if r.err == nil && !isClock(start) {
			r.fail(deref(item), p, fmt.Errorf("%w: %q, expected a start time HH:MM such as \"06:00\"", ErrInvalid, start))
		}
		if r.err == nil && i > 0 && start <= s.Starts[i-1] {
			r.fail(deref(item), p, fmt.Errorf("%w: %q after %q, expected start times in ascending order", ErrInvalid, start, s.Starts[i-1]))
		}
		s.Starts = append(s.Starts, start)
	}
	if r.err == nil && len(s.Starts) == 0 {
		r.fail(deref(m["starts"]), path+".starts", fmt.Errorf("%w: an empty list, expected at least one start time", ErrInvalid))
	}
	if r.err == nil {
		if _, err := time.LoadLocation(s.Zone); err != nil || s.Zone == "" {
			r.fail(deref(m["zone"]), path+".zone", fmt.Errorf("%w: %q, expected a time zone such as \"UTC\" or \"Europe/Lisbon\"", ErrInvalid, s.Zone))
		}
	}
	return s
}

func isClock(s string) bool {
	if len(s) != 5 || s[2] != ':' {
		return false
	}
	h, errH := strconv.Atoi(s[:2])
	m, errM := strconv.Atoi(s[3:])
	return errH == nil && errM == nil && h >= 0 && h <= 23 && m >= 0 && m <= 59 && s[0] != '+' && s[3] != '+'
}

func (r *reader) calibration(n *yaml.Node) *Calibration {
	if isNull(n) || r.err != nil {
		return nil
	}
	const path = "calibration"
	m := r.fields(n, path, []string{"binning", "ece", "bins", "cost_threshold"}, []string{"ece_noise"})
	c := &Calibration{Binning: r.str(m["binning"], path+".binning"), ECE: r.share(m["ece"], path+".ece"), ECENoise: r.share(m["ece_noise"], path+".ece_noise")}
	if r.err == nil && c.Binning != "width" && c.Binning != "quantile" {
		r.fail(deref(m["binning"]), path+".binning", fmt.Errorf("%w: %q, expected \"width\" or \"quantile\"", ErrInvalid, c.Binning))
	}
	for i, item := range r.list(m["bins"], path+".bins") {
		p := fmt.Sprintf("%s.bins[%d]", path, i)
		b := r.fields(item, p, []string{"lower", "upper", "mean_score", "observed_rate", "rows", "weight"}, nil)
		bin := CalibrationBin{
			Lower: r.share(b["lower"], p+".lower"), Upper: r.share(b["upper"], p+".upper"),
			MeanScore: r.share(b["mean_score"], p+".mean_score"), ObservedRate: r.share(b["observed_rate"], p+".observed_rate"),
			Rows: r.integer(b["rows"], p+".rows"), Weight: r.count(b["weight"], p+".weight"),
		}
		if r.err == nil && (math.IsNaN(bin.Lower) || math.IsNaN(bin.Upper) || bin.Lower > bin.Upper) {
			r.fail(deref(item), p, fmt.Errorf("%w: lower %v and upper %v, expected 0 <= lower <= upper <= 1", ErrInvalid, bin.Lower, bin.Upper))
		}
		c.Bins = append(c.Bins, bin)
	}
	if t := m["cost_threshold"]; !isNull(t) && r.err == nil {
		p := path + ".cost_threshold"
		tm := r.fields(t, p, []string{"probability", "score"}, nil)
		c.CostThreshold = &CostThreshold{Probability: r.share(tm["probability"], p+".probability"), Score: r.number(tm["score"], p+".score", true)}
	}
	return c
}

func (r *reader) stability(n *yaml.Node, path string) *Stability {
	if isNull(n) || r.err != nil {
		return nil
	}
	m := r.fields(n, path, []string{"replicates", "seed", "met", "score", "flagged_share", "recall"}, []string{"skipped", "recall_at_cut", "false_discovery_rate_at_cut"})
	s := &Stability{
		Replicates: r.integer(m["replicates"], path+".replicates"),
		Met:        r.integer(m["met"], path+".met"),
		Skipped:    r.optionalStr(m["skipped"], path+".skipped"),
	}
	s.Seed = r.seed(m["seed"], path+".seed")
	s.Score = r.range_(m["score"], path+".score")
	s.FlaggedShare = r.interval(m["flagged_share"], path+".flagged_share")
	s.Recall = r.interval(m["recall"], path+".recall")
	s.RecallAtCut = r.interval(m["recall_at_cut"], path+".recall_at_cut")
	s.FalseDiscoveryRateAtCut = r.interval(m["false_discovery_rate_at_cut"], path+".false_discovery_rate_at_cut")
	if r.err == nil && s.Met > s.Replicates {
		r.fail(deref(m["met"]), path+".met", fmt.Errorf("%w: %d, expected at most replicates (%d)", ErrInvalid, s.Met, s.Replicates))
	}
	return s
}

// seed reads a seed: a whole number from 0 to the largest uint64.
func (r *reader) seed(n *yaml.Node, path string) uint64 {
	seed := deref(n)
	if r.err != nil {
		return 0
	}
	var err error
	var v uint64
	if seed == nil || seed.Kind != yaml.ScalarNode || seed.ShortTag() != "!!int" {
		err = fmt.Errorf("%w: expected a whole number >= 0, found %s", ErrType, describe(seed))
	} else if v, err = strconv.ParseUint(seed.Value, 10, 64); err != nil {
		err = fmt.Errorf("%w: %s, expected a whole number from 0 to %d", ErrInvalid, seed.Value, uint64(math.MaxUint64))
	}
	if err != nil {
		r.fail(seed, path, err)
	}
	return v
}

// promise reads the promise of a candidate with the cut spec rule: a
// string or null (""). Absent, it is what the rule promises (PromiseOf).
// File.Validate checks that it agrees with the rule.
func (r *reader) promise(m map[string]*yaml.Node, path, rule string) string {
	node, ok := m["promise"]
	if !ok || r.err != nil {
		return PromiseOf(rule)
	}
	return r.optionalStr(node, path+".promise")
}

// optimism reads a candidate's cost_optimism: null, or the optimism of the
// least-cost figure of a candidate whose rule is the cost rule, with
// corrected costs that are its projected costs plus the optimism and
// per-shift figures that are the per-case ones times the volume (null
// without a volume).
func (r *reader) optimism(n *yaml.Node, path, rule string, e evidence.Cut, volume float64) *CostOptimism {
	if isNull(n) || r.err != nil {
		return nil
	}
	if parsed, err := cutrule.Parse(rule); rule == "" || (err == nil && parsed.Kind != cutrule.Cost) {
		r.fail(deref(n), path, fmt.Errorf("%w: the least-cost figure's optimism on a candidate not picked by the cost rule, expected null", ErrInvalid))
		return nil
	}
	m := r.fields(n, path, []string{"per_case", "per_shift", "corrected_cost_per_case", "corrected_cost_per_shift", "folds", "seed", "method"}, nil)
	o := &CostOptimism{
		PerCase:           r.number(m["per_case"], path+".per_case", false),
		PerShift:          r.number(m["per_shift"], path+".per_shift", true),
		CorrectedPerCase:  r.number(m["corrected_cost_per_case"], path+".corrected_cost_per_case", true),
		CorrectedPerShift: r.number(m["corrected_cost_per_shift"], path+".corrected_cost_per_shift", true),
		Folds:             r.integer(m["folds"], path+".folds"),
		Seed:              r.seed(m["seed"], path+".seed"),
		Method:            r.str(m["method"], path+".method"),
	}
	switch {
	case r.err != nil:
		return nil
	case o.Folds < 2:
		r.fail(deref(m["folds"]), path+".folds", fmt.Errorf("%w: %d, expected at least 2 folds", ErrInvalid, o.Folds))
	case strings.TrimSpace(o.Method) == "":
		r.fail(deref(m["method"]), path+".method", fmt.Errorf("%w: empty, expected the method the estimate rests on", ErrInvalid))
	}
	perShift, correctedPerShift := math.NaN(), math.NaN()
	if volume > 0 {
		perShift = volume * o.PerCase
		correctedPerShift = e.Projected.CostPerShift + perShift
	}
	for _, c := range []struct {
		key       string
		got, want float64
		expected  string
	}{
		{"corrected_cost_per_case", o.CorrectedPerCase, e.Projected.CostPerCase + o.PerCase, "the projected cost_per_case plus per_case"},
		{"per_shift", o.PerShift, perShift, "per_case times the volume (null without one)"},
		{"corrected_cost_per_shift", o.CorrectedPerShift, correctedPerShift, "the projected cost_per_shift plus per_shift (null without a volume)"},
	} {
		if r.err == nil && !sameFigure(c.got, c.want) {
			r.fail(deref(m[c.key]), path+"."+c.key, fmt.Errorf("%w: %v, expected %s (%v)", ErrInvalid, c.got, c.expected, c.want))
		}
	}
	return o
}

// sameFigure is sameCount for figures that may be undefined: both NaN, or
// both defined and the same to within countTolerance.
func sameFigure(a, b float64) bool {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.IsNaN(a) && math.IsNaN(b)
	}
	return sameCount(a, b)
}

// range_ reads [low, high] of numbers or nulls.
func (r *reader) range_(n *yaml.Node, path string) [2]float64 {
	return r.pair(n, path, func(n *yaml.Node, path string) float64 { return r.number(n, path, true) }, rangeEnds)
}

func (r *reader) segments(n *yaml.Node, path string) *Segments {
	if isNull(n) || r.err != nil {
		return nil
	}
	m := r.fields(n, path, []string{"column", "groups"}, []string{"left_out", "tests"})
	s := &Segments{Column: r.str(m["column"], path+".column")}
	if v, ok := m["left_out"]; ok {
		s.LeftOut = r.integer(v, path+".left_out")
	}
	if v, ok := m["tests"]; ok {
		s.Tests = r.integer(v, path+".tests")
	}
	for i, item := range r.list(m["groups"], path+".groups") {
		p := fmt.Sprintf("%s.groups[%d]", path, i)
		g := r.fields(item, p, []string{"name", "rows", "positives", "negatives", "tp", "fp", "recall", "recall_ci", "precision", "precision_ci", "outlier"},
			[]string{"recall_gap", "recall_gap_ci", "recall_adjusted_p", "false_discovery_gap", "false_discovery_gap_ci", "false_discovery_adjusted_p"})
		group := SegmentGroup{
			Name: r.str(g["name"], p+".name"), Rows: r.integer(g["rows"], p+".rows"),
			Positives: r.count(g["positives"], p+".positives"), Negatives: r.count(g["negatives"], p+".negatives"),
			TP: r.count(g["tp"], p+".tp"), FP: r.count(g["fp"], p+".fp"),
			Recall: r.share(g["recall"], p+".recall"), RecallCI: r.interval(g["recall_ci"], p+".recall_ci"),
			Precision: r.share(g["precision"], p+".precision"), PrecisionCI: r.interval(g["precision_ci"], p+".precision_ci"),
			Outlier:                 r.boolean(g["outlier"], p+".outlier"),
			RecallGap:               r.gap(g["recall_gap"], p+".recall_gap"),
			RecallGapCI:             r.gapInterval(g["recall_gap_ci"], p+".recall_gap_ci"),
			RecallAdjustedP:         r.share(g["recall_adjusted_p"], p+".recall_adjusted_p"),
			FalseDiscoveryGap:       r.gap(g["false_discovery_gap"], p+".false_discovery_gap"),
			FalseDiscoveryGapCI:     r.gapInterval(g["false_discovery_gap_ci"], p+".false_discovery_gap_ci"),
			FalseDiscoveryAdjustedP: r.share(g["false_discovery_adjusted_p"], p+".false_discovery_adjusted_p"),
		}
		switch {
		case r.err != nil:
		case group.TP > group.Positives*(1+countTolerance):
			r.fail(deref(g["tp"]), p+".tp", fmt.Errorf("%w: %v, expected at most the group's positives %v", ErrInvalid, group.TP, group.Positives))
		case group.FP > group.Negatives*(1+countTolerance):
			r.fail(deref(g["fp"]), p+".fp", fmt.Errorf("%w: %v, expected at most the group's negatives %v", ErrInvalid, group.FP, group.Negatives))
		}
		s.Groups = append(s.Groups, group)
	}
	return s
}

// gap reads a difference of two shares, a number in [-1,1], or null
// (NaN); an absent key reads as NaN.
func (r *reader) gap(n *yaml.Node, path string) float64 {
	v := r.number(n, path, true)
	if r.err == nil && !math.IsNaN(v) && !(v >= -1 && v <= 1) {
		r.fail(deref(n), path, fmt.Errorf("%w: %v, expected a difference of shares in [-1,1] or null", ErrInvalid, v))
	}
	return v
}

// gapInterval reads [lower, upper] of differences of shares or nulls, or
// a null interval; an absent key reads as NaNs.
func (r *reader) gapInterval(n *yaml.Node, path string) [2]float64 {
	if isNull(n) {
		return [2]float64{math.NaN(), math.NaN()}
	}
	return r.pair(n, path, r.gap, intervalEnds)
}

func (r *reader) shifts(n *yaml.Node, path string) *Shifts {
	if isNull(n) || r.err != nil {
		return nil
	}
	m := r.fields(n, path, []string{"count", "mean", "p90", "max", "busiest", "over_capacity"}, []string{"sample_p90", "model_spread", "basis"})
	s := &Shifts{
		Count:     r.integer(m["count"], path+".count"),
		Mean:      r.number(m["mean"], path+".mean", true),
		P90:       r.number(m["p90"], path+".p90", true),
		Max:       r.number(m["max"], path+".max", true),
		SampleP90: r.number(m["sample_p90"], path+".sample_p90", true),
		Spread:    r.number(m["model_spread"], path+".model_spread", true),
	}
	if !isNull(m["basis"]) {
		s.Basis = r.str(m["basis"], path+".basis")
	}
	if !isNull(m["busiest"]) {
		s.Busiest = r.timestamp(m["busiest"], path+".busiest")
	}
	s.OverCapacity = r.share(m["over_capacity"], path+".over_capacity")
	// A file of sill-cut/2 before the shift-peak model holds the sample's
	// p90 as p90; since, the sample's is sample_p90 and p90 is the
	// model's, which may lie above the sample's busiest shift.
	sampleP90, key := s.SampleP90, "sample_p90"
	if m["sample_p90"] == nil {
		sampleP90, key = s.P90, "p90"
	}
	if r.err == nil && sampleP90 > s.Max {
		r.fail(deref(m[key]), path+"."+key, fmt.Errorf("%w: %v above max %v, expected %s <= max", ErrInvalid, sampleP90, s.Max, key))
	}
	return s
}

func (r *reader) signOffs(n *yaml.Node) []SignOff {
	var out []SignOff
	for i, item := range r.list(n, "sign_offs") {
		p := fmt.Sprintf("sign_offs[%d]", i)
		m := r.fields(item, p, []string{"name", "role", "verdict", "note", "at", "chosen", "chosen_score"}, []string{"key"})
		s := SignOff{
			Name:        r.str(m["name"], p+".name"),
			Role:        r.optionalStr(m["role"], p+".role"),
			Verdict:     Verdict(r.str(m["verdict"], p+".verdict")),
			Note:        r.optionalStr(m["note"], p+".note"),
			At:          r.timestamp(m["at"], p+".at"),
			Chosen:      r.str(m["chosen"], p+".chosen"),
			ChosenScore: r.number(m["chosen_score"], p+".chosen_score", false),
		}
		if v, ok := m["key"]; ok {
			s.Key = r.str(v, p+".key")
		}
		if r.err == nil {
			if err := s.validate(p); err != nil {
				r.failAt(err.(*ParseError).Path, err.(*ParseError).Err)
			}
		}
		out = append(out, s)
	}
	return out
}

// curve reads the stored trade-off: at most MaxCurvePoints of [score, tp,
// fp], strictest cut first (scores falling, or rising when lower scores
// are riskier), tp and fp growing and within the data's totals.
func (r *reader) curve(n *yaml.Node, d Data) []CurvePoint {
	items := r.list(n, "curve")
	if r.err == nil && len(items) > MaxCurvePoints {
		r.fail(deref(n), "curve", fmt.Errorf("%w: %d points, expected at most %d", ErrInvalid, len(items), MaxCurvePoints))
	}
	out := make([]CurvePoint, 0, len(items))
	for i, item := range items {
		p := fmt.Sprintf("curve[%d]", i)
		values := r.list(item, p)
		if r.err == nil && len(values) != 3 {
			r.fail(deref(item), p, fmt.Errorf("%w: %d values, expected [score, tp, fp]", ErrInvalid, len(values)))
		}
		if r.err != nil {
			return nil
		}
		point := CurvePoint{Score: r.number(values[0], p+"[0]", false), TP: r.count(values[1], p+"[1]"), FP: r.count(values[2], p+"[2]")}
		if r.err != nil {
			return nil
		}
		switch {
		case point.TP > d.Positives*(1+countTolerance)+countTolerance:
			r.fail(deref(values[1]), p+"[1]", fmt.Errorf("%w: tp %v, expected at most data.positives %v", ErrInvalid, point.TP, d.Positives))
		case !math.IsNaN(d.Negatives) && point.FP > d.Negatives*(1+countTolerance)+countTolerance:
			r.fail(deref(values[2]), p+"[2]", fmt.Errorf("%w: fp %v, expected at most data.negatives %v", ErrInvalid, point.FP, d.Negatives))
		case i > 0 && !stricter(out[i-1].Score, point.Score, d.LowerIsRiskier):
			r.fail(deref(values[0]), p+"[0]", fmt.Errorf("%w: score %v after %v, expected the strictest cut first", ErrInvalid, point.Score, out[i-1].Score))
		case i > 0 && (point.TP < out[i-1].TP || point.FP < out[i-1].FP):
			r.fail(deref(item), p, fmt.Errorf("%w: tp or fp below the stricter cut's, expected counts that grow as the cut loosens", ErrInvalid))
		}
		out = append(out, point)
	}
	return out
}

// stricter reports whether a cut at a flags fewer cases than one at b.
func stricter(a, b float64, lowerIsRiskier bool) bool {
	if lowerIsRiskier {
		return a < b
	}
	return a > b
}

// squares reads data.squared_weights (SquaredWeights), allowed with
// sampling weights only: every figure a count >= 0, the histogram's one
// a bin, the curve's [tp, fp] pairs growing and within the class totals
// (their number is checked against the curve by squaresOnCurve).
func (r *reader) squares(n *yaml.Node, d Data) *SquaredWeights {
	const path = "data.squared_weights"
	if r.err == nil && (d.WeightColumn == "" || d.WeightKind != design.Sampling) {
		r.fail(deref(n), path, fmt.Errorf("%w: squared weights with no sampling weights, expected null or no key (they are written for weight_kind sampling only)", ErrInvalid))
	}
	m := r.fields(n, path, []string{"positives", "negatives", "curve", "score_histogram"}, nil)
	out := &SquaredWeights{
		Positives: r.count(m["positives"], path+".positives"),
		Negatives: r.count(m["negatives"], path+".negatives"),
	}
	out.Histogram = r.numbers(m["score_histogram"], path+".score_histogram")
	for i, v := range out.Histogram {
		if r.err == nil && v < 0 {
			r.fail(deref(m["score_histogram"]).Content[i], fmt.Sprintf("%s.score_histogram[%d]", path, i), fmt.Errorf("%w: %v, expected a count >= 0", ErrInvalid, v))
		}
	}
	if r.err == nil && len(out.Histogram) != len(d.Histogram.Counts) {
		r.fail(deref(m["score_histogram"]), path+".score_histogram", fmt.Errorf("%w: %d values for %d histogram bins, expected one a bin", ErrInvalid, len(out.Histogram), len(d.Histogram.Counts)))
	}
	for i, item := range r.list(m["curve"], path+".curve") {
		p := fmt.Sprintf("%s.curve[%d]", path, i)
		values := r.list(item, p)
		if r.err == nil && len(values) != 2 {
			r.fail(deref(item), p, fmt.Errorf("%w: %d values, expected [tp, fp]", ErrInvalid, len(values)))
		}
		if r.err != nil {
			return nil
		}
		pair := [2]float64{r.count(values[0], p+"[0]"), r.count(values[1], p+"[1]")}
		switch {
		case r.err != nil:
		case pair[0] > out.Positives*(1+countTolerance)+countTolerance || pair[1] > out.Negatives*(1+countTolerance)+countTolerance:
			r.fail(deref(item), p, fmt.Errorf("%w: [%v, %v], expected at most the totals [%v, %v]", ErrInvalid, pair[0], pair[1], out.Positives, out.Negatives))
		case i > 0 && (pair[0] < out.Curve[i-1][0] || pair[1] < out.Curve[i-1][1]):
			r.fail(deref(item), p, fmt.Errorf("%w: below the stricter cut's, expected squared weights that grow as the cut loosens", ErrInvalid))
		}
		out.Curve = append(out.Curve, pair)
	}
	if r.err != nil {
		return nil
	}
	return out
}

// squaresOnCurve fails when data.squared_weights.curve does not hold one
// pair for each point of the curve.
func (r *reader) squaresOnCurve(f *File) {
	s := f.Data.Squares
	if r.err != nil || s == nil || len(s.Curve) == len(f.Curve) {
		return
	}
	r.failAt("data.squared_weights.curve", fmt.Errorf("%w: %d pairs for %d points of the curve, expected one a point", ErrInvalid, len(s.Curve), len(f.Curve)))
}
