package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"strings"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/mattn/go-isatty"
	"github.com/muesli/termenv"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/tui"
)

type exploreOptions struct {
	input  inputFlags
	assume assumptionFlags
	out    string
	beyond beyondFlags // the flags of report's figures beyond the averages that the screen uses
	record recordFlags // --model-name, --model-version, --chosen-by: save.go
}

// registerBeyond registers the flags of beyondFlags that the explorer
// takes: segments' order, case times and shifts, the bootstrap run by the
// b key, the reliability table's bins and a second model's file.
func (o *exploreOptions) registerBeyond(fs *pflag.FlagSet) {
	f := &o.beyond
	fs.StringVar(&f.segmentOrder, "segment-order", "size", "first order of the segments overlay (s): size, gap or name")
	fs.IntVar(&f.calibrationBins, "calibration-bins", 10, "bins of the reliability table (e; scores in [0,1] only)")
	fs.IntVar(&f.replicates, "bootstrap", 200, "resampled sets when b asks how stable the cuts are (0: off)")
	fs.Uint64Var(&f.seed, "seed", 1, "seed of the resampling; the same seed gives the same figures")
	f.registerShared(fs)
}

// config returns the explorer's settings from the flags, checked.
func (o *exploreOptions) config() (tui.Config, error) {
	opts, err := o.beyond.options()
	if err != nil {
		return tui.Config{}, err
	}
	if err := o.record.check(); err != nil {
		return tui.Config{}, err
	}
	return tui.Config{Analysis: opts, SegmentOrder: o.beyond.order(),
		Model: o.record.model(), ChosenBy: strings.TrimSpace(o.record.chosenBy)}, nil
}

// load reads the scores at path and, with --compare, joins the second
// model's file to them. A set without both classes is refused: no cut can
// be chosen on it.
func (o *exploreOptions) load(ctx context.Context, path string, progress func(int)) (*scores.Set, error) {
	set, err := o.input.load(ctx, path, nil, progress)
	if err != nil {
		return nil, err
	}
	if err := bothClasses(set, "explore"); err != nil {
		return nil, err
	}
	return o.beyond.loadCompare(ctx, set)
}

func newExploreCmd() *cobra.Command {
	var o exploreOptions
	cmd := &cobra.Command{
		Use:   "explore FILE",
		Short: "Walk the cuts of a scored validation set on screen, pin candidates and write the chosen cut",
		Long: `explore opens a keyboard-driven screen on a validation set (the same files
and flags as report): the ranked list with the cut under the cursor, the
curve, the figures of the cursor's cut, the starting points on keys 1-6, and
a comparison strip of the cuts you pin. w writes the chosen cut, the pinned
candidates and the assumptions to --out; ? lists every key.

Beyond the averages: with --segment, s breaks the cursor's cut down by group;
with --time and --shifts the queue figure adds the real shifts' peaks and
queue90 at the capacity is a starting point; b resamples the set (--bootstrap,
--seed) to show how far the cuts move; e asks whether the scores read as
probabilities; with --score a --score b (or --compare FILE --id COL), m puts
both models' cuts side by side.`,
		Example: `  sill explore bearings.csv --volume 1500 --capacity 90
  sill explore scores.jsonl --cost-false-alert 120 --cost-miss 1200 --out cut.yaml
  sill explore bearings.csv --segment yard --time read_at --shifts 06:00,14:00,22:00 --volume 1500 --capacity 90`,
		Args: argsNamed("FILE (the validation set; sill with no arguments explores the demo)"),
		RunE: func(cmd *cobra.Command, args []string) error {
			path := args[0]
			if path == "-" {
				return fmt.Errorf("explore takes its keys from the terminal, so it cannot read scores from standard input; save them to a file first")
			}
			// Flag mistakes first, so that they are told even without a
			// terminal.
			if err := o.beyond.prepare(&o.input); err != nil {
				return err
			}
			cfg, err := o.config()
			if err != nil {
				return err
			}
			if err := checkOut(o.out); err != nil {
				return err
			}
			if !isTerminal() || cmd.OutOrStdout() != os.Stdout {
				return fmt.Errorf("explore needs a terminal on standard input and output; for printed figures use: sill report %s", path)
			}
			cfg.Load = func(progress func(int)) (*scores.Set, error) { return o.load(cmd.Context(), path, progress) }
			cfg.Assume, cfg.Out = o.assume.assumptions, o.out
			err = runExplorer(cmd.Context(), cfg)
			o.input.warnWeights(cmd.ErrOrStderr()) // once the screen has closed
			return err
		},
	}
	fs := cmd.Flags()
	o.input.register(fs)
	o.assume.register(fs)
	o.assume.input = &o.input
	fs.StringVar(&o.out, "out", "cut.yaml", "decision file the write key saves")
	o.record.register(fs, "")
	o.registerBeyond(fs)
	return cmd
}

