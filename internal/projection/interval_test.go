package projection_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
)

// sixDecimals is the band of values worked by hand to six or more
// decimals.
const sixDecimals = 5e-7

// TestPrecisionInterval checks the adjusted logit interval of Mercaldo,
// Lau and Zhou (2007) on values worked by hand from the paper's formulas.
// The paper's own worked example is not recalled with its numbers, so
// none is quoted; the steps of each value are in its note.
func TestPrecisionInterval(t *testing.T) {
	cases := []struct {
		name         string
		c            projection.Counts
		p, conf      float64
		lower, upper float64
	}{
		{
			// 45 of 50 true cases and 30 of 300 false cases flagged, base
			// rate 5%, 95%: z = 1.959964, z²/2 = 1.920729 is added to each
			// count: 46.920729, 6.920729, 31.920729, 271.920729, so
			// n1 = 53.841459, n0 = 303.841459, r = 0.871461,
			// f = 0.105057; logit = log(0.05*0.871461 / (0.95*0.105057))
			// = -0.828773; var = 6.920729/(46.920729*53.841459) +
			// 271.920729/(31.920729*303.841459) = 0.030776, sd 0.175431;
			// limits expit(-0.828773 ∓ 1.959964*0.175431) = 0.236383,
			// 0.381087. The precision itself is 0.045/0.14 = 0.321429.
			name: "45/50 and 30/300 at 5%", c: projection.Counts{TP: 45, FN: 5, FP: 30, TN: 270}, p: 0.05, conf: 0.95,
			lower: 0.236383, upper: 0.381087,
		},
		{
			// No true case flagged: the lower limit is the precision, 0.
			// Upper by hand: counts 1.920729, 11.920729, 11.920729,
			// 91.920729; n1 = 13.841459, n0 = 103.841459; r = 0.138766,
			// f = 0.114797; logit = log(0.1*0.138766/(0.9*0.114797))
			// = -2.007601; var = 11.920729/(1.920729*13.841459) +
			// 91.920729/(11.920729*103.841459) = 0.448389 + 0.074257
			// = 0.522646, sd 0.722943; upper expit(-2.007601 +
			// 1.959964*0.722943) = expit(-0.590660) = 0.3564835.
			name: "no true case flagged", c: projection.Counts{TP: 0, FN: 10, FP: 10, TN: 90}, p: 0.1, conf: 0.95,
			lower: 0, upper: 0.3564835,
		},
		{
			// No false case flagged: the upper limit is 1.
			name: "no false case flagged", c: projection.Counts{TP: 10, FN: 0, FP: 0, TN: 100}, p: 0.1, conf: 0.95,
			lower: math.NaN(), upper: 1, // lower checked below: strictly inside (0,1)
		},
		{name: "base rate 0", c: projection.Counts{TP: 5, FN: 5, FP: 5, TN: 5}, p: 0, conf: 0.95, lower: 0, upper: 0},
		{name: "base rate 1", c: projection.Counts{TP: 5, FN: 5, FP: 5, TN: 5}, p: 1, conf: 0.95, lower: 1, upper: 1},
		{name: "nothing flagged", c: projection.Counts{FN: 5, TN: 5}, p: 0.5, conf: 0.95, lower: math.NaN(), upper: math.NaN()},
		{name: "no true cases", c: projection.Counts{FP: 5, TN: 5}, p: 0.5, conf: 0.95, lower: math.NaN(), upper: math.NaN()},
		{name: "no cases at all", c: projection.Counts{}, p: 0.5, conf: 0.95, lower: math.NaN(), upper: math.NaN()},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			lower, upper := projection.PrecisionInterval(tc.c, tc.p, tc.conf)
			if tc.name == "no false case flagged" {
				if !(lower > 0 && lower < 1) {
					t.Errorf("lower %v, want inside (0,1)", lower)
				}
			} else if !floatcmp.Within(lower, tc.lower, sixDecimals) {
				t.Errorf("lower %v, want %v", lower, tc.lower)
			}
			if !floatcmp.Within(upper, tc.upper, sixDecimals) {
				t.Errorf("upper %v, want %v", upper, tc.upper)
			}
		})
	}
}

