package format

// NumberInterval formats an interval of plain numbers with the given
// decimals, "0.881–0.911" for an AUC's with 3. It reads "n/a" when either
// end is undefined.
func NumberInterval(ci [2]float64, decimals int) string {
	if !defined(ci[0]) || !defined(ci[1]) {
		return NA
	}
	return fixed(ci[0], decimals) + "–" + fixed(ci[1], decimals)
}

// NumberWithInterval formats a figure with its interval in brackets,
// both with the given decimals: "0.896 (0.881–0.912)" for an AUC with 3.
// An undefined interval is left out ("0.896"); an undefined figure reads
// "n/a".
func NumberWithInterval(v float64, ci [2]float64, decimals int) string {
	if !defined(v) {
		return NA
	}
	if !defined(ci[0]) || !defined(ci[1]) {
		return fixed(v, decimals)
	}
	return fixed(v, decimals) + " (" + NumberInterval(ci, decimals) + ")"
}
