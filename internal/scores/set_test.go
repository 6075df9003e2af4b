package scores_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
)

// TestNewPanicsOnLengthMismatch checks that slices of different lengths
// are a programmer mistake: a panic whose message starts with "scores:".
func TestNewPanicsOnLengthMismatch(t *testing.T) {
	cases := []struct {
		name    string
		scores  []float64
		labels  []bool
		weights []float64
	}{
		{"fewer labels", []float64{1, 2}, []bool{true}, nil},
		{"more labels", []float64{1}, []bool{true, false}, nil},
		{"fewer weights", []float64{1, 2}, []bool{true, false}, []float64{1}},
		{"weights for an empty set", nil, nil, []float64{1}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			defer func() {
				r := recover()
				msg, _ := r.(string)
				if !strings.HasPrefix(msg, "scores:") {
					t.Errorf("panic %v, want a message starting with \"scores:\"", r)
				}
			}()
			scores.New(tc.scores, tc.labels, tc.weights, false)
		})
	}
}

// TestNewErrors checks that bad data given to New is an error, not a panic.
func TestNewErrors(t *testing.T) {
	cases := []struct {
		name     string
		scores   []float64
		weights  []float64
		sentinel error
		message  string
	}{
		{"NaN score", []float64{0.5, math.NaN()}, nil, scores.ErrBadScore, "row 2: invalid score NaN, expected a finite number"},
		{"infinite score", []float64{math.Inf(-1), 0.5}, nil, scores.ErrBadScore, "row 1: invalid score -Inf, expected a finite number"},
		{"negative weight", []float64{0.5, 0.1}, []float64{1, -2}, scores.ErrBadWeight, "row 2: invalid weight -2, expected a finite number >= 0"},
		{"NaN weight", []float64{0.5, 0.1}, []float64{math.NaN(), 1}, scores.ErrBadWeight, "row 1: invalid weight NaN, expected a finite number >= 0"},
		{"infinite weight", []float64{0.5, 0.1}, []float64{1, math.Inf(1)}, scores.ErrBadWeight, "row 2: invalid weight +Inf, expected a finite number >= 0"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := scores.New(tc.scores, make([]bool, len(tc.scores)), tc.weights, false)
			if !errors.Is(err, tc.sentinel) {
				t.Fatalf("got %v, want %v", err, tc.sentinel)
			}
			if err.Error() != tc.message {
				t.Errorf("message %q, want %q", err, tc.message)
			}
		})
	}
}

// TestNewRanks checks New's ranking by hand: riskiest first, ties in the
// order given, -0 tied with +0, and the order turned round by
// lowerIsRiskier.
func TestNewRanks(t *testing.T) {
	negZero := math.Copysign(0, -1)
	// Labels mark the rows so that the order of ties can be seen: rows
	// 1..6 are (0.3 T) (-0 F) (1.5 T) (0 T) (0.3 F) (-2 F).
	in := []float64{0.3, negZero, 1.5, 0, 0.3, -2}
	labels := []bool{true, false, true, true, false, false}
	weights := []float64{1, 2, 3, 4, 5, 6}

	set, err := scores.New(slices.Clone(in), slices.Clone(labels), slices.Clone(weights), false)
	if err != nil {
		t.Fatal(err)
	}
	// Higher riskier: 1.5 (row 3), 0.3 (rows 1, 5), zero (rows 2, 4), -2 (row 6).
	if want := []float64{3, 1, 5, 2, 4, 6}; !slices.Equal(set.Weights(), want) {
		t.Errorf("higher riskier: row order %v, want %v", set.Weights(), want)
	}
	if want := []bool{true, true, false, false, true, false}; !slices.Equal(set.Labels(), want) {
		t.Errorf("higher riskier: labels %v, want %v", set.Labels(), want)
	}

	set, err = scores.New(slices.Clone(in), slices.Clone(labels), slices.Clone(weights), true)
	if err != nil {
		t.Fatal(err)
	}
	// Lower riskier: -2 (row 6), zero (rows 2, 4), 0.3 (rows 1, 5), 1.5 (row 3).
	if want := []float64{6, 2, 4, 1, 5, 3}; !slices.Equal(set.Weights(), want) {
		t.Errorf("lower riskier: row order %v, want %v", set.Weights(), want)
	}
	if !set.Flags(0.3, 0) || set.Flags(0.3, 1.5) || !set.Flags(0.3, 0.3) {
		t.Error("lower riskier: Flags should flag scores <= the cut")
	}
	if !set.Riskier(-2, 0) || set.Riskier(0, 0) {
		t.Error("lower riskier: Riskier(-2, 0) should hold and Riskier(0, 0) not")
	}

	set, _ = scores.New([]float64{1}, []bool{true}, nil, false)
	if !set.Flags(0.3, 0.3) || !set.Flags(0.3, 1) || set.Flags(0.3, 0.2) {
		t.Error("higher riskier: Flags should flag scores >= the cut")
	}

	empty, err := scores.New(nil, nil, nil, false)
	if err != nil || empty.Len() != 0 {
		t.Errorf("empty New: %v, %d rows", err, empty.Len())
	}
	if p, n := empty.Totals(); p != 0 || n != 0 {
		t.Errorf("empty totals %v %v", p, n)
	}
}

