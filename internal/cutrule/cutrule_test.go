package cutrule_test

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

func TestParseAccepts(t *testing.T) {
	cases := []struct {
		text      string
		want      cutrule.Rule
		canonical string
	}{
		{"score=0.5", cutrule.Rule{Kind: cutrule.Score, Value: 0.5}, "score=0.5"},
		{"score=-2.5", cutrule.Rule{Kind: cutrule.Score, Value: -2.5}, "score=-2.5"},
		{"score=1e3", cutrule.Rule{Kind: cutrule.Score, Value: 1000}, "score=1000"},
		{" HIT = 0.8 ", cutrule.Rule{Kind: cutrule.Hit, Value: 0.8}, "hit=0.8"},
		{"hit=0", cutrule.Rule{Kind: cutrule.Hit, Value: 0}, "hit=0"},
		{"hit=1", cutrule.Rule{Kind: cutrule.Hit, Value: 1}, "hit=1"},
		{"wrong=0.333", cutrule.Rule{Kind: cutrule.Wrong, Value: 0.333}, "wrong=0.333"},
		{"hit=80%", cutrule.Rule{Kind: cutrule.Hit, Value: 0.8}, "hit=0.8"},
		{"wrong=33.3%", cutrule.Rule{Kind: cutrule.Wrong, Value: 0.333}, "wrong=0.333"}, // the float 0.333 (package share), not 33.3/100
		{"hit = 80 %", cutrule.Rule{Kind: cutrule.Hit, Value: 0.8}, "hit=0.8"},
		{"wrong=0%", cutrule.Rule{Kind: cutrule.Wrong}, "wrong=0"},
		{"top=57%", cutrule.Rule{Kind: cutrule.Top, Value: 57, Percent: true}, "top=57%"},
		{"wrong=0", cutrule.Rule{Kind: cutrule.Wrong}, "wrong=0"},
		{"top=10", cutrule.Rule{Kind: cutrule.Top, Value: 10}, "top=10"},
		{"top=1", cutrule.Rule{Kind: cutrule.Top, Value: 1}, "top=1"},
		{"top=5%", cutrule.Rule{Kind: cutrule.Top, Value: 5, Percent: true}, "top=5%"},
		{"top=0.5 %", cutrule.Rule{Kind: cutrule.Top, Value: 0.5, Percent: true}, "top=0.5%"},
		{"top=100%", cutrule.Rule{Kind: cutrule.Top, Value: 100, Percent: true}, "top=100%"},
		{"base", cutrule.Rule{Kind: cutrule.Base}, "base"},
		{"Cost", cutrule.Rule{Kind: cutrule.Cost}, "cost"},
		{"queue=90", cutrule.Rule{Kind: cutrule.Queue, Value: 90}, "queue=90"},
		{"queue=0", cutrule.Rule{Kind: cutrule.Queue}, "queue=0"},
		{"queue=12.5", cutrule.Rule{Kind: cutrule.Queue, Value: 12.5}, "queue=12.5"},
		{"hit95=0.8", cutrule.Rule{Kind: cutrule.HitBound, Value: 0.8, Level: 95}, "hit95=0.8"},
		{"HIT90 = 80%", cutrule.Rule{Kind: cutrule.HitBound, Value: 0.8, Level: 90}, "hit90=0.8"},
		{"hit99.5=0.7", cutrule.Rule{Kind: cutrule.HitBound, Value: 0.7, Level: 99.5}, "hit99.5=0.7"},
		{"wrong95=0.333", cutrule.Rule{Kind: cutrule.WrongBound, Value: 0.333, Level: 95}, "wrong95=0.333"},
		{"wrong80=25%", cutrule.Rule{Kind: cutrule.WrongBound, Value: 0.25, Level: 80}, "wrong80=0.25"},
	}
	for _, tc := range cases {
		got, err := cutrule.Parse(tc.text)
		if err != nil {
			t.Errorf("Parse(%q): %v", tc.text, err)
			continue
		}
		if got != tc.want {
			t.Errorf("Parse(%q) = %+v, want %+v", tc.text, got, tc.want)
		}
		if s := got.String(); s != tc.canonical {
			t.Errorf("Parse(%q).String() = %q, want %q", tc.text, s, tc.canonical)
		}
		again, err := cutrule.Parse(got.String())
		if err != nil || again != got {
			t.Errorf("round trip of %q: %+v, %v", got.String(), again, err)
		}
	}
}

