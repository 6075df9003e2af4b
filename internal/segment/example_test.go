package segment_test

import (
	"fmt"
	"strings"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

func ExampleAt() {
	csv := "score,label,site\n0.9,1,north\n0.8,1,south\n0.7,0,north\n0.4,1,south\n0.2,0,north\n"
	set, _ := scores.Read(strings.NewReader(csv), "example.csv", scores.Options{SegmentColumn: "site"})
	c := curve.New(set)
	b := segment.At(set, c.At(2), 0.95) // the cut at 0.7 flags three rows
	b.Sort(segment.ByName)
	for _, f := range b.Segments {
		fmt.Printf("%s: %d rows, recall %.2f, precision %.2f\n", f.Segment, f.Rows, f.Recall, f.Precision)
	}
	// Output:
	// north: 3 rows, recall 1.00, precision 0.50
	// south: 2 rows, recall 0.50, precision 1.00
}
