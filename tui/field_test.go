package tui

import (
	"testing"

	tea "github.com/charmbracelet/bubbletea"
)

// TestTextField edits a field key by key; each want was worked by hand
// from the keys' meanings in fieldKeys (│ is the cursor).
func TestTextField(t *testing.T) {
	runes := func(s string) tea.KeyMsg { return tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(s)} }
	for _, tc := range []struct {
		name  string
		start string
		limit int
		keys  []tea.KeyMsg
		want  string
	}{
		{"type at the end", "0.0", 24, []tea.KeyMsg{runes("5")}, "0.05│"},
		{"backspace", "120", 24, []tea.KeyMsg{{Type: tea.KeyBackspace}}, "12│"},
		{"left then type", "15", 24, []tea.KeyMsg{{Type: tea.KeyLeft}, runes("0")}, "10│5"},
		{"home then delete", "x90", 24, []tea.KeyMsg{{Type: tea.KeyHome}, {Type: tea.KeyDelete}}, "│90"},
		{"ctrl+a ctrl+e", "ab", 24, []tea.KeyMsg{{Type: tea.KeyCtrlA}, {Type: tea.KeyCtrlE}, runes("c")}, "abc│"},
		{"ctrl+u clears", "1500", 24, []tea.KeyMsg{{Type: tea.KeyCtrlU}}, "│"},
		{"space", "a", 24, []tea.KeyMsg{{Type: tea.KeySpace}, runes("b")}, "a b│"},
		{"a pasted line break stays on the line", "", 24, []tea.KeyMsg{{Type: tea.KeyRunes, Runes: []rune("one\ntwo"), Paste: true}}, "one two│"},
		{"the limit", "abc", 4, []tea.KeyMsg{runes("def")}, "abcd│"},
		{"backspace at the start does nothing", "ab", 24, []tea.KeyMsg{{Type: tea.KeyHome}, {Type: tea.KeyBackspace}}, "│ab"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f := newTextField(tc.limit)
			f.SetValue(tc.start)
			f.Focus()
			for _, k := range tc.keys {
				f, _ = f.Update(k)
			}
			if got := f.View(); got != tc.want {
				t.Errorf("got %q, want %q", got, tc.want)
			}
		})
	}
}
