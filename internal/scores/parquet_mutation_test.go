package scores

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

var parquetMutationsAll = flag.Bool("parquet-mutations-all", false, "TestParquetMutations changes every byte of the seed files, three ways each (about a minute), instead of a seeded sample")

var parquetMutationsShow = flag.Bool("parquet-mutations-show", false, "TestParquetMutations logs every refusal")

// parquetMutationsPerFile is how many one-byte mutations of each seed file
// TestParquetMutations tries without -parquet-mutations-all.
const parquetMutationsPerFile = 300

// TestParquetMutations changes one byte of small valid Parquet files at a
// time, at every position, and reads each result: every one must read or
// be refused with one positioned line (a *ParseError naming the file), and
// none may panic, in this goroutine or any other. It tries a seeded sample
// of positions, each with one of three values (a flipped low bit, a
// flipped byte, a random byte); -parquet-mutations-all tries every
// position with all three.
func TestParquetMutations(t *testing.T) {
	seeds := parquetSeeds()
	names := make([]string, 0, len(seeds))
	for name := range seeds {
		names = append(names, name)
	}
	slices.Sort(names)
	rng := rand.New(rand.NewPCG(13, 14))
	tried, refused := 0, 0
	for _, name := range names {
		data := seeds[name]
		if _, err := ReadParquet(bytes.NewReader(data), int64(len(data)), name, Options{DropInvalid: true, Positive: "true"}); err != nil {
			t.Fatalf("seed %s does not read: %v", name, err)
		}
		mutated := make([]byte, len(data))
		for try := range len(data) {
			i := try
			values := []byte{data[i] ^ 1, ^data[i], byte(rng.IntN(256))}
			if !*parquetMutationsAll {
				if try == parquetMutationsPerFile {
					break
				}
				i = rng.IntN(len(data))
				values = []byte{[]byte{data[i] ^ 1, ^data[i], byte(rng.IntN(256))}[rng.IntN(3)]}
			}
			for _, v := range values {
				if v == data[i] {
					continue
				}
				copy(mutated, data)
				mutated[i] = v
				mode := uint8(rng.IntN(256))
				err := readMutated(mutated, name, parquetFuzzOptions(mode))
				tried++
				if err == nil {
					continue
				}
				refused++
				if *parquetMutationsShow {
					t.Log(err)
				}
				if msg := checkParquetError(err, name); msg != "" {
					t.Errorf("%s byte %d set to %#02x (mode %#02x): %s", name, i, v, mode, msg)
				}
			}
		}
	}
	t.Logf("%d one-byte mutations of %d files: %d read, %d refused", tried, len(seeds), tried-refused, refused)
}

// readMutated reads data with ReadParquet, turning a panic in the calling
// goroutine into an error for the test to report.
func readMutated(data []byte, name string, opt Options) (err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("panic: %v", p)
		}
	}()
	_, err = ReadParquet(bytes.NewReader(data), int64(len(data)), name, opt)
	return err
}

// checkParquetError says what is wrong with an error of ReadParquet, ""
// when nothing is: one line, a *ParseError, naming the file first.
func checkParquetError(err error, name string) string {
	msg := err.Error()
	var pe *ParseError
	switch {
	case !errors.As(err, &pe):
		return fmt.Sprintf("error %T %q is not a *ParseError", err, msg)
	case !strings.HasPrefix(msg, name+":"):
		return fmt.Sprintf("error %q does not begin with the file name", msg)
	case strings.ContainsAny(msg, "\n\r"):
		return fmt.Sprintf("error %q is more than one line", msg)
	}
	return ""
}

// TestParquetDamagedFiles reads the files of testdata/parquet/damaged,
// each a seed file with one byte changed, on which the reader once
// panicked in the Parquet library (its name says how): each is refused
// with one line naming the file, but makeslice, whose byte only made the
// old reader make room for too many rows, which now reads.
func TestParquetDamagedFiles(t *testing.T) {
	names, err := filepath.Glob("testdata/parquet/damaged/*.parquet")
	if err != nil || len(names) == 0 {
		t.Fatalf("no damaged files: %v", err)
	}
	for _, path := range names {
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		for mode := range 256 {
			err := readMutated(data, path, parquetFuzzOptions(uint8(mode)))
			if err == nil {
				if !strings.HasSuffix(path, "makeslice.parquet") && mode == 0 {
					t.Errorf("%s reads", path)
				}
				continue
			}
			if msg := checkParquetError(err, path); msg != "" {
				t.Errorf("%s (mode %#02x): %s", path, mode, msg)
			}
		}
	}
}