// demoAssumptions are the flags of the demo's operating assumptions
// (package demo).
func demoAssumptions() []string {
	return []string{fmt.Sprintf("--volume=%d", demo.Volume), fmt.Sprintf("--capacity=%d", demo.Capacity),
		fmt.Sprintf("--cost-false-alert=%d", demo.CostFalseAlert), fmt.Sprintf("--cost-miss=%d", demo.CostMiss)}
}

// demoShifts are the flags that place the demo's readings in the depot's
// three crew shifts.
var demoShifts = []string{"--time=read_at", "--shifts=06:00,14:00,22:00", "--tz=UTC"}

// exploreDemo opens the explorer on the built-in demo data with the demo
// assumptions, its yards as segments and its readings in the three crew
// shifts.
func exploreDemo(ctx context.Context) error {
	cfg, err := demoConfig()
	if err != nil {
		return err
	}
	return runExplorer(ctx, cfg)
}

// demoConfig is the explorer's configuration for the built-in demo data.
func demoConfig() (tui.Config, error) {
	o := &exploreOptions{}
	fs := pflag.NewFlagSet("demo", pflag.ContinueOnError)
	o.assume.register(fs)
	o.registerBeyond(fs)
	if err := fs.Parse(append(demoAssumptions(), demoShifts...)); err != nil {
		return tui.Config{}, err
	}
	if err := o.beyond.prepare(&o.input); err != nil {
		return tui.Config{}, err
	}
	cfg, err := o.config()
	if err != nil {
		return cfg, err
	}
	cfg.Load = func(progress func(int)) (*scores.Set, error) { return o.input.loadDemo() }
	cfg.Assume, cfg.Out = o.assume.assumptions, "cut.yaml"
	return cfg, nil
}

// isTerminal reports whether both standard input and output are terminals.
func isTerminal() bool {
	return isatty.IsTerminal(os.Stdin.Fd()) && isatty.IsTerminal(os.Stdout.Fd())
}

// runExplorer runs the screen of cfg until the user quits or ctx ends. A
// load error ends the screen and is returned, so that sill prints it and
// exits with status 2.
func runExplorer(ctx context.Context, cfg tui.Config) error {
	renderer := lipgloss.NewRenderer(os.Stdout)
	if os.Getenv("NO_COLOR") != "" {
		renderer.SetColorProfile(termenv.Ascii)
	}
	styles := tui.DefaultStyles(renderer)
	cfg.ToolVersion, cfg.Styles, cfg.Context = toolVersion(), &styles, ctx
	model := tui.New(cfg)
	final, err := tea.NewProgram(model, tea.WithAltScreen(), tea.WithContext(ctx)).Run()
	model.WaitForWrites() // a write still going when the screen closed ends before the process does
	if err != nil {
		return fmt.Errorf("explore: %w", err)
	}
	return exploreOutcome(final.(tui.Model), cfg.Out, os.Stderr)
}

// exploreOutcome says on stderr where the decision is once the explorer
// m has closed, and returns the load error or the failed write that
// makes the exit status 2.
func exploreOutcome(m tui.Model, out string, stderr io.Writer) error {
	if err := m.Err(); err != nil {
		return err
	}
	path, n := m.Written(), m.Unwritten()
	if err := m.WriteErr(); err != nil {
		if path != "" {
			return fmt.Errorf("the last write failed (%s holds the decision as written before it): %w", path, err)
		}
		return fmt.Errorf("the decision was not written: %w", err)
	}
	path, out = format.Printable(path), format.Printable(out) // for the lines below; the error above is made printable where it is printed
	switch {
	case path != "" && n > 0:
		fmt.Fprintf(stderr, "sill: %s holds the decision as last written; the changes after that were not written\n", path)
	case path != "":
		fmt.Fprintf(stderr, "sill: the decision is in %s\n", path)
	case n == 1:
		fmt.Fprintf(stderr, "sill: the pinned candidate was not written (w writes it to %s)\n", out)
	case n > 1:
		fmt.Fprintf(stderr, "sill: the %d pinned candidates were not written (w writes them to %s)\n", n, out)
	}
	return nil
}
