package main

import (
	"encoding/json"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"
)

// veldmoorTable is the Veldmoor Freight depot's (invented) crates, with
// times and a weight, written with decimal points; the tests below write
// it as other programs export it.
const veldmoorTable = "crate,score,label,weight,scanned\n" +
	"VM-101,0.91,1,1,2026-03-27 06:10:00\n" +
	"VM-102,0.85,0,2.5,2026-03-27 07:45:00\n" +
	"VM-103,0.107681,1,1,2026-03-27 09:29:00\n" +
	"VM-104,0.60,1,1,2026-03-27 14:05:00\n" +
	"VM-105,0.42,0,1,2026-03-27 18:40:00\n" +
	"VM-106,0.05,0,1,2026-03-27 23:15:00\n"

// reportJSON runs report --format json with args and decodes the result.
func reportJSON(t *testing.T, args ...string) map[string]any {
	t.Helper()
	res := runSill(t, "", append([]string{"report", "--format", "json"}, args...)...)
	if res.code != 0 || res.stderr != "" {
		t.Fatalf("%v: exit %d, stderr %q", args, res.code, res.stderr)
	}
	var out map[string]any
	if err := json.Unmarshal([]byte(res.stdout), &out); err != nil {
		t.Fatal(err)
	}
	delete(out, "source")
	delete(out, "sha256")
	return out
}

// TestRunExports reads the table as a European spreadsheet exports it
// (semicolons, decimal commas) and as a spreadsheet's "Unicode text"
// (UTF-16 with a byte-order mark, tabs), and expects the figures of the
// plain CSV file.
func TestRunExports(t *testing.T) {
	dir := t.TempDir()
	european := strings.NewReplacer(",", ";", ".", ",").Replace(veldmoorTable)
	unicodeText := utf16LE("\r\n", strings.ReplaceAll(veldmoorTable, ",", "\t"))
	plain := reportJSON(t, writeFile(t, dir, "plain.csv", []byte(veldmoorTable)), "--weight", "weight", "--weight-kind", "frequency")
	want := mustJSON(t, plain)
	for name, data := range map[string][]byte{
		"european.csv": []byte(european),
		"unicode.txt":  unicodeText,
	} {
		got := reportJSON(t, writeFile(t, dir, name, data), "--weight", "weight", "--weight-kind", "frequency")
		if g := mustJSON(t, got); g != want {
			t.Errorf("%s: figures differ from the plain file:\n%s\nwant\n%s", name, g, want)
		}
	}
	// --decimal-comma with tabs; a point in such a file is refused, a
	// decimal comma without it is pointed at the flag.
	tabbed := writeFile(t, dir, "tabbed.tsv", []byte(strings.NewReplacer(",", "\t", ".", ",").Replace(veldmoorTable)))
	if got := mustJSON(t, reportJSON(t, tabbed, "--weight", "weight", "--weight-kind", "frequency", "--decimal-comma")); got != want {
		t.Errorf("tabs with --decimal-comma: figures differ:\n%s", got)
	}
	bad := []struct {
		name, data string
		args       []string
		want       string
	}{
		{"comma without the flag", strings.NewReplacer(",", "\t", ".", ",").Replace(veldmoorTable), nil,
			`bad.csv:2: column "score": invalid score "0,91", a number with a decimal comma, expected a decimal point (or the file read with decimal commas); read decimal commas with --decimal-comma`},
		{"thousands separator", "score;label;weight\n0,5;1;1.250,5\n", []string{"--weight", "weight"},
			`bad.csv:2: column "weight": invalid weight "1.250,5", a point in a file read with decimal commas, expected a decimal comma such as 0,25 and no separator between thousands`},
		{"UTF-16 without its mark", string(utf16LE("\n", "score\tlabel\n0.5\t1\n")[2:]), nil,
			`bad.csv: text encoding not read: UTF-16 without a byte-order mark, expected UTF-8, or UTF-16 that begins with its byte-order mark as spreadsheets write it`},
		{"UTF-16 of an odd length", string(append(utf16LE("\n", "score\tlabel\n0.5\t1\n"), '\n')), nil,
			`bad.csv:3: text encoding not read: the text ends within a UTF-16 code unit (an odd number of bytes), expected two bytes per unit`},
	}
	for _, c := range bad {
		path := writeFile(t, t.TempDir(), "bad.csv", []byte(c.data))
		res := runSill(t, "", append([]string{"report", path}, c.args...)...)
		if res.code != 2 || res.stdout != "" || res.stderr != "sill: "+path[:len(path)-len("bad.csv")]+c.want+"\n" {
			t.Errorf("%s: exit %d, stdout %q, stderr %q, want %q", c.name, res.code, res.stdout, res.stderr, c.want)
		}
	}
}

// utf16LE writes text as little-endian UTF-16 with a byte-order mark, its
// line ends as newline.
func utf16LE(newline, text string) []byte {
	out := []byte{0xff, 0xfe}
	for _, u := range utf16.Encode([]rune(strings.ReplaceAll(text, "\n", newline))) {
		out = append(out, byte(u), byte(u>>8))
	}
	return out
}

