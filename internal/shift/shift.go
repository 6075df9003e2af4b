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
// to the one holding the latest counts, including shifts with no cases,
// by the share of it the period covers (Assignment.Cover): the first and
// the last shift in part, a run of empty shifts that the set's rate says
// cannot be chance (GapCases) not at all.
//
// Which cases a cut flags follows the cut rule in the doc of package
// scores: the flagged cases of a cut are the first rows of the ranked set.
//
// # Scaling to production
//
// Without a volume the counts are the validation set's own (each unit of
// weight is one alert). With a production volume V per shift the set is
// taken to be a sample drawn evenly over the period: a shift's count is
// multiplied by V divided by the set's weight per covered shift, and, when
// the production base rate p differs from the validation rate b, a true
// case counts p/b and a false case (1-p)/(1-b), as in package projection.
// The scaled counts over the covered time then give the projected queue
// per shift.
//
// # The shift-peak model
//
// A validation set thinned over many shifts holds few cases a shift, so
// its shifts differ mostly by counting noise: scaled up to production's
// volume, that noise looks like busy and quiet shifts that production
// will not have. The model keeps apart the two sources of spread.
//
// Between shifts. Each shift k of the period has a covered share e_k of
// its length (see Assignment.Cover) and a sum X_k (its scaled alerts at a
// cut, or its scaled cases). Were the expected sum the same in every
// shift, X_k would differ from e_k*m (m the sum per covered shift) by
// sampling alone, with variance about the sum v_k of the squared scaled
// weights of its cases (a Poisson count of weighted cases). Cochran's
// statistic Q = sum (X_k - e_k*m)^2 / e_k then has expectation
// lambda2*(K-1) with lambda2 = sum v_k / sum e_k over the K covered
// shifts; a real spread of the expected sum, of variance (tau*m)^2,
// adds tau^2*m^2*(E - sum e_k^2/E), E = sum e_k. The method-of-moments
// estimate tau^2 = (Q - lambda2*(K-1)) / (m^2*(E - sum e_k^2/E)), floored
// at zero, is DerSimonian and Laird's (1986, "Meta-analysis in clinical
// trials", Controlled Clinical Trials) with the shifts as the studies and
// weights e_k; tau is the relative spread of the per-shift sum beyond
// what sampling gives, capped at MaxSpread. The shifts are told apart
// from noise when Q/lambda2 exceeds the 97.5th percentile of chi-square
// with K-1 degrees of freedom (Cochran's test of homogeneity at 2.5%,
// Wilson and Hilferty's approximation to the quantile). The estimate is
// made twice: over the flagged cases (the alerts) and over all cases (the
// cases per shift). The spread of the expected queue that the model uses
// (QueueSpread) is the larger of the two, each counted only when its test
// tells the shifts apart, so that the two tests together keep a 5% chance
// of taking noise for a spread: the cases, many more than the alerts,
// show a swing in volume sooner, and the queue follows the volume unless
// the alert rate falls as the volume rises. With few cases a shift
// neither test can tell real differences from noise, and the spread used
// is none.
//
// Production's shift. A production shift scores V cases (the volume
// given, else the set's own weight per covered shift). Its expected alert
// rate is the projected rate pi = m/V times a multiplier M of mean 1 and
// relative spread tau (lognormal, over 40 nodes of equal probability),
// and its queue given M is Binomial(V, min(1, pi*M)): production's own
// counting noise at that volume. With no spread the queue is Binomial(V,
// pi). The p90 is the least whole number of alerts that 9 shifts in 10
// stay at or below; the share of shifts over a capacity C is
// P(queue > C). The queue90 rule uses the same p90.
//
// The spread of the alert rate, (1+tau^2)/(1+tau_cases^2) - 1 floored at
// zero (taking rate and volume as independent), says where the spread of
// the queue comes from. The sample's own scaled counts per shift stay
// beside the model's figures (Peaks.Sample, Peaks.Max), labelled so.
package shift

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/sill-tool/sill/internal/format"
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
	// Cover is the share of each shift's length that the period covers:
	// 1 inside the period, less for the first and the last shift (the
	// period runs from one mean gap between cases before the first case
	// to one after the last, the usual unbiased estimate of the ends of
	// an even spread), 0 in a gap (GapCases).
	Cover []float64
	// Gaps is the number of shifts left out as gaps in the data.
	Gaps  int
	first int64 // key of shift 0
}

