package decision

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"go.yaml.in/yaml/v3"

	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// WriteOptions say what Write may replace.
type WriteOptions struct {
	// Force replaces a file that is not a decision file, or one made from
	// other data.
	Force bool
	// Expect, when not nil, is the file as it was read (ReadFileStamped,
	// or the Stamp of the last write): the write is refused with an error
	// matching sharedfile.ErrChanged when the file has changed since.
	Expect *sharedfile.Stamp
}

// Write saves f at path with the guarantees of package sharedfile: under a
// lock beside the file, replaced atomically only if still as expected,
// through symbolic links, keeping the file's mode, cleaned up when ctx ends.
// It returns the Stamp of the file written, for the next write to expect.
//
// Unless o.Force is set it refuses to replace an existing file that is not
// a readable decision file (ErrNotDecisionFile) or whose data.sha256
// differs from f's (ErrDifferentData); both errors also match
// sharedfile.ErrOtherKind. A decision file on the same data is replaced.
// The check and the replacement are one step under the lock, so that of
// two writers of different data to one path one is refused. It returns an
// error without writing when f fails Validate.
func Write(ctx context.Context, path string, f *File, o WriteOptions) (sharedfile.Stamp, error) {
	if err := f.Validate(); err != nil {
		return sharedfile.Stamp{}, fmt.Errorf("write %s: %w", path, err)
	}
	data, err := Marshal(f)
	if err != nil {
		return sharedfile.Stamp{}, fmt.Errorf("write %s: %w", path, err)
	}
	opts := sharedfile.Options{Expect: o.Expect}
	if !o.Force {
		opts.Kind = func(current []byte) error { return replaceable(current, path, f.Data.SHA256) }
	}
	return sharedfile.Write(ctx, path, data, opts)
}

// replaceable says whether current, the file at path, may be replaced by a
// decision file on the data of digest: only a decision file on that data.
func replaceable(current []byte, path, digest string) error {
	existing, err := Read(bytes.NewReader(current), path)
	if err != nil {
		return fmt.Errorf("%w (%v)", ErrNotDecisionFile, err)
	}
	if existing.Data.SHA256 != digest {
		return fmt.Errorf("%w (its data.sha256 is %s, this data's is %s)", ErrDifferentData, short(existing.Data.SHA256), short(digest))
	}
	return nil
}

func short(digest string) string {
	if len(digest) > 12 {
		return digest[:12] + "…"
	}
	if digest == "" {
		return "empty"
	}
	return digest
}

