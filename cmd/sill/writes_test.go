package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/sharedfile"
	"github.com/sill-tool/sill/tui"
)

// demo --out replaces demo data and nothing else unless forced (it
// overwrote any file before, a decision file included).
func TestDemoOutRefusesOtherFiles(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(2000, 3))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", scoresPath, "--cut", "hit=0.8", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	mine := writeFile(t, dir, "mine.csv", []byte("case,p,outcome\n1,0.4,0\n"))
	for _, path := range []string{cutPath, mine} {
		before, _ := os.ReadFile(path)
		r := runSill(t, "", "demo", "--rows", "50", "--out", path)
		want := "sill: write " + path + ": the existing file is not demo data (its first line is "
		if r.code != 2 || !strings.HasPrefix(r.stderr, want) || !strings.HasSuffix(r.stderr, "; add --force to replace it, or write to another file\n") {
			t.Errorf("demo --out %s: exit %d, stderr %q; want 2 and %q…", filepath.Base(path), r.code, r.stderr, want)
		}
		if after, _ := os.ReadFile(path); string(after) != string(before) {
			t.Errorf("a refused demo --out changed %s", filepath.Base(path))
		}
	}
	// Demo data is replaced; anything with --force.
	if r := runSill(t, "", "demo", "--rows", "50", "--seed", "9", "--out", scoresPath); r.code != 0 {
		t.Errorf("demo --out over demo data: exit %d, %s", r.code, r.stderr)
	}
	if r := runSill(t, "", "demo", "--rows", "50", "--out", cutPath, "--force"); r.code != 0 {
		t.Errorf("demo --out --force: exit %d, %s", r.code, r.stderr)
	}
	if data, _ := os.ReadFile(cutPath); !strings.HasPrefix(string(data), demo.Header+"\n") {
		t.Error("--force did not replace the file")
	}
	if r := runSill(t, "", "demo", "--force"); r.code != 2 || r.stderr != "sill: --force goes with --out FILE\n" {
		t.Errorf("--force without --out: exit %d, stderr %q", r.code, r.stderr)
	}
}

// report --save through a symbolic link replaces the file it names and
// keeps that file's mode (it replaced the link with a 0644 file before).
func TestSaveThroughLinkKeepsModeAndLink(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(2000, 3))
	shared := filepath.Join(dir, "shared.yaml")
	if r := runSill(t, "", "report", scoresPath, "--cut", "hit=0.8", "--save", shared); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	if err := os.Chmod(shared, 0o600); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "cut.yaml")
	if err := os.Symlink("shared.yaml", link); err != nil {
		t.Fatal(err)
	}
	if r := runSill(t, "", "report", scoresPath, "--cut", "base", "--save", link); r.code != 0 {
		t.Fatalf("save through the link: exit %d, %s", r.code, r.stderr)
	}
	if info, err := os.Lstat(link); err != nil || info.Mode()&os.ModeSymlink == 0 {
		t.Fatalf("the link is no longer a link (%v)", err)
	}
	info, err := os.Stat(shared)
	if err != nil || info.Mode().Perm() != 0o600 {
		t.Fatalf("the shared file's mode after the save: %v (%v), want 0600", info.Mode().Perm(), err)
	}
	if f, err := decision.ReadFile(shared); err != nil || f.Chosen != "base" {
		t.Fatalf("the shared file was not replaced: %v", err)
	}
}

// exploreScreen drives the explorer on the demo data without a terminal,
// as the program would: it loads, then takes keys, running the commands
// they return.
func exploreScreen(t *testing.T, out string, keys ...string) tui.Model {
	t.Helper()
	set, err := scores.Read(bytes.NewReader(demo.CSV(500, 3)), "bearings.csv", scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var m tea.Model = tui.New(tui.Config{
		Load: func(func(int)) (*scores.Set, error) { return set, nil },
		Assume: func(*scores.Set) (projection.Assumptions, error) {
			return projection.Assumptions{BaseRate: 0.07, Confidence: 0.95}, nil
		},
		Out: out,
	})
	m, _ = m.Update(tea.WindowSizeMsg{Width: 100, Height: 30})
	var run func(cmd tea.Cmd)
	run = func(cmd tea.Cmd) {
		if cmd == nil {
			return
		}
		switch msg := cmd().(type) {
		case tea.BatchMsg:
			run(msg[0]) // the load; the other is the loading screen's tick
		case tea.QuitMsg, nil:
		default:
			var next tea.Cmd
			m, next = m.Update(msg)
			run(next)
		}
	}
	run(m.Init())
	for _, k := range keys {
		var cmd tea.Cmd
		m, cmd = m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(k)})
		run(cmd)
	}
	return m.(tui.Model)
}