// TestRunZonelessTimes reads times without a zone in --tz without
// --time-layout, and points a time in another form at --time-layout with
// the layout that reads it. The shifts' peaks must equal those of the same
// times written in RFC 3339 with Amsterdam's offset that day (UTC+1).
func TestRunZonelessTimes(t *testing.T) {
	dir := t.TempDir()
	args := []string{"--weight", "weight", "--weight-kind", "frequency", "--time", "scanned", "--shifts", "06:00,14:00,22:00", "--tz", "Europe/Amsterdam"}
	zoned := strings.NewReplacer(" 06:10:00", "T06:10:00+01:00", " 07:45:00", "T07:45:00+01:00", " 09:29:00", "T09:29:00+01:00",
		" 14:05:00", "T14:05:00+01:00", " 18:40:00", "T18:40:00+01:00", " 23:15:00", "T23:15:00+01:00").Replace(veldmoorTable)
	want := mustJSON(t, reportJSON(t, append([]string{writeFile(t, dir, "zoned.csv", []byte(zoned))}, args...)...))
	for name, table := range map[string]string{
		"space, seconds":      veldmoorTable,
		"T, seconds":          strings.ReplaceAll(veldmoorTable, "2026-03-27 ", "2026-03-27T"),
		"space, no seconds":   strings.ReplaceAll(veldmoorTable, ":00\n", "\n"),
		"T, fraction":         strings.ReplaceAll(strings.ReplaceAll(veldmoorTable, "2026-03-27 ", "2026-03-27T"), ":00\n", ":00.250\n"),
		"space, no seconds 2": strings.ReplaceAll(veldmoorTable, ":00\n", "\n"),
	} {
		got := mustJSON(t, reportJSON(t, append([]string{writeFile(t, dir, "times.csv", []byte(table))}, args...)...))
		if got != want {
			t.Errorf("%s: figures differ from the zoned times:\n%s\nwant\n%s", name, got, want)
		}
	}
	dayFirst := strings.ReplaceAll(veldmoorTable, "2026-03-27 ", "27/03/2026 ")
	path := writeFile(t, dir, "dayfirst.csv", []byte(dayFirst))
	res := runSill(t, "", append([]string{"report", path}, args...)...)
	wantErr := `dayfirst.csv:2: column "scanned": invalid time "27/03/2026 06:10:00", expected a date and time such as 2026-03-27 09:29:00 or 2026-03-27T09:29Z (a time without a zone is read in the time zone given), or the layout of the times written as Go writes its reference time, Mon Jan 2 15:04:05 2006: here "02/01/2006 15:04:05"; give it with --time-layout "02/01/2006 15:04:05"` + "\n"
	if res.code != 2 || !strings.HasSuffix(res.stderr, wantErr) || strings.Count(res.stderr, "\n") != 1 {
		t.Errorf("day first: exit %d, stderr %q, want it to end %q", res.code, res.stderr, wantErr)
	}
	// The layout the message gives reads the file.
	if got := mustJSON(t, reportJSON(t, append([]string{path, "--time-layout", "02/01/2006 15:04:05"}, args...)...)); got != want {
		t.Errorf("day first with the layout given: figures differ:\n%s", got)
	}
}

// TestRunOutsideScore: one score of 1.7 among the Veldmoor depot's
// probabilities is named by its line in every output's warnings, and the
// probability sections it removes are named. The true case at 0.5 among
// the false ones keeps the classes from being completely separated, which
// would add a warning of its own.
func TestRunOutsideScore(t *testing.T) {
	var b strings.Builder
	b.WriteString("crate,score,label\n")
	for i := range 40 {
		score := strconv.FormatFloat(float64(i)/40, 'f', 3, 64)
		if i == 6 {
			score = "1.7" // line 8
		}
		b.WriteString("VM-" + strconv.Itoa(i) + "," + score + "," + map[bool]string{true: "1", false: "0"}[i >= 26 || i == 6 || i == 20] + "\n")
	}
	path := writeFile(t, t.TempDir(), "depot.csv", []byte(b.String()))
	want := "1 score lies outside [0, 1] (line 8), so the scores are not read as probabilities: the Brier score, log loss, calibration and net benefit are left out"
	for _, format := range []string{"text", "markdown", "json"} {
		res := runSill(t, "", "report", path, "--format", format)
		if res.code != 0 || !strings.Contains(res.stdout+res.stderr, want) {
			t.Errorf("%s: exit %d, the warning missing:\n%s\n%s", format, res.code, res.stdout, res.stderr)
		}
	}
	res := runSill(t, "", "report", path, "--format", "json")
	var out map[string]any
	if err := json.Unmarshal([]byte(res.stdout), &out); err != nil {
		t.Fatal(err)
	}
	if warnings, _ := out["warnings"].([]any); len(warnings) != 1 || warnings[0] != want {
		t.Errorf("JSON warnings %v, want [%q]", out["warnings"], want)
	}
	if out["brier"] != nil {
		t.Errorf("brier %v with a score outside [0, 1], want null", out["brier"])
	}
}
