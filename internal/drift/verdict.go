package drift

import (
	"math"
	"sort"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/projection"
)

// Statuses of a check, and the exit codes the command gives them.
const (
	StatusOK         = "ok"         // exit 0: production behaves as validated, at the assumed base rate
	StatusDrift      = "drift"      // exit 1: the model no longer behaves as validated
	StatusAssumption = "assumption" // exit 3: the model behaves as validated; the base rate assumed is wrong
)

// Judged is one test of the verdict's family, with its adjusted outcome.
type Judged struct {
	Name     string
	PValue   float64
	Model    bool // a test of the model (its rejection is drift); false: of the base rate (assumption)
	Rejected bool // by Holm's step-down procedure at Level across the family
}

// ScoreTest compares the scores of one class with the validated ones, on
// bins cut from the file's curve (HomogeneityTest).
type ScoreTest struct {
	Defined   bool
	Bins      int
	Statistic float64
	Freedom   int
	PValue    float64
}

// holm marks the tests of family that Holm's step-down procedure rejects
// at level: with the p-values in ascending order, the i-th (from 0) is
// rejected while p < level/(m-i) (Holm 1979, "A simple sequentially
// rejective multiple test procedure", Scandinavian Journal of
// Statistics; from memory). It keeps the chance of any rejection under no
// change at most level whatever the tests' dependence. NaN p-values are
// not tests and are left out.
func holm(family []Judged, level float64) {
	var order []int
	for i, j := range family {
		if !math.IsNaN(j.PValue) {
			order = append(order, i)
		}
	}
	sort.SliceStable(order, func(a, b int) bool { return family[order[a]].PValue < family[order[b]].PValue })
	m := len(order)
	for rank, i := range order {
		if !(family[i].PValue < level/float64(m-rank)) {
			return
		}
		family[i].Rejected = true
	}
}

// judgeLabelled adds to res the tests that do not depend on the base rate
// (recall, false positive rate, the scores within each class) and the
// observed base rate against the assumed one.
func judgeLabelled(res *Result, f *decision.File, chosen decision.Candidate, t tally, opt Options) {
	v := chosen.Cut
	a := f.Assumptions
	valPositives, valNegatives := v.TP+v.FN, v.FP+v.TN
	val, fresh := validationTrials(v), t.effective(opt.Sample)
	res.FalsePositiveRate = Compare(fresh.fp, fresh.negatives, ratioOrNaN(v.FP, valNegatives), shrunkVariance(val.fp, val.negatives), opt.Tolerance, a.Confidence)
	assumedVariance := 0.0
	if res.BaseRateValidation {
		positives := valPositives
		if val.cases != valPositives+valNegatives && valPositives+valNegatives > 0 {
			positives = valPositives / (valPositives + valNegatives) * val.cases
		}
		assumedVariance = shrunkVariance(positives, val.cases)
	}
	freshPositives := t.positives
	if fresh.cases != t.weight && t.weight > 0 {
		freshPositives = t.positives / t.weight * fresh.cases
	}
	res.BaseRateTest = Compare(freshPositives, fresh.cases, res.BaseRate, assumedVariance, opt.Tolerance, a.Confidence)
	res.BaseRateObserved, res.BaseRateCI = res.BaseRateTest.Observed, res.BaseRateTest.ObservedCI
	res.BaseRateMethod = "Wilson interval of the labelled share"

	family := []Judged{
		{Name: "recall", PValue: definedP(res.Recall), Model: true},
		{Name: "false positive rate", PValue: definedP(res.FalsePositiveRate), Model: true},
	}
	if t.byPositives != nil {
		// Each side's bins at its class's effective size (unchanged for
		// frequency weights); bin by bin (designHomogeneity) for new data
		// under sampling weights and for a file that keeps its squared
		// weights (data.squared_weights), whose class bins then count at
		// their own noise: one size for a class thinned by score read
		// its thinned bins at the rows of the others and alarmed on noise.
		validationPositives := atSize(t.byPositives.positives, val.positives, valPositives)
		validationNegatives := atSize(t.byNegatives.negatives, val.negatives, valNegatives)
		if opt.Sample.Sampling() || t.byPositives.positiveSquares != nil {
			freshPositiveSquares, freshNegativeSquares := t.newPositives, t.newNegatives
			if opt.Sample.Sampling() {
				freshPositiveSquares, freshNegativeSquares = t.newPositiveSquares, t.newNegativeSquares
			}
			if t.byPositives.positiveSquares != nil {
				validationPositives, validationNegatives = t.byPositives.positives, t.byNegatives.negatives
			}
			res.ScoresPositive = scoreTestDesign(validationPositives, t.byPositives.positiveSquares, t.newPositives, freshPositiveSquares)
			res.ScoresNegative = scoreTestDesign(validationNegatives, t.byNegatives.negativeSquares, t.newNegatives, freshNegativeSquares)
		} else {
			res.ScoresPositive = scoreTest(validationPositives, t.newPositives)
			res.ScoresNegative = scoreTest(validationNegatives, t.newNegatives)
		}
		family = append(family,
			Judged{Name: "scores of true cases", PValue: res.ScoresPositive.PValue, Model: true},
			Judged{Name: "scores of false cases", PValue: res.ScoresNegative.PValue, Model: true})
	}
	family = append(family, Judged{Name: "base rate", PValue: definedP(res.BaseRateTest)})
	res.Family = family
}

