package shift_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
	"time"
	_ "time/tzdata" // the zone database for Europe/Amsterdam on any machine

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

func unix(t *testing.T, text string) int64 {
	t.Helper()
	v, err := time.Parse(time.RFC3339, text)
	if err != nil {
		t.Fatal(err)
	}
	return v.Unix()
}

// timedSet makes a set whose scores fall with the row number, so that the
// ranked order is the order given.
func timedSet(t *testing.T, times []int64, labels []bool) *scores.Set {
	t.Helper()
	sc := make([]float64, len(times))
	for i := range sc {
		sc[i] = float64(len(times) - i)
	}
	set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Times: times})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

func location(t *testing.T, name string) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(name)
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

// TestShiftsAcrossMidnightAndDST places hand-picked times in shifts. The
// expected shift starts were worked out by hand from the zone rules:
// Europe/Amsterdam leaves summer time at 03:00 CEST on 2026-10-25 (clocks
// back to 02:00 CET) and enters it at 02:00 CET on 2026-03-29.
func TestShiftsAcrossMidnightAndDST(t *testing.T) {
	ams := location(t, "Europe/Amsterdam")
	cases := []struct {
		name  string
		loc   *time.Location
		times []string
		// wantStart[i] is the local start of row i's shift.
		wantStart []string
		wantCount int
	}{
		{
			name: "crossing midnight, UTC",
			loc:  time.UTC,
			times: []string{
				"2026-09-01T05:59:59Z", // before the first start: the night shift of 31 August
				"2026-09-01T06:00:00Z", // on a start: that shift
				"2026-09-01T22:30:00Z", // night shift of 1 September
				"2026-09-02T03:00:00Z", // same night shift, after midnight
			},
			wantStart: []string{"2026-08-31T22:00:00Z", "2026-09-01T06:00:00Z", "2026-09-01T22:00:00Z", "2026-09-01T22:00:00Z"},
			wantCount: 4, // 31 Aug 22:00, 1 Sep 06:00, 14:00 (no cases), 22:00
		},
		{
			name: "autumn change: the night shift lasts nine hours",
			loc:  ams,
			times: []string{
				"2026-10-24T20:00:00Z", // 22:00 CEST, the night shift starts
				"2026-10-25T00:30:00Z", // 02:30 CEST, the first 02:30
				"2026-10-25T01:30:00Z", // 02:30 CET, the second 02:30
				"2026-10-25T04:59:59Z", // 05:59:59 CET, still the night shift
				"2026-10-25T05:00:00Z", // 06:00 CET, the day shift
			},
			wantStart: []string{"2026-10-24T22:00:00+02:00", "2026-10-24T22:00:00+02:00", "2026-10-24T22:00:00+02:00", "2026-10-24T22:00:00+02:00", "2026-10-25T06:00:00+01:00"},
			wantCount: 2,
		},
		{
			name: "spring change: the night shift lasts seven hours",
			loc:  ams,
			times: []string{
				"2026-03-28T21:00:00Z", // 22:00 CET
				"2026-03-29T00:59:59Z", // 01:59:59 CET, just before the change
				"2026-03-29T01:00:00Z", // 03:00 CEST
				"2026-03-29T03:59:59Z", // 05:59:59 CEST
				"2026-03-29T04:00:00Z", // 06:00 CEST, the day shift
			},
			wantStart: []string{"2026-03-28T22:00:00+01:00", "2026-03-28T22:00:00+01:00", "2026-03-28T22:00:00+01:00", "2026-03-28T22:00:00+01:00", "2026-03-29T06:00:00+02:00"},
			wantCount: 2,
		},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sched, err := shift.ParseSchedule("22:00, 06:00,14:00", c.loc) // any order
			if err != nil {
				t.Fatal(err)
			}
			times := make([]int64, len(c.times))
			for i, s := range c.times {
				times[i] = unix(t, s)
			}
			set := timedSet(t, times, make([]bool, len(times)))
			a, err := shift.Assign(set, sched)
			if err != nil {
				t.Fatal(err)
			}
			if a.Count != c.wantCount {
				t.Errorf("%d shifts, want %d", a.Count, c.wantCount)
			}
			for i := range times {
				got := a.Start(int(a.Of[i]))
				if want := unix(t, c.wantStart[i]); got.Unix() != want {
					t.Errorf("row %d (%s): shift starts %s, want %s", i, c.times[i], got.Format(time.RFC3339), c.wantStart[i])
				}
			}
		})
	}
}

