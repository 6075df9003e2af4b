package decision

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestYAMLEscapesControls checks that the YAML encoder writes control
// characters in notes and names escaped (a double-quoted scalar with
// \e, \a, \r, \x9b or \u escapes, YAML 1.2 section 5.7, from memory),
// so that printing the file on a terminal sets no title and clears
// nothing, and that they read back as they were.
func TestYAMLEscapesControls(t *testing.T) {
	controls := "\x1b]0;title\x07\x1b[2J\u009b31m\r\x08"
	f := demoFile(t)
	f.Note = "file " + controls
	f.Candidates[0].Note = "candidate " + controls
	path := filepath.Join(t.TempDir(), "cut.yaml")
	if err := save(path, f, false); err != nil {
		t.Fatal(err)
	}
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []string{"\x1b", "\x07", "\r", "\x08", "\u009b"} {
		if strings.Contains(string(raw), c) {
			t.Errorf("the file holds %q raw:\n%s", c, raw)
		}
	}
	back, err := ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if back.Note != f.Note || back.Candidates[0].Note != f.Candidates[0].Note {
		t.Errorf("read back %q and %q, want %q and %q", back.Note, back.Candidates[0].Note, f.Note, f.Candidates[0].Note)
	}
}
