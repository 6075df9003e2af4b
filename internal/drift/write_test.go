package drift

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/format"
)

// TestWriteTextAgreesWithShown checks the check's text against the house
// forms of package format: the difference is that of the shares as shown
// beside it, so an observed 49.996% against an expected 50.004% (both
// "50.0%") differs by "0.0 pt", never "-0.0 pt"; counts read in plain
// digits and intervals as "a–b%" (worked by hand).
func TestWriteTextAgreesWithShown(t *testing.T) {
	nan := math.NaN()
	r := &Result{
		Chosen: "hit=0.8", Cut: 0.156, Rows: 6000, Weight: 6000, Flagged: 3000, Labelled: false, Confidence: 0.95,
		BaseRate: 0.071, BaseRateValidation: true, ValidationRows: 12000, ValidationPath: "validation.csv",
		AlertRate: Test{Defined: true, Observed: 0.49996, ObservedCI: [2]float64{0.49, 0.583}, Expected: 0.50004, Difference: -0.00008, PValue: 1},
		Recall:    Test{Observed: nan, Expected: 0.8},
		Precision: Test{Observed: nan, Expected: 0.34},
		PSI:       nan,
	}
	r.findings()
	var b strings.Builder
	if err := WriteText(&b, r, "cut.yaml", "new.csv"); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{"(12000 rows)", "new data     6000 rows", "49.0–58.3%", "50.0%", "0.0 pt", "flag when score >= 0.156"} {
		if !strings.Contains(out, want) {
			t.Errorf("text lacks %q:\n%s", want, out)
		}
	}
	for _, bad := range []string{"-0.0", "6,000", " to 58.3%"} {
		if strings.Contains(out, bad) {
			t.Errorf("text holds %q:\n%s", bad, out)
		}
	}
}

// TestWritersShowUntrustedTextSafely puts terminal controls into the
// chosen candidate's name and the file names: the text writes them out
// visibly and the JSON escapes them, keeping its values.
func TestWritersShowUntrustedTextSafely(t *testing.T) {
	nan := math.NaN()
	h := format.Hostile
	r := &Result{
		Chosen: "pick" + h, Cut: 0.5, Rows: 10, Weight: 10, Flagged: 5, Confidence: 0.95, ValidationPath: "v" + h + ".csv",
		AlertRate: Test{Defined: true, Observed: 0.5, ObservedCI: [2]float64{0.2, 0.8}, Expected: 0.5, PValue: 1},
		Recall:    Test{Observed: nan, Expected: 0.8}, Precision: Test{Observed: nan, Expected: 0.3}, PSI: nan,
	}
	r.findings()
	var text, encoded strings.Builder
	if err := WriteText(&text, r, "cut"+h+".yaml", "new"+h+".csv"); err != nil {
		t.Fatal(err)
	}
	if c, bad := format.Unsafe(text.String()); bad || !strings.Contains(text.String(), `pick\x1b]0;title\a`) {
		t.Errorf("text: %q raw, or the name not shown escaped:\n%s", c, text.String())
	}
	if err := WriteJSON(&encoded, r, "cut"+h+".yaml", "new"+h+".csv"); err != nil {
		t.Fatal(err)
	}
	if c, bad := format.Unsafe(encoded.String()); bad {
		t.Errorf("json: %q raw:\n%s", c, encoded.String())
	}
	var back map[string]any
	if err := json.Unmarshal([]byte(encoded.String()), &back); err != nil {
		t.Fatal(err)
	}
	if want := strings.ToValidUTF8("pick"+h, "\ufffd"); back["chosen"] != want {
		t.Errorf("json chosen %q, want %q", back["chosen"], want)
	}
}

