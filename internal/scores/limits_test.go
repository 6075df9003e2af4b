package scores

import (
	"bytes"
	"errors"
	"io"
	"os"
	"strings"
	"testing"
)

// zeros is an input that never ends, as /dev/zero, counting what is read.
type zeros struct{ read int64 }

func (z *zeros) Read(p []byte) (int, error) {
	clear(p)
	z.read += int64(len(p))
	return len(p), nil
}

// TestReadNeverEndingInput: an input of zeros that never ends (once 6 GB
// passed into the header reader before memory ran out) is refused at line
// 1 once a line passes MaxLine, by Read, ReadCounts and, on /dev/zero
// itself, Load; Read takes no more than the limit and its buffers.
func TestReadNeverEndingInput(t *testing.T) {
	const want = "zero:1: line longer than the limit of 16 MiB, expected lines of delimited text (is this a table of scores?)"
	for name, read := range map[string]func(io.Reader) error{
		"Read":       func(r io.Reader) error { _, err := Read(r, "zero", Options{}); return err },
		"ReadCounts": func(r io.Reader) error { _, err := ReadCounts(r, "zero", Options{}); return err },
		"Read csv": func(r io.Reader) error {
			_, err := Read(r, "zero", Options{Input: InputCSV, Delimiter: ','})
			return err
		},
	} {
		z := &zeros{}
		err := read(z)
		if err == nil || err.Error() != want || !errors.Is(err, ErrTooLong) {
			t.Errorf("%s: error %v, want %s", name, err, want)
		}
		if z.read > MaxLine+4<<20 {
			t.Errorf("%s: read %d bytes before refusing, want at most the limit and 4 MiB of buffers", name, z.read)
		}
	}
	device, err := os.Open("/dev/zero")
	if err != nil {
		t.Skip("no /dev/zero:", err)
	}
	defer device.Close()
	if _, err := Load(device, "zero", Options{}); err == nil || err.Error() != want {
		t.Errorf("Load of /dev/zero: error %v, want %s", err, want)
	}
}

// TestReadLongLines: a line past MaxLine is refused at its own line, by
// both readers with the same message, in delimited text and JSON Lines; a
// quote that opens and never closes is refused where its record begins
// once the record passes the limit, rather than read to the end.
func TestReadLongLines(t *testing.T) {
	long := strings.Repeat("7", MaxLine+1)
	manyLines := strings.Repeat("0.5,1\n", MaxLine/6+4000)
	cases := []struct {
		name, input, want string
	}{
		{"cell", "score,label\n0.1,1\n0." + long + ",0\n0.3,1\n",
			"t:3: line longer than the limit of 16 MiB, expected lines of delimited text (is this a table of scores?)"},
		{"header", "score,label" + long + "\n0.1,1\n",
			"t:1: line longer than the limit of 16 MiB, expected lines of delimited text (is this a table of scores?)"},
		{"json", `{"score":0.1,"label":1}` + "\n" + `{"score":0.` + long + `,"label":0}` + "\n",
			"t:2: line longer than the limit of 16 MiB, expected one JSON object per line"},
		{"unclosed quote", "score,label\n0.1,1\n\"0.2,1\n" + manyLines,
			"t:3: line longer than the limit of 16 MiB: a record that begins here runs over several lines past the limit of 16 MiB, expected a quoted field to close on its own line or soon after (an unclosed quote?)"},
	}
	for _, tc := range cases {
		_, readErr := Read(strings.NewReader(tc.input), "t", Options{})
		if readErr == nil || readErr.Error() != tc.want {
			t.Errorf("%s: Read error %v, want %s", tc.name, readErr, tc.want)
		}
		_, loadErr := Load(bytes.NewReader([]byte(tc.input)), "t", Options{})
		if loadErr == nil || readErr == nil || loadErr.Error() != readErr.Error() {
			t.Errorf("%s: Load error %v, Read error %v", tc.name, loadErr, readErr)
		}
	}
	// A line just under the limit is read.
	fine := "score,label,note\n0.1,1," + strings.Repeat("n", MaxLine-20) + "\n0.2,0,x\n"
	for name, read := range map[string]func() (*Set, error){
		"Read": func() (*Set, error) { return Read(strings.NewReader(fine), "t", Options{}) },
		"Load": func() (*Set, error) { return Load(bytes.NewReader([]byte(fine)), "t", Options{}) },
	} {
		if set, err := read(); err != nil || set.Len() != 2 {
			t.Errorf("%s of a line just under the limit: %v", name, err)
		}
	}
}
