package decision

import (
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
)

func TestNewHistogram(t *testing.T) {
	seq := func(from, to int) []float64 {
		var out []float64
		for v := from; v <= to; v++ {
			out = append(out, float64(v))
		}
		return out
	}
	ones := func(n float64, count int) []float64 {
		out := make([]float64, count)
		for i := range out {
			out[i] = n
		}
		return out
	}
	for _, tc := range []struct {
		name      string
		scores    []float64
		weights   []float64
		lower     bool
		edges     []float64
		counts    []float64
		whereFrom string
	}{
		{name: "empty", edges: []float64{}, counts: []float64{}, whereFrom: "an empty set has no bins (doc)"},
		{name: "one score", scores: []float64{0.4, 0.4, 0.4}, edges: []float64{0.4, 0.4}, counts: []float64{3},
			whereFrom: "one distinct score: a single bin from it to itself"},
		{name: "1 to 40", scores: seq(1, 40), edges: append(append([]float64{1}, oddsFrom3To39()...), 40), counts: ones(2, 20),
			whereFrom: "by hand: 40 rows, an edge every 2 rows at 3, 5, ..., 39"},
		{name: "1 to 40 lower riskier", scores: seq(1, 40), lower: true, edges: append(append([]float64{1}, oddsFrom3To39()...), 40), counts: ones(2, 20),
			whereFrom: "edges ascend by score whatever the direction of risk"},
		{name: "heavy tie", scores: append(ones(5, 10), 6, 7), edges: []float64{5, 6, 7, 7}, counts: []float64{10, 1, 1},
			whereFrom: "by hand: 12 rows, the ten 5s take 10/12 of the weight in one bin; 6 (cum 10 >= 1/20*12) and 7 (cum 11) open bins"},
		{name: "weights", scores: []float64{1, 2, 3}, weights: []float64{18, 1, 1}, edges: []float64{1, 2, 3, 3}, counts: []float64{18, 1, 1},
			whereFrom: "by hand: weight 20; 2 has 18 below it (>= 1/20), 3 has 19 below it (>= 19/20 reached, next is 20 so no more edges after)"},
		{name: "zero weights use rows", scores: []float64{1, 2}, weights: []float64{0, 0}, edges: []float64{1, 2, 2}, counts: []float64{0, 0},
			whereFrom: "every weight 0: edges by rows (1 of 2 below 2 is >= 1/20), counts stay weighted"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			labels := make([]bool, len(tc.scores))
			set, err := scores.New(append([]float64(nil), tc.scores...), labels, tc.weights, tc.lower)
			if err != nil {
				t.Fatal(err)
			}
			h := NewHistogram(set)
			assertFloats(t, "edges", h.Edges, tc.edges)
			assertFloats(t, "counts", h.Counts, tc.counts)
			if err := h.validate(); err != nil {
				t.Errorf("validate: %v", err)
			}
		})
	}
}

func oddsFrom3To39() []float64 {
	var out []float64
	for v := 3; v <= 39; v += 2 {
		out = append(out, float64(v))
	}
	return out
}

// TestHistogramWeightTwoIsRowTwice checks the weight property of the
// house style on random sets: a weight of 2 gives the same histogram as
// the row written twice.
func TestHistogramWeightTwoIsRowTwice(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 4))
	for trial := 0; trial < 50; trial++ {
		n := 1 + rng.IntN(200)
		var sc, weights, doubled []float64
		for i := 0; i < n; i++ {
			s := float64(rng.IntN(30)) / 10 // ties on purpose
			w := float64(1 + rng.IntN(2))
			sc = append(sc, s)
			weights = append(weights, w)
			doubled = append(doubled, s)
			if w == 2 {
				doubled = append(doubled, s)
			}
		}
		a, _ := scores.New(sc, make([]bool, len(sc)), weights, false)
		b, _ := scores.New(doubled, make([]bool, len(doubled)), nil, false)
		ha, hb := NewHistogram(a), NewHistogram(b)
		assertFloats(t, "edges", ha.Edges, hb.Edges)
		assertFloats(t, "counts", ha.Counts, hb.Counts)
	}
}

func TestBin(t *testing.T) {
	h := Histogram{Edges: []float64{0, 1, 2, 3}, Counts: []float64{1, 1, 1}}
	// By the doc: [0,1) [1,2) [2,3], with scores outside in the end bins.
	for _, tc := range []struct {
		score float64
		bin   int
	}{{-5, 0}, {0, 0}, {0.99, 0}, {1, 1}, {2, 2}, {3, 2}, {9, 2}} {
		if got := h.Bin(tc.score); got != tc.bin {
			t.Errorf("Bin(%v) = %d, want %d", tc.score, got, tc.bin)
		}
	}
}
