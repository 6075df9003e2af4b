package compare

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// sixRows is the hand-worked set of these tests, riskiest first:
//
//	score 0.9 true · 0.8 false · 0.8 true (tied) · 0.7 false · 0.6 true · 0.5 false
//
// so 3 true and 3 false cases and a validation base rate of 0.5.
func sixRows(t *testing.T, weights []float64) *curve.Curve {
	t.Helper()
	set, err := scores.New(
		[]float64{0.9, 0.8, 0.8, 0.7, 0.6, 0.5},
		[]bool{true, false, true, false, true, false},
		weights, false)
	if err != nil {
		t.Fatal(err)
	}
	return curve.New(set)
}

var sixAssumptions = projection.Assumptions{
	BaseRate: 0.5, Volume: 100, Capacity: 40, Confidence: 0.95,
	Costs: &projection.Costs{FalseAlert: 10, Miss: 100},
}

func row(t *testing.T, table Table, figure string) Row {
	t.Helper()
	for _, r := range table.Rows {
		if strings.TrimSpace(r.Figure) == figure {
			return r
		}
	}
	t.Fatalf("no row %q in %v", figure, figures(table))
	return Row{}
}

func figures(table Table) []string {
	var out []string
	for _, r := range table.Rows {
		out = append(out, r.Figure)
	}
	return out
}

