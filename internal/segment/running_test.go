package segment_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

// TestRunningMatchesAt walks a seeded, weighted set with ties back and
// forth and jumps across it: every breakdown of Running equals At's, the
// reference, to within a tolerance for the order of the weighted sums.
func TestRunningMatchesAt(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	n := 500
	values, labels, weights := make([]float64, n), make([]bool, n), make([]float64, n)
	for i := range n {
		values[i] = math.Round(rng.Float64()*40) / 40 // ties
		labels[i] = rng.Float64() < 0.2+0.5*values[i]
		weights[i] = 0.5 + rng.Float64()
	}
	segmentOf := make([]int32, n)
	for i := range segmentOf {
		segmentOf[i] = []int32{0, 1, 3}[rng.IntN(3)]
	}
	set, err := scores.NewSet(scores.Columns{
		Scores: values, Labels: labels, Weights: weights,
		SegmentOf: segmentOf, SegmentNames: []string{"east", "west", "empty", "north"},
	})
	if err != nil {
		t.Fatal(err)
	}
	c := curve.New(set)
	r := segment.NewRunning(set)
	walk := []int{0, 1, 2, 1, c.Len() - 1, c.Len() / 2, c.Len()/2 + 1, 3, c.Len() - 3, c.Len() - 2, 0, c.Len() - 1, 5}
	for k := 0; k < 200; k++ {
		walk = append(walk, rng.IntN(c.Len()))
	}
	for _, cut := range walk {
		p := c.At(cut)
		got, want := r.At(p, 0.95), segment.At(set, p, 0.95)
		if len(got.Segments) != len(want.Segments) {
			t.Fatalf("cut %d: %d groups, want %d", cut, len(got.Segments), len(want.Segments))
		}
		pairs := append([][2]segment.Figures{{got.Overall, want.Overall}}, nil...)
		for i := range got.Segments {
			pairs = append(pairs, [2]segment.Figures{got.Segments[i], want.Segments[i]})
		}
		for _, pair := range pairs {
			g, w := pair[0], pair[1]
			if g.Segment != w.Segment || g.Rows != w.Rows || g.Outlier != w.Outlier ||
				!floatcmp.Equal(g.TP, w.TP) || !floatcmp.Equal(g.FP, w.FP) || !floatcmp.Equal(g.Recall, w.Recall) || !floatcmp.Equal(g.Precision, w.Precision) ||
				!floatcmp.Equal(g.RecallCI[0], w.RecallCI[0]) || !floatcmp.Equal(g.PrecisionCI[1], w.PrecisionCI[1]) || !floatcmp.Equal(g.FlaggedShare, w.FlaggedShare) {
				t.Fatalf("cut %d, group %q: got %+v, want %+v", cut, g.Segment, g, w)
			}
		}
	}
}

// TestRunningEmpty: an empty set and a set without segments give
// breakdowns with no groups, as At does.
func TestRunningEmpty(t *testing.T) {
	set, err := scores.New(nil, nil, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	b := segment.NewRunning(set).At(curve.Point{}, 0.95)
	if len(b.Segments) != 0 || !math.IsNaN(b.Overall.Recall) {
		t.Errorf("empty set: %+v", b)
	}
	set, err = scores.New([]float64{0.9, 0.1}, []bool{true, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	c := curve.New(set)
	b = segment.NewRunning(set).At(c.At(0), 0.95)
	if len(b.Segments) != 0 || b.Overall.Recall != 1 { // one of one true case flagged
		t.Errorf("no segments: %+v", b)
	}
}
