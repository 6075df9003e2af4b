package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/atomicfile"
	"github.com/sill-tool/sill/internal/demo"
)

func newDemoCmd() *cobra.Command {
	var (
		rows int
		seed uint64
		out  string
	)
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Write the invented demo validation set (a fictional wagon-bearing alert desk) as CSV",
		Long: `demo writes an invented validation set: the wagon-bearing desk of the
fictional Veldmoor Freight depot, whose model scores axle-box vibration
readings for likely bearing faults. Columns: id, yard, read_at, score,
label. The same --rows and --seed always give the same file.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if rows < 1 {
				return fmt.Errorf("--rows %d: expected at least 1", rows)
			}
			data := demo.CSV(rows, seed)
			if out == "" || out == "-" {
				_, err := cmd.OutOrStdout().Write(data)
				return err
			}
			if err := atomicfile.Write(out, data, 0o644); err != nil {
				return err
			}
			fmt.Fprintf(cmd.ErrOrStderr(), "sill: wrote %d rows to %s\n", rows, out)
			return nil
		},
	}
	cmd.Flags().IntVar(&rows, "rows", demo.DefaultRows, "number of rows")
	cmd.Flags().Uint64Var(&seed, "seed", demo.DefaultSeed, "random seed")
	cmd.Flags().StringVar(&out, "out", "", "file to write (default: standard output)")
	return cmd
}
