// Package cutrule parses cut specs and finds the cut each one picks on a
// curve.
//
// The specs:
//
//	score=V    the cut at score V: the deepest cut that flags no case
//	           safer than V (the smallest data score >= V; the largest
//	           <= V when lower scores are riskier)
//	top=N      the deepest cut that flags at most N validation rows
//	top=P%     the deepest cut that flags at most P percent of the rows
//	hit=R      the strictest cut whose recall (hit share) is >= R
//	wrong=F    the deepest cut whose false discovery rate (wrong-alert
//	           share) is <= F
//	base       the deepest cut whose alert rate does not exceed the base rate
//	queue=K    the deepest cut whose queue per shift is <= K (needs a volume)
//	cost       the cut of least cost, the strictest among equals (needs costs)
//	queue90=K  the deepest cut at which 9 shifts in 10 of the validation
//	           period queue at most K alerts (needs case times and a shift
//	           schedule, WithShifts; see package shift)
//	hitNN=R    the strictest cut whose one-sided NN% lower bound of
//	           recall is >= R (hit95=0.8): its recall is at least R with
//	           NN% confidence
//	wrongNN=F  the deepest cut whose one-sided NN% upper bound of the
//	           wrong-alert share is <= F (wrong95=0.333)
//
// hit=R and wrong=F meet their figure on the validation set only: the
// cut's true recall lies below R (or its true wrong-alert share above F)
// about half the time. hitNN= and wrongNN= keep their promise in all but
// about 100-NN% of validation sets. NN, the level in percent, lies in
// (50, 100) and may have decimals (hit99.5=0.8). The bounds are
// one-sided Wilson bounds (package interval, OneSided) of the validation
// counts; wrongNN=F, like wrong=F, reads the projected wrong-alert share
// when production's base rate differs from the validation set's, and its
// bound is then one end of the projected precision's interval
// (projection.PrecisionInterval, at two-sided confidence 2·NN%-1).
//
// R and F are shares, written as package share reads them (0.8 or 80%);
// so is P%, which may be a fraction of a percent (top=0.5%).
//
// score= concerns the ranked list. top= counts cases: rows, a counts
// table's cases, or with weights the weighted cases (the sum of the
// flagged rows' weights; top=P% of the sum of all weights). On a set
// whose rows all weigh 0 no case counts: every rule but score= is unmet,
// its reason saying so (top= would otherwise take the loosest cut, which
// flags nothing of weight).
// The other rules use the projected production figures (package
// projection), which equal the validation figures when the production base
// rate is the validation one. Which cases a cut flags follows the cut rule
// in the doc of package scores. Comparisons allow a relative slack of
// 1e-12, so that rounding in the projection never decides a tie.
package cutrule

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/interval"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/share"
	"github.com/sill-tool/sill/internal/shift"
)

// Kind says which rule a spec is.
type Kind int

// The kinds of rule, in the order of the package doc.
const (
	Score Kind = iota
	Top
	Hit
	Wrong
	Base
	Queue
	Cost
	Queue90
	HitBound   // hitNN=R
	WrongBound // wrongNN=F
)

var kindNames = [...]string{Score: "score", Top: "top", Hit: "hit", Wrong: "wrong", Base: "base", Queue: "queue", Cost: "cost", Queue90: "queue90",
	HitBound: "hit", WrongBound: "wrong"}

// Rule is a parsed cut spec.
type Rule struct {
	Kind    Kind
	Value   float64 // the number after '='; unused by base and cost
	Percent bool    // top=P%: Value is a percentage
	// Level is NN of hitNN= and wrongNN=, the one-sided level in percent
	// as written (95); 0 for other rules.
	Level float64
}

// Confidence returns the one-sided level of a hitNN= or wrongNN= rule as
// a share (0.95), 0 for other rules.
func (r Rule) Confidence() float64 { return r.Level / 100 }

// expected lists the specs, for the error of a spec that is none of them.
const expected = "expected one of score=V, top=N, top=P%, hit=R, hitNN=R, wrong=F, wrongNN=F, base, queue=K, queue90=K, cost " +
	"(R and F shares such as 0.8 or 80%, NN a one-sided level in percent above 50 and below 100, as in hit95=0.8)"

// Errors returned by Parse and Find. They name what is missing, not how a
// caller sets it; the command line adds its flags.
var (
	ErrMalformed   = errors.New("malformed cut spec")
	ErrNeedsVolume = errors.New("needs a volume per shift")
	ErrNeedsCosts  = errors.New("needs at least one cost")
	ErrNeedsShifts = errors.New("needs case times and a shift schedule")
)

// slack is the relative tolerance of every comparison with a rule's value.
const slack = 1e-12

