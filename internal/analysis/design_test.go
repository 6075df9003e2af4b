package analysis_test

import (
	"context"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
)

// TestResamplingFollowsDesign: the bootstrap resamples as a random sample
// whatever the weights' kind, sampling weights constant within each class
// (false cases kept 1 in 10, weighted 10) included: the kept rows are a
// random sample and the class mix varies between such sets (see
// bootstrap's TestSamplingWeightsCoverage). Within classes only when the
// caller asks for it.
func TestResamplingFollowsDesign(t *testing.T) {
	build := func(negativeWeights ...float64) *scores.Set {
		sc := []float64{0.9, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2}
		labels := []bool{true, false, true, false, true, false, false, false}
		weights := []float64{1, negativeWeights[0], 1, negativeWeights[1], 1, negativeWeights[2], negativeWeights[3], negativeWeights[4]}
		set, err := scores.NewSet(scores.Columns{Scores: sc, Labels: labels, Weights: weights, WeightColumn: "w"})
		if err != nil {
			t.Fatal(err)
		}
		return set
	}
	cases := []struct {
		name string
		set  *scores.Set
		kind design.Kind
		ask  bootstrap.Design
		want bootstrap.Design
	}{
		{"downsampled, sampling", build(10, 10, 10, 10, 10), design.Sampling, bootstrap.Ordinary, bootstrap.Ordinary},
		{"downsampled, frequency", build(10, 10, 10, 10, 10), design.Frequency, bootstrap.Ordinary, bootstrap.Ordinary},
		{"varying, sampling", build(10, 5, 10, 20, 10), design.Sampling, bootstrap.Ordinary, bootstrap.Ordinary},
		{"downsampled, sampling, asked within classes", build(10, 10, 10, 10, 10), design.Sampling, bootstrap.WithinClass, bootstrap.WithinClass},
	}
	for _, tc := range cases {
		a := projection.Assumptions{BaseRate: 0.1, Confidence: 0.95, Sample: design.New(tc.set, tc.kind)}
		res, err := analysis.Run(context.Background(), tc.set, a, analysis.Options{Rules: rules(t, "hit=0.5"),
			Resampling: analysis.Resampling{Replicates: 20, Seed: 1, Design: tc.ask}})
		if err != nil {
			t.Fatal(err)
		}
		if res.Stability.Design != tc.want {
			t.Errorf("%s: design %v, want %v", tc.name, res.Stability.Design, tc.want)
		}
	}
}
