package page

import (
	"fmt"
	"io"
	"strings"

	"gonum.org/v1/plot/plotter"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
)

// AgainstOptions name the two decisions of a comparison.
type AgainstOptions struct {
	Proposed, Production Options
}

// againstView is the part of a page of two decisions that a page of one
// does not have.
type againstView struct {
	ProposedName, ProductionName string
	Facts                        [][3]string // what, in production, proposed
	Changed                      []string    // assumptions that changed, in words
	Change                       []string    // the change per shift in plain words
}

// WriteAgainst writes the page that sets the proposed decision beside the
// one in production: what each rests on, the assumptions that changed,
// both chosen cuts side by side with their figures and intervals, the
// change per shift in plain words and both curves on one chart.
func WriteAgainst(w io.Writer, proposed, production *decision.File, opt AgainstOptions) error {
	newChosen, ok := proposed.ChosenCandidate()
	if !ok {
		return fmt.Errorf("page: chosen %q names no candidate", proposed.Chosen)
	}
	oldChosen, ok := production.ChosenCandidate()
	if !ok {
		return fmt.Errorf("page: chosen %q names no candidate", production.Chosen)
	}
	newName, oldName := opt.Proposed.Name, opt.Production.Name
	if newName == "" {
		newName = proposed.Data.Path
	}
	if oldName == "" {
		oldName = production.Data.Path
	}
	a := &againstView{
		ProposedName:   newName,
		ProductionName: oldName,
		Facts:          againstFacts(proposed, production, newChosen, oldChosen),
		Changed:        changedAssumptions(production, proposed),
		Change:         changePerShift(oldChosen.Cut, newChosen.Cut, production, proposed),
	}
	v := &view{
		Title:   "Proposed cut " + newChosen.Name + " against " + oldChosen.Name + " in production",
		Name:    newName + " against " + oldName,
		Against: a,
		Job: fmt.Sprintf("A model scores each case; a case whose score is at or beyond the cut becomes an alert that a person works. "+
			"The cut in production is %s, from %s; the proposed one is %s, from %s. This page sets the two side by side: "+
			"the data and assumptions each rests on, their figures on their own validation sets, and what the change would mean per shift.",
			oldChosen.Name, oldName, newChosen.Name, newName),
		Assume:     assumptions(proposed),
		Glossary:   glossary,
		Caution:    evidence.Caution,
		NoSignOff:  "No sign-off of the proposed decision is recorded in its file.",
		SignOffs:   signOffs(proposed),
		SigningFor: signingFor(proposed, newChosen, newName),
		Written:    proposed.Created.UTC().Format("2006-01-02 15:04 MST") + " by " + proposed.WrittenBy() + " (proposed); " + production.Created.UTC().Format("2006-01-02 15:04 MST") + " by " + production.WrittenBy() + " (in production)",
	}
	// Both chosen cuts side by side, the one in production as the
	// reference; each column carries the figures projected under its own
	// file's assumptions. Each stands against its own capacity in the
	// change per shift, not in the table, which has one capacity row.
	shared := proposed.Assumptions
	shared.Capacity = 0
	t := compare.New([]compare.Column{
		{Name: "in production: " + oldChosen.Name, Rule: oldChosen.Rule, Cut: oldChosen.Cut},
		{Name: "proposed: " + newChosen.Name, Rule: newChosen.Rule, Cut: newChosen.Cut},
	}, 0, compare.Options{Assumptions: shared, BaseRateChanged: proposed.BaseRateChanged() || production.BaseRateChanged(), LowerIsRiskier: proposed.Data.LowerIsRiskier})
	v.Table = render(t, "reference")
	charts, missing, err := againstCharts(proposed, production, newChosen, oldChosen, opt)
	if err != nil {
		return err
	}
	v.Charts, v.NoCurve = charts, missing
	return templates.ExecuteTemplate(w, "against", v)
}

