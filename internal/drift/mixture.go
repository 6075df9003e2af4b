package drift

import (
	"math"
	"sort"

	"github.com/sill-tool/sill/internal/decision"
)

// classBins are bins of score cut from the decision file's stored curve,
// with the validation set's weighted true and false cases in each. Bin j
// holds the scores flagged at the cut ends[j] but not at ends[j-1] (the
// cut rule of package scores, in the file's direction); scores flagged at
// no end count in the last bin, so every new score has a bin.
type classBins struct {
	ends           []float64 // cut scores, strictest first
	lowerIsRiskier bool
	positives      []float64 // validation true cases per bin
	negatives      []float64 // validation false cases per bin
	// The squared weights of the validation true and false cases per bin,
	// from the file's data.squared_weights (sampling weights); nil when
	// the file has none.
	positiveSquares, negativeSquares []float64
}

// maxClassBins bounds the bins cut from the curve: ten bins keep ten or
// more validation cases of a class in each when the class has a hundred
// (common practice for chi-square tests, no source).
const maxClassBins = 10

// newClassBins cuts the file's curve into at most bins bins of about equal
// weight of share(tp, fp) (the cumulative count the bins are even in:
// true cases, false cases or both). ok is false when the file has no curve
// (a sill-cut/1 file) or fewer than two bins result.
func newClassBins(f *decision.File, bins int, share func(tp, fp float64) float64) (classBins, bool) {
	curve := f.Curve
	if len(curve) < 2 || bins < 2 {
		return classBins{}, false
	}
	last := curve[len(curve)-1]
	total := share(last.TP, last.FP)
	if !(total > 0) {
		return classBins{}, false
	}
	b := classBins{lowerIsRiskier: f.Data.LowerIsRiskier}
	squares := f.Data.Squares
	if squares != nil && len(squares.Curve) != len(curve) {
		squares = nil // not reached for a file read or built by package decision
	}
	var tp, fp float64               // cumulative at the previous end
	var tpSquares, fpSquares float64 // likewise
	next := 1
	for i, p := range curve {
		if i < len(curve)-1 && share(p.TP, p.FP) < float64(next)*total/float64(bins) {
			continue
		}
		if p.TP-tp <= 0 && p.FP-fp <= 0 {
			continue
		}
		b.ends = append(b.ends, p.Score)
		b.positives = append(b.positives, p.TP-tp)
		b.negatives = append(b.negatives, p.FP-fp)
		tp, fp = p.TP, p.FP
		if squares != nil {
			q := squares.Curve[i]
			b.positiveSquares = append(b.positiveSquares, math.Max(0, q[0]-tpSquares))
			b.negativeSquares = append(b.negativeSquares, math.Max(0, q[1]-fpSquares))
			tpSquares, fpSquares = q[0], q[1]
		}
		for next < bins && share(p.TP, p.FP) >= float64(next)*total/float64(bins) {
			next++
		}
	}
	// Cases the loosest stored cut leaves out (none in a full curve) join
	// the last bin.
	b.positives[len(b.positives)-1] += math.Max(0, f.Data.Positives-tp)
	b.negatives[len(b.negatives)-1] += math.Max(0, f.Data.Negatives-fp)
	if squares != nil {
		b.positiveSquares[len(b.positiveSquares)-1] += math.Max(0, squares.Positives-tpSquares)
		b.negativeSquares[len(b.negativeSquares)-1] += math.Max(0, squares.Negatives-fpSquares)
	}
	return b, len(b.ends) >= 2
}

// bin returns the bin of score.
func (b classBins) bin(score float64) int {
	j := sort.Search(len(b.ends), func(j int) bool {
		if b.lowerIsRiskier {
			return score <= b.ends[j]
		}
		return score >= b.ends[j]
	})
	return min(j, len(b.ends)-1)
}

