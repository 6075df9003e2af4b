// Package page writes the sign-off page of a decision file: one
// self-contained HTML document a lead opens in any browser, prints and
// signs, with the job, the data, the trade-off drawn, the candidates side
// by side, what each would mean per shift, the assumptions, a glossary,
// the standing caution and room to sign. Nothing on the page asks for
// anything from elsewhere: the charts are inline SVG (drawn with gonum's
// plot), the style is inline CSS with the system's fonts, and there is no
// script.
//
// Every figure comes from the decision file (and, when given, the curve
// it was chosen on); the page computes nothing the file does not hold
// beyond the arithmetic of plain words ("about 90 alerts a shift").
// Which cases a cut flags follows the cut rule in the doc of package
// scores.
package page

import (
	"bytes"
	_ "embed"
	"errors"
	"fmt"
	"html/template"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/review"
)

// Options say what the page holds beyond the decision file.
type Options struct {
	// Name is how the page names the decision, such as the file's path.
	Name string
}

//go:embed page.html.tmpl
var pageTemplate string

var templates = template.Must(template.New("page").Parse(pageTemplate))

// Write writes the sign-off page of f to w. Text from the file (names,
// notes, rules, the model) is escaped for HTML by the template and then,
// with the whole page, made printable (visible): a control character or
// a bidirectional override in a candidate's name could otherwise hide or
// reorder what the people signing read.
func Write(w io.Writer, f *decision.File, opt Options) error {
	v, err := newView(f, opt)
	if err != nil {
		return err
	}
	var page bytes.Buffer
	if err := templates.ExecuteTemplate(&page, "page", v); err != nil {
		return err
	}
	_, err = io.WriteString(w, printable(page.String()))
	return err
}

// printable is format.Printable on every run of text between the page's
// own line feeds and tabs, which it keeps (the page's layout holds both,
// and in HTML they are white space).
func printable(page string) string {
	lines := strings.Split(page, "\n")
	for i, line := range lines {
		runs := strings.Split(line, "\t")
		for j, run := range runs {
			runs[j] = format.Printable(run)
		}
		lines[i] = strings.Join(runs, "\t")
	}
	return strings.Join(lines, "\n")
}

// view is what the template shows.
type view struct {
	Title      string
	Name       string
	Against    *againstView // set on a page of two decisions
	Job        string
	Facts      []fact
	Charts     []figure
	NoCurve    string
	Table      tableView
	Given      string // what the projected intervals take as given (format.ProjectedGiven)
	Words      []words
	Promises   []words // what each rule promises, and the least-cost figure's optimism
	NoPromise  string  // why Promises is empty
	Workload   workloadView
	Sections   []section
	Assume     []fact
	Notes      []fact
	Glossary   []fact
	Caution    string
	SignOffs   []signOff
	NoSignOff  string
	SigningFor string // what a signature on paper approves
	Written    string
}

type fact struct{ Term, Text string }

type figure struct {
	SVG     template.HTML
	Caption string
}

type tableView struct {
	Header []cell
	Rows   []rowView
	// Unbroken keeps figures and intervals on one line ("51577–61899"):
	// set when at most maxUnbroken candidates leave room for that on a
	// printed page; wider tables let them wrap rather than run off it.
	Unbroken bool
}

// maxUnbroken is the most candidates whose figures fit a printed A4 or
// Letter page unbroken (seen in chromium's print to PDF: four fit, seven
// run off the page).
const maxUnbroken = 4

type rowView struct {
	Detail  bool
	Heading bool // names the kind of the rows below it, measured or projected
	Cells   []cell
}

// cell is one table cell and its class: "chosen" for the chosen
// candidate's column, "diff" for a difference from it.
type cell struct{ Text, Class string }

type words struct {
	Name   string
	Chosen bool
	Text   string
}

type workloadView struct {
	Shown  bool
	Why    string // why there is no workload, when not Shown
	Chart  figure
	Header []string
	Rows   [][]string
	Peaks  string
}

// section is a part of the evidence that a decision file may or may not
// hold; Missing says plainly why it is not there.
type section struct {
	ID, Title string
	Intro     string
	Missing   string
	Header    []string
	Rows      [][]string
	Note      string
}