// TestWriteTextWords: check's text uses the house's one term per idea, the
// hit share (recall) and the wrong-alert share (FDR), naming recall and
// FDR beside them once and precision nowhere; the precision test is shown
// as the wrong-alert share, 1 - precision. Worked by hand: precision 75.0%
// (interval 60.0–85.0%) against 80.0% projected is a wrong-alert share of
// 25.0% (15.0–40.0%) against 20.0%, 5.0 points higher.
func TestWriteTextWords(t *testing.T) {
	r := &Result{
		Chosen: "hit=0.8", Cut: 0.3, Rows: 400, Weight: 400, Flagged: 100, Labelled: true, Confidence: 0.95,
		BaseRate: 0.1, BaseRateObserved: 0.1, BaseRateCI: [2]float64{0.07, 0.13}, ValidationRows: 1000, ValidationPath: "validation.csv",
		AlertRate:         Test{Defined: true, Observed: 0.25, ObservedCI: [2]float64{0.2, 0.3}, Expected: 0.24, Difference: 0.01, PValue: 0.6},
		Recall:            Test{Defined: true, Observed: 0.78, ObservedCI: [2]float64{0.6, 0.9}, Expected: 0.8, Difference: -0.02, PValue: 0.7},
		FalsePositiveRate: Test{Defined: true, Observed: 0.2, ObservedCI: [2]float64{0.15, 0.25}, Expected: 0.19, Difference: 0.01, PValue: 0.8},
		Precision:         Test{Defined: true, Successes: 75, Trials: 100, Observed: 0.75, ObservedCI: [2]float64{0.6, 0.85}, Expected: 0.8, Difference: -0.05, PValue: 0.5},
		PSI:               0.01,
	}
	r.findings()
	var b strings.Builder
	if err := WriteText(&b, r, "cut.yaml", "new.csv"); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	row := ""
	for _, line := range strings.Split(out, "\n") {
		if strings.HasPrefix(line, "wrong-alert share (FDR)") {
			row = strings.Join(strings.Fields(line), " ")
		}
	}
	if want := "wrong-alert share (FDR) 25.0% 15.0–40.0% 20.0% projected +5.0 pt 0.5000 shown"; row != want {
		t.Errorf("wrong-alert share row %q, want %q\n%s", row, want, out)
	}
	if strings.Contains(out, "precision") {
		t.Errorf("text says precision:\n%s", out)
	}
	if n := strings.Count(out, "recall"); n != 1 || !strings.Contains(out, "hit share (recall)") {
		t.Errorf("text names recall %d times, want once, as hit share (recall):\n%s", n, out)
	}
	if !strings.Contains(out, "wrong-alert share in the new data 25.0% against 20.0% projected: more of the alerts are wrong") {
		t.Errorf("no finding on the wrong-alert share:\n%s", out)
	}
}

// TestComplement turns a share test round by hand: 30 of 40 observed
// (75%, interval 0.6–0.86) against 0.8 expected becomes 10 of 40 (25%,
// interval 0.14–0.4) against 0.2, the difference negated, the p-value kept.
func TestComplement(t *testing.T) {
	got := Test{Defined: true, Successes: 30, Trials: 40, Observed: 0.75, ObservedCI: [2]float64{0.6, 0.86}, Expected: 0.8, Difference: -0.05, PValue: 0.4, Z: 0.8}.Complement()
	want := Test{Defined: true, Successes: 10, Trials: 40, Observed: 0.25, ObservedCI: [2]float64{0.14, 0.4}, Expected: 0.2, Difference: 0.05, PValue: 0.4, Z: 0.8}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"successes", got.Successes, want.Successes}, {"trials", got.Trials, want.Trials},
		{"observed", got.Observed, want.Observed}, {"low", got.ObservedCI[0], want.ObservedCI[0]}, {"high", got.ObservedCI[1], want.ObservedCI[1]},
		{"expected", got.Expected, want.Expected}, {"difference", got.Difference, want.Difference}, {"p", got.PValue, want.PValue}, {"z", got.Z, want.Z},
	} {
		if !floatcmp.Equal(c.got, c.want) {
			t.Errorf("%s %v, want %v", c.name, c.got, c.want)
		}
	}
	if !got.Defined {
		t.Error("complement undefined")
	}
}
