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
	var encoded bytes.Buffer
	enc := json.NewEncoder(&encoded)
	enc.SetIndent("", "  ")
	if err := enc.Encode(out); err != nil {
		return err
	}
	_, err := w.Write(format.JSON(encoded.Bytes())) // names from the files, safe on a terminal
	return err
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
	fmt.Fprintf(&b, "chosen cut   %s: flag when score %s %s\n", r.Chosen, sign, format.Score(r.Cut))
	rate := "a base rate given when it was saved"
	if r.BaseRateValidation {
		rate = "the validation base rate"
	}
	fmt.Fprintf(&b, "expected     from %s (%s rows), projected at %s, %s\n", r.ValidationPath, format.Count(float64(r.ValidationRows)), rate, format.Share(r.BaseRate))
	flagged := format.Count(r.Flagged) + " of them"
	if r.Weighted {
		flagged = format.Count(r.Flagged) + " of weight " + format.Count(r.Weight)
	}
	fmt.Fprintf(&b, "new data     %s rows, %s; the cut flags %s\n", format.Count(float64(r.Rows)), labels, flagged)
	tolerance := "none"
	if r.Tolerance > 0 {
		tolerance = format.Number(100*r.Tolerance, 1) + " points"
	}
	fmt.Fprintf(&b, "tests        two-sample z tests at the %g%% level (on noise alone each trips about once in %d runs); tolerance %s\n\n",
		100*Level, int(math.Round(1/Level)), tolerance)

	rows := [][]string{{"check", "observed", "interval", "expected", "difference", "p-value", "verdict"}}
	add := func(name, source string, t Test, measured bool) {
		if !measured {
			rows = append(rows, []string{name, "not measured", "", format.Share(t.Expected) + " " + source, "", "", "-"})
			return
		}
		if !t.Defined {
			rows = append(rows, []string{name, format.Share(t.Observed), format.Interval(t.ObservedCI), format.Share(t.Expected) + " " + source, "", "", "not tested"})
			return
		}
		verdict := "ok"
		if t.Drift {
			verdict = "DRIFT"
		}
		rows = append(rows, []string{name, format.Share(t.Observed), format.Interval(t.ObservedCI), format.Share(t.Expected) + " " + source,
			format.ShareDiff(t.Observed, t.Expected).Text, format.PValue(t.PValue), verdict})
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
		rows = append(rows, []string{"score PSI", format.Number(r.PSI, 3), r.PSIBand, "noise ~" + format.Number(r.PSINoise, 3), "", "", psiVerdict})
	}
	b.WriteString(format.Grid(rows[0], rows[1:], true))
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
	_, err := io.WriteString(w, format.PrintableText(b.String())) // names from the files are untrusted
	return err
}