// Parse reads a spec such as "hit=0.8", "top=5%" or "base".
func Parse(text string) (Rule, error) {
	spec := strings.TrimSpace(text)
	name, value, hasValue := strings.Cut(spec, "=")
	name = strings.ToLower(strings.TrimSpace(name))
	value = strings.TrimSpace(value)
	bad := func(why string) (Rule, error) {
		return Rule{}, fmt.Errorf("%w %q: %s", ErrMalformed, text, why)
	}
	kind, level, why := parseName(name)
	if why != "" {
		return bad(why)
	}
	r := Rule{Kind: Kind(kind), Level: level}
	if r.Kind == Base || r.Kind == Cost {
		if hasValue {
			return bad(name + " takes no value")
		}
		return r, nil
	}
	if !hasValue || value == "" {
		return bad(name + " needs a value after '='")
	}
	if r.Kind == Hit || r.Kind == Wrong || r.Kind == HitBound || r.Kind == WrongBound || r.Kind == Top && strings.HasSuffix(value, "%") {
		s, err := share.Read(value)
		if err != nil {
			return bad(err.Error())
		}
		r.Value = s.Fraction
		if r.Kind == Top { // top=P% keeps P as written
			r.Value, r.Percent = s.Written, true
			if r.Value == 0 {
				return bad("expected a percentage above 0% and at most 100%")
			}
		}
		return r, nil
	}
	v, err := strconv.ParseFloat(value, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return bad(fmt.Sprintf("%q is not a finite number", value))
	}
	r.Value = v
	switch {
	case r.Kind == Top && !(v >= 1 && v == math.Trunc(v)):
		return bad("expected a whole number of rows, at least 1")
	case (r.Kind == Queue || r.Kind == Queue90) && !(v >= 0):
		return bad("expected a queue size of at least 0")
	}
	return r, nil
}

// parseName reads the name before '=': one of kindNames, or hit or wrong
// followed by a level in percent (hitNN, wrongNN). why says what was
// expected when it is none of them.
func parseName(name string) (kind int, level float64, why string) {
	for k, n := range kindNames[:HitBound] {
		if n == name {
			return k, 0, ""
		}
	}
	for _, b := range []struct {
		prefix string
		kind   Kind
	}{{"hit", HitBound}, {"wrong", WrongBound}} {
		digits, ok := strings.CutPrefix(name, b.prefix)
		if !ok || digits == "" || !(digits[0] >= '0' && digits[0] <= '9') {
			continue
		}
		v, err := strconv.ParseFloat(digits, 64)
		if err != nil || !(v > 50 && v < 100) {
			return 0, 0, fmt.Sprintf("%q is not a level: expected %sNN with NN in percent above 50 and below 100, as in %s95", digits, b.prefix, b.prefix)
		}
		return int(b.kind), v, ""
	}
	return 0, 0, expected
}

// String returns the spec in the form Parse reads.
func (r Rule) String() string {
	name := kindNames[r.Kind]
	switch r.Kind {
	case Base, Cost:
		return name
	case HitBound, WrongBound:
		name += strconv.FormatFloat(r.Level, 'g', -1, 64)
	case Top:
		if r.Percent {
			return name + "=" + strconv.FormatFloat(r.Value, 'g', -1, 64) + "%"
		}
	}
	return name + "=" + strconv.FormatFloat(r.Value, 'g', -1, 64)
}

// Defaults returns the usual starting points (rules of thumb from common
// practice, no source): match the base rate, catch 80% of true cases,
// accept about one wrong alert in three; then queue=capacity when a
// capacity and a volume are given, and cost when costs are given; then
// hit=0.8 and wrong=0.333 again with a 95% promise (Promised).
func Defaults(a projection.Assumptions) []Rule {
	rules := []Rule{{Kind: Base}, {Kind: Hit, Value: 0.8}, {Kind: Wrong, Value: 0.333}}
	if a.Capacity > 0 && a.Volume > 0 {
		rules = append(rules, Rule{Kind: Queue, Value: a.Capacity})
	}
	if a.Costs != nil {
		rules = append(rules, Rule{Kind: Cost})
	}
	return append(rules, Promised()...)
}

// Promised returns the starting points that keep a promise: hit95=0.8
// and wrong95=0.333, the hit=0.8 and wrong=0.333 of Defaults at a
// one-sided 95% level. They come last among the starting points, so
// that the keys of the others keep their places.
func Promised() []Rule {
	return []Rule{{Kind: HitBound, Value: 0.8, Level: 95}, {Kind: WrongBound, Value: 0.333, Level: 95}}
}

