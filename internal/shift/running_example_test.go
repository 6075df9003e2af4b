package shift_test

import (
	"fmt"
	"time"

	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

func ExampleRunning() {
	sched, _ := shift.ParseSchedule("06:00,14:00,22:00", time.UTC)
	var times []int64
	for _, text := range []string{"2026-09-01T23:10:00Z", "2026-09-02T03:40:00Z", "2026-09-02T09:00:00Z"} {
		t, _ := time.Parse(time.RFC3339, text)
		times = append(times, t.Unix())
	}
	set, _ := scores.NewSet(scores.Columns{Scores: []float64{0.9, 0.8, 0.7}, Labels: []bool{true, false, false}, Times: times})
	a, _ := shift.Assign(set, sched)
	r := shift.NewRunning(set, a, shift.ScaleFor(set, a, projection.Assumptions{BaseRate: 1.0 / 3}))
	for _, rows := range []int{1, 3, 2} { // as a cursor moves: one case flagged, all three, two
		p := r.At(rows, 1)
		fmt.Printf("%d flagged: the sample's busiest shift %v, %v of its shifts over a capacity of 1\n", rows, p.Max, p.Sample.OverCapacity)
	}
	// Output:
	// 1 flagged: the sample's busiest shift 1, 0 of its shifts over a capacity of 1
	// 3 flagged: the sample's busiest shift 2, 0.5 of its shifts over a capacity of 1
	// 2 flagged: the sample's busiest shift 2, 0.5 of its shifts over a capacity of 1
}
