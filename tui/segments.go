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
		p.gaps = !p.gaps
	}
	p.offset = max(min(p.offset, groups-page), 0)
	if s.cursor != before {
		host.list.follow()
	}
	return false, nil
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
	lines, keys := p.groupRows(lines, b, row, "↑↓ cut · o order · v gaps · s/esc closes")
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
// the last page) and the keys lead with the groups shown.
func (p *segmentsPane) groupRows(lines []string, b segment.Breakdown, row func(segment.Figures) string, keys string) ([]string, string) {
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
		keys = fmt.Sprintf("%d–%d of %d · pgup/pgdn g/G scroll · ", p.offset+1, end, len(b.Segments)) + keys
	}
	return lines, keys
}

// differsLegend says what "differs" means, in the longest words that fit
// width.
func differsLegend(b segment.Breakdown, width int) string {
	level := format.PValue(1 - b.Confidence)
	for _, l := range []string{
		fmt.Sprintf("differs: hit or wrong-alert share differs from the rest of the set (p adjusted by Holm over %d tests below %s; by chance alone any flag at all in at most %s of sets)",
			b.Tests, level, format.Level(1-b.Confidence)),
		fmt.Sprintf("differs: hit or wrong-alert share differs from the rest (Holm-adjusted p below %s)", level),
	} {
		if ansi.StringWidth(l) <= width {
			return l
		}
	}
	return "differs: differs from the rest (adjusted p below " + level + ")"
}

// gapsView draws the overlay with each group's gaps from the rest of the
// set: hit share's and wrong-alert share's, each with its interval
// (Newcombe's hybrid score) and Holm-adjusted p-value, and the group's
// base rate beside the rest's, which wrong-alert shares follow.
func (p *segmentsPane) gapsView() string {
	s, st := p.s, p.ctx.styles
	b := p.breakdown()
	longest := len("segment")
	for _, f := range b.Segments {
		longest = max(longest, ansi.StringWidth(f.Segment))
	}
	// rows, hit gap, interval, adj. p, wrong gap, interval, adj. p, base
	// rate, rest's, note.
	// Narrower than that, gaps drop their unit (the count line gives it)
	// and intervals read in whole points.
	const pW, rateW = 8, 7
	gapW, rangeW := 9, 19
	natural := 7 + 2*(gapW+1+rangeW+pW) + 2*rateW + 8 + min(longest, 28) + 1
	width := min(p.ctx.width-2, natural+st.Overlay.GetHorizontalFrameSize())
	innerW := width - st.Overlay.GetHorizontalFrameSize()
	gapText, gapInterval := format.Gap, format.GapInterval
	if innerW < natural {
		gapW, rangeW = 7, 11
		gapText = func(d float64) string { return strings.TrimSuffix(format.Gap(d), " pt") }
		gapInterval = format.ShortGapInterval
	}
	fixed := 7 + 2*(gapW+1+rangeW+pW) + 2*rateW + 8
	nameW := max(innerW-fixed, 8)
	sign := format.CutSign(s.set.LowerIsRiskier())
	title := fmt.Sprintf("segments (%s) against the rest at cut %s %s · by %s", s.set.SegmentColumn(), sign, format.Score(s.point().Score), orderName(p.order))
	row := func(f segment.Figures) string {
		note := ""
		if f.Outlier {
			note = "differs"
		}
		r, w := f.RecallTest, f.FalseDiscoveryTest
		return pad(format.Printable(f.Segment), nameW, false) + pad(strconv.Itoa(f.Rows), 7, true) +
			pad(gapText(r.Gap), gapW, true) + " " + pad(gapInterval(r.GapCI), rangeW, false) + pad(format.PValue(r.AdjustedP), pW, true) +
			pad(gapText(w.Gap), gapW, true) + " " + pad(gapInterval(w.GapCI), rangeW, false) + pad(format.PValue(w.AdjustedP), pW, true) +
			pad(format.Share(f.BaseRate()), rateW, true) + pad(format.Share(b.RestBaseRate(f)), rateW, true) + " " + note
	}
	head := pad("segment", nameW, false) + pad("rows", 7, true) +
		pad("hit", gapW, true) + " " + pad("interval", rangeW, false) + pad("adj. p", pW, true) +
		pad("wrong", gapW, true) + " " + pad("interval", rangeW, false) + pad("adj. p", pW, true) +
		pad("base", rateW, true) + pad("rest", rateW, true)
	lines := []string{
		st.Muted.Render(fmt.Sprintf("%d groups · %d differ · gap: group less the rest of the set, in points · %s intervals", len(b.Segments), b.Outliers(),
			format.Level(b.Confidence))),
		st.ColumnHead.Render(head),
	}
	// The base-rate line below takes the overall row's place.
	lines, keys := p.groupRows(lines, b, row, "↑↓ cut · o order · v figures · s/esc closes")
	legend := differsLegend(b, innerW)
	baseRates := "base, rest: share of true cases in the group and in the rest; wrong-alert shares follow them, so a wrong gap may come from the mix of cases"
	if ansi.StringWidth(baseRates) > innerW {
		baseRates = "base, rest: true-case shares; wrong-alert shares follow them"
	}
	lines = append(lines, st.Muted.Render(legend), st.Muted.Render(baseRates), st.Muted.Render(keys))
	return framed(st.Overlay, st.OverlayEdge, st.Title, title, strings.Join(lines, "\n"), width,
		min(len(lines)+st.Overlay.GetVerticalFrameSize(), p.ctx.height-2))
}
