package tui

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// tenRows is the hand-worked set of the update tests, riskiest first:
//
//	0.9 T · 0.8 F · 0.8 T (tied) · 0.7 F · 0.6 T · 0.5 F · 0.4 F · 0.3 F · 0.2 F · 0.1 F
//
// 3 true cases of 10, base rate 0.3, and 9 cuts (0.8 is one cut of two
// rows): cut 0 is 0.9, cut 1 is 0.8, cut 2 is 0.7, cut 3 is 0.6 and so on.
func tenRows(t testing.TB) *scores.Set {
	t.Helper()
	set, err := scores.NewSet(scores.Columns{
		Scores: []float64{0.9, 0.8, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2, 0.1},
		Labels: []bool{true, false, true, false, true, false, false, false, false, false},
		Source: "ten.csv",
	})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// tenAssumptions: volume 100, capacity 40, a wrong alert costs 10 and a
// miss 100, at the validation base rate 0.3.
func tenAssumptions(*scores.Set) (projection.Assumptions, error) {
	return projection.Assumptions{BaseRate: 0.3, Volume: 100, Capacity: 40, Confidence: 0.95,
		Costs: &projection.Costs{FalseAlert: 10, Miss: 100}}, nil
}

func tenModel(t testing.TB) Model {
	t.Helper()
	return loaded(t, tenRows(t), tenAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 100, 30)
}

func cursorScore(t *testing.T, m Model) float64 {
	t.Helper()
	_, score, ok := m.Cursor()
	if !ok {
		t.Fatal("no cursor: the scores are not loaded")
	}
	return score
}

// TestStartingPoints jumps to each starting point of tenRows. Each expected
// cut is worked by hand from the rules in the doc of package cutrule:
//
//	1 base:        flagged share <= 0.3: 3 rows at 0.8 → 0.8
//	2 hit=0.8:     strictest recall >= 0.8: recall 3/3 first at 0.6
//	3 wrong=0.333: deepest share of wrong alerts <= 0.333: 0 at 0.9, 1/3 > 0.333 at 0.8 → 0.9
//	4 queue=40:    deepest 100*flagged/10 <= 40: 4 rows at 0.7 → 0.7
//	5 cost:        per case 0.7*FPR*10 + 0.3*(1-recall)*100: 20, 11, 12, 2, 3, ... → 0.6
func TestStartingPoints(t *testing.T) {
	m := tenModel(t)
	if got := cursorScore(t, m); got != 0.8 {
		t.Errorf("first screen: cursor at %v, want the first starting point 0.8", got)
	}
	for _, tc := range []struct {
		key  string
		want float64
	}{{"1", 0.8}, {"2", 0.6}, {"3", 0.9}, {"4", 0.7}, {"5", 0.6}} {
		m = keys(m, "G", tc.key)
		if got := cursorScore(t, m); got != tc.want {
			t.Errorf("key %s: cursor at %v, want %v", tc.key, got, tc.want)
		}
	}
	m = keys(m, "5")
	if got := m.s.rulesAt(m.s.cursor); strings.Join(got, ",") != "hit=0.8,cost" {
		t.Errorf("rules at 0.6: %v, want hit=0.8 and cost", got)
	}
	// Least cost at 0.6 is 2 per case, 200 per shift (hand-worked above).
	if got := m.s.evidenceAt(m.s.cursor).Projected.CostPerShift; !floatcmp.Equal(got, 200) {
		t.Errorf("cost per shift at 0.6: %v, want 200", got)
	}
}

// TestStartingPointsNeedAssumptions: without volume and costs only the
// first three starting points exist and the two promised ones after
// them (keys 4 and 5), and keys 6 and 7 do nothing.
func TestStartingPointsNeedAssumptions(t *testing.T) {
	m := loaded(t, tenRows(t), func(*scores.Set) (projection.Assumptions, error) {
		return projection.Assumptions{BaseRate: 0.3, Confidence: 0.95}, nil
	}, filepath.Join(t.TempDir(), "cut.yaml"), 100, 30)
	if len(m.s.starts) != 5 || m.s.starts[3].Rule.Kind != cutrule.HitBound || m.s.starts[4].Rule.Kind != cutrule.WrongBound {
		t.Fatalf("%d starting points, want 5: base, hit, wrong, then hit95 and wrong95", len(m.s.starts))
	}
	m = keys(m, "G", "6", "7")
	if got := cursorScore(t, m); got != 0.1 {
		t.Errorf("keys 6 and 7 moved the cursor to %v; want it left at the loosest cut 0.1", got)
	}
	if m.ctx.keys.Capacity.Enabled() || m.ctx.keys.LeastCost.Enabled() {
		t.Errorf("capacity and least-cost keys enabled without their assumptions")
	}
}

func TestCursorMoves(t *testing.T) {
	m := tenModel(t) // at 0.8, cut 1
	cases := []struct {
		key  string
		want float64
	}{
		{"down", 0.7}, {"j", 0.6}, {"up", 0.7}, {"k", 0.8},
		{"k", 0.9}, {"k", 0.9}, // stays at the strictest cut
		{"G", 0.1}, {"j", 0.1}, // stays at the loosest
		{"g", 0.9}, {"end", 0.1}, {"home", 0.9},
		// A page is the rows in view (24 at 100x30), more than the set:
		// page down goes to the loosest cut, page up back to the strictest.
		{"pgdown", 0.1}, {"pgup", 0.9},
	}
	for i, tc := range cases {
		m = keys(m, tc.key)
		if got := cursorScore(t, m); got != tc.want {
			t.Errorf("step %d (%s): cursor at %v, want %v", i, tc.key, got, tc.want)
		}
	}
	// The tie group at 0.8 moves together: one step from 0.9 flags 3 rows.
	m = keys(m, "g", "j")
	if rows := m.s.point().Rows; rows != 3 {
		t.Errorf("cut 0.8 flags %d rows, want 3 (the tie group of two moves together)", rows)
	}
}

// TestTypedAhead: several runes in one message act as separate keys.
func TestTypedAhead(t *testing.T) {
	m := tenModel(t)
	m = send(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("jjp")})
	if got := cursorScore(t, m); got != 0.6 {
		t.Errorf("after jj cursor at %v, want 0.6", got)
	}
	if got := m.Pins(); len(got) != 1 {
		t.Errorf("pins %v, want one", got)
	}
}

