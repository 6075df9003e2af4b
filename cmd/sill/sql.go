package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/warehouse"
)

func newSQLCmd() *cobra.Command {
	q := warehouse.Query{Digits: 4}
	cmd := &cobra.Command{
		Use:   "sql --table T --score S --label L",
		Short: "Print the SQL query that counts a warehouse table into a counts table for --counts",
		Long: `sql prints one portable GROUP BY query that turns a table of scored cases in
your own database into a counts table: one row per rounded score (and
segment) with the number of true cases, false cases and cases whose label is
neither. Run it in your engine, export the result as CSV with a header, and
read it with sill report --counts (or any command that reads scores); every
figure comes out as from the raw rows with their scores rounded the same way.

Labels are read as sill reads them: 1/true/yes/y/t/positive/pos against
0/false/no/n/f/negative/neg, in any case, or --positive names the one true
value. Identifiers are quoted, so names with spaces, capitals or quotes are
safe; --where is used as written. sill runs nothing: the query is printed on
standard output.

The query is plain SQL with identifiers in double quotes, as the SQL
standard has them; sill's tests run it on SQLite and PostgreSQL, and it was
run by hand on DuckDB. An engine whose text type is not called VARCHAR takes
--text-type (STRING, say); one that quotes identifiers otherwise needs its
own setting for that or a hand edit.`,
		Example: `  sill sql --table analytics.bearing_scores --score p_fail --label failed > counts.sql
  sill sql --table scored --score score --label outcome --positive failed --segment yard --where "scored_on >= '2026-01-01'"
  sill report counts.csv --counts --volume 1500`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			text, err := q.SQL()
			if err != nil {
				return err
			}
			_, err = fmt.Fprint(cmd.OutOrStdout(), text)
			return err
		},
	}
	fs := cmd.Flags()
	fs.StringVar(&q.Table, "table", "", "table to count (schema.table allowed)")
	fs.StringVar(&q.Score, "score", "", "score column")
	fs.StringVar(&q.Label, "label", "", "label column")
	fs.IntVar(&q.Digits, "digits", q.Digits, fmt.Sprintf("round scores half up to this many decimal digits (0 to %d; -1 keeps them as they are)", warehouse.MaxDigits))
	fs.StringVar(&q.Segment, "segment", "", "optional group column, kept in the counts table")
	fs.StringVar(&q.Where, "where", "", "optional SQL condition on the rows, used as written")
	fs.StringVar(&q.Positive, "positive", "", "the only label value that means a true case (default: the usual label words)")
	fs.StringVar(&q.TextType, "text-type", "", "the engine's text type for the label cast (default VARCHAR(255)), e.g. STRING")
	for _, name := range []string{"table", "score", "label"} {
		_ = cmd.MarkFlagRequired(name)
	}
	return cmd
}
