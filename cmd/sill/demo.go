package main

import (
	"errors"
	"fmt"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// maxDemoRows bounds sill demo --rows: the set is made in memory, about
// 50 bytes a row.
const maxDemoRows = 1_000_000

func newDemoCmd() *cobra.Command {
	var (
		rows  int
		seed  uint64
		out   string
		force bool
	)
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Write the invented demo validation set (a fictional wagon-bearing alert desk) as CSV",
		Long: `demo writes an invented validation set: the wagon-bearing desk of the
fictional Veldmoor Freight depot, whose model scores axle-box vibration
readings for likely bearing faults. Columns: id, yard, read_at, score,
label. The same --rows and --seed always give the same file.

--out replaces an existing file only when it holds demo data; anything
else (a decision file, your own scores) only with --force.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if rows < 1 {
				return fmt.Errorf("--rows %d: expected at least 1", rows)
			}
			if rows > maxDemoRows {
				return fmt.Errorf("--rows %d: expected at most %d (the demo set is made in memory)", rows, maxDemoRows)
			}
			if force && (out == "" || out == "-") {
				return errors.New("--force goes with --out FILE")
			}
			data := demo.CSV(rows, seed)
			if out == "" || out == "-" {
				_, err := cmd.OutOrStdout().Write(data)
				return err
			}
			var opts sharedfile.Options
			if !force {
				opts.Kind = demo.Replaceable
			}
			if _, err := sharedfile.Write(cmd.Context(), out, data, opts); err != nil {
				if errors.Is(err, sharedfile.ErrOtherKind) {
					return fmt.Errorf("%w; add --force to replace it, or write to another file", err)
				}
				return err
			}
			fmt.Fprintf(cmd.ErrOrStderr(), "sill: wrote %d rows to %s\n", rows, out)
			return nil
		},
	}
	cmd.Flags().IntVar(&rows, "rows", demo.DefaultRows, "number of rows")
	cmd.Flags().Uint64Var(&seed, "seed", demo.DefaultSeed, "random seed")
	cmd.Flags().StringVar(&out, "out", "", "file to write (default: standard output)")
	cmd.Flags().BoolVar(&force, "force", false, "with --out: replace a file that does not hold demo data")
	return cmd
}
