package projection_test

import (
	"errors"
	"math"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
)

var nan = math.NaN()

// TestProjectPredictiveValues checks the precision formula against worked
// predictive-value examples of clinical epidemiology, where precision is
// the positive predictive value (PPV), recall the sensitivity and
// 1 - false positive rate the specificity.
func TestProjectPredictiveValues(t *testing.T) {
	cases := []struct {
		name     string
		point    curve.Point
		baseRate float64
		ppv      float64
		note     string
	}{
		{
			// Altman DG, Bland JM (1994), "Diagnostic tests 2: predictive
			// values", BMJ 309:102, using the liver scan data of "Diagnostic
			// tests 1" (BMJ 308:1552): 231 true positives, 32 false
			// positives, 27 false negatives, 54 true negatives, and PPV
			// 231/263 = 0.88 at the sample's prevalence 258/344 (counts and
			// the 0.88 from memory). Projected at that same prevalence the
			// formula must give the sample PPV exactly: r*p = 231/344,
			// f*(1-p) = (32/86)*(86/344) = 32/344, so 231/263.
			name:     "Altman and Bland liver scan at the sample prevalence",
			point:    curve.Point{TP: 231, FP: 32, FN: 27, TN: 54},
			baseRate: 258.0 / 344,
			ppv:      231.0 / 263,
		},
		{
			// The same scan at prevalence 0.25, computed by hand (the
			// paper's point is that predictive values move with prevalence;
			// this particular figure is ours, not quoted from it):
			// sensitivity 231/258 = 0.89535, specificity 54/86 = 0.62791;
			// PPV = 0.89535*0.25 / (0.89535*0.25 + 0.37209*0.75)
			//     = 0.22384 / 0.50291 = 0.4451.
			name:     "Altman and Bland liver scan at prevalence 0.25",
			point:    curve.Point{TP: 231, FP: 32, FN: 27, TN: 54},
			baseRate: 0.25,
			ppv:      (231.0 / 258 * 0.25) / (231.0/258*0.25 + 32.0/86*0.75),
			note:     "about 0.445",
		},
		{
			// A common teaching illustration of how the predictive value
			// depends on prevalence, the subject of the chapter on diagnosis
			// in Fletcher RH, Fletcher SW, Fletcher GS (2014), "Clinical
			// Epidemiology: The Essentials", 5th ed. (from memory; we do not
			// claim these exact numbers are printed there): sensitivity 0.9
			// and specificity 0.9 at prevalence 1% give a PPV of only about
			// 8%. The value is our own hand computation:
			// 0.9*0.01 / (0.9*0.01 + 0.1*0.99) = 0.009 / 0.108 = 1/12
			// = 0.0833.
			name:     "sensitivity 0.9, specificity 0.9, prevalence 1%",
			point:    curve.Point{TP: 90, FP: 10, FN: 10, TN: 90},
			baseRate: 0.01,
			ppv:      1.0 / 12,
			note:     "0.0833",
		},
		{
			// The same test at prevalence 50%, by hand:
			// 0.45 / (0.45 + 0.05) = 0.9.
			name:     "sensitivity 0.9, specificity 0.9, prevalence 50%",
			point:    curve.Point{TP: 90, FP: 10, FN: 10, TN: 90},
			baseRate: 0.5,
			ppv:      0.9,
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			fig := projection.Project(tc.point, projection.Assumptions{BaseRate: tc.baseRate, Confidence: 0.95})
			if !floatcmp.Equal(fig.Precision, tc.ppv) {
				t.Errorf("precision %v, want %v %s", fig.Precision, tc.ppv, tc.note)
			}
			if !floatcmp.Equal(fig.FalseDiscoveryRate(), 1-tc.ppv) {
				t.Errorf("false discovery rate %v, want %v", fig.FalseDiscoveryRate(), 1-tc.ppv)
			}
		})
	}
	// The two rounded values quoted above, as a guard on the hand work:
	// each agrees to half a unit of its last quoted decimal.
	const fourDecimals, threeDecimals = 0.00005, 0.0005
	if fig := projection.Project(curve.Point{TP: 90, FP: 10, FN: 10, TN: 90}, projection.Assumptions{BaseRate: 0.01}); !floatcmp.Within(fig.Precision, 0.0833, fourDecimals) {
		t.Errorf("PPV at 1%% prevalence %v, want about 0.0833", fig.Precision)
	}
	if fig := projection.Project(curve.Point{TP: 231, FP: 32, FN: 27, TN: 54}, projection.Assumptions{BaseRate: 0.25}); !floatcmp.Within(fig.Precision, 0.445, threeDecimals) {
		t.Errorf("liver scan PPV at prevalence 0.25 %v, want about 0.445", fig.Precision)
	}
}