func TestParseRejects(t *testing.T) {
	cases := []struct {
		text, why string
	}{
		{"hit=1.2", `"1.2" is more than 1, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"hit=-0.1", `"-0.1" is negative, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"wrong=2", `"2" is more than 1, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"hit=105%", `"105%" is more than 100%, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"hit=-5%", `"-5%" is negative, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"hit=80%%", `"80%%" has more than one percent sign, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"wrong=-0", ""}, // -0 is 0: accepted; see below
		{"top=0", "expected a whole number of rows, at least 1"},
		{"top=2.5", "expected a whole number of rows, at least 1"},
		{"top=-1", "expected a whole number of rows, at least 1"},
		{"top=150%", `"150%" is more than 100%, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"top=0%", "expected a percentage above 0% and at most 100%"},
		{"top=%", `"%" has no number before the percent sign, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"queue=-1", "expected a queue size of at least 0"},
		{"hit100=0.8", `"100" is not a level: expected hitNN with NN in percent above 50 and below 100, as in hit95`},
		{"hit50=0.8", `"50" is not a level: expected hitNN with NN in percent above 50 and below 100, as in hit95`},
		{"wrong9x=0.3", `"9x" is not a level: expected wrongNN with NN in percent above 50 and below 100, as in wrong95`},
		{"hit95", "hit95 needs a value after '='"},
		{"wrong95=1.5", `"1.5" is more than 1, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"base=3", "base takes no value"},
		{"cost=1", "cost takes no value"},
		{"hit", "hit needs a value after '='"},
		{"hit=", "hit needs a value after '='"},
		{"hit=abc", `"abc" is not a number, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"hit=NaN", `"NaN" is not a number, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`},
		{"score=Inf", `"Inf" is not a finite number`},
		{"recall=0.8", "expected one of score=V, top=N, top=P%, hit=R, hitNN=R, wrong=F, wrongNN=F, base, queue=K, queue90=K, cost (R and F shares such as 0.8 or 80%, NN a one-sided level in percent above 50 and below 100, as in hit95=0.8)"},
		{"", "expected one of score=V, top=N, top=P%, hit=R, hitNN=R, wrong=F, wrongNN=F, base, queue=K, queue90=K, cost (R and F shares such as 0.8 or 80%, NN a one-sided level in percent above 50 and below 100, as in hit95=0.8)"},
		{"=0.5", "expected one of score=V, top=N, top=P%, hit=R, hitNN=R, wrong=F, wrongNN=F, base, queue=K, queue90=K, cost (R and F shares such as 0.8 or 80%, NN a one-sided level in percent above 50 and below 100, as in hit95=0.8)"},
	}
	for _, tc := range cases {
		_, err := cutrule.Parse(tc.text)
		if tc.why == "" {
			if err != nil {
				t.Errorf("Parse(%q): %v, want it accepted", tc.text, err)
			}
			continue
		}
		if !errors.Is(err, cutrule.ErrMalformed) {
			t.Errorf("Parse(%q) = %v, want ErrMalformed", tc.text, err)
			continue
		}
		// The message quotes the spec as given and says what was expected.
		want := `malformed cut spec "` + tc.text + `": ` + tc.why
		if err.Error() != want {
			t.Errorf("Parse(%q) message\n got %s\nwant %s", tc.text, err, want)
		}
	}
}

