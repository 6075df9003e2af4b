package bootstrap

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// TestLazyMatchesDrawnInFull: a replicate drawn lazily picks, for every
// rule, the cut that the eager path (every cut visited, cutrule.Find)
// picks on the same replicate drawn in full (every cell's count, fill),
// and gives the band the full replicate gives; drawing the cells first
// and the rules after gives the same draws (no draw depends on the order
// of the questions). Seeded random counts tables: 200 trials, 1 to 300
// cells on 2 to 200 score values (ties between the classes), whole counts
// of 1 to 3 cases or a few large ones (in one trial of five, frequency
// weights with halves, drawn by the Poisson tree; in another, rows of
// sampling weights alike within each class), both directions, both designs, at
// random production assumptions with costs; rule values at random and at
// figures of the full replicate (where ties with the value occur).
func TestLazyMatchesDrawnInFull(t *testing.T) {
	rng := rand.New(rand.NewPCG(41, 2026))
	for trial := range 200 {
		cells, poissonCells, sampling := randomCells(t, rng, trial)
		design := []Design{Ordinary, WithinClass}[trial%2]
		tree := newCellTree(cells, design, poissonCells)
		if sampling {
			tree.sampling, tree.classWeight = true, sampledWeights
		}
		lazy, full := newLazyReplicate(tree), newLazyReplicate(tree)
		a := projection.Assumptions{
			BaseRate:   []float64{0.02, 0.3, 0.5, 0.9}[rng.IntN(4)],
			Volume:     float64(1 + rng.IntN(500)),
			Confidence: 0.95,
			Costs:      &projection.Costs{FalseAlert: float64(rng.IntN(5)), Miss: float64(rng.IntN(20)), Hit: -float64(rng.IntN(3))},
		}
		if trial%3 == 0 {
			positives, negatives := cells.Totals()
			a.BaseRate = positives / (positives + negatives) // the validation rate: wrongNN= bounds Wilson's
		}
		for b := range uint64(5) {
			seed := uint64(trial)
			full.draw(seed, b)
			drawn := make([]float64, cells.Len())
			full.fill(drawn)
			rep := drawnSet(t, cells, drawn)
			if sampling {
				rep = drawnRows(t, cells, drawn)
			}
			c := curve.New(rep)
			if c.Len() == 0 { // a Poisson replicate may draw nothing
				if lazy.draw(uint64(trial), b); lazy.Len() != 0 {
					t.Errorf("trial %d replicate %d: nothing drawn in full, %d cuts lazily", trial, b, lazy.Len())
				}
				continue
			}
			rules := lazyRules(rng, c, a)
			want, err := cutrule.Find(rules, c, a)
			if err != nil {
				t.Fatal(err)
			}
			got, err := lazy.outcomes(seed, b, rules, a)
			if err != nil {
				t.Fatal(err)
			}
			for i := range rules {
				if g, w := pointOf(got[i]), pointOf(want[i]); g != w {
					t.Errorf("trial %d replicate %d (%s, base rate %v): %v lazily %s, drawn in full %s", trial, b, design, a.BaseRate, rules[i], g, w)
				}
			}
			checkBand(t, fmt.Sprintf("trial %d replicate %d", trial, b), lazy, cells, rep)
		}
	}
}

// pointOf describes an outcome by what the bootstrap takes from it.
func pointOf(o cutrule.Outcome) string {
	if !o.Met {
		return "unmet"
	}
	p := o.Point
	return fmt.Sprintf("score %v cases %d TP %v FP %v FN %v TN %v", p.Score, p.Cases, p.TP, p.FP, p.FN, p.TN)
}

// drawnSet returns the counts table of the cells' drawn cases.
func drawnSet(t *testing.T, cells *scores.Set, drawn []float64) *scores.Set {
	t.Helper()
	var sc, counts []float64
	var labels []bool
	for i, d := range drawn {
		if d > 0 {
			sc, labels, counts = append(sc, cells.Scores()[i]), append(labels, cells.Labels()[i]), append(counts, d)
		}
	}
	rep, err := scores.NewCounts(sc, labels, counts, cells.LowerIsRiskier())
	if err != nil {
		t.Fatal(err)
	}
	return rep
}