// TestPrecisionIntervalVariance checks the logit variance of
// PrecisionInterval against the delta method worked numerically: the
// derivatives of log(p*r/((1-p)*f)) by r and by f taken by central
// differences, times the binomial variances r(1-r)/n1 and f(1-f)/n0 of
// the adjusted counts. It must match the closed form the interval uses,
// so half the interval's logit width over z is that standard deviation.
func TestPrecisionIntervalVariance(t *testing.T) {
	const conf = 0.9
	z := 1.6448536269514722 // the two-sided 90% normal quantile (common practice, no source)
	add := z * z / 2
	for _, c := range []projection.Counts{{TP: 12, FN: 30, FP: 7, TN: 400}, {TP: 300, FN: 3, FP: 90, TN: 20}, {TP: 1.5, FN: 2.25, FP: 0.5, TN: 8}} {
		tp, fn, fp, tn := c.TP+add, c.FN+add, c.FP+add, c.TN+add
		n1, n0 := tp+fn, fp+tn
		r, f := tp/n1, fp/n0
		const p, h = 0.2, 1e-6
		logit := func(r, f float64) float64 { return math.Log(p * r / ((1 - p) * f)) }
		dr := (logit(r+h, f) - logit(r-h, f)) / (2 * h)
		df := (logit(r, f+h) - logit(r, f-h)) / (2 * h)
		sd := math.Sqrt(dr*dr*r*(1-r)/n1 + df*df*f*(1-f)/n0)
		lower, upper := projection.PrecisionInterval(c, p, conf)
		logitOf := func(v float64) float64 { return math.Log(v / (1 - v)) }
		if got := (logitOf(upper) - logitOf(lower)) / (2 * z); !floatcmp.Within(got, sd, 1e-6) {
			t.Errorf("%+v: logit half-width over z %v, delta method %v", c, got, sd)
		}
		if centre := (logitOf(upper) + logitOf(lower)) / 2; !floatcmp.Within(centre, logit(r, f), 1e-9) {
			t.Errorf("%+v: centre %v, want logit of the adjusted precision %v", c, centre, logit(r, f))
		}
	}
}

// TestAlertRateInterval checks the MOVER with Wilson limits on values
// worked by hand.
func TestAlertRateInterval(t *testing.T) {
	// 45 of 50 true cases flagged, 30 of 300 false cases, base rate 5%,
	// 95%. Wilson limits (z = 1.959964): recall 0.9 in [0.786398,
	// 0.956524], false positive rate 0.1 in [0.070948, 0.139166]. Alert
	// rate 0.05*0.9 + 0.95*0.1 = 0.14;
	// lower 0.14 - sqrt((0.05*0.113602)² + (0.95*0.029052)²) = 0.111822,
	// upper 0.14 + sqrt((0.05*0.056524)² + (0.95*0.039166)²) = 0.177315.
	c := projection.Counts{TP: 45, FN: 5, FP: 30, TN: 270}
	lower, upper := projection.AlertRateInterval(c, 0.05, 0.95)
	if !floatcmp.Within(lower, 0.111822, sixDecimals) || !floatcmp.Within(upper, 0.177315, sixDecimals) {
		t.Errorf("alert rate interval [%v, %v], want [0.111822, 0.177315]", lower, upper)
	}
	// The cost per case with a wrong alert 5, a miss 100, a hit -20:
	// p*miss + r*p*(hit-miss) + f*(1-p)*5 = 5 - 6r + 4.75f = 0.075.
	// The recall's coefficient is negative, so its upper Wilson limit
	// gives the lower limit: lower = 0.075 - sqrt((6*0.056524)² +
	// (4.75*0.029052)²) = -0.291146, upper = 0.075 + sqrt((6*0.113602)²
	// + (4.75*0.039166)²) = 0.781547.
	a := projection.Assumptions{BaseRate: 0.05, Volume: 1000, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 5, Miss: 100, Hit: -20}}
	iv := projection.IntervalsOf(c, a)
	checks := []struct {
		name string
		got  [2]float64
		want [2]float64
	}{
		{"cost per case", iv.CostPerCase, [2]float64{-0.291146, 0.781547}},
		{"cost per shift", iv.CostPerShift, [2]float64{-291.146, 781.547}},
		{"queue per shift", iv.QueuePerShift, [2]float64{111.822, 177.315}},
		{"precision", iv.Precision, [2]float64{0.236383, 0.381087}},
		{"wrong-alert share", iv.FalseDiscovery(), [2]float64{1 - 0.381087, 1 - 0.236383}},
	}
	for _, ch := range checks {
		scale := max(1, math.Abs(ch.want[1]))
		if !floatcmp.Within(ch.got[0], ch.want[0], sixDecimals*scale) || !floatcmp.Within(ch.got[1], ch.want[1], sixDecimals*scale) {
			t.Errorf("%s %v, want %v", ch.name, ch.got, ch.want)
		}
	}
	// A term weighted 0 drops out even where its rate is undefined: with
	// no true cases at base rate 0 the alert rate is the false positive
	// rate, with its Wilson interval.
	lower, upper = projection.AlertRateInterval(projection.Counts{FP: 30, TN: 270}, 0, 0.95)
	if !floatcmp.Within(lower, 0.070948, sixDecimals) || !floatcmp.Within(upper, 0.139166, sixDecimals) {
		t.Errorf("base rate 0: [%v, %v], want the Wilson interval of 30/300", lower, upper)
	}
	// ... but an undefined rate that counts leaves it undefined.
	if lower, upper = projection.AlertRateInterval(projection.Counts{FP: 30, TN: 270}, 0.5, 0.95); !math.IsNaN(lower) || !math.IsNaN(upper) {
		t.Errorf("no true cases at base rate 0.5: [%v, %v], want undefined", lower, upper)
	}
	// Without a volume or costs those intervals are undefined.
	iv = projection.IntervalsOf(c, projection.Assumptions{BaseRate: 0.05, Confidence: 0.95})
	for _, ci := range [][2]float64{iv.QueuePerShift, iv.CostPerShift, iv.CostPerCase} {
		if !math.IsNaN(ci[0]) || !math.IsNaN(ci[1]) {
			t.Errorf("interval %v without the assumption it needs, want undefined", ci)
		}
	}
}

