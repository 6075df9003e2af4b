package report_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
)

// TestCostOptimismShown checks that the cost cut carries the optimism
// estimate analysis.CostOptimism computes, per shift, in JSON and text,
// and that no other cut does.
func TestCostOptimismShown(t *testing.T) {
	// 200 seeded rows, a quarter true, true scores shifted up by 1.
	rng := rand.New(rand.NewPCG(7, 7))
	var b strings.Builder
	b.WriteString("score,label\n")
	for range 200 {
		label := 0
		shiftBy := 0.0
		if rng.Float64() < 0.25 {
			label, shiftBy = 1, 1
		}
		fmt.Fprintf(&b, "%.6f,%d\n", rng.NormFloat64()+shiftBy, label)
	}
	const volume = 1000
	s := scenario{name: "optimism", table: b.String(), specs: []string{"hit=0.8", "cost"},
		a: func(set *scores.Set) projection.Assumptions {
			a := validation(set)
			a.Volume, a.Costs = volume, &projection.Costs{FalseAlert: 1, Miss: 4}
			return a
		}}
	r, set := s.build(t)
	want := volume * analysis.CostOptimism(set, s.a(set))
	var js bytes.Buffer
	if err := report.WriteJSON(&js, r, nil); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Cuts []struct {
			Spec      string         `json:"spec"`
			Projected map[string]any `json:"projected"`
		} `json:"cuts"`
	}
	if err := json.Unmarshal(js.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	for _, c := range doc.Cuts {
		got, ok := c.Projected["cost_optimism_per_shift"].(float64)
		switch {
		case c.Spec == "cost" && (!ok || !floatcmp.Equal(got, want) || !(got > 0)):
			t.Errorf("cost cut: cost_optimism_per_shift %v (present %v), want %v > 0", c.Projected["cost_optimism_per_shift"], ok, want)
		case c.Spec != "cost" && ok:
			t.Errorf("%s cut has cost_optimism_per_shift %v, want none", c.Spec, got)
		}
	}
	var text bytes.Buffer
	if err := report.WriteText(&text, r); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(text.String(), "more out of sample (optimism estimate, Tibshirani and Tibshirani 2009") {
		t.Errorf("text lacks the optimism line:\n%s", text.String())
	}
}
