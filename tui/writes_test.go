package tui

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// Two explorers on the same data and file: the second to write finds the
// first's file and asks instead of writing over it; n keeps it, y
// replaces it, o writes elsewhere.
func TestExplorerWriteAfterAnotherSave(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "cut.yaml")
	first := loaded(t, tenRows(t), tenAssumptions, out, 100, 30)
	second := loaded(t, tenRows(t), tenAssumptions, out, 100, 30)
	first = keys(first, "w")
	if first.Written() != out {
		t.Fatalf("first write: %q", first.status)
	}
	saved, _ := os.ReadFile(out)

	second = keys(second, "2", "p", "w")
	if !topIs[*question[*Model]](second) || !strings.Contains(second.overlays[0].View(), "cut.yaml changed on disk") {
		t.Fatalf("no question before writing over another's save; status %q", second.status)
	}
	if !errors.Is(second.WriteErr(), sharedfile.ErrChanged) {
		t.Errorf("write error %v, want ErrChanged", second.WriteErr())
	}
	second = keys(second, "n")
	if got, _ := os.ReadFile(out); string(got) != string(saved) || second.Written() != "" {
		t.Fatal("n wrote over the other's save")
	}
	if second.WriteErr() == nil {
		t.Error("declining left no write error: the explorer would exit 0 with nothing written")
	}

	// o: another file.
	elsewhere := filepath.Join(dir, "mine.yaml")
	second = keys(second, "w", "o", "ctrl+u")
	second = typeText(second, elsewhere)
	second = keys(second, "enter")
	if f, err := decision.ReadFile(elsewhere); err != nil || len(f.Candidates) != 1 || second.Written() != elsewhere || second.WriteErr() != nil {
		t.Fatalf("o: %v, written %q, error %v", err, second.Written(), second.WriteErr())
	}

	// y: replaced on purpose, by a third explorer opened before the first
	// wrote again.
	third := loaded(t, tenRows(t), tenAssumptions, out, 100, 30)
	first = keys(first, "2", "p", "w")
	third = keys(third, "w")
	if !topIs[*question[*Model]](third) {
		t.Fatalf("third: no question; status %q", third.status)
	}
	third = keys(third, "y")
	if third.Written() != out || third.WriteErr() != nil {
		t.Fatalf("y: written %q, error %v", third.Written(), third.WriteErr())
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 2 {
		t.Errorf("the folder holds %d entries, want cut.yaml and mine.yaml only", len(entries))
	}
}

// After WaitForWrites a write asked for does not start: the process is
// about to exit.
func TestNoWriteAfterTheScreenEnded(t *testing.T) {
	out := filepath.Join(t.TempDir(), "cut.yaml")
	m := loaded(t, tenRows(t), tenAssumptions, out, 100, 30)
	m.WaitForWrites()
	m = keys(m, "w")
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) || !errors.Is(m.WriteErr(), errScreenEnded) {
		t.Fatalf("a write began after the screen ended: %v, %v", err, m.WriteErr())
	}
}
