package analysis_test

import (
	"cmp"
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

// same reports whether a and b print the same, which treats NaN as equal
// to NaN where reflect.DeepEqual does not.
func same(a, b any) bool { return fmt.Sprintf("%+v", a) == fmt.Sprintf("%+v", b) }

// table is eight cases, four true, in two groups, scored by two models,
// at times over two days. With shifts starting 00:00 and 12:00 UTC the
// rows fall in four shifts:
//
//	score  other  label  seg  time          shift
//	0.9    0.2    1      A    day 1 01:00   0
//	0.8    0.9    1      B    day 1 13:00   1
//	0.8    0.3    0      A    day 1 02:00   0
//	0.7    0.6    0      B    day 1 14:00   1
//	0.6    0.7    1      A    day 2 01:00   2
//	0.5    0.1    0      A    day 2 13:00   3
//	0.4    0.8    1      B    day 2 03:00   2
//	0.3    0.4    0      B    day 2 15:00   3
const table = "score,other,label,seg,at\n" +
	"0.9,0.2,1,A,2026-03-01T01:00:00Z\n" +
	"0.8,0.9,1,B,2026-03-01T13:00:00Z\n" +
	"0.8,0.3,0,A,2026-03-01T02:00:00Z\n" +
	"0.7,0.6,0,B,2026-03-01T14:00:00Z\n" +
	"0.6,0.7,1,A,2026-03-02T01:00:00Z\n" +
	"0.5,0.1,0,A,2026-03-02T13:00:00Z\n" +
	"0.4,0.8,1,B,2026-03-02T03:00:00Z\n" +
	"0.3,0.4,0,B,2026-03-02T15:00:00Z\n"

func read(t *testing.T, opt scores.Options) *scores.Set {
	t.Helper()
	opt.SegmentColumn, opt.TimeColumn, opt.TimeLocation = "seg", "at", time.UTC
	if opt.ScoreColumn == "" {
		opt.ScoreColumn = "score"
	}
	set, err := scores.Read(strings.NewReader(table), "t.csv", opt)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

func rules(t *testing.T, specs ...string) []cutrule.Rule {
	t.Helper()
	var out []cutrule.Rule
	for _, s := range specs {
		r, err := cutrule.Parse(s)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, r)
	}
	return out
}

func schedule(t *testing.T) *shift.Schedule {
	t.Helper()
	s, err := shift.ParseSchedule("00:00,12:00", time.UTC)
	if err != nil {
		t.Fatal(err)
	}
	return &s
}

var validation = projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}

func TestStarts(t *testing.T) {
	costs := &projection.Costs{FalseAlert: 1, Miss: 4}
	for _, c := range []struct {
		name   string
		a      projection.Assumptions
		shifts bool
		want   string
	}{
		// cutrule.Defaults, then queue90 at the capacity with shifts:
		// the rules of issue 6, common practice, no source.
		{"plain", validation, false, "base hit=0.8 wrong=0.333 hit95=0.8 wrong95=0.333"},
		{"shifts without capacity", validation, true, "base hit=0.8 wrong=0.333 hit95=0.8 wrong95=0.333"},
		{"capacity without shifts", projection.Assumptions{BaseRate: 0.5, Volume: 10, Capacity: 3}, false, "base hit=0.8 wrong=0.333 queue=3 hit95=0.8 wrong95=0.333"},
		{"capacity and shifts", projection.Assumptions{BaseRate: 0.5, Volume: 10, Capacity: 3}, true, "base hit=0.8 wrong=0.333 queue=3 queue90=3 hit95=0.8 wrong95=0.333"},
		{"costs", projection.Assumptions{BaseRate: 0.5, Costs: costs}, true, "base hit=0.8 wrong=0.333 cost hit95=0.8 wrong95=0.333"},
	} {
		var got []string
		for _, r := range analysis.Starts(c.a, c.shifts) {
			got = append(got, r.String())
		}
		if strings.Join(got, " ") != c.want {
			t.Errorf("%s: %v, want %s", c.name, got, c.want)
		}
	}
}

