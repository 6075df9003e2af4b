package decision

import (
	"fmt"
	"math"
	"sort"

	"github.com/sill-tool/sill/internal/scores"
)

// HistogramBins is the number of quantile bins NewHistogram aims for.
const HistogramBins = 20

// Histogram is a compact summary of the validation scores, kept so that
// fresh scores can be compared with them without the data.
//
// Edges ascend by score whatever the direction of risk. There is one more
// edge than bins: Edges[0] is the smallest score and the last edge the
// largest. Bin i holds the scores s with Edges[i] <= s < Edges[i+1]; the
// last bin also holds scores equal to the last edge. Scores below the
// first edge count in the first bin and scores above the last edge in the
// last bin (see Bin). Counts[i] is the weighted number of scores in bin i.
// The Histogram of an empty set has no edges and no counts.
type Histogram struct {
	Edges  []float64
	Counts []float64
}

// NewHistogram returns the quantile histogram of set's scores: bin edges at
// the scores where the weighted share of smaller scores first reaches
// 1/20, 2/20, ... (by rows when every weight is zero). Tied scores never
// straddle an edge, so a heavy tie gives fewer than 20 bins.
func NewHistogram(set *scores.Set) Histogram {
	n := set.Len()
	if n == 0 {
		return Histogram{Edges: []float64{}, Counts: []float64{}}
	}
	// ascending(k) is the index of the k-th smallest score: the set is
	// ranked riskiest first, which is descending unless lower is riskier.
	ascending := func(k int) int {
		if set.LowerIsRiskier() {
			return k
		}
		return n - 1 - k
	}
	weightOf := set.Weight
	total := 0.0
	for i := 0; i < n; i++ {
		total += set.Weight(i)
	}
	if !(total > 0) {
		weightOf = func(int) float64 { return 1 }
		total = float64(n)
	}
	const slack = 1e-12
	edges := []float64{set.Scores()[ascending(0)]}
	cumulative := 0.0 // weight of the scores below the current one
	next := 1         // the quantile (in 20ths) the next edge waits for
	for k := 0; k < n; {
		score := set.Scores()[ascending(k)]
		if k > 0 && next < HistogramBins && cumulative >= float64(next)*total/HistogramBins*(1-slack) {
			edges = append(edges, score)
			next = int(math.Floor(cumulative*HistogramBins/total*(1+slack))) + 1
		}
		for ; k < n && set.Scores()[ascending(k)] == score; k++ {
			cumulative += weightOf(ascending(k))
		}
	}
	edges = append(edges, set.Scores()[ascending(n-1)])
	h := Histogram{Edges: edges}
	h.Counts = h.Fill(set)
	return h
}

// Bin returns the bin that holds score; it panics on a Histogram without
// bins.
func (h Histogram) Bin(score float64) int {
	if len(h.Edges) < 2 {
		panic("decision: Bin of a histogram without bins")
	}
	inner := h.Edges[1 : len(h.Edges)-1]
	return sort.Search(len(inner), func(j int) bool { return inner[j] > score })
}

// Fill returns the weighted count of set's scores in each bin of h; it
// returns nil when h has no bins.
func (h Histogram) Fill(set *scores.Set) []float64 {
	if len(h.Edges) < 2 {
		return nil
	}
	counts := make([]float64, len(h.Edges)-1)
	for i, s := range set.Scores() {
		counts[h.Bin(s)] += set.Weight(i)
	}
	return counts
}

// FillSquares returns the squared weights of set's scores in each bin of
// h (SquaredWeights.Histogram); nil when h has no bins.
func (h Histogram) FillSquares(set *scores.Set) []float64 {
	if len(h.Edges) < 2 {
		return nil
	}
	squares := make([]float64, len(h.Edges)-1)
	for i, s := range set.Scores() {
		w := set.Weight(i)
		squares[h.Bin(s)] += w * w
	}
	return squares
}

// validate checks the shape described in the Histogram doc.
func (h Histogram) validate() error {
	bad := func(path, format string, args ...any) error {
		return &ParseError{Path: "data.score_histogram." + path, Err: fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)}
	}
	if len(h.Edges) == 0 && len(h.Counts) == 0 {
		return nil
	}
	if len(h.Edges) != len(h.Counts)+1 {
		return bad("edges", "%d edges for %d counts, expected one edge more than counts", len(h.Edges), len(h.Counts))
	}
	for i, e := range h.Edges {
		if math.IsNaN(e) || math.IsInf(e, 0) {
			return &ParseError{Path: fmt.Sprintf("data.score_histogram.edges[%d]", i), Err: fmt.Errorf("%w, found %v", ErrNotFinite, e)}
		}
		last := i == len(h.Edges)-1
		if i > 0 && (h.Edges[i-1] > e || (!last && h.Edges[i-1] == e)) {
			return bad(fmt.Sprintf("edges[%d]", i), "%v after %v, expected ascending edges", e, h.Edges[i-1])
		}
	}
	for i, c := range h.Counts {
		if math.IsNaN(c) || math.IsInf(c, 0) || c < 0 {
			return bad(fmt.Sprintf("counts[%d]", i), "%v, expected a finite count >= 0", c)
		}
	}
	return nil
}
