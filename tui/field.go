package tui

import (
	"unicode"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/sill-tool/sill/internal/format"
)

// fieldKeys are the editing keys of a textField; typed characters go in
// as text.
var fieldKeys = struct {
	Backspace, Delete, Left, Right, Home, End, Clear key.Binding
}{
	Backspace: key.NewBinding(key.WithKeys("backspace"), key.WithHelp("backspace", "delete back")),
	Delete:    key.NewBinding(key.WithKeys("delete"), key.WithHelp("delete", "delete forward")),
	Left:      key.NewBinding(key.WithKeys("left"), key.WithHelp("←", "cursor left")),
	Right:     key.NewBinding(key.WithKeys("right"), key.WithHelp("→", "cursor right")),
	Home:      key.NewBinding(key.WithKeys("home", "ctrl+a"), key.WithHelp("home/ctrl+a", "to the start")),
	End:       key.NewBinding(key.WithKeys("end", "ctrl+e"), key.WithHelp("end/ctrl+e", "to the end")),
	Clear:     key.NewBinding(key.WithKeys("ctrl+u"), key.WithHelp("ctrl+u", "clear")),
}

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
	k := fieldKeys
	switch {
	case m.Type == tea.KeyRunes || m.Type == tea.KeySpace:
		runes := m.Runes
		if m.Type == tea.KeySpace {
			runes = []rune{' '}
		}
		for _, r := range runes {
			if unicode.IsControl(r) {
				r = ' ' // a pasted line break or tab stays on the one line
			}
			if f.limit > 0 && len(f.value) >= f.limit {
				break
			}
			f.value = append(f.value[:f.cursor], append([]rune{r}, f.value[f.cursor:]...)...)
			f.cursor++
		}
	case key.Matches(m, k.Backspace):
		if f.cursor > 0 {
			f.value = append(f.value[:f.cursor-1], f.value[f.cursor:]...)
			f.cursor--
		}
	case key.Matches(m, k.Delete):
		if f.cursor < len(f.value) {
			f.value = append(f.value[:f.cursor], f.value[f.cursor+1:]...)
		}
	case key.Matches(m, k.Left):
		f.cursor = max(f.cursor-1, 0)
	case key.Matches(m, k.Right):
		f.cursor = min(f.cursor+1, len(f.value))
	case key.Matches(m, k.Home):
		f.cursor = 0
	case key.Matches(m, k.End):
		f.cursor = len(f.value)
	case key.Matches(m, k.Clear):
		f.value, f.cursor = f.value[:0], 0
	}
	return f, nil
}

// View draws the text, with the cursor when focused.
func (f textField) View() string {
	// The text may be a note or a name read from a file: untrusted.
	if !f.focused {
		return format.Printable(string(f.value))
	}
	return format.Printable(string(f.value[:f.cursor])) + "│" + format.Printable(string(f.value[f.cursor:]))
}
