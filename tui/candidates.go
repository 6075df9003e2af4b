package tui

import (
	"fmt"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/format"
)

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
	case key.Matches(msg, k.Repin):
		p := s.pins[s.selected]
		switch heldBy, ok := s.repinSelected(); {
		case ok:
			m.unwritten = true
			m.list.follow()
			m.status = fmt.Sprintf("re-pinned %q at %s, the cut its rule picks under these assumptions", p.name, format.Score(s.curve.At(s.cursor).Score))
		case heldBy != "":
			m.status = fmt.Sprintf("not re-pinned: %s lands on %s, held by %q; x unpins one", p.rule, format.Score(s.curve.At(p.now).Score), heldBy)
		}
	case key.Matches(msg, k.Rename):
		m.push(renameBox(m.ctx, s.pins[s.selected].name))
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

// movedStatus says that n pins no longer meet their rule, and how to
// re-pin them.
func movedStatus(n int) string {
	what := fmt.Sprintf("%d pins were", n)
	if n == 1 {
		what = "1 pin was"
	}
	return "assumptions changed: " + what + " pinned under earlier assumptions, marked (earlier); in the strip R re-pins to what the rule picks now"
}
