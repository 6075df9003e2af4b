package cutrule_test

import (
	"errors"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

// TestQueue90HandWorked: shifts at 00:00 and 12:00 UTC over two days (four
// shifts, all covered), ten rows with scores 10..1 (ranked as given), 2.5
// a shift, scaled to 10 cases a shift. Four shifts cannot tell a spread
// from noise (the most uneven, 3 flagged in one shift and none in three,
// gives Q/lambda2 = 9, below chi-square's 9.35), so the queue at r rows is
// Binomial(10, r/10), by hand: at 0.1, P(<=3) = 0.9872 and the p90 is 2
// (P(<=1) = 0.7361, P(<=2) = 0.9298); at 0.2, P(<=3) = 0.8791; at 0.3,
// P(<=5) = 0.9527; at 0.4, P(<=5) = 0.8338. So queue90=3 gives the cut at
// score 10 (1 row), queue90=5 the cut at score 8 (3 rows), and queue90=0.5
// is unmet: at the strictest cut 9 shifts in 10 already queue up to 2.
func TestQueue90HandWorked(t *testing.T) {
	sc := []float64{10, 9, 8, 7, 6, 5, 4, 3, 2, 1}
	labels := []bool{true, false, true, false, true, false, false, true, false, false}
	base := time.Date(2026, 9, 1, 0, 0, 0, 0, time.UTC).Unix()
	var times []int64
	for _, h := range []int64{1, 2, 3, 13, 37, 38, 25, 26, 40, 47} {
		times = append(times, base+h*3600)
	}
	set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Times: times})
	if err != nil {
		t.Fatal(err)
	}
	sched, _ := shift.ParseSchedule("00:00,12:00", time.UTC)
	assigned, err := shift.Assign(set, sched)
	if err != nil {
		t.Fatal(err)
	}
	a := projection.Assumptions{BaseRate: 0.4, Volume: 10, Confidence: 0.95}
	rules := []cutrule.Rule{{Kind: cutrule.Queue90, Value: 3}, {Kind: cutrule.Queue90, Value: 5}, {Kind: cutrule.Queue90, Value: 0.5}}
	f, err := cutrule.NewFinder(rules, set, a, cutrule.WithShifts(assigned, shift.ScaleFor(set, assigned, a)))
	if err != nil {
		t.Fatal(err)
	}
	curve.Walk(set, f.Visit)
	out := f.Outcomes()
	if !out[0].Met || out[0].Point.Score != 10 || out[0].Point.Rows != 1 {
		t.Errorf("queue90=3: %+v", out[0])
	}
	if !out[1].Met || out[1].Point.Score != 8 {
		t.Errorf("queue90=5: %+v", out[1])
	}
	if out[2].Met || !strings.Contains(out[2].Reason, "up to 2.0 alerts, above 0.5") {
		t.Errorf("queue90=0.5: %+v", out[2])
	}
}

func TestQueue90ParseAndNeeds(t *testing.T) {
	r, err := cutrule.Parse("queue90=40")
	if err != nil || r.Kind != cutrule.Queue90 || r.Value != 40 || r.String() != "queue90=40" {
		t.Fatalf("%+v %v", r, err)
	}
	if _, err := cutrule.Parse("queue90=-1"); !errors.Is(err, cutrule.ErrMalformed) {
		t.Errorf("negative: %v", err)
	}
	set, _ := scores.New([]float64{1, 2}, []bool{true, false}, nil, false)
	if _, err := cutrule.NewFinder([]cutrule.Rule{r}, set, projection.Assumptions{Confidence: 0.95}); !errors.Is(err, cutrule.ErrNeedsShifts) {
		t.Errorf("without shifts: %v", err)
	}
}
