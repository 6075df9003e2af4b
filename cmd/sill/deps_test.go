package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// TestImportDirection checks the house rule that imports go one way: no
// package under internal/ depends on tui/, cobra, pflag, or the terminal
// libraries. It asks `go list -deps` (the go tool that runs the tests).
func TestImportDirection(t *testing.T) {
	deps := goList(t, "{{.ImportPath}} {{join .Deps \" \"}}", "github.com/sill-tool/sill/internal/...")
	forbidden := []string{
		"github.com/sill-tool/sill/tui",
		"github.com/sill-tool/sill/cmd",
		"github.com/spf13/cobra",
		"github.com/spf13/pflag",
		"github.com/charmbracelet/lipgloss",
		"github.com/charmbracelet/bubbletea",
		"github.com/charmbracelet/bubbles",
	}
	// A figure's text comes from package format, so the packages that lay
	// figures out without computing them never need the report (and all it
	// draws in); format itself stands on the standard library alone.
	const sill = "github.com/sill-tool/sill/"
	noReport := map[string]bool{sill + "internal/compare": true, sill + "internal/review": true, sill + "internal/drift": true}
	for pkg, pkgDeps := range deps {
		for _, dep := range pkgDeps {
			if noReport[pkg] && dep == sill+"internal/report" {
				t.Errorf("%s imports %s for formatting; use internal/format", pkg, dep)
			}
			if pkg == sill+"internal/format" && strings.HasPrefix(dep, sill) {
				t.Errorf("%s imports %s; it stands on the standard library alone", pkg, dep)
			}
			for _, bad := range forbidden {
				if dep == bad || strings.HasPrefix(dep, bad+"/") {
					t.Errorf("%s imports %s", pkg, dep)
				}
			}
		}
	}
	if packages := len(deps); packages < 5 {
		t.Errorf("go list found %d internal packages; the pattern is probably wrong", packages)
	}
}

// goList runs the go tool's list with the template format, which gives a
// package's path and then the paths it names, and returns them by package.
// It skips the test without the go tool.
func goList(t *testing.T, format, pattern string) map[string][]string {
	t.Helper()
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("the go tool is not on PATH")
	}
	out, err := exec.Command(goTool, "list", "-f", format, pattern).CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, out)
	}
	packages := map[string][]string{}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		if fields := strings.Fields(line); len(fields) > 0 {
			packages[fields[0]] = fields[1:]
		}
	}
	return packages
}

// TestFloatcmpOnlyInTests checks that the float-comparison helper of the
// tests stays out of the program: no package's non-test files import
// internal/floatcmp, save internal/golden, which is test-only itself (no
// non-test file imports it either). It asks `go list` for the imports of
// the non-test files of every package.
func TestFloatcmpOnlyInTests(t *testing.T) {
	const sill = "github.com/sill-tool/sill/"
	imports := goList(t, "{{.ImportPath}} {{join .Imports \" \"}}", sill+"...")
	for pkg, deps := range imports {
		if pkg == sill+"internal/golden" {
			continue
		}
		for _, imp := range deps {
			if imp == sill+"internal/floatcmp" || imp == sill+"internal/golden" {
				t.Errorf("%s imports %s outside its tests", pkg, imp)
			}
		}
	}
	if packages := len(imports); packages < 10 {
		t.Errorf("go list found %d packages; the pattern is probably wrong", packages)
	}
}

// TestEngineNamesNoFlags checks the house rule that the engine speaks no
// flags: no string in the non-test files of any package under internal/
// names a command-line flag ("--volume"), since the explorer sets the same
// values with a form; cmd adds the flag when it wraps their errors (see
// readFlagHint); where output shows a command line (the query's first
// comment, how to sign a file), the caller gives it.
func TestEngineNamesNoFlags(t *testing.T) {
	flag := regexp.MustCompile(`"[^"\n]*--[a-z][^"\n]*"`)
	dirs, err := os.ReadDir(filepath.Join("..", "..", "internal"))
	if err != nil {
		t.Fatal(err)
	}
	checked := 0
	for _, d := range dirs {
		if !d.IsDir() {
			continue
		}
		files, err := filepath.Glob(filepath.Join("..", "..", "internal", d.Name(), "*.go"))
		if err != nil {
			t.Fatalf("internal/%s: %v", d.Name(), err)
		}
		checked++
		for _, name := range files {
			if strings.HasSuffix(name, "_test.go") {
				continue
			}
			text, err := os.ReadFile(name)
			if err != nil {
				t.Fatal(err)
			}
			for i, line := range strings.Split(string(text), "\n") {
				code, _, _ := strings.Cut(line, "// ") // a comment may name a flag as an example
				if flag.MatchString(code) {
					t.Errorf("%s:%d names a flag: %s", name, i+1, strings.TrimSpace(line))
				}
			}
		}
	}
	if checked < 20 {
		t.Errorf("checked %d packages under internal/; the walk is probably wrong", checked)
	}
}
