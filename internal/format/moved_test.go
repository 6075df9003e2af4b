package format

import "testing"

// TestFormatters checks the forms the report was written with before
// they moved here, each worked out by hand (common practice, no source).
func TestFormatters(t *testing.T) {
	tenth, fifth := 0.1, 0.2 // variables, so that the sum is rounded at run time
	cases := []struct {
		name, got, want string
	}{
		{"percent", Share(0.1234), "12.3%"},
		{"percent zero", Share(0), "0.0%"},
		{"percent tiny", Share(0.0004), "<0.1%"},
		{"percent nearly all", Share(0.99996), ">99.9%"},
		{"percent one", Share(1), "100.0%"},
		{"percent undefined", Share(nan), "n/a"},
		{"range", Interval([2]float64{0.05, 0.4567}), "5.0–45.7%"},
		{"range undefined", Interval([2]float64{nan, 1}), "n/a"},
		{"count whole", Count(433), "433"},
		{"count weighted", Count(12.345), "12.35"},
		{"count weighted large", Count(1234.5), "1234"}, // FormatFloat rounds half to even
		{"money whole", Money(0), "0"},
		{"money whole small", Money(120), "120"},
		{"money fraction", Money(1.5), "1.50"},
		{"money large", Money(66300.4), "66300"},
		{"money benefit", Money(-80), "-80"},
		{"money rounding noise", Money(60.00000000000001), "60"},
		{"money minus zero", Money(-0.001), "0"},
		{"count rounding noise", Count(2.9999999999), "3"},
		{"queue whole", Queue(108), "108.0"},
		{"queue fraction", Queue(61.25), "61.2"}, // 61.25 is exact in binary; FormatFloat rounds half to even
		{"queue undefined", Queue(nan), "n/a"},
		{"against over", Against(108, 90), "18.0 over"},
		{"against under", Against(61.25, 90), "28.8 under"},
		{"against just under", Against(89.75, 90), "0.2 under"}, // the queue shows 89.8 (half to even)
		{"against at", Against(90.02, 90), "at capacity"},
		{"against undefined", Against(nan, 90), "n/a"},
		{"fixed", Number(0.81249, 3), "0.812"},
		{"score exact", Score(tenth + fifth), "0.30000000000000004"},
		{"score short", Score(0.3), "0.3"},
		{"queue interval", QueueInterval([2]float64{98.24, 130.46}), "98.2–130.5"},
		{"queue interval undefined", QueueInterval([2]float64{nan, nan}), "n/a"},
		{"money interval", MoneyInterval([2]float64{812.2, 1040}), "812–1040"},
		{"money interval across zero", MoneyInterval([2]float64{-291.146, 781.547}), "-291 to 782"},
		{"money interval minus zero", MoneyInterval([2]float64{-0.001, 5}), "0–5"},
		{"money interval mixed digits", MoneyInterval([2]float64{34.92, 143.2}), "35–143"},
		{"money interval small", MoneyInterval([2]float64{0.125, 2.5}), "0.12–2.50"},
		{"money interval undefined", MoneyInterval([2]float64{1, nan}), "n/a"},
	}
	for _, tc := range cases {
		if tc.got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, tc.got, tc.want)
		}
	}
}

// TestMarkdown: what a note may hold comes out as written once a
// Markdown viewer renders it (CommonMark's backslash escapes; common
// practice, no source beyond the CommonMark spec's list of escapable
// punctuation).
func TestMarkdown(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"plain words", "plain words"},
		{"a | b", `a \| b`},
		{"*stars* and _under_", `\*stars\* and \_under\_`},
		{"`code`", "\\`code\\`"},
		{"<night> shift", `\<night> shift`},
		{"</b> <!-- x", `\</b> \<!-- x`},
		{"score <= 0.3, a < b", "score <= 0.3, a < b"},
		{"line one\nline two\r\nline three", "line one line two line three"},
	} {
		if got := Markdown(tc.in); got != tc.want {
			t.Errorf("Markdown(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}