// TestRun checks every figure of the table at score=0.8 against values
// worked out by hand from the table above.
func TestRun(t *testing.T) {
	set := read(t, scores.Options{})
	a := validation
	a.Costs = &projection.Costs{FalseAlert: 1, Miss: 4}
	a.Capacity = 1
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{
		Rules: rules(t, "score=0.8", "score=5"), Shifts: schedule(t), CalibrationBins: 2,
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Outcomes) != 2 || !res.Outcomes[0].Met || res.Outcomes[1].Met {
		t.Fatalf("outcomes %+v", res.Outcomes)
	}
	// score=0.8 flags the first three rows: two true, one false.
	if p := res.Outcomes[0].Point; p.Rows != 3 || p.TP != 2 || p.FP != 1 {
		t.Errorf("point %+v", p)
	}
	if res.Summary.Rows != 8 || res.Summary.Positives != 4 || !floatcmp.Equal(res.Summary.BaseRate, 0.5) {
		t.Errorf("summary %+v", res.Summary)
	}

	// Segments: A holds 0.9 (true), 0.8 (false), 0.6 (true), 0.5 (false),
	// two of them flagged, one true: recall 1/2, precision 1/2. B holds
	// 0.8 (true) flagged of two true cases: recall 1/2, precision 1.
	seg := res.Segments[0].Segments
	if len(seg) != 2 || seg[0].Segment != "A" || !floatcmp.Equal(seg[0].Recall, 0.5) || !floatcmp.Equal(seg[0].Precision, 0.5) ||
		seg[1].Segment != "B" || !floatcmp.Equal(seg[1].Recall, 0.5) || !floatcmp.Equal(seg[1].Precision, 1) {
		t.Errorf("segments %+v", seg)
	}
	if len(res.Segments[1].Segments) != 0 {
		t.Errorf("an unmet rule has a breakdown: %+v", res.Segments[1])
	}

	// Shifts: without a volume each case counts one alert. Flagged: two in
	// shift 0, one in shift 1, none in 2 and 3. The period runs from one
	// mean gap (38/7 hours) before the first case (day 1 01:00) to as far
	// after the last (day 2 15:00), so it covers shifts 0-2 and 8.43 of
	// shift 3's 12 hours: 3.7024 shifts' worth, 8/3.7024 = 2.1608 cases a
	// shift, a mean queue of 3/3.7024 = 0.8103. The sample's p90 over its
	// three whole shifts (2, 1, 0) is 2, one of them over the capacity 1.
	// The model: the spread cannot be told from noise in four shifts, so
	// the queue is Binomial(2.1608, 0.375).
	p := res.Shifts.Peaks[0]
	q := shift.NewQueue(8/3.7023809523825292, 0.375, 0)
	if res.Shifts.Assigned.Count != 4 || !floatcmp.Equal(res.Shifts.Assigned.Covered(), 3.7023809523825292) ||
		res.Shifts.Scale.Positive != 1 || res.Shifts.Scale.Negative != 1 || !floatcmp.Equal(res.Shifts.Scale.Volume, 8/3.7023809523825292) ||
		!floatcmp.Equal(p.Mean, 3/3.7023809523825292) || !floatcmp.Equal(p.Max, 2) || p.Busiest != 0 ||
		!floatcmp.Equal(p.Sample.P90, 2) || !floatcmp.Equal(p.Sample.OverCapacity, 1.0/3) ||
		p.Model.Spread != 0 || !floatcmp.Equal(p.Model.Rate, 0.375) || p.P90 != q.Quantile(0.9) || !floatcmp.Equal(p.OverCapacity, 1-q.CDF(1)) {
		t.Errorf("shifts %+v, peaks %+v", res.Shifts, p)
	}

	// Calibration, two bins: [0,0.5] holds 0.5, 0.4, 0.3 (one true of
	// three, mean 0.4), (0.5,1] the other five (three true, mean 0.76):
	// ECE = (3*|1/3-0.4| + 5*|0.6-0.76|)/8 = 0.125.
	cal := res.Calibration
	if cal == nil || len(cal.Table.Bins) != 2 || !floatcmp.Equal(cal.Table.ECE, 0.125) {
		t.Fatalf("calibration %+v", cal)
	}
	// Elkan 2001: 1/(1+4) = 0.2, the same on the score scale at equal
	// base rates. The cost per case FP + 4 FN at each cut: 0.9: 12,
	// 0.8: 9, 0.7: 10, 0.6: 6, 0.5: 7, 0.4: 3, 0.3: 4; least at 0.4.
	if cal.Cost == nil || !floatcmp.Equal(cal.Cost.Probability, 0.2) || !floatcmp.Equal(cal.Cost.Score, 0.2) ||
		!cal.Cost.LeastCost.Met || cal.Cost.LeastCost.Point.Score != 0.4 {
		t.Errorf("cost threshold %+v", cal.Cost)
	}
	// Net benefit at 0.8 (Vickers and Elkin 2006) at base rate 0.5 and
	// the costs' threshold 0.2 (odds 0.25): recall 2/4, FPR 1/4, so
	// 0.5*0.5 - 0.25*0.5*0.25 = 0.21875; flagging all: 0.5 - 0.5*0.25 =
	// 0.375.
	if !floatcmp.Equal(cal.NetBenefit[0], 0.21875) || !floatcmp.Equal(cal.NetBenefitAll[0], 0.375) || !floatcmp.Equal(cal.Threshold, 0.2) || !cal.ThresholdFromCosts ||
		!math.IsNaN(cal.NetBenefit[1]) || !math.IsNaN(cal.NetBenefitAll[1]) {
		t.Errorf("net benefit %v, all %v", cal.NetBenefit, cal.NetBenefitAll)
	}
	if res.Second != nil || res.Stability != nil || res.Curve != nil {
		t.Errorf("second %v, stability %v, curve %v: none asked for", res.Second, res.Stability, res.Curve)
	}
}

