package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// candidatesTable is the page's table of candidates, the part that must
// read the same whether the page comes from the data or from the file.
var candidatesTable = regexp.MustCompile(`(?s)<table class="candidates[^"]*">.*?</table>`)

// TestPageFromFileAndFromData makes the sign-off page from a decision
// file (review) and straight from the data (report) with the same cuts
// and choice: the candidates read the same, both draw the curve, and
// --out writes the file and replaces only a page.
func TestPageFromFileAndFromData(t *testing.T) {
	dir := t.TempDir()
	scoresPath, cutPath := savedDemo(t, dir)
	fromFile := runSill(t, "", "review", cutPath, "--format", "html")
	if fromFile.code != 0 || fromFile.stderr != "" {
		t.Fatalf("review --format html: exit %d, %s", fromFile.code, fromFile.stderr)
	}
	args := append([]string{"report", scoresPath, "--cut", "hit=0.8", "--cut", "base", "--cut", "queue=90", "--cut", "cost",
		"--choose", "queue=90", "--format", "html"}, demoAssumptions()...)
	fromData := runSill(t, "", args...)
	if fromData.code != 0 {
		t.Fatalf("report --format html: exit %d, %s", fromData.code, fromData.stderr)
	}
	a, b := candidatesTable.FindString(fromFile.stdout), candidatesTable.FindString(fromData.stdout)
	if a == "" || a != b {
		t.Errorf("the candidates differ between the page of the file and that of the data:\n%s\n---\n%s", a, b)
	}
	if strings.Contains(fromFile.stdout, "keeps no curve") || strings.Contains(fromData.stdout, "keeps no curve") {
		t.Error("a sill-cut/2 file keeps its curve; the page should draw it")
	}
	if !strings.Contains(fromFile.stdout, "for the October review") {
		t.Error("the file's note is not on its page")
	}

	out := filepath.Join(dir, "sign-off.html")
	for range 2 { // the second time replaces the page written the first time
		r := runSill(t, "", "review", cutPath, "--format", "html", "--out", out)
		if r.code != 0 || r.stdout != "" || !strings.Contains(r.stderr, "wrote the sign-off page to "+out) {
			t.Fatalf("--out: exit %d, stdout %d bytes, stderr %q", r.code, len(r.stdout), r.stderr)
		}
	}
	if written, _ := os.ReadFile(out); string(written) != fromFile.stdout {
		t.Error("--out wrote something else than standard output shows")
	}

	// Against: both chosen cuts, from two files.
	r := runSill(t, "", "review", cutPath, "--against", cutPath, "--format", "html")
	if r.code != 0 || !strings.Contains(r.stdout, "Proposed cut against the cut in production") || strings.Count(r.stdout, ">in production: queue=90</text>") != 2 {
		t.Errorf("--against: exit %d, %s", r.code, r.stderr)
	}
}

func TestPageErrors(t *testing.T) {
	dir := t.TempDir()
	scoresPath, cutPath := savedDemo(t, dir)
	notes := writeFile(t, dir, "notes.html", []byte("<!DOCTYPE html><p>the desk's own notes</p>"))
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"out without html", []string{"review", cutPath, "--out", filepath.Join(dir, "x.html")}, "--out goes with --format html"},
		{"bad format", []string{"review", cutPath, "--format", "pdf"}, `--format "pdf": expected text, markdown or html`},
		{"foreign file", []string{"review", cutPath, "--format", "html", "--out", notes}, "not a sign-off page written by sill; remove it or write to another file"},
		{"missing against", []string{"review", cutPath, "--format", "html", "--against", filepath.Join(dir, "none.yaml")}, "--against: "},
		{"report out without html", []string{"report", scoresPath, "--out", filepath.Join(dir, "x.html")}, "--out goes with --format html"},
		{"report unknown choice", []string{"report", scoresPath, "--cut", "hit=0.8", "--choose", "base", "--format", "html"}, `--choose "base": expected one of the cuts hit=0.8`},
		{"choose alone", []string{"report", scoresPath, "--cut", "hit=0.8", "--choose", "hit=0.8"}, "go with --save FILE.yaml or --format html"},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := runSill(t, "", c.args...)
			if r.code == 0 || !strings.Contains(r.stderr, c.want) {
				t.Errorf("exit %d, stderr %q, want it to hold %q", r.code, r.stderr, c.want)
			}
		})
	}
	if data, _ := os.ReadFile(notes); string(data) != "<!DOCTYPE html><p>the desk's own notes</p>" {
		t.Error("a refused --out changed the file")
	}
}