// The hand-built example of this file: ten cases ranked riskiest first,
// P = 4 true (T), N = 6 false (F), validation base rate 0.4.
//
//	cut  score  rows  tp fp fn tn  recall  FDR    flagged share  fpr
//	c0   0.95    1    1  0  3  6   0.25    0      0.1            0
//	c1   0.90    2    2  0  2  6   0.50    0      0.2            0
//	c2   0.80    3    2  1  2  5   0.50    1/3    0.3            1/6
//	c3   0.70    5    3  2  1  4   0.75    0.4    0.5            2/6   (tie: 0.70 T and 0.70 F)
//	c4   0.60    6    3  3  1  3   0.75    0.5    0.6            3/6
//	c5   0.50    7    4  3  0  3   1       3/7    0.7            3/6
//	c6   0.40    8    4  4  0  2   1       0.5    0.8            4/6
//	c7   0.30    9    4  5  0  1   1       5/9    0.9            5/6
//	c8   0.20   10    4  6  0  0   1       0.6    1              1
var (
	handScores = []float64{0.30, 0.95, 0.70, 0.20, 0.90, 0.60, 0.70, 0.40, 0.80, 0.50}
	handLabels = []bool{false, true, false, false, true, false, true, false, false, true}
)

func handCurve(t *testing.T, weights []float64, lowerIsRiskier bool, values []float64) *curve.Curve {
	t.Helper()
	if values == nil {
		values = handScores
	}
	set, err := scores.New(slices.Clone(values), slices.Clone(handLabels), slices.Clone(weights), lowerIsRiskier)
	if err != nil {
		t.Fatal(err)
	}
	return curve.New(set)
}

// validationBase is the assumptions with the validation base rate and no
// volume or costs.
var validationBase = projection.Assumptions{BaseRate: 0.4, Confidence: 0.95}

type want struct {
	spec  string
	score float64 // the cut picked; NaN means unmet
	why   string  // the reason when unmet
}

func checkOutcomes(t *testing.T, c *curve.Curve, a projection.Assumptions, wants []want) {
	t.Helper()
	rules := make([]cutrule.Rule, len(wants))
	for i, w := range wants {
		r, err := cutrule.Parse(w.spec)
		if err != nil {
			t.Fatal(err)
		}
		rules[i] = r
	}
	outcomes, err := cutrule.Find(rules, c, a)
	if err != nil {
		t.Fatal(err)
	}
	if len(outcomes) != len(wants) {
		t.Fatalf("%d outcomes for %d rules", len(outcomes), len(wants))
	}
	for i, w := range wants {
		o := outcomes[i]
		if o.Rule != rules[i] {
			t.Errorf("%s: outcome %d is for %v", w.spec, i, o.Rule)
		}
		if math.IsNaN(w.score) {
			if o.Met {
				t.Errorf("%s: met at score %v, want unmet (%s)", w.spec, o.Point.Score, w.why)
				continue
			}
			if o.Reason != w.why {
				t.Errorf("%s: reason\n got %s\nwant %s", w.spec, o.Reason, w.why)
			}
			if o.Point != (curve.Point{}) {
				t.Errorf("%s: unmet outcome carries a point %+v", w.spec, o.Point)
			}
			continue
		}
		if !o.Met {
			t.Errorf("%s: unmet (%s), want score %v", w.spec, o.Reason, w.score)
			continue
		}
		if o.Point.Score != w.score || o.Reason != "" {
			t.Errorf("%s: score %v reason %q, want %v", w.spec, o.Point.Score, o.Reason, w.score)
		}
		if fig := projection.Project(o.Point, a); !floatcmp.Equal(fig.AlertRate, o.Projected.AlertRate) {
			t.Errorf("%s: projected figures %+v do not match the point's %+v", w.spec, o.Projected, fig)
		}
	}
}

var unmet = math.NaN()