type signOff struct {
	Name, Role, Verdict, Note, At string
}

func newView(f *decision.File, opt Options) (*view, error) {
	chosen, ok := f.ChosenCandidate()
	if !ok {
		return nil, fmt.Errorf("page: chosen %q names no candidate", f.Chosen)
	}
	name := opt.Name
	if name == "" {
		name = f.Data.Path
	}
	v := &view{
		Title:   "Sign-off: " + chosen.Name + " on " + name,
		Name:    name,
		Job:     job(f, chosen),
		Facts:   append([]fact{{"model", model(f)}}, dataFacts(f)...),
		Table:   tableOf(f),
		Given:   format.ProjectedGiven,
		Assume:  assumptions(f),
		Notes:   notes(f),
		Caution: evidence.Caution,
		Written: f.Created.UTC().Format("2006-01-02 15:04 MST") + " by " + f.WrittenBy(),
	}
	v.Glossary = glossary
	for _, c := range ordered(f) {
		v.Words = append(v.Words, words{Name: c.Name, Chosen: c.Name == f.Chosen, Text: plainWords(c.Cut, f.Assumptions.Volume, format.Share)})
	}
	v.Promises, v.NoPromise = promises(f)
	charts, missing, err := tradeOffCharts(f)
	if err != nil {
		return nil, err
	}
	v.Charts, v.NoCurve = charts, missing
	if v.Workload, err = workload(f); err != nil {
		return nil, err
	}
	v.Sections = []section{stability(f), segments(f), calibration(f)}
	v.SignOffs = signOffs(f)
	v.SigningFor = signingFor(f, chosen, name)
	v.NoSignOff = "No sign-off is recorded in this file."
	return v, nil
}

// promises lists, chosen candidate first, what each candidate's rule
// promises about production (decision.Candidate.Promise) and, for the
// cost rule's candidate, how much its projected cost understates its own
// cost (review.OptimismLine); with none, it says why.
func promises(f *decision.File) (list []words, none string) {
	for _, c := range ordered(f) {
		name := c.Name
		if c.Rule != "" && c.Rule != c.Name {
			name += " (rule " + c.Rule + ")"
		}
		for _, text := range []string{c.Promise, review.OptimismLine(c)} {
			if text != "" {
				list = append(list, words{Name: name, Chosen: c.Name == f.Chosen, Text: text})
			}
		}
	}
	if len(list) == 0 {
		none = "No candidate comes from a rule that promises a hit share or a wrong-alert share (hit=, wrong=, hitNN=, wrongNN=) or from the cost rule, so there is no promise to state: every figure above holds for this validation set, with the intervals shown."
	}
	return list, none
}

// signingFor says what a signature on paper is given for, so that a
// printed sign-off page stands on its own.
func signingFor(f *decision.File, chosen decision.Candidate, name string) string {
	return fmt.Sprintf("Signing for the cut %s (flag a case when its score is %s %s) of %s, chosen on the validation set with fingerprint %s.",
		chosen.Name, flagSign(f), format.Score(chosen.Cut.Score), name, f.Data.SHA256)
}

// ordered returns the candidates with the chosen one first and the others
// in the file's order.
func ordered(f *decision.File) []decision.Candidate {
	var out []decision.Candidate
	for _, c := range f.Candidates {
		if c.Name == f.Chosen {
			out = append([]decision.Candidate{c}, out...)
		} else {
			out = append(out, c)
		}
	}
	return out
}

func flagSign(f *decision.File) string {
	if f.Data.LowerIsRiskier {
		return "≤"
	}
	return "≥"
}

func job(f *decision.File, chosen decision.Candidate) string {
	noun := "candidates"
	if len(f.Candidates) == 1 {
		noun = "candidate"
	}
	return fmt.Sprintf("A model scores each case; a case whose score is %s the cut becomes an alert that a person works. "+
		"This page records the cut chosen for that job and the evidence it was chosen on: %s cases with known outcomes, "+
		"%d %s compared, and %s chosen, flagging a case when its score is %s %s. "+
		"It shows what each candidate catches and how often it is wrong, what that would mean per shift in production, "+
		"the assumptions behind those projections, and room for the people who approve it to sign.",
		flagSign(f), format.Count(float64(f.Data.Rows)), len(f.Candidates), noun, chosen.Name, flagSign(f), format.Score(chosen.Cut.Score))
}

