package curve_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/scores"
)

// Floats are compared with floatcmp.Equal: one named
// tolerance, floatcmp.Tolerance, with NaN equal to NaN.

var nan = math.NaN()

// mustSet builds a ranked set or fails the test.
func mustSet(t testing.TB, values []float64, labels []bool, weights []float64, lowerIsRiskier bool) *scores.Set {
	t.Helper()
	set, err := scores.New(slices.Clone(values), slices.Clone(labels), slices.Clone(weights), lowerIsRiskier)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// row is one expected point, with its rates.
type row struct {
	score                            float64
	rows                             int
	tp, fp, fn, tn                   float64
	recall, precision, fdr, fpr, shr float64
}

func pointsOf(set *scores.Set) ([]curve.Point, curve.Summary) {
	var points []curve.Point
	sum := curve.Walk(set, func(p curve.Point) { points = append(points, p) })
	return points, sum
}

func checkPoints(t *testing.T, got []curve.Point, want []row) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%d cuts, want %d", len(got), len(want))
	}
	for i, w := range want {
		p := got[i]
		if p.Index != i || p.Score != w.score || p.Rows != w.rows {
			t.Errorf("cut %d: index %d score %v rows %d, want %d %v %d", i, p.Index, p.Score, p.Rows, i, w.score, w.rows)
		}
		for _, c := range []struct {
			name      string
			got, want float64
		}{
			{"tp", p.TP, w.tp}, {"fp", p.FP, w.fp}, {"fn", p.FN, w.fn}, {"tn", p.TN, w.tn},
			{"recall", p.Recall(), w.recall}, {"precision", p.Precision(), w.precision},
			{"false discovery rate", p.FalseDiscoveryRate(), w.fdr}, {"false positive rate", p.FalsePositiveRate(), w.fpr},
			{"flagged share", p.FlaggedShare(), w.shr},
		} {
			if !floatcmp.Equal(c.got, c.want) {
				t.Errorf("cut %d (score %v): %s %v, want %v", i, p.Score, c.name, c.got, c.want)
			}
		}
	}
}

func checkSummary(t *testing.T, got, want curve.Summary) {
	t.Helper()
	if got.Rows != want.Rows || got.Weighted != want.Weighted || got.Probabilities != want.Probabilities {
		t.Errorf("rows %d weighted %v probabilities %v, want %d %v %v", got.Rows, got.Weighted, got.Probabilities, want.Rows, want.Weighted, want.Probabilities)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"positives", got.Positives, want.Positives}, {"negatives", got.Negatives, want.Negatives},
		{"base rate", got.BaseRate, want.BaseRate}, {"ROC AUC", got.ROCAUC, want.ROCAUC},
		{"average precision", got.AveragePrecision, want.AveragePrecision},
		{"Brier score", got.Brier, want.Brier}, {"log loss", got.LogLoss, want.LogLoss},
	} {
		if !floatcmp.Equal(c.got, c.want) {
			t.Errorf("%s %v, want %v", c.name, c.got, c.want)
		}
	}
}

