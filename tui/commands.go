package tui

import (
	"errors"
	"fmt"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// The explorer's slow work (loading, the starting points under new
// assumptions, writing) runs in commands that return these messages,
// named for what happened.
type (
	// loadTickMsg asks the loading screen to show the rows read so far.
	loadTickMsg struct{}
	// scoresLoadedMsg carries the loaded set's figures under the
	// starting assumptions.
	scoresLoadedMsg struct{ res *analysis.Result }
	// startsFoundMsg carries the figures under new assumptions: the
	// starting points, the second model's and the shift queues' scale.
	startsFoundMsg struct {
		assume projection.Assumptions
		res    *analysis.Result
		err    error
		// checks say whether each pin's rule still picks its cut under
		// assume, for the pins there were when the work started.
		checks map[pinCheck]analysis.RuleCheck
	}
	// loadFailedMsg says the scores could not be loaded: the explorer shows
	// nothing more and quits.
	loadFailedMsg struct{ err error }
	// fileWrittenMsg says the decision file was written, and what it is
	// now.
	fileWrittenMsg struct {
		path       string
		candidates int
		chosen     string
		stamp      sharedfile.Stamp
	}
	// writeFailedMsg says the decision file was not written.
	writeFailedMsg struct{ err error }
)

func tickCmd() tea.Cmd {
	return tea.Tick(100*time.Millisecond, func(time.Time) tea.Msg { return loadTickMsg{} })
}

// loadCmd reads the scores and computes their figures under the starting
// assumptions; the bootstrap waits for the b key.
func (m Model) loadCmd() tea.Cmd {
	ctx, opts, load, assume, counter, done := m.cfg.Context, m.cfg.Analysis, m.cfg.Load, m.cfg.Assume, m.rowsRead, m.readDone
	opts.Rules, opts.Cursor, opts.Resampling = nil, true, analysis.Resampling{}
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
			return loadFailedMsg{fmt.Errorf("%s: no rows to explore", set.Source())}
		}
		a, err := assume(set)
		if err != nil {
			return loadFailedMsg{err}
		}
		res, err := analysis.Run(ctx, set, a, opts)
		if err != nil {
			return loadFailedMsg{analysisError(set, err)}
		}
		return scoresLoadedMsg{res: res}
	}
}

// analysisError words an error of package analysis for the screen.
func analysisError(set *scores.Set, err error) error {
	var e *analysis.Error
	switch {
	case !errors.As(err, &e):
		return err
	case e.Step == analysis.StepShifts:
		return fmt.Errorf("%s: %w", set.Source(), err)
	case e.Step == analysis.StepRules || e.Step == analysis.StepSecond || e.Step == analysis.StepResampling:
		return e.Err
	}
	return err
}

// findStartsCmd computes the figures under new assumptions.
func (m Model) findStartsCmd(a projection.Assumptions) tea.Cmd {
	res, ctx := m.s.res, m.cfg.Context
	keys, rules, scores := m.s.pinChecks()
	return func() tea.Msg {
		next, err := res.Reassume(ctx, a)
		if err != nil {
			return startsFoundMsg{assume: a, err: analysisError(res.Set, err)}
		}
		checks := map[pinCheck]analysis.RuleCheck{}
		if found, err := next.CheckRules(ctx, rules, scores); err == nil {
			for i, k := range keys {
				checks[k] = found[i]
			}
		}
		return startsFoundMsg{assume: a, res: next, checks: checks}
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
	if !sameAssumptions(s.assume, s.res.Assume) {
		// The figures under the new assumptions arrive by startsFoundMsg,
		// which runs the write then.
		m.writeWaiting = true
		m.status = "writing once the figures under the new assumptions are computed"
		return nil
	}
	picks := make([]decision.Pick, len(s.pins))
	for i, p := range s.pins {
		picks[i] = decision.Pick{Name: p.name, Rule: p.rule, Point: s.curve.At(p.cut)}
	}
	// The bootstrap the b key ran belongs with the figures it ran under.
	res := *s.res
	if s.stability != nil && !s.resampling.running {
		res.Stability = s.stability
	}
	chosen := s.pins[s.reference].name
	file, err := decision.New(&res, picks, chosen, decision.Record{ToolVersion: m.cfg.ToolVersion, Model: m.record.model, ChosenBy: m.record.chosenBy})
	if err != nil {
		m.status = "not written: " + err.Error()
		m.writeErr = err
		return nil
	}
	path, ctx, writes := m.cfg.Out, m.cfg.Context, m.writes
	opts := decision.WriteOptions{Force: force}
	if m.outStamp != nil {
		expect := *m.outStamp
		opts.Expect = &expect
	}
	return func() tea.Msg {
		return writes.run(func() tea.Msg {
			stamp, err := decision.Write(ctx, path, file, opts)
			if err != nil {
				return writeFailedMsg{err}
			}
			return fileWrittenMsg{path: path, candidates: len(picks), chosen: chosen, stamp: stamp}
		}, writeFailedMsg{errScreenEnded})
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
