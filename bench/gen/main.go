// Command gen writes the synthetic scored validation set of package bench
// (score,label; six-decimal probabilities; about 8% positives by default)
// to a file or standard output.
package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/sill-tool/sill/bench"
)

func main() {
	rows := flag.Int("rows", 10_000_000, "data rows to write")
	positiveShare := flag.Float64("positive-share", 0.08, "expected share of positive rows")
	seed := flag.Uint64("seed", 1, "random seed")
	out := flag.String("out", "", "file to write (default: standard output)")
	flag.Parse()
	if err := run(*out, *rows, *positiveShare, *seed); err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
}

func run(out string, rows int, positiveShare float64, seed uint64) error {
	if out == "" {
		return bench.WriteTable(os.Stdout, rows, positiveShare, seed)
	}
	f, err := os.Create(out)
	if err != nil {
		return err
	}
	if err := bench.WriteTable(f, rows, positiveShare, seed); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
