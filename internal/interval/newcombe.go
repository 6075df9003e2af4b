package interval

import (
	"fmt"
	"math"
)

// Difference returns the interval of p1 - p2, the difference between two
// independent proportions s1/n1 and s2/n2, by the hybrid score method
// built from Wilson limits (Newcombe 1998, "Interval estimation for the
// difference between independent proportions: comparison of eleven
// methods", Statistics in Medicine 17, method 10): with (l1, u1) and
// (l2, u2) the Wilson intervals of the two proportions at the same level,
//
//	lower = d - sqrt((p1-l1)² + (u2-p2)²)
//	upper = d + sqrt((u1-p1)² + (p2-l2)²)
//
// Counts may be non-integer and are read as Wilson reads them. When
// either proportion has no trials the difference is undefined and both
// ends are NaN. It panics when confidence lies outside (0,1).
func Difference(s1, n1, s2, n2, confidence float64) (lower, upper float64) {
	return differenceAtZ(s1, n1, s2, n2, Z(confidence))
}

// DifferenceP returns the two-sided p-value of no difference between the
// two proportions that agrees with Difference: the largest 1 - confidence
// at which Difference's interval still holds 0 (the normal quantile found
// to 1e-12 by Brent's method, see nearEndRoot). A p below 1 - confidence is thus the same as an
// interval that leaves out 0. Equal proportions give 1; an undefined
// difference gives NaN.
func DifferenceP(s1, n1, s2, n2 float64) float64 {
	if !(n1 > 0 && n2 > 0) {
		return math.NaN()
	}
	d := clampShare(s1, n1) - clampShare(s2, n2)
	if d == 0 {
		return 1
	}
	// The interval's near end moves away from d as z grows, and passes 0
	// before z reaches the point where p is below any float's reach.
	nearEnd := func(z float64) float64 {
		lower, upper := differenceAtZ(s1, n1, s2, n2, z)
		if d > 0 {
			return lower
		}
		return -upper
	}
	const hi = 40.0
	atHi := nearEnd(hi)
	if atHi > 0 {
		return 0
	}
	// At z = 0 both Wilson intervals are their points: the near end is d.
	return math.Erfc(nearEndRoot(nearEnd, 0, hi, math.Abs(d), atHi, 1e-12) / math.Sqrt2)
}

// nearEndRoot returns a root of f in [a, b], where fa = f(a) and fb = f(b)
// have opposite signs (or one is 0), to within tol, by Brent's method
// (Brent 1973, "Algorithms for Minimization without Derivatives", ch. 4,
// the zero finder known as zeroin): inverse quadratic or secant steps
// while they stay inside the bracket and shrink it fast enough, else
// bisection. It takes about a fifth of bisection's evaluations of f at the
// same tolerance, and like bisection it keeps the root bracketed.
func nearEndRoot(f func(float64) float64, a, b, fa, fb, tol float64) float64 {
	const eps = 0x1p-52
	c, fc := a, fa
	d := b - a
	e := d
	for range 200 {
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol1 := 2*eps*math.Abs(b) + tol/2
		half := (c - b) / 2
		if math.Abs(half) <= tol1 || fb == 0 {
			return b
		}
		if math.Abs(e) >= tol1 && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			s := fb / fa
			if a == c {
				p, q = 2*half*s, 1-s // secant
			} else {
				q, r := fa/fc, fb/fc // inverse quadratic
				p = s * (2*half*q*(q-r) - (b-a)*(r-1))
				q = (q - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < min(3*half*q-math.Abs(tol1*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = half, half
			}
		} else {
			d, e = half, half
		}
		a, fa = b, fb
		if math.Abs(d) > tol1 {
			b += d
		} else {
			b += math.Copysign(tol1, half)
		}
		fb = f(b)
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
	}
	return b
}

func differenceAtZ(s1, n1, s2, n2, z float64) (lower, upper float64) {
	if !(n1 > 0 && n2 > 0) {
		return math.NaN(), math.NaN()
	}
	p1, p2 := clampShare(s1, n1), clampShare(s2, n2)
	l1, u1 := wilsonAtZ(s1, n1, z)
	l2, u2 := wilsonAtZ(s2, n2, z)
	d := p1 - p2
	return d - math.Hypot(p1-l1, u2-p2), d + math.Hypot(u1-p1, p2-l2)
}

func clampShare(successes, trials float64) float64 {
	return min(max(successes, 0), trials) / trials
}

// OneSided returns the one-sided Wilson bounds at the given level, in
// (0.5, 1): lower is the bound the proportion lies above with that
// probability, upper the one it lies below. Each is the matching end of
// the two-sided Wilson interval at confidence 2·level - 1 (one tail of
// 1 - level on each side). With no trials both are NaN. It panics when
// level lies outside (0.5, 1).
func OneSided(successes, trials, level float64) (lower, upper float64) {
	if !(level > 0.5 && level < 1) {
		panic(fmt.Sprintf("interval: one-sided level %v outside (0.5,1)", level))
	}
	return Wilson(successes, trials, 2*level-1)
}

// wilsonAtZ is Wilson's interval at the normal quantile z >= 0.
func wilsonAtZ(successes, trials, z float64) (lower, upper float64) {
	successes = min(max(successes, 0), trials)
	p := successes / trials
	z2 := z * z
	centre := (p + z2/(2*trials)) / (1 + z2/trials)
	half := z / (1 + z2/trials) * math.Sqrt(p*(1-p)/trials+z2/(4*trials*trials))
	lower, upper = centre-half, centre+half
	if successes == 0 {
		lower = 0
	}
	if successes == trials {
		upper = 1
	}
	return max(lower, 0), min(upper, 1)
}
