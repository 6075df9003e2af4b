package tui

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/segment"
)

// segmentsPane is the overlay of the breakdown by segment at the cursor's
// cut: rows, true cases, flagged share, hit share and wrong-alert share
// with their intervals, and "differs" on a group whose hit share or
// wrong-alert share differs from the rest of the set's (package segment's
// group-against-rest tests); v shows instead the gaps from the rest with
// their intervals, adjusted p-values and base rates. The cut keys still
// move the cut under it; the page keys scroll the groups and o changes
// their order. The sorted breakdown is
// kept until the cut, the order or the confidence changes, so a scroll
// costs only the drawing.
type segmentsPane struct {
	s      *session
	ctx    *shared
	order  segment.Order
	offset int  // first group in view
	gaps   bool // the gaps from the rest instead of the figures
	// pValues shows each gap's adjusted p-value instead of its interval,
	// in a gaps view too narrow for both.
	pValues bool

	sorted *sortedGroups // shared by copies of the pane
}

// sortedGroups is the last sorted breakdown and what it was made for.
type sortedGroups struct {
	ok         bool
	cut        int
	order      segment.Order
	confidence float64
	breakdown  segment.Breakdown
}

func newSegmentsPane(s *session, ctx *shared, order segment.Order) *segmentsPane {
	return &segmentsPane{s: s, ctx: ctx, order: order, sorted: &sortedGroups{}}
}

// open shows the groups from the top.
func (p *segmentsPane) open() { p.offset = 0 }

// breakdown returns the sorted breakdown at the cursor's cut.
func (p segmentsPane) breakdown() segment.Breakdown {
	s, c := p.s, p.sorted
	if !c.ok || c.cut != s.cursor || c.order != p.order || c.confidence != s.assume.Confidence {
		b, _ := s.breakdownAt(s.cursor)
		b.Segments = append([]segment.Figures(nil), b.Segments...)
		b.Sort(p.order)
		*c = sortedGroups{ok: true, cut: s.cursor, order: p.order, confidence: s.assume.Confidence, breakdown: b}
	}
	return c.breakdown
}

// rowsInView is how many groups fit in the overlay between the screen's
// header and footer, beside its frame, the count line, the heading, the
// overall row and the lines of notes and keys.
func (p segmentsPane) rowsInView() int {
	return max(p.ctx.height-2-p.ctx.styles.Overlay.GetVerticalFrameSize()-5, 1)
}

// Update moves the cut with the cut keys (the list under the overlay
// follows), scrolls with the page keys and changes the order with o; s,
// esc or q close the overlay.
func (p *segmentsPane) Update(host *Model, m tea.KeyMsg) (bool, tea.Cmd) {
	k, s := p.ctx.keys, p.s
	if key.Matches(m, k.Segments) || key.Matches(m, k.Cancel) || key.Matches(m, k.Quit) {
		return true, nil
	}
	if s.curve == nil {
		return false, nil
	}
	before := s.cursor
	groups := len(p.breakdown().Segments)
	page := p.rowsInView()
	switch {
	case key.Matches(m, k.Up):
		s.cursor = max(s.cursor-1, 0)
	case key.Matches(m, k.Down):
		s.cursor = min(s.cursor+1, s.curve.Len()-1)
	case key.Matches(m, k.PageDown):
		p.offset += page
	case key.Matches(m, k.PageUp):
		p.offset -= page
	case key.Matches(m, k.Top):
		p.offset = 0
	case key.Matches(m, k.Bottom):
		p.offset = groups - page
	case key.Matches(m, k.SegmentOrder):
		p.order = (p.order + 1) % 3
		p.offset = 0
	case key.Matches(m, k.CurveView):
		p.nextView()
	}
	p.offset = max(min(p.offset, groups-page), 0)
	if s.cursor != before {
		host.list.follow()
	}
	return false, nil
}

// nextView turns from the figures to the gaps and back; where the gaps
// view has no room for both intervals and adjusted p-values, through the
// gaps with their intervals, then with their p-values.
func (p *segmentsPane) nextView() {
	switch {
	case !p.gaps:
		p.gaps, p.pValues = true, false
	case !p.pValues && p.gapsColumns(p.breakdown()).narrow:
		p.pValues = true
	default:
		p.gaps, p.pValues = false, false
	}
}

