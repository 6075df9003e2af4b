package design_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/scores"
)

// Floats are compared with floatcmp.Equal (floatcmp.Tolerance, NaN equal
// to NaN).

func weighted(t *testing.T, sc []float64, labels []bool, weights []float64) *scores.Set {
	t.Helper()
	column := "w"
	if weights == nil {
		column = ""
	}
	set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: weights, WeightColumn: column})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

func TestKind(t *testing.T) {
	for _, name := range []string{"frequency", "sampling"} {
		k, err := design.ParseKind(name)
		if err != nil || k.String() != name {
			t.Errorf("ParseKind(%q) = %v, %v", name, k, err)
		}
	}
	if _, err := design.ParseKind("survey"); err == nil {
		t.Error("ParseKind(survey): no error")
	}
}

// TestDeclared: the rule for weights read without a declared kind, on
// small hand-made sets.
func TestDeclared(t *testing.T) {
	labels := []bool{true, true, false, false, false}
	sc := func() []float64 { return []float64{0.9, 0.8, 0.7, 0.2, 0.1} }
	cases := []struct {
		name    string
		weights []float64
		stop    string // part of the error; "" for none
		warn    bool
	}{
		{"no weights", nil, "", false},
		{"all 1", []float64{1, 1, 1, 1, 1}, "", false},
		{"all equal, not 1", []float64{3, 3, 3, 3, 3}, "", false},
		{"downsampled negatives", []float64{1, 1, 10, 10, 10}, "every true case weighs 1 and every false case 10", false},
		{"downsampled, a zero weight ignored", []float64{1, 1, 10, 0, 10}, "every true case weighs 1 and every false case 10", false},
		{"not whole", []float64{1, 2.5, 1, 1, 1}, "not whole numbers (such as 2.5)", false},
		{"whole, varying within a class", []float64{1, 2, 1, 3, 1}, "", true},
	}
	for _, tc := range cases {
		set := weighted(t, sc(), append([]bool(nil), labels...), tc.weights)
		warning, err := design.Declared(set)
		var undeclared *design.UndeclaredError
		switch {
		case tc.stop != "" && (!errors.As(err, &undeclared) || !strings.Contains(err.Error(), tc.stop) || !strings.Contains(err.Error(), `column "w"`)):
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.stop)
		case tc.stop == "" && err != nil:
			t.Errorf("%s: error %v", tc.name, err)
		case tc.warn != (warning != ""):
			t.Errorf("%s: warning %q, want one: %v", tc.name, warning, tc.warn)
		}
	}
}

// TestNew: frequency weights and sets without weights have no design
// (nil); sampling weights constant within class record the class weights.
func TestNew(t *testing.T) {
	labels := []bool{true, false, false}
	if s := design.New(weighted(t, []float64{3, 2, 1}, labels, []float64{1, 10, 10}), design.Frequency); s != nil {
		t.Errorf("frequency: %+v, want nil", s)
	}
	if s := design.New(weighted(t, []float64{3, 2, 1}, labels, nil), design.Sampling); s != nil {
		t.Errorf("no weights: %+v, want nil", s)
	}
	s := design.New(weighted(t, []float64{3, 2, 1}, append([]bool(nil), labels...), []float64{1, 10, 10}), design.Sampling)
	if !s.WithinClass() || s.PositiveWeight != 1 || s.NegativeWeight != 10 {
		t.Errorf("downsampled: %+v", s)
	}
	s = design.New(weighted(t, []float64{3, 2, 1}, append([]bool(nil), labels...), []float64{1, 10, 12}), design.Sampling)
	if !s.Sampling() || s.WithinClass() {
		t.Errorf("varying: %+v", s)
	}
}