// TestScaleToVolume: a volume of 4 cases a shift over 3.7024 covered
// shifts of 8 cases (TestRun) makes each flagged case 4*3.7024/8 = 1.8512
// alerts (the base rates agree); the mean queue at score=0.8 is 4 * 3/8 =
// 1.5, the projected queue. The model's p90 is that of Binomial(4, 0.375),
// by hand: P(<=2) = 0.1526 + 0.3662 + 0.3296 = 0.8484, P(<=3) = 0.9802,
// so 3.
func TestScaleToVolume(t *testing.T) {
	a := validation
	a.Volume = 4
	res, err := analysis.Run(context.Background(), read(t, scores.Options{}), a, analysis.Options{Rules: rules(t, "score=0.8"), Shifts: schedule(t)})
	if err != nil {
		t.Fatal(err)
	}
	if p := res.Shifts.Peaks[0]; !floatcmp.Equal(res.Shifts.Scale.Positive, 4*3.7023809523825292/8) || res.Shifts.Scale.Volume != 4 ||
		!floatcmp.Equal(p.Mean, 1.5) || !floatcmp.Equal(p.P90, 3) {
		t.Errorf("scale %+v, peaks %+v", res.Shifts.Scale, p)
	}
}

// TestSecondModel: the second model's cuts are those the same rules pick
// on the set ranked by the other score, and its summary is that set's.
func TestSecondModel(t *testing.T) {
	both := read(t, scores.Options{CompareColumn: "other"})
	res, err := analysis.Run(context.Background(), both, validation, analysis.Options{Rules: rules(t, "hit=0.5", "top=2")})
	if err != nil {
		t.Fatal(err)
	}
	alone, err := analysis.Run(context.Background(), read(t, scores.Options{ScoreColumn: "other"}), validation, analysis.Options{Rules: rules(t, "hit=0.5", "top=2")})
	if err != nil {
		t.Fatal(err)
	}
	if res.Second == nil || res.Second.TestErr != nil {
		t.Fatalf("second %+v", res.Second)
	}
	if !same(res.Second.Outcomes, alone.Outcomes) || !same(res.Second.Summary, alone.Summary) {
		t.Errorf("second model\n%+v\n%+v\nwant the other score's own\n%+v\n%+v", res.Second.Outcomes, res.Second.Summary, alone.Outcomes, alone.Summary)
	}
	// The other score ranks true cases at 0.9, 0.8, 0.7, 0.2: hit=0.5
	// takes the strictest cut with two of four caught, 0.8.
	if o := res.Second.Outcomes[0]; !o.Met || o.Point.Score != 0.8 {
		t.Errorf("hit=0.5 on the other score %+v", o)
	}
	// The paired AUCs (the share of true-false pairs in which the true
	// case ranks higher, ties counting half), hand-worked. The score's
	// true cases 0.9, 0.8, 0.6, 0.4 against 0.8, 0.7, 0.5, 0.3: 4 + 3.5
	// + 2 + 1 = 10.5 of 16. The other's 0.9, 0.8, 0.7, 0.2 against 0.6,
	// 0.4, 0.3, 0.1: 4 + 4 + 4 + 1 = 13 of 16.
	if !floatcmp.Equal(res.Second.Test.AUC[0], 10.5/16) || !floatcmp.Equal(res.Second.Test.AUC[1], 13.0/16) || !floatcmp.Equal(res.Second.Test.Difference, -2.5/16) {
		t.Errorf("paired test %+v", res.Second.Test)
	}
}

