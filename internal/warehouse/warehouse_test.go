package warehouse

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
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

// TestSQLErrors checks the messages of bad queries, written out by hand:
// they name the part of the query, never a flag (cmd adds the flags).
func TestSQLErrors(t *testing.T) {
	cases := []struct {
		q     Query
		field string
		want  string
	}{
		{Query{Score: "s", Label: "l"}, "table", "table: empty name"},
		{Query{Table: "t", Label: "l"}, "score", "score: empty name"},
		{Query{Table: "t", Score: "s", Label: "l", Digits: 13}, "digits", "digits 13: digits out of range, expected 0 to 12, or -1 to keep every score as it is"},
		{Query{Table: "t.", Score: "s", Label: "l"}, "table", `table: empty name in "t.": a dot must separate two names`},
		{Query{Table: "t", Score: "s", Label: "l", Segment: "Positives"}, "segment", `segment "Positives": the counts table has its own columns of that name (score, positives, negatives, unrecognised); rename the column in a view first`},
		{Query{Table: "t", Score: "s", Label: "l", Segment: "score"}, "segment", `segment "score": the counts table has its own columns of that name (score, positives, negatives, unrecognised); rename the column in a view first`},
		{Query{Table: "t", Score: "s", Label: "l", TextType: "TEXT); DROP TABLE t; --"}, "text type", `text type "TEXT); DROP TABLE t; --": not a type name, expected one such as VARCHAR(255) or STRING`},
		{Query{Table: "t", Score: "s", Label: "l", Dialect: 7}, "dialect", `dialect "Dialect(7)": unknown dialect, expected one of standard, clickhouse`},
	}
	for _, c := range cases {
		_, err := c.q.SQL()
		var fe *FieldError
		if err == nil || err.Error() != c.want || !errors.As(err, &fe) || fe.Field != c.field {
			t.Errorf("%+v: error %v, want %s about %s", c.q, err, c.want, c.field)
		}
		if strings.Contains(fmt.Sprint(err), "--") && c.field != "text type" {
			t.Errorf("%+v: %v names a flag", c.q, err)
		}
	}
}

// TestParseDialect checks the dialect names, in any case, and the refusal
// of others.
func TestParseDialect(t *testing.T) {
	for _, c := range []struct {
		name string
		want Dialect
	}{{"", Standard}, {"standard", Standard}, {" ClickHouse ", ClickHouse}} {
		if got, err := ParseDialect(c.name); err != nil || got != c.want {
			t.Errorf("ParseDialect(%q) = %v, %v; want %v", c.name, got, err, c.want)
		}
	}
	if _, err := ParseDialect("spark"); !errors.Is(err, ErrUnknownDialect) {
		t.Errorf("ParseDialect(spark) = %v, want ErrUnknownDialect", err)
	}
}

