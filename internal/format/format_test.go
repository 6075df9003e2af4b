package format

import (
	"github.com/sill-tool/sill/internal/floatcmp"

	"fmt"
	"math"
	"testing"
)

var (
	nan    = math.NaN()
	inf    = math.Inf(1)
	negZer = math.Copysign(0, -1)
)

// Every expected text below was worked out by hand from the house forms in
// the package doc (common practice, no source).
func TestFigures(t *testing.T) {
	for _, tc := range []struct {
		name string
		got  string
		want string
	}{
		{"share", Share(0.4913), "49.1%"},
		{"share zero", Share(0), "0.0%"},
		{"share one", Share(1), "100.0%"},
		{"share negative zero", Share(negZer), "0.0%"},
		{"share tiny", Share(1e-300), "<0.1%"},
		{"share just below 0.05%", Share(0.00049), "<0.1%"},
		{"share at 0.05% rounds up", Share(0.0005), "0.1%"},
		{"share near one", Share(0.99951), ">99.9%"},
		{"share just below the top band", Share(0.99949), "99.9%"},
		{"share NaN", Share(nan), "n/a"},
		{"share +Inf", Share(inf), "n/a"},
		{"share -Inf", Share(-inf), "n/a"},
		{"share tiny negative", Share(-1e-9), "0.0%"}, // rounds to -0.0: no minus
		{"share huge", Share(1e14), "1e+16%"},

		{"interval", Interval([2]float64{0.49, 0.583}), "49.0–58.3%"},
		{"interval undefined end", Interval([2]float64{0.1, nan}), "n/a"},
		{"interval infinite end", Interval([2]float64{-inf, 0.2}), "n/a"},
		{"interval negative zero", Interval([2]float64{negZer, 0.01}), "0.0–1.0%"},
		{"number interval", NumberInterval([2]float64{0.88107, 0.91181}, 3), "0.881–0.912"},
		{"number interval undefined", NumberInterval([2]float64{nan, 0.9}, 3), "n/a"},
		{"number interval negative zero", NumberInterval([2]float64{-0.0001, 1}, 3), "0.000–1.000"},
		{"number with interval", NumberWithInterval(0.89644, [2]float64{0.88107, 0.91181}, 3), "0.896 (0.881–0.912)"},
		{"number with undefined interval", NumberWithInterval(1, [2]float64{nan, nan}, 3), "1.000"},
		{"undefined number with interval", NumberWithInterval(nan, [2]float64{0.1, 0.2}, 3), "n/a"},

		{"count whole", Count(6000), "6000"},
		{"count weighted", Count(4.5), "4.50"},
		{"count weighted rounds whole", Count(60.00000000000001), "60"},
		{"count from 100 rounds", Count(250.4), "250"},
		{"count 99.996 rounds to 100", Count(99.996), "100"},
		{"count negative zero", Count(negZer), "0"},
		{"count tiny", Count(1e-300), "0"},
		{"count tiny negative", Count(-0.001), "0"},
		{"count 0.005 shows", Count(0.005), "0.01"}, // 0.005 is just above 0.005 in binary
		{"count negative", Count(-3.25), "-3.25"},
		{"count huge", Count(1.23456e15), "1.235e+15"},
		{"count largest", Count(math.MaxFloat64), "1.798e+308"},
		{"count just below huge", Count(999999999999999), "999999999999999"},
		{"count NaN", Count(nan), "n/a"},
		{"count Inf", Count(inf), "n/a"},

		{"money", Money(12.5), "12.50"},
		{"money large", Money(-1500.4), "-1500"},
		{"money rounding noise below zero", Money(-0.4e-12), "0"},
		{"money -0.004 is not -0", Money(-0.004), "0"},
		{"money NaN", Money(nan), "n/a"},

		{"queue", Queue(89.76), "89.8"},
		{"queue whole", Queue(12), "12.0"},
		{"queue negative zero", Queue(-0.04), "0.0"},
		{"queue half even", Queue(12.25), "12.2"}, // 12.25 is exact in binary: 'f' rounds half to even
		{"queue huge", Queue(2e300), "2e+300"},
		{"queue NaN", Queue(nan), "n/a"},

		{"score", Score(0.35123), "0.35123"},
		{"score zero", Score(0), "0"},
		{"score negative zero", Score(negZer), "0"},
		{"score huge", Score(1e300), "1e+300"},
		{"score tiny", Score(5e-324), "5e-324"},
		{"score NaN", Score(nan), "n/a"},
		{"given", Given(1500), "1500"},
		{"given fraction", Given(37.5), "37.5"},

		{"number", Number(0.81234, 3), "0.812"},
		{"number negative zero", Number(-0.0004, 3), "0.000"},
		{"number whole", Number(-2.5, 0), "-2"}, // half to even
		{"number Inf", Number(-inf, 2), "n/a"},
		{"significant", Significant(0.0123456, 4), "0.01235"},
		{"significant zero", Significant(negZer, 4), "0"},
		{"significant NaN", Significant(nan, 4), "n/a"},

		{"p-value", PValue(0.01234), "0.0123"},
		{"p-value small", PValue(0.00009), "<0.0001"},
		{"p-value at the edge", PValue(0.0001), "0.0001"},
		{"p-value one", PValue(1), "1.0000"},
		{"p-value zero", PValue(0), "<0.0001"},
		{"p-value NaN", PValue(nan), "n/a"},

		// Against takes the queue as shown: 89.75 shows "89.8" (half to
		// even on the exact binary 89.75), so 0.2 under a capacity of 90.
		{"against under", Against(89.75, 90), "0.2 under"},
		{"against over", Against(120, 90), "30.0 over"},
		{"against at", Against(89.96, 90), "at capacity"},
		{"against shown at", Against(90.04, 90), "at capacity"},
		{"against capacity with two decimals", Against(50, 37.55), "12.45 over"},
		{"against NaN queue", Against(nan, 90), "n/a"},
		{"against NaN capacity", Against(10, nan), "n/a"},
	} {
		if tc.got != tc.want {
			t.Errorf("%s: got %q, want %q", tc.name, tc.got, tc.want)
		}
	}
}

