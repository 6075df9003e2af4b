package tui

import (
	"fmt"
	"math"
	"strconv"

	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/modelpair"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// beyond is the part of the session that looks past the averages: the
// breakdown by segment, the queues of the real shifts, how far the cuts
// move when the set is drawn again, whether the scores read as
// probabilities, and a second model of the same cases. Each part is nil or
// empty when the data does not allow it.
type beyond struct {
	extras // computed once the set is loaded

	// segmentsAt caches the last breakdown by segment.
	segmentsAt struct {
		cut        int
		confidence float64
		ok         bool
		breakdown  segment.Breakdown
	}

	// peaks follows the shift queues as the cursor moves; peaksAt caches
	// the last.
	peaks   *shift.Running
	peaksAt struct {
		cut      int
		capacity float64
		ok       bool
		peaks    shift.Peaks
	}

	// stability is the last bootstrap, under the assumptions it ran with;
	// nil before one has finished. resampling is the one running.
	stability  *bootstrap.Result
	resampling resampling
}

// extras is what loading computes for beyond, once.
type extras struct {
	// segments follows the breakdown by group as the cursor moves; nil
	// without a segment column.
	segments *segment.Running

	// assigned places every ranked row in a shift of the validation
	// period; nil without case times and a shift schedule. scale turns a
	// flagged case into alerts of a production shift under the
	// assumptions.
	assigned *shift.Assignment
	scale    shift.Scale

	// reliability is the reliability table; nil when the scores are not
	// probabilities.
	reliability *calibration.Table

	// second is the second model's own ranked set with its curve and
	// starting points; nil without a second score column. pair is DeLong's
	// paired test of the two, pairErr why it has no figures.
	second         *scores.Set
	secondCurve    *curve.Curve
	secondAssigned *shift.Assignment
	secondStarts   []cutrule.Outcome
	pair           modelpair.Test
	pairErr        error
}

// loadExtras computes the figures beyond the averages that a loaded set
// allows: segments with a segment column, shifts with case times and a
// schedule, the reliability table for probabilities, and a second model's
// ranking with a second score column.
func loadExtras(cfg Config, set *scores.Set, c *curve.Curve, a projection.Assumptions) (extras, error) {
	var x extras
	if set.SegmentOf != nil {
		x.segments = segment.NewRunning(set)
	}
	if cfg.Shifts != nil && set.Times != nil {
		assigned, err := shift.Assign(set, *cfg.Shifts)
		if err != nil {
			return x, fmt.Errorf("%s: shifts: %w", set.Source, err)
		}
		x.assigned = &assigned
		x.scale = shift.ScaleFor(set, assigned, a)
	}
	if calibration.Probabilities(set) {
		bins := cfg.CalibrationBins
		if bins == 0 {
			bins = 10
		}
		table, err := calibration.Reliability(set, bins, cfg.CalibrationBinning)
		if err != nil {
			return x, fmt.Errorf("calibration: %w", err)
		}
		x.reliability = &table
	}
	if set.CompareScores != nil {
		second, err := modelpair.Second(set)
		if err != nil {
			return x, err
		}
		x.second, x.secondCurve = second, curve.New(second)
		x.pair, x.pairErr = modelpair.Compare(set)
		if x.assigned != nil {
			assigned, err := shift.Assign(second, *cfg.Shifts)
			if err != nil {
				return x, fmt.Errorf("%s: shifts of the second model: %w", set.Source, err)
			}
			x.secondAssigned = &assigned
		}
		starts, _, err := findStarts(x.secondCurve, a, x.secondAssigned)
		if err != nil {
			return x, err
		}
		x.secondStarts = starts
	}
	return x, nil
}

// apply puts the loaded extras into the session.
func (b *beyond) apply(set *scores.Set, x extras) {
	b.extras = x
	b.segmentsAt.ok = false
	b.peaks, b.peaksAt.ok = nil, false
	if x.assigned != nil {
		b.peaks = shift.NewRunning(set, *x.assigned, x.scale)
	}
	b.stability = nil
}

// findStarts finds the starting points on c under a: cutrule.Defaults and,
// with shifts and a capacity, queue90 at the capacity. It returns the
// scale of the shift queues under a as well.
func findStarts(c *curve.Curve, a projection.Assumptions, assigned *shift.Assignment) ([]cutrule.Outcome, shift.Scale, error) {
	rules := cutrule.Defaults(a)
	scale := shift.Scale{Positive: 1, Negative: 1}
	var opts []cutrule.Option
	if assigned != nil {
		scale = shift.ScaleFor(c.Set, *assigned, a)
		opts = append(opts, cutrule.WithShifts(*assigned, scale))
		if a.Capacity > 0 {
			rules = append(rules, cutrule.Rule{Kind: cutrule.Queue90, Value: a.Capacity})
		}
	}
	f, err := cutrule.NewFinder(rules, c.Set, a, opts...)
	if err != nil {
		return nil, scale, err
	}
	c.Points(f.Visit)
	return f.Outcomes(), scale, nil
}

// breakdownAt returns the breakdown by segment at cut i, in the order of
// the set's segment names; ok is false without a segment column.
func (s *session) breakdownAt(i int) (segment.Breakdown, bool) {
	if s.segments == nil {
		return segment.Breakdown{}, false
	}
	c := &s.segmentsAt
	if !c.ok || c.cut != i || c.confidence != s.assume.Confidence {
		c.breakdown = s.segments.At(s.curve.At(i), s.assume.Confidence)
		c.cut, c.confidence, c.ok = i, s.assume.Confidence, true
	}
	return c.breakdown, true
}

// peaksAtCut returns the queues of the real shifts at cut i; ok is false
// without shifts.
func (s *session) peaksAtCut(i int) (shift.Peaks, bool) {
	if s.peaks == nil {
		return shift.Peaks{}, false
	}
	c := &s.peaksAt
	if !c.ok || c.cut != i || c.capacity != s.assume.Capacity {
		c.peaks = s.peaks.At(s.curve.At(i).Rows, s.assume.Capacity)
		c.cut, c.capacity, c.ok = i, s.assume.Capacity, true
	}
	return c.peaks, true
}

// setScale takes the shift queues' scale under new assumptions and peaks,
// the queues at that scale (made when the scale changed).
func (s *session) setScale(scale shift.Scale, peaks *shift.Running) {
	if s.assigned == nil || scale == s.scale || peaks == nil {
		return
	}
	s.scale, s.peaks = scale, peaks
	s.peaksAt.ok = false
}

// busiest names shift i of the period by its local start.
func (s *session) busiest(i int) string {
	if s.assigned == nil || i < 0 {
		return "n/a"
	}
	return s.assigned.Start(i).Format("Mon 02 Jan 15:04")
}

// spreadAt returns the bootstrap spread of the first starting point that
// picks cut i, if the bootstrap has run; a rule it did not resample
// (queue90) comes with Skipped set, and only when no other rule there was
// resampled.
func (s *session) spreadAt(i int) (bootstrap.Spread, bool) {
	if s.stability == nil {
		return bootstrap.Spread{}, false
	}
	var skipped *bootstrap.Spread
	for k, o := range s.starts {
		if !o.Met || o.Point.Index != i || k >= len(s.stability.Spreads) {
			continue
		}
		sp := s.stability.Spreads[k]
		switch {
		case sp.Rule != o.Rule:
		case sp.Skipped != "" && skipped == nil:
			skipped = &sp
		case sp.Skipped == "" && sp.Met > 0:
			return sp, true
		}
	}
	if skipped != nil {
		return *skipped, true
	}
	return bootstrap.Spread{}, false
}

// costSpread returns the bootstrap spread of the least-cost rule.
func (s *session) costSpread() (bootstrap.Spread, bool) {
	if s.stability == nil {
		return bootstrap.Spread{}, false
	}
	for _, sp := range s.stability.Spreads {
		if sp.Rule.Kind == cutrule.Cost && sp.Met > 0 {
			return sp, true
		}
	}
	return bootstrap.Spread{}, false
}

// secondAtWorkload returns the second model's point that flags as many
// rows as cut i of the first, or the nearest stricter one.
func (s *session) secondAtWorkload(i int) (curve.Point, bool) {
	if s.secondCurve == nil || s.secondCurve.Len() == 0 {
		return curve.Point{}, false
	}
	rows := s.curve.At(i).Rows
	j := s.secondCurve.CutOfRow(max(rows-1, 0))
	if p := s.secondCurve.At(j); p.Rows > rows && j > 0 {
		j--
	}
	return s.secondCurve.At(j), true
}

// ruleWords names a rule's cut in plain words, for sentences such as "the
// 80% hit-share point could land anywhere from …".
func ruleWords(r cutrule.Rule) string {
	switch r.Kind {
	case cutrule.Hit:
		return "the " + strconv.FormatFloat(100*r.Value, 'g', 4, 64) + "% hit-share point"
	case cutrule.Wrong:
		return "the " + strconv.FormatFloat(100*r.Value, 'g', 3, 64) + "% wrong-alert point"
	case cutrule.Base:
		return "the base-rate point"
	case cutrule.Queue:
		return "the capacity point (" + report.Count(r.Value) + " a shift)"
	case cutrule.Queue90:
		return "the 9-shifts-in-10 point (" + report.Count(r.Value) + ")"
	case cutrule.Cost:
		return "the least-cost point"
	}
	return "the " + r.String() + " point"
}

// significant formats a percentile of scores, which interpolates between
// data scores, with three significant digits (whole numbers from 1000).
func significant(v float64) string {
	switch {
	case math.IsNaN(v):
		return "n/a"
	case math.Abs(v) >= 1000:
		return strconv.FormatFloat(v, 'f', 0, 64)
	}
	return strconv.FormatFloat(v, 'g', 3, 64)
}
