package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
)

type reportOptions struct {
	input     inputFlags
	assume    assumptionFlags
	format    string
	out       string // the sign-off page's file, with --format html
	withCurve bool
	cuts      []string
	beyond    beyondFlags // segments, shift peaks, stability, calibration, two models: beyond.go
	save      saveFlags   // --save, --choose, --force: save.go
}

func newReportCmd() *cobra.Command {
	var o reportOptions
	cmd := &cobra.Command{
		Use:   "report FILE",
		Short: "Print the figures of a scored validation set at its starting points or chosen cuts",
		Long: `report reads a validation set (CSV, TSV or JSON Lines, optionally gzip
compressed; "-" reads standard input) and prints its summary and the figures
of each cut: hit share, wrong-alert share, queue and cost per shift.

Cut specs for --cut (repeatable):
  score=V   the cut at score V            top=N, top=P%  flag at most N cases / P%
  hit=R     catch at least share R         wrong=F        wrong-alert share at most F
  base      flag as many as the base rate  queue=K        at most K alerts per shift
  cost      least cost per shift           queue90=K      9 shifts in 10 at most K alerts
  hitNN=R   recall at least R, NN% sure    wrongNN=F      wrong-alert share at most F, NN% sure
R and F are shares, as 0.8 or 80%; every share flag takes a percentage too.
hit=R and wrong=F meet R and F on this set only: about half the time the
cut falls short in production. hit95=0.8 picks the strictest cut whose
one-sided 95% lower bound (Wilson) of recall is at least 0.8, wrong95=0.333
the deepest whose upper bound of wrong-alert share is at most 0.333: short
in about 5 sets in 100. NN lies above 50 and below 100.
Without --cut: base, hit=0.8 and wrong=0.333, plus queue=capacity and cost
when --capacity or costs are given, and queue90=capacity with --time; then
hit95=0.8 and wrong95=0.333.

Beyond the averages: --segment COL breaks each cut down by group; --time COL
with --shifts (and --tz) gives busy shifts: 9 shifts in 10 at most, from
production's own counting noise at the volume plus the real spread between
shifts the set shows beyond its sampling noise (with few cases a shift it
cannot tell real spread from noise, and says so), beside the sample's own
counts per shift; --bootstrap B (--seed S) shows how far each cut moves when
the set is drawn again; scores in [0,1] get a reliability table, ECE beside
its noise level at the set's size, and net benefit at production's base rate
(threshold probability from the costs, else the base rate); --score a
--score b (or
--compare FILE joined on --id) compares two models on the same cases
(DeLong's paired AUC test).

Again under new assumptions: --reproject FILE.yaml takes a decision file's
candidates at their scores (with their names, rules and notes), its chosen
one, model, chosen-by and note, and its assumptions where no flag is given;
with --save it writes the decision again (sill check offers this line when
only the base rate was wrong). Each candidate's rule is reported beside it,
at the cut it picks now.

Outputs: --format csv prints one row per cut with its counts, rates,
intervals and projected figures in plain machine form (README lists the
columns); --format csv --curve prints the table of every cut instead.
--curve adds that table to the text, JSON and Markdown forms.`,
		Example: `  sill demo --out bearings.csv
  sill report bearings.csv --volume 1500 --capacity 90
  sill report bearings.csv --cut hit=0.9 --cut top=2% --format json
  sill report bearings.csv --cut hit=0.8 --cut base --save cut.yaml --choose base
  sill report bearings.csv --volume 1500 --capacity 90 --format html --out sign-off.html
  sill report bearings.csv --segment yard --time read_at --shifts 06:00,14:00,22:00 --tz Europe/Amsterdam --volume 1500 --capacity 90 --bootstrap 500`,
		Args: argsNamed("FILE (the validation set, or - for standard input)"),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.beyond.prepare(&o.input); err != nil {
				return err
			}
			set, err := o.input.load(cmd.Context(), args[0], cmd.InOrStdin(), nil)
			if err != nil {
				return err
			}
			o.input.warnWeights(cmd.ErrOrStderr())
			return o.run(cmd.Context(), set, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	fs := cmd.Flags()
	o.input.register(fs)
	o.assume.register(fs)
	o.assume.input = &o.input
	fs.StringVar(&o.format, "format", "text", "output: text, json, markdown, html (the sign-off page) or csv (one row per cut asked for; with --curve, every cut instead)")
	fs.StringVar(&o.out, "out", "", "with --format html: the file to write the page to (default: standard output)")
	fs.BoolVar(&o.withCurve, "curve", false, "add a table of every cut (text, JSON, Markdown); with --format csv, print that table alone")
	fs.StringArrayVar(&o.cuts, "cut", nil, "cut spec to report (repeatable), such as hit=0.8 or hit=80%")
	o.beyond.register(fs)
	o.save.register(fs)
	return cmd
}

// run computes the report of set and writes it; nothing is written to
// stdout when an error is returned before output starts.
func (o *reportOptions) run(ctx context.Context, set *scores.Set, stdout, stderr io.Writer) error {
	switch o.format {
	case "text", "json", "markdown", "csv", "html":
	default:
		return fmt.Errorf("--format %q: expected text, json, markdown, html or csv", o.format)
	}
	if o.out != "" && o.format != "html" {
		return errors.New("--out goes with --format html")
	}
	o.save.page = o.format == "html"
	if err := o.save.check(); err != nil {
		return err
	}
	if o.save.path != "" {
		if err := bothClasses(set, "--save"); err != nil {
			return err
		}
	}
	reprojected, err := o.save.readReproject(set, o.cuts)
	if err != nil {
		return err
	}
	if o.save.from != nil {
		o.assume.defaults = &o.save.from.Assumptions
	}
	a, err := o.assume.assumptions(set)
	if err != nil {
		return err
	}
	opts, err := o.beyond.options()
	if err != nil {
		return err
	}
	for _, text := range o.cuts {
		r, err := cutrule.Parse(text)
		if err != nil {
			return fmt.Errorf("--cut: %w", err)
		}
		opts.Rules = append(opts.Rules, r)
	}
	opts.Rules = append(opts.Rules, reprojected...)
	joined, err := o.beyond.loadCompare(ctx, set)
	if err != nil {
		return err
	}
	opts.Resampling.BandCuts = report.BandCuts
	curveCSV := o.format == "csv" && o.withCurve
	if curveCSV {
		opts.Resampling = analysis.Resampling{} // the curve alone
	}
	res, err := analysis.Run(ctx, joined, a, opts)
	if err != nil {
		return o.beyond.analysisError(err)
	}
	points := report.Points(res.Points)
	if curveCSV {
		// One table a pipeline can read whole: every cut, not the cuts
		// asked for, which --format csv without --curve gives.
		if o.save.path != "" || len(o.cuts) > 0 {
			return fmt.Errorf("--format csv --curve prints every cut alone; --cut and --save go with --format csv without --curve")
		}
		return report.WriteCurveCSV(stdout, points)
	}
	r := report.New(res, report.Options{SegmentOrder: o.beyond.order(), SegmentsShown: o.beyond.segmentsShown, Hints: reportHints})
	// Saved once every figure is computed, so that an error leaves no file.
	if err := o.save.write(ctx, res, stderr); err != nil {
		return err
	}
	if o.format == "html" {
		return o.page(ctx, res, stdout, stderr)
	}
	// Warnings go to stderr whatever the format; JSON also carries them.
	for _, w := range r.Warnings {
		fmt.Fprintln(stderr, "sill: warning: "+format.Printable(w))
	}
	if !o.withCurve {
		points = nil
	}
	switch o.format {
	case "json":
		return report.WriteJSON(stdout, r, points)
	case "markdown":
		return report.WriteMarkdown(stdout, r, points)
	case "csv":
		return report.WriteCutsCSV(stdout, r)
	default:
		return report.WriteTextCurve(stdout, r, points)
	}
}

// reportHints are the flags that change what a report shows.
var reportHints = report.Hints{
	AllSegments:    "--segments-shown 0 shows all, --format json lists all",
	Resampling:     "with --bootstrap",
	Volume:         "give --volume",
	LowerIsRiskier: "--lower-is-riskier",
}

// runDefault runs when sill is called with no command: the explorer on the
// built-in demo data when standard input and output are terminals, else
// the report of the same data.
func runDefault(cmd *cobra.Command) error {
	if isTerminal() && cmd.OutOrStdout() == os.Stdout {
		return exploreDemo(cmd.Context())
	}
	var o reportOptions
	o.format = "text"
	fs := pflag.NewFlagSet("demo", pflag.ContinueOnError)
	o.assume.register(fs)
	o.beyond.register(fs)
	if err := fs.Parse(append(demoAssumptions(), demoShifts...)); err != nil {
		return err
	}
	if err := o.beyond.prepare(&o.input); err != nil {
		return err
	}
	set, err := o.input.loadDemo()
	if err != nil {
		return err
	}
	return o.run(cmd.Context(), set, cmd.OutOrStdout(), os.Stderr)
}
