package page_test

import (
	"math"
	"testing"

	"github.com/sill-tool/sill/internal/page"
)

func nan() float64 { return math.NaN() }

// TestInWords checks the plain fractions, worked out by hand: the first of
// halves, thirds and quarters within 2 points, else the nearest tenth.
func TestInWords(t *testing.T) {
	for _, c := range []struct {
		share float64
		want  string
	}{
		{0.333, "1 in 3"},  // 1/3 is 0.03 points off
		{0.5, "1 in 2"},    // exact
		{0.51, "1 in 2"},   // 1 point off a half
		{0.537, "5 in 10"}, // 3.7 off a half, 12.9 off two thirds: tenths, 5 is nearest
		{0.746, "3 in 4"},  // 0.4 off three quarters
		{0.8, "8 in 10"},   // no half, third or quarter within 2 points
		{0.802, "8 in 10"}, // as above
		{0.378, "4 in 10"}, // 4.5 off a third: tenths
		{0.05, "1 in 10"},  // the lowest share said as a fraction: 0.05 rounds to 1 tenth (half away from zero)
		{0.049, "fewer than 1 in 20"},
		{0.951, "more than 19 in 20"},
		{0, "none"},
		{1, "all"},
		{nan(), "n/a"},
	} {
		if got := page.InWords(c.share); got != c.want {
			t.Errorf("InWords(%v) = %q, want %q", c.share, got, c.want)
		}
	}
}

// TestAbout checks the rounding of expected counts, by hand: two
// significant figures from 10 on, one decimal below.
func TestAbout(t *testing.T) {
	for _, c := range []struct {
		v    float64
		want string
	}{
		{108.2, "110"},
		{342, "340"},
		{61.2, "61"},
		{1349, "1300"},
		{1350, "1400"}, // half rounds away from zero
		{9.96, "10"},
		{2.46, "2.5"},
		{3, "3"},
		{0, "0"},
		{-47, "-47"},
		{math.Inf(1), "n/a"},
	} {
		if got := page.About(c.v); got != c.want {
			t.Errorf("About(%v) = %q, want %q", c.v, got, c.want)
		}
	}
}