// Marshal returns the YAML document of f. Keys come in the order of the
// format; numbers are written in the shortest form that reads back to the
// same float64, always with a decimal point before any exponent so that
// YAML 1.1 readers also see numbers.
func Marshal(f *File) ([]byte, error) {
	cand := &yaml.Node{Kind: yaml.SequenceNode}
	for _, c := range f.Candidates {
		cand.Content = append(cand.Content, candidateNode(c, f.Data))
	}
	a := f.Assumptions
	costs := [3]float64{math.NaN(), math.NaN(), math.NaN()}
	if a.Costs != nil {
		costs = [3]float64{a.Costs.FalseAlert, a.Costs.Miss, a.Costs.Hit}
	}
	d := f.Data
	doc := mapping(
		"format", str(Format),
		"created", quoted(f.Created.UTC().Format(time.RFC3339)),
		"tool_version", quoted(f.ToolVersion),
		"model", mapping("name", optionalStr(f.Model.Name), "version", optionalStr(f.Model.Version)),
		"chosen_by", optionalStr(f.ChosenBy),
		"data", mapping(
			"path", quoted(d.Path),
			"sha256", quoted(d.SHA256),
			"rows", num(float64(d.Rows)),
			"positives", num(d.Positives),
			"negatives", num(d.Negatives),
			"score_column", quoted(d.ScoreColumn),
			"label_column", quoted(d.LabelColumn),
			"weight_column", optionalStr(d.WeightColumn),
			"weight_kind", weightKind(d),
			"lower_is_riskier", boolean(d.LowerIsRiskier),
			"score_histogram", mapping(
				"edges", flowList(d.Histogram.Edges...),
				"counts", flowList(d.Histogram.Counts...),
			),
			"ranking", rankingNode(d.Ranking),
		),
		"assumptions", mapping(
			"base_rate", num(a.BaseRate),
			"volume_per_shift", given(a.Volume),
			"cost_false_alert", num(costs[0]),
			"cost_miss", num(costs[1]),
			"cost_hit", num(costs[2]),
			"capacity", given(a.Capacity),
			"confidence", num(a.Confidence),
		),
		"shift_schedule", scheduleNode(f.ShiftSchedule),
		"calibration", calibrationNode(f.Calibration),
		"chosen", quoted(f.Chosen),
		"chosen_score", chosenScore(f),
		"candidates", cand,
		"note", optionalStr(f.Note),
		"caution", str(evidence.Caution), // the standing caution, whatever a hand edit left in f
		"sign_offs", signOffsNode(f.SignOffs),
		"curve", curveNode(f.Curve),
	)
	if d.Squares != nil {
		data := doc.Content[2*slices.Index(keysOf(doc), "data")+1]
		key := str("squared_weights")
		key.HeadComment = "sums of squared weights (sampling weights): of the true and false cases, in each histogram bin,\nand [tp, fp] flagged at each cut of the curve, in its order"
		data.Content = append(data.Content, key, squaresNode(d.Squares))
	}
	doc.HeadComment = "sill decision file. The chosen cut flags a case when its score is " + format.CutSign(d.LowerIsRiskier) +
		" the chosen candidate's score;\nthe figures are the evidence it was chosen on. Read it with: sill review FILE"
	var buf bytes.Buffer
	enc := yaml.NewEncoder(&buf)
	enc.SetIndent(2)
	if err := enc.Encode(doc); err != nil {
		return nil, fmt.Errorf("encode: %w", err)
	}
	if err := enc.Close(); err != nil {
		return nil, fmt.Errorf("encode: %w", err)
	}
	return buf.Bytes(), nil
}

// chosenScore is the chosen candidate's score, repeated at the top for
// deployment configs that read one key.
func chosenScore(f *File) *yaml.Node {
	c, ok := f.ChosenCandidate()
	if !ok {
		return null()
	}
	n := num(c.Cut.Score)
	n.LineComment = "the chosen candidate's score: flag when score " + format.CutSign(f.Data.LowerIsRiskier) + " this"
	return n
}

func candidateNode(c Candidate, d Data) *yaml.Node {
	lowerIsRiskier := d.LowerIsRiskier
	e := c.Cut
	validation := mapping(
		"rows", num(float64(e.Rows)),
		"flagged", num(e.Flagged),
		"flagged_share", num(e.FlaggedShare),
		"tp", num(e.TP),
		"fp", num(e.FP),
		"fn", num(e.FN),
		"tn", num(e.TN),
		"recall", num(e.Recall),
		"recall_ci", flowList(e.RecallCI[:]...),
		"precision", num(e.Precision),
		"precision_ci", flowList(e.PrecisionCI[:]...),
		"false_discovery_rate", num(e.FalseDiscoveryRate),
		"false_discovery_ci", flowList(e.FalseDiscoveryCI[:]...),
		"false_positive_rate", num(e.FalsePositiveRate),
	)
	if d.WeightColumn != "" && d.WeightKind == design.Sampling {
		// The cases each interval counted as, which check's tests need:
		// with frequency weights they are the weighted counts above.
		t := e.Trials
		validation.Content = append(validation.Content, str("effective_trials"), mapping(
			"recall", num(t.Recall),
			"false_positive_rate", num(t.FalsePositiveRate),
			"precision", num(t.Precision),
			"flagged_share", num(t.FlaggedShare),
			"base_rate", num(t.BaseRate),
		))
	}
	score := num(e.Score)
	score.LineComment = "flag when score " + format.CutSign(lowerIsRiskier) + " this"
	n := mapping(
		"name", quoted(c.Name),
		"rule", optionalStr(c.Rule),
		"score", score,
		"rule_holds", ruleHolds(c.RuleCheck),
		"rule_picks", rulePicks(c.RuleCheck),
		"promise", optionalStr(c.Promise),
		"validation", validation,
		"projected", mapping(
			"alert_rate", num(e.Projected.AlertRate),
			"precision", num(e.Projected.Precision),
			"queue_per_shift", num(e.Projected.QueuePerShift),
			"cost_per_shift", num(e.Projected.CostPerShift),
			"cost_per_case", num(e.Projected.CostPerCase),
			"precision_ci", intervalNode(e.ProjectedCI.Precision),
			"alert_rate_ci", intervalNode(e.ProjectedCI.AlertRate),
			"queue_per_shift_ci", intervalNode(e.ProjectedCI.QueuePerShift),
			"cost_per_shift_ci", intervalNode(e.ProjectedCI.CostPerShift),
			"cost_per_case_ci", intervalNode(e.ProjectedCI.CostPerCase),
		),
		"cost_optimism", optimismNode(c.Optimism),
		"note", optionalStr(c.Note),
		"stability", stabilityNode(c.Stability),
		"segments", segmentsNode(c.Segments),
		"shifts", shiftsNode(c.Shifts),
	)
	// Say which figures are measured and which projected, in the words
	// every view uses.
	for i := 0; i < len(n.Content); i += 2 {
		switch n.Content[i].Value {
		case "validation":
			n.Content[i].LineComment = format.MeasuredHeading
		case "projected":
			n.Content[i].LineComment = format.ProjectedHeading + "; " + format.ProjectedGiven
		case "cost_optimism":
			if c.Optimism != nil {
				n.Content[i].LineComment = format.ProjectedHeading + ": the least-cost figure understates its own cost; corrected = projected + optimism"
			}
		}
	}
	return n
}

