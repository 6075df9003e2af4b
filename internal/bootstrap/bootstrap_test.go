package bootstrap_test

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/quantile"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

// normalSet draws positives from N(shift,1) and negatives from N(0,1).
func normalSet(t testing.TB, rng *rand.Rand, positives, negatives int, shift float64) *scores.Set {
	t.Helper()
	sc := make([]float64, 0, positives+negatives)
	labels := make([]bool, 0, positives+negatives)
	for range positives {
		sc, labels = append(sc, rng.NormFloat64()+shift), append(labels, true)
	}
	for range negatives {
		sc, labels = append(sc, rng.NormFloat64()), append(labels, false)
	}
	set, err := scores.New(sc, labels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

func rules(t testing.TB, specs ...string) []cutrule.Rule {
	t.Helper()
	var out []cutrule.Rule
	for _, s := range specs {
		r, err := cutrule.Parse(s)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, r)
	}
	return out
}

var assume = projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}

// TestReproducible: the same seed gives the same result whatever the
// number of workers; another seed gives another.
func TestReproducible(t *testing.T) {
	set := normalSet(t, rand.New(rand.NewPCG(1, 2)), 60, 140, 1.2)
	rs := rules(t, "hit=0.8", "wrong=0.4", "top=10%", "base")
	run := func(seed uint64, workers int) bootstrap.Result {
		res, err := bootstrap.Run(context.Background(), set, rs, assume, bootstrap.Options{Replicates: 150, Seed: seed, Workers: workers, BandCuts: 20})
		if err != nil {
			t.Fatal(err)
		}
		return res
	}
	one, two, again, other := run(42, 1), run(42, 2), run(42, 2), run(43, 2)
	same := func(a, b bootstrap.Result) bool {
		for i := range a.Spreads {
			x, y := a.Spreads[i], b.Spreads[i]
			if x.Met != y.Met || !floatcmp.Equal(x.Score[0], y.Score[0]) || !floatcmp.Equal(x.Score[1], y.Score[1]) || !floatcmp.Equal(x.FlaggedShare[0], y.FlaggedShare[0]) || !floatcmp.Equal(x.FlaggedShare[1], y.FlaggedShare[1]) {
				return false
			}
		}
		for j := range a.Band {
			if !floatcmp.Equal(a.Band[j].Recall[0], b.Band[j].Recall[0]) || !floatcmp.Equal(a.Band[j].FalseDiscoveryRate[1], b.Band[j].FalseDiscoveryRate[1]) {
				return false
			}
		}
		return len(a.Band) == len(b.Band)
	}
	if !same(one, two) || !same(two, again) {
		t.Error("same seed, different result")
	}
	if same(one, other) {
		t.Error("another seed gave the very same result")
	}
	if len(one.Band) != 20 {
		t.Errorf("band of %d cuts, want 20", len(one.Band))
	}
	for _, s := range one.Spreads {
		if s.Met != 150 || !(s.Score[0] <= s.Score[1]) || !(s.FlaggedShare[0] <= s.FlaggedShare[1]) {
			t.Errorf("%s: %+v", s.Rule, s)
		}
	}
	// The band is ordered: looser cuts catch more.
	for j := 1; j < len(one.Band); j++ {
		if one.Band[j].Recall[1] < one.Band[j-1].Recall[1] {
			t.Errorf("band recall falls at cut %d", j)
		}
	}
}

// longCoverage runs the coverage simulation with more sets: go test
// ./internal/bootstrap -run Coverage -coverage.long.
var longCoverage = flag.Bool("coverage.long", false, "run the bootstrap coverage simulation with 2000 sets")

