package drift

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
)

// Status returns the verdict: StatusOK, StatusDrift or StatusAssumption.
func (r *Result) Status() string {
	if r.Verdict == "" {
		if r.Drift {
			return StatusDrift
		}
		return StatusOK
	}
	return r.Verdict
}

// number is a float that reads as JSON null when undefined.
type number float64

func (n number) MarshalJSON() ([]byte, error) {
	v := float64(n)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return []byte("null"), nil
	}
	return []byte(strconv.FormatFloat(v, 'g', -1, 64)), nil
}

func pair(ci [2]float64) *[2]number {
	if math.IsNaN(ci[0]) || math.IsNaN(ci[1]) {
		return nil
	}
	return &[2]number{number(ci[0]), number(ci[1])}
}

// jsonResult is the JSON form: a contract for scheduled jobs. Keys keep
// their names and meanings; new keys may be added.
type jsonResult struct {
	DecisionFile   string `json:"decision_file"`
	Scores         string `json:"scores"`
	Chosen         string `json:"chosen"`
	Cut            number `json:"cut"`
	LowerIsRiskier bool   `json:"lower_is_riskier"`
	Rows           int    `json:"rows"`
	// WeightKind is what the new data's weights are read as ("frequency"
	// or "sampling"), ValidationWeightKind the decision file's; null
	// without weights.
	WeightKind           *string      `json:"weight_kind"`
	ValidationWeightKind *string      `json:"validation_weight_kind"`
	Labelled             bool         `json:"labelled"`
	Level                float64      `json:"level"`
	BaseRate             number       `json:"projected_base_rate"`
	Tolerance            float64      `json:"tolerance"`
	AlertRateObserved    number       `json:"alert_rate_observed"`
	AlertRateProjected   number       `json:"alert_rate_projected"`
	AlertRateCI          *[2]number   `json:"alert_rate_ci"`
	AlertRatePValue      number       `json:"alert_rate_p_value"`
	PSI                  number       `json:"psi"`
	PSIBand              *string      `json:"psi_band"`
	PSINoise             number       `json:"psi_noise"`
	PSINoiseLevel        number       `json:"psi_noise_p99"`
	PSIDrift             bool         `json:"psi_drift"`
	RecallObserved       number       `json:"recall_observed"`
	RecallCI             *[2]number   `json:"recall_ci"`
	RecallValidation     number       `json:"recall_validation"`
	RecallPValue         number       `json:"recall_p_value"`
	PrecisionObserved    number       `json:"precision_observed"`
	PrecisionCI          *[2]number   `json:"precision_ci"`
	PrecisionProjected   number       `json:"precision_projected"`
	PrecisionPValue      number       `json:"precision_p_value"`
	FPRObserved          number       `json:"false_positive_rate_observed"`
	FPRCI                *[2]number   `json:"false_positive_rate_ci"`
	FPRValidation        number       `json:"false_positive_rate_validation"`
	FPRPValue            number       `json:"false_positive_rate_p_value"`
	BaseRateObserved     number       `json:"base_rate_observed"`
	BaseRateCI           *[2]number   `json:"base_rate_ci"`
	BaseRateMethod       string       `json:"base_rate_method"`
	Tests                []jsonTest   `json:"tests"`
	LevelMethod          string       `json:"level_method"`
	Reprojected          *jsonFigures `json:"reprojected"`
	NextStep             string       `json:"next_step"`
	Status               string       `json:"status"`
	Findings             []string     `json:"findings"`
	// Warnings say what makes the check less exact than stated, with the
	// fix (Result.Warnings); empty when nothing does.
	Warnings []string `json:"warnings"`
	Caution  string   `json:"caution"`
}

// jsonTest is one test of the verdict's family.
type jsonTest struct {
	Name     string `json:"name"`
	Judges   string `json:"judges"` // "model" or "base rate"
	PValue   number `json:"p_value"`
	Rejected bool   `json:"rejected"`
}

// jsonFigures are the chosen cut's figures at the observed base rate.
type jsonFigures struct {
	BaseRate      number `json:"base_rate"`
	AlertRate     number `json:"alert_rate"`
	Precision     number `json:"precision"`
	QueuePerShift number `json:"queue_per_shift"`
	Capacity      number `json:"capacity"`
}