// TestWalkHandWorked checks the sweep and the summary on small sets whose
// every figure was worked out by hand in the comments.
func TestWalkHandWorked(t *testing.T) {
	const T, F = true, false
	cases := []struct {
		name    string
		scores  []float64
		labels  []bool
		weights []float64
		lower   bool
		points  []row
		summary curve.Summary
	}{
		{
			// Ties at 0.8 (one of each class) and 0.3 (one of each).
			// P = 3, N = 4. Cuts 0.9, 0.8, 0.5, 0.3, 0.1.
			// AUC by pairs, ties half: the positive at 0.9 outranks all 4
			// negatives (4); the one at 0.8 outranks 0.5, 0.3, 0.1 and ties
			// 0.8 (3.5); the one at 0.3 outranks 0.1 and ties 0.3 (1.5):
			// 9 of 12 = 0.75.
			// AP: recall rises at 0.9 (1/3, precision 1), 0.8 (2/3,
			// precision 2/3) and 0.3 (1, precision 3/6):
			// 1/3 + 1/3*2/3 + 1/3*1/2 = 13/18.
			// Brier: 0.01 + 0.64 + 0.04 + 0.25 + 0.49 + 0.09 + 0.01 = 1.53, / 7.
			name:   "ties",
			scores: []float64{0.3, 0.9, 0.8, 0.1, 0.5, 0.8, 0.3},
			labels: []bool{T, T, F, F, F, T, F},
			points: []row{
				{0.9, 1, 1, 0, 2, 4, 1.0 / 3, 1, 0, 0, 1.0 / 7},
				{0.8, 3, 2, 1, 1, 3, 2.0 / 3, 2.0 / 3, 1.0 / 3, 1.0 / 4, 3.0 / 7},
				{0.5, 4, 2, 2, 1, 2, 2.0 / 3, 0.5, 0.5, 0.5, 4.0 / 7},
				{0.3, 6, 3, 3, 0, 1, 1, 0.5, 0.5, 3.0 / 4, 6.0 / 7},
				{0.1, 7, 3, 4, 0, 0, 1, 3.0 / 7, 4.0 / 7, 1, 1},
			},
			summary: curve.Summary{
				Rows: 7, Positives: 3, Negatives: 4, BaseRate: 3.0 / 7, Probabilities: true,
				ROCAUC: 0.75, AveragePrecision: 13.0 / 18, Brier: 1.53 / 7,
				LogLoss: -(2*math.Log(0.9) + math.Log(0.2) + math.Log(0.8) + math.Log(0.5) + math.Log(0.3) + math.Log(0.7)) / 7,
			},
		},
		{
			// Weighted, with a zero weight: 0.9 T w2, 0.7 F w0, 0.6 F w1,
			// 0.6 T w0.5, 0.2 F w3. P = 2.5, N = 4. The zero-weight row
			// at 0.7 is still a cut, with the counts of the cut before.
			// AUC: 2*(0+1+3) + 0.5*(3 + 1/2) = 9.75, / (2.5*4) = 0.975.
			// AP: 0.8*1 at 0.9, nothing at 0.7, 0.2*(2.5/3.5) at 0.6:
			// 0.8 + 1/7.
			// Brier: 2*0.01 + 0 + 0.36 + 0.5*0.16 + 3*0.04 = 0.58, / 6.5.
			name:    "weights with a zero weight",
			scores:  []float64{0.6, 0.9, 0.2, 0.7, 0.6},
			labels:  []bool{F, T, F, F, T},
			weights: []float64{1, 2, 3, 0, 0.5},
			points: []row{
				{0.9, 1, 2, 0, 0.5, 4, 0.8, 1, 0, 0, 2 / 6.5},
				{0.7, 2, 2, 0, 0.5, 4, 0.8, 1, 0, 0, 2 / 6.5},
				{0.6, 4, 2.5, 1, 0, 3, 1, 2.5 / 3.5, 1 / 3.5, 0.25, 3.5 / 6.5},
				{0.2, 5, 2.5, 4, 0, 0, 1, 2.5 / 6.5, 4 / 6.5, 1, 1},
			},
			summary: curve.Summary{
				Rows: 5, Positives: 2.5, Negatives: 4, BaseRate: 2.5 / 6.5, Weighted: true, Probabilities: true,
				ROCAUC: 0.975, AveragePrecision: 0.8 + 1.0/7, Brier: 0.58 / 6.5,
				LogLoss: -(2*math.Log(0.9) + math.Log(0.4) + 0.5*math.Log(0.6) + 3*math.Log(0.8)) / 6.5,
			},
		},
		{
			// Only true cases: false positive rate and AUC undefined;
			// precision 1 at every cut, so AP = 1/3*1 + 2/3*1 = 1.
			// Brier: (0.09 + 0.36 + 0.36) / 3 = 0.27.
			name:   "true cases only",
			scores: []float64{0.4, 0.7, 0.4},
			labels: []bool{T, T, T},
			points: []row{
				{0.7, 1, 1, 0, 2, 0, 1.0 / 3, 1, 0, nan, 1.0 / 3},
				{0.4, 3, 3, 0, 0, 0, 1, 1, 0, nan, 1},
			},
			summary: curve.Summary{
				Rows: 3, Positives: 3, Negatives: 0, BaseRate: 1, Probabilities: true,
				ROCAUC: nan, AveragePrecision: 1, Brier: 0.27,
				LogLoss: -(math.Log(0.7) + 2*math.Log(0.4)) / 3,
			},
		},
		{
			// Only false cases: recall, AUC and AP undefined; precision 0.
			// Brier: (0.49 + 0.16) / 2 = 0.325.
			name:   "false cases only",
			scores: []float64{0.4, 0.7},
			labels: []bool{F, F},
			points: []row{
				{0.7, 1, 0, 1, 0, 1, nan, 0, 1, 0.5, 0.5},
				{0.4, 2, 0, 2, 0, 0, nan, 0, 1, 1, 1},
			},
			summary: curve.Summary{
				Rows: 2, Positives: 0, Negatives: 2, BaseRate: 0, Probabilities: true,
				ROCAUC: nan, AveragePrecision: nan, Brier: 0.325,
				LogLoss: -(math.Log(0.3) + math.Log(0.6)) / 2,
			},
		},
		{
			// Nothing: no cut, every figure NaN, no probabilities.
			name:    "empty",
			points:  []row{},
			summary: curve.Summary{ROCAUC: nan, AveragePrecision: nan, Brier: nan, LogLoss: nan, BaseRate: nan},
		},
		{
			// Every row weighs 0: the cuts are there, every count is 0
			// and every rate NaN.
			name:    "all weights zero",
			scores:  []float64{0.2, 0.6},
			labels:  []bool{T, F},
			weights: []float64{0, 0},
			points: []row{
				{0.6, 1, 0, 0, 0, 0, nan, nan, nan, nan, nan},
				{0.2, 2, 0, 0, 0, 0, nan, nan, nan, nan, nan},
			},
			summary: curve.Summary{Rows: 2, Weighted: true, Probabilities: true, BaseRate: nan, ROCAUC: nan, AveragePrecision: nan, Brier: nan, LogLoss: nan},
		},
		{
			// Logits: scores outside [0,1] are no probabilities, so Brier
			// and log loss are NaN. -1 T, 2 F, 0.5 T: the one false case
			// (2) outranks both true ones, so AUC is 0 of 2 pairs = 0.
			// AP: recall 1/2 at 0.5 with precision 1/2, 1 at -1 with 2/3:
			// 1/4 + 1/3.
			name:   "scores beyond [0,1]",
			scores: []float64{-1, 2, 0.5},
			labels: []bool{T, F, T},
			points: []row{
				{2, 1, 0, 1, 2, 0, 0, 0, 1, 1, 1.0 / 3},
				{0.5, 2, 1, 1, 1, 0, 0.5, 0.5, 0.5, 1, 2.0 / 3},
				{-1, 3, 2, 1, 0, 0, 1, 2.0 / 3, 1.0 / 3, 1, 1},
			},
			summary: curve.Summary{
				Rows: 3, Positives: 2, Negatives: 1, BaseRate: 2.0 / 3,
				ROCAUC: 0, AveragePrecision: 0.25 + 1.0/3, Brier: nan, LogLoss: nan,
			},
		},
		{
			// Lower is riskier on scores in [0,1]: cuts run 0.1, 0.4,
			// 0.8; the scores are not probabilities of a true case, so
			// Brier and log loss are NaN. 0.1 T, 0.4 F, 0.8 F: AUC 1, AP 1.
			name:   "lower is riskier",
			scores: []float64{0.8, 0.1, 0.4},
			labels: []bool{F, T, F},
			lower:  true,
			points: []row{
				{0.1, 1, 1, 0, 0, 2, 1, 1, 0, 0, 1.0 / 3},
				{0.4, 2, 1, 1, 0, 1, 1, 0.5, 0.5, 0.5, 2.0 / 3},
				{0.8, 3, 1, 2, 0, 0, 1, 1.0 / 3, 2.0 / 3, 1, 1},
			},
			summary: curve.Summary{
				Rows: 3, Positives: 1, Negatives: 2, BaseRate: 1.0 / 3,
				ROCAUC: 1, AveragePrecision: 1, Brier: nan, LogLoss: nan,
			},
		},
		{
			// Every score tied: one cut flagging everything; AUC 1/2
			// (every pair tied), AP = base rate 1/3.
			name:   "one tie group",
			scores: []float64{0.5, 0.5, 0.5},
			labels: []bool{F, T, F},
			points: []row{
				{0.5, 3, 1, 2, 0, 0, 1, 1.0 / 3, 2.0 / 3, 1, 1},
			},
			summary: curve.Summary{
				Rows: 3, Positives: 1, Negatives: 2, BaseRate: 1.0 / 3, Probabilities: true,
				ROCAUC: 0.5, AveragePrecision: 1.0 / 3, Brier: 0.25, LogLoss: math.Log(2),
			},
		},
		{
			// Log loss clips: a true case scored 0 costs -ln(1e-15)
			// (1e-15 is the clip; 34.538776394910684 by hand with a
			// calculator). Brier (1-0)^2 = 1.
			name:   "clipped log loss",
			scores: []float64{0},
			labels: []bool{T},
			points: []row{
				{0, 1, 1, 0, 0, 0, 1, 1, 0, nan, 1},
			},
			summary: curve.Summary{
				Rows: 1, Positives: 1, BaseRate: 1, Probabilities: true,
				ROCAUC: nan, AveragePrecision: 1, Brier: 1, LogLoss: -math.Log(1e-15),
			},
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			set := mustSet(t, tc.scores, tc.labels, tc.weights, tc.lower)
			points, sum := pointsOf(set)
			checkPoints(t, points, tc.points)
			checkSummary(t, sum, tc.summary)

			// The stored curve gives the same points and summary.
			c := curve.New(set)
			if c.Len() != len(tc.points) {
				t.Fatalf("Curve.Len %d, want %d", c.Len(), len(tc.points))
			}
			var stored []curve.Point
			c.Points(func(p curve.Point) { stored = append(stored, p) })
			checkPoints(t, stored, tc.points)
			checkSummary(t, c.Summary, tc.summary)
			if tc.summary.LogLoss == -math.Log(1e-15) && !floatcmp.Equal(sum.LogLoss, 34.538776394910684) {
				t.Errorf("clipped log loss %v, want 34.538776394910684", sum.LogLoss)
			}
		})
	}
}

