// Package tui is the explorer: a keyboard-driven screen to walk the cuts of
// a scored validation set, pin candidates, compare them side by side and
// write the chosen cut to a decision file.
//
// The root Model holds the focused pane, a stack of overlays (help, the
// assumptions form, renaming, the question before replacing a file), what
// the panes share (size, styles, keys), the session every pane reads and
// one field per pane. Which cases a cut flags follows the cut rule in the
// doc of package scores.
package tui

import (
	"errors"
	"fmt"
	"strings"
	"sync/atomic"
	"time"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// Config is what the explorer needs from the command line.
type Config struct {
	// Load reads the scores; it runs in the background and may call
	// progress with the rows read so far.
	Load func(progress func(rows int)) (*scores.Set, error)
	// Assume returns the starting assumptions for the loaded set.
	Assume func(set *scores.Set) (projection.Assumptions, error)
	// Out is the decision file the write key saves to.
	Out string
	// ToolVersion is written into the decision file.
	ToolVersion string
	// Styles and Keys; zero values take PlainStyles and DefaultKeyMap.
	Styles *Styles
	Keys   *KeyMap

	// Shifts is the crew shift schedule. With it and case times in the
	// set, the queue figure shows the real shifts of the validation period
	// and queue90 at the capacity is a starting point.
	Shifts *shift.Schedule
	// Replicates and Seed are the bootstrap's, run on demand; 0
	// replicates means 200.
	Replicates int
	Seed       uint64
	// CalibrationBins and CalibrationBinning shape the reliability table;
	// 0 bins means 10.
	CalibrationBins    int
	CalibrationBinning calibration.Binning
	// SegmentOrder is the first order of the segments overlay.
	SegmentOrder segment.Order
}

// focus says which pane the keys go to.
type focus int

const (
	focusList  focus = iota // the ranked list and the cut keys
	focusStrip              // the comparison strip
)

// overlayKind is one layer drawn over the panes; the top one takes the keys.
type overlayKind int

const (
	overlayHelp        overlayKind = iota // every key, grouped
	overlayForm                           // the assumptions form
	overlayRename                         // renaming a candidate
	overlayReplace                        // the question before replacing a file made from other data
	overlaySegments                       // the breakdown by segment at the cursor's cut
	overlayCalibration                    // the reliability table and the cost threshold
	overlayModels                         // the two models' cuts side by side
)

// shared is what every pane of a screen shares: the terminal's size, the
// styles and the keys.
type shared struct {
	width, height int
	styles        Styles
	keys          KeyMap
}

// newShared returns what the panes of a screen share, with the given styles
// and keys where not nil and the plain styles and default keys otherwise.
func newShared(styles *Styles, keys *KeyMap) *shared {
	ctx := &shared{styles: PlainStyles(), keys: DefaultKeyMap()}
	if styles != nil {
		ctx.styles = *styles
	}
	if keys != nil {
		ctx.keys = *keys
	}
	return ctx
}

// Messages, named for what happened.
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

// Model is the explorer's root model.
type Model struct {
	cfg      Config
	ctx      *shared
	s        *session
	focus    focus
	overlays []overlayKind

	loading   bool
	rowsRead  *atomic.Int64
	readDone  *atomic.Bool // the scores are read; the cuts are being worked out
	err       error
	status    string
	written   string // the path last written, "" before any write
	unwritten bool   // candidates or assumptions changed since the last write
	tableSig  string // what the strip's table was built from

	list        listPane
	chart       curvePane
	figures     figuresPane
	strip       Strip
	help        helpPane
	form        formPane
	rename      renamePane
	replace     replacePane
	segments    segmentsPane
	calibration calibrationPane
	models      modelsPane
}

// New returns the explorer for cfg; the scores load when the program starts.
func New(cfg Config) Model {
	ctx := newShared(cfg.Styles, cfg.Keys)
	if cfg.Out == "" {
		cfg.Out = "cut.yaml"
	}
	s := &session{beyond: beyond{resampling: newResampling()}}
	m := Model{
		cfg: cfg, ctx: ctx, s: s, loading: true, rowsRead: new(atomic.Int64), readDone: new(atomic.Bool),
		list:        newListPane(s, ctx),
		chart:       newCurvePane(s, ctx),
		figures:     newFiguresPane(s, ctx),
		strip:       NewStrip(ctx.styles, ctx.keys),
		help:        helpPane{ctx: ctx},
		form:        newFormPane(ctx),
		rename:      newRenamePane(ctx),
		replace:     replacePane{ctx: ctx},
		segments:    newSegmentsPane(s, ctx, cfg.SegmentOrder),
		calibration: calibrationPane{s: s, ctx: ctx},
		models:      modelsPane{s: s, ctx: ctx},
	}
	return m
}

// Err returns the load error that ended the explorer, if any.
func (m Model) Err() error { return m.err }

// Written returns the path of the decision file last written, or "".
func (m Model) Written() string { return m.written }

// Unwritten returns how many candidates are pinned when the candidates or
// assumptions have changed since the last write, and 0 otherwise.
func (m Model) Unwritten() int {
	if !m.unwritten {
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
		m.s.set, m.s.curve, m.s.assume, m.s.starts = msg.set, msg.curve, msg.assume, msg.starts
		m.s.beyond.apply(msg.set, msg.extras)
		m.s.cursor = 0
		for _, o := range msg.starts {
			if o.Met {
				m.s.cursor = o.Point.Index
				break
			}
		}
		m.form.load(msg.assume, msg.curve.Summary.BaseRate)
		if warnings := report.Warnings(msg.set, msg.curve.Summary); len(warnings) > 0 {
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
			return m, nil
		}
		m.s.starts, m.s.secondStarts = msg.starts, msg.secondStarts
		m.s.setScale(msg.scale, msg.peaks)
		m.refresh()
		return m, nil
	case resampleTickMsg, resampledMsg:
		return m.resampleUpdate(msg)
	case fileWrittenMsg:
		m.written = msg.path
		m.unwritten = false
		noun := "candidates"
		if msg.candidates == 1 {
			noun = "candidate"
		}
		m.status = fmt.Sprintf("wrote %s: %d %s, chosen %q", msg.path, msg.candidates, noun, msg.chosen)
		return m, nil
	case writeFailedMsg:
		if errors.Is(msg.err, decision.ErrDifferentData) || errors.Is(msg.err, decision.ErrNotDecisionFile) {
			m.replace.reason = msg.err.Error()
			m.replace.path = m.cfg.Out
			m.push(overlayReplace)
			return m, nil
		}
		m.status = "not written: " + msg.err.Error()
		return m, nil
	case tea.KeyMsg:
		// Esc and the next key pressed soon after can arrive as one alt
		// key: take them as the two keys they were, since the explorer
		// binds no alt key.
		if msg.Alt && !msg.Paste {
			return escThen(m, msg)
		}
		// Keys typed ahead over a slow link can arrive as one message of
		// several runes; take them one at a time.
		if msg.Type == tea.KeyRunes && len(msg.Runes) > 1 && !msg.Paste {
			var cmds []tea.Cmd
			var next tea.Model = m
			for _, r := range msg.Runes {
				var cmd tea.Cmd
				next, cmd = next.(Model).key(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune{r}})
				cmds = append(cmds, cmd)
			}
			return next, tea.Batch(cmds...)
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
		return m.overlayKey(msg)
	}
	if key.Matches(msg, k.Quit) {
		m.stopResampling()
		return m, tea.Quit
	}
	if m.loading || m.s.curve == nil {
		return m, nil
	}
	m.status = ""
	switch {
	case key.Matches(msg, k.Help):
		m.push(overlayHelp)
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
		m.form.load(m.s.assume, m.s.curve.Summary.BaseRate)
		m.push(overlayForm)
		return m, nil
	case key.Matches(msg, k.Write):
		return m, m.write(false)
	case key.Matches(msg, k.CurveView):
		m.chart, _ = m.chart.Update(msg)
		return m, nil
	case key.Matches(msg, k.Segments):
		m.segments.open()
		m.push(overlaySegments)
		return m, nil
	case key.Matches(msg, k.Calibration):
		m.push(overlayCalibration)
		return m, nil
	case key.Matches(msg, k.Models):
		m.push(overlayModels)
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

// stripFocusedKey handles the keys of the comparison strip.
func (m Model) stripFocusedKey(msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	k, s := m.ctx.keys, m.s
	for _, b := range []key.Binding{k.Remove, k.MoveLeft, k.MoveRight, k.Choose} {
		if key.Matches(msg, b) {
			m.unwritten = true
		}
	}
	switch {
	case key.Matches(msg, k.Jump):
		s.cursor = s.pins[s.selected].cut
		m.list.follow()
	case key.Matches(msg, k.Remove):
		name, wasChosen := s.pins[s.selected].name, s.selected == s.reference
		s.removeSelected()
		m.status = fmt.Sprintf("unpinned %q", name)
		if wasChosen && len(s.pins) > 0 {
			m.status += fmt.Sprintf("; %q is the chosen cut now", s.pins[s.reference].name)
		}
		if len(s.pins) == 0 {
			m.focus = focusList
		}
	case key.Matches(msg, k.MoveLeft):
		s.moveSelected(-1)
	case key.Matches(msg, k.MoveRight):
		s.moveSelected(1)
	case key.Matches(msg, k.Choose):
		s.reference = s.selected
		m.status = fmt.Sprintf("%q is the chosen cut; the others are compared with it", s.pins[s.selected].name)
	case key.Matches(msg, k.Rename):
		m.rename.start(s.pins[s.selected].name)
		m.push(overlayRename)
	default:
		m.strip.SetSelected(s.selected)
		m.strip, _ = m.strip.Update(msg)
		if m.strip.Selected() != s.selected {
			// Selecting a candidate puts the cursor on its cut.
			s.selected = m.strip.Selected()
			s.cursor = s.pins[s.selected].cut
			m.list.follow()
			break
		}
		// The list keys still move the cursor while the strip has the keys.
		m.list, _ = m.list.Update(msg)
		m.figures, _ = m.figures.Update(msg)
		m.list.follow()
	}
	m.refresh()
	return m, nil
}

// overlayKey gives a key to the top overlay.
func (m Model) overlayKey(msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	k := m.ctx.keys
	switch m.overlays[len(m.overlays)-1] {
	case overlayHelp:
		if key.Matches(msg, k.Help) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit) {
			m.pop()
		}
		return m, nil
	case overlaySegments:
		if key.Matches(msg, k.Segments) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit) {
			m.pop()
			return m, nil
		}
		before := m.s.cursor
		m.segments, _ = m.segments.Update(msg)
		if m.s.cursor != before {
			m.list.follow()
		}
		return m, nil
	case overlayCalibration:
		if key.Matches(msg, k.Calibration) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit) {
			m.pop()
			return m, nil
		}
		if key.Matches(msg, k.Up) || key.Matches(msg, k.Down) {
			m.list, _ = m.list.Update(msg)
		}
		return m, nil
	case overlayModels:
		if key.Matches(msg, k.Models) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit) {
			m.pop()
		}
		return m, nil
	case overlayForm:
		var done bool
		var a projection.Assumptions
		var cmd tea.Cmd
		m.form, a, done, cmd = m.form.Update(msg)
		if done {
			m.pop()
			if m.form.applied {
				m.s.assume = a
				m.unwritten = true
				m.status = "assumptions changed: every figure and pin recomputed"
				if m.dropStability() {
					m.status += "; b resamples again under them"
				}
				m.refresh()
				return m, m.findStartsCmd(a)
			}
		}
		return m, cmd
	case overlayRename:
		var name string
		var done bool
		var cmd tea.Cmd
		m.rename, name, done, cmd = m.rename.Update(msg)
		if done && m.rename.cancelled {
			m.pop()
			return m, nil
		}
		if done {
			if err := m.s.rename(name); err != nil {
				m.rename.err = err.Error()
				return m, nil
			}
			m.pop()
			m.unwritten = true
			m.refresh()
		}
		return m, cmd
	case overlayReplace:
		switch {
		case key.Matches(msg, k.Yes):
			m.pop()
			return m, m.write(true)
		case key.Matches(msg, k.No):
			m.pop()
			m.status = "not written: " + m.cfg.Out + " kept as it was"
		}
		return m, nil
	}
	return m, nil
}

