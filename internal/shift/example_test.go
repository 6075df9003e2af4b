package shift_test

import (
	"fmt"
	"time"

	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

func ExampleAssign() {
	sched, _ := shift.ParseSchedule("06:00,14:00,22:00", time.UTC)
	var times []int64
	for _, text := range []string{"2026-09-01T23:10:00Z", "2026-09-02T03:40:00Z", "2026-09-02T09:00:00Z"} {
		t, _ := time.Parse(time.RFC3339, text)
		times = append(times, t.Unix())
	}
	set, _ := scores.NewSet(scores.Columns{Scores: []float64{0.9, 0.8, 0.7}, Labels: []bool{true, false, false}, Times: times})
	a, _ := shift.Assign(set, sched)
	p := a.At(set, 2, shift.Scale{Positive: 1, Negative: 1}, 0) // the two riskiest cases flagged
	fmt.Println(a.Count, "shifts; busiest starts", a.Start(p.Busiest).Format("Jan 2 15:04"), "with", p.Max, "alerts")
	// Output: 2 shifts; busiest starts Sep 1 22:00 with 2 alerts
}