// TestCover: the covered share of each shift. Shifts at 00:00 and 12:00
// UTC; cases at 10, 14, 18, 22 and 26 hours after the first midnight: the
// mean gap is 16/4 = 4 hours, so the period runs from 6 to 30 hours:
// half of shift 0 (0-12), all of shift 1, half of shift 2 (24-36), two
// shifts' worth; the set's 5 cases make 2.5 a covered shift (by hand).
// A run of empty shifts long enough to expect 20 cases at the set's rate
// is a gap, left out.
func TestCover(t *testing.T) {
	sched, _ := shift.ParseSchedule("00:00,12:00", time.UTC)
	base := unix(t, "2026-09-01T00:00:00Z")
	hour := int64(3600)
	times := []int64{base + 10*hour, base + 14*hour, base + 18*hour, base + 22*hour, base + 26*hour}
	set := timedSet(t, times, make([]bool, len(times)))
	a, err := shift.Assign(set, sched)
	if err != nil {
		t.Fatal(err)
	}
	if len(a.Cover) != 3 || !floatcmp.Equal(a.Cover[0], 0.5) || !floatcmp.Equal(a.Cover[1], 1) || !floatcmp.Equal(a.Cover[2], 0.5) ||
		!floatcmp.Equal(a.Covered(), 2) || a.Gaps != 0 {
		t.Errorf("cover %v, covered %v, gaps %d", a.Cover, a.Covered(), a.Gaps)
	}
	if s := shift.ScaleFor(set, a, projection.Assumptions{BaseRate: 0}); !floatcmp.Equal(s.Volume, 2.5) {
		t.Errorf("own volume %v, want 2.5", s.Volume)
	}
	// Thirty cases 20 minutes apart in each of shifts 0 and 10 (12-hour
	// shifts, 5 days apart): 60 cases over 11 shifts' worth, about 5.5 a
	// shift, so the nine empty shifts between expect about 49 cases, 20
	// or more: a gap. Shifts 0 and 10 are covered whole: one mean gap
	// (129.7/59 = 2.2 hours) before the first case at 1 hour and after the
	// last at 130.7 hours reaches past both ends.
	times = nil
	for k := range int64(30) {
		times = append(times, base+hour+k*hour/3, base+121*hour+k*hour/3)
	}
	set = timedSet(t, times, make([]bool, len(times)))
	a, err = shift.Assign(set, sched)
	if err != nil {
		t.Fatal(err)
	}
	if a.Count != 11 || a.Gaps != 9 || a.Cover[5] != 0 || !floatcmp.Equal(a.Covered(), 2) {
		t.Errorf("count %d gaps %d cover %v", a.Count, a.Gaps, a.Cover)
	}
}

func TestParseSchedule(t *testing.T) {
	s, err := shift.ParseSchedule("14:00,06:00,22:30", nil)
	if err != nil || s.String() != "06:00,14:00,22:30" || s.Location != time.UTC {
		t.Errorf("%v %v", s, err)
	}
	for _, bad := range []string{"", "6", "06:0", "24:00", "06:00,06:00", "ab:cd", "06:60"} {
		if _, err := shift.ParseSchedule(bad, nil); !errors.Is(err, shift.ErrSchedule) {
			t.Errorf("%q: %v", bad, err)
		}
	}
}

