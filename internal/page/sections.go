package page

import (
	"fmt"
	"math"
	"strings"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
)

// notComputed begins the text of a part of the evidence the file does not
// hold.
const notComputed = "Not computed for this decision: "

// model names the model the file records.
func model(f *decision.File) string {
	m := f.Model
	switch {
	case m.Name == "" && m.Version == "":
		return "not recorded in this file"
	case m.Version == "":
		return m.Name + " (version not recorded)"
	case m.Name == "":
		return "version " + m.Version + " (name not recorded)"
	}
	return m.Name + ", version " + m.Version
}

func chosenBy(f *decision.File) string {
	if f.ChosenBy == "" {
		return "not recorded in this file"
	}
	return f.ChosenBy
}

// stability is where each candidate's rule landed across the bootstrap.
func stability(f *decision.File) section {
	s := section{ID: "stability", Title: "Stability"}
	for _, c := range ordered(f) {
		st := c.Stability
		if st == nil {
			continue
		}
		if s.Intro == "" {
			s.Intro = fmt.Sprintf("Where each rule's cut lands when the validation set is drawn again, %d times (seed %d): the spread of each figure over the draws in which the rule was met.", st.Replicates, st.Seed)
			s.Header = []string{"candidate", "met in", "cut", "share flagged where the rule lands", "hit share where the rule lands"}
		}
		name := c.Name
		if c.Name == f.Chosen {
			name += " (chosen)"
		}
		if st.Skipped != "" {
			status := "not resampled"
			if st.Skipped == decision.SkippedByHand {
				status = "no rule: the cut stays put" // its redraws at the cut are in the table above
			}
			s.Rows = append(s.Rows, []string{name, status, "", "", ""})
			s.Note += name + ": " + st.Skipped + ". "
			continue
		}
		s.Rows = append(s.Rows, []string{name, fmt.Sprintf("%d of %d", st.Met, st.Replicates),
			scoreRange(st.Score), format.Interval(st.FlaggedShare), format.Interval(st.Recall)})
	}
	s.Note = strings.TrimSpace(s.Note)
	if s.Rows == nil {
		s.Missing = notComputed + "the validation set was not drawn again, so how far each cut would move on another sample is not shown."
	}
	return s
}

// scoreRange is the range of a cut over the draws, to three significant
// digits: the ends are percentiles between draws, not cuts of the data.
func scoreRange(r [2]float64) string {
	if format.Score(r[0]) == format.NA || format.Score(r[1]) == format.NA {
		return format.NA
	}
	return format.Significant(r[0], 3) + " to " + format.Significant(r[1], 3)
}

// segments lists, for each candidate, the groups that differ from the
// rest of the set.
func segments(f *decision.File) section {
	s := section{ID: "segments", Title: "Segments"}
	computed, tested := false, false
	for _, c := range ordered(f) {
		seg := c.Segments
		if seg == nil {
			continue
		}
		tested = tested || seg.Tests > 0
		if !computed {
			computed = true
			s.Header = []string{"candidate", "group", "rows", "hit share", "interval", "hit gap", "interval", "adj. p", "wrong gap", "interval", "adj. p"}
		}
		name := c.Name
		if c.Name == f.Chosen {
			name += " (chosen)"
		}
		flagged := 0
		for _, g := range seg.Groups {
			if !g.Outlier {
				continue
			}
			flagged++
			s.Rows = append(s.Rows, []string{name, g.Name, format.Count(float64(g.Rows)), format.Share(g.Recall), format.Interval(g.RecallCI),
				format.Gap(g.RecallGap), format.GapInterval(g.RecallGapCI), format.PValue(g.RecallAdjustedP),
				format.Gap(g.FalseDiscoveryGap), format.GapInterval(g.FalseDiscoveryGapCI), format.PValue(g.FalseDiscoveryAdjustedP)})
		}
		if flagged == 0 {
			s.Rows = append(s.Rows, []string{name, fmt.Sprintf("none of %d groups differs", len(seg.Groups)), "", "", "", "", "", "", "", "", ""})
		}
		if seg.LeftOut > 0 {
			s.Note = fmt.Sprintf("Groups beyond the largest ones were not kept in the file (%d left out).", seg.LeftOut)
		}
	}
	switch {
	case !computed:
		s.Missing = notComputed + "no breakdown by segment, so no group is checked for standing apart."
	case tested:
		s.Intro = fmt.Sprintf("Each candidate broken down by %q, each group set against the rest of the set. A group is listed when its hit share or its wrong-alert share differs from the rest's: "+
			"the gap (group less rest) with its %s interval (Newcombe's hybrid score), and its p-value adjusted by Holm over every group's two tests, below %s. "+
			"With no real difference, any group at all is listed in about %s of validation sets. "+
			"A wrong-alert share follows its group's base rate: a group with fewer true cases has more wrong alerts at the same cut even where the model ranks as well.",
			firstColumn(f), format.Level(f.Assumptions.Confidence), format.PValue(1-f.Assumptions.Confidence), format.Level(1-f.Assumptions.Confidence))
	default:
		s.Intro = fmt.Sprintf("Each candidate broken down by %q. This file was written before groups were tested against the rest of the set: a group is listed when its hit-share or wrong-alert-share interval lies clear of the whole set's, which flags some group by chance alone more often as groups grow in number.", firstColumn(f))
	}
	return s
}

