// Package modelpair compares two models scored on the same validation
// cases: the paired test of their ROC AUC difference of DeLong, DeLong and
// Clarke-Pearson (1988, "Comparing the areas under two or more correlated
// receiver operating characteristic curves: a nonparametric approach"),
// and the second model's own ranked set, so that the same cut rule can be
// applied to both.
//
// Both models' scores run in the same direction: with LowerIsRiskier a
// small score is riskier for both. Ties count half, as in the AUC of
// package curve. Weights are frequency weights (see the scores package
// doc): a weight of 2 gives the same test as the row written twice, and
// zero-weight rows drop out.
package modelpair

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"sync"

	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/scores"
)

// Errors of this package.
var (
	ErrNoSecondModel = errors.New("the set has no second score column")
	ErrNoClass       = errors.New("the paired AUC test needs true and false cases")
)

// Test is the outcome of DeLong's paired test.
type Test struct {
	AUC        [2]float64 // the first and the second model's ROC AUC
	Difference float64    // AUC[0] - AUC[1]
	// Variance and Covariance are DeLong's estimates of the AUCs'
	// variances and their covariance.
	Variance   [2]float64
	Covariance float64
	// StdError is the standard error of Difference; Z is Difference over
	// it and P the two-sided p-value from the standard normal. Z and P
	// are NaN when StdError is 0 (for example the same scores twice) or
	// undefined (a class of weight 1 or less).
	StdError float64
	Z, P     float64
}

// Compare runs DeLong's paired test on the set's two score columns
// (Scores and CompareScores). It returns ErrNoSecondModel without a second
// column and ErrNoClass when either class weighs nothing.
func Compare(set *scores.Set) (Test, error) {
	if set.CompareScores() == nil {
		return Test{}, ErrNoSecondModel
	}
	return Paired(set.Scores(), set.CompareScores(), set.Labels(), set.Weights(), set.LowerIsRiskier())
}

// CompareSampling is Compare with the set's weights read as sampling
// weights: the variances follow SamplingPaired.
func CompareSampling(set *scores.Set) (Test, error) {
	if set.CompareScores() == nil {
		return Test{}, ErrNoSecondModel
	}
	return SamplingPaired(set.Scores(), set.CompareScores(), set.Labels(), set.Weights(), set.LowerIsRiskier())
}

// SamplingPaired is Paired with weights read as sampling weights
// (inverse selection probabilities; package design): the rows are the
// sampling units. The AUCs and placements are Paired's, weighted; the
// covariance of the two AUCs is taken by linearisation of the weighted
// Mann-Whitney statistic, whose influence of a true case i is its
// placement's deviation V10_i - AUC and of a false case j V01_j - AUC
// (the structural components of DeLong, DeLong and Clarke-Pearson 1988):
//
//	cov = sum over true cases of w^2 (V10 - AUC)(V10' - AUC') / m^2 * k1/(k1-1)
//	    + sum over false cases of w^2 (V01 - AUC)(V01' - AUC') / n^2 * k0/(k0-1)
//
// with m and n the class weights and k Kish's effective size of each
// class (the with-replacement variance of a weighted total, as for a
// survey ratio; Woodruff 1971). With every weight 1 it is DeLong's
// variance exactly; weighting every row 10 leaves it unchanged, where the
// frequency reading would divide it by 10. Named here: DeLong's
// placements with the linearised variance of sampling weights.
func SamplingPaired(a, b []float64, labels []bool, weights []float64, lowerIsRiskier bool) (Test, error) {
	return paired(a, b, labels, weights, lowerIsRiskier, true)
}

// Paired runs DeLong's paired test on two models' scores a and b of the
// same cases, in any order. weights may be nil (every row weighs 1). It
// panics when the slices differ in length and returns ErrNoClass when
// either class weighs nothing.
//
// For each true case i its placement in model r is V10 = the weighted
// share of false cases that it outranks (ties half), and for each false
// case j V01 = the weighted share of true cases that outrank it. The AUC
// is the weighted mean of either; S10 and S01 are the weighted covariance
// matrices of the placements over the true and the false cases (divided by
// the class weight less 1), and the covariance of the two AUCs is S10/m +
// S01/n with m and n the class weights.
func Paired(a, b []float64, labels []bool, weights []float64, lowerIsRiskier bool) (Test, error) {
	return paired(a, b, labels, weights, lowerIsRiskier, false)
}

