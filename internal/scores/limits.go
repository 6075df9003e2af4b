package scores

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
)

// MaxLine is the most bytes a line may hold: a header, a row of delimited
// text (a quoted record over several lines included), a JSON Lines object
// and so every cell and every JSON value. Past it reading stops with
// ErrTooLong at the line, so that input that never ends, such as a device
// of zeros, or a binary file read as text costs at most this much memory
// before it is refused.
const MaxLine = 16 << 20

// ErrTooLong is the sentinel of a line or record longer than MaxLine.
var ErrTooLong = fmt.Errorf("line longer than the limit of %d MiB", MaxLine>>20)

// errRecordTooLong is what boundedReader returns when a record of
// delimited text has gone on past MaxLine over several lines, such as
// after a quote that never closes.
var errRecordTooLong = errors.New("quoted record too long")

// readAheadSlack is how far a CSV reader reads ahead of the record it
// returns: the size of the buffer package csv puts in front of its input.
const readAheadSlack = 4096

// boundedReader passes on the input of a CSV reader, stopping it when one
// physical line, or the bytes since the last record (mark), go past
// MaxLine. It counts the lines it has passed on, so that a line too long
// is named exactly.
type boundedReader struct {
	r         io.Reader
	lines     int   // line feeds passed on
	lineBytes int   // bytes passed on since the last line feed
	sinceMark int64 // bytes passed on since mark
	err       error
	ended     bool // the input has ended
	lastLine  int  // bytes of the last line passed on whole, line feed aside
}

func (l *boundedReader) Read(p []byte) (int, error) {
	if l.err != nil {
		return 0, l.err
	}
	n, err := l.r.Read(p)
	l.ended = l.ended || err == io.EOF
	for data := p[:n]; len(data) > 0; {
		i := bytes.IndexByte(data, '\n')
		if i < 0 {
			l.lineBytes += len(data)
			break
		}
		if l.lineBytes+i > MaxLine {
			l.lineBytes += i
			break
		}
		l.lines++
		l.lastLine = l.lineBytes + i
		l.lineBytes = 0
		data = data[i+1:]
	}
	l.sinceMark += int64(n)
	switch {
	case l.lineBytes > MaxLine:
		l.err = ErrTooLong
	case l.sinceMark > MaxLine+readAheadSlack:
		l.err = errRecordTooLong
	}
	if l.err != nil {
		return 0, l.err
	}
	return n, err
}

// mark notes that a record has been read.
func (l *boundedReader) mark() { l.sinceMark = 0 }

// tooLong turns a boundedReader's error into a *ParseError: a line too
// long at its own line, a record too long at recordLine, where it began.
func (l *boundedReader) tooLong(source string, recordLine int) error {
	if l.err == ErrTooLong {
		return &ParseError{File: source, Line: l.lines + 1, Err: fmt.Errorf("%w, expected lines of delimited text (is this a table of scores?)", ErrTooLong)}
	}
	return &ParseError{File: source, Line: recordLine, Err: fmt.Errorf("%w: a record that begins here runs over several lines past the limit of %d MiB, expected a quoted field to close on its own line or soon after (an unclosed quote?)", ErrTooLong, MaxLine>>20)}
}

// readLine reads one line of in, its line feed included, refusing a line
// longer than MaxLine without holding more than that. At the end of the
// input it returns what is left with io.EOF.
func readLine(in *bufio.Reader) ([]byte, error) {
	var line []byte
	for {
		chunk, err := in.ReadSlice('\n')
		if len(line)+len(chunk) > MaxLine+1 {
			return nil, ErrTooLong
		}
		if err == bufio.ErrBufferFull {
			line = append(line, chunk...)
			continue
		}
		if line == nil {
			return chunk, err // valid until the next read of in
		}
		return append(line, chunk...), err
	}
}

// recordReader reads the records of delimited text through a
// boundedReader, so that a record past MaxLine is refused where it begins.
type recordReader struct {
	*csv.Reader
	bound  *boundedReader
	source string
	next   int // the line the next record begins on, blank lines aside
}

func newRecordReader(in io.Reader, source string, delim rune) *recordReader {
	bound := &boundedReader{r: in}
	r := csv.NewReader(bound)
	r.Comma = delim
	r.FieldsPerRecord = -1
	r.ReuseRecord = true
	return &recordReader{Reader: r, bound: bound, source: source, next: 1}
}

// Read reads a record as csv.Reader.Read does; a line or record past
// MaxLine is a *ParseError.
func (r *recordReader) Read() ([]string, error) {
	record, err := r.Reader.Read()
	if err != nil {
		if r.bound.err != nil && errors.Is(err, r.bound.err) {
			return nil, r.bound.tooLong(r.source, r.next)
		}
		var pe *csv.ParseError
		if errors.As(err, &pe) && errors.Is(pe.Err, csv.ErrQuote) {
			return nil, r.quoteError(pe)
		}
		return nil, err
	}
	r.bound.mark()
	last := len(record) - 1
	line, _ := r.FieldPos(last)
	r.next = line + strings.Count(record[last], "\n") + 1
	return record, nil
}

// ErrQuote is the sentinel of a quoted field that does not close as it
// should.
var ErrQuote = errors.New("quoted field not closed")

// quoteError words package csv's error for a quoted field that does not
// close properly. A quote that never closes makes the rest of the input
// one field, so the error is placed at the line where the field opens,
// not where the reader gave up.
func (r *recordReader) quoteError(pe *csv.ParseError) error {
	switch {
	case r.bound.endsInside(pe):
		where := ""
		if pe.Line > pe.StartLine {
			where = fmt.Sprintf(" at line %d", pe.Line)
		}
		return &ParseError{File: r.source, Line: pe.StartLine, Err: fmt.Errorf("%w: a quoted field opens on this line and the input ends inside it%s, expected a closing \" on this line", ErrQuote, where)}
	case pe.Line > pe.StartLine:
		return &ParseError{File: r.source, Line: pe.StartLine, Err: fmt.Errorf("%w: a quoted field opens on this line and runs on to line %d, where a \" is followed by other text, expected a closing \" on this line followed by a delimiter or the end of the line", ErrQuote, pe.Line)}
	}
	return &ParseError{File: r.source, Line: pe.Line, Err: fmt.Errorf("%w: a \" at column %d is followed by other text, expected a closing \" followed by a delimiter or the end of the line (a quote inside a quoted field is written \"\")", ErrQuote, pe.Column)}
}

// endsInside reports whether package csv's quote error pe is the input
// ending inside a quoted field: the input has ended and the error is on
// the last line, past its end (where package csv places it).
func (l *boundedReader) endsInside(pe *csv.ParseError) bool {
	if !l.ended {
		return false
	}
	switch pe.Line {
	case l.lines + 1: // an unterminated last line
		return pe.Column > l.lineBytes
	case l.lines:
		return pe.Column > l.lastLine
	}
	return false
}