func TestPinAndStrip(t *testing.T) {
	m := tenModel(t)
	m = keys(m, "p")           // 0.8, on base
	m = keys(m, "p")           // the same cut again: no second pin
	m = keys(m, "j", "j", "j") // 0.5, no rule
	m = keys(m, "p")
	m = keys(m, "2", "p") // 0.6, on hit=0.8 and cost
	if got := strings.Join(m.Pins(), ","); got != "base,cut 2,hit=0.8" {
		t.Fatalf("pins %q, want base,cut 2,hit=0.8", got)
	}
	if m.s.reference != 0 {
		t.Errorf("reference %d, want the first pin", m.s.reference)
	}
	m = keys(m, "tab")
	if m.focus != focusStrip {
		t.Fatalf("tab did not give the strip the keys")
	}
	// The newest pin is selected; selecting "cut 2" to its left puts the
	// cursor on its cut, and enter brings it back after a move.
	m = keys(m, "left")
	if got := cursorScore(t, m); got != 0.5 {
		t.Errorf("selecting cut 2: cursor at %v, want 0.5", got)
	}
	m = keys(m, "g", "enter")
	if got := cursorScore(t, m); got != 0.5 {
		t.Errorf("enter on cut 2: cursor at %v, want 0.5", got)
	}
	m = keys(m, "c")
	if m.s.reference != 1 {
		t.Errorf("c: reference %d, want 1", m.s.reference)
	}
	m = keys(m, ">")
	if got := strings.Join(m.Pins(), ","); got != "base,hit=0.8,cut 2" || m.s.reference != 2 {
		t.Errorf("> gave %q with reference %d, want base,hit=0.8,cut 2 with the reference following cut 2", got, m.s.reference)
	}
	m = keys(m, "r", "ctrl+u")
	m = typeText(m, "base")
	m = keys(m, "enter")
	if rename, ok := m.overlays[len(m.overlays)-1].(*textBox[*Model]); len(m.overlays) != 1 || !ok || rename.err == "" {
		t.Errorf("renaming to a taken name was not refused: overlays %v", m.overlays)
	}
	m = keys(m, "ctrl+u")
	m = typeText(m, "lead's pick")
	m = keys(m, "enter")
	if got := m.Pins()[2]; got != "lead's pick" || len(m.overlays) != 0 {
		t.Errorf("rename gave %q, overlays %v", got, m.overlays)
	}
	table := m.s.table()
	if table.Names[table.Reference] != "lead's pick" {
		t.Errorf("strip reference %q, want the renamed chosen candidate", table.Names[table.Reference])
	}
	m = keys(m, "x")
	if got := strings.Join(m.Pins(), ","); got != "base,hit=0.8" || m.s.reference != 0 {
		t.Errorf("x gave %q reference %d, want base,hit=0.8 with the reference back on the first", got, m.s.reference)
	}
	if want := `unpinned "lead's pick"; "base" is the chosen cut now`; m.status != want {
		t.Errorf("unpinning the chosen candidate: status %q, want %q", m.status, want)
	}
	m = keys(m, "x", "x")
	if len(m.Pins()) != 0 || m.focus != focusList {
		t.Errorf("removing every pin left %v, focus %v", m.Pins(), m.focus)
	}
}