func (m *Model) push(o overlayKind) { m.overlays = append(m.overlays, o) }
func (m *Model) pop()               { m.overlays = m.overlays[:len(m.overlays)-1] }

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

// refresh brings the keys, the strip and the layout up to date with the
// session.
func (m *Model) refresh() {
	k := &m.ctx.keys
	s := m.s
	starts := []*key.Binding{&k.BaseRate, &k.Hit, &k.Wrong, &k.Capacity, &k.LeastCost, &k.Peak}
	for _, b := range starts {
		b.SetEnabled(false)
	}
	for i, o := range s.starts {
		switch o.Rule.Kind {
		case cutrule.Base:
			k.BaseRate.SetEnabled(true)
		case cutrule.Hit:
			k.Hit.SetEnabled(true)
		case cutrule.Wrong:
			k.Wrong.SetEnabled(true)
		case cutrule.Queue:
			k.Capacity.SetEnabled(true)
			k.Capacity.SetHelp(keyName(i), "queue at capacity ("+report.Count(o.Rule.Value)+")")
		case cutrule.Cost:
			k.LeastCost.SetEnabled(true)
			k.LeastCost.SetKeys(keyName(i))
			k.LeastCost.SetHelp(keyName(i), "least cost")
		case cutrule.Queue90:
			k.Peak.SetEnabled(true)
			k.Peak.SetKeys(keyName(i))
			k.Peak.SetHelp(keyName(i), "9 shifts in 10 at capacity ("+report.Count(o.Rule.Value)+")")
		}
	}
	if s.set != nil {
		k.Segments.SetEnabled(s.segments != nil)
		k.SegmentOrder.SetEnabled(s.segments != nil)
		k.Models.SetEnabled(s.second != nil)
		k.Stability.SetEnabled(true)
		k.Calibration.SetEnabled(true)
	}
	strip := m.focus == focusStrip && len(s.pins) > 0
	for _, b := range []*key.Binding{&k.Left, &k.Right, &k.Jump, &k.Remove, &k.MoveLeft, &k.MoveRight, &k.Rename, &k.Choose} {
		b.SetEnabled(strip)
	}
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

func keyName(i int) string { return string(rune('1' + i)) }

// matchesDisabled reports whether msg is the key of b while b is turned
// off, so that the screen can say why the key does nothing here.
func matchesDisabled(msg tea.KeyMsg, b key.Binding) bool {
	if b.Enabled() {
		return false
	}
	b.SetEnabled(true)
	return key.Matches(msg, b)
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
		notice := fmt.Sprintf("sill needs a terminal of at least %d×%d;\nthis one is %d×%d.\nEnlarge it, or press q to quit.", minWidth, minHeight, w, h)
		return fit(lipgloss.Place(w, h, lipgloss.Center, lipgloss.Center, notice), w, h)
	}
	if m.loading || m.s.curve == nil {
		text := fmt.Sprintf("reading scores… %d rows so far", m.rowsRead.Load())
		if m.readDone.Load() {
			text = fmt.Sprintf("read %d rows · working out every cut…", m.rowsRead.Load())
		}
		return fit(lipgloss.Place(w, h, lipgloss.Center, lipgloss.Center, st.Muted.Render(text)), w, h)
	}
	if len(m.overlays) > 0 && m.overlays[len(m.overlays)-1] == overlaySegments {
		// The breakdown takes the whole body: the panes under it would
		// show only at its edges, so they are not drawn.
		base := m.header(w) + strings.Repeat("\n", h-1) + m.footer(w)
		return fit(overlay(base, m.overlayView(), w, h), w, h)
	}
	right := m.figures.View()
	if l.curve.H > 0 {
		right = m.chart.View() + "\n" + right
	}
	body := lipgloss.JoinHorizontal(lipgloss.Top, m.list.View(m.focus == focusList), right)
	parts := []string{m.header(w), body}
	if l.strip.H > 0 {
		parts = append(parts, m.strip.View(m.focus == focusStrip))
	}
	parts = append(parts, m.footer(w))
	frame := strings.Join(parts, "\n")
	if len(m.overlays) > 0 {
		frame = overlay(frame, m.overlayView(), w, h)
	}
	return fit(frame, w, h)
}

