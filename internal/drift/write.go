package drift

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/sill-tool/sill/internal/evidence"
)

// Status returns "drift" when any check drifted, else "ok".
func (r *Result) Status() string {
	if r.Drift {
		return "drift"
	}
	return "ok"
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
	DecisionFile       string     `json:"decision_file"`
	Scores             string     `json:"scores"`
	Chosen             string     `json:"chosen"`
	Cut                number     `json:"cut"`
	LowerIsRiskier     bool       `json:"lower_is_riskier"`
	Rows               int        `json:"rows"`
	Labelled           bool       `json:"labelled"`
	Level              float64    `json:"level"`
	BaseRate           number     `json:"projected_base_rate"`
	Tolerance          float64    `json:"tolerance"`
	AlertRateObserved  number     `json:"alert_rate_observed"`
	AlertRateProjected number     `json:"alert_rate_projected"`
	AlertRateCI        *[2]number `json:"alert_rate_ci"`
	AlertRatePValue    number     `json:"alert_rate_p_value"`
	PSI                number     `json:"psi"`
	PSIBand            *string    `json:"psi_band"`
	PSINoise           number     `json:"psi_noise"`
	PSINoiseLevel      number     `json:"psi_noise_p99"`
	PSIDrift           bool       `json:"psi_drift"`
	RecallObserved     number     `json:"recall_observed"`
	RecallCI           *[2]number `json:"recall_ci"`
	RecallValidation   number     `json:"recall_validation"`
	RecallPValue       number     `json:"recall_p_value"`
	PrecisionObserved  number     `json:"precision_observed"`
	PrecisionCI        *[2]number `json:"precision_ci"`
	PrecisionProjected number     `json:"precision_projected"`
	PrecisionPValue    number     `json:"precision_p_value"`
	Status             string     `json:"status"`
	Findings           []string   `json:"findings"`
	Caution            string     `json:"caution"`
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
		Status: r.Status(), Findings: r.Findings, Caution: evidence.Caution,
	}
	if r.PSIBand != "" {
		band := r.PSIBand
		out.PSIBand = &band
	}
	if out.Findings == nil {
		out.Findings = []string{}
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(out)
}

// WriteText writes r for a person: what was checked, a table of the
// checks and the findings.
func WriteText(w io.Writer, r *Result, decisionFile, scoresFile string) error {
	var b strings.Builder
	sign := ">="
	if r.LowerIsRiskier {
		sign = "<="
	}
	labels := "no labels"
	if r.Labelled {
		labels = "labelled"
	}
	fmt.Fprintf(&b, "Check of %s against %s\n", scoresFile, decisionFile)
	fmt.Fprintf(&b, "chosen cut   %s: flag when score %s %s\n", r.Chosen, sign, strconv.FormatFloat(r.Cut, 'g', -1, 64))
	rate := "a base rate given when it was saved"
	if r.BaseRateValidation {
		rate = "the validation base rate"
	}
	fmt.Fprintf(&b, "expected     from %s (%s rows), projected at %s, %s\n", r.ValidationPath, count(float64(r.ValidationRows)), rate, percent(r.BaseRate))
	flagged := count(r.Flagged) + " of them"
	if r.Weighted {
		flagged = count(r.Flagged) + " of weight " + count(r.Weight)
	}
	fmt.Fprintf(&b, "new data     %s rows, %s; the cut flags %s\n", count(float64(r.Rows)), labels, flagged)
	tolerance := "none"
	if r.Tolerance > 0 {
		tolerance = points(r.Tolerance) + " points"
	}
	fmt.Fprintf(&b, "tests        two-sample z tests at the %g%% level (on noise alone each trips about once in %d runs); tolerance %s\n\n",
		100*Level, int(math.Round(1/Level)), tolerance)

	rows := [][]string{{"check", "observed", "interval", "expected", "difference", "p-value", "verdict"}}
	add := func(name, source string, t Test, measured bool) {
		if !measured {
			rows = append(rows, []string{name, "not measured", "", percent(t.Expected) + " " + source, "", "", "-"})
			return
		}
		if !t.Defined {
			rows = append(rows, []string{name, percent(t.Observed), rangeOf(t.ObservedCI), percent(t.Expected) + " " + source, "", "", "not tested"})
			return
		}
		verdict := "ok"
		if t.Drift {
			verdict = "DRIFT"
		}
		rows = append(rows, []string{name, percent(t.Observed), rangeOf(t.ObservedCI), percent(t.Expected) + " " + source,
			signedPoints(t.Difference), shortP(t.PValue), verdict})
	}
	add("alert rate", "projected", r.AlertRate, true)
	add("recall", "validation", r.Recall, r.Labelled)
	add("precision", "projected", r.Precision, r.Labelled)
	psiVerdict := "ok"
	if r.PSIDrift {
		psiVerdict = "DRIFT"
	} else if r.PSIBand == "large" {
		psiVerdict = "within noise"
	} else if r.PSIBand == "moderate" {
		psiVerdict = "watch"
	}
	if math.IsNaN(r.PSI) {
		rows = append(rows, []string{"score PSI", "not measured", "", "", "", "", "-"})
	} else {
		rows = append(rows, []string{"score PSI", fmt.Sprintf("%.3f", r.PSI), r.PSIBand, fmt.Sprintf("noise ~%.3f", r.PSINoise), "", "", psiVerdict})
	}
	grid(&b, rows)
	fmt.Fprintf(&b, "\nPSI bands (common practice): below %v stable, %v to %v moderate, above %v large; only large counts as drift, and only beyond what noise alone gives once in a hundred runs.\n",
		PSIModerate, PSIModerate, PSILarge, PSILarge)
	if r.Drift {
		b.WriteString("\nstatus: drift - production no longer behaves like the validation set\n")
	} else {
		b.WriteString("\nstatus: ok - production still behaves like the validation set on these checks\n")
	}
	if len(r.Findings) > 0 {
		b.WriteString("findings:\n")
	}
	for _, f := range r.Findings {
		b.WriteString("  - " + f + "\n")
	}
	b.WriteString("\ncaution: " + evidence.Caution + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

func grid(b *strings.Builder, rows [][]string) {
	widths := make([]int, len(rows[0]))
	for _, row := range rows {
		for i, cell := range row {
			widths[i] = max(widths[i], len([]rune(cell)))
		}
	}
	for _, row := range rows {
		var line strings.Builder
		for i, cell := range row {
			if i > 0 {
				line.WriteString("  ")
			}
			line.WriteString(cell + strings.Repeat(" ", widths[i]-len([]rune(cell))))
		}
		b.WriteString(strings.TrimRight(line.String(), " ") + "\n")
	}
}

func rangeOf(ci [2]float64) string {
	if math.IsNaN(ci[0]) || math.IsNaN(ci[1]) {
		return ""
	}
	return fmt.Sprintf("%.1f%% to %.1f%%", 100*ci[0], 100*ci[1])
}

func signedPoints(v float64) string { return fmt.Sprintf("%+.1f pt", 100*v) }

func shortP(p float64) string {
	if p < 0.0001 {
		return "<0.0001"
	}
	return fmt.Sprintf("%.4f", p)
}

func count(v float64) string {
	if v == math.Trunc(v) && math.Abs(v) < 1e15 {
		s := strconv.FormatInt(int64(v), 10)
		var out []byte
		for i := range s {
			if i > 0 && (len(s)-i)%3 == 0 && s[i-1] != '-' {
				out = append(out, ',')
			}
			out = append(out, s[i])
		}
		return string(out)
	}
	return strconv.FormatFloat(v, 'f', 1, 64)
}