// TestFindHandExample applies every rule to the hand-built example; each
// answer is worked out from the table above.
func TestFindHandExample(t *testing.T) {
	c := handCurve(t, nil, false, nil)
	checkOutcomes(t, c, validationBase, []want{
		// The three starting points, rules of thumb from common practice
		// (no source):
		// base: flagged share <= 0.4 holds at c0-c2 (0.1, 0.2, 0.3), not
		// at c3 (0.5): the deepest is c2.
		{"base", 0.80, ""},
		// hit=0.8: recall first reaches 0.8 at c5 (1.0).
		{"hit=0.8", 0.50, ""},
		// wrong=0.333: c2's FDR is 1/3 = 0.3333... > 0.333, and every cut
		// from c3 on is above it too, so the deepest is c1 (FDR 0).
		{"wrong=0.333", 0.90, ""},

		// wrong=0.34 admits c2 (1/3) but nothing deeper (0.4 and up).
		{"wrong=0.34", 0.80, ""},
		// wrong=0.45: c4 (0.5) fails but c5 (3/7 = 0.4286) holds again:
		// the deepest cut that meets the rule, not the first to break it.
		{"wrong=0.45", 0.50, ""},
		{"wrong=0", 0.90, ""},
		{"wrong=1", 0.20, ""},

		// hit: the strictest cut whose recall is >= R.
		{"hit=0", 0.95, ""},
		{"hit=0.25", 0.95, ""},
		{"hit=0.5", 0.90, ""},
		{"hit=0.6", 0.70, ""},
		{"hit=0.75", 0.70, ""},
		{"hit=1", 0.50, ""},

		// score=V: the smallest data score >= V.
		{"score=0.8", 0.80, ""},
		{"score=0.75", 0.80, ""}, // between 0.70 and 0.80
		{"score=0.7", 0.70, ""},  // the tie group at 0.70, both rows flagged
		{"score=0.1", 0.20, ""},  // below every score: the loosest cut
		{"score=0.96", unmet, "no score is at or beyond 0.96; the riskiest is 0.95"},

		// top=N counts rows; the tie at 0.70 moves two rows at once.
		{"top=1", 0.95, ""},
		{"top=3", 0.80, ""},
		{"top=4", 0.80, ""}, // c3 flags 5 rows
		{"top=5", 0.70, ""},
		{"top=100", 0.20, ""},
		{"top=50%", 0.70, ""}, // 5 of 10 rows
		{"top=45%", 0.80, ""}, // 4.5 rows: at most 4, so c2 (3 rows)
		{"top=30%", 0.80, ""}, // 3 rows exactly
		{"top=5%", unmet, "the strictest cut already flags 1 row (score 0.95)"},
	})
}

// TestFindTopCountsRows checks that top= counts cases: with weights the
// weighted cases (frequency weights: a weight of 10 stands for 10 cases).
// The first row weighs 10 of 13, so top=2 and top=50% (6.5 of 13) flag
// nothing and are unmet, top=11 flags the first two rows (weight 11) and
// top=85% (11.05) the same; top=10 the first row alone.
func TestFindTopCountsRows(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.8, 0.7, 0.6}, []bool{true, false, false, true}, []float64{10, 1, 1, 1}, false)
	if err != nil {
		t.Fatal(err)
	}
	c := curve.New(set)
	a := projection.Assumptions{BaseRate: 11.0 / 13, Confidence: 0.95}
	checkOutcomes(t, c, a, []want{
		{"top=2", unmet, "the strictest cut already flags 10 weighted cases (score 0.9)"},
		{"top=50%", unmet, "the strictest cut already flags 10 weighted cases (score 0.9)"},
		{"top=10", 0.9, ""},
		{"top=11", 0.8, ""},
		{"top=85%", 0.8, ""},
	})

	// A strictest tie group larger than N: top= flags nothing and is unmet.
	set, err = scores.New([]float64{0.9, 0.9, 0.9, 0.1}, []bool{true, false, true, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	checkOutcomes(t, curve.New(set), projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}, []want{
		{"top=2", unmet, "the strictest cut already flags 3 rows (tied at score 0.9)"},
		{"top=3", 0.9, ""},
	})
}