func dataFacts(f *decision.File) []fact {
	d := f.Data
	total := d.Positives + d.Negatives
	base := math.NaN()
	if total > 0 {
		base = d.Positives / total
	}
	columns := fmt.Sprintf("score %q, label %q", d.ScoreColumn, d.LabelColumn)
	if d.WeightColumn != "" {
		columns += fmt.Sprintf(", weight %q", d.WeightColumn)
	}
	direction := "higher scores are riskier"
	if d.LowerIsRiskier {
		direction = "lower scores are riskier"
	}
	facts := []fact{
		{"validation set", d.Path},
		{"fingerprint (SHA-256)", d.SHA256},
		{"rows", format.Count(float64(d.Rows))},
		{"true cases", format.Count(d.Positives)},
		{"false cases", format.Count(d.Negatives)},
		{"base rate", format.Share(base)},
	}
	if r := d.Ranking; r != nil {
		level := fmt.Sprintf("%g%% interval", 100*f.Assumptions.Confidence)
		facts = append(facts,
			fact{"ROC AUC", format.NumberWithInterval(r.ROCAUC, r.ROCAUCCI, 3) + " · " + level + " from DeLong's variance"},
			fact{"average precision", format.NumberWithInterval(r.AveragePrecision, r.AveragePrecisionCI, 3) + " · " + level + " on the logit scale"})
	}
	return append(facts, fact{"columns", columns + "; " + direction}, fact{"chosen by", chosenBy(f)})
}

func assumptions(f *decision.File) []fact {
	a := f.Assumptions
	base := format.Share(a.BaseRate)
	if !f.BaseRateChanged() {
		base += " (the validation set's own)"
	} else {
		base += " (differs from the validation set's; projected figures use it)"
	}
	out := []fact{{"production base rate", base}}
	if a.Volume > 0 {
		out = append(out, fact{"cases per shift", format.Count(a.Volume)})
	} else {
		out = append(out, fact{"cases per shift", "not given: no per-shift figures"})
	}
	if a.Capacity > 0 {
		out = append(out, fact{"capacity", format.Count(a.Capacity) + " alerts a shift"})
	} else {
		out = append(out, fact{"capacity", "not given"})
	}
	if c := a.Costs; c != nil {
		out = append(out, fact{"costs per case", fmt.Sprintf("wrong alert %s, miss %s, hit %s", format.Money(c.FalseAlert), format.Money(c.Miss), format.Money(c.Hit))})
	} else {
		out = append(out, fact{"costs per case", "not given: no cost figures"})
	}
	out = append(out, fact{"shifts", shiftSchedule(f)})
	out = append(out, fact{"intervals", strconv.FormatFloat(100*a.Confidence, 'g', -1, 64) + "% Wilson intervals on the validation counts"})
	if moved := review.RulesMoved(f); moved != "" {
		out = append(out, fact{"rules", moved})
	}
	return out
}

func notes(f *decision.File) []fact {
	oneLine := func(s string) string { return strings.Join(strings.Fields(s), " ") }
	var out []fact
	if f.Note != "" {
		out = append(out, fact{"decision", oneLine(f.Note)})
	}
	for _, c := range f.Candidates {
		if c.Note != "" {
			out = append(out, fact{c.Name, oneLine(c.Note)})
		}
	}
	return out
}

// tableOf lays out the candidates with the chosen one first, as the
// review's text does, with each figure's difference from the chosen one.
func tableOf(f *decision.File) tableView {
	var columns []compare.Column
	for _, c := range ordered(f) {
		columns = append(columns, review.Column(c))
	}
	t := compare.New(columns, 0, compare.Options{Assumptions: f.Assumptions, BaseRateChanged: f.BaseRateChanged(), LowerIsRiskier: f.Data.LowerIsRiskier})
	return render(t, "chosen")
}