// drawnRows returns the rows of sampling weights drawn: drawn[i] rows of
// cell i, each of its class's weight in sampledWeights.
func drawnRows(t *testing.T, cells *scores.Set, drawn []float64) *scores.Set {
	t.Helper()
	var sc, weights []float64
	var labels []bool
	for i, d := range drawn {
		w := sampledWeights[1]
		if cells.Labels()[i] {
			w = sampledWeights[0]
		}
		for range int(d) {
			sc, labels, weights = append(sc, cells.Scores()[i]), append(labels, cells.Labels()[i]), append(weights, w)
		}
	}
	rep, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: weights, WeightColumn: "w", LowerIsRiskier: cells.LowerIsRiskier()})
	if err != nil {
		t.Fatal(err)
	}
	return rep
}

// sampledWeights are the class weights (true, false) of the trials of
// sampling weights in TestLazyMatchesDrawnInFull: false cases kept 1 in
// 8, powers of 2 so that sums of them are exact whatever their order.
var sampledWeights = [2]float64{1, 8}

// randomCells returns random cells (one row per score and label) for
// TestLazyMatchesDrawnInFull: a counts table; in one trial of five the
// weighted cells of frequency weights with halves (poisson); in another
// the rows of sampling weights alike within each class (sampledWeights,
// the cells counting rows).
func randomCells(t *testing.T, rng *rand.Rand, trial int) (cells *scores.Set, poisson, sampling bool) {
	t.Helper()
	values := 2 + rng.IntN(200)
	n := 1 + rng.IntN(300)
	seen := map[[2]int]bool{}
	var sc, counts []float64
	var labels []bool
	for range n {
		v, positive := rng.IntN(values), rng.Float64() < 0.2+0.6*float64(trial%5)/5
		label := 0
		if positive {
			label = 1
		}
		if seen[[2]int{v, label}] {
			continue
		}
		seen[[2]int{v, label}] = true
		count := float64(1 + rng.IntN(3))
		if rng.IntN(20) == 0 {
			count = float64(1 + rng.IntN(5000))
		}
		sc, labels, counts = append(sc, float64(v)/float64(values)), append(labels, positive), append(counts, count)
	}
	if !hasBoth(labels) {
		sc, labels, counts = append(sc, 0.5, 0.5), append(labels, true, false), append(counts, 1, 1)
	}
	set, err := scores.NewCounts(sc, labels, counts, trial%4 == 1)
	if trial%5 == 4 {
		for i := range counts {
			counts[i] += 0.5
		}
		set, err = scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: counts, LowerIsRiskier: trial%4 == 1})
	}
	sampling = trial%5 == 3
	if sampling {
		set = sampledRows(t, sc, labels, counts, trial%4 == 1)
	}
	if err != nil {
		t.Fatal(err)
	}
	cells, poisson, err = cellsOf(set, sampling)
	if err != nil {
		t.Fatal(err)
	}
	if poisson != (trial%5 == 4) || cells == nil {
		t.Fatalf("trial %d: cellsOf says poisson %v, cells %v", trial, poisson, cells != nil)
	}
	return cells, poisson, sampling
}

