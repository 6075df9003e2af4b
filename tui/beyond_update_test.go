package tui

import (
	"io"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/muesli/termenv"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// topIs reports whether the top overlay of m is of type T.
func topIs[T overlay[*Model]](m Model) bool {
	if len(m.overlays) == 0 {
		return false
	}
	_, ok := m.overlays[len(m.overlays)-1].(T)
	return ok
}

// TestSegmentsOverlay: s opens the breakdown, the cut keys still move the
// cut under it, o cycles the order, the page keys scroll, esc closes; the
// figures are those of package segment at the cursor's cut.
func TestSegmentsOverlay(t *testing.T) {
	set := manySegments(t)
	m := loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions}, 80, 24)
	m = keys(m, "2", "s")
	if !topIs[*segmentsPane](m) {
		t.Fatalf("s opened %v", m.overlays)
	}
	before := m.s.cursor
	m = keys(m, "j")
	if m.s.cursor != before+1 || !topIs[*segmentsPane](m) {
		t.Errorf("j under the breakdown: cursor %d, want %d, overlays %v", m.s.cursor, before+1, m.overlays)
	}
	// The breakdown is At's at the cursor's cut (the reference), sorted
	// by size: most rows first.
	want := segment.At(set, m.s.point(), m.s.assume.Confidence)
	want.Sort(segment.BySize)
	got := m.segments.breakdown()
	if len(got.Segments) != 40 || got.Segments[0].Segment != want.Segments[0].Segment || !floatcmp.Equal(got.Overall.Recall, want.Overall.Recall) {
		t.Errorf("breakdown %+v, want %+v", got.Segments[0], want.Segments[0])
	}
	for i := range got.Segments {
		if i > 0 && got.Segments[i].Rows > got.Segments[i-1].Rows {
			t.Fatalf("by size: %d rows after %d", got.Segments[i].Rows, got.Segments[i-1].Rows)
		}
		if !floatcmp.Equal(got.Segments[i].TP, want.Segments[i].TP) || got.Segments[i].Outlier != want.Segments[i].Outlier {
			t.Fatalf("group %s: %+v, want %+v", got.Segments[i].Segment, got.Segments[i], want.Segments[i])
		}
	}
	page := m.segments.rowsInView()
	m = keys(m, "pgdown")
	if m.segments.offset != page {
		t.Errorf("pgdown: offset %d, want %d", m.segments.offset, page)
	}
	m = keys(m, "G")
	if m.segments.offset != 40-page {
		t.Errorf("G: offset %d, want %d (the last page)", m.segments.offset, 40-page)
	}
	m = keys(m, "o")
	if m.segments.order != segment.ByGap || m.segments.offset != 0 {
		t.Errorf("o: order %v offset %d, want by gap from the top", m.segments.order, m.segments.offset)
	}
	got = m.segments.breakdown()
	for i := 1; i < len(got.Segments); i++ {
		if got.Segments[i].LargestGap() > got.Segments[i-1].LargestGap() {
			t.Fatalf("by gap: %v after %v", got.Segments[i].LargestGap(), got.Segments[i-1].LargestGap())
		}
	}
	m = keys(m, "o", "o")
	if m.segments.order != segment.BySize {
		t.Errorf("o three times: order %v, want by size again", m.segments.order)
	}
	m = keys(m, "esc")
	if len(m.overlays) != 0 {
		t.Errorf("esc left %v", m.overlays)
	}
}