// TestInnerNames checks that the inner query's names step aside from
// columns and conditions that use them, without regard to case.
func TestInnerNames(t *testing.T) {
	if got := (Query{Score: "p", Label: "l"}).innerNames(); got.score != "sill_score" || got.rows != "sill_rows" {
		t.Errorf("plain names: %+v", got)
	}
	for _, q := range []Query{
		{Score: "SILL_SCORE", Label: "l"},
		{Score: "p", Label: "l", Segment: "sill_segment"},
		{Score: "p", Label: "l", Where: `"Sill_Label" IS NOT NULL`},
	} {
		if got := q.innerNames(); got.score != "sill_score2" || got.segment != "sill_segment2" || got.label != "sill_label2" {
			t.Errorf("%+v: %+v, want the names with 2", q, got)
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
		"clickhouse-segment":      {Table: `desk.scored_all`, Score: `p\fail`, Label: "failed", Segment: "yard", Digits: 3, Dialect: ClickHouse, Positive: `y\es`},
		"clickhouse-text-type":    {Table: "scored", Score: "p", Label: "failed", Digits: 2, Dialect: ClickHouse, TextType: "String"},
	}
	for name, q := range cases {
		q.ReadBy = "sill report --counts FILE" // as cmd words it
		if q.Segment != "" {
			q.ReadBy += " --segment " + q.Segment
		}
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

// scoreKind says what a case's score cell holds in the loaded tables.
type scoreKind int

const (
	scoreNumber    scoreKind = iota
	scoreNull                // NULL
	scoreNotNumber           // text in SQLite ("" or "n/a"), NaN or an infinity elsewhere
)

// rawCase is one scored case of the tables loaded into the databases.
type rawCase struct {
	score     float64 // six decimals, never half way at the digits rounded to
	kind      scoreKind
	label     string
	nullLabel bool // only where the score is not a number
	yard      string
}

// labelWords are label texts as they appear in real tables, with the
// class the reader gives them.
var labelWords = []struct {
	text     string
	positive bool
}{{"1", true}, {"0", false}, {" Yes", true}, {"no", false}, {"TRUE", true}, {"f", false}, {"positive", true}, {"neg ", false}}

// rawCases makes seeded cases whose scores are k/10^6 with the three digits
// after the rounding point never 500, so that rounding half up at 3 digits
// has no ties to break and every correct rounding agrees. About one case
// in 25 has a NULL score and one in 25 a score that is not a number; a
// quarter of those have a NULL label.
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
		c := rawCase{score: float64(k) / 1e6, label: word, yard: []string{"north", "east", "west", "south"}[rng.IntN(4)]}
		switch rng.IntN(25) {
		case 0:
			c.kind = scoreNull
		case 1:
			c.kind = scoreNotNumber
		}
		c.nullLabel = c.kind != scoreNumber && rng.IntN(4) == 0
		cases[i] = c
	}
	return cases
}

// reference is the raw rows with a numeric score read by sill with their
// scores rounded in Go the way the query rounds them, the yard "west" left
// out as the query's condition leaves it out.
func reference(t *testing.T, cases []rawCase, digits int, positive string) *scores.Set {
	t.Helper()
	var b strings.Builder
	b.WriteString("score,label,yard\n")
	scale := math.Pow(10, float64(digits))
	for _, c := range cases {
		if c.yard == "west" || c.kind != scoreNumber {
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

// withoutScore counts the cases outside "west" whose score is NULL or not
// a number, and of them the true and the false ones as the query reads
// their labels: with positive set, that text alone is true and the rest
// (NULL included) false; else by the label words, NULL being neither.
func withoutScore(cases []rawCase, positive string) scores.LabelCounts {
	var counts scores.LabelCounts
	for _, c := range cases {
		if c.yard == "west" || c.kind == scoreNumber {
			continue
		}
		text := strings.TrimSpace(c.label)
		switch {
		case positive != "" && !c.nullLabel && text == positive:
			counts.Positives++
		case positive != "":
			counts.Negatives++
		case c.nullLabel:
			counts.Neither++
		case slices.Contains(positiveWords, strings.ToLower(text)):
			counts.Positives++
		default:
			counts.Negatives++
		}
	}
	return counts
}

// checkCounts reads the query's output as --counts reads it and checks it
// against the raw rows: the same curve at every cut, the same summary and
// the same segment figures at every cut (sameFigures), and the cases
// without a numeric score dropped, with their labels' counts.
func checkCounts(t *testing.T, engine string, out []byte, cases []rawCase, positive string) {
	t.Helper()
	got, err := scores.ReadCounts(bytes.NewReader(out), engine+".csv", scores.Options{SegmentColumn: yardColumn})
	if err != nil {
		t.Fatalf("%s: %v\nquery output begins %q", engine, err, out[:min(len(out), 300)])
	}
	sameFigures(t, engine, reference(t, cases, 3, positive), got)
	want := withoutScore(cases, positive)
	if want.Total() == 0 || want.Neither == 0 && positive == "" {
		t.Fatalf("%s: the seeded cases have no score that is NULL or not a number, or none of them a NULL label", engine)
	}
	if got.Dropped() != want.Total() || got.NoScore() == nil || *got.NoScore() != want {
		t.Errorf("%s: dropped %d (%+v), want %d (%+v) without a numeric score", engine, got.Dropped(), got.NoScore(), want.Total(), want)
	}
}

// sameFigures checks that counts give the reference's figures: every cut's
// score, cases, TP, FP, FN and TN; the summary's counts, base rate, ROC AUC
// and average precision exactly, and Brier score and log loss within
// rounding (the sums run in another order); and every segment's figures
// at every cut (cases, counts, shares, intervals, outlier flag) exactly.
func sameFigures(t *testing.T, engine string, want, got *scores.Set) {
	t.Helper()
	var wantPoints, gotPoints []curve.Point
	wantSum := curve.Walk(want, func(p curve.Point) { wantPoints = append(wantPoints, p) })
	gotSum := curve.Walk(got, func(p curve.Point) { gotPoints = append(gotPoints, p) })
	if len(wantPoints) != len(gotPoints) {
		t.Fatalf("%s: %d cuts from the raw rows, %d from the counts", engine, len(wantPoints), len(gotPoints))
	}
	for i := range wantPoints {
		w, g := wantPoints[i], gotPoints[i]
		if w.Score != g.Score || w.Cases != g.Cases || w.TP != g.TP || w.FP != g.FP || w.FN != g.FN || w.TN != g.TN {
			t.Fatalf("%s: cut %d: raw rows give %+v, counts give %+v", engine, i, w, g)
		}
	}
	if wantSum.Rows != gotSum.Rows || wantSum.Positives != gotSum.Positives || wantSum.Negatives != gotSum.Negatives ||
		wantSum.BaseRate != gotSum.BaseRate || wantSum.ROCAUC != gotSum.ROCAUC || wantSum.AveragePrecision != gotSum.AveragePrecision ||
		wantSum.Probabilities != gotSum.Probabilities || !floatcmp.Equal(wantSum.Brier, gotSum.Brier) || !floatcmp.Equal(wantSum.LogLoss, gotSum.LogLoss) {
		t.Fatalf("%s: summaries differ\nraw    %+v\ncounts %+v", engine, wantSum, gotSum)
	}
	if len(got.SegmentNames()) != 3 {
		t.Errorf("%s: segments %v, want north, east and south", engine, got.SegmentNames())
	}
	for i := range wantPoints {
		w := segment.At(want, wantPoints[i], 0.95)
		g := segment.At(got, gotPoints[i], 0.95)
		if !sameSegment(w.Overall, g.Overall) {
			t.Fatalf("%s: cut %d overall: raw rows give %+v, counts give %+v", engine, i, w.Overall, g.Overall)
		}
		byName := map[string]segment.Figures{}
		for _, f := range g.Segments {
			byName[f.Segment] = f
		}
		if len(g.Segments) != len(w.Segments) {
			t.Fatalf("%s: cut %d: %d segments from the raw rows, %d from the counts", engine, i, len(w.Segments), len(g.Segments))
		}
		for _, f := range w.Segments {
			if !sameSegment(f, byName[f.Segment]) {
				t.Fatalf("%s: cut %d segment %s: raw rows give %+v, counts give %+v", engine, i, f.Segment, f, byName[f.Segment])
			}
		}
	}
}

// sameSegment compares two groups' figures exactly, NaN equal to NaN.
func sameSegment(a, b segment.Figures) bool {
	same := func(x, y float64) bool { return x == y || math.IsNaN(x) && math.IsNaN(y) }
	return a.Segment == b.Segment && a.Rows == b.Rows && a.Positives == b.Positives && a.Negatives == b.Negatives &&
		a.Flagged == b.Flagged && same(a.FlaggedShare, b.FlaggedShare) && a.TP == b.TP && a.FP == b.FP &&
		same(a.Recall, b.Recall) && same(a.RecallCI[0], b.RecallCI[0]) && same(a.RecallCI[1], b.RecallCI[1]) &&
		same(a.Precision, b.Precision) && same(a.PrecisionCI[0], b.PrecisionCI[0]) && same(a.PrecisionCI[1], b.PrecisionCI[1]) &&
		a.Outlier == b.Outlier
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

// engine says how one engine's tables are written: the score column's
// type, the label and segment columns', and the literal of a score that is
// not a number (the i-th such case, so that kinds alternate).
type engine struct {
	scoreType, textType string
	notNumber           func(i int) string
}

// insertSQL writes the statements that create and fill the raw table;
// suffix ends the CREATE TABLE statement (ClickHouse's table engine).
func insertSQL(table string, cases []rawCase, e engine, suffix string) string {
	var b strings.Builder
	fmt.Fprintf(&b, "CREATE TABLE %s (%s %s, %s %s, %s %s)%s;\n", table, Quote(scoreColumn), e.scoreType, Quote(labelColumn), e.textType, Quote(yardColumn), e.textType, suffix)
	notNumbers := 0
	for start := 0; start < len(cases); start += 500 {
		// One line per statement: clickhouse-client reads the rows of an
		// INSERT up to the end of its line.
		fmt.Fprintf(&b, "INSERT INTO %s VALUES ", table)
		for i, c := range cases[start:min(start+500, len(cases))] {
			if i > 0 {
				b.WriteString(", ")
			}
			score := strconv.FormatFloat(c.score, 'f', 6, 64)
			switch c.kind {
			case scoreNull:
				score = "NULL"
			case scoreNotNumber:
				score = e.notNumber(notNumbers)
				notNumbers++
			}
			label := Literal(c.label)
			if c.nullLabel {
				label = "NULL"
			}
			fmt.Fprintf(&b, "(%s, %s, %s)", score, label, Literal(c.yard))
		}
		b.WriteString(";\n")
	}
	return b.String()
}

// command returns a function that runs the program at path with the
// arguments argv makes of the ones it is given, the script on standard
// input, and returns standard output; an error fails the test with the
// program's standard error.
func command(t *testing.T, path string, argv func(more []string) []string) func(script string, more ...string) []byte {
	return func(script string, more ...string) []byte {
		t.Helper()
		cmd := exec.Command(path, argv(more)...)
		cmd.Stdin = strings.NewReader(script)
		var stderr bytes.Buffer
		cmd.Stderr = &stderr
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("%s: %v: %s", filepath.Base(path), err, stderr.String())
		}
		return out
	}
}

// server returns the port of a server from the environment variable
// portVar and the path of its client program, or stops the test through
// needEngine with the hint when the variable is empty, or with how to
// install the Debian package when the program is missing.
func server(t *testing.T, portVar, hint, program, debianPackage string) (port, path string) {
	t.Helper()
	if port = os.Getenv(portVar); port == "" {
		needEngine(t, "%s", hint)
	}
	path, err := exec.LookPath(program)
	if err != nil {
		needEngine(t, "%s not found on PATH: install Debian's %s to run this test", program, debianPackage)
	}
	return port, path
}

// needEngine skips a test whose engine is not there, or fails it under CI
// (the environment variable CI set), where .ci/run should have installed
// and started it.
func needEngine(t *testing.T, format string, args ...any) {
	t.Helper()
	message := fmt.Sprintf(format, args...)
	if os.Getenv("CI") != "" {
		t.Fatal(message + " (CI is set, so .ci/run should have provided it)")
	}
	t.Skip(message)
}

// TestCountsQueryOnSQLite loads a raw table into SQLite (the sqlite3
// command line), runs the printed query, and checks that the counts table
// it returns gives the figures of the raw rows rounded to 3 digits, with
// the label words and with --positive, the cases without a numeric score
// counted apart: SQLite keeps "" and "n/a" as text in a REAL column, which
// the query must not read as 0.
func TestCountsQueryOnSQLite(t *testing.T) {
	sqlite, err := exec.LookPath("sqlite3")
	if err != nil {
		needEngine(t, "sqlite3 not found on PATH: install Debian's sqlite3 to run this test")
	}
	cases := rawCases(5000, 1)
	query, err := testQuery().SQL()
	if err != nil {
		t.Fatal(err)
	}
	db := filepath.Join(t.TempDir(), "raw.db")
	run := command(t, sqlite, func(more []string) []string { return append(more, db) })
	sqliteText := engine{"REAL", "VARCHAR(20)", func(i int) string { return []string{"''", "'n/a'"}[i%2] }}
	run(insertSQL(Quote(tableName), cases, sqliteText, ""))
	checkCounts(t, "sqlite", run(query, "-csv", "-header"), cases, "")

	// With --positive only that text is a true case: " Yes", "1" and the
	// rest count as false cases here.
	q := testQuery()
	q.Positive = "TRUE"
	if query, err = q.SQL(); err != nil {
		t.Fatal(err)
	}
	checkCounts(t, "sqlite --positive", run(query, "-csv", "-header"), cases, "TRUE")

	// A score column declared TEXT holds every score as text, which the
	// query counts apart rather than compare as text: every case is on the
	// row of no score, none misread, and the table is refused as having
	// no row with a score.
	q = testQuery()
	q.Table = "scores as text"
	if query, err = q.SQL(); err != nil {
		t.Fatal(err)
	}
	run(insertSQL(Quote(q.Table), cases, engine{"TEXT", "TEXT", sqliteText.notNumber}, ""))
	_, err = scores.ReadCounts(bytes.NewReader(run(query, "-csv", "-header")), "sqlite-text.csv", scores.Options{SegmentColumn: yardColumn})
	want := reference(t, cases, 3, "").Cases() + withoutScore(cases, "").Total()
	if !errors.Is(err, scores.ErrNoScoredRows) || !strings.Contains(err.Error(), fmt.Sprintf("all %d cases are on rows with no score", want)) {
		t.Errorf("sqlite TEXT scores: error %v; want no row with a score, all %d cases on rows with no score", err, want)
	}
}

// TestCountsQueryOnPostgres does the same on PostgreSQL through psql, with
// the score as DOUBLE PRECISION (not a number: NaN and infinities) and as
// NUMERIC (NaN). It needs a server: .ci/run starts one (.ci/postgres) and
// sets SILL_POSTGRES_PORT.
func TestCountsQueryOnPostgres(t *testing.T) {
	port, psql := server(t, "SILL_POSTGRES_PORT", "no PostgreSQL server: set SILL_POSTGRES_PORT to a server on 127.0.0.1 that user postgres may use (eval \"$(.ci/postgres start)\" starts one)",
		"psql", "postgresql-client")
	schema := fmt.Sprintf("sill_test_%d", os.Getpid())
	run := command(t, psql, func(more []string) []string {
		return append([]string{"-X", "-q", "-v", "ON_ERROR_STOP=1", "-h", "127.0.0.1", "-p", port, "-U", "postgres", "-d", "postgres"}, more...)
	})
	run("CREATE SCHEMA " + Quote(schema) + ";")
	t.Cleanup(func() { run("DROP SCHEMA " + Quote(schema) + " CASCADE;") })
	cases := rawCases(5000, 2)
	q := testQuery()
	q.Table = schema + "." + tableName
	query, err := q.SQL()
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range []engine{
		{"DOUBLE PRECISION", "VARCHAR(20)", func(i int) string { return []string{"'NaN'", "'Infinity'", "'-Infinity'"}[i%3] }},
		{"NUMERIC(9, 6)", "VARCHAR(20)", func(int) string { return "'NaN'" }},
	} {
		table := Quote(schema) + "." + Quote(tableName)
		run("DROP TABLE IF EXISTS " + table + ";\n" + insertSQL(table, cases, e, ""))
		checkCounts(t, "postgres "+e.scoreType, run(query, "--csv"), cases, "")
	}
}

// TestCountsQueryOnClickHouse runs the query printed with --dialect
// clickhouse through a Distributed table on ClickHouse: the seeded cases
// are split between two shards, the databases sill_shard_1 and
// sill_shard_2 of the cluster sill_two_shards, and the Distributed table
// in the database default reads both. The scores are Nullable(Float64)
// (not a number: NaN and infinities), the labels Nullable(String). It
// needs the server that .ci/clickhouse starts, which sets
// SILL_CLICKHOUSE_PORT.
func TestCountsQueryOnClickHouse(t *testing.T) {
	port, client := server(t, "SILL_CLICKHOUSE_PORT", "no ClickHouse server: set SILL_CLICKHOUSE_PORT to the server that eval \"$(.ci/clickhouse start)\" starts (it defines the cluster sill_two_shards)",
		"clickhouse-client", "clickhouse-client")
	run := command(t, client, func(more []string) []string {
		return append([]string{"--host", "127.0.0.1", "--port", port, "--multiquery"}, more...)
	})
	table := fmt.Sprintf("%s %d", tableName, os.Getpid())
	shards := []string{"sill_shard_1", "sill_shard_2"}
	var drop strings.Builder
	for _, db := range append(shards, "default") {
		fmt.Fprintf(&drop, "DROP TABLE IF EXISTS %s.%s;\n", Quote(db), Quote(table))
	}
	run(drop.String())
	t.Cleanup(func() { run(drop.String()) })

	cases := rawCases(5000, 3)
	rng := rand.New(rand.NewPCG(3, 7))
	parts := make([][]rawCase, len(shards))
	for _, c := range cases {
		shard := rng.IntN(len(shards))
		parts[shard] = append(parts[shard], c)
	}
	e := engine{"Nullable(Float64)", "Nullable(String)", func(i int) string { return []string{"nan", "inf", "-inf"}[i%3] }}
	for i, db := range shards {
		if len(parts[i]) == 0 {
			t.Fatalf("shard %s has no cases", db)
		}
		run(insertSQL(Quote(db)+"."+Quote(table), parts[i], e, " ENGINE = Log"))
	}
	run(fmt.Sprintf("CREATE TABLE %s.%s AS %s.%s ENGINE = Distributed(sill_two_shards, '', %s);\n",
		Quote("default"), Quote(table), Quote(shards[0]), Quote(table), Literal(table)))

	for _, positive := range []string{"", "TRUE"} {
		q := testQuery()
		q.Table = "default." + table
		q.Dialect = ClickHouse
		q.Positive = positive
		query, err := q.SQL()
		if err != nil {
			t.Fatal(err)
		}
		checkCounts(t, "clickhouse distributed --positive "+positive, run(query, "--format", "CSVWithNames"), cases, positive)
	}
}
