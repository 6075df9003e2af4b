// Package shift counts the alerts that each real shift of the validation
// period would have produced, from the cases' timestamps and a crew shift
// schedule, so that a cut can be judged by its busy shifts and not only by
// its average queue.
//
// A schedule is a list of local start times ("06:00,14:00,22:00") in a time
// zone. A shift runs from its start to the next start by the local wall
// clock, so a shift that crosses midnight belongs to the day it starts,
// and a shift that spans a daylight-saving change is an hour longer or
// shorter in real time. Every shift from the one holding the earliest case
// to the one holding the latest counts, including shifts with no cases;
// the first and the last shift are usually covered only in part, which
// over a period of many shifts matters little.
//
// Which cases a cut flags follows the cut rule in the doc of package
// scores: the flagged cases of a cut are the first rows of the ranked set.
//
// # Scaling to production
//
// Without a volume the counts are the validation set's own (each unit of
// weight is one alert). With a production volume V per shift the set is
// taken to be a sample drawn evenly over the period: a shift's count is
// multiplied by V divided by the set's mean weight per shift, and, when
// the production base rate p differs from the validation rate b, a true
// case counts p/b and a false case (1-p)/(1-b), as in package projection.
// The mean of the scaled counts over the shifts then equals the projected
// queue per shift.
package shift

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// Errors of this package.
var (
	ErrSchedule = errors.New("malformed shift schedule")
	ErrNoTimes  = errors.New("the set has no time column")
	ErrSpan     = errors.New("the cases span too many shifts")
)

// MaxShifts bounds the shifts of one period (about 900 years of three
// shifts a day), so that a stray timestamp cannot exhaust memory.
const MaxShifts = 1_000_000

// Schedule is a crew shift schedule.
type Schedule struct {
	Starts   []int // minutes after local midnight, ascending and distinct
	Location *time.Location
}

// ParseSchedule reads start times such as "06:00,14:00,22:00" (HH:MM, 24
// hour, in any order) in loc; nil loc means UTC.
func ParseSchedule(text string, loc *time.Location) (Schedule, error) {
	if loc == nil {
		loc = time.UTC
	}
	s := Schedule{Location: loc}
	for _, part := range strings.Split(text, ",") {
		part = strings.TrimSpace(part)
		hh, mm, ok := strings.Cut(part, ":")
		h, errH := strconv.Atoi(hh)
		m, errM := strconv.Atoi(mm)
		if !ok || errH != nil || errM != nil || len(mm) != 2 || h < 0 || h > 23 || m < 0 || m > 59 {
			return Schedule{}, fmt.Errorf("%w %q: start %q, expected HH:MM such as 06:00", ErrSchedule, text, part)
		}
		s.Starts = append(s.Starts, h*60+m)
	}
	slices.Sort(s.Starts)
	for i := 1; i < len(s.Starts); i++ {
		if s.Starts[i] == s.Starts[i-1] {
			return Schedule{}, fmt.Errorf("%w %q: a start time appears twice", ErrSchedule, text)
		}
	}
	return s, nil
}

// String returns the schedule in the form ParseSchedule reads.
func (s Schedule) String() string {
	parts := make([]string, len(s.Starts))
	for i, m := range s.Starts {
		parts[i] = fmt.Sprintf("%02d:%02d", m/60, m%60)
	}
	return strings.Join(parts, ",")
}

// key numbers the shifts of all time: day number (days from 1970-01-01 by
// the local calendar) times the shifts per day, plus the shift's place.
func (s Schedule) key(unix int64) int64 {
	_, offset := time.Unix(unix, 0).In(s.Location).Zone()
	wall := unix + int64(offset) // seconds since 1970-01-01 00:00 on the local wall clock
	day := floorDiv(wall, 86400)
	minute := int((wall - day*86400) / 60)
	place := len(s.Starts) - 1
	if minute < s.Starts[0] {
		day-- // before the first start: the previous day's last shift
	} else {
		for place > 0 && s.Starts[place] > minute {
			place--
		}
	}
	return day*int64(len(s.Starts)) + int64(place)
}