func TestNewHandWorked(t *testing.T) {
	c := sixRows(t, nil)
	a := sixAssumptions
	columns := []Column{
		{Name: "strict", Rule: "top=1", Cut: evidence.Of(c.At(0), a)},
		{Name: "pin 2", Cut: evidence.Of(c.At(1), a)},
	}
	table := New(columns, 0, Options{Assumptions: a})
	if got, want := strings.Join(table.Names, ","), "strict,pin 2"; got != want {
		t.Errorf("names %q, want %q", got, want)
	}
	if table.Rules[0] != "top=1" || table.Rules[1] != "" {
		t.Errorf("rules %q", table.Rules)
	}
	// Every value below is worked by hand from sixRows.
	// Cut 0 (score 0.9): TP 1, FP 0, FN 2, TN 3.
	// Cut 1 (score 0.8, the tie group of two): TP 2, FP 1, FN 1, TN 2.
	// Projection at p = 0.5, volume 100:
	//   cut 0: alert rate 1/3*0.5 + 0*0.5 = 1/6, queue 16.7, 40-16.67 = 23.3 under;
	//          cost per case 0.5*(2/3)*100 = 33.33, per shift 3333
	//   cut 1: alert rate 2/3*0.5 + 1/3*0.5 = 0.5, queue 50, 10 over;
	//          cost per case 0.5*(1/3)*10 + 0.5*(1/3)*100 = 18.33, per shift 1833
	cases := []struct {
		figure       string
		cells, diffs [2]string
		values       [2]float64
		delta        float64
	}{
		{"cut (flag score >=)", [2]string{"0.9", "0.8"}, [2]string{"", "-0.1"}, [2]float64{0.9, 0.8}, -0.1},
		{"cases flagged", [2]string{"1", "3"}, [2]string{"", "+2"}, [2]float64{1, 3}, 2},
		{"share of all cases", [2]string{"16.7%", "50.0%"}, [2]string{"", ""}, [2]float64{math.NaN(), math.NaN()}, math.NaN()},
		// The difference is that of the shares as shown: 66.7 - 33.3 = 33.4.
		{"hit share (recall)", [2]string{"33.3%", "66.7%"}, [2]string{"", "+33.4 pt"}, [2]float64{1.0 / 3, 2.0 / 3}, 0.334},
		{"true cases found", [2]string{"1 of 3", "2 of 3"}, [2]string{"", ""}, [2]float64{math.NaN(), math.NaN()}, math.NaN()},
		{"wrong-alert share (FDR)", [2]string{"0.0%", "33.3%"}, [2]string{"", "+33.3 pt"}, [2]float64{0, 1.0 / 3}, 0.333},
		{"false positive rate", [2]string{"0.0%", "33.3%"}, [2]string{"", "+33.3 pt"}, [2]float64{0, 1.0 / 3}, 0.333},
		{"alert rate", [2]string{"16.7%", "50.0%"}, [2]string{"", "+33.3 pt"}, [2]float64{1.0 / 6, 0.5}, 0.333},
		{"queue per shift", [2]string{"16.7", "50.0"}, [2]string{"", "+33.3"}, [2]float64{100.0 / 6, 50}, 33.3},
		{"against capacity 40", [2]string{"23.3 under", "10.0 over"}, [2]string{"", ""}, [2]float64{math.NaN(), math.NaN()}, math.NaN()},
		{"cost per shift", [2]string{"3333", "1833"}, [2]string{"", "-1500"}, [2]float64{10000.0 / 3, 5500.0 / 3}, -1500},
	}
	for _, tc := range cases {
		r := row(t, table, tc.figure)
		for i := range 2 {
			if r.Cells[i] != tc.cells[i] {
				t.Errorf("%s column %d: cell %q, want %q", tc.figure, i, r.Cells[i], tc.cells[i])
			}
			if r.Diffs[i] != tc.diffs[i] {
				t.Errorf("%s column %d: diff %q, want %q", tc.figure, i, r.Diffs[i], tc.diffs[i])
			}
			if !floatcmp.Equal(r.Values[i], tc.values[i]) {
				t.Errorf("%s column %d: value %v, want %v", tc.figure, i, r.Values[i], tc.values[i])
			}
		}
		if !floatcmp.Equal(r.Deltas[1], tc.delta) {
			t.Errorf("%s: delta %v, want %v", tc.figure, r.Deltas[1], tc.delta)
		}
		if !r.Detail && r.Deltas[0] != 0 {
			t.Errorf("%s: reference delta %v, want 0", tc.figure, r.Deltas[0])
		}
	}
	if r := row(t, table, "hit share (recall)"); r.Better != Higher {
		t.Errorf("hit share better %v, want Higher", r.Better)
	}
	if r := row(t, table, "cost per shift"); r.Better != Lower {
		t.Errorf("cost better %v, want Lower", r.Better)
	}
	for _, r := range table.Rows {
		if r.Figure == "wrong-alert share" {
			t.Errorf("projected wrong-alert share shown although the base rate is the validation one")
		}
	}
	// The heading rows name the kinds, and each projected figure is
	// followed by its interval, from evidence.Cut.ProjectedCI (package
	// projection tests the values).
	var figures []string
	for _, r := range table.Rows {
		figures = append(figures, strings.TrimSpace(r.Figure))
		if r.Heading && (!r.Detail || r.Cells[0] != "" || r.Diffs[1] != "") {
			t.Errorf("heading %q has cells %q or differences %q", r.Figure, r.Cells, r.Diffs)
		}
	}
	got := strings.Join(figures, "|")
	want := "cut (flag score >=)|" + format.MeasuredHeading + "|cases flagged|share of all cases|hit share (recall)|95% interval|true cases found|" +
		"wrong-alert share (FDR)|95% interval|false positive rate|" + format.ProjectedHeading + "|alert rate|95% interval|" +
		"queue per shift|95% interval|against capacity 40|cost per shift|95% interval"
	if got != want {
		t.Errorf("rows\n%s\nwant\n%s", got, want)
	}
	for i, r := range table.Rows {
		if r.Figure != "queue per shift" {
			continue
		}
		for c := range 2 {
			if cell, want := table.Rows[i+1].Cells[c], format.QueueInterval(columns[c].Cut.ProjectedCI.QueuePerShift); cell != want || cell == format.NA {
				t.Errorf("queue interval column %d %q, want %q", c, cell, want)
			}
		}
	}
}