// TestFindProjected checks the operating rules under a production base
// rate of 0.1 with 100 cases per shift. By hand, alert rate = r*0.1 +
// fpr*0.9 and queue = 100 * alert rate:
//
//	c0: 0.025 + 0      = 0.025  queue  2.5  precision 1
//	c1: 0.05  + 0      = 0.05   queue  5    precision 1
//	c2: 0.05  + 0.15   = 0.2    queue 20    precision 0.25
//	c3: 0.075 + 0.3    = 0.375  queue 37.5  precision 0.2
//	c5: 0.1   + 0.45   = 0.55   queue 55
func TestFindProjected(t *testing.T) {
	c := handCurve(t, nil, false, nil)
	a := projection.Assumptions{BaseRate: 0.1, Volume: 100, Confidence: 0.95}
	checkOutcomes(t, c, a, []want{
		{"base", 0.90, ""},        // 0.05 <= 0.1 < 0.2
		{"wrong=0.333", 0.90, ""}, // c2's projected FDR is 0.75
		{"wrong=0.8", 0.70, ""},   // c3's projected FDR 0.8 is within (slack), c4 0.857 is not
		{"hit=0.8", 0.50, ""},     // recall does not depend on the base rate
		{"queue=20", 0.80, ""},
		{"queue=37.5", 0.70, ""}, // exactly at the limit
		{"queue=37", 0.80, ""},
		{"queue=2.5", 0.95, ""},
		{"queue=2", unmet, "the strictest cut already queues 2.5 alerts per shift, above 2"},
		{"score=0.75", 0.80, ""}, // the ranked list does not depend on the base rate
		{"top=3", 0.80, ""},
	})
	a.BaseRate = 0.01
	checkOutcomes(t, c, a, []want{
		// c0's alert rate 0.0025 is within 0.01; c1's 0.005 too; c2's
		// 0.0050 + 0.165 is not.
		{"base", 0.90, ""},
	})
	a.BaseRate = 0.001
	checkOutcomes(t, c, a, []want{
		// c0: 0.25*0.001 = 0.00025 <= 0.001, c1: 0.0005, c2: 0.0005 + 0.1665.
		{"base", 0.90, ""},
	})
	// With no volume the projected queue is undefined; queue= is refused.
	_, err := cutrule.Find([]cutrule.Rule{{Kind: cutrule.Queue, Value: 10}}, c, validationBase)
	if !errors.Is(err, cutrule.ErrNeedsVolume) || err.Error() != "cut queue=10 needs a volume per shift" {
		t.Errorf("queue without volume: %v", err)
	}
}

// TestFindBaseUnmet checks base's reason when even the strictest cut
// flags more than the base rate: at base rate 0.01 with the only false
// case on top, the strictest cut's alert rate is fpr 1 * 0.99 = 99%.
func TestFindBaseUnmet(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.8}, []bool{false, true}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	c := curve.New(set)
	checkOutcomes(t, c, projection.Assumptions{BaseRate: 0.01, Confidence: 0.95}, []want{
		{"base", unmet, "the strictest cut already flags 99.0%, above the base rate 1.0%"},
		{"wrong=0.1", unmet, "every cut has a wrong-alert share above 0.1; the strictest has 100.0%"},
		{"hit=1", 0.8, ""},
	})
}

