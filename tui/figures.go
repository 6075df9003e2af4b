package tui

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/shift"
)

// figureLines is how many content lines the figures pane draws before
// the figures beyond the averages (see lines): the two headings, measured
// and projected, among them.
const figureLines = 13

// stabilityLines is how many lines the bootstrap's figures take beyond
// the ranges it adds to the hit-share and wrong-alert lines.
const stabilityLines = 2

// lines is how many content lines the figures pane draws for the loaded
// data: figureLines, one for the projected wrong-alert share when the
// production base rate differs from the validation one, one for the real
// shifts' queues, one for the net benefit of probabilities, one for a
// second model and stabilityLines while resampling or after.
func (p figuresPane) lines() int {
	s := p.s
	n := figureLines
	if s.curve == nil {
		return n
	}
	if s.baseRateChanged() {
		n++
	}
	if s.shifts() != nil && s.assume.Volume > 0 {
		n++
	}
	if s.calibration() != nil {
		n++
	}
	if s.second() != nil {
		n++
	}
	if s.resampling.running || s.stability != nil {
		n += stabilityLines
	}
	return n
}

// figuresPane shows the figures of the cursor's cut: hit share and
// wrong-alert share with their intervals and plain readings, the projected
// queue and cost per shift, the validation counts behind them, and the
// starting points with the one the cursor sits on marked.
type figuresPane struct {
	s      *session
	ctx    *shared
	width  int
	height int
}

func newFiguresPane(s *session, ctx *shared) figuresPane { return figuresPane{s: s, ctx: ctx} }

// SetSize sets the outer size.
func (p *figuresPane) SetSize(width, height int) { p.width, p.height = width, height }

// Update jumps the cursor to a starting point.
func (p figuresPane) Update(msg tea.Msg) (figuresPane, tea.Cmd) {
	m, ok := msg.(tea.KeyMsg)
	if !ok {
		return p, nil
	}
	for i, b := range p.startKeys() {
		if i < len(p.s.starts) && key.Matches(m, b) && p.s.starts[i].Met {
			p.s.cursor = p.s.starts[i].Point.Index
		}
	}
	return p, nil
}

// startKeys are the keys of the starting points, in the order of
// cutrule.Defaults.
func (p figuresPane) startKeys() []key.Binding {
	k := p.ctx.keys
	out := []key.Binding{k.BaseRate, k.Hit, k.Wrong}
	for _, o := range p.s.starts[min(3, len(p.s.starts)):] {
		switch o.Rule.Kind {
		case cutrule.HitBound:
			out = append(out, k.HitBound)
		case cutrule.WrongBound:
			out = append(out, k.WrongBound)
		case cutrule.Queue:
			out = append(out, k.Capacity)
		case cutrule.Cost:
			out = append(out, k.LeastCost)
		case cutrule.Queue90:
			out = append(out, k.Peak)
		}
	}
	return out
}

// ShortHelp lists the keys of the starting points as one, "1-5 starts";
// none before they are found.
func (p figuresPane) ShortHelp() []key.Binding {
	n := len(p.s.starts)
	if n == 0 {
		return nil
	}
	return []key.Binding{key.NewBinding(key.WithKeys("1"), key.WithHelp("1-"+keyName(n-1), "starts"))}
}

// FullHelp lists the keys of the starting points the assumptions give.
func (p figuresPane) FullHelp() [][]key.Binding {
	var out []key.Binding
	for _, b := range p.startKeys() {
		if b.Enabled() {
			out = append(out, b)
		}
	}
	return [][]key.Binding{out}
}

// View draws the figures.
func (p figuresPane) View() string {
	st := p.ctx.styles
	title := "this cut"
	if p.s.curve != nil {
		title += " · " + assumptionsText(p.s.assume)
	}
	if p.s.curve == nil || p.s.curve.Len() == 0 {
		return framed(st.Pane, st.PaneEdge, st.Title, title, "", p.width, p.height)
	}
	return framed(st.Pane, st.PaneEdge, st.Title, title, p.body(), p.width, p.height)
}