// overlayView draws the top overlay.
func (m Model) overlayView() string {
	switch m.overlays[len(m.overlays)-1] {
	case overlayHelp:
		return m.help.View(m.helpGroups())
	case overlayForm:
		return m.form.View()
	case overlayRename:
		return m.rename.View()
	case overlayReplace:
		return m.replace.View()
	case overlaySegments:
		return m.segments.View()
	case overlayCalibration:
		return m.calibration.View()
	case overlayModels:
		return m.models.View()
	}
	return ""
}

// header is the top line: the data's name on the left, its size and
// ranking figures on the right, which keep their room first.
func (m Model) header(width int) string {
	s, st := m.s, m.ctx.styles
	sum := s.curve.Summary
	left := "sill · " + s.set.Source
	right := fmt.Sprintf("%d rows · %s true (%s) · ROC AUC %s", sum.Rows,
		report.Count(sum.Positives), report.Percent(sum.BaseRate), report.Fixed(sum.ROCAUC, 3))
	if s.set.Weighted() && !s.set.Counts { // a counts table's weights are whole cases
		right += " · weighted"
	}
	rightW := min(ansi.StringWidth(right), width*3/4)
	return st.Header.Render(fitLine(left, width-rightW-2)) + "  " + st.Muted.Render(fitLine(right, rightW))
}

