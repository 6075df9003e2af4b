package page_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/page"
)

// TestStabilityByHand: a candidate picked by hand carries only its
// redraws at the cut (decision.SkippedByHand); the stability table says
// its cut stays put rather than that it was not resampled, and a rule's
// candidate that was skipped for another reason still reads "not
// resampled".
func TestStabilityByHand(t *testing.T) {
	for _, tc := range []struct {
		skipped, want, not string
	}{
		{decision.SkippedByHand, "no rule: the cut stays put", "not resampled"},
		{"the rule needs shift times", "not resampled", "no rule: the cut stays put"},
	} {
		f := fixture(t)
		nan := [2]float64{math.NaN(), math.NaN()}
		f.Candidates[0].Stability = &decision.Stability{Replicates: 50, Seed: 1, Score: nan, FlaggedShare: nan, Recall: nan, Skipped: tc.skipped}
		var b bytes.Buffer
		if err := page.Write(&b, f, page.Options{Name: "parcels-cut.yaml"}); err != nil {
			t.Fatal(err)
		}
		text := visibleText(b.String())
		if !strings.Contains(text, tc.want) || strings.Contains(text, tc.not) {
			t.Errorf("skipped %q: the stability table should say %q and not %q", tc.skipped, tc.want, tc.not)
		}
	}
}