func (p figuresPane) body() string {
	s, st := p.s, p.ctx.styles
	a := s.assume
	e := s.evidenceAt(s.cursor)
	conf := strconv.FormatFloat(100*a.Confidence, 'g', -1, 64) + "%"
	sign := format.CutSign(s.set.LowerIsRiskier())
	var lines []string
	add := func(format string, args ...any) { lines = append(lines, fmt.Sprintf(format, args...)) }
	width := p.width - st.Pane.GetHorizontalFrameSize()

	add("%s %s %s", st.Label.Render("flag score "+sign), st.Figure.Render(format.Score(e.Score)),
		st.Muted.Render(fmt.Sprintf("· %s flagged (%s)", format.Count(e.Flagged), format.Share(e.FlaggedShare))))
	// Measured on the validation set: each share with its interval and,
	// after b, the range of the resampled sets, which belongs here.
	lines = append(lines, st.Label.Render(format.MeasuredHeading))
	add("%s %s  %s", st.Label.Render("hit share"), st.Figure.Render(format.Share(e.Recall)),
		st.Muted.Render(conf+" "+format.Interval(e.RecallCI)))
	band, banded := p.band()
	found := format.Count(e.TP) + " of " + format.Count(e.TP+e.FN) + " true cases found"
	if banded {
		found = format.Count(e.TP) + " of " + format.Count(e.TP+e.FN) + " found · redraws " + format.Interval(band.Recall)
	}
	add("  %s", st.Muted.Render(found))
	add("%s %s  %s", st.Label.Render("wrong-alert share"), st.Figure.Render(format.Share(e.FalseDiscoveryRate)),
		st.Muted.Render(conf+" "+format.Interval(e.FalseDiscoveryCI)))
	reading := Reading(e.FalseDiscoveryRate)
	if banded {
		reading = shortReading(reading) + " · redraws " + format.Interval(band.FalseDiscoveryRate)
	}
	add("  %s", st.Muted.Render(reading))
	add("%s %s", st.Label.Render("false positive rate"), format.Share(e.FalsePositiveRate))

	// Projected to production, each figure with its interval (production's
	// base rate, volume and costs taken as given).
	lines = append(lines, st.Label.Render(format.ProjectedHeading))
	interval := func(head, ci, tail string) string {
		w := width - ansi.StringWidth(head)
		// The interval, with its confidence as on every other line, before
		// the words when both do not fit.
		return head + st.Muted.Render(longestFit(w, "  "+conf+" "+ci+tail, " "+conf+" "+ci+tail, "  "+conf+" "+ci, " "+conf+" "+ci, " "+ci, tail))
	}
	lines = append(lines, interval(st.Label.Render("alert rate")+" "+format.Share(e.Projected.AlertRate), format.Interval(e.ProjectedCI.AlertRate), ""))
	if s.baseRateChanged() {
		// What the desk will see is the share at production's base rate.
		production := e.Projected.FalseDiscoveryRate()
		head := st.Label.Render("wrong-alert share") + " " + st.Figure.Render(format.Share(production))
		lines = append(lines, interval(head, format.Interval(e.ProjectedCI.FalseDiscovery()), " ("+shortReading(Reading(production))+")"))
	}
	if a.Volume > 0 {
		queue := st.Label.Render("queue per shift") + " " + st.Figure.Render(format.Queue(e.Projected.QueuePerShift))
		against, short := "", ""
		style := st.Muted
		if a.Capacity > 0 {
			short = " (" + format.Against(e.Projected.QueuePerShift, a.Capacity) + ")"
			against = " (" + format.Against(e.Projected.QueuePerShift, a.Capacity) + " cap " + format.Count(a.Capacity) + ")"
			if e.Projected.QueuePerShift > a.Capacity {
				style = st.Warning
			}
		}
		ci := format.QueueInterval(e.ProjectedCI.QueuePerShift)
		w := width - ansi.StringWidth(queue)
		type form struct{ interval, standing string }
		chosen := form{"", against}
		for _, f := range []form{{"  " + conf + " " + ci, against}, {"  " + ci, against}, {" " + ci, against}, {" " + ci, short}, {"", against}} {
			if ansi.StringWidth(f.interval+f.standing) <= w {
				chosen = f
				break
			}
		}
		lines = append(lines, queue+st.Muted.Render(chosen.interval)+style.Render(chosen.standing))
		if peaks, ok := s.peaksAtCut(s.cursor); ok {
			lines = append(lines, p.peaksLine(peaks))
		}
	} else {
		lines = append(lines, st.Muted.Render(longestFit(width, "queue per shift: needs a volume (a to set it)", "queue per shift: needs a volume (a)")))
	}
	switch {
	case a.Costs != nil && a.Volume > 0:
		head := st.Label.Render("cost per shift") + " " + st.Figure.Render(format.Money(e.Projected.CostPerShift))
		tail := " " + costsText(a.Costs)
		if opt, ok := s.costOptimismAtCursor(); ok {
			// The least-cost cut's own cost is optimistic
			// (analysis.CostOptimism): say so where it fits, else keep the
			// costs.
			more := " about " + format.Money(a.Volume*opt) + " more out of sample"
			if ansi.StringWidth(head+" "+format.MoneyInterval(e.ProjectedCI.CostPerShift)+more) <= width {
				tail = more
			}
		}
		lines = append(lines, interval(head, format.MoneyInterval(e.ProjectedCI.CostPerShift), tail))
	case a.Costs != nil:
		head := st.Label.Render("cost per case") + " " + st.Figure.Render(format.Money(e.Projected.CostPerCase))
		ci := format.MoneyInterval(e.ProjectedCI.CostPerCase)
		lines = append(lines, head+st.Muted.Render(longestFit(width-ansi.StringWidth(head), "  "+conf+" "+ci+" (a volume gives it per shift)", "  "+ci+" (per shift: a volume)", " (per shift: a volume)")))
	default:
		lines = append(lines, st.Muted.Render(longestFit(width, "cost per shift: needs costs (a to set them)", "cost per shift: needs costs (a)")))
	}
	if s.calibration() != nil {
		point := s.point()
		cut, all := s.res.NetBenefitAt(point)
		head := st.Label.Render("net benefit") + " " + st.Figure.Render(format.Number(cut, 4)) + " "
		lines = append(lines, head+st.Muted.Render(longestFit(width-ansi.StringWidth(head), "a case · flag all "+format.Number(all, 4), "· flag all "+format.Number(all, 4))))
	}
	if s.second() != nil {
		lines = append(lines, p.secondLine())
	}
	add("%s", st.Muted.Render(fmt.Sprintf("validation TP %s FP %s FN %s TN %s",
		format.Count(e.TP), format.Count(e.FP), format.Count(e.FN), format.Count(e.TN))))
	lines = append(lines, p.startLine(p.width-st.Pane.GetHorizontalFrameSize()))
	if s.resampling.running || s.stability != nil {
		lines = append(lines, p.stabilityLines(p.width-st.Pane.GetHorizontalFrameSize())...)
	}
	return strings.Join(lines, "\n")
}