// HomogeneityTest returns Pearson's chi-square statistic for two samples
// of counts over the same bins (a 2 x k contingency table), its degrees of
// freedom (bins holding any count, less one) and the p-value from the
// chi-square distribution. Counts may be weighted (frequency weights) and
// must be >= 0; the slices must have one length (a panic otherwise). With
// an empty sample or fewer than two bins in use the p-value is NaN.
func HomogeneityTest(a, b []float64) (statistic float64, freedom int, p float64) {
	if len(a) != len(b) {
		panic("drift: HomogeneityTest got slices of different lengths")
	}
	var na, nb float64
	for i := range a {
		na += a[i]
		nb += b[i]
	}
	if !(na > 0) || !(nb > 0) {
		return math.NaN(), 0, math.NaN()
	}
	n := na + nb
	for i := range a {
		column := a[i] + b[i]
		if !(column > 0) {
			continue
		}
		freedom++
		ea, eb := na*column/n, nb*column/n
		statistic += (a[i]-ea)*(a[i]-ea)/ea + (b[i]-eb)*(b[i]-eb)/eb
	}
	freedom--
	if freedom < 1 {
		return math.NaN(), 0, math.NaN()
	}
	return statistic, freedom, ChiSquareSurvival(statistic, float64(freedom))
}

// ChiSquareSurvival returns P(X > x) for X chi-square with k degrees of
// freedom: the regularised upper incomplete gamma function Q(k/2, x/2),
// by its series below a+1 and its continued fraction above (Press,
// Teukolsky, Vetterling and Flannery, "Numerical Recipes", section 6.2,
// from memory). 1 for x <= 0; NaN for k <= 0 or NaN input.
func ChiSquareSurvival(x, k float64) float64 {
	if math.IsNaN(x) || math.IsNaN(k) || k <= 0 {
		return math.NaN()
	}
	if x <= 0 {
		return 1
	}
	a, z := k/2, x/2
	lg, _ := math.Lgamma(a)
	front := math.Exp(a*math.Log(z) - z - lg)
	if z < a+1 {
		sum, term := 1/a, 1/a
		for n := 1; n < 1000; n++ {
			term *= z / (a + float64(n))
			sum += term
			if term < sum*1e-15 {
				break
			}
		}
		return math.Max(0, 1-front*sum)
	}
	// Lentz's method for the continued fraction.
	const tiny = 1e-300
	bb := z + 1 - a
	c, d := 1/tiny, 1/bb
	h := d
	for n := 1; n < 1000; n++ {
		an := -float64(n) * (float64(n) - a)
		bb += 2
		d = an*d + bb
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = bb + an/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		delta := d * c
		h *= delta
		if math.Abs(delta-1) < 1e-15 {
			break
		}
	}
	return math.Min(1, front*h)
}

// Mixture is the base rate that best explains a sample of scores as the
// mixture p*F1 + (1-p)*F0 of the validated class distributions, over bins.
type Mixture struct {
	BaseRate float64    // the maximum-likelihood p in [0,1]
	CI       [2]float64 // profile-likelihood interval at the confidence asked
	// Inflation is the factor the sample's deviance is divided by for the
	// validation set's own noise (see FitMixture); 1 ignores it.
	Inflation float64
	// Fit is Pearson's goodness-of-fit statistic of the fitted mixture,
	// divided by Inflation, with Freedom degrees of freedom (bins in use
	// less two: the total and p) and its p-value FitP; NaN with fewer than
	// three bins in use.
	Fit     float64
	Freedom int
	FitP    float64
	loglik  func(p float64) float64
	info    float64 // observed information at BaseRate, per the deviance scale
}

