package main

import (
	"encoding/json"
	"os"
	"strings"
	"testing"
)

// An invented set of parcel scans: six kept parcels of each kind, the
// cleared ones kept 1 in 10 (weight 10) and every held one kept (weight 1),
// the mark of a class downsampled; weights2 varies within the classes.
const tollbrookScans = "parcel,score,label,weight,weights2\n" +
	"TB-1,0.95,1,1,1\n" +
	"TB-2,0.90,1,1,2\n" +
	"TB-3,0.80,0,10,10\n" +
	"TB-4,0.75,1,1,1\n" +
	"TB-5,0.60,0,10,12\n" +
	"TB-6,0.55,1,1,1\n" +
	"TB-7,0.40,0,10,10\n" +
	"TB-8,0.30,1,1,3\n" +
	"TB-9,0.20,0,10,10\n" +
	"TB-10,0.15,0,10,8\n" +
	"TB-11,0.10,1,1,1\n" +
	"TB-12,0.05,0,10,10\n"

// TestReportNamesWeightKind runs report end to end and checks that the
// kind of weights is named in JSON (weight_kind, null without weights),
// in the text header and in the Markdown header, with the design the
// sampling weights were found to have.
func TestReportNamesWeightKind(t *testing.T) {
	path := writeFile(t, t.TempDir(), "tollbrook.csv", []byte(tollbrookScans))
	for _, tc := range []struct {
		name  string
		args  []string
		kind  any    // weight_kind in JSON
		words string // in the text and Markdown headers; "" for none
	}{
		{"no weights", nil, nil, ""},
		{"frequency", []string{"--weight", "weight", "--weight-kind", "frequency"}, "frequency", "frequency weights"},
		// 1 and 10 as the rows above give them.
		{"sampling, downsampled", []string{"--weight", "weight", "--weight-kind", "sampling"}, "sampling", "sampling weights, one class downsampled: every true case weighs 1, every false case 10"},
		{"sampling, varying", []string{"--weight", "weights2", "--weight-kind", "sampling"}, "sampling", "sampling weights"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out := reportJSON(t, append([]string{path}, tc.args...)...)
			if got, ok := out["weight_kind"]; !ok || got != tc.kind {
				t.Errorf("weight_kind %v (present %v), want %v", got, ok, tc.kind)
			}
			text := runSill(t, "", append([]string{"report", path}, tc.args...)...)
			md := runSill(t, "", append([]string{"report", "--format", "markdown", path}, tc.args...)...)
			if text.code != 0 || md.code != 0 {
				t.Fatalf("exit %d/%d: %s%s", text.code, md.code, text.stderr, md.stderr)
			}
			textHead := strings.SplitN(text.stdout, "\n", 4)[2]
			mdHead := strings.SplitN(md.stdout, "\n", 4)[2]
			if tc.words == "" {
				if strings.Contains(textHead, "weight") || strings.Contains(mdHead, "weight") {
					t.Errorf("headers name weights without any:\n%s\n%s", textHead, mdHead)
				}
				return
			}
			if !strings.HasSuffix(textHead, " · "+tc.words) {
				t.Errorf("text header %q, want it to end %q", textHead, tc.words)
			}
			if !strings.HasSuffix(mdHead, ", "+tc.words) {
				t.Errorf("Markdown header %q, want it to end %q", mdHead, tc.words)
			}
		})
	}
}

