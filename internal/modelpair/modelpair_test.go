package modelpair_test

import (
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/modelpair"
	"github.com/sill-tool/sill/internal/scores"
)

// TestAgainstPROC compares the test with the R package pROC 1.18.0
// (Debian's r-cran-proc, R 4.2.2): auc, var(method = "delong"),
// cov(method = "delong") and roc.test(method = "delong", paired = TRUE),
// written by testdata/calibration-delong/make_delong.R to delong.json.
func TestAgainstPROC(t *testing.T) {
	const dir = "../../testdata/calibration-delong"
	raw, err := os.ReadFile(filepath.Join(dir, "delong.json"))
	if err != nil {
		t.Fatal(err)
	}
	var generic struct {
		Datasets map[string]map[string]any `json:"datasets"`
	}
	if err := json.Unmarshal(raw, &generic); err != nil {
		t.Fatal(err)
	}
	if len(generic.Datasets) != 2 {
		t.Fatalf("%d datasets", len(generic.Datasets))
	}
	for name, d := range generic.Datasets {
		f, err := os.Open(filepath.Join(dir, d["file"].(string)))
		if err != nil {
			t.Fatal(err)
		}
		set, err := scores.Read(f, name, scores.Options{ScoreColumn: "a", CompareColumn: "b"})
		f.Close()
		if err != nil {
			t.Fatal(err)
		}
		got, err := modelpair.Compare(set)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range []struct {
			key string
			got float64
		}{
			{"auc_a", got.AUC[0]}, {"auc_b", got.AUC[1]}, {"var_a", got.Variance[0]}, {"var_b", got.Variance[1]},
			{"cov_ab", got.Covariance}, {"z", got.Z}, {"p", got.P},
		} {
			want := d[c.key].(float64)
			// p is tiny in one set; compare it relatively.
			ok := floatcmp.Equal(c.got, want)
			if c.key == "p" {
				ok = math.Abs(c.got-want) <= 1e-9*want
			}
			if !ok {
				t.Errorf("%s %s: sill %v, pROC %v", name, c.key, c.got, want)
			}
		}
		// The AUC agrees with package curve's.
		if sum := curve.Walk(set, nil); !floatcmp.Equal(sum.ROCAUC, got.AUC[0]) {
			t.Errorf("%s: AUC %v, curve %v", name, got.AUC[0], sum.ROCAUC)
		}
	}
}

