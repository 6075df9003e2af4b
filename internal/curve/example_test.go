package curve_test

import (
	"fmt"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/scores"
)

// ExampleWalk sweeps five scored cases, two of them tied at 0.6, from the
// strictest cut to the loosest.
func ExampleWalk() {
	set, err := scores.New(
		[]float64{0.2, 0.9, 0.6, 0.6, 0.4},
		[]bool{false, true, true, false, true},
		nil, false)
	if err != nil {
		fmt.Println(err)
		return
	}
	sum := curve.Walk(set, func(p curve.Point) {
		fmt.Printf("flag score >= %v: %d rows, tp %v fp %v, recall %.2f, precision %.2f\n",
			p.Score, p.Rows, p.TP, p.FP, p.Recall(), p.Precision())
	})
	fmt.Printf("ROC AUC %.4f, average precision %.4f\n", sum.ROCAUC, sum.AveragePrecision)
	// Output:
	// flag score >= 0.9: 1 rows, tp 1 fp 0, recall 0.33, precision 1.00
	// flag score >= 0.6: 3 rows, tp 2 fp 1, recall 0.67, precision 0.67
	// flag score >= 0.4: 4 rows, tp 3 fp 1, recall 1.00, precision 0.75
	// flag score >= 0.2: 5 rows, tp 3 fp 2, recall 1.00, precision 0.60
	// ROC AUC 0.7500, average precision 0.8056
}
