package page

import (
	"math"
	"testing"
)

// TestPlaceLabels: a label goes right of its mark unless that overlaps one
// placed before; then left, then a line down. Hand-worked on the 270 × 200
// point area: "hit95=0.8 (chosen)" at (0.26, 0.83) takes x 76.2–159.0
// and y 157–167 (6 right of 70.2, 18 characters of 4.6; 9 down from 166);
// "hit=0.8" at (0.23, 0.80) right would take x 68.1–100.3, y 151–161: it
// overlaps, so it goes left, x 23.9–55.9; queue=90 at (0.06, 0.47), far below, keeps
// the right; a mark without a label or with an undefined place is left
// out.
func TestPlaceLabels(t *testing.T) {
	nan := math.NaN()
	marks := []mark{
		{label: "hit95=0.8 (chosen)", x: 0.26, y: 0.83, chosen: true},
		{label: "hit=0.8", x: 0.23, y: 0.80},
		{label: "queue=90", x: 0.06, y: 0.47},
		{x: 0.5, y: 0.5},
		{label: "n/a", x: nan, y: 0.5},
	}
	got := placeLabels(marks)
	want := []struct {
		label string
		left  bool
		dy    float64
	}{{"hit95=0.8 (chosen)", false, -9}, {"hit=0.8", true, -9}, {"queue=90", false, -9}}
	if len(got) != len(want) {
		t.Fatalf("%d labels placed, want %d: %+v", len(got), len(want), got)
	}
	for i, w := range want {
		if g := got[i]; g.mark.label != w.label || g.left != w.left || g.dy != w.dy {
			t.Errorf("label %d: %q left %v dy %v, want %q left %v dy %v", i, g.mark.label, g.left, g.dy, w.label, w.left, w.dy)
		}
	}
	// Three at one point: right, left, then right a line down.
	same := []mark{{label: "a=1", x: 0.5, y: 0.5}, {label: "b=2", x: 0.5, y: 0.5}, {label: "c=3", x: 0.5, y: 0.5}}
	got = placeLabels(same)
	if got[0].left || !got[1].left || got[2].left || got[2].dy != -19 {
		t.Errorf("three at one point: %+v", got)
	}
}
