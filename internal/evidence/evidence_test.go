package evidence_test

import (
	"math"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/projection"
)

// TestOf checks the figures of one cut by hand: 4 rows flagged of 10,
// tp 3, fp 1, fn 2, tn 4, at 90% confidence.
//
// Rates: flagged share 4/10, recall 3/5, precision 3/4, FDR 1/4, fpr 1/5.
// Intervals: Wilson at 90% (z = 1.6448536269514715), evaluated by hand
// from Wilson's formula with python3 as the calculator:
// recall 3 of 5 gives [0.2724831718661929, 0.857293527980787], precision
// 3 of 4 gives [0.3561680085985065, 0.9420926788001412]; the FDR interval
// is the complement of precision's, [1-0.94209..., 1-0.35616...]; the
// false positive rate 1 of 5 gives [0.04596245388060399,
// 0.5647074465784567].
// Projection at base rate 0.2, 1000 cases per shift: alert rate
// 0.6*0.2 + 0.2*0.8 = 0.28, precision 0.12/0.28 = 3/7, queue 280.
func TestOf(t *testing.T) {
	p := curve.Point{Index: 3, Score: 0.7, Rows: 4, Cases: 4, TP: 3, FP: 1, FN: 2, TN: 4}
	a := projection.Assumptions{BaseRate: 0.2, Volume: 1000, Confidence: 0.9}
	c := evidence.Of(p, a)
	for _, check := range []struct {
		what      string
		got, want float64
	}{
		{"score", c.Score, 0.7},
		{"rows", float64(c.Rows), 4},
		{"flagged", c.Flagged, 4},
		{"flagged share", c.FlaggedShare, 0.4},
		{"tp", c.TP, 3}, {"fp", c.FP, 1}, {"fn", c.FN, 2}, {"tn", c.TN, 4},
		{"recall", c.Recall, 0.6},
		{"recall lower", c.RecallCI[0], 0.2724831718661929},
		{"recall upper", c.RecallCI[1], 0.857293527980787},
		{"precision", c.Precision, 0.75},
		{"precision lower", c.PrecisionCI[0], 0.3561680085985065},
		{"precision upper", c.PrecisionCI[1], 0.9420926788001412},
		{"false discovery rate", c.FalseDiscoveryRate, 0.25},
		{"false discovery lower", c.FalseDiscoveryCI[0], 1 - 0.9420926788001412},
		{"false discovery upper", c.FalseDiscoveryCI[1], 1 - 0.3561680085985065},
		{"false positive rate", c.FalsePositiveRate, 0.2},
		{"false positive lower", c.FalsePositiveCI[0], 0.04596245388060399},
		{"false positive upper", c.FalsePositiveCI[1], 0.5647074465784567},
		{"projected alert rate", c.Projected.AlertRate, 0.28},
		{"projected precision", c.Projected.Precision, 3.0 / 7},
		{"projected queue", c.Projected.QueuePerShift, 280},
		{"projected cost", c.Projected.CostPerShift, math.NaN()},
	} {
		if !floatcmp.Equal(check.got, check.want) {
			t.Errorf("%s %v, want %v", check.what, check.got, check.want)
		}
	}
	// The interval follows the assumptions' level: at 95% it is wider.
	wide := evidence.Of(p, projection.Assumptions{BaseRate: 0.2, Confidence: 0.95})
	if lo, hi := interval.Wilson(3, 5, 0.95); wide.RecallCI != [2]float64{lo, hi} || !(lo < c.RecallCI[0]) {
		t.Errorf("95%% recall interval %v, want Wilson(3, 5, 0.95) = [%v, %v], wider than %v", wide.RecallCI, lo, hi, c.RecallCI)
	}
}

// TestOfWeighted checks that weighted counts are the effective counts of
// the intervals: recall's interval is Wilson(tp, tp+fn) with the weighted
// sums, here 2.5 of 4.
func TestOfWeighted(t *testing.T) {
	p := curve.Point{Score: 0.4, Rows: 3, Cases: 3, TP: 2.5, FP: 0.5, FN: 1.5, TN: 6}
	c := evidence.Of(p, projection.Assumptions{BaseRate: 0.4, Confidence: 0.95})
	lo, hi := interval.Wilson(2.5, 4, 0.95)
	if c.RecallCI != [2]float64{lo, hi} {
		t.Errorf("recall interval %v, want Wilson(2.5, 4) = [%v, %v]", c.RecallCI, lo, hi)
	}
	lo, hi = interval.Wilson(2.5, 3, 0.95)
	if c.PrecisionCI != [2]float64{lo, hi} {
		t.Errorf("precision interval %v, want Wilson(2.5, 3) = [%v, %v]", c.PrecisionCI, lo, hi)
	}
	if c.Flagged != 3 || c.Rows != 3 {
		t.Errorf("flagged %v over %d rows, want weight 3 over 3 rows", c.Flagged, c.Rows)
	}
}

// TestOfUndefined checks a set with no true cases: recall and its
// interval are NaN, precision is 0 with a defined interval (0 of 2), and
// the FDR interval is its complement, ending exactly at 1.
func TestOfUndefined(t *testing.T) {
	p := curve.Point{Score: 0.9, Rows: 2, Cases: 2, FP: 2, TN: 3}
	c := evidence.Of(p, projection.Assumptions{BaseRate: 0, Confidence: 0.95})
	if !math.IsNaN(c.Recall) || !math.IsNaN(c.RecallCI[0]) || !math.IsNaN(c.RecallCI[1]) {
		t.Errorf("recall %v interval %v, want NaN", c.Recall, c.RecallCI)
	}
	if c.Precision != 0 || c.PrecisionCI[0] != 0 || c.FalseDiscoveryCI[1] != 1 || c.FalseDiscoveryRate != 1 {
		t.Errorf("precision %v interval %v, FDR %v interval %v", c.Precision, c.PrecisionCI, c.FalseDiscoveryRate, c.FalseDiscoveryCI)
	}
	if evidence.Defined(c.Recall) || !evidence.Defined(c.Precision) || evidence.Defined(math.Inf(1)) {
		t.Error("Defined should be false for NaN and infinities, true for numbers")
	}

	// Nothing flagged: precision, FDR and both their intervals are NaN.
	p = curve.Point{Score: 0.9, Rows: 1, Cases: 1, FN: 2, TN: 3} // a zero-weight row flagged
	c = evidence.Of(p, projection.Assumptions{BaseRate: 0.4, Confidence: 0.95})
	for _, v := range []float64{c.Precision, c.FalseDiscoveryRate, c.PrecisionCI[0], c.PrecisionCI[1], c.FalseDiscoveryCI[0], c.FalseDiscoveryCI[1], c.Projected.Precision} {
		if !math.IsNaN(v) {
			t.Errorf("nothing flagged: got %v, want NaN (%+v)", v, c)
		}
	}
}