// ShortHelp lists the overlay's keys, the way out first: the footer drops
// the last ones where it has no room, and the overlay lists them at its
// foot.
func (p *segmentsPane) ShortHelp() []key.Binding {
	k := p.ctx.keys
	return []key.Binding{hint(k.Segments, "s/esc", "close"), hint(k.Up, "↑↓", "move the cut"),
		hint(k.PageDown, "pgup/pgdn", "scroll"), hint(k.SegmentOrder, "", "next order"), hint(k.CurveView, "", "figures/gaps")}
}

// coversBody marks the breakdown as taking the whole body.
func (p *segmentsPane) coversBody() {}

func orderName(o segment.Order) string {
	switch o {
	case segment.ByGap:
		return "gap from the rest"
	case segment.ByName:
		return "name"
	}
	return "size"
}

// View draws the overlay at nearly the screen's size.
func (p *segmentsPane) View() string {
	if p.gaps {
		return p.gapsView()
	}
	s, st := p.s, p.ctx.styles
	b := p.breakdown()
	longest := len("(overall)")
	for _, f := range b.Segments {
		longest = max(longest, ansi.StringWidth(f.Segment))
	}
	// The figures' columns at full width: rows, true, flagged, hit and its
	// interval, wrong-alert share and its interval, gap, note.
	const gapW = 7
	natural := 7 + 7 + 8 + 7 + 1 + 12 + 7 + 1 + 12 + gapW + 8 + min(longest, 28) + 1
	width := min(p.ctx.width-2, natural+st.Overlay.GetHorizontalFrameSize())
	innerW := width - st.Overlay.GetHorizontalFrameSize()
	sign := format.CutSign(s.set.LowerIsRiskier())
	title := fmt.Sprintf("segments (%s) at cut %s %s · by %s", s.set.SegmentColumn(), sign, format.Score(s.point().Score), orderName(p.order))

	// Columns: the name takes what the figures leave.
	wide := innerW >= natural
	rangeW := 9
	interval := format.ShortInterval
	if wide {
		rangeW = 12
		interval = format.Interval
	}
	// The larger gap from the rest of the set (of hit share's and
	// wrong-alert share's, in points) shows where there is room, and sorted by it.
	gap := wide || p.order == segment.ByGap
	fixed := 7 + 7 + 8 + 7 + 1 + rangeW + 7 + 1 + rangeW + 8
	if gap {
		fixed += gapW
	}
	nameW := max(innerW-fixed, 8)
	row := func(f segment.Figures) string {
		note := ""
		if f.Outlier {
			note = "differs"
		}
		gapText := ""
		if gap && f.Segment != "(overall)" {
			gapText = pad(format.Number(100*f.LargestGap(), 1)+"pt", gapW, true)
		} else if gap {
			gapText = pad("", gapW, true)
		}
		return pad(format.Printable(f.Segment), nameW, false) + pad(strconv.Itoa(f.Rows), 7, true) + pad(format.Count(f.Positives), 7, true) +
			pad(format.Share(f.FlaggedShare), 8, true) + pad(format.Share(f.Recall), 7, true) + " " + pad(interval(f.RecallCI), rangeW, false) +
			pad(format.Share(f.FalseDiscoveryRate()), 7, true) + " " + pad(interval(f.FalseDiscoveryCI()), rangeW, false) + gapText + " " + note
	}
	head := pad("segment", nameW, false) + pad("rows", 7, true) + pad("true", 7, true) + pad("flagged", 8, true) +
		pad("hit", 7, true) + " " + pad("interval", rangeW, false) + pad("wrong", 7, true) + " " + pad("interval", rangeW, false)
	if gap {
		head += pad("gap", gapW, true)
	}
	overall := b.Overall
	overall.Segment = "(overall)"
	lines := []string{
		st.Muted.Render(fmt.Sprintf("%d groups · %d differ · %s intervals · flagged: share of the group", len(b.Segments), b.Outliers(),
			format.Level(s.assume.Confidence))),
		st.ColumnHead.Render(head),
		st.Figure.Render(row(overall)),
	}
	lines, keys := p.groupRows(lines, b, row, "↑↓ cut · o order · v gaps · s/esc closes", innerW)
	// What differs and gap mean, in the longest words that fit.
	legend := differsLegend(b, innerW)
	if gap {
		for _, l := range []string{
			legend + " · gap: the larger of the two figures' gaps from the rest, in points",
			legend + " · gap: the larger gap from the rest",
		} {
			if ansi.StringWidth(l) <= innerW {
				legend = l
				break
			}
		}
	}
	lines = append(lines, st.Muted.Render(legend), st.Muted.Render(keys))
	// framed fits every line to the box's inner width.
	return framed(st.Overlay, st.OverlayEdge, st.Title, title, strings.Join(lines, "\n"), width,
		min(len(lines)+st.Overlay.GetVerticalFrameSize(), p.ctx.height-2))
}

