package main

import (
	"context"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/floatcmp"
)

// TestCheckRedoLineKeepsTheDecision runs the line sill check offers after
// status assumption, as a user would paste it: the decision it writes
// keeps every candidate (name, rule, score, note), the chosen one, the
// model, chosen_by and the note, with segments, shift queues and the
// bootstrap recomputed, under the observed base rate.
func TestCheckRedoLineKeepsTheDecision(t *testing.T) {
	dir := t.TempDir()
	data := writeFile(t, dir, "bearings.csv", demo.CSV(demo.DefaultRows, demo.DefaultSeed))
	cutPath := filepath.Join(dir, "cut.yaml")
	// Saved at a base rate of 5% while the data's is 7.2% (434 of 6000):
	// checking the data itself is a wrong assumption, exit 3.
	save := []string{"report", data, "--cut", "base", "--cut", "hit=0.8", "--cut", "queue=90", "--choose", "hit=0.8",
		"--base-rate", "0.05", "--volume", "1500", "--capacity", "90", "--cost-false-alert", "20", "--cost-miss", "300",
		"--segment", "yard", "--time", "read_at", "--shifts", "06:00,14:00,22:00", "--tz", "Europe/Amsterdam", "--bootstrap", "40", "--seed", "7",
		"--model-name", "bearing-wear", "--model-version", "13", "--chosen-by", "Ines Varga", "--save", cutPath}
	if r := runSill(t, "", save...); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	before, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	// Notes are written on the review screen; here by hand.
	before.Note = "kept for the night crew"
	for i := range before.Candidates {
		before.Candidates[i].Note = "note on " + before.Candidates[i].Name
	}
	if _, err := decision.Write(context.Background(), cutPath, before, decision.WriteOptions{}); err != nil {
		t.Fatal(err)
	}

	check := runSill(t, "", "check", cutPath, data)
	if check.code != 3 {
		t.Fatalf("check: exit %d, want 3 (assumption); %s %s", check.code, check.stderr, check.stdout)
	}
	_, line, found := strings.Cut(check.stdout, "signed off again: ")
	line, _, _ = strings.Cut(line, "\n")
	if !found || !strings.HasPrefix(line, "sill report ") {
		t.Fatalf("no line to run in:\n%s", check.stdout)
	}
	words := shellWords(t, line)
	if r := runSill(t, "", words[1:]...); r.code != 0 {
		t.Fatalf("%s: exit %d, %s", line, r.code, r.stderr)
	}

	after, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	if len(after.Candidates) != len(before.Candidates) {
		t.Fatalf("%d candidates after, %d before", len(after.Candidates), len(before.Candidates))
	}
	for i, b := range before.Candidates {
		a := after.Candidates[i]
		if a.Name != b.Name || a.Rule != b.Rule || a.Cut.Score != b.Cut.Score || a.Note != b.Note {
			t.Errorf("candidate %d: %q %q %v %q, want %q %q %v %q", i, a.Name, a.Rule, a.Cut.Score, a.Note, b.Name, b.Rule, b.Cut.Score, b.Note)
		}
		if a.Segments == nil || a.Shifts == nil {
			t.Errorf("candidate %q: segments %v shifts %v, want both recomputed", a.Name, a.Segments != nil, a.Shifts != nil)
		}
		// The bootstrap's spread belongs to a rule: hit=0.8 (recall alone)
		// picks the same cut at any base rate and keeps it.
		if a.Rule == "hit=0.8" && (a.Stability == nil || a.Stability.Replicates != 40 || a.Stability.Seed != 7) {
			t.Errorf("candidate %q: stability %+v, want 40 replicates of seed 7", a.Name, a.Stability)
		}
	}
	if after.Chosen != "hit=0.8" || after.Model != before.Model || after.ChosenBy != "Ines Varga" || after.Note != before.Note {
		t.Errorf("chosen %q model %+v chosen_by %q note %q", after.Chosen, after.Model, after.ChosenBy, after.Note)
	}
	// The observed base rate 434/6000 = 0.07233, rounded to four decimals
	// in the line; the other assumptions as saved.
	a, b := after.Assumptions, before.Assumptions
	if !floatcmp.Within(a.BaseRate, 0.0723, 1e-12) || a.Volume != b.Volume || a.Capacity != b.Capacity || *a.Costs != *b.Costs || a.Confidence != b.Confidence {
		t.Errorf("assumptions %+v, want those of %+v at base rate 0.0723", a, b)
	}
	if !strings.Contains(line, "--segment yard") || !strings.Contains(line, "--tz Europe/Amsterdam") || !strings.Contains(line, "--bootstrap 40 --seed 7") {
		t.Errorf("the line does not give the segments, shifts and bootstrap again: %s", line)
	}
	// Each candidate's rule is checked under the new assumptions: hit=0.8
	// (recall alone) still picks its cut; base, the deepest cut whose
	// alert rate is at most the base rate, picks a looser one at 7.2%
	// than at 5%; and review says so in every form.
	for _, c := range after.Candidates {
		k := c.RuleCheck
		if k == nil || (c.Rule == "hit=0.8") != k.Holds || (c.Rule == "base" && !(k.Picks < c.Cut.Score)) {
			t.Errorf("candidate %q: rule check %+v", c.Name, k)
		}
	}
	for _, form := range []string{"text", "markdown", "html"} {
		r := runSill(t, "", "review", cutPath, "--format", form)
		for _, want := range []string{"base (earlier)", "its rule now", "pinned under earlier assumptions"} {
			if form == "html" && want == "base (earlier)" {
				continue // the page has no rule row; the facts and the row below say it
			}
			if r.code != 0 || !strings.Contains(r.stdout, want) {
				t.Errorf("review --format %s: exit %d, no %q", form, r.code, want)
			}
		}
	}
	// The check now passes at the re-projected base rate.
	if r := runSill(t, "", "check", cutPath, data); r.code != 0 {
		t.Errorf("check after the redo: exit %d, %s", r.code, r.stdout)
	}
}