func TestAssumptionsForm(t *testing.T) {
	m := tenModel(t)
	m = keys(m, "4", "p") // 0.7: queue 40 at volume 100
	m = keys(m, "a")
	if len(m.overlays) != 1 || !topIs[*formPane](m) {
		t.Fatalf("a did not open the form")
	}
	form := m.overlays[0].(*formPane)
	m = keys(m, "tab", "ctrl+u") // volume
	m = typeText(m, "-5")
	m = keys(m, "enter")
	if len(m.overlays) != 1 || form.fields[fieldVolume].err == "" {
		t.Fatalf("a negative volume was accepted")
	}
	if m.s.assume.Volume != 100 {
		t.Errorf("refused form changed the volume to %v", m.s.assume.Volume)
	}
	m = keys(m, "ctrl+u")
	m = typeText(m, "200")
	m = keys(m, "enter")
	if len(m.overlays) != 0 {
		t.Fatalf("a valid form stayed open: %q", form.fields[fieldVolume].err)
	}
	if m.s.assume.Volume != 200 || m.s.assume.BaseRate != 0.3 {
		t.Errorf("assumptions %+v, want volume 200 and the base rate unchanged", m.s.assume)
	}
	// The pin recomputes: 4 of 10 flagged at volume 200 is 80 per shift.
	if got := m.s.table().Rows; !strings.Contains(strings.Join(rowCells(got, "queue per shift"), ","), "80.0") {
		t.Errorf("pinned queue after the change: %v, want 80.0", rowCells(got, "queue per shift"))
	}
	// The capacity starting point moves: queue 2*rows*10 <= 40 is 2 rows,
	// but 0.8 flags 3, so the deepest cut within 40 is 0.9 (1 row, 20).
	m = keys(m, "4")
	if got := cursorScore(t, m); got != 0.9 {
		t.Errorf("capacity start after the change at %v, want 0.9", got)
	}
	// esc leaves the assumptions as they were.
	m = keys(m, "a", "ctrl+u")
	m = typeText(m, "0.5")
	m = keys(m, "esc")
	if m.s.assume.BaseRate != 0.3 || len(m.overlays) != 0 {
		t.Errorf("esc: base rate %v overlays %v", m.s.assume.BaseRate, m.overlays)
	}
}

func rowCells(rows []compare.Row, figure string) []string {
	for _, r := range rows {
		if strings.TrimSpace(r.Figure) == figure {
			return r.Cells
		}
	}
	return nil
}

