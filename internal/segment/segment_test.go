package segment_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

func read(t *testing.T, csv string) (*scores.Set, *curve.Curve) {
	t.Helper()
	set, err := scores.Read(strings.NewReader(csv), "t.csv", scores.Options{SegmentColumn: "seg", WeightColumn: weightColumn(csv)})
	if err != nil {
		t.Fatal(err)
	}
	return set, curve.New(set)
}

func weightColumn(csv string) string {
	if strings.HasPrefix(csv, "score,label,seg,w") {
		return "w"
	}
	return ""
}

// pointAt returns the curve point whose cut is score.
func pointAt(t *testing.T, c *curve.Curve, score float64) curve.Point {
	t.Helper()
	for i := range c.Len() {
		if p := c.At(i); p.Score == score {
			return p
		}
	}
	t.Fatalf("no cut at %v", score)
	return curve.Point{}
}

// Eight rows, a tie at 0.8 across classes and groups.
const small = "score,label,seg\n" +
	"0.9,1,A\n0.8,1,B\n0.8,0,A\n0.7,0,B\n0.6,1,A\n0.5,0,A\n0.4,1,B\n0.3,0,B\n"

// wilsonOneOfTwo is the 95% Wilson interval of 1 success in 2 trials,
// worked by hand from Wilson's formula with z = 1.959964: centre
// (0.5 + z²/4)/(1 + z²/2) = 0.5, half-width z/(1+z²/2)·sqrt(1/8 + z²/16)
// = 0.40546879; the commonly quoted (0.0945, 0.9055).
var wilsonOneOfTwo = [2]float64{0.5 - 0.40546879, 0.5 + 0.40546879}

func TestAtHandWorked(t *testing.T) {
	set, c := read(t, small)
	// Cut 0.8 flags the first three rows: 0.9/1/A, 0.8/1/B, 0.8/0/A.
	b := segment.At(set, pointAt(t, c, 0.8), 0.95)
	cases := []struct {
		got                           segment.Figures
		name                          string
		rows                          int
		positives, tp, fp, share, rec float64
		prec                          float64
	}{
		// Overall: 4 true cases, 2 caught, 1 wrong alert, 3 of 8 flagged.
		{b.Overall, "", 8, 4, 2, 1, 3.0 / 8, 0.5, 2.0 / 3},
		// A: 0.9/1, 0.8/0 flagged; 0.6/1, 0.5/0 not.
		{b.Segments[0], "A", 4, 2, 1, 1, 0.5, 0.5, 0.5},
		// B: 0.8/1 flagged; 0.7/0, 0.4/1, 0.3/0 not.
		{b.Segments[1], "B", 4, 2, 1, 0, 0.25, 0.5, 1},
	}
	for _, want := range cases {
		f := want.got
		if f.Segment != want.name || f.Rows != want.rows || !floatcmp.Equal(f.Positives, want.positives) || !floatcmp.Equal(f.TP, want.tp) ||
			!floatcmp.Equal(f.FP, want.fp) || !floatcmp.Equal(f.FlaggedShare, want.share) || !floatcmp.Equal(f.Recall, want.rec) || !floatcmp.Equal(f.Precision, want.prec) {
			t.Errorf("%q: got %+v", want.name, f)
		}
	}
	// wilsonOneOfTwo is written to 8 decimals, so it agrees to half a unit
	// of the 8th.
	const eightDecimals = 5e-9
	if a := b.Segments[0]; !floatcmp.Within(a.RecallCI[0], wilsonOneOfTwo[0], eightDecimals) || !floatcmp.Within(a.RecallCI[1], wilsonOneOfTwo[1], eightDecimals) {
		t.Errorf("A recall interval %v, want %v", a.RecallCI, wilsonOneOfTwo)
	}
	if b.Outliers() != 0 {
		t.Errorf("small groups cannot be outliers, got %d", b.Outliers())
	}
}

