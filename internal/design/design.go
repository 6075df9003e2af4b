// Package design says what a validation set's weights are and how the set
// was drawn, and gives the intervals and effective sample sizes that
// follow: one place for the sampling design, which evidence, analysis,
// the bootstrap, drift and modelpair call.
//
// # Two kinds of weights
//
// Frequency weights (Frequency, the reading without a declaration) count
// cases: a row of weight 3 is three identical cases, exactly as the row
// written three times. Intervals are Wilson intervals on the weighted
// counts, as they always were.
//
// Sampling weights (Sampling) are inverse probabilities of selection: a
// row of weight 10 is one case drawn, standing for ten like it in the
// population. The row is the sampling unit, so the weighted counts
// estimate population shares but do not measure how much was seen. Two
// designs follow:
//
//   - Weights constant within each class (every true case weighs w1 and
//     every false case w0; the mark of a class downsampled, such as keeping
//     1 false case in 10 and weighting it 10). Figures within one class
//     (recall, false positive rate) take the Wilson interval of the
//     unweighted counts: the rows of a class are a plain random sample of
//     that class. Figures that mix the classes map the Wilson interval of
//     the unweighted counts through the weight ratio: precision (and the
//     wrong-alert share, its complement) by the predictive-value mapping
//     p = w1*u / (w1*u + w0*(1-u)) of the unweighted precision u, as in
//     Mercaldo, Lau and Zhou (2007, "Confidence intervals for predictive
//     values with an emphasis to case-control studies", Statistics in
//     Medicine 26:2170-2183), whose bounds the mapping carries since it
//     is increasing. The flagged share mixes the classes by their weighted
//     shares, which are themselves estimated; it takes the general
//     interval below, whose variance in this design equals the
//     delta-method variance of the mapping.
//   - Any other sampling weights: the linearised (Taylor) variance of the
//     weighted ratio, var(R) = n/(n-1) sum over rows of w^2 (y - R x)^2 /
//     X^2 for R = sum w y / sum w x (Woodruff 1971), in the form for a
//     single stage drawn with replacement, no strata or clusters, where n
//     is the number of rows of the whole set (of weight > 0), also for a
//     figure within one class or among the flagged cases (a domain: rows
//     outside it count in n with a residual of 0). Then the Wilson
//     interval at the effective sample size of Korn and Graubard (1998,
//     "Confidence intervals for proportions with small expected number of
//     positive counts estimated from survey data", Survey Methodology
//     24:193-201), n* = R(1-R)/var(R) with R*n* successes. Their
//     degrees-of-freedom adjustment (from memory) scales n* by
//     (t[n-1]/t[df])^2, the two-sided quantiles of Student's t at the
//     interval's level with n-1 degrees of freedom (n the rows of the
//     domain) and with the design's degrees of freedom df; with no strata
//     or clusters df is n-1 and the factor is exactly 1, as in R's survey
//     package (svyciprop, method "beta", version 4.1.1, whose factor on
//     such a design and its domains is 1 and whose n.eff the tests check).
//     Korn and Graubard put n* into the Clopper-Pearson interval; sill
//     takes Wilson's, as for frequency weights. Where the variance is 0 (R
//     is 0 or 1) n* is Kish's effective size of the domain, X^2 / sum w^2.
//
// Every formula reads the weighted counts and the sums of squared weights
// of the four cells of a cut (curve.Point.Squares). A nil *Sample reads as
// frequency weights.
package design

import (
	"fmt"
	"math"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/scores"
)

// Kind is what the weights of a set are.
type Kind int

const (
	// Frequency weights count cases: weight 3 is the row written three
	// times. The reading without a declaration, and of a set without
	// weights.
	Frequency Kind = iota
	// Sampling weights are inverse probabilities of selection: each row
	// is one case drawn, standing for its weight's worth of cases.
	Sampling
)

// String returns the kind's name as written in decision files and
// flags: "frequency" or "sampling".
func (k Kind) String() string {
	if k == Sampling {
		return "sampling"
	}
	return "frequency"
}

// ParseKind reads a Kind from its name.
func ParseKind(name string) (Kind, error) {
	switch name {
	case "frequency":
		return Frequency, nil
	case "sampling":
		return Sampling, nil
	}
	return Frequency, fmt.Errorf("weight kind %q, expected frequency or sampling", name)
}