// sampledRows writes counts[i] rows of score sc[i] and label labels[i],
// each weighing its class's weight in sampledWeights.
func sampledRows(t *testing.T, sc []float64, labels []bool, counts []float64, lowerIsRiskier bool) *scores.Set {
	t.Helper()
	var rows, weights []float64
	var rowLabels []bool
	for i := range sc {
		w := sampledWeights[1]
		if labels[i] {
			w = sampledWeights[0]
		}
		for range int(counts[i]) {
			rows, rowLabels, weights = append(rows, sc[i]), append(rowLabels, labels[i]), append(weights, w)
		}
	}
	set, err := scores.NewSet(scores.Columns{Scores: rows, Labels: rowLabels, Weights: weights, WeightColumn: "w", LowerIsRiskier: lowerIsRiskier})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

func hasBoth(labels []bool) bool {
	var positive, negative bool
	for _, l := range labels {
		positive, negative = positive || l, negative || !l
	}
	return positive && negative
}

// lazyRules returns every kind of rule the bootstrap resamples, with
// values at random and at the figures of a point of c.
func lazyRules(rng *rand.Rand, c *curve.Curve, a projection.Assumptions) []cutrule.Rule {
	at := c.At(rng.IntN(c.Len()))
	fig := projection.Project(at, a)
	rules := []cutrule.Rule{
		{Kind: cutrule.Score, Value: rng.Float64()*1.2 - 0.1},
		{Kind: cutrule.Score, Value: at.Score},
		{Kind: cutrule.Top, Value: float64(1 + rng.IntN(at.Cases+1))},
		{Kind: cutrule.Top, Value: float64(at.Cases)},
		{Kind: cutrule.Top, Value: 1 + 99*rng.Float64(), Percent: true},
		{Kind: cutrule.Hit, Value: rng.Float64()},
		{Kind: cutrule.Base},
		{Kind: cutrule.Queue, Value: rng.Float64() * a.Volume},
		{Kind: cutrule.Cost},
		{Kind: cutrule.Wrong, Value: rng.Float64()},
		{Kind: cutrule.HitBound, Value: rng.Float64(), Level: 95},
		{Kind: cutrule.WrongBound, Value: rng.Float64(), Level: 90},
		{Kind: cutrule.HitBound, Value: 0.8, Level: 95},
		{Kind: cutrule.WrongBound, Value: 0.333, Level: 95},
	}
	if r := at.Recall(); !math.IsNaN(r) {
		rules = append(rules, cutrule.Rule{Kind: cutrule.Hit, Value: r})
	}
	if f := fig.FalseDiscoveryRate(); f >= 0 && f <= 1 {
		rules = append(rules, cutrule.Rule{Kind: cutrule.Wrong, Value: f})
	}
	return rules
}

// checkBand compares the lazy replicate's band with the full one's at
// every cut of the cells.
func checkBand(t *testing.T, name string, lazy *lazyReplicate, cells, rep *scores.Set) {
	t.Helper()
	base := curve.New(cells)
	var cuts []bandCut
	for k := range base.Len() {
		p := base.At(k)
		cuts = append(cuts, bandCut{index: k, score: p.Score, rows: p.Rows})
	}
	recallAt, fdrAt := grid(len(cuts), 1), grid(len(cuts), 1)
	lazy.band(cuts, 0, recallAt, fdrAt)
	positives, _ := rep.Totals()
	for j, cut := range cuts {
		var tp, fp float64
		for i := range rep.Len() {
			if cells.Riskier(cut.score, rep.Scores()[i]) {
				continue
			}
			if rep.Labels()[i] {
				tp += rep.Weight(i)
			} else {
				fp += rep.Weight(i)
			}
		}
		recall, fdr := tp/positives, fp/(tp+fp)
		if !same(recall, recallAt[j][0]) || !same(fdr, fdrAt[j][0]) {
			t.Errorf("%s band cut %d: lazily %v and %v, in full %v and %v", name, j, recallAt[j][0], fdrAt[j][0], recall, fdr)
		}
	}
}

// same reports whether a and b are equal, NaN equal to NaN.
func same(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }

// TestTreeKeepsClassSizes: within classes every replicate holds exactly
// as many cases of each class as the table, and an ordinary replicate as
// many cases in all, spread over the cells in about their shares.
// Hand-built: true cases 3,000,000 at score 0.9 and 1,000,000 at 0.5;
// false cases 2,000,000 at 0.5 and 4,000,000 at 0.1. 20 replicates each.
func TestTreeKeepsClassSizes(t *testing.T) {
	set, err := scores.NewCounts([]float64{0.9, 0.5, 0.5, 0.1}, []bool{true, true, false, false}, []float64{3e6, 1e6, 2e6, 4e6}, false)
	if err != nil {
		t.Fatal(err)
	}
	for _, design := range []Design{WithinClass, Ordinary} {
		r := newLazyReplicate(newCellTree(set, design, false))
		drawn := make([]float64, set.Len())
		for b := range uint64(20) {
			r.draw(1, b)
			r.fill(drawn)
			var positives, all float64
			for i, d := range drawn {
				all += d
				if set.Labels()[i] {
					positives += d
				}
			}
			if all != 10e6 || (design == WithinClass && positives != 4e6) {
				t.Fatalf("%s replicate %d: %v cases, %v true, want 10e6 (and 4e6 true within classes)", design, b, all, positives)
			}
			for i, d := range drawn {
				// about 10 standard errors of a share near one half among millions
				if share, want := d/all, set.Weight(i)/10e6; math.Abs(share-want) > 0.002 {
					t.Errorf("%s replicate %d cell %d: share %v, want about %v", design, b, i, share, want)
				}
			}
		}
	}
}

// TestCellMoments: each cell's drawn count, over replicates, has the
// mean n·w/W and variance n·(w/W)·(1-w/W) of a multinomial draw of n
// cases over cells of w of W cases (ordinary design, textbook formulas),
// and a Poisson tree (weights not whole) the mean and variance w of a
// Poisson draw. Seeded; 20 cells of 1 to 40 cases, 20000 replicates; the
// sample mean within 5 standard errors, the variance within 10%.
func TestCellMoments(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	var sc, counts []float64
	var labels []bool
	for i := range 20 {
		sc, labels, counts = append(sc, float64(i)/20), append(labels, i%3 == 0), append(counts, float64(1+rng.IntN(40)))
	}
	for _, poissonCells := range []bool{false, true} {
		var set *scores.Set
		var err error
		if poissonCells {
			for i := range counts {
				counts[i] += 0.5
			}
			set, err = scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: counts})
		} else {
			set, err = scores.NewCounts(sc, labels, counts, false)
		}
		if err != nil {
			t.Fatal(err)
		}
		r := newLazyReplicate(newCellTree(set, Ordinary, poissonCells))
		const replicates = 20000
		sum, squares := make([]float64, set.Len()), make([]float64, set.Len())
		drawn := make([]float64, set.Len())
		for b := range uint64(replicates) {
			r.draw(9, b)
			r.fill(drawn)
			for i, d := range drawn {
				sum[i] += d
				squares[i] += d * d
			}
		}
		var all float64
		for i := range set.Len() {
			all += set.Weight(i)
		}
		for i := range set.Len() {
			w := set.Weight(i)
			wantMean, wantVariance := w, w*(1-w/all) // multinomial of all cases over the cells
			if poissonCells {
				wantVariance = w
			}
			mean := sum[i] / replicates
			variance := squares[i]/replicates - mean*mean
			if math.Abs(mean-wantMean) > 5*math.Sqrt(wantVariance/replicates) || math.Abs(variance-wantVariance) > 0.1*wantVariance {
				t.Errorf("poisson %v cell %d of %v cases: mean %v variance %v, want %v and %v", poissonCells, i, w, mean, variance, wantMean, wantVariance)
			}
		}
	}
}

