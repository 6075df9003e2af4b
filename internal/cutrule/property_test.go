package cutrule_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// oracle picks a rule's cut by brute force over every point, straight
// from the definitions in the package doc: it returns the index of the
// cut, or -1 when none meets the rule. Comparisons use the package's
// stated relative slack of 1e-12.
func oracle(r cutrule.Rule, points []curve.Point, set *scores.Set, a projection.Assumptions) int {
	const slack = 1e-12
	figures := make([]projection.Figures, len(points))
	for i, p := range points {
		figures[i] = projection.Project(p, a)
	}
	deepest := func(ok func(i int) bool) int {
		pick := -1
		for i := range points {
			if ok(i) {
				pick = i
			}
		}
		return pick
	}
	if positives, negatives := set.Totals(); set.Weighted() && set.Len() > 0 && !(positives+negatives > 0) && r.Kind != cutrule.Score {
		return -1 // every row weighs 0: no case counts, and only score= is met
	}
	switch r.Kind {
	case cutrule.Score:
		return deepest(func(i int) bool { return !set.Riskier(r.Value, points[i].Score) })
	case cutrule.Top:
		// Cases: rows, or with weights the weighted cases.
		total, flagged := float64(set.Len()), func(i int) float64 { return float64(points[i].Rows) }
		if set.Weighted() {
			positives, negatives := set.Totals()
			total, flagged = positives+negatives, func(i int) float64 { return points[i].TP + points[i].FP }
		}
		limit := r.Value
		if r.Percent {
			limit = r.Value / 100 * total
		}
		return deepest(func(i int) bool { return flagged(i) <= limit*(1+slack) })
	case cutrule.Hit:
		for i, p := range points {
			if p.Recall() >= r.Value-slack {
				return i
			}
		}
		return -1
	case cutrule.Wrong:
		return deepest(func(i int) bool { return figures[i].FalseDiscoveryRate() <= r.Value+slack })
	case cutrule.Base:
		return deepest(func(i int) bool { return figures[i].AlertRate <= a.BaseRate*(1+slack) })
	case cutrule.Queue:
		return deepest(func(i int) bool { return figures[i].QueuePerShift <= r.Value*(1+slack) })
	case cutrule.Cost:
		least := math.Inf(1)
		for _, f := range figures {
			if f.CostPerCase < least {
				least = f.CostPerCase
			}
		}
		for i, f := range figures {
			if f.CostPerCase <= least+slack*math.Abs(least) {
				return i // the strictest within the slack of the least
			}
		}
		return -1
	case cutrule.HitBound:
		for i, p := range points {
			if lower, _ := interval.Wilson(p.TP, p.Positives(), 2*r.Level/100-1); lower >= r.Value-slack {
				return i
			}
		}
		return -1
	case cutrule.WrongBound:
		positives, negatives := set.Totals()
		projected := a.BaseRate != positives/(positives+negatives)
		return deepest(func(i int) bool {
			p := points[i]
			_, upper := interval.Wilson(p.FP, p.TP+p.FP, 2*r.Level/100-1)
			if projected {
				lower, _ := projection.PrecisionInterval(projection.Counts{TP: p.TP, FP: p.FP, FN: p.FN, TN: p.TN}, a.BaseRate, 2*r.Level/100-1)
				upper = 1 - lower
			}
			return upper <= r.Value+slack
		})
	}
	panic("oracle: unknown kind")
}