// TestReassume: the figures under new assumptions are those Run gives
// under them, the starting points included.
func TestReassume(t *testing.T) {
	set := read(t, scores.Options{CompareColumn: "other"})
	opts := analysis.Options{Shifts: schedule(t), Cursor: true}
	first, err := analysis.Run(context.Background(), set, validation, opts)
	if err != nil {
		t.Fatal(err)
	}
	a := projection.Assumptions{BaseRate: 0.2, Volume: 40, Capacity: 6, Confidence: 0.9, Costs: &projection.Costs{FalseAlert: 1, Miss: 9}}
	moved, err := first.Reassume(context.Background(), a)
	if err != nil {
		t.Fatal(err)
	}
	fresh, err := analysis.Run(context.Background(), set, a, opts)
	if err != nil {
		t.Fatal(err)
	}
	if len(moved.Rules) != 8 || !same(moved.Rules, fresh.Rules) || !same(moved.Outcomes, fresh.Outcomes) ||
		!same(*moved.Shifts, *fresh.Shifts) || !same(moved.Segments, fresh.Segments) ||
		!same(*moved.Calibration.Cost, *fresh.Calibration.Cost) || !same(moved.Calibration.NetBenefit, fresh.Calibration.NetBenefit) ||
		!same(moved.Second.Outcomes, fresh.Second.Outcomes) {
		t.Errorf("reassumed\n%+v\nwant\n%+v", moved, fresh)
	}
	if first.Assume != validation || len(first.Rules) != 5 {
		t.Errorf("Reassume changed its receiver: %+v %v", first.Assume, first.Rules)
	}
}

// TestCursor: the figures that follow a cursor equal those read from the
// set at each cut.
func TestCursor(t *testing.T) {
	set := read(t, scores.Options{})
	a := validation
	a.Volume, a.Capacity = 4, 3
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{Shifts: schedule(t), Cursor: true})
	if err != nil {
		t.Fatal(err)
	}
	plain, err := analysis.Run(context.Background(), set, a, analysis.Options{Shifts: schedule(t)})
	if err != nil {
		t.Fatal(err)
	}
	for _, i := range []int{3, 0, 5, 1, 5, 2} {
		p := res.Curve.At(i)
		s1, ok1 := res.SegmentsAt(p, 0.9)
		s2, ok2 := plain.SegmentsAt(p, 0.9)
		q1, _ := res.PeaksAt(p, 3)
		q2, _ := plain.PeaksAt(p, 3)
		if !ok1 || !ok2 || len(s1.Segments) != len(s2.Segments) || !floatcmp.Equal(s1.Segments[0].Recall, s2.Segments[0].Recall) ||
			!floatcmp.Equal(s1.Segments[1].Precision, s2.Segments[1].Precision) || !floatcmp.Equal(q1.P90, q2.P90) || !floatcmp.Equal(q1.Mean, q2.Mean) || q1.Busiest != q2.Busiest {
			t.Errorf("cut %d: %+v %+v, %+v %+v", i, s1, s2, q1, q2)
		}
	}
}

// TestPoints: the cuts come the same from the kept curve and from a
// second walk, strictest first; the table has seven distinct scores.
func TestPoints(t *testing.T) {
	set := read(t, scores.Options{})
	for _, cursor := range []bool{false, true} {
		res, err := analysis.Run(context.Background(), set, validation, analysis.Options{Cursor: cursor})
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		res.Points(func(p curve.Point) { got = append(got, fmt.Sprintf("%g:%g/%g", p.Score, p.TP, p.FP)) })
		// Cumulative true and false cases at each score, from the table.
		want := "0.9:1/0 0.8:2/1 0.7:2/2 0.6:3/2 0.5:3/3 0.4:4/3 0.3:4/4"
		if strings.Join(got, " ") != want {
			t.Errorf("cursor %v: %v, want %s", cursor, got, want)
		}
	}
}

