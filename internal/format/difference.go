package format

import (
	"math"
	"strconv"
	"strings"
)

// Difference is one figure less a reference figure, as shown beside them.
type Difference struct {
	// Text is the signed difference, "+3.2 pt", "-250", "same" when the
	// two values are equal, an unsigned zero in the shown digits when they
	// differ but show alike, "n/a" when either is undefined.
	Text string
	// Value is the difference of the two figures as shown, in the
	// figures' own unit (a share for ShareDiff, so 0.032 for "+3.2 pt");
	// 0 for "same", NaN for "n/a".
	Value float64
}

func (d Difference) String() string { return d.Text }

// undefinedDiff is the difference when either figure is undefined.
var undefinedDiff = Difference{Text: NA, Value: math.NaN()}

// signed writes the difference d, already rounded to decimals, with its
// sign and unit; zero without a sign.
func signed(d float64, decimals int, unit string) string {
	text := fixed(math.Abs(d), decimals)
	if text == "0" || strings.Trim(text, "0.") == "" {
		return text + unit
	}
	if d > 0 {
		return "+" + text + unit
	}
	return "-" + text + unit
}

// ShareDiff is the difference of two shares in percentage points, from
// the shares as Share shows them: "+3.2 pt".
func ShareDiff(v, ref float64) Difference {
	if !defined(v) || !defined(ref) {
		return undefinedDiff
	}
	if v == ref {
		return Difference{Text: "same"}
	}
	d := shown(Share(v)) - shown(Share(ref))
	return Difference{Text: signed(d, 1, " pt"), Value: shown(fixed(d, 1)) / 100}
}

// CountDiff is the difference of two counts as Count shows them, in the
// digits of the more precise of the two: "42.57" beside "150" gives
// "+107.43".
func CountDiff(v, ref float64) Difference {
	if !defined(v) || !defined(ref) {
		return undefinedDiff
	}
	if v == ref {
		return Difference{Text: "same"}
	}
	a, b := shown(Count(v)), shown(Count(ref))
	if math.Abs(v) >= huge || math.Abs(ref) >= huge {
		// Four significant digits already hide the ones place.
		return Difference{Text: signed(a-b, 0, ""), Value: a - b}
	}
	decimals := max(amountDecimals(v), amountDecimals(ref))
	text := signed(a-b, decimals, "")
	return Difference{Text: text, Value: shown(strings.TrimLeft(text, "+"))}
}

// MoneyDiff is the difference of two costs as Money shows them.
func MoneyDiff(v, ref float64) Difference { return CountDiff(v, ref) }

// QueueDiff is the difference of two queues as Queue shows them, with one
// decimal.
func QueueDiff(v, ref float64) Difference { return NumberDiff(v, ref, 1) }

// NumberDiff is the difference of two figures shown by Number with the
// given decimals, in those decimals.
func NumberDiff(v, ref float64, decimals int) Difference {
	if !defined(v) || !defined(ref) {
		return undefinedDiff
	}
	if v == ref {
		return Difference{Text: "same"}
	}
	d := shown(fixed(v, decimals)) - shown(fixed(ref, decimals))
	text := signed(d, decimals, "")
	return Difference{Text: text, Value: shown(strings.TrimLeft(text, "+"))}
}

// ScoreDiff is the difference of two cut scores to four significant
// digits; Score shows the scores exactly, so the difference is theirs.
func ScoreDiff(v, ref float64) Difference {
	if !defined(v) || !defined(ref) {
		return undefinedDiff
	}
	if v == ref {
		return Difference{Text: "same"}
	}
	d := v - ref
	text := strconv.FormatFloat(math.Abs(d), 'g', 4, 64)
	if d > 0 {
		text = "+" + text
	} else {
		text = "-" + text
	}
	return Difference{Text: text, Value: d}
}