// TestSegmentsViews: v turns the breakdown from the figures to the gaps
// and back where the gaps view has room for both intervals and adjusted
// p-values (100 columns); at 80 columns, where it has not, v goes through
// the gaps with their intervals, then with their adjusted p-values, then
// back to the figures, and each of those frames is 80 columns wide with
// the base rates in view.
func TestSegmentsViews(t *testing.T) {
	set := demoTimedSet(t)
	for _, tc := range []struct {
		width, height int
		want          []string // the views after each v: figures, gaps, p (gaps with adjusted p-values)
	}{
		{100, 30, []string{"gaps", "figures", "gaps"}},
		{80, 24, []string{"gaps", "p", "figures", "gaps"}},
	} {
		m := loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions}, tc.width, tc.height)
		m = keys(m, "s")
		for i, want := range tc.want {
			m = keys(m, "v")
			got := "figures"
			if m.segments.gaps {
				got = "gaps"
				if m.segments.gapsColumns(m.segments.breakdown()).pValues && !m.segments.gapsColumns(m.segments.breakdown()).intervals {
					got = "p"
				}
			}
			if got != want {
				t.Errorf("%dx%d: after %d v, %s, want %s", tc.width, tc.height, i+1, got, want)
			}
			frame := ansi.Strip(m.View())
			checkSize(t, frame, tc.width, tc.height)
			if got != "figures" && (!strings.Contains(frame, "base") || !strings.Contains(frame, "rest") || !strings.Contains(frame, "12.0%")) {
				t.Errorf("%dx%d %s: the base rates are not in view:\n%s", tc.width, tc.height, got, frame)
			}
		}
	}
}

// TestSegmentsKeyWithoutSegments: without a segment column s does nothing
// and the help does not list it.
func TestSegmentsKeyWithoutSegments(t *testing.T) {
	m := tenModel(t)
	m = keys(m, "s")
	if len(m.overlays) != 0 {
		t.Errorf("s opened %v without segments", m.overlays)
	}
	for _, b := range m.beyondKeys() {
		if b.Help().Key == "s" || b.Help().Key == "m" {
			t.Errorf("help lists %q without the data for it", b.Help().Key)
		}
	}
}

// TestShiftPeaks: with the demo's times and three shifts, the peaks at the
// cursor are those of package shift at its rows (the reference), key 6 is
// queue90 at the capacity and lands on the deepest cut whose modelled 90th
// percentile is at most the capacity, and doubling the volume doubles the
// mean and the sample's queues (the scale is the volume over the set's
// cases per shift) but not the p90, whose counting noise grows as the
// square root of the volume.
func TestShiftPeaks(t *testing.T) {
	m := demoBeyond(t, 100, 30)
	// 28 days of three shifts from 2026-09-01 00:00 UTC (the demo's doc),
	// and the shift from 22:00 the evening before, which holds the first
	// night's readings: 85.
	if m.s.shifts() == nil || m.s.shifts().Assigned.Count != 85 {
		t.Fatalf("assigned %v shifts", m.s.shifts() != nil && m.s.shifts().Assigned.Count == 85)
	}
	assigned := m.s.shifts().Assigned
	last := m.s.starts[len(m.s.starts)-1-len(cutrule.Promised())] // the promised ones come after it
	if last.Rule != (cutrule.Rule{Kind: cutrule.Queue90, Value: 90}) || !last.Met || !m.ctx.keys.Peak.Enabled() {
		t.Fatalf("last starting point %v met %v, key enabled %v", last.Rule, last.Met, m.ctx.keys.Peak.Enabled())
	}
	m = keys(m, "6")
	if m.s.cursor != last.Point.Index {
		t.Fatalf("6: cursor %d, want %d", m.s.cursor, last.Point.Index)
	}
	scale := shift.ScaleFor(m.s.set, assigned, m.s.assume)
	at := func(cut int) shift.Peaks { return assigned.At(m.s.set, m.s.curve.At(cut).Rows, scale, 90) }
	got, _ := m.s.peaksAtCut(m.s.cursor)
	want := at(m.s.cursor)
	if !floatcmp.Equal(got.P90, want.P90) || !floatcmp.Equal(got.Max, want.Max) || got.Busiest != want.Busiest || !floatcmp.Equal(got.OverCapacity, want.OverCapacity) {
		t.Errorf("peaks %+v, want %+v", got, want)
	}
	if want.P90 > 90 || at(m.s.cursor+1).P90 <= 90 {
		t.Errorf("queue90=90 at cut %d: p90 %v, one looser %v", m.s.cursor, want.P90, at(m.s.cursor+1).P90)
	}
	if !strings.Contains(m.View(), "9 in 10 ≤ "+format.Number(want.P90, 0)+" (noise + "+format.Number(100*want.Model.Spread, 0)+"% spread)") {
		t.Errorf("the figures do not show the 90th percentile %v:\n%s", want.P90, m.View())
	}
	// Double the volume in the form: every queue doubles.
	m = keys(m, "a", "tab", "ctrl+u")
	m = typeText(m, "3000")
	m = keys(m, "enter")
	if m.s.assume.Volume != 3000 {
		t.Fatalf("volume %v: %s", m.s.assume.Volume, m.status)
	}
	doubled, _ := m.s.peaksAtCut(m.s.cursor)
	reference := assigned.At(m.s.set, m.s.curve.At(m.s.cursor).Rows, shift.ScaleFor(m.s.set, assigned, m.s.assume), 90)
	if !floatcmp.Equal(doubled.Mean, 2*want.Mean) || !floatcmp.Equal(doubled.Max, 2*want.Max) || doubled.P90 != reference.P90 || !(doubled.P90 < 2*want.P90) {
		t.Errorf("volume doubled: mean %v p90 %v max %v, want %v, %v (below %v) and %v", doubled.Mean, doubled.P90, doubled.Max, 2*want.Mean, reference.P90, 2*want.P90, 2*want.Max)
	}
}

