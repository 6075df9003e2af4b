// Package curve computes every operating point of a ranked validation set
// and the summary figures of the whole ranking.
//
// A cut is a distinct score; which cases it flags follows the cut rule in
// the doc of package scores. Cuts are numbered from 0, the strictest (it
// flags only the riskiest tie group), to Len()-1, the loosest (it flags
// every case). All counts are weighted sums (see the scores package doc on
// weights); Point.Rows alone counts rows.
package curve

import (
	"math"

	"github.com/sill-tool/sill/internal/scores"
)

// Point is the confusion table at one cut.
type Point struct {
	Index int     // cut number, 0 is the strictest
	Score float64 // the cut
	Rows  int     // validation rows flagged, whatever their weight: rows [0, Rows) of the ranked set

	// Cases is the number of validation cases flagged: Rows, except for a
	// counts table, whose rows stand for their counts (scores.Set.CasesFlagged).
	Cases int

	TP, FP, FN, TN float64 // weighted counts

	// Squares holds each cell's sum of squared weights (TP, FP, FN, TN
	// in that order), what a design-based variance of sampling weights
	// needs (package design). Without a weight column every case weighs
	// 1 and Squares equals the counts.
	Squares [4]float64
}

// Flagged returns the weighted number of flagged cases.
func (p Point) Flagged() float64 { return p.TP + p.FP }

// Positives returns the weighted number of true cases in the set.
func (p Point) Positives() float64 { return p.TP + p.FN }

// Negatives returns the weighted number of false cases in the set.
func (p Point) Negatives() float64 { return p.FP + p.TN }

// Recall returns the share of true cases flagged (hit share), or NaN when
// the set has no true case.
func (p Point) Recall() float64 { return ratio(p.TP, p.TP+p.FN) }

// Precision returns the share of flagged cases that are true, or NaN when
// nothing of weight is flagged.
func (p Point) Precision() float64 { return ratio(p.TP, p.TP+p.FP) }

// FalseDiscoveryRate returns the share of flagged cases that are false
// (wrong-alert share), or NaN when nothing of weight is flagged.
func (p Point) FalseDiscoveryRate() float64 { return ratio(p.FP, p.TP+p.FP) }

// FalsePositiveRate returns the share of false cases flagged, or NaN when
// the set has no false case.
func (p Point) FalsePositiveRate() float64 { return ratio(p.FP, p.FP+p.TN) }

// FlaggedShare returns the weighted share of all cases flagged, or NaN
// when the set weighs nothing.
func (p Point) FlaggedShare() float64 { return ratio(p.TP+p.FP, p.TP+p.FP+p.FN+p.TN) }

func ratio(num, den float64) float64 {
	if den == 0 {
		return math.NaN()
	}
	return num / den
}

// Summary holds the figures of the whole ranking. Undefined figures are
// NaN: ROCAUC needs both classes, AveragePrecision needs a true case, and
// Brier and LogLoss need Probabilities.
type Summary struct {
	Rows                 int
	Positives, Negatives float64 // weighted
	BaseRate             float64 // Positives / (Positives + Negatives)
	Weighted             bool
	// PositiveSquares and NegativeSquares are the sums of squared
	// weights of the true and the false cases (the counts without a
	// weight column).
	PositiveSquares, NegativeSquares float64

	// Probabilities reports whether every score lies in [0,1] and higher
	// scores are riskier, so that scores can be read as probabilities.
	Probabilities bool

	ROCAUC           float64 // ties count half; Mann-Whitney U / (P*N)
	AveragePrecision float64 // sum over cuts of (recall_k - recall_k-1) * precision_k
	Brier            float64 // weight-averaged squared error
	LogLoss          float64 // weight-averaged, probabilities clipped to [1e-15, 1-1e-15]
}

// logLossClip bounds probabilities away from 0 and 1 in LogLoss.
const logLossClip = 1e-15

