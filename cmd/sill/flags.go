package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/share"
	"github.com/sill-tool/sill/internal/warehouse"
)

// inputFlags are the flags that say how to read a score table.
type inputFlags struct {
	opt   scores.Options
	input string
	delim string

	// scoreColumns holds --score: one column, or two to compare two models
	// (the second becomes opt.CompareColumn); empty leaves opt as it is.
	scoreColumns []string

	// counts reads the input as a counts table (score, positives,
	// negatives), such as `sill sql` queries produce.
	counts bool

	// weightKind is --weight-kind: what the --weight column holds
	// ("frequency" or "sampling"; "" when not given). defaultKind, when
	// set, stands in for it (check takes the decision file's).
	weightKind  string
	defaultKind *design.Kind
	// weightWarning is the one-line warning about the weights that load
	// found ("" for none), for the command to print once.
	weightWarning string
}

func (f *inputFlags) register(fs *pflag.FlagSet) {
	fs.StringArrayVar(&f.scoreColumns, "score", nil, "score column (default: first of "+strings.Join(scores.DefaultScoreColumns, ", ")+"); give it twice to compare two models on the same cases")
	fs.StringVar(&f.opt.LabelColumn, "label", "", "label column (default: first of "+strings.Join(scores.DefaultLabelColumns, ", ")+")")
	fs.StringVar(&f.opt.WeightColumn, "weight", "", "optional column of non-negative case weights")
	fs.StringVar(&f.weightKind, "weight-kind", "", "what --weight holds: frequency (a row of weight 3 is three cases) or sampling (inverse selection probabilities, such as 10 for negatives kept 1 in 10); needed when the weights are not whole numbers or differ only between the classes")
	fs.StringVar(&f.opt.SegmentColumn, "segment", "", "optional group column")
	fs.StringVar(&f.opt.IDColumn, "id", "", "optional case id column")
	fs.StringVar(&f.opt.Positive, "positive", "", "the only label value that means a true case (default: 1/true/yes/positive vs 0/false/no/negative)")
	fs.BoolVar(&f.opt.LowerIsRiskier, "lower-is-riskier", false, "a small score means a likely true case")
	fs.BoolVar(&f.opt.DropInvalid, "drop-invalid", false, "skip rows with a missing or non-finite score, and count them")
	fs.BoolVar(&f.opt.DecimalComma, "decimal-comma", false, "numbers are written with a decimal comma, 0,25 (found without this flag in semicolon-separated text whose first score has one); a point in a number is then refused")
	fs.StringVar(&f.input, "input", "", "input format: csv, jsonl or parquet (default: detected)")
	fs.StringVar(&f.delim, "delim", "", `field delimiter for csv, e.g. "," or "\t" (default: detected from the header)`)
	fs.BoolVar(&f.counts, "counts", false, "the input is a counts table: score, positives, negatives (and --segment), one row per score, as sill sql makes it")
}

// load reads the table at path ("-" for standard input); progress may be
// nil. Reading stops with ctx's error once ctx ends. A reading error that
// a flag can mend names the flag.
func (f *inputFlags) load(ctx context.Context, path string, stdin io.Reader, progress func(rows int)) (*scores.Set, error) {
	if err := f.checkWeightKind(); err != nil {
		return nil, err
	}
	set, err := f.loadSet(ctx, path, stdin, progress)
	if err != nil {
		return nil, readFlagHint(err)
	}
	if err := f.declare(set); err != nil {
		return nil, err
	}
	return set, nil
}

// checkWeightKind checks --weight-kind before anything is read.
func (f *inputFlags) checkWeightKind() error {
	if f.weightKind == "" {
		return nil
	}
	if _, err := design.ParseKind(f.weightKind); err != nil {
		return fmt.Errorf("--weight-kind %q: expected frequency or sampling", f.weightKind)
	}
	if f.opt.WeightColumn == "" {
		return fmt.Errorf("--weight-kind %s says what the --weight column holds; give --weight COLUMN too", f.weightKind)
	}
	return nil
}

// kind returns what the weights are: --weight-kind, else the default
// kind when one is set, else frequency.
func (f *inputFlags) kind() design.Kind {
	if k, err := design.ParseKind(f.weightKind); err == nil && f.weightKind != "" {
		return k
	}
	if f.defaultKind != nil {
		return *f.defaultKind
	}
	return design.Frequency
}