// GapCases is the expected cases that a run of shifts with none must
// have lacked, at the set's mean rate over the covered time, to be taken
// as a gap in the data rather than quiet shifts: the chance of seeing no
// case by chance is then below e^-20, about 2 in a billion.
const GapCases = 20

// Covered returns the covered time of the period in shifts' worth.
func (a Assignment) Covered() float64 {
	sum := 0.0
	for _, c := range a.Cover {
		sum += c
	}
	return sum
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
	a.cover(set)
	return a, nil
}

// cover sets a.Cover: the covered share of each shift, and gaps.
func (a *Assignment) cover(set *scores.Set) {
	times := set.Times()
	tmin, tmax := slices.Min(times), slices.Max(times)
	a.Cover = make([]float64, a.Count)
	if tmax == tmin {
		for i := range a.Cover {
			a.Cover[i] = 1
		}
		return
	}
	gap := float64(tmax-tmin) / float64(len(times)-1)
	from, to := float64(tmin)-gap, float64(tmax)+gap
	for i := range a.Cover {
		start, end := float64(a.Start(i).Unix()), float64(a.Start(i+1).Unix())
		if length := end - start; length > 0 {
			a.Cover[i] = max(min(end, to)-max(start, from), 0) / length
		}
	}
	cases := make([]int, a.Count)
	for _, k := range a.Of {
		cases[k]++
	}
	rate := float64(len(times)) / a.Covered()
	for i := 0; i < a.Count; {
		if cases[i] > 0 {
			i++
			continue
		}
		j, expected := i, 0.0
		for ; j < a.Count && cases[j] == 0; j++ {
			expected += a.Cover[j] * rate
		}
		if expected >= GapCases {
			for k := i; k < j; k++ {
				a.Cover[k] = 0
				a.Gaps++
			}
		}
		i = j
	}
}

// Start returns the local start time of shift i of the period.
func (a Assignment) Start(i int) time.Time { return a.Schedule.start(a.first + int64(i)) }

// Scale converts a flagged case's weight into alerts in a production
// shift; see the package doc.
type Scale struct {
	Positive, Negative float64 // alerts per unit of weight of a true / false case
	// Volume is the cases of a shift the queues are counted at: the
	// production volume given, else the set's own weight per covered
	// shift; 0 without shifts.
	Volume float64
}