// Outcome is the cut a rule picks. When Met is false, Point is the zero
// value and Reason says why no cut meets the rule.
type Outcome struct {
	Rule      Rule
	Met       bool
	Reason    string
	Point     curve.Point
	Projected projection.Figures
}

// Find applies rules to every cut of c under a.
func Find(rules []Rule, c *curve.Curve, a projection.Assumptions) ([]Outcome, error) {
	f, err := NewFinder(rules, c.Set, a)
	if err != nil {
		return nil, err
	}
	c.Points(f.Visit)
	return f.Outcomes(), nil
}

// Finder applies rules to a stream of points, strictest first, in memory
// independent of the number of cuts.
type Finder struct {
	rules []Rule
	set   *scores.Set // nil for a Finder of class totals (NewTotalsFinder)
	// weighted and lowerIsRiskier are the set's (scores.Set.Weighted,
	// scores.Set.LowerIsRiskier).
	weighted, lowerIsRiskier bool
	a                        projection.Assumptions
	found                    []bool
	best                     []Outcome

	// The strictest point and its figures, for the reasons of unmet rules.
	seen         bool
	first        curve.Point
	firstFigures projection.Figures
	leastWrong   float64 // the least defined projected wrong-alert share seen; NaN before one

	// For queue90=K: the shifts of the set's rows, and per rule a counter
	// of the shift queues (nil for other rules).
	// totalCases is what top=P% takes its share of: the weighted cases
	// of a weighted set, else the cases (rows, or a counts table's cases).
	totalCases float64

	// projectedWrong says whether wrongNN= bounds the projected
	// wrong-alert share (production's base rate differs from the set's).
	projectedWrong bool

	// weightless says the set has rows but every one weighs 0: no case
	// counts, and only score= (which reads the ranked list) can be met.
	weightless bool

	shifts    *shift.Assignment
	scale     shift.Scale
	counters  []*shift.Counter
	firstP90  []float64
	rowsAdded int
}

// Option adjusts a Finder.
type Option func(*Finder)

// WithShifts gives a Finder the shifts of the set's rows and the scale of
// their queues, which queue90=K needs.
func WithShifts(a shift.Assignment, scale shift.Scale) Option {
	return func(f *Finder) { f.shifts, f.scale = &a, scale }
}

// NewFinder checks that the assumptions suit the rules and returns a
// Finder for points of set.
func NewFinder(rules []Rule, set *scores.Set, a projection.Assumptions, opts ...Option) (*Finder, error) {
	positives, negatives := set.Totals()
	f := newFinder(rules, a, positives, negatives, float64(set.Cases()))
	f.set, f.weighted, f.lowerIsRiskier = set, set.Weighted(), set.LowerIsRiskier()
	if f.weighted {
		f.totalCases = positives + negatives
		f.weightless = set.Len() > 0 && !(positives+negatives > 0)
	}
	for _, o := range opts {
		o(f)
	}
	var cases shift.Spread
	casesKnown := false
	for i, r := range rules {
		if r.Kind != Queue90 {
			continue
		}
		if f.shifts == nil {
			return nil, fmt.Errorf("cut %s %w", r, ErrNeedsShifts)
		}
		if len(f.shifts.Of) != set.Len() {
			panic(fmt.Sprintf("cutrule: shifts of %d rows for a set of %d", len(f.shifts.Of), set.Len()))
		}
		if f.counters == nil {
			f.counters = make([]*shift.Counter, len(rules))
			f.firstP90 = make([]float64, len(rules))
		}
		if !casesKnown {
			cases, casesKnown = f.shifts.CaseSpread(set, f.scale), true
		}
		f.counters[i] = f.shifts.NewCounter(f.scale, cases, r.Value)
	}
	if err := f.check(); err != nil {
		return nil, err
	}
	return f, nil
}

// NewTotalsFinder returns a Finder for the points of a set known by its
// class totals alone, such as a bootstrap replicate whose points are
// drawn as they are asked for: positives true cases and negatives false
// cases (weighted sums when weighted, the set's scores.Set.Weighted),
// ranked with lower scores riskier when lowerIsRiskier. It takes no
// queue90=K rule (ErrNeedsShifts), and otherwise checks a as NewFinder
// does; it finds what NewFinder's Finder finds on the set itself.
func NewTotalsFinder(rules []Rule, positives, negatives float64, lowerIsRiskier, weighted bool, a projection.Assumptions) (*Finder, error) {
	for _, r := range rules {
		if r.Kind == Queue90 {
			return nil, fmt.Errorf("cut %s %w", r, ErrNeedsShifts)
		}
	}
	f := newFinder(rules, a, positives, negatives, positives+negatives)
	f.lowerIsRiskier, f.weighted = lowerIsRiskier, weighted
	f.weightless = weighted && !(positives+negatives > 0)
	if err := f.check(); err != nil {
		return nil, err
	}
	return f, nil
}

