// Package share reads shares (proportions, such as a base rate, a hit
// share or a confidence level) as people write them: a fraction from 0
// to 1, or a percentage from 0% to 100%.
//
// The forms read:
//
//	0.05  .05  1  0  5e-2   a fraction, a decimal number from 0 to 1
//	5%  5 %  0.5%  100%     a percentage: a decimal number from 0 to 100
//	                        and one percent sign after it
//
// Spaces around the number and between it and the percent sign are
// ignored. Refused, with an *Error that says what was expected: nothing
// at all, more than one percent sign ("5%%"), a sign before a percentage
// or a fraction that makes it negative ("-5%"), more than 100% or 1
// ("105%", "1.5"), and anything but a plain decimal number (a decimal
// comma "0,05", digit separators "1_0", hexadecimal, "inf", "NaN").
//
// The package speaks no flag names; callers add them when they wrap its
// errors. Bounds narrower than [0,1] (a confidence level above 0 and below
// 1, say) are the caller's to check.
package share

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"strconv"
	"strings"
)

// Expected says what a share may be; every Error ends with it.
const Expected = "a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%"

// ErrNotShare is the sentinel every *Error unwraps to.
var ErrNotShare = errors.New("not a share")

// Error says why a text is not a share.
type Error struct {
	Text    string // the text as given
	Problem string // what is wrong with it, such as "is more than 100%"
}

func (e *Error) Error() string {
	return fmt.Sprintf("%q %s, expected %s", e.Text, e.Problem, Expected)
}

// Unwrap returns ErrNotShare.
func (e *Error) Unwrap() error { return ErrNotShare }

// Share is a share as it was written.
type Share struct {
	Fraction float64 // from 0 to 1
	Percent  bool    // written as a percentage
	// Written is the number as written: Fraction, or for a percentage the
	// number before the sign (5 for "5%"), exact where Fraction × 100
	// would round.
	Written float64
}

// Parse reads text as a share (the forms of the package doc) and returns
// it as a fraction from 0 to 1: "5%" and "0.05" both give 0.05.
func Parse(text string) (float64, error) {
	s, err := Read(text)
	return s.Fraction, err
}

// Read reads text as a share (the forms of the package doc) and says how
// it was written.
func Read(text string) (Share, error) {
	bad := func(problem string) (Share, error) {
		return Share{}, &Error{Text: text, Problem: problem}
	}
	number := strings.TrimSpace(text)
	percent := strings.HasSuffix(number, "%")
	if percent {
		number = strings.TrimSpace(strings.TrimSuffix(number, "%"))
	}
	switch {
	case number == "" && percent:
		return bad("has no number before the percent sign")
	case number == "":
		return bad("is empty")
	case strings.Count(text, "%") > 1:
		return bad("has more than one percent sign")
	case strings.Contains(number, "%"):
		return bad("has its percent sign before the end")
	case strings.Contains(number, ","):
		return bad("has a decimal comma")
	case strings.Trim(number, "0123456789.eE+-") != "" || strings.ContainsAny(number[1:], "+-") && !afterExponent(number):
		return bad("is not a number")
	}
	v, err := strconv.ParseFloat(number, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return bad("is not a number")
	}
	limit := 1.0
	if percent {
		limit = 100
	}
	switch {
	case v < 0:
		return bad("is negative")
	case v > limit && percent:
		return bad("is more than 100%")
	case v > limit:
		return bad("is more than 1")
	}
	s := Share{Fraction: v, Percent: percent, Written: v}
	if percent {
		// The fraction nearest the decimal number / 100, so that "33.3%"
		// gives the same float as "0.333" (v / 100 would not).
		exact, ok := new(big.Rat).SetString(number)
		if !ok {
			return bad("is not a number")
		}
		s.Fraction, _ = exact.Quo(exact, big.NewRat(100, 1)).Float64()
	}
	return s, nil
}

// afterExponent reports whether every sign after the first character of
// number directly follows an exponent mark, as in "5e-2".
func afterExponent(number string) bool {
	for i := 1; i < len(number); i++ {
		if (number[i] == '+' || number[i] == '-') && number[i-1] != 'e' && number[i-1] != 'E' {
			return false
		}
	}
	return true
}