// declare checks weights read without --weight-kind (or a default kind):
// weights that cannot be read as counts of cases as they stand stop with
// one line asking for the flag; whole-number weights that vary within a
// class leave a warning in f.weightWarning.
func (f *inputFlags) declare(set *scores.Set) error {
	f.weightWarning = ""
	if f.weightKind != "" || f.defaultKind != nil {
		return nil
	}
	warning, err := design.Declared(set)
	if err != nil {
		source := set.Source()
		if source == "-" {
			source = "standard input"
		}
		return fmt.Errorf("%s: %w; give --weight-kind frequency or --weight-kind sampling", format.Printable(source), err)
	}
	if warning != "" {
		f.weightWarning = warning + "; --weight-kind sampling reads them as sampling weights"
	}
	return nil
}

// warnWeights prints the weights' warning, if load left one, once.
func (f *inputFlags) warnWeights(w io.Writer) {
	if f.weightWarning != "" {
		fmt.Fprintln(w, "sill: warning: "+format.Printable(f.weightWarning))
		f.weightWarning = ""
	}
}

// readFlagHint adds to a reading error the flag that mends it, if one
// does: --decimal-comma for a number with a decimal comma, --time-layout
// (with a layout that reads the time, where one was found) for a time in
// no form read without one.
func readFlagHint(err error) error {
	var layoutErr *scores.TimeLayoutError
	switch {
	case err == nil:
		return nil
	case errors.As(err, &layoutErr) && layoutErr.Layout != "":
		return fmt.Errorf("%w; give it with --time-layout %q", err, layoutErr.Layout)
	case errors.As(err, &layoutErr):
		return fmt.Errorf("%w; give the layout with --time-layout", err)
	case errors.Is(err, scores.ErrDecimalComma) && !errors.Is(err, scores.ErrBadScore) && !errors.Is(err, scores.ErrBadWeight) && !errors.Is(err, scores.ErrBadCount):
		return err // decimal commas asked for where commas part the cells
	case errors.Is(err, scores.ErrDecimalComma):
		return fmt.Errorf("%w; read decimal commas with --decimal-comma", err)
	case errors.Is(err, scores.ErrBadLabel):
		return fmt.Errorf("%w (or set --positive)", err)
	case errors.Is(err, scores.ErrNeitherLabel):
		return fmt.Errorf("%w (set --positive in the query)", err)
	case errors.Is(err, scores.ErrPositiveInCounts):
		return fmt.Errorf("%w; drop --positive", err)
	}
	return err
}

// loadSet is load without the flag hints.
func (f *inputFlags) loadSet(ctx context.Context, path string, stdin io.Reader, progress func(rows int)) (*scores.Set, error) {
	opt := f.opt
	opt.Progress = progress
	if err := f.scoreOptions(&opt); err != nil {
		return nil, err
	}
	switch strings.ToLower(f.input) {
	case "":
	case "csv", "tsv":
		opt.Input = scores.InputCSV
	case "jsonl", "ndjson":
		opt.Input = scores.InputJSONL
	case "parquet":
		opt.Input = scores.InputParquet
	default:
		return nil, fmt.Errorf("--input %q: expected csv, jsonl or parquet", f.input)
	}
	switch f.delim {
	case "":
	case `\t`, "tab":
		opt.Delimiter = '\t'
	default:
		r := []rune(f.delim)
		if len(r) != 1 || r[0] == '"' || r[0] == '\n' || r[0] == '\r' {
			return nil, fmt.Errorf("--delim %q: expected one character such as , or ; or \\t", f.delim)
		}
		opt.Delimiter = r[0]
	}
	read := scores.Read
	if f.counts {
		read = scores.ReadCounts
	}
	if path == "-" {
		if set, handled, err := readParquet(ctx, path, stdin, nil, opt); handled {
			return set, err
		}
		if f.counts {
			return read(readerWithContext(ctx, stdin), "-", opt)
		}
		if seekable := seekableStdin(stdin); seekable != nil {
			if file, ok := seekable.(*os.File); ok {
				if set, handled, err := readParquet(ctx, path, nil, file, opt); handled {
					return set, err // Parquet redirected from a file
				}
			}
			return scores.Load(readSeekerWithContext(ctx, seekable), "-", opt) // standard input redirected from a file
		}
		return loadPiped(readerWithContext(ctx, stdin), opt)
	}
	file, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("read scores: %w", err)
	}
	defer file.Close()
	if info, err := file.Stat(); err == nil && info.IsDir() {
		if set, handled, err := readParquetFolder(path, opt); handled {
			return set, err
		}
		return nil, fmt.Errorf("read scores: %s is a directory, expected a file", path)
	}
	if f.counts {
		return read(readerWithContext(ctx, file), path, opt)
	}
	if set, handled, err := readParquet(ctx, path, nil, file, opt); handled {
		return set, err
	}
	return scores.Load(readSeekerWithContext(ctx, file), path, opt) // the block reader; it hands what it cannot take to scores.Read
}