// ScaleFor returns the scale of set, assigned to a's shifts, under the
// assumptions: 1 per unit of weight without a volume, else as the package
// doc says. A set of no weight or no shifts gets scale 1.
func ScaleFor(set *scores.Set, a Assignment, assume projection.Assumptions) Scale {
	positives, negatives := set.Totals()
	total := positives + negatives
	covered := a.Covered()
	if !(total > 0) || !(covered > 0) {
		return Scale{Positive: 1, Negative: 1}
	}
	own := total / covered
	if !(assume.Volume > 0) {
		return Scale{Positive: 1, Negative: 1, Volume: own}
	}
	factor := assume.Volume / own
	s := Scale{Positive: factor, Negative: factor, Volume: assume.Volume}
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

// Peaks are the queues of the shifts of a period at one cut: the mean,
// the p90 and the share over capacity of production's shifts under the
// shift-peak model (see the package doc), beside the sample's own scaled
// counts.
type Peaks struct {
	Shifts int // shifts in the period
	// Mean is the mean queue per shift: the scaled alerts over the
	// covered time, the projected queue.
	Mean float64
	// P90 is the model's 90th percentile: 9 production shifts in 10
	// queue at most this many alerts.
	P90 float64
	// OverCapacity is the model's share of shifts whose queue exceeds the
	// capacity; NaN without a capacity.
	OverCapacity float64
	// Max is the sample's longest scaled queue of a real shift, and
	// Busiest that shift, the earliest among equals; -1 without shifts.
	Max     float64
	Busiest int
	// Sample are the sample's own scaled counts.
	Sample SampleQueues
	// Model is what the model's figures rest on.
	Model Model
}

// WholeCover is the covered share from which a shift counts among the
// sample's whole shifts (SampleQueues).
const WholeCover = 0.9

// SampleQueues are the figures of the set's own scaled counts per shift,
// over the shifts the period covers at least WholeCover of (all shifts
// when none is):
// mostly the sample's counting noise times the scale when the set holds
// few cases a shift.
type SampleQueues struct {
	Whole        int     // shifts counted
	P90          float64 // nearest-rank 90th percentile
	OverCapacity float64 // share over the capacity; NaN without one
}

// Model is what the model's figures at one cut rest on.
type Model struct {
	// Volume is the cases of a production shift (Scale.Volume) and Rate
	// the projected alert rate, Mean/Volume.
	Volume, Rate float64
	// Queue is the spread of the alerts per shift between shifts beyond
	// sampling, Cases that of the cases per shift, and Spread the relative
	// spread of the expected queue that the figures use (QueueSpread).
	Queue, Cases Spread
	Spread       float64
	// RateSpread is the relative spread of the alert rate between shifts,
	// (1+Spread^2)/(1+Cases.Used()^2) - 1 floored at zero, square-rooted
	// (the two taken as independent).
	RateSpread float64
	// Flagged is the set's own flagged weight per covered shift.
	Flagged float64
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
	queues := make([]float64, a.Count)
	sumSq, flagged := 0.0, 0.0
	for i := range rows {
		x := alertsOf(set, i, scale)
		queues[a.Of[i]] += x
		sumSq += x * x
		flagged += set.Weight(i)
	}
	return a.peaks(queues, sumSq, flagged, a.CaseSpread(set, scale), scale, capacity)
}

// alertsOf is what ranked row i adds to its shift's queue.
func alertsOf(set *scores.Set, i int, scale Scale) float64 {
	if set.Labels()[i] {
		return set.Weight(i) * scale.Positive
	}
	return set.Weight(i) * scale.Negative
}

// CaseSpread returns the spread of the scaled cases per shift of set
// between the shifts of a, beyond sampling.
func (a Assignment) CaseSpread(set *scores.Set, scale Scale) Spread {
	if a.Count == 0 {
		return Spread{}
	}
	sums := make([]float64, a.Count)
	sumSq := 0.0
	for i := range set.Len() {
		x := alertsOf(set, i, scale)
		sums[a.Of[i]] += x
		sumSq += x * x
	}
	return dispersion(sums, a.Cover, sumSq)
}

// peaks returns the peaks of the shift queues queues, whose alerts'
// squares sum to sumSq, from flagged weight of the set.
func (a Assignment) peaks(queues []float64, sumSq, flagged float64, cases Spread, scale Scale, capacity float64) Peaks {
	p := Peaks{Shifts: a.Count, Mean: math.NaN(), P90: math.NaN(), Max: math.NaN(), Busiest: -1, OverCapacity: math.NaN(),
		Sample: SampleQueues{P90: math.NaN(), OverCapacity: math.NaN()}}
	covered := a.Covered()
	if a.Count == 0 || !(covered > 0) {
		return p
	}
	sum := 0.0
	p.Busiest = 0
	whole := make([]float64, 0, a.Count)
	for i, q := range queues {
		sum += q
		if q > queues[p.Busiest] {
			p.Busiest = i
		}
		if a.Cover[i] >= WholeCover {
			whole = append(whole, q)
		}
	}
	if len(whole) == 0 {
		whole = append(whole, queues...)
	}
	p.Mean = sum / covered
	p.Max = queues[p.Busiest]
	slices.Sort(whole)
	p.Sample.Whole = len(whole)
	p.Sample.P90 = whole[P90Rank(len(whole))-1]
	if capacity > 0 {
		over := len(whole) - sort.SearchFloat64s(whole, math.Nextafter(capacity, math.Inf(1)))
		p.Sample.OverCapacity = float64(over) / float64(len(whole))
	}
	p.Model = Model{Volume: scale.Volume, Queue: dispersion(queues, a.Cover, sumSq), Cases: cases, Flagged: flagged / covered, Rate: math.NaN()}
	p.Model.Spread = QueueSpread(p.Model.Queue, cases)
	p.Model.RateSpread = math.Sqrt(max((1+p.Model.Spread*p.Model.Spread)/(1+cases.Used()*cases.Used())-1, 0))
	if scale.Volume > 0 {
		p.Model.Rate = p.Mean / scale.Volume
		q := NewQueue(scale.Volume, p.Model.Rate, p.Model.Spread)
		p.P90 = q.Quantile(0.9)
		if capacity > 0 {
			p.OverCapacity = 1 - q.CDF(capacity)
		}
	}
	return p
}

// Counter follows the shift queues as a cut loosens row by row, to tell
// whether the model's 90th-percentile queue is still at most a limit.
type Counter struct {
	a      Assignment
	scale  Scale
	limit  float64
	queues []float64
	// Running sums over the shifts of some cover: alerts, alerts squared
	// over cover (Cochran's Q), and squared alerts of the rows.
	sum, sumOverCover, sumSq float64
	covered, coveredSq       float64
	shifts                   int
	cases                    Spread
	// The highest alert rate within the limit at the spread last seen
	// twice in a row (the p90 grows with the rate at a fixed spread), so
	// that a walk over many cuts at one spread needs one search.
	lastSpread, critical float64
	seenSpread, known    bool
}

// slack is the relative tolerance of a queue against its limit, as in
// package cutrule, so that rounding in the scale never decides a tie.
const slack = 1e-12

// NewCounter returns a Counter of a's shifts with no row added; cases is
// the spread of the cases per shift (CaseSpread).
func (a Assignment) NewCounter(scale Scale, cases Spread, limit float64) *Counter {
	c := &Counter{a: a, scale: scale, cases: cases, limit: limit * (1 + slack), queues: make([]float64, a.Count)}
	for _, e := range a.Cover {
		if e > 0 {
			c.covered += e
			c.coveredSq += e * e
			c.shifts++
		}
	}
	return c
}

// Add adds ranked row i, a true case when positive, of weight w.
func (c *Counter) Add(i int, positive bool, w float64) {
	if positive {
		w *= c.scale.Positive
	} else {
		w *= c.scale.Negative
	}
	s := c.a.Of[i]
	e := c.a.Cover[s]
	before := c.queues[s]
	c.queues[s] += w
	c.sum += w
	c.sumSq += w * w
	if e > 0 {
		c.sumOverCover += (c.queues[s]*c.queues[s] - before*before) / e
	}
}

// queue returns the model's queue at the rows added so far.
func (c *Counter) queue() Queue {
	alerts := spreadOf(c.sum, c.sumOverCover, c.sumSq, c.covered, c.coveredSq, c.shifts)
	return NewQueue(c.scale.Volume, c.sum/c.covered/c.scale.Volume, QueueSpread(alerts, c.cases))
}

// Within reports whether the model's 90th-percentile queue is at most
// the limit. With no shifts it reports false.
func (c *Counter) Within() bool {
	if c.shifts == 0 || !(c.covered > 0) || !(c.scale.Volume > 0) {
		return false
	}
	// The p90 is at least the mean's whole part (a binomial's median is,
	// and the multiplier's p90 is above 1 up to MaxSpread): past the
	// limit by a whole alert no distribution is needed.
	if mean := c.sum / c.covered; math.Floor(mean) > c.limit {
		return false
	}
	q := c.queue()
	if !c.seenSpread || q.Spread != c.lastSpread {
		c.seenSpread, c.known, c.lastSpread = true, false, q.Spread
		return q.CDF(c.limit) >= 0.9
	}
	if !c.known {
		c.critical, c.known = criticalRate(q.Volume, q.Spread, c.limit), true
	}
	if math.Abs(q.Rate-c.critical) > 1e-9 {
		return q.Rate < c.critical
	}
	return q.CDF(c.limit) >= 0.9
}

// criticalRate is the alert rate at which the queue of volume cases and
// the spread given has CDF(limit) = 0.9, by bisection: below it 9 shifts
// in 10 stay within the limit.
func criticalRate(volume, spread, limit float64) float64 {
	lo, hi := 0.0, 1.0
	if NewQueue(volume, hi, spread).CDF(limit) >= 0.9 {
		return math.Inf(1)
	}
	for range 60 {
		mid := (lo + hi) / 2
		if NewQueue(volume, mid, spread).CDF(limit) >= 0.9 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// P90 returns the model's 90th-percentile queue at the rows added so far,
// NaN with no shifts.
func (c *Counter) P90() float64 {
	if c.shifts == 0 || !(c.covered > 0) || !(c.scale.Volume > 0) {
		return math.NaN()
	}
	return c.queue().Quantile(0.9)
}

// Basis says in plain words what the model's p90 at m rests on
// (format.PeakBasis).
func (m Model) Basis() string {
	return format.PeakBasis(m.Volume, m.Flagged, m.Spread, m.Cases.Used(), m.RateSpread, m.Queue.Distinct || m.Cases.Distinct)
}