// TestCurveRows checks CutOfRow, FirstRow and Point's counting helpers on
// the "ties" example: cuts 0.9 (row 0), 0.8 (rows 1-2), 0.5 (row 3), 0.3
// (rows 4-5), 0.1 (row 6).
func TestCurveRows(t *testing.T) {
	const T, F = true, false
	set := mustSet(t, []float64{0.3, 0.9, 0.8, 0.1, 0.5, 0.8, 0.3}, []bool{T, T, F, F, F, T, F}, nil, false)
	c := curve.New(set)
	wantCut := []int{0, 1, 1, 2, 3, 3, 4}
	for r, want := range wantCut {
		if got := c.CutOfRow(r); got != want {
			t.Errorf("CutOfRow(%d) = %d, want %d", r, got, want)
		}
	}
	wantFirst := []int{0, 1, 3, 4, 6}
	for i, want := range wantFirst {
		if got := c.FirstRow(i); got != want {
			t.Errorf("FirstRow(%d) = %d, want %d", i, got, want)
		}
	}
	p := c.At(2) // cut 0.5: tp 2, fp 2, fn 1, tn 2
	if p.Flagged() != 4 || p.Positives() != 3 || p.Negatives() != 4 {
		t.Errorf("At(2): flagged %v positives %v negatives %v, want 4 3 4", p.Flagged(), p.Positives(), p.Negatives())
	}
}

