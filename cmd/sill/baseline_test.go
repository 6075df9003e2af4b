package main

import (
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
)

// TestCheckBaseline: sill check --baseline judges batches in order against
// a first production batch: batches drawn like it pass (exit 0); batches
// whose scores moved signal (exit 1, the first signalling batch named);
// the stated false-signal chance and detection are in the output; broken
// inputs exit 2. A small validation set's note points to --baseline.
func TestCheckBaseline(t *testing.T) {
	dir := t.TempDir()
	validation := writeFile(t, dir, "validation.csv", bearingsCSV(1, 1000, 0.07, 0, true))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", validation, "--cut", "hit=0.8", "--volume", "1500", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	baseline := writeFile(t, dir, "week-00.csv", bearingsCSV(20, 5000, 0.07, 0, false))
	var same, moved []string
	for i, seed := range []uint64{21, 22, 23, 24} {
		same = append(same, writeFile(t, dir, "week-0"+string(rune('1'+i))+".csv", bearingsCSV(seed, 4000, 0.07, 0, false)))
		// From the third batch on the scores rise by 0.4 of a standard
		// deviation: about a third more cases are flagged.
		shift := 0.0
		if i >= 2 {
			shift = 0.4
		}
		moved = append(moved, writeFile(t, dir, "shifted-0"+string(rune('1'+i))+".csv", bearingsCSV(seed+10, 4000, 0.07, shift, false)))
	}
	r := runSill(t, "", append([]string{"check", cutPath, "--baseline", baseline}, same...)...)
	if r.code != 0 || !strings.Contains(r.stdout, "status: ok") || !strings.Contains(r.stdout, "a false signal within these 4 batches comes about once in 100 runs") ||
		!strings.Contains(r.stdout, "a rise of the alert rate by a fifth") {
		t.Errorf("same batches: exit %d\n%s%s", r.code, r.stdout, r.stderr)
	}
	r = runSill(t, "", append([]string{"check", cutPath, "--baseline", baseline, "--format", "json"}, moved...)...)
	var out struct {
		Status      string  `json:"status"`
		SignalBatch *string `json:"signal_batch"`
		Direction   *string `json:"direction"`
		Level       float64 `json:"false_signal_within_batches"`
		Batches     []struct {
			Name      string `json:"name"`
			Signalled bool   `json:"signalled"`
		} `json:"batches"`
	}
	if err := json.Unmarshal([]byte(r.stdout), &out); err != nil {
		t.Fatalf("exit %d, not JSON: %v\n%s", r.code, err, r.stdout)
	}
	if r.code != 1 || out.Status != "drift" || out.SignalBatch == nil || *out.Direction != "rise" || out.Level != 0.01 || len(out.Batches) != 4 ||
		!(strings.HasSuffix(*out.SignalBatch, "shifted-03.csv") || strings.HasSuffix(*out.SignalBatch, "shifted-04.csv")) {
		t.Errorf("moved batches: exit %d, %+v", r.code, out)
	}
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"check", cutPath, "--baseline", baseline}, "one or more batches"},
		{[]string{"check", cutPath, "--baseline", filepath.Join(dir, "none.csv"), same[0]}, "--baseline: "},
		{[]string{"check", cutPath, "--baseline", baseline, same[0], filepath.Join(dir, "none.csv")}, "none.csv"},
	} {
		if r := runSill(t, "", tc.args...); r.code != 2 || !strings.Contains(r.stderr, tc.want) {
			t.Errorf("%q: exit %d, %q, want %q", tc.args, r.code, r.stderr, tc.want)
		}
	}
	// The validation set (1000 rows) is smaller than a batch of 4000:
	// the single check says so and points to --baseline.
	if r := runSill(t, "", "check", cutPath, same[0]); !strings.Contains(r.stdout, "--baseline FIRST_BATCH") {
		t.Errorf("small validation set: no pointer to --baseline in\n%s", r.stdout)
	}
}

// TestCheckBaselineSamplingWeights: batches whose every row weighs 10.
// Read as frequency weights (--weight-kind frequency) each row is ten
// cases and the alert rate rests on them all; read as sampling weights
// each row is one case drawn, so the effective cases behind the alert
// rate are about the rows: Korn and Graubard's size of a share whose
// weights are all equal is the row count times (n-1)/n, the
// with-replacement factor of package design (by hand: 500 rows give
// 499), shown in the text's effective column and JSON effective_cases.
func TestCheckBaselineSamplingWeights(t *testing.T) {
	dir := t.TempDir()
	validation := writeFile(t, dir, "validation.csv", bearingsCSV(1, 1000, 0.07, 0, true))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", validation, "--cut", "hit=0.8", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d, %s", r.code, r.stderr)
	}
	weighted := func(name string, seed uint64) string {
		lines := strings.Split(strings.TrimSpace(string(bearingsCSV(seed, 500, 0.07, 0, false))), "\n")
		for i := range lines {
			if i == 0 {
				lines[i] += ",w"
			} else {
				lines[i] += ",10"
			}
		}
		return writeFile(t, dir, name, []byte(strings.Join(lines, "\n")+"\n"))
	}
	baseline, batch := weighted("week-00.csv", 30), weighted("week-01.csv", 31)
	for _, tc := range []struct {
		kind           string
		cases, trials  float64
		effectiveShown bool
	}{
		{"frequency", 5000, 5000, false},
		{"sampling", 5000, 499, true},
	} {
		r := runSill(t, "", "check", cutPath, "--weight", "w", "--weight-kind", tc.kind, "--baseline", baseline, batch, "--format", "json")
		var out struct {
			Baseline struct {
				Cases     float64 `json:"cases"`
				Effective float64 `json:"effective_cases"`
			} `json:"baseline"`
		}
		if err := json.Unmarshal([]byte(r.stdout), &out); err != nil {
			t.Fatalf("%s: exit %d, not JSON: %v\n%s%s", tc.kind, r.code, err, r.stdout, r.stderr)
		}
		if !floatcmp.Within(out.Baseline.Cases, tc.cases, 1e-9) || !floatcmp.Within(out.Baseline.Effective, tc.trials, 1e-9) {
			t.Errorf("%s: cases %v, effective %v; want %v, %v", tc.kind, out.Baseline.Cases, out.Baseline.Effective, tc.cases, tc.trials)
		}
		text := runSill(t, "", "check", cutPath, "--weight", "w", "--weight-kind", tc.kind, "--baseline", baseline, batch).stdout
		if strings.Contains(text, "effective") != tc.effectiveShown {
			t.Errorf("%s: effective column shown %v, want %v\n%s", tc.kind, !tc.effectiveShown, tc.effectiveShown, text)
		}
	}
}
