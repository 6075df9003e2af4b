package tui

import (
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/compare"
)

// Strip is the comparison strip: the pinned candidates side by side, one
// column each, every figure with its difference from the chosen candidate
// (the reference, marked ◆). The selected candidate is marked ▸ and kept
// in view when the columns do not all fit.
//
// The strip draws a compare.Table and moves the selection; what the other
// strip keys do (jump, remove, reorder, rename, choose) is up to the model
// that owns the candidates, which then calls SetTable. The explorer and the
// review screen share it.
type Strip struct {
	styles   Styles
	keys     KeyMap
	table    compare.Table
	selected int
	width    int
	height   int
}

// NewStrip returns an empty strip drawn with styles and driven by keys.
func NewStrip(styles Styles, keys KeyMap) Strip { return Strip{styles: styles, keys: keys} }

// SetTable sets the comparison to draw, keeping the selection in range.
func (s *Strip) SetTable(t compare.Table) {
	s.table = t
	s.selected = min(max(s.selected, 0), max(len(t.Names)-1, 0))
}

// SetSelected selects column i (clamped to the columns there are).
func (s *Strip) SetSelected(i int) {
	s.selected = min(max(i, 0), max(len(s.table.Names)-1, 0))
}

// Selected returns the selected column, 0 when there is none.
func (s Strip) Selected() int { return s.selected }

// SetSize sets the outer size, border included.
func (s *Strip) SetSize(width, height int) { s.width, s.height = width, height }

// Lines returns the content lines the strip needs to show every figure:
// the names, the rules and one line per row of the table.
func (s Strip) Lines() int { return 2 + len(s.table.Rows) }

// Update moves the selection with the Left and Right keys.
func (s Strip) Update(msg tea.Msg) (Strip, tea.Cmd) {
	if m, ok := msg.(tea.KeyMsg); ok {
		switch {
		case key.Matches(m, s.keys.Left):
			s.SetSelected(s.selected - 1)
		case key.Matches(m, s.keys.Right):
			s.SetSelected(s.selected + 1)
		}
	}
	return s, nil
}

// ShortHelp lists the strip's most used keys.
func (s Strip) ShortHelp() []key.Binding {
	return []key.Binding{s.keys.Left, s.keys.Right, s.keys.Jump, s.keys.Choose}
}

// FullHelp lists every strip key.
func (s Strip) FullHelp() [][]key.Binding {
	k := s.keys
	return [][]key.Binding{{k.Left, k.Right, k.Jump, k.Choose, k.Rename, k.Remove, k.MoveLeft, k.MoveRight}}
}

// View draws the strip at its size; focused draws the frame that shows it
// has the keys.
func (s Strip) View(focused bool) string {
	st := s.styles
	box, edge := st.Pane, st.PaneEdge
	if focused {
		box, edge = st.FocusedPane, st.FocusedEdge
	}
	innerW := s.width - box.GetHorizontalFrameSize()
	innerH := s.height - box.GetVerticalFrameSize()
	n := len(s.table.Names)
	title := "comparison strip · " + strconv.Itoa(n) + " pinned"
	if n == 0 {
		return framed(box, edge, st.Title, "comparison strip", st.Muted.Render("nothing pinned yet: p pins the cursor's cut"), s.width, s.height)
	}
	if innerH < 3 {
		return framed(box, edge, st.Title, title, s.chips(), s.width, s.height)
	}
	body, first, last := s.grid(innerW)
	if first > 0 || last < n-1 {
		title += " · showing " + strconv.Itoa(first+1) + "–" + strconv.Itoa(last+1)
	}
	return framed(box, edge, st.Title, title, body, s.width, s.height)
}

// chips is the one-line form: every candidate's name.
func (s Strip) chips() string {
	st := s.styles
	parts := make([]string, 0, len(s.table.Names)+1)
	for i, name := range s.table.Names {
		parts = append(parts, s.heading(i, name))
	}
	return strings.Join(parts, "  ") + st.Muted.Render("   tab compares them")
}

