package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/demo"
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