// TestIntervalsHoldTheirFigures checks on a grid of small and large
// counts that each interval holds its own projected figure and that the
// alert rate's and precision's stay within [0,1].
func TestIntervalsHoldTheirFigures(t *testing.T) {
	counts := []float64{0, 1, 2, 3, 7, 40, 1000}
	for _, costs := range []projection.Costs{{FalseAlert: 3, Miss: 50, Hit: -1}, {Miss: 1}} {
		a := projection.Assumptions{Volume: 500, Confidence: 0.95, Costs: &costs}
		for _, tp := range counts {
			for _, fn := range counts {
				for _, fp := range counts {
					for _, tn := range counts {
						for _, p := range []float64{0, 0.001, 0.05, 0.5, 0.99, 1} {
							a.BaseRate = p
							c := projection.Counts{TP: tp, FN: fn, FP: fp, TN: tn}
							fig := projectCounts(c, a)
							iv := projection.IntervalsOf(c, a)
							for _, ch := range []struct {
								name  string
								v     float64
								ci    [2]float64
								share bool
							}{
								{"precision", fig.Precision, iv.Precision, true},
								{"alert rate", fig.AlertRate, iv.AlertRate, true},
								{"queue", fig.QueuePerShift, iv.QueuePerShift, false},
								{"cost", fig.CostPerShift, iv.CostPerShift, false},
							} {
								if math.IsNaN(ch.v) != math.IsNaN(ch.ci[0]) || math.IsNaN(ch.v) != math.IsNaN(ch.ci[1]) {
									t.Fatalf("%+v p=%v %s %v: interval %v defined differently", c, p, ch.name, ch.v, ch.ci)
								}
								if math.IsNaN(ch.v) {
									continue
								}
								slack := 1e-12 * max(1, math.Abs(ch.v))
								if !(ch.ci[0] <= ch.v+slack && ch.v <= ch.ci[1]+slack) {
									t.Fatalf("%+v p=%v %s %v outside %v", c, p, ch.name, ch.v, ch.ci)
								}
								if ch.share && !(ch.ci[0] >= 0 && ch.ci[1] <= 1) {
									t.Fatalf("%+v p=%v %s interval %v leaves [0,1]", c, p, ch.name, ch.ci)
								}
							}
						}
					}
				}
			}
		}
	}
}

// TestPrecisionLowerCeiling: the ceiling is at least the lower limit of
// PrecisionInterval at every TP and FP between two cuts' (every whole
// count in the box, at random classes, cuts, base rates and levels;
// seeded, 2000 boxes), and NaN where it is undefined.
func TestPrecisionLowerCeiling(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 18))
	for trial := range 2000 {
		n1, n0 := float64(1+rng.IntN(30)), float64(1+rng.IntN(30))
		tpLo, fpLo := float64(rng.IntN(int(n1)+1)), float64(rng.IntN(int(n0)+1))
		tpHi, fpHi := tpLo+float64(rng.IntN(int(n1-tpLo)+1)), fpLo+float64(rng.IntN(int(n0-fpLo)+1))
		p := []float64{0.001, 0.05, 0.3, 0.5, 0.9, 0.999}[rng.IntN(6)]
		confidence := []float64{0.8, 0.9, 0.95, 0.99}[rng.IntN(4)]
		stricter := projection.Counts{TP: tpLo, FN: n1 - tpLo, FP: fpLo, TN: n0 - fpLo}
		looser := projection.Counts{TP: tpHi, FN: n1 - tpHi, FP: fpHi, TN: n0 - fpHi}
		ceiling := projection.PrecisionLowerCeiling(stricter, looser, p, confidence)
		for tp := tpLo; tp <= tpHi; tp++ {
			for fp := fpLo; fp <= fpHi; fp++ {
				lower, _ := projection.PrecisionInterval(projection.Counts{TP: tp, FN: n1 - tp, FP: fp, TN: n0 - fp}, p, confidence)
				if lower > ceiling {
					t.Fatalf("trial %d: TP %v FP %v between %+v and %+v at p %v, confidence %v: lower limit %v above the ceiling %v", trial, tp, fp, stricter, looser, p, confidence, lower, ceiling)
				}
			}
		}
	}
	one := projection.Counts{TP: 3, FN: 1}
	for _, c := range []struct {
		counts projection.Counts
		p      float64
	}{{one, 0.5}, {projection.Counts{TP: 1, FN: 1, FP: 1, TN: 1}, 0}, {projection.Counts{TP: 1, FN: 1, FP: 1, TN: 1}, 1}} {
		if got := projection.PrecisionLowerCeiling(c.counts, c.counts, c.p, 0.9); !math.IsNaN(got) {
			t.Errorf("%+v at p %v: ceiling %v, want NaN (a class without cases, or p at an edge)", c.counts, c.p, got)
		}
	}
}
