package scores

import (
	"bytes"
	"math"
	"slices"
	"testing"
)

// FuzzReadParquet checks that no Parquet input makes ReadParquet panic, in
// the calling goroutine or in those that decode row groups, that every
// error is one line naming the file (a *ParseError), and that every set it
// returns is well formed: columns of one length, finite scores and weights
// >= 0, ranked riskiest first. The seeds are the files of parquetSeeds,
// one for each kind of column the reader takes (double, float, integer,
// decimal as integers and as byte arrays, text numbers; boolean, integer
// and text labels; nulls, weights, segments, ids, time columns), plain and
// compressed, in one row group or several. Crashers found by
// `go test ./internal/scores -run '^$' -fuzz FuzzReadParquet` are kept in
// testdata/fuzz/FuzzReadParquet, which `go test` runs.
func FuzzReadParquet(f *testing.F) {
	seeds := parquetSeeds()
	names := make([]string, 0, len(seeds))
	for name := range seeds {
		names = append(names, name)
	}
	slices.Sort(names)
	for i, name := range names {
		f.Add(seeds[name], uint8(i*37))
	}
	f.Fuzz(func(t *testing.T, data []byte, mode uint8) {
		const name = "fuzz.parquet"
		set, err := ReadParquet(bytes.NewReader(data), int64(len(data)), name, parquetFuzzOptions(mode))
		if err != nil {
			if msg := checkParquetError(err, name); msg != "" {
				t.Fatal(msg)
			}
			return
		}
		n := set.Len()
		if len(set.labels) != n || (set.weights != nil && len(set.weights) != n) || (set.segmentOf != nil && len(set.segmentOf) != n) || (set.ids != nil && len(set.ids) != n) {
			t.Fatalf("%d scores, %d labels, %d weights, %d segments, %d ids", n, len(set.labels), len(set.weights), len(set.segmentOf), len(set.ids))
		}
		for i, s := range set.scores {
			if math.IsNaN(s) || math.IsInf(s, 0) {
				t.Fatalf("row %d: score %v is not finite", i, s)
			}
			if i > 0 && set.Riskier(s, set.scores[i-1]) {
				t.Fatalf("rows %d, %d not ranked", i-1, i)
			}
			if w := set.Weight(i); !(w >= 0) || math.IsInf(w, 0) {
				t.Fatalf("row %d: weight %v", i, w)
			}
			if set.segmentOf != nil && int(set.segmentOf[i]) >= len(set.segmentNames) {
				t.Fatalf("row %d: segment code %d of %d names", i, set.segmentOf[i], len(set.segmentNames))
			}
		}
	})
}
