package quantile

import (
	"github.com/sill-tool/sill/internal/floatcmp"

	"math"
	"testing"
)

func TestLinear(t *testing.T) {
	// Expected values worked by hand: position q*(n-1), then linear
	// interpolation between the neighbouring order statistics.
	values := []float64{1, 2, 4, 8}
	cases := []struct {
		q, want float64
	}{
		{0, 1},
		{1, 8},
		{0.5, 3},     // position 1.5: halfway between 2 and 4
		{1.0 / 3, 2}, // position 1
		{0.25, 1.75}, // position 0.75: 1 + 0.75*(2-1)
		{0.9, 6.8},   // position 2.7: 4 + 0.7*(8-4)
	}
	for _, c := range cases {
		if got := Linear(values, c.q); !floatcmp.Equal(got, c.want) {
			t.Errorf("Linear(%v, %v) = %v, want %v", values, c.q, got, c.want)
		}
	}
	// Of (1,2,3,4): q 0.05 sits at position 0.15, so 1.15; q 0.95 at 2.85,
	// so 3.85.
	for q, want := range map[float64]float64{0.05: 1.15, 0.95: 3.85} {
		if got := Linear([]float64{1, 2, 3, 4}, q); !floatcmp.Equal(got, want) {
			t.Errorf("Linear(1..4, %v) = %v, want %v", q, got, want)
		}
	}
	if got := Linear(nil, 0.5); !math.IsNaN(got) {
		t.Errorf("Linear of no values = %v, want NaN", got)
	}
	if got := Linear([]float64{3}, 0.7); got != 3 {
		t.Errorf("Linear of one value = %v, want 3", got)
	}
}

func TestLinearPanicsOutsideUnitInterval(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Fatal("no panic for q = 1.5")
		}
	}()
	Linear([]float64{1, 2}, 1.5)
}
