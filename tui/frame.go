package tui

import (
	"strings"

	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
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
// The border and padding come from box.
func framed(box, edge, titleStyle lipgloss.Style, title, body string, width, height int) string {
	if width <= 0 || height <= 0 {
		return ""
	}
	innerW := width - box.GetHorizontalFrameSize()
	innerH := height - box.GetVerticalFrameSize()
	if innerW <= 0 || innerH <= 0 {
		return fit("", width, height)
	}
	content := box.BorderTop(false).
		Width(width - box.GetHorizontalBorderSize()).
		Height(height - box.GetVerticalBorderSize()).
		Render(fit(body, innerW, innerH))
	if box.GetBorderTopSize() == 0 {
		return content
	}
	b := box.GetBorderStyle()
	room := width - ansi.StringWidth(b.TopLeft) - ansi.StringWidth(b.TopRight) - 1
	label := ""
	if title != "" && room > 2 {
		label = ansi.Truncate(" "+title+" ", room, "…")
	}
	fill := max(room-ansi.StringWidth(label), 0)
	top := edge.Render(b.TopLeft+b.Top) + titleStyle.Render(label) + edge.Render(strings.Repeat(b.Top, fill)+b.TopRight)
	return top + "\n" + content
}

// overlay draws box over base, centred, keeping base's size. Both are
// lines of equal width.
func overlay(base, box string, width, height int) string {
	baseLines := strings.Split(fit(base, width, height), "\n")
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
