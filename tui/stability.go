package tui

import (
	"context"
	"errors"
	"fmt"
	"sync/atomic"
	"time"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/bootstrap"
)

// bandCuts is how many cuts, spread over the ranked rows, carry the band.
const bandCuts = 120

// resampling is the bootstrap run on demand: it runs in a tea.Cmd on every
// core, reports progress through done, and stops when cancel is called.
// run counts the runs, so that a result of a stopped or outdated run is
// dropped.
type resampling struct {
	running bool
	run     int
	total   int
	done    *atomic.Int64
	cancel  context.CancelFunc
}

func newResampling() resampling { return resampling{done: new(atomic.Int64)} }

type (
	// resampleTickMsg asks the screen to show the resampling's progress.
	resampleTickMsg struct{ run int }
	// resampledMsg carries a finished (or failed, or stopped) bootstrap.
	resampledMsg struct {
		run    int
		result bootstrap.Result
		err    error
	}
)

func resampleTick(run int) tea.Cmd {
	return tea.Tick(150*time.Millisecond, func(time.Time) tea.Msg { return resampleTickMsg{run: run} })
}

// resampleKey starts the bootstrap, or stops the one running; after one
// has finished under the current assumptions it says so instead.
func (m Model) resampleKey() (tea.Model, tea.Cmd) {
	r := &m.s.resampling
	if r.running {
		m.stopResampling()
		m.status = "resampling stopped"
		m.resize()
		return m, nil
	}
	if res := m.s.stability; res != nil {
		// The same seed and size give the same figures again.
		m.status = fmt.Sprintf("resampled already: %d sets, seed %d (the same seed gives the same figures; --bootstrap and --seed change them)", res.Replicates, res.Seed)
		return m, nil
	}
	opt := m.cfg.Analysis.Resampling
	replicates := opt.Replicates
	if replicates <= 0 {
		m.status = "resampling is off (--bootstrap 0)"
		return m, nil
	}
	opt.BandCuts = bandCuts
	for _, p := range m.s.pins { // the eager draw works out the pins' redraws as it runs
		opt.CutScores = append(opt.CutScores, m.s.curve.At(p.cut).Score)
	}
	ctx, cancel := context.WithCancel(m.cfg.Context)
	r.run++
	r.running, r.total, r.cancel = true, replicates, cancel
	r.done.Store(0)
	done, run := r.done, r.run
	opt.Progress = func(n int) { done.Store(int64(n)) }
	res := m.s.res
	m.status = fmt.Sprintf("resampling the set %d times on every core; b stops", replicates)
	m.resize()
	work := func() tea.Msg {
		stability, err := res.Resample(ctx, opt)
		return resampledMsg{run: run, result: stability, err: analysisError(res.Set, err)}
	}
	return m, tea.Batch(work, resampleTick(run))
}

// resampleUpdate handles the bootstrap's progress and result.
func (m Model) resampleUpdate(msg tea.Msg) (tea.Model, tea.Cmd) {
	r := &m.s.resampling
	switch msg := msg.(type) {
	case resampleTickMsg:
		if r.running && msg.run == r.run {
			return m, resampleTick(msg.run)
		}
	case resampledMsg:
		if msg.run != r.run {
			return m, nil // stopped, or the assumptions changed since
		}
		r.running = false
		r.cancel()
		switch {
		case errors.Is(msg.err, context.Canceled):
			m.status = "resampling stopped"
		case msg.err != nil:
			m.status = "resampling: " + msg.err.Error()
		default:
			res := msg.result
			m.s.stability = &res
			m.status = fmt.Sprintf("resampled %d times (seed %d): band on the chart, redraws in the figures", res.Replicates, res.Seed)
			if c, ok := m.s.costCheck(); ok && c.outside {
				m.status = fmt.Sprintf("resampled %d times · warning: the scores are not calibrated for costing (e)", res.Replicates)
			}
		}
		m.refresh() // the pins' redraws join the strip
	}
	return m, nil
}

// stopResampling stops a running bootstrap, as the explorer quits.
func (m *Model) stopResampling() {
	if m.s.resampling.running {
		m.s.resampling.cancel()
		m.s.resampling.running = false
		m.s.resampling.run++
	}
}

// dropStability stops a running bootstrap and forgets a finished one, as
// the assumptions they ran under have changed. It reports whether there
// was one.
func (m *Model) dropStability() bool {
	had := m.s.resampling.running || m.s.stability != nil
	m.stopResampling()
	m.s.resampling.run++
	m.s.stability = nil
	return had
}

// beyondKeys are the keys of the figures beyond the averages that apply
// to the loaded data, for the help. The segments overlay lists its own
// keys (the order key among them) at its foot.
func (m Model) beyondKeys() []key.Binding {
	k := m.ctx.keys
	var out []key.Binding
	for _, b := range []key.Binding{k.Segments, k.Stability, k.Calibration, k.Models} {
		if b.Enabled() {
			out = append(out, b)
		}
	}
	return out
}
