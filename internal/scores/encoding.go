package scores

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"unicode/utf16"
	"unicode/utf8"
)

// ErrEncoding is the sentinel of text in an encoding the readers do not
// take: UTF-16 without its byte-order mark, or UTF-16 that is cut short or
// holds a lone surrogate.
var ErrEncoding = errors.New("text encoding not read")

// utf16Order returns the byte order of UTF-16 text that begins with its
// byte-order mark, and whether it does.
func utf16Order(in *bufio.Reader) (bigEndian, ok bool) {
	bom, _ := in.Peek(2)
	switch {
	case bytes.Equal(bom, []byte{0xff, 0xfe}):
		return false, true
	case bytes.Equal(bom, []byte{0xfe, 0xff}):
		return true, true
	}
	return false, false
}

// looksUTF16 reports whether the first bytes of in are ASCII text written
// as UTF-16 without a byte-order mark: every other byte zero, which UTF-8
// text never holds.
func looksUTF16(in *bufio.Reader) bool {
	head, _ := in.Peek(8)
	if len(head) < 4 {
		return false
	}
	little := head[0] != 0 && head[1] == 0 && head[2] != 0 && head[3] == 0
	big := head[0] == 0 && head[1] != 0 && head[2] == 0 && head[3] != 0
	return little || big
}

// utf16Reader decodes UTF-16 text, its byte-order mark already read, into
// UTF-8. Text cut short within a code unit or a surrogate pair, and a lone
// surrogate, are a *ParseError at the line they are found on.
type utf16Reader struct {
	src       *bufio.Reader
	source    string
	bigEndian bool
	out       []byte // decoded bytes not yet passed on
	lines     int    // line feeds decoded
	err       error
}

func newUTF16Reader(src *bufio.Reader, source string, bigEndian bool) *utf16Reader {
	return &utf16Reader{src: src, source: source, bigEndian: bigEndian}
}

func (u *utf16Reader) Read(p []byte) (int, error) {
	for len(u.out) == 0 && u.err == nil {
		u.decode()
	}
	if len(u.out) > 0 {
		n := copy(p, u.out)
		u.out = u.out[n:]
		return n, nil
	}
	return 0, u.err
}

// unit reads one code unit: io.EOF at the end of the input, a
// *ParseError when it ends within one.
func (u *utf16Reader) unit() (uint16, error) {
	var pair [2]byte
	n, err := io.ReadFull(u.src, pair[:])
	switch {
	case n == 0 && err == io.EOF:
		return 0, io.EOF
	case err == io.ErrUnexpectedEOF:
		return 0, u.bad("the text ends within a UTF-16 code unit (an odd number of bytes), expected two bytes per unit")
	case err != nil:
		return 0, err
	}
	if u.bigEndian {
		return uint16(pair[0])<<8 | uint16(pair[1]), nil
	}
	return uint16(pair[1])<<8 | uint16(pair[0]), nil
}

// decode decodes up to a few thousand code units into u.out.
func (u *utf16Reader) decode() {
	out := u.out[:0]
	for range 4096 {
		first, err := u.unit()
		if err != nil {
			u.err = err
			break
		}
		r := rune(first)
		if utf16.IsSurrogate(r) {
			second, err := u.unit()
			if err == io.EOF {
				err = u.bad("the text ends within a UTF-16 surrogate pair, expected its second half")
			}
			if err != nil {
				u.err = err
				break
			}
			if r = utf16.DecodeRune(r, rune(second)); r == utf8.RuneError {
				u.err = u.bad("a lone UTF-16 surrogate, expected a pair")
				break
			}
		}
		if r == '\n' {
			u.lines++
		}
		out = utf8.AppendRune(out, r)
	}
	u.out = out
}

func (u *utf16Reader) bad(what string) error {
	return &ParseError{File: u.source, Line: u.lines + 1, Err: fmt.Errorf("%w: %s", ErrEncoding, what)}
}