// TestHandWorked: two true cases (scores a 0.9, 0.4; b 0.6, 0.6) and two
// false cases (a 0.5, 0.1; b 0.6, 0.2).
//
// Model a: placements of the true cases V10 = (1, 0.5), of the false
// cases V01 = (0.5, 1); AUC 0.75. Model b: the true cases both tie the
// first false case and beat the second, V10 = (0.75, 0.75); V01 = (0.5,
// 1); AUC 0.75. Difference 0.
// S10 (divisor 1): var_a = (0.25² + 0.25²) = 0.125, var_b = 0, cov = 0.
// S01: deviations a (-0.25, 0.25), b (-0.25, 0.25): var_a = var_b = cov
// = 0.125. So Var(AUC_a) = 0.125/2 + 0.125/2 = 0.125, Var(AUC_b) = 0 +
// 0.0625 = 0.0625, Cov = 0 + 0.0625 = 0.0625; the variance of the
// difference 0.125 + 0.0625 - 0.125 = 0.0625, standard error 0.25, z 0,
// p 1.
func TestHandWorked(t *testing.T) {
	a := []float64{0.9, 0.4, 0.5, 0.1}
	b := []float64{0.6, 0.6, 0.6, 0.2}
	labels := []bool{true, true, false, false}
	got, err := modelpair.Paired(a, b, labels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	want := modelpair.Test{AUC: [2]float64{0.75, 0.75}, Variance: [2]float64{0.125, 0.0625}, Covariance: 0.0625, StdError: 0.25, Z: 0, P: 1}
	if !floatcmp.Equal(got.AUC[0], want.AUC[0]) || !floatcmp.Equal(got.AUC[1], want.AUC[1]) || !floatcmp.Equal(got.Variance[0], want.Variance[0]) ||
		!floatcmp.Equal(got.Variance[1], want.Variance[1]) || !floatcmp.Equal(got.Covariance, want.Covariance) || !floatcmp.Equal(got.StdError, want.StdError) ||
		!floatcmp.Equal(got.Z, want.Z) || !floatcmp.Equal(got.P, want.P) {
		t.Errorf("got %+v\nwant %+v", got, want)
	}
	// Negating both models and flipping the direction changes nothing.
	neg := func(v []float64) []float64 {
		out := make([]float64, len(v))
		for i, x := range v {
			out[i] = -x
		}
		return out
	}
	flipped, _ := modelpair.Paired(neg(a), neg(b), labels, nil, true)
	if !floatcmp.Equal(flipped.Variance[0], got.Variance[0]) || !floatcmp.Equal(flipped.AUC[1], got.AUC[1]) {
		t.Errorf("flipped %+v", flipped)
	}
}

// TestWeightEqualsRepeat: a weight of 2 gives the same test as the row
// written twice, and a zero weight drops the row (seeded random data).
func TestWeightEqualsRepeat(t *testing.T) {
	rng := rand.New(rand.NewPCG(88, 1))
	var a, b, wa []float64
	var labels, repLabels []bool
	var repA, repB []float64
	for range 60 {
		y := rng.Float64() < 0.4
		x := math.Round((rng.NormFloat64()+boolF(y))*4) / 4
		z := math.Round((rng.NormFloat64()+0.5*boolF(y))*4) / 4
		w := float64(rng.IntN(3))
		a, b, labels, wa = append(a, x), append(b, z), append(labels, y), append(wa, w)
		for range int(w) {
			repA, repB, repLabels = append(repA, x), append(repB, z), append(repLabels, y)
		}
	}
	weighted, err := modelpair.Paired(a, b, labels, wa, false)
	if err != nil {
		t.Fatal(err)
	}
	repeated, err := modelpair.Paired(repA, repB, repLabels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	if !floatcmp.Equal(weighted.AUC[0], repeated.AUC[0]) || !floatcmp.Equal(weighted.Variance[1], repeated.Variance[1]) || !floatcmp.Equal(weighted.Covariance, repeated.Covariance) || !floatcmp.Equal(weighted.Z, repeated.Z) {
		t.Errorf("weighted %+v\nrepeated %+v", weighted, repeated)
	}
}

func boolF(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

func TestUndefined(t *testing.T) {
	if _, err := modelpair.Paired([]float64{1, 2}, []float64{1, 2}, []bool{true, true}, nil, false); !errors.Is(err, modelpair.ErrNoClass) {
		t.Errorf("one class: %v", err)
	}
	if _, err := modelpair.Paired(nil, nil, nil, nil, false); !errors.Is(err, modelpair.ErrNoClass) {
		t.Errorf("empty: %v", err)
	}
	// The same scores twice: difference 0 with no variance, z and p NaN.
	same, err := modelpair.Paired([]float64{3, 1, 2, 0}, []float64{3, 1, 2, 0}, []bool{true, true, false, false}, nil, false)
	if err != nil || same.Difference != 0 || !math.IsNaN(same.Z) || !math.IsNaN(same.P) {
		t.Errorf("same scores: %+v %v", same, err)
	}
	// One row per class: the variances are undefined.
	single, err := modelpair.Paired([]float64{2, 1}, []float64{1, 2}, []bool{true, false}, nil, false)
	if err != nil || !math.IsNaN(single.Variance[0]) || !math.IsNaN(single.Z) {
		t.Errorf("one row per class: %+v %v", single, err)
	}
	plain, _ := scores.New([]float64{1, 2}, []bool{true, false}, nil, false)
	if _, err := modelpair.Compare(plain); !errors.Is(err, modelpair.ErrNoSecondModel) {
		t.Errorf("no second model: %v", err)
	}
	if _, err := modelpair.Second(plain); !errors.Is(err, modelpair.ErrNoSecondModel) {
		t.Errorf("second of none: %v", err)
	}
}

// TestSecond: the second model's set is ranked by its scores and carries
// every column; its curve's AUC is the test's second AUC.
func TestSecond(t *testing.T) {
	set, err := scores.NewSet(scores.Columns{
		Scores: []float64{0.9, 0.8, 0.3, 0.1}, Labels: []bool{true, false, true, false}, Weights: []float64{1, 2, 1, 1},
		CompareScores: []float64{0.2, 0.7, 0.7, 0.4}, Times: []int64{10, 20, 30, 40},
	})
	if err != nil {
		t.Fatal(err)
	}
	second, err := modelpair.Second(set)
	if err != nil {
		t.Fatal(err)
	}
	// Ranked by b: 0.7 (row 1), 0.7 (row 2, tie keeps order), 0.4 (row 3), 0.2 (row 0).
	wantTimes := []int64{20, 30, 40, 10}
	wantScores := []float64{0.7, 0.7, 0.4, 0.2}
	for i := range wantTimes {
		if second.Times()[i] != wantTimes[i] || second.Scores()[i] != wantScores[i] {
			t.Errorf("row %d: %v %v", i, second.Scores()[i], second.Times()[i])
		}
	}
	test, _ := modelpair.Compare(set)
	if sum := curve.Walk(second, nil); !floatcmp.Equal(sum.ROCAUC, test.AUC[1]) {
		t.Errorf("AUC of second %v, test %v", sum.ROCAUC, test.AUC[1])
	}
}

func readString(t *testing.T, name, text string, opt scores.Options) *scores.Set {
	t.Helper()
	set, err := scores.Read(strings.NewReader(text), name, opt)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// TestJoin: the second file's scores land on the matching ids whatever
// their order; the joined test equals the one on two columns of one file.
func TestJoin(t *testing.T) {
	one := "id,score,label\nA,0.9,1\nB,0.4,1\nC,0.5,0\nD,0.1,0\n"
	two := "id,score\nD,0.2\nC,0.6\nE,0.99\nB,0.6\nA,0.6\n"
	both := "id,score,other,label\nA,0.9,0.6,1\nB,0.4,0.6,1\nC,0.5,0.6,0\nD,0.1,0.2,0\n"
	opt := scores.Options{IDColumn: "id"}
	first := readString(t, "one.csv", one, opt)
	second := readString(t, "two.csv", two, scores.Options{IDColumn: "id", NoLabels: true})
	joined, err := modelpair.Join(first, second)
	if err != nil {
		t.Fatal(err)
	}
	if joined.CompareColumn() != "two.csv:score" {
		t.Errorf("compare column %q", joined.CompareColumn())
	}
	got, _ := modelpair.Compare(joined)
	want, _ := modelpair.Compare(readString(t, "both.csv", both, scores.Options{CompareColumn: "other"}))
	if !floatcmp.Equal(got.AUC[1], want.AUC[1]) || !floatcmp.Equal(got.Covariance, want.Covariance) || !floatcmp.Equal(got.StdError, want.StdError) {
		t.Errorf("joined %+v\none file %+v", got, want)
	}
	cases := []struct {
		name, a, b string
		err        error
	}{
		{"missing id", one, "id,score\nA,1\nB,1\nC,1\n", modelpair.ErrUnmatchedID},
		{"duplicate in second", one, "id,score\nA,1\nA,2\nB,1\nC,1\nD,1\n", modelpair.ErrDuplicateID},
		{"duplicate in first", "id,score,label\nA,1,1\nA,2,0\n", "id,score\nA,1\n", modelpair.ErrDuplicateID},
		{"label clash", one, "id,score,label\nA,1,0\nB,1,1\nC,1,0\nD,1,0\n", modelpair.ErrLabelClash},
	}
	for _, c := range cases {
		a := readString(t, "a.csv", c.a, opt)
		b := readString(t, "b.csv", c.b, scores.Options{IDColumn: "id", NoLabels: !strings.Contains(c.b, "label")})
		if _, err := modelpair.Join(a, b); !errors.Is(err, c.err) {
			t.Errorf("%s: %v, want %v", c.name, err, c.err)
		}
	}
	noIDs := readString(t, "n.csv", "score,label\n1,1\n", scores.Options{})
	if _, err := modelpair.Join(noIDs, second); !errors.Is(err, modelpair.ErrNoIDs) {
		t.Errorf("no ids: %v", err)
	}
}

// TestPairedProperties checks, on seeded sets with heavy ties, weights in
// {0, 1, 2} (zero weights drop out) and a class sometimes of one row:
//   - each model's AUC equals the AUC of package curve, computed another
//     way (a sweep of the ranked set, ties counting half);
//   - swapping the models swaps the AUCs and variances and negates the
//     difference and Z, leaving the standard error and P;
//   - negating both models' scores and flipping the direction changes
//     nothing.
//
// The references are the same test on transformed input and package
// curve, no outside source.
func TestPairedProperties(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 41))
	for trial := range 200 {
		n := 2 + rng.IntN(40)
		a, b := make([]float64, n), make([]float64, n)
		labels := make([]bool, n)
		weights := make([]float64, n)
		for i := range n {
			a[i] = float64(rng.IntN(6))
			b[i] = float64(rng.IntN(4)) / 2
			labels[i] = rng.IntN(3) == 0
			weights[i] = float64(rng.IntN(3))
		}
		labels[0], labels[1], weights[0], weights[1] = true, false, 1, 1 // both classes weigh something
		w := weights
		if trial%3 == 0 {
			w = nil
		}
		got, err := modelpair.Paired(a, b, labels, w, false)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		for r, model := range [][]float64{a, b} {
			var ws []float64
			if w != nil {
				ws = append([]float64(nil), w...)
			}
			set, err := scores.New(append([]float64(nil), model...), append([]bool(nil), labels...), ws, false)
			if err != nil {
				t.Fatal(err)
			}
			if auc := curve.Walk(set, nil).ROCAUC; !floatcmp.Equal(got.AUC[r], auc) {
				t.Errorf("trial %d: model %d AUC %v, curve's %v", trial, r, got.AUC[r], auc)
			}
		}
		swapped, _ := modelpair.Paired(b, a, labels, w, false)
		if !floatcmp.Equal(swapped.AUC[0], got.AUC[1]) || !floatcmp.Equal(swapped.AUC[1], got.AUC[0]) || !floatcmp.Equal(swapped.Difference, -got.Difference) ||
			!floatcmp.Equal(swapped.Variance[0], got.Variance[1]) || !floatcmp.Equal(swapped.StdError, got.StdError) || !floatcmp.Equal(swapped.Z, -got.Z) || !floatcmp.Equal(swapped.P, got.P) {
			t.Errorf("trial %d: swapped %+v, original %+v", trial, swapped, got)
		}
		negA, negB := make([]float64, n), make([]float64, n)
		for i := range n {
			negA[i], negB[i] = -a[i], -b[i]
		}
		flipped, _ := modelpair.Paired(negA, negB, labels, w, true)
		if !floatcmp.Equal(flipped.AUC[0], got.AUC[0]) || !floatcmp.Equal(flipped.AUC[1], got.AUC[1]) || !floatcmp.Equal(flipped.Covariance, got.Covariance) ||
			!floatcmp.Equal(flipped.StdError, got.StdError) || !floatcmp.Equal(flipped.Z, got.Z) || !floatcmp.Equal(flipped.P, got.P) {
			t.Errorf("trial %d: negated and flipped %+v, original %+v", trial, flipped, got)
		}
	}
}
