package bootstrap_test

import (
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/bootstrap"
)

// TestDescribeThresholdsStated: the thresholds of the words are the ones
// WordsConvention states, and it says they have no published source. By
// hand: a spread of 0.10 to 0.12 (ratio 1.2) is steady, 0.10 to 0.15
// (1.5) fairly steady, 0.10 to 0.17 (1.7) unsteady.
func TestDescribeThresholdsStated(t *testing.T) {
	if !strings.Contains(bootstrap.WordsConvention, "1.25") || !strings.Contains(bootstrap.WordsConvention, "1.6") ||
		!strings.Contains(bootstrap.WordsConvention, "no published source") {
		t.Errorf("convention %q", bootstrap.WordsConvention)
	}
	for _, c := range []struct {
		hi   float64
		want string
	}{{0.12, "steady:"}, {0.15, "fairly steady:"}, {0.17, "unsteady:"}} {
		s := bootstrap.Spread{Met: 100, FlaggedShare: [2]float64{0.10, c.hi}, Recall: [2]float64{0.5, 0.5}}
		if got := bootstrap.Describe(s, 100); !strings.HasPrefix(got, c.want) {
			t.Errorf("0.10 to %v: %q, want %q", c.hi, got, c.want)
		}
	}
}
