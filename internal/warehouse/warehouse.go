// Package warehouse writes the SQL query that turns a table of scored cases
// in a database into a counts table: one row per rounded score (and
// segment) with the number of true cases, false cases and cases whose label
// is neither. `sill report --counts` reads that table as if it were the
// raw rows (see scores.ReadCounts), so a set of any size needs only the
// memory of its distinct scores.
//
// The query has one shape on every engine. An inner query reads each row:
// its score rounded (or NULL when the score is NULL or not a number), its
// segment and its label as trimmed text, under names that start with
// "sill_" and differ from every column the query names, so that no engine
// can mistake one for the other. The outer query groups by those names
// and sums the labels, and names the results score, positives, negatives
// and unrecognised only there. Cases without a numeric score land on rows
// with an empty score (NULL), which scores.ReadCounts counts as dropped,
// with their labels' counts; no engine turns them into a score.
//
// The standard dialect is SQL as the standard has it: SELECT, CASE, SUM,
// FLOOR, LOWER, TRIM, BETWEEN, one CAST of the label to text, a derived
// table, GROUP BY and ORDER BY, identifiers in double quotes. A score is a
// number when +score lies between -1e308 and 1e308: NULL, NaN and the
// infinities do not, and in SQLite, where a REAL column may hold text such
// as "" or "n/a", the unary plus makes the comparison by type, so text
// never counts as a number (nor does a number stored as text: declare the
// score column REAL). Dialects change only what an engine lacks; see
// Dialect. The tests run the query on SQLite 3.40, PostgreSQL 15 and
// through a two-shard Distributed table on ClickHouse 18.16. Nothing here
// runs a query.
package warehouse

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// MaxDigits is the most digits a score may be rounded to.
const MaxDigits = 12

// Errors returned by Query.SQL, inside a *FieldError.
var (
	ErrNoName    = errors.New("empty name")
	ErrBadDigits = fmt.Errorf("digits out of range, expected 0 to %d, or -1 to keep every score as it is", MaxDigits)
	// ErrBadTextType is returned for a type name with quotes, a semicolon,
	// a dash or a line break, which no type name needs.
	ErrBadTextType = errors.New("not a type name, expected one such as VARCHAR(255) or STRING")
	// ErrSegmentName is returned for a segment column named like one of
	// the counts table's own columns, which the table could not tell
	// apart from it.
	ErrSegmentName = errors.New("the counts table has its own columns of that name (score, positives, negatives, unrecognised); rename the column in a view first")
	// ErrUnknownDialect is returned by ParseDialect for a name it does not
	// know.
	ErrUnknownDialect = fmt.Errorf("unknown dialect, expected one of %s", strings.Join(DialectNames(), ", "))
)

// FieldError reports which part of a Query is wrong. Field names the part
// in words ("table", "score", "label", "segment", "digits", "text type",
// "dialect"); Value is the offending value as the message shows it, ""
// when the message shows none.
type FieldError struct {
	Field string
	Value string
	Err   error
}

func (e *FieldError) Error() string {
	if e.Value == "" {
		return e.Field + ": " + e.Err.Error()
	}
	return e.Field + " " + e.Value + ": " + e.Err.Error()
}

func (e *FieldError) Unwrap() error { return e.Err }

// Dialect names the SQL an engine reads. The zero value is Standard.
type Dialect int

const (
	// Standard is SQL as the standard has it; SQLite, PostgreSQL and
	// DuckDB read it as it is, and so do engines whose text type is
	// VARCHAR (others take Query.TextType).
	Standard Dialect = iota
	// ClickHouse differs from Standard in four places: the label is
	// trimmed with replaceRegexpAll (ClickHouse 18.16 has no TRIM); it is
	// cast to Nullable(String), as VARCHAR(255) takes no length there and
	// a NULL label cannot be cast to String; the score is tested as it is,
	// without the unary plus that ClickHouse does not read before a name;
	// and a backslash in a name or in the Positive text is doubled, as
	// ClickHouse reads it as an escape.
	ClickHouse
)

var dialectNames = [...]string{Standard: "standard", ClickHouse: "clickhouse"}

// DialectNames lists the dialects ParseDialect knows, Standard first.
func DialectNames() []string { return append([]string(nil), dialectNames[:]...) }

// ParseDialect returns the dialect of a name, in any case; "" is Standard.
func ParseDialect(name string) (Dialect, error) {
	name = strings.ToLower(strings.TrimSpace(name))
	if name == "" {
		return Standard, nil
	}
	for d, n := range dialectNames {
		if n == name {
			return Dialect(d), nil
		}
	}
	return Standard, ErrUnknownDialect
}

func (d Dialect) String() string {
	if d >= 0 && int(d) < len(dialectNames) {
		return dialectNames[d]
	}
	return "Dialect(" + strconv.Itoa(int(d)) + ")"
}

// textType is the dialect's text type for the label cast.
func (d Dialect) textType() string {
	if d == ClickHouse {
		return "Nullable(String)"
	}
	return "VARCHAR(255)"
}

