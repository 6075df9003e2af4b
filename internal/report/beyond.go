package report

import (
	"fmt"
	"strings"

	"github.com/sill-tool/sill/internal/cutrule"
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