// TestRedoLineKeepsTheTimeLayout: times written day first with dots
// ("07.09.2026 14:56:02") need --time-layout; the decision file records
// the layout (shift_schedule.time_layout), the line sill check offers
// gives it again, and that line reads the data as the save did, into the
// same shifts.
func TestRedoLineKeepsTheTimeLayout(t *testing.T) {
	dir := t.TempDir()
	const layout = "02.01.2006 15:04:05"
	var csv strings.Builder
	for i, line := range strings.Split(strings.TrimSpace(string(demo.CSV(demo.DefaultRows, demo.DefaultSeed))), "\n") {
		cells := strings.Split(line, ",")
		if i > 0 {
			when, err := time.Parse(time.RFC3339, cells[2])
			if err != nil {
				t.Fatalf("demo line %d: %v", i+1, err)
			}
			cells[2] = when.UTC().Format(layout)
		}
		csv.WriteString(strings.Join(cells, ",") + "\n")
	}
	data := writeFile(t, dir, "bearings dotted.csv", []byte(csv.String()))
	cutPath := filepath.Join(dir, "cut.yaml")
	save := []string{"report", data, "--cut", "base", "--cut", "hit=0.8", "--base-rate", "0.05", "--volume", "1500", "--capacity", "90",
		"--time", "read_at", "--shifts", "06:00,14:00,22:00", "--tz", "UTC", "--time-layout", layout, "--save", cutPath}
	if r := runSill(t, "", save...); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	before, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	if s := before.ShiftSchedule; s == nil || s.TimeLayout != layout {
		t.Fatalf("shift schedule %+v, want the layout %q", s, layout)
	}
	check := runSill(t, "", "check", cutPath, data)
	_, line, found := strings.Cut(check.stdout, "signed off again: ")
	line, _, _ = strings.Cut(line, "\n")
	if check.code != 3 || !found {
		t.Fatalf("check: exit %d, want 3 with a line to run; %s %s", check.code, check.stderr, check.stdout)
	}
	if !strings.Contains(line, "--time-layout '"+layout+"'") {
		t.Errorf("the line does not give the layout again: %s", line)
	}
	words := shellWords(t, line)
	if r := runSill(t, "", words[1:]...); r.code != 0 {
		t.Fatalf("%s: exit %d, %s", line, r.code, r.stderr)
	}
	after, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	if s := after.ShiftSchedule; s == nil || s.TimeLayout != layout {
		t.Errorf("after the redo: shift schedule %+v, want the layout %q", s, layout)
	}
	for i, b := range before.Candidates {
		a := after.Candidates[i]
		// The queues move with the base rate; the shifts are the same.
		if a.Shifts == nil || b.Shifts == nil || a.Shifts.Count != b.Shifts.Count {
			t.Errorf("candidate %q: shifts %+v after, %+v before", a.Name, a.Shifts, b.Shifts)
		}
	}
}

// TestReprojectErrors: --reproject takes its cuts from the file.
func TestReprojectErrors(t *testing.T) {
	dir := t.TempDir()
	scoresPath, cutPath := savedDemo(t, dir)
	other := writeFile(t, dir, "other.csv", bearingsCSV(1, 500, 0.1, 0, true))
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"report", scoresPath, "--reproject", cutPath, "--cut", "base"}, "--cut and --choose go without it"},
		{[]string{"report", other, "--reproject", cutPath}, "chosen on other data"},
		{[]string{"report", scoresPath, "--reproject", filepath.Join(dir, "none.yaml")}, "--reproject: "},
		// The same bytes read with other labels are other cases.
		{[]string{"report", scoresPath, "--reproject", cutPath, "--positive", "0"}, "chosen on this data read as 434 true and 5566 false cases, read now as 5566 and 434"},
	} {
		if r := runSill(t, "", tc.args...); r.code != 2 || !strings.Contains(r.stderr, tc.want) {
			t.Errorf("%q: exit %d, %q, want %q", tc.args, r.code, r.stderr, tc.want)
		}
	}
}

// shellWords splits a line as a POSIX shell splits the words shellWord
// makes: plain words and single-quoted ones.
func shellWords(t *testing.T, line string) []string {
	t.Helper()
	var words []string
	var word strings.Builder
	inWord, quoted := false, false
	for _, r := range line {
		switch {
		case quoted && r == '\'':
			quoted = false
		case quoted:
			word.WriteRune(r)
		case r == '\'':
			quoted, inWord = true, true
		case r == ' ':
			if inWord {
				words = append(words, word.String())
				word.Reset()
			}
			inWord = false
		case r == '\\' || r == '"':
			t.Fatalf("unexpected %q in %s", r, line)
		default:
			word.WriteRune(r)
			inWord = true
		}
	}
	if inWord {
		words = append(words, word.String())
	}
	return words
}