// TestOutlier builds three groups of true cases only: A and B have 400 of
// 500 caught (80%), C 5 of 20 (25%). Each group is set against the rest:
// A's 80% against 405 of 520 (77.9%), a gap of 2.1 points with a standard
// error near 2.5 (no flag); C's 25% against 800 of 1,000 (80%), a gap of
// -55 points, its interval the one of interval.Difference(5, 20, 800,
// 1000) (about -0.69 to -0.33: -0.55 ∓ the hypotenuses of 0.138 and 0.024,
// and of 0.219 and 0.026, from the Wilson limits 0.112
// and 0.469 of 5/20 and 0.774 and 0.824 of 800/1,000). Wrong-alert shares
// are 0 everywhere (no false case), tested but equal (p 1). Six tests, so
// Holm multiplies C's tiny p by 6.
func TestOutlier(t *testing.T) {
	var csv strings.Builder
	csv.WriteString("score,label,seg\n")
	for _, g := range []struct {
		name           string
		caught, missed int
	}{{"A", 400, 100}, {"B", 400, 100}, {"C", 5, 15}} {
		for range g.caught {
			csv.WriteString("0.9,1," + g.name + "\n")
		}
		for range g.missed {
			csv.WriteString("0.1,1," + g.name + "\n")
		}
	}
	set, c := read(t, csv.String())
	b := segment.At(set, pointAt(t, c, 0.9), 0.95)
	if !floatcmp.Equal(b.Overall.Recall, 805.0/1020) {
		t.Fatalf("overall recall %v", b.Overall.Recall)
	}
	if b.Tests != 6 || b.Confidence != 0.95 {
		t.Errorf("tests %d at %v, want 6 at 0.95", b.Tests, b.Confidence)
	}
	want := map[string]bool{"A": false, "B": false, "C": true}
	for _, f := range b.Segments {
		if f.Outlier != want[f.Segment] {
			t.Errorf("%s: outlier %v, recall test %+v", f.Segment, f.Outlier, f.RecallTest)
		}
		if f.FalseDiscoveryTest.P != 1 || f.FalseDiscoveryTest.Gap != 0 {
			t.Errorf("%s: wrong-alert test %+v, want gap 0 at p 1", f.Segment, f.FalseDiscoveryTest)
		}
	}
	cTest := b.Segments[2].RecallTest
	lower, upper := interval.Difference(5, 20, 800, 1000, 0.95)
	if !floatcmp.Equal(cTest.Gap, -0.55) || !floatcmp.Equal(cTest.Rest, 0.8) || cTest.GapCI != [2]float64{lower, upper} ||
		!floatcmp.Within(lower, -0.69, 0.01) || !floatcmp.Within(upper, -0.33, 0.01) {
		t.Errorf("C: recall test %+v, want gap -0.55 against 0.8 in [%v, %v]", cTest, lower, upper)
	}
	if p := interval.DifferenceP(5, 20, 800, 1000); !floatcmp.Equal(cTest.P, p) || !floatcmp.Equal(cTest.AdjustedP, min(1, 6*p)) {
		t.Errorf("C: p %v adjusted %v, want %v and 6 times it", cTest.P, cTest.AdjustedP, p)
	}
	aTest := b.Segments[0].RecallTest
	if !floatcmp.Equal(aTest.Gap, 0.8-405.0/520) || aTest.AdjustedP < 0.05 {
		t.Errorf("A: recall test %+v, want gap %v and no flag", aTest, 0.8-405.0/520)
	}
	if !math.IsNaN(b.Overall.RecallTest.P) {
		t.Errorf("overall has a test: %+v", b.Overall.RecallTest)
	}
	b.Sort(segment.ByGap)
	if b.Segments[0].Segment != "C" {
		t.Errorf("by gap: first %q, want C", b.Segments[0].Segment)
	}
	b.Sort(segment.BySize)
	if got := b.Segments[0].Segment + b.Segments[1].Segment + b.Segments[2].Segment; got != "ABC" {
		t.Errorf("by size (ties by name): %s, want ABC", got)
	}
}

// TestRunningTests: the running breakdown's tests equal At's.
func TestRunningTests(t *testing.T) {
	set, c := read(t, small)
	r := segment.NewRunning(set)
	for _, i := range []int{0, c.Len() - 1, 2, 1} {
		want, got := segment.At(set, c.At(i), 0.9), r.At(c.At(i), 0.9)
		for k := range want.Segments {
			w, g := want.Segments[k], got.Segments[k]
			if !floatcmp.Equal(w.RecallTest.AdjustedP, g.RecallTest.AdjustedP) || !floatcmp.Equal(w.FalseDiscoveryTest.GapCI[0], g.FalseDiscoveryTest.GapCI[0]) || w.Outlier != g.Outlier {
				t.Errorf("cut %d %s: running %+v, At %+v", i, w.Segment, g, w)
			}
		}
		if want.Tests != got.Tests {
			t.Errorf("cut %d: %d tests running, %d At", i, got.Tests, want.Tests)
		}
	}
}

// TestWeightEqualsRepeat: a weight of 2 gives the same figures as the row
// written twice.
func TestWeightEqualsRepeat(t *testing.T) {
	weighted := "score,label,seg,w\n0.9,1,A,2\n0.7,0,A,1\n0.6,1,B,1\n0.5,0,B,2\n"
	repeated := "score,label,seg\n0.9,1,A\n0.9,1,A\n0.7,0,A\n0.6,1,B\n0.5,0,B\n0.5,0,B\n"
	sw, cw := read(t, weighted)
	sr, cr := read(t, repeated)
	bw := segment.At(sw, pointAt(t, cw, 0.6), 0.9)
	br := segment.At(sr, pointAt(t, cr, 0.6), 0.9)
	for i := range bw.Segments {
		w, r := bw.Segments[i], br.Segments[i]
		if !floatcmp.Equal(w.Recall, r.Recall) || !floatcmp.Equal(w.Precision, r.Precision) || !floatcmp.Equal(w.RecallCI[0], r.RecallCI[0]) ||
			!floatcmp.Equal(w.PrecisionCI[1], r.PrecisionCI[1]) || !floatcmp.Equal(w.FlaggedShare, r.FlaggedShare) {
			t.Errorf("%s: weighted %+v, repeated %+v", w.Segment, w, r)
		}
	}
}