// Walk sweeps a ranked set once, from the strictest cut to the loosest,
// calling visit (when not nil) with every cut's point, and returns the
// summary. It uses memory independent of the number of rows. An empty set
// visits nothing and returns a summary of NaNs and zeros.
func Walk(set *scores.Set, visit func(Point)) Summary {
	positives, negatives := set.Totals()
	positiveSquares, negativeSquares := positives, negatives
	if set.Weighted() {
		positiveSquares, negativeSquares = squaredWeights(set)
	}
	sum := Summary{
		Rows:            set.Cases(),
		Positives:       positives,
		Negatives:       negatives,
		BaseRate:        ratio(positives, positives+negatives),
		Weighted:        set.Weighted(),
		PositiveSquares: positiveSquares,
		NegativeSquares: negativeSquares,
		Probabilities:   !set.LowerIsRiskier() && set.Len() > 0,
	}
	weighted := set.Weighted()
	var (
		tpSquares, fpSquares float64 // cumulative, with a weight column
		tp, fp               float64 // cumulative
		aucSum, apSum        float64
		brier, logLoss       float64
		totalWeight          float64
		previousRecall       float64
		scoresList           = set.Scores()
		labels               = set.Labels()
		n                    = set.Len()
		cutIndex             int
	)
	for start := 0; start < n; {
		score := scoresList[start]
		var groupTP, groupFP, groupTPSquares, groupFPSquares float64
		// The log terms are the same for every row of the group.
		var logP, logNotP float64
		if sum.Probabilities {
			p := min(max(score, logLossClip), 1-logLossClip)
			logP, logNotP = math.Log(p), math.Log(1-p)
		}
		end := start
		for ; end < n && scoresList[end] == score; end++ {
			w := set.Weight(end)
			if labels[end] {
				groupTP += w
				if weighted {
					groupTPSquares += w * w
				}
			} else {
				groupFP += w
				if weighted {
					groupFPSquares += w * w
				}
			}
			if score < 0 || score > 1 {
				sum.Probabilities = false
			}
			if sum.Probabilities {
				y := 0.0
				if labels[end] {
					y = 1
				}
				brier += w * (score - y) * (score - y)
				logLoss -= w * (y*logP + (1-y)*logNotP)
			}
			totalWeight += w
		}
		// Each false case in the group outranks the true cases below it
		// and ties with the true cases beside it.
		aucSum += groupFP * (tp + groupTP/2)
		tp += groupTP
		fp += groupFP
		tpSquares += groupTPSquares
		fpSquares += groupFPSquares
		if positives > 0 && groupTP > 0 {
			recall := tp / positives
			apSum += (recall - previousRecall) * (tp / (tp + fp))
			previousRecall = recall
		}
		if visit != nil {
			p := Point{Index: cutIndex, Score: score, Rows: end, Cases: set.CasesFlagged(end), TP: tp, FP: fp, FN: positives - tp, TN: negatives - fp}
			p.Squares = [4]float64{p.TP, p.FP, p.FN, p.TN}
			if weighted {
				p.Squares = [4]float64{tpSquares, fpSquares, positiveSquares - tpSquares, negativeSquares - fpSquares}
			}
			visit(p)
		}
		cutIndex++
		start = end
	}
	// aucSum counts the (true, false) pairs in which the true case ranks
	// riskier, ties counting half.
	sum.ROCAUC = math.NaN()
	if positives > 0 && negatives > 0 {
		sum.ROCAUC = aucSum / (positives * negatives)
	}
	sum.AveragePrecision = math.NaN()
	if positives > 0 {
		sum.AveragePrecision = apSum
	}
	sum.Brier, sum.LogLoss = math.NaN(), math.NaN()
	if sum.Probabilities && totalWeight > 0 {
		sum.Brier = brier / totalWeight
		sum.LogLoss = logLoss / totalWeight
	}
	return sum
}

// squaredWeights returns the sums of squared weights of the true and the
// false cases, summed tie group by tie group in ranked order as the sweep
// adds them, so that the loosest cut leaves no rounding residue.
func squaredWeights(set *scores.Set) (positives, negatives float64) {
	for start, n := 0, set.Len(); start < n; {
		var groupPositives, groupNegatives float64
		end := start
		for ; end < n && set.Scores()[end] == set.Scores()[start]; end++ {
			w := set.Weight(end)
			if set.Labels()[end] {
				groupPositives += w * w
			} else {
				groupNegatives += w * w
			}
		}
		positives += groupPositives
		negatives += groupNegatives
		start = end
	}
	return positives, negatives
}
