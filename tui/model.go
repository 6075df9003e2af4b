// Package tui is the explorer: a keyboard-driven screen to walk the cuts of
// a scored validation set, pin candidates, compare them side by side and
// write the chosen cut to a decision file.
//
// The root Model holds the focused pane, a stack of overlays (help, the
// assumptions form, renaming, the question before replacing a file, the
// views beyond the averages), what the panes share (size, styles, keys),
// the session every pane reads and one field per pane. It handles a few
// global keys and hands the rest to the top overlay, through the one
// overlay interface every overlay implements, or to the focused pane. Which cases a cut flags follows the cut rule in the
// doc of package scores.
package tui

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"sync/atomic"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// focus says which pane the keys go to.
type focus int

const (
	focusList  focus = iota // the ranked list and the cut keys
	focusStrip              // the comparison strip
)

// Model is the explorer's root model.
type Model struct {
	cfg      Config
	ctx      *shared
	s        *session
	focus    focus
	overlays []overlay[*Model] // the top one last

	loading   bool
	rowsRead  *atomic.Int64
	readDone  *atomic.Bool // the scores are read; the cuts are being worked out
	err       error
	status    string
	written   string            // the path last written, "" before any write
	outStamp  *sharedfile.Stamp // cfg.Out as this screen found it or last wrote it; nil: not known
	writes    *writeTracker
	writeErr  error // why the last write asked for did not happen; nil after one that did
	unwritten bool  // candidates or assumptions changed since the last write
	// writeWaiting holds a write asked for while the figures under new
	// assumptions were still being computed; it runs once they arrive.
	writeWaiting bool
	tableSig     string // what the strip's table was built from

	list     listPane
	chart    curvePane
	figures  figuresPane
	strip    Strip
	segments *segmentsPane // an overlay kept between openings, with its order

	// record is what the decision file records beside the figures: the
	// model and who chose the cut, from Config and the form.
	record struct {
		model    decision.Model
		chosenBy string
	}
}

// New returns the explorer for cfg; the scores load when the program starts.
func New(cfg Config) Model {
	ctx := newShared(cfg.Styles, cfg.Keys)
	if cfg.ReadOnly {
		ctx.keys.Write.SetEnabled(false)
	}
	if cfg.Out == "" {
		cfg.Out = "cut.yaml"
	}
	if cfg.Context == nil {
		cfg.Context = context.Background()
	}
	s := &session{beyond: beyond{resampling: newResampling()}}
	var outStamp *sharedfile.Stamp
	if stamp, err := sharedfile.StampOf(cfg.Out); err == nil {
		outStamp = &stamp // a write replaces only this, or asks
	}
	m := Model{
		cfg: cfg, ctx: ctx, s: s, loading: true, rowsRead: new(atomic.Int64), readDone: new(atomic.Bool),
		outStamp: outStamp, writes: &writeTracker{},
		list:     newListPane(s, ctx),
		chart:    newCurvePane(s, ctx),
		figures:  newFiguresPane(s, ctx),
		strip:    NewStrip(ctx.styles, ctx.keys),
		segments: newSegmentsPane(s, ctx, cfg.SegmentOrder),
	}
	m.record.model, m.record.chosenBy = cfg.Model, cfg.ChosenBy
	return m
}

// Err returns the load error that ended the explorer, if any.
func (m Model) Err() error { return m.err }

// Written returns the path of the decision file last written, or "".
func (m Model) Written() string { return m.written }

// Unwritten returns how many candidates are pinned when the candidates or
// assumptions have changed since the last write, and 0 otherwise.
func (m Model) Unwritten() int {
	if !m.unwritten || m.cfg.ReadOnly {
		return 0
	}
	return len(m.s.pins)
}

// Cursor returns the cursor's cut index and its score; ok is false before
// the scores are loaded.
func (m Model) Cursor() (index int, score float64, ok bool) {
	if m.s.curve == nil || m.s.curve.Len() == 0 {
		return 0, 0, false
	}
	return m.s.cursor, m.s.point().Score, true
}

// Pins returns the names of the pinned candidates, in strip order.
func (m Model) Pins() []string {
	out := make([]string, len(m.s.pins))
	for i, p := range m.s.pins {
		out[i] = p.name
	}
	return out
}

// Init starts loading.
func (m Model) Init() tea.Cmd {
	return tea.Batch(m.loadCmd(), tickCmd())
}