// TestRankMatchesStableSort compares the ranking with sort.SliceStable on
// seeded random scores of every sign and size, heavy ties included.
func TestRankMatchesStableSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	generators := map[string]func() float64{
		"probabilities":   rng.Float64,
		"few ties":        func() float64 { return float64(rng.IntN(5)) / 4 },
		"signed logits":   func() float64 { return rng.NormFloat64() * 4 },
		"wide magnitudes": func() float64 { return math.Ldexp(rng.Float64()-0.5, rng.IntN(2000)-1000) },
		"signed zeros":    func() float64 { return []float64{-1, math.Copysign(0, -1), 0, 1}[rng.IntN(4)] },
	}
	for name, draw := range generators {
		for _, lower := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s/lower=%v", name, lower), func(t *testing.T) {
				for _, n := range []int{0, 1, 2, 17, 1000} {
					in := make([]float64, n)
					ids := make([]float64, n) // the row number, carried as a weight
					for i := range in {
						in[i] = draw()
						ids[i] = float64(i)
					}
					want := make([]int, n)
					for i := range want {
						want[i] = i
					}
					sort.SliceStable(want, func(a, b int) bool {
						if lower {
							return in[want[a]] < in[want[b]]
						}
						return in[want[a]] > in[want[b]]
					})
					set, err := scores.New(slices.Clone(in), make([]bool, n), ids, lower)
					if err != nil {
						t.Fatal(err)
					}
					for i, w := range want {
						if int(set.Weights()[i]) != w {
							t.Fatalf("n=%d: ranked row %d is input row %v, want %d", n, i, set.Weights()[i], w)
						}
					}
				}
			})
		}
	}
}

