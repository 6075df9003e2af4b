package shift

import (
	"math"

	"github.com/sill-tool/sill/internal/quantile"
)

// MaxSpread caps the relative spread between shifts that the model
// takes: a shift's expected queue varying by twice its mean. Past it the
// lognormal's p90 would fall as the spread grows.
const MaxSpread = 2

// modelNodes is the number of equal-probability nodes of the multiplier.
const modelNodes = 40

// Spread is the between-shift spread of one per-shift sum.
type Spread struct {
	// Relative is tau: the standard deviation of a shift's expected sum
	// between shifts, as a share of the mean, beyond sampling noise
	// (DerSimonian and Laird's estimate, floored at zero).
	Relative float64
	// Distinct says the shifts differ beyond sampling noise (Cochran's
	// test at the 2.5% level, so that the alerts' test and the cases'
	// together keep 5%); false also when there are too few shifts or
	// cases to tell.
	Distinct bool
}

// Used is the spread the model takes from s: Relative when the shifts
// are told apart from noise, else none (an estimate above zero is then
// mostly the sample's noise).
func (s Spread) Used() float64 {
	if s.Distinct {
		return s.Relative
	}
	return 0
}

// QueueSpread is the relative spread of the expected queue between
// shifts that the model uses: the larger of what the alerts show and what
// the cases per shift show (each only when told apart from noise; the
// cases, many more than the alerts, tell a swing in volume sooner, and
// the queue follows the volume unless the alert rate falls as the volume
// rises).
func QueueSpread(alerts, cases Spread) float64 { return max(alerts.Used(), cases.Used()) }

// dispersion returns the spread of the per-shift sums against the covered
// shares cover (shifts of no cover are left out) with sumSq the sum of
// the squared scaled weights behind them.
func dispersion(sums, cover []float64, sumSq float64) Spread {
	var e, e2, x, qx float64
	k := 0
	for i, c := range cover {
		if !(c > 0) {
			continue
		}
		k++
		e += c
		e2 += c * c
		x += sums[i]
		qx += sums[i] * sums[i] / c
	}
	return spreadOf(x, qx, sumSq, e, e2, k)
}

// spreadOf is dispersion from its sums over the k shifts of some cover:
// x the per-shift sums, qx their squares over the cover, e and e2 the
// covers and their squares.
func spreadOf(x, qx, sumSq, e, e2 float64, k int) Spread {
	if k < 2 || !(e > 0) || !(x > 0) || !(sumSq > 0) {
		return Spread{}
	}
	m := x / e
	q := qx - x*x/e
	lambda2 := sumSq / e
	df := float64(k - 1)
	den := m * m * (e - e2/e)
	s := Spread{Distinct: q/lambda2 > quantile.ChiSquare(0.975, df)}
	if den > 0 {
		s.Relative = min(math.Sqrt(max((q-lambda2*df)/den, 0)), MaxSpread)
	}
	return s
}

// Queue is the distribution of a production shift's queue under the
// model: Binomial(Volume, min(1, Rate*M)), M lognormal of mean 1 and
// relative spread Spread.
type Queue struct {
	Volume, Rate, Spread float64
	nodes                []float64 // the multipliers M, of mean 1; nil when Spread is 0
}

// NewQueue returns the queue of a shift of volume cases at alert rate
// rate with the relative spread spread between shifts.
func NewQueue(volume, rate, spread float64) Queue {
	q := Queue{Volume: volume, Rate: min(max(rate, 0), 1), Spread: spread}
	if spread > 0 {
		sigma2 := math.Log1p(spread * spread)
		sigma := math.Sqrt(sigma2)
		q.nodes = make([]float64, modelNodes)
		sum := 0.0
		for j := range q.nodes {
			z := math.Sqrt2 * math.Erfinv(2*(float64(j)+0.5)/modelNodes-1)
			q.nodes[j] = math.Exp(-sigma2/2 + sigma*z)
			sum += q.nodes[j]
		}
		for j := range q.nodes {
			q.nodes[j] *= modelNodes / sum
		}
	}
	return q
}

// Mean is the mean queue.
func (q Queue) Mean() float64 { return q.Volume * q.Rate }

