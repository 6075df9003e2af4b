package review_test

import (
	"math"
	"reflect"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/review"
)

// TestSegmentLines: the groups that differ, with their gaps, and the base
// rates beside a wrong-alert gap. Hand-made file: 100 true cases among
// 1000 (the curve's last point); group "east" 50 true of 300 (base rate
// 16.7%), the rest 50 of 700 (7.1%).
func TestSegmentLines(t *testing.T) {
	nan := math.NaN()
	f := &decision.File{
		Assumptions: projection.Assumptions{Confidence: 0.95},
		Curve:       []decision.CurvePoint{{Score: 0.9, TP: 10, FP: 5}, {Score: 0.1, TP: 100, FP: 900}},
		Candidates: []decision.Candidate{
			{Name: "hit=0.8", Segments: &decision.Segments{Column: "depot", Tests: 4, Groups: []decision.SegmentGroup{
				{Name: "east", Positives: 50, Negatives: 250, Outlier: true,
					RecallGap: -0.2, RecallGapCI: [2]float64{-0.35, -0.05}, RecallAdjustedP: 0.012,
					FalseDiscoveryGap: 0.15, FalseDiscoveryGapCI: [2]float64{0.02, 0.27}, FalseDiscoveryAdjustedP: 0.04},
				{Name: "west", Positives: 50, Negatives: 650, RecallGap: 0.2, FalseDiscoveryGap: -0.15},
			}}},
			{Name: "top=5%", Segments: &decision.Segments{Column: "depot", Tests: 4, Groups: []decision.SegmentGroup{
				{Name: "east", RecallGap: nan}, {Name: "west"},
			}}},
			{Name: "by hand"},
		},
	}
	want := []string{
		`each group of "depot" against the rest of the set: gap (group less rest) with its 95% interval (Newcombe's hybrid score), p adjusted by Holm over the 4 tests; a group differs below 0.0500, and with no real difference any group at all does so in about 5% of validation sets`,
		"hit=0.8: east differs: hit gap -20.0 pt (-35.0 to -5.0 pt, adj. p 0.0120), wrong gap +15.0 pt (+2.0 to +27.0 pt, adj. p 0.0400); base rate 16.7% against 7.1% in the rest, and wrong-alert shares follow base rates",
		"top=5%: none of 2 groups differs",
	}
	if got := review.SegmentLines(f); !reflect.DeepEqual(got, want) {
		t.Errorf("got\n%q\nwant\n%q", got, want)
	}
	// A file from before the tests says what its flag meant.
	f.Candidates[0].Segments.Tests = 0
	if got := review.SegmentLines(f); len(got) != 3 || got[0] != `groups of "depot": this file was written before groups were tested against the rest of the set; its flag marks an interval clear of the whole set's` ||
		got[1] != "hit=0.8: east differs" {
		t.Errorf("old file: %q", got)
	}
	if got := review.SegmentLines(&decision.File{Candidates: []decision.Candidate{{Name: "a"}}}); got != nil {
		t.Errorf("no breakdown: %q", got)
	}
}

// TestPromiseLines: the promises as the file records them (hit= on this
// set only, hit95= at its level), and the least-cost candidate's
// optimism per shift with a volume, per case without; a candidate without
// a promise or optimism says nothing.
func TestPromiseLines(t *testing.T) {
	cost := evidence.Cut{Projected: projection.Figures{CostPerShift: 54000, CostPerCase: 36}}
	f := &decision.File{Candidates: []decision.Candidate{
		{Name: "hit=0.8", Rule: "hit=0.8", Promise: "hit share about 80.0% on this set only: below it about half the time in production"},
		{Name: "safe", Rule: "hit95=0.8", Promise: "hit share at least 80.0% with 95% confidence: below it in about 5% of validation sets"},
		{Name: "base", Rule: "base"}, {Name: "by hand"},
		// 36 + 3.1 = 39.1 per case; 1500 a shift: 4650 more, 58650 (format.Money: no
		// thousands separator, whole amounts without decimals).
		{Name: "least cost", Rule: "cost", Cut: cost, Optimism: &decision.CostOptimism{PerCase: 3.1, CorrectedPerCase: 39.1,
			PerShift: 4650, CorrectedPerShift: 58650, Folds: 10, Seed: 16, Method: "ten folds"}},
		{Name: "per case", Rule: "cost", Cut: cost, Optimism: &decision.CostOptimism{PerCase: 3.1, CorrectedPerCase: 39.1,
			PerShift: math.NaN(), CorrectedPerShift: math.NaN(), Folds: 10, Seed: 16, Method: "ten folds"}},
	}}
	want := []string{
		"hit=0.8 (hit=0.8): hit share about 80.0% on this set only: below it about half the time in production",
		"safe (hit95=0.8): hit share at least 80.0% with 95% confidence: below it in about 5% of validation sets",
		"least cost (cost): projected cost per shift 54000 understates its own cost (the cut was chosen on the same cases): about 4650 more out of sample, 58650 corrected (optimism estimate, ten folds; seed 16)",
		"per case (cost): projected cost per case 36 understates its own cost (the cut was chosen on the same cases): about 3.10 more out of sample, 39.10 corrected (optimism estimate, ten folds; seed 16)",
	}
	if got := review.PromiseLines(f); !reflect.DeepEqual(got, want) {
		t.Errorf("got\n%q\nwant\n%q", got, want)
	}
}