func TestFormParse(t *testing.T) {
	ctx := &shared{styles: PlainStyles(), keys: DefaultKeyMap()}
	cases := []struct {
		name   string
		values map[int]string
		bad    int // the field refused, -1 for none
		check  func(projection.Assumptions) bool
	}{
		{"percent base rate", map[int]string{fieldBaseRate: "7%"}, -1, func(a projection.Assumptions) bool { return floatcmp.Equal(a.BaseRate, 0.07) }},
		{"empty base rate is the validation rate", map[int]string{fieldBaseRate: ""}, -1, func(a projection.Assumptions) bool { return a.BaseRate == 0.25 }},
		{"base rate above 1", map[int]string{fieldBaseRate: "1.5"}, fieldBaseRate, nil},
		{"not a number", map[int]string{fieldVolume: "lots"}, fieldVolume, nil},
		{"capacity without volume", map[int]string{fieldVolume: "", fieldCapacity: "10"}, fieldCapacity, nil},
		{"one cost gives costs", map[int]string{fieldCostMiss: "50"}, -1, func(a projection.Assumptions) bool {
			return a.Costs != nil && a.Costs.Miss == 50 && a.Costs.FalseAlert == 0
		}},
		{"no costs", map[int]string{}, -1, func(a projection.Assumptions) bool { return a.Costs == nil }},
		{"confidence 1", map[int]string{fieldConfidence: "1"}, fieldConfidence, nil},
		{"infinite volume", map[int]string{fieldVolume: "Inf"}, fieldVolume, nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			p := newFormPane(ctx, projection.Assumptions{BaseRate: 0.25, Confidence: 0.95}, 0.25)
			for field, v := range tc.values {
				p.fields[field].input.SetValue(v)
			}
			a, ok := p.parse()
			if tc.bad >= 0 {
				if ok || p.fields[tc.bad].err == "" {
					t.Errorf("field %d not refused (ok %v)", tc.bad, ok)
				}
				return
			}
			if !ok {
				t.Fatalf("refused: %+v", p.fields)
			}
			if !tc.check(a) {
				t.Errorf("assumptions %+v", a)
			}
		})
	}
}

// TestFormShares: the base rate and confidence fields read shares as the
// command line does (package share), with the reason beside a refused
// one; the volume, a count, takes no percent sign.
func TestFormShares(t *testing.T) {
	ctx := &shared{styles: PlainStyles(), keys: DefaultKeyMap()}
	cases := []struct {
		field       int
		text        string
		want        float64 // the base rate or confidence read
		refusedWith string  // "" when accepted
	}{
		{fieldBaseRate, "5%", 0.05, ""},
		{fieldBaseRate, " 5 % ", 0.05, ""},
		{fieldBaseRate, "0.05", 0.05, ""},
		{fieldBaseRate, "33.3%", 0.333, ""},
		{fieldBaseRate, "105%", 0, `this is more than 100%; expected 0 to 1 or 0% to 100%`},
		{fieldBaseRate, "-5%", 0, `this is negative; expected 0 to 1 or 0% to 100%`},
		{fieldBaseRate, "5%%", 0, `this has more than one percent sign; expected 0 to 1 or 0% to 100%`},
		{fieldConfidence, "90%", 0.9, ""},
		{fieldConfidence, "100%", 0, "expected a level above 0 and below 1, such as 0.95 or 95%"},
		{fieldConfidence, "95", 0, `this is more than 1; expected 0 to 1 or 0% to 100%`},
		{fieldVolume, "5%", 0, `"5%" is not a number`},
	}
	for _, tc := range cases {
		p := newFormPane(ctx, projection.Assumptions{BaseRate: 0.25, Confidence: 0.95}, 0.25)
		p.fields[tc.field].input.SetValue(tc.text)
		a, ok := p.parse()
		if tc.refusedWith != "" {
			if ok || p.fields[tc.field].err != tc.refusedWith {
				t.Errorf("field %d %q: ok %v, reason %q; want refused with %q", tc.field, tc.text, ok, p.fields[tc.field].err, tc.refusedWith)
			}
			continue
		}
		got := a.BaseRate
		if tc.field == fieldConfidence {
			got = a.Confidence
		}
		if !ok || got != tc.want {
			t.Errorf("field %d %q: ok %v, read %v; want %v", tc.field, tc.text, ok, got, tc.want)
		}
	}
}

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "cut.yaml")
	m := loaded(t, tenRows(t), tenAssumptions, out, 100, 30)
	if m.Unwritten() != 0 {
		t.Errorf("fresh screen: %d unwritten", m.Unwritten())
	}
	// Nothing pinned: w pins the cursor's cut (base, 0.8) and writes it.
	m = keys(m, "w")
	if m.Unwritten() != 0 {
		t.Errorf("after writing: %d unwritten", m.Unwritten())
	}
	if m.Written() != out {
		t.Fatalf("written %q, status %q", m.Written(), m.status)
	}
	f, err := decision.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	if f.Chosen != "base" || len(f.Candidates) != 1 || f.Candidates[0].Cut.Score != 0.8 {
		t.Errorf("file chose %q among %d, score %v; want base at 0.8", f.Chosen, len(f.Candidates), f.Candidates[0].Cut.Score)
	}
	// Pin a second, choose it, write again: the same data replaces quietly.
	m = keys(m, "2", "p")
	if m.Unwritten() != 2 {
		t.Errorf("after a new pin: %d unwritten, want 2", m.Unwritten())
	}
	m = keys(m, "tab", "c", "w")
	f, err = decision.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	if f.Chosen != "hit=0.8" || len(f.Candidates) != 2 || f.Candidates[1].Cut.Score != 0.6 {
		t.Errorf("second write chose %q among %d", f.Chosen, len(f.Candidates))
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("the folder holds %d entries, want only cut.yaml (no temporary file left)", len(entries))
	}
}