// Each difference below was worked out by hand from the figures as shown
// beside it (common practice, no source).
func TestDifferences(t *testing.T) {
	for _, tc := range []struct {
		name      string
		got       Difference
		text      string
		value     float64
		shownA, B string // the figures the difference sits beside, for the reader
	}{
		// 108.25 shows "108.2" (half to even), 89.76 shows "89.8": 18.4,
		// though 108.25 - 89.76 = 18.49 would round to 18.5.
		{"queue agrees with shown", QueueDiff(108.25, 89.76), "+18.4", 18.4, "108.2", "89.8"},
		{"queue negative", QueueDiff(89.76, 342.04), "-252.2", -252.2, "89.8", "342.0"},
		{"queue equal values", QueueDiff(12.3, 12.3), "same", 0, "12.3", "12.3"},
		{"queue shows alike", QueueDiff(12.31, 12.34), "0.0", 0, "12.3", "12.3"},
		{"queue NaN", QueueDiff(nan, 1), "n/a", nan, "n/a", "1.0"},
		{"queue Inf", QueueDiff(1, inf), "n/a", nan, "1.0", "n/a"},

		{"points", ShareDiff(0.0321, 0), "+3.2 pt", 0.032, "3.2%", "0.0%"},
		// 0.4914 shows 49.1%, 0.4906 shows 49.1%: the shown figures agree.
		{"points show alike", ShareDiff(0.4906, 0.4914), "0.0 pt", 0, "49.1%", "49.1%"},
		{"points tiny negative is not -0.0", ShareDiff(0.5, 0.5004), "0.0 pt", 0, "50.0%", "50.0%"},
		// 0.12349 shows 12.3%, 0.10051 shows 10.1%: 2.2, not 2.3 (2.298).
		{"points rounding boundary", ShareDiff(0.12349, 0.10051), "+2.2 pt", 0.022, "12.3%", "10.1%"},
		{"points below the band", ShareDiff(0.0003, 0.002), "-0.2 pt", -0.002, "<0.1%", "0.2%"},
		{"points above the band", ShareDiff(0.9996, 0.5), "+50.0 pt", 0.5, ">99.9%", "50.0%"},
		{"points equal", ShareDiff(1, 1), "same", 0, "100.0%", "100.0%"},
		{"points undefined", ShareDiff(nan, 0.5), "n/a", nan, "n/a", "50.0%"},

		{"count", CountDiff(253, 3), "+250", 250, "253", "3"},
		{"count weighted beside whole", CountDiff(150.4, 42.57), "+107.43", 107.43, "150", "42.57"},
		{"count shows alike", CountDiff(150.4, 149.6), "0", 0, "150", "150"},
		{"count negative", CountDiff(2.5, 5), "-2.50", -2.5, "2.50", "5"},
		{"count whole weighted", CountDiff(60.00000000000001, 40), "+20", 20, "60", "40"},
		{"count huge", CountDiff(2e15, 1e15), "+1e+15", 1e15, "2e+15", "1e+15"},

		{"money", MoneyDiff(-1500, 0), "-1500", -1500, "-1500", "0"},
		{"money tiny", MoneyDiff(0.001, 0), "0", 0, "0", "0"},

		{"number", NumberDiff(0.8125, 0.8004, 3), "+0.012", 0.012, "0.812", "0.800"},
		{"number alike", NumberDiff(0.8004, 0.8001, 3), "0.000", 0, "0.800", "0.800"},

		{"score", ScoreDiff(0.8, 0.9), "-0.1", 0.8 - 0.9, "0.8", "0.9"},
		{"score small", ScoreDiff(0.000123456, 0), "+0.0001235", 0.000123456, "0.000123456", "0"},
		{"score equal", ScoreDiff(0.5, 0.5), "same", 0, "0.5", "0.5"},
		{"score NaN", ScoreDiff(nan, nan), "n/a", nan, "n/a", "n/a"},
	} {
		if tc.got.Text != tc.text || !floatcmp.Equal(tc.got.Value, tc.value) {
			t.Errorf("%s (beside %s and %s): got %q %v, want %q %v", tc.name, tc.shownA, tc.B, tc.got.Text, tc.got.Value, tc.text, tc.value)
		}
	}
}

