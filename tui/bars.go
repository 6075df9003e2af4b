package tui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/sill-tool/sill/internal/format"
)

// statusBar draws the lines both screens keep around their panes: the
// header on top, and at the bottom the footer with what just happened and
// the keys that matter most here.
type statusBar struct{ ctx *shared }

// header is a top line as wide as the screen: left in the header style,
// then right in rightW cells, each cut with … where it does not fit.
func (b statusBar) header(left, right string, rightW int) string {
	st, width := b.ctx.styles, b.ctx.width
	left, right = format.Printable(left), format.Printable(right) // a file's name is untrusted text
	return st.Header.Render(fitLine(left, width-rightW-2)) + "  " + st.Muted.Render(fitLine(right, rightW))
}

// footer is the bottom line: the status before the way to every key and
// the way out (tail), which always show; then mark, a rendered word on the
// state of the file, if any; then the enabled hints, in order of
// importance, while they fit. A hint's key name and description are its
// Help(). A status too long for the bottom line starts on a line of its
// own above it, at whole words, so that the footer is then two lines (see
// withFooter); what still does not fit is shortened at a whole clause.
func (b statusBar) footer(status, mark string, hints, tail []key.Binding) string {
	st, width := b.ctx.styles, b.ctx.width
	status = format.Printable(status) // it may quote a name, a note or an error from input
	if above, rest, wrapped := b.wrapStatus(status, mark, tail); wrapped {
		return st.Status.Render(fitLine(above, width)) + "\n" + b.footerLine(rest, mark, hints, tail)
	}
	return b.footerLine(status, mark, hints, tail)
}

// withFooter puts footer under frame, whose last lines give way to the
// footer's lines beyond the first: a long status covers the bottom edge of
// the panes until the next key clears it, and the screen keeps its height.
func withFooter(frame, footer string) string {
	if extra := strings.Count(footer, "\n"); extra > 0 {
		lines := strings.Split(frame, "\n")
		frame = strings.Join(lines[:max(len(lines)-extra, 0)], "\n")
	}
	return frame + "\n" + footer
}

// wrapStatus splits a status too long for the footer line into a first
// line as wide as the screen, broken at a space, and the rest ("" when the
// whole status fits on that line); wrapped is false when the status fits
// the footer line as it is, or starts with a word wider than the screen.
func (b statusBar) wrapStatus(status, mark string, tail []key.Binding) (above, rest string, wrapped bool) {
	width := b.ctx.width
	end := 0
	for i, h := range tail {
		if i > 0 {
			end += 3
		}
		end += ansi.StringWidth(h.Help().Key) + 1 + ansi.StringWidth(h.Help().Desc)
	}
	room := width - ansi.StringWidth(mark) - end - 4
	if status == "" || ansi.StringWidth(status) <= room {
		return "", "", false
	}
	lines := wrapWords(status, width)
	if ansi.StringWidth(lines[0]) > width {
		return "", "", false // one word wider than the screen: cut below
	}
	return lines[0], strings.Join(lines[1:], " "), true
}

// footerLine is the footer's bottom line with status cut to fit.
func (b statusBar) footerLine(status, mark string, hints, tail []key.Binding) string {
	st, width := b.ctx.styles, b.ctx.width
	render := func(h key.Binding) string {
		return st.Key.Render(h.Help().Key) + " " + st.Footer.Render(h.Help().Desc)
	}
	separator := st.Footer.Render(" · ")
	rendered := make([]string, len(tail))
	for i, h := range tail {
		rendered[i] = render(h)
	}
	end := strings.Join(rendered, separator)
	lead := mark
	if status != "" {
		bar := st.Footer.Render("  │ ")
		room := width - ansi.StringWidth(mark) - ansi.StringWidth(end) - ansi.StringWidth(bar)
		lead = st.Status.Render(fitStatus(status, room)) + bar + mark
	}
	room := width - ansi.StringWidth(lead) - ansi.StringWidth(end)
	var parts []string
	for _, h := range hints {
		if !h.Enabled() {
			continue
		}
		part := render(h)
		if ansi.StringWidth(part)+ansi.StringWidth(separator) > room {
			break
		}
		room -= ansi.StringWidth(part) + ansi.StringWidth(separator)
		parts = append(parts, part)
	}
	return fitLine(lead+strings.Join(append(parts, end), separator), width)
}

// hint is b as the footer shows it: its key name (name, or the binding's
// own when name is "") and what in a few words.
func hint(b key.Binding, name, what string) key.Binding {
	if name == "" {
		name = b.Help().Key
	}
	b.SetHelp(name, what)
	return b
}

