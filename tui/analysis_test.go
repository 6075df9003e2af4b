package tui

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
)

// TestReportAndExplorerAgree: from the same set, assumptions and options
// (the demo with two models, yards, reading times and the three crew
// shifts), the report and the explorer's session show the same figures at
// every starting point: the cut, its counts, the projected figures'
// intervals, the segments, the shift queues, the net benefit, the cost threshold and the second model's cut;
// and again after the assumptions change in the form.
func TestReportAndExplorerAgree(t *testing.T) {
	set := twoModels(t)
	timed := demoTimedSet(t)
	set = withColumns(t, set, func(c *scores.Columns) { c.Times, c.TimeColumn = timed.Times(), timed.TimeColumn() })
	opts := analysis.Options{Shifts: threeShifts(t), Resampling: analysis.Resampling{Replicates: 40, Seed: 3}}
	m := loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions, Analysis: opts}, 100, 30)
	agree(t, m, opts)
	// A new base rate and volume in the form: both recompute alike.
	m = keys(m, "a", "ctrl+u")
	m = typeText(m, "0.02")
	m = keys(m, "tab", "ctrl+u")
	m = typeText(m, "4000")
	m = keys(m, "enter")
	if m.s.res.Assume.BaseRate != 0.02 || m.s.res.Assume.Volume != 4000 {
		t.Fatalf("the form gave %+v: %s", m.s.res.Assume, m.status)
	}
	m = resample(t, m)
	agree(t, m, opts)
}

