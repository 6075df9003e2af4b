package bootstrap

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestBinomialMoments: the binomial draws have the mean n*p and variance
// n*p*(1-p) of the binomial distribution (textbook formulas), on both
// sides of the switch from inversion to the normal, at p above one
// half (drawn as failures), at the edges p = 0 and 1, and at a p tiny
// beside a huge n. Seeded; 20000 draws each, so the
// sample mean is within 5 standard errors of n*p and the sample variance
// within 10% of n*p*(1-p).
func TestBinomialMoments(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, c := range []struct {
		n int
		p float64
	}{{10, 0.3}, {1000, 0.02}, {1000, 0.029}, {1000, 0.031}, {100000, 0.4}, {50, 0.9}, {3_000_000_000, 0.5}, {1 << 40, 1e-13}} {
		const draws = 20000
		var sum, sumSquares float64
		for range draws {
			x := binomial(rng, c.n, c.p)
			if x < 0 || x > c.n {
				t.Fatalf("n %d p %v: draw %d outside [0, n]", c.n, c.p, x)
			}
			sum += float64(x)
			sumSquares += float64(x) * float64(x)
		}
		mean := sum / draws
		variance := sumSquares/draws - mean*mean
		wantMean, wantVariance := float64(c.n)*c.p, float64(c.n)*c.p*(1-c.p)
		if math.Abs(mean-wantMean) > 5*math.Sqrt(wantVariance/draws) {
			t.Errorf("n %d p %v: mean %v, want %v", c.n, c.p, mean, wantMean)
		}
		if math.Abs(variance-wantVariance) > 0.1*wantVariance {
			t.Errorf("n %d p %v: variance %v, want %v", c.n, c.p, variance, wantVariance)
		}
	}
	if binomial(rng, 10, 0) != 0 || binomial(rng, 10, 1) != 10 || binomial(rng, 0, 0.5) != 0 {
		t.Error("edges: p = 0 must give 0, p = 1 must give n, n = 0 must give 0")
	}
	if x := binomial(rng, 10, 1e-300); x != 0 {
		t.Errorf("p = 1e-300 over 10 trials gave %d", x)
	}
}

// TestPoissonMoments: Poisson draws have mean and variance m (textbook
// formulas), on both sides of the switch from inversion to the normal and
// at whole and fractional means. Seeded; 20000 draws each, so the sample
// mean is within 5 standard errors of m and the variance within 10%.
func TestPoissonMoments(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for _, m := range []float64{0.3, 1, 2, 7.5, 29, 29.9, 30, 1000, 4e6} {
		const draws = 20000
		var sum, sumSquares float64
		for range draws {
			x := float64(poisson(rng, m))
			if x < 0 {
				t.Fatalf("m %v: draw %v below 0", m, x)
			}
			sum += x
			sumSquares += x * x
		}
		mean := sum / draws
		variance := sumSquares/draws - mean*mean
		if math.Abs(mean-m) > 5*math.Sqrt(m/draws) {
			t.Errorf("m %v: mean %v", m, mean)
		}
		if math.Abs(variance-m) > 0.1*m {
			t.Errorf("m %v: variance %v", m, variance)
		}
	}
	if poisson(rng, 0) != 0 {
		t.Error("m = 0 must give 0")
	}
}