// TestPeaksHandWorked: shifts at 00:00 and 12:00 UTC over two days, ten
// rows ranked by the order given, the first six flagged. Flagged rows per
// shift: 3, 1, 0, 2 (rows 0-2, 3, none, 4-5). Mean 1.5, maximum 3 in shift
// 0, 90th percentile by nearest rank ceil(0.9*4) = 4th of (0,1,2,3) = 3;
// over a capacity of 1.5: two shifts of four.
func TestPeaksHandWorked(t *testing.T) {
	sched, _ := shift.ParseSchedule("00:00,12:00", time.UTC)
	base := unix(t, "2026-09-01T00:00:00Z")
	hour := int64(3600)
	times := []int64{
		base + 1*hour, base + 2*hour, base + 3*hour, // shift 0
		base + 13*hour,                 // shift 1
		base + 37*hour, base + 38*hour, // shift 3
		base + 25*hour, base + 26*hour, base + 40*hour, base + 47*hour, // unflagged, shifts 2 and 3
	}
	labels := []bool{true, false, true, false, true, false, false, true, false, false}
	set := timedSet(t, times, labels)
	a, err := shift.Assign(set, sched)
	if err != nil {
		t.Fatal(err)
	}
	p := a.At(set, 6, shift.ScaleFor(set, a, projection.Assumptions{BaseRate: 0.4}), 1.5)
	if p.Shifts != 4 || !floatcmp.Equal(p.Mean, 1.5) || !floatcmp.Equal(p.Max, 3) || p.Busiest != 0 ||
		p.Sample.Whole != 4 || !floatcmp.Equal(p.Sample.P90, 3) || !floatcmp.Equal(p.Sample.OverCapacity, 0.5) {
		t.Errorf("got %+v", p)
	}
	// The model: the set's own 2.5 cases a shift (10 over 4 wholly covered
	// shifts: the period's ends, one mean gap of 46/9 hours beyond the
	// first and last case, fall outside it) at the alert rate 1.5/2.5 =
	// 0.6; 4 shifts cannot tell any spread from noise, so the queue is
	// Binomial(2.5, 0.6).
	q := shift.NewQueue(2.5, 0.6, 0)
	if m := p.Model; !floatcmp.Equal(m.Volume, 2.5) || !floatcmp.Equal(m.Rate, 0.6) || m.Spread != 0 || m.Queue.Distinct ||
		p.P90 != q.Quantile(0.9) || !floatcmp.Equal(p.OverCapacity, 1-q.CDF(1.5)) || !floatcmp.Equal(m.Flagged, 1.5) {
		t.Errorf("model %+v, p90 %v over %v", m, p.P90, p.OverCapacity)
	}
	// With 100 cases per shift the ten rows (2.5 per shift) scale by 40:
	// mean 60, the projected queue 100 * 6/10.
	scaled := a.At(set, 6, shift.ScaleFor(set, a, projection.Assumptions{BaseRate: 0.4, Volume: 100}), 0)
	if !floatcmp.Equal(scaled.Mean, 60) || !floatcmp.Equal(scaled.Max, 120) || !math.IsNaN(scaled.OverCapacity) {
		t.Errorf("scaled: %+v", scaled)
	}
	none := a.At(set, 0, shift.Scale{Positive: 1, Negative: 1}, 0)
	if !floatcmp.Equal(none.Max, 0) || none.Busiest != 0 {
		t.Errorf("nothing flagged: %+v", none)
	}
}

