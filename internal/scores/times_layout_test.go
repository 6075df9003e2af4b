package scores

import (
	"errors"
	"testing"
	"time"
	_ "time/tzdata" // the zone database for Europe/Amsterdam on any machine
)

// TestParseTimeWithoutLayout reads the common forms without a layout. The
// expected unix seconds were worked out by hand: 2026-03-27 is 20539 days
// after 1970-01-01, so 2026-03-27T09:29:00Z is 20539*86400 + 9*3600 +
// 29*60 = 1774603740; Europe/Amsterdam is UTC+1 on that day (summer time
// begins on 2026-03-29), so 09:29 there is 3600 seconds earlier.
func TestParseTimeWithoutLayout(t *testing.T) {
	amsterdam, err := time.LoadLocation("Europe/Amsterdam")
	if err != nil {
		t.Fatal(err)
	}
	const utc = 1774603740
	cases := []struct {
		text string
		loc  *time.Location
		want int64
	}{
		{"2026-03-27T09:29:00Z", nil, utc},
		{"2026-03-27T09:29:00Z", amsterdam, utc},           // a zone in the text wins
		{"2026-03-27T10:29:00+01:00", amsterdam, utc},      // RFC 3339 with an offset
		{"2026-03-27 10:29:00+01:00", nil, utc},            // with a space
		{"2026-03-27 09:29:00", nil, utc},                  // no zone: read in UTC
		{"2026-03-27 09:29:00", amsterdam, utc - 3600},     // no zone: read in the zone given
		{"2026-03-27T09:29:00", amsterdam, utc - 3600},     // T, no zone
		{"2026-03-27 09:29", amsterdam, utc - 3600},        // no seconds
		{"2026-03-27T09:29", nil, utc},                     // T, no seconds
		{"2026-03-27 09:29:00.250", amsterdam, utc - 3600}, // fraction of a second (unix seconds drop it)
		{" 2026-03-27T09:29:00.5 ", nil, utc},              // spaces around
	}
	for _, c := range cases {
		got, err := parseTime(c.text, "", c.loc)
		if err != nil || got != c.want {
			t.Errorf("parseTime(%q) = %d, %v, want %d", c.text, got, err, c.want)
		}
	}
}

// TestTimeLayoutGuess: a time in no form read without a layout is a
// *TimeLayoutError carrying a layout that reads it, where its shape shows
// one (each expected layout written by hand from Go's reference time).
func TestTimeLayoutGuess(t *testing.T) {
	cases := []struct{ text, layout string }{
		{"27/03/2026 09:29", "02/01/2006 15:04"},
		{"03/27/2026 09:29:00", "01/02/2006 15:04:05"}, // 27 cannot be a month
		{"5.3.2026 9:29", "2.1.2006 15:04"},
		{"2026/03/27 09:29:00.125", "2006/01/02 15:04:05.000"},
		{"yesterday", ""},
		{"27/03/26 09:29", ""}, // a two-digit year is not guessed
		{"2026-03-27", ""},     // a date without a time of day
	}
	for _, c := range cases {
		_, err := parseTime(c.text, "", nil)
		var layoutErr *TimeLayoutError
		if !errors.As(err, &layoutErr) || !errors.Is(err, ErrBadTime) {
			t.Fatalf("%q: error %v, want a *TimeLayoutError matching ErrBadTime", c.text, err)
		}
		if layoutErr.Layout != c.layout {
			t.Errorf("%q: layout %q, want %q", c.text, layoutErr.Layout, c.layout)
		}
	}
}