func TestWriteOverOtherData(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "cut.yaml")
	// A decision file made from the demo data.
	other := loaded(t, demoSet(t), demoAssumptions, out, 100, 30)
	other = keys(other, "w")
	if other.Written() != out {
		t.Fatalf("demo write: %q", other.status)
	}
	before, _ := os.ReadFile(out)

	m := loaded(t, tenRows(t), tenAssumptions, out, 100, 30)
	m = keys(m, "w")
	if len(m.overlays) != 1 || !topIs[*question[*Model]](m) {
		t.Fatalf("no question before replacing a file of other data; status %q", m.status)
	}
	m = keys(m, "n")
	after, _ := os.ReadFile(out)
	if string(after) != string(before) || m.Written() != "" {
		t.Errorf("n replaced the file")
	}
	m = keys(m, "w", "y")
	f, err := decision.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	if f.Data.Path != "ten.csv" || m.Written() != out {
		t.Errorf("y: file is for %q", f.Data.Path)
	}
}

func TestLoadError(t *testing.T) {
	bad := &scores.ParseError{File: "scores.csv", Line: 14, Column: "label", Err: scores.ErrBadLabel}
	m := New(Config{
		Load:   func(func(int)) (*scores.Set, error) { return nil, bad },
		Assume: tenAssumptions,
	})
	m = send(m, tea.WindowSizeMsg{Width: 80, Height: 24})
	msg := m.loadCmd()()
	next, cmd := m.Update(msg)
	m = next.(Model)
	if !errors.Is(m.Err(), scores.ErrBadLabel) {
		t.Errorf("Err() = %v, want the parse error", m.Err())
	}
	if cmd == nil {
		t.Fatal("no quit after a load error")
	}
	if _, ok := cmd().(tea.QuitMsg); !ok {
		t.Errorf("command after a load error is not quit")
	}
	if m.View() != "" {
		t.Errorf("view after a load error: %q, want nothing left on screen", m.View())
	}
}

func TestQuitKeys(t *testing.T) {
	for _, k := range []string{"q", "ctrl+c"} {
		m := tenModel(t)
		_, cmd := m.Update(keyMsg(k))
		if cmd == nil {
			t.Fatalf("%s: no command", k)
		}
		if _, ok := cmd().(tea.QuitMsg); !ok {
			t.Errorf("%s does not quit", k)
		}
	}
	// In the form q is text, ctrl+c still quits.
	m := keys(tenModel(t), "a", "q")
	if len(m.overlays) != 1 {
		t.Errorf("q closed the form")
	}
	if _, cmd := m.Update(keyMsg("ctrl+c")); cmd == nil {
		t.Errorf("ctrl+c in the form does not quit")
	}
}

// TestStaleStartingPoints: starting points found for assumptions that have
// changed since are dropped.
func TestStaleStartingPoints(t *testing.T) {
	m := tenModel(t)
	stale := startsFoundMsg{assume: projection.Assumptions{BaseRate: 0.9, Confidence: 0.95}}
	before := len(m.s.starts)
	m = send(m, stale)
	if len(m.s.starts) != before {
		t.Errorf("stale starting points replaced the current ones")
	}
}