// optimismNode writes the least-cost figure's optimism, null without one.
func optimismNode(o *CostOptimism) *yaml.Node {
	if o == nil {
		return null()
	}
	return mapping(
		"per_case", num(o.PerCase),
		"per_shift", num(o.PerShift),
		"corrected_cost_per_case", num(o.CorrectedPerCase),
		"corrected_cost_per_shift", num(o.CorrectedPerShift),
		"folds", num(float64(o.Folds)),
		"seed", &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!int", Value: strconv.FormatUint(o.Seed, 10)},
		"method", quoted(o.Method),
	)
}

// intervalNode writes an interval as [low, high], or null when it is
// undefined.
func intervalNode(ci [2]float64) *yaml.Node {
	if !evidence.Defined(ci[0]) || !evidence.Defined(ci[1]) {
		return null()
	}
	return flowList(ci[:]...)
}

// ruleHolds is whether the rule picks the candidate's cut under the
// file's assumptions, null without a check.
func ruleHolds(k *RuleCheck) *yaml.Node {
	if k == nil {
		return null()
	}
	n := boolean(k.Holds)
	if k.Holds {
		n.LineComment = "the rule picks this cut under the assumptions above"
	} else {
		n.LineComment = "pinned under earlier assumptions: the rule picks another cut now"
	}
	return n
}

// rulePicks is the score the rule picks under the file's assumptions.
func rulePicks(k *RuleCheck) *yaml.Node {
	if k == nil {
		return null()
	}
	return num(k.Picks)
}

func scheduleNode(s *ShiftSchedule) *yaml.Node {
	if s == nil {
		return null()
	}
	starts := &yaml.Node{Kind: yaml.SequenceNode, Style: yaml.FlowStyle}
	for _, start := range s.Starts {
		starts.Content = append(starts.Content, quoted(start))
	}
	n := mapping("starts", starts, "zone", quoted(s.Zone), "time_column", optionalStr(s.TimeColumn))
	if s.TimeLayout != "" {
		n.Content = append(n.Content, str("time_layout"), quoted(s.TimeLayout))
	}
	return n
}

func calibrationNode(c *Calibration) *yaml.Node {
	if c == nil {
		return null()
	}
	bins := &yaml.Node{Kind: yaml.SequenceNode}
	for _, b := range c.Bins {
		bin := mapping("lower", num(b.Lower), "upper", num(b.Upper), "mean_score", num(b.MeanScore),
			"observed_rate", num(b.ObservedRate), "rows", num(float64(b.Rows)), "weight", num(b.Weight))
		bin.Style = yaml.FlowStyle
		bins.Content = append(bins.Content, bin)
	}
	cost := null()
	if t := c.CostThreshold; t != nil {
		cost = mapping("probability", num(t.Probability), "score", num(t.Score))
	}
	return mapping("binning", quoted(c.Binning), "ece", num(c.ECE), "ece_noise", num(c.ECENoise), "bins", bins, "cost_threshold", cost)
}

