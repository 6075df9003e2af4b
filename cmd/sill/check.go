package main

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/drift"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/scores"
)

// checkLong is check's help text.
const checkLong = `check applies the chosen cut of a decision file (written by sill report
--save or the explorer) to fresh scores and asks whether the model still
behaves as validated, and whether the base rate the projection assumed
still holds. The scores are read like report's (CSV, TSV or JSON Lines,
optionally gzip compressed; "-" reads standard input, as it does for the
decision file); the label column is optional here, and --ignore-labels
skips one whose outcomes are not known yet (blank cells).

A change of base rate alone moves the alert rate, precision and the
distribution of all scores, while the model behaves as validated. So the
model is judged on what does not depend on the base rate:

With labels:
  base rate            the labelled share, with its Wilson interval, against
                       the base rate assumed
  recall               the share of true cases flagged, against validation
  false positive rate  the share of false cases flagged, against validation
  scores of true cases, scores of false cases
                       each class's scores against the validated ones, a
                       chi-square test on up to 10 bins cut from the
                       decision file's stored curve (sill-cut/2)
Without labels:
  base rate            the base rate that best explains the new scores as a
                       mix of the validated true and false cases (maximum
                       likelihood on the bins, profile-likelihood interval)
  scores as a mix      whether any such mix fits the new scores (a
                       chi-square goodness-of-fit test); if none does, the
                       scores moved

The alert rate, precision and the PSI of all scores are shown beside them.
A file of the earlier format (no curve) without labels is judged on the
alert rate and the PSI of all scores, which cannot tell a base rate from
drift.

The tests are judged together at the 1% level by Holm's procedure: on
sampling noise alone any finding comes about once in a hundred runs, for
the verdict as a whole. --tolerance adds a practical margin on every share.
Weights are read by their kind (--weight-kind, else the decision file's):
under sampling weights every share, and the scores of each class, are
tested at their effective sample sizes, not at the weighted counts.
When the validation set is smaller than the new data, the check's power
and false alarms rest mostly on the validation set, and the output says so.

Against a production baseline: when the validation set is small beside the
batches, --baseline FIRST_BATCH judges the batches given after the decision
file, in order, against that first production batch instead: a two-sided
CUSUM (Page 1954) of the alert rate at the chosen cut, on the angular scale;
under sampling weights each batch counts at its effective number of cases.
Its decision interval is set by a seeded simulation that includes the
baseline's own noise, so that on noise alone a false signal within the
batches given comes about once in 100 runs; the output states it, and how
soon a rise of the alert rate by a fifth would signal. A signal is drift
(exit 1): the base rate or the model moved, which one a labelled check of
the batch tells.

Exit status:
  0  ok          the model behaves as validated, at the base rate assumed
  1  drift       the model no longer behaves as validated
  2  error       such as an unreadable decision file
  3  assumption  the model behaves as validated but the base rate differs
                 beyond noise: the projection must be redone (the output
                 gives the alerts per shift at the observed rate and the
                 sill report --reproject line that writes the decision again
                 at that rate, every candidate, note and name kept)`

