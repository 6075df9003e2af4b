package tui

import (
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/scores"
)

// TestStatusNamesOutsideScore: a score of 1.7 among probabilities (line 4
// of the table, counted by hand) is named in the status line once the set
// is loaded, with the sections it leaves out.
func TestStatusNamesOutsideScore(t *testing.T) {
	var b strings.Builder
	b.WriteString("score,label\n")
	for i := range 40 {
		score := []string{"0.1", "0.4", "0.7", "0.9"}[i%4]
		if i == 2 {
			score = "1.7"
		}
		b.WriteString(score + "," + map[bool]string{true: "1", false: "0"}[i%4 >= 2] + "\n")
	}
	set, err := scores.Read(strings.NewReader(b.String()), "depot.csv", scores.Options{})
	if err != nil {
		t.Fatal(err)
	}
	m := loaded(t, set, demoAssumptions, "", 100, 30)
	want := "1 score lies outside [0, 1] (line 4), so the scores are not read as probabilities: the Brier score, log loss, calibration and net benefit are left out"
	if !strings.Contains(m.status, want) {
		t.Errorf("status %q, want it to hold %q", m.status, want)
	}
}
