package report

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// This file holds the figures beyond the averages (issue 6): segments,
// shift peaks, stability, calibration and the comparison of two models.
// Each is added to a Report by New from the analysis result, by an add method, and each shows in
// JSON under its own keys and in the text forms as a section after the
// table of cuts.

// section is a titled table with notes, rendered by the text and Markdown
// writers.
type section struct {
	title string
	table table
	notes []string
	// text, when set, is the plain-text body written instead of table,
	// and the notes are wrapped to textWidth: for sections laid out to
	// fit a terminal of 80 columns (the segments). Markdown keeps table.
	text string
}

// textWidth is the width the plain-text segments section fits.
const textWidth = 80

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
	// Outlier is the group's flag: it differs from the rest of the set in
	// recall or wrong-alert share (see RecallGap and FalseDiscoveryGap).
	Outlier bool `json:"outlier"`

	BaseRate          number   `json:"base_rate"`
	RestBaseRate      number   `json:"rest_base_rate"`
	RecallGap         groupGap `json:"recall_gap"`
	FalseDiscoveryGap groupGap `json:"false_discovery_rate_gap"`
}

// groupGap is a group's figure against the rest of the set's.
type groupGap struct {
	Rest      number    `json:"rest"`
	Gap       number    `json:"gap"`
	GapCI     *interval `json:"gap_ci"`
	P         number    `json:"p"`
	AdjustedP number    `json:"adjusted_p"`
}

func newGroupGap(t segment.Test) groupGap {
	return groupGap{Rest: number(t.Rest), Gap: number(t.Gap), GapCI: newInterval(t.GapCI), P: number(t.P), AdjustedP: number(t.AdjustedP)}
}

// segmentTests says how the groups of one cut were tested.
type segmentTests struct {
	Against    string  `json:"against"`
	Interval   string  `json:"interval"`
	Adjustment string  `json:"adjustment"`
	Tests      int     `json:"tests"`
	Level      float64 `json:"level"`
}

// segmentTestWords say how groups are tested, in the notes of every form.
func segmentTestWords(b segment.Breakdown) string {
	return fmt.Sprintf("gap: the group's figure less the rest of the set's, with its %s interval (Newcombe's hybrid score), not adjusted: it leaves out 0 exactly when the unadjusted p is below %s; "+
		"adj. p: adjusted by Holm over the %s, so that with no real difference any flag at all comes in about %s of runs (for cases drawn at random; less often where each group's true and false cases were counted out by design)",
		format.Level(b.Confidence), format.PValue(1-b.Confidence), format.Plural(b.Tests, "test", "tests"), format.Level(1-b.Confidence))
}

// baseRateNote is the note beside a wrong-alert gap: shares of wrong
// alerts follow the base rate.
func baseRateNote(b segment.Breakdown, f segment.Figures) string {
	return fmt.Sprintf("base rate %s, rest %s", format.Share(f.BaseRate()), format.Share(b.RestBaseRate(f)))
}