// footer is the bottom line: what just happened, then the keys that matter
// most here, in a few words each.
func (m Model) footer(width int) string {
	st := m.ctx.styles
	k := m.ctx.keys
	type hint struct {
		b    key.Binding
		what string
	}
	var hints []hint
	if m.focus == focusStrip {
		hints = append(hints, hint{k.Left, "select"}, hint{k.Jump, "go to"}, hint{k.Choose, "choose"},
			hint{k.Rename, "rename"}, hint{k.Remove, "unpin"}, hint{k.Focus, "list"})
	} else {
		hints = append(hints, hint{k.Up, "stricter"}, hint{k.Down, "looser"})
		if n := len(m.s.starts); n > 0 {
			hints = append(hints, hint{key.NewBinding(key.WithKeys("1"), key.WithHelp("1-"+keyName(n-1), "")), "starts"})
		}
		hints = append(hints, hint{k.Pin, "pin"})
		if len(m.s.pins) > 0 {
			hints = append(hints, hint{k.Focus, "strip"})
		}
	}
	hints = append(hints, hint{k.Write, "write"}, hint{k.Assumptions, "assumptions"})
	if m.focus == focusList {
		// Shown where the line has room after the keys that matter most.
		hints = append(hints, hint{k.Segments, "segments"}, hint{k.Stability, "stability"}, hint{k.Calibration, "calibration"}, hint{k.Models, "two models"})
	}
	render := func(h hint) string {
		name := h.b.Help().Key
		if name == k.Left.Help().Key {
			name = "←→"
		}
		return st.Key.Render(name) + " " + st.Footer.Render(h.what)
	}
	separator := st.Footer.Render(" · ")
	// The way to every key and the way out always show; the other hints
	// follow in order of importance while they fit, and a long status
	// gives way before them.
	tail := render(hint{k.Help, "all keys"}) + separator + render(hint{k.Quit, "quit"})
	lead := ""
	switch {
	case m.unwritten && len(m.s.pins) > 0:
		lead = st.Warning.Render("not written") + separator
	case m.written != "" && m.status == "":
		// Whether the pins on screen are the file's, at a glance.
		lead = st.Muted.Render("written: "+m.written) + separator
	}
	if m.status != "" {
		bar := st.Footer.Render("  │ ")
		room := width - ansi.StringWidth(lead) - ansi.StringWidth(tail) - ansi.StringWidth(bar)
		lead = st.Status.Render(fitStatus(m.status, room)) + bar + lead
	}
	room := width - ansi.StringWidth(lead) - ansi.StringWidth(tail)
	var parts []string
	for _, h := range hints {
		if !h.b.Enabled() {
			continue
		}
		part := render(h)
		if ansi.StringWidth(part)+ansi.StringWidth(separator) > room {
			break
		}
		room -= ansi.StringWidth(part) + ansi.StringWidth(separator)
		parts = append(parts, part)
	}
	line := lead + strings.Join(append(parts, tail), separator)
	return fitLine(line, width)
}

// fitStatus cuts a status line to width cells, marking the cut with …; it
// keeps at least a few words when the room is smaller than that.
func fitStatus(status string, width int) string {
	if ansi.StringWidth(status) <= width {
		return status
	}
	return ansi.Truncate(status, max(width, 12), "…")
}

// escThen takes an alt key as the Esc and the key it was typed as: over a
// slow link the two arrive as one message. Neither screen binds an alt key.
func escThen(model tea.Model, msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	next, first := model.Update(tea.KeyMsg{Type: tea.KeyEsc})
	msg.Alt = false
	next, second := next.Update(msg)
	return next, tea.Batch(first, second)
}
