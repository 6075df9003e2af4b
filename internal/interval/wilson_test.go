package interval_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
)

// Floats are compared with floatcmp.Equal: one named
// tolerance, floatcmp.Tolerance, with NaN equal to NaN. Published values
// rounded to four decimals are compared after rounding ours the same way.

func round4(v float64) float64 { return math.Round(v*1e4) / 1e4 }

// TestZ checks the two-sided normal quantiles against the values of any
// standard normal table (common practice, no source): 1.644854 (90%),
// 1.959964 (95%), 2.575829 (99%), to six decimals.
func TestZ(t *testing.T) {
	cases := []struct{ confidence, z float64 }{
		{0.90, 1.644854},
		{0.95, 1.959964},
		{0.99, 2.575829},
	}
	for _, tc := range cases {
		if got := interval.Z(tc.confidence); math.Round(got*1e6)/1e6 != tc.z {
			t.Errorf("Z(%v) = %v, want %v to six decimals", tc.confidence, got, tc.z)
		}
	}
	for _, bad := range []float64{0, 1, -0.5, 95, math.NaN()} {
		func() {
			defer func() {
				msg, _ := recover().(string)
				if !strings.HasPrefix(msg, "interval:") {
					t.Errorf("Z(%v): panic %q, want a message starting with \"interval:\"", bad, msg)
				}
			}()
			interval.Z(bad)
		}()
	}
}

// TestWilsonPublished checks Wilson against Newcombe RG (1998), "Two-sided
// confidence intervals for the single proportion: comparison of seven
// methods", Statistics in Medicine 17:857-872: the worked examples of its
// tables for the score interval without continuity correction, 95%, four
// decimals. The values are from memory, not read from the paper; they
// agree to four decimals with our own evaluation of Wilson's formula.
func TestWilsonPublished(t *testing.T) {
	cases := []struct {
		successes, trials float64
		lower, upper      float64
	}{
		{81, 263, 0.2553, 0.3662},
		{15, 148, 0.0624, 0.1605},
		{0, 20, 0, 0.1611},
		{1, 29, 0.0061, 0.1718},
	}
	for _, tc := range cases {
		lo, hi := interval.Wilson(tc.successes, tc.trials, 0.95)
		if round4(lo) != tc.lower || round4(hi) != tc.upper {
			t.Errorf("Wilson(%v, %v) = [%v, %v], want [%v, %v] to four decimals", tc.successes, tc.trials, lo, hi, tc.lower, tc.upper)
		}
	}
}

// TestWilsonHand checks the edges and undefined cases by hand. With no
// successes the Wilson interval is [0, z²/(n+z²)] and with all successes
// [n/(n+z²), 1]: the centre is (z²/2n)/(1+z²/n) and the half width is the
// same amount, so the bounds reduce to those closed forms.
func TestWilsonHand(t *testing.T) {
	z := interval.Z(0.95)
	z2 := z * z
	nan := math.NaN()
	cases := []struct {
		name              string
		successes, trials float64
		lower, upper      float64
	}{
		{"no trials", 0, 0, nan, nan},
		{"negative trials", 1, -2, nan, nan},
		{"NaN trials", 1, nan, nan, nan},
		{"no successes", 0, 10, 0, z2 / (10 + z2)},
		{"all successes", 10, 10, 10 / (10 + z2), 1},
		{"one trial, no success", 0, 1, 0, z2 / (1 + z2)},
		{"one trial, one success", 1, 1, 1 / (1 + z2), 1},
		// Successes outside [0, trials] are clamped.
		{"more successes than trials", 12, 10, 10 / (10 + z2), 1},
		{"negative successes", -1, 10, 0, z2 / (10 + z2)},
		// Weighted counts need not be whole: 0 of 2.5 is [0, z²/(2.5+z²)].
		{"weighted no successes", 0, 2.5, 0, z2 / (2.5 + z2)},
		// Half: symmetric about 0.5. Centre 0.5, half width
		// z/(1+z²/n)*sqrt(0.25/n + z²/(4n²)) with n = 10.
		{"half", 5, 10, 0.5 - z/(1+z2/10)*math.Sqrt(0.025+z2/400), 0.5 + z/(1+z2/10)*math.Sqrt(0.025+z2/400)},
	}
	for _, tc := range cases {
		lo, hi := interval.Wilson(tc.successes, tc.trials, 0.95)
		if !floatcmp.Equal(lo, tc.lower) || !floatcmp.Equal(hi, tc.upper) {
			t.Errorf("%s: Wilson(%v, %v) = [%v, %v], want [%v, %v]", tc.name, tc.successes, tc.trials, lo, hi, tc.lower, tc.upper)
		}
	}
	// The edges are exact, not merely close.
	if lo, _ := interval.Wilson(0, 7, 0.95); lo != 0 {
		t.Errorf("lower bound of 0 of 7 is %v, want exactly 0", lo)
	}
	if _, hi := interval.Wilson(7, 7, 0.95); hi != 1 {
		t.Errorf("upper bound of 7 of 7 is %v, want exactly 1", hi)
	}
}

// TestWilsonProperties checks on seeded random counts that the interval
// lies in [0,1], contains the observed share, mirrors under swapping
// successes and failures, and widens with the confidence level.
func TestWilsonProperties(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 8))
	for range 500 {
		trials := float64(1 + rng.IntN(1000))
		if rng.IntN(2) == 0 {
			trials = rng.Float64() * 50 // weighted counts
		}
		successes := math.Round(rng.Float64()*trials*4) / 4
		successes = min(successes, trials)
		lo, hi := interval.Wilson(successes, trials, 0.95)
		share := successes / trials
		if !(lo >= 0 && hi <= 1 && lo <= share+floatcmp.Tolerance && share <= hi+floatcmp.Tolerance) {
			t.Fatalf("Wilson(%v, %v) = [%v, %v] does not hold the share %v inside [0,1]", successes, trials, lo, hi, share)
		}
		mlo, mhi := interval.Wilson(trials-successes, trials, 0.95)
		if !floatcmp.Equal(mlo, 1-hi) || !floatcmp.Equal(mhi, 1-lo) {
			t.Fatalf("Wilson(%v, %v) = [%v, %v] does not mirror [%v, %v]", trials-successes, trials, mlo, mhi, lo, hi)
		}
		wlo, whi := interval.Wilson(successes, trials, 0.99)
		if wlo > lo+floatcmp.Tolerance || whi < hi-floatcmp.Tolerance {
			t.Fatalf("99%% interval [%v, %v] narrower than the 95%% one [%v, %v]", wlo, whi, lo, hi)
		}
	}
}