// explore exits with status 2 after a write that failed (it exited 0).
func TestExploreExitAfterFailedWrite(t *testing.T) {
	dir := t.TempDir()
	missing := filepath.Join(dir, "no such folder", "cut.yaml")
	var stderr bytes.Buffer
	err := exploreOutcome(exploreScreen(t, missing, "w", "q"), missing, &stderr)
	want := "the decision was not written: write " + missing + ": the folder " + filepath.Dir(missing) + " does not exist"
	if err == nil || err.Error() != want {
		t.Fatalf("error %v, want %q", err, want)
	}
	if exit := (*exitError)(nil); errors.As(err, &exit) {
		t.Errorf("exit status %d, want 2 (run gives 2 to every error that is not an exitError)", exit.code)
	}

	// Refused over a scores file, and the question declined: not written either.
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(500, 3))
	if err := exploreOutcome(exploreScreen(t, scoresPath, "w", "n", "q"), scoresPath, &stderr); !errors.Is(err, decision.ErrNotDecisionFile) {
		t.Errorf("declined replacement: error %v, want ErrNotDecisionFile", err)
	}

	// Written: status 0 and where the decision is.
	good := filepath.Join(dir, "cut.yaml")
	stderr.Reset()
	if err := exploreOutcome(exploreScreen(t, good, "w", "q"), good, &stderr); err != nil || stderr.String() != "sill: the decision is in "+good+"\n" {
		t.Errorf("written: error %v, stderr %q", err, stderr.String())
	}
}

// review exits with status 2 when the file changed on disk after the
// screen read it and the changes were not written elsewhere.
func TestReviewExitAfterRefusedWrite(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "bearings.csv", demo.CSV(2000, 3))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", scoresPath, "--cut", "hit=0.8", "--cut", "base", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	screen := func() tea.Model {
		file, stamp, err := decision.ReadFileStamped(cutPath)
		if err != nil {
			t.Fatal(err)
		}
		var m tea.Model = tui.NewReview(tui.ReviewConfig{File: file, Path: cutPath, Stamp: stamp})
		m, _ = m.Update(tea.WindowSizeMsg{Width: 100, Height: 30})
		return m
	}
	press := func(m tea.Model, keys ...string) tui.Review {
		for _, k := range keys {
			var cmd tea.Cmd
			m, cmd = m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(k)})
			if cmd != nil {
				if msg := cmd(); msg != nil {
					m, _ = m.Update(msg)
				}
			}
		}
		return m.(tui.Review)
	}
	opened := screen()
	// Another session saves after this one opened the file.
	if r := runSill(t, "", "report", scoresPath, "--cut", "base", "--save", cutPath); r.code != 0 {
		t.Fatalf("second save: exit %d, %s", r.code, r.stderr)
	}
	var stderr bytes.Buffer
	err := reviewOutcome(press(opened, "l", "c", "w"), cutPath, &stderr)
	if !errors.Is(err, sharedfile.ErrChanged) || !strings.HasPrefix(err.Error(), "the changes on screen were not written: write "+cutPath+": changed since it was read") {
		t.Fatalf("error %v, want the refused write", err)
	}
	// Written: status 0.
	stderr.Reset()
	if err := reviewOutcome(press(screen(), "w"), cutPath, &stderr); err != nil || stderr.String() != "sill: wrote "+cutPath+"; chosen base\n" {
		t.Fatalf("good write: %v, stderr %q", err, stderr.String())
	}
}