// LevelMethod says how the verdict keeps Level as a family.
const LevelMethod = "Holm's step-down procedure across the tests, each two-sided"

// NextStep is the next step for the status, in one line.
func (r *Result) NextStep() string {
	switch r.Status() {
	case StatusDrift:
		return "the model no longer behaves as validated: stop trusting the cut's projected figures and take the findings to the model's owner"
	case StatusAssumption:
		if r.Redo != "" {
			return "re-project the decision at the observed base rate and have it signed off again: " + r.Redo
		}
		return "re-project the decision at the observed base rate and have it signed off again"
	default:
		return "nothing to do; check the next batch"
	}
}

// WriteJSON writes r as one JSON object; decisionFile and scoresFile name
// the inputs. Shares that were not measured (recall and precision without
// labels) are null.
func WriteJSON(w io.Writer, r *Result, decisionFile, scoresFile string) error {
	nan := number(math.NaN())
	obs := func(t Test) number {
		if !t.Defined {
			return nan
		}
		return number(t.Observed)
	}
	pv := func(t Test) number {
		if !t.Defined {
			return nan
		}
		return number(t.PValue)
	}
	ci := func(t Test) *[2]number {
		if !t.Defined {
			return nil
		}
		return pair(t.ObservedCI)
	}
	out := jsonResult{
		DecisionFile: decisionFile, Scores: scoresFile, Chosen: r.Chosen, Cut: number(r.Cut), LowerIsRiskier: r.LowerIsRiskier,
		Rows: r.Rows, Labelled: r.Labelled, Level: Level, BaseRate: number(r.BaseRate), Tolerance: r.Tolerance,
		AlertRateObserved: number(r.AlertRate.Observed), AlertRateProjected: number(r.AlertRate.Expected),
		AlertRateCI: pair(r.AlertRate.ObservedCI), AlertRatePValue: pv(r.AlertRate),
		PSI: number(r.PSI), PSINoise: number(r.PSINoise), PSINoiseLevel: number(r.PSINoiseLevel), PSIDrift: r.PSIDrift,
		RecallObserved: obs(r.Recall), RecallCI: ci(r.Recall), RecallValidation: number(r.Recall.Expected), RecallPValue: pv(r.Recall),
		PrecisionObserved: obs(r.Precision), PrecisionCI: ci(r.Precision), PrecisionProjected: number(r.Precision.Expected), PrecisionPValue: pv(r.Precision),
		FPRObserved: obs(r.FalsePositiveRate), FPRCI: ci(r.FalsePositiveRate), FPRValidation: number(r.FalsePositiveRate.Expected), FPRPValue: pv(r.FalsePositiveRate),
		BaseRateObserved: number(r.BaseRateObserved), BaseRateCI: pair(r.BaseRateCI), BaseRateMethod: r.BaseRateMethod,
		Tests: []jsonTest{}, LevelMethod: LevelMethod, NextStep: r.NextStep(),
		Status: r.Status(), Findings: r.Findings, Caution: evidence.Caution,
	}
	if r.WeightKind != "" {
		out.WeightKind = &r.WeightKind
	}
	if r.ValidationWeightKind != "" {
		out.ValidationWeightKind = &r.ValidationWeightKind
	}
	for _, j := range r.Family {
		judges := "model"
		if !j.Model {
			judges = "base rate"
		}
		out.Tests = append(out.Tests, jsonTest{Name: j.Name, Judges: judges, PValue: number(j.PValue), Rejected: j.Rejected})
	}
	if !math.IsNaN(r.BaseRateObserved) {
		out.Reprojected = &jsonFigures{BaseRate: number(r.BaseRateObserved), AlertRate: number(r.Reprojected.AlertRate), Precision: number(r.Reprojected.Precision),
			QueuePerShift: number(r.Reprojected.QueuePerShift), Capacity: number(math.NaN())}
		if r.Capacity > 0 {
			out.Reprojected.Capacity = number(r.Capacity)
		}
	}
	if r.PSIBand != "" {
		band := r.PSIBand
		out.PSIBand = &band
	}
	if out.Findings == nil {
		out.Findings = []string{}
	}
	out.Warnings = append([]string{}, r.Warnings...)
	var encoded bytes.Buffer
	enc := json.NewEncoder(&encoded)
	enc.SetIndent("", "  ")
	if err := enc.Encode(out); err != nil {
		return err
	}
	_, err := w.Write(format.JSON(encoded.Bytes())) // names from the files, safe on a terminal
	return err
}