// newFinder returns a Finder of a set of the given class totals and cases.
func newFinder(rules []Rule, a projection.Assumptions, positives, negatives, cases float64) *Finder {
	f := &Finder{rules: rules, a: a, found: make([]bool, len(rules)), best: make([]Outcome, len(rules)), leastWrong: math.NaN()}
	for i, r := range rules {
		f.best[i].Rule = r
	}
	f.projectedWrong = a.BaseRate != positives/(positives+negatives)
	f.totalCases = cases
	return f
}

// check returns the error of a rule that the assumptions do not suit.
func (f *Finder) check() error {
	for _, r := range f.rules {
		if r.Kind == Queue && !(f.a.Volume > 0) {
			return fmt.Errorf("cut %s %w", r, ErrNeedsVolume)
		}
		if r.Kind == Cost && f.a.Costs == nil {
			return fmt.Errorf("cut %s %w", r, ErrNeedsCosts)
		}
	}
	return nil
}

// flaggedCases is what top= counts at p: the weighted cases flagged in a
// weighted set (frequency or sampling weights alike: the cases the set
// stands for), else the cases flagged.
func (f *Finder) flaggedCases(p curve.Point) float64 {
	if f.weighted {
		return p.TP + p.FP
	}
	return float64(p.Cases)
}

// WrongUpperBound returns the one-sided upper bound at level (a share in
// (0.5,1)) of the wrong-alert share at p: Wilson's on the validation
// counts (FP of TP+FP) when baseRate is the validation set's (projected
// false), otherwise one minus the lower end of the projected precision's
// interval at baseRate (projection.PrecisionInterval at two-sided
// confidence 2·level-1). NaN where nothing is flagged or the projected
// precision is undefined.
func WrongUpperBound(p curve.Point, baseRate, level float64, projected bool) float64 {
	if !projected {
		_, upper := interval.OneSided(p.FP, p.TP+p.FP, level)
		return upper
	}
	lower, _ := projection.PrecisionInterval(projection.Counts{TP: p.TP, FP: p.FP, FN: p.FN, TN: p.TN}, baseRate, 2*level-1)
	return 1 - lower
}

// HitLowerBound returns the one-sided lower bound at level (a share in
// (0.5,1)) of the recall at p: Wilson's of TP out of the true cases. NaN
// without true cases.
func HitLowerBound(p curve.Point, level float64) float64 {
	lower, _ := interval.OneSided(p.TP, p.Positives(), level)
	return lower
}

// riskier reports whether score a ranks riskier than score b (see
// scores.Set.Riskier).
func (f *Finder) riskier(a, b float64) bool {
	if f.lowerIsRiskier {
		return a < b
	}
	return a > b
}

// Visit considers the next point; points must come strictest first.
func (f *Finder) Visit(p curve.Point) {
	fig := projection.Project(p, f.a)
	if f.counters != nil {
		for ; f.rowsAdded < p.Rows; f.rowsAdded++ {
			for _, c := range f.counters {
				if c != nil {
					c.Add(f.rowsAdded, f.set.Labels()[f.rowsAdded], f.set.Weight(f.rowsAdded))
				}
			}
		}
	}
	if wrong := fig.FalseDiscoveryRate(); wrong < f.leastWrong || (math.IsNaN(f.leastWrong) && !math.IsNaN(wrong)) {
		f.leastWrong = wrong
	}
	if !f.seen {
		f.seen, f.first, f.firstFigures = true, p, fig
		for i, c := range f.counters {
			if c != nil {
				f.firstP90[i] = c.P90()
			}
		}
	}
	for i := range f.rules {
		if f.keeps(i, p, fig) {
			f.keep(i, p, fig)
		}
	}
}

// keeps reports whether rule i takes point p, whose projected figures are
// fig, over what it holds so far: points come strictest first, and a rule
// ends on the last point it keeps.
func (f *Finder) keeps(i int, p curve.Point, fig projection.Figures) bool {
	if f.weightless && f.rules[i].Kind != Score {
		return false
	}
	switch r := f.rules[i]; r.Kind {
	case Score:
		return !f.riskier(r.Value, p.Score) // p.Score is at or riskier than V
	case Top:
		limit := r.Value
		if r.Percent {
			limit = r.Value / 100 * f.totalCases
		}
		return f.flaggedCases(p) <= limit*(1+slack)
	case Hit:
		return !f.found[i] && p.Recall() >= r.Value-slack
	case Wrong:
		return fig.FalseDiscoveryRate() <= r.Value+slack
	case Base:
		return fig.AlertRate <= f.a.BaseRate*(1+slack)
	case Queue:
		return fig.QueuePerShift <= r.Value*(1+slack)
	case Cost:
		// Strictly less by more than the slack, so that the strictest
		// of equal costs stays; an undefined cost never wins.
		best := f.best[i].Projected.CostPerCase
		return !math.IsNaN(fig.CostPerCase) && (!f.found[i] || fig.CostPerCase < best-slack*math.Abs(best))
	case Queue90:
		return f.counters[i].Within()
	case HitBound:
		return !f.found[i] && HitLowerBound(p, r.Confidence()) >= r.Value-slack
	case WrongBound:
		return WrongUpperBound(p, f.a.BaseRate, r.Confidence(), f.projectedWrong) <= r.Value+slack
	}
	return false
}

