package main

import (
	"os/exec"
	"strings"
	"testing"
)

// TestImportDirection checks the house rule that imports go one way: no
// package under internal/ depends on tui/, cobra, pflag, or the terminal
// libraries. It asks `go list -deps` (the go tool that runs the tests).
func TestImportDirection(t *testing.T) {
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("the go tool is not on PATH")
	}
	out, err := exec.Command(goTool, "list", "-f", "{{.ImportPath}} {{join .Deps \" \"}}", "github.com/sill-tool/sill/internal/...").CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, out)
	}
	forbidden := []string{
		"github.com/sill-tool/sill/tui",
		"github.com/sill-tool/sill/cmd",
		"github.com/spf13/cobra",
		"github.com/spf13/pflag",
		"github.com/charmbracelet/lipgloss",
		"github.com/charmbracelet/bubbletea",
		"github.com/charmbracelet/bubbles",
	}
	packages := 0
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		fields := strings.Fields(line)
		if len(fields) == 0 {
			continue
		}
		packages++
		for _, dep := range fields[1:] {
			for _, bad := range forbidden {
				if dep == bad || strings.HasPrefix(dep, bad+"/") {
					t.Errorf("%s imports %s", fields[0], dep)
				}
			}
		}
	}
	if packages < 5 {
		t.Errorf("go list found %d internal packages; the pattern is probably wrong", packages)
	}
}
