package tui

import (
	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
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
}

// Update closes the help on the help key, esc or q.
func (o *helpOverlay[H]) Update(_ H, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := o.ctx.keys
	return key.Matches(msg, k.Help) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit), nil
}

// View draws the help.
func (o *helpOverlay[H]) View() string { return o.draw() }

// ShortHelp lists the keys that close the help.
func (o *helpOverlay[H]) ShortHelp() []key.Binding {
	return []key.Binding{hint(o.ctx.keys.Help, "?/esc", "close")}
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