// TestFindCost checks cost on the hand example with volume 100 and the
// validation base rate. Cost per case = (2*fp + 3*fn) / 10 with a wrong
// alert costing 2 and a miss 3:
//
//	c0 (0,3) 0.9  c1 (0,2) 0.6  c2 (1,2) 0.8  c3 (2,1) 0.7  c4 (3,1) 0.9
//	c5 (3,0) 0.6  c6 (4,0) 0.8  c7 (5,0) 1.0  c8 (6,0) 1.2
//
// c1 and c5 tie at 0.6; cost takes the strictest, c1. The two costs come
// from different terms (0.2*3 and 0.3*2), which differ in the last bit, so
// the tie is only seen with the package's slack.
func TestFindCost(t *testing.T) {
	c := handCurve(t, nil, false, nil)
	a := validationBase
	a.Volume = 100
	a.Costs = &projection.Costs{FalseAlert: 2, Miss: 3}
	outcomes, err := cutrule.Find([]cutrule.Rule{{Kind: cutrule.Cost}}, c, a)
	if err != nil {
		t.Fatal(err)
	}
	o := outcomes[0]
	if !o.Met || o.Point.Score != 0.90 {
		t.Fatalf("cost: met %v at %v, want the strictest of the tie, 0.90", o.Met, o.Point.Score)
	}
	if !floatcmp.Equal(o.Projected.CostPerShift, 60) || !floatcmp.Equal(o.Projected.CostPerCase, 0.6) {
		t.Errorf("cost per shift %v per case %v, want 60 and 0.6", o.Projected.CostPerShift, o.Projected.CostPerCase)
	}

	// A benefit for each hit (-4) moves the least cost deeper:
	// cost = (-4*tp + 2*fp + 3*fn) / 10: c1 -0.2, c3 -0.5, c5 -1.0,
	// c6 -0.8: c5.
	a.Costs = &projection.Costs{FalseAlert: 2, Miss: 3, Hit: -4}
	checkOutcomes(t, c, a, []want{{"cost", 0.50, ""}})

	// Cost works without a volume: the cut of least cost per case.
	a.Volume = 0
	checkOutcomes(t, c, a, []want{{"cost", 0.50, ""}})

	// Without any cost it is refused.
	_, err = cutrule.Find([]cutrule.Rule{{Kind: cutrule.Cost}}, c, validationBase)
	if !errors.Is(err, cutrule.ErrNeedsCosts) || err.Error() != "cut cost needs at least one cost" {
		t.Errorf("cost without costs: %v", err)
	}
}

// TestFindLowerIsRiskier runs the hand example with every score replaced
// by 1-score and the direction flipped: the same cuts are picked, at the
// mirrored scores, and score=V takes the largest data score <= V.
func TestFindLowerIsRiskier(t *testing.T) {
	mirrored := []float64{0.70, 0.05, 0.30, 0.80, 0.10, 0.40, 0.30, 0.60, 0.20, 0.50}
	c := handCurve(t, nil, true, mirrored)
	checkOutcomes(t, c, validationBase, []want{
		{"base", 0.20, ""},
		{"hit=0.8", 0.50, ""},
		{"wrong=0.333", 0.10, ""},
		{"score=0.25", 0.20, ""}, // the largest data score <= 0.25
		{"score=0.3", 0.30, ""},
		{"score=0.9", 0.80, ""},
		{"score=0.01", unmet, "no score is at or beyond 0.01; the riskiest is 0.05"},
		{"top=4", 0.20, ""},
	})
}

