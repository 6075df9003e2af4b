package tui

import (
	"flag"
	"path/filepath"
	"strings"
	"testing"

	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/golden"
)

// The -update flag rewrites the golden files. The golden package that
// teatest imports registers a flag of that name too; share it.
func init() {
	if flag.Lookup("update") == nil {
		flag.Bool("update", false, "rewrite the golden files under testdata")
	}
}

// testdataDir is the absolute testdata folder, found before any test
// changes the working folder.
var testdataDir, _ = filepath.Abs("testdata")

// checkGolden compares got with testdata/<Test>/<name>.golden, rewriting
// the file under -update.
func checkGolden(t *testing.T, name, got string) {
	t.Helper()
	golden.Check(t, testdataDir, name, got)
}

// checkFrame asserts that frame is exactly width×height cells with no
// escape codes left, then compares it with its golden file.
func checkFrame(t *testing.T, name, frame string, width, height int) {
	t.Helper()
	checkSize(t, frame, width, height)
	checkGolden(t, name, frame+"\n")
}

// checkSize asserts that frame is exactly width×height cells with no
// escape codes left.
func checkSize(t *testing.T, frame string, width, height int) {
	t.Helper()
	if strings.Contains(frame, "\x1b") {
		t.Errorf("frame holds escape codes with colour off")
	}
	lines := strings.Split(frame, "\n")
	if len(lines) != height {
		t.Errorf("frame has %d lines, want %d", len(lines), height)
	}
	for i, line := range lines {
		if w := ansi.StringWidth(line); w != width {
			t.Errorf("line %d is %d cells wide, want %d: %q", i+1, w, width, line)
		}
	}
}
