package tui

import (
	"context"
	"fmt"
	"math"
	"strconv"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// session is the state every pane reads: the data, the assumptions, the
// cursor's cut and the pinned candidates. The root model owns it and the
// panes hold a pointer to it.
type session struct {
	// res is every figure of the set under the assumptions it was
	// computed with (package analysis); set, curve and starts are its
	// own. assume runs ahead of res.Assume while the figures under new
	// assumptions are computed in the background.
	res    *analysis.Result
	set    *scores.Set
	curve  *curve.Curve
	assume projection.Assumptions

	// cursor is the cut under the cursor, an index into curve (0 is the
	// strictest cut).
	cursor int

	// starts are the starting points (analysis.Starts) under res.Assume,
	// in the order of the keys 1 to 6.
	starts []cutrule.Outcome

	pins      []pin
	selected  int // the candidate the strip's keys act on
	reference int // the chosen candidate, which the others are compared with
	pinned    int // how many pins were ever made, for automatic names

	beyond // segments, shift peaks, stability, calibration, a second model: beyond.go
}

// pin is a candidate: a named cut, with the rule it came from if any.
type pin struct {
	name string
	rule string // "" for a cut picked by hand
	cut  int    // index into the curve

	// moved says the rule no longer picks cut under the current
	// assumptions: the pin was made under earlier ones. now is the cut
	// the rule picks instead, -1 when no cut meets it (checkPins).
	moved bool
	now   int
	// checked says the rule was checked under assumptions other than the
	// ones it was pinned under.
	checked bool
}

// pinCheck is the key of a pin's rule check: its rule at its cut.
type pinCheck struct {
	rule string
	cut  int
}

// pinChecks lists the rules of the pins made by a rule, with their cuts'
// scores, for analysis.Result.CheckRules.
func (s *session) pinChecks() (keys []pinCheck, rules []cutrule.Rule, scores []float64) {
	for _, p := range s.pins {
		r, err := cutrule.Parse(p.rule)
		if err != nil {
			continue
		}
		keys = append(keys, pinCheck{p.rule, p.cut})
		rules = append(rules, r)
		scores = append(scores, s.curve.At(p.cut).Score)
	}
	return keys, rules, scores
}

// checkPins marks each pin whose rule no longer picks its cut under the
// assumptions of checks (found by CheckRules for the keys); a pin with no
// check there (made since) is checked against s.res now. It returns how
// many pins have moved.
func (s *session) checkPins(checks map[pinCheck]analysis.RuleCheck) int {
	keys, rules, scores := s.pinChecks()
	var missing []int
	for i, k := range keys {
		if _, ok := checks[k]; !ok {
			missing = append(missing, i)
		}
	}
	if len(missing) > 0 {
		var r []cutrule.Rule
		var sc []float64
		for _, i := range missing {
			r, sc = append(r, rules[i]), append(sc, scores[i])
		}
		found, err := s.res.CheckRules(context.Background(), r, sc)
		if err == nil {
			if checks == nil {
				checks = map[pinCheck]analysis.RuleCheck{}
			}
			for j, i := range missing {
				checks[keys[i]] = found[j]
			}
		}
	}
	moved := 0
	for i := range s.pins {
		p := &s.pins[i]
		p.moved, p.now = false, p.cut
		c, ok := checks[pinCheck{p.rule, p.cut}]
		p.checked = ok
		if !ok || c.Holds {
			continue
		}
		p.moved, p.now = true, -1
		if c.Now.Met {
			p.now = c.Now.Point.Index
		}
		moved++
	}
	return moved
}

// repinSelected moves the selected pin to the cut its rule picks now; it
// reports false when the pin has not moved or its rule meets no cut. When
// another candidate holds that cut already it moves nothing and returns
// that candidate's name: two candidates at one cut would compare a cut
// with itself, and which name, rule and note to keep is the user's call
// (x unpins the moved one, or the other).
func (s *session) repinSelected() (heldBy string, ok bool) {
	if s.selected >= len(s.pins) {
		return "", false
	}
	p := &s.pins[s.selected]
	if !p.moved || p.now < 0 {
		return "", false
	}
	for i, other := range s.pins {
		if i != s.selected && other.cut == p.now {
			return other.name, false
		}
	}
	p.cut, p.moved = p.now, false
	s.cursor = p.cut
	return "", true
}

// bandAt returns the bootstrap's band exactly at cut i (the redraws at
// this cut, bootstrap.Result.BandAtCut, worked out once per cut) once a
// run has finished under the current assumptions; false when the run
// cannot say at that cut (rows of sampling weights that vary within a
// class know only the cuts named when it started).
func (s *session) bandAt(i int) (bootstrap.BandPoint, bool) {
	if s.stability == nil || s.resampling.running || i < 0 || i >= s.curve.Len() {
		return bootstrap.BandPoint{}, false
	}
	return s.stability.BandAtCut(s.curve.At(i).Score)
}

// point returns the cursor's point.
func (s *session) point() curve.Point { return s.curve.At(s.cursor) }

// evidenceAt returns the figures of cut i under the current assumptions.
func (s *session) evidenceAt(i int) evidence.Cut { return evidence.Of(s.curve.At(i), s.assume) }

// baseRateChanged reports whether production's base rate is not the
// validation one, so that projected shares differ from validation shares.
func (s *session) baseRateChanged() bool {
	return s.assume.BaseRate != s.curve.Summary.BaseRate
}

// rulesAt lists the starting points that pick cut i.
func (s *session) rulesAt(i int) []string {
	var out []string
	for _, o := range s.starts {
		if o.Met && o.Point.Index == i {
			out = append(out, o.Rule.String())
		}
	}
	return out
}

// pinCursor pins the cursor's cut, named after the first starting point it
// sits on or else "cut N" in the order pinned. A cut already pinned is
// selected instead. It returns the name and whether a new pin was made.
func (s *session) pinCursor() (string, bool) {
	for i, p := range s.pins {
		if p.cut == s.cursor {
			s.selected = i
			return p.name, false
		}
	}
	s.pinned++
	p := pin{cut: s.cursor, now: s.cursor}
	if rules := s.rulesAt(s.cursor); len(rules) > 0 {
		p.rule = rules[0]
		p.name = rules[0]
	}
	if p.name == "" || s.nameTaken(p.name) {
		p.name = "cut " + strconv.Itoa(s.pinned)
		for s.nameTaken(p.name) {
			s.pinned++
			p.name = "cut " + strconv.Itoa(s.pinned)
		}
	}
	s.pins = append(s.pins, p)
	s.selected = len(s.pins) - 1
	return p.name, true
}

func (s *session) nameTaken(name string) bool {
	for _, p := range s.pins {
		if p.name == name {
			return true
		}
	}
	return false
}

// removeSelected unpins the selected candidate.
func (s *session) removeSelected() {
	if len(s.pins) == 0 {
		return
	}
	i := s.selected
	s.pins = append(s.pins[:i], s.pins[i+1:]...)
	switch {
	case len(s.pins) == 0:
		s.reference, s.selected = 0, 0
		return
	case s.reference == i:
		s.reference = 0
	case s.reference > i:
		s.reference--
	}
	s.selected = min(i, len(s.pins)-1)
}

// moveSelected moves the selected candidate by step places, keeping the
// reference on the same candidate.
func (s *session) moveSelected(step int) {
	i, j := s.selected, s.selected+step
	if len(s.pins) == 0 || j < 0 || j >= len(s.pins) {
		return
	}
	s.pins[i], s.pins[j] = s.pins[j], s.pins[i]
	switch s.reference {
	case i:
		s.reference = j
	case j:
		s.reference = i
	}
	s.selected = j
}

// rename gives the selected candidate a new name; names must be unique
// and not empty.
func (s *session) rename(name string) error {
	if name == "" {
		return fmt.Errorf("a candidate needs a name")
	}
	for i, p := range s.pins {
		if i != s.selected && p.name == name {
			return fmt.Errorf("%q is taken by another candidate", name)
		}
	}
	s.pins[s.selected].name = name
	return nil
}

// tableSignature is a key of everything table depends on.
func (s *session) tableSignature() string {
	a := s.assume
	costs := "none"
	if a.Costs != nil {
		costs = fmt.Sprint(*a.Costs)
	}
	// The bootstrap's band gives each pin its redraws: a finished run
	// counts as its run number, none as -1.
	resampled := -1
	if s.stability != nil && !s.resampling.running {
		resampled = s.resampling.run
	}
	return fmt.Sprint(s.pins, s.reference, a.BaseRate, a.Volume, a.Capacity, a.Confidence, costs, resampled)
}

// table returns the comparison of the pinned candidates; after the
// bootstrap each carries the range of its hit share across the resampled
// sets at its own cut (the redraws at this cut, as the figures pane shows
// them), which the strip draws under the hit share it belongs to.
func (s *session) table() compare.Table {
	columns := make([]compare.Column, len(s.pins))
	for i, p := range s.pins {
		columns[i] = compare.Column{Name: p.name, Rule: p.rule, Cut: s.evidenceAt(p.cut)}
		if band, ok := s.bandAt(p.cut); ok {
			recall, wrong := band.Recall, band.FalseDiscoveryRate
			columns[i].RecallRedraws, columns[i].WrongRedraws = &recall, &wrong
		}
		if p.checked {
			now := compare.RuleNow{Holds: !p.moved, Picks: math.NaN()}
			if p.now >= 0 {
				now.Picks = s.curve.At(p.now).Score
			}
			columns[i].RuleNow = &now
		}
	}
	return compare.New(columns, s.reference, compare.Options{
		Assumptions:     s.assume,
		BaseRateChanged: s.baseRateChanged(),
		LowerIsRiskier:  s.set.LowerIsRiskier(),
	})
}