// agree checks the explorer m against the report of the same set under
// m's assumptions.
func agree(t *testing.T, m Model, opts analysis.Options) {
	t.Helper()
	s := m.s
	// The report asks for the bootstrap in Run, with the explorer's band.
	opts.Resampling.BandCuts = bandCuts
	res, err := analysis.Run(context.Background(), s.set, s.assume, opts)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := report.WriteJSON(&buf, report.New(res, report.Options{}), nil); err != nil {
		t.Fatal(err)
	}
	var out struct {
		Cuts []struct {
			Spec, Reason string
			Met          bool
			Score        float64
			TP, FP       float64
			NetBenefit   float64 `json:"net_benefit"`
			Segments     []struct {
				Segment           string
				Recall, Precision float64
			}
			Shifts struct {
				Mean, P90, Max float64
			} `json:"queue_by_shift"`
			Stability struct {
				ScoreP05 float64 `json:"score_p05"`
				ScoreP95 float64 `json:"score_p95"`
			}
			Second struct {
				Met   bool
				Score float64
			} `json:"second_model"`
			Projected struct {
				PrecisionCI     [2]float64 `json:"precision_ci"`
				AlertRateCI     [2]float64 `json:"alert_rate_ci"`
				QueuePerShiftCI [2]float64 `json:"queue_per_shift_ci"`
				CostPerShiftCI  [2]float64 `json:"cost_per_shift_ci"`
			}
		}
		ROCAUCCI           [2]float64 `json:"roc_auc_ci"`
		AveragePrecisionCI [2]float64 `json:"average_precision_ci"`
		Calibration        struct {
			ECE           float64
			CostThreshold float64 `json:"cost_threshold"`
		}
	}
	if err := json.Unmarshal(buf.Bytes(), &out); err != nil {
		t.Fatal(err)
	}
	if len(out.Cuts) != len(s.starts) || len(out.Cuts) != 8 {
		t.Fatalf("report has %d cuts, the explorer %d starting points", len(out.Cuts), len(s.starts))
	}
	// The running tallies add and take away, the report sums afresh: equal within floatcmp.Tolerance.
	for i, c := range out.Cuts {
		o := s.starts[i]
		if c.Spec != o.Rule.String() || c.Met != o.Met {
			t.Errorf("cut %d: report %s met %v, explorer %s met %v", i, c.Spec, c.Met, o.Rule, o.Met)
			continue
		}
		if !o.Met {
			continue
		}
		if c.Score != o.Point.Score || c.TP != o.Point.TP || c.FP != o.Point.FP {
			t.Errorf("%s: report score %v TP %v FP %v, explorer %+v", c.Spec, c.Score, c.TP, c.FP, o.Point)
		}
		b, _ := s.breakdownAt(o.Point.Index)
		for k, g := range c.Segments {
			// The report orders by size; find the group by name.
			for _, e := range b.Segments {
				if e.Segment == g.Segment && (!floatcmp.Equal(e.Recall, g.Recall) || !floatcmp.Equal(e.Precision, g.Precision)) {
					t.Errorf("%s segment %d %s: report %v %v, explorer %v %v", c.Spec, k, g.Segment, g.Recall, g.Precision, e.Recall, e.Precision)
				}
			}
		}
		if len(c.Segments) != len(b.Segments) || len(b.Segments) == 0 {
			t.Errorf("%s: %d segments in the report, %d on screen", c.Spec, len(c.Segments), len(b.Segments))
		}
		p, _ := s.peaksAtCut(o.Point.Index)
		if !floatcmp.Equal(c.Shifts.P90, p.P90) || !floatcmp.Equal(c.Shifts.Max, p.Max) || !floatcmp.Equal(c.Shifts.Mean, p.Mean) {
			t.Errorf("%s: report queues %+v, explorer %+v", c.Spec, c.Shifts, p)
		}
		// The projected figures' intervals, as the figures pane reads them.
		iv := s.evidenceAt(o.Point.Index).ProjectedCI
		for _, pair := range [][2][2]float64{{c.Projected.PrecisionCI, iv.Precision}, {c.Projected.AlertRateCI, iv.AlertRate},
			{c.Projected.QueuePerShiftCI, iv.QueuePerShift}, {c.Projected.CostPerShiftCI, iv.CostPerShift}} {
			if !floatcmp.Equal(pair[0][0], pair[1][0]) || !floatcmp.Equal(pair[0][1], pair[1][1]) || pair[0][0] >= pair[0][1] {
				t.Errorf("%s: report's projected interval %v, explorer's %v", c.Spec, pair[0], pair[1])
			}
		}
		nb, _ := s.res.NetBenefitAt(o.Point)
		if !floatcmp.Equal(c.NetBenefit, nb) {
			t.Errorf("%s: report net benefit %v, explorer %v", c.Spec, c.NetBenefit, nb)
		}
		second := s.second().Outcomes[i]
		if c.Second.Met != second.Met || c.Second.Score != second.Point.Score {
			t.Errorf("%s: report's second model %+v, explorer's %+v", c.Spec, c.Second, second)
		}
		if s.stability != nil {
			if sp := s.stability.Spreads[i]; sp.Skipped == "" && (c.Stability.ScoreP05 != sp.Score[0] || c.Stability.ScoreP95 != sp.Score[1]) {
				t.Errorf("%s: report's resampled cuts %+v, explorer's %+v", c.Spec, c.Stability, sp)
			}
		}
	}
	if r := s.res.Ranking; out.ROCAUCCI != r.ROCAUC.Interval || out.AveragePrecisionCI != r.AveragePrecision {
		t.Errorf("report's ranking intervals %v %v, explorer's %v %v", out.ROCAUCCI, out.AveragePrecisionCI, r.ROCAUC.Interval, r.AveragePrecision)
	}
	cal := s.calibration()
	if check, ok := s.costCheck(); !ok || cal == nil || !floatcmp.Equal(out.Calibration.ECE, cal.Table.ECE) || !floatcmp.Equal(out.Calibration.CostThreshold, check.threshold) {
		t.Errorf("report calibration %+v, explorer's %+v, cost threshold %+v", out.Calibration, cal, check)
	}
	if strings.Contains(buf.String(), "NaN") {
		t.Errorf("the report holds NaN")
	}
}

// TestResamplingOff: with no resampled sets (--bootstrap 0) b says that
// resampling is off and starts nothing.
func TestResamplingOff(t *testing.T) {
	set := demoSet(t)
	m := loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions}, 100, 30)
	next, cmd := m.Update(keyMsg("b"))
	m = next.(Model)
	if cmd != nil || m.s.resampling.running || !strings.Contains(m.status, "resampling is off") {
		t.Errorf("b with no resampled sets: command %v, running %v, status %q", cmd != nil, m.s.resampling.running, m.status)
	}
}
