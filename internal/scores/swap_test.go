package scores

import (
	"slices"
	"testing"
)

func TestSwapScores(t *testing.T) {
	// Hand-built: model A ranks rows a,b,c,d; model B ranks c,a,d,b with a
	// tie between a and d that keeps A's order (a before d).
	set, err := NewSet(Columns{
		Scores:        []float64{0.9, 0.7, 0.5, 0.2},
		CompareScores: []float64{0.6, 0.1, 0.8, 0.6},
		Labels:        []bool{true, false, true, false},
		IDs:           []string{"a", "b", "c", "d"},
		ScoreColumn:   "model_a",
		CompareColumn: "model_b",
	})
	if err != nil {
		t.Fatal(err)
	}
	swapped := set.SwapScores()
	if got, want := swapped.ids, []string{"c", "a", "d", "b"}; !slices.Equal(got, want) {
		t.Fatalf("ranked by the second score: ids %v, want %v", got, want)
	}
	if got, want := swapped.scores, []float64{0.8, 0.6, 0.6, 0.1}; !slices.Equal(got, want) {
		t.Errorf("scores %v, want %v", got, want)
	}
	if got, want := swapped.compareScores, []float64{0.5, 0.9, 0.2, 0.7}; !slices.Equal(got, want) {
		t.Errorf("second scores %v, want %v", got, want)
	}
	if got, want := swapped.labels, []bool{true, true, false, false}; !slices.Equal(got, want) {
		t.Errorf("labels %v, want %v", got, want)
	}
	if swapped.scoreColumn != "model_b" || swapped.compareColumn != "model_a" {
		t.Errorf("columns %q and %q, want model_b and model_a", swapped.scoreColumn, swapped.compareColumn)
	}
	if got, want := set.ids, []string{"a", "b", "c", "d"}; !slices.Equal(got, want) {
		t.Errorf("the original set changed: ids %v", got)
	}
	plain, err := New([]float64{1}, []bool{true}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	if plain.SwapScores() != nil {
		t.Error("SwapScores without a second score column is not nil")
	}
}