// TestDifferencesAgreeWithShown checks, over a sweep of queues and shares
// either side of rounding boundaries, that the difference is the
// difference of the shown figures and never reads "-0".
func TestDifferencesAgreeWithShown(t *testing.T) {
	// shownDigits: figures parsed back from text, a few decimals, subtracted.
	const shownDigits = 1e-6
	for i := 0; i <= 2000; i++ {
		for j := 0; j <= 2000; j += 37 {
			a, b := float64(i)*0.05+0.0001*float64(i%3), float64(j)*0.05
			d := QueueDiff(a, b)
			if a == b {
				continue
			}
			want := shown(Queue(a)) - shown(Queue(b))
			if !floatcmp.Within(shown(d.Text), want, shownDigits) {
				t.Fatalf("QueueDiff(%v, %v) = %q beside %s and %s", a, b, d.Text, Queue(a), Queue(b))
			}
			sa, sb := a/100, b/100
			if s := ShareDiff(sa, sb).Text; s[0] == '-' && shown(s[:len(s)-3]) == 0 {
				t.Fatalf("ShareDiff(%v, %v) = %q", sa, sb, s)
			}
		}
	}
}

func ExampleQueueDiff() {
	fmt.Println(Queue(108.25), Queue(89.76), QueueDiff(108.25, 89.76))
	// Output: 108.2 89.8 +18.4
}

func ExampleShare() {
	fmt.Println(Share(0.4913), Share(0.0001), Share(math.NaN()), Interval([2]float64{0.49, 0.583}))
	// Output: 49.1% <0.1% n/a 49.0–58.3%
}