// TestProjectFigures checks every projected figure by hand. The point has
// recall 0.9 and false positive rate 0.1.
func TestProjectFigures(t *testing.T) {
	p := curve.Point{TP: 90, FP: 10, FN: 10, TN: 90}
	costs := &projection.Costs{FalseAlert: 5, Miss: 100, Hit: -20}
	cases := []struct {
		name  string
		point curve.Point
		a     projection.Assumptions
		want  projection.Figures
	}{
		{
			// alert rate 0.9*0.01 + 0.1*0.99 = 0.108; queue 1000*0.108 =
			// 108; cost per case 0.01*0.9*(-20) + 0.99*0.1*5 +
			// 0.01*0.1*100 = -0.18 + 0.495 + 0.1 = 0.415; per shift 415.
			name:  "volume and costs",
			point: p,
			a:     projection.Assumptions{BaseRate: 0.01, Volume: 1000, Costs: costs},
			want:  projection.Figures{AlertRate: 0.108, Precision: 1.0 / 12, QueuePerShift: 108, CostPerShift: 415, CostPerCase: 0.415},
		},
		{
			// No volume: nothing per shift; cost per case still defined.
			name:  "no volume",
			point: p,
			a:     projection.Assumptions{BaseRate: 0.01, Costs: costs},
			want:  projection.Figures{AlertRate: 0.108, Precision: 1.0 / 12, QueuePerShift: nan, CostPerShift: nan, CostPerCase: 0.415},
		},
		{
			// No costs: no cost figures.
			name:  "no costs",
			point: p,
			a:     projection.Assumptions{BaseRate: 0.01, Volume: 1000},
			want:  projection.Figures{AlertRate: 0.108, Precision: 1.0 / 12, QueuePerShift: 108, CostPerShift: nan, CostPerCase: nan},
		},
		{
			// Base rate 0: only false alerts, alert rate = fpr 0.1,
			// precision 0; cost 0.1*5 = 0.5 per case, 500 per shift.
			name:  "base rate 0",
			point: p,
			a:     projection.Assumptions{BaseRate: 0, Volume: 1000, Costs: costs},
			want:  projection.Figures{AlertRate: 0.1, Precision: 0, QueuePerShift: 100, CostPerShift: 500, CostPerCase: 0.5},
		},
		{
			// Base rate 1: alert rate = recall 0.9, precision 1; cost
			// 0.9*(-20) + 0.1*100 = -8 per case.
			name:  "base rate 1",
			point: p,
			a:     projection.Assumptions{BaseRate: 1, Volume: 10, Costs: costs},
			want:  projection.Figures{AlertRate: 0.9, Precision: 1, QueuePerShift: 9, CostPerShift: -80, CostPerCase: -8},
		},
		{
			// A validation set with no true cases: recall is undefined,
			// but at base rate 0 it is never needed.
			name:  "no true cases at base rate 0",
			point: curve.Point{FP: 3, TN: 1},
			a:     projection.Assumptions{BaseRate: 0, Volume: 8},
			want:  projection.Figures{AlertRate: 0.75, Precision: 0, QueuePerShift: 6, CostPerShift: nan, CostPerCase: nan},
		},
		{
			// ...and at base rate 0.5 everything that needs recall is NaN.
			name:  "no true cases at base rate 0.5",
			point: curve.Point{FP: 3, TN: 1},
			a:     projection.Assumptions{BaseRate: 0.5, Volume: 8, Costs: costs},
			want:  projection.Figures{AlertRate: nan, Precision: nan, QueuePerShift: nan, CostPerShift: nan, CostPerCase: nan},
		},
		{
			// No false cases at base rate 1: fpr is undefined and unneeded.
			name:  "no false cases at base rate 1",
			point: curve.Point{TP: 1, FN: 3},
			a:     projection.Assumptions{BaseRate: 1, Volume: 8},
			want:  projection.Figures{AlertRate: 0.25, Precision: 1, QueuePerShift: 2, CostPerShift: nan, CostPerCase: nan},
		},
		{
			// Nothing flagged: alert rate 0, precision undefined.
			name:  "nothing flagged",
			point: curve.Point{FN: 2, TN: 8},
			a:     projection.Assumptions{BaseRate: 0.2, Volume: 100, Costs: costs},
			want:  projection.Figures{AlertRate: 0, Precision: nan, QueuePerShift: 0, CostPerShift: 2000, CostPerCase: 20},
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := projection.Project(tc.point, tc.a)
			for _, c := range []struct {
				what      string
				got, want float64
			}{
				{"alert rate", got.AlertRate, tc.want.AlertRate},
				{"precision", got.Precision, tc.want.Precision},
				{"queue per shift", got.QueuePerShift, tc.want.QueuePerShift},
				{"cost per shift", got.CostPerShift, tc.want.CostPerShift},
				{"cost per case", got.CostPerCase, tc.want.CostPerCase},
			} {
				if !floatcmp.Equal(c.got, c.want) {
					t.Errorf("%s %v, want %v", c.what, c.got, c.want)
				}
			}
		})
	}
}