// Sample is how a validation set was drawn: the kind of its weights and,
// for sampling weights constant within each class, the class weights.
// A nil *Sample is frequency weights.
type Sample struct {
	Kind Kind
	// ClassConstant says every true case (of weight > 0) weighs
	// PositiveWeight and every false case NegativeWeight.
	ClassConstant                  bool
	PositiveWeight, NegativeWeight float64
	// Rows is the number of rows drawn (of weight > 0), n of the
	// linearised variance's factor n/(n-1). New sets it; a Sample made by
	// hand with Rows below 2 has no factor.
	Rows int
}

// New returns the design of set under kind: nil for frequency weights or
// a set without a weight column, so that every figure reads the weighted
// counts as before.
func New(set *scores.Set, kind Kind) *Sample {
	if kind != Sampling || !set.Weighted() {
		return nil
	}
	shape := Inspect(set)
	s := &Sample{Kind: Sampling}
	for i := range set.Len() {
		if set.Weight(i) > 0 {
			s.Rows++
		}
	}
	if shape.ClassConstant {
		s.ClassConstant, s.PositiveWeight, s.NegativeWeight = true, shape.PositiveWeight, shape.NegativeWeight
	}
	return s
}

// Sampling reports whether s reads sampling weights.
func (s *Sample) Sampling() bool { return s != nil && s.Kind == Sampling }

// WithinClass reports whether the classes were sampled apart by design:
// sampling weights constant within each class.
func (s *Sample) WithinClass() bool { return s.Sampling() && s.ClassConstant }

// String describes the design in words, for reports.
func (s *Sample) String() string {
	switch {
	case !s.Sampling():
		return "frequency weights"
	case s.ClassConstant && s.PositiveWeight != s.NegativeWeight:
		return fmt.Sprintf("sampling weights, one class downsampled: every true case weighs %g, every false case %g", s.PositiveWeight, s.NegativeWeight)
	case s.ClassConstant:
		return fmt.Sprintf("sampling weights, constant within each class: every case weighs %g", s.PositiveWeight)
	}
	return "sampling weights"
}

// Shape is what a set's weight column holds, as Inspect finds it.
// Rows of weight 0 count for nothing and are not looked at.
type Shape struct {
	Weighted bool // the set has a weight column
	// Integer: every weight is a whole number. NonInteger is the first
	// weight found that is not (0 when Integer).
	Integer    bool
	NonInteger float64
	// ClassConstant: within each class every weight is the same,
	// PositiveWeight for the true cases and NegativeWeight for the false
	// ones (0 for a class with no row of weight).
	ClassConstant                  bool
	PositiveWeight, NegativeWeight float64
}

// Downsampled reports the mark of a class downsampled: weights constant
// within each class but different between the classes. Weights all equal
// are not that.
func (s Shape) Downsampled() bool {
	return s.ClassConstant && s.PositiveWeight > 0 && s.NegativeWeight > 0 && s.PositiveWeight != s.NegativeWeight
}

// Inspect looks at set's weight column. A set without one (or a counts
// table, whose weights are counts) has a zero Shape.
func Inspect(set *scores.Set) Shape {
	if !set.Weighted() {
		return Shape{}
	}
	shape := Shape{Weighted: true, Integer: true, ClassConstant: true}
	for i := range set.Len() {
		w := set.Weight(i)
		if w == 0 {
			continue
		}
		if shape.Integer && w != math.Trunc(w) {
			shape.Integer, shape.NonInteger = false, w
		}
		class := &shape.NegativeWeight
		if set.Labels()[i] {
			class = &shape.PositiveWeight
		}
		switch {
		case *class == 0:
			*class = w
		case *class != w:
			shape.ClassConstant = false
		}
	}
	if !shape.ClassConstant {
		shape.PositiveWeight, shape.NegativeWeight = 0, 0
	}
	return shape
}

// UndeclaredError says that a set's weights cannot be read without being
// told their kind: they are not whole numbers, or they carry the mark of
// a downsampled class. Column names the weight column; Seen says what
// was found.
type UndeclaredError struct {
	Column string
	Seen   string
}

func (e *UndeclaredError) Error() string {
	return fmt.Sprintf("column %q: %s: expected to be told whether they are frequency weights (counts of cases) or sampling weights (inverse selection probabilities)", e.Column, e.Seen)
}