// Update handles one message.
func (m Model) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	switch msg := msg.(type) {
	case tea.WindowSizeMsg:
		m.ctx.width, m.ctx.height = msg.Width, msg.Height
		m.resize()
		return m, nil
	case loadTickMsg:
		if m.loading {
			return m, tickCmd()
		}
		return m, nil
	case loadFailedMsg:
		m.loading = false
		m.err = msg.err
		return m, tea.Quit
	case scoresLoadedMsg:
		m.loading = false
		m.s.use(msg.res)
		m.s.assume, m.s.stability = msg.res.Assume, nil
		m.s.cursor = 0
		for _, o := range m.s.starts {
			if o.Met {
				m.s.cursor = o.Point.Index
				break
			}
		}
		if warnings := analysis.WarningWords(msg.res.Warnings, "--lower-is-riskier"); len(warnings) > 0 {
			m.status = "warning: " + strings.Join(warnings, "; ")
		}
		m.refresh()
		return m, nil
	case startsFoundMsg:
		if !sameAssumptions(msg.assume, m.s.assume) {
			return m, nil // found for assumptions changed since
		}
		if msg.err != nil {
			m.status = "assumptions: " + msg.err.Error()
			if m.writeWaiting {
				m.writeWaiting = false
				m.status = "not written: " + m.status
			}
			return m, nil
		}
		m.s.use(msg.res)
		if moved := m.s.checkPins(msg.checks); moved > 0 {
			m.status = movedStatus(moved)
		}
		m.refresh()
		if m.writeWaiting {
			m.writeWaiting = false
			return m, m.write(false)
		}
		return m, nil
	case resampleTickMsg, resampledMsg:
		return m.resampleUpdate(msg)
	case fileWrittenMsg:
		m.written = msg.path
		m.unwritten = false
		m.outStamp, m.writeErr = &msg.stamp, nil
		noun := "candidates"
		if msg.candidates == 1 {
			noun = "candidate"
		}
		m.status = fmt.Sprintf("wrote %s: %d %s, chosen %q", msg.path, msg.candidates, noun, msg.chosen)
		return m, nil
	case writeFailedMsg:
		m.writeErr = msg.err
		if errors.Is(msg.err, sharedfile.ErrChanged) {
			m.push(m.changedQuestion(msg.err))
			return m, nil
		}
		if errors.Is(msg.err, decision.ErrDifferentData) || errors.Is(msg.err, decision.ErrNotDecisionFile) {
			path := m.cfg.Out
			m.push(replaceQuestion(m.ctx, path, msg.err.Error(), path+" already exists and was not made from this data.",
				"Replace it with this decision?",
				func(m *Model) tea.Cmd { return m.write(true) },
				func(m *Model) tea.Cmd { m.status = "not written: " + path + " kept as it was"; return nil }))
			return m, nil
		}
		m.status = "not written: " + msg.err.Error()
		return m, nil
	case tea.KeyMsg:
		if next, cmd, split := splitKeys(m, msg); split {
			return next, cmd
		}
		return m.key(msg)
	}
	return m, nil
}

// key handles a key press: ctrl+c always quits, an overlay takes the rest
// first, then the global keys, then the focused pane.
func (m Model) key(msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	k := m.ctx.keys
	if key.Matches(msg, k.Interrupt) {
		m.stopResampling()
		return m, tea.Quit
	}
	if len(m.overlays) > 0 {
		return m, keyTop(&m.overlays, &m, msg)
	}
	if key.Matches(msg, k.Quit) {
		if n := m.Unwritten(); n > 0 {
			m.push(m.quitQuestion(n))
			return m, nil
		}
		m.stopResampling()
		return m, tea.Quit
	}
	if m.loading || m.s.curve == nil {
		return m, nil
	}
	m.status = ""
	switch {
	case key.Matches(msg, k.Help):
		groups := m.helpGroups()
		m.push(&helpOverlay[*Model]{ctx: m.ctx, draw: func() string { return helpView(m.ctx, groups) }, terms: explorerTerms})
		return m, nil
	case key.Matches(msg, k.Focus):
		switch {
		case m.focus == focusList && len(m.s.pins) > 0:
			m.focus = focusStrip
		case m.focus == focusList:
			m.status = "nothing pinned yet: p pins the cursor's cut"
		default:
			m.focus = focusList
		}
		m.refresh()
		return m, nil
	case key.Matches(msg, k.Pin):
		name, made := m.s.pinCursor()
		if made {
			m.unwritten = true
			m.status = fmt.Sprintf("pinned %q", name)
		} else {
			m.status = fmt.Sprintf("this cut is already pinned as %q", name)
		}
		m.refresh()
		return m, nil
	case key.Matches(msg, k.Assumptions):
		m.push(newFormPane(m.ctx, m.s.assume, m.s.curve.Summary.BaseRate))
		return m, nil
	case key.Matches(msg, k.Record):
		m.push(newRecordForm(m.ctx, m.record.model, m.record.chosenBy))
		return m, nil
	case key.Matches(msg, k.Write):
		return m, m.write(false)
	case key.Matches(msg, k.CurveView):
		m.chart, _ = m.chart.Update(msg)
		return m, nil
	case key.Matches(msg, k.Segments):
		m.segments.open()
		m.push(m.segments)
		return m, nil
	case key.Matches(msg, k.Calibration):
		m.push(&calibrationPane{s: m.s, ctx: m.ctx})
		return m, nil
	case key.Matches(msg, k.Models):
		m.push(&modelsPane{s: m.s, ctx: m.ctx})
		return m, nil
	case key.Matches(msg, k.Stability):
		return m.resampleKey()
	case matchesDisabled(msg, k.Segments):
		m.status = "no breakdown by segment: explore with --segment COL to name a group column"
		return m, nil
	case matchesDisabled(msg, k.Models):
		m.status = "one model only: --score a --score b, or --compare FILE --id COL, adds a second"
		return m, nil
	}
	if m.focus == focusStrip {
		return m.stripFocusedKey(msg)
	}
	before := m.s.cursor
	m.figures, _ = m.figures.Update(msg)
	if m.s.cursor == before {
		m.list, _ = m.list.Update(msg)
	}
	m.list.follow()
	return m, nil
}

