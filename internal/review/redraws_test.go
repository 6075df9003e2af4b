package review

import (
	"math"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/decision"
)

// TestRedrawsRow: a candidate whose file records the range at its cut
// shows it under the hit share and under the wrong-alert share as the
// redraws at this cut, in that order; one written
// before the key (NaN) shows where its rule lands under that label
// instead, never as redraws; a candidate not resampled shows neither.
// Hand-made stabilities.
func TestRedrawsRow(t *testing.T) {
	nan := [2]float64{math.NaN(), math.NaN()}
	lands := [2]float64{0.8, 0.81}
	for _, tc := range []struct {
		name      string
		st        *decision.Stability
		redraws   string // the redraws rows' cells in order, "" for no row
		landsCell string // the rule-landed row's cell, "" for no row
	}{
		{"at the cut", &decision.Stability{Replicates: 200, Met: 200, Recall: lands, RecallAtCut: [2]float64{0.762, 0.838}, FalseDiscoveryRateAtCut: [2]float64{0.7, 0.75}}, "76.2–83.8% 70.0–75.0%", ""},
		{"older file", &decision.Stability{Replicates: 200, Met: 200, Recall: lands, RecallAtCut: nan, FalseDiscoveryRateAtCut: nan}, "", "80.0–81.0%"},
		{"not resampled", nil, "", ""},
	} {
		c := decision.Candidate{Name: "hit=0.8", Rule: "hit=0.8", Stability: tc.st}
		c.Cut.Score, c.Cut.Recall = 0.5, 0.8
		tbl := compare.New([]compare.Column{Column(c)}, 0, compare.Options{})
		got := map[string]string{}
		for _, r := range tbl.Rows {
			label := strings.TrimSpace(r.Figure)
			got[label] = strings.TrimSpace(got[label] + " " + r.Cells[0])
		}
		if got[compare.RedrawsLabel] != tc.redraws || got[compare.LandsLabel] != tc.landsCell {
			t.Errorf("%s: redraws %q, where the rule lands %q; want %q and %q", tc.name, got[compare.RedrawsLabel], got[compare.LandsLabel], tc.redraws, tc.landsCell)
		}
	}
}