// TestBandCuts: bandCuts, which walks the scores, picks the cuts that
// the set's curve gives for the same rows (bandCutsOfCurve, the earlier
// way): seeded random sets of rows with ties, with weights and as counts
// tables, both directions, 1 to 200 band cuts.
func TestBandCuts(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 9))
	for trial := range 300 {
		n := 1 + rng.IntN(300)
		sc, labels, weights := make([]float64, n), make([]bool, n), make([]float64, n)
		for i := range n {
			sc[i], labels[i], weights[i] = float64(rng.IntN(1+rng.IntN(100))), rng.IntN(2) == 0, float64(1+rng.IntN(4))
		}
		var set *scores.Set
		var err error
		switch trial % 3 {
		case 0:
			set, err = scores.New(sc, labels, nil, trial%2 == 1)
		case 1:
			set, err = scores.New(sc, labels, weights, trial%2 == 1)
		default:
			set, err = scores.NewCounts(sc, labels, weights, trial%2 == 1)
		}
		if err != nil {
			t.Fatal(err)
		}
		k := []int{1, 3, 50, 200}[rng.IntN(4)]
		if got, want := fmt.Sprint(bandCuts(set, k)), fmt.Sprint(bandCutsOfCurve(set, k)); got != want {
			t.Fatalf("trial %d, %d cuts: %s, the curve gives %s", trial, k, got, want)
		}
	}
}

// bandCutsOfCurve is bandCuts by way of the set's curve, which a test
// holds bandCuts to.
func bandCutsOfCurve(set *scores.Set, k int) []bandCut {
	n := set.Len()
	if k <= 0 || n == 0 || set.Cases() == 0 {
		return nil
	}
	c := curve.New(set)
	var out []bandCut
	last := -1
	for j := 1; j <= k; j++ {
		row := set.RowOfCase(max(int(math.Ceil(float64(j)*float64(set.Cases())/float64(k)))-1, 0))
		cut := c.CutOfRow(row)
		if cut == last {
			continue
		}
		last = cut
		p := c.At(cut)
		out = append(out, bandCut{index: cut, score: p.Score, rows: p.Rows})
	}
	return out
}

