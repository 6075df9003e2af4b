package scores_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"sort"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// aggregate returns the counts table of raw score,label[,segment] rows, as
// the GROUP BY of `sill sql` would produce it, rows in a scrambled order.
func aggregate(rng *rand.Rand, raw [][3]string, withSegment bool) string {
	type key struct{ score, segment string }
	counts := map[key]*[2]int{}
	var keys []key
	for _, r := range raw {
		k := key{r[0], ""}
		if withSegment {
			k.segment = r[2]
		}
		if counts[k] == nil {
			counts[k] = &[2]int{}
			keys = append(keys, k)
		}
		if r[1] == "1" {
			counts[k][0]++
		} else {
			counts[k][1]++
		}
	}
	rng.Shuffle(len(keys), func(i, j int) { keys[i], keys[j] = keys[j], keys[i] })
	var sb strings.Builder
	if withSegment {
		sb.WriteString("score,yard,positives,negatives\n")
	} else {
		sb.WriteString("score,positives,negatives\n")
	}
	for _, k := range keys {
		c := counts[k]
		if withSegment {
			fmt.Fprintf(&sb, "%s,%s,%d,%d\n", k.score, k.segment, c[0], c[1])
		} else {
			fmt.Fprintf(&sb, "%s,%d,%d\n", k.score, c[0], c[1])
		}
	}
	return sb.String()
}

// TestCountsEqualRawRows checks, on seeded random sets with many ties, that
// a counts table gives the same curve, summary and cut-rule inputs as the
// raw rows it aggregates: every point's score, cases, TP and FP, the row
// count, totals, ROC AUC and average precision exactly; Brier score and log
// loss within countsTolerance.
func TestCountsEqualRawRows(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for trial := range 60 {
		n := 1 + rng.IntN(3000)
		distinct := 1 + rng.IntN(200)
		withSegment := trial%3 == 0
		lower := trial%4 == 1
		raw := make([][3]string, n)
		var rawText strings.Builder
		rawText.WriteString("score,label,yard\n")
		for i := range raw {
			score := fmt.Sprintf("%.3f", float64(rng.IntN(distinct))/float64(distinct))
			label := "0"
			if rng.IntN(5) == 0 {
				label = "1"
			}
			yard := []string{"north", "east", "south"}[rng.IntN(3)]
			raw[i] = [3]string{score, label, yard}
			fmt.Fprintf(&rawText, "%s,%s,%s\n", score, label, yard)
		}
		opt := scores.Options{LowerIsRiskier: lower}
		if withSegment {
			opt.SegmentColumn = "yard"
		}
		rows, err := scores.Read(strings.NewReader(rawText.String()), "raw.csv", opt)
		if err != nil {
			t.Fatal(err)
		}
		counted, err := scores.ReadCounts(strings.NewReader(aggregate(rng, raw, withSegment)), "counts.csv", opt)
		if err != nil {
			t.Fatal(err)
		}
		if !counted.CountsTable() || rows.CountsTable() || counted.Cases() != n || rows.Cases() != n {
			t.Fatalf("trial %d: counts table %v and %v, cases %d and %d, want %d", trial, counted.CountsTable(), rows.CountsTable(), counted.Cases(), rows.Cases(), n)
		}
		var want, got []curve.Point
		wantSum := curve.Walk(rows, func(p curve.Point) { want = append(want, p) })
		gotSum := curve.Walk(counted, func(p curve.Point) { got = append(got, p) })
		if len(want) != len(got) {
			t.Fatalf("trial %d: %d cuts from rows, %d from counts", trial, len(want), len(got))
		}
		for i := range want {
			w, g := want[i], got[i]
			if w.Score != g.Score || w.Cases != g.Cases || w.TP != g.TP || w.FP != g.FP || w.FN != g.FN || w.TN != g.TN {
				t.Fatalf("trial %d cut %d: rows give %+v, counts give %+v", trial, i, w, g)
			}
		}
		// Only the Brier score and log loss sum a float per row (a count of k
		// adds k*x once where the raw rows add x k times); the rest agree exactly.
		if wantSum.Rows != gotSum.Rows || wantSum.Positives != gotSum.Positives || wantSum.Negatives != gotSum.Negatives ||
			wantSum.Weighted != gotSum.Weighted || wantSum.Probabilities != gotSum.Probabilities ||
			!floatcmp.Equal(wantSum.ROCAUC, gotSum.ROCAUC) || math.Float64bits(wantSum.ROCAUC) != math.Float64bits(gotSum.ROCAUC) && !math.IsNaN(wantSum.ROCAUC) ||
			math.Float64bits(wantSum.AveragePrecision) != math.Float64bits(gotSum.AveragePrecision) && !math.IsNaN(wantSum.AveragePrecision) ||
			!floatcmp.Equal(wantSum.Brier, gotSum.Brier) || !floatcmp.Equal(wantSum.LogLoss, gotSum.LogLoss) {
			t.Fatalf("trial %d: summaries differ\nrows   %+v\ncounts %+v", trial, wantSum, gotSum)
		}
		// The cut rules pick the same cuts, top= counting cases.
		rules := []cutrule.Rule{{Kind: cutrule.Top, Value: 10, Percent: true}, {Kind: cutrule.Top, Value: float64(1 + n/3)}, {Kind: cutrule.Hit, Value: 0.5}}
		a := projection.Assumptions{BaseRate: wantSum.BaseRate, Confidence: 0.95}
		if math.IsNaN(a.BaseRate) {
			a.BaseRate = 0
		}
		pick := func(set *scores.Set) string {
			f, err := cutrule.NewFinder(rules, set, a)
			if err != nil {
				t.Fatal(err)
			}
			curve.Walk(set, f.Visit)
			var picked []string
			for _, o := range f.Outcomes() {
				picked = append(picked, fmt.Sprint(o.Met, o.Point.Score, o.Point.Cases, o.Point.TP))
			}
			return strings.Join(picked, "; ")
		}
		if w, g := pick(rows), pick(counted); w != g {
			t.Fatalf("trial %d: raw rows pick %s, counts pick %s", trial, w, g)
		}
		if withSegment {
			// The same groups with the same weighted totals.
			wantNames := append([]string(nil), rows.SegmentNames()...)
			gotNames := append([]string(nil), counted.SegmentNames()...)
			sort.Strings(wantNames)
			sort.Strings(gotNames)
			if strings.Join(wantNames, ",") != strings.Join(gotNames, ",") {
				t.Fatalf("trial %d: segments %v and %v", trial, wantNames, gotNames)
			}
			totals := func(s *scores.Set) map[string]float64 {
				m := map[string]float64{}
				for i := range s.Len() {
					if s.Labels()[i] {
						m[s.Segment(i)+"+"] += s.Weight(i)
					} else {
						m[s.Segment(i)+"-"] += s.Weight(i)
					}
				}
				return m
			}
			if fmt.Sprint(totals(rows)) != fmt.Sprint(totals(counted)) {
				t.Fatalf("trial %d: segment totals %v and %v", trial, totals(rows), totals(counted))
			}
		}
	}
}

