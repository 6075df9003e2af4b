package tui

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/format"
)

// listPane is the ranked list: cases riskiest first, the flagged ones above
// a cut line, the cursor's tie group highlighted. It draws only the rows
// in view, so its cost does not grow with the set.
type listPane struct {
	s      *session
	ctx    *shared
	width  int // outer size, border included
	height int
	offset int // first ranked row in view
}

func newListPane(s *session, ctx *shared) listPane { return listPane{s: s, ctx: ctx} }

// SetSize sets the outer size and keeps the cut line in view.
func (p *listPane) SetSize(width, height int) {
	p.width, p.height = width, height
	p.follow()
}

// rowsInView is how many ranked rows fit beside the heading and cut line.
func (p listPane) rowsInView() int {
	return max(p.height-p.ctx.styles.Pane.GetVerticalFrameSize()-2, 1)
}

// follow scrolls so that the cut line and a few rows under it are in view.
func (p *listPane) follow() {
	if p.s.curve == nil || p.s.curve.Len() == 0 {
		return
	}
	n := p.rowsInView()
	end := p.s.point().Rows // rows above the cut line
	margin := min(3, n/4)
	if end-p.offset > n-margin {
		p.offset = end - (n - margin)
	}
	if end-p.offset < 1 {
		p.offset = end - 1
	}
	p.offset = max(min(p.offset, p.s.set.Len()-n+1), 0)
}

// Update moves the cursor for the movement keys.
func (p listPane) Update(msg tea.Msg) (listPane, tea.Cmd) {
	m, ok := msg.(tea.KeyMsg)
	if !ok || p.s.curve == nil || p.s.curve.Len() == 0 {
		return p, nil
	}
	keys, c := p.ctx.keys, p.s.curve
	last := c.Len() - 1
	switch {
	case key.Matches(m, keys.Up):
		p.s.cursor = max(p.s.cursor-1, 0)
	case key.Matches(m, keys.Down):
		p.s.cursor = min(p.s.cursor+1, last)
	case key.Matches(m, keys.PageUp):
		p.s.cursor = c.CutOfRow(max(c.FirstRow(p.s.cursor)-p.rowsInView(), 0))
	case key.Matches(m, keys.PageDown):
		p.s.cursor = c.CutOfRow(min(p.s.point().Rows-1+p.rowsInView(), p.s.set.Len()-1))
	case key.Matches(m, keys.Top):
		p.s.cursor = 0
	case key.Matches(m, keys.Bottom):
		p.s.cursor = last
	default:
		return p, nil
	}
	p.follow()
	return p, nil
}

// ShortHelp lists the pane's most used keys, in a few words each.
func (p listPane) ShortHelp() []key.Binding {
	return []key.Binding{hint(p.ctx.keys.Up, "", "stricter"), hint(p.ctx.keys.Down, "", "looser")}
}

// FullHelp lists every key of the pane, in groups; the keys that come in
// pairs share a line.
func (p listPane) FullHelp() [][]key.Binding {
	k := p.ctx.keys
	return [][]key.Binding{{k.Up, k.Down,
		pairedHelp("pgup/pgdn", "a page stricter/looser"),
		pairedHelp("home/end", "strictest/loosest (g/G)")}}
}

// View draws the pane at its size.
func (p listPane) View(focused bool) string {
	st := p.ctx.styles
	box, edge := st.Pane, st.PaneEdge
	if focused {
		box, edge = st.FocusedPane, st.FocusedEdge
	}
	innerW := p.width - box.GetHorizontalFrameSize()
	title := "ranked list"
	if p.s.curve != nil {
		title = "ranked list, riskiest first"
	}
	return framed(box, edge, st.Title, title, p.body(innerW), p.width, p.height)
}

// columns are the widths of the list's columns at an inner width.
type listColumns struct{ rank, score, mark, id, segment int }

// columns fits the columns to innerW; idWidth is the widest id in view.
func (p listPane) columns(innerW, idWidth int) listColumns {
	c := listColumns{rank: max(len(strconv.Itoa(p.s.set.Len())), 4), score: 7, mark: 1}
	// gutter 1, rank, space, score, space, mark, space, hit 6, spaces
	rest := innerW - (1 + c.rank + 1 + c.score + 1 + c.mark + 1 + 6 + 1)
	// The mark's column is as wide as its heading, "true", where that
	// leaves every id whole; where the room goes to the ids it is one
	// character wide and its heading runs on over the ids' (see markHead).
	if wide := len("true") - c.mark; p.s.set.IDs() == nil && rest >= wide || p.s.set.IDs() != nil && rest-wide-1 >= max(idWidth, 2) {
		c.mark += wide
		rest -= wide
	}
	if p.s.set.IDs() != nil {
		c.id = min(max(rest, 0), max(idWidth, 2), 16)
		rest -= c.id + 1
	}
	if p.s.set.SegmentOf() != nil && rest >= 6 {
		c.segment = min(rest, 14)
	}
	return c
}

