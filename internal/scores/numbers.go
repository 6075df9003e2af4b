package scores

import (
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
