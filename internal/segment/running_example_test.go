package segment_test

import (
	"fmt"
	"strings"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

func ExampleRunning() {
	csv := "score,label,site\n0.9,1,north\n0.8,1,south\n0.7,0,north\n0.4,1,south\n0.2,0,north\n"
	set, _ := scores.Read(strings.NewReader(csv), "example.csv", scores.Options{SegmentColumn: "site"})
	c := curve.New(set)
	r := segment.NewRunning(set)
	for _, cut := range []int{0, 2, 3} { // as a cursor steps: 0.9, then 0.7, then 0.4
		b := r.At(c.At(cut), 0.95)
		fmt.Printf("cut %v:", c.At(cut).Score)
		for _, f := range b.Segments {
			fmt.Printf(" %s recall %.2f", f.Segment, f.Recall)
		}
		fmt.Println()
	}
	// Output:
	// cut 0.9: north recall 1.00 south recall 0.00
	// cut 0.7: north recall 1.00 south recall 0.50
	// cut 0.4: north recall 1.00 south recall 1.00
}