// TestScaledMeanIsProjectedQueue: with a volume and another base rate, the
// mean of the scaled shift queues equals the projected queue per shift at
// every cut (property, seeded random data with weights).
func TestScaledMeanIsProjectedQueue(t *testing.T) {
	rng := rand.New(rand.NewPCG(6, 6))
	n := 300
	sc, labels, weights, times := make([]float64, n), make([]bool, n), make([]float64, n), make([]int64, n)
	start := unix(t, "2026-09-01T00:00:00Z")
	for i := range n {
		labels[i] = rng.Float64() < 0.2
		sc[i] = math.Round(rng.NormFloat64()*10) / 10
		if labels[i] {
			sc[i] += 1
		}
		weights[i] = float64(rng.IntN(3))
		times[i] = start + rng.Int64N(7*86400)
	}
	set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: weights, Times: times})
	if err != nil {
		t.Fatal(err)
	}
	sched, _ := shift.ParseSchedule("06:00,14:00,22:00", time.UTC)
	a, err := shift.Assign(set, sched)
	if err != nil {
		t.Fatal(err)
	}
	assume := projection.Assumptions{BaseRate: 0.05, Volume: 1500, Confidence: 0.95}
	scale := shift.ScaleFor(set, a, assume)
	checked := 0
	curve.New(set).Points(func(p curve.Point) {
		want := projection.Project(p, assume).QueuePerShift
		if got := a.At(set, p.Rows, scale, 0).Mean; !floatcmp.Equal(got, want) {
			t.Errorf("cut %v: mean %v, projected %v", p.Score, got, want)
		}
		checked++
	})
	if checked < 10 {
		t.Fatalf("only %d cuts", checked)
	}
}

// TestCounterMatchesPeaks: as a cut loosens row by row, Counter.Within
// agrees with At's 90th percentile (the model's) against the limit, and
// Counter.P90 with At's (seeded random data).
func TestCounterMatchesPeaks(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 1))
	n := 200
	sc, labels, times := make([]float64, n), make([]bool, n), make([]int64, n)
	start := unix(t, "2026-09-01T00:00:00Z")
	for i := range n {
		sc[i] = float64(n - i)
		labels[i] = rng.Float64() < 0.3
		times[i] = start + rng.Int64N(5*86400)
	}
	set := timedSet(t, times, labels)
	sched, _ := shift.ParseSchedule("07:00,19:00", time.UTC)
	a, _ := shift.Assign(set, sched)
	scale := shift.Scale{Positive: 1.5, Negative: 0.5, Volume: 25}
	cases := a.CaseSpread(set, scale)
	for _, limit := range []float64{0, 3, 7.5, 12} {
		c := a.NewCounter(scale, cases, limit)
		for rows := 0; rows <= n; rows++ {
			if rows > 0 {
				c.Add(rows-1, set.Labels()[rows-1], 1)
			}
			p90 := a.At(set, rows, scale, 0).P90
			if c.Within() != (p90 <= limit) || !floatcmp.Equal(c.P90(), p90) {
				t.Fatalf("limit %v rows %d: within %v, p90 %v (counter %v)", limit, rows, c.Within(), p90, c.P90())
			}
		}
	}
}

func TestAssignErrors(t *testing.T) {
	sched, _ := shift.ParseSchedule("06:00", time.UTC)
	plain, _ := scores.New([]float64{1}, []bool{true}, nil, false)
	if _, err := shift.Assign(plain, sched); !errors.Is(err, shift.ErrNoTimes) {
		t.Errorf("no times: %v", err)
	}
	far := timedSet(t, []int64{0, 1e11}, []bool{true, false}) // 1970 and about year 5138: 1.16 million days
	if _, err := shift.Assign(far, sched); !errors.Is(err, shift.ErrSpan) {
		t.Errorf("span: %v", err)
	}
	empty := timedSet(t, []int64{}, []bool{})
	a, err := shift.Assign(empty, sched)
	if err != nil || a.Count != 0 {
		t.Fatalf("empty: %+v %v", a, err)
	}
	if p := a.At(empty, 0, shift.Scale{Positive: 1, Negative: 1}, 5); !math.IsNaN(p.Mean) || p.Busiest != -1 {
		t.Errorf("empty peaks: %+v", p)
	}
	if shift.P90Rank(1) != 1 || shift.P90Rank(10) != 9 || shift.P90Rank(11) != 10 {
		t.Errorf("P90Rank: %d %d %d", shift.P90Rank(1), shift.P90Rank(10), shift.P90Rank(11))
	}
}
