package main

import (
	"fmt"
	"os"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/mattn/go-isatty"
	"github.com/muesli/termenv"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/tui"
)

type exploreOptions struct {
	input  inputFlags
	assume assumptionFlags
	out    string
}

func newExploreCmd() *cobra.Command {
	var o exploreOptions
	cmd := &cobra.Command{
		Use:   "explore FILE",
		Short: "Walk the cuts of a scored validation set on screen, pin candidates and write the chosen cut",
		Long: `explore opens a keyboard-driven screen on a validation set (the same files
and flags as report): the ranked list with the cut under the cursor, the
curve, the figures of the cursor's cut, the starting points on keys 1-5, and
a comparison strip of the cuts you pin. w writes the chosen cut, the pinned
candidates and the assumptions to --out; ? lists every key.`,
		Example: `  sill explore bearings.csv --volume 1500 --capacity 90
  sill explore scores.jsonl --cost-false-alert 120 --cost-miss 1200 --out cut.yaml`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			path := args[0]
			if path == "-" {
				return fmt.Errorf("explore takes its keys from the terminal, so it cannot read scores from standard input; save them to a file first")
			}
			if !isTerminal() || cmd.OutOrStdout() != os.Stdout {
				return fmt.Errorf("explore needs a terminal on standard input and output; for printed figures use: sill report %s", path)
			}
			load := func(progress func(int)) (*scores.Set, error) {
				return o.input.load(path, nil, progress)
			}
			return runExplorer(load, o.assume.assumptions, o.out)
		},
	}
	fs := cmd.Flags()
	o.input.register(fs)
	o.assume.register(fs)
	fs.StringVar(&o.out, "out", "cut.yaml", "decision file the write key saves")
	return cmd
}

// exploreDemo opens the explorer on the built-in demo data with the demo
// assumptions.
func exploreDemo() error {
	var o exploreOptions
	fs := pflag.NewFlagSet("demo", pflag.ContinueOnError)
	o.assume.register(fs)
	if err := fs.Parse(demo.Assumptions); err != nil {
		return err
	}
	load := func(progress func(int)) (*scores.Set, error) { return o.input.loadDemo() }
	return runExplorer(load, o.assume.assumptions, "cut.yaml")
}

// isTerminal reports whether both standard input and output are terminals.
func isTerminal() bool {
	return isatty.IsTerminal(os.Stdin.Fd()) && isatty.IsTerminal(os.Stdout.Fd())
}

// runExplorer runs the screen until the user quits. A load error ends the
// screen and is returned, so that sill prints it and exits with status 2.
func runExplorer(load func(func(int)) (*scores.Set, error), assume func(*scores.Set) (projection.Assumptions, error), out string) error {
	renderer := lipgloss.NewRenderer(os.Stdout)
	if os.Getenv("NO_COLOR") != "" {
		renderer.SetColorProfile(termenv.Ascii)
	}
	styles := tui.DefaultStyles(renderer)
	model := tui.New(tui.Config{Load: load, Assume: assume, Out: out, ToolVersion: versionString(), Styles: &styles})
	final, err := tea.NewProgram(model, tea.WithAltScreen()).Run()
	if err != nil {
		return fmt.Errorf("explore: %w", err)
	}
	m := final.(tui.Model)
	if err := m.Err(); err != nil {
		return err
	}
	if path := m.Written(); path != "" {
		fmt.Fprintf(os.Stderr, "sill: the decision is in %s\n", path)
	}
	if n := m.Unwritten(); n > 0 {
		fmt.Fprintf(os.Stderr, "sill: %d pinned candidates or changed assumptions were not written (w writes them to %s)\n", n, out)
	}
	return nil
}
