package page

import (
	"bytes"
	"fmt"
	"html/template"
	"image/color"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	xfont "golang.org/x/image/font"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/sill-tool/sill/internal/evidence"
)

// MaxDrawnPoints bounds the points of one drawn line: a curve with more
// cuts is drawn through an even selection of them, always with both ends,
// so that the page stays small whatever the size of the set.
const MaxDrawnPoints = 600

// lineKind is how a line is drawn; every kind differs from the others by
// dash and width, not by colour alone.
type lineKind int

const (
	lineMain      lineKind = iota // solid, thick
	lineSecond                    // dashed, thick
	lineEarlier                   // dotted, thin: the decision in production
	lineEarlier2                  // dash-dot, thin
	lineReference                 // thin grey, a guide such as chance or capacity
)

type line struct {
	legend string
	points plotter.XYs
	kind   lineKind
}

// mark is one candidate drawn on a chart. The chosen candidate is a
// filled square with "(chosen)" in its label; the others are rings.
type mark struct {
	label  string // "" draws the glyph without a label
	x, y   float64
	chosen bool
}

// chart is what one drawing holds.
type chart struct {
	title, xLabel, yLabel string
	percentX, percentY    bool
	lines                 []line
	marks                 []mark
	bars                  []bar // with bars, the X axis names them and lines run across
	yFromZero             bool
	legendLowRight        bool // the legend in the lower right corner, where a rising curve leaves room
	peaks                 []peakSeries
}

// peakShape is the glyph of a series of peaks on the workload chart.
type peakShape int

const (
	peakP90 peakShape = iota // a triangle
	peakMax                  // a cross
)

// peakSeries marks one figure of the real shifts on every bar.
type peakSeries struct {
	legend string
	marks  []mark
	shape  peakShape
}

type bar struct {
	name  string
	value float64
}

var (
	ink      = color.Gray{Y: 0x20}
	ink2     = color.RGBA{R: 0x1f, G: 0x4e, B: 0x79, A: 0xff}
	inkMuted = color.Gray{Y: 0x88}
	inkMark  = color.RGBA{R: 0xa0, G: 0x2c, B: 0x2c, A: 0xff}
	barFill  = color.Gray{Y: 0xcc}
)

// chartFont is the face of every text in the charts; the page's CSS
// draws it in the system's sans-serif.
func chartFont(size vg.Length) font.Face {
	return font.DefaultCache.Lookup(font.Font{Typeface: "Liberation", Variant: "Sans"}, size)
}

func styleText(s *text.Style, size vg.Length) {
	s.Font = chartFont(size).Font
	s.Font.Size = size
	s.Color = ink
}

// draw renders c as an inline SVG element, without the XML prolog.
// crowdedBars is the number of bars whose names still fit side by side
// under a bar chart of the page's width.
const crowdedBars = 4

func (c chart) draw(width, height vg.Length) (template.HTML, error) {
	p := c.newPlot()
	if len(c.bars) > 0 {
		values := make(plotter.Values, len(c.bars))
		names := make([]string, len(c.bars))
		for i, b := range c.bars {
			values[i], names[i] = b.value, b.name
			if !evidence.Defined(b.value) {
				values[i] = 0
			}
		}
		bars, err := plotter.NewBarChart(values, vg.Points(28))
		if err != nil {
			return "", fmt.Errorf("page: bars: %w", err)
		}
		bars.Color = barFill
		bars.LineStyle.Color = ink
		bars.LineStyle.Width = vg.Points(0.5)
		p.Add(bars)
		p.NominalX(names...)
		if len(names) > crowdedBars {
			// Side by side the names of many candidates run into each other:
			// they are turned to read upwards, each ending under its bar.
			p.X.Tick.Label.Rotation = math.Pi / 6
			p.X.Tick.Label.XAlign = draw.XRight
			p.X.Tick.Label.YAlign = draw.YCenter
		}
		p.Y.Min = 0
	}
	if c.yFromZero {
		p.Y.Min = 0
	}
	if len(c.bars) > 0 {
		c.headroom(p)
	}

	for _, l := range c.lines {
		pts := thin(l.points, MaxDrawnPoints)
		if len(pts) == 0 {
			continue
		}
		drawn, err := plotter.NewLine(pts)
		if err != nil {
			return "", fmt.Errorf("page: line %q: %w", l.legend, err)
		}
		drawn.LineStyle = lineStyle(l.kind)
		p.Add(drawn)
		if l.legend != "" {
			p.Legend.Add(l.legend, drawn)
		}
	}
	if err := addMarks(p, c.marks); err != nil {
		return "", err
	}
	if err := addPeaks(p, c.peaks); err != nil {
		return "", err
	}

	canvas := vgsvg.New(width, height)
	p.Draw(draw.New(canvas))
	var b bytes.Buffer
	if _, err := canvas.WriteTo(&b); err != nil {
		return "", fmt.Errorf("page: write chart: %w", err)
	}
	svg := b.String()
	if i := strings.Index(svg, "<svg"); i >= 0 {
		svg = svg[i:] // drop the XML prolog and comment: the SVG sits inside HTML
	}
	// The gonum SVG backend writes its own text as escaped character data
	// (html.EscapeString) and numbers elsewhere, so the markup is safe to
	// embed as it is.
	return template.HTML(svg), nil //nolint:gosec // see above
}

