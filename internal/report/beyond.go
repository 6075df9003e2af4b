package report

import (
	"fmt"
	"strings"

	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

// This file holds the figures beyond the averages (issue 6): segments,
// shift peaks, stability, calibration and the comparison of two models.
// Each is added to a Report after New by an Add method, and each shows in
// JSON under its own keys and in the text forms as a section after the
// table of cuts.

// section is a titled table with notes, rendered by the text and Markdown
// writers.
type section struct {
	title string
	table table
	notes []string
}

type segmentFigures struct {
	Segment      string    `json:"segment"`
	Rows         int       `json:"rows"`
	Positives    float64   `json:"positives"`
	Flagged      float64   `json:"flagged"`
	FlaggedShare number    `json:"flagged_share"`
	Recall       number    `json:"recall"`
	RecallCI     *interval `json:"recall_ci"`
	Precision    number    `json:"precision"`
	PrecisionCI  *interval `json:"precision_ci"`
	Outlier      bool      `json:"outlier"`
}

// AddSegments adds, under each met cut, the figures of every group of
// set's segment column (package segment), arranged in order. outcomes are
// the ones r was made from, in the same order. A set without a segment
// column adds nothing.
func (r *Report) AddSegments(set *scores.Set, outcomes []cutrule.Outcome, order segment.Order) {
	if set.SegmentOf == nil {
		return
	}
	conf := float64(r.Assumptions.Confidence)
	for i, o := range outcomes {
		if !o.Met || i >= len(r.Cuts) {
			continue
		}
		b := segment.At(set, o.Point, conf)
		b.Sort(order)
		list := make([]segmentFigures, 0, len(b.Segments))
		t := table{header: []string{"segment", "rows", "true cases", "flagged", "hit share", "interval", "precision", "interval", "note"}}
		for _, f := range b.Segments {
			list = append(list, segmentFigures{
				Segment: f.Segment, Rows: f.Rows, Positives: f.Positives, Flagged: f.Flagged,
				FlaggedShare: number(f.FlaggedShare),
				Recall:       number(f.Recall), RecallCI: newInterval(f.RecallCI),
				Precision: number(f.Precision), PrecisionCI: newInterval(f.PrecisionCI),
				Outlier: f.Outlier,
			})
			mark := ""
			if f.Outlier {
				mark = "outside"
			}
			t.rows = append(t.rows, []string{f.Segment, fmt.Sprint(f.Rows), Count(f.Positives), Percent(f.FlaggedShare),
				Percent(f.Recall), Range(f.RecallCI), Percent(f.Precision), Range(f.PrecisionCI), mark})
		}
		r.Cuts[i].Segments = list
		notes := []string{fmt.Sprintf("overall: hit share %s (%s), precision %s (%s)",
			Percent(b.Overall.Recall), Range(b.Overall.RecallCI), Percent(b.Overall.Precision), Range(b.Overall.PrecisionCI))}
		if n := b.Outliers(); n > 0 {
			notes = append(notes, fmt.Sprintf("%s marked \"outside\": hit-share or precision interval wholly outside the overall one", plural(n, "segment", "segments")))
		}
		r.sections = append(r.sections, section{
			title: fmt.Sprintf("segments (%s) at %s, cut %s", set.SegmentColumn, r.Cuts[i].Spec, Score(o.Point.Score)),
			table: t,
			notes: notes,
		})
	}
}

// writeSections writes the added sections as plain text.
func (r *Report) writeSections(b *strings.Builder) {
	for _, s := range r.sections {
		fmt.Fprintf(b, "\n\n%s\n", s.title)
		writeGrid(b, s.table)
		for _, n := range s.notes {
			b.WriteString("  " + n + "\n")
		}
	}
}

// writeSectionsMarkdown writes the added sections as Markdown tables.
func (r *Report) writeSectionsMarkdown(b *strings.Builder) {
	for _, s := range r.sections {
		fmt.Fprintf(b, "\n\n### %s\n\n", mdEscape(s.title))
		b.WriteString("| " + strings.Join(mdEscapeAll(s.table.header), " | ") + " |\n")
		b.WriteString("|" + strings.Repeat(" --- |", len(s.table.header)) + "\n")
		for _, row := range s.table.rows {
			b.WriteString("| " + strings.Join(mdEscapeAll(row), " | ") + " |\n")
		}
		for _, n := range s.notes {
			b.WriteString("\n- " + mdEscape(n))
		}
	}
}

type calibrationFigures struct {
	Binning string           `json:"binning"`
	Bins    []calibrationBin `json:"bins"`
	ECE     number           `json:"ece"`
	// CostThreshold is the score at which calibrated probabilities make
	// flagging cheaper than not (Elkan 2001), carried over to the
	// production base rate; null without costs.
	CostThreshold            number `json:"cost_threshold"`
	CostThresholdProbability number `json:"cost_threshold_probability"`
	// LeastCostCut is the empirical least-cost cut (the cost rule).
	LeastCostCut number `json:"least_cost_cut"`
}

type calibrationBin struct {
	Lower        float64 `json:"lower"`
	Upper        float64 `json:"upper"`
	MeanScore    number  `json:"mean_score"`
	ObservedRate number  `json:"observed_rate"`
	Count        int     `json:"count"`
}

// AddCalibration adds the reliability table of set (package calibration)
// in bins bins, the net benefit of every met cut at its own score as the
// threshold probability, and, when a has costs, Elkan's cost threshold
// beside the empirical least-cost cut. It adds nothing when set's scores
// are not probabilities, and returns an error only for bad bin options.
func (r *Report) AddCalibration(set *scores.Set, outcomes []cutrule.Outcome, bins int, binning calibration.Binning, a projection.Assumptions) error {
	if !calibration.Probabilities(set) {
		return nil
	}
	table, err := calibration.Reliability(set, bins, binning)
	if err != nil {
		return err
	}
	name := "width"
	if binning == calibration.Quantile {
		name = "quantile"
	}
	cf := &calibrationFigures{Binning: name, ECE: number(table.ECE), CostThreshold: null, CostThresholdProbability: null, LeastCostCut: null}
	t := tableOf("bin", "rows", "mean score", "observed rate", "gap")
	for _, b := range table.Bins {
		cf.Bins = append(cf.Bins, calibrationBin{Lower: b.Lower, Upper: b.Upper, MeanScore: number(b.MeanScore), ObservedRate: number(b.ObservedRate), Count: b.Count})
		t.rows = append(t.rows, []string{Fixed(b.Lower, 3) + "–" + Fixed(b.Upper, 3), fmt.Sprint(b.Count), Fixed(b.MeanScore, 3), Fixed(b.ObservedRate, 3), Fixed(b.ObservedRate-b.MeanScore, 3)})
	}
	notes := []string{"expected calibration error (ECE) " + Fixed(table.ECE, 4) + ": the mean of |observed rate - mean score| over the bins, weighted by their cases"}
	if c := a.Costs; c != nil {
		p := calibration.CostThreshold(*c)
		cf.CostThresholdProbability = number(p)
		cf.CostThreshold = number(calibration.ShiftThreshold(p, float64(r.BaseRate), a.BaseRate))
		if least, err := cutrule.Find([]cutrule.Rule{{Kind: cutrule.Cost}}, curve.New(set), a); err == nil && least[0].Met {
			cf.LeastCostCut = number(least[0].Point.Score)
		}
		line := "cost threshold (Elkan 2001) " + Fixed(float64(cf.CostThreshold), 3) + ", if the scores are calibrated probabilities"
		if r.baseRateGiven {
			line += " (probability " + Fixed(p, 3) + " at the production base rate)"
		}
		notes = append(notes, line, "empirical least-cost cut "+Score(float64(cf.LeastCostCut)))
		r.beyond.costThreshold = float64(cf.CostThreshold)
	}
	for i, o := range outcomes {
		if !o.Met || i >= len(r.Cuts) {
			continue
		}
		nb := number(calibration.NetBenefit(o.Point, o.Point.Score))
		r.Cuts[i].NetBenefit = &nb
		notes = append(notes, fmt.Sprintf("net benefit at %s (threshold probability %s): %s per case, against %s for flagging every case",
			r.Cuts[i].Spec, Score(o.Point.Score), Fixed(float64(nb), 4), Fixed(calibration.NetBenefitAll(float64(r.BaseRate), o.Point.Score), 4)))
	}
	r.Calibration = cf
	r.sections = append(r.sections, section{title: fmt.Sprintf("calibration: reliability table, %s bins (%s)", fmt.Sprint(bins), name), table: t, notes: notes})
	return nil
}

func tableOf(header ...string) table { return table{header: header} }

// beyondState is what the Add methods share between them.
type beyondState struct {
	costThreshold float64 // Elkan's threshold on the score scale, 0 when not computed
}