func floorDiv(a, b int64) int64 {
	q := a / b
	if (a%b != 0) && ((a < 0) != (b < 0)) {
		q--
	}
	return q
}

// start returns the local start time of the shift with the given key.
func (s Schedule) start(key int64) time.Time {
	per := int64(len(s.Starts))
	day, place := key/per, key%per
	if place < 0 {
		day, place = day-1, place+per
	}
	date := time.Unix(day*86400, 0).UTC()
	m := s.Starts[place]
	return time.Date(date.Year(), date.Month(), date.Day(), m/60, m%60, 0, 0, s.Location)
}

// Assignment places every ranked row of a set in a shift of the period.
type Assignment struct {
	Schedule Schedule
	Of       []int32 // Of[i] is the shift of ranked row i, 0 the earliest
	Count    int     // shifts in the period
	first    int64   // key of shift 0
}

// Assign places the rows of set in the shifts of s. It returns ErrNoTimes
// for a set without times and ErrSpan when the period holds more than
// MaxShifts shifts. An empty set has no shifts.
func Assign(set *scores.Set, s Schedule) (Assignment, error) {
	if set.Times() == nil {
		return Assignment{}, ErrNoTimes
	}
	if len(s.Starts) == 0 {
		return Assignment{}, fmt.Errorf("%w: no start times", ErrSchedule)
	}
	a := Assignment{Schedule: s, Of: make([]int32, set.Len())}
	if set.Len() == 0 {
		return a, nil
	}
	keys := make([]int64, set.Len())
	lo, hi := int64(math.MaxInt64), int64(math.MinInt64)
	for i, t := range set.Times() {
		keys[i] = s.key(t)
		lo, hi = min(lo, keys[i]), max(hi, keys[i])
	}
	if hi-lo+1 > MaxShifts {
		return Assignment{}, fmt.Errorf("%w: %d shifts from %s to %s, at most %d", ErrSpan, hi-lo+1,
			s.start(lo).Format(time.DateOnly), s.start(hi).Format(time.DateOnly), MaxShifts)
	}
	for i, k := range keys {
		a.Of[i] = int32(k - lo)
	}
	a.Count, a.first = int(hi-lo+1), lo
	return a, nil
}

// Start returns the local start time of shift i of the period.
func (a Assignment) Start(i int) time.Time { return a.Schedule.start(a.first + int64(i)) }

// Scale converts a flagged case's weight into alerts in a production
// shift; see the package doc.
type Scale struct {
	Positive, Negative float64 // alerts per unit of weight of a true / false case
}

// ScaleFor returns the scale of set, assigned to a's shifts, under the
// assumptions: 1 per unit of weight without a volume, else as the package
// doc says. A set of no weight or no shifts gets scale 1.
func ScaleFor(set *scores.Set, a Assignment, assume projection.Assumptions) Scale {
	if !(assume.Volume > 0) || a.Count == 0 {
		return Scale{1, 1}
	}
	positives, negatives := set.Totals()
	total := positives + negatives
	if !(total > 0) {
		return Scale{1, 1}
	}
	factor := assume.Volume / (total / float64(a.Count))
	s := Scale{factor, factor}
	if b := positives / total; b != assume.BaseRate {
		s.Positive, s.Negative = 0, 0
		if b > 0 {
			s.Positive = factor * assume.BaseRate / b
		}
		if b < 1 {
			s.Negative = factor * (1 - assume.BaseRate) / (1 - b)
		}
	}
	return s
}

// Peaks are the queues of the shifts of a period at one cut.
type Peaks struct {
	Shifts int     // shifts in the period
	Mean   float64 // mean queue per shift
	P90    float64 // nearest-rank 90th percentile: 9 shifts in 10 queue at most this
	Max    float64
	// Busiest is the shift with the longest queue, the earliest among
	// equals; -1 without shifts.
	Busiest int
	// OverCapacity is the share of shifts whose queue exceeds the
	// capacity; NaN without a capacity.
	OverCapacity float64
}