// TestFindOneClassAndEmpty checks the reasons given when a class is
// missing or the set is empty.
func TestFindOneClassAndEmpty(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.4}, []bool{false, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	checkOutcomes(t, curve.New(set), projection.Assumptions{BaseRate: 0, Confidence: 0.95}, []want{
		{"hit=0.5", unmet, "the validation set has no true cases, so hit share is undefined"},
		{"wrong=0.5", unmet, "the validation set has no true cases, so every alert is wrong"},
		{"score=0.5", 0.9, ""},
		{"top=1", 0.9, ""},
	})

	// With a production base rate above 0 the missing true cases leave
	// the projected cost undefined at every cut: cost is unmet.
	a := projection.Assumptions{BaseRate: 0.5, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 1, Miss: 1}}
	checkOutcomes(t, curve.New(set), a, []want{
		{"cost", unmet, "the projected cost is undefined: the validation set has no true cases, which the production base rate 50.0% needs"},
	})

	// Only true cases and a production base rate of 0: every projected
	// figure needs the false positive rate, which is undefined.
	set, err = scores.New([]float64{0.5}, []bool{true}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	a = projection.Assumptions{BaseRate: 0, Volume: 10, Confidence: 0.95, Costs: &projection.Costs{Miss: 1}}
	checkOutcomes(t, curve.New(set), a, []want{
		{"base", unmet, "the projected alert rate is undefined: the validation set has no false cases, which the production base rate 0.0% needs"},
		{"wrong=0.333", unmet, "the projected wrong-alert share is undefined: the validation set has no false cases, which the production base rate 0.0% needs"},
		{"queue=1", unmet, "the projected queue is undefined: the validation set has no false cases, which the production base rate 0.0% needs"},
		{"cost", unmet, "the projected cost is undefined: the validation set has no false cases, which the production base rate 0.0% needs"},
		{"hit=0.8", 0.5, ""}, // recall needs no base rate
	})

	// Every row weighs 0: no case counts, so every rule but score= is
	// unmet and the reason says so; top= does not take the loosest cut
	// for flagging nothing of weight. score= reads the ranked list.
	set, err = scores.New([]float64{0.5, 0.4}, []bool{true, false}, []float64{0, 0}, false)
	if err != nil {
		t.Fatal(err)
	}
	const weightless = "no case in the validation set has any weight (every row weighs 0), so no cut can meet the rule"
	a = projection.Assumptions{BaseRate: 0.1, Volume: 10, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 1, Miss: 5}}
	checkOutcomes(t, curve.New(set), a, []want{
		{"base", unmet, weightless},
		{"top=1", unmet, weightless},
		{"top=5", unmet, weightless},
		{"top=50%", unmet, weightless},
		{"hit=0.8", unmet, weightless},
		{"wrong=0.333", unmet, weightless},
		{"hit95=0.8", unmet, weightless},
		{"wrong95=0.333", unmet, weightless},
		{"queue=1", unmet, weightless},
		{"cost", unmet, weightless},
		{"score=0.45", 0.5, ""},
	})

	empty, err := scores.New(nil, nil, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	checkOutcomes(t, curve.New(empty), projection.Assumptions{BaseRate: 0, Confidence: 0.95}, []want{
		{"base", unmet, "the set has no rows"},
		{"hit=0.8", unmet, "the set has no rows"},
		{"top=5", unmet, "the set has no rows"},
	})
}

// TestDefaults checks the starting points: base, hit=0.8, wrong=0.333
// (rules of thumb from common practice, no source), then queue=capacity
// with a capacity and a volume, then cost with costs, then hit95=0.8 and
// wrong95=0.333 (the same with a 95% promise).
func TestDefaults(t *testing.T) {
	specs := func(rules []cutrule.Rule) string {
		var s []string
		for _, r := range rules {
			s = append(s, r.String())
		}
		return strings.Join(s, " ")
	}
	cases := []struct {
		a    projection.Assumptions
		want string
	}{
		{projection.Assumptions{}, "base hit=0.8 wrong=0.333 hit95=0.8 wrong95=0.333"},
		{projection.Assumptions{Capacity: 90}, "base hit=0.8 wrong=0.333 hit95=0.8 wrong95=0.333"}, // no volume: no queue
		{projection.Assumptions{Capacity: 90, Volume: 1500}, "base hit=0.8 wrong=0.333 queue=90 hit95=0.8 wrong95=0.333"},
		{projection.Assumptions{Costs: &projection.Costs{Miss: 1}}, "base hit=0.8 wrong=0.333 cost hit95=0.8 wrong95=0.333"},
		{projection.Assumptions{Capacity: 90, Volume: 1500, Costs: &projection.Costs{}}, "base hit=0.8 wrong=0.333 queue=90 cost hit95=0.8 wrong95=0.333"},
	}
	for _, tc := range cases {
		if got := specs(cutrule.Defaults(tc.a)); got != tc.want {
			t.Errorf("Defaults(%+v) = %s, want %s", tc.a, got, tc.want)
		}
	}
}

