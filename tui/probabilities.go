package tui

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
)

// calibrationPane is the overlay that asks whether the scores read as
// probabilities: the reliability table with the expected calibration
// error, the cost threshold that calibrated probabilities imply (Elkan
// 2001) beside the empirical least-cost cut, a warning when the two differ
// by more than where the least-cost cut lands in resampled sets, and the
// net benefit at the cursor's cut (Vickers and Elkin 2006).
type calibrationPane struct {
	s   *session
	ctx *shared
}

// Update moves the cut with the up and down keys, the list under the
// overlay following; e, esc or q close the overlay.
func (p *calibrationPane) Update(m *Model, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := p.ctx.keys
	if key.Matches(msg, k.Calibration) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit) {
		return true, nil
	}
	if key.Matches(msg, k.Up) || key.Matches(msg, k.Down) {
		m.list, _ = m.list.Update(msg)
	}
	return false, nil
}

// ShortHelp lists the overlay's keys, the way out first.
func (p *calibrationPane) ShortHelp() []key.Binding {
	k := p.ctx.keys
	return []key.Binding{hint(k.Calibration, "e/esc", "close"), hint(k.Up, "↑↓", "move the cut")}
}

// View draws the overlay.
func (p *calibrationPane) View() string {
	s, st := p.s, p.ctx.styles
	cal := s.calibration()
	if cal == nil {
		lines := wrapWords("The scores are not probabilities: they need to lie in [0,1] with higher scores riskier. "+
			"So there is no reliability table, no cost threshold from probabilities and no net benefit; "+
			"the least-cost cut (a starting point, with costs) does not need them.", 64)
		lines = append(lines, "", st.Muted.Render("e or esc closes"))
		return overlayBox(p.ctx, "are the scores probabilities?", strings.Join(lines, "\n"))
	}
	t := cal.Table
	binning := "of equal width"
	if t.Binning == calibration.Quantile {
		binning = "of about equal rows"
	}
	var lines []string
	head := pad("scores", 13, false) + pad("rows", 8, true) + pad("mean score", 12, true) + pad("observed", 10, true) + pad("gap", 8, true)
	lines = append(lines, st.ColumnHead.Render(head))
	for _, b := range t.Bins {
		line := pad(format.Number(b.Lower, 2)+"–"+format.Number(b.Upper, 2), 13, false) + pad(strconv.Itoa(b.Count), 8, true) +
			pad(format.Number(b.MeanScore, 3), 12, true) + pad(format.Number(b.ObservedRate, 3), 10, true) + pad(format.NumberDiff(b.ObservedRate, b.MeanScore, 3).Text, 8, true)
		lines = append(lines, line)
	}
	lines = append(lines, st.Label.Render("expected calibration error")+" "+st.Figure.Render(format.Number(t.ECE, 4))+
		st.Muted.Render(" (the gaps, weighted by cases)"))
	lines = append(lines, st.Muted.Render("  noise level at this size about "+format.Number(t.Noise, 4)+": 9 in 10 calibrated sets stay below"))
	lines = append(lines, p.costLines()...)
	point := s.point()
	cut, all := s.res.NetBenefitAt(point)
	lines = append(lines, st.Label.Render("net benefit here")+" "+st.Figure.Render(format.Number(cut, 4))+
		st.Muted.Render(" a case · flag all "+format.Number(all, 4)+" · none 0"))
	lines = append(lines, st.Muted.Render("  at threshold probability "+format.Number(cal.Threshold, 4)+thresholdBasis(cal)+", production's base rate"))
	lines = append(lines, st.Muted.Render("↑↓ move the cut · e or esc closes"))
	return overlayBox(p.ctx, "are the scores probabilities? · "+strconv.Itoa(len(t.Bins))+" bins "+binning, strings.Join(lines, "\n"))
}

// costLines put the cost threshold of calibrated probabilities beside the
// least-cost cut, with the bootstrap's judgement of their difference.
func (p calibrationPane) costLines() []string {
	s, st := p.s, p.ctx.styles
	c, ok := s.costCheck()
	if !ok {
		return []string{st.Muted.Render("cost threshold: needs costs (a to set them)")}
	}
	line := st.Label.Render("cost threshold (Elkan 2001)") + " " + st.Figure.Render(format.Number(c.threshold, 3)) +
		st.Muted.Render(" if the scores are calibrated")
	if s.baseRateChanged() {
		line += st.Muted.Render(" (probability " + format.Number(c.probability, 3) + " at production's base rate)")
	}
	out := []string{line}
	if c.least == nil {
		return append(out, st.Muted.Render("least-cost cut: none met"))
	}
	line = st.Label.Render("least-cost cut") + " " + st.Figure.Render(format.Score(c.least.Point.Score))
	lands := " · lands " + significant(c.spread.Score[0]) + " to " + significant(c.spread.Score[1]) + " in resampled sets"
	switch {
	case !evidence.Defined(c.threshold):
		out = append(out, line)
	case !c.judged:
		side := "above"
		if c.least.Point.Score < c.threshold {
			side = "below"
		}
		out = append(out, line+st.Muted.Render(fmt.Sprintf(" · %s %s the threshold; b resamples to judge",
			format.Number(math.Abs(c.least.Point.Score-c.threshold), 3), side)))
	case c.outside:
		out = append(out, line+st.Muted.Render(lands),
			st.Warning.Render("⚠ the threshold lies outside that range: the scores are probably not"),
			st.Warning.Render("  calibrated, so do not cost from them as probabilities"))
	default:
		out = append(out, line+st.Muted.Render(lands+", the threshold within: they agree"))
	}
	return out
}