// addSegments adds, under each met cut, the figures of every group of the
// set's segment column (res.Segments), arranged in order. The text forms
// show the first shown groups (every group when shown <= 0) and count the
// rest; JSON lists them all. A set without a segment column adds nothing.
func (r *Report) addSegments(res *analysis.Result, order segment.Order, shown int) {
	if res.Segments == nil {
		return
	}
	set := res.Set
	for i, o := range res.Outcomes {
		if !o.Met || i >= len(r.Cuts) {
			continue
		}
		b := res.Segments[i]
		b.Segments = slices.Clone(b.Segments)
		b.Sort(order)
		list := make([]segmentFigures, 0, len(b.Segments))
		t := table{header: []string{"segment", "rows", "true cases", "flagged", "hit share", "interval", "wrong-alert share", "interval",
			"hit gap", "interval", "adj. p", "wrong gap", "interval", "adj. p", "note"}, wordsLast: true}
		hidden, hiddenOutside := 0, 0
		var shownGroups []segment.Figures
		for k, f := range b.Segments {
			list = append(list, segmentFigures{
				Segment: f.Segment, Rows: f.Rows, Positives: f.Positives, Flagged: f.Flagged,
				FlaggedShare: number(f.FlaggedShare),
				Recall:       number(f.Recall), RecallCI: newInterval(f.RecallCI),
				Precision: number(f.Precision), PrecisionCI: newInterval(f.PrecisionCI),
				Outlier:  f.Outlier,
				BaseRate: number(f.BaseRate()), RestBaseRate: number(b.RestBaseRate(f)),
				RecallGap: newGroupGap(f.RecallTest), FalseDiscoveryGap: newGroupGap(f.FalseDiscoveryTest),
			})
			if shown > 0 && k >= shown {
				hidden++
				if f.Outlier {
					hiddenOutside++
				}
				continue
			}
			shownGroups = append(shownGroups, f)
			mark := ""
			if f.Outlier {
				mark = "differs"
			}
			if f.FalseDiscoveryTest.AdjustedP < 1-b.Confidence {
				mark += "; " + baseRateNote(b, f)
			}
			rt, ft := f.RecallTest, f.FalseDiscoveryTest
			t.rows = append(t.rows, []string{f.Segment, fmt.Sprint(f.Rows), format.Count(f.Positives), format.Share(f.FlaggedShare),
				format.Share(f.Recall), format.Interval(f.RecallCI), format.Share(f.FalseDiscoveryRate()), format.Interval(f.FalseDiscoveryCI()),
				format.Gap(rt.Gap), format.GapInterval(rt.GapCI), format.PValue(rt.AdjustedP),
				format.Gap(ft.Gap), format.GapInterval(ft.GapCI), format.PValue(ft.AdjustedP), mark})
		}
		r.Cuts[i].Segments = list
		r.Cuts[i].SegmentTests = &segmentTests{Against: "rest of the set", Interval: "newcombe hybrid score", Adjustment: "holm",
			Tests: b.Tests, Level: 1 - b.Confidence}
		notes := []string{fmt.Sprintf("overall: hit share %s (%s), wrong-alert share %s (%s)",
			format.Share(b.Overall.Recall), format.Interval(b.Overall.RecallCI), format.Share(b.Overall.FalseDiscoveryRate()), format.Interval(b.Overall.FalseDiscoveryCI()))}
		notes = append(notes, segmentTestWords(b))
		if n := b.Outliers(); n > 0 {
			notes = append(notes, fmt.Sprintf("%s marked \"differs\": hit share or wrong-alert share differs from the rest of the set (adj. p below %s)", format.Plural(n, "segment", "segments"), format.PValue(1-b.Confidence)))
		}
		notes = append(notes, "a wrong-alert share follows its group's base rate: groups with fewer true cases have more wrong alerts at the same cut even where the model ranks as well, so a wrong gap may come from the mix of cases")
		if hidden > 0 {
			word := "segments"
			if hidden == 1 {
				word = "segment"
			}
			note := fmt.Sprintf("%d more %s not shown (%d of them differ)", hidden, word, hiddenOutside)
			if r.hints.AllSegments != "" {
				note += "; " + r.hints.AllSegments
			}
			notes = append(notes, note)
		}
		r.sections = append(r.sections, section{
			title: fmt.Sprintf("segments (%s) at %s, cut %s", set.SegmentColumn(), r.Cuts[i].Spec, format.Score(o.Point.Score)),
			table: t,
			notes: notes,
			text:  segmentText(b, shownGroups),
		})
	}
}

// segmentText lays out the groups of b for plain text within textWidth
// columns, where the table of every figure side by side would run past
// it: a line naming each group (marked "differs" when flagged), a line of
// its counts and base rates beside the rest's, then its hit share and its
// wrong-alert share, each with its interval, its gap from the rest of the
// set, the gap's interval and the adjusted p, aligned across groups under
// one heading.
func segmentText(b segment.Breakdown, groups []segment.Figures) string {
	header := []string{"", "share", "interval", "gap", "interval", "adj. p"}
	rows := make([][]string, 0, 2*len(groups))
	for _, f := range groups {
		rt, ft := f.RecallTest, f.FalseDiscoveryTest
		rows = append(rows,
			[]string{"  hit share", format.Share(f.Recall), format.Interval(f.RecallCI), format.Gap(rt.Gap), format.GapInterval(rt.GapCI), format.PValue(rt.AdjustedP)},
			[]string{"  wrong-alert share", format.Share(f.FalseDiscoveryRate()), format.Interval(f.FalseDiscoveryCI()), format.Gap(ft.Gap), format.GapInterval(ft.GapCI), format.PValue(ft.AdjustedP)})
	}
	widths := make([]int, len(header))
	for _, row := range append([][]string{header}, rows...) {
		for i, cell := range row {
			widths[i] = max(widths[i], format.CellWidth(cell))
		}
	}
	var out strings.Builder
	out.WriteString(format.GridRow(header, widths, false))
	for k, f := range groups {
		name := f.Segment
		if f.Outlier {
			name += " · differs"
		}
		out.WriteString(format.Printable(name) + "\n")
		out.WriteString(format.Wrap(fmt.Sprintf("%s · %s · %s flagged · base rate %s (rest %s)", format.Plural(f.Rows, "row", "rows"),
			amount(f.Positives, "true case", "true cases"), format.Share(f.FlaggedShare), format.Share(f.BaseRate()), format.Share(b.RestBaseRate(f))),
			textWidth, "  ", "    "))
		out.WriteString(format.GridRow(rows[2*k], widths, false))
		out.WriteString(format.GridRow(rows[2*k+1], widths, false))
	}
	return out.String()
}