// TestFinderStreams checks that a Finder fed by curve.Walk gives the same
// outcomes as Find on the stored curve.
func TestFinderStreams(t *testing.T) {
	c := handCurve(t, nil, false, nil)
	a := validationBase
	a.Volume, a.Costs = 100, &projection.Costs{FalseAlert: 1, Miss: 5}
	rules := []cutrule.Rule{{Kind: cutrule.Base}, {Kind: cutrule.Hit, Value: 0.6}, {Kind: cutrule.Cost}, {Kind: cutrule.Queue, Value: 45}}
	stored, err := cutrule.Find(rules, c, a)
	if err != nil {
		t.Fatal(err)
	}
	f, err := cutrule.NewFinder(rules, c.Set, a)
	if err != nil {
		t.Fatal(err)
	}
	curve.Walk(c.Set, f.Visit)
	for i, o := range f.Outcomes() {
		if o.Point != stored[i].Point || o.Met != stored[i].Met {
			t.Errorf("%v: streamed %+v, stored %+v", rules[i], o.Point, stored[i].Point)
		}
	}
}

// TestFindWrongUnmetReasons checks the reason of an unmet wrong=F when the
// set has both classes but the strictest cut's projected wrong-alert share
// is undefined. Both once read "the validation set has no true cases",
// which was false. Hand-worked:
//   - rows 0.9 (true, weight 0), 0.8 (false), 0.5 (true), 0.2 (false) at
//     base rate 0.5: the cut at 0.9 flags no weight, so its share is
//     undefined; 0.8 flags one false case (share 100%); 0.5 has recall 1
//     and false positive rate 0.5, alert rate 0.75, precision 0.5/0.75,
//     share 33.3%; 0.2 has share 50%. The least is 33.3%.
//   - the same rows at production base rate 0: every alert is wrong.
func TestFindWrongUnmetReasons(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.8, 0.5, 0.2}, []bool{true, false, true, false}, []float64{0, 1, 1, 1}, false)
	if err != nil {
		t.Fatal(err)
	}
	checkOutcomes(t, curve.New(set), projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}, []want{
		{"wrong=0.1", unmet, "every cut has a wrong-alert share above 0.1; the least is 33.3%"},
		{"wrong=0.4", 0.5, ""},
	})
	checkOutcomes(t, curve.New(set), projection.Assumptions{BaseRate: 0, Confidence: 0.95}, []want{
		{"wrong=0.5", unmet, "at the production base rate 0.0% every alert is wrong"},
		{"hit=0.5", 0.5, ""}, // recall needs no base rate
	})
}

// TestBasis checks that each rule names the kind of figure it picks on,
// in the words of package format.
func TestBasis(t *testing.T) {
	cases := []struct {
		spec  string
		given bool
		want  string
	}{
		{"hit=0.8", true, "the measured hit share (production keeps it)"},
		{"wrong=0.3", true, "the projected wrong-alert share"},
		{"wrong=0.3", false, "the measured wrong-alert share"},
		{"top=5%", true, "the measured rows flagged"},
		{"base", false, "the projected alert rate against the base rate"},
		{"queue=90", true, "the projected queue per shift"},
		{"cost", true, "the projected cost per shift"},
	}
	for _, tc := range cases {
		r, err := cutrule.Parse(tc.spec)
		if err != nil {
			t.Fatal(err)
		}
		if got := r.Basis(tc.given); got != tc.want {
			t.Errorf("%s (base rate given %v): %q, want %q", tc.spec, tc.given, got, tc.want)
		}
	}
}
