package scores_test

import (
	"bytes"
	"compress/gzip"
	"fmt"
	"math/rand/v2"
	"slices"
	"strconv"
	"syscall"
	"testing"
	"time"

	"github.com/sill-tool/sill/bench"
	"github.com/sill-tool/sill/internal/scores"
)

// BenchmarkGzipTail reads the million-row gzip table of bench's
// BenchmarkGzipLoad with scores.Load and reports, beside the time of a
// read, how long the read took after the last decompressed byte was read
// (tail-ms: the last block's parsing and the ranking that waits for it),
// how long before (input-ms), and the processor time of the whole process
// per read (cpu-ms, user plus system, from getrusage), which says more
// than wall times on a loaded machine. bench's GzipLoad against GzipDecompress is the
// target's measure; this one says where a read's time goes, and the tail
// is what bucketing while reading is meant to keep short.
//
//	go test ./internal/scores -run '^$' -bench GzipTail -count 6
func BenchmarkGzipTail(b *testing.B) {
	var plain, packed bytes.Buffer
	if err := bench.WriteTable(&plain, 1_000_000, 0.08, 1); err != nil {
		b.Fatal(err)
	}
	w := gzip.NewWriter(&packed)
	w.Write(plain.Bytes())
	if err := w.Close(); err != nil {
		b.Fatal(err)
	}
	var ended time.Time
	defer scores.SetInputEnded(func() { ended = time.Now() })()
	var input, tail time.Duration
	b.SetBytes(int64(plain.Len()))
	b.ReportAllocs()
	cpuBefore := cpuTime(b)
	for b.Loop() {
		start := time.Now()
		if _, err := scores.Load(bytes.NewReader(packed.Bytes()), "bench.csv.gz", scores.Options{}); err != nil {
			b.Fatal(err)
		}
		done := time.Now()
		input += ended.Sub(start)
		tail += done.Sub(ended)
	}
	cpu := cpuTime(b) - cpuBefore
	b.ReportMetric(float64(cpu.Microseconds())/1000/float64(b.N), "cpu-ms")
	b.ReportMetric(float64(input.Microseconds())/1000/float64(b.N), "input-ms")
	b.ReportMetric(float64(tail.Microseconds())/1000/float64(b.N), "tail-ms")
}

// cpuTime returns the user plus system time the process has taken.
func cpuTime(b *testing.B) time.Duration {
	var usage syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &usage); err != nil {
		b.Fatal(err)
	}
	return time.Duration(usage.Utime.Nano() + usage.Stime.Nano())
}

// BenchmarkGzipOrders reads gzip tables of a million uniform scores (six
// decimals, seeded) in orders that are hard on a digit fixed by the first
// block: rising and falling (the first block's range is narrow, nearly
// every later row falls outside it), a tenth of the scores exactly 0 (the
// digit then spans the exponent), and shuffled, reporting the processor
// time per read (cpu-ms) beside the wall time.
//
//	go test ./internal/scores -run '^$' -bench GzipOrders -benchtime 8x
func BenchmarkGzipOrders(b *testing.B) {
	for _, order := range []string{"rising", "falling", "zeros", "shuffled"} {
		data := ordersTable(order)
		b.Run(order, func(b *testing.B) {
			cpuBefore := cpuTime(b)
			for b.Loop() {
				if _, err := scores.Load(bytes.NewReader(data), "orders.csv.gz", scores.Options{}); err != nil {
					b.Fatal(err)
				}
			}
			cpu := cpuTime(b) - cpuBefore
			b.ReportMetric(float64(cpu.Microseconds())/1000/float64(b.N), "cpu-ms")
		})
	}
}

// ordersTable returns the gzip table of BenchmarkGzipOrders in the order
// named.
func ordersTable(order string) []byte {
	rng := rand.New(rand.NewPCG(5, 6))
	values := make([]float64, 1_000_000)
	for i := range values {
		values[i] = rng.Float64()
	}
	switch order {
	case "rising":
		slices.Sort(values)
	case "falling":
		slices.Sort(values)
		slices.Reverse(values)
	case "zeros":
		for i := range values {
			if rng.IntN(10) == 0 {
				values[i] = 0
			}
		}
	}
	var plain, packed bytes.Buffer
	plain.WriteString("score,label\n")
	for _, v := range values {
		plain.WriteString(strconv.FormatFloat(v, 'f', 6, 64))
		fmt.Fprintf(&plain, ",%d\n", rng.IntN(2))
	}
	w := gzip.NewWriter(&packed)
	w.Write(plain.Bytes())
	w.Close()
	return packed.Bytes()
}
