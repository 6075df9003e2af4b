package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"
)

func newRootCmd() *cobra.Command {
	root := &cobra.Command{
		Use:   "sill",
		Short: "Choose, justify and hand over the operating cut of a binary classifier",
		Long: `sill shows every cut of a scored validation set in the units an operation
thinks in: hit share (recall), wrong-alert share (false discovery rate),
alerts per shift and cost, with their uncertainty, projected to production's
base rate and volume.

Run with no arguments to explore the built-in demo data.`,
		Version:       toolVersion(),
		SilenceUsage:  true,
		SilenceErrors: true,
		Args:          cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runDefault(cmd)
		},
	}
	root.AddCommand(newReportCmd(), newDemoCmd())
	root.AddCommand(newExploreCmd())
	root.AddCommand(newCheckCmd())
	root.AddCommand(newReviewCmd())
	root.AddCommand(newSQLCmd())
	root.AddCommand(newManualCmd())
	root.AddCommand(newServeCmd())
	root.SetVersionTemplate("{{.Version}}\n")
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return flagValueTypeError(err) })
	return root
}

// argsNamed accepts exactly the arguments named, and otherwise says which
// ones the command takes, such as "report takes one argument, FILE (the
// validation set, or - for standard input); got 0".
func argsNamed(names ...string) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if len(args) == len(names) {
			return nil
		}
		what := "one argument, " + names[0]
		if len(names) > 1 {
			what = fmt.Sprintf("%d arguments, %s", len(names), strings.Join(names, " then "))
		}
		return fmt.Errorf("%s takes %s; got %d (see sill %s --help)", cmd.Name(), what, len(args), cmd.Name())
	}
}