// keep records point p as rule i's cut.
func (f *Finder) keep(i int, p curve.Point, fig projection.Figures) {
	f.found[i] = true
	f.best[i] = Outcome{Rule: f.rules[i], Met: true, Point: p, Projected: fig}
}

// Points gives random access to the cuts of a ranked set, strictest first
// (a *curve.Curve is one).
type Points interface {
	Len() int
	At(i int) curve.Point
}

// Search finds what visiting every point of pts in order would, for a
// Finder that has visited nothing yet, without projecting every cut for
// every rule. Rules that hold on the strictest cuts up to some cut and not
// beyond (score=, top=, base, queue=: the flagged cases, the hit share
// and the false positive rate only grow as the cut loosens, and so does
// every figure these rules compare) and hit=R, which first holds at some
// cut and from there on, are found by binary search. wrong=F, wrongNN=F
// (the deepest cut that holds), hitNN=R (the strictest) and cost (the
// least) are found by branch and bound over runs of cuts: between two cuts
// every cut has at least the FP and at most the TP of the looser one's
// ends, which bounds its figure (see mayKeep), and a run that cannot hold
// the answer is skipped. queue90=K needs every row in its shift, so a
// Finder with such a rule visits every point instead. Outcomes then
// returns the same as after visiting, reasons included.
func (f *Finder) Search(pts Points) {
	n := pts.Len()
	if f.seen {
		panic("cutrule: Search after Visit")
	}
	if f.counters != nil || n == 0 {
		for k := range n {
			f.Visit(pts.At(k))
		}
		return
	}
	first, last := pts.At(0), pts.At(n-1)
	f.seen, f.first, f.firstFigures = true, first, projection.Project(first, f.a)
	at := func(k int) (curve.Point, projection.Figures) {
		p := pts.At(k)
		return p, projection.Project(p, f.a)
	}
	all := run{lo: 0, hi: n - 1, first: first, last: last}
	for i, r := range f.rules {
		k := -1
		switch r.Kind {
		case Score, Top, Base, Queue:
			// The first cut where the rule no longer holds; the one before
			// it is the last that does.
			k = sort.Search(n, func(k int) bool { p, fig := at(k); return !f.keeps(i, p, fig) }) - 1
		case Hit:
			if k = sort.Search(n, func(k int) bool { p, fig := at(k); return f.keeps(i, p, fig) }); k == n {
				k = -1
			}
		case Wrong, WrongBound:
			k = f.deepest(i, pts, all)
		case HitBound:
			k = f.strictest(i, pts, all)
		case Cost:
			f.least(i, pts, all)
		}
		if k >= 0 {
			p, fig := at(k)
			f.keep(i, p, fig)
		}
		if r.Kind == Wrong && k < 0 {
			// Unmet: the least wrong-alert share of any cut, for the
			// reason, as visiting finds it.
			f.leastWrongOf(pts, all)
		}
	}
}

// run is the cuts lo to hi of a Points, both included, with the points
// at its two ends.
type run struct {
	lo, hi      int
	first, last curve.Point
}

// split halves a run of at least three cuts at its middle cut.
func (r run) split(pts Points) (stricter, looser run) {
	mid := (r.lo + r.hi) / 2
	p := pts.At(mid)
	return run{lo: r.lo, hi: mid, first: r.first, last: p}, run{lo: mid, hi: r.hi, first: p, last: r.last}
}

// corner returns the point with the TP of r's loosest cut and the FP of
// its strictest: every cut of r has at least its FP and at most its TP
// (both only grow as the cut loosens), so its projected wrong-alert share
// is at least the corner's, its recall at most the corner's, and so are
// their bounds (Wilson's one-sided bounds grow with the successes and
// fall with the failures).
func (r run) corner() curve.Point {
	return curve.Point{TP: r.last.TP, FN: r.last.FN, FP: r.first.FP, TN: r.first.TN}
}