// firstColumn is the segment column of the first candidate with a
// breakdown.
func firstColumn(f *decision.File) string {
	for _, c := range ordered(f) {
		if c.Segments != nil {
			return c.Segments.Column
		}
	}
	return ""
}

// calibration is the reliability table of scores read as probabilities.
func calibration(f *decision.File) section {
	s := section{ID: "calibration", Title: "Calibration"}
	cal := f.Calibration
	if cal == nil {
		s.Missing = notComputed + "the scores are not probabilities in [0, 1] with higher riskier, or the file was written before calibration was kept."
		return s
	}
	s.Intro = "Scores read as probabilities against the share of true cases among the cases with such scores (" + cal.Binning + " bins). " +
		"Expected calibration error: " + format.Share(cal.ECE) + eceNoise(cal.ECENoise) + "."
	if ct := cal.CostThreshold; ct != nil {
		s.Intro += " Under the costs, flagging a case costs less than leaving it above a probability of " + format.Share(ct.Probability) +
			", which is a score of " + format.Significant(ct.Score, 3) + " on the validation set's scale."
	}
	s.Header = []string{"scores", "rows", "mean score", "share true"}
	for _, b := range cal.Bins {
		s.Rows = append(s.Rows, []string{format.Score(format.Rounded(b.Lower, 3)) + " to " + format.Score(format.Rounded(b.Upper, 3)),
			format.Count(float64(b.Rows)), format.Share(b.MeanScore), format.Share(b.ObservedRate)})
	}
	return s
}

// shiftSchedule says how case times were placed in shifts.
func shiftSchedule(f *decision.File) string {
	s := f.ShiftSchedule
	if s == nil {
		return "not given: no real shifts were counted"
	}
	text := "starting " + strings.Join(s.Starts, ", ") + " (" + s.Zone + ")"
	if s.TimeColumn != "" {
		text += fmt.Sprintf(", case times from column %q", s.TimeColumn)
	}
	return text
}

// signOffs are the file's sign-offs in the order given; one given for an
// earlier choice says so.
func signOffs(f *decision.File) []signOff {
	var out []signOff
	for _, s := range f.SignOffs {
		verdict := string(s.Verdict)
		if !f.ForCurrentChoice(s) {
			verdict += " (given for the earlier choice " + s.Chosen + ", score " + format.Score(s.ChosenScore) + ")"
		}
		role := s.Role
		if role == "" {
			role = "not given"
		}
		out = append(out, signOff{Name: s.Name, Role: role, Verdict: verdict, Note: s.Note, At: s.At.UTC().Format("2006-01-02 15:04")})
	}
	return out
}

// eceNoise puts the ECE's noise level at the set's size beside it; nothing
// for a file written before it was kept.
func eceNoise(noise float64) string {
	if math.IsNaN(noise) {
		return ""
	}
	return ", against a noise level at this size of about " + format.Share(noise) +
		" (9 in 10 sets of perfectly calibrated scores of this size stay below it)"
}
