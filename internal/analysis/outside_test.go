package analysis_test

import (
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/scores"
)

// TestOutsideWarning: scores outside [0, 1] in a set that otherwise reads
// as probabilities are named by line, the first three and a count of the
// rest; a set on another scale, or lower-is-riskier, gets no such warning.
// Expected lines counted by hand from the tables (the header is line 1).
func TestOutsideWarning(t *testing.T) {
	table := func(outside map[int]string, rows int) string {
		var b strings.Builder
		b.WriteString("score,label\n")
		for i := range rows {
			score := "0.5"
			if s, ok := outside[i]; ok {
				score = s
			}
			b.WriteString(score + "," + []string{"0", "1"}[i%2] + "\n")
		}
		return b.String()
	}
	const tail = ", so the scores are not read as probabilities: the Brier score, log loss, calibration and net benefit are left out"
	cases := []struct {
		name  string
		in    string
		lower bool
		want  string
	}{
		{"one", table(map[int]string{2: "1.7"}, 40), false, "1 score lies outside [0, 1] (line 4)" + tail},
		{"five", table(map[int]string{0: "1.7", 5: "-0.1", 9: "2", 30: "1.01", 39: "7"}, 100), false, "5 scores lie outside [0, 1] (lines 2, 7, 11 and 2 more)" + tail},
		{"another scale", table(map[int]string{0: "1.7", 1: "3"}, 20), false, ""}, // 10% of the rows
		{"lower is riskier", table(map[int]string{2: "1.7"}, 40), true, ""},
		{"none", table(nil, 40), false, ""},
	}
	for _, c := range cases {
		for name, load := range map[string]func(string) (*scores.Set, error){
			"Read": func(in string) (*scores.Set, error) {
				return scores.Read(strings.NewReader(in), "t.csv", scores.Options{LowerIsRiskier: c.lower})
			},
			"Load": func(in string) (*scores.Set, error) {
				return scores.Load(strings.NewReader(in), "t.csv", scores.Options{LowerIsRiskier: c.lower})
			},
		} {
			set, err := load(c.in)
			if err != nil {
				t.Fatal(err)
			}
			if got := analysis.OutsideWarning(set); got != c.want {
				t.Errorf("%s, %s: %q\nwant %q", c.name, name, got, c.want)
			}
		}
	}
}