// TestProjectValidationRate checks that at the validation base rate the
// projected figures equal the validation ones: alert rate = flagged share
// and precision = validation precision (3 of 4 flagged on a set of 10
// with 5 true cases: 0.4 and 0.75).
func TestProjectValidationRate(t *testing.T) {
	p := curve.Point{TP: 3, FP: 1, FN: 2, TN: 4}
	fig := projection.Project(p, projection.Assumptions{BaseRate: 0.5})
	if !floatcmp.Equal(fig.AlertRate, p.FlaggedShare()) || !floatcmp.Equal(fig.AlertRate, 0.4) {
		t.Errorf("alert rate %v, flagged share %v, want 0.4", fig.AlertRate, p.FlaggedShare())
	}
	if !floatcmp.Equal(fig.Precision, p.Precision()) || !floatcmp.Equal(fig.Precision, 0.75) {
		t.Errorf("precision %v, validation %v, want 0.75", fig.Precision, p.Precision())
	}
}

func TestValidate(t *testing.T) {
	ok := projection.Assumptions{BaseRate: 0.07, Volume: 1500, Capacity: 90, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 120, Miss: 1200, Hit: -5}}
	if err := ok.Validate(); err != nil {
		t.Errorf("valid assumptions: %v", err)
	}
	if err := (projection.Assumptions{Confidence: 0.9}).Validate(); err != nil {
		t.Errorf("zero assumptions with a confidence: %v", err)
	}
	if err := (projection.Assumptions{BaseRate: 1, Confidence: 0.5}).Validate(); err != nil {
		t.Errorf("base rate 1: %v", err)
	}
	cases := []struct {
		name    string
		change  func(a *projection.Assumptions)
		message string
	}{
		{"base rate below 0", func(a *projection.Assumptions) { a.BaseRate = -0.1 }, "invalid assumption: base rate -0.1, expected a share in [0,1]"},
		{"base rate above 1", func(a *projection.Assumptions) { a.BaseRate = 1.5 }, "invalid assumption: base rate 1.5, expected a share in [0,1]"},
		{"base rate NaN", func(a *projection.Assumptions) { a.BaseRate = nan }, "invalid assumption: base rate NaN, expected a share in [0,1]"},
		{"negative volume", func(a *projection.Assumptions) { a.Volume = -1 }, "invalid assumption: volume per shift -1, expected a positive number"},
		{"infinite volume", func(a *projection.Assumptions) { a.Volume = math.Inf(1) }, "invalid assumption: volume per shift +Inf, expected a positive number"},
		{"NaN volume", func(a *projection.Assumptions) { a.Volume = nan }, "invalid assumption: volume per shift NaN, expected a positive number"},
		{"negative capacity", func(a *projection.Assumptions) { a.Capacity = -3 }, "invalid assumption: capacity -3, expected a positive number"},
		{"confidence 0", func(a *projection.Assumptions) { a.Confidence = 0 }, "invalid assumption: confidence 0, expected a level in (0,1) such as 0.95"},
		{"confidence 1", func(a *projection.Assumptions) { a.Confidence = 1 }, "invalid assumption: confidence 1, expected a level in (0,1) such as 0.95"},
		{"confidence 95", func(a *projection.Assumptions) { a.Confidence = 95 }, "invalid assumption: confidence 95, expected a level in (0,1) such as 0.95"},
		{"NaN cost", func(a *projection.Assumptions) { a.Costs = &projection.Costs{Miss: nan} }, "invalid assumption: cost NaN, expected a finite number"},
		{"infinite cost", func(a *projection.Assumptions) { a.Costs = &projection.Costs{Hit: math.Inf(-1)} }, "invalid assumption: cost -Inf, expected a finite number"},
		// Finite but too large: the figures of a shift would overflow.
		{"volume past the bound", func(a *projection.Assumptions) { a.Volume = 1e200 }, "invalid assumption: volume per shift 1e+200 is too large, expected at most 1e+150 so that the figures stay finite"},
		{"capacity past the bound", func(a *projection.Assumptions) { a.Capacity = 1e151 }, "invalid assumption: capacity 1e+151 is too large, expected at most 1e+150 so that the figures stay finite"},
		{"cost past the bound", func(a *projection.Assumptions) { a.Costs = &projection.Costs{Miss: -1e300} }, "invalid assumption: cost 1e+300 is too large, expected at most 1e+150 so that the figures stay finite"},
		{"cost per shift past the bound", func(a *projection.Assumptions) { a.Volume, a.Costs = 1e100, &projection.Costs{FalseAlert: 1e51} }, "invalid assumption: cost per shift 1e+151 is too large, expected at most 1e+150 so that the figures stay finite"},
	}
	var amount *projection.AmountError
	if err := (projection.Assumptions{Volume: 1e200, Confidence: 0.9}).Validate(); !errors.As(err, &amount) || amount.Amount != projection.AmountVolume {
		t.Errorf("volume past the bound: %v, want an AmountError naming the volume", err)
	}
	for _, tc := range cases {
		a := ok
		tc.change(&a)
		err := a.Validate()
		if !errors.Is(err, projection.ErrAssumption) {
			t.Errorf("%s: %v, want ErrAssumption", tc.name, err)
			continue
		}
		if err.Error() != tc.message {
			t.Errorf("%s: message\n got %s\nwant %s", tc.name, err, tc.message)
		}
	}
}