func stabilityNode(s *Stability) *yaml.Node {
	if s == nil {
		return null()
	}
	return mapping(
		"replicates", num(float64(s.Replicates)),
		"seed", &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!int", Value: strconv.FormatUint(s.Seed, 10)},
		"met", num(float64(s.Met)),
		"score", flowList(s.Score[:]...),
		"flagged_share", flowList(s.FlaggedShare[:]...),
		"recall", flowList(s.Recall[:]...),
		"skipped", optionalStr(s.Skipped),
		"recall_at_cut", pairOrNull(s.RecallAtCut),
		"false_discovery_rate_at_cut", pairOrNull(s.FalseDiscoveryRateAtCut),
	)
}

// pairOrNull is a flow list of the two values, or null when both are NaN.
func pairOrNull(v [2]float64) *yaml.Node {
	if math.IsNaN(v[0]) && math.IsNaN(v[1]) {
		return null()
	}
	return flowList(v[:]...)
}

func segmentsNode(s *Segments) *yaml.Node {
	if s == nil {
		return null()
	}
	groups := &yaml.Node{Kind: yaml.SequenceNode}
	for _, g := range s.Groups {
		group := mapping(
			"name", quoted(g.Name), "rows", num(float64(g.Rows)),
			"positives", num(g.Positives), "negatives", num(g.Negatives), "tp", num(g.TP), "fp", num(g.FP),
			"recall", num(g.Recall), "recall_ci", flowList(g.RecallCI[:]...),
			"precision", num(g.Precision), "precision_ci", flowList(g.PrecisionCI[:]...),
			"outlier", boolean(g.Outlier),
			"recall_gap", num(g.RecallGap), "recall_gap_ci", flowList(g.RecallGapCI[:]...), "recall_adjusted_p", num(g.RecallAdjustedP),
			"false_discovery_gap", num(g.FalseDiscoveryGap), "false_discovery_gap_ci", flowList(g.FalseDiscoveryGapCI[:]...),
			"false_discovery_adjusted_p", num(g.FalseDiscoveryAdjustedP))
		group.Style = yaml.FlowStyle
		groups.Content = append(groups.Content, group)
	}
	n := mapping("column", quoted(s.Column), "groups", groups)
	if s.LeftOut > 0 {
		n.Content = append(n.Content, str("left_out"), num(float64(s.LeftOut)))
	}
	if s.Tests > 0 {
		n.Content = append(n.Content, str("tests"), num(float64(s.Tests)))
	}
	return n
}

func shiftsNode(s *Shifts) *yaml.Node {
	if s == nil {
		return null()
	}
	busiest := null()
	if !s.Busiest.IsZero() {
		busiest = quoted(s.Busiest.Format(time.RFC3339))
	}
	return mapping("count", num(float64(s.Count)), "mean", num(s.Mean), "p90", num(s.P90), "max", num(s.Max),
		"busiest", busiest, "over_capacity", num(s.OverCapacity), "sample_p90", num(s.SampleP90), "model_spread", num(s.Spread),
		"basis", optionalStr(s.Basis))
}

func signOffsNode(list []SignOff) *yaml.Node {
	n := &yaml.Node{Kind: yaml.SequenceNode}
	if len(list) == 0 {
		n.Style = yaml.FlowStyle // sign_offs: []
	}
	for _, s := range list {
		item := mapping(
			"name", quoted(s.Name),
			"role", optionalStr(s.Role),
			"verdict", str(string(s.Verdict)),
			"note", optionalStr(s.Note),
			"at", quoted(s.At.UTC().Format(time.RFC3339)),
			"chosen", quoted(s.Chosen),
			"chosen_score", num(s.ChosenScore),
		)
		if s.Key != "" {
			item.Content = append(item.Content, str("key"), quoted(s.Key))
		}
		n.Content = append(n.Content, item)
	}
	return n
}

