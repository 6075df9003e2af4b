// Package report renders the figures of a validation set and its chosen
// cuts as text, JSON, Markdown or CSV.
package report

import (
	"math"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

// Report is everything a report shows but the full curve, which is
// streamed (see WriteJSON). Its JSON form is a contract that scripts read:
// keys keep their names and meanings, and new keys may be added.
type Report struct {
	Source      string  `json:"source"`
	Rows        int     `json:"rows"`
	DroppedRows int     `json:"dropped_rows"`
	Positives   float64 `json:"positives"`
	Negatives   float64 `json:"negatives"`
	BaseRate    number  `json:"base_rate"`
	Weighted    bool    `json:"weighted"`
	// WeightKind is what the weights are, "frequency" or "sampling"
	// (package design); null without weights.
	WeightKind       *string `json:"weight_kind"`
	LowerIsRiskier   bool    `json:"lower_is_riskier"`
	ROCAUC           number  `json:"roc_auc"`
	AveragePrecision number  `json:"average_precision"`
	// ROCAUCCI is DeLong's normal interval of the AUC at the assumptions'
	// confidence, clipped to [0,1], with its standard error;
	// AveragePrecisionCI the logit interval over the true cases (see
	// analysis.Ranking). Null when undefined.
	ROCAUCCI           *interval   `json:"roc_auc_ci"`
	ROCAUCStdError     number      `json:"roc_auc_std_error"`
	AveragePrecisionCI *interval   `json:"average_precision_ci"`
	Brier              number      `json:"brier"`
	LogLoss            number      `json:"log_loss"`
	Assumptions        assumptions `json:"assumptions"`
	Cuts               []cut       `json:"cuts"`
	Warnings           []string    `json:"warnings"`
	Caution            string      `json:"caution"`

	// DroppedNoScore counts by label the dropped rows whose score was
	// missing where the input gives their labels (a counts table's rows
	// with no score, as sill sql counts NULL and non-numeric scores); nil
	// otherwise. The rows are among DroppedRows.
	DroppedNoScore *droppedNoScore `json:"dropped_no_score,omitempty"`

	// Added by the Add methods in beyond.go.
	Calibration   *calibrationFigures `json:"calibration,omitempty"`
	ShiftSchedule *shiftSchedule      `json:"shift_schedule,omitempty"`
	Bootstrap     *bootstrapFigures   `json:"bootstrap,omitempty"`
	Comparison    *comparison         `json:"comparison,omitempty"`

	// baseRateGiven reports whether the production base rate differs from
	// the validation one, for the text forms.
	baseRateGiven bool
	// baseRateUndefined reports a set with no weighted case (every row
	// weighs 0) and no base rate given: the 0 the caller puts in place of
	// the undefined rate is no production base rate.
	baseRateUndefined bool
	// weights names the weights in words for the text forms ("frequency
	// weights", or sampling weights and whether they are constant within
	// each class); "" without weights.
	weights      string
	cutsEvidence []evidence.Cut
	sections     []section // added by the add methods in beyond.go
	hints        Hints
	beyond       beyondState
}

type assumptions struct {
	BaseRate       number `json:"base_rate"`
	Volume         number `json:"volume_per_shift"`
	CostFalseAlert number `json:"cost_false_alert"`
	CostMiss       number `json:"cost_miss"`
	CostHit        number `json:"cost_hit"`
	Capacity       number `json:"capacity"`
	Confidence     number `json:"confidence"`
	// IntervalsTakeAsGiven names the keys above that the intervals of
	// projected figures take as given (format.ProjectedGiven): they carry
	// the validation set's sampling error only, not any error in these.
	IntervalsTakeAsGiven []string `json:"intervals_take_as_given"`
}

// takenAsGiven are the assumptions' keys the projected intervals take as
// given: production's base rate, volume and costs.
var takenAsGiven = []string{"base_rate", "volume_per_shift", "cost_false_alert", "cost_miss", "cost_hit"}

type cut struct {
	Spec         string  `json:"spec"`
	Basis        string  `json:"basis"`             // the figure the rule picks on, measured or projected (cutrule.Rule.Basis)
	Promise      string  `json:"promise,omitempty"` // what the rule's cut promises about production (cutrule.Rule.Promise); hit=, wrong=, hitNN=, wrongNN=
	Met          bool    `json:"met"`
	Reason       *string `json:"reason"`
	Score        number  `json:"score"`
	Flagged      float64 `json:"flagged"`
	FlaggedShare float64 `json:"flagged_share"`
	// FlaggedShareCI is the interval of the flagged share at the
	// assumptions' confidence (evidence.Cut.FlaggedShareCI); null when
	// unmet.
	FlaggedShareCI     *interval `json:"flagged_share_ci"`
	TP                 float64   `json:"tp"`
	FP                 float64   `json:"fp"`
	FN                 float64   `json:"fn"`
	TN                 float64   `json:"tn"`
	Recall             number    `json:"recall"`
	RecallCI           *interval `json:"recall_ci"`
	Precision          number    `json:"precision"`
	PrecisionCI        *interval `json:"precision_ci"`
	FalseDiscoveryRate number    `json:"false_discovery_rate"`
	FalsePositiveRate  number    `json:"false_positive_rate"`
	Projected          projected `json:"projected"`

	Segments     []segmentFigures `json:"segments,omitempty"`      // with a segment column; see beyond.go
	SegmentTests *segmentTests    `json:"segment_tests,omitempty"` // how the groups were tested
	NetBenefit   *number          `json:"net_benefit"`             // null unless the scores are probabilities
	Shifts       *shiftFigures    `json:"queue_by_shift,omitempty"`
	Stability    *stability       `json:"stability,omitempty"`
	Second       *secondModelCut  `json:"second_model,omitempty"`

	optimism string // the cost rule's optimism line (addCostOptimism)
}

type projected struct {
	AlertRate     number `json:"alert_rate"`
	Precision     number `json:"precision"`
	QueuePerShift number `json:"queue_per_shift"`
	CostPerShift  number `json:"cost_per_shift"`

	// Intervals at the confidence of the assumptions, production's base
	// rate and volume taken as given (projection.IntervalsOf); null where
	// the figure is undefined or not projected.
	PrecisionCI     *interval `json:"precision_ci"`
	AlertRateCI     *interval `json:"alert_rate_ci"`
	QueuePerShiftCI *interval `json:"queue_per_shift_ci"`
	CostPerShiftCI  *interval `json:"cost_per_shift_ci"`

	// On the cost rule's cut: how much more it costs out of sample than
	// on the validation set it was chosen on (analysis.CostOptimism), per
	// shift with a volume, else per case.
	CostOptimismPerShift *number `json:"cost_optimism_per_shift,omitempty"`
	CostOptimismPerCase  *number `json:"cost_optimism_per_case,omitempty"`

	// With case times (addShiftPeaks in beyond.go).
	QueuePerShiftP90 *number `json:"queue_per_shift_p90,omitempty"`
	QueuePerShiftMax *number `json:"queue_per_shift_max,omitempty"`
}

type point struct {
	Score             float64 `json:"score"`
	Flagged           float64 `json:"flagged"`
	TP                float64 `json:"tp"`
	FP                float64 `json:"fp"`
	FN                float64 `json:"fn"`
	TN                float64 `json:"tn"`
	Recall            number  `json:"recall"`
	Precision         number  `json:"precision"`
	FalsePositiveRate number  `json:"false_positive_rate"`
}

// droppedNoScore is the JSON form of scores.LabelCounts.
type droppedNoScore struct {
	Rows      int `json:"rows"`
	Positives int `json:"positives"`
	Negatives int `json:"negatives"`
	Neither   int `json:"neither"`
}

// BandCuts is how many cuts carry the bootstrap's band in JSON.
const BandCuts = 50

// Options are the report's own choices of how to show the figures.
type Options struct {
	// SegmentOrder orders the groups under each cut.
	SegmentOrder segment.Order
	// SegmentsShown is how many groups the text forms show under each
	// cut; 0 shows all. JSON lists all.
	SegmentsShown int
	// Hints say how the reader changes what the report shows.
	Hints Hints
}

// Hints name, in the caller's words, how a reader changes what a report
// shows: the command line gives its flags, a screen its own keys or
// fields. An empty hint is left out of the text.
type Hints struct {
	AllSegments    string // shows every segment under each cut, e.g. "--segments-shown 0 shows all"
	Resampling     string // asks for the bootstrap, e.g. "with --bootstrap"
	Volume         string // gives production's volume, e.g. "give --volume"
	LowerIsRiskier string // says that lower scores are riskier, e.g. "--lower-is-riskier"
}

// New gathers the report of res (package analysis): the summary, the
// figures of each cut and what res holds beyond them. It computes
// nothing of its own.
func New(res *analysis.Result, opt Options) *Report {
	r := newReport(res.Set, res.Summary, res.Warnings, res.Assume, res.Outcomes, opt.Hints)
	r.ROCAUCCI = newInterval(res.Ranking.ROCAUC.Interval)
	r.ROCAUCStdError = number(res.Ranking.ROCAUC.StdError)
	r.AveragePrecisionCI = newInterval(res.Ranking.AveragePrecision)
	r.addSegments(res, opt.SegmentOrder, opt.SegmentsShown)
	r.addCalibration(res)
	r.addCostOptimism(res)
	r.addShiftPeaks(res)
	if res.Stability != nil {
		r.addStability(res)
	}
	r.addComparison(res)
	return r
}

// newReport gathers a report of set, whose summary is sum and warnings
// warnings, under a, with one outcome per requested cut.
func newReport(set *scores.Set, sum curve.Summary, warnings []analysis.Warning, a projection.Assumptions, outcomes []cutrule.Outcome, hints Hints) *Report {
	r := &Report{
		Source:           set.Source(),
		Rows:             sum.Rows,
		DroppedRows:      set.Dropped(),
		Positives:        sum.Positives,
		Negatives:        sum.Negatives,
		BaseRate:         number(sum.BaseRate),
		Weighted:         sum.Weighted,
		LowerIsRiskier:   set.LowerIsRiskier(),
		ROCAUC:           number(sum.ROCAUC),
		AveragePrecision: number(sum.AveragePrecision),
		Brier:            number(sum.Brier),
		LogLoss:          number(sum.LogLoss),
		Assumptions: assumptions{
			BaseRate:             number(a.BaseRate),
			Volume:               given(a.Volume),
			Capacity:             given(a.Capacity),
			CostFalseAlert:       null,
			CostMiss:             null,
			CostHit:              null,
			Confidence:           number(a.Confidence),
			IntervalsTakeAsGiven: takenAsGiven,
		},
		Warnings:      analysis.WarningWords(warnings, hints.LowerIsRiskier),
		hints:         hints,
		Caution:       evidence.Caution,
		baseRateGiven: a.BaseRate != sum.BaseRate,
	}
	if math.IsNaN(sum.BaseRate) && a.BaseRate == 0 {
		r.baseRateGiven, r.baseRateUndefined = false, true
		r.Assumptions.BaseRate = null
	}
	if sum.Weighted {
		kind := design.Frequency.String()
		if a.Sample.Sampling() {
			kind = design.Sampling.String()
		}
		r.WeightKind, r.weights = &kind, a.Sample.String()
	}
	if c := a.Costs; c != nil {
		r.Assumptions.CostFalseAlert = number(c.FalseAlert)
		r.Assumptions.CostMiss = number(c.Miss)
		r.Assumptions.CostHit = number(c.Hit)
	}
	for _, o := range outcomes {
		c := newCut(o, a)
		c.Basis = o.Rule.Basis(r.baseRateGiven)
		c.Promise = o.Rule.Promise()
		r.Cuts = append(r.Cuts, c)
		if o.Met {
			r.cutsEvidence = append(r.cutsEvidence, evidence.Of(o.Point, a))
		} else {
			r.cutsEvidence = append(r.cutsEvidence, evidence.Cut{})
		}
	}
	if c := set.NoScore(); c != nil {
		r.DroppedNoScore = &droppedNoScore{Rows: c.Total(), Positives: c.Positives, Negatives: c.Negatives, Neither: c.Neither}
	}
	return r
}

func newCut(o cutrule.Outcome, a projection.Assumptions) cut {
	c := cut{Spec: o.Rule.String(), Met: o.Met}
	if !o.Met {
		reason := o.Reason
		c.Reason = &reason
		c.Score, c.Recall, c.Precision, c.FalseDiscoveryRate, c.FalsePositiveRate = null, null, null, null, null
		c.Projected = projected{AlertRate: null, Precision: null, QueuePerShift: null, CostPerShift: null}
		return c
	}
	e := evidence.Of(o.Point, a)
	c.Score = number(e.Score)
	c.Flagged, c.FlaggedShare, c.FlaggedShareCI = e.Flagged, e.FlaggedShare, newInterval(e.FlaggedShareCI)
	c.TP, c.FP, c.FN, c.TN = e.TP, e.FP, e.FN, e.TN
	c.Recall, c.RecallCI = number(e.Recall), newInterval(e.RecallCI)
	c.Precision, c.PrecisionCI = number(e.Precision), newInterval(e.PrecisionCI)
	c.FalseDiscoveryRate = number(e.FalseDiscoveryRate)
	c.FalsePositiveRate = number(e.FalsePositiveRate)
	c.Projected = projected{
		AlertRate:     number(e.Projected.AlertRate),
		Precision:     number(e.Projected.Precision),
		QueuePerShift: number(e.Projected.QueuePerShift),
		CostPerShift:  number(e.Projected.CostPerShift),

		PrecisionCI:     newInterval(e.ProjectedCI.Precision),
		AlertRateCI:     newInterval(e.ProjectedCI.AlertRate),
		QueuePerShiftCI: newInterval(e.ProjectedCI.QueuePerShift),
		CostPerShiftCI:  newInterval(e.ProjectedCI.CostPerShift),
	}
	return c
}

func newPoint(p curve.Point) point {
	return point{
		Score: p.Score, Flagged: p.Flagged(), TP: p.TP, FP: p.FP, FN: p.FN, TN: p.TN,
		Recall: number(p.Recall()), Precision: number(p.Precision()), FalsePositiveRate: number(p.FalsePositiveRate()),
	}
}

// number is a float that reads as JSON null when it is NaN or infinite.
type number float64

var null = number(math.NaN())

func (n number) MarshalJSON() ([]byte, error) {
	if !evidence.Defined(float64(n)) {
		return []byte("null"), nil
	}
	return formatJSONFloat(float64(n)), nil
}

// given returns v, or null when v is 0 (an assumption not given).
func given(v float64) number {
	if v == 0 {
		return null
	}
	return number(v)
}

type interval [2]number

func newInterval(ci [2]float64) *interval {
	if !evidence.Defined(ci[0]) || !evidence.Defined(ci[1]) {
		return nil
	}
	return &interval{number(ci[0]), number(ci[1])}
}

// addCostOptimism puts the optimism estimate of the least-cost figure
// (analysis.CostOptimism) beside the cost rule's cut.
func (r *Report) addCostOptimism(res *analysis.Result) {
	if math.IsNaN(res.CostOptimism) {
		return
	}
	for i, o := range res.Outcomes {
		if !o.Met || o.Rule.Kind != cutrule.Cost || i >= len(r.Cuts) {
			continue
		}
		c, e := &r.Cuts[i], r.cutsEvidence[i]
		figure, base, per := res.CostOptimism, e.Projected.CostPerCase, "case"
		if v := res.Assume.Volume; v > 0 {
			figure, base, per = v*figure, e.Projected.CostPerShift, "shift"
			n := number(figure)
			c.Projected.CostOptimismPerShift = &n
		} else {
			n := number(figure)
			c.Projected.CostOptimismPerCase = &n
		}
		c.optimism = "cost per " + per + " " + format.Money(base) + ", about " + format.Money(figure) +
			" more out of sample (optimism estimate, " + analysis.OptimismMethod() + ")"
	}
}