// TestUndefined covers one class only, nothing flagged, no segment column
// and an empty set.
func TestUndefined(t *testing.T) {
	set, c := read(t, "score,label,seg\n0.9,0,A\n0.2,0,B\n")
	b := segment.At(set, c.At(0), 0.95)
	if a := b.Segments[0]; !math.IsNaN(a.Recall) || !math.IsNaN(a.RecallCI[0]) || a.Outlier || !floatcmp.Equal(a.Precision, 0) {
		t.Errorf("no true case: %+v", a)
	}
	if bb := b.Segments[1]; !math.IsNaN(bb.Precision) || bb.Outlier {
		t.Errorf("nothing flagged: %+v", bb)
	}
	plain, err := scores.New([]float64{0.3, 0.6}, []bool{true, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	if b := segment.At(plain, curve.New(plain).At(0), 0.95); b.Segments != nil || b.Overall.Rows != 2 {
		t.Errorf("no segment column: %+v", b)
	}
	empty, _ := scores.New(nil, nil, nil, false)
	if b := segment.At(empty, curve.Point{}, 0.95); b.Overall.Rows != 0 || !math.IsNaN(b.Overall.Recall) {
		t.Errorf("empty: %+v", b)
	}
}

func TestParseOrder(t *testing.T) {
	for text, want := range map[string]segment.Order{"size": segment.BySize, "gap": segment.ByGap, "name": segment.ByName} {
		if got, err := segment.ParseOrder(text); err != nil || got != want {
			t.Errorf("%q: %v %v", text, got, err)
		}
	}
	if _, err := segment.ParseOrder("biggest"); err == nil {
		t.Error("unknown order accepted")
	}
}

// TestNegatedScores: negating every score and flipping the direction
// gives the same breakdown at every cut (seeded random data with ties).
func TestNegatedScores(t *testing.T) {
	var plain, negated strings.Builder
	plain.WriteString("score,label,seg\n")
	negated.WriteString("score,label,seg\n")
	rng := uint64(12345)
	next := func() uint64 { rng = rng*6364136223846793005 + 1442695040888963407; return rng >> 33 }
	for range 200 {
		s := float64(next()%20) / 4
		label := next()%3 == 0
		seg := []string{"x", "y", "z"}[next()%3]
		l := "0"
		if label {
			l = "1"
		}
		plain.WriteString(strconvF(s) + "," + l + "," + seg + "\n")
		negated.WriteString(strconvF(-s) + "," + l + "," + seg + "\n")
	}
	sp, cp := read(t, plain.String())
	sn, err := scores.Read(strings.NewReader(negated.String()), "n.csv", scores.Options{SegmentColumn: "seg", LowerIsRiskier: true})
	if err != nil {
		t.Fatal(err)
	}
	cn := curve.New(sn)
	if cp.Len() != cn.Len() {
		t.Fatalf("%d cuts against %d", cp.Len(), cn.Len())
	}
	for i := range cp.Len() {
		bp, bn := segment.At(sp, cp.At(i), 0.95), segment.At(sn, cn.At(i), 0.95)
		bp.Sort(segment.ByName)
		bn.Sort(segment.ByName)
		for k := range bp.Segments {
			x, y := bp.Segments[k], bn.Segments[k]
			if x.Segment != y.Segment || !floatcmp.Equal(x.Recall, y.Recall) || !floatcmp.Equal(x.Precision, y.Precision) || x.Outlier != y.Outlier || !floatcmp.Equal(x.RecallCI[0], y.RecallCI[0]) {
				t.Fatalf("cut %d %s: %+v against %+v", i, x.Segment, x, y)
			}
		}
	}
}

func strconvF(v float64) string { return fmt.Sprint(v) }

// TestFalseDiscovery: the wrong-alert share of a group is 1 - precision
// and its interval the complement of precision's (by hand: precision 0.75
// in [0.3, 0.95] gives 0.25 in [0.05, 0.7]); undefined stays undefined.
func TestFalseDiscovery(t *testing.T) {
	f := segment.Figures{Precision: 0.75, PrecisionCI: [2]float64{0.3, 0.95}}
	if got := f.FalseDiscoveryRate(); !floatcmp.Equal(got, 0.25) {
		t.Errorf("FalseDiscoveryRate %v, want 0.25", got)
	}
	if ci := f.FalseDiscoveryCI(); !floatcmp.Equal(ci[0], 0.05) || !floatcmp.Equal(ci[1], 0.7) {
		t.Errorf("FalseDiscoveryCI %v, want [0.05 0.7]", ci)
	}
	undefined := segment.Figures{Precision: math.NaN(), PrecisionCI: [2]float64{math.NaN(), math.NaN()}}
	if !math.IsNaN(undefined.FalseDiscoveryRate()) || !math.IsNaN(undefined.FalseDiscoveryCI()[0]) {
		t.Errorf("undefined precision gave a defined wrong-alert share")
	}
}