// writeSections writes the added sections as plain text.
func (r *Report) writeSections(b *strings.Builder) {
	for _, s := range r.sections {
		fmt.Fprintf(b, "\n\n%s\n", s.title)
		if s.text == "" {
			writeGrid(b, s.table)
			for _, n := range s.notes {
				b.WriteString("  " + n + "\n")
			}
			continue
		}
		b.WriteString(s.text)
		for _, n := range s.notes {
			b.WriteString(format.Wrap(n, textWidth, "  ", "    "))
		}
	}
}

// writeSectionsMarkdown writes the added sections as Markdown tables.
func (r *Report) writeSectionsMarkdown(b *strings.Builder) {
	for _, s := range r.sections {
		fmt.Fprintf(b, "\n\n### %s\n\n", format.Markdown(s.title))
		b.WriteString("| " + strings.Join(format.MarkdownCells(s.table.header), " | ") + " |\n")
		b.WriteString("|" + strings.Repeat(" --- |", len(s.table.header)) + "\n")
		for _, row := range s.table.rows {
			b.WriteString("| " + strings.Join(format.MarkdownCells(row), " | ") + " |\n")
		}
		for _, n := range s.notes {
			b.WriteString("\n- " + format.Markdown(n))
		}
	}
}

type calibrationFigures struct {
	Binning string           `json:"binning"`
	Bins    []calibrationBin `json:"bins"`
	ECE     number           `json:"ece"`
	// ECENoise is the ECE that 9 in 10 perfectly calibrated sets of this
	// size and score distribution stay at or below; ECENoiseMean their
	// mean (calibration.NoiseLevel).
	ECENoise     number `json:"ece_noise"`
	ECENoiseMean number `json:"ece_noise_mean"`
	// NetBenefitThreshold is net benefit's threshold probability, the same
	// for every cut; NetBenefitThresholdFrom says where it comes from:
	// "costs" or "base rate" (no costs given).
	NetBenefitThreshold     number `json:"net_benefit_threshold"`
	NetBenefitThresholdFrom string `json:"net_benefit_threshold_from"`
	// NetBenefitBaseRate is the base rate net benefit is computed at:
	// production's.
	NetBenefitBaseRate number `json:"net_benefit_base_rate"`
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

// addCalibration adds the reliability table of res (analysis.Calibration),
// the net benefit of every met cut at its own score as the threshold
// probability, and, when res has costs, Elkan's cost threshold beside the
// empirical least-cost cut. It adds nothing when the scores are not
// probabilities.
func (r *Report) addCalibration(res *analysis.Result) {
	cal := res.Calibration
	if cal == nil {
		return
	}
	table, binning, bins := cal.Table, cal.Table.Binning, cal.Bins
	name := "width"
	if binning == calibration.Quantile {
		name = "quantile"
	}
	cf := &calibrationFigures{Binning: name, ECE: number(table.ECE), ECENoise: number(table.Noise), ECENoiseMean: number(table.NoiseMean),
		NetBenefitThreshold: number(cal.Threshold), NetBenefitThresholdFrom: "base rate", NetBenefitBaseRate: number(res.Assume.BaseRate),
		CostThreshold: null, CostThresholdProbability: null, LeastCostCut: null}
	if cal.ThresholdFromCosts {
		cf.NetBenefitThresholdFrom = "costs"
	}
	t := tableOf("bin", "rows", "mean score", "observed rate", "gap")
	for _, b := range table.Bins {
		cf.Bins = append(cf.Bins, calibrationBin{Lower: b.Lower, Upper: b.Upper, MeanScore: number(b.MeanScore), ObservedRate: number(b.ObservedRate), Count: b.Count})
		t.rows = append(t.rows, []string{format.Number(b.Lower, 3) + "–" + format.Number(b.Upper, 3), fmt.Sprint(b.Count), format.Number(b.MeanScore, 3), format.Number(b.ObservedRate, 3), format.NumberDiff(b.ObservedRate, b.MeanScore, 3).Text})
	}
	notes := []string{"expected calibration error (ECE) " + format.Number(table.ECE, 4) + ": the mean of |observed rate - mean score| over the bins, weighted by their cases",
		"ECE noise level at this size about " + format.Number(table.Noise, 4) + ": 9 in 10 sets of perfectly calibrated scores of this size and score spread stay at or below it (mean " +
			format.Number(table.NoiseMean, 4) + "; labels drawn as Bernoulli(score), 1,000 seeded runs); an ECE below it cannot be told from noise"}
	if c := cal.Cost; c != nil {
		p := c.Probability
		cf.CostThresholdProbability = number(p)
		cf.CostThreshold = number(c.Score)
		if c.LeastCost.Met {
			cf.LeastCostCut = number(c.LeastCost.Point.Score)
		}
		line := "cost threshold (Elkan 2001) " + format.Number(float64(cf.CostThreshold), 3) + ", if the scores are calibrated probabilities"
		if r.baseRateGiven {
			line += " (probability " + format.Number(p, 3) + " at the production base rate)"
		}
		least := "empirical least-cost cut " + format.Score(float64(cf.LeastCostCut)) + " on the validation set"
		if r.hints.Resampling != "" {
			least += "; " + r.hints.Resampling + ", a warning says when the cost threshold lies outside the range where the least-cost cut lands in resampled sets"
		}
		notes = append(notes, line, least)
		r.beyond.costThreshold = float64(cf.CostThreshold)
	}
	basis := "from the costs, false alert / (false alert + miss - hit), so net benefit ranks the cuts as their cost does"
	if !cal.ThresholdFromCosts {
		basis = "the base rate, as no costs are given: net benefit is then the base rate times (recall - false positive rate)"
	}
	rate, threshold := format.Share(res.Assume.BaseRate), cal.Threshold
	if r.baseRateUndefined {
		// No weighted case: no base rate, and no threshold taken from it.
		rate, cf.NetBenefitBaseRate = undefinedBaseRate, null
		if !cal.ThresholdFromCosts {
			threshold, cf.NetBenefitThreshold = math.NaN(), null
		}
	}
	notes = append(notes, "net benefit (Vickers and Elkin 2006) at production's base rate "+rate+
		" and threshold probability "+format.Number(threshold, 4)+", "+basis)
	for i, o := range res.Outcomes {
		if !o.Met || i >= len(r.Cuts) {
			continue
		}
		nb := number(cal.NetBenefit[i])
		r.Cuts[i].NetBenefit = &nb
		notes = append(notes, fmt.Sprintf("net benefit at %s: %s per case, against %s for flagging every case and 0 for none",
			r.Cuts[i].Spec, format.Number(float64(nb), 4), format.Number(cal.NetBenefitAll[i], 4)))
	}
	r.Calibration = cf
	binsOf := "of equal width"
	if binning == calibration.Quantile {
		binsOf = "of about equal rows"
	}
	r.sections = append(r.sections, section{title: fmt.Sprintf("calibration: reliability table, %d bins %s", bins, binsOf), table: t, notes: notes})
}

func tableOf(header ...string) table { return table{header: header} }

// beyondState is what the Add methods share between them.
type beyondState struct {
	costThreshold float64 // Elkan's threshold on the score scale, 0 when not computed
}

type shiftFigures struct {
	// Mean is the mean queue per shift; P90 and OverCapacityShare are
	// the shift-peak model's (package shift): production's counting noise
	// plus the real spread between shifts estimated beyond the sample's.
	Mean              number `json:"mean"`
	P90               number `json:"p90"`
	OverCapacityShare number `json:"over_capacity_share"`
	// Max and BusiestShift are the sample's: its longest scaled queue of a
	// real shift and that shift's local start (RFC 3339).
	Max          number `json:"max"`
	BusiestShift string `json:"busiest_shift"`
	// The sample's own scaled counts over its whole shifts.
	SampleP90               number `json:"sample_p90"`
	SampleOverCapacityShare number `json:"sample_over_capacity_share"`
	SampleWholeShifts       int    `json:"sample_whole_shifts"`
	// What the model rests on: the cases of a production shift, the set's
	// flagged cases per shift, the relative spread of the expected queue
	// between shifts taken (0: none), the spreads estimated from the
	// alerts and from the cases per shift and whether each tells shifts
	// apart from noise, the alert rate's spread, and the words.
	Volume              number `json:"model_volume"`
	FlaggedPerShift     number `json:"sample_flagged_per_shift"`
	Spread              number `json:"model_spread"`
	AlertSpread         number `json:"alert_spread"`
	AlertSpreadDistinct bool   `json:"alert_spread_distinct"`
	CaseSpread          number `json:"case_spread"`
	CaseSpreadDistinct  bool   `json:"case_spread_distinct"`
	RateSpread          number `json:"rate_spread"`
	Basis               string `json:"basis"`
}

type shiftSchedule struct {
	Schedule   string `json:"schedule"`
	TimeZone   string `json:"time_zone"`
	Shifts     int    `json:"shifts"`
	FirstShift string `json:"first_shift"`
	LastShift  string `json:"last_shift"`
	// Scaled reports whether queues are scaled to the production volume
	// (see package shift); AlertsPerTrueCase and AlertsPerFalseCase are
	// the scale.
	Scaled             bool    `json:"scaled"`
	AlertsPerTrueCase  float64 `json:"alerts_per_true_case"`
	AlertsPerFalseCase float64 `json:"alerts_per_false_case"`
	// CoveredShifts is the covered time in shifts' worth (partial first
	// and last shifts count by their covered share), GapShifts the empty
	// shifts left out as a gap in the data.
	CoveredShifts float64 `json:"covered_shifts"`
	GapShifts     int     `json:"gap_shifts"`
}

// addShiftPeaks adds, under each met cut, the queues of the real shifts of
// the validation period (res.Shifts): mean, 90th percentile, maximum and
// the share of shifts over capacity, scaled as res.Shifts.Scale says.
func (r *Report) addShiftPeaks(res *analysis.Result) {
	if res.Shifts == nil {
		return
	}
	assigned, scale := res.Shifts.Assigned, res.Shifts.Scale
	capacity := float64(r.Assumptions.Capacity)
	if !evidence.Defined(capacity) {
		capacity = 0
	}
	scaled := evidence.Defined(float64(r.Assumptions.Volume))
	r.ShiftSchedule = &shiftSchedule{
		Schedule: assigned.Schedule.String(), TimeZone: assigned.Schedule.Location.String(), Shifts: assigned.Count,
		Scaled: scaled, AlertsPerTrueCase: scale.Positive, AlertsPerFalseCase: scale.Negative,
		CoveredShifts: assigned.Covered(), GapShifts: assigned.Gaps,
	}
	if assigned.Count > 0 {
		r.ShiftSchedule.FirstShift = assigned.Start(0).Format(time.RFC3339)
		r.ShiftSchedule.LastShift = assigned.Start(assigned.Count - 1).Format(time.RFC3339)
	}
	t := tableOf("cut", "mean", "9 in 10 shifts at most")
	if capacity > 0 {
		t.header = append(t.header, "shifts over "+format.Count(capacity))
	}
	t.header = append(t.header, "sample: 9 in 10", "sample: busiest", "busiest shift")
	var bases []string
	for i, o := range res.Outcomes {
		if i >= len(r.Cuts) {
			continue
		}
		if !o.Met {
			undefinedP90, undefinedMax := null, null
			r.Cuts[i].Projected.QueuePerShiftP90, r.Cuts[i].Projected.QueuePerShiftMax = &undefinedP90, &undefinedMax
			continue
		}
		p := res.Shifts.Peaks[i]
		m := p.Model
		f := &shiftFigures{Mean: number(p.Mean), P90: number(p.P90), Max: number(p.Max), OverCapacityShare: number(p.OverCapacity),
			SampleP90: number(p.Sample.P90), SampleOverCapacityShare: number(p.Sample.OverCapacity), SampleWholeShifts: p.Sample.Whole,
			Volume: number(m.Volume), FlaggedPerShift: number(m.Flagged), Spread: number(m.Spread),
			AlertSpread: number(m.Queue.Relative), AlertSpreadDistinct: m.Queue.Distinct, CaseSpread: number(m.Cases.Relative), CaseSpreadDistinct: m.Cases.Distinct,
			RateSpread: number(m.RateSpread), Basis: m.Basis()}
		if p.Busiest >= 0 {
			f.BusiestShift = assigned.Start(p.Busiest).Format(time.RFC3339)
		}
		r.Cuts[i].Shifts = f
		p90, peak := f.P90, f.Max
		r.Cuts[i].Projected.QueuePerShiftP90, r.Cuts[i].Projected.QueuePerShiftMax = &p90, &peak
		row := []string{r.Cuts[i].Spec, format.Number(p.Mean, 1), format.Number(p.P90, 0)}
		if capacity > 0 {
			row = append(row, format.Share(p.OverCapacity))
		}
		row = append(row, format.Number(p.Sample.P90, 1), format.Number(p.Max, 1), busiestLabel(assigned, p.Busiest))
		t.rows = append(t.rows, row)
		bases = append(bases, r.Cuts[i].Spec+": "+m.Basis())
	}
	notes := []string{fmt.Sprintf("%s shifts starting %s (%s), from %s to %s, covering %s shifts' worth (the first and last shift count by the time the set covers%s)",
		format.Count(float64(assigned.Count)), assigned.Schedule.String(), assigned.Schedule.Location.String(), r.ShiftSchedule.FirstShift, r.ShiftSchedule.LastShift,
		format.Number(assigned.Covered(), 1), gapWords(assigned.Gaps)),
		"mean, 9 in 10 shifts and shifts over capacity are production's under the shift-peak model: its own counting noise at the volume, plus the real spread between shifts that the set shows beyond its sampling noise; the sample's columns are the set's own scaled counts per shift, mostly sampling noise when it holds few cases a shift"}
	notes = append(notes, bases...)
	if scaled {
		notes = append(notes, fmt.Sprintf("scaled to %s cases per shift: the validation set is taken as an even sample of the period, so each flagged true case counts %.3g alerts and each false one %.3g",
			format.Count(float64(r.Assumptions.Volume)), scale.Positive, scale.Negative))
	} else {
		own := "the validation set's own counts per shift"
		if r.hints.Volume != "" {
			own += " (" + r.hints.Volume + " to scale them to production)"
		}
		notes = append(notes, own)
	}
	r.sections = append(r.sections, section{title: "queue per real shift of the validation period", table: t, notes: notes})
}

func busiestLabel(a shift.Assignment, i int) string {
	if i < 0 {
		return "n/a"
	}
	return a.Start(i).Format("Mon 2006-01-02 15:04")
}

type stability struct {
	ScoreP05        number `json:"score_p05"`
	ScoreP95        number `json:"score_p95"`
	FlaggedShareP05 number `json:"flagged_share_p05"`
	FlaggedShareP95 number `json:"flagged_share_p95"`
	RecallP05       number `json:"recall_p05"`
	RecallP95       number `json:"recall_p95"`
	// The wrong-alert share at the rule's cut in the replicates.
	FalseDiscoveryRateP05 number `json:"false_discovery_rate_p05"`
	FalseDiscoveryRateP95 number `json:"false_discovery_rate_p95"`
	Met                   int    `json:"met_in"` // replicates in which the rule was met
	Summary               string `json:"summary"`
	// The hit share and wrong-alert share at the report's own cut (the
	// set's cut, held fixed) across the replicates: the redraws of the
	// measured shares, beside them in the figures table. The fields
	// above are where the rule lands, the rule re-applied to each.
	RecallAtCutP05             number `json:"recall_at_cut_p05"`
	RecallAtCutP95             number `json:"recall_at_cut_p95"`
	FalseDiscoveryRateAtCutP05 number `json:"false_discovery_rate_at_cut_p05"`
	FalseDiscoveryRateAtCutP95 number `json:"false_discovery_rate_at_cut_p95"`
}

// atCut sets s's redraws at the cut of score, null where res cannot say
// (bootstrap.Result.BandAtCut).
func (s *stability) atCut(res bootstrap.Result, score float64, met bool) {
	s.RecallAtCutP05, s.RecallAtCutP95, s.FalseDiscoveryRateAtCutP05, s.FalseDiscoveryRateAtCutP95 = null, null, null, null
	if !met {
		return
	}
	if p, ok := res.BandAtCut(score); ok {
		s.RecallAtCutP05, s.RecallAtCutP95 = number(p.Recall[0]), number(p.Recall[1])
		s.FalseDiscoveryRateAtCutP05, s.FalseDiscoveryRateAtCutP95 = number(p.FalseDiscoveryRate[0]), number(p.FalseDiscoveryRate[1])
	}
}

type bootstrapFigures struct {
	Replicates int         `json:"replicates"`
	Seed       uint64      `json:"seed"`
	Stratified bool        `json:"stratified"`
	Band       []bandPoint `json:"band"`
}

type bandPoint struct {
	Score                 float64 `json:"score"`
	RecallP05             number  `json:"recall_p05"`
	RecallP95             number  `json:"recall_p95"`
	FalseDiscoveryRateP05 number  `json:"false_discovery_rate_p05"`
	FalseDiscoveryRateP95 number  `json:"false_discovery_rate_p95"`
}

// addStability adds, under each cut, where its rule lands across the
// bootstrap replicates of res (package bootstrap), whose spreads are one
// per cut in the order of r's cuts; and the band of hit share and
// wrong-alert share. When the calibration figures hold a cost threshold
// and the cost rule is among the cuts, a threshold outside the cost cut's
// 5th-95th percentile range gives a warning. It runs after addCalibration.
func (r *Report) addStability(result *analysis.Result) {
	res := *result.Stability
	r.Bootstrap = &bootstrapFigures{Replicates: res.Replicates, Seed: res.Seed, Stratified: res.Design == bootstrap.WithinClass, Band: []bandPoint{}}
	for _, p := range res.Band {
		r.Bootstrap.Band = append(r.Bootstrap.Band, bandPoint{Score: p.Score,
			RecallP05: number(p.Recall[0]), RecallP95: number(p.Recall[1]),
			FalseDiscoveryRateP05: number(p.FalseDiscoveryRate[0]), FalseDiscoveryRateP95: number(p.FalseDiscoveryRate[1])})
	}
	t := tableOf("cut", "score", "cut lands 5–95%", "flagged share "+compare.LandsWords, "hit share "+compare.LandsWords, "wrong-alert share "+compare.LandsWords, "in plain words")
	t.wordsLast = true
	for i, s := range res.Spreads {
		if i >= len(r.Cuts) {
			break
		}
		c := &r.Cuts[i]
		words := bootstrap.Describe(s, res.Replicates)
		if s.Skipped != "" {
			c.Stability = &stability{ScoreP05: null, ScoreP95: null, FlaggedShareP05: null, FlaggedShareP95: null, RecallP05: null, RecallP95: null, FalseDiscoveryRateP05: null, FalseDiscoveryRateP95: null, Summary: words}
			c.Stability.atCut(res, float64(c.Score), c.Met)
			t.rows = append(t.rows, []string{c.Spec, format.Score(float64(c.Score)), "n/a", "n/a", "n/a", "n/a", words})
			continue
		}
		c.Stability = &stability{ScoreP05: number(s.Score[0]), ScoreP95: number(s.Score[1]),
			FlaggedShareP05: number(s.FlaggedShare[0]), FlaggedShareP95: number(s.FlaggedShare[1]),
			RecallP05: number(s.Recall[0]), RecallP95: number(s.Recall[1]),
			FalseDiscoveryRateP05: number(s.FalseDiscoveryRate[0]), FalseDiscoveryRateP95: number(s.FalseDiscoveryRate[1]), Met: s.Met, Summary: words}
		c.Stability.atCut(res, float64(c.Score), c.Met)
		t.rows = append(t.rows, []string{c.Spec, format.Score(float64(c.Score)), format.Significant(s.Score[0], 4) + " to " + format.Significant(s.Score[1], 4), format.Interval(s.FlaggedShare), format.Interval(s.Recall), format.Interval(s.FalseDiscoveryRate), words})
	}
	if c := result.CheckCost(result.Stability); c.Outside {
		s := c.Spread
		r.Warnings = append(r.Warnings, fmt.Sprintf("the cost threshold that calibrated probabilities imply (%s) lies outside the range where the least-cost cut lands in resampled sets (%s to %s): the scores are probably not calibrated, so do not read them as probabilities for costing",
			format.Number(result.Calibration.Cost.Score, 3), format.Significant(s.Score[0], 4), format.Significant(s.Score[1], 4)))
	}
	notes := []string{fmt.Sprintf("%d resampled sets (seed %d), %s; the 5th and 95th percentiles bound a 90%% range", res.Replicates, res.Seed, designWords(res.Design)),
		compare.LandsNote,
		bootstrap.WordsConvention}
	r.sections = append(r.sections, section{title: "how stable each cut is (bootstrap)", table: t, notes: notes})
}

type comparison struct {
	ScoreA        string `json:"score_a"`
	ScoreB        string `json:"score_b"`
	AUCA          number `json:"auc_a"`
	AUCB          number `json:"auc_b"`
	AUCDifference number `json:"auc_difference"` // auc_a - auc_b
	DeLongSE      number `json:"delong_se"`
	DeLongZ       number `json:"delong_z"`
	DeLongP       number `json:"delong_p"`
}

// secondModelCut is the cut that the same rule picks for the second model.
type secondModelCut struct {
	Met           bool      `json:"met"`
	Reason        *string   `json:"reason"`
	Score         number    `json:"score"`
	Flagged       float64   `json:"flagged"`
	FlaggedShare  number    `json:"flagged_share"`
	Recall        number    `json:"recall"`
	RecallCI      *interval `json:"recall_ci"`
	Precision     number    `json:"precision"`
	PrecisionCI   *interval `json:"precision_ci"`
	QueuePerShift number    `json:"queue_per_shift"`
	CostPerShift  number    `json:"cost_per_shift"`
}

// addComparison adds the comparison of two models scored on the same
// cases (res.Second): DeLong's paired AUC test at the top, and under each
// cut the cut that the same rule picks for the second model. The test's
// error, when not nil, is reported as a warning (one class only, for
// example) and the test's figures are null.
func (r *Report) addComparison(res *analysis.Result) {
	if res.Second == nil {
		return
	}
	scoreA, scoreB := res.Set.ScoreColumn(), res.Set.CompareColumn()
	test, testErr, outcomes, second, a := res.Second.Test, res.Second.TestErr, res.Outcomes, res.Second.Outcomes, res.Assume
	c := &comparison{ScoreA: scoreA, ScoreB: scoreB, AUCA: null, AUCB: null, AUCDifference: null, DeLongSE: null, DeLongZ: null, DeLongP: null}
	if testErr == nil {
		c.AUCA, c.AUCB, c.AUCDifference = number(test.AUC[0]), number(test.AUC[1]), number(test.Difference)
		c.DeLongSE, c.DeLongZ, c.DeLongP = number(test.StdError), number(test.Z), number(test.P)
	} else {
		r.Warnings = append(r.Warnings, "no paired AUC test: "+testErr.Error())
	}
	r.Comparison = c
	t := tableOf("cut", scoreA+" cut", "flagged", "hit share", "wrong-alert share", scoreB+" cut", "flagged", "hit share", "wrong-alert share")
	for i, o := range second {
		if i >= len(r.Cuts) || i >= len(outcomes) {
			break
		}
		s := &secondModelCut{Met: o.Met, Score: null, FlaggedShare: null, Recall: null, Precision: null, QueuePerShift: null, CostPerShift: null}
		row := []string{r.Cuts[i].Spec}
		if first := outcomes[i]; first.Met {
			e := evidence.Of(first.Point, a)
			row = append(row, format.Score(e.Score), format.Share(e.FlaggedShare), format.Share(e.Recall), format.Share(e.FalseDiscoveryRate))
		} else {
			row = append(row, "unmet", "", "", "")
		}
		if o.Met {
			e := evidence.Of(o.Point, a)
			s.Score, s.Flagged, s.FlaggedShare = number(e.Score), e.Flagged, number(e.FlaggedShare)
			s.Recall, s.RecallCI = number(e.Recall), newInterval(e.RecallCI)
			s.Precision, s.PrecisionCI = number(e.Precision), newInterval(e.PrecisionCI)
			s.QueuePerShift, s.CostPerShift = number(e.Projected.QueuePerShift), number(e.Projected.CostPerShift)
			row = append(row, format.Score(e.Score), format.Share(e.FlaggedShare), format.Share(e.Recall), format.Share(e.FalseDiscoveryRate))
		} else {
			reason := o.Reason
			s.Reason = &reason
			row = append(row, "unmet", "", "", "")
		}
		r.Cuts[i].Second = s
		t.rows = append(t.rows, row)
	}
	notes := []string{}
	if testErr == nil {
		difference := format.NumberDiff(test.AUC[0], test.AUC[1], 3).Text // from the AUCs as shown
		if difference == "same" {
			difference = "none"
		}
		notes = append(notes, fmt.Sprintf("ROC AUC of %s %s, of %s %s: difference %s, standard error %s (DeLong et al. 1988, paired), z %s, p %s",
			scoreA, format.Number(test.AUC[0], 3), scoreB, format.Number(test.AUC[1], 3), difference, format.Number(test.StdError, 4), format.Number(test.Z, 2), format.PValue(test.P)))
		switch {
		case !evidence.Defined(test.P):
			notes = append(notes, "the test is undefined here (no spread between the models, or too few cases of a class)")
		case test.P < 0.05:
			notes = append(notes, "on these cases the two AUCs differ by more than chance would explain at the 5% level")
		default:
			notes = append(notes, "on these cases the AUC difference is within what chance would explain at the 5% level")
		}
	}
	r.sections = append(r.sections, section{title: "two models on the same cases: " + scoreA + " and " + scoreB, table: t, notes: notes})
}

// designWords says how the bootstrap drew its cases.
func designWords(d bootstrap.Design) string {
	if d == bootstrap.WithinClass {
		return "true and false cases resampled separately, as the classes were sampled apart"
	}
	return "cases resampled as a random sample, so the mix of true and false cases varies"
}

// gapWords names the empty shifts left out as a gap in the data.
func gapWords(gaps int) string {
	if gaps == 0 {
		return ""
	}
	return "; " + format.Count(float64(gaps)) + " empty shifts in a row left out as a gap in the data"
}