// TestReadCountsHandWorked reads a small table whose figures were worked
// out by hand: scores 0.9 (2 true, 1 false), 0.5 (0 true, 3 false, listed
// on two rows) and 0.1 (1 true, 0 false). Ranked: 0.9 flags 3 cases, 0.5
// flags 6, 0.1 flags all 7. ROC AUC: of the 3*4 = 12 (true, false) pairs,
// the two 0.9 trues beat the 3 falses at 0.5 (6 pairs) and tie the one at
// 0.9 (2 halves), the 0.1 true loses to all: (6 + 1) / 12.
func TestReadCountsHandWorked(t *testing.T) {
	in := "score,positives,negatives\n0.5,0,2\n0.9,2,1\n0.1,1,0\n0.5,0,1\n"
	set, err := scores.ReadCounts(strings.NewReader(in), "c.csv", scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var cases []int
	var tp []float64
	sum := curve.Walk(set, func(p curve.Point) { cases = append(cases, p.Cases); tp = append(tp, p.TP) })
	if fmt.Sprint(cases) != "[3 6 7]" || fmt.Sprint(tp) != "[2 2 3]" {
		t.Errorf("cases %v tp %v, want [3 6 7] [2 2 3]", cases, tp)
	}
	if sum.Rows != 7 || sum.Positives != 3 || sum.Negatives != 4 || sum.Weighted {
		t.Errorf("summary %+v, want 7 rows, 3 true, 4 false, not weighted", sum)
	}
	if !floatcmp.Equal(sum.ROCAUC, 7.0/12) {
		t.Errorf("ROC AUC %v, want 7/12", sum.ROCAUC)
	}
}

// TestReadCountsErrors checks the messages of bad counts tables, written
// out by hand from the format in STYLE.md.
func TestReadCountsErrors(t *testing.T) {
	cases := []struct {
		name, input string
		opt         scores.Options
		sentinel    error
		message     string
	}{
		{"no negatives column", "score,positives\n0.5,1\n", scores.Options{}, scores.ErrMissingColumn,
			`c.csv:1: column "negatives": column not found in header ["score", "positives"], expected score, positives and negatives columns`},
		{"fractional count", "score,positives,negatives\n0.5,1.5,2\n", scores.Options{}, scores.ErrBadCount,
			`c.csv:2: column "positives": invalid count "1.5", expected a whole number of cases >= 0`},
		{"negative count", "score,positives,negatives\n0.5,1,2\n0.4,1,-1\n", scores.Options{}, scores.ErrBadCount,
			`c.csv:3: column "negatives": invalid count "-1", expected a whole number of cases >= 0`},
		{"unrecognised labels", "score,positives,negatives,unrecognised\n0.5,1,2,0\n0.4,1,1,3\n", scores.Options{}, scores.ErrBadCount,
			`c.csv:3: column "unrecognised": invalid count: 3 case(s) with a label that is neither a true nor a false case, expected none`},
		{"text score", "score,positives,negatives\nn/a,1,2\n", scores.Options{}, scores.ErrBadScore,
			`c.csv:2: column "score": invalid score "n/a", expected a finite number`},
		{"ragged", "score,positives,negatives\n0.5,1\n", scores.Options{}, scores.ErrRagged,
			`c.csv:2: wrong number of fields: row has 2, header has 3`},
		{"only header", "score,positives,negatives\n", scores.Options{}, scores.ErrNoRows,
			`c.csv: no data rows after the header`},
		{"label flag", "score,positives,negatives\n0.5,1,2\n", scores.Options{Positive: "yes"}, scores.ErrPositiveInCounts,
			`c.csv: a counts table counts the labels already: a positive label does not apply`},
	}
	for _, c := range cases {
		_, err := scores.ReadCounts(strings.NewReader(c.input), "c.csv", c.opt)
		if err == nil || err.Error() != c.message {
			t.Errorf("%s: error %v\nwant %s", c.name, err, c.message)
			continue
		}
		if c.sentinel != nil && !errors.Is(err, c.sentinel) {
			t.Errorf("%s: errors.Is(%v) false", c.name, c.sentinel)
		}
	}
}

// TestReadCountsDropInvalid checks that a row with a score that is not a
// number is dropped under DropInvalid with all its cases counted: 4 + 6 =
// 10, not split by label.
func TestReadCountsDropInvalid(t *testing.T) {
	in := "score,positives,negatives\n0.5,1,2\nn/a,4,6\n0.2,0,3\n"
	set, err := scores.ReadCounts(strings.NewReader(in), "c.csv", scores.Options{DropInvalid: true})
	if err != nil {
		t.Fatal(err)
	}
	if set.Dropped() != 10 || set.NoScore() != nil || set.Cases() != 6 || len(set.DroppedReasons()) != 1 {
		t.Errorf("dropped %d (%+v; %q), cases %d; want 10 dropped, not split, 6 cases",
			set.Dropped(), set.NoScore(), set.DroppedReasons(), set.Cases())
	}
}

// TestReadCountsNoScore checks the rows of cases whose score was NULL or
// not a number where they were counted, as engines export NULL (empty,
// \N, NULL): they are dropped without DropInvalid, by label, their
// unrecognised labels too, and the rest reads as the table without them.
// Expected values added up by hand: dropped 3+4+1 + 0+2 + 5+0+2 = 17, of
// them 3+0+5 = 8 true, 4+2+0 = 6 false and 1+0+2 = 3 with neither label.
func TestReadCountsNoScore(t *testing.T) {
	in := "score,yard,positives,negatives,unrecognised\n" +
		"0.5,north,1,2,0\n" +
		",north,3,4,1\n" +
		"\\N,south,0,2,0\n" +
		"0.2,south,0,3,0\n" +
		" null ,east,5,0,2\n"
	set, err := scores.ReadCounts(strings.NewReader(in), "c.csv", scores.Options{SegmentColumn: "yard"})
	if err != nil {
		t.Fatal(err)
	}
	if want := (scores.LabelCounts{Positives: 8, Negatives: 6, Neither: 3}); set.Dropped() != 17 || set.NoScore() == nil || *set.NoScore() != want || set.Cases() != 6 {
		t.Errorf("dropped %d (%+v), cases %d; want 17 (%+v), 6 cases", set.Dropped(), set.NoScore(), set.Cases(), want)
	}
	if want := `c.csv:3: column "score": 8 case(s) with no score (NULL or not a number where they were counted): 3 true, 4 false, 1 with neither label`; len(set.DroppedReasons()) != 3 || set.DroppedReasons()[0] != want {
		t.Errorf("reasons %q, want 3 beginning %q", set.DroppedReasons(), want)
	}
	same, err := scores.ReadCounts(strings.NewReader("score,yard,positives,negatives\n0.5,north,1,2\n0.2,south,0,3\n"), "c.csv", scores.Options{SegmentColumn: "yard"})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(set.Scores(), same.Scores()) || !reflect.DeepEqual(set.Labels(), same.Labels()) || !reflect.DeepEqual(set.Weights(), same.Weights()) {
		t.Errorf("kept rows %v %v %v, want %v %v %v", set.Scores(), set.Labels(), set.Weights(), same.Scores(), same.Labels(), same.Weights())
	}
}

// TestReadCountsOnlyNoScore: a counts table whose every case is on a row
// of no score (as when the warehouse's score column holds text) is
// refused with one message instead of read as a set of nothing. Counts
// added by hand: 434 + 0 + 2 = 436 true, 5566 + 3 = 5569 false, 1 with
// neither label, 6006 in all.
func TestReadCountsOnlyNoScore(t *testing.T) {
	in := "score,positives,negatives,unrecognised\n,434,5566,0\nNULL,2,3,1\n"
	_, err := scores.ReadCounts(strings.NewReader(in), "c.csv", scores.Options{})
	want := `c.csv: column "score": no row with a score: all 6006 cases are on rows with no score (436 true, 5569 false, 1 with neither label), where it was NULL or not a number when they were counted (a score column the engine stores as text counts as not a number), expected at least one row with a score`
	if err == nil || err.Error() != want || !errors.Is(err, scores.ErrNoScoredRows) {
		t.Errorf("error %v,\nwant %s", err, want)
	}
}
