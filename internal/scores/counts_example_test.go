package scores_test

import (
	"fmt"
	"strings"

	"github.com/sill-tool/sill/internal/scores"
)

func ExampleReadCounts() {
	table := "score,positives,negatives\n0.9,2,1\n0.5,0,3\n0.1,1,0\n"
	set, err := scores.ReadCounts(strings.NewReader(table), "counts.csv", scores.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	positives, negatives := set.Totals()
	fmt.Println(set.Len(), "rows in the set,", set.Cases(), "cases:", positives, "true and", negatives, "false")
	// Output:
	// 4 rows in the set, 7 cases: 3 true and 4 false
}