func againstFacts(proposed, production *decision.File, newChosen, oldChosen decision.Candidate) [][3]string {
	same := func(a, b string) string {
		if a == b {
			return "same"
		}
		return b
	}
	base := func(f *decision.File) string {
		total := f.Data.Positives + f.Data.Negatives
		if !(total > 0) {
			return "n/a"
		}
		return format.Share(f.Data.Positives / total)
	}
	return [][3]string{
		{"model", model(production), model(proposed)},
		{"validation set", production.Data.Path, same(production.Data.Path, proposed.Data.Path)},
		{"fingerprint (SHA-256)", production.Data.SHA256, same(production.Data.SHA256, proposed.Data.SHA256)},
		{"rows", format.Count(float64(production.Data.Rows)), format.Count(float64(proposed.Data.Rows))},
		{"base rate", base(production), base(proposed)},
		{"chosen cut", oldChosen.Name + ": score " + flagSign(production) + " " + format.Score(oldChosen.Cut.Score), newChosen.Name + ": score " + flagSign(proposed) + " " + format.Score(newChosen.Cut.Score)},
		{"decision written", production.Created.UTC().Format("2006-01-02 15:04 MST"), proposed.Created.UTC().Format("2006-01-02 15:04 MST")},
	}
}

// changedAssumptions says in words each assumption that differs.
func changedAssumptions(old, new *decision.File) []string {
	var out []string
	for i, o := range assumptions(old) {
		n := assumptions(new)[i]
		if o.Text != n.Text {
			out = append(out, fmt.Sprintf("%s: %s, was %s", o.Term, n.Text, o.Text))
		}
	}
	return out
}

// changePerShift says what moving from the cut in production to the
// proposed one means in an average shift, each figure as the files'
// projections give it.
func changePerShift(old, new evidence.Cut, oldFile, newFile *decision.File) []string {
	if !(oldFile.Assumptions.Volume > 0) || !(newFile.Assumptions.Volume > 0) {
		return []string{"Not computed: " + missingVolume(oldFile, newFile) + " gives no number of cases per shift, so the change per shift cannot be said; " +
			"the shares below still compare."}
	}
	alerts := func(c evidence.Cut) float64 { return c.Projected.QueuePerShift }
	wrong := func(c evidence.Cut) float64 { return c.Projected.QueuePerShift * c.Projected.FalseDiscoveryRate() }
	caught := func(c evidence.Cut) float64 { return c.Projected.QueuePerShift * c.Projected.Precision }
	line := func(what string, get func(evidence.Cut) float64) string {
		o, n := get(old), get(new)
		if !evidence.Defined(o) || !evidence.Defined(n) {
			return what + ": n/a"
		}
		return fmt.Sprintf("%s: about %s a shift, was about %s (%s)", what, About(n), About(o), moreOrFewer(About(n), About(o), n-o))
	}
	out := []string{
		line("alerts", alerts),
		line("wrong alerts", wrong),
		line("true cases caught", caught),
	}
	if oldFile.Assumptions.Costs != nil && newFile.Assumptions.Costs != nil {
		o, n := old.Projected.CostPerShift, new.Projected.CostPerShift
		d := format.MoneyDiff(n, o)
		change := "the same"
		switch {
		case d.Value > 0:
			change = strings.TrimPrefix(d.Text, "+") + " more"
		case d.Value < 0:
			change = strings.TrimPrefix(d.Text, "-") + " less"
		}
		out = append(out, fmt.Sprintf("cost: %s a shift, was %s (%s)", format.Money(n), format.Money(o), change))
	}
	against := func(f *decision.File, c evidence.Cut) string {
		if !(f.Assumptions.Capacity > 0) {
			return "no capacity given"
		}
		standing := format.Against(c.Projected.QueuePerShift, f.Assumptions.Capacity)
		if standing == "at capacity" || standing == format.NA {
			return standing + " (capacity " + format.Count(f.Assumptions.Capacity) + ")"
		}
		return standing + " a capacity of " + format.Count(f.Assumptions.Capacity)
	}
	if oldFile.Assumptions.Capacity > 0 || newFile.Assumptions.Capacity > 0 {
		out = append(out, fmt.Sprintf("against capacity: %s, was %s", against(newFile, new), against(oldFile, old)))
	}
	return out
}