func render(t compare.Table, referenceWord string) tableView {
	tv := tableView{Unbroken: len(t.Names) <= maxUnbroken}
	tv.Header = []cell{{Text: "figure"}}
	for c, name := range t.Names {
		if c == t.Reference {
			if name != referenceWord {
				name += " (" + referenceWord + ")"
			}
			tv.Header = append(tv.Header, cell{name, "chosen"})
			continue
		}
		tv.Header = append(tv.Header, cell{Text: name}, cell{"vs " + referenceWord, "diff"})
	}
	for _, r := range t.Rows {
		cells := []cell{{Text: strings.TrimSpace(r.Figure)}}
		for c := range t.Names {
			if c == t.Reference {
				cells = append(cells, cell{r.Cells[c], "chosen"})
				continue
			}
			cells = append(cells, cell{Text: r.Cells[c]}, cell{r.Diffs[c], "diff"})
		}
		tv.Rows = append(tv.Rows, rowView{Detail: r.Detail, Heading: r.Heading, Cells: cells})
	}
	return tv
}

// chartWidth and chartHeight are the size of a trade-off chart; the page
// scales it to the column.
var chartWidth, chartHeight = vg.Points(330), vg.Points(250)

// curveLines returns the hit share and wrong-alert share against the
// share flagged, and the ROC, of a curve over positives and negatives.
func curveLines(curve []decision.CurvePoint, positives, negatives float64) (hit, wrong, roc plotter.XYs) {
	total := positives + negatives
	if len(curve) == 0 || !(total > 0) {
		return nil, nil, nil
	}
	hit = plotter.XYs{{X: 0, Y: 0}}
	roc = plotter.XYs{{X: 0, Y: 0}}
	for _, p := range curve {
		flagged := (p.TP + p.FP) / total
		if positives > 0 {
			hit = append(hit, plotter.XY{X: flagged, Y: p.TP / positives})
		}
		if p.TP+p.FP > 0 {
			wrong = append(wrong, plotter.XY{X: flagged, Y: p.FP / (p.TP + p.FP)})
		}
		if positives > 0 && negatives > 0 {
			roc = append(roc, plotter.XY{X: p.FP / negatives, Y: p.TP / positives})
		}
	}
	return hit, wrong, roc
}

// tradeOffCharts draws the trade-off and the ROC with every candidate
// marked; without a curve only the marks are drawn and missing says why.
func tradeOffCharts(f *decision.File) (charts []figure, missing string, err error) {
	hit, wrong, roc := curveLines(f.Curve, f.Data.Positives, f.Data.Negatives)
	if len(f.Curve) == 0 {
		missing = "This decision file keeps no curve (it was written as sill-cut/1), so only the candidates are drawn, not the lines between them."
	}
	var onHit, onWrong, onROC []mark
	for _, c := range ordered(f) {
		label, chosen := c.Name, c.Name == f.Chosen
		if chosen {
			label += " (chosen)"
		}
		onHit = append(onHit, mark{label: label, x: c.Cut.FlaggedShare, y: c.Cut.Recall, chosen: chosen})
		onWrong = append(onWrong, mark{x: c.Cut.FlaggedShare, y: c.Cut.FalseDiscoveryRate, chosen: chosen})
		onROC = append(onROC, mark{label: label, x: c.Cut.FalsePositiveRate, y: c.Cut.Recall, chosen: chosen})
	}
	tradeOff := chart{
		title: "What a cut catches and how often it is wrong", xLabel: "share of cases flagged", yLabel: "share",
		percentX: true, percentY: true,
		lines: []line{{legend: "hit share (recall)", points: hit, kind: lineMain}, {legend: "wrong-alert share", points: wrong, kind: lineSecond}},
		marks: append(onHit, onWrong...),
	}
	rocChart := chart{
		title: "ROC", xLabel: "false positive rate", yLabel: "hit share (recall)",
		percentX: true, percentY: true, legendLowRight: true,
		lines: []line{{points: plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 1}}, kind: lineReference}, {legend: "this model", points: roc, kind: lineMain}},
		marks: onROC,
	}
	charts, err = figures(
		tradeOff, "Hit share (solid) and wrong-alert share (dashed) against the share of cases flagged; each candidate marked on both lines, the chosen one a filled square.",
		rocChart, "Hit share against the false positive rate; the dashed diagonal is a ranking by chance.")
	return charts, missing, err
}

