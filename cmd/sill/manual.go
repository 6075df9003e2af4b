package main

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/cobra/doc"

	"github.com/sill-tool/sill/internal/sharedfile"
)

// newManualCmd returns the hidden command that writes the man pages of the
// command tree into a folder; the release build runs it before packing the
// archives (.goreleaser.yaml).
func newManualCmd() *cobra.Command {
	return &cobra.Command{
		Use:    "manual FOLDER",
		Short:  "Write the man pages of every command into FOLDER (made if missing)",
		Hidden: true,
		Args:   argsNamed("FOLDER (where the man pages go)"),
		RunE: func(cmd *cobra.Command, args []string) error {
			names, err := writeManual(cmd.Context(), cmd.Root(), args[0])
			if err != nil {
				return err
			}
			fmt.Fprintf(cmd.ErrOrStderr(), "sill: wrote %d man pages to %s\n", len(names), args[0])
			return nil
		},
	}
}

// writeManual writes one man page (section 1) per command of the tree
// under root into dir, named as man expects (sill.1, sill-report.1, ...),
// and returns their file names. The pages carry toolVersion and the date
// of SOURCE_DATE_EPOCH, else of today. It changes the commands it is given
// (their descriptions become preformatted text), so give it a tree made
// for the purpose.
func writeManual(ctx context.Context, root *cobra.Command, dir string) ([]string, error) {
	// The pages cover the completion command and the --version flag that
	// cobra adds when the binary runs.
	root.InitDefaultCompletionCmd()
	root.InitDefaultVersionFlag()
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("manual: %w", err)
	}
	var names []string
	var write func(cmd *cobra.Command) error
	write = func(cmd *cobra.Command) error {
		// The descriptions are laid out for a terminal, with aligned
		// columns: keep them as they are rather than reflowed.
		if cmd.Long != "" {
			cmd.Long = "```\n" + strings.TrimRight(cmd.Long, "\n") + "\n```"
		}
		cmd.DisableAutoGenTag = true
		var page bytes.Buffer
		header := &doc.GenManHeader{Section: "1", Source: toolVersion(), Manual: "sill manual"}
		if err := doc.GenMan(cmd, header, &page); err != nil {
			return fmt.Errorf("manual: %s: %w", cmd.CommandPath(), err)
		}
		name := strings.ReplaceAll(cmd.CommandPath(), " ", "-") + ".1"
		if _, err := sharedfile.Write(ctx, filepath.Join(dir, name), page.Bytes(), sharedfile.Options{Perm: 0o644}); err != nil {
			return fmt.Errorf("manual: %w", err)
		}
		names = append(names, name)
		for _, sub := range cmd.Commands() {
			if sub.IsAvailableCommand() && !sub.IsAdditionalHelpTopicCommand() {
				if err := write(sub); err != nil {
					return err
				}
			}
		}
		return nil
	}
	return names, write(root)
}