// tests returns how many tests the verdict rests on.
func (r *Result) tests() int {
	n := 0
	for _, j := range r.Family {
		if !math.IsNaN(j.PValue) {
			n++
		}
	}
	if r.PSIDrift || (r.Mixture == nil && !r.Labelled && !math.IsNaN(r.PSI)) {
		n++ // the PSI of all scores judges too without labels or a curve
	}
	return n
}

// WriteText writes r for a person: what was checked, a table of the
// checks and the findings.
func WriteText(w io.Writer, r *Result, decisionFile, scoresFile string) error {
	var b strings.Builder
	sign := format.CutSign(r.LowerIsRiskier)
	labels := "no labels"
	if r.Labelled {
		labels = "labelled"
	}
	fmt.Fprintf(&b, "Check of %s against %s\n", scoresFile, decisionFile)
	fmt.Fprintf(&b, "chosen cut   %s: flag when score %s %s\n", r.Chosen, sign, format.Score(r.Cut))
	rate := "a base rate given when it was saved"
	if r.BaseRateValidation {
		rate = "the validation base rate"
	}
	validation := format.Count(float64(r.ValidationRows)) + " rows"
	if r.ValidationWeights != "" {
		validation += ", " + r.ValidationWeights
	}
	fmt.Fprintf(&b, "expected     from %s (%s), projected at %s, %s\n", r.ValidationPath, validation, rate, format.Share(r.BaseRate))
	flagged := format.Count(r.Flagged) + " of them"
	if r.Weighted {
		flagged = format.Count(r.Flagged) + " of weight " + format.Count(r.Weight) + " (" + r.Weights + ")"
	}
	fmt.Fprintf(&b, "new data     %s rows, %s; the cut flags %s\n", format.Count(float64(r.Rows)), labels, flagged)
	tolerance := "none"
	if r.Tolerance > 0 {
		tolerance = format.Number(100*r.Tolerance, 1) + " points"
	}
	fmt.Fprintf(&b, "tests        %d tests judge the verdict together at the %g%% level (%s): on noise alone any finding, drift or assumption, comes about once in %d runs; tolerance %s\n\n",
		r.tests(), 100*Level, LevelMethod, int(math.Round(1/Level)), tolerance)

	rows := r.checkRows()
	b.WriteString(format.Grid(rows[0], rows[1:], true))
	if r.Labelled || r.Mixture != nil {
		b.WriteString("\nThe alert rate, wrong-alert share and PSI of all scores move with the base rate, so they are shown, not judged: ")
		if r.Labelled {
			b.WriteString("the model is judged on the hit share, the false positive rate and the scores within each class")
		} else {
			b.WriteString("the model is judged on whether the new scores are a mix of the validated true and false cases at some base rate")
		}
		b.WriteString(".\n")
		if r.BaseRateMethod != "" {
			fmt.Fprintf(&b, "Base rate: %s.\n", r.BaseRateMethod)
		}
	} else {
		fmt.Fprintf(&b, "\nPSI bands (common practice): below %v stable, %v to %v moderate, above %v large; only large counts as drift, and only beyond what noise alone gives once in a hundred runs.\n",
			PSIModerate, PSIModerate, PSILarge, PSILarge)
	}
	switch r.Status() {
	case StatusDrift:
		b.WriteString("\nstatus: drift - the model no longer behaves as validated\n")
	case StatusAssumption:
		b.WriteString("\nstatus: assumption - the model behaves as validated, but the base rate assumed is wrong: the projection must be redone\n")
	default:
		b.WriteString("\nstatus: ok - production behaves as validated, at the base rate assumed\n")
	}
	if len(r.Findings) > 0 {
		b.WriteString("findings:\n")
	}
	for _, f := range r.Findings {
		b.WriteString("  - " + f + "\n")
	}
	b.WriteString("next step: " + r.NextStep() + "\n")
	for _, w := range r.Warnings {
		b.WriteString("\nwarning: " + w + "\n")
	}
	b.WriteString("\ncaution: " + evidence.Caution + "\n")
	_, err := io.WriteString(w, format.PrintableText(b.String())) // names from the files are untrusted
	return err
}

