package tui

import (
	"errors"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
)

// stackHost is a screen with nothing but an overlay stack, for the tests
// of the stack itself.
type stackHost struct {
	overlays []overlay[*stackHost]
	said     string
}

// TestKeyTopOpensFromAnswer checks the stack as a prompt uses it: an
// answer that closes a question and opens a text box leaves the box on
// top (as "write elsewhere" would ask for a path), the box refuses a text
// with its reason and stays, and esc closes it, leaving the stack empty;
// the stack an earlier copy of the screen holds is not changed.
func TestKeyTopOpensFromAnswer(t *testing.T) {
	ctx := newShared(nil, nil)
	box := newTextBox(ctx, "path", "", 40, func(h *stackHost, text string) error {
		if text == "" {
			return errors.New("expected a path")
		}
		h.said = text
		return nil
	})
	ask := &question[*stackHost]{ctx: ctx, title: "changed on disk", answers: []answer[*stackHost]{
		{key: ctx.keys.Yes, what: "elsewhere", do: func(h *stackHost) tea.Cmd {
			h.overlays = push(h.overlays, box)
			return nil
		}},
	}}
	h := &stackHost{}
	h.overlays = push(h.overlays, ask)
	before := h.overlays
	keyTop(&h.overlays, h, keyMsg("x")) // no answer: nothing happens
	if len(h.overlays) != 1 || h.overlays[0] != ask {
		t.Fatalf("a key that answers nothing changed the stack: %v", h.overlays)
	}
	keyTop(&h.overlays, h, keyMsg("y"))
	if len(h.overlays) != 1 || h.overlays[0] != box {
		t.Fatalf("after the answer: %v, want the text box alone", h.overlays)
	}
	if len(before) != 1 || before[0] != ask {
		t.Errorf("the earlier stack changed: %v", before)
	}
	keyTop(&h.overlays, h, keyMsg("enter"))
	if len(h.overlays) != 1 || box.err == "" {
		t.Fatalf("an empty path was taken: overlays %v, err %q", h.overlays, box.err)
	}
	for _, k := range []string{"o", "u", "t"} {
		keyTop(&h.overlays, h, keyMsg(k))
	}
	keyTop(&h.overlays, h, keyMsg("enter"))
	if len(h.overlays) != 0 || h.said != "out" {
		t.Errorf("enter on %q: overlays %v, said %q", "out", h.overlays, h.said)
	}
}