// P90Rank is the 1-based rank, in ascending order, of the 90th percentile
// among n values: ceil(0.9*n), at least 1.
func P90Rank(n int) int { return max(int(math.Ceil(0.9*float64(n)-1e-9)), 1) }

// At returns the peaks when the first rows ranked rows of set (the set
// that a was assigned from) are flagged. capacity 0 means none given. With
// no shifts every figure is NaN. It panics when rows is outside
// [0, set.Len()].
func (a Assignment) At(set *scores.Set, rows int, scale Scale, capacity float64) Peaks {
	if rows < 0 || rows > set.Len() || len(a.Of) != set.Len() {
		panic(fmt.Sprintf("shift: %d flagged rows of a set of %d assigned %d rows", rows, set.Len(), len(a.Of)))
	}
	p := Peaks{Shifts: a.Count, Mean: math.NaN(), P90: math.NaN(), Max: math.NaN(), Busiest: -1, OverCapacity: math.NaN()}
	if a.Count == 0 {
		return p
	}
	queues := make([]float64, a.Count)
	for i := range rows {
		w := set.Weight(i) * scale.Negative
		if set.Labels()[i] {
			w = set.Weight(i) * scale.Positive
		}
		queues[a.Of[i]] += w
	}
	sum, over := 0.0, 0
	p.Busiest = 0
	for i, q := range queues {
		sum += q
		if q > queues[p.Busiest] {
			p.Busiest = i
		}
		if capacity > 0 && q > capacity {
			over++
		}
	}
	p.Mean = sum / float64(a.Count)
	p.Max = queues[p.Busiest]
	sorted := slices.Clone(queues)
	slices.Sort(sorted)
	p.P90 = sorted[P90Rank(a.Count)-1]
	if capacity > 0 {
		p.OverCapacity = float64(over) / float64(a.Count)
	}
	return p
}

// Counter follows the shift queues as a cut loosens row by row, to tell
// whether the 90th-percentile queue is still at most a limit. Queues only
// grow as rows are added, so once over the limit a Counter stays over.
type Counter struct {
	of      []int32
	scale   Scale
	limit   float64
	queues  []float64
	over    int // shifts whose queue exceeds limit
	allowed int // shifts that may exceed it with the 90th percentile within
}

// slack is the relative tolerance of a queue against its limit, as in
// package cutrule, so that rounding in the scale never decides a tie.
const slack = 1e-12

// NewCounter returns a Counter of a's shifts with no row added.
func (a Assignment) NewCounter(scale Scale, limit float64) *Counter {
	return &Counter{of: a.Of, scale: scale, limit: limit * (1 + slack), queues: make([]float64, a.Count), allowed: a.Count - P90Rank(a.Count)}
}

// Add adds ranked row i, a true case when positive, of weight w.
func (c *Counter) Add(i int, positive bool, w float64) {
	if positive {
		w *= c.scale.Positive
	} else {
		w *= c.scale.Negative
	}
	s := c.of[i]
	before := c.queues[s]
	c.queues[s] += w
	if before <= c.limit && c.queues[s] > c.limit {
		c.over++
	}
}

// Within reports whether the 90th-percentile queue is at most the limit.
// With no shifts it reports false.
func (c *Counter) Within() bool { return len(c.queues) > 0 && c.over <= c.allowed }

// P90 returns the current 90th-percentile queue, NaN with no shifts. It
// sorts a copy of the queues, so call it rarely.
func (c *Counter) P90() float64 {
	if len(c.queues) == 0 {
		return math.NaN()
	}
	sorted := slices.Clone(c.queues)
	slices.Sort(sorted)
	return sorted[P90Rank(len(sorted))-1]
}
