package page_test

import (
	"flag"
	"html"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/interval"
)

// The -update flag that golden.Check reads.
var _ = flag.Bool("update", false, "rewrite the golden files under testdata")

// decisionYAML is a decision file of an invented desk that reviews
// parcel scans: three candidates, a capacity and costs, a note with markup
// and a candidate name with an ampersand, which the page must show as
// text. The figures were worked out by hand from the counts: 1000 cases,
// 100 true; cut 0.8 flags 60 (45 true), 0.5 flags 150 (80 true), 0.3
// flags 300 (90 true). Projections at 2000 cases per shift and the
// validation base rate: queue = 2000 × flagged/1000.
const decisionYAML = `format: sill-cut/1
created: "2026-10-01T08:30:00Z"
tool_version: "sill 1.2.0"
data:
  path: "parcels.csv"
  sha256: "3f0a9c2e55d1b7a4c6e8f0123456789abcdef0123456789abcdef0123456789a"
  rows: 1000
  positives: 100
  negatives: 900
  score_column: "score"
  label_column: "label"
  weight_column: null
  lower_is_riskier: false
  score_histogram: {edges: [0, 0.5, 1], counts: [850, 150]}
assumptions: {base_rate: 0.1, volume_per_shift: 2000, cost_false_alert: 5, cost_miss: 80, cost_hit: 0, capacity: 250, confidence: 0.95}
chosen: "hit=0.8"
candidates:
  - name: "top=6%"
    rule: "top=6%"
    score: 0.8
    validation: {flagged: 60, tp: 45, fp: 15, fn: 55, tn: 885, recall: 0.45, recall_ci: [0.356, 0.548],
                 precision: 0.75, precision_ci: [0.627, 0.842], false_positive_rate: 0.016667}
    projected: {alert_rate: 0.06, precision: 0.75, queue_per_shift: 120, cost_per_shift: 9400}
  - name: "hit=0.8"
    rule: "hit=0.8"
    score: 0.5
    validation: {flagged: 150, tp: 80, fp: 70, fn: 20, tn: 830, recall: 0.8, recall_ci: [0.711, 0.866],
                 precision: 0.5333, precision_ci: [0.454, 0.611], false_positive_rate: 0.077778}
    projected: {alert_rate: 0.15, precision: 0.5333, queue_per_shift: 300, cost_per_shift: 3900}
    note: "the desk's own target"
  - name: "A&B <late>"
    rule: null
    score: 0.3
    validation: {flagged: 300, tp: 90, fp: 210, fn: 10, tn: 690, recall: 0.9, recall_ci: [0.826, 0.945],
                 precision: 0.3, precision_ci: [0.251, 0.354], false_positive_rate: 0.233333}
    projected: {alert_rate: 0.3, precision: 0.3, queue_per_shift: 600, cost_per_shift: 3700}
note: "<script>alert(1)</script> approved by the desk lead"
caution: "hand-edited caution that the page must not show"
`