// Declared checks weights read without a declared kind. It returns an
// *UndeclaredError for non-integer weights or weights constant within
// each class but different between them, and a warning (one line, "" for
// none) for whole-number weights that vary within a class, which are
// read as frequency weights.
func Declared(set *scores.Set) (warning string, err error) {
	shape := Inspect(set)
	switch {
	case !shape.Weighted:
		return "", nil
	case !shape.Integer:
		return "", &UndeclaredError{Column: set.WeightColumn(), Seen: fmt.Sprintf("weights that are not whole numbers (such as %g)", shape.NonInteger)}
	case shape.Downsampled():
		return "", &UndeclaredError{Column: set.WeightColumn(), Seen: fmt.Sprintf("every true case weighs %g and every false case %g, the mark of a class downsampled", shape.PositiveWeight, shape.NegativeWeight)}
	case !shape.ClassConstant:
		return fmt.Sprintf("column %q: whole-number weights that vary within a class are read as frequency weights, each row counting as that many cases", set.WeightColumn()), nil
	}
	return "", nil
}

// Figure names a share of a cut whose interval the design gives.
type Figure int

// The shares of a cut.
const (
	Recall            Figure = iota // TP of TP+FN: within the true cases
	FalsePositiveRate               // FP of FP+TN: within the false cases
	Precision                       // TP of TP+FP: mixes the classes
	FlaggedShare                    // TP+FP of all: mixes the classes
)

// cells of a Point, in the order of Point.Squares.
const (
	tp = iota
	fp
	fn
	tn
)

// parts returns the cells in the numerator and those in the denominator
// of f.
func parts(f Figure) (num, den []int) {
	switch f {
	case Recall:
		return []int{tp}, []int{tp, fn}
	case FalsePositiveRate:
		return []int{fp}, []int{fp, tn}
	case Precision:
		return []int{tp}, []int{tp, fp}
	}
	return []int{tp, fp}, []int{tp, fp, fn, tn}
}

func counts(p curve.Point) [4]float64 { return [4]float64{p.TP, p.FP, p.FN, p.TN} }

// Interval returns the interval of figure f at p at the confidence level,
// and the effective number of trials it rests on: the weighted count of
// the figure's denominator for frequency weights, its design-based
// effective sample size for sampling weights (see the package doc). The
// interval is [NaN, NaN] and the trials 0 where the figure is undefined
// (nothing of weight in its denominator). It panics when confidence lies
// outside (0,1).
func (s *Sample) Interval(f Figure, p curve.Point, confidence float64) (ci [2]float64, trials float64) {
	c := counts(p)
	num, den := parts(f)
	var successes, total float64
	for _, k := range num {
		successes += c[k]
	}
	for _, k := range den {
		total += c[k]
	}
	if !s.Sampling() {
		ci[0], ci[1] = interval.Wilson(successes, total, confidence)
		return ci, max(total, 0)
	}
	if !(total > 0) {
		ci[0], ci[1] = interval.Wilson(0, 0, confidence)
		return ci, 0
	}
	if s.ClassConstant {
		switch f {
		case Recall:
			n := rows(total, s.PositiveWeight)
			ci[0], ci[1] = interval.Wilson(rows(successes, s.PositiveWeight), n, confidence)
			return ci, n
		case FalsePositiveRate:
			n := rows(total, s.NegativeWeight)
			ci[0], ci[1] = interval.Wilson(rows(successes, s.NegativeWeight), n, confidence)
			return ci, n
		case Precision:
			hits, wrong := rows(c[tp], s.PositiveWeight), rows(c[fp], s.NegativeWeight)
			lo, hi := interval.Wilson(hits, hits+wrong, confidence)
			ci = [2]float64{s.predictive(lo), s.predictive(hi)}
			return ci, Trials(successes/total, s.taylor(c, p.Squares, num, den), hits+wrong)
		}
	}
	n := Trials(successes/total, s.taylor(c, p.Squares, num, den), kish(c, p.Squares, den))
	ci[0], ci[1] = interval.Wilson(successes/total*n, n, confidence)
	return ci, n
}

// predictive maps an unweighted precision u to the weighted one through
// the class weights.
func (s *Sample) predictive(u float64) float64 {
	hits, wrong := s.PositiveWeight*u, s.NegativeWeight*(1-u)
	if hits == 0 {
		return 0
	}
	return hits / (hits + wrong)
}