// peaksLine is the queue of production's shifts at the cursor's cut under
// the shift-peak model (package shift): the 90th percentile and the share
// of shifts over capacity, with what the p90 rests on (counting noise
// alone, or with the real spread between shifts the set shows), beside
// the sample's busiest real shift.
func (p figuresPane) peaksLine(peaks shift.Peaks) string {
	s, st := p.s, p.ctx.styles
	width := p.width - st.Pane.GetHorizontalFrameSize()
	overStyle := st.Muted
	if peaks.OverCapacity > 0.1 {
		overStyle = st.Warning
	}
	overLong, overShort := "", ""
	if s.assume.Capacity > 0 {
		overLong = " · " + format.Share(peaks.OverCapacity) + " over cap"
		overShort = ", " + format.Number(100*peaks.OverCapacity, 0) + "% over"
	}
	whole := func(v float64) string { return format.Number(v, 0) }
	basis := " (noise only)"
	if spread := peaks.Model.Spread; spread > 0 {
		basis = " (noise + " + whole(100*spread) + "% spread)"
	}
	when := " (" + s.busiest(peaks.Busiest) + ")"
	// The longest form that fits, down to the shortest.
	forms := [][4]string{
		{"9 in 10 shifts ≤", whole(peaks.P90), basis + " · sample's busiest " + format.Queue(peaks.Max) + when, overLong},
		{"9 in 10 shifts ≤", whole(peaks.P90), basis + " · sample max " + whole(peaks.Max), overLong},
		{"9 in 10 ≤", whole(peaks.P90), basis, overShort},
		{"shifts: 9/10 ≤", whole(peaks.P90), "", overShort},
	}
	var line string
	for _, f := range forms {
		line = "  " + st.Label.Render(f[0]) + " " + st.Figure.Render(f[1]) + st.Muted.Render(f[2]) + overStyle.Render(f[3])
		if ansi.StringWidth(line) <= width {
			break
		}
	}
	return line
}

