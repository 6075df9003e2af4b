package main

import (
	"context"
	"fmt"
	"os"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"
	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/review"
	"github.com/sill-tool/sill/internal/sharedfile"
	"github.com/sill-tool/sill/tui"
)

func newReviewCmd() *cobra.Command {
	var format string
	cmd := &cobra.Command{
		Use:   "review FILE.yaml",
		Short: "Compare the candidates of a decision file side by side, choose one and note why",
		Long: `review reads a decision file (written by sill report --save or the
explorer) and needs no data: every candidate cut side by side with the same
figures as the explorer's comparison strip, each with its difference from
the chosen one.

On a terminal it opens a screen where you move between candidates, mark one
as chosen, add a note to a candidate or to the file, and write the file back
(atomically; the evidence is kept as it was). With --format text or
markdown it prints the comparison instead, for a sign-off document; that is
also what it does when standard output is not a terminal.`,
		Example: `  sill review cut.yaml
  sill review cut.yaml --format markdown > sign-off.md`,
		Args: argsNamed("the decision file (or - for standard input)"),
		RunE: func(cmd *cobra.Command, args []string) error {
			switch format {
			case "", "text", "markdown":
			default:
				return fmt.Errorf("--format %q: expected text or markdown", format)
			}
			var file *decision.File
			var stamp sharedfile.Stamp
			var err error
			if args[0] == "-" {
				file, err = decision.Read(cmd.InOrStdin(), "-")
				if format == "" {
					format = "text" // the screen writes back to a file
				}
			} else {
				file, stamp, err = decision.ReadFileStamped(args[0])
			}
			if err != nil {
				return err
			}
			if format == "" {
				if isTerminal() && cmd.OutOrStdout() == os.Stdout {
					return runReviewScreen(cmd.Context(), file, stamp, args[0])
				}
				format = "text"
			}
			if format == "markdown" {
				return review.WriteMarkdown(cmd.OutOrStdout(), file, args[0])
			}
			return review.WriteText(cmd.OutOrStdout(), file, args[0])
		},
	}
	cmd.Flags().StringVar(&format, "format", "", "print instead of opening the screen: text or markdown")
	return cmd
}

// runReviewScreen opens the review screen on file, read from path as
// stamp says, until the user quits.
func runReviewScreen(ctx context.Context, file *decision.File, stamp sharedfile.Stamp, path string) error {
	renderer := lipgloss.NewRenderer(os.Stdout)
	if os.Getenv("NO_COLOR") != "" {
		renderer.SetColorProfile(termenv.Ascii)
	}
	styles := tui.DefaultStyles(renderer)
	screen := tui.NewReview(tui.ReviewConfig{File: file, Path: path, Stamp: stamp, Context: ctx, Styles: &styles})
	final, err := tea.NewProgram(screen, tea.WithAltScreen()).Run()
	screen.WaitForWrites() // a write still going when the screen closed ends before the process does
	if err != nil {
		return fmt.Errorf("review: %w", err)
	}
	r := final.(tui.Review)
	if err := r.WriteErr(); err != nil {
		return fmt.Errorf("the changes on screen were not written: %w", err)
	}
	switch {
	case r.Written() && !r.Changed():
		fmt.Fprintf(os.Stderr, "sill: wrote %s; chosen %s\n", r.Path(), r.File().Chosen)
	case r.Changed():
		fmt.Fprintf(os.Stderr, "sill: %s left as it was; the changes on screen were not written\n", path)
	}
	return nil
}
