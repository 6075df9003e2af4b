package scores_test

import (
	"errors"
	"strings"
	"testing"
	"time"
	_ "time/tzdata" // the zone database for Europe/Amsterdam on any machine

	"github.com/sill-tool/sill/internal/scores"
)

// TestTimeAndCompareColumns checks that the optional time and second score
// columns are read and ranked with the other columns. The expected unix
// seconds were worked out by hand: 2026-09-01T00:00:00Z is 1788220800
// (20699 days after 1970-01-01, times 86400).
func TestTimeAndCompareColumns(t *testing.T) {
	in := "score,label,read_at,other\n" +
		"0.2,0,2026-09-01T00:00:00Z,0.9\n" +
		"0.8,1,2026-09-01T01:00:00+01:00,0.1\n" +
		"0.5,0,2026-09-01T00:00:30Z,0.5\n"
	set, err := scores.Read(strings.NewReader(in), "t.csv", scores.Options{TimeColumn: "read_at", CompareColumn: "other"})
	if err != nil {
		t.Fatal(err)
	}
	// Ranked riskiest first: 0.8, 0.5, 0.2.
	wantTimes := []int64{1788220800, 1788220830, 1788220800}
	wantOther := []float64{0.1, 0.5, 0.9}
	for i := range wantTimes {
		if set.Times()[i] != wantTimes[i] || set.CompareScores()[i] != wantOther[i] {
			t.Errorf("row %d: time %d other %v, want %d %v", i, set.Times()[i], set.CompareScores()[i], wantTimes[i], wantOther[i])
		}
	}
	if set.TimeColumn() != "read_at" || set.CompareColumn() != "other" {
		t.Errorf("columns %q %q", set.TimeColumn(), set.CompareColumn())
	}
}

// TestTimeLayoutInLocation reads a layout without a zone in a named zone:
// 2026-03-29 01:30 in Europe/Amsterdam is still winter time (UTC+1), so
// it is 00:30 UTC, 1774744200 (hand-worked: 20541 days * 86400 + 1800).
func TestTimeLayoutInLocation(t *testing.T) {
	loc, err := time.LoadLocation("Europe/Amsterdam")
	if err != nil {
		t.Fatal(err)
	}
	in := "score,label,when\n0.3,1,2026-03-29 01:30\n"
	set, err := scores.Read(strings.NewReader(in), "t.csv", scores.Options{TimeColumn: "when", TimeLayout: "2006-01-02 15:04", TimeLocation: loc})
	if err != nil {
		t.Fatal(err)
	}
	if set.Times()[0] != 1774744200 {
		t.Errorf("got %d, want 1774744200", set.Times()[0])
	}
}

func TestBadTimeAndCompareErrors(t *testing.T) {
	cases := []struct {
		name, in string
		opt      scores.Options
		sentinel error
		message  string
	}{
		{"bad time", "score,label,when\n0.3,1,2026-09-01T00:00:00Z\n0.4,0,yesterday\n", scores.Options{TimeColumn: "when"}, scores.ErrBadTime,
			`t.csv:3: column "when": invalid time "yesterday", expected a date and time such as 2026-03-27 09:29:00 or 2026-03-27T09:29Z (a time without a zone is read in the time zone given), or the layout of the times written as Go writes its reference time, Mon Jan 2 15:04:05 2006`},
		{"missing time column", "score,label\n0.3,1\n", scores.Options{TimeColumn: "when"}, scores.ErrMissingColumn, ""},
		{"bad second score", "score,label,b\n0.3,1,NaN\n", scores.Options{CompareColumn: "b"}, scores.ErrBadScore, ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := scores.Read(strings.NewReader(c.in), "t.csv", c.opt)
			if !errors.Is(err, c.sentinel) {
				t.Fatalf("got %v, want %v", err, c.sentinel)
			}
			if c.message != "" && err.Error() != c.message {
				t.Errorf("message %q\nwant    %q", err.Error(), c.message)
			}
		})
	}
	// With DropInvalid a bad second score drops the row.
	set, err := scores.Read(strings.NewReader("score,label,b\n0.3,1,x\n0.4,0,0.2\n"), "t.csv", scores.Options{CompareColumn: "b", DropInvalid: true})
	if err != nil || set.Len() != 1 || set.Dropped() != 1 {
		t.Fatalf("drop: %v, %d rows, %d dropped", err, set.Len(), set.Dropped())
	}
}