// checkRows are the rows of WriteText's table of checks, header first.
func (r *Result) checkRows() [][]string {
	judged := map[string]Judged{}
	for _, j := range r.Family {
		judged[j.Name] = j
	}
	verdictOf := func(name string) string {
		j, ok := judged[name]
		switch {
		case !ok:
			return "shown"
		case math.IsNaN(j.PValue):
			return "not tested"
		case j.Rejected && j.Model:
			return "DRIFT"
		case j.Rejected:
			return "CHANGED"
		}
		return "ok"
	}
	rows := [][]string{{"check", "observed", "interval", "expected", "difference", "p-value", "verdict"}}
	// add adds the row of a test, shown under label; name is the test's
	// name in the family.
	add := func(label, name, source string, t Test, measured bool) {
		switch {
		case !measured:
			rows = append(rows, []string{label, "not measured", "", format.Share(t.Expected) + " " + source, "", "", "-"})
		case !t.Defined:
			rows = append(rows, []string{label, format.Share(t.Observed), format.Interval(t.ObservedCI), format.Share(t.Expected) + " " + source, "", "", "not tested"})
		default:
			rows = append(rows, []string{label, format.Share(t.Observed), format.Interval(t.ObservedCI), format.Share(t.Expected) + " " + source,
				format.ShareDiff(t.Observed, t.Expected).Text, format.PValue(t.PValue), verdictOf(name)})
		}
	}
	if _, ok := judged["base rate"]; ok {
		rows = append(rows, []string{"base rate", format.Share(r.BaseRateObserved), format.Interval(r.BaseRateCI), format.Share(r.BaseRate) + " assumed",
			format.ShareDiff(r.BaseRateObserved, r.BaseRate).Text, format.PValue(judged["base rate"].PValue), verdictOf("base rate")})
	}
	add("hit share (recall)", "recall", "validation", r.Recall, r.Labelled)
	if r.Labelled {
		add("false positive rate", "false positive rate", "validation", r.FalsePositiveRate, true)
	}
	class := func(name string, t ScoreTest) {
		if !t.Defined {
			rows = append(rows, []string{name, "not tested", "", "", "", "", "-"})
			return
		}
		rows = append(rows, []string{name, "chi-square " + format.Number(t.Statistic, 1), fmt.Sprintf("%d bins", t.Bins), "validated", "", format.PValue(t.PValue), verdictOf(name)})
	}
	if r.Labelled {
		class("scores of true cases", r.ScoresPositive)
		class("scores of false cases", r.ScoresNegative)
	}
	if m := r.Mixture; m != nil {
		name := "scores fit a mixture of the validated classes"
		if math.IsNaN(m.FitP) {
			rows = append(rows, []string{"scores as a mix", "not tested", "", "", "", "", "-"})
		} else {
			rows = append(rows, []string{"scores as a mix", "chi-square " + format.Number(m.Fit, 1), fmt.Sprintf("%d degrees", m.Freedom), "a fitting mix", "", format.PValue(m.FitP), verdictOf(name)})
		}
	}
	add("alert rate", "alert rate", "projected", r.AlertRate, true)
	add("wrong-alert share (FDR)", "precision", "projected", r.Precision.Complement(), r.Labelled)
	if math.IsNaN(r.PSI) {
		rows = append(rows, []string{"score PSI", "not measured", "", "", "", "", "-"})
	} else {
		rows = append(rows, []string{"score PSI", format.Number(r.PSI, 3), r.PSIBand, "noise ~" + format.Number(r.PSINoise, 3), "", "", r.psiVerdict()})
	}
	return rows
}

// psiVerdict is the verdict column of the PSI of all scores: judged only
// without labels or a curve, shown otherwise.
func (r *Result) psiVerdict() string {
	if r.Mixture != nil || r.Labelled {
		return "shown"
	}
	switch {
	case r.PSIDrift:
		return "DRIFT"
	case r.PSIBand == "large":
		return "within noise"
	case r.PSIBand == "moderate":
		return "watch"
	}
	return "ok"
}