// boundSlack widens the bounds of mayKeep and least far beyond rounding,
// so that a run is skipped only when no cut of it can hold; every cut
// they leave is judged by the rule itself.
const boundSlack = 1e-9

// mayKeep reports whether some cut of r might hold for rule i, a wrong=F,
// wrongNN=F or hitNN=R rule: false only when none can. A projected
// wrongNN=F bound is bounded by projection.PrecisionLowerCeiling.
func (f *Finder) mayKeep(i int, r run) bool {
	rule, p := f.rules[i], r.corner()
	var figure, limit float64
	switch rule.Kind {
	case Wrong:
		figure, limit = projection.Project(p, f.a).FalseDiscoveryRate(), rule.Value+slack+boundSlack
	case WrongBound:
		figure, limit = WrongUpperBound(p, f.a.BaseRate, rule.Confidence(), false), rule.Value+slack+boundSlack
		if f.projectedWrong {
			// One minus the lower limit of the projected precision's
			// interval, which is at most its ceiling over the run.
			counts := func(p curve.Point) projection.Counts {
				return projection.Counts{TP: p.TP, FP: p.FP, FN: p.FN, TN: p.TN}
			}
			figure = 1 - projection.PrecisionLowerCeiling(counts(r.first), counts(r.last), f.a.BaseRate, 2*rule.Confidence()-1)
		}
	case HitBound:
		// Holds where the bound reaches the value: compare negated.
		figure, limit = -HitLowerBound(p, rule.Confidence()), -(rule.Value - slack - boundSlack)
	default:
		return true
	}
	return math.IsNaN(figure) || figure <= limit
}

// deepest returns the loosest cut of r at which rule i holds, or -1.
func (f *Finder) deepest(i int, pts Points, r run) int {
	switch {
	case f.keeps(i, r.last, projection.Project(r.last, f.a)):
		return r.hi
	case r.hi == r.lo || !f.mayKeep(i, r):
		return -1
	case r.hi-r.lo == 1:
		if f.keeps(i, r.first, projection.Project(r.first, f.a)) {
			return r.lo
		}
		return -1
	}
	stricter, looser := r.split(pts)
	if k := f.deepest(i, pts, looser); k >= 0 {
		return k
	}
	return f.deepest(i, pts, stricter)
}

// strictest returns the strictest cut of r at which rule i holds, or -1.
func (f *Finder) strictest(i int, pts Points, r run) int {
	switch {
	case f.keeps(i, r.first, projection.Project(r.first, f.a)):
		return r.lo
	case r.hi == r.lo || !f.mayKeep(i, r):
		return -1
	case r.hi-r.lo == 1:
		if f.keeps(i, r.last, projection.Project(r.last, f.a)) {
			return r.hi
		}
		return -1
	}
	stricter, looser := r.split(pts)
	if k := f.strictest(i, pts, stricter); k >= 0 {
		return k
	}
	return f.strictest(i, pts, looser)
}

// leastWrongOf lowers f.leastWrong to the least defined projected
// wrong-alert share of a cut of r, as visiting every cut would, skipping
// a run whose least possible share (at its corner) is no lower.
func (f *Finder) leastWrongOf(pts Points, r run) {
	for _, p := range [2]curve.Point{r.first, r.last} {
		if wrong := projection.Project(p, f.a).FalseDiscoveryRate(); wrong < f.leastWrong || (math.IsNaN(f.leastWrong) && !math.IsNaN(wrong)) {
			f.leastWrong = wrong
		}
	}
	if r.hi-r.lo < 2 {
		return
	}
	if lowest := projection.Project(r.corner(), f.a).FalseDiscoveryRate(); lowest >= f.leastWrong+boundSlack {
		return
	}
	stricter, looser := r.split(pts)
	f.leastWrongOf(pts, stricter)
	f.leastWrongOf(pts, looser)
}

// least finds the cut of cost rule i as visiting every cut in order
// does: a cut takes the rule's place when its cost is below the held one
// by more than the slack. It first finds a low cost by branch and bound
// (lowestCost) and a limit a little above it, then the first cut at or
// below the limit: visiting in order, that cut takes the place of any
// before it (all above the limit) as long as it lies below the limit by
// more than twice the slack, and from there on only cuts at or below the
// limit can take the place. So it visits, in order, only those
// (costsWithin). Should the first cut lie within the slack of every limit
// tried, it visits in order every cut that could take the place
// (leastInOrder).
func (f *Finder) least(i int, pts Points, all run) {
	low := f.lowestCost(pts, all, math.NaN())
	if math.IsNaN(low) {
		return // no cut has a defined cost
	}
	for step := range 10 {
		limit := low + (1e-7*math.Abs(low)+1e-300)*math.Ldexp(1, -step)
		first, cost := f.firstCostWithin(pts, all, limit)
		if first >= 0 && cost < limit-2*slack*math.Abs(limit) {
			f.costsWithin(i, pts, all, first, limit)
			return
		}
	}
	f.leastInOrder(i, pts, all)
}