// scoreOptions sets the score columns named by --score.
func (f *inputFlags) scoreOptions(opt *scores.Options) error {
	switch len(f.scoreColumns) {
	case 0:
	case 1:
		opt.ScoreColumn = f.scoreColumns[0]
	case 2:
		opt.ScoreColumn, opt.CompareColumn = f.scoreColumns[0], f.scoreColumns[1]
		if opt.ScoreColumn == opt.CompareColumn {
			return fmt.Errorf("--score %s given twice: name two different columns to compare two models", opt.ScoreColumn)
		}
	default:
		return fmt.Errorf("--score given %d times: name one score column, or two to compare two models", len(f.scoreColumns))
	}
	return nil
}

// loadDemo reads the built-in demo data with the same options.
func (f *inputFlags) loadDemo() (*scores.Set, error) {
	opt := f.opt
	if err := f.scoreOptions(&opt); err != nil {
		return nil, err
	}
	if opt.SegmentColumn == "" {
		opt.SegmentColumn = "yard"
	}
	if opt.IDColumn == "" {
		opt.IDColumn = "id"
	}
	return scores.Read(strings.NewReader(string(demo.CSV(demo.DefaultRows, demo.DefaultSeed))), demo.Source, opt)
}

// assumptionFlags are the operating assumptions shared by every command
// that projects figures to production.
type assumptionFlags struct {
	volume, baseRate, capacity float64
	costFalseAlert, costMiss   float64
	costHit, confidence        float64
	fs                         *pflag.FlagSet
	// defaults, when set, are the assumptions a flag not given keeps
	// (report --reproject: the decision file's); otherwise the base rate
	// is the validation one and the rest are not given.
	defaults *projection.Assumptions
	// input, when set, says what the set's weights are (--weight-kind),
	// which the intervals follow.
	input *inputFlags
}

// sample is the design of set under the input's --weight-kind: nil for
// frequency weights, or without the input flags.
func (f *assumptionFlags) sample(set *scores.Set) *design.Sample {
	if f.input == nil {
		return nil
	}
	return design.New(set, f.input.kind())
}

func (f *assumptionFlags) register(fs *pflag.FlagSet) {
	f.fs = fs
	fs.Float64Var(&f.volume, "volume", 0, "cases scored per shift in production")
	fs.Var(newShareFlag(&f.baseRate, 0, shareBounds{}), "base-rate", "production base rate, such as 0.05 or 5% (default: the validation base rate)")
	fs.Float64Var(&f.capacity, "capacity", 0, "alerts one shift can work (needs --volume)")
	fs.Float64Var(&f.costFalseAlert, "cost-false-alert", 0, "cost of working a wrong alert")
	fs.Float64Var(&f.costMiss, "cost-miss", 0, "cost of missing a true case")
	fs.Float64Var(&f.costHit, "cost-hit", 0, "cost of a caught true case (negative: a benefit)")
	fs.Var(newShareFlag(&f.confidence, projection.DefaultConfidence, shareBounds{above0: true, below1: true, expected: "a level above 0 and below 1, such as 0.95 or 95%"}),
		"confidence", "confidence level of every interval, such as 0.9 or 90%")
}

// assumptions builds the operating assumptions, taking the base rate from
// the validation set unless --base-rate is given.
func (f *assumptionFlags) assumptions(set *scores.Set) (projection.Assumptions, error) {
	positives, negatives := set.Totals()
	a := projection.Assumptions{
		Sample:     f.sample(set),
		BaseRate:   positives / (positives + negatives),
		Volume:     f.volume,
		Capacity:   f.capacity,
		Confidence: f.confidence,
	}
	changed := func(name string) bool { return f.fs != nil && f.fs.Changed(name) }
	if d := f.defaults; d != nil {
		a.BaseRate = d.BaseRate
		if !changed("volume") {
			a.Volume = d.Volume
		}
		if !changed("capacity") {
			a.Capacity = d.Capacity
		}
		if !changed("confidence") {
			a.Confidence = d.Confidence
		}
		if d.Costs != nil {
			costs := *d.Costs
			a.Costs = &costs
		}
	}
	if changed("base-rate") {
		a.BaseRate = f.baseRate
	} else if math.IsNaN(a.BaseRate) {
		a.BaseRate = 0
	}
	if changed("volume") && !(f.volume > 0) {
		return a, fmt.Errorf("--volume %v: expected a positive number of cases per shift", f.volume)
	}
	if changed("capacity") {
		if !(f.capacity > 0) {
			return a, fmt.Errorf("--capacity %v: expected a positive number of alerts per shift", f.capacity)
		}
		if !(a.Volume > 0) {
			return a, fmt.Errorf("--capacity needs --volume: the queue per shift is projected from the volume")
		}
	}
	if changed("cost-false-alert") || changed("cost-miss") || changed("cost-hit") {
		costs := projection.Costs{FalseAlert: f.costFalseAlert, Miss: f.costMiss, Hit: f.costHit}
		if d := f.defaults; d != nil && d.Costs != nil {
			// A cost not given keeps the file's.
			for name, cost := range map[string]*float64{"cost-false-alert": &costs.FalseAlert, "cost-miss": &costs.Miss, "cost-hit": &costs.Hit} {
				if !changed(name) {
					*cost = map[string]float64{"cost-false-alert": d.Costs.FalseAlert, "cost-miss": d.Costs.Miss, "cost-hit": d.Costs.Hit}[name]
				}
			}
		}
		a.Costs = &costs
	}
	if err := a.Validate(); err != nil {
		return a, flagError(err)
	}
	return a, nil
}

