package bench

import (
	"bytes"
	"context"
	"io"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
)

// BenchmarkReport is `sill report FILE --format json` without and with
// `--bootstrap 200` (issue 9: with it at most 10 times as long), side by
// side in one run on the synthetic table of benchRows rows: the load, the
// analysis and the JSON, each from the table's bytes in memory.
//
//	go test ./bench -run '^$' -bench Report -benchtime 3x
func BenchmarkReport(b *testing.B) {
	data := benchTable(b)
	for _, c := range []struct {
		name       string
		replicates int
	}{{"plain", 0}, {"bootstrap200", 200}} {
		b.Run(c.name, func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			b.ReportAllocs()
			for b.Loop() {
				set, err := scores.Load(bytes.NewReader(data), "bench.csv", scores.Options{})
				if err != nil {
					b.Fatal(err)
				}
				positives, negatives := set.Totals()
				a := projection.Assumptions{BaseRate: positives / (positives + negatives), Confidence: projection.DefaultConfidence}
				opts := analysis.Options{Resampling: analysis.Resampling{Replicates: c.replicates, Seed: 1, BandCuts: report.BandCuts}}
				res, err := analysis.Run(context.Background(), set, a, opts)
				if err != nil {
					b.Fatal(err)
				}
				if err := report.WriteJSON(io.Discard, report.New(res, report.Options{}), nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