func (p listPane) body(innerW int) string {
	s, st := p.s, p.ctx.styles
	if s.curve == nil || s.curve.Len() == 0 {
		return st.Muted.Render("no cases")
	}
	idWidth := 0
	if s.set.IDs() != nil {
		for r := p.offset; r < min(p.offset+p.rowsInView(), s.set.Len()); r++ {
			idWidth = max(idWidth, len([]rune(s.set.IDs()[r])))
		}
	}
	cols := p.columns(innerW, idWidth)
	var b strings.Builder
	head := " " + pad("rank", cols.rank, true) + " " + pad("score", cols.score, false) + " " + markHead(cols)
	if cols.segment > 0 {
		head += " " + pad("segment", cols.segment, false)
	}
	head += " " + pad("hit", 6, true)
	b.WriteString(st.ColumnHead.Render(fitLine(head, innerW)))

	n := p.rowsInView()
	point := s.point()
	end := point.Rows
	groupStart := s.curve.FirstRow(s.cursor)
	shown := 0
	for r := p.offset; r < s.set.Len() && shown < n+1; r++ {
		if r == end {
			b.WriteString("\n" + st.CutLine.Render(p.cutLine(point.Score, point.Cases, innerW)))
			shown++
			if shown >= n+1 {
				break
			}
		}
		b.WriteString("\n" + p.row(r, cols, innerW, r < end, r >= groupStart && r < end))
		shown++
	}
	if end == s.set.Len() && shown < n+1 {
		b.WriteString("\n" + st.CutLine.Render(p.cutLine(point.Score, point.Cases, innerW)))
	}
	return b.String()
}

// markHead heads the mark's column "true" at every width, and the ids'
// column "id". Where the mark's column is one character wide (the room
// went to the ids), "true" starts over the marks and runs on over the ids,
// and "id" follows it: "true id" over "● AX-105404".
func markHead(cols listColumns) string {
	if cols.mark >= len("true") {
		if cols.id > 0 {
			return "true " + pad("id", cols.id, false)
		}
		return "true"
	}
	if cols.id == 0 {
		return "true"
	}
	return pad("true id", cols.mark+1+cols.id, false)
}

// cutLine is the line drawn under the last flagged row, width cells wide.
// It counts the flagged cases; with weights it counts the ranked rows
// above it, which the figures pane weighs.
func (p listPane) cutLine(score float64, flagged, width int) string {
	sign := format.CutSign(p.s.set.LowerIsRiskier())
	noun := "flagged"
	if p.s.set.Weighted() {
		noun = "rows flagged"
	}
	line := fmt.Sprintf("━━ cut %s %s ━ %d %s ", sign, format.Score(score), flagged, noun)
	if rest := width - ansi.StringWidth(line); rest > 0 {
		line += strings.Repeat("━", rest)
	}
	return fitLine(line, width)
}

// row draws ranked row r: a gutter bar when flagged, the rank, the score,
// ● for a true case and · for a false one, id, segment and the hit share
// the cut at this row's score would have.
func (p listPane) row(r int, cols listColumns, innerW int, flagged, inGroup bool) string {
	s, st := p.s, p.ctx.styles
	gutter := " "
	if flagged {
		gutter = "▌"
	}
	if inGroup {
		gutter = "▶"
	}
	mark := "·"
	if s.set.Labels()[r] {
		mark = "●"
	}
	hit := s.curve.At(s.curve.CutOfRow(r)).Recall()
	head := gutter + pad(strconv.Itoa(r+1), cols.rank, true) + " " + pad(format.Score(s.set.Scores()[r]), cols.score, false) + " "
	tail := ""
	if cols.id > 0 {
		tail += " " + pad(format.Printable(s.set.ID(r)), cols.id, false)
	}
	if cols.segment > 0 {
		tail += " " + pad(format.Printable(s.set.Segment(r)), cols.segment, false)
	}
	tail += " " + pad(format.Share(hit), 6, true)
	tail = fitLine(tail, max(innerW-ansi.StringWidth(head)-cols.mark, 0))
	style := st.Unflagged
	switch {
	case inGroup:
		style = st.CurrentCut
	case flagged:
		style = st.Flagged
	}
	mark = pad(mark, cols.mark, false)
	if !s.set.Labels()[r] {
		return style.Render(head + mark + tail)
	}
	// A true case's mark gets its own style on top of the row's.
	return style.Render(head) + st.TrueCase.Inherit(style).Render(mark) + style.Render(tail)
}

// pad fits text to width, right-aligned when right is set.
func pad(text string, width int, right bool) string {
	if width <= 0 {
		return ""
	}
	r := []rune(text)
	if len(r) > width {
		return string(r[:width-1]) + "…"
	}
	space := strings.Repeat(" ", width-len(r))
	if right {
		return space + text
	}
	return text + space
}
