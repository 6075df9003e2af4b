package tui

import (
	tea "github.com/charmbracelet/bubbletea"
)

// textField is a one-line text entry: typed characters go in at the
// cursor, backspace and delete remove, left, right, home and end move. The
// cursor shows as │ so that it reads without colour.
type textField struct {
	value   []rune
	cursor  int
	limit   int
	focused bool
}

func newTextField(limit int) textField { return textField{limit: limit} }

// SetValue replaces the text and puts the cursor at its end.
func (f *textField) SetValue(s string) {
	f.value = []rune(s)
	if f.limit > 0 && len(f.value) > f.limit {
		f.value = f.value[:f.limit]
	}
	f.cursor = len(f.value)
}

// Value returns the text.
func (f textField) Value() string { return string(f.value) }

// Focus and Blur say whether the field takes keys and shows its cursor.
func (f *textField) Focus() { f.focused = true }
func (f *textField) Blur()  { f.focused = false }

// Update edits the text for a key press; other messages are ignored.
func (f textField) Update(msg tea.Msg) (textField, tea.Cmd) {
	m, ok := msg.(tea.KeyMsg)
	if !ok || !f.focused {
		return f, nil
	}
	switch m.Type {
	case tea.KeyRunes, tea.KeySpace:
		runes := m.Runes
		if m.Type == tea.KeySpace {
			runes = []rune{' '}
		}
		for _, r := range runes {
			if f.limit > 0 && len(f.value) >= f.limit {
				break
			}
			f.value = append(f.value[:f.cursor], append([]rune{r}, f.value[f.cursor:]...)...)
			f.cursor++
		}
	case tea.KeyBackspace:
		if f.cursor > 0 {
			f.value = append(f.value[:f.cursor-1], f.value[f.cursor:]...)
			f.cursor--
		}
	case tea.KeyDelete:
		if f.cursor < len(f.value) {
			f.value = append(f.value[:f.cursor], f.value[f.cursor+1:]...)
		}
	case tea.KeyLeft:
		f.cursor = max(f.cursor-1, 0)
	case tea.KeyRight:
		f.cursor = min(f.cursor+1, len(f.value))
	case tea.KeyHome, tea.KeyCtrlA:
		f.cursor = 0
	case tea.KeyEnd, tea.KeyCtrlE:
		f.cursor = len(f.value)
	case tea.KeyCtrlU:
		f.value, f.cursor = f.value[:0], 0
	}
	return f, nil
}

// View draws the text, with the cursor when focused.
func (f textField) View() string {
	if !f.focused {
		return string(f.value)
	}
	return string(f.value[:f.cursor]) + "│" + string(f.value[f.cursor:])
}
