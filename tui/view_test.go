package tui

import (
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/muesli/termenv"

	"github.com/sill-tool/sill/internal/scores"
)

// TestView draws the whole screen on the built-in demo data at fixed sizes
// with colour off. Each case names its size and state.
func TestView(t *testing.T) {
	set := demoSet(t)
	cases := []struct {
		name          string
		width, height int
		keys          []string
		text          string // typed after keys
		after         []string
	}{
		{name: "first-80x24", width: 80, height: 24},
		{name: "first-100x30", width: 100, height: 30},
		{name: "first-140x44", width: 140, height: 44},
		{name: "cursor-down-3-80x24", width: 80, height: 24, keys: []string{"j", "j", "j"}},
		{name: "cursor-up-1-80x24", width: 80, height: 24, keys: []string{"k"}},
		{name: "cursor-top-80x24", width: 80, height: 24, keys: []string{"g"}},
		{name: "cursor-bottom-80x24", width: 80, height: 24, keys: []string{"G"}},
		{name: "start-1-base-80x24", width: 80, height: 24, keys: []string{"G", "1"}},
		{name: "start-2-hit-80x24", width: 80, height: 24, keys: []string{"2"}},
		{name: "start-3-wrong-80x24", width: 80, height: 24, keys: []string{"3"}},
		{name: "start-4-capacity-80x24", width: 80, height: 24, keys: []string{"4"}},
		{name: "start-5-cost-80x24", width: 80, height: 24, keys: []string{"5"}},
		{name: "chart-all-80x24", width: 80, height: 24, keys: []string{"v"}},
		{name: "chart-roc-100x30", width: 100, height: 30, keys: []string{"v", "v"}},
		{name: "two-pins-80x24", width: 80, height: 24, keys: []string{"2", "p", "4", "p"}},
		{name: "two-pins-strip-80x24", width: 80, height: 24, keys: []string{"2", "p", "4", "p", "tab"}},
		{name: "two-pins-strip-120x44", width: 120, height: 44, keys: []string{"2", "p", "4", "p"}},
		{name: "form-bad-value-80x24", width: 80, height: 24, keys: []string{"a", "tab", "ctrl+u"}, text: "-40", after: []string{"enter"}},
		{name: "base-rate-5pct-80x24", width: 80, height: 24, keys: []string{"5", "a", "ctrl+u"}, text: "5%", after: []string{"enter"}},
		{name: "help-80x24", width: 80, height: 24, keys: []string{"?"}},
		{name: "help-80x22", width: 80, height: 22, keys: []string{"?"}},
		{name: "help-terms-80x24", width: 80, height: 24, keys: []string{"?", "tab"}},
		{name: "help-terms-last-100x30", width: 100, height: 30, keys: []string{"?", "shift+tab"}},
		{name: "minimum-80x22", width: 80, height: 22},
		{name: "minimum-80x22-pinned", width: 80, height: 22, keys: []string{"2", "p"}},
		{name: "too-small-79x24", width: 79, height: 24},
		{name: "too-small-80x21", width: 80, height: 21},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			m := loaded(t, set, demoAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), tc.width, tc.height)
			m = keys(m, tc.keys...)
			m = typeText(m, tc.text)
			m = keys(m, tc.after...)
			checkFrame(t, tc.name, m.View(), tc.width, tc.height)
		})
	}
}

