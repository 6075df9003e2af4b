package scores

import (
	"bytes"
	"compress/gzip"
	"errors"
	"fmt"
	"strings"
	"testing"
)

// TestCorruptGzipBody: bytes flipped inside the deflate stream (not only a
// bad header or a truncated tail) read as corrupt gzip data, by both
// readers.
func TestCorruptGzipBody(t *testing.T) {
	var table strings.Builder
	table.WriteString("score,label\n")
	for i := range 3000 {
		fmt.Fprintf(&table, "0.%03d,%d\n", i%1000, i%7/6)
	}
	var packed bytes.Buffer
	z := gzip.NewWriter(&packed)
	z.Write([]byte(table.String()))
	z.Close()
	data := packed.Bytes()
	for i := 40; i < 240 && i < len(data)-8; i++ {
		data[i] ^= 0x5a
	}
	for name, read := range map[string]func() error{
		"Read": func() error { _, err := Read(bytes.NewReader(data), "x.csv.gz", Options{}); return err },
		"Load": func() error { _, err := Load(bytes.NewReader(data), "x.csv.gz", Options{}); return err },
	} {
		err := read()
		if !errors.Is(err, ErrCorruptGzip) {
			t.Errorf("%s: error %v, want one wrapping ErrCorruptGzip", name, err)
		}
	}
}