// secondLine is the second model at the same workload as the cursor's
// cut: as many rows flagged, or the nearest stricter cut.
func (p figuresPane) secondLine() string {
	s, st := p.s, p.ctx.styles
	q, ok := s.secondAtWorkload(s.cursor)
	if !ok {
		return st.Muted.Render("model B: no cases")
	}
	return st.Label.Render("B at this workload") + " " + st.Muted.Render("hit ") + st.Figure.Render(format.Share(q.Recall())) +
		st.Muted.Render(" · wrong ") + st.Figure.Render(format.Share(q.FalseDiscoveryRate()))
}

// stabilityLines are the bootstrap's figures for the cursor's cut: while
// it runs, its progress; after, the band of hit share and wrong-alert
// share at this score and, on a starting point, where its cut lands, in
// numbers and plain words.
func (p figuresPane) stabilityLines(width int) []string {
	s, st := p.s, p.ctx.styles
	out := make([]string, 0, stabilityLines)
	if s.resampling.running {
		done := int(s.resampling.done.Load())
		out = append(out, st.Label.Render("resampling")+" "+st.Figure.Render(fmt.Sprintf("%d of %d", done, s.resampling.total))+" "+st.Muted.Render("(b stops)"),
			st.Muted.Render(progressBar(done, s.resampling.total, max(width-2, 4))))
		return out
	}
	res := s.stability
	var sentences []string
	if sp, on := s.spreadAt(s.cursor); on && sp.Skipped != "" {
		sentences = []string{
			fmt.Sprintf("%s is not resampled: drawing cases again piles repeats into the same shifts", ruleWords(sp.Rule)),
			fmt.Sprintf("%s is not resampled (repeats pile into shifts)", ruleWords(sp.Rule)),
		}
	} else if on {
		from, to := significant(sp.Score[0]), significant(sp.Score[1])
		sentences = []string{
			fmt.Sprintf("%s could land anywhere from score %s to %s on another validation set of this size", ruleWords(sp.Rule), from, to),
			fmt.Sprintf("%s: score %s to %s on another set of this size", ruleWords(sp.Rule), from, to),
		}
	} else if band, ok := s.bandAt(s.cursor); ok && evidence.Defined(band.Recall[0]) && evidence.Defined(band.FalseDiscoveryRate[0]) {
		caught, wrong := format.ShortInterval(band.Recall), format.ShortInterval(band.FalseDiscoveryRate)
		sentences = []string{
			fmt.Sprintf("on another validation set of this size this score would catch %s of the true cases, with %s of its alerts wrong, 9 times in 10", caught, wrong),
			fmt.Sprintf("on another set of this size this score would catch %s of true cases, %s of alerts wrong, 9 times in 10", caught, wrong),
			fmt.Sprintf("another set of this size: %s caught, %s wrong (9 in 10)", caught, wrong),
		}
	} else {
		sentences = []string{fmt.Sprintf("%d resampled sets; keys 1-%d say where each starting point could land", res.Replicates, len(s.starts))}
	}
	var lines []string
	for _, sentence := range sentences {
		if lines = wrapWords(sentence, width); len(lines) <= stabilityLines {
			break
		}
	}
	for _, l := range lines {
		out = append(out, st.Muted.Render(l))
	}
	if len(out) > stabilityLines {
		out = out[:stabilityLines]
		out[stabilityLines-1] = ansi.Truncate(out[stabilityLines-1]+" …", width, "…")
	}
	return out
}

// band returns the bootstrap's band exactly at the cursor's cut, if it
// has run.
func (p figuresPane) band() (bootstrap.BandPoint, bool) {
	return p.s.bandAt(p.s.cursor)
}

// progressBar draws done of total as a bar of width cells that reads
// without colour.
func progressBar(done, total, width int) string {
	if total <= 0 {
		return ""
	}
	filled := min(width*done/total, width)
	return strings.Repeat("█", filled) + strings.Repeat("░", width-filled)
}