// TestViewSaved writes the file from a fresh working folder and shows the
// confirmation; the folder then holds the file and nothing else (the
// temporary file of the atomic write is gone).
func TestViewSaved(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	m := loaded(t, demoSet(t), demoAssumptions, "cut.yaml", 80, 24)
	m = keys(m, "2", "p", "w")
	if m.Written() != "cut.yaml" {
		t.Fatalf("not written: %s", m.status)
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 1 || entries[0].Name() != "cut.yaml" {
		t.Errorf("folder holds %v, want only cut.yaml", entries)
	}
	checkFrame(t, "saved-80x24", m.View(), 80, 24)
	// Once the status gives way, the footer still says the file holds
	// what is pinned, until something changes.
	m = keys(m, "j")
	if footer := m.footer(); !strings.HasPrefix(footer, "written: cut.yaml · ") {
		t.Errorf("footer after a move %q, want it to start with the file written", footer)
	}
	m = keys(m, "p")
	if footer := m.footer(); !strings.Contains(footer, "not written") || strings.Contains(footer, "written: ") {
		t.Errorf("footer after a new pin %q, want not written", footer)
	}
}

// TestViewLoading draws the screen while the scores are read.
func TestViewLoading(t *testing.T) {
	m := New(Config{Load: func(func(int)) (*scores.Set, error) { return nil, nil }, Assume: demoAssumptions})
	m = send(m, tea.WindowSizeMsg{Width: 80, Height: 24})
	m.rowsRead.Store(131072)
	checkFrame(t, "loading-80x24", m.View(), 80, 24)
	// Read, and the cuts being worked out.
	m.readDone.Store(true)
	checkFrame(t, "loading-80x24-read", m.View(), 80, 24)
}

// TestViewResize shrinks and grows the terminal: each frame fits.
func TestViewResize(t *testing.T) {
	m := loaded(t, demoSet(t), demoAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 100, 30)
	m = keys(m, "2", "p", "4", "p")
	for _, size := range [][2]int{{80, 24}, {60, 15}, {80, 22}, {150, 50}, {81, 25}} {
		m = send(m, tea.WindowSizeMsg{Width: size[0], Height: size[1]})
		frame := m.View()
		checkSize(t, frame, size[0], size[1])
	}
	checkFrame(t, "grown-81x25", m.View(), 81, 25)
}

// TestPaneViews draws panes on their own.
func TestPaneViews(t *testing.T) {
	m := loaded(t, tenRows(t), tenAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 100, 30)
	m = keys(m, "p", "2", "p", "j", "p")
	ctx := m.ctx

	strip := NewStrip(ctx.styles, ctx.keys)
	strip.SetTable(m.s.table())
	strip.SetSelected(1)
	strip.SetSize(76, strip.Lines()+2)
	checkFrame(t, "strip-76x"+strconv.Itoa(strip.Lines()+2), strip.View(true), 76, strip.Lines()+2)
	strip.SetSize(76, 3)
	checkFrame(t, "strip-76x3-collapsed", strip.View(false), 76, 3)
	empty := NewStrip(ctx.styles, ctx.keys)
	empty.SetSize(60, 3)
	checkFrame(t, "strip-60x3-empty", empty.View(false), 60, 3)

	figures := newFiguresPane(m.s, ctx)
	figures.SetSize(48, figures.lines()+2)
	checkFrame(t, "figures-48x"+strconv.Itoa(figures.lines()+2)+"-cut-0.5", figures.View(), 48, figures.lines()+2)

	list := newListPane(m.s, ctx)
	list.SetSize(40, 14)
	checkFrame(t, "list-40x14-cut-0.5", list.View(true), 40, 14)

	chart := newCurvePane(m.s, ctx)
	chart.SetSize(50, 12)
	checkFrame(t, "chart-50x12-cut-0.5", chart.View(), 50, 12)
}

// TestViewColour draws with colour on: every line keeps the frame's width
// (escape codes take no cells) and colour codes are present.
func TestViewColour(t *testing.T) {
	r := lipgloss.NewRenderer(io.Discard)
	r.SetColorProfile(termenv.TrueColor)
	styles := DefaultStyles(r)
	set := demoSet(t)
	m := New(Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions,
		Out: filepath.Join(t.TempDir(), "cut.yaml"), Styles: &styles})
	m = send(m, tea.WindowSizeMsg{Width: 100, Height: 30})
	m = send(m, m.loadCmd()())
	for _, step := range [][]string{nil, {"2", "p", "4", "p"}, {"tab"}, {"?"}, {"esc", "a"}} {
		m = keys(m, step...)
		frame := m.View()
		if !strings.Contains(frame, "\x1b[") {
			t.Errorf("after %v: no colour codes with colour on", step)
		}
		lines := strings.Split(frame, "\n")
		if len(lines) != 30 {
			t.Errorf("after %v: %d lines, want 30", step, len(lines))
		}
		for i, line := range lines {
			if w := ansi.StringWidth(line); w != 100 {
				t.Errorf("after %v: line %d is %d cells, want 100", step, i+1, w)
			}
		}
	}
}