// randomSet draws a seeded set with heavy ties and, when weighted, weights
// in {1, 2, 3}.
func randomSet(rng *rand.Rand, n int, weighted bool) (values []float64, labels []bool, weights []float64) {
	for range n {
		v := float64(rng.IntN(n/3+1)) / float64(n/3+1)
		values = append(values, v)
		labels = append(labels, rng.Float64() < 0.2+0.6*v)
		if weighted {
			weights = append(weights, float64(1+rng.IntN(3)))
		}
	}
	return values, labels, weights
}

// TestCurveProperties checks, on seeded random sets, the properties of
// issue 2: tp+fn equals the positives at every cut; tp and fp never fall
// as the cut loosens; AUC is unchanged by a strictly increasing transform
// and becomes 1-AUC when scores are negated; negating scores and flipping
// the direction leaves every point unchanged; a weight of 2 gives the
// figures of the row written twice; shuffling rows changes nothing.
func TestCurveProperties(t *testing.T) {
	rng := rand.New(rand.NewPCG(2026, 12))
	for trial := range 60 {
		n := 1 + rng.IntN(200)
		weighted := trial%2 == 1
		values, labels, weights := randomSet(rng, n, weighted)
		set := mustSet(t, values, labels, weights, false)
		points, sum := pointsOf(set)
		name := fmt.Sprintf("trial %d (n=%d, weighted=%v)", trial, n, weighted)

		var lastTP, lastFP float64
		for _, p := range points {
			if !floatcmp.Equal(p.TP+p.FN, sum.Positives) || !floatcmp.Equal(p.FP+p.TN, sum.Negatives) {
				t.Fatalf("%s: cut %v: tp+fn %v, fp+tn %v; positives %v, negatives %v", name, p.Score, p.TP+p.FN, p.FP+p.TN, sum.Positives, sum.Negatives)
			}
			if p.TP < lastTP || p.FP < lastFP {
				t.Fatalf("%s: cut %v: tp %v fp %v fell from %v %v", name, p.Score, p.TP, p.FP, lastTP, lastFP)
			}
			lastTP, lastFP = p.TP, p.FP
		}
		last := points[len(points)-1]
		if last.FN != 0 || last.TN != 0 || last.Rows != n {
			t.Fatalf("%s: the loosest cut should flag every row: %+v", name, last)
		}

		// A strictly increasing transform keeps every tie and every order.
		transformed := make([]float64, n)
		for i, v := range values {
			transformed[i] = math.Exp(3*v) + v*v*v - 7
		}
		_, tsum := pointsOf(mustSet(t, transformed, labels, weights, false))
		if !floatcmp.Equal(tsum.ROCAUC, sum.ROCAUC) || !floatcmp.Equal(tsum.AveragePrecision, sum.AveragePrecision) {
			t.Errorf("%s: transformed AUC %v AP %v, want %v %v", name, tsum.ROCAUC, tsum.AveragePrecision, sum.ROCAUC, sum.AveragePrecision)
		}

		negated := make([]float64, n)
		for i, v := range values {
			negated[i] = -v
		}
		_, nsum := pointsOf(mustSet(t, negated, labels, weights, false))
		if !floatcmp.Equal(nsum.ROCAUC, 1-sum.ROCAUC) {
			t.Errorf("%s: negated AUC %v, want 1-%v", name, nsum.ROCAUC, sum.ROCAUC)
		}

		// Negated and lower-is-riskier: the same points, scores negated.
		flipped, fsum := pointsOf(mustSet(t, negated, labels, weights, true))
		if len(flipped) != len(points) {
			t.Fatalf("%s: flipped has %d cuts, want %d", name, len(flipped), len(points))
		}
		for i, p := range points {
			q := flipped[i]
			if q.Score != -p.Score || q.Rows != p.Rows || !floatcmp.Equal(q.TP, p.TP) || !floatcmp.Equal(q.FP, p.FP) || !floatcmp.Equal(q.FN, p.FN) || !floatcmp.Equal(q.TN, p.TN) {
				t.Fatalf("%s: cut %d: flipped %+v, want %+v with the score negated", name, i, q, p)
			}
		}
		if !floatcmp.Equal(fsum.ROCAUC, sum.ROCAUC) || !floatcmp.Equal(fsum.AveragePrecision, sum.AveragePrecision) {
			t.Errorf("%s: flipped AUC %v AP %v, want %v %v", name, fsum.ROCAUC, fsum.AveragePrecision, sum.ROCAUC, sum.AveragePrecision)
		}

		// Shuffled: the same points, rows included, and the same summary.
		order := rng.Perm(n)
		shuffledValues, shuffledLabels := make([]float64, n), make([]bool, n)
		var shuffledWeights []float64
		if weighted {
			shuffledWeights = make([]float64, n)
		}
		for i, j := range order {
			shuffledValues[i], shuffledLabels[i] = values[j], labels[j]
			if weighted {
				shuffledWeights[i] = weights[j]
			}
		}
		shuffled, ssum := pointsOf(mustSet(t, shuffledValues, shuffledLabels, shuffledWeights, false))
		comparePoints(t, name+" shuffled", shuffled, points, true)
		compareSummaries(t, name+" shuffled", ssum, sum)

		// Weights written out as repeated rows: the same counts and
		// figures at every cut; only Rows (which counts rows) differs.
		if weighted {
			var repValues []float64
			var repLabels []bool
			for i, w := range weights {
				for range int(w) {
					repValues = append(repValues, values[i])
					repLabels = append(repLabels, labels[i])
				}
			}
			repeated, rsum := pointsOf(mustSet(t, repValues, repLabels, nil, false))
			comparePoints(t, name+" repeated", repeated, points, false)
			rsum.Rows, rsum.Weighted = sum.Rows, sum.Weighted
			compareSummaries(t, name+" repeated", rsum, sum)
		}
	}
}