func (m *Model) push(o overlay[*Model]) { m.overlays = push(m.overlays, o) }

// applyAssumptions takes a as the assumptions: every figure and pin is
// recomputed, a bootstrap under the old ones is dropped, and the starting
// points are found again in the background.
func (m *Model) applyAssumptions(a projection.Assumptions) tea.Cmd {
	m.s.assume = a
	m.unwritten = true
	m.status = "assumptions changed: every figure and pin recomputed"
	if m.dropStability() {
		m.status += "; b resamples again under them"
	}
	m.refresh()
	return m.findStartsCmd(a)
}

// refresh brings the keys, the strip and the layout up to date with the
// session.
func (m *Model) refresh() {
	k := &m.ctx.keys
	s := m.s
	k.enableExplorer(s, m.focus == focusStrip)
	if len(s.pins) == 0 {
		m.focus = focusList
	}
	m.strip.keys = *k
	if s.curve != nil {
		// Rebuild the comparison only when what it shows has changed; a
		// new selection alone only moves the strip's mark.
		if sig := s.tableSignature(); sig != m.tableSig {
			m.strip.SetTable(s.table())
			m.tableSig = sig
		}
		m.strip.SetSelected(s.selected)
	}
	m.resize()
}

// screen returns the layout at the current size and state.
func (m Model) screen() screenLayout {
	frame := frameSize{W: m.ctx.styles.Pane.GetHorizontalFrameSize(), H: m.ctx.styles.Pane.GetVerticalFrameSize()}
	return layout(m.ctx.width, m.ctx.height, layoutState{
		pinned:       len(m.s.pins) > 0,
		stripFocused: m.focus == focusStrip,
		stripLines:   m.strip.Lines(),
		figureLines:  m.figures.lines(),
	}, frame)
}

// resize passes the layout's sizes down to the panes.
func (m *Model) resize() {
	l := m.screen()
	if l.tooSmall {
		return
	}
	m.list.SetSize(l.list.W, l.list.H)
	m.chart.SetSize(l.curve.W, l.curve.H)
	m.figures.SetSize(l.figures.W, l.figures.H)
	m.strip.SetSize(l.strip.W, l.strip.H)
}

// View draws the screen at exactly the terminal's size.
func (m Model) View() string {
	w, h := m.ctx.width, m.ctx.height
	if w <= 0 || h <= 0 {
		return ""
	}
	st := m.ctx.styles
	if m.err != nil {
		return ""
	}
	l := m.screen()
	if l.tooSmall {
		return tooSmallNotice("sill", minWidth, minHeight, w, h, len(m.overlays) > 0)
	}
	if m.loading || m.s.curve == nil {
		text := fmt.Sprintf("reading scores… %d rows so far", m.rowsRead.Load())
		if m.readDone.Load() {
			text = fmt.Sprintf("read %d rows · working out every cut…", m.rowsRead.Load())
		}
		return fit(lipgloss.Place(w, h, lipgloss.Center, lipgloss.Center, st.Muted.Render(text)), w, h)
	}
	var top overlay[*Model]
	if n := len(m.overlays); n > 0 {
		top = m.overlays[n-1]
	}
	if _, covers := top.(bodyCover); covers {
		// The panes under it would show only at its edges, so they are
		// not drawn.
		base := withFooter(m.header()+strings.Repeat("\n", h-2), m.footer())
		return fit(drawOver(base, top.View(), w, h), w, h)
	}
	right := m.figures.View()
	if l.curve.H > 0 {
		right = m.chart.View() + "\n" + right
	}
	body := lipgloss.JoinHorizontal(lipgloss.Top, m.list.View(m.focus == focusList), right)
	parts := []string{m.header(), body}
	if l.strip.H > 0 {
		parts = append(parts, m.strip.View(m.focus == focusStrip))
	}
	frame := withFooter(strings.Join(parts, "\n"), m.footer())
	if top != nil {
		frame = drawOver(frame, top.View(), w, h)
	}
	return fit(frame, w, h)
}