// TestNewReferenceElsewhere takes the second column as reference: the
// differences turn round.
func TestNewReferenceElsewhere(t *testing.T) {
	c := sixRows(t, nil)
	a := sixAssumptions
	table := New([]Column{{Name: "a", Cut: evidence.Of(c.At(0), a)}, {Name: "b", Cut: evidence.Of(c.At(1), a)}}, 1, Options{Assumptions: a})
	r := row(t, table, "hit share (recall)")
	if r.Diffs[0] != "-33.4 pt" || r.Diffs[1] != "" {
		t.Errorf("diffs %q, want [-33.4 pt, \"\"] (33.3%% - 66.7%% as shown, by hand)", r.Diffs)
	}
}

// TestNewWeighted doubles the weight of the top row: it then counts as two
// true cases out of four (hand-worked).
func TestNewWeighted(t *testing.T) {
	c := sixRows(t, []float64{2, 1, 1, 1, 1, 1})
	a := projection.Assumptions{BaseRate: 4.0 / 7, Confidence: 0.95}
	table := New([]Column{{Name: "top", Cut: evidence.Of(c.At(0), a)}}, 0, Options{Assumptions: a})
	if got := row(t, table, "true cases found").Cells[0]; got != "2 of 4" {
		t.Errorf("true cases found %q, want \"2 of 4\"", got)
	}
	if got := row(t, table, "hit share (recall)").Cells[0]; got != "50.0%" {
		t.Errorf("hit share %q, want 50.0%% (2 of 4)", got)
	}
	for _, r := range table.Rows {
		if strings.HasPrefix(r.Figure, "queue") || strings.HasPrefix(r.Figure, "cost") {
			t.Errorf("row %q shown without a volume", r.Figure)
		}
	}
}

// TestNewOneClass has no true case: hit share and its difference are
// undefined, and say so.
func TestNewOneClass(t *testing.T) {
	set, err := scores.New([]float64{0.9, 0.5}, []bool{false, false}, nil, false)
	if err != nil {
		t.Fatal(err)
	}
	c := curve.New(set)
	a := projection.Assumptions{BaseRate: 0, Confidence: 0.95}
	table := New([]Column{{Name: "a", Cut: evidence.Of(c.At(0), a)}, {Name: "b", Cut: evidence.Of(c.At(1), a)}}, 0, Options{Assumptions: a})
	r := row(t, table, "hit share (recall)")
	if r.Cells[0] != "n/a" || r.Diffs[1] != "n/a" || !math.IsNaN(r.Deltas[1]) {
		t.Errorf("one class: cells %q diffs %q deltas %v, want n/a and NaN", r.Cells, r.Diffs, r.Deltas)
	}
	// Every alert is wrong: FDR 1 at both cuts, so the difference is "same".
	if r := row(t, table, "wrong-alert share (FDR)"); r.Cells[1] != "100.0%" || r.Diffs[1] != "same" {
		t.Errorf("FDR cells %q diffs %q, want 100.0%% and same", r.Cells, r.Diffs)
	}
}

func TestNewEmptyAndBaseRate(t *testing.T) {
	if table := New(nil, 3, Options{}); len(table.Rows) != 0 || len(table.Names) != 0 {
		t.Errorf("no columns: %+v, want an empty table", table)
	}
	c := sixRows(t, nil)
	a := projection.Assumptions{BaseRate: 0.1, Confidence: 0.9}
	table := New([]Column{{Name: "a", Cut: evidence.Of(c.At(1), a)}}, 0, Options{Assumptions: a, BaseRateChanged: true, LowerIsRiskier: true})
	// At p = 0.1: alert rate 2/3*0.1 + 1/3*0.9 = 0.3667, precision
	// 0.0667/0.3667 = 0.1818, wrong-alert share 81.8% (by hand).
	if got := row(t, table, "wrong-alert share").Cells[0]; got != "81.8%" {
		t.Errorf("projected wrong-alert share %q, want 81.8%%", got)
	}
	row(t, table, "cut (flag score <=)")
	row(t, table, "90% interval")
}

func TestNewPanicsOnBadReference(t *testing.T) {
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(fmt.Sprint(r), "compare:") {
			t.Errorf("recover %v, want a panic starting with compare:", r)
		}
	}()
	New([]Column{{Name: "a"}}, 1, Options{})
}

