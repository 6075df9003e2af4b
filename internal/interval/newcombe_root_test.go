package interval

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/format"
)

// bisectionP is DifferenceP as it was before Brent's method: bisection on
// z in [0, 40] until the bracket is narrower than 1e-12, p from its
// midpoint. It is the reference the faster search must agree with, and
// it counts its evaluations of the near end in evals.
func bisectionP(s1, n1, s2, n2 float64, evals *int) float64 {
	if !(n1 > 0 && n2 > 0) {
		return math.NaN()
	}
	d := clampShare(s1, n1) - clampShare(s2, n2)
	if d == 0 {
		return 1
	}
	nearEnd := func(z float64) float64 {
		*evals++
		lower, upper := differenceAtZ(s1, n1, s2, n2, z)
		if d > 0 {
			return lower
		}
		return -upper
	}
	lo, hi := 0.0, 40.0
	if nearEnd(hi) > 0 {
		return 0
	}
	for range 100 {
		mid := (lo + hi) / 2
		if nearEnd(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo < 1e-12 {
			break
		}
	}
	return math.Erfc((lo + hi) / 2 / math.Sqrt2)
}

// TestDifferencePAgreesWithBisection: over a seeded grid of 20,000 pairs
// of proportions (trials from 1 to 10^6 on a log scale, whole and
// fractional counts as weights give them, successes anywhere in [0, n]
// with the ends 0 and n a fifth of the time each, equal proportions
// among them), Brent's method gives the same p-value as the bisection
// it replaced to a relative 1e-9 plus 1e-15 (both find z to 1e-12, and
// p's relative error is about z·Δz, below 4e-11 for z <= 40; far out,
// at p near 1e-240, the near end is so flat in z that rounding alone moves
// the root by some 1e-11, so tiny p-values agree to 1e-15 only, all
// printing "<0.0001"), and the same as printed (format.PValue) in every
// pair; it takes at most half of bisection's
// evaluations on average.
func TestDifferencePAgreesWithBisection(t *testing.T) {
	const pairs, relative, absolute = 20000, 1e-9, 1e-15
	rng := rand.New(rand.NewPCG(2026, 12))
	trials := func() float64 {
		n := math.Pow(10, 6*rng.Float64())
		if rng.IntN(2) == 0 {
			n = math.Max(1, math.Round(n))
		}
		return n
	}
	successes := func(n float64) float64 {
		switch rng.IntN(5) {
		case 0:
			return 0
		case 1:
			return n
		}
		s := n * rng.Float64()
		if n == math.Round(n) {
			s = math.Round(s)
		}
		return s
	}
	var oldEvals, newEvals int
	count := func(s1, n1, s2, n2 float64) float64 {
		d := clampShare(s1, n1) - clampShare(s2, n2)
		p := DifferenceP(s1, n1, s2, n2)
		if d != 0 && !(p == 0) {
			// Brent's evaluations: f(40) and the steps (f(0) is d), counted
			// by running the search again with a counting f.
			nearEnd := func(z float64) float64 {
				newEvals++
				lower, upper := differenceAtZ(s1, n1, s2, n2, z)
				if d > 0 {
					return lower
				}
				return -upper
			}
			if got := nearEnd(0); got != math.Abs(d) {
				t.Fatalf("%v/%v - %v/%v: near end at z 0 is %v, DifferenceP takes it as %v", s1, n1, s2, n2, got, math.Abs(d))
			}
			newEvals--
			nearEndRoot(nearEnd, 0, 40, math.Abs(d), nearEnd(40), 1e-12)
		}
		return p
	}
	worst := 0.0
	for i := range pairs {
		n1, n2 := trials(), trials()
		s1, s2 := successes(n1), successes(n2)
		if i%50 == 0 {
			s2 = s1 / n1 * n2 // equal proportions
		}
		want := bisectionP(s1, n1, s2, n2, &oldEvals)
		got := count(s1, n1, s2, n2)
		if math.IsNaN(want) != math.IsNaN(got) || math.Abs(got-want) > relative*want+absolute {
			t.Fatalf("%v/%v - %v/%v: p %v, bisection %v", s1, n1, s2, n2, got, want)
		}
		if want > 1e-6 {
			worst = math.Max(worst, math.Abs(got-want)/want)
		}
		if format.PValue(got) != format.PValue(want) {
			t.Errorf("%v/%v - %v/%v: p prints %s, bisection %s", s1, n1, s2, n2, format.PValue(got), format.PValue(want))
		}
	}
	t.Logf("%d pairs: largest relative difference where p > 1e-6 %.3g; evaluations of the near end %d by bisection, %d by Brent's method", pairs, worst, oldEvals, newEvals)
	if 2*newEvals > oldEvals {
		t.Errorf("Brent's method took %d evaluations, bisection %d: want at most half", newEvals, oldEvals)
	}
}
