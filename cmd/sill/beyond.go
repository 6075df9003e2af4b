package main

import (
	"context"
	"fmt"
	"time"

	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/bootstrap"
	"github.com/sill-tool/sill/internal/calibration"
	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/modelpair"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
	"github.com/sill-tool/sill/internal/shift"
)

// beyondFlags are report's flags for the figures beyond the averages:
// segments, shift peaks, stability, calibration and two models.
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
	joined       *scores.Set // set with the compare file's scores, by finderOptions

	// Set by prepare and finderOptions.
	location *time.Location
	assigned *shift.Assignment
	scale    shift.Scale
}

func (f *beyondFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&f.segmentOrder, "segment-order", "size", "order of the segments under each cut: size, gap (furthest from overall first) or name")
	fs.IntVar(&f.segmentsShown, "segments-shown", 20, "segments shown under each cut in text and Markdown (0: all; JSON lists all)")
	fs.IntVar(&f.calibrationBins, "calibration-bins", 10, "bins of the reliability table (scores in [0,1] only)")
	fs.IntVar(&f.replicates, "bootstrap", 0, "resample the set this many times to show how far each cut moves (0: off)")
	fs.Uint64Var(&f.seed, "seed", 1, "seed of --bootstrap; the same seed gives the same figures")
	f.registerShared(fs)
}

// registerShared registers the flags that report and explore take with
// the same meaning: reliability binning, case times and shifts, and a
// second model's file.
func (f *beyondFlags) registerShared(fs *pflag.FlagSet) {
	fs.StringVar(&f.calibrationBinning, "calibration-binning", "width", "reliability bins: width (equal width) or quantile (equal rows)")
	fs.StringVar(&f.timeColumn, "time", "", "column of case times, for the queue of each real shift (needs --shifts)")
	fs.StringVar(&f.timeLayout, "time-layout", "", `layout of --time in Go's reference-time form, e.g. "2006-01-02 15:04" (default: RFC 3339)`)
	fs.StringVar(&f.timeZone, "tz", "UTC", "time zone of the shift schedule and of times without a zone, e.g. Europe/Amsterdam")
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
// options, labels optional, and joins it to set on the ids.
func (f *beyondFlags) loadCompare(set *scores.Set) (*scores.Set, error) {
	other := *f.input
	other.opt.SegmentColumn, other.opt.WeightColumn, other.opt.TimeColumn, other.opt.CompareColumn = "", "", "", ""
	other.opt.NoLabels = true
	other.scoreColumns = nil
	if f.compareScore != "" {
		other.scoreColumns = []string{f.compareScore}
	} else {
		other.opt.ScoreColumn = ""
	}
	second, err := other.load(f.compareFile, nil, nil)
	if err != nil {
		return nil, fmt.Errorf("--compare: %w", err)
	}
	joined, err := modelpair.Join(set, second)
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

// defaultRules adds queue90=capacity to the default rules when case times
// and a capacity are given.
func (f *beyondFlags) defaultRules(rules []cutrule.Rule, a projection.Assumptions) []cutrule.Rule {
	if f.timeColumn != "" && a.Capacity > 0 {
		rules = append(rules, cutrule.Rule{Kind: cutrule.Queue90, Value: a.Capacity})
	}
	return rules
}

// finderOptions reads and joins the --compare file, places the rows in
// shifts when case times are given and returns the cut finder's options
// for queue90=K. It runs before anything is written.
func (f *beyondFlags) finderOptions(set *scores.Set, a projection.Assumptions) ([]cutrule.Option, error) {
	if f.compareFile != "" {
		joined, err := f.loadCompare(set)
		if err != nil {
			return nil, err
		}
		f.joined = joined
	}
	if f.timeColumn == "" {
		return nil, nil
	}
	sched, err := shift.ParseSchedule(f.shifts, f.location)
	if err != nil {
		return nil, fmt.Errorf("--shifts: %w", err)
	}
	assigned, err := shift.Assign(set, sched)
	if err != nil {
		return nil, fmt.Errorf("--time %s: %w", f.timeColumn, err)
	}
	f.assigned, f.scale = &assigned, shift.ScaleFor(set, assigned, a)
	return []cutrule.Option{cutrule.WithShifts(assigned, f.scale)}, nil
}

// apply adds the figures beyond the averages to r.
func (f *beyondFlags) apply(r *report.Report, set *scores.Set, sum curve.Summary, a projection.Assumptions, rules []cutrule.Rule, outcomes []cutrule.Outcome) error {
	order, err := segment.ParseOrder(f.segmentOrder)
	if err != nil {
		return valueFlagError("--segment-order", err)
	}
	r.AddSegments(set, outcomes, order, f.segmentsShown)
	binning, err := calibration.ParseBinning(f.calibrationBinning)
	if err != nil {
		return valueFlagError("--calibration-binning", err)
	}
	if err := r.AddCalibration(set, outcomes, f.calibrationBins, binning, a); err != nil {
		return fmt.Errorf("--calibration-bins: %w", err)
	}
	if f.assigned != nil {
		r.AddShiftPeaks(set, outcomes, *f.assigned, f.scale)
	}
	if f.replicates > 0 {
		opt := bootstrap.Options{Replicates: f.replicates, Seed: f.seed, BandCuts: 50}
		if f.assigned != nil {
			opt.FinderOptions = []cutrule.Option{cutrule.WithShifts(*f.assigned, f.scale)}
		}
		res, err := bootstrap.Run(context.Background(), set, rules, a, opt)
		if err != nil {
			return fmt.Errorf("--bootstrap: %w", err)
		}
		r.AddStability(res)
	}
	if f.joined != nil {
		set = f.joined
	}
	if set.CompareScores != nil {
		if err := f.compare(r, set, a, rules, outcomes); err != nil {
			return err
		}
	}
	return nil
}

// compare adds the second model's cuts and DeLong's paired test.
func (f *beyondFlags) compare(r *report.Report, set *scores.Set, a projection.Assumptions, rules []cutrule.Rule, outcomes []cutrule.Outcome) error {
	test, testErr := modelpair.Compare(set)
	second, err := modelpair.Second(set)
	if err != nil {
		return err
	}
	var opts []cutrule.Option
	if f.assigned != nil {
		assigned, err := shift.Assign(second, f.assigned.Schedule)
		if err != nil {
			return fmt.Errorf("--time %s: %w", f.timeColumn, err)
		}
		opts = append(opts, cutrule.WithShifts(assigned, shift.ScaleFor(second, assigned, a)))
	}
	finder, err := cutrule.NewFinder(rules, second, a, opts...)
	if err != nil {
		return fmt.Errorf("--cut %w", err)
	}
	curve.Walk(second, finder.Visit)
	r.AddComparison(set.ScoreColumn, set.CompareColumn, test, testErr, outcomes, finder.Outcomes(), a)
	return nil
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
