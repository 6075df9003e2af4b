package drift

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

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