// TestFindMatchesOracle checks Find, and a Finder's Search, against the
// brute-force oracle on
// seeded random sets with heavy ties, weights and both directions, at
// random production assumptions, with rule values drawn both at random and
// exactly at figures of the data (where ties with the rule's value occur).
func TestFindMatchesOracle(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 2026))
	for trial := range 600 {
		// Half the trials have many cuts, so that Search's branch and
		// bound skips runs of them.
		n, levels := 1+rng.IntN(40), 12
		if trial%2 == 1 {
			n, levels = 1+rng.IntN(400), 2+rng.IntN(300)
		}
		values := make([]float64, n)
		labels := make([]bool, n)
		var weights []float64
		if trial%3 == 0 {
			weights = make([]float64, n)
		}
		for i := range values {
			values[i] = float64(rng.IntN(levels)) / float64(levels-1)
			labels[i] = rng.Float64() < 0.3+0.4*values[i]
			if weights != nil {
				weights[i] = float64(rng.IntN(4)) / 2
			}
		}
		set, err := scores.New(values, labels, weights, trial%4 == 1)
		if err != nil {
			t.Fatal(err)
		}
		c := curve.New(set)
		var points []curve.Point
		c.Points(func(p curve.Point) { points = append(points, p) })
		a := projection.Assumptions{
			BaseRate:   []float64{0, 0.02, 0.3, 0.5, 1}[rng.IntN(5)],
			Volume:     float64(1 + rng.IntN(500)),
			Confidence: 0.95,
			Costs:      &projection.Costs{FalseAlert: float64(rng.IntN(5)), Miss: float64(rng.IntN(20)), Hit: -float64(rng.IntN(3))},
		}
		if trial%5 == 0 {
			a.BaseRate = c.Summary.BaseRate // the validation rate
			if math.IsNaN(a.BaseRate) {
				a.BaseRate = 0
			}
		}
		// A point to take values from, so that rules land exactly on
		// figures of the data.
		at := points[rng.IntN(len(points))]
		atFig := projection.Project(at, a)
		rules := []cutrule.Rule{
			{Kind: cutrule.Score, Value: rng.Float64()*1.2 - 0.1},
			{Kind: cutrule.Score, Value: at.Score},
			{Kind: cutrule.Top, Value: float64(1 + rng.IntN(n))},
			{Kind: cutrule.Top, Value: float64(at.Rows)},
			{Kind: cutrule.Top, Value: 1 + 99*rng.Float64(), Percent: true},
			{Kind: cutrule.Hit, Value: rng.Float64()},
			{Kind: cutrule.Base},
			{Kind: cutrule.Queue, Value: rng.Float64() * a.Volume},
			{Kind: cutrule.Cost},
			{Kind: cutrule.Wrong, Value: rng.Float64()},
			{Kind: cutrule.HitBound, Value: rng.Float64(), Level: 95},
			{Kind: cutrule.WrongBound, Value: rng.Float64(), Level: 90},
		}
		if r := at.Recall(); !math.IsNaN(r) {
			rules = append(rules, cutrule.Rule{Kind: cutrule.Hit, Value: r})
		}
		if f := atFig.FalseDiscoveryRate(); f >= 0 && f <= 1 {
			rules = append(rules, cutrule.Rule{Kind: cutrule.Wrong, Value: f})
		}
		if q := atFig.QueuePerShift; q >= 0 {
			rules = append(rules, cutrule.Rule{Kind: cutrule.Queue, Value: q})
		}
		outcomes, err := cutrule.Find(rules, c, a)
		if err != nil {
			t.Fatal(err)
		}
		// Search (binary search and scans over the stored cuts) gives
		// what visiting every cut gives, reasons included.
		finder, err := cutrule.NewFinder(rules, set, a)
		if err != nil {
			t.Fatal(err)
		}
		finder.Search(c)
		for i, o := range finder.Outcomes() {
			if got, want := fmt.Sprintf("%+v", o), fmt.Sprintf("%+v", outcomes[i]); got != want {
				t.Errorf("trial %d: %v searched\n%s\nvisited\n%s", trial, rules[i], got, want)
			}
		}
		for i, r := range rules {
			want := oracle(r, points, set, a)
			o := outcomes[i]
			name := fmt.Sprintf("trial %d (n=%d, base rate %v, lower %v): %v", trial, n, a.BaseRate, set.LowerIsRiskier(), r)
			switch {
			case want < 0 && o.Met:
				t.Errorf("%s: met at cut %d (score %v), oracle says unmet", name, o.Point.Index, o.Point.Score)
			case want >= 0 && !o.Met:
				t.Errorf("%s: unmet (%s), oracle picks cut %d (score %v)", name, o.Reason, want, points[want].Score)
			case want >= 0 && o.Point != points[want]:
				t.Errorf("%s: cut %d (score %v), oracle picks cut %d (score %v)", name, o.Point.Index, o.Point.Score, want, points[want].Score)
			case !o.Met && o.Reason == "":
				t.Errorf("%s: unmet without a reason", name)
			}
		}
	}
}
