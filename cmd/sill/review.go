package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"
	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/review"
	"github.com/sill-tool/sill/internal/sharedfile"
	"github.com/sill-tool/sill/tui"
)

// signFlags are review's flags that record a sign-off.
type signFlags struct {
	name, role, verdict, note string
}

func (s *signFlags) given() bool {
	return s.name != "" || s.role != "" || s.verdict != "" || s.note != ""
}

// sign appends the sign-off to the file at path through the lock, so that
// a sign-off or write of another process in between is kept.
func (s *signFlags) sign(ctx context.Context, path string, stderr io.Writer) error {
	if path == "-" {
		return errors.New("--sign records the sign-off in the decision file; name the file, not standard input")
	}
	if strings.TrimSpace(s.name) == "" {
		return errors.New("--verdict, --role and --note go with --sign NAME (who signs)")
	}
	verdict, err := decision.ParseVerdict(s.verdict)
	if err != nil {
		return fmt.Errorf("--verdict: %w", err)
	}
	for flag, text := range map[string]string{"--sign": s.name, "--role": s.role} {
		if strings.ContainsAny(text, "\r\n") {
			return fmt.Errorf("%s %q: a line break, expected one line", flag, text)
		}
	}
	f, _, err := decision.AppendSignOff(ctx, path, decision.SignOff{Name: strings.TrimSpace(s.name), Role: strings.TrimSpace(s.role),
		Verdict: verdict, Note: strings.TrimSpace(s.note), At: time.Now().UTC().Truncate(time.Second)})
	if err != nil {
		return err
	}
	last := f.SignOffs[len(f.SignOffs)-1]
	fmt.Fprintf(stderr, "sill: signed %s: %s by %s for the chosen %s (score %s); %d %s in the file\n", format.Printable(path), last.Verdict,
		format.Printable(last.Name), format.Printable(last.Chosen), format.Score(last.ChosenScore), len(f.SignOffs), pluralWord(len(f.SignOffs), "sign-off", "sign-offs"))
	return nil
}

