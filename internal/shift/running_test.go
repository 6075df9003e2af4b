package shift_test

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

// TestRunningMatchesAt walks a seeded weighted set back and forth and
// across: every Peaks of Running equals Assignment.At's, the reference.
func TestRunningMatchesAt(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 8))
	n := 400
	sc, labels, weights, times := make([]float64, n), make([]bool, n), make([]float64, n), make([]int64, n)
	start := unix(t, "2026-09-01T00:00:00Z")
	for i := range n {
		labels[i] = rng.Float64() < 0.25
		sc[i] = math.Round(rng.Float64()*30) / 30
		weights[i] = 0.25 + rng.Float64()
		times[i] = start + rng.Int64N(6*86400)
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
	scale := shift.Scale{Positive: 1.7, Negative: 0.6}
	r := shift.NewRunning(set, a, scale)
	walk := []int{0, 1, 5, 4, n, n / 2, n/2 + 3, 2, n - 2, n - 1, 0, n}
	for range 200 {
		walk = append(walk, rng.IntN(n+1))
	}
	for _, rows := range walk {
		for _, capacity := range []float64{0, 12} {
			got, want := r.At(rows, capacity), a.At(set, rows, scale, capacity)
			if got.Shifts != want.Shifts || got.Busiest != want.Busiest || !floatcmp.Equal(got.Mean, want.Mean) ||
				!floatcmp.Equal(got.P90, want.P90) || !floatcmp.Equal(got.Max, want.Max) || !floatcmp.Equal(got.OverCapacity, want.OverCapacity) {
				t.Fatalf("rows %d capacity %v: got %+v, want %+v", rows, capacity, got, want)
			}
		}
	}
}

// TestRunningNoShifts: an empty set has no shifts and every figure NaN.
func TestRunningNoShifts(t *testing.T) {
	set := timedSet(t, []int64{}, []bool{})
	sched, _ := shift.ParseSchedule("06:00", time.UTC)
	a, err := shift.Assign(set, sched)
	if err != nil {
		t.Fatal(err)
	}
	p := shift.NewRunning(set, a, shift.Scale{Positive: 1, Negative: 1}).At(0, 5)
	if p.Shifts != 0 || p.Busiest != -1 || !math.IsNaN(p.P90) || !math.IsNaN(p.OverCapacity) {
		t.Errorf("no shifts: %+v", p)
	}
}
