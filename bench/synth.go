// Package bench holds the synthetic data and the benchmarks behind the
// speed and memory figures in RESULTS.md. The side-by-side script run.sh
// builds the programs, generates the data into bench/data/ (ignored by
// git) and measures them; `go test ./bench -bench .` runs the Go
// benchmarks, which make their own data in memory.
package bench

import (
	"bufio"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
)

// WriteTable writes a synthetic scored validation set: a header
// "score,label", then one row per case with a probability written with six
// decimals and a 0/1 label, positiveShare of them positive on average. The
// scores are the logistic of a normal draw whose mean depends on the label,
// so the ranking is good but not perfect. The same seed gives the same
// bytes.
func WriteTable(out io.Writer, rows int, positiveShare float64, seed uint64) error {
	rng := rand.New(rand.NewPCG(seed, seed^0x5ca1ab1e))
	w := bufio.NewWriterSize(out, 1<<20)
	w.WriteString("score,label\n")
	line := make([]byte, 0, 32)
	for range rows {
		positive := rng.Float64() < positiveShare
		mean := -2.5
		if positive {
			mean = 0.5
		}
		p := 1 / (1 + math.Exp(-(mean + 1.2*rng.NormFloat64())))
		line = strconv.AppendFloat(line[:0], p, 'f', 6, 64)
		if positive {
			line = append(line, ",1\n"...)
		} else {
			line = append(line, ",0\n"...)
		}
		if _, err := w.Write(line); err != nil {
			return err
		}
	}
	return w.Flush()
}