// newPlot is c's plot with its title, axes, legend place and grid, before
// any data.
func (c chart) newPlot() *plot.Plot {
	p := plot.New()
	p.Title.Text = c.title
	styleText(&p.Title.TextStyle, 11)
	p.X.Label.Text, p.Y.Label.Text = c.xLabel, c.yLabel
	for _, axis := range []*plot.Axis{&p.X, &p.Y} {
		styleText(&axis.Label.TextStyle, 9)
		styleText(&axis.Tick.Label, 8)
		axis.Color, axis.Tick.Color = ink, ink
	}
	p.Legend.Top, p.Legend.Left = !c.legendLowRight, !c.legendLowRight
	p.Legend.XOffs = vg.Points(6)
	if c.legendLowRight {
		p.Legend.XOffs, p.Legend.YOffs = vg.Points(-6), vg.Points(6)
	}
	styleText(&p.Legend.TextStyle, 8)
	if c.percentX {
		p.X.Tick.Marker = percentTicks{}
		p.X.Min, p.X.Max = 0, 1
	}
	if c.percentY {
		p.Y.Tick.Marker = percentTicks{}
		p.Y.Min, p.Y.Max = 0, 1
	}
	grid := plotter.NewGrid()
	grid.Vertical.Color = color.Gray{Y: 0xe4}
	grid.Horizontal.Color = color.Gray{Y: 0xe4}
	if len(c.bars) > 0 {
		grid.Vertical.Color = nil
	}
	p.Add(grid)
	return p
}

// headroom raises the top of a bar chart above its tallest mark, for the
// legend in the corner.
func (c chart) headroom(p *plot.Plot) {
	top := 0.0
	higher := func(v float64) {
		if evidence.Defined(v) && v > top {
			top = v
		}
	}
	for _, b := range c.bars {
		higher(b.value)
	}
	for _, l := range c.lines {
		for _, xy := range l.points {
			higher(xy.Y)
		}
	}
	for _, series := range c.peaks {
		for _, m := range series.marks {
			higher(m.y)
		}
	}
	if top > 0 {
		p.Y.Max = top * 1.3
	}
}

// addPeaks adds each series of shift-peak marks that has a defined value.
func addPeaks(p *plot.Plot, peaks []peakSeries) error {
	for _, series := range peaks {
		var xy plotter.XYs
		for _, m := range series.marks {
			if evidence.Defined(m.y) {
				xy = append(xy, plotter.XY{X: m.x, Y: m.y})
			}
		}
		if len(xy) == 0 {
			continue
		}
		scatter, err := plotter.NewScatter(xy)
		if err != nil {
			return fmt.Errorf("page: %s: %w", series.legend, err)
		}
		scatter.GlyphStyle = draw.GlyphStyle{Color: ink, Radius: vg.Points(4), Shape: draw.PyramidGlyph{}}
		if series.shape == peakMax {
			scatter.GlyphStyle = draw.GlyphStyle{Color: inkMark, Radius: vg.Points(4), Shape: draw.CrossGlyph{}}
		}
		p.Add(scatter)
		p.Legend.Add(series.legend, scatter)
	}
	return nil
}

func lineStyle(kind lineKind) draw.LineStyle {
	s := draw.LineStyle{Color: ink2, Width: vg.Points(1.6)}
	switch kind {
	case lineSecond:
		s.Color = inkMark
		s.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
	case lineEarlier:
		s.Color = inkMuted
		s.Width = vg.Points(1.1)
		s.Dashes = []vg.Length{vg.Points(1.2), vg.Points(2)}
	case lineEarlier2:
		s.Color = inkMuted
		s.Width = vg.Points(1.1)
		s.Dashes = []vg.Length{vg.Points(6), vg.Points(2), vg.Points(1.2), vg.Points(2)}
	case lineReference:
		s.Color = inkMuted
		s.Width = vg.Points(0.8)
		s.Dashes = []vg.Length{vg.Points(3), vg.Points(3)}
	}
	return s
}

