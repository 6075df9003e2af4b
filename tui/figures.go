package tui

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
)

// figureLines is how many content lines the figures pane draws.
const figureLines = 10

// figuresPane shows the figures of the cursor's cut: hit share and
// wrong-alert share with their intervals and plain readings, the projected
// queue and cost per shift, the validation counts behind them, and the
// starting points with the one the cursor sits on marked.
type figuresPane struct {
	s      *session
	ctx    *context
	width  int
	height int
}

func newFiguresPane(s *session, ctx *context) figuresPane { return figuresPane{s: s, ctx: ctx} }

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
		case cutrule.Queue:
			out = append(out, k.Capacity)
		case cutrule.Cost:
			out = append(out, k.LeastCost)
		}
	}
	return out
}

// ShortHelp lists the pane's keys.
func (p figuresPane) ShortHelp() []key.Binding { return p.startKeys() }

// FullHelp lists the pane's keys in groups.
func (p figuresPane) FullHelp() [][]key.Binding { return [][]key.Binding{p.startKeys()} }

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
	sign := ">="
	if s.set.LowerIsRiskier {
		sign = "<="
	}
	var lines []string
	add := func(format string, args ...any) { lines = append(lines, fmt.Sprintf(format, args...)) }

	add("%s %s %s", st.Label.Render("flag score "+sign), st.Figure.Render(report.Score(e.Score)),
		st.Muted.Render(fmt.Sprintf("· %s flagged (%s)", report.Count(e.Flagged), report.Percent(e.FlaggedShare))))
	add("%s %s  %s", st.Label.Render("hit share"), st.Figure.Render(report.Percent(e.Recall)),
		st.Muted.Render(conf+" "+report.Range(e.RecallCI)))
	add("  %s", st.Muted.Render(report.Count(e.TP)+" of "+report.Count(e.TP+e.FN)+" true cases found"))
	add("%s %s  %s", st.Label.Render("wrong-alert share"), st.Figure.Render(report.Percent(e.FalseDiscoveryRate)),
		st.Muted.Render(conf+" "+report.Range(e.FalseDiscoveryCI)))
	reading := Reading(e.FalseDiscoveryRate)
	if s.baseRateChanged() {
		// What the desk will see is the share at production's base rate.
		production := e.Projected.FalseDiscoveryRate()
		short := strings.NewReplacer(" alerts are wrong", " wrong", " alerts is wrong", " wrong", " alerts is right", " right").Replace(Reading(production))
		reading = "in production " + report.Percent(production) + " (" + short + ")"
	}
	add("  %s", st.Muted.Render(reading))
	add("%s %s %s", st.Label.Render("false positive rate"), report.Percent(e.FalsePositiveRate),
		st.Muted.Render("· alert rate "+report.Percent(e.Projected.AlertRate)))
	if a.Volume > 0 {
		queue := st.Label.Render("queue per shift") + " " + st.Figure.Render(report.Queue(e.Projected.QueuePerShift))
		if a.Capacity > 0 {
			against := report.Against(e.Projected.QueuePerShift, a.Capacity)
			style := st.Muted
			if e.Projected.QueuePerShift > a.Capacity {
				style = st.Warning
			}
			queue += " " + style.Render("("+against+" cap "+report.Count(a.Capacity)+")")
		}
		lines = append(lines, queue)
	} else {
		add("%s", st.Muted.Render("queue per shift: needs a volume (a to set it)"))
	}
	switch {
	case a.Costs != nil && a.Volume > 0:
		add("%s %s %s", st.Label.Render("cost per shift"), st.Figure.Render(report.Money(e.Projected.CostPerShift)), st.Muted.Render(costsText(a.Costs)))
	case a.Costs != nil:
		add("%s %s %s", st.Label.Render("cost per case"), st.Figure.Render(report.Money(e.Projected.CostPerCase)), st.Muted.Render("(a volume gives it per shift)"))
	default:
		add("%s", st.Muted.Render("cost per shift: needs costs (a to set them)"))
	}
	add("%s", st.Muted.Render(fmt.Sprintf("validation TP %s FP %s FN %s TN %s",
		report.Count(e.TP), report.Count(e.FP), report.Count(e.FN), report.Count(e.TN))))
	lines = append(lines, p.startLine(p.width-st.Pane.GetHorizontalFrameSize()))
	return strings.Join(lines, "\n")
}

// startLine lists the starting points by key, marking the ones the cursor
// is on and those no cut meets. When the names do not fit in width it
// names only the ones the cursor is on.
func (p figuresPane) startLine(width int) string {
	s, st := p.s, p.ctx.styles
	on := len(s.rulesAt(s.cursor)) > 0
	build := func(names bool) string {
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
			case !o.Met:
				parts = append(parts, st.Muted.Render(n+" "+o.Rule.String()+" unmet"))
			case names:
				parts = append(parts, st.Key.Render(n)+" "+o.Rule.String())
			default:
				parts = append(parts, st.Key.Render(n))
			}
		}
		return strings.Join(parts, " ")
	}
	if line := build(true); ansi.StringWidth(line) <= width {
		return line
	}
	return build(false)
}

// assumptionsText is the assumptions in a few words: the base rate, the
// volume and the capacity.
func assumptionsText(a projection.Assumptions) string {
	parts := []string{"base " + report.Percent(a.BaseRate)}
	if a.Volume > 0 {
		parts = append(parts, report.Count(a.Volume)+"/shift")
	}
	if a.Capacity > 0 {
		parts = append(parts, "cap "+report.Count(a.Capacity))
	}
	return strings.Join(parts, " · ")
}

// costsText is the costs in a few words.
func costsText(c *projection.Costs) string {
	if c == nil {
		return ""
	}
	text := "(wrong " + report.Money(c.FalseAlert) + ", miss " + report.Money(c.Miss)
	if c.Hit != 0 {
		text += ", hit " + report.Money(c.Hit)
	}
	return text + ")"
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
