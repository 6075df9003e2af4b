package shift_test

import (
	"math/rand/v2"
	"testing"
	"time"
	_ "time/tzdata" // the zone database for Europe/Amsterdam on any machine

	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

// BenchmarkAssign1M places a million cases over a year in three shifts a
// day in a zone with daylight saving; BenchmarkAt1M counts one cut.
func benchSet(b *testing.B) (*scores.Set, shift.Schedule) {
	rng := rand.New(rand.NewPCG(2, 2))
	n := 1_000_000
	sc, labels, times := make([]float64, n), make([]bool, n), make([]int64, n)
	start := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC).Unix()
	for i := range n {
		sc[i] = rng.Float64()
		labels[i] = rng.Float64() < 0.07
		times[i] = start + rng.Int64N(365*86400)
	}
	set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Times: times})
	if err != nil {
		b.Fatal(err)
	}
	loc, err := time.LoadLocation("Europe/Amsterdam")
	if err != nil {
		b.Fatal(err)
	}
	sched, _ := shift.ParseSchedule("06:00,14:00,22:00", loc)
	return set, sched
}

func BenchmarkAssign1M(b *testing.B) {
	set, sched := benchSet(b)
	for b.Loop() {
		if _, err := shift.Assign(set, sched); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkAt1M(b *testing.B) {
	set, sched := benchSet(b)
	a, _ := shift.Assign(set, sched)
	for b.Loop() {
		a.At(set, set.Len()/10, shift.Scale{Positive: 1, Negative: 1}, 90)
	}
}