// addMarks draws the candidates: the chosen one a filled square, the
// others rings, each labelled with its name when it has a label. Every
// glyph is drawn before any label, so that no mark covers a name, and the
// labels are placed by placeLabels so that two candidates at nearby cuts
// (hit=0.8 and hit95=0.8, say) do not print their names over each other.
func addMarks(p *plot.Plot, marks []mark) error {
	for _, m := range marks {
		if !evidence.Defined(m.x) || !evidence.Defined(m.y) {
			continue
		}
		scatter, err := plotter.NewScatter(plotter.XYs{{X: m.x, Y: m.y}})
		if err != nil {
			return fmt.Errorf("page: mark %q: %w", m.label, err)
		}
		scatter.GlyphStyle = draw.GlyphStyle{Color: ink, Radius: vg.Points(3.2), Shape: draw.RingGlyph{}}
		if m.chosen {
			scatter.GlyphStyle = draw.GlyphStyle{Color: inkMark, Radius: vg.Points(4.2), Shape: draw.BoxGlyph{}}
		}
		p.Add(scatter)
	}
	for _, pl := range placeLabels(marks) {
		m := pl.mark
		labels, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: m.x, Y: m.y}}, Labels: []string{m.label}})
		if err != nil {
			return fmt.Errorf("page: label %q: %w", m.label, err)
		}
		for i := range labels.TextStyle {
			styleText(&labels.TextStyle[i], 8)
			if m.chosen {
				labels.TextStyle[i].Font.Weight = xfont.WeightBold
				labels.TextStyle[i].Color = inkMark
			}
			if pl.left {
				labels.TextStyle[i].XAlign = draw.XRight
			}
		}
		labels.Offset = vg.Point{X: vg.Points(pl.dx), Y: vg.Points(pl.dy)}
		p.Add(labels)
	}
	return nil
}

// placement is where a mark's label goes: its offset from the mark in
// points and whether it ends at the mark (left) or starts after it.
type placement struct {
	mark   mark
	dx, dy float64
	left   bool
}

// The sizes placeLabels reckons with, in points: the plotting area of a
// chart of chartWidth × chartHeight (less the axes and titles, about
// 270 × 200 on shares from 0 to 1), the width of one character and the
// height of a line of the labels' 8-point text. Approximate by design: a
// label only has to clear the others.
const (
	labelAreaW, labelAreaH = 270.0, 200.0
	labelCharW, labelLineH = 4.6, 10.0
)

// placeLabels places the labels of the marks with one and a defined
// position, in order (the chosen candidate comes first on the page, so
// its label keeps the first place): right of and below the mark, as
// always, unless that overlaps a label placed already; then left of the
// mark, then one line further down on either side, then one line up. A
// label with no free place keeps the first. The marks' x and y are read
// as shares (0 to 1) on both axes, as on the trade-off and ROC charts.
func placeLabels(marks []mark) []placement {
	type box struct{ x0, x1, y0, y1 float64 }
	var placed []box
	var out []placement
	for _, m := range marks {
		if m.label == "" || !evidence.Defined(m.x) || !evidence.Defined(m.y) {
			continue
		}
		x, y := m.x*labelAreaW, m.y*labelAreaH
		width := labelCharW * float64(utf8.RuneCountInString(m.label))
		boxAt := func(pl placement) box {
			x0 := x + pl.dx
			if pl.left {
				x0 -= width
			}
			return box{x0, x0 + width, y + pl.dy, y + pl.dy + labelLineH}
		}
		free := func(b box) bool {
			for _, o := range placed {
				if b.x0 < o.x1 && o.x0 < b.x1 && b.y0 < o.y1 && o.y0 < b.y1 {
					return false
				}
			}
			return true
		}
		tries := []placement{{m, 6, -9, false}, {m, -6, -9, true}, {m, 6, -19, false}, {m, -6, -19, true}, {m, 6, 3, false}, {m, -6, 3, true}}
		chosen := tries[0]
		for _, pl := range tries {
			if free(boxAt(pl)) {
				chosen = pl
				break
			}
		}
		placed = append(placed, boxAt(chosen))
		out = append(out, chosen)
	}
	return out
}

// thin returns at most limit points of pts, evenly spread and always with
// the first and the last.
func thin(pts plotter.XYs, limit int) plotter.XYs {
	var kept plotter.XYs
	for _, xy := range pts {
		if evidence.Defined(xy.X) && evidence.Defined(xy.Y) {
			kept = append(kept, xy)
		}
	}
	if len(kept) <= limit || limit < 2 {
		return kept
	}
	out := make(plotter.XYs, 0, limit)
	step := float64(len(kept)-1) / float64(limit-1)
	for i := 0; i < limit; i++ {
		out = append(out, kept[int(math.Round(float64(i)*step))])
	}
	return out
}

// percentTicks marks a share axis at every 20% with a label and every 10%
// without.
type percentTicks struct{}

func (percentTicks) Ticks(lo, hi float64) []plot.Tick {
	var ticks []plot.Tick
	for i := 0; i <= 10; i++ {
		v := float64(i) / 10
		if v < lo-1e-9 || v > hi+1e-9 {
			continue
		}
		label := ""
		if i%2 == 0 {
			label = strconv.Itoa(i*10) + "%"
		}
		ticks = append(ticks, plot.Tick{Value: v, Label: label})
	}
	return ticks
}
