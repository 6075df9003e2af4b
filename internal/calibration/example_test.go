package calibration_test

import (
	"fmt"

	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

func ExampleReliability() {
	set, _ := scores.New([]float64{0.1, 0.2, 0.3, 0.7, 0.8, 0.9}, []bool{false, false, true, true, true, false}, nil, false)
	table, _ := calibration.Reliability(set, 2, calibration.FixedWidth)
	for _, b := range table.Bins {
		fmt.Printf("%.1f-%.1f: %d rows, mean score %.2f, observed %.2f\n", b.Lower, b.Upper, b.Count, b.MeanScore, b.ObservedRate)
	}
	fmt.Printf("ECE %.3f\n", table.ECE)
	// Output:
	// 0.0-0.5: 3 rows, mean score 0.20, observed 0.33
	// 0.5-1.0: 3 rows, mean score 0.80, observed 0.67
	// ECE 0.133
}

func ExampleCostThreshold() {
	// A wrong alert costs 120, a missed failure 1200.
	fmt.Printf("%.4f\n", calibration.CostThreshold(projection.Costs{FalseAlert: 120, Miss: 1200}))
	// Output: 0.0909
}
