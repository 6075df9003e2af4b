package segment

import (
	"flag"
	"fmt"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
)

var segmentLong = flag.Bool("segment-long", false, "the group-test simulations run 10,000 replicates instead of a few hundred (about a minute)")

// TestHolm checks Holm's adjustment against values worked by hand: p
// 0.01, 0.04, 0.03, 0.005 (m 4) in rising order 0.005, 0.01, 0.03, 0.04
// give 4·0.005 = 0.02, 3·0.01 = 0.03, 2·0.03 = 0.06, then 1·0.04 = 0.04
// held up to the 0.06 before it; 0.6 and 0.7 give 1.2 and 0.7, both 1
// once capped and held.
func TestHolm(t *testing.T) {
	cases := []struct {
		p, want []float64
	}{
		{[]float64{0.01, 0.04, 0.03, 0.005}, []float64{0.03, 0.06, 0.06, 0.02}},
		{[]float64{0.6, 0.7}, []float64{1, 1}},
		{[]float64{0.2}, []float64{0.2}},
		{nil, nil},
	}
	for _, c := range cases {
		tests := make([]Test, len(c.p))
		ptrs := make([]*Test, len(c.p))
		for i, p := range c.p {
			tests[i].P = p
			ptrs[i] = &tests[i]
		}
		holm(ptrs)
		for i := range tests {
			if !floatcmp.Equal(tests[i].AdjustedP, c.want[i]) {
				t.Errorf("p %v: adjusted %d = %v, want %v", c.p, i, tests[i].AdjustedP, c.want[i])
			}
		}
	}
}

// groupsAt draws one cut's tallies of groups of cases: group g has
// positives[g] true and negatives[g] false cases, each true case flagged
// with chance recall[g] and each false one with chance falseAlarm.
func groupsAt(rng *rand.Rand, positives, negatives []int, recall []float64, falseAlarm float64) (total tally, groups []tally, names []string) {
	groups = make([]tally, len(positives))
	names = make([]string, len(positives))
	for g := range positives {
		names[g] = fmt.Sprint("g", g)
		for range positives[g] {
			groups[g].add(true, rng.Float64() < recall[g], 1, 1)
		}
		for range negatives[g] {
			groups[g].add(false, rng.Float64() < falseAlarm, 1, 1)
		}
		total = total.plus(groups[g])
	}
	return total, groups, names
}

func repeated(n int, v float64) []float64 {
	s := make([]float64, n)
	for i := range s {
		s[i] = v
	}
	return s
}

func repeatedInt(n, v int) []int {
	s := make([]int, n)
	for i := range s {
		s[i] = v
	}
	return s
}

// randomGroups draws one cut's tallies of groups of cases drawn at
// random: each group has cases cases, each true with chance baseRate; a
// true case is flagged with chance recall, a false one with chance
// falseAlarm. The class counts of a group vary from draw to draw, as in a
// validation set sampled from production.
func randomGroups(rng *rand.Rand, groups, cases int, baseRate, recall, falseAlarm float64) (total tally, tallies []tally, names []string) {
	tallies = make([]tally, groups)
	names = make([]string, groups)
	for g := range tallies {
		names[g] = fmt.Sprint("g", g)
		for range cases {
			if rng.Float64() < baseRate {
				tallies[g].add(true, rng.Float64() < recall, 1, 1)
			} else {
				tallies[g].add(false, rng.Float64() < falseAlarm, 1, 1)
			}
		}
		total = total.plus(tallies[g])
	}
	return total, tallies, names
}

// plus is the tally of t and u together (for simulations).
func (t tally) plus(u tally) tally {
	return tally{rows: t.rows + u.rows, cases: t.cases + u.cases,
		positives: t.positives + u.positives, negatives: t.negatives + u.negatives,
		truePositive: t.truePositive + u.truePositive, falsePositive: t.falsePositive + u.falsePositive}
}

// TestGroupFlagsUnderNoDifference: when no group differs, any flag at all
// comes in about 1 - confidence of runs, whatever the number of groups
// (the old flag, a group's interval outside the overall one, came in
// 39–40% of runs with 20 groups and 85–89% with 50).
//
// Setup: 5, 20 and 50 groups of 600 cases, each case true with chance
// 10% (drawn at random, so a group's class counts vary as in a validation
// set sampled from production); at the cut every true case is flagged
// with chance 0.8 and every false one with 0.05 (wrong-alert share about
// 36%); 95% intervals, so the stated family rate is 5%. 400 replicates
// per number of groups in CI (-segment-long: 10,000), seeded PCG(16,
// groups).
//
// Seen (10,000 replicates each): 5 groups 4.81%, 20 groups 5.30%, 50
// groups 5.43%; with 400: 4.25%, 5.50%, 5.75%. A little over 5% with
// many groups: the Wilson-based tests are large-sample ones, decided far
// in the tail (at 50 groups a test rejects at 0.05/100), where they run a
// little liberal on 60 true cases. Band asserted: 2%
// to 8.5% with 400 replicates (5% within about 3 standard errors of 1.1
// points), 4% to 6.5% with 10,000 (standard error 0.22 points).
func TestGroupFlagsUnderNoDifference(t *testing.T) {
	replicates, low, high := 400, 0.02, 0.085
	if *segmentLong {
		replicates, low, high = 10000, 0.04, 0.065
	}
	for _, groups := range []int{5, 20, 50} {
		rng := rand.New(rand.NewPCG(16, uint64(groups)))
		anyFlag := 0
		for range replicates {
			total, tallies, names := randomGroups(rng, groups, 600, 0.1, 0.8, 0.05)
			if b := breakdown(total, tallies, names, 0.95); b.Outliers() > 0 {
				anyFlag++
			}
		}
		rate := float64(anyFlag) / float64(replicates)
		t.Logf("%d groups, cases drawn at random: any flag in %.2f%% of %d runs", groups, 100*rate, replicates)
		if rate < low || rate > high {
			t.Errorf("%d groups: any flag in %.2f%% of runs, want within [%.1f%%, %.1f%%]", groups, 100*rate, 100*low, 100*high)
		}
	}
}

