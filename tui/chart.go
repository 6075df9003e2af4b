package tui

import (
	"fmt"
	"math"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"
	"github.com/guptarohit/asciigraph"

	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/format"
)

// chartView is what the chart plots.
type chartView int

const (
	viewNear   chartView = iota // both shares by cases flagged, up to a few times the base rate
	viewAll                     // both shares by cases flagged, the whole list
	viewROC                     // hit share by false positive rate
	chartViews                  // the number of views
)

// curvePane is the chart of the trade-off with the cursor's cut marked.
// The plot is drawn once per data, size and view and cached; a keystroke
// only moves the mark.
type curvePane struct {
	s      *session
	ctx    *shared
	width  int
	height int
	view   chartView

	cacheKey   chartKey
	cacheLines [][]rune // the plot without the mark
	plotLeft   int      // column of the first data cell in cacheLines
	plotRows   int      // lines of cacheLines that hold data (above the x axis)
	xMax       float64  // the right end of the x axis

	// painted is the last drawing, reused while the mark stays in the same
	// column; shared by copies of the pane.
	painted *paintedChart
}

type paintedChart struct {
	key    chartKey
	x      int
	beyond bool
	pins   string // the pins' columns, as a key
	text   string
}

type chartKey struct {
	curve         *curve.Curve
	width, height int
	view          chartView
	stability     *bootstrap.Result // the band, nil without one
	second        *curve.Curve      // the second model's curve, nil without one
}

func newCurvePane(s *session, ctx *shared) curvePane {
	return curvePane{s: s, ctx: ctx, painted: &paintedChart{x: -2}}
}

// SetSize sets the outer size; the plot is redrawn on the next View.
func (p *curvePane) SetSize(width, height int) { p.width, p.height = width, height }

// Update cycles the view.
func (p curvePane) Update(msg tea.Msg) (curvePane, tea.Cmd) {
	if m, ok := msg.(tea.KeyMsg); ok && key.Matches(m, p.ctx.keys.CurveView) {
		p.view = (p.view + 1) % chartViews
	}
	return p, nil
}

// ShortHelp lists the pane's keys.
func (p curvePane) ShortHelp() []key.Binding { return []key.Binding{p.ctx.keys.CurveView} }

// FullHelp lists the pane's keys in groups.
func (p curvePane) FullHelp() [][]key.Binding { return [][]key.Binding{{p.ctx.keys.CurveView}} }

// title names each series beside its own mark, so that the chart reads
// on a monochrome terminal; the longest form that fits the pane's top
// border is taken.
func (p curvePane) title() string {
	room := p.width - 6
	second := p.s.secondCurve() != nil
	band := p.s.stability != nil && p.view != viewROC
	if p.view == viewROC {
		titles := []string{"ROC: hit share ─ by false positive rate", "ROC: hit share ─"}
		if second {
			titles = []string{"ROC: hit share by false positive rate, A ─ B +++", "ROC: A ─, B +"}
		}
		if ansi.StringWidth(titles[0]) <= room {
			return titles[0]
		}
		return titles[1]
	}
	series := []string{"hit share ─, wrong-alert share ···", "hit ─, wrong-alert ···"}
	if second {
		series = []string{"A: hit ─ wrong ···, B: hit +++ wrong ×××", "A ─ ···, B + ×"}
	}
	extra := ""
	if band {
		extra = ", ░ 9 in 10 redraws"
	}
	axis := " · by cases flagged"
	if p.view == viewAll {
		axis += ", all"
	}
	for _, s := range series {
		for _, t := range []string{s + extra + axis, s + extra} {
			if ansi.StringWidth(t) <= room {
				return t
			}
		}
	}
	return series[len(series)-1] + extra
}

