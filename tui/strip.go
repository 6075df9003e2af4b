package tui

import (
	"slices"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/format"
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

	// scrolls says the rows scroll (Scroll) when they do not all fit,
	// instead of giving way (the review screen, where the figures are
	// all the lead has); offset is the first row in view.
	scrolls bool
	offset  int

	generation int         // counts SetTable calls, so the cache knows the table
	cache      *stripCache // the last drawing, shared by copies of the strip
}

// stripCache keeps the last drawing: the strip only changes when its table,
// selection, size or focus does, not when the cursor moves.
type stripCache struct {
	key  stripCacheKey
	view string
}

// stripCacheKey is what a drawing of the strip depends on.
type stripCacheKey struct {
	generation, selected, width, height, offset int
	focused                                     bool
}

// NewStrip returns an empty strip drawn with styles and driven by keys.
func NewStrip(styles Styles, keys KeyMap) Strip {
	return Strip{styles: styles, keys: keys, cache: &stripCache{key: stripCacheKey{generation: -1}}}
}

// SetTable sets the comparison to draw, keeping the selection in range.
func (s *Strip) SetTable(t compare.Table) {
	s.generation++
	// The names and rules may come from a decision file: untrusted text.
	t.Names, t.Rules = printableAll(t.Names), printableAll(t.Rules)
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

// SetScrolling makes the rows scroll when they do not all fit: only the
// counts in scrollDrops give way, every interval stays and Scroll brings
// the rows below into view.
func (s *Strip) SetScrolling(on bool) { s.scrolls = on }

// Scroll moves the rows in view by step rows (negative: up), within the
// rows there are.
func (s *Strip) Scroll(step int) {
	s.offset = s.window(s.rowLines()).first + step
	s.offset = s.window(s.rowLines()).first
}

// Scrollable reports whether the strip scrolls and has rows out of view.
func (s Strip) Scrollable() bool {
	w := s.window(s.rowLines())
	return s.scrolls && w.total > w.last-w.first
}

// rowLines is how many rows of the table the strip has lines for, below
// the names and the rules.
func (s Strip) rowLines() int {
	return s.height - s.styles.Pane.GetVerticalFrameSize() - 2
}

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

// ShortHelp lists the strip's most used keys, in a few words each.
func (s Strip) ShortHelp() []key.Binding {
	k := s.keys
	return []key.Binding{hint(k.Left, "←→", "select"), hint(k.Repin, "", "re-pin"), hint(k.Jump, "", "go to"), hint(k.Choose, "", "choose"),
		hint(k.Rename, "", "rename"), hint(k.Remove, "", "unpin")}
}

// FullHelp lists every strip key, turned off or not, so that the help
// shows them before anything is pinned; the keys that come in pairs share
// a line.
func (s Strip) FullHelp() [][]key.Binding {
	k := s.keys
	return [][]key.Binding{{pairedHelp("←/h →/l", "previous/next candidate"), k.Jump, k.Choose, k.Rename, k.Remove,
		pairedHelp("< >", "move candidate left/right"), k.Repin}}
}

// View draws the strip at its size; focused draws the frame that shows it
// has the keys.
func (s Strip) View(focused bool) string {
	key := stripCacheKey{s.generation, s.selected, s.width, s.height, s.offset, focused}
	if s.cache != nil && s.cache.key == key {
		return s.cache.view
	}
	view := s.draw(focused)
	if s.cache != nil {
		s.cache.key, s.cache.view = key, view
	}
	return view
}

// draw draws the strip without the cache.
func (s Strip) draw(focused bool) string {
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
	body, shown := s.grid(innerW, innerH)
	w := s.window(innerH - 2)
	rows := "rows " + strconv.Itoa(w.first+1) + "–" + strconv.Itoa(w.last) + " of " + strconv.Itoa(w.total)
	switch scrolled := s.scrolls && w.total > w.last-w.first; {
	case shown < n && scrolled:
		title += " · " + strconv.Itoa(shown) + " in view ←→ · " + rows + " ↑↓"
	case shown < n:
		title += " · " + strconv.Itoa(shown) + " in view, ←→ for the rest"
	case scrolled:
		title += " · " + rows + ", ↑↓ for the rest"
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

// detailOrder is the order in which detail rows give way when the strip is
// short of lines: the share of all cases first, the capacity reading last
// of the figures. The bootstrap's redraws, asked for with b, outlast the
// count of true cases found, except the wrong-alert share's (wrongRedraws),
// which gives way second, as the wrong-alert share is what the hit share
// and its interval already bound; which the hit share and the header's count
// of true cases already give, and the least-cost cut's corrected cost,
// which the review screen's candidate lines also give.
// The headings that name the measured and the projected figures go last:
// the labels below them still differ ("wrong-alert share (FDR)", measured;
// "wrong-alert share", projected).
var detailOrder = []string{"share of all cases", wrongRedraws, "interval", "true cases found", strings.TrimSpace(compare.CorrectedRow), compare.RedrawsLabel, compare.LandsLabel, "against capacity", format.MeasuredHeading, format.ProjectedHeading}

// wrongRedraws stands in detailOrder for the second redraws row, the
// wrong-alert share's, which goes before the hit share's.
const wrongRedraws = "\x00wrong-alert redraws"

// matchesDrop reports whether rows[i] is a row that the entry what of a
// drop list names: a row whose label holds what, or for wrongRedraws a
// redraws row that follows another.
func matchesDrop(rows []compare.Row, i int, what string) bool {
	if what != wrongRedraws {
		return strings.Contains(rows[i].Figure, what)
	}
	if strings.TrimSpace(rows[i].Figure) != compare.RedrawsLabel {
		return false
	}
	for _, r := range rows[:i] {
		if strings.TrimSpace(r.Figure) == compare.RedrawsLabel {
			return true
		}
	}
	return false
}

// scrollDrops are the detail rows a scrolling strip still lets go before
// it scrolls: counts that the figure above them and the header give.
var scrollDrops = []string{"share of all cases", "true cases found"}

// rowWindow is the part of the table's rows in view: rows[first:last] of
// the rows kept, after the heading of their section when it is above
// them (heading is then not nil), total rows in all.
type rowWindow struct {
	rows               []compare.Row
	heading            *compare.Row
	first, last, total int
}

// window returns the rows to draw in lines lines. A strip that does not
// scroll drops detail rows in detailOrder until they fit; one that
// scrolls drops only those of scrollDrops and shows lines rows from its
// offset (clamped so that the last row is in view at the end), led by the
// heading of their section when it has scrolled away.
func (s Strip) window(lines int) rowWindow {
	if !s.scrolls {
		rows := rowsThatFit(s.table.Rows, lines, detailOrder)
		return rowWindow{rows: rows, last: len(rows), total: len(rows)}
	}
	rows := rowsThatFit(s.table.Rows, lines, scrollDrops)
	lines = max(lines, 1)
	// heading returns the heading above row i when row i is not one.
	heading := func(i int) *compare.Row {
		if i == 0 || i >= len(rows) || rows[i].Heading {
			return nil
		}
		for h := i - 1; h >= 0; h-- {
			if rows[h].Heading {
				return &rows[h]
			}
		}
		return nil
	}
	// end returns the end of the rows in view from row i.
	end := func(i int) int {
		n := lines
		if heading(i) != nil {
			n--
		}
		return min(i+max(n, 1), len(rows))
	}
	first := min(max(s.offset, 0), max(len(rows)-1, 0))
	for first > 0 && end(first-1) >= len(rows) {
		first-- // no space left below the last row
	}
	return rowWindow{rows: rows, heading: heading(first), first: first, last: end(first), total: len(rows)}
}

// inView returns the rows of w to draw, the heading first.
func (w rowWindow) inView() []compare.Row {
	out := w.rows[w.first:w.last]
	if w.heading != nil {
		out = append([]compare.Row{*w.heading}, out...)
	}
	return out
}

// rowsThatFit returns the rows of t to draw in lines lines: every figure,
// dropping detail rows in the order of drops until they fit.
func rowsThatFit(rows []compare.Row, lines int, drops []string) []compare.Row {
	keep := make([]bool, len(rows))
	count := len(rows)
	for i := range keep {
		keep[i] = true
	}
	for _, what := range drops {
		for i, r := range rows {
			if count <= lines {
				break
			}
			if keep[i] && r.Detail && matchesDrop(rows, i, what) {
				keep[i] = false
				count--
			}
		}
	}
	out := make([]compare.Row, 0, count)
	for i, r := range rows {
		if keep[i] {
			out = append(out, r)
		}
	}
	return out
}

// grid draws the table in innerW×innerH: the reference column and as many
// others as fit around the selected one, in strip order. It returns the
// number of columns drawn.
func (s Strip) grid(innerW, innerH int) (string, int) {
	st, t := s.styles, s.table
	labelW := 0
	for _, r := range t.Rows {
		if !r.Heading { // a heading runs on over the empty cells
			labelW = max(labelW, ansi.StringWidth(r.Figure))
		}
	}
	labelW = min(labelW, 27)
	// A figure's value is right-aligned with its difference after it; a
	// detail (which has no difference) may spread over both.
	valueW := make([]int, len(t.Names))
	diffW := make([]int, len(t.Names))
	detailW := make([]int, len(t.Names))
	for c := range t.Names {
		for _, r := range t.Rows {
			if r.Detail {
				detailW[c] = max(detailW[c], ansi.StringWidth(r.Cells[c]))
				continue
			}
			valueW[c] = max(valueW[c], ansi.StringWidth(r.Cells[c]))
			diffW[c] = max(diffW[c], ansi.StringWidth(r.Diffs[c]))
		}
		if c == t.Reference {
			diffW[c] = max(diffW[c], len("ref"))
		}
	}
	colW := func(c int) int {
		w := max(valueW[c]+1+diffW[c], detailW[c], ansi.StringWidth(t.Names[c])+3, ansi.StringWidth(t.Rules[c])+2, 10)
		return min(w, 26) + 2
	}
	// Columns in view: the reference, always, so that every difference on
	// screen is against a column on screen, and the others widening from
	// the selected one to both sides; all in strip order, so that left and
	// right on screen are the left and right of the keys.
	others := make([]int, 0, len(t.Names))
	for c := range t.Names {
		if c != t.Reference {
			others = append(others, c)
		}
	}
	shown := []int{t.Reference}
	if len(others) > 0 {
		room := innerW - labelW - colW(t.Reference)
		at := 0
		for i, c := range others {
			if c == s.selected {
				at = i
			}
		}
		first, last, used := at, at, colW(others[at])
		if used > room {
			last = at - 1 // not even the selected one fits beside the reference
		}
		for last >= first {
			grew := false
			if last+1 < len(others) && used+colW(others[last+1]) <= room {
				last++
				used += colW(others[last])
				grew = true
			}
			if first > 0 && used+colW(others[first-1]) <= room {
				first--
				used += colW(others[first])
				grew = true
			}
			if !grew {
				break
			}
		}
		if last >= first {
			shown = append(shown, others[first:last+1]...)
		}
		slices.Sort(shown)
	}
	var lines []string
	names := pad("", labelW, false)
	rules := pad("candidate · rule", labelW, false)
	for _, c := range shown {
		names += "  " + fitLine(s.heading(c, t.Names[c]), colW(c)-2)
		rule := t.Rules[c]
		if rule == "" {
			rule = "by hand"
		}
		rules += "  " + pad("  "+rule, colW(c)-2, false)
	}
	lines = append(lines, names, st.Muted.Render(rules))
	for _, r := range s.window(innerH - 2).inView() {
		if r.Heading {
			lines = append(lines, st.Label.Render(fitLine(r.Figure, innerW)))
			continue
		}
		label := pad(r.Figure, labelW, false)
		if r.Detail {
			label = st.Muted.Render(label)
		}
		line := label
		for _, c := range shown {
			w := colW(c) - 2
			value := r.Cells[c]
			diff := r.Diffs[c]
			if c == t.Reference && !r.Detail {
				diff = "ref"
			}
			cell := pad(value, valueW[c], true)
			text := cell + " " + pad(diff, max(w-valueW[c]-1, 0), false)
			if r.Detail {
				if ansi.StringWidth(value) < valueW[c] {
					value = pad(value, valueW[c], true)
				}
				line += "  " + st.Muted.Render(fitLine(value, w))
				continue
			}
			line += "  " + st.Figure.Render(ansi.Truncate(cell, w, "…")) + s.diffStyle(r, c).Render(fitLine(text[len(cell):], max(w-ansi.StringWidth(cell), 0)))
		}
		lines = append(lines, line)
	}
	return strings.Join(lines, "\n"), len(shown)
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

// printableAll returns texts made terminal-safe by format.Printable, as a
// new slice.
func printableAll(texts []string) []string {
	out := make([]string, len(texts))
	for i, t := range texts {
		out[i] = format.Printable(t)
	}
	return out
}
