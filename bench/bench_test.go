package bench

import (
	"bytes"
	"compress/gzip"
	"io"
	"sync"
	"testing"

	kgzip "github.com/klauspost/compress/gzip"
	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// benchRows is the size of the in-memory table of the benchmarks; the
// 10-million-row figures come from run.sh.
const benchRows = 1_000_000

var (
	tableOnce sync.Once
	table     []byte
)

// benchTable returns the synthetic table of benchRows rows, made once.
func benchTable(b *testing.B) []byte {
	tableOnce.Do(func() {
		var buf bytes.Buffer
		if err := WriteTable(&buf, benchRows, 0.08, 1); err != nil {
			panic(err)
		}
		table = buf.Bytes()
	})
	b.SetBytes(int64(len(table)))
	return table
}

// BenchmarkLoad reads the table with the block reader (scores.Load), the
// sort included.
func BenchmarkLoad(b *testing.B) {
	data := benchTable(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := scores.Load(bytes.NewReader(data), "bench.csv", scores.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRead reads the table with the line reader (scores.Read), the
// reference path, for comparison.
func BenchmarkRead(b *testing.B) {
	data := benchTable(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := scores.Read(bytes.NewReader(data), "bench.csv", scores.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSort ranks the table's columns (scores.New sorts them in place).
func BenchmarkSort(b *testing.B) {
	set, err := scores.Load(bytes.NewReader(benchTable(b)), "bench.csv", scores.Options{})
	if err != nil {
		b.Fatal(err)
	}
	// Read order, as the file gives it: undo the ranking by a fixed shuffle.
	n := set.Len()
	shuffledScores := make([]float64, n)
	shuffledLabels := make([]bool, n)
	for i := range n {
		j := (i * 7919) % n // 7919 is prime and does not divide 10^6
		shuffledScores[j], shuffledLabels[j] = set.Scores()[i], set.Labels()[i]
	}
	b.SetBytes(int64(n) * 9)
	scoresCopy := make([]float64, n)
	labelsCopy := make([]bool, n)
	b.ReportAllocs()
	for b.Loop() {
		copy(scoresCopy, shuffledScores)
		copy(labelsCopy, shuffledLabels)
		if _, err := scores.New(scoresCopy, labelsCopy, nil, false); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSweep walks every cut of the ranked table once (curve.Walk).
func BenchmarkSweep(b *testing.B) {
	set, err := scores.Load(bytes.NewReader(benchTable(b)), "bench.csv", scores.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(set.Len()) * 9)
	b.ReportAllocs()
	cuts := 0
	for b.Loop() {
		curve.Walk(set, func(curve.Point) { cuts++ })
	}
}

// An explorer keystroke (update plus view at 10M rows) is benchmarked in
// package tui, next to the model it drives.

var (
	gzipOnce  sync.Once
	gzipTable []byte
)

// benchGzip returns the table compressed with gzip at its default level,
// made once.
func benchGzip(b *testing.B) []byte {
	plain := benchTable(b)
	gzipOnce.Do(func() {
		var buf bytes.Buffer
		w := gzip.NewWriter(&buf)
		w.Write(plain)
		if err := w.Close(); err != nil {
			panic(err)
		}
		gzipTable = buf.Bytes()
	})
	return gzipTable
}

// BenchmarkGzipDecompress only decompresses the gzip table, with the
// standard library's decoder (scores.Decompress, as a program that only
// decompresses would), into nothing: the time BenchmarkGzipLoad is held
// to (at most 1.3 times this). Both report the plain table's bytes.
// BenchmarkGzipDecompressFast is the stricter floor of the decoder the
// readers use.
func BenchmarkGzipDecompress(b *testing.B) {
	data := benchGzip(b)
	for b.Loop() {
		n, err := scores.Decompress(bytes.NewReader(data), io.Discard)
		if err != nil || n != int64(len(benchTable(b))) {
			b.Fatal(n, err)
		}
	}
}

// BenchmarkGzipLoad reads the gzip table with scores.Load, decompressing,
// parsing and ranking at once (each block bucketed as it is parsed, the
// buckets sorted after the last block; internal/scores's BenchmarkGzipTail
// times that last part and the processor time of a read).
func BenchmarkGzipLoad(b *testing.B) {
	data := benchGzip(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := scores.Load(bytes.NewReader(data), "bench.csv.gz", scores.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkGzipDecompressFast only decompresses the gzip table with the
// faster decoder the readers use, to show how much of the reading is
// decompression.
func BenchmarkGzipDecompressFast(b *testing.B) {
	data := benchGzip(b)
	for b.Loop() {
		z, err := kgzip.NewReader(bytes.NewReader(data))
		if err != nil {
			b.Fatal(err)
		}
		if n, err := io.Copy(io.Discard, z); err != nil || n != int64(len(benchTable(b))) {
			b.Fatal(n, err)
		}
	}
}

// BenchmarkCostOptimism is the least-cost figure's optimism estimate
// (analysis.CostOptimism, 10 folds) on the table of BenchmarkSweep, to be
// read beside it: one sweep plus the fold work per distinct score.
func BenchmarkCostOptimism(b *testing.B) {
	set, err := scores.Load(bytes.NewReader(benchTable(b)), "bench.csv", scores.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(set.Len()) * 9)
	b.ReportAllocs()
	a := projection.Assumptions{BaseRate: 0.08, Volume: 1000, Confidence: 0.95, Costs: &projection.Costs{FalseAlert: 1, Miss: 10}}
	for b.Loop() {
		analysis.CostOptimism(set, a)
	}
}