// TestInterval checks each design's interval against hand-worked values.
func TestInterval(t *testing.T) {
	const level = 0.95
	// Frequency weights (nil): Wilson on the weighted counts, and the
	// weighted denominators as trials.
	p := curve.Point{TP: 30, FP: 20, FN: 10, TN: 140}
	p.Squares = [4]float64{p.TP, p.FP, p.FN, p.TN}
	var none *design.Sample
	for _, tc := range []struct {
		f                 design.Figure
		successes, trials float64
	}{
		{design.Recall, 30, 40}, {design.FalsePositiveRate, 20, 160}, {design.Precision, 30, 50}, {design.FlaggedShare, 50, 200},
	} {
		ci, n := none.Interval(tc.f, p, level)
		lo, hi := interval.Wilson(tc.successes, tc.trials, level)
		if !floatcmp.Equal(ci[0], lo) || !floatcmp.Equal(ci[1], hi) || n != tc.trials {
			t.Errorf("frequency figure %d: %v over %v trials, want [%v %v] over %v", tc.f, ci, n, lo, hi, tc.trials)
		}
	}

	// Downsampled negatives, weight 10: 30 hits and 10 misses of weight
	// 1, 20 flagged and 180 unflagged false rows of weight 10. Recall is
	// Wilson(30, 40), the false positive rate Wilson(20, 200) on the
	// rows; precision maps Wilson(30, 50) by u/(u+10(1-u)).
	down := &design.Sample{Kind: design.Sampling, ClassConstant: true, PositiveWeight: 1, NegativeWeight: 10}
	q := curve.Point{TP: 30, FP: 200, FN: 10, TN: 1800}
	q.Squares = [4]float64{30, 2000, 10, 18000}
	ci, n := down.Interval(design.Recall, q, level)
	lo, hi := interval.Wilson(30, 40, level)
	if !floatcmp.Equal(ci[0], lo) || !floatcmp.Equal(ci[1], hi) || n != 40 {
		t.Errorf("downsampled recall %v over %v, want [%v %v] over 40", ci, n, lo, hi)
	}
	ci, n = down.Interval(design.FalsePositiveRate, q, level)
	lo, hi = interval.Wilson(20, 200, level)
	if !floatcmp.Equal(ci[0], lo) || !floatcmp.Equal(ci[1], hi) || n != 200 {
		t.Errorf("downsampled false positive rate %v over %v, want [%v %v] over 200", ci, n, lo, hi)
	}
	ci, n = down.Interval(design.Precision, q, level)
	lo, hi = interval.Wilson(30, 50, level)
	mapped := func(u float64) float64 { return u / (u + 10*(1-u)) }
	// Trials: precision 30/230; Taylor variance (200/230)^2*30 +
	// (30/230)^2*2000, over 230^2; trials = p(1-p)/variance.
	prec := 30.0 / 230
	variance := ((1-prec)*(1-prec)*30 + prec*prec*2000) / (230 * 230)
	if !floatcmp.Equal(ci[0], mapped(lo)) || !floatcmp.Equal(ci[1], mapped(hi)) || !floatcmp.Equal(n, prec*(1-prec)/variance) {
		t.Errorf("downsampled precision %v over %v, want [%v %v] over %v", ci, n, mapped(lo), mapped(hi), prec*(1-prec)/variance)
	}
	// The same trials by the delta method on the mapping (worked in the
	// package doc): u = 0.6 over 50 rows, g'(u) = 10 / (u + 10(1-u))^2.
	u := 0.6
	slope := 10 / ((u + 10*(1-u)) * (u + 10*(1-u)))
	if delta := slope * slope * u * (1 - u) / 50; !floatcmp.Equal(delta, variance) {
		t.Errorf("delta-method variance %v, Taylor %v", delta, variance)
	}

	// General sampling weights: true rows of weight 1 and 2 flagged, one
	// of weight 1 missed. Recall 3/4; Taylor variance ((1/4)^2*5 +
	// (3/4)^2*1)/16 = 0.0546875; trials 0.1875/0.0546875 = 3.428571...
	general := &design.Sample{Kind: design.Sampling}
	g := curve.Point{TP: 3, FN: 1, FP: 2, TN: 4}
	g.Squares = [4]float64{5, 4, 1, 16} // FP one row of weight 2, TN one of weight 4
	ci, n = general.Interval(design.Recall, g, level)
	want := 0.1875 / 0.0546875
	lo, hi = interval.Wilson(0.75*want, want, level)
	if !floatcmp.Equal(n, want) || !floatcmp.Equal(ci[0], lo) || !floatcmp.Equal(ci[1], hi) {
		t.Errorf("general recall %v over %v, want [%v %v] over %v", ci, n, lo, hi, want)
	}
	// A share of 0 has no Taylor variance: Kish's size of the domain,
	// (FP+TN)^2 / (squares) = 36/20.
	z := curve.Point{TP: 3, FN: 1, FP: 0, TN: 6}
	z.Squares = [4]float64{5, 0, 1, 20}
	if _, n = general.Interval(design.FalsePositiveRate, z, level); !floatcmp.Equal(n, 36.0/20) {
		t.Errorf("general false positive rate of 0: trials %v, want 1.8", n)
	}
	// Nothing of weight in the denominator: undefined.
	if ci, n = general.Interval(design.Precision, curve.Point{FN: 1, TN: 1}, level); !math.IsNaN(ci[0]) || n != 0 {
		t.Errorf("nothing flagged: %v over %v", ci, n)
	}
}
