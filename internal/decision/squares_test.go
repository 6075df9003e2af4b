package decision

import (
	"bytes"
	"context"
	"errors"
	"slices"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// squaresFile is the decision file of six weighted cases, the weights
// read as kind: scores 0.9 0.8 0.7 0.4 0.2 0.1, true cases at 0.9, 0.7
// and 0.1, weights 1 2 3 1 4 1; the cut at 0.7 chosen.
func squaresFile(t *testing.T, kind design.Kind) *File {
	t.Helper()
	set, err := scores.NewSet(scores.Columns{
		Scores:  []float64{0.9, 0.8, 0.7, 0.4, 0.2, 0.1},
		Labels:  []bool{true, false, true, false, false, true},
		Weights: []float64{1, 2, 3, 1, 4, 1}, WeightColumn: "w", ScoreColumn: "score", LabelColumn: "label",
	})
	if err != nil {
		t.Fatal(err)
	}
	positives, negatives := set.Totals()
	a := projection.Assumptions{BaseRate: positives / (positives + negatives), Confidence: 0.95, Sample: design.New(set, kind)}
	res, err := analysis.Run(context.Background(), set, a, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var picks []Pick
	res.Points(func(p curve.Point) {
		if p.Score == 0.7 {
			picks = append(picks, Pick{Name: "at 0.7", Point: p})
		}
	})
	f, err := New(res, picks, "", Record{ToolVersion: "test"})
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// TestSquaredWeights: sampling weights record data.squared_weights, by
// hand from the six cases of squaresFile: true cases 1² + 3² + 1² = 11,
// false cases 2² + 1² + 4² = 21; flagged at the cuts 0.9, 0.8, 0.7, 0.4,
// 0.2, 0.1: [1, 0], [1, 4], [10, 4], [10, 5], [10, 21], [11, 21]. The
// histogram's squares add up to 32. They survive a write and a read;
// frequency weights write no key.
func TestSquaredWeights(t *testing.T) {
	f := squaresFile(t, design.Sampling)
	q := f.Data.Squares
	if q == nil {
		t.Fatal("no squared weights under sampling weights")
	}
	want := [][2]float64{{1, 0}, {1, 4}, {10, 4}, {10, 5}, {10, 21}, {11, 21}}
	if q.Positives != 11 || q.Negatives != 21 || !slices.Equal(q.Curve, want) || sum(q.Histogram) != 32 || len(q.Histogram) != len(f.Data.Histogram.Counts) {
		t.Errorf("squared weights %+v, want positives 11, negatives 21, curve %v and histogram squares adding to 32", *q, want)
	}
	if got := design.Kish(f.Data.Positives, q.Positives); got != 25.0/11 {
		t.Errorf("Kish size of the true cases %v, want 25/11", got)
	}
	text, err := Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	back, err := Read(bytes.NewReader(text), "cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if b := back.Data.Squares; b == nil || b.Positives != q.Positives || b.Negatives != q.Negatives || !slices.Equal(b.Curve, q.Curve) || !slices.Equal(b.Histogram, q.Histogram) {
		t.Errorf("read back %+v, want %+v", back.Data.Squares, *q)
	}
	frequency := squaresFile(t, design.Frequency)
	text, err = Marshal(frequency)
	if err != nil {
		t.Fatal(err)
	}
	if frequency.Data.Squares != nil || strings.Contains(string(text), "squared_weights") {
		t.Error("frequency weights record squared weights, want no key")
	}
}

// TestReadRejectsBrokenSquaredWeights: each broken data.squared_weights
// fails at its key path.
func TestReadRejectsBrokenSquaredWeights(t *testing.T) {
	valid, err := Marshal(squaresFile(t, design.Sampling))
	if err != nil {
		t.Fatal(err)
	}
	text := string(valid)
	if _, err := Read(strings.NewReader(text), "cut.yaml"); err != nil {
		t.Fatalf("the unbroken file: %v", err)
	}
	for _, tc := range []struct {
		name     string
		broken   string
		sentinel error
		path     string
	}{
		{"with frequency weights", replaceNth(t, text, `weight_kind: sampling`, 0, `weight_kind: frequency`), ErrInvalid, "data.squared_weights"},
		{"not a mapping", replaceNth(t, text, `(?s)squared_weights:\n.*?\nassumptions:`, 0, "squared_weights: 3\nassumptions:"), ErrType, "data.squared_weights"},
		{"unknown key", replaceNth(t, text, `\n    positives: `, 0, "\n    rows: 3\n    positives: "), ErrUnknownKey, "data.squared_weights.rows"},
		{"missing negatives", replaceNth(t, text, `\n    negatives: \d+`, 0, ""), ErrMissingKey, "data.squared_weights.negatives"},
		{"negative total", replaceNth(t, text, `\n    positives: \d+`, 0, "\n    positives: -1"), ErrInvalid, "data.squared_weights.positives"},
		{"total text", replaceNth(t, text, `\n    negatives: \d+`, 0, "\n    negatives: many"), ErrType, "data.squared_weights.negatives"},
		{"histogram short", replaceNth(t, text, `\n    score_histogram: \[\d+, `, 0, "\n    score_histogram: ["), ErrInvalid, "data.squared_weights.score_histogram"},
		{"histogram negative", replaceNth(t, text, `\n    score_histogram: \[\d+, `, 0, "\n    score_histogram: [-1, "), ErrInvalid, "data.squared_weights.score_histogram[0]"},
		{"curve pair of three", replaceNth(t, text, `- \[1, 4\]`, 0, `- [1, 4, 4]`), ErrInvalid, "data.squared_weights.curve[1]"},
		{"curve falls", replaceNth(t, text, `- \[10, 5\]`, 0, `- [9, 5]`), ErrInvalid, "data.squared_weights.curve[3]"},
		{"curve above the total", replaceNth(t, text, `- \[11, 21\]`, 0, `- [12, 21]`), ErrInvalid, "data.squared_weights.curve[5]"},
		{"curve nan", replaceNth(t, text, `- \[1, 0\]`, 0, `- [.nan, 0]`), ErrNotFinite, "data.squared_weights.curve[0][0]"},
		{"a pair short of the curve", replaceNth(t, text, `\n      - \[11, 21\]`, 0, ""), ErrInvalid, "data.squared_weights.curve"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Read(strings.NewReader(tc.broken), "cut.yaml")
			var pe *ParseError
			if !errors.Is(err, tc.sentinel) || !errors.As(err, &pe) || pe.Path != tc.path {
				t.Fatalf("error %v, want %v at path %q", err, tc.sentinel, tc.path)
			}
		})
	}
}

func sum(xs []float64) float64 {
	s := 0.0
	for _, x := range xs {
		s += x
	}
	return s
}
