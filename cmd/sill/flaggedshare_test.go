package main

import (
	"slices"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/floatcmp"
)

// TestReportFlaggedShareInterval runs report end to end on the twelve
// unweighted scans: top=3 flags 3 of 12 cases, a share of 25.0%. The
// share's Wilson interval is in JSON (flagged_share_ci) and on its own
// row under "cases flagged" in text and Markdown, at --confidence.
func TestReportFlaggedShareInterval(t *testing.T) {
	path := writeFile(t, t.TempDir(), "tollbrook.csv", []byte(tollbrookScans))
	for _, tc := range []struct {
		confidence string
		ci         [2]float64 // Wilson interval of 3 of 12, worked by hand
		row        string     // the words of the text row under cases flagged
	}{
		// Wilson (1927), z = 1.959964: centre (0.25 + z²/24) / (1 + z²/12)
		// = 0.310624, half-width z·sqrt(0.25·0.75/12 + z²/576) / (1 + z²/12)
		// = 0.221682.
		{"0.95", [2]float64{0.088942, 0.532306}, "95% interval of the share 8.9–53.2%"},
		// z = 1.644854: centre 0.295995, half-width 0.191343.
		{"0.9", [2]float64{0.104652, 0.487338}, "90% interval of the share 10.5–48.7%"},
	} {
		t.Run(tc.confidence, func(t *testing.T) {
			args := []string{path, "--cut", "top=3", "--confidence", tc.confidence}
			out := reportJSON(t, args...)
			c := out["cuts"].([]any)[0].(map[string]any)
			if c["flagged_share"] != 0.25 {
				t.Fatalf("flagged_share %v, want 0.25", c["flagged_share"])
			}
			got, _ := c["flagged_share_ci"].([]any)
			if len(got) != 2 {
				t.Fatalf("flagged_share_ci %v, want a pair", c["flagged_share_ci"])
			}
			for i := range 2 {
				// Six decimals worked by hand: within 2e-6.
				if v, _ := got[i].(float64); !floatcmp.Within(v, tc.ci[i], 2e-6) {
					t.Errorf("flagged_share_ci[%d] = %v, want %v", i, v, tc.ci[i])
				}
			}
			text := runSill(t, "", append([]string{"report"}, args...)...).stdout
			// Columns aligned to the widest cell: compare the words.
			lines := strings.Split(text, "\n")
			at := slices.IndexFunc(lines, func(l string) bool { return strings.HasPrefix(l, "cases flagged ") })
			if at < 0 || at+1 == len(lines) || strings.Join(strings.Fields(lines[at+1]), " ") != strings.Join(strings.Fields(tc.row), " ") {
				t.Errorf("text lacks the row %q under cases flagged:\n%s", tc.row, text)
			}
			md := runSill(t, "", append([]string{"report", "--format", "markdown"}, args...)...).stdout
			words := strings.Fields(tc.row)
			want := "| cases flagged | 3 (25.0%) |\n| ↳ " + strings.Join(words[:len(words)-1], " ") + " | " + words[len(words)-1] + " |\n"
			if !strings.Contains(md, want) {
				t.Errorf("Markdown lacks %q:\n%s", want, md)
			}
		})
	}
}