// groupRows appends the groups in view to lines, each drawn by row and
// those that differ in the warning style, and returns them with the keys
// line. When the groups scroll, the box keeps its height (blank lines pad
// the last page) and the keys lead with the groups shown, the scroll keys
// in fewer words where width has no room for them all.
func (p *segmentsPane) groupRows(lines []string, b segment.Breakdown, row func(segment.Figures) string, keys string, width int) ([]string, string) {
	n := p.rowsInView()
	end := min(p.offset+n, len(b.Segments))
	for _, f := range b.Segments[p.offset:end] {
		text := row(f)
		if f.Outlier {
			text = p.ctx.styles.Warning.Render(text)
		}
		lines = append(lines, text)
	}
	if len(b.Segments) > n {
		for range n - (end - p.offset) {
			lines = append(lines, "")
		}
		shown := fmt.Sprintf("%d–%d of %d · ", p.offset+1, end, len(b.Segments))
		if long := shown + "pgup/pgdn g/G scroll · " + keys; ansi.StringWidth(long) <= width {
			return lines, long
		}
		keys = shown + "pgup/pgdn · " + keys
	}
	return lines, keys
}

// differsLegend says what "differs" means, in the longest words that fit
// width.
func differsLegend(b segment.Breakdown, width int) string {
	level := format.PValue(1 - b.Confidence)
	for _, l := range []string{
		fmt.Sprintf("differs: hit or wrong-alert share differs from the rest of the set (p adjusted by Holm over %d tests below %s; by chance alone any flag at all in about %s of sets)",
			b.Tests, level, format.Level(1-b.Confidence)),
		fmt.Sprintf("differs: hit or wrong-alert share differs from the rest (Holm-adjusted p below %s)", level),
	} {
		if ansi.StringWidth(l) <= width {
			return l
		}
	}
	return "differs: differs from the rest (adjusted p below " + level + ")"
}

// gapsLayout is the gaps view's columns at the screen's width: full
// (gaps with their unit, intervals to a tenth of a point), compact (gaps
// without the unit, intervals in whole points) or, where not even those
// fit beside the base rates (80 columns), narrow: each gap with either its
// interval or its adjusted p-value (v turns from one to the other).
type gapsLayout struct {
	width, innerW, nameW int
	rowsW, gapW, rangeW  int
	intervals, pValues   bool // which of a gap's interval and adjusted p are shown
	narrow               bool
	gapText              func(float64) string
	gapInterval          func([2]float64) string
}

// gapsPW and gapsRateW are the widths of an adjusted p-value's column and
// of a base rate's.
const gapsPW, gapsRateW = 8, 7

// gapsColumns returns the gaps view's layout for breakdown b.
func (p *segmentsPane) gapsColumns(b segment.Breakdown) gapsLayout {
	st := p.ctx.styles
	longest := len("segment")
	for _, f := range b.Segments {
		longest = max(longest, ansi.StringWidth(f.Segment))
	}
	l := gapsLayout{rowsW: 7, gapW: 9, rangeW: 19, intervals: true, pValues: true, gapText: format.Gap, gapInterval: format.GapInterval}
	// fixed is the width of every column but the name's.
	fixed := func() int {
		w := l.rowsW + 2*gapsRateW + 8
		for range 2 {
			w += l.gapW
			if l.intervals {
				w += 1 + l.rangeW
			}
			if l.pValues {
				w += gapsPW
			}
		}
		return w
	}
	natural := fixed() + min(longest, 28) + 1
	l.width = min(p.ctx.width-2, natural+st.Overlay.GetHorizontalFrameSize())
	l.innerW = l.width - st.Overlay.GetHorizontalFrameSize()
	if l.innerW < natural {
		// Narrower: gaps drop their unit (the count line gives it) and
		// intervals read in whole points.
		l.gapW, l.rangeW = 7, 11
		l.gapText = func(d float64) string { return strings.TrimSuffix(format.Gap(d), " pt") }
		l.gapInterval = format.ShortGapInterval
	}
	if l.innerW-fixed() < 8 {
		// Narrower still: the interval or the adjusted p, not both.
		l.narrow, l.rowsW, l.rangeW = true, 6, 10
		l.intervals, l.pValues = !p.pValues, p.pValues
	}
	l.nameW = max(l.innerW-fixed(), 8)
	return l
}