// flagError rewords an assumption error for the command line.
func flagError(err error) error {
	var amount *projection.AmountError
	if errors.As(err, &amount) {
		flags := map[string]string{
			projection.AmountVolume:       "--volume",
			projection.AmountCapacity:     "--capacity",
			projection.AmountCost:         "--cost-false-alert, --cost-miss or --cost-hit",
			projection.AmountCostPerShift: "--volume times the largest of --cost-false-alert, --cost-miss and --cost-hit",
		}[amount.Amount]
		return fmt.Errorf("%s: %w", flags, err)
	}
	return fmt.Errorf("%w (check --base-rate, --volume, --capacity, the costs and --confidence)", err)
}

// shareBounds narrows a share flag below [0,1]; expected says what the
// flag then takes.
type shareBounds struct {
	above0, below1 bool
	expected       string
}

// shareFlag is a flag whose value is a share, as package share reads it:
// 0.05 or 5%.
type shareFlag struct {
	value  *float64
	bounds shareBounds
}

func newShareFlag(value *float64, initial float64, bounds shareBounds) *shareFlag {
	*value = initial
	return &shareFlag{value: value, bounds: bounds}
}

func (f *shareFlag) Set(text string) error {
	v, err := share.Parse(text)
	if err != nil {
		return err
	}
	if f.bounds.above0 && v == 0 || f.bounds.below1 && v == 1 {
		return fmt.Errorf("%q: expected %s", text, f.bounds.expected)
	}
	*f.value = v
	return nil
}

func (f *shareFlag) String() string { return strconv.FormatFloat(*f.value, 'g', -1, 64) }

// Type names the value in help: "--base-rate share".
func (f *shareFlag) Type() string { return "share" }

// flagValueTypeError rewords pflag's error for a flag's value as one line naming
// the flag and what it takes: for a share flag "--base-rate: "105%" is
// more than 100%, expected ..." (what package share says, without pflag's
// "invalid argument" frame around it); for a number or duration flag
// "--volume "abc": expected a number of cases per shift, such as 20000",
// as the range errors of the same flags read, instead of
// the parse error of Go's strconv.
func flagValueTypeError(err error) error {
	var invalid *pflag.InvalidValueError
	if !errors.As(err, &invalid) {
		return err
	}
	flag := invalid.GetFlag()
	if _, ok := flag.Value.(*shareFlag); ok {
		return valueFlagError("--"+flag.Name, errors.Unwrap(invalid))
	}
	if expected, ok := flagTakes[flag.Name]; ok {
		return fmt.Errorf("--%s %q: expected %s", flag.Name, invalid.GetValue(), expected)
	}
	return err
}

// flagTakes says what each number and duration flag of every command
// takes, in the words of flagValueTypeError; TestFlagTakesEveryNumberFlag keeps it
// complete. A flag name means the same in every command that has it.
var flagTakes = map[string]string{
	"volume":           "a number of cases per shift, such as 20000",
	"capacity":         "a number of alerts one shift can work, such as 400",
	"cost-false-alert": "an amount per wrong alert, such as 12.5",
	"cost-miss":        "an amount per missed true case, such as 300",
	"cost-hit":         "an amount per caught true case, such as 20 (negative for a benefit)",
	"bootstrap":        "a whole number of resampled sets, such as 200 (0: off)",
	"seed":             "a whole number from 0 up, such as 1",
	"calibration-bins": "a whole number of bins, such as 10",
	"segments-shown":   "a whole number of segments, such as 20 (0: all)",
	"rows":             "a whole number of rows, such as 5000",
	"digits":           fmt.Sprintf("a whole number of decimal digits from 0 to %d, or -1 to keep the scores as they are", warehouse.MaxDigits),
	"max-sessions":     "a whole number of connections, such as 4",
	"idle-timeout":     "a duration such as 15m or 1h30m",
}