func newCheckCmd() *cobra.Command {
	var (
		input        inputFlags
		output       string
		tolerance    float64
		ignoreLabels bool
		baseline     string
	)
	cmd := &cobra.Command{
		Use:   "check FILE.yaml NEW_SCORES",
		Short: "Check fresh production scores against the chosen cut of a decision file",
		Long:  checkLong,
		Example: `  sill check cut.yaml scores-2026-09-28.csv
  sill check cut.yaml nightly.csv.gz --format json --tolerance 0.02
  sill check cut.yaml --baseline week-01.csv week-02.csv week-03.csv week-04.csv`,
		Args: checkArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if output != "text" && output != "json" {
				return fmt.Errorf("--format %q: expected text or json", output)
			}
			var file *decision.File
			var err error
			switch {
			case args[0] == "-" && args[1] == "-":
				return fmt.Errorf("the decision file and the new scores cannot both come from standard input")
			case args[0] == "-":
				file, err = decision.Read(cmd.InOrStdin(), "-")
			default:
				file, err = decision.ReadFile(args[0])
			}
			if err != nil {
				return err
			}
			fs := cmd.Flags()
			if len(input.scoreColumns) > 1 {
				return fmt.Errorf("--score given %d times: check applies the file's cut to one score column", len(input.scoreColumns))
			}
			if fs.Changed("lower-is-riskier") && input.opt.LowerIsRiskier != file.Data.LowerIsRiskier {
				return fmt.Errorf("--lower-is-riskier=%v contradicts %s, whose cut was chosen with lower_is_riskier: %v", input.opt.LowerIsRiskier, args[0], file.Data.LowerIsRiskier)
			}
			input.opt.LowerIsRiskier = file.Data.LowerIsRiskier
			input.opt.NoLabels = !input.counts // outcomes are often not known yet; a counts table has them
			input.opt.IgnoreLabels = ignoreLabels
			if !fs.Changed("score") && !isDefaultName(file.Data.ScoreColumn, scores.DefaultScoreColumns) {
				input.opt.ScoreColumn = file.Data.ScoreColumn
			}
			if file.Data.WeightColumn != "" {
				// New data weighted like the validation set read as the
				// file says, unless --weight-kind says otherwise.
				kind := file.Data.WeightKind
				input.defaultKind = &kind
			}
			if baseline != "" {
				return checkBaseline(cmd, file, args[0], baseline, args[1:], output, input.kind(), batchLoader(cmd, &input))
			}
			set, err := input.load(cmd.Context(), args[1], cmd.InOrStdin(), nil)
			if err != nil {
				var parseErr *scores.ParseError
				if errors.As(err, &parseErr) && errors.Is(err, scores.ErrMissingColumn) && parseErr.Column != "" && parseErr.Column == file.Data.ScoreColumn && !fs.Changed("score") {
					return fmt.Errorf("%w; it is the score column of %s, --score names the column of the new scores", err, args[0])
				}
				if errors.Is(err, scores.ErrBadLabel) && !ignoreLabels {
					// Fresh scores often come before their outcomes.
					return fmt.Errorf("%w; --ignore-labels checks the alert rate and scores without them", err)
				}
				return err
			}
			input.warnWeights(cmd.ErrOrStderr())
			for _, w := range analysis.DroppedWarnings(set) {
				fmt.Fprintf(cmd.ErrOrStderr(), "sill: warning: %s: %s\n", format.Printable(args[1]), format.Printable(w))
			}
			res, err := drift.Check(file, set, drift.Options{Tolerance: tolerance, Labelled: set.LabelColumn() != "" && !ignoreLabels, IgnoreLabels: "--ignore-labels", Baseline: "--baseline FIRST_BATCH",
				Sample: design.New(set, input.kind()),
				Redo:   func(baseRate float64) string { return redoLine(file, args[0], baseRate) }})
			if err != nil {
				return fmt.Errorf("check %s: %w", args[1], err)
			}
			if output == "json" {
				err = drift.WriteJSON(cmd.OutOrStdout(), res, args[0], args[1])
			} else {
				err = drift.WriteText(cmd.OutOrStdout(), res, args[0], args[1])
			}
			if err != nil {
				return err
			}
			switch res.Status() {
			case drift.StatusDrift:
				return &exitError{code: 1}
			case drift.StatusAssumption:
				return &exitError{code: 3}
			}
			return nil
		},
	}
	fs := cmd.Flags()
	input.register(fs)
	// check applies one cut to one score column and breaks nothing down.
	fs.Lookup("score").Usage = "score column (default: the decision file's score column when present, else the first of " + strings.Join(scores.DefaultScoreColumns, ", ") + ")"
	_ = fs.MarkHidden("segment")
	_ = fs.MarkHidden("id")
	fs.StringVar(&output, "format", "text", "output: text or json")
	fs.StringVar(&baseline, "baseline", "", "a first production batch: the batches after the decision file are judged against it, in order, by a CUSUM of the alert rate (see above)")
	fs.BoolVar(&ignoreLabels, "ignore-labels", false, "check the alert rate and scores only, even where a label column is present")
	fs.Var(newShareFlag(&tolerance, 0, shareBounds{below1: true, expected: "a margin below 1, such as 0.02 or 2% for two percentage points"}),
		"tolerance", "practical margin on every share, such as 0.02 or 2% for two percentage points")
	return cmd
}

// batchLoader reads the batches of check --baseline as input says,
// warning about their weights once for them all: they share their
// columns.
func batchLoader(cmd *cobra.Command, input *inputFlags) func(string) (*scores.Set, error) {
	warned := false
	return func(path string) (*scores.Set, error) {
		set, err := input.load(cmd.Context(), path, cmd.InOrStdin(), nil)
		if !warned && input.weightWarning != "" {
			input.warnWeights(cmd.ErrOrStderr())
			warned = true
		}
		input.weightWarning = ""
		return set, err
	}
}

// checkArgs takes the decision file and the new scores, or with
// --baseline the decision file and one or more batches.
func checkArgs(cmd *cobra.Command, args []string) error {
	if !cmd.Flags().Changed("baseline") {
		return argsNamed("the decision file", "the new scores (either may be - for standard input)")(cmd, args)
	}
	if len(args) < 2 {
		return fmt.Errorf("check --baseline takes the decision file then one or more batches to judge, in order; got %d arguments (see sill check --help)", len(args))
	}
	return nil
}

