package warehouse

import (
	"bytes"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/scores"
)

var update = flag.Bool("update", false, "rewrite the golden files")

// TestQuote checks identifier and literal quoting; the expected forms
// follow the SQL standard's delimited identifiers and character literals
// (a quote inside is doubled), written out by hand.
func TestQuote(t *testing.T) {
	cases := []struct{ in, ident, literal string }{
		{`score`, `"score"`, `'score'`},
		{`p fail`, `"p fail"`, `'p fail'`},
		{`a"b`, `"a""b"`, `'a"b'`},
		{`it's`, `"it's"`, `'it''s'`},
		{`x"; DROP TABLE t; --`, `"x""; DROP TABLE t; --"`, `'x"; DROP TABLE t; --'`},
	}
	for _, c := range cases {
		if got := Quote(c.in); got != c.ident {
			t.Errorf("Quote(%q) = %s, want %s", c.in, got, c.ident)
		}
		if got := Literal(c.in); got != c.literal {
			t.Errorf("Literal(%q) = %s, want %s", c.in, got, c.literal)
		}
	}
	if got, err := QuoteQualified(`lake.analytics.scored "cases"`); err != nil || got != `"lake"."analytics"."scored ""cases"""` {
		t.Errorf("QuoteQualified = %s, %v", got, err)
	}
	if _, err := QuoteQualified("lake..cases"); err == nil {
		t.Error("QuoteQualified accepted an empty part")
	}
}

func TestSQLErrors(t *testing.T) {
	cases := []struct {
		q    Query
		want string
	}{
		{Query{Score: "s", Label: "l"}, "--table: empty name"},
		{Query{Table: "t", Label: "l"}, "--score: empty name"},
		{Query{Table: "t", Score: "s", Label: "l", Digits: 13}, "--digits 13: digits out of range, expected 0 to 12, or -1 to keep every score as it is"},
		{Query{Table: "t.", Score: "s", Label: "l"}, `--table: empty name in "t.": a dot must separate two names`},
		{Query{Table: "t", Score: "s", Label: "l", Segment: "Positives"}, `--segment "Positives": the counts table has its own columns of that name (score, positives, negatives, unrecognised); rename the column in a view first`},
		{Query{Table: "t", Score: "s", Label: "l", Segment: "score"}, `--segment "score": the counts table has its own columns of that name (score, positives, negatives, unrecognised); rename the column in a view first`},
		{Query{Table: "t", Score: "s", Label: "l", TextType: "TEXT); DROP TABLE t; --"}, `--text-type "TEXT); DROP TABLE t; --": not a type name, expected one such as VARCHAR(255) or STRING`},
	}
	for _, c := range cases {
		if _, err := c.q.SQL(); err == nil || err.Error() != c.want {
			t.Errorf("%+v: error %v, want %s", c.q, err, c.want)
		}
	}
}

// TestSQLGolden compares the printed queries with golden files, read and
// checked by hand when written (go test ./internal/warehouse -update).
func TestSQLGolden(t *testing.T) {
	cases := map[string]Query{
		"default-words-4-digits":  {Table: "analytics.bearing_scores", Score: "p_fail", Label: "failed", Digits: 4},
		"positive-segment-where":  {Table: "scored", Score: "Score", Label: "outcome", Digits: 2, Segment: "yard", Where: "scored_on >= '2026-01-01'", Positive: "failed"},
		"unrounded-awkward-names": {Table: `odd "name"`, Score: "p fail", Label: "it's", Digits: -1},
		"text-type-string":        {Table: "lake.scores", Score: "score", Label: "label", Digits: 4, TextType: "STRING"},
	}
	for name, q := range cases {
		got, err := q.SQL()
		if err != nil {
			t.Fatal(err)
		}
		path := filepath.Join("testdata", t.Name(), name+".golden")
		if *update {
			os.MkdirAll(filepath.Dir(path), 0o755)
			if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		want, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%s: %v (run with -update)", name, err)
		}
		if got != string(want) {
			t.Errorf("%s: query differs from %s:\n%s", name, path, got)
		}
	}
}

// rawCase is one scored case of the tables loaded into the databases.
type rawCase struct {
	score float64 // six decimals, never half way at the digits rounded to
	label string
	yard  string
}

// labelWords are label texts as they appear in real tables, with the
// class the reader gives them.
var labelWords = []struct {
	text     string
	positive bool
}{{"1", true}, {"0", false}, {" Yes", true}, {"no", false}, {"TRUE", true}, {"f", false}, {"positive", true}, {"neg ", false}}

