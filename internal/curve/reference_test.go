package curve_test

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/floatcmp"
	"github.com/sill-tool/sill/internal/scores"
)

// The reference values in testdata/reference were written by
// testdata/reference/make_reference.py with scikit-learn 1.2.1 (Debian's
// python3-sklearn); reference.json records the exact versions.
const referenceDir = "../../testdata/reference"

// referenceFile is reference.json as written by make_reference.py.
type referenceFile struct {
	Versions map[string]string           `json:"versions"`
	Datasets map[string]referenceDataset `json:"datasets"`
}

type referenceDataset struct {
	Rows             int      `json:"rows"`
	Weighted         bool     `json:"weighted"`
	ROCAUC           float64  `json:"roc_auc"`
	AveragePrecision float64  `json:"average_precision"`
	Brier            *float64 `json:"brier"`    // absent when scores are not probabilities
	LogLoss          *float64 `json:"log_loss"` // absent when scores are not probabilities

	// PrecisionRecall is sklearn.metrics.precision_recall_curve: thresholds
	// ascending, with one extra final point (precision 1, recall 0) that
	// has no threshold.
	PrecisionRecall struct {
		Precision  []float64 `json:"precision"`
		Recall     []float64 `json:"recall"`
		Thresholds []float64 `json:"thresholds"`
	} `json:"precision_recall_curve"`

	// ROC is sklearn.metrics.roc_curve(drop_intermediate=False):
	// thresholds descending, led by an invented threshold above every
	// score that gives the point fpr = tpr = 0.
	ROC struct {
		FPR        []float64 `json:"fpr"`
		TPR        []float64 `json:"tpr"`
		Thresholds []float64 `json:"thresholds"`
	} `json:"roc_curve"`
}

// referenceComparer counts the comparisons it makes so that a test can
// show it compared something.
type referenceComparer struct {
	t        *testing.T
	compared int
}

func (c *referenceComparer) check(what string, got, want float64) {
	c.t.Helper()
	c.compared++
	if !floatcmp.Equal(got, want) {
		c.t.Errorf("%s: sill %v, reference %v (difference %g, tolerance %g)", what, got, want, got-want, floatcmp.Tolerance)
	}
}

func loadReferenceJSON(t *testing.T) referenceFile {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(referenceDir, "reference.json"))
	if err != nil {
		t.Fatal(err)
	}
	var ref referenceFile
	if err := json.Unmarshal(data, &ref); err != nil {
		t.Fatalf("reference.json: %v", err)
	}
	return ref
}

