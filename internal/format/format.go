// Package format turns figures into the text every view shows: the text
// and Markdown reports, check, review and every pane of the explorer. The
// same value prints the same wherever it appears.
//
// The house forms, and why:
//   - An undefined figure (NaN, or an infinity, which no figure can
//     honestly be) reads "n/a".
//   - A share reads as a percentage with one decimal, "49.1%". A share that
//     is not 0 (or 1) but rounds to it reads "<0.1%" (or ">99.9%"), so a
//     rounded figure never looks exact.
//   - An interval of shares reads "49.0–58.3%": short enough for a pane's
//     column, and one "%" says the unit once.
//   - A count reads in plain digits, "6000": no thousands separator,
//     because a comma is the decimal mark in much of Europe and plain
//     digits paste into any spreadsheet. A weighted count below 100 keeps
//     two decimals ("4.50"), one that rounds to a whole number drops them
//     (60.00000000000001, a sum of rounded shares, reads "60"). An amount
//     too small for two decimals reads "0", not "<0.01": sums of products
//     of weights and costs carry rounding noise of that size, and a cost
//     that is zero by hand must read 0.
//   - Money reads like a count, with no currency sign (the costs are in
//     whatever unit they were given in).
//   - A queue (expected alerts per shift) always has one decimal, so a
//     column of queues reads alike.
//   - A cut score reads exactly, in the shortest form that reads back
//     equal.
//   - A p-value reads with four decimals, "<0.0001" below that: enough for
//     check's 1% level with room to spare.
//   - Magnitudes of 1e15 and beyond, where plain digits stop being exact,
//     read with four significant digits ("1.235e+15").
//   - Nothing ever reads "-0" (or "-0.0", "-0.0 pt"): a figure that rounds
//     to zero reads as zero.
//
// A difference shown beside two figures is the difference of the figures
// as shown (each rounded to its own digits), so "89.8" and "108.2" sit
// beside "+18.4", never "+18.5". Two equal values differ by "same"; two
// values that differ but show alike differ by zero in the shown digits
// ("0.0 pt"), without a sign.
//
// Printable makes untrusted text (file names, column and segment values,
// notes, names) safe to print on a terminal; see its doc.
package format

import (
	"math"
	"strconv"
	"strings"
)

// NA is the text of an undefined figure.
const NA = "n/a"

// huge is the magnitude from which figures read with four significant
// digits instead of plain ones.
const huge = 1e15