// judgeUnlabelled fits the base rate that best explains the new scores as
// a mixture of the validated class distributions, tests the fit and the
// fitted rate against the assumed one.
func judgeUnlabelled(res *Result, f *decision.File, t tally, opt Options) {
	b := t.mixture
	P, N := sum(b.positives), sum(b.negatives)
	f1, f0 := make([]float64, len(b.positives)), make([]float64, len(b.negatives))
	for j := range f1 {
		f1[j], f0[j] = b.positives[j]/P, b.negatives[j]/N
	}
	// Each side at its effective size (unchanged for frequency weights).
	// The class shares f1 and f0 rest on each class's own effective size
	// (recall's and the false positive rate's trials: the unweighted rows
	// when a class was downsampled), not on the weighted total's: scaling
	// the weighted class totals to the base rate's effective size gave the
	// downsampled class ten times the rows it has and alarmed in 81 of
	// 400 no-drift runs (TestVerdictDownsampledFalseAlarmRate).
	v, _ := f.ChosenCandidate()
	val := validationTrials(v.Cut)
	if val.positives > 0 && val.negatives > 0 {
		P, N = val.positives, val.negatives
	}
	// A file that keeps its squared weights gives each bin's share its
	// own variance (binShares); the class sizes are then Kish's.
	var v1, v0 []float64
	if b.positiveSquares != nil {
		_, v1 = binShares(b.positives, b.positiveSquares)
		_, v0 = binShares(b.negatives, b.negativeSquares)
		if v1 != nil && v0 != nil {
			P, N = kishSize(b.positives, b.positiveSquares), kishSize(b.negatives, b.negativeSquares)
		}
	}
	// The new data's own noise: a multinomial sample of their weight
	// (frequency weights), or under sampling weights one of Kish's
	// effective size times the bins' mean design effect (designEffect).
	n, effect := t.weight, 1.0
	if opt.Sample.Sampling() {
		effect, n = designEffect(t.mixed, t.mixedSquares)
	}
	m := FitMixture(atSize(t.mixed, n, t.weight), f1, f0, f.Assumptions.Confidence, mixtureInflation(f1, f0, v1, v0, P, N, n, effect))
	res.Mixture = &m
	res.BaseRateObserved, res.BaseRateCI = m.BaseRate, m.CI
	res.BaseRateMethod = "maximum likelihood of the scores as a mixture of the validated classes, profile-likelihood interval"
	assumedVariance := 0.0
	if res.BaseRateValidation {
		cases := val.cases
		if !(cases > 0) {
			cases = P + N
		}
		assumedVariance = res.BaseRate * (1 - res.BaseRate) / cases
	}
	res.BaseRateP = m.Against(res.BaseRate, assumedVariance, opt.Tolerance)
	res.Family = []Judged{
		{Name: "scores fit a mixture of the validated classes", PValue: m.FitP, Model: true},
		{Name: "base rate", PValue: res.BaseRateP},
	}
}

// scoreTest runs HomogeneityTest when both samples are big enough for its
// chi-square reading: bins that expect fewer than five new cases are
// merged with their neighbour first.
func scoreTest(validation, fresh []float64) ScoreTest {
	a, b, _ := mergeSmall(validation, fresh, 5)
	if len(a) < 2 {
		return ScoreTest{PValue: math.NaN(), Statistic: math.NaN()}
	}
	s, k, p := HomogeneityTest(a, b)
	return ScoreTest{Defined: !math.IsNaN(p), Bins: len(a), Statistic: s, Freedom: k, PValue: p}
}

// scoreTestDesign is scoreTest bin by bin: fresh are the new data's
// weighted counts and freshSquares their squared weights per bin,
// validation the validated class's counts with validationSquares (nil:
// validation is at its effective size, a multinomial sample); bins are
// merged on both sides' counts at Kish's effective size and compared by
// designHomogeneity.
func scoreTestDesign(validation, validationSquares, fresh, freshSquares []float64) ScoreTest {
	if validationSquares == nil {
		validationSquares = validation
	}
	na, nb := kishSize(validation, validationSquares), kishSize(fresh, freshSquares)
	a, _, merged := mergeSmall(atSize(validation, na, sum(validation)), atSize(fresh, nb, sum(fresh)), 5, validation, validationSquares, fresh, freshSquares)
	if len(a) < 2 {
		return ScoreTest{PValue: math.NaN(), Statistic: math.NaN()}
	}
	s, k, p := designHomogeneity(merged[0], merged[1], merged[2], merged[3])
	return ScoreTest{Defined: !math.IsNaN(p), Bins: len(a), Statistic: s, Freedom: k, PValue: p}
}

