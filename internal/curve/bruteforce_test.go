package curve_test

import (
	"github.com/sill-tool/sill/internal/floatcmp"

	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestWalkMatchesBruteForce recomputes every figure of seeded random sets
// straight from its definition, with no sweep: each cut's counts by
// testing every row against the cut rule (scores.Set.Flags), AUC by
// comparing every (true, false) pair with ties counted half, AP as the
// sum over cuts of the recall step times the precision, and Brier score
// and log loss as weighted means over the rows.
func TestWalkMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 1927))
	for trial := range 200 {
		n := rng.IntN(60)
		values := make([]float64, n)
		labels := make([]bool, n)
		var weights []float64
		if trial%2 == 1 {
			weights = make([]float64, n)
		}
		for i := range values {
			values[i] = float64(rng.IntN(9)) / 8
			if trial%3 == 2 {
				values[i] = values[i]*6 - 3 // logits: no probabilities
			}
			labels[i] = rng.Float64() < 0.2+0.5*values[i]
			if weights != nil {
				weights[i] = float64(rng.IntN(5)) / 2 // zeros included
			}
		}
		lower := trial%4 == 3
		set := mustSet(t, values, labels, weights, lower)
		points, sum := pointsOf(set)
		name := fmt.Sprintf("trial %d (n=%d, weighted %v, lower %v)", trial, n, weights != nil, lower)

		weight := func(i int) float64 {
			if weights == nil {
				return 1
			}
			return weights[i]
		}
		// Distinct scores, riskiest first.
		cuts := slices.Clone(values)
		slices.Sort(cuts)
		cuts = slices.Compact(cuts)
		if !lower {
			slices.Reverse(cuts)
		}
		if len(points) != len(cuts) {
			t.Fatalf("%s: %d cuts, want %d distinct scores", name, len(points), len(cuts))
		}
		var positives, negatives float64
		for i := range values {
			if labels[i] {
				positives += weight(i)
			} else {
				negatives += weight(i)
			}
		}
		ap, previousRecall := 0.0, 0.0
		for k, cut := range cuts {
			var tp, fp, fn, tn float64
			rows := 0
			for i, v := range values {
				flagged := set.Flags(cut, v)
				if flagged {
					rows++
				}
				switch {
				case flagged && labels[i]:
					tp += weight(i)
				case flagged:
					fp += weight(i)
				case labels[i]:
					fn += weight(i)
				default:
					tn += weight(i)
				}
			}
			p := points[k]
			if p.Score != cut || p.Rows != rows || !floatcmp.Equal(p.TP, tp) || !floatcmp.Equal(p.FP, fp) || !floatcmp.Equal(p.FN, fn) || !floatcmp.Equal(p.TN, tn) {
				t.Fatalf("%s: cut %v: %+v, want rows %d tp %v fp %v fn %v tn %v", name, cut, p, rows, tp, fp, fn, tn)
			}
			if positives > 0 && tp+fp > 0 {
				recall := tp / positives
				ap += (recall - previousRecall) * tp / (tp + fp)
				previousRecall = recall
			}
		}

		var pairs, wins float64
		for i := range values {
			for j := range values {
				if !labels[i] || labels[j] {
					continue
				}
				w := weight(i) * weight(j)
				pairs += w
				switch {
				case set.Riskier(values[i], values[j]):
					wins += w
				case values[i] == values[j]:
					wins += w / 2
				}
			}
		}
		wantAUC, wantAP := math.NaN(), math.NaN()
		if positives > 0 && negatives > 0 {
			wantAUC = wins / pairs
		}
		if positives > 0 {
			wantAP = ap
		}
		wantBrier, wantLogLoss := math.NaN(), math.NaN()
		probabilities := n > 0 && !lower
		for _, v := range values {
			probabilities = probabilities && v >= 0 && v <= 1
		}
		if probabilities && positives+negatives > 0 {
			var brier, logLoss float64
			for i, v := range values {
				y := 0.0
				if labels[i] {
					y = 1
				}
				brier += weight(i) * (v - y) * (v - y)
				q := min(max(v, 1e-15), 1-1e-15)
				logLoss -= weight(i) * (y*math.Log(q) + (1-y)*math.Log(1-q))
			}
			wantBrier, wantLogLoss = brier/(positives+negatives), logLoss/(positives+negatives)
		}
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"ROC AUC", sum.ROCAUC, wantAUC}, {"average precision", sum.AveragePrecision, wantAP},
			{"Brier score", sum.Brier, wantBrier}, {"log loss", sum.LogLoss, wantLogLoss},
		} {
			if !floatcmp.Equal(c.got, c.want) {
				t.Errorf("%s: %s %v, want %v", name, c.what, c.got, c.want)
			}
		}
		if sum.Probabilities != probabilities {
			t.Errorf("%s: Probabilities %v, want %v", name, sum.Probabilities, probabilities)
		}
	}
}
