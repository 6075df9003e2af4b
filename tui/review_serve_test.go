package tui

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/decision"
)

// TestReviewReadOnlySigner: the screen sill serve opens changes nothing
// with c, n, N or w, shows the base name given, and signs by the fixed
// signer, with its key, through the file's lock.
func TestReviewReadOnlySigner(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	f, stamp := reviewFile(t, path)
	before, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	signer := &Signer{Name: "Ada Quist", Key: "SHA256:AAAAexampleFingerprintForTheTest0000000000"}
	r := NewReview(ReviewConfig{File: f, Path: path, Shown: "cut.yaml", Stamp: stamp, ReadOnly: true, Signer: signer})
	r, _ = sendReview(t, r, tea.WindowSizeMsg{Width: 120, Height: 32})
	for _, k := range []string{"right", "c", "n", "x", "enter", "N", "y", "enter", "w"} {
		r, _ = sendReview(t, r, keyPress(k))
	}
	if r.Changed() || r.Written() {
		t.Errorf("read-only: changed %v, written %v after c, n, N and w; expected neither", r.Changed(), r.Written())
	}
	if got, _ := os.ReadFile(path); string(got) != string(before) {
		t.Fatal("the read-only screen changed the file")
	}
	frame := r.View()
	if !strings.Contains(frame, "sill review · cut.yaml") || strings.Contains(frame, path) {
		t.Errorf("the header shows %q; expected the name given, not the path", firstFrameLine(frame))
	}
	for _, hidden := range []string{"w write", "n note"} {
		if strings.Contains(frame, hidden) {
			t.Errorf("the footer offers %q, which does nothing here", hidden)
		}
	}

	// S opens the form on the role, the name being the signer's.
	r, _ = sendReview(t, r, keyPress("S"))
	if frame := r.View(); !strings.Contains(frame, "Ada Quist (your key's name)") || !strings.Contains(frame, "▸role") {
		t.Fatalf("the sign-off form does not show the fixed name and the role focused:\n%s", frame)
	}
	r = typeNote(t, r, "shift lead")
	r, _ = sendReview(t, r, tea.KeyMsg{Type: tea.KeyTab})
	r = typeNote(t, r, "approve")
	next, cmd := r.Update(keyPress("enter"))
	r = next.(Review)
	if cmd == nil {
		t.Fatal("enter on the filled form signed nothing")
	}
	_, _ = r.Update(cmd())
	back, err := decision.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(back.SignOffs) != 1 || back.SignOffs[0].Name != "Ada Quist" || back.SignOffs[0].Key != signer.Key || back.SignOffs[0].Role != "shift lead" {
		t.Errorf("sign-offs %+v; expected one by the signer with its key", back.SignOffs)
	}
	if back.Note != f.Note || back.Chosen != f.Chosen {
		t.Error("signing changed the choice or the note")
	}
}

func firstFrameLine(frame string) string {
	line, _, _ := strings.Cut(frame, "\n")
	return line
}