func ExampleNew() {
	set, _ := scores.New([]float64{0.9, 0.8, 0.8, 0.7}, []bool{true, true, false, false}, nil, false)
	c := curve.New(set)
	a := projection.Assumptions{BaseRate: 0.5, Confidence: 0.95}
	table := New([]Column{
		{Name: "strict", Cut: evidence.Of(c.At(0), a)},
		{Name: "loose", Cut: evidence.Of(c.At(1), a)},
	}, 0, Options{Assumptions: a})
	r := table.Rows[4] // hit share, after the cut, the heading and cases flagged with its share
	fmt.Println(r.Figure, r.Cells, r.Diffs[1])
	// Output: hit share (recall) [50.0% 100.0%] +50.0 pt
}

// TestNewOwnCapacity: with OwnCapacity each column's queue stands against
// its own capacity. On sixRows at volume 100 and the validation base rate,
// the cut at 0.9 flags 1 case in 6 (queue 16.7) and the cut at 0.8 flags 3
// (queue 50.0), by hand.
func TestNewOwnCapacity(t *testing.T) {
	c := sixRows(t, nil)
	a := sixAssumptions
	tests := []struct {
		name       string
		capacities [2]float64
		figure     string    // the row's label, trimmed
		cells      [2]string // hand-worked: queue minus capacity
	}{
		{"different", [2]float64{40, 60}, "against its own capacity", [2]string{"23.3 under 40", "10.0 under 60"}},
		{"the same", [2]float64{40, 40}, "against capacity 40", [2]string{"23.3 under", "10.0 over"}},
		{"one not given", [2]float64{0, 45}, "against its own capacity", [2]string{"no capacity given", "5.0 over 45"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			columns := []Column{
				{Name: "old", Cut: evidence.Of(c.At(0), a), Capacity: tt.capacities[0]},
				{Name: "new", Cut: evidence.Of(c.At(1), a), Capacity: tt.capacities[1]},
			}
			table := New(columns, 0, Options{Assumptions: a, OwnCapacity: true})
			r := row(t, table, tt.figure)
			if !r.Detail || r.Cells[0] != tt.cells[0] || r.Cells[1] != tt.cells[1] {
				t.Errorf("row %q: %q, want %q (detail)", r.Figure, r.Cells, tt.cells)
			}
		})
	}
	// Neither column has a capacity: no row, whatever the assumptions say.
	columns := []Column{{Name: "old", Cut: evidence.Of(c.At(0), a)}, {Name: "new", Cut: evidence.Of(c.At(1), a)}}
	for _, r := range New(columns, 0, Options{Assumptions: a, OwnCapacity: true}).Rows {
		if strings.Contains(r.Figure, "capacity") {
			t.Errorf("row %q without any capacity", r.Figure)
		}
	}
}

// TestNewRuleNow: a candidate whose rule no longer picks its cut is marked
// as pinned under earlier assumptions, and a detail row under the cut
// says what each rule picks now; with every rule holding there is no row.
func TestNewRuleNow(t *testing.T) {
	c := sixRows(t, nil)
	a := sixAssumptions
	columns := []Column{
		{Name: "base", Rule: "base", Cut: evidence.Of(c.At(1), a), RuleNow: &RuleNow{Holds: false, Picks: 0.9}},
		{Name: "hit", Rule: "hit=0.6", Cut: evidence.Of(c.At(1), a), RuleNow: &RuleNow{Holds: true, Picks: 0.8}},
		{Name: "queue", Rule: "queue=10", Cut: evidence.Of(c.At(0), a), RuleNow: &RuleNow{Holds: false, Picks: math.NaN()}},
		{Name: "mine", Cut: evidence.Of(c.At(2), a)},
	}
	table := New(columns, 1, Options{Assumptions: a})
	if want := []string{"base (earlier)", "hit=0.6", "queue=10 (earlier)", ""}; fmt.Sprint(table.Rules) != fmt.Sprint(want) {
		t.Errorf("rules %q, want %q", table.Rules, want)
	}
	r := row(t, table, "its rule now")
	if want := []string{"picks 0.9", "holds", "meets no cut", ""}; !r.Detail || fmt.Sprint(r.Cells) != fmt.Sprint(want) {
		t.Errorf("row %q, want %q", r.Cells, want)
	}
	if table.Rows[1].Figure != RuleNowRow {
		t.Errorf("row under the cut is %q, want the rule row", table.Rows[1].Figure)
	}
	columns[0].RuleNow, columns[2].RuleNow = &RuleNow{Holds: true, Picks: 0.8}, nil
	for _, r := range New(columns, 1, Options{Assumptions: a}).Rows {
		if r.Figure == RuleNowRow {
			t.Error("a rule row while every checked rule holds")
		}
	}
}