// rawCases makes seeded cases whose scores are k/10^6 with the three digits
// after the rounding point never 500, so that rounding half up at 3 digits
// has no ties to break and every correct rounding agrees.
func rawCases(n int, seed uint64) []rawCase {
	rng := rand.New(rand.NewPCG(seed, 99))
	cases := make([]rawCase, n)
	for i := range cases {
		k := rng.IntN(1_000_000)
		if k%1000 == 500 {
			k++
		}
		positive := rng.IntN(6) == 0
		var word string
		for {
			w := labelWords[rng.IntN(len(labelWords))]
			if w.positive == positive {
				word = w.text
				break
			}
		}
		cases[i] = rawCase{score: float64(k) / 1e6, label: word, yard: []string{"north", "east", "west", "south"}[rng.IntN(4)]}
	}
	return cases
}

// reference is the raw rows read by sill with their scores rounded in Go
// the way the query rounds them, the yard "west" left out as the query's
// condition leaves it out.
func reference(t *testing.T, cases []rawCase, digits int, positive string) *scores.Set {
	t.Helper()
	var b strings.Builder
	b.WriteString("score,label,yard\n")
	scale := math.Pow(10, float64(digits))
	for _, c := range cases {
		if c.yard == "west" {
			continue
		}
		rounded := math.Floor(c.score*scale+0.5) / scale
		fmt.Fprintf(&b, "%s,%s,%s\n", strconv.FormatFloat(rounded, 'g', -1, 64), c.label, c.yard)
	}
	set, err := scores.Read(strings.NewReader(b.String()), "raw.csv", scores.Options{SegmentColumn: "yard", Positive: positive})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// sameCurve checks that counts give the reference's curve: every cut's
// score, cases, TP and FP, and the summary's counts, ROC AUC and average
// precision, exactly.
func sameCurve(t *testing.T, engine string, want, got *scores.Set) {
	t.Helper()
	var wantPoints, gotPoints []curve.Point
	wantSum := curve.Walk(want, func(p curve.Point) { wantPoints = append(wantPoints, p) })
	gotSum := curve.Walk(got, func(p curve.Point) { gotPoints = append(gotPoints, p) })
	if len(wantPoints) != len(gotPoints) {
		t.Fatalf("%s: %d cuts from the raw rows, %d from the counts", engine, len(wantPoints), len(gotPoints))
	}
	for i := range wantPoints {
		w, g := wantPoints[i], gotPoints[i]
		if w.Score != g.Score || w.Cases != g.Cases || w.TP != g.TP || w.FP != g.FP {
			t.Fatalf("%s: cut %d: raw rows give %+v, counts give %+v", engine, i, w, g)
		}
	}
	if wantSum.Rows != gotSum.Rows || wantSum.Positives != gotSum.Positives || wantSum.Negatives != gotSum.Negatives ||
		wantSum.ROCAUC != gotSum.ROCAUC || wantSum.AveragePrecision != gotSum.AveragePrecision {
		t.Fatalf("%s: summaries differ\nraw    %+v\ncounts %+v", engine, wantSum, gotSum)
	}
	if len(got.SegmentNames) != 3 {
		t.Errorf("%s: segments %v, want north, east and south", engine, got.SegmentNames)
	}
}

// The table and column names of the loaded tables: awkward on purpose, so
// that the query's quoting is tried for real.
const (
	tableName   = `scored "cases"`
	scoreColumn = "p Fail"
	labelColumn = "it's failed"
	yardColumn  = "yard"
)

func testQuery() Query {
	return Query{Table: tableName, Score: scoreColumn, Label: labelColumn, Segment: yardColumn, Digits: 3, Where: Quote(yardColumn) + " <> 'west'"}
}

// insertSQL writes the statements that create and fill the raw table.
func insertSQL(table string, cases []rawCase, scoreType string) string {
	var b strings.Builder
	fmt.Fprintf(&b, "CREATE TABLE %s (%s %s, %s VARCHAR(20), %s VARCHAR(20));\n", table, Quote(scoreColumn), scoreType, Quote(labelColumn), Quote(yardColumn))
	for start := 0; start < len(cases); start += 500 {
		fmt.Fprintf(&b, "INSERT INTO %s VALUES\n", table)
		for i, c := range cases[start:min(start+500, len(cases))] {
			if i > 0 {
				b.WriteString(",\n")
			}
			fmt.Fprintf(&b, "(%s, %s, %s)", strconv.FormatFloat(c.score, 'f', 6, 64), Literal(c.label), Literal(c.yard))
		}
		b.WriteString(";\n")
	}
	return b.String()
}

// TestCountsQueryOnSQLite loads a raw table into SQLite (the sqlite3
// command line), runs the printed query, and checks that the counts table
// it returns gives the curve of the raw rows rounded to 3 digits, with the
// label words and with --positive.
func TestCountsQueryOnSQLite(t *testing.T) {
	sqlite, err := exec.LookPath("sqlite3")
	if err != nil {
		t.Skip("sqlite3 not found on PATH: install Debian's sqlite3 to run this test")
	}
	cases := rawCases(5000, 1)
	query, err := testQuery().SQL()
	if err != nil {
		t.Fatal(err)
	}
	db := filepath.Join(t.TempDir(), "raw.db")
	run := func(script string, args ...string) []byte {
		cmd := exec.Command(sqlite, append(args, db)...)
		cmd.Stdin = strings.NewReader(script)
		var stderr bytes.Buffer
		cmd.Stderr = &stderr
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("sqlite3: %v: %s", err, stderr.String())
		}
		return out
	}
	run(insertSQL(Quote(tableName), cases, "REAL"))
	out := run(query, "-csv", "-header")
	set, err := scores.ReadCounts(bytes.NewReader(out), "sqlite.csv", scores.Options{SegmentColumn: yardColumn})
	if err != nil {
		t.Fatalf("%v\nquery output begins %q", err, out[:min(len(out), 300)])
	}
	sameCurve(t, "sqlite", reference(t, cases, 3, ""), set)

	// With --positive only that text is a true case: " Yes", "1" and the
	// rest count as false cases here.
	q := testQuery()
	q.Positive = "TRUE"
	if query, err = q.SQL(); err != nil {
		t.Fatal(err)
	}
	out = run(query, "-csv", "-header")
	if set, err = scores.ReadCounts(bytes.NewReader(out), "sqlite.csv", scores.Options{SegmentColumn: yardColumn}); err != nil {
		t.Fatal(err)
	}
	sameCurve(t, "sqlite --positive", reference(t, cases, 3, "TRUE"), set)
}