func newReviewCmd() *cobra.Command {
	var outFormat, against, out string
	var signing signFlags
	cmd := &cobra.Command{
		Use:   "review FILE.yaml",
		Short: "Compare the candidates of a decision file side by side, choose one and note why",
		Long: `review reads a decision file (written by sill report --save or the
explorer) and needs no data: every candidate cut side by side with the same
figures as the explorer's comparison strip, each with its difference from
the chosen one.

On a terminal it opens a screen where you move between candidates, mark one
as chosen, add a note to a candidate or to the file, sign it off, and write
the file back (atomically; the evidence is kept as it was). With --format
text or markdown it prints the comparison instead, for a sign-off document;
that is also what it does when standard output is not a terminal.

--sign NAME --verdict approve|revise|reject [--role ROLE] [--note TEXT]
appends a sign-off to the file and prints nothing else: under the file's
lock it reads the file as it is then and appends, so that sign-offs given at
the same moment all land. A sign-off records the chosen cut it was given
for; one given before the choice changed stays, marked as for the earlier
choice.

--against OLD.yaml shows what changes when this file's chosen cut replaces
the one in production (OLD.yaml): model, data, the assumptions that
changed, both chosen cuts' figures and the change per shift in plain words.

--format html writes the sign-off page: one self-contained HTML file (no
script, nothing fetched from elsewhere) with the trade-off drawn, the
candidates side by side, the workload per shift, stability, segments,
calibration, the assumptions, a glossary, the caution, the sign-offs and
lines to sign; it prints on A4 and Letter. With --against it sets both
chosen cuts side by side with both curves on one chart. --out FILE writes
it to FILE (replacing only a page sill wrote).`,
		Example: `  sill review cut.yaml
  sill review cut.yaml --format markdown > sign-off.md
  sill review cut.yaml --sign "Ada Quist" --role "operations lead" --verdict approve --note "fits the night crew"
  sill review new.yaml --against cut-in-production.yaml --format markdown
  sill review cut.yaml --format html --out sign-off.html
  sill review new.yaml --against cut-in-production.yaml --format html --out change.html`,
		Args: argsNamed("the decision file (or - for standard input)"),
		RunE: func(cmd *cobra.Command, args []string) error {
			switch outFormat {
			case "", "text", "markdown", "html":
			default:
				return fmt.Errorf("--format %q: expected text, markdown or html", outFormat)
			}
			if out != "" && outFormat != "html" {
				return errors.New("--out goes with --format html")
			}
			if signing.given() {
				if outFormat != "" || against != "" {
					return errors.New("--sign records a sign-off and prints nothing; run --format or --against apart")
				}
				return signing.sign(cmd.Context(), args[0], cmd.ErrOrStderr())
			}
			var old *decision.File
			if against != "" {
				var err error
				if old, err = decision.ReadFile(against); err != nil {
					return fmt.Errorf("--against: %w", err)
				}
			}
			var file *decision.File
			var stamp sharedfile.Stamp
			var err error
			if args[0] == "-" {
				file, err = decision.Read(cmd.InOrStdin(), "-")
				if outFormat == "" {
					outFormat = "text" // the screen writes back to a file
				}
			} else {
				file, stamp, err = decision.ReadFileStamped(args[0])
			}
			if err != nil {
				return err
			}
			if outFormat == "" {
				if isTerminal() && cmd.OutOrStdout() == os.Stdout {
					return runReviewScreen(cmd.Context(), file, stamp, args[0], old, against)
				}
				outFormat = "text"
			}
			if outFormat == "html" {
				return reviewPage(cmd, file, args[0], old, against, out)
			}
			if old != nil {
				change := review.Against(file, args[0], old, against)
				if outFormat == "markdown" {
					return review.WriteAgainstMarkdown(cmd.OutOrStdout(), change)
				}
				return review.WriteAgainstText(cmd.OutOrStdout(), change)
			}
			if outFormat == "markdown" {
				return review.WriteMarkdown(cmd.OutOrStdout(), file, args[0])
			}
			return review.WriteText(cmd.OutOrStdout(), file, args[0], "sill review FILE --sign NAME --role ROLE --verdict approve|revise|reject")
		},
	}
	fs := cmd.Flags()
	fs.StringVar(&outFormat, "format", "", "print instead of opening the screen: text, markdown or html (the sign-off page)")
	fs.StringVar(&out, "out", "", "with --format html: the file to write the page to (default: standard output)")
	fs.StringVar(&against, "against", "", "the decision file of the cut in production: show what changes with this one")
	fs.StringVar(&signing.name, "sign", "", "record a sign-off by this name in the file (with --verdict)")
	fs.StringVar(&signing.role, "role", "", "with --sign: the signer's role, such as \"operations lead\"")
	fs.StringVar(&signing.verdict, "verdict", "", "with --sign: approve, revise or reject")
	fs.StringVar(&signing.note, "note", "", "with --sign: a note to go with the verdict")
	return cmd
}

// runReviewScreen opens the review screen on file, read from path as
// stamp says, until the user quits.
func runReviewScreen(ctx context.Context, file *decision.File, stamp sharedfile.Stamp, path string, against *decision.File, againstPath string) error {
	renderer := lipgloss.NewRenderer(os.Stdout)
	if os.Getenv("NO_COLOR") != "" {
		renderer.SetColorProfile(termenv.Ascii)
	}
	styles := tui.DefaultStyles(renderer)
	screen := tui.NewReview(tui.ReviewConfig{File: file, Path: path, Stamp: stamp, Context: ctx, Styles: &styles,
		Against: against, AgainstPath: againstPath})
	final, err := tea.NewProgram(screen, tea.WithAltScreen()).Run()
	screen.WaitForWrites() // a write still going when the screen closed ends before the process does
	if err != nil {
		return fmt.Errorf("review: %w", err)
	}
	return reviewOutcome(final.(tui.Review), path, os.Stderr)
}

// reviewOutcome says on stderr what became of the file at path once the
// review screen r has closed, and returns the failed write that makes the
// exit status 2.
func reviewOutcome(r tui.Review, path string, stderr io.Writer) error {
	if err := r.WriteErr(); err != nil {
		return fmt.Errorf("the changes on screen were not written: %w", err)
	}
	switch {
	case r.Written() && !r.Changed():
		fmt.Fprintf(stderr, "sill: wrote %s; chosen %s\n", format.Printable(r.Path()), format.Printable(r.File().Chosen))
	case r.Changed():
		fmt.Fprintf(stderr, "sill: %s left as it was; the changes on screen were not written\n", format.Printable(path))
	}
	return nil
}
