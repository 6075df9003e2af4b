package main

import (
	"errors"
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/drift"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
)

func newCheckCmd() *cobra.Command {
	var (
		input        inputFlags
		output       string
		tolerance    float64
		ignoreLabels bool
	)
	cmd := &cobra.Command{
		Use:   "check FILE.yaml NEW_SCORES",
		Short: "Check fresh production scores against the chosen cut of a decision file",
		Long: `check applies the chosen cut of a decision file (written by sill report
--save or the explorer) to fresh scores and asks whether production still
behaves like the validation set the cut was chosen on. The scores are read
like report's (CSV, TSV or JSON Lines, optionally gzip compressed; "-" reads
standard input, as it does for the decision file); the label column is
optional here, and --ignore-labels skips one whose outcomes are not known
yet (blank cells).

The checks:
  alert rate   the share the cut flags, with its Wilson interval, against the
               file's projected alert rate
  recall       with labels: the share of true cases flagged, against the
               validation recall
  precision    with labels: the share of alerts that are true, against the
               projected precision
  score PSI    the population stability index of the new scores on the
               file's histogram bins; bands of common practice: below 0.1
               stable, 0.1 to 0.25 moderate (reported, not drift), above
               0.25 large (drift, unless so few new rows give as much
               through noise alone more than once in a hundred runs)

The shares are compared by two-sample z tests that count the sizes of both
the validation set and the new data, at the 1% level: on sampling noise
alone each check drifts about once in a hundred runs, so a scheduled job
does not cry wolf. --tolerance adds a practical margin: a share drifts
only when it differs by more than the margin beyond sampling noise.

Exit status: 0 when every check is within tolerance, 1 when any drifts
(the output says which and by how much), 2 for errors such as an unreadable
decision file.`,
		Example: `  sill check cut.yaml scores-2026-09-28.csv
  sill check cut.yaml nightly.csv.gz --format json --tolerance 0.02`,
		Args: argsNamed("the decision file", "the new scores (either may be - for standard input)"),
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
			for _, w := range report.DroppedWarnings(set) {
				fmt.Fprintf(cmd.ErrOrStderr(), "sill: warning: %s: %s\n", format.Printable(args[1]), format.Printable(w))
			}
			res, err := drift.Check(file, set, drift.Options{Tolerance: tolerance, Labelled: set.LabelColumn != "" && !ignoreLabels, IgnoreLabels: "--ignore-labels"})
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
			if res.Drift {
				return &exitError{code: 1}
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
	fs.BoolVar(&ignoreLabels, "ignore-labels", false, "check the alert rate and scores only, even where a label column is present")
	fs.Var(newShareFlag(&tolerance, 0, shareBounds{below1: true, expected: "a margin below 1, such as 0.02 or 2% for two percentage points"}),
		"tolerance", "practical margin on every share, such as 0.02 or 2% for two percentage points")
	return cmd
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