// figures draws two trade-off charts, each with its caption.
func figures(first chart, firstCaption string, second chart, secondCaption string) ([]figure, error) {
	var out []figure
	for i, c := range []chart{first, second} {
		svg, err := c.draw(chartWidth, chartHeight)
		if err != nil {
			return nil, err
		}
		out = append(out, figure{SVG: svg, Caption: []string{firstCaption, secondCaption}[i]})
	}
	return out, nil
}

// workload draws each candidate's expected alerts per shift against the
// capacity, with the real shifts' peaks when the file holds them.
func workload(f *decision.File) (workloadView, error) {
	a := f.Assumptions
	if !(a.Volume > 0) {
		return workloadView{Why: "Not computed: the decision gives no number of cases per shift, so no figure per shift is projected."}, nil
	}
	w := workloadView{Shown: true, Header: []string{"candidate", "alerts per shift"}}
	if a.Capacity > 0 {
		w.Header = append(w.Header, "against capacity "+format.Count(a.Capacity))
	}
	peaks := false
	for _, c := range f.Candidates {
		peaks = peaks || c.Shifts != nil
	}
	if peaks {
		w.Header = append(w.Header, "mean a shift", "9 in 10 shifts at most", "the sample's busiest shift", "its start")
		if a.Capacity > 0 {
			w.Header = append(w.Header, "shifts over capacity")
		}
		w.Peaks = "Real shifts: the validation period's cases placed in the crew shifts" + shiftCount(f) + " and scaled to production's volume. " +
			"9 in 10 shifts have at most the figure shown, and the share over capacity, under the shift-peak model: production's own counting noise at its volume " +
			"plus the real differences between shifts that the validation period shows beyond its own sampling noise. " +
			"The sample's busiest shift is the heaviest single shift of the validation period, scaled, with the time it started" + shiftZone(f) +
			"; with few cases a shift it is mostly the sample's counting noise." + peakBases(f)
	} else {
		w.Peaks = "The busiest shifts were not computed for this decision: the figures are the expected load of an average shift."
	}
	var bars []bar
	var p90s, busiest []mark
	for i, c := range ordered(f) {
		q := c.Cut.Projected.QueuePerShift
		name := c.Name
		if c.Name == f.Chosen {
			name += " (chosen)"
		}
		bars = append(bars, bar{name: name, value: q})
		row := []string{name, format.Queue(q)}
		if a.Capacity > 0 {
			row = append(row, format.Against(q, a.Capacity))
		}
		if peaks {
			row = append(row, shiftCells(c.Shifts, a.Capacity > 0)...)
		}
		if sh := c.Shifts; sh != nil {
			p90s = append(p90s, mark{x: float64(i), y: sh.P90})
			busiest = append(busiest, mark{x: float64(i), y: sh.Max})
		}
		w.Rows = append(w.Rows, row)
	}
	ch := chart{title: "Alerts per shift", yLabel: "alerts per shift", bars: bars, yFromZero: true}
	caption := "Bars: each candidate's expected alerts in an average shift."
	if a.Capacity > 0 {
		ch.lines = []line{{legend: "capacity " + format.Count(a.Capacity), points: plotter.XYs{{X: -0.5, Y: a.Capacity}, {X: float64(len(bars)) - 0.5, Y: a.Capacity}}, kind: lineSecond}}
		caption += " Dashed line: the capacity of a shift."
	}
	if len(p90s) > 0 {
		ch.peaks = []peakSeries{{legend: "9 in 10 shifts at most", marks: p90s, shape: peakP90}, {legend: "busiest shift", marks: busiest, shape: peakMax}}
		caption += " Triangles: 9 in 10 real shifts have at most this many alerts; crosses: the busiest real shift."
	}
	svg, err := ch.draw(chartWidth, vg.Points(220))
	if err != nil {
		return w, err
	}
	w.Chart = figure{SVG: svg, Caption: caption}
	return w, nil
}

