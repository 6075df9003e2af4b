package scores_test

import (
	"bytes"
	"errors"
	"math"
	"reflect"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
)

// fuzzOptions turns the fuzzer's mode byte into reader options, so that
// the fuzzer explores the optional columns and flags too:
//
//	bit 0  LowerIsRiskier        bit 3  weight column "w"
//	bit 1  DropInvalid           bit 4  segment column "seg" and id column "id"
//	bit 2  force JSON Lines      bit 5  force CSV with ';'
//	bit 6  --positive "1"        bit 7  time column "at" and second score "b"
func fuzzOptions(mode uint8) scores.Options {
	var opt scores.Options
	opt.LowerIsRiskier = mode&1 != 0
	opt.DropInvalid = mode&2 != 0
	if mode&4 != 0 {
		opt.Input = scores.InputJSONL
	}
	if mode&8 != 0 {
		opt.WeightColumn = "w"
	}
	if mode&16 != 0 {
		opt.SegmentColumn, opt.IDColumn = "seg", "id"
	}
	if mode&32 != 0 && mode&4 == 0 {
		opt.Input, opt.Delimiter = scores.InputCSV, ';'
	}
	if mode&64 != 0 {
		opt.Positive = "1"
	}
	if mode&128 != 0 {
		opt.TimeColumn, opt.CompareColumn = "at", "b"
	}
	return opt
}

// FuzzRead checks that no input makes the reader panic, that every error
// is a *ParseError, and that every set it returns is well formed: columns
// of one length, finite scores, non-negative finite weights, ranked
// riskiest first. It also checks that Load, the block reader, gives the
// same set or the same error as Read. The seeds live in
// testdata/fuzz/FuzzRead (CSV, TSV, JSON Lines, gzip and garbage);
// `go test` runs them, and `go test -fuzz=FuzzRead ./internal/scores/`
// explores further.
func FuzzRead(f *testing.F) {
	f.Fuzz(func(t *testing.T, data []byte, mode uint8) {
		opt := fuzzOptions(mode)
		set, err := scores.Read(bytes.NewReader(data), "fuzz.csv", opt)
		loaded, loadErr := scores.Load(bytes.NewReader(data), "fuzz.csv", opt)
		switch {
		case (err == nil) != (loadErr == nil):
			t.Fatalf("Read error %v, Load error %v", err, loadErr)
		case err != nil && err.Error() != loadErr.Error():
			t.Fatalf("Read error\n%v\nLoad error\n%v", err, loadErr)
		case err == nil && !reflect.DeepEqual(set, loaded):
			t.Fatalf("Read and Load differ:\n%+v\n%+v", set, loaded)
		}
		if err != nil {
			var pe *scores.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("error %T %v is not a *ParseError", err, err)
			}
			if _, ok := err.(*scores.ParseError); !ok {
				t.Fatalf("error %T is not itself a *ParseError", err)
			}
			if err.Error() == "" {
				t.Fatal("empty error message")
			}
			return
		}
		n := set.Len()
		if len(set.Labels()) != n {
			t.Fatalf("%d scores, %d labels", n, len(set.Labels()))
		}
		for name, length := range map[string]int{"weights": len(set.Weights()), "ids": len(set.IDs()), "segments": len(set.SegmentOf()), "times": len(set.Times()), "compare": len(set.CompareScores())} {
			if length != 0 && length != n {
				t.Fatalf("%d scores, %d %s", n, length, name)
			}
		}
		if opt.WeightColumn != "" && set.Weights() == nil {
			t.Fatal("weight column asked for but Weights is nil")
		}
		for i, s := range set.Scores() {
			if math.IsNaN(s) || math.IsInf(s, 0) {
				t.Fatalf("row %d: score %v is not finite", i, s)
			}
			if i > 0 && set.Riskier(s, set.Scores()[i-1]) {
				t.Fatalf("rows %d, %d not ranked: %v after %v", i-1, i, s, set.Scores()[i-1])
			}
			if w := set.Weight(i); !(w >= 0) || math.IsInf(w, 0) {
				t.Fatalf("row %d: weight %v", i, w)
			}
			if set.SegmentOf() != nil && int(set.SegmentOf()[i]) >= len(set.SegmentNames()) {
				t.Fatalf("row %d: segment code %d of %d names", i, set.SegmentOf()[i], len(set.SegmentNames()))
			}
		}
		if n == 0 && set.Dropped() == 0 {
			t.Fatal("an empty set with nothing dropped should be ErrNoRows")
		}
		if len(set.SHA256()) != 64 {
			t.Fatalf("digest %q", set.SHA256())
		}
	})
}