func TestResample(t *testing.T) {
	set := read(t, scores.Options{})
	opt := analysis.Resampling{Replicates: 20, Seed: 5, BandCuts: 3}
	res, err := analysis.Run(context.Background(), set, validation, analysis.Options{Resampling: opt})
	if err != nil {
		t.Fatal(err)
	}
	again, err := res.Resample(context.Background(), opt)
	if err != nil {
		t.Fatal(err)
	}
	direct, err := bootstrap.Run(context.Background(), set, res.Rules, validation, bootstrap.Options{Replicates: 20, Seed: 5, BandCuts: 3})
	if err != nil {
		t.Fatal(err)
	}
	figures := func(r bootstrap.Result) string { // the exported figures: the exact band's cache is a pointer
		return fmt.Sprintf("%d %d %v %+v %+v", r.Replicates, r.Seed, r.Design, r.Spreads, r.Band)
	}
	if res.Stability == nil || figures(*res.Stability) != figures(again) || figures(again) != figures(direct) {
		t.Errorf("the same seed gives other figures:\n%+v\n%+v\n%+v", res.Stability, again, direct)
	}
}

func TestErrors(t *testing.T) {
	noTimes, err := scores.Read(strings.NewReader("score,label\n0.9,1\n0.1,0\n"), "n.csv", scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	oneClass, err := scores.Read(strings.NewReader("score,label\n0.9,1\n0.1,1\n"), "o.csv", scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		ctx  context.Context
		set  *scores.Set
		opts analysis.Options
		step analysis.Step
		is   error
	}{
		{"no times", context.Background(), noTimes, analysis.Options{Shifts: schedule(t)}, analysis.StepShifts, shift.ErrNoTimes},
		{"queue without volume", context.Background(), noTimes, analysis.Options{Rules: rules(t, "queue=3")}, analysis.StepRules, cutrule.ErrNeedsVolume},
		{"queue90 without shifts", context.Background(), noTimes, analysis.Options{Rules: rules(t, "queue90=3")}, analysis.StepRules, cutrule.ErrNeedsShifts},
		{"resampling one class", context.Background(), oneClass, analysis.Options{Resampling: analysis.Resampling{Replicates: 5}}, analysis.StepResampling, bootstrap.ErrNoClass},
		{"cancelled", cancelled, noTimes, analysis.Options{}, "", context.Canceled},
	} {
		_, err := analysis.Run(c.ctx, c.set, validation, c.opts)
		var e *analysis.Error
		switch {
		case !errors.Is(err, c.is):
			t.Errorf("%s: %v, want %v", c.name, err, c.is)
		case c.step == "" && errors.As(err, &e):
			t.Errorf("%s: %v names a step", c.name, err)
		case c.step != "" && (!errors.As(err, &e) || e.Step != c.step):
			t.Errorf("%s: %v, want step %q", c.name, err, c.step)
		}
	}
}

// TestCheckCost: the cost threshold of costs 1 and 4, 1/(1+4) = 0.2
// (Elkan 2001), against where the least-cost cut lands in resampled sets.
func TestCheckCost(t *testing.T) {
	set := read(t, scores.Options{})
	withCosts := validation
	withCosts.Costs = &projection.Costs{FalseAlert: 1, Miss: 4}
	spread := func(lo, hi float64, met int) *bootstrap.Result {
		return &bootstrap.Result{Replicates: 10, Spreads: []bootstrap.Spread{
			{Rule: cutrule.Rule{Kind: cutrule.Base}, Met: 10, Score: [2]float64{0.1, 0.9}},
			{Rule: cutrule.Rule{Kind: cutrule.Cost}, Met: met, Score: [2]float64{lo, hi}},
		}}
	}
	for _, c := range []struct {
		name      string
		a         projection.Assumptions
		stability *bootstrap.Result
		judged    bool
		outside   bool
	}{
		{"threshold below the range", withCosts, spread(0.5, 0.8, 10), true, true},
		{"threshold within", withCosts, spread(0.1, 0.8, 10), true, false},
		{"threshold on the lower end", withCosts, spread(0.2, 0.8, 10), true, false},
		{"threshold above the range", withCosts, spread(0.05, 0.15, 10), true, true},
		{"never met in a resampled set", withCosts, spread(math.NaN(), math.NaN(), 0), false, false},
		{"not resampled", withCosts, nil, false, false},
		{"no costs", validation, spread(0.5, 0.8, 10), false, false},
	} {
		res, err := analysis.Run(context.Background(), set, c.a, analysis.Options{})
		if err != nil {
			t.Fatal(err)
		}
		got := res.CheckCost(c.stability)
		if got.Judged != c.judged || got.Outside != c.outside || (c.judged && got.Spread.Rule.Kind != cutrule.Cost) {
			t.Errorf("%s: %+v, want judged %v outside %v", c.name, got, c.judged, c.outside)
		}
	}
}

// TestCheckRules: candidates pinned at the validation base rate (0.5)
// checked under a production base rate of 0.2, by hand on table. At 0.5,
// base picks 0.7 (4 of 8 flagged), hit=0.75 picks 0.6 (3 of 4 true cases)
// and queue=40 at 100 cases a shift picks 0.8 (3 of 8: 37.5). At 0.2 the
// alert rate is 0.2·recall + 0.8·fpr: 0.05 at 0.9, 0.3 at 0.8, so base
// picks 0.9; hit=0.75 does not depend on the base rate; the queue at 0.8
// is 30 and at 0.7 is 50, so queue=40 still picks 0.8.
func TestCheckRules(t *testing.T) {
	set := read(t, scores.Options{})
	hit := cutrule.Rule{Kind: cutrule.Hit, Value: 0.75}
	rules := []cutrule.Rule{{Kind: cutrule.Base}, hit, {Kind: cutrule.Queue, Value: 40}}
	pinned := []float64{0.7, 0.6, 0.8}
	tests := []struct {
		name   string
		assume projection.Assumptions
		holds  []bool
		now    []float64 // NaN: no cut met
	}{
		{"as pinned", projection.Assumptions{BaseRate: 0.5, Volume: 100, Confidence: 0.95}, []bool{true, true, true}, []float64{0.7, 0.6, 0.8}},
		{"base rate 0.2", projection.Assumptions{BaseRate: 0.2, Volume: 100, Confidence: 0.95}, []bool{false, true, true}, []float64{0.9, 0.6, 0.8}},
		// Without a volume a queue rule picks nothing: it holds nowhere.
		{"no volume", projection.Assumptions{BaseRate: 0.2, Confidence: 0.95}, []bool{false, true, false}, []float64{0.9, 0.6, math.NaN()}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			// hit=0.75 is one of the result's rules, the others walked.
			res, err := analysis.Run(context.Background(), set, tt.assume, analysis.Options{Rules: []cutrule.Rule{hit}})
			if err != nil {
				t.Fatal(err)
			}
			checks, err := res.CheckRules(context.Background(), rules, pinned)
			if err != nil {
				t.Fatal(err)
			}
			for i, c := range checks {
				now := math.NaN()
				if c.Now.Met {
					now = c.Now.Point.Score
				}
				if c.Rule != rules[i] || c.Holds != tt.holds[i] || !floatcmp.Equal(now, tt.now[i]) {
					t.Errorf("%v: holds %v now %v, want %v %v", rules[i], c.Holds, now, tt.holds[i], tt.now[i])
				}
				if !c.Now.Met && c.Now.Reason == "" {
					t.Errorf("%v: not met without a reason", rules[i])
				}
			}
		})
	}
}