// pairedHelp is a line of the help for two keys that do opposite things,
// such as a page up and down.
func pairedHelp(keys, what string) key.Binding {
	return key.NewBinding(key.WithKeys(keys), key.WithHelp(keys, what))
}

// fitStatus shortens a status line to width cells: whole clauses (parted
// by " · " or "; ") while they fit, then " …"; a first clause longer than
// width is cut at a word, and only a single word is cut inside. It keeps
// at least a few characters when the room is smaller than that.
func fitStatus(status string, width int) string {
	if ansi.StringWidth(status) <= width {
		return status
	}
	width = max(width, 12)
	kept := ""
	for pos := 0; ; {
		i, sep := nextClause(status[pos:])
		if i < 0 || ansi.StringWidth(status[:pos+i])+2 > width {
			break
		}
		kept = status[:pos+i]
		pos += i + len(sep)
	}
	if kept != "" {
		return kept + " …"
	}
	words := wrapWords(status, width-2)
	if len(words) > 0 && ansi.StringWidth(words[0]) <= width-2 {
		return words[0] + " …"
	}
	return ansi.Truncate(status, width, "…")
}

// nextClause returns where the first clause of text ends, at " · " or
// "; ", and that separator; -1 when text is one clause.
func nextClause(text string) (int, string) {
	dot, semi := strings.Index(text, " · "), strings.Index(text, "; ")
	switch {
	case dot < 0 && semi < 0:
		return -1, ""
	case semi < 0 || dot >= 0 && dot < semi:
		return dot, " · "
	default:
		return semi, "; "
	}
}

// splitKeys takes apart what a slow link glues together before a screen
// sees its keys: an Esc and the key typed after it arrive as one alt key
// (neither screen binds an alt key), and keys typed ahead as one message
// of several runes. It gives screen each key in turn and reports whether
// msg was such a message.
func splitKeys(screen tea.Model, msg tea.KeyMsg) (tea.Model, tea.Cmd, bool) {
	switch {
	case msg.Paste:
		return screen, nil, false
	case msg.Alt:
		next, first := screen.Update(tea.KeyMsg{Type: tea.KeyEsc})
		msg.Alt = false
		next, second := next.Update(msg)
		return next, tea.Batch(first, second), true
	case msg.Type == tea.KeyRunes && len(msg.Runes) > 1:
		var cmds []tea.Cmd
		for _, r := range msg.Runes {
			var cmd tea.Cmd
			screen, cmd = screen.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune{r}})
			cmds = append(cmds, cmd)
		}
		return screen, tea.Batch(cmds...), true
	}
	return screen, nil, false
}

// tooSmallNotice is what the screen called name shows on a width×height
// terminal below its minimum size minW×minH: what it needs, what it has
// and how to leave, in the longest form whose lines all fit, centred, at
// exactly width×height. With an overlay open (overlayOpen) the way to
// leave is ctrl+c, since q may go to a field that cannot be seen.
func tooSmallNotice(name string, minW, minH, width, height int, overlayOpen bool) string {
	press, quits := "press q to quit", "q quits"
	if overlayOpen {
		press, quits = "press ctrl+c to quit", "ctrl+c quits"
	}
	forms := [][]string{
		{fmt.Sprintf("%s needs a terminal of at least %d×%d;", name, minW, minH),
			fmt.Sprintf("this one is %d×%d.", width, height), "Enlarge it, or " + press + "."},
		wrapWords(fmt.Sprintf("%s needs a terminal of at least %d×%d; this one is %d×%d. Enlarge it, or %s.",
			name, minW, minH, width, height, press), width),
		wrapWords(fmt.Sprintf("needs %d×%d, has %d×%d; %s", minW, minH, width, height, quits), width),
		wrapWords(fmt.Sprintf("needs %d×%d; %s", minW, minH, quits), width),
		{fmt.Sprintf("needs %d×%d", minW, minH)},
	}
	lines := forms[len(forms)-1]
	for _, form := range forms {
		if fitsIn(form, width, height) {
			lines = form
			break
		}
	}
	return fit(lipgloss.Place(width, height, lipgloss.Center, lipgloss.Center, strings.Join(lines, "\n")), width, height)
}

// fitsIn reports whether lines fit in width columns and height lines.
func fitsIn(lines []string, width, height int) bool {
	if len(lines) > height {
		return false
	}
	for _, l := range lines {
		if ansi.StringWidth(l) > width {
			return false
		}
	}
	return true
}
