package main

import (
	"context"
	"errors"
	"fmt"
	"time"

	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/modelpair"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// beyondFlags are the flags of the figures beyond the averages (segments,
// shift peaks, stability, calibration and two models), which become the
// options of package analysis.
type beyondFlags struct {
	segmentOrder       string
	segmentsShown      int
	calibrationBins    int
	calibrationBinning string

	timeColumn string
	timeLayout string
	timeZone   string
	shifts     string

	replicates int
	seed       uint64

	compareFile  string // a second model's scores of the same cases, joined on --id
	compareScore string // its score column: the second --score, or the default names
	input        *inputFlags

	location *time.Location // set by prepare
}

func (f *beyondFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&f.segmentOrder, "segment-order", "size", "order of the segments under each cut: size, gap (furthest from overall first) or name")
	fs.IntVar(&f.segmentsShown, "segments-shown", 20, "segments shown under each cut in text and Markdown (0: all; JSON lists all)")
	fs.IntVar(&f.calibrationBins, "calibration-bins", 10, "bins of the reliability table (scores in [0,1] only)")
	fs.IntVar(&f.replicates, "bootstrap", 0, "resample the set this many times: the redraws at this cut under each measured share, and where each rule lands (0: off)")
	fs.Uint64Var(&f.seed, "seed", 1, "seed of --bootstrap; the same seed gives the same figures")
	f.registerShared(fs)
}

// registerShared registers the flags that report and explore take with
// the same meaning: reliability binning, case times and shifts, and a
// second model's file.
func (f *beyondFlags) registerShared(fs *pflag.FlagSet) {
	fs.StringVar(&f.calibrationBinning, "calibration-binning", "width", "reliability bins: width (equal width) or quantile (equal rows)")
	fs.StringVar(&f.timeColumn, "time", "", "column of case times, for the queue of each real shift (needs --shifts)")
	fs.StringVar(&f.timeLayout, "time-layout", "", `layout of --time in Go's reference-time form, e.g. "02/01/2006 15:04" (default: 2026-03-27T09:29:00Z, 2026-03-27 09:29:00 or 2026-03-27 09:29, with T or a space, seconds and fractions optional)`)
	fs.StringVar(&f.timeZone, "tz", "UTC", "time zone of the shift schedule and of times without a zone (such as 2026-03-27 09:29:00), e.g. Europe/Amsterdam")
	fs.StringVar(&f.shifts, "shifts", "", "local start times of the crew shifts, e.g. 06:00,14:00,22:00")
	fs.StringVar(&f.compareFile, "compare", "", "a second model's scores of the same cases, joined on --id (its score column: the second --score)")
}

// prepare checks the time flags and sets the reading options they need
// before the set is read.
func (f *beyondFlags) prepare(in *inputFlags) error {
	if f.timeZone == "" {
		f.timeZone = "UTC"
	}
	loc, err := time.LoadLocation(f.timeZone)
	if err != nil {
		return fmt.Errorf("--tz %q: expected a time-zone name such as UTC or Europe/Amsterdam", f.timeZone)
	}
	f.location = loc
	switch {
	case f.timeColumn == "" && f.shifts != "":
		return fmt.Errorf("--shifts needs --time: the column of case times to place in shifts")
	case f.timeColumn != "" && f.shifts == "":
		return fmt.Errorf("--time needs --shifts: the local start times of the crew shifts, e.g. 06:00,14:00,22:00")
	case f.timeColumn == "" && f.timeLayout != "":
		return fmt.Errorf("--time-layout needs --time")
	}
	if f.shifts != "" {
		if _, err := shift.ParseSchedule(f.shifts, loc); err != nil {
			return fmt.Errorf("--shifts: %w", err)
		}
	}
	in.opt.TimeColumn, in.opt.TimeLayout, in.opt.TimeLocation = f.timeColumn, f.timeLayout, loc
	f.input = in
	if f.compareFile != "" {
		switch {
		case f.compareFile == "-":
			return fmt.Errorf("--compare -: name a file; standard input is for the first one")
		case in.opt.IDColumn == "":
			return fmt.Errorf("--compare needs --id: the column that names each case in both files")
		}
		if len(in.scoreColumns) == 2 {
			f.compareScore = in.scoreColumns[1]
			in.scoreColumns = in.scoreColumns[:1]
		}
	}
	return nil
}

