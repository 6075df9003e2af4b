package share

import (
	"errors"
	"testing"
)

// TestRead checks every form of the package doc, accepted and refused.
// The expected fractions are the written numbers, divided by 100 for a
// percentage (worked by hand).
func TestRead(t *testing.T) {
	cases := []struct {
		text     string
		fraction float64
		percent  bool
		written  float64
		problem  string // "" when the text is a share
	}{
		{"0.05", 0.05, false, 0.05, ""},
		{".05", 0.05, false, 0.05, ""},
		{"5e-2", 0.05, false, 0.05, ""},
		{"0", 0, false, 0, ""},
		{"1", 1, false, 1, ""},
		{"  0.8 ", 0.8, false, 0.8, ""},
		{"5%", 0.05, true, 5, ""},
		{" 5 % ", 0.05, true, 5, ""},
		{"33.3%", 0.333, true, 33.3, ""},
		{"0.5%", 0.005, true, 0.5, ""},
		{"0%", 0, true, 0, ""},
		{"100%", 1, true, 100, ""},
		{"57%", 0.57, true, 57, ""}, // Written stays 57 where 0.57 × 100 gives 56.99999999999999
		{"+5%", 0.05, true, 5, ""},
		{"0.7%", 0.007, true, 0.7, ""}, // 0.7 / 100 gives 0.006999999999999999
		{"5e-1%", 0.005, true, 0.5, ""},
		{"-0", 0, false, 0, ""},
		{"", 0, false, 0, "is empty"},
		{"   ", 0, false, 0, "is empty"},
		{"%", 0, false, 0, "has no number before the percent sign"},
		{"5%%", 0, false, 0, "has more than one percent sign"},
		{"%5", 0, false, 0, "has its percent sign before the end"},
		{"5 % 5", 0, false, 0, "has its percent sign before the end"},
		{"-5%", 0, false, 0, "is negative"},
		{"-0.1", 0, false, 0, "is negative"},
		{"105%", 0, false, 0, "is more than 100%"},
		{"1.5", 0, false, 0, "is more than 1"},
		{"5", 0, false, 0, "is more than 1"}, // a percentage without its sign
		{"0,05", 0, false, 0, "has a decimal comma"},
		{"1_0%", 0, false, 0, "is not a number"},
		{"0x1p-2", 0, false, 0, "is not a number"},
		{"inf", 0, false, 0, "is not a number"},
		{"NaN", 0, false, 0, "is not a number"},
		{"five", 0, false, 0, "is not a number"},
		{"5-%", 0, false, 0, "is not a number"},
		{"1e400", 0, false, 0, "is not a number"},
		{"0.5.1", 0, false, 0, "is not a number"},
	}
	for _, tc := range cases {
		got, err := Read(tc.text)
		if tc.problem != "" {
			var e *Error
			if !errors.As(err, &e) || e.Problem != tc.problem || e.Text != tc.text || !errors.Is(err, ErrNotShare) {
				t.Errorf("Read(%q) error %v, want problem %q", tc.text, err, tc.problem)
			}
			continue
		}
		if err != nil || got != (Share{Fraction: tc.fraction, Percent: tc.percent, Written: tc.written}) {
			t.Errorf("Read(%q) = %+v, %v; want %v, %v, %v", tc.text, got, err, tc.fraction, tc.percent, tc.written)
		}
		if f, err := Parse(tc.text); err != nil || f != tc.fraction {
			t.Errorf("Parse(%q) = %v, %v; want %v", tc.text, f, err, tc.fraction)
		}
	}
}

// TestErrorMessage checks the whole message: the text, the problem, then
// what was expected.
func TestErrorMessage(t *testing.T) {
	_, err := Parse("105%")
	want := `"105%" is more than 100%, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%`
	if err == nil || err.Error() != want {
		t.Errorf("error %v, want %s", err, want)
	}
}
