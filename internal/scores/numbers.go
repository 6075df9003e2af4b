package scores

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// errNotDecimal is what parseDecimal returns for text that is not a
// number; errGoNotation for text that is one only in Go's notation.
var (
	errNotDecimal = errors.New("not a decimal number")
	errGoNotation = errors.New("a number in Go's notation only")
)

// goNotationHint is the hint of a value refused with errGoNotation.
const goNotationHint = "expected a number in decimal notation such as 0.25 or 1.5e-3 (hexadecimal and digits separated by _ are not read)"

// parseDecimal reads a number as CSV practice writes one: an optional sign,
// digits with an optional decimal point (at least one digit in all), and
// an optional exponent of e or E, an optional sign and digits, such as
// 0.25, -3, .5, 7. or 1.5e-3. Go's other forms (hexadecimal such as
// 0x1p-2, digits separated by underscores such as 1_000) are not numbers
// here. The words inf, infinity and nan, in any case and with a sign, are
// read as the values they name, so that the callers refuse them as
// numbers that are not finite; a number too large for float64 reads as
// an infinity with the same effect.
func parseDecimal(text string) (float64, error) {
	if !isDecimal(text) && !isInfOrNaN(text) {
		if _, err := strconv.ParseFloat(text, 64); err == nil || errors.Is(err, strconv.ErrRange) {
			return 0, errGoNotation
		}
		return 0, errNotDecimal
	}
	v, err := strconv.ParseFloat(text, 64)
	if err != nil && !errors.Is(err, strconv.ErrRange) {
		return 0, errNotDecimal
	}
	return v, nil
}

// isDecimal reports whether text is a number in the notation parseDecimal
// takes.
func isDecimal(text string) bool {
	i := 0
	if i < len(text) && (text[i] == '+' || text[i] == '-') {
		i++
	}
	digits := 0
	for ; i < len(text) && text[i] >= '0' && text[i] <= '9'; i++ {
		digits++
	}
	if i < len(text) && text[i] == '.' {
		for i++; i < len(text) && text[i] >= '0' && text[i] <= '9'; i++ {
			digits++
		}
	}
	if digits == 0 {
		return false
	}
	if i < len(text) && (text[i] == 'e' || text[i] == 'E') {
		i++
		if i < len(text) && (text[i] == '+' || text[i] == '-') {
			i++
		}
		exponent := 0
		for ; i < len(text) && text[i] >= '0' && text[i] <= '9'; i++ {
			exponent++
		}
		if exponent == 0 {
			return false
		}
	}
	return i == len(text)
}

// isInfOrNaN reports whether text is one of the words for an infinity or
// not-a-number that strconv.ParseFloat reads.
func isInfOrNaN(text string) bool {
	word := strings.ToLower(strings.TrimLeft(text, "+-"))
	if len(text)-len(word) > 1 {
		return false
	}
	return word == "inf" || word == "infinity" || word == "nan"
}

// MaxWeightTotal bounds the sum of a set's weights (or of a counts table's
// counts): past it the products of counts that figures need, such as the
// true cases times the false cases of the AUC, overflow float64, and a
// figure would read as infinite or undefined instead of being refused.
const MaxWeightTotal = 1e150

// ErrWeightTotal is the sentinel of weights or counts whose sum cannot be
// held well enough to count with.
var ErrWeightTotal = errors.New("sum out of range")

// checkWeightTotal checks that weights add up to a total the figures can
// count with: at most MaxWeightTotal, below 2^53 times the smallest
// positive weight, so that adding it to the total still counts, and for a
// counts table (counts) at most 2^53 cases, which float64 counts exactly.
// nil weights pass.
func checkWeightTotal(weights []float64, counts bool) error {
	total, smallest := 0.0, math.Inf(1)
	for _, w := range weights {
		total += w
		if w > 0 && w < smallest {
			smallest = w
		}
	}
	switch {
	case counts && total >= maxCount:
		return fmt.Errorf("%w: the counts add up to %.0f cases or more, expected fewer than %d, which float64 counts exactly", ErrWeightTotal, total, int64(maxCount))
	case math.IsInf(total, 0):
		return fmt.Errorf("%w: the weights add up to more than float64 holds (about 1.8e308), expected at most %g so that the figures stay finite", ErrWeightTotal, MaxWeightTotal)
	case !(total <= MaxWeightTotal):
		return fmt.Errorf("%w: the weights add up to %g, expected at most %g so that the figures stay finite", ErrWeightTotal, total, MaxWeightTotal)
	case total >= maxCount*smallest:
		return fmt.Errorf("%w: the weights add up to %g, beside which the smallest, %g, adds nothing (float64 keeps about 16 digits), expected a total below 2^53 times the smallest weight", ErrWeightTotal, total, smallest)
	}
	return nil
}