// heading is a candidate's name with its marks: ▸ selected, ◆ chosen.
func (s Strip) heading(i int, name string) string {
	st := s.styles
	mark := " "
	if i == s.table.Reference {
		mark = "◆"
	}
	text := mark + name
	if i == s.selected {
		text = "▸" + text
		return st.Selected.Render(text)
	}
	if i == s.table.Reference {
		return st.Reference.Render(" " + text)
	}
	return " " + text
}

// grid draws the table, with as many columns as fit around the selected
// one, and returns the first and last column drawn.
func (s Strip) grid(innerW int) (string, int, int) {
	st, t := s.styles, s.table
	labelW := 0
	for _, r := range t.Rows {
		labelW = max(labelW, ansi.StringWidth(r.Figure))
	}
	labelW = min(labelW, 27)
	valueW := make([]int, len(t.Names))
	diffW := make([]int, len(t.Names))
	for c := range t.Names {
		for _, r := range t.Rows {
			valueW[c] = max(valueW[c], ansi.StringWidth(r.Cells[c]))
			diffW[c] = max(diffW[c], ansi.StringWidth(r.Diffs[c]))
		}
		if c == t.Reference {
			diffW[c] = max(diffW[c], len("ref"))
		}
	}
	colW := func(c int) int {
		w := valueW[c] + 1 + diffW[c]
		w = max(w, ansi.StringWidth(t.Names[c])+3, ansi.StringWidth(t.Rules[c])+2, 12)
		return min(w, 26) + 2
	}
	// Columns in view: start at the selected one and widen to both sides.
	room := innerW - labelW
	first, last := s.selected, s.selected
	used := colW(s.selected)
	for {
		grew := false
		if last+1 < len(t.Names) && used+colW(last+1) <= room {
			last++
			used += colW(last)
			grew = true
		}
		if first > 0 && used+colW(first-1) <= room {
			first--
			used += colW(first)
			grew = true
		}
		if !grew {
			break
		}
	}
	var lines []string
	names := pad("", labelW, false)
	rules := pad("candidate · rule", labelW, false)
	for c := first; c <= last; c++ {
		names += "  " + fitLine(s.heading(c, t.Names[c]), colW(c)-2)
		rule := t.Rules[c]
		if rule == "" {
			rule = "by hand"
		}
		rules += "  " + pad("  "+rule, colW(c)-2, false)
	}
	lines = append(lines, names, st.Muted.Render(rules))
	for _, r := range t.Rows {
		label := pad(r.Figure, labelW, false)
		if r.Detail {
			label = st.Muted.Render(label)
		}
		line := label
		for c := first; c <= last; c++ {
			w := colW(c) - 2
			value := r.Cells[c]
			diff := r.Diffs[c]
			if c == t.Reference && !r.Detail {
				diff = "ref"
			}
			cell := pad(value, valueW[c], true)
			text := cell + " " + pad(diff, max(w-valueW[c]-1, 0), false)
			if r.Detail {
				line += "  " + st.Muted.Render(fitLine(pad(value, valueW[c], true), w))
				continue
			}
			line += "  " + st.Figure.Render(ansi.Truncate(cell, w, "…")) + s.diffStyle(r, c).Render(fitLine(text[len(cell):], max(w-ansi.StringWidth(cell), 0)))
		}
		lines = append(lines, line)
	}
	return strings.Join(lines, "\n"), first, last
}

// diffStyle styles a difference as a gain or a loss by the row's direction.
func (s Strip) diffStyle(r compare.Row, c int) lipgloss.Style {
	st := s.styles
	d := r.Deltas[c]
	switch {
	case c == s.table.Reference || d == 0 || d != d:
		return st.Muted
	case (r.Better == compare.Higher) == (d > 0) && r.Better != compare.Neither:
		return st.Good
	case r.Better != compare.Neither:
		return st.Bad
	}
	return st.Muted
}
