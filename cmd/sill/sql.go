package main

import (
	"errors"
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/warehouse"
)

func newSQLCmd() *cobra.Command {
	q := warehouse.Query{Digits: 4}
	var dialect string
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

Cases whose score is NULL or not a number are counted on rows with no
score; --counts reports them as dropped rows, with how many were true and
false cases, and never turns them into a score.

The query is standard SQL with identifiers in double quotes; it rounds in
an inner query and groups outside it, so no engine mixes a column with the
result's names. sill's tests run it on SQLite, PostgreSQL and, with
--dialect clickhouse, through a two-shard Distributed table on ClickHouse.
--dialect clickhouse trims the label with replaceRegexpAll, casts it to
Nullable(String), tests the score without a unary plus and doubles
backslashes in names and the --positive text. An engine whose text type is
not called VARCHAR takes --text-type (STRING, say); one that quotes
identifiers otherwise than with double quotes needs a hand edit.`,
		Example: `  sill sql --table analytics.bearing_scores --score p_fail --label failed > counts.sql
  sill sql --table scored --score score --label outcome --positive failed --segment yard --where "scored_on >= '2026-01-01'"
  sill sql --dialect clickhouse --table desk.scored_all --score p_fail --label failed --segment yard
  sill report counts.csv --counts --volume 1500`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			var err error
			if q.Dialect, err = warehouse.ParseDialect(dialect); err != nil {
				return fmt.Errorf("--dialect %q: %w", dialect, err)
			}
			q.ReadBy = "sill report --counts FILE"
			if q.Segment != "" {
				q.ReadBy += " --segment " + shellWord(q.Segment)
			}
			text, err := q.SQL()
			if err != nil {
				return sqlFlagError(err)
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
	fs.StringVar(&dialect, "dialect", "standard", "the SQL the engine reads: "+strings.Join(warehouse.DialectNames(), " or "))
	fs.StringVar(&q.TextType, "text-type", "", "the engine's text type for the label cast (default VARCHAR(255), Nullable(String) in clickhouse), e.g. STRING")
	for _, name := range []string{"table", "score", "label"} {
		_ = cmd.MarkFlagRequired(name)
	}
	return cmd
}

// sqlFlagError names the flag that sets the part of the query an error is
// about.
func sqlFlagError(err error) error {
	var fe *warehouse.FieldError
	if !errors.As(err, &fe) {
		return err
	}
	flag := "--" + strings.ReplaceAll(fe.Field, " ", "-")
	if fe.Value != "" {
		flag += " " + fe.Value
	}
	return fmt.Errorf("%s: %w", flag, fe.Err)
}
