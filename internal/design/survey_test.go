package design_test

import (
	"encoding/csv"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
)

// readCSV reads a small CSV of testdata, skipping lines that start with
// '#', into its header and rows.
func readCSV(t *testing.T, name string) (header []string, rows [][]string) {
	t.Helper()
	data, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	var kept []string
	for _, line := range strings.Split(string(data), "\n") {
		if !strings.HasPrefix(line, "#") {
			kept = append(kept, line)
		}
	}
	records, err := csv.NewReader(strings.NewReader(strings.Join(kept, "\n"))).ReadAll()
	if err != nil || len(records) < 2 {
		t.Fatalf("%s: %v (%d records)", name, err, len(records))
	}
	return records[0], records[1:]
}

func number(t *testing.T, text string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(strings.TrimSpace(text), 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// TestSurveyReference checks the linearised variance (with its factor
// n/(n-1)) and Korn and Graubard's effective sample size of general
// sampling weights against R's survey package: the values of
// testdata/survey_reference.csv, written by testdata/survey_reference.R
// (R 4.2.2, survey 4.1.1, Debian) from the 80 rows of
// testdata/survey_sample.csv (scores, labels and weights 1/chance of a
// score-based draw, made up for this test). Checked at cuts 0.5 and 0.7:
// the estimate, the effective size (svyciprop's n.eff for method "beta",
// degrees-of-freedom factor included, 1 on this design) as the interval's
// trials, and the interval as Wilson's at that size.
func TestSurveyReference(t *testing.T) {
	_, sample := readCSV(t, "testdata/survey_sample.csv")
	var sc, weights []float64
	var labels []bool
	for _, r := range sample {
		sc = append(sc, number(t, r[0]))
		labels = append(labels, r[1] == "1")
		weights = append(weights, number(t, r[2]))
	}
	set := weighted(t, append([]float64(nil), sc...), append([]bool(nil), labels...), append([]float64(nil), weights...))
	s := design.New(set, design.Sampling)
	if !s.Sampling() || s.WithinClass() || s.Rows != 80 {
		t.Fatalf("design %+v, want general sampling weights over 80 rows", s)
	}
	header, ref := readCSV(t, "testdata/survey_reference.csv")
	column := map[string]int{}
	for i, name := range header {
		column[name] = i
	}
	figures := map[string]design.Figure{"recall": design.Recall, "false_positive_rate": design.FalsePositiveRate,
		"precision": design.Precision, "flagged_share": design.FlaggedShare}
	if len(ref) != 10 {
		t.Fatalf("survey_reference.csv has %d rows, want 10", len(ref))
	}
	for _, r := range ref {
		cut, name := number(t, r[column["cut"]]), strings.TrimSpace(r[column["figure"]])
		estimate, nEff := number(t, r[column["estimate"]]), number(t, r[column["n_eff"]])
		if factor := number(t, r[column["df_factor"]]); factor != 1 {
			t.Errorf("cut %v %s: survey's degrees-of-freedom factor %v, want 1 on a design with no strata or clusters", cut, name, factor)
		}
		p := pointAt(t, append([]float64(nil), sc...), append([]bool(nil), labels...), append([]float64(nil), weights...), cut)
		if name == "base_rate" {
			if got := s.BaseRateTrials(p); !floatcmp.Equal(got, nEff) {
				t.Errorf("cut %v base rate: trials %v, survey's n.eff %v", cut, got, nEff)
			}
			continue
		}
		f, ok := figures[name]
		if !ok {
			t.Fatalf("survey_reference.csv: figure %q", name)
		}
		ci, trials := s.Interval(f, p, 0.95)
		lo, hi := interval.Wilson(estimate*nEff, nEff, 0.95)
		if got := share(f, p); !floatcmp.Equal(got, estimate) {
			t.Errorf("cut %v %s: estimate %v, survey's %v", cut, name, got, estimate)
		}
		if !floatcmp.Equal(trials, nEff) || !floatcmp.Equal(ci[0], lo) || !floatcmp.Equal(ci[1], hi) {
			t.Errorf("cut %v %s: %v over %v trials, want Wilson at survey's n.eff %v: [%v %v]", cut, name, ci, trials, nEff, lo, hi)
		}
	}
}

// share returns figure f's weighted share at p.
func share(f design.Figure, p curve.Point) float64 {
	switch f {
	case design.Recall:
		return p.TP / (p.TP + p.FN)
	case design.FalsePositiveRate:
		return p.FP / (p.FP + p.TN)
	case design.Precision:
		return p.TP / (p.TP + p.FP)
	}
	return (p.TP + p.FP) / (p.TP + p.FP + p.FN + p.TN)
}