// startLine lists the starting points by key, marking the ones the cursor
// is on and those no cut meets. When the names do not fit in width it
// names only the ones the cursor is on and those unmet, and when that does
// not fit either only the ones the cursor is on (an unmet one's key is
// muted).
func (p figuresPane) startLine(width int) string {
	s, st := p.s, p.ctx.styles
	on := len(s.rulesAt(s.cursor)) > 0
	build := func(names, unmetNames bool) string {
		label := "start"
		if !on {
			label = "start (none here)"
		}
		parts := []string{st.Label.Render(label)}
		for i, o := range s.starts {
			n := strconv.Itoa(i + 1)
			switch {
			case o.Met && o.Point.Index == s.cursor:
				parts = append(parts, st.OnRule.Render("["+n+" "+o.Rule.String()+"]"))
			case !o.Met && unmetNames:
				parts = append(parts, st.Muted.Render(n+" "+o.Rule.String()+" unmet"))
			case !o.Met:
				parts = append(parts, st.Muted.Render(n))
			case names:
				parts = append(parts, st.Key.Render(n)+" "+o.Rule.String())
			default:
				parts = append(parts, st.Key.Render(n))
			}
		}
		return strings.Join(parts, " ")
	}
	line := build(true, true)
	if ansi.StringWidth(line) > width {
		line = build(false, true)
	}
	if ansi.StringWidth(line) > width {
		line = build(false, false)
	}
	// After a bootstrap, how steady the cursor's starting point is.
	if sp, ok := s.spreadAt(s.cursor); ok && sp.Skipped == "" {
		verdict, _, _ := strings.Cut(bootstrap.Describe(sp, s.stability.Replicates), ":")
		if with := line + st.Muted.Render(" · "+verdict); ansi.StringWidth(with) <= width {
			line = with
		}
	}
	return line
}

// assumptionsText is the assumptions in a few words: the base rate, the
// volume and the capacity.
func assumptionsText(a projection.Assumptions) string {
	parts := []string{"base " + format.Share(a.BaseRate)}
	if a.Volume > 0 {
		parts = append(parts, format.Count(a.Volume)+"/shift")
	}
	if a.Capacity > 0 {
		parts = append(parts, "cap "+format.Count(a.Capacity))
	}
	return strings.Join(parts, " · ")
}

// costsText is the costs in a few words.
func costsText(c *projection.Costs) string {
	if c == nil {
		return ""
	}
	text := "(wrong " + format.Money(c.FalseAlert) + ", miss " + format.Money(c.Miss)
	if c.Hit != 0 {
		text += ", hit " + format.Money(c.Hit)
	}
	return text + ")"
}

// shortReading is Reading without "alerts" ("about 1 in 3 wrong"), for a
// line that says more after it.
func shortReading(reading string) string {
	return strings.NewReplacer(" alerts are wrong", " wrong", " alerts is wrong", " wrong", " alerts is right", " right").Replace(reading)
}

// Reading puts a wrong-alert share in words, as "about 1 in 3 alerts is
// wrong". It picks the fraction k/d with d from 2 to 10 nearest the share
// (the smallest d among equals); shares under 10% read as 1 in
// round(1/share). An undefined share reads "no alerts at this cut".
func Reading(share float64) string {
	switch {
	case math.IsNaN(share):
		return "no alerts at this cut"
	case share <= 0:
		return "no alert is wrong"
	case share >= 1:
		return "every alert is wrong"
	case share < 0.1:
		return fmt.Sprintf("about 1 in %d alerts is wrong", int(math.Round(1/share)))
	case share > 0.9:
		return fmt.Sprintf("about 1 in %d alerts is right", int(math.Round(1/(1-share))))
	}
	bestK, bestD, bestErr := 0, 1, math.Inf(1)
	for d := 2; d <= 10; d++ {
		k := int(math.Round(share * float64(d)))
		if k < 1 || k >= d {
			continue
		}
		if err := math.Abs(float64(k)/float64(d) - share); err < bestErr-1e-9 {
			bestK, bestD, bestErr = k, d, err
		}
		if bestErr < 0.02 {
			break
		}
	}
	verb := "are"
	if bestK == 1 {
		verb = "is"
	}
	return fmt.Sprintf("about %d in %d alerts %s wrong", bestK, bestD, verb)
}

// longestFit returns the first of forms, longest first, that fits in width
// cells, and the last when none does.
func longestFit(width int, forms ...string) string {
	for _, f := range forms {
		if ansi.StringWidth(f) <= width {
			return f
		}
	}
	return forms[len(forms)-1]
}

// costOptimismAtCursor returns the optimism per case of the least-cost
// figure (analysis.CostOptimism) when the cursor sits on the cost rule's
// cut.
func (s *session) costOptimismAtCursor() (float64, bool) {
	if s.res == nil || math.IsNaN(s.res.CostOptimism) {
		return 0, false
	}
	at := s.point().Index
	for _, o := range s.res.Outcomes {
		if o.Met && o.Rule.Kind == cutrule.Cost && o.Point.Index == at {
			return s.res.CostOptimism, true
		}
	}
	return 0, false
}