// FitMixture returns the maximum-likelihood base rate of counts (the new
// scores' weighted counts per bin) under the mixture p*f1 + (1-p)*f0,
// where f1 and f0 are the validated class shares per bin (each summing to
// 1 over the bins; the slices of one length, a panic otherwise).
//
// The log-likelihood sum_j n_j ln(p f1_j + (1-p) f0_j) is concave in p;
// its maximum on [0,1] is found by bisection on its derivative. The
// interval is the profile-likelihood one: the p whose deviance
// 2(L(p^) - L(p)), divided by inflation, stays within the chi-square
// quantile of one degree of freedom at confidence. inflation (>= 1)
// widens it for the noise of f1 and f0, which were estimated on the
// validation set: the caller passes the mean over the bins of the
// variance of a bin's share of n new cases less its mixture share (the
// new cases' own, and p^2 f1(1-f1)/P + (1-p)^2 f0(1-f0)/N from P true and
// N false validation cases) over the multinomial variance of n new cases
// (mixtureInflation: Rao and Scott's first-order factor, 1981; from
// memory). The fit statistic is Pearson's sum_j (n_j - n m_j)^2 / (n m_j)
// at the fitted p, divided by the same factor. With no counts every
// figure is NaN.
func FitMixture(counts, f1, f0 []float64, confidence float64, inflation func(p float64) float64) Mixture {
	if len(counts) != len(f1) || len(f1) != len(f0) {
		panic("drift: FitMixture got slices of different lengths")
	}
	nan := math.NaN()
	m := Mixture{BaseRate: nan, CI: [2]float64{nan, nan}, Inflation: nan, Fit: nan, FitP: nan}
	var n float64
	for _, c := range counts {
		n += c
	}
	if !(n > 0) {
		return m
	}
	share := func(j int, p float64) float64 { return p*f1[j] + (1-p)*f0[j] }
	loglik := func(p float64) float64 {
		l := 0.0
		for j, c := range counts {
			if c > 0 {
				l += c * math.Log(share(j, p))
			}
		}
		return l
	}
	slope := func(p float64) float64 {
		d := 0.0
		for j, c := range counts {
			if c > 0 {
				d += c * (f1[j] - f0[j]) / share(j, p)
			}
		}
		return d
	}
	const edge = 1e-12
	var p float64
	switch {
	case slope(edge) <= 0:
		p = 0
	case slope(1-edge) >= 0:
		p = 1
	default:
		lo, hi := edge, 1-edge
		for range 200 {
			mid := (lo + hi) / 2
			if slope(mid) > 0 {
				lo = mid
			} else {
				hi = mid
			}
		}
		p = (lo + hi) / 2
	}
	m.BaseRate, m.loglik = p, loglik
	m.Inflation = 1
	if inflation != nil {
		m.Inflation = math.Max(1, inflation(p))
	}
	at := math.Min(math.Max(p, edge), 1-edge)
	best := loglik(at)
	for j, c := range counts {
		if c > 0 {
			d := f1[j] - f0[j]
			m.info += c * d * d / (share(j, at) * share(j, at))
		}
	}
	m.info /= m.Inflation
	// The chi-square quantile of one degree of freedom is the square of
	// the normal one at (1+confidence)/2.
	z := math.Sqrt2 * math.Erfinv(confidence)
	limit := z * z
	deviance := func(q float64) float64 { return 2 * (best - loglik(q)) / m.Inflation }
	// Each side of p: bisection for where the deviance reaches the limit.
	side := func(from, to float64) float64 {
		if !(deviance(to) > limit) { // finite and within, or the log of 0 at an end
			return to
		}
		lo, hi := from, to
		for range 200 {
			mid := (lo + hi) / 2
			if deviance(mid) > limit {
				hi = mid
			} else {
				lo = mid
			}
		}
		return (lo + hi) / 2
	}
	m.CI = [2]float64{side(at, 0), side(at, 1)}
	if p == 0 {
		m.CI[0] = 0
	}
	if p == 1 {
		m.CI[1] = 1
	}
	used := 0
	fit := 0.0
	for j, c := range counts {
		e := n * share(j, p)
		if e > 0 {
			used++
			fit += (c - e) * (c - e) / e
		}
	}
	if used >= 3 {
		m.Freedom = used - 2
		m.Fit = fit / m.Inflation
		m.FitP = ChiSquareSurvival(m.Fit, float64(m.Freedom))
	}
	return m
}

// Against returns the two-sided p-value of the base rate being assumed
// (within tolerance) against m: the likelihood-ratio statistic
// 2(L(p^) - L(p0)) over (Inflation + assumedVariance * information), where
// p0 is assumed moved toward p^ by tolerance and assumedVariance is the
// variance of assumed when it was itself estimated (0 when given). The
// divisor reads the statistic as (p^-p0)^2 / (var p^ + var p0) for a
// quadratic likelihood. 1 when p^ is within tolerance of assumed; NaN
// without a fit.
func (m Mixture) Against(assumed, assumedVariance, tolerance float64) float64 {
	if m.loglik == nil || math.IsNaN(m.BaseRate) {
		return math.NaN()
	}
	gap := m.BaseRate - assumed
	if math.Abs(gap) <= tolerance {
		return 1
	}
	p0 := assumed + math.Copysign(tolerance, gap)
	p0 = math.Min(math.Max(p0, 1e-12), 1-1e-12)
	at := math.Min(math.Max(m.BaseRate, 1e-12), 1-1e-12)
	raw := 2 * (m.loglik(at) - m.loglik(p0)) // not yet divided by the inflation
	divisor := m.Inflation + assumedVariance*m.info*m.Inflation
	return ChiSquareSurvival(raw/divisor, 1)
}