// TestRanking: the summary's intervals are DeLong's (the paired test's
// variance of the first model, taken row by row) and the logit interval
// of the average precision, at the assumptions' confidence, with or
// without a cursor, and they follow a new confidence in Reassume. The AP
// of the table: true cases at cuts 0.9 (precision 1), 0.8 (2 of 3), 0.6
// (3 of 5) and 0.4 (4 of 7), each adding 1/4 of recall: 0.25·(1 + 2/3 +
// 3/5 + 4/7) = 0.709524.
func TestRanking(t *testing.T) {
	set := read(t, scores.Options{CompareColumn: "other"})
	for _, cursor := range []bool{false, true} {
		res, err := analysis.Run(context.Background(), set, validation, analysis.Options{Cursor: cursor})
		if err != nil {
			t.Fatal(err)
		}
		test := res.Second.Test
		z := 1.959963984540054 // two-sided 95%
		se := math.Sqrt(test.Variance[0])
		got := res.Ranking.ROCAUC
		if !floatcmp.Equal(got.AUC, 10.5/16) || !floatcmp.Equal(got.StdError, se) ||
			!floatcmp.Equal(got.Interval[0], 10.5/16-z*se) || !floatcmp.Equal(got.Interval[1], min(10.5/16+z*se, 1)) {
			t.Errorf("cursor %v: AUC estimate %+v, want AUC %v SE %v", cursor, got, 10.5/16, se)
		}
		ap := 0.25 * (1 + 2.0/3 + 3.0/5 + 4.0/7)
		lo, hi := interval.AveragePrecision(ap, 4, 0.95)
		if !floatcmp.Equal(res.Summary.AveragePrecision, ap) || !floatcmp.Equal(res.Ranking.AveragePrecision[0], lo) || !floatcmp.Equal(res.Ranking.AveragePrecision[1], hi) {
			t.Errorf("cursor %v: AP %v interval %v, want %v [%v, %v]", cursor, res.Summary.AveragePrecision, res.Ranking.AveragePrecision, ap, lo, hi)
		}
		a := validation
		a.Confidence = 0.9
		moved, err := res.Reassume(context.Background(), a)
		if err != nil {
			t.Fatal(err)
		}
		if z90 := 1.6448536269514722; !floatcmp.Equal(moved.Ranking.ROCAUC.Interval[0], 10.5/16-z90*se) {
			t.Errorf("cursor %v: at 90%% %+v", cursor, moved.Ranking.ROCAUC)
		}
	}
}

