package interval_test

import (
	"encoding/json"
	"math"
	"os"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
)

// TestDifferenceReferenceStatsmodels compares Difference with statsmodels'
// confint_proportions_2indep(method="newcomb"), the values written by
// testdata/reference/make_newcombe.py (statsmodels 0.13.5, Debian).
func TestDifferenceReferenceStatsmodels(t *testing.T) {
	data, err := os.ReadFile("../../testdata/reference/newcombe.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Versions map[string]string `json:"versions"`
		Cases    []struct {
			Count1, Nobs1, Count2, Nobs2, Alpha float64
			Low, High                           float64
		} `json:"cases"`
	}
	if err := json.Unmarshal(data, &ref); err != nil {
		t.Fatalf("newcombe.json: %v", err)
	}
	if len(ref.Cases) < 12 {
		t.Fatalf("newcombe.json has %d cases, want 12", len(ref.Cases))
	}
	for _, c := range ref.Cases {
		lower, upper := interval.Difference(c.Count1, c.Nobs1, c.Count2, c.Nobs2, 1-c.Alpha)
		if !floatcmp.Equal(lower, c.Low) || !floatcmp.Equal(upper, c.High) {
			t.Errorf("Difference(%v/%v - %v/%v, %v) = [%v, %v], statsmodels [%v, %v]",
				c.Count1, c.Nobs1, c.Count2, c.Nobs2, 1-c.Alpha, lower, upper, c.Low, c.High)
		}
	}
}

// TestDifferencePublished checks the worked examples of Newcombe (1998),
// "Interval estimation for the difference between independent proportions:
// comparison of eleven methods", Statistics in Medicine, table II, method
// 10, printed to 4 decimals (from memory; statsmodels agrees, above).
func TestDifferencePublished(t *testing.T) {
	const fourDecimals = 5e-5 // the table's half unit of the 4th decimal
	cases := []struct {
		s1, n1, s2, n2 float64
		lower, upper   float64
	}{
		{56, 70, 48, 80, 0.0524, 0.3339},
		{9, 10, 3, 10, 0.1705, 0.8090},
		{6, 7, 2, 7, 0.0582, 0.8062},
		{5, 56, 0, 29, -0.0381, 0.1926},
	}
	for _, c := range cases {
		lower, upper := interval.Difference(c.s1, c.n1, c.s2, c.n2, 0.95)
		if !floatcmp.Within(lower, c.lower, fourDecimals) || !floatcmp.Within(upper, c.upper, fourDecimals) {
			t.Errorf("%v/%v - %v/%v: [%.4f, %.4f], Newcombe [%v, %v]", c.s1, c.n1, c.s2, c.n2, lower, upper, c.lower, c.upper)
		}
	}
}

// TestDifferenceP checks that the p-value agrees with the interval: at
// confidence 1 - p the interval's near end is 0, and below or above that
// it leaves 0 out or holds it.
func TestDifferenceP(t *testing.T) {
	cases := []struct {
		name           string
		s1, n1, s2, n2 float64
	}{
		{"Newcombe's 56/70 - 48/80", 56, 70, 48, 80},
		{"a negative difference", 3, 10, 9, 10},
		{"a small one", 50, 100, 45, 100},
		{"weighted counts", 12.5, 40.25, 30.75, 61.5},
		{"one side at zero", 5, 56, 0, 29},
	}
	for _, c := range cases {
		p := interval.DifferenceP(c.s1, c.n1, c.s2, c.n2)
		if !(p > 0 && p < 1) {
			t.Fatalf("%s: p %v", c.name, p)
		}
		lower, upper := interval.Difference(c.s1, c.n1, c.s2, c.n2, 1-p)
		near := lower
		if c.s1/c.n1 < c.s2/c.n2 {
			near = upper
		}
		if !floatcmp.Within(near, 0, 1e-9) {
			t.Errorf("%s: p %v, interval at 1-p [%v, %v] does not end at 0", c.name, p, lower, upper)
		}
		// A higher confidence (1 - 0.99p) widens the interval over 0; a
		// lower one (1 - 1.01p) narrows it off 0.
		lo, hi := interval.Difference(c.s1, c.n1, c.s2, c.n2, 1-p*0.99)
		if !(lo <= 0 && hi >= 0) {
			t.Errorf("%s: interval at 1 - 0.99p [%v, %v] leaves 0 out", c.name, lo, hi)
		}
		lo, hi = interval.Difference(c.s1, c.n1, c.s2, c.n2, 1-p*1.01)
		if lo <= 0 && hi >= 0 {
			t.Errorf("%s: interval at 1 - 1.01p [%v, %v] holds 0", c.name, lo, hi)
		}
	}
	// Newcombe's first example leaves 0 out at 95%, so p < 0.05; its lower
	// end 0.0524 is about 1.5 standard errors above 0 (half-width about
	// 0.14 at z 1.96): p is about 0.005, and surely inside (0.001, 0.02).
	if p := interval.DifferenceP(56, 70, 48, 80); !(p > 0.001 && p < 0.02) {
		t.Errorf("56/70 - 48/80: p %v, want within (0.001, 0.02)", p)
	}
	if p := interval.DifferenceP(3, 10, 6, 20); p != 1 {
		t.Errorf("equal proportions: p %v, want 1", p)
	}
	if p := interval.DifferenceP(3, 10, 0, 0); !math.IsNaN(p) {
		t.Errorf("no trials: p %v, want NaN", p)
	}
	if l, u := interval.Difference(0, 0, 1, 2, 0.95); !math.IsNaN(l) || !math.IsNaN(u) {
		t.Errorf("no trials: [%v, %v], want NaN", l, u)
	}
}

// TestOneSided checks that the one-sided bounds at level are the two-sided
// interval's ends at 2·level-1: 95% one-sided is the 90% two-sided
// interval (z 1.644854), each tail 5%.
func TestOneSided(t *testing.T) {
	lower, upper := interval.OneSided(40, 50, 0.95)
	l2, u2 := interval.Wilson(40, 50, 0.90)
	if lower != l2 || upper != u2 {
		t.Errorf("OneSided(40, 50, 0.95) = [%v, %v], Wilson 90%% [%v, %v]", lower, upper, l2, u2)
	}
	// By hand: p 0.8, n 50, z 1.6448536, z² 2.705543: centre
	// (0.8+z²/100)/(1+z²/50) = 0.82705543/1.05411086 = 0.784601; half
	// z/1.05411086·sqrt(0.0032+z²/10000) = 1.560418·0.0589114 = 0.0919274;
	// lower 0.692674, to the 6 decimals worked.
	if !floatcmp.Within(lower, 0.692674, 2e-6) {
		t.Errorf("lower %v, by hand 0.692674", lower)
	}
}