func TestReading(t *testing.T) {
	cases := []struct {
		share float64
		want  string
	}{
		{math.NaN(), "no alerts at this cut"},
		{0, "no alert is wrong"},
		{1, "every alert is wrong"},
		{1.0 / 3, "about 1 in 3 alerts is wrong"}, // exactly 1/3
		{0.5, "about 1 in 2 alerts is wrong"},
		{0.6, "about 3 in 5 alerts are wrong"},   // 3/5 exactly; 2/3 is further
		{0.746, "about 3 in 4 alerts are wrong"}, // 3/4 within 0.02
		{0.05, "about 1 in 20 alerts is wrong"},  // below 10%: 1 in round(1/0.05)
		{0.95, "about 1 in 20 alerts is right"},  // above 90%: 1 in round(1/0.05) right
		{0.462, "about 4 in 9 alerts are wrong"}, // 1/2 off by 0.038, 4/9 = 0.444 off by 0.018
	}
	for _, tc := range cases {
		if got := Reading(tc.share); got != tc.want {
			t.Errorf("Reading(%v) = %q, want %q", tc.share, got, tc.want)
		}
	}
}

// TestEscThenKey checks that esc and a key read together as alt+key (as
// a terminal sends them when they come close together) act as the two
// keys: the form closes and the cursor moves.
func TestEscThenKey(t *testing.T) {
	m := tenModel(t)
	before := cursorScore(t, m)
	m = keys(m, "a")
	if len(m.overlays) != 1 {
		t.Fatal("a did not open the form")
	}
	m = send(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("j"), Alt: true})
	if len(m.overlays) != 0 {
		t.Errorf("alt+j left the form open")
	}
	if got := cursorScore(t, m); got >= before {
		t.Errorf("alt+j: cursor at %v, want a looser cut than %v", got, before)
	}
}

// TestKeysThatNeedMore checks that s and m say what they need when the
// data has no segments and one model only.
func TestKeysThatNeedMore(t *testing.T) {
	m := tenModel(t)
	for key, want := range map[string]string{"s": "--segment COL", "m": "--score a --score b"} {
		m = keys(m, key)
		if len(m.overlays) != 0 || !strings.Contains(m.status, want) {
			t.Errorf("%s: overlays %v, status %q, want it to name %s", key, m.overlays, m.status, want)
		}
	}
}

// TestQuitAsksWithUnwrittenPins: q with pins not written asks; n and esc
// stay, y quits; once written, or with no pins, q quits at once; ctrl+c
// always quits.
func TestQuitAsksWithUnwrittenPins(t *testing.T) {
	quits := func(cmd tea.Cmd) bool {
		if cmd == nil {
			return false
		}
		_, ok := cmd().(tea.QuitMsg)
		return ok
	}
	for _, stay := range []string{"n", "esc"} {
		m := keys(tenModel(t), "p")
		next, cmd := m.Update(keyMsg("q"))
		m = next.(Model)
		if quits(cmd) || len(m.overlays) != 1 {
			t.Fatalf("q with a pin not written: quits %v, overlays %d; want the question", quits(cmd), len(m.overlays))
		}
		if view := ansi.Strip(m.View()); !strings.Contains(view, "pins not written") || !strings.Contains(view, "y quits") {
			t.Errorf("the question is not on screen:\n%s", view)
		}
		next, cmd = m.Update(keyMsg(stay))
		m = next.(Model)
		if quits(cmd) || len(m.overlays) != 0 || len(m.s.pins) != 1 {
			t.Errorf("%s: quits %v, overlays %d, pins %d; want the screen as it was", stay, quits(cmd), len(m.overlays), len(m.s.pins))
		}
		if _, cmd = keys(m, "q").Update(keyMsg("y")); !quits(cmd) {
			t.Errorf("y after %s does not quit", stay)
		}
	}
	m := keys(tenModel(t), "p", "q")
	if _, cmd := m.Update(keyMsg("ctrl+c")); !quits(cmd) {
		t.Errorf("ctrl+c with the question open does not quit")
	}
	written := keys(tenModel(t), "p")
	written.unwritten = false // as after a write (fileWrittenMsg)
	if _, cmd := written.Update(keyMsg("q")); !quits(cmd) {
		t.Errorf("q once the pins are written does not quit")
	}
}

