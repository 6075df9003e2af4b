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

// TestControlsMadeVisible: a candidate's name holding a terminal escape
// sequence and a right-to-left override reaches the page as visible
// escapes ("\x1b", "\u202e"), not as characters that hide or reorder what
// the people signing read; the page's own line feeds and tabs stay.
func TestControlsMadeVisible(t *testing.T) {
	f := fixture(t)
	evil := "late\x1b[31m\u202eyad"
	for i := range f.Candidates {
		if f.Candidates[i].Name == f.Chosen {
			f.Candidates[i].Name = evil
		}
	}
	f.Chosen = evil
	var b bytes.Buffer
	if err := page.Write(&b, f, page.Options{Name: "parcels-cut.yaml"}); err != nil {
		t.Fatal(err)
	}
	doc := b.String()
	if strings.ContainsAny(doc, "\x1b\u202e") {
		t.Error("the page holds the escape character or the override as they are")
	}
	if !strings.Contains(doc, `late\x1b[31m\u202eyad`) {
		t.Error("the name is not shown with its controls written out")
	}
	if !strings.Contains(doc, "\n") || !strings.Contains(doc, "\t") {
		t.Error("the page lost its own line feeds or tabs")
	}
}