func comparePoints(t *testing.T, name string, got, want []curve.Point, sameRows bool) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: %d cuts, want %d", name, len(got), len(want))
	}
	for i := range want {
		g, w := got[i], want[i]
		if g.Score != w.Score || (sameRows && g.Rows != w.Rows) || !floatcmp.Equal(g.TP, w.TP) || !floatcmp.Equal(g.FP, w.FP) || !floatcmp.Equal(g.FN, w.FN) || !floatcmp.Equal(g.TN, w.TN) {
			t.Fatalf("%s: cut %d: %+v, want %+v", name, i, g, w)
		}
	}
}

func compareSummaries(t *testing.T, name string, got, want curve.Summary) {
	t.Helper()
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"ROC AUC", got.ROCAUC, want.ROCAUC}, {"average precision", got.AveragePrecision, want.AveragePrecision},
		{"Brier", got.Brier, want.Brier}, {"log loss", got.LogLoss, want.LogLoss},
		{"positives", got.Positives, want.Positives}, {"negatives", got.Negatives, want.Negatives},
	} {
		if !floatcmp.Equal(c.got, c.want) {
			t.Errorf("%s: %s %v, want %v", name, c.what, c.got, c.want)
		}
	}
	if got.Rows != want.Rows {
		t.Errorf("%s: rows %d, want %d", name, got.Rows, want.Rows)
	}
}

