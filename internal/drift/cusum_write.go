package drift

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"

	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
)

// ruleLine states the rule and the false-signal chance it keeps.
func (s *Sequence) ruleLine() string {
	batches := fmt.Sprintf("these %d batches", len(s.Steps))
	if len(s.Steps) == 1 {
		batches = "this batch"
	}
	return fmt.Sprintf("two-sided CUSUM of the alert rate against the baseline (Page 1954), on the angular scale, reference %s, decision interval %s: "+
		"on noise alone, the baseline's own included, a false signal within %s comes about once in %s runs (h set by %s simulated runs, seed %d)",
		format.Number(s.Reference, 1), format.Number(s.Threshold, 2), batches, format.Count(math.Round(1/s.Level)), format.Count(float64(s.Replicates)), s.Seed)
}

// detectionLine states the change the rule finds, and how soon.
func (s *Sequence) detectionLine() string {
	p0 := s.Baseline.AlertRate()
	what := fmt.Sprintf("a rise of the alert rate by a fifth (%s to %s) from the first batch", format.Share(p0), format.Share(p0*(1+s.Shift)))
	if !evidence.Defined(s.MeanDelay) {
		return what + " would not signal within these batches: more or larger batches, or a larger baseline, are needed"
	}
	return fmt.Sprintf("%s signals within these batches in %s of runs, on average at batch %s", what, format.Share(s.Detected), format.Number(s.MeanDelay, 1))
}

// verdictLine is the status line and the next step.
func (s *Sequence) verdictLine() (status, next string) {
	if s.Signal < 0 {
		return "ok - the alert rate holds against the baseline", "none: keep adding batches in order"
	}
	st := s.Steps[s.Signal]
	way, sum := "fell", st.Down
	if s.Rise {
		way, sum = "rose", st.Up
	}
	return fmt.Sprintf("drift - from batch %s the alert rate %s against the baseline (%s against %s; the sum %s passed %s)",
			format.Printable(st.Name), way, format.Share(st.AlertRate()), format.Share(s.Baseline.AlertRate()), format.Number(sum, 2), format.Number(s.Threshold, 2)),
		"a change of base rate and a drifting model both move the alert rate: with labels, sill check FILE BATCH tells them apart; the queue per shift moves either way"
}

// WriteBaselineText writes the judgement of the batches for a person.
func WriteBaselineText(w io.Writer, s *Sequence, chosen string, cut float64, lowerIsRiskier bool, decisionFile string) error {
	var b strings.Builder
	sign := format.CutSign(lowerIsRiskier)
	fmt.Fprintf(&b, "Check of %d batches against the baseline %s, with %s\n", len(s.Steps), s.Baseline.Name, decisionFile)
	fmt.Fprintf(&b, "chosen cut   %s: flag when score %s %s\n", chosen, sign, format.Score(cut))
	fmt.Fprintf(&b, "baseline     %s: %s cases, %s flagged (%s)%s\n", s.Baseline.Name, format.Count(s.Baseline.Cases), format.Count(s.Baseline.Flagged), format.Share(s.Baseline.AlertRate()), effectiveNote(s.Baseline))
	fmt.Fprintf(&b, "rule         %s\n", s.ruleLine())
	fmt.Fprintf(&b, "detection    %s\n\n", s.detectionLine())
	header := []string{"batch", "cases", "flagged", "alert rate", "vs baseline", "z", "rise sum", "fall sum", "state"}
	effective := s.sampled()
	if effective {
		header = slices.Insert(header, 2, "effective")
	}
	var rows [][]string
	for _, st := range s.Steps {
		state := "ok"
		switch {
		case !(st.Cases > 0):
			state = "no cases, skipped"
		case st.Signalled:
			state = "SIGNAL"
		case st.AfterAlarm:
			state = "after the signal"
		}
		row := []string{st.Name, format.Count(st.Cases), format.Count(st.Flagged), format.Share(st.AlertRate()),
			format.ShareDiff(st.AlertRate(), s.Baseline.AlertRate()).Text, format.Number(st.Z, 2), format.Number(st.Up, 2), format.Number(st.Down, 2), state}
		if effective {
			row = slices.Insert(row, 2, format.Count(st.Trials))
		}
		rows = append(rows, row)
	}
	b.WriteString(format.Grid(header, rows, true))
	if effective {
		b.WriteString("\nunder sampling weights each alert rate is judged at its effective number of cases (Korn and Graubard 1998), not its weighted cases\n")
	}
	status, next := s.verdictLine()
	fmt.Fprintf(&b, "\nstatus: %s\nnext step: %s\n", status, next)
	b.WriteString("\ncaution: " + evidence.Caution + "\n")
	_, err := io.WriteString(w, format.PrintableText(b.String()))
	return err
}