// ErrDecimalComma marks a number written with a decimal comma in text read
// with decimal points: the text may want reading with decimal commas.
var ErrDecimalComma = errors.New("a decimal comma")

// errPointInComma is what numberText returns for a number with a point in
// text read with decimal commas.
var errPointInComma = errors.New("a point in a number read with a decimal comma")

// numberText returns a number's text in the notation parseDecimal reads.
// With comma set the number is written with a decimal comma (0,25 or
// -1,5e-3): its comma becomes a point, and a point anywhere is
// errPointInComma, since it is either a decimal point in the wrong file
// or a thousands separator (1.234,5), which are not read in either mark.
// Without comma the text is returned as it is, except that a number that
// reads only with a decimal comma (0,25) is ErrDecimalComma.
func numberText(text string, comma bool) (string, error) {
	if comma {
		if strings.IndexByte(text, '.') >= 0 {
			return "", errPointInComma
		}
		return strings.Replace(text, ",", ".", 1), nil
	}
	if strings.IndexByte(text, ',') >= 0 && strings.IndexByte(text, '.') < 0 && isDecimal(strings.Replace(text, ",", ".", 1)) {
		return "", ErrDecimalComma
	}
	return text, nil
}

// markError words numberText's error for a cell of column kind sentinel
// (ErrBadScore, ErrBadWeight); other errors get the hint given.
func markError(sentinel error, text string, err error, hint string) error {
	switch err {
	case ErrDecimalComma:
		return &valueError{sentinel: sentinel, value: text, also: ErrDecimalComma,
			hint: "a number with a decimal comma, expected a decimal point (or the file read with decimal commas)"}
	case errPointInComma:
		return &valueError{sentinel: sentinel, value: text,
			hint: "a point in a file read with decimal commas, expected a decimal comma such as 0,25 and no separator between thousands"}
	}
	return &valueError{sentinel: sentinel, value: text, hint: hint}
}

// decimalCommaDelimiter is the delimiter of text whose decimal mark is
// looked for: the semicolon, which text with decimal commas is written
// with because the comma is taken.
const decimalCommaDelimiter = ';'

// useDecimalComma settles whether the builder reads numbers with a
// decimal comma: when Options.DecimalComma says so, or when the text is
// delimited by semicolons and the first data row's score cell (firstRow,
// its text) reads only with a decimal comma, as in 0,107681. The choice
// holds for the whole file, so that one cell never reads with a point
// and the next with a comma.
//
// Decimal commas in text whose delimiter is the comma are an error.
func (b *builder) useDecimalComma(delim rune, firstRow []byte) error {
	b.comma = b.opt.DecimalComma
	if b.comma && delim == ',' {
		return &ParseError{File: b.source, Line: 1, Err: fmt.Errorf("%w: numbers with decimal commas in text delimited by commas, expected semicolons or tabs between the cells", ErrDecimalComma)}
	}
	if b.comma || delim != decimalCommaDelimiter || b.scoreCol < 0 {
		return nil
	}
	row := strings.TrimSuffix(strings.TrimSuffix(string(firstRow), "\n"), "\r")
	cells := strings.Split(row, string(delim))
	if b.scoreCol >= len(cells) {
		return nil
	}
	cell := strings.Trim(strings.TrimSpace(cells[b.scoreCol]), `"`)
	_, err := numberText(strings.TrimSpace(cell), false)
	b.comma = err == ErrDecimalComma
	return nil
}

// firstRowAhead returns a copy of the first line of in from offset on that
// is not blank, without consuming it: the first data row when offset is
// just past the header line. It is nil when no such line ends within in's
// buffer.
func firstRowAhead(in *bufio.Reader, offset int) []byte {
	for n := min(max(in.Buffered(), offset+1), in.Size()); ; n = min(2*n, in.Size()) {
		data, err := in.Peek(n)
		if len(data) < offset {
			return nil
		}
		rest := data[offset:]
		for len(rest) > 0 {
			end := bytes.IndexByte(rest, '\n')
			if end < 0 {
				if err != nil && len(bytes.TrimSpace(rest)) > 0 {
					return append([]byte(nil), rest...) // the last line, unterminated
				}
				break
			}
			if len(bytes.TrimSpace(rest[:end])) > 0 {
				return append([]byte(nil), rest[:end+1]...)
			}
			rest = rest[end+1:]
		}
		if err != nil || n == in.Size() {
			return nil
		}
	}
}
