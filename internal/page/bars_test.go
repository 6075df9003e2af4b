package page

import (
	"fmt"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"
)

// TestCrowdedBarNamesTurn draws the workload chart with few and with many
// candidates: up to crowdedBars names stand level under their bars, more are
// turned (the SVG rotates their text) so that they do not run into each other,
// as they did with the seven starting points of the demo.
func TestCrowdedBarNamesTurn(t *testing.T) {
	for _, count := range []int{crowdedBars, crowdedBars + 1, 7} {
		c := chart{title: "Alerts per shift", yLabel: "alerts per shift"}
		for i := 0; i < count; i++ {
			c.bars = append(c.bars, bar{name: fmt.Sprintf("candidate-%d", i), value: float64(10 * (i + 1))})
		}
		svg, err := c.draw(vg.Points(320), vg.Points(200))
		if err != nil {
			t.Fatalf("%d bars: %v", count, err)
		}
		// The Y axis's own label is always turned; the names are the rest.
		turned := strings.Count(string(svg), "rotate(") - 1
		if count <= crowdedBars && turned != 0 {
			t.Errorf("%d bars: %d rotated texts, want the names level", count, turned)
		}
		if count > crowdedBars && turned < count {
			t.Errorf("%d bars: %d rotated texts, want every name turned", count, turned)
		}
	}
}
