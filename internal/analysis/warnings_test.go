package analysis_test

import (
	"context"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// TestWarnings checks the warning of each degenerate set, in the words
// of a caller whose way to turn the direction round is a flag.
func TestWarnings(t *testing.T) {
	cases := []struct {
		name    string
		values  []float64
		labels  []bool
		weights []float64
		want    []string
	}{
		{"both classes", []float64{0.9, 0.1}, []bool{true, false}, nil, nil},
		{"empty", nil, nil, nil, nil},
		{"no true case", []float64{0.9}, []bool{false}, nil, []string{"the validation set has no true cases: hit share, AUC and average precision are undefined"}},
		{"no false case", []float64{0.9}, []bool{true}, nil, []string{"the validation set has no false cases: false positive rate and AUC are undefined"}},
		{"no weight", []float64{0.9, 0.1}, []bool{true, false}, []float64{0, 0}, []string{"every row weighs 0: no rate or summary figure is defined"}},
		// The true case scores below both false ones: of its 2 pairs it
		// wins none, ROC AUC 0/2 = 0 (by hand).
		{"upside down", []float64{0.1, 0.5, 0.9}, []bool{true, false, false}, nil, []string{"ROC AUC 0.000 is below 0.5: the scores rank false cases above true ones more often than not; if lower scores mean likely true cases, add --lower-is-riskier"}},
		{"upside down, lower is riskier", []float64{0.9, 0.5, 0.1}, []bool{true, false, false}, nil, []string{"ROC AUC 0.000 is below 0.5: the scores rank false cases above true ones more often than not; if higher scores mean likely true cases, drop --lower-is-riskier"}},
		// The warning agrees with the AUC as shown. One true case between
		// two false ones, the higher weighing 0.5004 and the lower 0.4996:
		// the true case wins 0.4996 of the weight of its pairs, AUC 0.4996,
		// shown "0.500", so no warning; with 0.5006 and 0.4994 it shows
		// "0.499" and is warned about (by hand).
		{"AUC 0.4996 shows 0.500", []float64{0.9, 0.5, 0.1}, []bool{false, true, false}, []float64{0.5004, 1, 0.4996}, nil},
		{"AUC 0.4994 shows 0.499", []float64{0.9, 0.5, 0.1}, []bool{false, true, false}, []float64{0.5006, 1, 0.4994}, []string{"ROC AUC 0.499 is below 0.5: the scores rank false cases above true ones more often than not; if lower scores mean likely true cases, add --lower-is-riskier"}},
		// Three true cases above two false ones: every pair won, AUC 1;
		// every placement is 1, so DeLong's variance (the spread of the
		// placements, DeLong, DeLong and Clarke-Pearson 1988) is 0 and the
		// interval 1–1 (by hand). With one true case and one false one the
		// placements have no spread to estimate (n−1 = 0): the interval is
		// undefined, not of zero width, and "both classes" above is not
		// warned about.
		{"separated", []float64{0.9, 0.8, 0.7, 0.3, 0.2}, []bool{true, true, true, false, false}, nil, []string{separated("every true case scores above every false one", "1.000", "3", "2")}},
		{"separated, weighted", []float64{0.9, 0.8, 0.7, 0.3, 0.2}, []bool{true, true, true, false, false}, []float64{2, 1, 1, 0.5, 1}, []string{separated("every true case scores above every false one", "1.000", "4", "1.50")}},
		// Upside down and separated: both warnings, the turn first.
		{"separated upside down", []float64{0.1, 0.2, 0.7, 0.8}, []bool{true, true, false, false}, nil, []string{
			"ROC AUC 0.000 is below 0.5: the scores rank false cases above true ones more often than not; if lower scores mean likely true cases, add --lower-is-riskier",
			separated("every false case scores above every true one", "0.000", "2", "2")}},
		// One false case above one true one of 3×2 pairs: AUC 5/6, an
		// interval of some width, no warning.
		{"nearly separated", []float64{0.9, 0.8, 0.7, 0.75, 0.2}, []bool{true, true, true, false, false}, nil, nil},
		// A tie between the two classes counts half: AUC 0.5, no warning.
		{"a tie, AUC 0.5", []float64{0.5, 0.5}, []bool{true, false}, nil, nil},
	}
	for _, tc := range cases {
		set, err := scores.New(tc.values, tc.labels, tc.weights, strings.Contains(tc.name, "lower is riskier"))
		if err != nil {
			t.Fatal(err)
		}
		res, err := analysis.Run(context.Background(), set, projection.Assumptions{BaseRate: 0.1, Confidence: 0.95}, analysis.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if got := analysis.WarningWords(res.Warnings, "--lower-is-riskier"); !slices.Equal(got, tc.want) {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
}

// separated is the warning of completely separated classes, in order,
// with the AUC and the counts as shown.
func separated(order, auc, positives, negatives string) string {
	return "ROC AUC " + auc + ": its interval of zero width is not informative, the classes being completely separated (" + order +
		"); DeLong's interval rests on how much each case's share of the other class it outranks varies, and here none varies: " +
		"how far to trust the separation rests on the " + positives + " true and " + negatives + " false cases alone"
}

// TestWeightless: on a set whose rows all weigh 0 no rule but score= is
// met (top=1 took the loosest cut, which flags nothing of weight), the
// reason says why, nothing panics, and net benefit is undefined at the
// cut score= picks and for flagging every case (not 0 at the base rate
// of 0 put in place of the undefined one).
func TestWeightless(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.6, 0.1}, []bool{true, false, false}, []float64{0, 0, 0}, false)
	if err != nil {
		t.Fatal(err)
	}
	var rules []cutrule.Rule
	for _, spec := range []string{"top=1", "top=50%", "base", "hit=0.8", "wrong=0.333", "hit95=0.8", "score=0.5"} {
		r, err := cutrule.Parse(spec)
		if err != nil {
			t.Fatal(err)
		}
		rules = append(rules, r)
	}
	res, err := analysis.Run(context.Background(), set, projection.Assumptions{BaseRate: 0, Confidence: 0.95}, analysis.Options{Rules: rules, CalibrationBins: 2})
	if err != nil {
		t.Fatal(err)
	}
	for i, o := range res.Outcomes {
		last := i == len(res.Outcomes)-1
		switch {
		case last && (!o.Met || o.Point.Score != 0.6):
			t.Errorf("score=0.5: met %v at %v, want the cut at 0.6", o.Met, o.Point.Score)
		case !last && (o.Met || !strings.Contains(o.Reason, "no case in the validation set has any weight")):
			t.Errorf("%s: met %v, reason %q", o.Rule, o.Met, o.Reason)
		}
	}
	if c := res.Calibration; c == nil {
		t.Fatal("no calibration")
	} else if nb, all := res.NetBenefitAt(res.Outcomes[len(rules)-1].Point); !math.IsNaN(nb) || !math.IsNaN(all) {
		t.Errorf("net benefit %v, flagging every case %v, want NaN for both", nb, all)
	}
}
