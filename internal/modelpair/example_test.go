package modelpair_test

import (
	"fmt"

	"github.com/sill-tool/sill/internal/modelpair"
)

// ExamplePaired: the same z (1.224745) and p (0.2206714) come from R's pROC
// 1.18.0, roc.test(method = "delong", paired = TRUE), run by hand.
func ExamplePaired() {
	a := []float64{0.9, 0.8, 0.7, 0.3, 0.2, 0.1}
	b := []float64{0.6, 0.2, 0.9, 0.5, 0.3, 0.1}
	labels := []bool{true, true, false, true, false, false}
	t, _ := modelpair.Paired(a, b, labels, nil, false)
	fmt.Printf("AUC %.3f vs %.3f, z %.2f, p %.2f\n", t.AUC[0], t.AUC[1], t.Z, t.P)
	// Output: AUC 0.889 vs 0.556, z 1.22, p 0.22
}