// rows returns the rows behind a weighted count of one class, each of
// weight w: count/w, rounded to a whole number when within rounding of
// one.
func rows(count, w float64) float64 {
	if count == 0 {
		return 0
	}
	n := count / w
	if r := math.Round(n); math.Abs(n-r) <= 1e-9*max(1, r) {
		return r
	}
	return n
}

// taylor returns the linearised variance of the ratio R = (sum of the
// num cells) / (sum of the den cells): the residual of a row is y - R x,
// so a row in a numerator cell contributes w^2 (1-R)^2 and a row only in
// the denominator w^2 R^2, over the squared denominator, times the
// with-replacement factor n/(n-1) of the set's rows.
func (s *Sample) taylor(c, squares [4]float64, num, den []int) float64 {
	var successes, total, squaresIn, squaresOut float64
	in := map[int]bool{}
	for _, k := range num {
		successes += c[k]
		squaresIn += squares[k]
		in[k] = true
	}
	for _, k := range den {
		total += c[k]
		if !in[k] {
			squaresOut += squares[k]
		}
	}
	r := successes / total
	factor := 1.0
	if s.Rows > 1 {
		factor = float64(s.Rows) / float64(s.Rows-1)
	}
	return factor * ((1-r)*(1-r)*squaresIn + r*r*squaresOut) / (total * total)
}

// kish returns Kish's effective size of the denominator's cells.
func kish(c, squares [4]float64, den []int) float64 {
	var total, sq float64
	for _, k := range den {
		total += c[k]
		sq += squares[k]
	}
	return Kish(total, sq)
}

// Kish returns Kish's effective size (sum w)^2 / (sum w^2) of cases of
// total weight w whose squared weights add up to squares; 0 when squares
// is not positive (no weight).
func Kish(w, squares float64) float64 {
	if !(squares > 0) {
		return 0
	}
	return w * w / squares
}

// Trials returns the effective sample size of Korn and Graubard of a
// share r with design variance v: r(1-r)/v, or fallback where that is
// undefined (r at 0 or 1, or v not positive).
func Trials(r, v, fallback float64) float64 {
	if !(v > 0) || !(r > 0 && r < 1) {
		return fallback
	}
	return r * (1 - r) / v
}

// BaseRateTrials returns the effective number of cases behind the
// weighted share of true cases of a set whose loosest cut is p (every
// case flagged, or any point: only the totals are read): the weighted
// total for frequency weights, Korn and Graubard's effective size of the
// linearised variance for sampling weights.
func (s *Sample) BaseRateTrials(p curve.Point) float64 {
	c := counts(p)
	positives, total := c[tp]+c[fn], c[tp]+c[fp]+c[fn]+c[tn]
	if !s.Sampling() || !(total > 0) {
		return max(total, 0)
	}
	// Every case is a trial; the successes are the true cases.
	all := [4]float64{positives, c[fp] + c[tn], 0, 0}
	sq := [4]float64{p.Squares[tp] + p.Squares[fn], p.Squares[fp] + p.Squares[tn], 0, 0}
	return Trials(positives/total, s.taylor(all, sq, []int{0}, []int{0, 1}), kish(all, sq, []int{0, 1}))
}

// Effective returns the counts of p's cells as the within-class figures
// count them: p's weighted counts for frequency weights; for sampling
// weights the true cases at recall's effective trials and the false cases
// at the false positive rate's (the unweighted rows when the weights are
// constant within each class), split by the weighted shares. They stand
// for recall and the false positive rate as two independent binomial
// shares, as projected figures read them.
func (s *Sample) Effective(p curve.Point) (tp, fp, fn, tn float64) {
	if !s.Sampling() {
		return p.TP, p.FP, p.FN, p.TN
	}
	split := func(f Figure, hits, total float64) (float64, float64) {
		if !(total > 0) {
			return 0, 0
		}
		_, n := s.Interval(f, p, 0.95) // the level does not change the trials
		return hits / total * n, n - hits/total*n
	}
	tp, fn = split(Recall, p.TP, p.TP+p.FN)
	fp, tn = split(FalsePositiveRate, p.FP, p.FP+p.TN)
	return tp, fp, fn, tn
}
