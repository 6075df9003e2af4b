package page

import (
	"math"
	"strconv"

	"github.com/sill-tool/sill/internal/evidence"
)

// InWords says a share as a plain fraction a reader keeps in mind: "1 in
// 3", "8 in 10". It picks the first of halves, thirds and quarters whose
// fraction lies within 2 points of the share, else the closest in tenths
// (ninths and sevenths are hard to picture). A share below 5% reads "fewer than 1 in 20", above 95% (but
// below 1) "more than 19 in 20"; 0 and 1 read "none" and "all"; an
// undefined share reads "n/a".
func InWords(share float64) string {
	switch {
	case !evidence.Defined(share):
		return "n/a"
	case share <= 0:
		return "none"
	case share >= 1:
		return "all"
	case share < 0.05:
		return "fewer than 1 in 20"
	case share > 0.95:
		return "more than 19 in 20"
	}
	for _, n := range []int{2, 3, 4} {
		k := math.Round(share * float64(n))
		if k >= 1 && k < float64(n) && math.Abs(k/float64(n)-share) <= 0.02 {
			return strconv.Itoa(int(k)) + " in " + strconv.Itoa(n)
		}
	}
	return strconv.Itoa(int(math.Round(share*10))) + " in 10"
}

// About rounds an expected count for plain words: to two significant
// figures, whole numbers only, in plain digits as package format writes
// counts ("about 90", "about 1300"); below 10 to one decimal when not
// whole ("about 2.5").
func About(v float64) string {
	if !evidence.Defined(v) {
		return "n/a"
	}
	if v < 0 {
		return "-" + About(-v)
	}
	if v < 10 {
		r := math.Round(v*10) / 10
		if r == math.Trunc(r) {
			return strconv.Itoa(int(r))
		}
		return strconv.FormatFloat(r, 'f', 1, 64)
	}
	magnitude := math.Pow(10, math.Floor(math.Log10(v))-1)
	return strconv.FormatFloat(math.Round(v/magnitude)*magnitude, 'f', 0, 64)
}

// plainWords says one cut in a lead's words, per shift when a volume is
// known: "about 90 alerts a shift, 1 in 3 wrong, 8 in 10 true cases
// caught". Without a volume it says the share of cases flagged instead.
func plainWords(c evidence.Cut, volume float64, percent func(float64) string) string {
	wrong := c.FalseDiscoveryRate
	if evidence.Defined(c.Projected.Precision) {
		wrong = c.Projected.FalseDiscoveryRate()
	}
	var flagged string
	switch q := c.Projected.QueuePerShift; {
	case volume > 0 && evidence.Defined(q) && About(q) == "1":
		flagged = "about 1 alert a shift"
	case volume > 0 && evidence.Defined(q):
		flagged = "about " + About(q) + " alerts a shift"
	default:
		flagged = "flags " + percent(c.Projected.AlertRate) + " of cases"
	}
	return flagged + ", " + InWords(wrong) + " wrong, " + InWords(c.Recall) + " true cases caught"
}
