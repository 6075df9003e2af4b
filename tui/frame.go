package tui

import (
	"strings"

	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/sill-tool/sill/internal/format"
)

// fit clips or pads text to exactly width columns and height lines.
func fit(text string, width, height int) string {
	if width <= 0 || height <= 0 {
		return ""
	}
	lines := strings.Split(text, "\n")
	if len(lines) > height {
		lines = lines[:height]
	}
	for len(lines) < height {
		lines = append(lines, "")
	}
	for i, line := range lines {
		lines[i] = fitLine(line, width)
	}
	return strings.Join(lines, "\n")
}

// fitLine clips or pads one line to exactly width columns.
func fitLine(line string, width int) string {
	if w := ansi.StringWidth(line); w > width {
		line = ansi.Truncate(line, width, "…")
	}
	if w := ansi.StringWidth(line); w < width {
		line += strings.Repeat(" ", width-w)
	}
	return line
}

// framed draws body inside box at exactly width×height cells, with title
// set into the top border in the title style and the border drawn in edge.
// The border characters and padding come from box; the lines are put
// together here rather than by box.Render, which would wrap and measure
// every line again on each keystroke.
func framed(box, edge, titleStyle lipgloss.Style, title, body string, width, height int) string {
	title = format.Printable(title) // a title may name a column, a candidate or a file
	if width <= 0 || height <= 0 {
		return ""
	}
	b := box.GetBorderStyle()
	top, right, bottom, left := box.GetBorderTopSize() > 0, box.GetBorderRightSize() > 0, box.GetBorderBottomSize() > 0, box.GetBorderLeftSize() > 0
	innerW := width - box.GetHorizontalFrameSize()
	innerH := height - box.GetVerticalFrameSize()
	if innerW <= 0 || innerH <= 0 {
		return fit("", width, height)
	}
	padTop, padRight, padBottom, padLeft := box.GetPadding()
	leftEdge, rightEdge := "", ""
	if left {
		leftEdge = edge.Render(b.Left)
	}
	if right {
		rightEdge = edge.Render(b.Right)
	}
	blank := strings.Repeat(" ", innerW)
	leftPad, rightPad := strings.Repeat(" ", padLeft), strings.Repeat(" ", padRight)
	lines := make([]string, 0, height)
	if top {
		room := width - ansi.StringWidth(b.TopLeft) - ansi.StringWidth(b.TopRight) - 1
		label := ""
		if title != "" && room > 2 {
			label = ansi.Truncate(" "+title+" ", room, "…")
		}
		fill := max(room-ansi.StringWidth(label), 0)
		lines = append(lines, edge.Render(b.TopLeft+b.Top)+titleStyle.Render(label)+edge.Render(strings.Repeat(b.Top, fill)+b.TopRight))
	}
	for range padTop {
		lines = append(lines, leftEdge+leftPad+blank+rightPad+rightEdge)
	}
	for _, line := range strings.Split(fit(body, innerW, innerH), "\n") {
		lines = append(lines, leftEdge+leftPad+line+rightPad+rightEdge)
	}
	for range padBottom {
		lines = append(lines, leftEdge+leftPad+blank+rightPad+rightEdge)
	}
	if bottom {
		fill := width - ansi.StringWidth(b.BottomLeft) - ansi.StringWidth(b.BottomRight)
		lines = append(lines, edge.Render(b.BottomLeft+strings.Repeat(b.Bottom, max(fill, 0))+b.BottomRight))
	}
	return strings.Join(lines, "\n")
}

// drawOver draws box over base, centred, keeping base's size. Both are
// lines of equal width; a line of base that is not width wide comes out
// as wide as it went in, so fit the result when that matters (View does).
func drawOver(base, box string, width, height int) string {
	baseLines := strings.Split(base, "\n")
	for len(baseLines) < height {
		baseLines = append(baseLines, "")
	}
	boxLines := strings.Split(box, "\n")
	boxW := 0
	for _, l := range boxLines {
		boxW = max(boxW, ansi.StringWidth(l))
	}
	boxW = min(boxW, width)
	top := max((height-len(boxLines))/2, 0)
	left := max((width-boxW)/2, 0)
	for i, l := range boxLines {
		y := top + i
		if y >= height {
			break
		}
		row := baseLines[y]
		baseLines[y] = ansi.Cut(row, 0, left) + fitLine(l, boxW) + ansi.Cut(row, left+boxW, width)
	}
	return strings.Join(baseLines, "\n")
}
