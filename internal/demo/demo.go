// Package demo invents a validation set to explore when no data is at hand.
//
// The scenario is made up: the wagon-bearing desk of the Veldmoor Freight
// depot, a fictional rail yard, gets an alert whenever a model that reads
// axle-box vibration thinks a bearing is about to fail. Three crew shifts a
// day (06:00, 14:00, 22:00) work the alerts.
//
// The generative process, per row, with a seeded PCG source:
//
//	segment  one of three yards, with probabilities 0.5, 0.3, 0.2
//	label    a failing bearing with probability 0.05, 0.08 or 0.12 by yard
//	latent   standard normal, plus 1.9 for a failing bearing, plus 0.25 in
//	         the harbour sheds, whose sensors read high
//	score    1/(1+exp(-(1.3*latent - 3.2))), rounded to 3 decimals, so
//	         many cases tie
//	read_at  a reading time spread over the 28 days from 2026-09-01,
//	         busier by day than by night
//	id       "AX-" and a six-digit number
package demo

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"time"
)

// Defaults for the built-in data.
const (
	DefaultRows = 6000
	DefaultSeed = 7
)

// The operating assumptions that fit the scenario: the desk scores about
// 1500 readings per shift (Volume), a crew shift can work 90 alerts
// (Capacity), a wrong alert costs about 120 (a crew inspection and yard
// time) and a missed failing bearing about 1200 (a wheelset and a
// delayed train).
const (
	Volume         = 1500
	Capacity       = 90
	CostFalseAlert = 120
	CostMiss       = 1200
)

// Source is the name the built-in data goes by in reports and files.
const Source = "built-in demo (Veldmoor Freight bearing desk)"

var (
	yards     = []string{"north-yard", "quarry-line", "harbour-sheds"}
	yardShare = []float64{0.5, 0.3, 0.2}
	yardRate  = []float64{0.05, 0.08, 0.12}
	start     = time.Date(2026, 9, 1, 0, 0, 0, 0, time.UTC)
)

// Header is the first line of CSV.
const Header = "id,yard,read_at,score,label"

// ErrNotDemoData says an existing file is not demo data.
var ErrNotDemoData = errors.New("the existing file is not demo data")

// Replaceable returns nil when current, the content of an existing file,
// is demo data as CSV writes it (its first line is Header), and otherwise
// an error matching ErrNotDemoData that quotes the file's first line: the
// demo never replaces other data unasked.
func Replaceable(current []byte) error {
	first, _, _ := bytes.Cut(current, []byte("\n"))
	if string(bytes.TrimSuffix(first, []byte("\r"))) == Header {
		return nil
	}
	if len(first) > 40 {
		first = append(first[:40:40], "…"...)
	}
	return fmt.Errorf("%w (its first line is %q, expected %q)", ErrNotDemoData, first, Header)
}

// CSV returns rows of invented data as CSV with the header
// id,yard,read_at,score,label. The same rows and seed give the same bytes.
func CSV(rows int, seed uint64) []byte {
	rng := rand.New(rand.NewPCG(seed, 0x5eed))
	var buf bytes.Buffer
	buf.WriteString(Header + "\n")
	for i := 0; i < rows; i++ {
		yard := pick(rng.Float64(), yardShare)
		failing := rng.Float64() < yardRate[yard]
		latent := rng.NormFloat64()
		if failing {
			latent += 1.9
		}
		if yard == 2 {
			latent += 0.25
		}
		score := 1 / (1 + math.Exp(-(1.3*latent - 3.2)))
		label := 0
		if failing {
			label = 1
		}
		fmt.Fprintf(&buf, "AX-%06d,%s,%s,%.3f,%d\n", 100000+i, yards[yard], readingTime(rng).Format(time.RFC3339), score, label)
	}
	return buf.Bytes()
}

// pick returns the index drawn by u from the shares.
func pick(u float64, shares []float64) int {
	for i, s := range shares {
		if u < s {
			return i
		}
		u -= s
	}
	return len(shares) - 1
}

// readingTime draws a time in the 28 days from start, twice as likely in
// daytime hours (06:00 to 22:00) as at night.
func readingTime(rng *rand.Rand) time.Time {
	for {
		t := start.Add(time.Duration(rng.Int64N(int64(28 * 24 * time.Hour))))
		if h := t.Hour(); (h >= 6 && h < 22) || rng.Float64() < 0.5 {
			return t.Truncate(time.Second)
		}
	}
}