// randomSample draws n cases of a population with half true cases, true
// cases' scores N(shift,1) and false cases' N(0,1): the class mix varies
// from sample to sample, as in a random sample.
func randomSample(t testing.TB, rng *rand.Rand, n int, shift float64) *scores.Set {
	t.Helper()
	sc, labels := make([]float64, n), make([]bool, n)
	for i := range n {
		labels[i] = rng.IntN(2) == 1
		sc[i] = rng.NormFloat64()
		if labels[i] {
			sc[i] += shift
		}
	}
	set, err := scores.New(sc, labels, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// TestCoverage: a simulation that the 5th-95th percentile bands of the
// hit=0.8 rule (where its cut lands, the flagged share and the wrong-alert
// share there) cover the population's figures about 90% of the time when
// the set is a random sample and the bootstrap resamples it as one (the
// default design). The population has half true cases, N(1,1), and half
// false cases, N(0,1); its cut for a hit share of 0.8 is the 20th
// percentile of N(1,1), c = 1 + Φ⁻¹(0.2); the flagged share there is
// 0.4 + 0.5·(1 - Φ(c)) and the wrong-alert share 0.5·(1 - Φ(c)) divided
// by that (textbook normal figures, common practice, no source).
// Seeded: 200 random samples of 200 cases, 200 replicates each (2000
// samples with -coverage.long).
func TestCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	phi := func(x float64) float64 { return 0.5 * (1 + math.Erf(x/math.Sqrt2)) }
	trueCut := 1 + math.Sqrt2*math.Erfinv(2*0.2-1)
	falseFlagged := 0.5 * (1 - phi(trueCut))
	trueShare := 0.4 + falseFlagged
	trueWrong := falseFlagged / trueShare
	rng := rand.New(rand.NewPCG(2026, 12))
	sets := 200
	if *longCoverage {
		sets = 2000
	}
	coveredCut, coveredShare, coveredWrong := 0, 0, 0
	for s := range sets {
		set := randomSample(t, rng, 200, 1)
		res, err := bootstrap.Run(context.Background(), set, rules(t, "hit=0.8"), assume, bootstrap.Options{Replicates: 200, Seed: uint64(s)})
		if err != nil {
			t.Fatal(err)
		}
		sp := res.Spreads[0]
		if sp.Score[0] <= trueCut && trueCut <= sp.Score[1] {
			coveredCut++
		}
		if sp.FlaggedShare[0] <= trueShare && trueShare <= sp.FlaggedShare[1] {
			coveredShare++
		}
		if sp.FalseDiscoveryRate[0] <= trueWrong && trueWrong <= sp.FalseDiscoveryRate[1] {
			coveredWrong++
		}
	}
	// Binomial sd of a 90% coverage over 200 sets is about 2.1 points; the
	// bounds are roughly three of them.
	for name, covered := range map[string]int{"cut score": coveredCut, "flagged share": coveredShare, "wrong-alert share": coveredWrong} {
		rate := float64(covered) / float64(sets)
		t.Logf("%s coverage %.3f over %d samples (nominal 0.90)", name, rate, sets)
		if rate < 0.83 || rate > 0.97 {
			t.Errorf("%s: coverage %.3f, expected near 0.90", name, rate)
		}
	}
}

// TestCellsAgreeWithRowDraws: drawing counts of each distinct score and
// label (what Run does) gives the same distribution of a rule's cut as
// drawing rows with replacement and ranking them again, which this test
// does by hand with scores.New, the cut finder and curve.Walk (the
// textbook case bootstrap, common practice, no source). One set of 400
// cases with scores on 50 values (heavy ties), 3000 replicates each way;
// the 5th, 50th and 95th percentiles of the hit=0.8 cut and of the
// wrong-alert share there agree within a tolerance of about four times
// their Monte Carlo noise, under both designs.
func TestCellsAgreeWithRowDraws(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	rng := rand.New(rand.NewPCG(11, 12))
	const n = 400
	sc, labels := make([]float64, n), make([]bool, n)
	for i := range n {
		labels[i] = rng.Float64() < 0.3
		x := rng.NormFloat64()
		if labels[i] {
			x += 1.2
		}
		sc[i] = math.Round(x*8) / 8
	}
	set, err := scores.New(append([]float64(nil), sc...), append([]bool(nil), labels...), nil, false)
	if err != nil {
		t.Fatal(err)
	}
	rs := rules(t, "hit=0.8")
	const replicates = 3000
	for _, design := range []bootstrap.Design{bootstrap.Ordinary, bootstrap.WithinClass} {
		var byRows, byRowsWrong []float64
		for range replicates {
			var rsc []float64
			var rl []bool
			pick := func(from []int) {
				for range from {
					i := from[rng.IntN(len(from))]
					rsc, rl = append(rsc, sc[i]), append(rl, labels[i])
				}
			}
			var all, positives, negatives []int
			for i := range n {
				all = append(all, i)
				if labels[i] {
					positives = append(positives, i)
				} else {
					negatives = append(negatives, i)
				}
			}
			if design == bootstrap.WithinClass {
				pick(positives)
				pick(negatives)
			} else {
				pick(all)
			}
			rep, err := scores.New(rsc, rl, nil, false)
			if err != nil {
				t.Fatal(err)
			}
			f, err := cutrule.NewFinder(rs, rep, assume)
			if err != nil {
				t.Fatal(err)
			}
			curve.Walk(rep, f.Visit)
			if o := f.Outcomes()[0]; o.Met {
				byRows, byRowsWrong = append(byRows, o.Point.Score), append(byRowsWrong, o.Point.FalseDiscoveryRate())
			}
		}
		res, err := bootstrap.Run(context.Background(), set, rs, assume, bootstrap.Options{Replicates: replicates, Seed: 3, Design: design})
		if err != nil {
			t.Fatal(err)
		}
		sort.Float64s(byRows)
		sort.Float64s(byRowsWrong)
		sp := res.Spreads[0]
		for _, c := range []struct {
			name      string
			got, want float64
			tolerance float64
		}{
			{"cut p05", sp.Score[0], quantile.Linear(byRows, bootstrap.Low), 0.13},
			{"cut p95", sp.Score[1], quantile.Linear(byRows, bootstrap.High), 0.13},
			{"wrong-alert share p05", sp.FalseDiscoveryRate[0], quantile.Linear(byRowsWrong, bootstrap.Low), 0.02},
			{"wrong-alert share p95", sp.FalseDiscoveryRate[1], quantile.Linear(byRowsWrong, bootstrap.High), 0.02},
		} {
			t.Logf("%s %s: cells %.4f, rows %.4f", design, c.name, c.got, c.want)
			if math.Abs(c.got-c.want) > c.tolerance {
				t.Errorf("%s %s: cells %.4f, rows %.4f, want within %.2f", design, c.name, c.got, c.want, c.tolerance)
			}
		}
	}
}

func TestErrorsAndProgress(t *testing.T) {
	oneClass, _ := scores.New([]float64{0.1, 0.2}, []bool{true, true}, nil, false)
	if _, err := bootstrap.Run(context.Background(), oneClass, rules(t, "hit=0.5"), assume, bootstrap.Options{Replicates: 10}); !errors.Is(err, bootstrap.ErrNoClass) {
		t.Errorf("one class: %v", err)
	}
	empty, _ := scores.New(nil, nil, nil, false)
	if _, err := bootstrap.Run(context.Background(), empty, nil, assume, bootstrap.Options{Replicates: 10}); !errors.Is(err, bootstrap.ErrNoClass) {
		t.Errorf("empty: %v", err)
	}
	set := normalSet(t, rand.New(rand.NewPCG(3, 3)), 20, 20, 1)
	if _, err := bootstrap.Run(context.Background(), set, nil, assume, bootstrap.Options{}); !errors.Is(err, bootstrap.ErrReplicates) {
		t.Errorf("no replicates: %v", err)
	}
	if _, err := bootstrap.Run(context.Background(), set, rules(t, "queue=5"), assume, bootstrap.Options{Replicates: 3}); !errors.Is(err, cutrule.ErrNeedsVolume) {
		t.Errorf("queue without volume: %v", err)
	}
	calls, last := 0, 0
	_, err := bootstrap.Run(context.Background(), set, rules(t, "hit=0.5"), assume, bootstrap.Options{Replicates: 30, Workers: 2, Progress: func(done int) { calls++; last = max(last, done) }})
	if err != nil || calls != 30 || last != 30 {
		t.Errorf("progress: %d calls, last %d, %v", calls, last, err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := bootstrap.Run(ctx, set, rules(t, "hit=0.5"), assume, bootstrap.Options{Replicates: 30}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
	// A rule never met has NaN percentiles and Met 0.
	res, err := bootstrap.Run(context.Background(), set, rules(t, "score=100"), assume, bootstrap.Options{Replicates: 5})
	if err != nil || res.Spreads[0].Met != 0 || !math.IsNaN(res.Spreads[0].Score[0]) {
		t.Errorf("unmet: %+v %v", res.Spreads, err)
	}
}

// BenchmarkDemoSize resamples a set of the demo's size (6000 rows) with
// the three default rules, on every core.
func BenchmarkDemoSize(b *testing.B) {
	set := normalSet(b, rand.New(rand.NewPCG(5, 5)), 430, 5570, 1.9)
	rs := rules(b, "base", "hit=0.8", "wrong=0.333")
	for b.Loop() {
		if _, err := bootstrap.Run(context.Background(), set, rs, assume, bootstrap.Options{Replicates: 200, Seed: 1, BandCuts: 100}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestDescribe: the plain words follow the larger ratio of the
// percentiles of flagged share and hit share, hand-picked around the 1.25
// and 1.6 boundaries.
func TestDescribe(t *testing.T) {
	steadyRecall := [2]float64{0.8, 0.8}
	nan := [2]float64{math.NaN(), math.NaN()}
	cases := []struct {
		s    bootstrap.Spread
		want string
	}{
		{bootstrap.Spread{Met: 100, FlaggedShare: [2]float64{0.10, 0.12}, Recall: steadyRecall}, "steady: the workload varies by a factor of 1.20 between the 5th and 95th percentile"},
		{bootstrap.Spread{Met: 100, FlaggedShare: [2]float64{0.10, 0.15}, Recall: steadyRecall}, "fairly steady: the workload varies by a factor of 1.50 between the 5th and 95th percentile"},
		{bootstrap.Spread{Met: 100, FlaggedShare: [2]float64{0.10, 0.20}, Recall: steadyRecall}, "unsteady: the workload varies by a factor of 2.00 between the 5th and 95th percentile"},
		{bootstrap.Spread{Met: 100, FlaggedShare: [2]float64{0.10, 0.10}, Recall: [2]float64{0.4, 0.7}}, "unsteady: the hit share varies by a factor of 1.75 between the 5th and 95th percentile"},
		{bootstrap.Spread{Met: 100, FlaggedShare: [2]float64{0.10, 0.10}, Recall: steadyRecall}, "steady: neither workload nor hit share moves"},
		{bootstrap.Spread{Met: 100, FlaggedShare: [2]float64{0, 0.10}, Recall: steadyRecall}, "unsteady: in some resampled sets the workload is nil"},
		{bootstrap.Spread{Met: 90, FlaggedShare: [2]float64{0.10, 0.11}, Recall: steadyRecall}, "often unmet: met in 90 of 100 resampled sets"},
		{bootstrap.Spread{Met: 0, FlaggedShare: nan, Recall: nan}, "never met in the resampled sets"},
		{bootstrap.Spread{Met: 100, FlaggedShare: nan, Recall: nan}, "spread undefined"},
	}
	for _, c := range cases {
		if got := bootstrap.Describe(c.s, 100); got != c.want {
			t.Errorf("%+v: %q, want %q", c.s, got, c.want)
		}
	}
}

// TestQueue90Skipped: queue90=K needs shifts to be checked and is reported
// as not resampled, while the other rules beside it are.
func TestQueue90Skipped(t *testing.T) {
	set := normalSet(t, rand.New(rand.NewPCG(4, 4)), 30, 30, 1)
	rs := rules(t, "hit=0.5", "queue90=3")
	if _, err := bootstrap.Run(context.Background(), set, rs, assume, bootstrap.Options{Replicates: 5}); !errors.Is(err, cutrule.ErrNeedsShifts) {
		t.Fatalf("queue90 without shifts: %v", err)
	}
	c := set.Columns()
	c.Times = make([]int64, set.Len()) // every case in one shift
	set, err := scores.NewSet(c)
	if err != nil {
		t.Fatal(err)
	}
	sched, _ := shift.ParseSchedule("06:00", time.UTC)
	assigned, err := shift.Assign(set, sched)
	if err != nil {
		t.Fatal(err)
	}
	res, err := bootstrap.Run(context.Background(), set, rs, assume, bootstrap.Options{Replicates: 20, FinderOptions: []cutrule.Option{cutrule.WithShifts(assigned, shift.Scale{Positive: 1, Negative: 1})}})
	if err != nil {
		t.Fatal(err)
	}
	if res.Spreads[0].Met != 20 || res.Spreads[0].Skipped != "" || res.Spreads[1].Skipped == "" || !math.IsNaN(res.Spreads[1].Score[0]) {
		t.Errorf("spreads %+v", res.Spreads)
	}
}

// TestBandAt: the band point at or just stricter than a cut, by hand.
func TestBandAt(t *testing.T) {
	res := bootstrap.Result{Band: []bootstrap.BandPoint{{Cut: 2}, {Cut: 5}, {Cut: 9}}}
	for cut, want := range map[int]int{0: 2, 2: 2, 3: 2, 5: 5, 8: 5, 9: 9, 40: 9} {
		if p, ok := res.BandAt(cut); !ok || p.Cut != want {
			t.Errorf("cut %d: band cut %d, want %d", cut, p.Cut, want)
		}
	}
	if _, ok := (bootstrap.Result{}).BandAt(3); ok {
		t.Error("no band, yet a point")
	}
	got := bootstrap.DescribeBand(bootstrap.BandPoint{Recall: [2]float64{0.762, 0.825}, FalseDiscoveryRate: [2]float64{math.NaN(), math.NaN()}})
	if want := "in 9 resampled sets of 10 the hit share lies within 76.2–82.5% and the wrong-alert share is undefined"; got != want {
		t.Errorf("%q", got)
	}
}

// TestCountsTableAsRawRows: a counts table is resampled by case, so with
// the same seed it gives exactly the result of the raw rows it counts
// (ties, both classes at one score and a score of one class included).
// The reference is the raw rows themselves, run through the same Run.
func TestCountsTableAsRawRows(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	var raw strings.Builder
	raw.WriteString("score,label\n")
	type key struct {
		score    string
		positive bool
	}
	counted := map[key]int{}
	for range 300 {
		score := fmt.Sprintf("%.2f", float64(rng.IntN(40))/40) // 40 scores: heavy ties
		positive := rng.Float64() < 0.3+0.5*float64(len(score)%2)
		if positive {
			raw.WriteString(score + ",1\n")
		} else {
			raw.WriteString(score + ",0\n")
		}
		counted[key{score, positive}]++
	}
	table := map[string][2]int{}
	for k, n := range counted {
		c := table[k.score]
		if k.positive {
			c[0] += n
		} else {
			c[1] += n
		}
		table[k.score] = c
	}
	var counts strings.Builder
	counts.WriteString("score,positives,negatives\n")
	for score, c := range table {
		fmt.Fprintf(&counts, "%s,%d,%d\n", score, c[0], c[1])
	}
	for _, lower := range []bool{false, true} {
		opt := scores.Options{LowerIsRiskier: lower}
		rawSet, err := scores.Read(strings.NewReader(raw.String()), "raw.csv", opt)
		if err != nil {
			t.Fatal(err)
		}
		countsSet, err := scores.ReadCounts(strings.NewReader(counts.String()), "counts.csv", opt)
		if err != nil {
			t.Fatal(err)
		}
		rs := rules(t, "hit=0.8", "wrong=0.4", "top=10%", "top=30", "base", "score=0.5")
		for _, workers := range []int{1, 2} {
			o := bootstrap.Options{Replicates: 60, Seed: 9, Workers: workers, BandCuts: 15}
			want, err := bootstrap.Run(context.Background(), rawSet, rs, assume, o)
			if err != nil {
				t.Fatal(err)
			}
			got, err := bootstrap.Run(context.Background(), countsSet, rs, assume, o)
			if err != nil {
				t.Fatal(err)
			}
			printed := func(r bootstrap.Result) string { // printed, so that NaN equals NaN
				at, _ := r.BandAtCut(0.5)
				return fmt.Sprintf("%d %d %v %+v %+v %+v", r.Replicates, r.Seed, r.Design, r.Spreads, r.Band, at)
			}
			if printed(want) != printed(got) {
				t.Errorf("lower %v, workers %d: counts table\n%s\nraw rows\n%s", lower, workers, printed(got), printed(want))
			}
		}
	}
}