func paired(a, b []float64, labels []bool, weights []float64, lowerIsRiskier, sampling bool) (Test, error) {
	if len(a) != len(b) || len(a) != len(labels) || (weights != nil && len(weights) != len(a)) {
		panic(fmt.Sprintf("modelpair: Paired got %d, %d scores, %d labels and %d weights", len(a), len(b), len(labels), len(weights)))
	}
	weight := func(i int) float64 {
		if weights == nil {
			return 1
		}
		return weights[i]
	}
	var positives, negatives []int
	var m, n float64
	for i, positive := range labels {
		w := weight(i)
		if w <= 0 {
			continue
		}
		if positive {
			positives, m = append(positives, i), m+w
		} else {
			negatives, n = append(negatives, i), n+w
		}
	}
	if len(positives) == 0 || len(negatives) == 0 {
		return Test{}, ErrNoClass
	}
	var v10, v01 [2][]float64
	var t Test
	sign := 1.0
	if lowerIsRiskier {
		sign = -1
	}
	// The two models' placements are independent: one goroutine each.
	var wg sync.WaitGroup
	for r, model := range [2][]float64{a, b} {
		wg.Add(1)
		go func() {
			defer wg.Done()
			v10[r] = placements(positives, negatives, model, sign, weight, false)
			v01[r] = placements(negatives, positives, model, sign, weight, true)
		}()
	}
	wg.Wait()
	for r := range 2 {
		auc := 0.0
		for k, i := range positives {
			auc += weight(i) * v10[r][k]
		}
		t.AUC[r] = auc / m
	}
	t.Difference = t.AUC[0] - t.AUC[1]
	s10 := covariance(v10, positives, weight, m, sampling)
	s01 := covariance(v01, negatives, weight, n, sampling)
	for r := range 2 {
		t.Variance[r] = s10[r][r] + s01[r][r]
	}
	t.Covariance = s10[0][1] + s01[0][1]
	variance := t.Variance[0] + t.Variance[1] - 2*t.Covariance
	t.StdError = math.Sqrt(max(variance, 0))
	t.Z, t.P = math.NaN(), math.NaN()
	if t.StdError > 0 {
		t.Z = t.Difference / t.StdError
		t.P = math.Erfc(math.Abs(t.Z) / math.Sqrt2)
	}
	return t, nil
}

// placements returns, for each row of own, the weighted share of the rows
// of other that it beats, ties counting half: a true case beats the false
// cases below it (above is false), a false case is beaten by the true
// cases above it (above is true). Risk is sign times the score.
func placements(own, other []int, score []float64, sign float64, weight func(int) float64, above bool) []float64 {
	type valued struct{ value, weight float64 }
	sorted := make([]valued, len(other))
	for k, j := range other {
		sorted[k] = valued{sign * score[j], weight(j)}
	}
	slices.SortFunc(sorted, func(x, y valued) int { return cmp.Compare(x.value, y.value) })
	values := make([]float64, len(sorted))
	cumulative := make([]float64, len(sorted)+1) // weight of the first k values in ascending order
	for k, v := range sorted {
		values[k] = v.value
		cumulative[k+1] = cumulative[k] + v.weight
	}
	total := cumulative[len(sorted)]
	out := make([]float64, len(own))
	for k, i := range own {
		x := sign * score[i]
		lo := sort.SearchFloat64s(values, x)                              // first >= x
		hi := sort.SearchFloat64s(values, math.Nextafter(x, math.Inf(1))) // first > x
		below, tied := cumulative[lo], cumulative[hi]-cumulative[lo]
		if above {
			out[k] = (total - cumulative[hi] + tied/2) / total
		} else {
			out[k] = (below + tied/2) / total
		}
	}
	return out
}

// covariance returns one class's part of the 2x2 covariance matrix of the
// two AUCs: the weighted covariance of the two models' placements over
// rows, divided by the class weight less 1 (NaN when that is not
// positive) and by the class weight, or with sampling weights
// moments.samplingCovariance. The placements' weighted mean is the AUC.
func covariance(v [2][]float64, rows []int, weight func(int) float64, classWeight float64, sampling bool) [2][2]float64 {
	var m [2][2]moments
	for k, i := range rows {
		w := weight(i)
		for x := range 2 {
			for y := range 2 {
				m[x][y].add(w, v[x][k], v[y][k])
				m[x][y].addSquares(w*w, v[x][k], v[y][k])
			}
		}
	}
	var s [2][2]float64
	for x := range 2 {
		for y := range 2 {
			s[x][y] = m[x][y].covariance(classWeight) / classWeight
			if sampling {
				s[x][y] = m[x][y].samplingCovariance()
			}
		}
	}
	return s
}