// TestResampling: b starts the bootstrap and shows its progress; b again
// stops it and a late result of the stopped run is dropped; a finished run
// gives the band and the spread of the cursor's starting point; changing
// the assumptions forgets it.
func TestResampling(t *testing.T) {
	m := demoBeyond(t, 100, 30)
	next, cmd := m.Update(keyMsg("b"))
	m = next.(Model)
	if !m.s.resampling.running || cmd == nil || !strings.Contains(m.View(), "resampling 0 of 100") {
		t.Fatalf("b: running %v, cmd %v", m.s.resampling.running, cmd != nil)
	}
	stale := m.s.resampling.run
	m = keys(m, "b")
	if m.s.resampling.running || m.status != "resampling stopped" {
		t.Errorf("b again: running %v, status %q", m.s.resampling.running, m.status)
	}
	next, _ = m.Update(resampledMsg{run: stale})
	m = next.(Model)
	if m.s.stability != nil {
		t.Errorf("a stopped run's result was taken")
	}
	next, _ = m.Update(resampleTickMsg{run: stale})
	m = next.(Model)

	m = resample(t, m)
	if m.s.stability == nil || m.s.stability.Replicates != 100 || m.s.stability.Seed != 1 || len(m.s.stability.Band) == 0 {
		t.Fatalf("resampled: %+v", m.s.stability)
	}
	result := m.s.stability
	m = keys(m, "b")
	if m.s.resampling.running || m.s.stability != result || !strings.Contains(m.status, "resampled already") {
		t.Errorf("b after a run: running %v, status %q", m.s.resampling.running, m.status)
	}
	m = keys(m, "2")
	sp, ok := m.s.spreadAt(m.s.cursor)
	if !ok || sp.Rule.Kind != cutrule.Hit || !(sp.Score[0] <= sp.Score[1]) {
		t.Fatalf("spread at hit=0.8: %+v %v", sp, ok)
	}
	view := m.View()
	for _, want := range []string{"the 80% hit-share point could land anywhere from", significant(sp.Score[0]) + " to " + significant(sp.Score[1]), "░"} {
		if !strings.Contains(view, want) {
			t.Errorf("the screen lacks %q:\n%s", want, view)
		}
	}
	m = keys(m, "a", "enter")
	if m.s.stability != nil || !strings.Contains(m.status, "b resamples again") {
		t.Errorf("after new assumptions: stability %v, status %q", m.s.stability != nil, m.status)
	}
}

// TestNetBenefit: the figures show the net benefit at the cursor's cut at
// production's base rate 0.3 and the threshold probability of the costs,
// 10/(10+100) = 1/11 (odds 0.1), the same for every cut. Hand-worked on
// the ten rows (3 true, 7 false): at 0.9 recall 1/3 and no false alert,
// 0.3/3 = 0.1000; at 0.8 recall 2/3 and FPR 1/7, 0.2 - 0.7/7*0.1 =
// 0.1900; at 0.5 recall 1 and FPR 3/7, 0.3 - 0.3*0.1 = 0.2700, with flag
// all 0.3 - 0.7*0.1 = 0.2300.
func TestNetBenefit(t *testing.T) {
	m := tenModel(t)
	for _, tc := range []struct {
		keys []string
		want string
	}{
		{[]string{"g"}, "net benefit 0.1000"},
		{[]string{"g", "j"}, "net benefit 0.1900"},
		{[]string{"g", "j", "j", "j", "j"}, "net benefit 0.2700 a case · flag all 0.2300"},
	} {
		got := keys(m, tc.keys...)
		if body := got.figures.body(); !strings.Contains(body, tc.want) {
			t.Errorf("after %v: figures lack %q:\n%s", tc.keys, tc.want, body)
		}
	}
}

