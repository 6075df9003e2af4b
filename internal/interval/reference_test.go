package interval_test

import (
	"encoding/json"
	"math"
	"os"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
)

// TestWilsonReferenceStatsmodels compares Wilson with
// statsmodels.stats.proportion.proportion_confint(method="wilson").
func TestWilsonReferenceStatsmodels(t *testing.T) {
	// reference: statsmodels 0.13.5 proportion_confint(count, nobs, alpha, method="wilson") via testdata/reference/make_reference.py
	data, err := os.ReadFile("../../testdata/reference/wilson.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Versions map[string]string `json:"versions"`
		Cases    []struct {
			Count, Nobs, Alpha float64
			Low, High          float64
		} `json:"cases"`
	}
	if err := json.Unmarshal(data, &ref); err != nil {
		t.Fatalf("wilson.json: %v", err)
	}
	t.Logf("reference versions: %v", ref.Versions)

	// The table holds 10 integer and 3 non-integer cases at 3 levels each.
	if len(ref.Cases) < 39 {
		t.Fatalf("wilson.json has %d cases, want at least 39", len(ref.Cases))
	}
	fractional := 0
	for _, c := range ref.Cases {
		if c.Count != math.Trunc(c.Count) || c.Nobs != math.Trunc(c.Nobs) {
			fractional++
		}
		confidence := 1 - c.Alpha
		lower, upper := interval.Wilson(c.Count, c.Nobs, confidence)
		// statsmodels leaves rounding residue such as -2.8e-17 at count 0;
		// sill clamps to [0,1]. Both agree within the tolerance.
		if !floatcmp.Equal(lower, c.Low) || !floatcmp.Equal(upper, c.High) {
			t.Errorf("Wilson(%v, %v, %v) = [%v, %v], statsmodels [%v, %v]", c.Count, c.Nobs, confidence, lower, upper, c.Low, c.High)
		}
	}
	if fractional == 0 {
		t.Error("wilson.json has no non-integer counts")
	}
}

// TestWilsonReferenceCloseFails shows the comparison can fail.
func TestWilsonReferenceCloseFails(t *testing.T) {
	if floatcmp.Equal(0.25, 0.25+2*floatcmp.Tolerance) {
		t.Error("values two tolerances apart compared equal")
	}
	if floatcmp.Equal(math.NaN(), 0.25) || !floatcmp.Equal(math.NaN(), math.NaN()) {
		t.Error("NaN handling is wrong")
	}
}