// checkBaseline judges batches, in order, against the baseline batch at
// the chosen cut of file (drift.JudgeBaseline) and writes the result;
// exit status 1 when the rule signals. kind is what the batches' weights
// are (each batch's design follows from it, design.New).
func checkBaseline(cmd *cobra.Command, file *decision.File, filePath, baseline string, batches []string, output string, kind design.Kind, load func(string) (*scores.Set, error)) error {
	stdin := 0
	for _, path := range append([]string{filePath, baseline}, batches...) {
		if path == "-" {
			stdin++
		}
	}
	if stdin > 1 {
		return fmt.Errorf("--baseline: at most one of the decision file, the baseline and the batches may come from standard input")
	}
	count := func(path string) (drift.Batch, error) {
		set, err := load(path)
		if err != nil {
			return drift.Batch{}, err
		}
		for _, w := range analysis.DroppedWarnings(set) {
			fmt.Fprintf(cmd.ErrOrStderr(), "sill: warning: %s: %s\n", format.Printable(path), format.Printable(w))
		}
		return drift.Count(file, set, path, design.New(set, kind))
	}
	base, err := count(baseline)
	if err != nil {
		return fmt.Errorf("--baseline: %w", err)
	}
	var judged []drift.Batch
	for _, path := range batches {
		b, err := count(path)
		if err != nil {
			return err
		}
		judged = append(judged, b)
	}
	seq, err := drift.JudgeBaseline(base, judged)
	if err != nil {
		return fmt.Errorf("--baseline %s: %w", baseline, err)
	}
	chosen, _ := file.ChosenCandidate()
	if output == "json" {
		err = drift.WriteBaselineJSON(cmd.OutOrStdout(), seq, chosen.Name, chosen.Cut.Score, filePath)
	} else {
		err = drift.WriteBaselineText(cmd.OutOrStdout(), seq, format.Printable(chosen.Name), chosen.Cut.Score, file.Data.LowerIsRiskier, filePath)
	}
	if err != nil {
		return err
	}
	if seq.Status() == drift.StatusDrift {
		return &exitError{code: 1}
	}
	return nil
}

// redoLine is the sill report line that writes the decision of file,
// saved at path, again at the base rate baseRate: --reproject keeps every
// candidate at its score with its name, rule and note, the chosen one, the
// model, chosen_by, the note and the other assumptions as the file holds
// them; the columns, segments, shift schedule (with the layout the times
// were read with) and bootstrap the file was made with are given again so
// that its figures are recomputed alike.
func redoLine(file *decision.File, path string, baseRate float64) string {
	args := []string{"sill", "report", shellWord(file.Data.Path)}
	if file.Data.ScoreColumn != "" && !isDefaultName(file.Data.ScoreColumn, scores.DefaultScoreColumns) {
		args = append(args, "--score", shellWord(file.Data.ScoreColumn))
	}
	if file.Data.LabelColumn != "" && !isDefaultName(file.Data.LabelColumn, scores.DefaultLabelColumns) {
		args = append(args, "--label", shellWord(file.Data.LabelColumn))
	}
	if file.Data.WeightColumn != "" {
		args = append(args, "--weight", shellWord(file.Data.WeightColumn), "--weight-kind", file.Data.WeightKind.String())
	}
	if file.Data.LowerIsRiskier {
		args = append(args, "--lower-is-riskier")
	}
	var stability *decision.Stability
	for _, c := range file.Candidates {
		if c.Segments != nil && c.Segments.Column != "" && !slices.Contains(args, "--segment") {
			args = append(args, "--segment", shellWord(c.Segments.Column))
		}
		if stability == nil {
			stability = c.Stability
		}
	}
	if s := file.ShiftSchedule; s != nil && s.TimeColumn != "" {
		args = append(args, "--time", shellWord(s.TimeColumn), "--shifts", shellWord(strings.Join(s.Starts, ",")), "--tz", shellWord(s.Zone))
		if s.TimeLayout != "" {
			args = append(args, "--time-layout", shellWord(s.TimeLayout))
		}
	}
	if stability != nil {
		args = append(args, "--bootstrap", strconv.Itoa(stability.Replicates), "--seed", strconv.FormatUint(stability.Seed, 10))
	}
	args = append(args, "--reproject", shellWord(path), "--base-rate", strconv.FormatFloat(roundShare(baseRate), 'f', -1, 64), "--save", shellWord(path))
	return strings.Join(args, " ")
}

// roundShare rounds a base rate to four decimals, finer than any interval
// around it.
func roundShare(p float64) float64 { return math.Round(p*1e4) / 1e4 }

// shellWord quotes s for a POSIX shell when it holds anything but plain
// path characters.
func shellWord(s string) string {
	plain := s != ""
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("-_./=:,+@%", r)) {
			plain = false
			break
		}
	}
	if plain {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

// isDefaultName reports whether name is one of the default column names.
func isDefaultName(name string, defaults []string) bool {
	for _, d := range defaults {
		if strings.EqualFold(name, d) {
			return true
		}
	}
	return false
}