// costOf returns the projected cost per case at p.
func (f *Finder) costOf(p curve.Point) float64 { return projection.Project(p, f.a).CostPerCase }

// costFloor returns the least cost any cut of r can have, NaN where a
// corner's cost is undefined: cost is linear in TP and FP, so its least
// over a run lies at a corner of the run's TP and FP ranges.
func (f *Finder) costFloor(r run) float64 {
	lowest := math.Inf(1)
	for _, tp := range [2]curve.Point{r.first, r.last} {
		for _, fp := range [2]curve.Point{r.first, r.last} {
			c := f.costOf(curve.Point{TP: tp.TP, FN: tp.FN, FP: fp.FP, TN: fp.TN})
			if math.IsNaN(c) {
				return math.NaN()
			}
			lowest = min(lowest, c)
		}
	}
	return lowest
}

// above reports whether floor, a cost floor widened far beyond rounding,
// lies above limit; false when either is NaN.
func above(floor, limit float64) bool {
	return floor-boundSlack*(math.Abs(floor)+math.Abs(limit)) > limit
}

// lowestCost returns the least defined cost of a cut of r, or of low
// (NaN for none) when that is lower, by branch and bound.
func (f *Finder) lowestCost(pts Points, r run, low float64) float64 {
	for _, p := range [2]curve.Point{r.first, r.last} {
		if c := f.costOf(p); c < low || (math.IsNaN(low) && !math.IsNaN(c)) {
			low = c
		}
	}
	if r.hi-r.lo < 2 || above(f.costFloor(r), low) || f.costFloor(r) == low {
		return low
	}
	first, second := r.split(pts)
	if f.costFloor(second) < f.costFloor(first) {
		first, second = second, first
	}
	return f.lowestCost(pts, second, f.lowestCost(pts, first, low))
}

// firstCostWithin returns the strictest cut of r whose cost is at most
// limit and its cost, or -1.
func (f *Finder) firstCostWithin(pts Points, r run, limit float64) (int, float64) {
	switch c := f.costOf(r.first); {
	case c <= limit:
		return r.lo, c
	case r.hi == r.lo || above(f.costFloor(r), limit):
		return -1, math.NaN()
	case r.hi-r.lo == 1:
		if c := f.costOf(r.last); c <= limit {
			return r.hi, c
		}
		return -1, math.NaN()
	}
	stricter, looser := r.split(pts)
	if k, c := f.firstCostWithin(pts, stricter, limit); k >= 0 {
		return k, c
	}
	return f.firstCostWithin(pts, looser, limit)
}

// costsWithin visits in order, for cost rule i, the cuts of all from cut
// from on whose cost is at most limit.
func (f *Finder) costsWithin(i int, pts Points, all run, from int, limit float64) {
	consider := func(k int, p curve.Point) {
		if fig := projection.Project(p, f.a); k >= from && fig.CostPerCase <= limit && f.keeps(i, p, fig) {
			f.keep(i, p, fig)
		}
	}
	var between func(r run)
	between = func(r run) {
		if r.hi-r.lo < 2 || r.hi <= from || above(f.costFloor(r), limit) {
			return
		}
		stricter, looser := r.split(pts)
		between(stricter)
		consider(looser.lo, looser.first)
		between(looser)
	}
	consider(all.lo, all.first)
	between(all)
	if all.hi > all.lo {
		consider(all.hi, all.last)
	}
}

// leastInOrder visits, in order, every cut of all that could take the
// cost rule i's place (the cost of least cost so far): the ends of all,
// then its cuts between, skipping a run whose least possible cost cannot
// beat the one held by more than the slack.
func (f *Finder) leastInOrder(i int, pts Points, all run) {
	consider := func(p curve.Point) {
		if fig := projection.Project(p, f.a); f.keeps(i, p, fig) {
			f.keep(i, p, fig)
		}
	}
	var between func(r run)
	between = func(r run) {
		if r.hi-r.lo < 2 || !f.mayBeatCost(i, r) {
			return
		}
		stricter, looser := r.split(pts)
		between(stricter)
		consider(looser.first)
		between(looser)
	}
	consider(all.first)
	between(all)
	if all.hi > all.lo {
		consider(all.last)
	}
}