// TestHelpTermsPages: in the help, tab turns to the pages of terms and
// back round to the keys, shift+tab goes back, and every term the
// explorer's figures pane and list show at 100x30 after b is explained on
// one of the pages; esc closes from any page.
func TestHelpTermsPages(t *testing.T) {
	m := keys(tenModel(t), "?")
	help := m.overlays[0].(*helpOverlay[*Model])
	pages := termPages(m.ctx, explorerTerms)
	if len(pages) < 2 {
		t.Fatalf("%d pages of terms at %dx%d; the test wants the flipping to matter", len(pages), m.ctx.width, m.ctx.height)
	}
	for i := 1; i <= len(pages); i++ {
		m = keys(m, "tab")
		if help.page != i || !strings.Contains(ansi.Strip(m.View()), fmt.Sprintf("terms on screen (%d of %d)", i, len(pages))) {
			t.Fatalf("after %d tabs: page %d, view:\n%s", i, help.page, ansi.Strip(m.View()))
		}
	}
	if m = keys(m, "tab"); help.page != 0 || !strings.Contains(ansi.Strip(m.View()), "move the cut") {
		t.Errorf("tab on the last page does not return to the keys (page %d)", help.page)
	}
	if m = keys(m, "shift+tab"); help.page != len(pages) {
		t.Errorf("shift+tab from the keys: page %d, want the last, %d", help.page, len(pages))
	}
	if m = keys(m, "esc"); len(m.overlays) != 0 {
		t.Errorf("esc on a page of terms does not close the help")
	}
	var all strings.Builder
	for _, p := range termPages(m.ctx, explorerTerms) {
		all.WriteString(ansi.Strip(p))
	}
	for _, shown := range []string{"redraws", "steady", "net benefit", "flag all", "queue90", "hit share", "wrong-alert share", "true ●", "validation TP FP FN TN", "shifts: 9/10"} {
		if !strings.Contains(all.String(), shown) {
			t.Errorf("no term explains %q", shown)
		}
	}
}

// TestListTrueColumn: the list's mark column is headed "true" where the
// ids keep their width, and the rows' marks sit under it.
func TestListTrueColumn(t *testing.T) {
	m := loaded(t, demoSet(t), demoAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 100, 30)
	lines := strings.Split(ansi.Strip(m.View()), "\n")
	head := lines[2]
	at := strings.Index(head, " true ")
	if at < 0 {
		t.Fatalf("no true column at 100x30: %q", head)
	}
	column := len([]rune(head[:at+1]))
	row := []rune(lines[3])
	if mark := string(row[column]); mark != "●" && mark != "·" {
		t.Errorf("the first row's mark %q is not under the column head %q:\n%s\n%s", mark, head, head, lines[3])
	}
}

// TestWriteWaitsForNewFigures: w pressed while the figures under new
// assumptions are still being computed writes once they arrive, with the
// new assumptions, instead of asking the user to press it again.
func TestWriteWaitsForNewFigures(t *testing.T) {
	out := filepath.Join(t.TempDir(), "cut.yaml")
	m := loaded(t, tenRows(t), tenAssumptions, out, 100, 30)
	m = keys(m, "a", "ctrl+u")
	m = typeText(m, "10%")
	// enter applies the form; hold back the background work it starts.
	next, compute := m.Update(keyMsg("enter"))
	m = next.(Model)
	if compute == nil {
		t.Fatal("applying the form started no computation")
	}
	next, cmd := m.Update(keyMsg("w"))
	m = next.(Model)
	if cmd != nil || m.Written() != "" {
		t.Fatalf("w wrote before the figures arrived (status %q)", m.status)
	}
	if !strings.Contains(m.status, "writing once") {
		t.Errorf("status %q does not say the write waits", m.status)
	}
	next, write := m.Update(compute())
	m = next.(Model)
	if write == nil {
		t.Fatalf("the figures arrived and no write started (status %q)", m.status)
	}
	next, _ = m.Update(write())
	m = next.(Model)
	if m.Written() != out {
		t.Fatalf("written %q, status %q", m.Written(), m.status)
	}
	f, err := decision.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	if !floatcmp.Equal(f.Assumptions.BaseRate, 0.1) {
		t.Errorf("file base rate %v, want the new 0.1", f.Assumptions.BaseRate)
	}
}
