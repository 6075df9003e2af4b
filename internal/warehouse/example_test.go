package warehouse_test

import (
	"fmt"

	"github.com/sill-tool/sill/internal/warehouse"
)

func ExampleQuery_SQL() {
	q := warehouse.Query{Table: "desk.bearing_scores", Score: "p_fail", Label: "failed", Digits: 3, Positive: "yes", ReadBy: "sill report --counts FILE"}
	text, err := q.SQL()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(text)
	// Output:
	// -- counts table for: sill report --counts FILE
	// -- scores rounded half up to 3 digits; export the result as CSV with a header
	// -- cases whose score is NULL or not a number are counted on rows with no score, which sill reports as dropped
	// SELECT
	//   sill_score AS score,
	//   SUM(CASE WHEN sill_label = 'yes' THEN 1 ELSE 0 END) AS positives,
	//   SUM(CASE WHEN sill_label = 'yes' THEN 0 ELSE 1 END) AS negatives
	// FROM (
	//   SELECT
	//     CASE WHEN +"p_fail" BETWEEN -1e308 AND 1e308 THEN FLOOR("p_fail" * 1000 + 0.5) / 1000 END AS sill_score,
	//     TRIM(CAST("failed" AS VARCHAR(255))) AS sill_label
	//   FROM "desk"."bearing_scores"
	// ) AS sill_rows
	// GROUP BY
	//   sill_score
	// ORDER BY sill_score DESC
}
