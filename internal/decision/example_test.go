package decision_test

import (
	"fmt"
	"strings"

	"github.com/sill-tool/sill/internal/decision"
)

// A decision file with one candidate, written by hand with only the
// required keys; deployment reads the chosen candidate's score.
const handWritten = `format: sill-cut/1
created: "2026-09-29T14:05:00Z"
tool_version: "1.0.0"
data:
  path: "bearings.csv"
  sha256: "051e0bf4de21daf7c1dd91df6c89ba836fcdff2880fda4b12884f49a565d6417"
  rows: 6000
  positives: 434
  score_column: "score"
  label_column: "label"
  lower_is_riskier: false
  score_histogram: {edges: [0, 0.36, 0.943], counts: [5641, 359]}
assumptions: {base_rate: 0.0723, volume_per_shift: 1500, cost_false_alert: null, cost_miss: null, cost_hit: null, capacity: 90, confidence: 0.95}
chosen: "queue=90"
candidates:
  - name: "queue=90"
    rule: "queue=90"
    score: 0.36
    validation: {flagged: 359, tp: 206, fp: 153, fn: 228, tn: 5413, recall: 0.4747, recall_ci: [0.428, 0.522],
                 precision: 0.5738, precision_ci: [0.522, 0.624], false_positive_rate: 0.0275}
    projected: {alert_rate: 0.0598, precision: 0.5738, queue_per_shift: 89.8, cost_per_shift: null}
caution: "a cut supports a decision; validate it prospectively"
`

func ExampleRead() {
	f, err := decision.Read(strings.NewReader(handWritten), "cut.yaml")
	if err != nil {
		fmt.Println(err)
		return
	}
	c, _ := f.ChosenCandidate()
	fmt.Printf("flag when score >= %v (%s, recall %.1f%%)\n", c.Cut.Score, c.Name, 100*c.Cut.Recall)

	_, err = decision.Read(strings.NewReader(strings.Replace(handWritten, "score: 0.36", "score: .inf", 1)), "cut.yaml")
	fmt.Println(err)
	// Output:
	// flag when score >= 0.36 (queue=90, recall 47.5%)
	// cut.yaml:18: candidates[0].score: expected a finite number, found .inf
}