// TestLoosestCutExact: at the loosest cut every case is flagged, so FN and
// TN are exactly 0 and recall and the false positive rate exactly 1, even
// with weights such as 0.1 whose sums round (worked by hand: the loosest
// cut flags all weight, and nothing is left). Once the totals were summed
// row by row and the sweep tie group by tie group, which left residues
// such as TN = -1.8e-15 and a false positive rate of 1.0000000000000002.
// Seeded: heavy ties, tenths as weights, zero weights included.
func TestLoosestCutExact(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for trial := range 200 {
		n := 1 + rng.IntN(60)
		values := make([]float64, n)
		labels := make([]bool, n)
		weights := make([]float64, n)
		for i := range n {
			values[i] = float64(rng.IntN(5))
			labels[i] = rng.IntN(2) == 0
			weights[i] = float64(rng.IntN(10)) / 10
		}
		for _, lower := range []bool{false, true} {
			set := mustSet(t, slices.Clone(values), slices.Clone(labels), slices.Clone(weights), lower)
			points, sum := pointsOf(set)
			last := points[len(points)-1]
			if last.FN != 0 || last.TN != 0 {
				t.Fatalf("trial %d (lower %v): loosest cut FN %v TN %v, want 0 and 0", trial, lower, last.FN, last.TN)
			}
			if sum.Positives > 0 && last.Recall() != 1 {
				t.Fatalf("trial %d: loosest recall %v", trial, last.Recall())
			}
			if sum.Negatives > 0 && last.FalsePositiveRate() != 1 {
				t.Fatalf("trial %d: loosest false positive rate %v", trial, last.FalsePositiveRate())
			}
		}
	}
}

// TestRefill: a curve refilled with another set has exactly the points
// that New gives for that set (seeded sets with ties, weights and counts
// tables, refilled one after another into one curve, larger then smaller),
// and a zero Summary but for the class totals.
func TestRefill(t *testing.T) {
	rng := rand.New(rand.NewPCG(2026, 1202))
	var c curve.Curve
	for trial := range 40 {
		n := 1 + rng.IntN(300)
		values, labels, weights := randomSet(rng, n, trial%2 == 1)
		var set *scores.Set
		var err error
		if trial%3 == 2 {
			counts := make([]float64, n)
			for i := range counts {
				counts[i] = float64(1 + rng.IntN(4))
			}
			set, err = scores.NewCounts(values, labels, counts, trial%4 == 1)
		} else {
			set, err = scores.New(values, labels, weights, trial%4 == 1)
		}
		if err != nil {
			t.Fatal(err)
		}
		c.Refill(set)
		want := curve.New(set)
		if c.Len() != want.Len() {
			t.Fatalf("trial %d: %d cuts, New gives %d", trial, c.Len(), want.Len())
		}
		for i := range want.Len() {
			if c.At(i) != want.At(i) {
				t.Fatalf("trial %d: cut %d %+v, New gives %+v", trial, i, c.At(i), want.At(i))
			}
		}
		if c.Summary.Positives != want.Summary.Positives || c.Summary.Negatives != want.Summary.Negatives || c.Summary.Rows != 0 || c.Summary.ROCAUC != 0 {
			t.Fatalf("trial %d: summary %+v", trial, c.Summary)
		}
	}
}
