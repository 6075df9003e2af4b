package decision

import (
	"bytes"
	"errors"
	"testing"
)

// FuzzRead checks that no input makes Read panic, and that whatever Read
// accepts writes back to a file that reads to the same bytes again. The
// seed corpus is in testdata/fuzz/FuzzRead; run it longer with
// go test ./internal/decision -run '^$' -fuzz FuzzRead -fuzztime 1m
// -fuzzminimizetime 2s (the default minimisation of a new input takes
// up to a minute on the larger seeds and stalls the count of runs).
func FuzzRead(f *testing.F) {
	f.Fuzz(func(t *testing.T, data []byte) {
		file, err := Read(bytes.NewReader(data), "fuzz.yaml")
		if errors.Is(err, errPanic) {
			t.Fatalf("Read recovered from a panic: %v", err)
		}
		if err != nil {
			return
		}
		out, err := Marshal(file)
		if err != nil {
			t.Fatalf("marshal of an accepted file: %v", err)
		}
		again, err := Read(bytes.NewReader(out), "again.yaml")
		if err != nil {
			t.Fatalf("re-read of a written file: %v\n%s", err, out)
		}
		out2, _ := Marshal(again)
		if !bytes.Equal(out, out2) {
			t.Fatalf("write, read, write changed the file:\n%s\n---\n%s", out, out2)
		}
	})
}
