package tui

import (
	"strings"
	"testing"

	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/decision"
)

// TestPinsStayTrue: pins made by a rule are checked again when the
// assumptions change. On tenRows (3 true of 10) at 100 cases a shift,
// queue=40 picks 0.7 (4 rows, 40 a shift) and base picks 0.8 (3 rows, the
// base rate 0.3); at 200 cases a shift queue=40 allows 2 rows, so it picks
// 0.9 (1 row; 0.8 flags 3), while base does not depend on the volume. The
// pin by hand is never checked. R re-pins the moved one; the decision file
// says which rules hold.
func TestPinsStayTrue(t *testing.T) {
	m := tenModel(t)
	m = keys(m, "1", "p", "4", "p", "end", "p")
	if got := m.Pins(); strings.Join(got, ",") != "base,queue=40,cut 3" {
		t.Fatalf("pins %q", got)
	}
	m = keys(m, "a", "tab", "ctrl+u")
	m = typeText(m, "200")
	m = keys(m, "enter")
	if p := m.s.pins; p[0].moved || !p[1].moved || p[2].moved || m.s.curve.At(p[1].now).Score != 0.9 {
		t.Fatalf("after volume 200: moved %v %v %v, queue=40 now at %v", p[0].moved, p[1].moved, p[2].moved, m.s.curve.At(p[1].now).Score)
	}
	if !strings.Contains(m.status, "1 pin was pinned under earlier assumptions") {
		t.Errorf("status %q", m.status)
	}
	table := m.s.table()
	if strings.Join(table.Rules, ",") != "base,queue=40 (earlier)," {
		t.Errorf("rules %q", table.Rules)
	}
	if got := strings.Join(rowCells(table.Rows, "its rule now"), ","); got != "holds,picks 0.9," {
		t.Errorf("its rule now: %q", got)
	}
	// R re-pins in the strip only, and only the moved candidate.
	if m.ctx.keys.Repin.Enabled() {
		t.Error("R enabled while the list has the keys")
	}
	m = keys(m, "tab")
	if m.ctx.keys.Repin.Enabled() {
		t.Error("R enabled on the pin by hand")
	}
	m = keys(m, "left")
	if !m.ctx.keys.Repin.Enabled() {
		t.Fatal("R disabled on the moved pin")
	}
	checkFrame(t, "moved-pin-100x30", ansi.Strip(m.View()), 100, 30)
	// The decision file written now records it (w from the strip too).
	m = keys(m, "w")
	f, err := decision.ReadFile(m.Written())
	if err != nil {
		t.Fatal(err)
	}
	if k := f.Candidates[1].RuleCheck; k == nil || k.Holds || k.Picks != 0.9 || f.Candidates[0].RuleCheck == nil || !f.Candidates[0].RuleCheck.Holds || f.Candidates[2].RuleCheck != nil {
		t.Errorf("file rule checks %+v %+v %+v", f.Candidates[0].RuleCheck, f.Candidates[1].RuleCheck, f.Candidates[2].RuleCheck)
	}

	m = keys(m, "R")
	if p := m.s.pins[1]; p.moved || m.s.curve.At(p.cut).Score != 0.9 || cursorScore(t, m) != 0.9 || !m.unwritten {
		t.Errorf("after R: moved %v at %v, cursor %v, unwritten %v", p.moved, m.s.curve.At(p.cut).Score, cursorScore(t, m), m.unwritten)
	}
	if !strings.Contains(m.status, `re-pinned "queue=40" at 0.9`) || strings.Contains(strings.Join(m.s.table().Rules, ","), "earlier") {
		t.Errorf("after R: status %q, rules %q", m.status, m.s.table().Rules)
	}
	// Back at 100 a shift the re-pinned cut is the one that moved.
	m = keys(m, "a", "tab", "ctrl+u")
	m = typeText(m, "100")
	m = keys(m, "enter")
	if p := m.s.pins[1]; !p.moved || m.s.curve.At(p.now).Score != 0.7 {
		t.Errorf("back at volume 100: moved %v, now at %v", p.moved, m.s.curve.At(p.now).Score)
	}
}

// TestRepinOntoHeldCut: on tenRows queue=40 picks 0.7 at 100 cases a
// shift and 0.9 at 200 (see TestPinsStayTrue), where the pin of
// wrong=0.333 already sits (the volume does not move it). R refuses with one line naming the holder, moves nothing, and
// leaves the pin marked as pinned under earlier assumptions; once the
// holder is unpinned R re-pins.
func TestRepinOntoHeldCut(t *testing.T) {
	m := tenModel(t)
	m = keys(m, "4", "p", "home", "p")
	if got := m.Pins(); strings.Join(got, ",") != "queue=40,wrong=0.333" || m.s.curve.At(m.s.pins[1].cut).Score != 0.9 {
		t.Fatalf("pins %q", got)
	}
	m = keys(m, "a", "tab", "ctrl+u")
	m = typeText(m, "200")
	m = keys(m, "enter", "tab", "left")
	if p := m.s.pins[0]; !p.moved || m.s.curve.At(p.now).Score != 0.9 || m.s.selected != 0 {
		t.Fatalf("after volume 200: moved %v, now at %v, selected %d", p.moved, m.s.curve.At(p.now).Score, m.s.selected)
	}
	m.unwritten = false
	m = keys(m, "R")
	want := `not re-pinned: queue=40 lands on 0.9, held by "wrong=0.333"; x unpins one`
	if m.status != want {
		t.Errorf("R onto a held cut: status %q, want %q", m.status, want)
	}
	if p := m.s.pins; len(p) != 2 || !p[0].moved || m.s.curve.At(p[0].cut).Score != 0.7 || m.unwritten {
		t.Errorf("R onto a held cut changed the pins: %+v, unwritten %v", p, m.unwritten)
	}
	if !strings.Contains(strings.Join(m.s.table().Rules, ","), "queue=40 (earlier)") {
		t.Errorf("rules %q", m.s.table().Rules)
	}
	checkSize(t, ansi.Strip(m.View()), 100, 30)
	// Unpin the holder; R then re-pins.
	m = keys(m, "right", "x", "R")
	if p := m.s.pins; len(p) != 1 || p[0].moved || m.s.curve.At(p[0].cut).Score != 0.9 || !strings.HasPrefix(m.status, `re-pinned "queue=40" at 0.9`) {
		t.Errorf("after unpinning the holder: %+v, status %q", p, m.status)
	}
}