func readReferenceSet(t *testing.T, file, weightColumn string) *scores.Set {
	t.Helper()
	f, err := os.Open(filepath.Join(referenceDir, file))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	set, err := scores.Read(f, file, scores.Options{WeightColumn: weightColumn})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

func TestReferenceScikitLearn(t *testing.T) {
	ref := loadReferenceJSON(t)
	t.Logf("reference versions: %v", ref.Versions)

	tests := []struct {
		file         string
		weightColumn string
	}{
		{file: "breast_cancer.csv"},                        // logistic-regression probabilities, few ties
		{file: "breast_cancer_feature.csv"},                // raw "mean radius": many ties, not probabilities
		{file: "ties_weights.csv", weightColumn: "weight"}, // 11 distinct scores, weights 0..3
	}
	if len(tests) != len(ref.Datasets) {
		t.Errorf("reference.json has %d datasets, the test knows %d", len(ref.Datasets), len(tests))
	}
	for _, tt := range tests {
		t.Run(tt.file, func(t *testing.T) {
			want, ok := ref.Datasets[tt.file]
			if !ok {
				t.Fatalf("reference.json has no entry for %s", tt.file)
			}
			set := readReferenceSet(t, tt.file, tt.weightColumn)
			c := curve.New(set)
			compare := &referenceComparer{t: t}

			// reference: row count and weighting as written by make_reference.py
			if c.Summary.Rows != want.Rows || c.Summary.Weighted != want.Weighted {
				t.Errorf("rows %d weighted %v, reference rows %d weighted %v", c.Summary.Rows, c.Summary.Weighted, want.Rows, want.Weighted)
			}

			// reference: scikit-learn 1.2.1 roc_auc_score via testdata/reference/make_reference.py
			compare.check("roc auc", c.Summary.ROCAUC, want.ROCAUC)
			// reference: scikit-learn 1.2.1 average_precision_score via testdata/reference/make_reference.py
			compare.check("average precision", c.Summary.AveragePrecision, want.AveragePrecision)
			if want.Brier != nil {
				// reference: scikit-learn 1.2.1 brier_score_loss via testdata/reference/make_reference.py
				compare.check("brier", c.Summary.Brier, *want.Brier)
			} else if c.Summary.Probabilities || !math.IsNaN(c.Summary.Brier) {
				// reference: make_reference.py gives no Brier score because the scores leave [0,1]
				t.Errorf("scores outside [0,1]: probabilities %v, brier %v, want false and NaN", c.Summary.Probabilities, c.Summary.Brier)
			}
			if want.LogLoss != nil {
				// reference: scikit-learn 1.2.1 log_loss(labels=[0,1]) on scores clipped to [1e-15, 1-1e-15] via testdata/reference/make_reference.py
				compare.check("log loss", c.Summary.LogLoss, *want.LogLoss)
			} else if !math.IsNaN(c.Summary.LogLoss) {
				// reference: make_reference.py gives no log loss because the scores leave [0,1]
				t.Errorf("scores outside [0,1]: log loss %v, want NaN", c.Summary.LogLoss)
			}

			// scikit-learn drops zero-weight rows before building curves,
			// so its thresholds are the cuts that add weight; sill keeps a
			// cut carried only by zero-weight rows. Collect the cuts that
			// add weight, strictest first.
			var weighted []curve.Point
			previousFlagged := 0.0
			for i := 0; i < c.Len(); i++ {
				p := c.At(i)
				if p.Flagged() != previousFlagged {
					weighted = append(weighted, p)
				}
				previousFlagged = p.Flagged()
			}

			// Precision-recall: sklearn's thresholds ascend, so sklearn
			// index k is sill's weighted cut m-1-k. A case is flagged when
			// score >= threshold in both.
			pr := want.PrecisionRecall
			m := len(pr.Thresholds)
			if len(pr.Precision) != m+1 || len(pr.Recall) != m+1 {
				t.Fatalf("precision_recall_curve: %d precisions, %d recalls, %d thresholds; want one more point than thresholds", len(pr.Precision), len(pr.Recall), m)
			}
			// reference: scikit-learn 1.2.1 precision_recall_curve appends (precision 1, recall 0) without a threshold; sill has no such cut
			if pr.Precision[m] != 1 || pr.Recall[m] != 0 {
				t.Errorf("precision_recall_curve final point (%v, %v), want (1, 0)", pr.Precision[m], pr.Recall[m])
			}
			if len(weighted) != m {
				t.Fatalf("sill has %d cuts that add weight, precision_recall_curve has %d thresholds", len(weighted), m)
			}
			for k, threshold := range pr.Thresholds {
				p := weighted[m-1-k]
				if p.Score != threshold {
					t.Errorf("precision_recall_curve threshold %d is %v, sill cut %d is %v", k, threshold, p.Index, p.Score)
					continue
				}
				// reference: scikit-learn 1.2.1 precision_recall_curve via testdata/reference/make_reference.py
				compare.check("precision at cut "+formatScore(threshold), p.Precision(), pr.Precision[k])
				// reference: scikit-learn 1.2.1 precision_recall_curve via testdata/reference/make_reference.py
				compare.check("recall at cut "+formatScore(threshold), p.Recall(), pr.Recall[k])
			}

			// ROC: sklearn's thresholds descend and start with an invented
			// threshold above every score (flag nothing), which sill does
			// not list, so sklearn index j is sill's weighted cut j-1.
			roc := want.ROC
			if len(roc.FPR) != m+1 || len(roc.TPR) != m+1 || len(roc.Thresholds) != m+1 {
				t.Fatalf("roc_curve: %d fpr, %d tpr, %d thresholds; want %d each", len(roc.FPR), len(roc.TPR), len(roc.Thresholds), m+1)
			}
			// reference: scikit-learn 1.2.1 roc_curve starts at (0, 0) above the top score
			if roc.FPR[0] != 0 || roc.TPR[0] != 0 || !set.Riskier(roc.Thresholds[0], set.Scores()[0]) {
				t.Errorf("roc_curve first point (%v, %v) at %v, want (0, 0) above the top score %v", roc.FPR[0], roc.TPR[0], roc.Thresholds[0], set.Scores()[0])
			}
			for j := 1; j <= m; j++ {
				p := weighted[j-1]
				if p.Score != roc.Thresholds[j] {
					t.Errorf("roc_curve threshold %d is %v, sill cut %d is %v", j, roc.Thresholds[j], p.Index, p.Score)
					continue
				}
				// reference: scikit-learn 1.2.1 roc_curve(drop_intermediate=False) via testdata/reference/make_reference.py
				compare.check("fpr at cut "+formatScore(p.Score), p.FalsePositiveRate(), roc.FPR[j])
				// reference: scikit-learn 1.2.1 roc_curve(drop_intermediate=False) via testdata/reference/make_reference.py
				compare.check("tpr at cut "+formatScore(p.Score), p.Recall(), roc.TPR[j])
			}

			// Summary figures plus four per threshold must all have been
			// compared, or the test proved nothing.
			if minimum := 2 + 4*m; m == 0 || compare.compared < minimum {
				t.Errorf("compared %d values over %d thresholds, want at least %d", compare.compared, m, minimum)
			}
		})
	}
}

func formatScore(score float64) string {
	data, _ := json.Marshal(score)
	return string(data)
}

// TestReferenceComparerFails shows the comparison can fail: a value one
// tolerance and a bit away, and NaN against a number, are reported.
func TestReferenceComparerFails(t *testing.T) {
	tests := []struct {
		got, want float64
		close     bool
	}{
		{0.5, 0.5, true},
		{0.5, 0.5 + floatcmp.Tolerance/2, true},
		{0.5, 0.5 + 2*floatcmp.Tolerance, false},
		{math.NaN(), math.NaN(), true},
		{math.NaN(), 0.5, false},
		{0.5, math.NaN(), false},
	}
	for _, tt := range tests {
		if got := floatcmp.Equal(tt.got, tt.want); got != tt.close {
			t.Errorf("floatcmp.Equal(%v, %v) = %v, want %v", tt.got, tt.want, got, tt.close)
		}
	}
}
