package scores

import (
	"slices"
	"testing"
)

func TestSwapScores(t *testing.T) {
	// Hand-built: model A ranks rows a,b,c,d; model B ranks c,a,d,b with a
	// tie between a and d that keeps A's order (a before d).
	set := &Set{
		Scores:        []float64{0.9, 0.7, 0.5, 0.2},
		CompareScores: []float64{0.6, 0.1, 0.8, 0.6},
		Labels:        []bool{true, false, true, false},
		IDs:           []string{"a", "b", "c", "d"},
		ScoreColumn:   "model_a",
		CompareColumn: "model_b",
	}
	swapped := set.SwapScores()
	if got, want := swapped.IDs, []string{"c", "a", "d", "b"}; !slices.Equal(got, want) {
		t.Fatalf("ranked by the second score: ids %v, want %v", got, want)
	}
	if got, want := swapped.Scores, []float64{0.8, 0.6, 0.6, 0.1}; !slices.Equal(got, want) {
		t.Errorf("scores %v, want %v", got, want)
	}
	if got, want := swapped.CompareScores, []float64{0.5, 0.9, 0.2, 0.7}; !slices.Equal(got, want) {
		t.Errorf("second scores %v, want %v", got, want)
	}
	if got, want := swapped.Labels, []bool{true, true, false, false}; !slices.Equal(got, want) {
		t.Errorf("labels %v, want %v", got, want)
	}
	if swapped.ScoreColumn != "model_b" || swapped.CompareColumn != "model_a" {
		t.Errorf("columns %q and %q, want model_b and model_a", swapped.ScoreColumn, swapped.CompareColumn)
	}
	if got, want := set.IDs, []string{"a", "b", "c", "d"}; !slices.Equal(got, want) {
		t.Errorf("the original set changed: ids %v", got)
	}
	if (&Set{Scores: []float64{1}, Labels: []bool{true}}).SwapScores() != nil {
		t.Error("SwapScores without a second score column is not nil")
	}
}