// TestCountsQueryOnPostgres does the same on PostgreSQL through psql. It
// needs a server: .ci/run starts one (.ci/postgres) and sets
// SILL_POSTGRES_PORT; without it the test is skipped.
func TestCountsQueryOnPostgres(t *testing.T) {
	port := os.Getenv("SILL_POSTGRES_PORT")
	if port == "" {
		t.Skip("no PostgreSQL server: set SILL_POSTGRES_PORT to a server on 127.0.0.1 that user postgres may use (eval \"$(.ci/postgres start)\" starts one)")
	}
	psql, err := exec.LookPath("psql")
	if err != nil {
		t.Skip("psql not found on PATH: install Debian's postgresql-client to run this test")
	}
	schema := fmt.Sprintf("sill_test_%d", os.Getpid())
	run := func(script string, args ...string) []byte {
		cmd := exec.Command(psql, append([]string{"-X", "-q", "-v", "ON_ERROR_STOP=1", "-h", "127.0.0.1", "-p", port, "-U", "postgres", "-d", "postgres"}, args...)...)
		cmd.Stdin = strings.NewReader(script)
		var stderr bytes.Buffer
		cmd.Stderr = &stderr
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("psql: %v: %s", err, stderr.String())
		}
		return out
	}
	run("CREATE SCHEMA " + Quote(schema) + ";")
	t.Cleanup(func() { run("DROP SCHEMA " + Quote(schema) + " CASCADE;") })
	cases := rawCases(5000, 2)
	q := testQuery()
	q.Table = schema + "." + tableName
	query, err := q.SQL()
	if err != nil {
		t.Fatal(err)
	}
	for _, scoreType := range []string{"DOUBLE PRECISION", "NUMERIC(9, 6)"} {
		table := Quote(schema) + "." + Quote(tableName)
		run("DROP TABLE IF EXISTS " + table + ";\n" + insertSQL(table, cases, scoreType))
		out := run(query, "--csv")
		set, err := scores.ReadCounts(bytes.NewReader(out), "postgres.csv", scores.Options{SegmentColumn: yardColumn})
		if err != nil {
			t.Fatalf("%s: %v\nquery output begins %q", scoreType, err, out[:min(len(out), 300)])
		}
		sameCurve(t, "postgres "+scoreType, reference(t, cases, 3, ""), set)
	}
}
