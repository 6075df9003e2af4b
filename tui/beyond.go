package tui

import (
	"strconv"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// beyond is the part of the session that looks past the averages: the
// breakdown by segment, the queues of the real shifts, how far the cuts
// move when the set is drawn again, whether the scores read as
// probabilities, and a second model of the same cases. The figures come
// from the session's analysis result; beyond caches the last ones asked
// for and holds the bootstrap run on demand.
type beyond struct {
	// segmentsAt caches the last breakdown by segment.
	segmentsAt struct {
		cut        int
		confidence float64
		res        *analysis.Result
		breakdown  segment.Breakdown
	}

	// peaksAt caches the last shift queues.
	peaksAt struct {
		cut      int
		capacity float64
		res      *analysis.Result
		peaks    shift.Peaks
	}

	// stability is the last bootstrap, under the assumptions it ran with;
	// nil before one has finished. resampling is the one running.
	stability  *bootstrap.Result
	resampling resampling
}

// use takes res as the session's figures.
func (s *session) use(res *analysis.Result) {
	s.res = res
	s.set, s.curve, s.starts = res.Set, res.Curve, res.Outcomes
}

// shifts returns the rows placed in shifts; nil without shifts.
func (s *session) shifts() *analysis.Shifts {
	if s.res == nil {
		return nil
	}
	return s.res.Shifts
}

// calibration returns the reliability table and what follows from it; nil
// when the scores are not probabilities.
func (s *session) calibration() *analysis.Calibration {
	if s.res == nil {
		return nil
	}
	return s.res.Calibration
}

// second returns the second model; nil without one.
func (s *session) second() *analysis.Second {
	if s.res == nil {
		return nil
	}
	return s.res.Second
}

// secondCurve returns the second model's curve; nil without one.
func (s *session) secondCurve() *curve.Curve {
	if second := s.second(); second != nil {
		return second.Curve
	}
	return nil
}

// hasSegments reports whether the set has a segment column.
func (s *session) hasSegments() bool { return s.set != nil && s.set.SegmentOf() != nil }

// breakdownAt returns the breakdown by segment at cut i, in the order of
// the set's segment names; ok is false without a segment column.
func (s *session) breakdownAt(i int) (segment.Breakdown, bool) {
	if !s.hasSegments() {
		return segment.Breakdown{}, false
	}
	c := &s.segmentsAt
	if c.res != s.res || c.cut != i || c.confidence != s.assume.Confidence {
		c.breakdown, _ = s.res.SegmentsAt(s.curve.At(i), s.assume.Confidence)
		c.cut, c.confidence, c.res = i, s.assume.Confidence, s.res
	}
	return c.breakdown, true
}

// peaksAtCut returns the queues of the real shifts at cut i; ok is false
// without shifts.
func (s *session) peaksAtCut(i int) (shift.Peaks, bool) {
	if s.shifts() == nil {
		return shift.Peaks{}, false
	}
	c := &s.peaksAt
	if c.res != s.res || c.cut != i || c.capacity != s.assume.Capacity {
		c.peaks, _ = s.res.PeaksAt(s.curve.At(i), s.assume.Capacity)
		c.cut, c.capacity, c.res = i, s.assume.Capacity, s.res
	}
	return c.peaks, true
}

// busiest names shift i of the period by its local start.
func (s *session) busiest(i int) string {
	if s.shifts() == nil || i < 0 {
		return "n/a"
	}
	return s.shifts().Assigned.Start(i).Format("Mon 02 Jan 15:04")
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

// secondAtWorkload returns the second model's point that flags as many
// rows as cut i of the first, or the nearest stricter one.
func (s *session) secondAtWorkload(i int) (curve.Point, bool) {
	other := s.secondCurve()
	if other == nil || other.Len() == 0 {
		return curve.Point{}, false
	}
	rows := s.curve.At(i).Rows
	j := other.CutOfRow(max(rows-1, 0))
	if p := other.At(j); p.Rows > rows && j > 0 {
		j--
	}
	return other.At(j), true
}

// ruleWords names a rule's cut in plain words, for sentences such as "the
// 80% hit-share point could land anywhere from …".
func ruleWords(r cutrule.Rule) string {
	switch r.Kind {
	case cutrule.Hit:
		return "the " + strconv.FormatFloat(100*r.Value, 'g', 4, 64) + "% hit-share point"
	case cutrule.Wrong:
		return "the " + strconv.FormatFloat(100*r.Value, 'g', 3, 64) + "% wrong-alert point"
	case cutrule.HitBound:
		return "the " + strconv.FormatFloat(100*r.Value, 'g', 4, 64) + "% hit-share point at " + format.Level(r.Confidence()) + " confidence"
	case cutrule.WrongBound:
		return "the " + strconv.FormatFloat(100*r.Value, 'g', 3, 64) + "% wrong-alert point at " + format.Level(r.Confidence()) + " confidence"
	case cutrule.Base:
		return "the base-rate point"
	case cutrule.Queue:
		return "the capacity point (" + format.Count(r.Value) + " a shift)"
	case cutrule.Queue90:
		return "the 9-shifts-in-10 point (" + format.Count(r.Value) + ")"
	case cutrule.Cost:
		return "the least-cost point"
	}
	return "the " + r.String() + " point"
}

// significant formats a percentile of scores, which interpolates between
// data scores, as the report does.
func significant(v float64) string { return format.Significant(v, 4) }