// TestCheckNamesWeightKind saves a decision on the downsampled scans with
// sampling weights and checks the same scans against it: check names the
// kinds in JSON (weight_kind for the new data, validation_weight_kind for
// the file's; null without weights) and in its text lines.
func TestCheckNamesWeightKind(t *testing.T) {
	dir := t.TempDir()
	path := writeFile(t, dir, "tollbrook.csv", []byte(tollbrookScans))
	cutPath := dir + "/cut.yaml"
	if r := runSill(t, "", "report", path, "--weight", "weight", "--weight-kind", "sampling", "--cut", "top=4", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d: %s", r.code, r.stderr)
	}
	if saved, err := os.ReadFile(cutPath); err != nil || !strings.Contains(string(saved), "\n  squared_weights:\n") {
		t.Errorf("the saved decision has no data.squared_weights under sampling weights (read error %v)", err)
	}
	for _, tc := range []struct {
		name          string
		args          []string
		kind          any    // weight_kind
		text          string // in the new-data line
		validation    any    // validation_weight_kind
		validationTxt string // in the expected line
	}{
		// The file's kind is the new data's unless --weight-kind says otherwise.
		{"as the file says", []string{"--weight", "weight"}, "sampling", "(sampling weights, one class downsampled: every true case weighs 1, every false case 10)", "sampling", "rows, sampling weights)"},
		{"declared frequency", []string{"--weight", "weight", "--weight-kind", "frequency"}, "frequency", "(frequency weights)", "sampling", "rows, sampling weights)"},
		{"unweighted new data", nil, nil, "flags 2 of them", "sampling", "rows, sampling weights)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			args := append([]string{"check", cutPath, path}, tc.args...)
			res := runSill(t, "", append(args, "--format", "json")...)
			if res.code == 2 {
				t.Fatalf("exit 2: %s", res.stderr)
			}
			var out map[string]any
			if err := json.Unmarshal([]byte(res.stdout), &out); err != nil {
				t.Fatal(err)
			}
			if got, ok := out["weight_kind"]; !ok || got != tc.kind {
				t.Errorf("weight_kind %v (present %v), want %v", got, ok, tc.kind)
			}
			if got, ok := out["validation_weight_kind"]; !ok || got != tc.validation {
				t.Errorf("validation_weight_kind %v (present %v), want %v", got, ok, tc.validation)
			}
			text := runSill(t, "", args...).stdout
			if !strings.Contains(text, tc.text) || !strings.Contains(text, tc.validationTxt) {
				t.Errorf("text lacks %q or %q:\n%s", tc.text, tc.validationTxt, text)
			}
		})
	}
}

// TestCheckWarnsWithoutSquaredWeights: a decision saved under sampling
// weights before data.squared_weights existed (the key taken out of a
// saved one) reads the validated classes' noise coarsely; check says so
// with the fix in text and as a JSON warning, and says nothing of it for
// the file as saved.
func TestCheckWarnsWithoutSquaredWeights(t *testing.T) {
	dir := t.TempDir()
	path := writeFile(t, dir, "tollbrook.csv", []byte(tollbrookScans))
	cutPath := dir + "/cut.yaml"
	if r := runSill(t, "", "report", path, "--weight", "weight", "--weight-kind", "sampling", "--cut", "top=4", "--save", cutPath); r.code != 0 {
		t.Fatalf("save: exit %d: %s", r.code, r.stderr)
	}
	saved, err := os.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	// The key's block: its line and the deeper-indented lines under it.
	var kept []string
	inside := false
	for _, line := range strings.Split(string(saved), "\n") {
		switch {
		case line == "  squared_weights:":
			inside = true
			continue
		case inside && strings.HasPrefix(line, "    "):
			continue
		}
		inside = false
		kept = append(kept, line)
	}
	older := writeFile(t, dir, "older.yaml", []byte(strings.Join(kept, "\n")))
	if strings.Contains(strings.Join(kept, "\n"), "squared_weights") || len(kept) == len(strings.Split(string(saved), "\n")) {
		t.Fatalf("the key was not taken out:\n%s", strings.Join(kept, "\n"))
	}
	const fix = "save the decision again with this version"
	for _, tc := range []struct {
		name string
		file string
		want bool
	}{{"as saved", cutPath, false}, {"saved before the key", older, true}} {
		t.Run(tc.name, func(t *testing.T) {
			text := runSill(t, "", "check", tc.file, path, "--weight", "weight")
			if text.code == 2 {
				t.Fatalf("exit 2: %s", text.stderr)
			}
			if got := strings.Contains(text.stdout, "\nwarning: the decision file was saved under sampling weights before the squared weights") && strings.Contains(text.stdout, fix); got != tc.want {
				t.Errorf("text warns of the missing key: %v, want %v\n%s", got, tc.want, text.stdout)
			}
			res := runSill(t, "", "check", tc.file, path, "--weight", "weight", "--format", "json")
			var out struct {
				Warnings []string `json:"warnings"`
			}
			if err := json.Unmarshal([]byte(res.stdout), &out); err != nil {
				t.Fatal(err)
			}
			if out.Warnings == nil {
				t.Errorf("json warnings is null, want a list")
			}
			if got := len(out.Warnings) == 1 && strings.Contains(out.Warnings[0], "data.squared_weights") && strings.Contains(out.Warnings[0], fix); got != tc.want {
				t.Errorf("json warnings %q, want the missing key's: %v", out.Warnings, tc.want)
			}
		})
	}
}