// TestCalibrationOverlay: e opens the reliability table, with the cost
// threshold of Elkan 2001 for the ten rows' costs, 10/(10+100) = 0.091
// (worked by hand), and closes with e.
func TestCalibrationOverlay(t *testing.T) {
	m := tenModel(t)
	m = keys(m, "e")
	if !topIs[*calibrationPane](m) {
		t.Fatalf("e opened %v", m.overlays)
	}
	view := m.View()
	for _, want := range []string{"cost threshold (Elkan 2001) 0.091", "expected calibration error", "least-cost cut"} {
		if !strings.Contains(view, want) {
			t.Errorf("the overlay lacks %q:\n%s", want, view)
		}
	}
	before := m.s.cursor
	m = keys(m, "j")
	if !topIs[*calibrationPane](m) || m.s.cursor != before+1 {
		t.Errorf("j under the overlay: cursor %d overlays %v", m.s.cursor, m.overlays)
	}
	m = keys(m, "e")
	if len(m.overlays) != 0 {
		t.Errorf("e again left %v", m.overlays)
	}
}

// TestTwoModels: a second score column gives the second model's starting
// points under the same rules, the models overlay, and both curves named
// in the chart's title.
func TestTwoModels(t *testing.T) {
	set := twoModels(t)
	m := loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions}, 100, 30)
	second := m.s.second()
	if second == nil || len(second.Outcomes) != len(m.s.starts) || !m.ctx.keys.Models.Enabled() {
		t.Fatalf("second %v, starts %d", second != nil, len(m.s.starts))
	}
	for i, o := range second.Outcomes {
		if o.Rule != m.s.starts[i].Rule {
			t.Errorf("second model's rule %d is %v, want %v", i, o.Rule, m.s.starts[i].Rule)
		}
		if o.Rule.Kind == cutrule.Hit && !(o.Point.Recall() >= 0.8) {
			t.Errorf("second model at hit=0.8 has recall %v", o.Point.Recall())
		}
	}
	if second.TestErr != nil || !(second.Test.AUC[0] > second.Test.AUC[1]) { // the second is the noisier reading
		t.Errorf("paired test %+v, %v", second.Test, second.TestErr)
	}
	if title := m.chart.title(); !strings.Contains(title, "─") || !strings.Contains(title, "+++") {
		t.Errorf("chart title %q does not name both models' marks", title)
	}
	m = keys(m, "m")
	if !topIs[*modelsPane](m) || !strings.Contains(m.View(), "DeLong") {
		t.Errorf("m: overlays %v", m.overlays)
	}
	m = send(m, tea.KeyMsg{Type: tea.KeyEsc})
	if len(m.overlays) != 0 {
		t.Errorf("esc left %v", m.overlays)
	}
}

// TestChartTitleMarks: on a monochrome screen the title names each series
// beside its own mark, as the plot draws them.
func TestChartTitleMarks(t *testing.T) {
	m := tenModel(t)
	if title := m.chart.title(); !strings.Contains(title, "hit share ─") || !strings.Contains(title, "wrong-alert share ···") {
		t.Errorf("title %q", title)
	}
}

// TestFlowResample runs the explorer as a program: b resamples in the
// background, the screen says when it is done, and the final model holds
// the result under the seed given.
func TestFlowResample(t *testing.T) {
	set := demoTimedSet(t)
	tm := startProgram(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions,
		Out: filepath.Join(t.TempDir(), "cut.yaml"), Analysis: analysis.Options{Shifts: threeShifts(t), Resampling: analysis.Resampling{Replicates: 60, Seed: 9}}}, 100, 30)
	tm.Type("2b")
	waitText(t, tm, "resampled 60 times")
	tm.Type("q")
	m := finalModel(t, tm)
	if m.s.stability == nil || m.s.stability.Replicates != 60 || m.s.stability.Seed != 9 || m.s.resampling.running {
		t.Fatalf("stability %+v, running %v", m.s.stability, m.s.resampling.running)
	}
	if _, ok := m.s.spreadAt(m.s.cursor); !ok {
		t.Errorf("no spread at the hit=0.8 cut")
	}
}