// fixture returns the decision of decisionYAML (a sill-cut/1 file) with
// what sill-cut/2 adds set by hand: the model, who chose, the ranking with
// its intervals, the curve (the
// three candidates' cuts between both ends), the chosen candidate's
// stability, segments and real shifts, the shift schedule, calibration
// and two sign-offs, one given for an earlier choice.
func fixture(t *testing.T) *decision.File {
	t.Helper()
	f, err := decision.Read(strings.NewReader(decisionYAML), "parcels-cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	f.Created = time.Date(2026, 10, 1, 8, 30, 0, 0, time.UTC)
	f.Model = decision.Model{Name: "parcel-risk", Version: "v7"}
	f.ChosenBy = "Ines Marlow"
	f.Data.Ranking = &decision.Ranking{ROCAUC: 0.874, ROCAUCCI: [2]float64{0.8412, 0.9068}, AveragePrecision: 0.58, AveragePrecisionCI: [2]float64{0.4821, 0.6722}}
	f.Curve = []decision.CurvePoint{{Score: 0.95, TP: 10, FP: 1}, {Score: 0.8, TP: 45, FP: 15}, {Score: 0.5, TP: 80, FP: 70}, {Score: 0.3, TP: 90, FP: 210}, {Score: 0, TP: 100, FP: 900}}
	f.ShiftSchedule = &decision.ShiftSchedule{Starts: []string{"06:00", "18:00"}, Zone: "UTC", TimeColumn: "scanned_at"}
	f.Calibration = &decision.Calibration{Binning: "width", ECE: 0.031, ECENoise: 0.012, Bins: []decision.CalibrationBin{
		{Lower: 0, Upper: 0.5, MeanScore: 0.12, ObservedRate: 0.03, Rows: 850, Weight: 850},
		{Lower: 0.5, Upper: 1, MeanScore: 0.66, ObservedRate: 0.53, Rows: 150, Weight: 150},
	}, CostThreshold: &decision.CostThreshold{Probability: 5.0 / 85, Score: 5.0 / 85}}
	for i := range f.Candidates {
		c := &f.Candidates[i]
		if c.Name == "A&B <late>" {
			// The least cost of the three (3700 a shift) as the cost rule
			// picks it, with an optimism of 0.2 a case: 400 a shift at
			// 2000 cases, 4100 corrected (1.85 + 0.2 = 2.05 a case).
			c.Rule, c.Optimism = "cost", &decision.CostOptimism{PerCase: 0.2, PerShift: 400, CorrectedPerCase: 2.05, CorrectedPerShift: 4100,
				Folds: 10, Seed: 16, Method: "the cut chosen on all but one of 10 folds, its cost on the fold left out less its cost where chosen"}
		}
		if c.Name != "hit=0.8" {
			continue
		}
		c.Stability = &decision.Stability{Replicates: 200, Seed: 7, Met: 200, Score: [2]float64{0.46, 0.55}, FlaggedShare: [2]float64{0.13, 0.17}, Recall: [2]float64{0.8, 0.81},
			RecallAtCut: [2]float64{0.74, 0.86}, FalseDiscoveryRateAtCut: [2]float64{0.62, 0.7}}
		c.Segments = &decision.Segments{Column: "depot", Groups: []decision.SegmentGroup{
			{Name: "east <dock>", Rows: 400, Positives: 50, Negatives: 350, TP: 30, FP: 40, Recall: 0.6, RecallCI: [2]float64{0.46, 0.72}, Precision: 3.0 / 7, PrecisionCI: [2]float64{0.32, 0.55}, Outlier: true},
			{Name: "west", Rows: 600, Positives: 50, Negatives: 550, TP: 50, FP: 30, Recall: 1, RecallCI: [2]float64{0.93, 1}, Precision: 0.625, PrecisionCI: [2]float64{0.52, 0.72}},
		}, Tests: 4}
		// Each group against the other (the rest of the set): recall 30/50
		// against 50/50, wrong alerts 40/70 against 30/80; Holm over the
		// four tests, the two of each figure sharing one p.
		east, west := &c.Segments.Groups[0], &c.Segments.Groups[1]
		recallP, wrongP := interval.DifferenceP(30, 50, 50, 50), interval.DifferenceP(40, 70, 30, 80)
		east.RecallGap, west.RecallGap = -0.4, 0.4
		east.RecallGapCI[0], east.RecallGapCI[1] = interval.Difference(30, 50, 50, 50, 0.95)
		west.RecallGapCI[0], west.RecallGapCI[1] = interval.Difference(50, 50, 30, 50, 0.95)
		east.FalseDiscoveryGap, west.FalseDiscoveryGap = 40.0/70-30.0/80, 30.0/80-40.0/70
		east.FalseDiscoveryGapCI[0], east.FalseDiscoveryGapCI[1] = interval.Difference(40, 70, 30, 80, 0.95)
		west.FalseDiscoveryGapCI[0], west.FalseDiscoveryGapCI[1] = interval.Difference(30, 80, 40, 70, 0.95)
		east.RecallAdjustedP, west.RecallAdjustedP = min(1, 4*recallP), min(1, 4*recallP)
		east.FalseDiscoveryAdjustedP, west.FalseDiscoveryAdjustedP = min(1, max(4*recallP, 2*wrongP)), min(1, max(4*recallP, 2*wrongP))
		c.Shifts = &decision.Shifts{Count: 60, Mean: 300, P90: 380, Max: 455, Busiest: time.Date(2026, 9, 14, 18, 0, 0, 0, time.UTC), OverCapacity: 0.7, SampleP90: 410, Spread: 0.2,
			Basis: "the p90 is production's own counting noise at 1500 cases a shift plus real differences between shifts of about 20.0% of the expected queue (one standard deviation, from the cases per shift), beyond what the set's own sampling noise makes"}
	}
	f.SignOffs = []decision.SignOff{
		{Name: "Osric Vale", Role: "operations lead", Verdict: decision.Revise, Note: "try the stricter cut", At: time.Date(2026, 10, 1, 9, 0, 0, 0, time.UTC), Chosen: "top=6%", ChosenScore: 0.8},
		{Name: "Osric Vale", Role: "operations lead", Verdict: decision.Approve, At: time.Date(2026, 10, 2, 10, 15, 0, 0, time.UTC), Chosen: "hit=0.8", ChosenScore: 0.5},
	}
	return f
}

var (
	styleSheet = regexp.MustCompile(`(?s)<style\b.*?</style>`)
	charts     = regexp.MustCompile(`(?s)<svg\b.*?</svg>`)
	tags       = regexp.MustCompile(`(?s)<[^>]*>`)
	blockEnds  = regexp.MustCompile(`(?i)</?(p|h1|h2|h3|li|tr|dt|dd|div|figcaption|section|header|footer|table|thead|tbody|ul|dl|figure|title|strong)\b[^>]*>`)
	cellEnds   = regexp.MustCompile(`(?i)</t[dh]>`)
)

// visibleText is the text a reader sees, without the style sheet and the
// charts: every block on its own line, table cells split by " | ",
// entities decoded and blank runs collapsed. It is deterministic, so it
// serves as a golden file.
func visibleText(doc string) string {
	doc = styleSheet.ReplaceAllString(doc, "")
	doc = charts.ReplaceAllString(doc, "\n[chart]\n")
	doc = cellEnds.ReplaceAllString(doc, " | ")
	doc = blockEnds.ReplaceAllString(doc, "\n")
	doc = tags.ReplaceAllString(doc, "")
	doc = html.UnescapeString(doc)
	var lines []string
	for _, l := range strings.Split(doc, "\n") {
		l = strings.Join(strings.Fields(l), " ")
		l = strings.TrimSuffix(l, " |")
		if l != "" {
			lines = append(lines, l)
		}
	}
	return strings.Join(lines, "\n") + "\n"
}
