package warehouse_test

import (
	"fmt"

	"github.com/sill-tool/sill/internal/warehouse"
)

func ExampleQuery_SQL() {
	q := warehouse.Query{Table: "desk.bearing_scores", Score: "p_fail", Label: "failed", Digits: 3, Positive: "yes"}
	text, err := q.SQL()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(text)
	// Output:
	// -- counts table for: sill report --counts FILE
	// -- scores rounded half up to 3 digits; export the result as CSV with a header
	// SELECT
	//   FLOOR("p_fail" * 1000 + 0.5) / 1000 AS score,
	//   SUM(CASE WHEN TRIM(CAST("failed" AS VARCHAR(255))) = 'yes' THEN 1 ELSE 0 END) AS positives,
	//   SUM(CASE WHEN TRIM(CAST("failed" AS VARCHAR(255))) = 'yes' THEN 0 ELSE 1 END) AS negatives
	// FROM "desk"."bearing_scores"
	// GROUP BY
	//   FLOOR("p_fail" * 1000 + 0.5) / 1000
	// ORDER BY score DESC
}