// trim returns the expression that strips spaces from both ends of text.
func (d Dialect) trim(text string) string {
	if d == ClickHouse {
		return "replaceRegexpAll(" + text + ", '^ +| +$', '')"
	}
	return "TRIM(" + text + ")"
}

// quote returns name as the dialect's delimited identifier: ClickHouse
// reads a backslash in quotes as an escape, so it is doubled there.
func (d Dialect) quote(name string) string {
	if d == ClickHouse {
		name = strings.ReplaceAll(name, `\`, `\\`)
	}
	return Quote(name)
}

// literal returns text as the dialect's string literal, a backslash
// doubled in ClickHouse as in quote.
func (d Dialect) literal(text string) string {
	if d == ClickHouse {
		text = strings.ReplaceAll(text, `\`, `\\`)
	}
	return Literal(text)
}

// isNumber returns the condition that holds when score is a finite number
// within ±1e308: not NULL, not NaN, not infinite, and in SQLite not text
// (the unary plus takes away the column's type affinity, so that SQLite
// compares by storage class and every text is greater than any number).
// ClickHouse reads no unary plus before a name and has no text in a
// numeric column, so it compares the score as it is.
func (d Dialect) isNumber(score string) string {
	if d == ClickHouse {
		return score + " BETWEEN -1e308 AND 1e308"
	}
	return "+" + score + " BETWEEN -1e308 AND 1e308"
}

// Query says which table and columns to count.
type Query struct {
	Table   string // table name; dots separate schema and catalogue parts
	Score   string // score column
	Label   string // label column
	Segment string // optional group column, "" for none

	// Digits is how many decimal digits scores are rounded to before
	// counting: half up, as FLOOR(score * 10^D + 0.5) / 10^D computes it
	// in the engine's floating point. -1 keeps every score as it is.
	Digits int

	// Where is an optional SQL condition on the rows, used as written.
	Where string

	// Dialect is the SQL the engine reads; the zero value is Standard.
	// Names and the Positive text are quoted as the dialect needs; Where
	// is used as written.
	Dialect Dialect

	// TextType is the engine's name for a text type, into which the label
	// is cast before it is compared with the label words; "" means the
	// dialect's (VARCHAR(255) in Standard).
	TextType string

	// Positive, when set, is the only label text read as a true case;
	// every other value (NULL included) is a false case. When empty the
	// label words of scores.Options are used: 1/true/yes/y/t/positive/pos
	// and 0/false/no/n/f/negative/neg (and 1.0, 0.0), without regard to
	// case or surrounding spaces; cases with any other label, NULL
	// included, are counted as unrecognised, which ReadCounts refuses.
	Positive string

	// ReadBy is the command that reads the counts table, in the caller's
	// words, written as the query's first comment line; "" leaves the
	// line out.
	ReadBy string
}

// Label words, as scores reads them; 1.0 and 0.0 are how engines write a
// numeric label as text.
var (
	positiveWords = []string{"1", "1.0", "true", "yes", "y", "t", "positive", "pos"}
	negativeWords = []string{"0", "0.0", "false", "no", "n", "f", "negative", "neg"}
)

// SQL returns the query, ending in a newline. Errors are *FieldError
// values.
func (q Query) SQL() (string, error) {
	for _, n := range []struct{ field, name string }{{"table", q.Table}, {"score", q.Score}, {"label", q.Label}} {
		if strings.TrimSpace(n.name) == "" {
			return "", &FieldError{Field: n.field, Err: ErrNoName}
		}
	}
	if q.Digits < -1 || q.Digits > MaxDigits {
		return "", &FieldError{Field: "digits", Value: strconv.Itoa(q.Digits), Err: ErrBadDigits}
	}
	for _, own := range []string{"score", "positives", "negatives", "unrecognised"} {
		if strings.EqualFold(strings.TrimSpace(q.Segment), own) {
			return "", &FieldError{Field: "segment", Value: strconv.Quote(q.Segment), Err: ErrSegmentName}
		}
	}
	if q.Dialect < 0 || int(q.Dialect) >= len(dialectNames) {
		return "", &FieldError{Field: "dialect", Value: strconv.Quote(q.Dialect.String()), Err: ErrUnknownDialect}
	}
	table, err := q.Dialect.quoteQualified(q.Table)
	if err != nil {
		return "", &FieldError{Field: "table", Err: err}
	}
	textType := strings.TrimSpace(q.TextType)
	if textType == "" {
		textType = q.Dialect.textType()
	}
	if strings.ContainsAny(textType, ";'\"-\n") {
		return "", &FieldError{Field: "text type", Value: strconv.Quote(q.TextType), Err: ErrBadTextType}
	}
	names := q.innerNames()

	d := q.Dialect
	score := d.quote(q.Score)
	rounded := score
	if q.Digits >= 0 {
		scale := "1" + strings.Repeat("0", q.Digits)
		rounded = "FLOOR(" + score + " * " + scale + " + 0.5) / " + scale
	}
	label := names.label
	var positive, negative string
	if q.Positive != "" {
		positive = label + " = " + d.literal(q.Positive)
	} else {
		positive = "LOWER(" + label + ") IN (" + literals(positiveWords) + ")"
		negative = "LOWER(" + label + ") IN (" + literals(negativeWords) + ")"
	}

	var b strings.Builder
	if q.ReadBy != "" {
		b.WriteString("-- counts table for: " + q.ReadBy + "\n")
	}
	if q.Digits >= 0 {
		fmt.Fprintf(&b, "-- scores rounded half up to %d digits; export the result as CSV with a header\n", q.Digits)
	} else {
		b.WriteString("-- scores as they are; export the result as CSV with a header\n")
	}
	b.WriteString("-- cases whose score is NULL or not a number are counted on rows with no score, which sill reports as dropped\n")
	if q.Dialect != Standard {
		fmt.Fprintf(&b, "-- dialect: %s\n", q.Dialect)
	}
	b.WriteString("SELECT\n")
	fmt.Fprintf(&b, "  %s AS score,\n", names.score)
	group := names.score
	if q.Segment != "" {
		fmt.Fprintf(&b, "  %s AS %s,\n", names.segment, d.quote(q.Segment))
		group += ",\n  " + names.segment
	}
	if q.Positive != "" {
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 1 ELSE 0 END) AS positives,\n", positive)
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 0 ELSE 1 END) AS negatives\n", positive)
	} else {
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 1 ELSE 0 END) AS positives,\n", positive)
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 1 ELSE 0 END) AS negatives,\n", negative)
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 0 WHEN %s THEN 0 ELSE 1 END) AS unrecognised\n", positive, negative)
	}
	b.WriteString("FROM (\n  SELECT\n")
	fmt.Fprintf(&b, "    CASE WHEN %s THEN %s END AS %s,\n", d.isNumber(score), rounded, names.score)
	if q.Segment != "" {
		fmt.Fprintf(&b, "    %s AS %s,\n", d.quote(q.Segment), names.segment)
	}
	fmt.Fprintf(&b, "    %s AS %s\n", d.trim("CAST("+d.quote(q.Label)+" AS "+textType+")"), names.label)
	fmt.Fprintf(&b, "  FROM %s\n", table)
	if strings.TrimSpace(q.Where) != "" {
		fmt.Fprintf(&b, "  WHERE (%s)\n", strings.TrimSpace(q.Where))
	}
	fmt.Fprintf(&b, ") AS %s\n", names.rows)
	fmt.Fprintf(&b, "GROUP BY\n  %s\n", group)
	fmt.Fprintf(&b, "ORDER BY %s DESC\n", names.score)
	return b.String(), nil
}

// innerNames are the names the query gives its own columns and derived
// table.
type innerNames struct{ score, segment, label, rows string }

// innerNames picks names for the inner query's columns that no column the
// query names, and nothing in the condition, could be taken for: sill_score
// and so on, with a number added until none of them appears in a column
// name or in the condition (without regard to case).
func (q Query) innerNames() innerNames {
	taken := strings.ToLower(q.Score + "\x00" + q.Label + "\x00" + q.Segment + "\x00" + q.Where)
	for n := 1; ; n++ {
		suffix := ""
		if n > 1 {
			suffix = strconv.Itoa(n)
		}
		names := innerNames{"sill_score" + suffix, "sill_segment" + suffix, "sill_label" + suffix, "sill_rows" + suffix}
		if !strings.Contains(taken, names.score) && !strings.Contains(taken, names.segment) &&
			!strings.Contains(taken, names.label) && !strings.Contains(taken, names.rows) {
			return names
		}
	}
}

// Quote returns name as a delimited SQL identifier: in double quotes, a
// double quote inside doubled, as the SQL standard has it.
func Quote(name string) string {
	return `"` + strings.ReplaceAll(name, `"`, `""`) + `"`
}

// QuoteQualified quotes each dot-separated part of a table name, so that
// analytics.scored_cases becomes "analytics"."scored_cases".
func QuoteQualified(name string) (string, error) {
	return Standard.quoteQualified(name)
}

func (d Dialect) quoteQualified(name string) (string, error) {
	parts := strings.Split(name, ".")
	for i, p := range parts {
		if p == "" {
			return "", fmt.Errorf("%w in %q: a dot must separate two names", ErrNoName, name)
		}
		parts[i] = d.quote(p)
	}
	return strings.Join(parts, "."), nil
}

// Literal returns text as a SQL string literal, a single quote inside
// doubled.
func Literal(text string) string {
	return "'" + strings.ReplaceAll(text, "'", "''") + "'"
}

func literals(words []string) string {
	quoted := make([]string, len(words))
	for i, w := range words {
		quoted[i] = Literal(w)
	}
	return strings.Join(quoted, ", ")
}
