package scores

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

// TimeLayoutError is the error of a case time in none of the forms read
// without a layout (see parseTime). Layout is a layout in the form of
// package time that would read Text, guessed from its shape, or "" when
// none was found. It matches ErrBadTime.
type TimeLayoutError struct {
	Text   string
	Layout string
}

func (e *TimeLayoutError) Error() string {
	msg := fmt.Sprintf("%v %q, expected a date and time such as 2026-03-27 09:29:00 or 2026-03-27T09:29Z (a time without a zone is read in the time zone given), or the layout of the times written as Go writes its reference time, Mon Jan 2 15:04:05 2006", ErrBadTime, e.Text)
	if e.Layout != "" {
		msg += fmt.Sprintf(": here %q", e.Layout)
	}
	return msg
}

func (e *TimeLayoutError) Is(target error) bool { return target == ErrBadTime }

// zonelessLayouts are the layouts read without one being given, besides
// RFC 3339, by the shape of the text: the date and the time apart by "T"
// or a space, with or without seconds, with or without a zone. A
// fraction of a second after the seconds is read by package time itself.
var zonelessLayouts = map[[3]bool]string{
	// {T between date and time, seconds, zone}
	{true, true, true}:    time.RFC3339,
	{true, true, false}:   "2006-01-02T15:04:05",
	{true, false, true}:   "2006-01-02T15:04Z07:00",
	{true, false, false}:  "2006-01-02T15:04",
	{false, true, true}:   "2006-01-02 15:04:05Z07:00",
	{false, true, false}:  "2006-01-02 15:04:05",
	{false, false, true}:  "2006-01-02 15:04Z07:00",
	{false, false, false}: "2006-01-02 15:04",
}

// parseTime reads a case time as unix seconds. With a layout (in the form
// of package time) it reads that layout; without, it reads a date and a
// time of day as 2026-03-27T09:29:00Z, 2026-03-27 09:29:00 and
// 2026-03-27T09:29 do, with "T" or a space between them, with or without
// seconds and fractions of a second, with a zone (Z or +01:00) or
// without. A time without a zone is read in loc (nil means UTC). A time in
// none of these forms is a *TimeLayoutError.
func parseTime(text, layout string, loc *time.Location) (int64, error) {
	text = strings.TrimSpace(text)
	if loc == nil {
		loc = time.UTC
	}
	if layout != "" {
		t, err := time.ParseInLocation(layout, text, loc)
		if err != nil {
			return 0, &valueError{sentinel: ErrBadTime, value: text, hint: "expected a time in the layout " + strconv.Quote(layout)}
		}
		return t.Unix(), nil
	}
	if len(text) >= len("2006-01-02T15:04") && (text[10] == 'T' || text[10] == ' ') {
		clock, zone := text[11:], false
		if i := strings.IndexAny(clock, "Z+-"); i >= 0 {
			clock, zone = clock[:i], true
		}
		seconds := strings.Count(clock, ":") >= 2
		if t, err := time.ParseInLocation(zonelessLayouts[[3]bool{text[10] == 'T', seconds, zone}], text, loc); err == nil {
			return t.Unix(), nil
		}
	}
	return 0, &TimeLayoutError{Text: text, Layout: guessLayout(text)}
}

// guessLayout returns a layout in the form of package time that reads
// text, found from its shape: runs of digits for the year (four digits),
// month and day (one or two, the day first unless only the month-first
// reading is a date, as in 03/27/2026), hours, minutes and seconds (apart
// by ':'), and a fraction of a second; other characters are kept. It
// returns "" when the shape is not that of a date and time or the guess
// does not read text.
func guessLayout(text string) string {
	var runs []string // digit runs and the text between them, in turn
	for i := 0; i < len(text); {
		j := i
		digits := text[i] >= '0' && text[i] <= '9'
		for j < len(text) && (text[j] >= '0' && text[j] <= '9') == digits {
			j++
		}
		runs = append(runs, text[i:j])
		i = j
	}
	var date []int // indices of the date's digit runs
	var layout []string
	clock := 0
	for i, run := range runs {
		layout = append(layout, run)
		if run[0] < '0' || run[0] > '9' {
			continue
		}
		switch {
		case i > 0 && runs[i-1] == "." && clock == 3:
			layout[i] = strings.Repeat("0", len(run))
		case i > 0 && runs[i-1] == ":" && clock > 0 && clock < 3:
			layout[i] = []string{"", "04", "05"}[clock]
			clock++
		case i+1 < len(runs) && runs[i+1] == ":" && clock == 0 && len(date) == 3:
			layout[i] = "15"
			clock = 1
		case len(date) < 3 && clock == 0:
			date = append(date, i)
		default:
			return ""
		}
	}
	if len(date) != 3 || clock < 2 {
		return ""
	}
	value := func(i int) int { n, _ := strconv.Atoi(runs[date[i]]); return n }
	// month and day write the month and day of run i, padded as it is.
	month := func(i int) string { return map[bool]string{true: "01", false: "1"}[len(runs[date[i]]) == 2] }
	day := func(i int) string { return map[bool]string{true: "02", false: "2"}[len(runs[date[i]]) == 2] }
	switch {
	case len(runs[date[0]]) == 4:
		layout[date[0]], layout[date[1]], layout[date[2]] = "2006", month(1), day(2)
	case len(runs[date[2]]) == 4 && value(0) <= 12 && value(1) > 12:
		layout[date[0]], layout[date[1]], layout[date[2]] = month(0), day(1), "2006"
	case len(runs[date[2]]) == 4:
		layout[date[0]], layout[date[1]], layout[date[2]] = day(0), month(1), "2006"
	default:
		return ""
	}
	guess := strings.Join(layout, "")
	if _, err := time.Parse(guess, text); err != nil {
		return ""
	}
	return guess
}
