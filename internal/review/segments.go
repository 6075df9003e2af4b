package review

import (
	"fmt"
	"math"
	"strconv"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
)

// SegmentLines says, for each candidate with a breakdown by group, which
// groups differ from the rest of the set (Outlier) and by how much: the
// gaps in hit share and wrong-alert share with their intervals and
// Holm-adjusted p-values, and beside a wrong-alert gap the group's base
// rate and the rest's (from the curve's totals, when the file holds its
// curve). A candidate whose groups all hold with the rest says so. A file
// written before groups were tested (no tests count) says what its flag
// meant. Nil when no candidate has a breakdown. Names are untrusted: the
// writers make the whole text printable.
func SegmentLines(f *decision.File) []string {
	var lines []string
	positives, cases := math.NaN(), math.NaN()
	if n := len(f.Curve); n > 0 {
		last := f.Curve[n-1]
		positives, cases = last.TP, last.TP+last.FP
	}
	level := 1 - f.Assumptions.Confidence
	for _, c := range f.Candidates {
		s := c.Segments
		if s == nil {
			continue
		}
		if lines == nil {
			if s.Tests > 0 {
				lines = append(lines, fmt.Sprintf("each group of %q against the rest of the set: gap (group less rest) with its %s interval (Newcombe's hybrid score), p adjusted by Holm over the %s; a group differs below %s, and with no real difference any group at all does so in about %s of validation sets",
					s.Column, format.Level(f.Assumptions.Confidence), tests(s.Tests), format.PValue(level), format.Level(level)))
			} else {
				lines = append(lines, fmt.Sprintf("groups of %q: this file was written before groups were tested against the rest of the set; its flag marks an interval clear of the whole set's", s.Column))
			}
		}
		differ := 0
		for _, g := range s.Groups {
			if !g.Outlier {
				continue
			}
			differ++
			line := fmt.Sprintf("%s: %s differs", oneLine(c.Name), oneLine(g.Name))
			if s.Tests > 0 {
				line += fmt.Sprintf(": hit gap %s (%s, adj. p %s), wrong gap %s (%s, adj. p %s)",
					format.Gap(g.RecallGap), format.GapInterval(g.RecallGapCI), format.PValue(g.RecallAdjustedP),
					format.Gap(g.FalseDiscoveryGap), format.GapInterval(g.FalseDiscoveryGapCI), format.PValue(g.FalseDiscoveryAdjustedP))
				if g.FalseDiscoveryAdjustedP < level {
					rest := (positives - g.Positives) / (cases - g.Positives - g.Negatives)
					line += fmt.Sprintf("; base rate %s against %s in the rest, and wrong-alert shares follow base rates", format.Share(g.Positives/(g.Positives+g.Negatives)), format.Share(rest))
				}
			}
			lines = append(lines, line)
		}
		if differ == 0 {
			lines = append(lines, fmt.Sprintf("%s: none of %d groups differs", oneLine(c.Name), len(s.Groups)+s.LeftOut))
		}
	}
	return lines
}

func tests(n int) string {
	if n == 1 {
		return "1 test"
	}
	return fmt.Sprintf("%d tests", n)
}

// PromiseLines say, for each candidate whose rule makes a promise, what
// it promises about production (decision.Candidate.Promise, as the file
// records it): hit= and wrong= meet their figure on the validation set
// only, hitNN= and wrongNN= hold it at their level; then, for a candidate
// the cost rule picked, how much its least-cost figure understates its
// cost (OptimismLine). Nil when no candidate has either.
func PromiseLines(f *decision.File) []string {
	var lines []string
	for _, c := range f.Candidates {
		if c.Promise != "" {
			lines = append(lines, fmt.Sprintf("%s (%s): %s", oneLine(c.Name), oneLine(c.Rule), oneLine(c.Promise)))
		}
		if c.Optimism != nil {
			lines = append(lines, fmt.Sprintf("%s (%s): %s", oneLine(c.Name), oneLine(c.Rule), OptimismLine(c)))
		}
	}
	return lines
}

// OptimismLine says by how much a least-cost candidate's projected cost
// understates its cost out of sample, per shift when the file has a
// volume, else per case, with the corrected cost and what the estimate
// rests on: "projected cost per shift 54,000 understates its own cost
// (...): about 4,643 more out of sample, 58,643 corrected (optimism
// estimate, ...)". "" without an optimism.
func OptimismLine(c decision.Candidate) string {
	o := c.Optimism
	if o == nil {
		return ""
	}
	per, cost, more, corrected := "case", c.Cut.Projected.CostPerCase, o.PerCase, o.CorrectedPerCase
	if !math.IsNaN(o.PerShift) {
		per, cost, more, corrected = "shift", c.Cut.Projected.CostPerShift, o.PerShift, o.CorrectedPerShift
	}
	return format.Projected + " cost per " + per + " " + format.Money(cost) + " understates its own cost (the cut was chosen on the same cases): about " +
		format.Money(more) + " more out of sample, " + format.Money(corrected) + " corrected (optimism estimate, " +
		oneLine(o.Method) + "; seed " + strconv.FormatUint(o.Seed, 10) + ")"
}
