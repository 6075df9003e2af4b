package report_test

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

// beyondSet is a small set with two groups; cut 0.8 flags the first three
// rows (see internal/segment's hand-worked test for the figures).
const beyondSet = "score,label,seg\n" +
	"0.9,1,A\n0.8,1,B\n0.8,0,A\n0.7,0,B\n0.6,1,A\n0.5,0,A\n0.4,1,B\n0.3,0,B\n"

func beyondReport(t *testing.T, specs ...string) (*report.Report, *scores.Set, []cutrule.Outcome, projection.Assumptions) {
	t.Helper()
	set, err := scores.Read(strings.NewReader(beyondSet), "t.csv", scores.Options{SegmentColumn: "seg"})
	if err != nil {
		t.Fatal(err)
	}
	c := curve.New(set)
	a := projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}
	var rules []cutrule.Rule
	for _, s := range specs {
		r, err := cutrule.Parse(s)
		if err != nil {
			t.Fatal(err)
		}
		rules = append(rules, r)
	}
	outcomes, err := cutrule.Find(rules, c, a)
	if err != nil {
		t.Fatal(err)
	}
	return report.New(set, c.Summary, a, outcomes), set, outcomes, a
}

// decode writes r as JSON and reads it back as generic values.
func decode(t *testing.T, r *report.Report) map[string]any {
	t.Helper()
	var buf bytes.Buffer
	if err := report.WriteJSON(&buf, r, nil); err != nil {
		t.Fatal(err)
	}
	var out map[string]any
	if err := json.Unmarshal(buf.Bytes(), &out); err != nil {
		t.Fatalf("%v\n%s", err, buf.String())
	}
	return out
}

func TestSegmentsInJSONAndText(t *testing.T) {
	r, set, outcomes, _ := beyondReport(t, "score=0.8", "score=5")
	r.AddSegments(set, outcomes, segment.ByName)
	cuts := decode(t, r)["cuts"].([]any)
	segs := cuts[0].(map[string]any)["segments"].([]any)
	if len(segs) != 2 {
		t.Fatalf("segments %v", segs)
	}
	a := segs[0].(map[string]any)
	for _, key := range []string{"segment", "rows", "positives", "flagged", "recall", "recall_ci", "precision", "precision_ci", "outlier"} {
		if _, ok := a[key]; !ok {
			t.Errorf("segment lacks key %q: %v", key, a)
		}
	}
	// A at cut 0.8: 1 of 2 true cases caught, 1 of 2 alerts right (hand-worked).
	if a["segment"] != "A" || a["recall"] != 0.5 || a["precision"] != 0.5 || a["outlier"] != false {
		t.Errorf("segment A %v", a)
	}
	if _, ok := cuts[1].(map[string]any)["segments"]; ok {
		t.Errorf("an unmet cut has no segments: %v", cuts[1])
	}
	var text bytes.Buffer
	if err := report.WriteText(&text, r); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(text.String(), "segments (seg) at score=0.8, cut 0.8") {
		t.Errorf("text lacks the segment section:\n%s", text.String())
	}
}