// TestCasesOfRowsAndCounts: a set of scored cases and a counts table of the
// same cases answer the same questions about cases. Hand-worked: scores
// 0.9 (2 true), 0.5 (1 true, 3 false), 0.1 (4 false) as ten rows and as
// four counted rows; ranked, the counts table's rows hold 2, 1, 3 and 4
// cases (at a tied score its rows keep their given order).
func TestCasesOfRowsAndCounts(t *testing.T) {
	rows, err := scores.New(
		[]float64{0.1, 0.9, 0.5, 0.5, 0.1, 0.9, 0.5, 0.5, 0.1, 0.1},
		[]bool{false, true, true, false, false, true, false, false, false, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	counted, err := scores.NewCounts([]float64{0.5, 0.1, 0.9, 0.5}, []bool{true, false, true, false}, []float64{1, 4, 2, 3}, false)
	if err != nil {
		t.Fatal(err)
	}
	if rows.CountsTable() || !counted.CountsTable() || rows.Weighted() || counted.Weighted() {
		t.Errorf("counts table %v and %v, weighted %v and %v; want false, true, false, false",
			rows.CountsTable(), counted.CountsTable(), rows.Weighted(), counted.Weighted())
	}
	if rows.Cases() != 10 || counted.Cases() != 10 {
		t.Errorf("cases %d and %d, want 10", rows.Cases(), counted.Cases())
	}
	for i, want := range []int{2, 1, 3, 4} {
		if got := counted.CasesAt(i); got != want {
			t.Errorf("counts table row %d holds %d cases, want %d", i, got, want)
		}
	}
	for i := range rows.Len() {
		if rows.CasesAt(i) != 1 {
			t.Errorf("scored row %d holds %d cases, want 1", i, rows.CasesAt(i))
		}
	}
	for r, want := range []int{0, 2, 3, 6, 10} {
		if got := counted.CasesFlagged(r); got != want {
			t.Errorf("counts table rows [0,%d) hold %d cases, want %d", r, got, want)
		}
	}
	for r := range rows.Len() + 1 {
		if rows.CasesFlagged(r) != r {
			t.Errorf("scored rows [0,%d) hold %d cases", r, rows.CasesFlagged(r))
		}
	}
	for c, want := range []int{0, 0, 1, 2, 2, 2, 3, 3, 3, 3} {
		if got := counted.RowOfCase(c); got != want {
			t.Errorf("case %d in counts table row %d, want %d", c, got, want)
		}
		if got := rows.RowOfCase(c); got != c {
			t.Errorf("case %d in scored row %d", c, got)
		}
	}
}

// TestNewCountsErrors: counts must be whole numbers >= 0.
func TestNewCountsErrors(t *testing.T) {
	for _, count := range []float64{-1, 1.5, math.NaN(), math.Inf(1)} {
		_, err := scores.NewCounts([]float64{0.5, 0.2}, []bool{true, false}, []float64{1, count}, false)
		if !errors.Is(err, scores.ErrBadCount) || !strings.HasPrefix(err.Error(), "row 2: ") {
			t.Errorf("count %v: error %v, want row 2 and ErrBadCount", count, err)
		}
	}
	empty, err := scores.NewCounts(nil, nil, nil, false)
	if err != nil || empty.Cases() != 0 || !empty.CountsTable() {
		t.Errorf("empty counts table: %v, %v", empty, err)
	}
}

// TestReplicate: a resample repeats scored cases, carrying their weights,
// and gathers a counts table's drawn cases into one row each, leaving out
// rows drawn no time. Hand-worked from the draws given.
func TestReplicate(t *testing.T) {
	weighted, err := scores.New([]float64{0.9, 0.5, 0.1}, []bool{true, false, false}, []float64{2, 0.5, 1}, false)
	if err != nil {
		t.Fatal(err)
	}
	var rep scores.Set
	scores.Replicate(&rep, weighted, []int32{2, 0, 1})
	if !slices.Equal(rep.Scores(), []float64{0.9, 0.9, 0.1}) || !slices.Equal(rep.Weights(), []float64{2, 2, 1}) || rep.CountsTable() {
		t.Errorf("scored replicate %v weighted %v (counts table %v)", rep.Scores(), rep.Weights(), rep.CountsTable())
	}
	counted, err := scores.NewCounts([]float64{0.9, 0.5, 0.1}, []bool{true, false, false}, []float64{5, 3, 4}, false)
	if err != nil {
		t.Fatal(err)
	}
	scores.Replicate(&rep, counted, []float64{7, 0, 5})
	if !slices.Equal(rep.Scores(), []float64{0.9, 0.1}) || !slices.Equal(rep.Weights(), []float64{7, 5}) || !rep.CountsTable() || rep.Cases() != 12 || rep.CasesFlagged(1) != 7 {
		t.Errorf("counts replicate %v weighted %v (counts table %v, %d cases)", rep.Scores(), rep.Weights(), rep.CountsTable(), rep.Cases())
	}
}
