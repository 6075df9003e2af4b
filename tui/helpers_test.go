package tui

import (
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// demoSet reads the built-in demo data, as sill with no arguments does.
func demoSet(t testing.TB) *scores.Set {
	t.Helper()
	set, err := scores.Read(strings.NewReader(string(demo.CSV(demo.DefaultRows, demo.DefaultSeed))), demo.Source,
		scores.Options{SegmentColumn: "yard", IDColumn: "id"})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// withColumns returns set rebuilt with the columns change makes to set's
// own, given in set's ranked order, as a test adds a column to a set.
func withColumns(t testing.TB, set *scores.Set, change func(c *scores.Columns)) *scores.Set {
	t.Helper()
	c := set.Columns()
	change(&c)
	out, err := scores.NewSet(c)
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// demoAssumptions are the demo's operating assumptions (package demo) with the validation
// base rate.
func demoAssumptions(set *scores.Set) (projection.Assumptions, error) {
	positives, negatives := set.Totals()
	return projection.Assumptions{
		BaseRate: positives / (positives + negatives), Volume: 1500, Capacity: 90, Confidence: 0.95,
		Costs: &projection.Costs{FalseAlert: 120, Miss: 1200},
	}, nil
}

// loaded returns a model that has loaded set under assume and been sized
// width×height, with colour off.
func loaded(t testing.TB, set *scores.Set, assume func(*scores.Set) (projection.Assumptions, error), out string, width, height int) Model {
	t.Helper()
	m := New(Config{
		Load:   func(func(int)) (*scores.Set, error) { return set, nil },
		Assume: assume,
		Out:    out,
	})
	m = send(m, tea.WindowSizeMsg{Width: width, Height: height})
	msg := m.loadCmd()()
	if _, ok := msg.(scoresLoadedMsg); !ok {
		t.Fatalf("load gave %#v", msg)
	}
	return send(m, msg)
}

// send passes one message to Update, runs the command it returns when that
// is quick work of the model's own (starting points, writing), and returns
// the model.
func send(m Model, msg tea.Msg) Model {
	next, cmd := m.Update(msg)
	m = next.(Model)
	if cmd != nil {
		switch out := cmd().(type) {
		case startsFoundMsg, fileWrittenMsg, writeFailedMsg:
			next, _ = m.Update(out)
			m = next.(Model)
		}
	}
	return m
}

// keys sends each key in turn: names such as "down" or "ctrl+c" and
// single characters.
func keys(m Model, names ...string) Model {
	for _, name := range names {
		m = send(m, keyMsg(name))
	}
	return m
}

func keyMsg(name string) tea.KeyMsg {
	special := map[string]tea.KeyType{
		"up": tea.KeyUp, "down": tea.KeyDown, "left": tea.KeyLeft, "right": tea.KeyRight,
		"enter": tea.KeyEnter, "esc": tea.KeyEsc, "tab": tea.KeyTab, "shift+tab": tea.KeyShiftTab,
		"backspace": tea.KeyBackspace, "pgup": tea.KeyPgUp, "pgdown": tea.KeyPgDown,
		"home": tea.KeyHome, "end": tea.KeyEnd, "ctrl+c": tea.KeyCtrlC, "ctrl+u": tea.KeyCtrlU,
	}
	if t, ok := special[name]; ok {
		return tea.KeyMsg{Type: t}
	}
	return tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(name)}
}

// typeText sends each character of text as a key.
func typeText(m Model, text string) Model {
	for _, r := range text {
		m = send(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune{r}})
	}
	return m
}