// TestNewRedraws: a column's resampled range of the hit share sits under
// the hit share's interval, "n/a" for a column not resampled; no row when
// none was.
func TestNewRedraws(t *testing.T) {
	c := sixRows(t, nil)
	a := sixAssumptions
	redraws := [2]float64{0.25, 0.5}
	columns := []Column{
		{Name: "resampled", Cut: evidence.Of(c.At(0), a), RecallRedraws: &redraws},
		{Name: "not", Cut: evidence.Of(c.At(1), a)},
	}
	table := New(columns, 0, Options{Assumptions: a})
	for i, r := range table.Rows {
		if r.Figure != "  "+RedrawsLabel {
			continue
		}
		if prev := strings.TrimSpace(table.Rows[i-1].Figure); prev != "95% interval" || strings.TrimSpace(table.Rows[i-2].Figure) != "hit share (recall)" {
			t.Errorf("redraws after %q, want after the hit share's interval", prev)
		}
		if r.Cells[0] != "25.0–50.0%" || r.Cells[1] != format.NA || !r.Detail {
			t.Errorf("redraws cells %q detail %v", r.Cells, r.Detail)
		}
		columns[0].RecallRedraws = nil
		for _, r := range New(columns, 0, Options{Assumptions: a}).Rows {
			if r.Figure == "  "+RedrawsLabel {
				t.Error("a redraws row with no column resampled")
			}
		}
		return
	}
	t.Error("no redraws row")
}

// TestNewCorrectedCost: the least-cost column's cost per shift corrected
// for its optimism sits under the cost's interval, with how much more it
// is; other columns are blank, and no column with one gives no row.
func TestNewCorrectedCost(t *testing.T) {
	c := sixRows(t, nil)
	a := sixAssumptions
	columns := []Column{{Name: "plain", Cut: evidence.Of(c.At(0), a)}, {Name: "least cost", Cut: evidence.Of(c.At(1), a)}}
	// Cost per shift of the second column plus 2600, written by
	// format.Money and format.MoneyDiff as the cost row writes them.
	cost := columns[1].Cut.Projected.CostPerShift
	corrected := cost + 2600
	columns[1].CorrectedCostPerShift = &corrected
	table := New(columns, 0, Options{Assumptions: a})
	for i, r := range table.Rows {
		if r.Figure != CorrectedRow {
			continue
		}
		if strings.TrimSpace(table.Rows[i-2].Figure) != "cost per shift" {
			t.Errorf("corrected row after %q, want after the cost per shift's interval", table.Rows[i-2].Figure)
		}
		if want := format.Money(corrected) + " (+2600)"; r.Cells[1] != want || r.Cells[0] != "" || !r.Detail {
			t.Errorf("cells %q detail %v, want \"\" and %q", r.Cells, r.Detail, want)
		}
		columns[1].CorrectedCostPerShift = nil
		for _, r := range New(columns, 0, Options{Assumptions: a}).Rows {
			if r.Figure == CorrectedRow {
				t.Error("a corrected row with no column corrected")
			}
		}
		return
	}
	t.Errorf("no corrected row in %q", figures(table))
}