// moreOrFewer says a change between two rounded counts in words that
// agree with them: "about 30 more", "about the same".
func moreOrFewer(newShown, oldShown string, d float64) string {
	switch {
	case newShown == oldShown:
		return "about the same"
	case d > 0:
		return "about " + About(d) + " more"
	default:
		return "about " + About(-d) + " fewer"
	}
}

func missingVolume(old, new *decision.File) string {
	switch {
	case !(old.Assumptions.Volume > 0) && !(new.Assumptions.Volume > 0):
		return "neither decision"
	case !(old.Assumptions.Volume > 0):
		return "the decision in production"
	default:
		return "the proposed decision"
	}
}

// againstCharts draws both decisions' curves on one trade-off chart and
// one ROC, with both chosen cuts marked.
func againstCharts(proposed, production *decision.File, newChosen, oldChosen decision.Candidate, opt AgainstOptions) ([]figure, string, error) {
	newHit, newWrong, newROC := curveLines(proposed.Curve, proposed.Data.Positives, proposed.Data.Negatives)
	oldHit, oldWrong, oldROC := curveLines(production.Curve, production.Data.Positives, production.Data.Negatives)
	missing := ""
	switch {
	case len(proposed.Curve) == 0 && len(production.Curve) == 0:
		missing = "Neither decision file keeps its curve, so only the two chosen cuts are drawn."
	case len(proposed.Curve) == 0:
		missing = "The proposed decision file keeps no curve; only its chosen cut is drawn."
	case len(production.Curve) == 0:
		missing = "The decision file in production keeps no curve; only its chosen cut is drawn."
	}
	newLabel, oldLabel := "proposed: "+newChosen.Name, "in production: "+oldChosen.Name
	tradeOff := chart{
		title: "Both decisions' trade-off", xLabel: "share of cases flagged", yLabel: "share", percentX: true, percentY: true,
		lines: []line{
			{legend: "hit share, proposed", points: newHit, kind: lineMain},
			{legend: "wrong-alert share, proposed", points: newWrong, kind: lineSecond},
			{legend: "hit share, in production", points: oldHit, kind: lineEarlier},
			{legend: "wrong-alert share, in production", points: oldWrong, kind: lineEarlier2},
		},
		marks: []mark{
			{label: newLabel, x: newChosen.Cut.FlaggedShare, y: newChosen.Cut.Recall, chosen: true},
			{x: newChosen.Cut.FlaggedShare, y: newChosen.Cut.FalseDiscoveryRate, chosen: true},
			{label: oldLabel, x: oldChosen.Cut.FlaggedShare, y: oldChosen.Cut.Recall},
			{x: oldChosen.Cut.FlaggedShare, y: oldChosen.Cut.FalseDiscoveryRate},
		},
	}
	rocChart := chart{
		title: "Both decisions' ROC", xLabel: "false positive rate", yLabel: "hit share (recall)", percentX: true, percentY: true, legendLowRight: true,
		lines: []line{
			{points: plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 1}}, kind: lineReference},
			{legend: "proposed", points: newROC, kind: lineMain},
			{legend: "in production", points: oldROC, kind: lineEarlier},
		},
		marks: []mark{
			{label: newLabel, x: newChosen.Cut.FalsePositiveRate, y: newChosen.Cut.Recall, chosen: true},
			{label: oldLabel, x: oldChosen.Cut.FalsePositiveRate, y: oldChosen.Cut.Recall},
		},
	}
	out, err := figures(
		tradeOff, "Proposed: thick lines, its chosen cut a filled square. In production: thin dotted lines, its chosen cut a ring.",
		rocChart, "Hit share against the false positive rate for both; the dashed diagonal is a ranking by chance.")
	return out, missing, err
}