// CDF returns the probability that the queue is at most k alerts.
func (q Queue) CDF(k float64) float64 {
	if math.IsNaN(k) || !(q.Volume > 0) {
		return math.NaN()
	}
	k = math.Floor(k)
	if q.nodes == nil {
		return binomialCDF(k, q.Volume, q.Rate)
	}
	sum := 0.0
	for _, m := range q.nodes {
		sum += binomialCDF(k, q.Volume, min(q.Rate*m, 1))
	}
	return sum / float64(len(q.nodes))
}

// Quantile returns the least whole number of alerts k with CDF(k) >= p.
func (q Queue) Quantile(p float64) float64 {
	if !(q.Volume > 0) || math.IsNaN(q.Rate) {
		return math.NaN()
	}
	lo, hi := -1.0, math.Ceil(q.Volume) // CDF(lo) < p <= CDF(hi)
	// Bracket the answer from the normal approximation, widening by
	// doubling steps, then halve the bracket.
	sd := math.Sqrt(q.Volume*q.Rate*(1-q.Rate) + math.Pow(q.Mean()*q.Spread, 2))
	guess := min(max(math.Floor(q.Mean()+1.2815515655446004*sd), 0), hi)
	step := math.Max(math.Ceil(sd/4), 1)
	if q.CDF(guess) >= p {
		hi = guess
		for next := guess - step; next > lo; next, step = next-step, step*2 {
			if q.CDF(next) < p {
				lo = next
				break
			}
			hi = next
		}
	} else {
		lo = guess
		for next := guess + step; next < hi; next, step = next+step, step*2 {
			if q.CDF(next) >= p {
				hi = next
				break
			}
			lo = next
		}
	}
	for hi-lo > 1 {
		mid := math.Floor((lo + hi) / 2)
		if q.CDF(mid) >= p {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// binomialCDF returns P(X <= k) for X ~ Binomial(n, p), n real (the
// regularized incomplete beta function I_{1-p}(n-k, k+1)); above a
// variance of 2,500 the normal approximation with continuity correction,
// whose error at the 90th percentile is about a tenth of an alert there.
func binomialCDF(k, n, p float64) float64 {
	switch {
	case k < 0:
		return 0
	case k >= n || p <= 0:
		return 1
	case p >= 1:
		return 0
	}
	if v := n * p * (1 - p); v > 2500 {
		return 0.5 * math.Erfc(-(k+0.5-n*p)/math.Sqrt(2*v))
	}
	return regIncBeta(n-k, k+1, 1-p)
}

// regIncBeta is the regularized incomplete beta function I_x(a, b), by
// its continued fraction (Abramowitz and Stegun 26.5.8, evaluated by
// Lentz's method as in Press et al., Numerical Recipes, section 6.4).
func regIncBeta(a, b, x float64) float64 {
	if x <= 0 {
		return 0
	}
	if x >= 1 {
		return 1
	}
	la, _ := math.Lgamma(a + b)
	lb, _ := math.Lgamma(a)
	lc, _ := math.Lgamma(b)
	front := math.Exp(la - lb - lc + a*math.Log(x) + b*math.Log1p(-x))
	if x < (a+1)/(a+b+2) {
		return front * betaFraction(a, b, x) / a
	}
	return 1 - front*betaFraction(b, a, 1-x)/b
}

func betaFraction(a, b, x float64) float64 {
	const tiny, eps = 1e-300, 1e-14
	qab, qap, qam := a+b, a+1, a-1
	c, d := 1.0, 1-qab*x/qap
	if math.Abs(d) < tiny {
		d = tiny
	}
	d = 1 / d
	h := d
	for m := 1; m <= 100000; m++ {
		fm := float64(m)
		aa := fm * (b - fm) * x / ((qam + 2*fm) * (a + 2*fm))
		d = 1 + aa*d
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = 1 + aa/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		h *= d * c
		aa = -(a + fm) * (qab + fm) * x / ((a + 2*fm) * (qap + 2*fm))
		d = 1 + aa*d
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = 1 + aa/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		del := d * c
		h *= del
		if math.Abs(del-1) < eps {
			break
		}
	}
	return h
}