// TestBandAtCutMatchesDrawnInFull: the band Result.BandAtCut gives at
// every cut of the set is the 5th and 95th percentile of the recall and
// false discovery rate that the run's replicates, drawn in full (fill),
// give at that cut, and equals the run's own band at its band cuts.
// Seeded random counts tables of randomCells (the trials of sampling
// weights left out: their cells are not the set), 40 trials of 25
// replicates each, both designs.
func TestBandAtCutMatchesDrawnInFull(t *testing.T) {
	rng := rand.New(rand.NewPCG(43, 2026))
	for trial := range 40 {
		cells, poissonCells, sampling := randomCells(t, rng, trial)
		if sampling {
			continue
		}
		design := []Design{Ordinary, WithinClass}[trial%2]
		const replicates = 25
		res, err := Run(context.Background(), cells, nil, projection.Assumptions{BaseRate: 0.1, Volume: 100, Confidence: 0.95},
			Options{Replicates: replicates, Seed: uint64(trial), BandCuts: 7, Design: design, Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		full := newLazyReplicate(newCellTree(cells, design, poissonCells))
		base := curve.New(cells)
		recall, fdr := grid(base.Len(), replicates), grid(base.Len(), replicates)
		for b := range replicates {
			full.draw(uint64(trial), uint64(b))
			drawn := make([]float64, cells.Len())
			full.fill(drawn)
			positives := 0.0
			for i, d := range drawn {
				if cells.Labels()[i] {
					positives += d
				}
			}
			for k := range base.Len() {
				var tp, fp float64
				for i, d := range drawn {
					switch {
					case cells.Riskier(base.At(k).Score, cells.Scores()[i]):
					case cells.Labels()[i]:
						tp += d
					default:
						fp += d
					}
				}
				recall[k][b], fdr[k][b] = rates(tp, fp, positives, [2]float64{1, 1})
			}
		}
		for k := range base.Len() {
			got, ok := res.BandAtCut(base.At(k).Score)
			wantRecall, _ := percentiles(recall[k], replicates/2)
			wantFDR, _ := percentiles(fdr[k], replicates/2)
			if !ok || got.Cut != k || !same(got.Recall[0], wantRecall[0]) || !same(got.Recall[1], wantRecall[1]) ||
				!same(got.FalseDiscoveryRate[0], wantFDR[0]) || !same(got.FalseDiscoveryRate[1], wantFDR[1]) {
				t.Errorf("trial %d cut %d: at the cut %v (%v), drawn in full recall %v, false discovery rate %v", trial, k, got, ok, wantRecall, wantFDR)
			}
		}
		for _, p := range res.Band {
			if got, _ := res.BandAtCut(p.Score); fmt.Sprint(got) != fmt.Sprint(p) {
				t.Errorf("trial %d: at band cut %d %v, band %v", trial, p.Cut, got, p)
			}
		}
	}
}

// TestBandAtCutEager: rows of sampling weights that vary within a class
// (the eager draw) know the band at the cuts named in Options.CutScores,
// equal to the band at the same cut, and no other. Seeded: 400 rows of
// normal scores, weights 1 to 3, 30 replicates.
func TestBandAtCutEager(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 9))
	var sc, weights []float64
	var labels []bool
	for i := range 400 {
		positive := i%4 == 0
		s := rng.NormFloat64()
		if positive {
			s += 1.5
		}
		sc, labels, weights = append(sc, s), append(labels, positive), append(weights, float64(1+rng.IntN(3)))
	}
	set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: weights, WeightColumn: "w"})
	if err != nil {
		t.Fatal(err)
	}
	probe, err := Run(context.Background(), set, nil, projection.Assumptions{BaseRate: 0.1, Volume: 100, Confidence: 0.95},
		Options{Replicates: 30, Seed: 5, BandCuts: 10, Sampling: true})
	if err != nil {
		t.Fatal(err)
	}
	named := []float64{probe.Band[2].Score, probe.Band[6].Score}
	res, err := Run(context.Background(), set, nil, projection.Assumptions{BaseRate: 0.1, Volume: 100, Confidence: 0.95},
		Options{Replicates: 30, Seed: 5, BandCuts: 10, Sampling: true, CutScores: named})
	if err != nil {
		t.Fatal(err)
	}
	for _, j := range []int{2, 6} {
		if got, ok := res.BandAtCut(probe.Band[j].Score); !ok || fmt.Sprint(got) != fmt.Sprint(probe.Band[j]) {
			t.Errorf("named cut %d: %v (%v), band %v", j, got, ok, probe.Band[j])
		}
	}
	if got, ok := res.BandAtCut(probe.Band[4].Score); ok {
		t.Errorf("cut not named: %v, want none", got)
	}
}
