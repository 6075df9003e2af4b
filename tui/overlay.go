package tui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"
)

// overlay is one layer drawn over a screen: help, a form, a question. The
// top one of a screen's stack takes every key but ctrl+c. H is the screen
// it acts on (*Model for the explorer, *Review for the review screen), so
// that an overlay changes the screen through its methods rather than
// through messages, and the screen handles every overlay the same way.
type overlay[H any] interface {
	// Update handles a key, acting on the screen through host; closed
	// says the overlay is done and comes off the stack.
	Update(host H, msg tea.KeyMsg) (closed bool, cmd tea.Cmd)
	// View draws the overlay at its natural size, no larger than the
	// screen.
	View() string
	// ShortHelp lists the keys the overlay takes, for the footer.
	ShortHelp() []key.Binding
}

// bodyCover is an overlay that takes the whole body between the header and
// the footer, so that the panes under it are not drawn.
type bodyCover interface{ coversBody() }

// push puts o on top of stack. The stack is copied rather than appended
// to in place, so that an earlier copy of the screen keeps its own.
func push[H any](stack []overlay[H], o overlay[H]) []overlay[H] {
	return append(stack[:len(stack):len(stack)], o)
}

// keyTop gives msg to the top overlay of *stack and takes that overlay off
// when it closes; an overlay it opens meanwhile stays on top.
func keyTop[H any](stack *[]overlay[H], host H, msg tea.KeyMsg) tea.Cmd {
	i := len(*stack) - 1
	top := (*stack)[i]
	closed, cmd := top.Update(host, msg)
	if closed {
		s := *stack
		*stack = append(s[:i:i], s[i+1:]...)
	}
	return cmd
}

// helpOverlay shows every key of a screen; the help key, esc or q close it.
type helpOverlay[H any] struct {
	ctx  *shared
	draw func() string
	// terms, when not nil, are the terms on screen with what each means:
	// the pages after the keys, as many as the screen's height needs.
	terms []term
	page  int // 0: the keys; then the pages of terms
}

// term is one word or mark a screen shows and what it means.
type term struct{ name, meaning string }

// Update flips the pages on the page key and closes the help on the help
// key, esc or q.
func (o *helpOverlay[H]) Update(_ H, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := o.ctx.keys
	if o.terms != nil && key.Matches(msg, k.HelpPage) {
		back := msg.String() == "left" || msg.String() == "h" || msg.String() == "shift+tab"
		n := 1 + len(termPages(o.ctx, o.terms))
		if back {
			o.page = (o.page + n - 1) % n
		} else {
			o.page = (o.page + 1) % n
		}
		return false, nil
	}
	return key.Matches(msg, k.Help) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit), nil
}

// View draws the page of the help shown.
func (o *helpOverlay[H]) View() string {
	if o.page == 0 || o.terms == nil {
		return o.draw()
	}
	pages := termPages(o.ctx, o.terms)
	i := min(o.page-1, len(pages)-1)
	return overlayBox(o.ctx, fmt.Sprintf("terms on screen (%d of %d)", i+1, len(pages)), pages[i])
}

// ShortHelp lists the keys that flip the pages and close the help.
func (o *helpOverlay[H]) ShortHelp() []key.Binding {
	close := hint(o.ctx.keys.Help, "?/esc", "close")
	if o.terms == nil {
		return []key.Binding{close}
	}
	what := "terms on screen"
	if o.page > 0 {
		what = "next page"
	}
	return []key.Binding{hint(o.ctx.keys.HelpPage, "tab", what), close}
}

// termPages lays terms out in pages that fit the screen: each term's name,
// then its meaning wrapped beside it; a page ends with the keys that flip
// and close.
func termPages(ctx *shared, terms []term) []string {
	st := ctx.styles
	boxW := min(ctx.width-st.Overlay.GetHorizontalFrameSize(), 96)
	// The header and the footer stay in view; the page's last two lines
	// are a blank and the keys.
	rows := max(ctx.height-2-st.Overlay.GetVerticalFrameSize()-2, 3)
	nameW := 0
	for _, t := range terms {
		nameW = max(nameW, ansi.StringWidth(t.name))
	}
	nameW = min(nameW, boxW/3)
	// The keys' line is as wide as the box, so that every page has its size.
	foot := st.Muted.Render(fitLine("tab next page · shift+tab back · ? or esc closes", boxW))
	var pages []string
	var page []string
	for _, t := range terms {
		var lines []string
		name := t.name
		if ansi.StringWidth(name) > nameW {
			lines = append(lines, st.Key.Render(name))
			name = ""
		}
		for i, l := range wrapWords(t.meaning, max(boxW-nameW-2, 12)) {
			if i == 0 {
				lines = append(lines, st.Key.Render(pad(name, nameW, false))+"  "+l)
			} else {
				lines = append(lines, strings.Repeat(" ", nameW+2)+l)
			}
		}
		if len(page) > 0 && len(page)+len(lines) > rows {
			pages = append(pages, strings.Join(append(page, "", foot), "\n"))
			page = nil
		}
		page = append(page, lines...)
	}
	return append(pages, strings.Join(append(page, "", foot), "\n"))
}