func TestSignificantAndShortInterval(t *testing.T) {
	for _, tc := range []struct{ name, got, want string }{
		{"significant", Significant(0.123456, 4), "0.1235"},
		{"significant whole digits", Significant(12345.6, 4), "12346"}, // more whole digits than 4: whole, not 1.235e+04
		{"significant thousand", Significant(1234.56, 4), "1235"},
		{"significant huge", Significant(2e20, 4), "2e+20"},
		{"significant tiny", Significant(1.23456e-9, 3), "1.23e-09"},
		{"short interval", ShortInterval([2]float64{0.614, 0.7851}), "61–79%"},
		{"short interval negative zero", ShortInterval([2]float64{-0.001, 0.004}), "0–0%"},
		{"short interval undefined", ShortInterval([2]float64{nan, 0.1}), "n/a"},
	} {
		if tc.got != tc.want {
			t.Errorf("%s: got %q, want %q", tc.name, tc.got, tc.want)
		}
	}
}

// TestGridMeasuresPrintable: a cell holding a control is laid out at the
// width it shows with (worked by hand: "a\x1bb" shows as 6 characters).
func TestGridMeasuresPrintable(t *testing.T) {
	got := Grid([]string{"name", "n"}, [][]string{{"a\x1bb", "1"}, {"plain", "22"}}, false)
	want := "name     n\n" + `a\x1bb` + "   1\nplain   22\n"
	if got != want {
		t.Errorf("got\n%s\nwant\n%s", got, want)
	}
}

// TestGap: a gap between two shares in points with its sign, its interval
// with signed ends, zero never signed, undefined as n/a (hand-written).
func TestGap(t *testing.T) {
	cases := []struct{ got, want string }{
		{Gap(-0.55), "-55.0 pt"},
		{Gap(0.0214), "+2.1 pt"},
		{Gap(-0.0004), "0.0 pt"},
		{Gap(0), "0.0 pt"},
		{Gap(math.NaN()), "n/a"},
		{GapInterval([2]float64{-0.6901, -0.3298}), "-69.0 to -33.0 pt"},
		{GapInterval([2]float64{-0.0304, 0.0521}), "-3.0 to +5.2 pt"},
		{GapInterval([2]float64{-0.00001, 0.1}), "0.0 to +10.0 pt"},
		{GapInterval([2]float64{math.NaN(), 0.1}), "n/a"},
		{ShortGapInterval([2]float64{-0.206, -0.006}), "-21 to -1"},
		{ShortGapInterval([2]float64{-0.004, 0.105}), "0 to +11"},
		{ShortGapInterval([2]float64{0.1, math.NaN()}), "n/a"},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("got %q, want %q", c.got, c.want)
		}
	}
}

// TestLevel: levels in the fewest digits, float residue rounded away
// (hand-written).
func TestLevel(t *testing.T) {
	for v, want := range map[float64]string{0.95: "95%", 1 - 0.95: "5%", 0.995: "99.5%", 0.9: "90%", 1 - 0.9: "10%", math.NaN(): "n/a"} {
		if got := Level(v); got != want {
			t.Errorf("Level(%v) = %q, want %q", v, got, want)
		}
	}
}

// TestPlural: the noun agrees with the number (by hand).
func TestPlural(t *testing.T) {
	for _, c := range []struct {
		n    int
		want string
	}{{0, "0 rows"}, {1, "1 row"}, {2, "2 rows"}, {6000, "6000 rows"}} {
		if got := Plural(c.n, "row", "rows"); got != c.want {
			t.Errorf("Plural(%d) = %q, want %q", c.n, got, c.want)
		}
	}
}

// TestWrap: lines of at most the width at spaces, the indents, a word too
// long standing alone, and empty text (worked by hand).
func TestWrap(t *testing.T) {
	cases := []struct {
		text, first, rest string
		width             int
		want              string
	}{
		{"aa bb cc dd", "  ", "    ", 10, "  aa bb cc\n    dd\n"},
		{"aa bb", "", "", 80, "aa bb\n"},
		{"a verylongword b", "", " ", 5, "a\n verylongword\n b\n"},
		{"  spaced   out  ", "- ", "  ", 20, "- spaced out\n"},
		{"", "  ", "  ", 10, ""},
	}
	for _, c := range cases {
		if got := Wrap(c.text, c.width, c.first, c.rest); got != c.want {
			t.Errorf("Wrap(%q, %d) = %q, want %q", c.text, c.width, got, c.want)
		}
	}
}