// defined reports whether v is a number a figure can hold.
func defined(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// fixed formats a defined v with the given decimals, four significant
// digits from huge on, and never with a minus sign before a zero.
func fixed(v float64, decimals int) string {
	if math.Abs(v) >= huge {
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	text := strconv.FormatFloat(v, 'f', decimals, 64)
	if text[0] == '-' && strings.Trim(text[1:], "0.") == "" {
		return text[1:]
	}
	return text
}

// Number formats v with the given decimals (0 or more): "0.812" for an
// AUC with 3. Undefined reads "n/a".
func Number(v float64, decimals int) string {
	if !defined(v) {
		return NA
	}
	return fixed(v, decimals)
}

// Significant formats v with the given number of significant digits
// (1 or more): for percentiles of scores, which interpolate between them,
// and scale factors. Magnitudes with more whole digits than that read as
// whole numbers ("12346" with 4), up to huge. Undefined reads "n/a".
func Significant(v float64, digits int) string {
	if !defined(v) {
		return NA
	}
	if v == 0 {
		return "0"
	}
	if a := math.Abs(v); a >= math.Pow(10, float64(digits)) && a < huge {
		return fixed(v, 0)
	}
	return strconv.FormatFloat(v, 'g', digits, 64)
}

// Share formats a share (a fraction of 1) as a percentage with one
// decimal: "49.1%", "<0.1%", ">99.9%". Undefined reads "n/a".
func Share(v float64) string {
	if !defined(v) {
		return NA
	}
	switch {
	case v > 0 && v < 0.0005:
		return "<0.1%"
	case v < 1 && v >= 0.9995:
		return ">99.9%"
	}
	return fixed(100*v, 1) + "%"
}

// Interval formats an interval of shares as "49.0–58.3%". It reads "n/a"
// when either end is undefined.
func Interval(ci [2]float64) string {
	if !defined(ci[0]) || !defined(ci[1]) {
		return NA
	}
	return fixed(100*ci[0], 1) + "–" + fixed(100*ci[1], 1) + "%"
}

// ShortInterval formats an interval of shares in whole percent, "49–58%":
// the one narrower form, for a column or a sentence too narrow for
// Interval. It reads "n/a" when either end is undefined.
func ShortInterval(ci [2]float64) string {
	if !defined(ci[0]) || !defined(ci[1]) {
		return NA
	}
	return fixed(100*ci[0], 0) + "–" + fixed(100*ci[1], 0) + "%"
}

// Count formats a count, possibly weighted: whole numbers plainly, other
// amounts below 100 with two decimals, larger ones rounded to whole
// numbers. Undefined reads "n/a".
func Count(v float64) string {
	if !defined(v) {
		return NA
	}
	return amount(v)
}

// Money formats a cost as Count formats a count. Undefined reads "n/a".
func Money(v float64) string { return Count(v) }

// amount is the body of Count and Money for a defined v.
func amount(v float64) string {
	if math.Abs(v) >= 100 {
		return fixed(v, 0)
	}
	return strings.TrimSuffix(fixed(v, 2), ".00")
}

// amountDecimals is how many decimals amount shows for v.
func amountDecimals(v float64) int {
	if math.Abs(v) >= 100 || strings.HasSuffix(fixed(v, 2), ".00") {
		return 0
	}
	return 2
}

// Queue formats a projected number of alerts per shift, an expectation
// rather than a count, always with one decimal. Undefined reads "n/a".
func Queue(v float64) string {
	if !defined(v) {
		return NA
	}
	return fixed(v, 1)
}

// Score formats a cut score exactly, in the shortest form that reads back
// equal. Undefined reads "n/a".
func Score(v float64) string {
	if !defined(v) {
		return NA
	}
	if v == 0 {
		return "0"
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// Given formats an assumption the way a person types it: "1500", "37.5".
// Undefined reads "n/a".
func Given(v float64) string { return Score(v) }

// PValue formats a p-value with four decimals, "<0.0001" below that.
// Undefined reads "n/a".
func PValue(p float64) string {
	if !defined(p) {
		return NA
	}
	if p < 0.0001 {
		return "<0.0001"
	}
	return fixed(p, 4)
}

// Against says how a queue stands against capacity, as "12.5 under" or
// "30.0 over": the shown queue (Queue) less the capacity as given, in the
// queue's one decimal or the capacity's own digits if it has more. A
// difference that shows as zero is "at capacity". Undefined reads "n/a".
func Against(queue, capacity float64) string {
	if !defined(queue) || !defined(capacity) {
		return NA
	}
	decimals := max(1, decimalsOf(Given(capacity)))
	d := shown(Queue(queue)) - capacity
	text := fixed(math.Abs(d), decimals)
	switch {
	case shown(text) == 0:
		return "at capacity"
	case d > 0:
		return text + " over"
	default:
		return text + " under"
	}
}

// decimalsOf counts the digits after the point of a plain number's text;
// 0 for exponent form, which Given writes only for huge or tiny values.
func decimalsOf(text string) int {
	if strings.ContainsAny(text, "eE") {
		return 0
	}
	if i := strings.IndexByte(text, '.'); i >= 0 {
		return len(text) - i - 1
	}
	return 0
}

// shown is the value a figure's text reads as: "<0.1%" reads as zero, ">99.9%" as 100, a trailing "%" is dropped.
func shown(text string) float64 {
	text = strings.TrimSuffix(text, "%")
	switch {
	case strings.HasPrefix(text, "<"):
		return 0
	case strings.HasPrefix(text, ">"):
		return 100
	}
	v, err := strconv.ParseFloat(text, 64)
	if err != nil {
		return math.NaN()
	}
	return v
}

// Rounded is v as Number shows it with the given decimals, NaN when
// undefined: for a judgement that must agree with the figure shown, such
// as a warning that a shown AUC is below 0.5.
func Rounded(v float64, decimals int) float64 {
	if !defined(v) {
		return math.NaN()
	}
	return shown(fixed(v, decimals))
}

// Gap formats a difference of two shares in percentage points with one
// decimal and its sign, "-5.5 pt", "+2.1 pt", an unsigned "0.0 pt" for a
// difference that rounds to zero. Undefined reads "n/a".
func Gap(d float64) string {
	if !defined(d) {
		return NA
	}
	return signed(math.Round(1000*d)/10, 1, " pt")
}

// GapInterval formats the interval of a difference of two shares in
// percentage points, "-6.9 to -3.3 pt": signed ends, since the
// interval may hold zero. It reads "n/a" when either end is undefined.
func GapInterval(ci [2]float64) string {
	if !defined(ci[0]) || !defined(ci[1]) {
		return NA
	}
	return signed(math.Round(1000*ci[0])/10, 1, "") + " to " + signed(math.Round(1000*ci[1])/10, 1, "") + " pt"
}

// Level formats a confidence level or an error rate as a percentage in
// the fewest digits that say it, "95%", "99.5%", "5%" (so 1 - 0.95, which
// a float holds as 0.050000000000000044, reads "5%"). Undefined reads
// "n/a".
func Level(v float64) string {
	if !defined(v) {
		return NA
	}
	return strconv.FormatFloat(math.Round(1e8*v)/1e6, 'g', -1, 64) + "%"
}

// ShortGapInterval formats the interval of a difference of two shares in
// whole percentage points without the unit, "-21 to -1": the narrow form
// of GapInterval for a column. It reads "n/a" when either end is
// undefined.
func ShortGapInterval(ci [2]float64) string {
	if !defined(ci[0]) || !defined(ci[1]) {
		return NA
	}
	return signed(math.Round(100*ci[0]), 0, "") + " to " + signed(math.Round(100*ci[1]), 0, "")
}

// CutSign is the comparison a case's score passes to be flagged, as every
// view writes it: ">=" where higher scores are riskier, "<=" where lower
// ones are (the cut rule of package scores).
func CutSign(lowerIsRiskier bool) string {
	if lowerIsRiskier {
		return "<="
	}
	return ">="
}