// answer is one key a question takes and what it does.
type answer[H any] struct {
	key  key.Binding
	what string               // the answer in a few words, for the footer
	do   func(host H) tea.Cmd // nil: only close the question
}

// question asks something that a key answers: replacing a file, quitting
// with changes not written. Any of its answers closes it; other keys do
// nothing.
type question[H any] struct {
	ctx     *shared
	title   string
	body    string
	answers []answer[H]
}

// Update runs the answer of the key pressed.
func (q *question[H]) Update(host H, msg tea.KeyMsg) (bool, tea.Cmd) {
	for _, a := range q.answers {
		if key.Matches(msg, a.key) {
			if a.do == nil {
				return true, nil
			}
			return true, a.do(host)
		}
	}
	return false, nil
}

// View draws the question in a box.
func (q *question[H]) View() string { return overlayBox(q.ctx, q.title, q.body) }

// ShortHelp lists the answers' keys.
func (q *question[H]) ShortHelp() []key.Binding {
	out := make([]key.Binding, len(q.answers))
	for i, a := range q.answers {
		out[i] = hint(a.key, "", a.what)
	}
	return out
}

// textBox asks for one line of text: enter hands it to accept, which acts
// on the screen or refuses the text with a reason shown in the box; esc
// closes the box and changes nothing.
type textBox[H any] struct {
	ctx    *shared
	title  string
	label  string // before the field; "" for none
	width  int    // the field's width in cells; 0: up to 64, within the screen
	count  bool   // show how many characters of the field's limit are used
	field  textField
	err    string   // why accept refused the text
	notes  []string // muted lines under the field: what the keys do
	accept func(host H, text string) error
	// then, when not nil, runs once accept has taken the text: work it
	// starts, such as a write.
	then func(host H) tea.Cmd
	// enter and esc say what those keys do, in a few words, for the footer.
	enter, esc string
}

// newTextBox returns a box editing text, at most limit characters.
func newTextBox[H any](ctx *shared, title, text string, limit int, accept func(H, string) error) *textBox[H] {
	b := &textBox[H]{ctx: ctx, title: title, field: newTextField(limit), accept: accept}
	b.field.SetValue(text)
	b.field.Focus()
	return b
}

// Update hands the text to accept on enter, closes on esc and edits the
// text on other keys.
func (b *textBox[H]) Update(host H, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := b.ctx.keys
	switch {
	case key.Matches(msg, k.Cancel):
		return true, nil
	case key.Matches(msg, k.Accept):
		if err := b.accept(host, b.field.Value()); err != nil {
			b.err = err.Error()
			return false, nil
		}
		if b.then != nil {
			return true, b.then(host)
		}
		return true, nil
	}
	var cmd tea.Cmd
	b.field, cmd = b.field.Update(msg)
	b.err = ""
	return false, cmd
}

// ShortHelp lists the box's keys.
func (b *textBox[H]) ShortHelp() []key.Binding {
	k := b.ctx.keys
	return []key.Binding{hint(k.Accept, "", b.enter), hint(k.Cancel, "", b.esc), hint(fieldKeys.Clear, "", "clear")}
}

// View draws the box.
func (b *textBox[H]) View() string {
	st := b.ctx.styles
	width := b.width
	if width == 0 {
		width = min(64, max(b.ctx.width-8, 20))
	}
	lines := []string{b.label + fieldLine(b.field, width)}
	if b.err != "" {
		lines = append(lines, st.Warning.Render("✗ "+b.err))
	}
	if b.count {
		lines = append(lines, st.Muted.Render(fmt.Sprintf("%d of %d characters", len([]rune(b.field.Value())), b.field.limit)))
	}
	for _, n := range b.notes {
		lines = append(lines, st.Muted.Render(n))
	}
	return overlayBox(b.ctx, b.title, strings.Join(lines, "\n"))
}

// fieldLine draws f in width columns, keeping the cursor in view: a long
// text shows the part around the cursor, with … where the start is cut.
func fieldLine(f textField, width int) string {
	text := f.View()
	if ansi.StringWidth(text) <= width {
		return fitLine(text, width)
	}
	runes := []rune(text)
	start := max(0, f.cursor-width+2)
	end := min(len(runes), start+width-1)
	return fitLine("…"+string(runes[start:end]), width)
}