// loadCompare reads the second model's file with the first one's reading
// options, labels optional, and joins it to set on the ids; without
// --compare it returns set.
func (f *beyondFlags) loadCompare(ctx context.Context, set *scores.Set) (*scores.Set, error) {
	if f.compareFile == "" {
		return set, nil
	}
	other := *f.input
	other.opt.SegmentColumn, other.opt.WeightColumn, other.opt.TimeColumn, other.opt.CompareColumn = "", "", "", ""
	other.opt.NoLabels = true
	other.scoreColumns = nil
	if f.compareScore != "" {
		other.scoreColumns = []string{f.compareScore}
	} else {
		other.opt.ScoreColumn = ""
	}
	second, err := other.load(ctx, f.compareFile, nil, nil)
	if err != nil {
		return nil, fmt.Errorf("--compare: %w", err)
	}
	joined, err := modelpair.Join(set, second)
	if errors.Is(err, modelpair.ErrNoIDs) {
		return nil, fmt.Errorf("--compare: %w (--id)", err)
	}
	if err != nil {
		return nil, fmt.Errorf("--compare: %w", err)
	}
	return joined, nil
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
		return valueFlagError("--segment-order", err)
	}
	if _, err := calibration.ParseBinning(f.calibrationBinning); err != nil {
		return valueFlagError("--calibration-binning", err)
	}
	if f.calibrationBins < 1 || f.calibrationBins > 1000 {
		return fmt.Errorf("--calibration-bins %d: expected a number of bins from 1 to 1000", f.calibrationBins)
	}
	if f.replicates < 0 || f.replicates > 100000 {
		return fmt.Errorf("--bootstrap %d: expected a number of resampled sets from 1 to 100000 (0: off)", f.replicates)
	}
	return nil
}

// options returns the analysis options of the flags, checked.
func (f *beyondFlags) options() (analysis.Options, error) {
	if err := f.check(); err != nil {
		return analysis.Options{}, err
	}
	opts := analysis.Options{
		CalibrationBins: f.calibrationBins,
		Resampling:      analysis.Resampling{Replicates: f.replicates, Seed: f.seed},
	}
	binning, err := calibration.ParseBinning(f.calibrationBinning)
	if err != nil {
		return opts, valueFlagError("--calibration-binning", err)
	}
	opts.CalibrationBinning = binning
	if f.shifts != "" {
		sched, err := shift.ParseSchedule(f.shifts, f.location)
		if err != nil {
			return opts, fmt.Errorf("--shifts: %w", err)
		}
		opts.Shifts = &sched
	}
	return opts, nil
}

// order returns the order of the segments, checked by check.
func (f *beyondFlags) order() segment.Order {
	order, _ := segment.ParseOrder(f.segmentOrder)
	return order
}

// analysisError adds to an error of package analysis the flag that sets
// what failed.
func (f *beyondFlags) analysisError(err error) error {
	var e *analysis.Error
	if !errors.As(err, &e) {
		return err
	}
	switch e.Step {
	case analysis.StepShifts:
		return fmt.Errorf("--time %s: %w", f.timeColumn, e.Err)
	case analysis.StepCalibration:
		return fmt.Errorf("--calibration-bins: %w", e.Err)
	case analysis.StepResampling:
		return fmt.Errorf("--bootstrap: %w", cutFlagHint(e.Err))
	}
	return cutFlagHint(e.Err)
}

// cutFlagHint adds the flags that give what a cut rule found missing, as
// in "cut queue=90 needs a volume per shift (--volume)".
func cutFlagHint(err error) error {
	switch {
	case errors.Is(err, cutrule.ErrNeedsVolume):
		return fmt.Errorf("%w (--volume)", err)
	case errors.Is(err, cutrule.ErrNeedsCosts):
		return fmt.Errorf("%w (--cost-false-alert, --cost-miss or --cost-hit)", err)
	case errors.Is(err, cutrule.ErrNeedsShifts):
		return fmt.Errorf("%w (--time and --shifts)", err)
	}
	return err
}

func valueFlagError(flag string, err error) error {
	return &flagValueError{flag: flag, err: err}
}

// flagValueError is a flag whose value a package rejected.
type flagValueError struct {
	flag string
	err  error
}

func (e *flagValueError) Error() string { return e.flag + ": " + e.err.Error() }
func (e *flagValueError) Unwrap() error { return e.err }
