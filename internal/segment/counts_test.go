package segment

import (
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/scores"
)

// TestCountsTableCountsCases: a counts table's breakdown equals that of the
// raw rows it aggregates, its row counts included (they count cases, not
// table rows).
func TestCountsTableCountsCases(t *testing.T) {
	raw := "score,label,yard\n" +
		"0.9,1,east\n0.9,1,east\n0.9,0,east\n" +
		"0.5,1,west\n0.5,0,west\n0.5,0,west\n0.5,0,west\n" +
		"0.1,0,east\n0.1,0,west\n"
	counts := "score,positives,negatives,yard\n" +
		"0.9,2,1,east\n0.5,1,3,west\n0.1,0,1,east\n0.1,0,1,west\n"
	opt := scores.Options{SegmentColumn: "yard"}
	rawSet, err := scores.Read(strings.NewReader(raw), "raw.csv", opt)
	if err != nil {
		t.Fatal(err)
	}
	countSet, err := scores.ReadCounts(strings.NewReader(counts), "counts.csv", opt)
	if err != nil {
		t.Fatal(err)
	}
	rawCurve, countCurve := curve.New(rawSet), curve.New(countSet)
	for i := range rawCurve.Len() {
		want := At(rawSet, rawCurve.At(i), 0.95)
		got := At(countSet, countCurve.At(i), 0.95)
		if got.Overall.Rows != want.Overall.Rows {
			t.Errorf("cut %d: overall rows %d, want %d", i, got.Overall.Rows, want.Overall.Rows)
		}
		for _, w := range want.Segments {
			found := false
			for _, g := range got.Segments {
				if g.Segment == w.Segment {
					found = true
					if g.Rows != w.Rows || g.Flagged != w.Flagged || g.Positives != w.Positives {
						t.Errorf("cut %d, %s: rows %d flagged %v true %v, want %d, %v, %v", i, w.Segment, g.Rows, g.Flagged, g.Positives, w.Rows, w.Flagged, w.Positives)
					}
				}
			}
			if !found {
				t.Errorf("cut %d: segment %s missing from the counts table's breakdown", i, w.Segment)
			}
		}
	}
}
