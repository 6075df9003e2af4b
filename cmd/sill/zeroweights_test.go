package main

import (
	"encoding/json"
	"strings"
	"testing"
)

// TestReportAllZeroWeightsBaseRateUndefined: on a set whose every row
// weighs 0 there is no base rate. The report's assumptions and the net
// benefit note say it is undefined instead of the 0 put in its place, in
// text, Markdown and JSON (null); a --base-rate given still shows.
func TestReportAllZeroWeightsBaseRateUndefined(t *testing.T) {
	dir := t.TempDir()
	path := writeFile(t, dir, "zero.csv", []byte("score,label,w\n0.9,1,0\n0.8,0,0\n0.3,1,0\n0.1,0,0\n0.5,0,0\n"))
	for _, form := range []string{"text", "markdown"} {
		res := runSill(t, "", "report", path, "--weight", "w", "--format", form)
		if res.code != 0 {
			t.Fatalf("%s: exit %d: %s", form, res.code, res.stderr)
		}
		if !strings.Contains(res.stdout, "base rate undefined (no weighted cases) · intervals at 95%") {
			t.Errorf("%s: assumptions do not say the base rate is undefined:\n%s", form, res.stdout)
		}
		if !strings.Contains(res.stdout, "at production's base rate undefined (no weighted cases) and threshold probability n/a") {
			t.Errorf("%s: net benefit note does not say the base rate is undefined:\n%s", form, res.stdout)
		}
		if strings.Contains(res.stdout, "base rate 0.0%") {
			t.Errorf("%s: a base rate of 0.0%% is printed:\n%s", form, res.stdout)
		}
	}
	res := runSill(t, "", "report", path, "--weight", "w", "--format", "json")
	var doc struct {
		Assumptions struct {
			BaseRate *float64 `json:"base_rate"`
		} `json:"assumptions"`
		Calibration struct {
			NetBenefitBaseRate  *float64 `json:"net_benefit_base_rate"`
			NetBenefitThreshold *float64 `json:"net_benefit_threshold"`
		} `json:"calibration"`
	}
	if err := json.Unmarshal([]byte(res.stdout), &doc); err != nil {
		t.Fatalf("json: %v\n%s", err, res.stdout)
	}
	if doc.Assumptions.BaseRate != nil || doc.Calibration.NetBenefitBaseRate != nil || doc.Calibration.NetBenefitThreshold != nil {
		t.Errorf("json: base rate %v, net benefit base rate %v, threshold %v, want all null",
			doc.Assumptions.BaseRate, doc.Calibration.NetBenefitBaseRate, doc.Calibration.NetBenefitThreshold)
	}
	given := runSill(t, "", "report", path, "--weight", "w", "--base-rate", "5%")
	if !strings.Contains(given.stdout, "assumptions: base rate 5.0% ·") {
		t.Errorf("--base-rate 5%% on the same set: assumptions are not the given rate:\n%s", given.stdout)
	}
}
