package tui

import (
	"fmt"

	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/format"
)

// What the explorer shows around its panes, and of its keys: the header,
// the footer and the groups of the help. The footer and the help ask the
// panes for their keys (ShortHelp, FullHelp).

// header is the top line: the data's name on the left, its size and
// ranking figures on the right, which keep their room first. The ranking
// figures carry their intervals (analysis.Ranking) while they fit in three
// quarters of the line: the average precision's interval goes first, then
// the average precision, then the AUC's interval.
func (m Model) header() string {
	s := m.s
	sum, ranking := s.curve.Summary, s.res.Ranking
	size := fmt.Sprintf("%d rows · %s true (%s)", sum.Rows, format.Count(sum.Positives), format.Share(sum.BaseRate))
	if s.set.Weighted() { // a counts table's weights are whole cases, not weights
		size += " · weighted"
	}
	auc := format.NumberWithInterval(sum.ROCAUC, ranking.ROCAUC.Interval, 3)
	candidates := []string{
		size + " · ROC AUC " + auc + " · AP " + format.NumberWithInterval(sum.AveragePrecision, ranking.AveragePrecision, 3),
		size + " · ROC AUC " + auc + " · AP " + format.Number(sum.AveragePrecision, 3),
		size + " · ROC AUC " + auc,
		size + " · ROC AUC " + format.Number(sum.ROCAUC, 3),
	}
	right := candidates[len(candidates)-1]
	for _, c := range candidates {
		if ansi.StringWidth(c) <= m.ctx.width*3/4 {
			right = c
			break
		}
	}
	return statusBar{m.ctx}.header("sill · "+s.set.Source(), right, min(ansi.StringWidth(right), m.ctx.width*3/4))
}

// footer is the bottom line: what just happened, whether the pins on
// screen are written, then the keys that matter most here, in a few words
// each.
func (m Model) footer() string {
	st, k := m.ctx.styles, m.ctx.keys
	tail := []key.Binding{hint(k.Help, "", "all keys"), hint(k.Quit, "", "quit")}
	var hints []key.Binding
	switch {
	case len(m.overlays) > 0:
		// The overlay's keys only: the others go to it, and q may be
		// typed into a field.
		hints = m.overlays[len(m.overlays)-1].ShortHelp()
		tail = []key.Binding{hint(k.Interrupt, "", "quit")}
	case m.focus == focusStrip:
		hints = append(m.strip.ShortHelp(), m.ShortHelp()...)
	default:
		hints = append(append(m.list.ShortHelp(), m.figures.ShortHelp()...), m.ShortHelp()...)
	}
	mark := ""
	switch {
	case m.unwritten && len(m.s.pins) > 0 && !m.cfg.ReadOnly:
		mark = st.Warning.Render("not written") + st.Footer.Render(" · ")
	case m.written != "" && m.status == "":
		// Whether the pins on screen are the file's, at a glance.
		mark = st.Muted.Render("written: "+m.written) + st.Footer.Render(" · ")
	}
	return statusBar{m.ctx}.footer(m.status, mark, hints, tail)
}

// ShortHelp lists the root's own keys that matter most with the focused
// pane, in a few words each, the most used first: with the list, the
// views beyond the averages come last, shown where the line has room.
func (m Model) ShortHelp() []key.Binding {
	k := m.ctx.keys
	var out []key.Binding
	switch {
	case m.focus == focusStrip:
		out = append(out, hint(k.Focus, "", "list"))
	case len(m.s.pins) > 0:
		out = append(out, hint(k.Pin, "", "pin"), hint(k.Focus, "", "strip"))
	default:
		out = append(out, hint(k.Pin, "", "pin"))
	}
	out = append(out, hint(k.Write, "", "write"), hint(k.Assumptions, "", "assumptions"))
	if m.focus == focusList {
		out = append(out, hint(k.Segments, "", "segments"), hint(k.Stability, "", "stability"),
			hint(k.Calibration, "", "calibration"), hint(k.Models, "", "two models"))
	}
	return out
}

// helpGroup is one titled group of keys in the help.
type helpGroup struct {
	title    string
	bindings []key.Binding
}

// helpGroups gathers every key, grouped, from the panes (their
// FullHelp) and the root. The strip's keys are listed even when the strip
// does not have the keys, so that they can be found. Keys that come in
// pairs (a page up and down, the previous and next candidate) share a
// line, so that the help fits an 80×22 terminal.
func (m Model) helpGroups() []helpGroup {
	k := m.ctx.keys
	flat := func(groups [][]key.Binding) []key.Binding {
		var out []key.Binding
		for _, g := range groups {
			out = append(out, g...)
		}
		return out
	}
	candidates := append([]key.Binding{k.Pin, k.Focus}, flat(m.strip.FullHelp())...)
	screen := append(flat(m.chart.FullHelp()), m.beyondKeys()...)
	screen = append(screen, k.Assumptions, k.Record, k.Write, k.Help, k.Quit, k.Interrupt)
	return []helpGroup{
		{"move the cut", flat(m.list.FullHelp())},
		{"starting points", flat(m.figures.FullHelp())},
		{"candidates", candidates},
		{"screen, views and file", screen},
	}
}
