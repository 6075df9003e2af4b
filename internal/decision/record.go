package decision

import (
	"math"
	"time"
)

// Model names the model whose scores the cut was chosen on (key model).
// Either field may be "" (written as null) when not given.
type Model struct {
	Name    string // key name, such as "bearing-wear"
	Version string // key version, such as "2026-11" or "v14"
}

// MaxCurvePoints is the most points Curve keeps.
const MaxCurvePoints = 512

// CurvePoint is one cut of the stored trade-off, written as the flow list
// [score, tp, fp]: the cut's score and the weighted true and false cases
// it flags. With Data.Positives and Data.Negatives it gives every figure
// of the cut: fn = positives - tp, tn = negatives - fp.
type CurvePoint struct {
	Score  float64
	TP, FP float64
}

// Recall returns the share of true cases flagged at p among positives, or
// NaN when positives is not above 0.
func (p CurvePoint) Recall(positives float64) float64 { return share(p.TP, positives) }

// FalsePositiveRate returns the share of false cases flagged at p among
// negatives, or NaN when negatives is not above 0.
func (p CurvePoint) FalsePositiveRate(negatives float64) float64 { return share(p.FP, negatives) }

// FlaggedShare returns the share of all cases flagged at p, or NaN when
// the set weighs nothing.
func (p CurvePoint) FlaggedShare(positives, negatives float64) float64 {
	return share(p.TP+p.FP, positives+negatives)
}

// FalseDiscoveryRate returns the share of flagged cases that are false,
// or NaN when nothing of weight is flagged.
func (p CurvePoint) FalseDiscoveryRate() float64 { return share(p.FP, p.TP+p.FP) }

func share(num, den float64) float64 {
	if !(den > 0) {
		return math.NaN()
	}
	return num / den
}

// ShiftSchedule is the crew shift schedule (key shift_schedule).
type ShiftSchedule struct {
	Starts []string // key starts: local start times "HH:MM", ascending
	Zone   string   // key zone: the IANA time zone, such as "UTC"
	// TimeColumn is the data column the case times came from (key
	// time_column).
	TimeColumn string
	// TimeLayout is the layout the case times were read with, in the
	// form of Go's package time (key time_layout, absent when the times
	// were in a form read without one), so that the data can be read
	// again as it was.
	TimeLayout string
}

// Calibration is the reliability table of scores that are probabilities
// (key calibration).
type Calibration struct {
	Binning string  // key binning: "width" or "quantile"
	ECE     float64 // key ece: expected calibration error; NaN written as null
	// ECENoise is the ECE that 9 in 10 sets of perfectly calibrated
	// scores of this size stay at or below (key ece_noise, optional; NaN
	// when absent).
	ECENoise float64
	Bins     []CalibrationBin
	// CostThreshold is the threshold implied by the costs (key
	// cost_threshold); nil without costs.
	CostThreshold *CostThreshold
}

// CalibrationBin is one row of the reliability table: the cases whose
// score lies in (Lower, Upper], the first bin taking its Lower too.
type CalibrationBin struct {
	Lower, Upper float64 // keys lower, upper
	MeanScore    float64 // key mean_score; NaN (null) in a bin of no weight
	ObservedRate float64 // key observed_rate; NaN (null) in a bin of no weight
	Rows         int     // key rows: rows in the bin (cases of a counts table)
	Weight       float64 // key weight: their summed weight
}

// CostThreshold is the probability above which flagging a case costs less
// than leaving it, at production's base rate, and the same threshold on
// the validation scores' scale.
type CostThreshold struct {
	Probability float64 // key probability
	Score       float64 // key score; NaN (null) when undefined
}

// Stability is where a candidate's rule lands across bootstrap replicates
// (key stability): the low and high percentiles over the replicates in
// which the rule was met.
type Stability struct {
	Replicates   int        // key replicates
	Seed         uint64     // key seed
	Met          int        // key met: replicates in which the rule was met
	Score        [2]float64 // key score; nulls when never met
	FlaggedShare [2]float64 // key flagged_share
	Recall       [2]float64 // key recall
	Skipped      string     // key skipped: why the rule was not resampled; "" (null) when it was
	// RecallAtCut and FalseDiscoveryRateAtCut are the Low and High
	// percentiles of the hit share and the wrong-alert share at the
	// candidate's own cut (held fixed) across the replicates: the
	// redraws at this cut, where Recall above is where the rule lands
	// (keys recall_at_cut and false_discovery_rate_at_cut; absent in
	// files written before them, and null where the run could not say,
	// both read as NaN).
	RecallAtCut             [2]float64
	FalseDiscoveryRateAtCut [2]float64
}

// Segments is a candidate's breakdown by group (key segments).
type Segments struct {
	Column string         // key column: the data's segment column
	Groups []SegmentGroup // key groups: in the order of the data's groups
	// LeftOut counts the groups beyond MaxSegmentGroups not kept (key
	// left_out; absent when 0).
	LeftOut int
	// Tests is how many group-against-rest tests Holm's adjustment
	// covered, over every group including those left out (key tests;
	// absent in files written before the groups were tested, read as 0).
	Tests int
}

// SegmentGroup is one group's figures at a candidate's cut.
type SegmentGroup struct {
	Name        string     // key name
	Rows        int        // key rows: rows in the group (cases of a counts table)
	Positives   float64    // key positives: weighted true cases in the group
	Negatives   float64    // key negatives
	TP, FP      float64    // keys tp, fp: flagged true and false cases
	Recall      float64    // key recall; NaN (null) without true cases
	RecallCI    [2]float64 // key recall_ci
	Precision   float64    // key precision; NaN (null) when nothing is flagged
	PrecisionCI [2]float64 // key precision_ci
	// Outlier is set when the group differs from the rest of the set in
	// recall or wrong-alert share: an adjusted p-value below 1 -
	// confidence (key outlier). Files written before the groups were
	// tested set it when the group's recall or precision interval lay
	// clear of the whole set's.
	Outlier bool
	// The group against the rest of the set (package segment): the gap
	// of recall (keys recall_gap, recall_gap_ci, recall_adjusted_p) and
	// of wrong-alert share (keys false_discovery_gap,
	// false_discovery_gap_ci, false_discovery_adjusted_p), each a
	// difference in [-1,1] with Newcombe's interval and Holm's adjusted
	// p-value. Optional: NaN (null) when undefined or absent (files
	// written before the groups were tested).
	RecallGap, FalseDiscoveryGap             float64
	RecallGapCI, FalseDiscoveryGapCI         [2]float64
	RecallAdjustedP, FalseDiscoveryAdjustedP float64
}

// Shifts are a candidate's queues in the real shifts of the validation
// period, scaled to production's volume (key shifts).
type Shifts struct {
	Count int     // key count: shifts in the period
	Mean  float64 // key mean: mean alerts per shift
	// P90 is the shift-peak model's (package shift): 9 production shifts
	// in 10 have at most this many alerts (key p90).
	P90 float64
	Max float64 // key max: the sample's busiest real shift's alerts
	// SampleP90 is the sample's own scaled 90th percentile (key
	// sample_p90, optional; NaN when absent), Spread the relative spread
	// between shifts the model took (key model_spread, optional; NaN when
	// absent) and Basis what the p90 rests on, in words (key basis,
	// optional).
	SampleP90, Spread float64
	Basis             string
	// Busiest is the busiest shift's local start time (key busiest);
	// zero when there were no shifts.
	Busiest time.Time
	// OverCapacity is the share of shifts over the capacity (key
	// over_capacity); NaN (null) without a capacity.
	OverCapacity float64
}