// mergeSmall merges neighbouring bins until each expects at least least
// cases of fresh's total under validation's shares (and holds some
// validation weight); the last bin joins the one before it when short.
// Each slice of also (of validation's length) is merged alike, into
// merged.
func mergeSmall(validation, fresh []float64, least float64, also ...[]float64) (a, b []float64, merged [][]float64) {
	total, freshTotal := sum(validation), sum(fresh)
	if !(total > 0) || !(freshTotal > 0) {
		return nil, nil, nil
	}
	merged = make([][]float64, len(also))
	var va, fa float64
	pending := make([]float64, len(also))
	for j := range validation {
		va += validation[j]
		fa += fresh[j]
		for k, x := range also {
			pending[k] += x[j]
		}
		if va/total*freshTotal >= least && va/total*total >= least {
			a, b = append(a, va), append(b, fa)
			for k := range also {
				merged[k] = append(merged[k], pending[k])
			}
			va, fa = 0, 0
			clear(pending)
		}
	}
	if va > 0 || fa > 0 {
		if len(a) == 0 {
			return nil, nil, nil
		}
		a[len(a)-1] += va
		b[len(b)-1] += fa
		for k := range also {
			merged[k][len(a)-1] += pending[k]
		}
	}
	return a, b, merged
}

// decide applies Holm's procedure to res.Family and sets the status, and
// when the base rate moved alone, the figures re-projected at the
// observed one.
func decide(res *Result, f *decision.File, chosen decision.Candidate) {
	holm(res.Family, Level)
	model, base := false, false
	for _, j := range res.Family {
		switch {
		case j.Rejected && j.Model:
			model = true
		case j.Rejected:
			base = true
		}
	}
	switch {
	case model:
		res.Verdict = StatusDrift
	case base:
		res.Verdict = StatusAssumption
	default:
		res.Verdict = StatusOK
	}
	res.Drift = model
	if !math.IsNaN(res.BaseRateObserved) {
		v := chosen.Cut
		a := f.Assumptions
		a.BaseRate = res.BaseRateObserved
		res.Reprojected = projection.Project(curve.Point{Score: v.Score, TP: v.TP, FP: v.FP, FN: v.FN, TN: v.TN}, a)
		res.Volume, res.Capacity = a.Volume, a.Capacity
	}
}

// SmallValidation reports whether the validation set holds fewer cases
// than the new data: the check's power and false alarms then rest mostly
// on the validation set's own noise.
func (r *Result) SmallValidation() bool {
	return r.ValidationWeight > 0 && r.ValidationWeight < r.Weight
}

func definedP(t Test) float64 {
	if !t.Defined {
		return math.NaN()
	}
	return t.PValue
}

func ratioOrNaN(num, den float64) float64 {
	if !(den > 0) {
		return math.NaN()
	}
	return num / den
}

func sum(xs []float64) float64 {
	s := 0.0
	for _, x := range xs {
		s += x
	}
	return s
}

// atSize returns counts scaled from their total weight to size, the
// effective size of the sample they count; counts themselves when the two
// agree (frequency weights) or the weight is not positive.
func atSize(counts []float64, size, weight float64) []float64 {
	if size == weight || !(weight > 0) {
		return counts
	}
	return scaled(counts, size/weight)
}

// mixtureInflation returns the factor FitMixture divides the new data's
// deviance by: the mean over the bins in use of the variance of a bin's
// share of n new cases less its fitted mixture share, over the
// multinomial variance of n new cases (the first-order design effect of Rao
// and Scott 1981, from memory). The new data's part is effect (1 for a
// multinomial sample of n, the bins' mean design effect under sampling
// weights); the validated shares f1 and f0, estimated from P true and N
// false cases, add p^2 var f1 + (1-p)^2 var f0 bin by bin, so that a bin
// of true cases is not charged the noise of the false ones. var f1 is
// v1 (the shares' variances under sampling weights), or f1(1-f1)/P when
// v1 is nil; likewise var f0.
func mixtureInflation(f1, f0, v1, v0 []float64, P, N, n, effect float64) func(p float64) float64 {
	variance := func(f, v []float64, size float64, j int) float64 {
		if v != nil {
			return v[j]
		}
		return f[j] * (1 - f[j]) / size
	}
	return func(p float64) float64 {
		var ratio float64
		used := 0
		for j := range f1 {
			share := p*f1[j] + (1-p)*f0[j]
			if !(share > 0) {
				continue
			}
			used++
			ratio += (p*p*variance(f1, v1, P, j) + (1-p)*(1-p)*variance(f0, v0, N, j)) / share
		}
		if used < 2 {
			return effect + n*(p*p/P+(1-p)*(1-p)/N)
		}
		return effect + n*ratio/float64(used-1)
	}
}
