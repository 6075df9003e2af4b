package cutrule_test

import (
	"fmt"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// ExampleFind picks three cuts on six cases, one spec of which no cut
// meets.
func ExampleFind() {
	set, err := scores.New(
		[]float64{0.9, 0.8, 0.6, 0.6, 0.3, 0.1},
		[]bool{true, false, true, false, true, false},
		nil, false)
	if err != nil {
		fmt.Println(err)
		return
	}
	var rules []cutrule.Rule
	for _, spec := range []string{"hit=0.6", "top=2", "score=0.95"} {
		r, err := cutrule.Parse(spec)
		if err != nil {
			fmt.Println(err)
			return
		}
		rules = append(rules, r)
	}
	a := projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}
	outcomes, err := cutrule.Find(rules, curve.New(set), a)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, o := range outcomes {
		if !o.Met {
			fmt.Printf("%s: unmet, %s\n", o.Rule, o.Reason)
			continue
		}
		fmt.Printf("%s: cut %v, %d rows, recall %.2f\n", o.Rule, o.Point.Score, o.Point.Rows, o.Point.Recall())
	}
	// Output:
	// hit=0.6: cut 0.6, 4 rows, recall 0.67
	// top=2: cut 0.8, 2 rows, recall 0.33
	// score=0.95: unmet, no score is at or beyond 0.95; the riskiest is 0.9
}
