package main

import (
	"fmt"

	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

// beyondFlags are report's flags for the figures beyond the averages:
// segments, shift peaks, stability, calibration and two models.
type beyondFlags struct {
	segmentOrder       string
	calibrationBins    int
	calibrationBinning string
}

func (f *beyondFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&f.segmentOrder, "segment-order", "size", "order of the segments under each cut: size, gap (furthest from overall first) or name")
	fs.IntVar(&f.calibrationBins, "calibration-bins", 10, "bins of the reliability table (scores in [0,1] only)")
	fs.StringVar(&f.calibrationBinning, "calibration-binning", "width", "reliability bins: width (equal width) or quantile (equal rows)")
}

// prepare sets the reading options these flags need before the set is read.
func (f *beyondFlags) prepare(in *inputFlags) error {
	return nil
}

// check reports a bad flag value before anything is computed. A zero
// beyondFlags (as runDefault has) is valid.
func (f *beyondFlags) check() error {
	if f.segmentOrder == "" {
		f.segmentOrder = "size"
	}
	if f.calibrationBins == 0 && f.calibrationBinning == "" {
		f.calibrationBins, f.calibrationBinning = 10, "width"
	}
	if _, err := segment.ParseOrder(f.segmentOrder); err != nil {
		return flagValueError("--segment-order", err)
	}
	if _, err := calibration.ParseBinning(f.calibrationBinning); err != nil {
		return flagValueError("--calibration-binning", err)
	}
	if f.calibrationBins < 1 || f.calibrationBins > 1000 {
		return fmt.Errorf("--calibration-bins %d: expected a number of bins from 1 to 1000", f.calibrationBins)
	}
	return nil
}

// apply adds the figures beyond the averages to r.
func (f *beyondFlags) apply(r *report.Report, set *scores.Set, sum curve.Summary, a projection.Assumptions, rules []cutrule.Rule, outcomes []cutrule.Outcome) error {
	order, err := segment.ParseOrder(f.segmentOrder)
	if err != nil {
		return flagValueError("--segment-order", err)
	}
	r.AddSegments(set, outcomes, order)
	binning, err := calibration.ParseBinning(f.calibrationBinning)
	if err != nil {
		return flagValueError("--calibration-binning", err)
	}
	if err := r.AddCalibration(set, outcomes, f.calibrationBins, binning, a); err != nil {
		return fmt.Errorf("--calibration-bins: %w", err)
	}
	return nil
}

func flagValueError(flag string, err error) error {
	return &valueFlagError{flag: flag, err: err}
}

type valueFlagError struct {
	flag string
	err  error
}

func (e *valueFlagError) Error() string { return e.flag + ": " + e.err.Error() }
func (e *valueFlagError) Unwrap() error { return e.err }
