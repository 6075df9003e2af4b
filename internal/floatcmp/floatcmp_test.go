package floatcmp

import (
	"math"
	"testing"
)

// TestEqual: common practice, no source; each case is hand-worked.
func TestEqual(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	for _, tc := range []struct {
		got, want float64
		equal     bool
	}{
		{0.1 + 0.2, 0.3, true},
		{1, 1 + 2e-9, false},    // absolute below 1: 2e-9 > 1e-9
		{1e6, 1e6 + 5e-4, true}, // relative above 1: 5e-4 <= 1e-9 * 1e6
		{1e6, 1e6 + 2e-3, false},
		{nan, nan, true},
		{nan, 0, false},
		{0, nan, false},
		{inf, inf, true},
		{inf, -inf, false},
		{inf, 1e300, false},
	} {
		if got := Equal(tc.got, tc.want); got != tc.equal {
			t.Errorf("Equal(%v, %v) = %v, want %v", tc.got, tc.want, got, tc.equal)
		}
	}
	if !Within(0.5, 0.51, 0.02) || Within(0.5, 0.53, 0.02) {
		t.Error("Within(0.5, ·, 0.02) does not take 0.51 and refuse 0.53")
	}
}