// moments accumulates the weighted co-moment of paired placements (x, y)
// of one class, one weighted placement at a time (West 1979, "Updating
// mean and variance estimates: an improved method"), so that the one-model
// variance can be taken in the same single pass over a set's cuts that
// finds its AUC.
type moments struct {
	weight, meanX, meanY, comoment float64

	// The sums of squared weights w^2, w^2 x, w^2 y and w^2 x y, for the
	// variance under sampling weights (samplingCovariance).
	squares, squaresX, squaresY, squaresXY float64
}

// addSquares adds placements (x, y) of rows whose squared weights sum to
// sq.
func (m *moments) addSquares(sq, x, y float64) {
	m.squares += sq
	m.squaresX += sq * x
	m.squaresY += sq * y
	m.squaresXY += sq * x * y
}

// samplingCovariance is the contribution of one class to the covariance
// of two AUCs under sampling weights (see SamplingPaired): the sum of
// w^2 (x - mean x)(y - mean y) over the class, over its squared weight,
// times k/(k-1) with k Kish's effective size of the class (design.Kish;
// the number of rows when every row weighs the same). NaN when k is 1 or
// less.
func (m *moments) samplingCovariance() float64 {
	k := design.Kish(m.weight, m.squares)
	if !(k-1 > 0) {
		return math.NaN()
	}
	sum := m.squaresXY - m.meanX*m.squaresY - m.meanY*m.squaresX + m.meanX*m.meanY*m.squares
	return sum / (m.weight * m.weight) * k / (k - 1)
}

func (m *moments) add(w, x, y float64) {
	if !(w > 0) {
		return
	}
	m.weight += w
	dx := x - m.meanX
	m.meanX += w / m.weight * dx
	m.meanY += w / m.weight * (y - m.meanY)
	m.comoment += w * dx * (y - m.meanY)
}

// covariance is DeLong's S10 or S01 entry: the co-moment divided by the
// class weight less 1, NaN when that is not positive.
func (m *moments) covariance(classWeight float64) float64 {
	if !(classWeight-1 > 0) {
		return math.NaN()
	}
	return m.comoment / (classWeight - 1)
}

// Second returns the set ranked by its second score column, every other
// column carried along (times and segments included), so that the cut
// rules can be applied to the second model. It returns ErrNoSecondModel
// without a second column. Rows tied on the second score keep the set's
// order.
func Second(set *scores.Set) (*scores.Set, error) {
	if set.CompareScores() == nil {
		return nil, ErrNoSecondModel
	}
	return set.SwapScores(), nil
}

// Errors of Join.
var (
	ErrNoIDs       = errors.New("joining two files needs an id column in both")
	ErrDuplicateID = errors.New("duplicate id")
	ErrUnmatchedID = errors.New("id missing from the second file")
	ErrLabelClash  = errors.New("the two files disagree on a case's label")
)

// Join returns set with the second model's scores taken from other, a set
// of the same cases scored by another model, matched on their ids: the
// result's CompareScores[i] is other's score of the case whose id is
// set.IDs[i]. Every case of set must be in other (other may hold more);
// an id may appear once in each. When other has a label column its labels
// must agree with set's. Both sets must run in the same direction; Join
// takes set's. The result shares set's columns but CompareScores.
func Join(set, other *scores.Set) (*scores.Set, error) {
	if set.IDs() == nil || other.IDs() == nil {
		return nil, ErrNoIDs
	}
	index := make(map[string]int, other.Len())
	for i, id := range other.IDs() {
		if _, dup := index[id]; dup {
			return nil, fmt.Errorf("%s: %w %q", other.Source(), ErrDuplicateID, id)
		}
		index[id] = i
	}
	seen := make(map[string]bool, set.Len())
	compare := make([]float64, set.Len())
	for i, id := range set.IDs() {
		if seen[id] {
			return nil, fmt.Errorf("%s: %w %q", set.Source(), ErrDuplicateID, id)
		}
		seen[id] = true
		j, ok := index[id]
		if !ok {
			return nil, fmt.Errorf("%w: %q of %s is not in %s", ErrUnmatchedID, id, set.Source(), other.Source())
		}
		if other.LabelColumn() != "" && other.Labels()[j] != set.Labels()[i] {
			return nil, fmt.Errorf("%w: id %q is %v in %s and %v in %s", ErrLabelClash, id, set.Labels()[i], set.Source(), other.Labels()[j], other.Source())
		}
		compare[i] = other.Scores()[j]
	}
	column := other.ScoreColumn()
	if column == set.ScoreColumn() {
		column = other.Source() + ":" + other.ScoreColumn()
	}
	return set.WithCompare(compare, column), nil
}