// costCheck is the cost threshold of calibrated probabilities beside the
// least-cost cut.
type costCheck struct {
	probability float64          // Elkan's threshold as a probability at production's base rate
	threshold   float64          // the same on the validation scores' scale
	least       *cutrule.Outcome // the least-cost starting point, nil when unmet
	spread      bootstrap.Spread // where the least-cost cut lands in resampled sets
	judged      bool             // the bootstrap has run and resampled the least-cost cut
	outside     bool             // judged, and the threshold lies outside the spread
}

// costCheck compares the cost threshold with the least-cost cut; ok is
// false without costs or when the scores are not probabilities.
func (s *session) costCheck() (costCheck, bool) {
	cal := s.calibration()
	if cal == nil || cal.Cost == nil {
		return costCheck{}, false
	}
	c := costCheck{probability: cal.Cost.Probability, threshold: cal.Cost.Score}
	if cal.Cost.LeastCost.Met {
		c.least = &cal.Cost.LeastCost
	}
	judged := s.res.CheckCost(s.stability)
	c.spread, c.judged, c.outside = judged.Spread, judged.Judged, judged.Outside
	return c, true
}

// modelsPane is the overlay of the two models on the same cases: their
// ROC AUCs with DeLong's paired test, and for each starting point both
// models' cuts side by side.
type modelsPane struct {
	s   *session
	ctx *shared
}

// Update closes the overlay on m, esc or q.
func (p *modelsPane) Update(_ *Model, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := p.ctx.keys
	return key.Matches(msg, k.Models) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit), nil
}

// ShortHelp lists the overlay's key.
func (p *modelsPane) ShortHelp() []key.Binding {
	return []key.Binding{hint(p.ctx.keys.Models, "m/esc", "close")}
}

// View draws the overlay.
func (p *modelsPane) View() string {
	s, st := p.s, p.ctx.styles
	second := s.second()
	if second == nil {
		return overlayBox(p.ctx, "two models", "no second model: give --score twice, or --compare FILE with --id\n"+st.Muted.Render("m or esc closes"))
	}
	a := s.assume
	lines := []string{
		fmt.Sprintf("A %s: ROC AUC %s   B %s: ROC AUC %s", format.Printable(s.set.ScoreColumn()), format.Number(s.curve.Summary.ROCAUC, 3),
			format.Printable(s.set.CompareColumn()), format.Number(second.Summary.ROCAUC, 3)),
	}
	if second.TestErr != nil {
		lines = append(lines, st.Muted.Render("paired test: "+format.Printable(second.TestErr.Error())))
	} else {
		lines = append(lines, st.Muted.Render(fmt.Sprintf("A − B %s (SE %s), z %s, p %s: DeLong's paired test",
			format.NumberDiff(second.Test.AUC[0], second.Test.AUC[1], 3).Text, format.Number(second.Test.StdError, 3), format.Number(second.Test.Z, 2), format.PValue(second.Test.P))))
	}
	head := pad("starting point", 16, false) + pad("", 2, false) + pad("cut", 8, true) + pad("flagged", 9, true) + pad("hit", 8, true) +
		pad("wrong", 8, true) + pad("queue", 8, true) + pad("cost", 10, true)
	lines = append(lines, "", st.ColumnHead.Render(head))
	row := func(name, model string, met bool, e evidence.Cut) string {
		if !met {
			return pad(name, 16, false) + pad(model, 2, false) + st.Muted.Render(pad("not met", 8, true))
		}
		queue, cost := "n/a", "n/a"
		if a.Volume > 0 {
			queue = format.Queue(e.Projected.QueuePerShift)
			if a.Costs != nil {
				cost = format.Money(e.Projected.CostPerShift)
			}
		}
		return pad(name, 16, false) + pad(model, 2, false) + pad(format.Score(e.Score), 8, true) + pad(format.Share(e.FlaggedShare), 9, true) +
			pad(format.Share(e.Recall), 8, true) + pad(format.Share(e.FalseDiscoveryRate), 8, true) + pad(queue, 8, true) + pad(cost, 10, true)
	}
	for i, o := range s.starts {
		name := o.Rule.String()
		if o.Met && o.Point.Index == s.cursor {
			name = "▶ " + name
		}
		lines = append(lines, row(name, "A", o.Met, evidence.Of(o.Point, a)))
		if i < len(second.Outcomes) {
			b := second.Outcomes[i]
			lines = append(lines, row("", "B", b.Met, evidence.Of(b.Point, a)))
		}
	}
	if q, ok := s.secondAtWorkload(s.cursor); ok {
		lines = append(lines, "", st.Label.Render("at this cut's workload")+" "+st.Muted.Render(fmt.Sprintf("A hit %s wrong %s · B hit %s wrong %s",
			format.Share(s.point().Recall()), format.Share(s.point().FalseDiscoveryRate()), format.Share(q.Recall()), format.Share(q.FalseDiscoveryRate()))))
	}
	lines = append(lines, st.Muted.Render("figures projected under the assumptions · ▶ the cursor's · m or esc closes"))
	return overlayBox(p.ctx, "two models on the same cases", strings.Join(lines, "\n"))
}

// thresholdBasis says where net benefit's threshold probability comes
// from.
func thresholdBasis(c *analysis.Calibration) string {
	if c.ThresholdFromCosts {
		return " from the costs"
	}
	return " = the base rate (no costs given)"
}