// TestNetBenefitRanksAsCost: on the demo (6,000 rows, seed 7) at a
// production base rate of 2% with the demo's costs (wrong alert 120, miss
// 1200), ordering every cut by net benefit, best first, orders them by
// projected cost per case, least first (cost = p*Miss - (Miss-Hit)*net
// benefit, package calibration); and the best net benefit is at the
// least-cost cut. Without costs the threshold is the base rate.
func TestNetBenefitRanksAsCost(t *testing.T) {
	set, err := scores.Read(strings.NewReader(string(demo.CSV(demo.DefaultRows, demo.DefaultSeed))), demo.Source, scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	a := projection.Assumptions{BaseRate: 0.02, Volume: demo.Volume, Confidence: 0.95,
		Costs: &projection.Costs{FalseAlert: demo.CostFalseAlert, Miss: demo.CostMiss}}
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{Rules: rules(t, "cost")})
	if err != nil {
		t.Fatal(err)
	}
	type cut struct{ benefit, cost, score float64 }
	var cuts []cut
	res.Points(func(p curve.Point) {
		nb, _ := res.NetBenefitAt(p)
		cuts = append(cuts, cut{nb, projection.Project(p, a).CostPerCase, p.Score})
	})
	if len(cuts) < 100 {
		t.Fatalf("%d cuts", len(cuts))
	}
	slices.SortStableFunc(cuts, func(x, y cut) int { return cmp.Compare(y.benefit, x.benefit) })
	for i := 1; i < len(cuts); i++ {
		if cuts[i].cost < cuts[i-1].cost-1e-9 {
			t.Fatalf("by net benefit, cut %v (cost %v) follows %v (cost %v)", cuts[i].score, cuts[i].cost, cuts[i-1].score, cuts[i-1].cost)
		}
	}
	if o := res.Outcomes[0]; !o.Met || o.Point.Score != cuts[0].score {
		t.Errorf("least-cost cut %v, best net benefit at %v", o.Point.Score, cuts[0].score)
	}
	if cuts[0].benefit > 0 {
		t.Logf("best net benefit %.4f at %v", cuts[0].benefit, cuts[0].score)
	}
	a.Costs = nil
	res, err = analysis.Run(context.Background(), set, a, analysis.Options{Rules: rules(t, "top=100")})
	if err != nil {
		t.Fatal(err)
	}
	if c := res.Calibration; c.ThresholdFromCosts || c.Threshold != 0.02 {
		t.Errorf("without costs: threshold %v from costs %v, want the base rate 0.02", c.Threshold, c.ThresholdFromCosts)
	}
}