// View draws the chart with the cursor's cut marked.
func (p *curvePane) View() string {
	st := p.ctx.styles
	innerW := p.width - st.Pane.GetHorizontalFrameSize()
	innerH := p.height - st.Pane.GetVerticalFrameSize()
	if p.s.curve == nil || p.s.curve.Len() == 0 || innerW < 12 || innerH < 2 {
		return framed(st.Pane, st.PaneEdge, st.Title, p.title(), "", p.width, p.height)
	}
	key := chartKey{p.s.curve, p.width, p.height, p.view, p.s.stability, p.s.secondCurve()}
	if key != p.cacheKey {
		p.draw(innerW, innerH-1)
		p.cacheKey = key
	}
	x, beyond := p.markerX(p.s.point())
	pins := make([]int, 0, len(p.s.pins))
	for _, pin := range p.s.pins {
		if px, out := p.markerX(p.s.curve.At(pin.cut)); !out {
			pins = append(pins, px)
		}
	}
	pinsKey := fmt.Sprint(pins)
	if p.painted.key != key || p.painted.x != x || p.painted.beyond != beyond || p.painted.pins != pinsKey {
		var b strings.Builder
		for i, line := range p.cacheLines {
			if i > 0 {
				b.WriteString("\n")
			}
			b.WriteString(p.paint(line, i, x, pins))
		}
		*p.painted = paintedChart{key: key, x: x, beyond: beyond, pins: pinsKey, text: b.String()}
	}
	point := p.s.point()
	where := fmt.Sprintf("┃ this cut: %s flagged", format.Share(point.FlaggedShare()))
	if p.view == viewROC {
		where = fmt.Sprintf("┃ this cut: false positive rate %s", format.Share(point.FalsePositiveRate()))
	}
	if beyond {
		where += " (beyond the right edge →)"
	}
	if len(p.s.pins) > 0 && p.plotRows < len(p.cacheLines) {
		where += " · ◇ pinned"
	}
	body := st.Muted.Render(where) + "\n" + p.painted.text
	return framed(st.Pane, st.PaneEdge, st.Title, p.title(), body, p.width, p.height)
}

// markerX is the data column of a cut's point, and whether the cut lies
// beyond the plotted range (then the column is the right edge).
func (p *curvePane) markerX(point curve.Point) (int, bool) {
	width := len(p.cacheLines[0]) - p.plotLeft
	if width <= 0 {
		return -1, false
	}
	v := point.FlaggedShare()
	if p.view == viewROC {
		v = point.FalsePositiveRate()
	}
	if math.IsNaN(v) {
		return -1, false
	}
	x := int(math.Round(v / p.xMax * float64(width-1)))
	if x > width-1 {
		return width - 1, true
	}
	return x, false
}

// paint draws one cached line with the cursor's mark at data column x and
// the pins' marks on the x axis, and styles each run of characters by what
// it shows.
func (p *curvePane) paint(line []rune, row, x int, pins []int) string {
	st := p.ctx.styles
	cells := append([]rune(nil), line...)
	if row == p.plotRows {
		for _, px := range pins {
			if c := p.plotLeft + px; c < len(cells) {
				cells[c] = '◇'
			}
		}
	}
	if x >= 0 && p.plotLeft+x < len(cells) {
		c := p.plotLeft + x
		switch {
		case row < p.plotRows && cells[c] == ' ':
			cells[c] = '┃'
		case row == p.plotRows:
			cells[c] = '▲'
		}
	}
	var b strings.Builder
	runStart, runKind := 0, -1
	flush := func(end int) {
		if runKind < 0 || end <= runStart {
			return
		}
		text := string(cells[runStart:end])
		switch runKind {
		case 1:
			text = st.HitLine.Render(text)
		case 2:
			text = st.WrongLine.Render(text)
		case 3:
			text = st.Marker.Render(text)
		case 4:
			text = st.Axis.Render(text)
		case 5:
			text = st.Band.Render(text)
		case 6:
			text = st.SecondLine.Render(text)
		}
		b.WriteString(text)
	}
	for i, r := range cells {
		kind := 0
		switch {
		case i >= p.plotLeft && (r == '┃' || r == '▲' || r == '◇'):
			kind = 3
		case i < p.plotLeft || row >= p.plotRows:
			kind = 4
		case r == '·':
			kind = 2
		case r == '░':
			kind = 5
		case r == '+' || r == '×':
			kind = 6
		case r != ' ':
			kind = 1
		}
		if kind != runKind {
			flush(i)
			runStart, runKind = i, kind
		}
	}
	flush(len(cells))
	return b.String()
}