// shiftCount says how many real shifts the figures rest on, when the
// candidates agree on it.
func shiftCount(f *decision.File) string {
	count := -1
	for _, c := range f.Candidates {
		if c.Shifts == nil {
			continue
		}
		if count >= 0 && c.Shifts.Count != count {
			return ""
		}
		count = c.Shifts.Count
	}
	if count < 0 {
		return ""
	}
	return fmt.Sprintf(" (%d shifts)", count)
}

// peakBases says for each candidate what its p90 rests on.
func peakBases(f *decision.File) string {
	var out string
	for _, c := range ordered(f) {
		if c.Shifts != nil && c.Shifts.Basis != "" {
			out += " " + c.Name + ": " + c.Shifts.Basis + "."
		}
	}
	return out
}

// shiftZone names the zone of the shifts' start times.
func shiftZone(f *decision.File) string {
	if f.ShiftSchedule == nil || f.ShiftSchedule.Zone == "" {
		return ""
	}
	return " (" + f.ShiftSchedule.Zone + ")"
}

// shiftCells are a candidate's figures in the real shifts.
func shiftCells(sh *decision.Shifts, capacity bool) []string {
	n := 4
	if !capacity {
		n = 3
	}
	if sh == nil {
		cells := make([]string, n+1)
		cells[0] = "not computed"
		return cells
	}
	start := ""
	if !sh.Busiest.IsZero() {
		start = sh.Busiest.Format("2006-01-02 15:04")
	}
	cells := []string{format.Queue(sh.Mean), format.Number(sh.P90, 0), format.Queue(sh.Max), start}
	if capacity {
		cells = append(cells, format.Share(sh.OverCapacity))
	}
	return cells
}

// glossary explains the terms of the page.
var glossary = []fact{
	{"cut", "The score at which a case becomes an alert. A case whose score is at or beyond the cut is flagged; ties at the cut are flagged."},
	{"candidate", "One cut put forward for the decision, named by the rule that found it (such as hit=0.8) or by hand."},
	{"hit share (recall)", "Of the true cases, the share the cut flags."},
	{"wrong-alert share (false discovery rate, FDR)", "Of the alerts, the share that turn out not to be true cases."},
	{"false positive rate", "Of the false cases, the share the cut flags anyway."},
	{"share flagged", "Of all cases, the share the cut flags."},
	{"ROC", "The receiver operating characteristic: hit share against false positive rate over every cut."},
	{"base rate", "The share of cases that are true cases. Projected figures use the production base rate in the assumptions."},
	{"projected", "A figure as it would be in production: the validation hit share and false positive rate applied to the production base rate and number of cases per shift."},
	{"interval", "A Wilson interval on the validation counts at the stated level: the range the true share plausibly lies in, given how many cases it rests on."},
	{"alerts per shift, capacity", "The expected number of alerts in a shift, and the number a shift can work."},
	{"fingerprint (SHA-256)", "A digest of the validation file's bytes: the same digest means the same file."},
	{"stability", "How far a cut's figures move when the validation set is drawn again (the bootstrap)."},
	{"calibration", "How well scores read as probabilities match the share of true cases among cases with that score."},
	{"promise", "What a rule's cut can be counted on in production. A rule met on the validation set alone (hit=, wrong=) misses its figure in production about half the time; hitNN= and wrongNN= meet it on a one-sided bound, so that they miss it in about (100 − NN)% of validation sets."},
	{"optimism (least cost)", "The least-cost cut is chosen on the same cases its cost is counted on, so that cost is too low; the optimism is an estimate of how much more it costs out of sample, and the corrected cost adds it (projected to production, like the cost)."},
}

// generator is the mark every page carries in its head, by which
// Replaceable knows a page it may replace.
const generator = `<meta name="generator" content="sill sign-off page">`

// ErrNotPage is why Replaceable refuses a file.
var ErrNotPage = errors.New("not a sign-off page written by sill")

// Replaceable accepts the content of a file that a page may replace: one
// written as a sign-off page (it carries the page's generator mark in its
// first kilobytes). Anything else is refused with ErrNotPage.
func Replaceable(current []byte) error {
	head := current
	if len(head) > 4096 {
		head = head[:4096]
	}
	if bytes.Contains(head, []byte(generator)) {
		return nil
	}
	return ErrNotPage
}
