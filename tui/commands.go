package tui

import (
	"errors"
	"fmt"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/shift"
)

// The explorer's slow work (loading, the starting points under new
// assumptions, writing) runs in commands that return these messages,
// named for what happened.
type (
	// loadTickMsg asks the loading screen to show the rows read so far.
	loadTickMsg struct{}
	// scoresLoadedMsg carries the loaded set, its curve and assumptions.
	scoresLoadedMsg struct {
		set    *scores.Set
		curve  *curve.Curve
		assume projection.Assumptions
		starts []cutrule.Outcome
		extras extras
	}
	// startsFoundMsg carries the starting points under new assumptions,
	// the second model's too, and the shift queues' scale.
	startsFoundMsg struct {
		assume       projection.Assumptions
		starts       []cutrule.Outcome
		secondStarts []cutrule.Outcome
		scale        shift.Scale
		peaks        *shift.Running // the shift queues at scale; nil without shifts or when the scale is unchanged
		err          error
	}
	// loadFailedMsg says the scores could not be loaded: the explorer shows
	// nothing more and quits.
	loadFailedMsg struct{ err error }
	// fileWrittenMsg says the decision file was written.
	fileWrittenMsg struct {
		path       string
		candidates int
		chosen     string
	}
	// writeFailedMsg says the decision file was not written.
	writeFailedMsg struct{ err error }
)

func tickCmd() tea.Cmd {
	return tea.Tick(100*time.Millisecond, func(time.Time) tea.Msg { return loadTickMsg{} })
}

// loadCmd reads the scores, computes the curve once and finds the
// starting points.
func (m Model) loadCmd() tea.Cmd {
	cfg, load, assume, counter, done := m.cfg, m.cfg.Load, m.cfg.Assume, m.rowsRead, m.readDone
	return func() tea.Msg {
		set, err := load(func(rows int) { counter.Store(int64(rows)) })
		if err != nil {
			return loadFailedMsg{err}
		}
		if set == nil {
			return loadFailedMsg{errors.New("no scores were read")}
		}
		counter.Store(int64(set.Len()))
		done.Store(true)
		if set.Len() == 0 {
			return loadFailedMsg{fmt.Errorf("%s: no rows to explore", set.Source)}
		}
		a, err := assume(set)
		if err != nil {
			return loadFailedMsg{err}
		}
		c := curve.New(set)
		x, err := loadExtras(cfg, set, c, a)
		if err != nil {
			return loadFailedMsg{err}
		}
		starts, _, err := findStarts(c, a, x.assigned)
		if err != nil {
			return loadFailedMsg{err}
		}
		return scoresLoadedMsg{set: set, curve: c, assume: a, starts: starts, extras: x}
	}
}

// findStartsCmd finds the starting points under new assumptions.
func (m Model) findStartsCmd(a projection.Assumptions) tea.Cmd {
	c, assigned, oldScale := m.s.curve, m.s.assigned, m.s.scale
	second, secondAssigned := m.s.secondCurve, m.s.secondAssigned
	return func() tea.Msg {
		starts, scale, err := findStarts(c, a, assigned)
		if err != nil {
			return startsFoundMsg{assume: a, err: err}
		}
		msg := startsFoundMsg{assume: a, starts: starts, scale: scale}
		if assigned != nil && scale != oldScale {
			msg.peaks = shift.NewRunning(c.Set, *assigned, scale) // a pass over the set, off the screen's loop
		}
		if second != nil {
			msg.secondStarts, _, msg.err = findStarts(second, a, secondAssigned)
		}
		return msg
	}
}

// write saves the pinned candidates, pinning the cursor's cut first when
// nothing is pinned; force replaces a file made from other data.
func (m *Model) write(force bool) tea.Cmd {
	s := m.s
	if len(s.pins) == 0 {
		s.pinCursor()
		m.refresh()
	}
	candidates := make([]decision.Candidate, len(s.pins))
	for i, p := range s.pins {
		candidates[i] = decision.Candidate{Name: p.name, Rule: p.rule, Cut: s.evidenceAt(p.cut)}
	}
	chosen := s.pins[s.reference].name
	file, err := decision.New(s.set, s.assume, candidates, chosen, m.cfg.ToolVersion)
	if err != nil {
		m.status = "not written: " + err.Error()
		return nil
	}
	path := m.cfg.Out
	return func() tea.Msg {
		if err := decision.Write(path, file, force); err != nil {
			return writeFailedMsg{err}
		}
		return fileWrittenMsg{path: path, candidates: len(candidates), chosen: chosen}
	}
}

// sameAssumptions reports whether a and b are the same assumptions, costs
// compared by value.
func sameAssumptions(a, b projection.Assumptions) bool {
	costsA, costsB := a.Costs, b.Costs
	a.Costs, b.Costs = nil, nil
	if a != b || (costsA == nil) != (costsB == nil) {
		return false
	}
	return costsA == nil || *costsA == *costsB
}
