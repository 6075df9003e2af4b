package page

import (
	"fmt"
	"io"

	"gonum.org/v1/plot/plotter"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/review"
)

// againstView is the part of a page of two decisions that a page of one
// does not have.
type againstView struct {
	Facts    [][3]string // what, in production, proposed
	Changed  [][3]string // the assumptions that differ: what, in production, proposed
	Change   []string    // the change per shift in plain words
	NoChange string      // why there is no change per shift, when Change is empty
}

// WriteAgainst writes the page of change, the proposed decision beside
// the one in production (review.Against computes it; this page draws it):
// what each rests on, the assumptions that changed, the change per shift
// in plain words, both curves on one chart and both chosen cuts side by
// side with their figures and intervals.
func WriteAgainst(w io.Writer, change review.Change) error {
	proposed, production := change.New, change.Old
	newChosen, ok := proposed.ChosenCandidate()
	if !ok {
		return fmt.Errorf("page: chosen %q names no candidate", proposed.Chosen)
	}
	oldChosen, ok := production.ChosenCandidate()
	if !ok {
		return fmt.Errorf("page: chosen %q names no candidate", production.Chosen)
	}
	newName, oldName := change.NewPath, change.OldPath
	a := &againstView{Facts: change.Facts, Changed: change.Assumptions, Change: change.PerShift}
	if len(a.Change) == 0 {
		a.NoChange = "Not computed: both decisions need a number of cases per shift for the change per shift to be said; the shares below still compare."
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
	v.Table = render(change.Table, "in production")
	charts, missing, err := againstCharts(proposed, production, newChosen, oldChosen)
	if err != nil {
		return err
	}
	v.Charts, v.NoCurve = charts, missing
	return templates.ExecuteTemplate(w, "against", v)
}

// againstCharts draws both decisions' curves on one trade-off chart and
// one ROC, with both chosen cuts marked.
func againstCharts(proposed, production *decision.File, newChosen, oldChosen decision.Candidate) ([]figure, string, error) {
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
