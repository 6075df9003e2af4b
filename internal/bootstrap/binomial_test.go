package bootstrap

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
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

// TestMultinomialKeepsClassSizes: above MaxCaseDraws a counts table's
// replicate drawn within classes still holds exactly as many cases of each class as the table,
// spread over its rows in about their shares. Hand-built: true cases
// 3,000,000 at score 0.9 and 1,000,000 at 0.5; false cases 2,000,000 at
// 0.5 and 4,000,000 at 0.1 (each class above MaxCaseDraws).
func TestMultinomialKeepsClassSizes(t *testing.T) {
	set, err := scores.NewCounts([]float64{0.9, 0.5, 0.5, 0.1}, []bool{true, true, false, false}, []float64{3e6, 1e6, 2e6, 4e6}, false)
	if err != nil {
		t.Fatal(err)
	}
	r := newReplicator(set, WithinClass, false)
	for _, g := range r.groups {
		if g.cases <= MaxCaseDraws {
			t.Fatalf("a class of %d cases does not pass MaxCaseDraws", g.cases)
		}
	}
	for b := range uint64(20) {
		rep := r.draw(1, b)
		positives, negatives := rep.Totals()
		if positives != 4e6 || negatives != 6e6 || rep.Cases() != 10e6 || !rep.CountsTable() {
			t.Fatalf("replicate %d: %v true and %v false cases, %d in all (counts table %v), want 4e6, 6e6 and 10e6", b, positives, negatives, rep.Cases(), rep.CountsTable())
		}
		for i, w := range rep.Weights() {
			share := w / map[bool]float64{true: 4e6, false: 6e6}[rep.Labels()[i]]
			want := set.Weights()[i] / map[bool]float64{true: 4e6, false: 6e6}[set.Labels()[i]]
			if math.Abs(share-want) > 0.002 { // about 8 standard errors of a share near one half among millions
				t.Errorf("replicate %d row %d: share %v, want about %v", b, i, share, want)
			}
		}
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

// TestPoissonTableIsInversion: for a whole mean below 30 the draws from
// the table of chances are the draws of the inversion that computes each
// chance in turn (e^-m, then each times m/x), one for one on the same
// stream, including uniforms close enough to 1 to run past the table
// (which keeps 24 chances).
func TestPoissonTableIsInversion(t *testing.T) {
	inversion := func(u, m float64) int {
		f, x := math.Exp(-m), 0
		for u > f && f > 0 {
			u -= f
			x++
			f *= m / float64(x)
		}
		return x
	}
	rng := rand.New(rand.NewPCG(24, 30))
	check := rand.New(rand.NewPCG(24, 30))
	for draw := range 200000 {
		m := float64(1 + draw%29)
		if draw%2 == 0 {
			m = 1 // the usual cell
		}
		got := poisson(rng, m)
		if want := inversion(check.Float64(), m); got != want {
			t.Fatalf("draw %d, mean %v: %d from the table, %d by inversion", draw, m, got, want)
		}
	}
	for _, u := range []float64{1 - 1e-16, 1 - 1e-12, 0.999999999} {
		for _, m := range []float64{1, 2, 29} {
			// A generator whose next uniform is u is not at hand; compare
			// the table's walk through poissonFromUniform instead.
			if got, want := poissonFromUniform(u, m), inversion(u, m); got != want {
				t.Errorf("u %v mean %v: %d from the table, %d by inversion", u, m, got, want)
			}
		}
	}
}

// TestWholeMeanDraws: the draws of a cell of m cases (m whole, below 30)
// follow the Poisson distribution of mean m: over 400,000 seeded draws
// each at m = 1, 2, 10 and 29 the share of each count from 0 to m+3 lies
// within 5 standard errors of e^-m m^x/x! (textbook), and the mean and
// variance within 5 standard errors of m (the sample variance's is about
// √((m + 2m²)/draws), from the Poisson's fourth central moment m + 3m²).
func TestWholeMeanDraws(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	var whole wholeMeanDraws
	const draws = 400_000
	for _, m := range []int{1, 2, 10, 29} {
		counts := map[int]float64{}
		var sum, sumSquares float64
		for range draws {
			x := whole.draw(rng, m)
			counts[x]++
			sum += float64(x)
			sumSquares += float64(x * x)
		}
		chance := math.Exp(-float64(m))
		for x := 0; x <= m+3; x++ {
			if x > 0 {
				chance *= float64(m) / float64(x)
			}
			got := counts[x] / draws
			if se := math.Sqrt(chance * (1 - chance) / draws); math.Abs(got-chance) > 5*se {
				t.Errorf("mean %d: share of %d %v, want %v within %v", m, x, got, chance, 5*se)
			}
		}
		mean := sum / draws
		variance := sumSquares/draws - mean*mean
		fm := float64(m)
		if math.Abs(mean-fm) > 5*math.Sqrt(fm/draws) || math.Abs(variance-fm) > 5*math.Sqrt((fm+2*fm*fm)/draws) {
			t.Errorf("mean %d: sample mean %v variance %v", m, mean, variance)
		}
	}
}
