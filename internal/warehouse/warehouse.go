// Package warehouse writes the SQL query that turns a table of scored cases
// in a database into a counts table: one row per rounded score (and
// segment) with the number of true cases, false cases and cases whose label
// is neither. `sill report --counts` reads that table as if it were the
// raw rows (see scores.ReadCounts), so a set of any size needs only the
// memory of its distinct scores.
//
// The query is plain SQL: SELECT, CASE, SUM, FLOOR, LOWER, TRIM, one CAST
// of the label to text, GROUP BY and ORDER BY, with identifiers in double
// quotes as the SQL standard has them. The tests run it on SQLite 3.40 and
// PostgreSQL 15; it was also run by hand on DuckDB 1.5.6. An engine whose
// text type has another name (STRING, say) takes it as Query.TextType; one
// that quotes identifiers otherwise than with double quotes needs its own
// setting for that or a hand edit. Nothing here runs a query.
package warehouse

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// MaxDigits is the most digits a score may be rounded to.
const MaxDigits = 12

// Errors returned by Query.SQL.
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
)

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

	// TextType is the engine's name for a text type, into which the label
	// is cast before it is compared with the label words; "" means
	// VARCHAR(255).
	TextType string

	// Positive, when set, is the only label text read as a true case;
	// every other value (NULL included) is a false case. When empty the
	// label words of scores.Options are used: 1/true/yes/y/t/positive/pos
	// and 0/false/no/n/f/negative/neg (and 1.0, 0.0), without regard to
	// case or surrounding spaces; cases with any other label, NULL
	// included, are counted as unrecognised, which ReadCounts refuses.
	Positive string
}

// Label words, as scores reads them; 1.0 and 0.0 are how engines write a
// numeric label as text.
var (
	positiveWords = []string{"1", "1.0", "true", "yes", "y", "t", "positive", "pos"}
	negativeWords = []string{"0", "0.0", "false", "no", "n", "f", "negative", "neg"}
)

// SQL returns the query, ending in a newline.
func (q Query) SQL() (string, error) {
	for _, n := range []struct{ flag, name string }{{"table", q.Table}, {"score", q.Score}, {"label", q.Label}} {
		if strings.TrimSpace(n.name) == "" {
			return "", fmt.Errorf("--%s: %w", n.flag, ErrNoName)
		}
	}
	if q.Digits < -1 || q.Digits > MaxDigits {
		return "", fmt.Errorf("--digits %d: %w", q.Digits, ErrBadDigits)
	}
	for _, own := range []string{"score", "positives", "negatives", "unrecognised"} {
		if strings.EqualFold(strings.TrimSpace(q.Segment), own) {
			return "", fmt.Errorf("--segment %q: %w", q.Segment, ErrSegmentName)
		}
	}
	table, err := QuoteQualified(q.Table)
	if err != nil {
		return "", fmt.Errorf("--table: %w", err)
	}
	score := Quote(q.Score)
	if q.Digits >= 0 {
		scale := "1" + strings.Repeat("0", q.Digits)
		score = "FLOOR(" + score + " * " + scale + " + 0.5) / " + scale
	}
	textType := strings.TrimSpace(q.TextType)
	if textType == "" {
		textType = "VARCHAR(255)"
	}
	if strings.ContainsAny(textType, ";'\"-\n") {
		return "", fmt.Errorf("--text-type %q: %w", q.TextType, ErrBadTextType)
	}
	labelText := "TRIM(CAST(" + Quote(q.Label) + " AS " + textType + "))"
	var positive, negative string
	if q.Positive != "" {
		positive = labelText + " = " + Literal(q.Positive)
	} else {
		positive = "LOWER(" + labelText + ") IN (" + literals(positiveWords) + ")"
		negative = "LOWER(" + labelText + ") IN (" + literals(negativeWords) + ")"
	}

	var b strings.Builder
	fmt.Fprintf(&b, "-- counts table for: sill report --counts FILE")
	if q.Segment != "" {
		fmt.Fprintf(&b, " --segment %s", shellWord(q.Segment))
	}
	b.WriteString("\n")
	if q.Digits >= 0 {
		fmt.Fprintf(&b, "-- scores rounded half up to %d digits; export the result as CSV with a header\n", q.Digits)
	} else {
		b.WriteString("-- scores as they are; export the result as CSV with a header\n")
	}
	b.WriteString("SELECT\n")
	fmt.Fprintf(&b, "  %s AS score,\n", score)
	group := score
	if q.Segment != "" {
		segment := Quote(q.Segment)
		fmt.Fprintf(&b, "  %s AS %s,\n", segment, segment)
		group += ",\n  " + segment
	}
	if q.Positive != "" {
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 1 ELSE 0 END) AS positives,\n", positive)
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 0 ELSE 1 END) AS negatives\n", positive)
	} else {
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 1 ELSE 0 END) AS positives,\n", positive)
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 1 ELSE 0 END) AS negatives,\n", negative)
		fmt.Fprintf(&b, "  SUM(CASE WHEN %s THEN 0 WHEN %s THEN 0 ELSE 1 END) AS unrecognised\n", positive, negative)
	}
	fmt.Fprintf(&b, "FROM %s\n", table)
	if strings.TrimSpace(q.Where) != "" {
		fmt.Fprintf(&b, "WHERE (%s)\n", strings.TrimSpace(q.Where))
	}
	fmt.Fprintf(&b, "GROUP BY\n  %s\n", group)
	b.WriteString("ORDER BY score DESC\n")
	return b.String(), nil
}

// Quote returns name as a delimited SQL identifier: in double quotes, a
// double quote inside doubled, as the SQL standard has it.
func Quote(name string) string {
	return `"` + strings.ReplaceAll(name, `"`, `""`) + `"`
}

// QuoteQualified quotes each dot-separated part of a table name, so that
// analytics.scored_cases becomes "analytics"."scored_cases".
func QuoteQualified(name string) (string, error) {
	parts := strings.Split(name, ".")
	for i, p := range parts {
		if p == "" {
			return "", fmt.Errorf("%w in %q: a dot must separate two names", ErrNoName, name)
		}
		parts[i] = Quote(p)
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

// shellWord quotes a word for the comment line when it needs it.
func shellWord(word string) string {
	if word != "" && strings.IndexFunc(word, func(r rune) bool {
		return !(r == '_' || r == '-' || r == '.' || r >= '0' && r <= '9' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z')
	}) < 0 {
		return word
	}
	return strconv.Quote(word)
}