// mayBeatCost reports whether a cut of r might take the place of the cut
// cost rule i holds: false only when none can.
func (f *Finder) mayBeatCost(i int, r run) bool {
	if !f.found[i] {
		return true
	}
	held := f.best[i].Projected.CostPerCase
	floor := f.costFloor(r)
	return math.IsNaN(floor) || floor-boundSlack*(math.Abs(floor)+math.Abs(held)) < held-slack*math.Abs(held)
}

// Outcomes returns one outcome per rule, in the order given.
func (f *Finder) Outcomes() []Outcome {
	out := make([]Outcome, len(f.rules))
	for i, r := range f.rules {
		if f.found[i] {
			out[i] = f.best[i]
			continue
		}
		out[i] = Outcome{Rule: r, Reason: f.reason(r)}
		if r.Kind == Queue90 && f.seen && !f.weightless {
			out[i].Reason = fmt.Sprintf("at the strictest cut 9 shifts in 10 already queue up to %.1f alerts, above %v", f.firstP90[i], r.Value)
		}
	}
	return out
}

// reason explains why no cut meets r.
func (f *Finder) reason(r Rule) string {
	if !f.seen {
		return "the set has no rows"
	}
	if f.weightless && r.Kind != Score {
		return "no case in the validation set has any weight (every row weighs 0), so no cut can meet the rule"
	}
	p, fig := f.first, f.firstFigures
	pct := func(v float64) string { return strconv.FormatFloat(100*v, 'f', 1, 64) + "%" }
	// undefined explains a projected figure that is NaN: the validation
	// set lacks the class that the production base rate needs.
	undefined := func(what string) string {
		noTrue, noFalse := !(p.Positives() > 0), !(p.Negatives() > 0)
		switch {
		case noTrue && noFalse:
			return fmt.Sprintf("the projected %s is undefined: no case in the validation set has any weight", what)
		case noFalse:
			return fmt.Sprintf("the projected %s is undefined: the validation set has no false cases, which the production base rate %s needs", what, pct(f.a.BaseRate))
		}
		return fmt.Sprintf("the projected %s is undefined: the validation set has no true cases, which the production base rate %s needs", what, pct(f.a.BaseRate))
	}
	switch r.Kind {
	case Score:
		return fmt.Sprintf("no score is at or beyond %v; the riskiest is %v", r.Value, p.Score)
	case Top:
		if f.weighted {
			return fmt.Sprintf("the strictest cut already flags %v weighted cases (score %v)", p.TP+p.FP, p.Score)
		}
		if p.Cases == 1 {
			return fmt.Sprintf("the strictest cut already flags 1 row (score %v)", p.Score)
		}
		return fmt.Sprintf("the strictest cut already flags %d rows (tied at score %v)", p.Cases, p.Score)
	case Hit:
		if !(p.Positives() > 0) {
			return "the validation set has no true cases, so hit share is undefined"
		}
		return fmt.Sprintf("no cut reaches hit share %v", r.Value)
	case Wrong:
		if !(p.Positives() > 0) {
			return "the validation set has no true cases, so every alert is wrong"
		}
		if math.IsNaN(f.leastWrong) {
			return undefined("wrong-alert share")
		}
		if f.a.BaseRate == 0 {
			return fmt.Sprintf("at the production base rate %s every alert is wrong", pct(0))
		}
		if math.IsNaN(fig.FalseDiscoveryRate()) {
			return fmt.Sprintf("every cut has a wrong-alert share above %v; the least is %s", r.Value, pct(f.leastWrong))
		}
		return fmt.Sprintf("every cut has a wrong-alert share above %v; the strictest has %s", r.Value, pct(fig.FalseDiscoveryRate()))
	case Base:
		if math.IsNaN(fig.AlertRate) {
			return undefined("alert rate")
		}
		return fmt.Sprintf("the strictest cut already flags %s, above the base rate %s", pct(fig.AlertRate), pct(f.a.BaseRate))
	case Queue:
		if math.IsNaN(fig.QueuePerShift) {
			return undefined("queue")
		}
		return fmt.Sprintf("the strictest cut already queues %.1f alerts per shift, above %v", fig.QueuePerShift, r.Value)
	case Cost:
		return undefined("cost")
	case HitBound:
		if !(p.Positives() > 0) {
			return "the validation set has no true cases, so hit share is undefined"
		}
		return fmt.Sprintf("no cut's one-sided %v%% lower bound of hit share reaches %v (too few true cases to promise it)", r.Level, r.Value)
	case WrongBound:
		if !(p.Positives() > 0) {
			return "the validation set has no true cases, so every alert is wrong"
		}
		return fmt.Sprintf("every cut's one-sided %v%% upper bound of wrong-alert share is above %v", r.Level, r.Value)
	}
	return "no cut meets the rule"
}