// gapsView draws the overlay with each group's gaps from the rest of the
// set: hit share's and wrong-alert share's, each with its interval
// (Newcombe's hybrid score) and Holm-adjusted p-value, and the group's
// base rate beside the rest's, which wrong-alert shares follow. Where
// both do not fit (80 columns) each gap shows its interval, or after v its
// adjusted p-value.
func (p *segmentsPane) gapsView() string {
	s, st := p.s, p.ctx.styles
	b := p.breakdown()
	l := p.gapsColumns(b)
	sign := format.CutSign(s.set.LowerIsRiskier())
	title := fmt.Sprintf("segments (%s) against the rest at cut %s %s · by %s", s.set.SegmentColumn(), sign, format.Score(s.point().Score), orderName(p.order))
	// share draws a gap with what the layout shows beside it.
	share := func(t segment.Test) string {
		text := pad(l.gapText(t.Gap), l.gapW, true)
		if l.intervals {
			text += " " + pad(l.gapInterval(t.GapCI), l.rangeW, false)
		}
		if l.pValues {
			text += pad(format.PValue(t.AdjustedP), gapsPW, true)
		}
		return text
	}
	row := func(f segment.Figures) string {
		note := ""
		if f.Outlier {
			note = "differs"
		}
		return pad(format.Printable(f.Segment), l.nameW, false) + pad(strconv.Itoa(f.Rows), l.rowsW, true) +
			share(f.RecallTest) + share(f.FalseDiscoveryTest) +
			pad(format.Share(f.BaseRate()), gapsRateW, true) + pad(format.Share(b.RestBaseRate(f)), gapsRateW, true) + " " + note
	}
	heading := func(name string) string {
		text := pad(name, l.gapW, true)
		if l.intervals {
			text += " " + pad("interval", l.rangeW, false)
		}
		if l.pValues {
			text += pad("adj. p", gapsPW, true)
		}
		return text
	}
	head := pad("segment", l.nameW, false) + pad("rows", l.rowsW, true) + heading("hit") + heading("wrong") +
		pad("base", gapsRateW, true) + pad("rest", gapsRateW, true)
	count := fmt.Sprintf("%d groups · %d differ · gap: group less the rest of the set, in points · %s intervals", len(b.Segments), b.Outliers(),
		format.Level(b.Confidence))
	keys := "↑↓ cut · o order · v figures · s/esc closes"
	switch {
	case l.narrow && l.pValues:
		count = fmt.Sprintf("%d groups · %d differ · gap: group less the rest, in points · adj. p: Holm's", len(b.Segments), b.Outliers())
	case l.narrow:
		count = fmt.Sprintf("%d groups · %d differ · gap: group less the rest, in points · %s intervals", len(b.Segments), b.Outliers(),
			format.Level(b.Confidence))
		keys = "↑↓ cut · o order · v adj. p · s/esc closes"
	}
	lines := []string{st.Muted.Render(count), st.ColumnHead.Render(head)}
	// The base-rate line below takes the overall row's place.
	lines, keys = p.groupRows(lines, b, row, keys, l.innerW)
	legend := differsLegend(b, l.innerW)
	baseRates := "base, rest: share of true cases in the group and in the rest; wrong-alert shares follow them, so a wrong gap may come from the mix of cases"
	if ansi.StringWidth(baseRates) > l.innerW {
		baseRates = "base, rest: true-case shares; wrong-alert shares follow them"
	}
	lines = append(lines, st.Muted.Render(legend), st.Muted.Render(baseRates), st.Muted.Render(keys))
	return framed(st.Overlay, st.OverlayEdge, st.Title, title, strings.Join(lines, "\n"), l.width,
		min(len(lines)+st.Overlay.GetVerticalFrameSize(), p.ctx.height-2))
}
