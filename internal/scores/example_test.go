package scores_test

import (
	"fmt"
	"strings"

	"github.com/sill-tool/sill/internal/scores"
)

// ExampleRead reads a small CSV table and shows it ranked riskiest first,
// the tie at 0.7 in the order read.
func ExampleRead() {
	table := "id,score,label\nAX-1,0.2,no\nAX-2,0.7,yes\nAX-3,0.9,no\nAX-4,0.7,no\n"
	set, err := scores.Read(strings.NewReader(table), "bearings.csv", scores.Options{IDColumn: "id"})
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := range set.Len() {
		fmt.Println(set.ID(i), set.Scores()[i], set.Labels()[i])
	}
	_, err = scores.Read(strings.NewReader("score,label\n0.5,maybe\n"), "bearings.csv", scores.Options{})
	fmt.Println(err)
	// Output:
	// AX-3 0.9 false
	// AX-2 0.7 true
	// AX-4 0.7 false
	// AX-1 0.2 false
	// bearings.csv:2: column "label": unrecognised label "maybe", expected 1/true/yes/positive or 0/false/no/negative
}