// WriteBaselineJSON writes the judgement as one JSON object.
func WriteBaselineJSON(w io.Writer, s *Sequence, chosen string, cut float64, decisionFile string) error {
	type batchJSON struct {
		Name      string `json:"name"`
		Cases     number `json:"cases"`
		Effective number `json:"effective_cases"`
		Flagged   number `json:"flagged"`
		AlertRate number `json:"alert_rate"`
		Z         number `json:"z"`
		Rise      number `json:"rise_sum"`
		Fall      number `json:"fall_sum"`
		Signalled bool   `json:"signalled"`
	}
	out := struct {
		Status       string      `json:"status"`
		DecisionFile string      `json:"decision_file"`
		Chosen       string      `json:"chosen"`
		Cut          number      `json:"cut"`
		Baseline     batchJSON   `json:"baseline"`
		Method       string      `json:"method"`
		Reference    number      `json:"reference"`
		Threshold    number      `json:"threshold"`
		Level        number      `json:"false_signal_within_batches"`
		Replicates   int         `json:"replicates"`
		Seed         uint64      `json:"seed"`
		Batches      []batchJSON `json:"batches"`
		SignalBatch  *string     `json:"signal_batch"`
		Direction    *string     `json:"direction"`
		Detection    struct {
			Shift     number `json:"relative_shift"`
			Share     number `json:"share_signalled"`
			MeanBatch number `json:"mean_batch"`
		} `json:"detection"`
		Caution string `json:"caution"`
	}{Status: s.Status(), DecisionFile: decisionFile, Chosen: chosen, Cut: number(cut),
		Baseline: batchJSON{Name: s.Baseline.Name, Cases: number(s.Baseline.Cases), Effective: number(s.Baseline.Trials), Flagged: number(s.Baseline.Flagged), AlertRate: number(s.Baseline.AlertRate()),
			Z: number(math.NaN()), Rise: number(math.NaN()), Fall: number(math.NaN())},
		Method: "two-sided CUSUM of the alert rate on the angular scale (Page 1954); h by simulation", Reference: number(s.Reference), Threshold: number(s.Threshold),
		Level: number(s.Level), Replicates: s.Replicates, Seed: s.Seed, Caution: evidence.Caution}
	for _, st := range s.Steps {
		out.Batches = append(out.Batches, batchJSON{Name: st.Name, Cases: number(st.Cases), Effective: number(st.Trials), Flagged: number(st.Flagged), AlertRate: number(st.AlertRate()),
			Z: number(st.Z), Rise: number(st.Up), Fall: number(st.Down), Signalled: st.Signalled})
	}
	if s.Signal >= 0 {
		name, way := s.Steps[s.Signal].Name, "fall"
		if s.Rise {
			way = "rise"
		}
		out.SignalBatch, out.Direction = &name, &way
	}
	out.Detection.Shift, out.Detection.Share, out.Detection.MeanBatch = number(s.Shift), number(s.Detected), number(s.MeanDelay)
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(out)
}

// sampled reports whether any batch, the baseline's included, counts
// fewer effective cases than weighted ones (sampling weights).
func (s *Sequence) sampled() bool {
	if s.Baseline.Trials != s.Baseline.Cases {
		return true
	}
	for _, st := range s.Steps {
		if st.Trials != st.Cases {
			return true
		}
	}
	return false
}

// effectiveNote gives a batch's effective cases where they differ from
// its weighted ones; "" otherwise.
func effectiveNote(b Batch) string {
	if b.Trials == b.Cases {
		return ""
	}
	return fmt.Sprintf(", %s effective cases", format.Count(b.Trials))
}