// TestGroupFlagsFixedClassCounts: when every group's class counts are
// fixed by design (60 true and 540 false cases in each group, instead of
// drawn at random), the flag is conservative, and the whole of that comes
// from the wrong-alert share's test. Its binomial model of the flagged
// cases holds when the cases are drawn at random (given the number
// flagged, the wrong alerts among them are binomial); with the true cases
// fixed at 60 and recall 0.8 the hits vary less than that model says
// (variance 60·0.8·0.2 = 9.6 beside about 48 for a Poisson-like count), so
// the wrong-alert share varies about two thirds as much as the test
// assumes, and its tests reject about a fifth as often as stated. The
// recall test conditions on the group's true cases and keeps its level.
//
// Setup: as TestGroupFlagsUnderNoDifference with the class counts fixed
// (60 and 540 per group), seeded PCG(16, groups). 400 replicates per
// number of groups in CI (-segment-long: 10,000).
//
// Seen (10,000 replicates each; before the random-draw test above was
// added, the only setup): 5 groups 2.8%, 20 groups 2.8%, 50 groups 3.1%;
// with 400: 2.8%, 3.0%, 2.8%. Of runs of 4,000 (5 groups) the recall tests
// alone flagged 2.3% and the wrong-alert tests 0.5%, each wrong-alert test
// at 0.105% against its Bonferroni share of 0.5%. Band asserted: 0.5% to
// 5% with 400 replicates, 2% to 4.5% with 10,000: at or below the stated
// rate.
func TestGroupFlagsFixedClassCounts(t *testing.T) {
	replicates, low, high := 400, 0.005, 0.05
	if *segmentLong {
		replicates, low, high = 10000, 0.02, 0.045
	}
	for _, groups := range []int{5, 20, 50} {
		rng := rand.New(rand.NewPCG(16, uint64(groups)))
		anyFlag := 0
		for range replicates {
			total, tallies, names := groupsAt(rng, repeatedInt(groups, 60), repeatedInt(groups, 540), repeated(groups, 0.8), 0.05)
			if b := breakdown(total, tallies, names, 0.95); b.Outliers() > 0 {
				anyFlag++
			}
		}
		rate := float64(anyFlag) / float64(replicates)
		t.Logf("%d groups, class counts fixed: any flag in %.2f%% of %d runs", groups, 100*rate, replicates)
		if rate < low || rate > high {
			t.Errorf("%d groups: any flag in %.2f%% of runs, want within [%.1f%%, %.1f%%]", groups, 100*rate, 100*low, 100*high)
		}
	}
}

// TestGroupFlagsPower: a real gap is found. Setup: two halves of 6,000
// cases, each 300 true and 2,700 false (base rate 10%), recall 0.87 in one
// and 0.73 in the other, false alarms 5% in both; found when the recall
// test flags the halves. 200 replicates in CI (-segment-long: 10,000),
// seeded.
//
// Seen (10,000 replicates): found in 96.8% of runs; with 200: 96.0%.
// Band asserted: at least 90% (the old flag found it in 16%; 96.8% less
// about 4.5 standard errors of 1.25 points at 200 replicates).
func TestGroupFlagsPower(t *testing.T) {
	replicates := 200
	if *segmentLong {
		replicates = 10000
	}
	rng := rand.New(rand.NewPCG(16, 2))
	found := 0
	for range replicates {
		total, tallies, names := groupsAt(rng, []int{300, 300}, []int{2700, 2700}, []float64{0.87, 0.73}, 0.05)
		b := breakdown(total, tallies, names, 0.95)
		if b.Segments[0].RecallTest.AdjustedP < 0.05 && b.Segments[1].RecallTest.AdjustedP < 0.05 {
			found++
		}
	}
	rate := float64(found) / float64(replicates)
	t.Logf("gap 0.87 against 0.73: found in %.1f%% of %d runs", 100*rate, replicates)
	if rate < 0.90 {
		t.Errorf("found in %.1f%% of runs, want at least 90%%", 100*rate)
	}
}