// curveNode writes the curve one [score, tp, fp] a line.
func curveNode(points []CurvePoint) *yaml.Node {
	n := &yaml.Node{Kind: yaml.SequenceNode}
	if len(points) == 0 {
		n.Style = yaml.FlowStyle
	}
	for _, p := range points {
		n.Content = append(n.Content, flowList(p.Score, p.TP, p.FP))
	}
	n.HeadComment = "[score, tp, fp] of the trade-off, strictest cut first, thinned to at most " + strconv.Itoa(MaxCurvePoints) + " cuts"
	return n
}

func mapping(pairs ...any) *yaml.Node {
	n := &yaml.Node{Kind: yaml.MappingNode}
	for i := 0; i < len(pairs); i += 2 {
		n.Content = append(n.Content, str(pairs[i].(string)), pairs[i+1].(*yaml.Node))
	}
	return n
}

func str(s string) *yaml.Node {
	return &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: s}
}

// quoted is a string that always reads back as a string, even when it
// looks like a number, a boolean or a date.
func quoted(s string) *yaml.Node {
	n := str(s)
	n.Style = yaml.DoubleQuotedStyle
	return n
}

func optionalStr(s string) *yaml.Node {
	if s == "" {
		return null()
	}
	return quoted(s)
}

func null() *yaml.Node { return &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!null", Value: "null"} }

func boolean(b bool) *yaml.Node {
	return &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!bool", Value: strconv.FormatBool(b)}
}

// num writes v, or null when v is NaN or infinite.
func num(v float64) *yaml.Node {
	if !evidence.Defined(v) {
		return null()
	}
	tag := "!!float"
	text := FormatNumber(v)
	if !strings.ContainsAny(text, ".e") {
		tag = "!!int"
	}
	return &yaml.Node{Kind: yaml.ScalarNode, Tag: tag, Value: text}
}

// given writes an assumption that is 0 when not given.
func given(v float64) *yaml.Node {
	if v == 0 {
		return null()
	}
	return num(v)
}

// rankingNode is the data's ranking figures, or null when not recorded.
func rankingNode(r *Ranking) *yaml.Node {
	if r == nil {
		return null()
	}
	return mapping(
		"roc_auc", num(r.ROCAUC),
		"roc_auc_ci", flowList(r.ROCAUCCI[:]...),
		"average_precision", num(r.AveragePrecision),
		"average_precision_ci", flowList(r.AveragePrecisionCI[:]...),
	)
}

func flowList(values ...float64) *yaml.Node {
	n := &yaml.Node{Kind: yaml.SequenceNode, Style: yaml.FlowStyle}
	for _, v := range values {
		n.Content = append(n.Content, num(v))
	}
	return n
}

// FormatNumber returns the shortest decimal text that reads back as v:
// plain digits when that is short (0.000125, 6000), otherwise an exponent
// with a decimal point in the mantissa (1.5e-09, 2.0e+21).
func FormatNumber(v float64) string {
	if v == 0 {
		return "0"
	}
	if abs := math.Abs(v); abs >= 1e-6 && abs < 1e15 {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	text := strconv.FormatFloat(v, 'e', -1, 64)
	mantissa, exponent, _ := strings.Cut(text, "e")
	if !strings.Contains(mantissa, ".") {
		mantissa += ".0"
	}
	return mantissa + "e" + exponent
}

// weightKind is the weight_kind of d: the kind's name with a weight
// column, null without one.
func weightKind(d Data) *yaml.Node {
	if d.WeightColumn == "" {
		return null()
	}
	return str(d.WeightKind.String())
}

// keysOf returns the keys of mapping n in order.
func keysOf(n *yaml.Node) []string {
	var keys []string
	for i := 0; i+1 < len(n.Content); i += 2 {
		keys = append(keys, n.Content[i].Value)
	}
	return keys
}

// squaresNode writes data.squared_weights, the curve one [tp, fp] a line.
func squaresNode(s *SquaredWeights) *yaml.Node {
	curve := &yaml.Node{Kind: yaml.SequenceNode}
	if len(s.Curve) == 0 {
		curve.Style = yaml.FlowStyle
	}
	for _, p := range s.Curve {
		curve.Content = append(curve.Content, flowList(p[0], p[1]))
	}
	return mapping(
		"positives", num(s.Positives),
		"negatives", num(s.Negatives),
		"score_histogram", flowList(s.Histogram...),
		"curve", curve,
	)
}