// TestBeyondColour draws the new overlays and the band with colour on:
// every line keeps the frame's width.
func TestBeyondColour(t *testing.T) {
	r := lipgloss.NewRenderer(io.Discard)
	r.SetColorProfile(termenv.TrueColor)
	styles := DefaultStyles(r)
	set := demoTimedSet(t)
	m := loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: demoAssumptions,
		Analysis: analysis.Options{Shifts: threeShifts(t), Resampling: analysis.Resampling{Replicates: 40, Seed: 1}}, Styles: &styles}, 100, 30)
	m = resample(t, m)
	for _, step := range [][]string{nil, {"s"}, {"o", "esc", "e"}, {"esc", "6"}} {
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

// TestOddSetsBeyond drives the keys of issue 6 over sets at the edges,
// each with a segment, times in the three shifts and a second model: one
// row, one class only, every row tied, lower scores riskier, zero weights.
// Nothing may panic, every frame keeps its size, and a bootstrap the data
// cannot support says why.
func TestOddSetsBeyond(t *testing.T) {
	build := func(values []float64, labels []bool, weights []float64, lower bool) *scores.Set {
		set, err := scores.New(values, labels, weights, lower)
		if err != nil {
			t.Fatal(err)
		}
		return withColumns(t, set, func(c *scores.Columns) {
			c.Source = "odd.csv"
			c.SegmentNames, c.SegmentColumn = []string{"east", "west"}, "yard"
			c.SegmentOf = make([]int32, set.Len())
			c.Times = make([]int64, set.Len())
			c.CompareScores = make([]float64, set.Len())
			for i := range c.SegmentOf {
				c.SegmentOf[i] = int32(i % 2)
				c.Times[i] = 1788220800 + int64(i)*20000 // from 2026-09-01 00:00 UTC, about 5.5 hours apart
				c.CompareScores[i] = set.Scores()[set.Len()-1-i]
			}
			c.CompareColumn = "other"
		})
	}
	sets := map[string]*scores.Set{
		"one-row":       build([]float64{0.5}, []bool{true}, nil, false),
		"no-true-case":  build([]float64{0.9, 0.5, 0.1}, []bool{false, false, false}, nil, false),
		"no-false-case": build([]float64{0.9, 0.5, 0.1}, []bool{true, true, true}, nil, false),
		"all-tied":      build([]float64{0.5, 0.5, 0.5, 0.5}, []bool{true, false, true, false}, nil, false),
		"lower-riskier": build([]float64{-3, -1, 0, 2, 5}, []bool{true, true, false, true, false}, nil, true),
		"zero-weights":  build([]float64{0.9, 0.7, 0.3}, []bool{true, false, true}, []float64{0, 2, 0}, false),
	}
	assume := func(set *scores.Set) (projection.Assumptions, error) {
		positives, negatives := set.Totals()
		base := 0.0
		if positives+negatives > 0 {
			base = positives / (positives + negatives)
		}
		return projection.Assumptions{BaseRate: base, Volume: 50, Capacity: 5, Confidence: 0.9,
			Costs: &projection.Costs{FalseAlert: 1, Miss: 10, Hit: -2}}, nil
	}
	script := []string{"s", "j", "o", "pgdown", "G", "esc", "e", "j", "esc", "m", "esc", "6", "v", "v", "v", "?", "?"}
	for name, set := range sets {
		t.Run(name, func(t *testing.T) {
			for _, size := range [][2]int{{80, 24}, {80, 22}, {130, 40}} {
				m := loadedWith(t, Config{Load: func(func(int)) (*scores.Set, error) { return set, nil }, Assume: assume,
					Analysis: analysis.Options{Shifts: threeShifts(t), Resampling: analysis.Resampling{Replicates: 20, Seed: 1}}}, size[0], size[1])
				m = resample(t, m)
				if m.s.stability == nil && !strings.HasPrefix(m.status, "resampling: ") {
					t.Errorf("no bootstrap and no reason: %q", m.status)
				}
				for _, k := range script {
					m = keys(m, k)
					checkSize(t, m.View(), size[0], size[1])
				}
				m = send(m, tea.WindowSizeMsg{Width: 40, Height: 10})
				checkSize(t, m.View(), 40, 10)
			}
		})
	}
}

// TestWriteQueue90: a candidate pinned on the queue90 starting point is
// written with its rule and read back.
func TestWriteQueue90(t *testing.T) {
	m := demoBeyond(t, 100, 30)
	m = keys(m, "6", "p", "w")
	if m.Written() == "" {
		t.Fatalf("not written: %s", m.status)
	}
	f, err := decision.ReadFile(m.Written())
	if err != nil {
		t.Fatal(err)
	}
	if len(f.Candidates) != 1 || f.Candidates[0].Rule != "queue90=90" || f.Chosen != "queue90=90" {
		t.Errorf("candidates %+v, chosen %q", f.Candidates, f.Chosen)
	}
}

// TestStripRedraws: after b each pin's column carries its hit share's
// and its wrong-alert share's ranges across the resampled sets exactly
// at its cut (BandAtCut, not the
// nearest band cut of the chart), as the figures pane shows it, in the row under the hit share; a pin
// made after the run gets one too; new assumptions forget it.
func TestStripRedraws(t *testing.T) {
	m := demoBeyond(t, 80, 24)
	m = keys(m, "1", "p", "2", "p")
	if rowCells(m.strip.table.Rows, compare.RedrawsLabel) != nil {
		t.Fatal("a redraws row before b")
	}
	m = resample(t, m)
	m = keys(m, "end", "p")
	rows := m.strip.table.Rows
	got := rowCells(rows, compare.RedrawsLabel)
	if len(got) != 3 {
		t.Fatalf("redraws after b: %q", got)
	}
	for i, p := range m.s.pins {
		band, ok := m.s.stability.BandAtCut(m.s.curve.At(p.cut).Score)
		if want := format.Interval(band.Recall); !ok || got[i] != want {
			t.Errorf("pin %q: redraws %q, want the band at its cut %q", p.name, got[i], want)
		}
	}
	// Two redraws rows: the hit share's, then the wrong-alert share's,
	// each under its figure and interval.
	var under []string
	for i, r := range rows {
		if strings.TrimSpace(r.Figure) == compare.RedrawsLabel {
			under = append(under, strings.TrimSpace(rows[i-2].Figure))
		}
	}
	if len(under) != 2 || !strings.HasPrefix(under[0], "hit share") || !strings.HasPrefix(under[1], "wrong-alert share") {
		t.Errorf("redraws rows under %q, want under the hit share and under the wrong-alert share, each after its interval", under)
	}
	wrong := rowCells(rows[slices.IndexFunc(rows, func(r compare.Row) bool { return strings.HasPrefix(strings.TrimSpace(r.Figure), "wrong-alert share") }):], compare.RedrawsLabel)
	for i, p := range m.s.pins {
		band, _ := m.s.stability.BandAtCut(m.s.curve.At(p.cut).Score)
		if want := format.Interval(band.FalseDiscoveryRate); i >= len(wrong) || wrong[i] != want {
			t.Errorf("pin %q: wrong-alert redraws %q, want the band at its cut %q", p.name, wrong, want)
		}
	}
	m = keys(m, "a", "tab", "ctrl+u")
	m = typeText(m, "3000")
	m = keys(m, "enter")
	if m.s.stability != nil || rowCells(m.strip.table.Rows, compare.RedrawsLabel) != nil {
		t.Error("redraws kept under new assumptions")
	}
}

// TestResampledStatusFits: the line that says the bootstrap has run fits
// one line of an 80-column screen with 200 resampled sets, so that it does
// not wrap into the footer.
func TestResampledStatusFits(t *testing.T) {
	m := resample(t, demoBeyond(t, 80, 24))
	if !strings.HasPrefix(m.status, "resampled ") || ansi.StringWidth(m.status) > 79 {
		t.Errorf("status after b %q (%d columns), want one that starts with 'resampled ' and fits 79", m.status, ansi.StringWidth(m.status))
	}
}