// draw plots the current view into the cache at innerW×lines.
func (p *curvePane) draw(innerW, lines int) {
	c := p.s.curve
	const labelW = 7 // "  100% ┤"
	width := max(innerW-labelW-2, 4)
	withAxis := lines >= 7
	height := lines - 1
	if withAxis {
		height = lines - 3
	}
	height = max(height, 1)

	n := p.s.set.Len()
	p.xMax = 1
	if p.view == viewNear {
		p.xMax = min(1, max(0.1, 4*c.Summary.BaseRate))
	}
	first, second := make([]float64, width), make([]float64, width)
	other := p.s.secondCurve()
	var otherHit, otherWrong []float64
	if other != nil {
		otherHit, otherWrong = make([]float64, width), make([]float64, width)
	}
	cuts := make([]int, width) // the cut of each column, for the band
	for j := range width {
		at := p.xMax * float64(j) / float64(width-1)
		var point curve.Point
		if p.view == viewROC {
			point = c.At(cutAtFalsePositiveRate(c, at))
			first[j] = zeroIfNaN(point.Recall())
			second[j] = math.NaN()
			if other != nil {
				otherHit[j] = zeroIfNaN(other.At(cutAtFalsePositiveRate(other, at)).Recall())
			}
			continue
		}
		row := min(max(int(math.Round(at*float64(n)))-1, 0), n-1)
		cuts[j] = c.CutOfRow(row)
		point = c.At(cuts[j])
		first[j] = zeroIfNaN(point.Recall())
		second[j] = zeroIfNaN(point.FalseDiscoveryRate())
		if other != nil {
			q := other.At(other.CutOfRow(row))
			otherHit[j], otherWrong[j] = zeroIfNaN(q.Recall()), zeroIfNaN(q.FalseDiscoveryRate())
		}
	}
	// The second model goes under the first, so the first stays whole
	// where they cross.
	var data [][]float64
	chars := []asciigraph.CharSet{}
	if other != nil {
		data = append(data, otherHit)
		chars = append(chars, asciigraph.CreateCharSet("+"))
		if p.view != viewROC {
			data = append(data, otherWrong)
			chars = append(chars, asciigraph.CreateCharSet("×"))
		}
	}
	data = append(data, first)
	chars = append(chars, asciigraph.DefaultCharSet)
	if p.view != viewROC {
		data = append(data, second)
		chars = append(chars, asciigraph.CreateCharSet("·"))
	}
	options := []asciigraph.Option{
		asciigraph.Height(height), asciigraph.LowerBound(0), asciigraph.UpperBound(1),
		asciigraph.SeriesChars(chars...),
		asciigraph.YAxisValueFormatter(func(v float64) string { return fmt.Sprintf("%3.0f%%", 100*v) }),
	}
	if withAxis {
		options = append(options, asciigraph.XAxisRange(0, p.xMax), asciigraph.XAxisTickCount(3),
			asciigraph.XAxisValueFormatter(func(v float64) string { return fmt.Sprintf("%.0f%%", 100*v) }))
	}
	plot := asciigraph.PlotMany(data, options...)
	p.cacheLines = p.cacheLines[:0]
	p.plotLeft = 0
	for _, line := range strings.Split(plot, "\n") {
		runes := []rune(line)
		if p.plotLeft == 0 {
			for i, r := range runes {
				if r == '┤' || r == '┼' {
					p.plotLeft = i + 1
					break
				}
			}
		}
		p.cacheLines = append(p.cacheLines, runes)
	}
	p.plotRows = len(p.cacheLines)
	if withAxis {
		p.plotRows = len(p.cacheLines) - 2
	}
	// Pad every line to the plot's full width so the mark can land anywhere.
	full := p.plotLeft + width
	for i, l := range p.cacheLines {
		for len(l) < full {
			l = append(l, ' ')
		}
		p.cacheLines[i] = l
	}
	if res := p.s.stability; res != nil && p.view != viewROC {
		p.fillBand(res, cuts, height)
	}
}

// fillBand shades the empty cells between the 5th and 95th percentiles of
// the resampled hit share and wrong-alert share in every column. With
// bounds 0 and 1 the plot puts value v on data line height -
// round(v*height), line 0 at the top.
func (p *curvePane) fillBand(res *bootstrap.Result, cuts []int, height int) {
	line := func(v float64) int { return height - int(math.Round(v*float64(height))) }
	for j, cut := range cuts {
		band, ok := res.BandAt(cut)
		if !ok {
			return
		}
		for _, r := range [][2]float64{band.Recall, band.FalseDiscoveryRate} {
			if math.IsNaN(r[0]) || math.IsNaN(r[1]) {
				continue
			}
			for y := max(line(r[1]), 0); y <= min(line(r[0]), p.plotRows-1); y++ {
				if cells := p.cacheLines[y]; p.plotLeft+j < len(cells) && cells[p.plotLeft+j] == ' ' {
					cells[p.plotLeft+j] = '░'
				}
			}
		}
	}
}

// cutAtFalsePositiveRate returns the loosest cut whose false positive rate
// is at most rate, or the strictest cut when none is. False positives only
// grow as cuts loosen, so a binary search finds it.
func cutAtFalsePositiveRate(c *curve.Curve, rate float64) int {
	lo, hi := 0, c.Len()-1
	if !(c.Summary.Negatives > 0) {
		return hi
	}
	best := 0
	for lo <= hi {
		mid := (lo + hi) / 2
		if c.At(mid).FP/c.Summary.Negatives <= rate+1e-12 {
			best, lo = mid, mid+1
		} else {
			hi = mid - 1
		}
	}
	return best
}

func zeroIfNaN(v float64) float64 {
	if math.IsNaN(v) {
		return 0
	}
	return v
}
