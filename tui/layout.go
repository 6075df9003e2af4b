package tui

// Minimum terminal size the explorer draws in; below it only a notice.
// 80 columns hold every figure line unclipped; 22 lines hold the help.
const (
	minWidth  = 80
	minHeight = 22
)

// rect is a pane's place on screen in cells, borders included.
type rect struct{ X, Y, W, H int }

// layoutState is what of the explorer's state the layout depends on.
type layoutState struct {
	pinned       bool // at least one candidate pinned
	stripFocused bool // the keys go to the strip
	stripLines   int  // content lines the strip needs to show every figure
	figureLines  int  // content lines of the figures pane
}

// frameSize is the border and padding a pane adds, from the styles.
type frameSize struct{ W, H int }

// screenLayout holds each pane's rectangle; a zero rect is a hidden pane.
type screenLayout struct {
	tooSmall bool
	header   rect
	list     rect
	curve    rect
	figures  rect
	strip    rect
	footer   rect
}

// minCurveLines is the smallest chart worth drawing.
const minCurveLines = 3

// layout places the panes in a width×height terminal. The ranked list takes
// the left of the body, the chart and the figures of the cursor's cut the
// right, and the comparison strip, once something is pinned, the full
// width below them. The strip shows every figure when there is room or it
// has the keys; otherwise it shrinks to one line of candidate names.
func layout(width, height int, st layoutState, frame frameSize) screenLayout {
	if width < minWidth || height < minHeight {
		return screenLayout{tooSmall: true}
	}
	l := screenLayout{
		header: rect{0, 0, width, 1},
		footer: rect{0, height - 1, width, 1},
	}
	bodyY, bodyH := 1, height-2
	figuresH := st.figureLines + frame.H
	curveMinH := minCurveLines + frame.H

	stripH := 0
	if st.pinned {
		full := st.stripLines + frame.H
		collapsed := 1 + frame.H
		switch {
		case st.stripFocused:
			stripH = min(full, bodyH-(4+frame.H))
		case bodyH-full >= figuresH+curveMinH:
			stripH = full
		default:
			stripH = collapsed
		}
		stripH = max(stripH, collapsed)
	}
	topH := bodyH - stripH
	if stripH > 0 {
		l.strip = rect{0, bodyY + topH, width, stripH}
	}

	listW := min(max(width*2/5, 34), 64)
	rightW := width - listW
	l.list = rect{0, bodyY, listW, topH}
	if topH >= figuresH+curveMinH {
		l.curve = rect{listW, bodyY, rightW, topH - figuresH}
		l.figures = rect{listW, bodyY + topH - figuresH, rightW, figuresH}
	} else {
		l.figures = rect{listW, bodyY, rightW, topH}
	}
	return l
}
