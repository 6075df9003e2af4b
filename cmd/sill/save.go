package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// saveFlags are report's flags that save the cuts as a decision file.
type saveFlags struct {
	path   string
	choose string
	force  bool
	record recordFlags
	page   bool // the sign-off page is asked for, which takes --choose and the record flags too

	// reproject is --reproject: a decision file whose candidates are the
	// cuts (each at its score, keeping its name, rule and note), whose
	// chosen one, model, chosen_by and note are kept, and whose
	// assumptions hold where no flag is given. from is that file, read.
	reproject string
	from      *decision.File
}

func (s *saveFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&s.path, "save", "", "save the cuts with their evidence to this decision file (YAML, see sill review)")
	fs.StringVar(&s.choose, "choose", "", "with --save or --format html: the cut to mark as chosen, by its spec (default: the first --cut)")
	fs.BoolVar(&s.force, "force", false, "with --save: replace a file made from other data, or one that is not a decision file")
	s.record.register(fs, "with --save: ")
	fs.StringVar(&s.reproject, "reproject", "", "a decision file to re-project: its candidates at their scores (names, rules, notes), the chosen one, model, chosen-by and note, under its assumptions except the flags given (sill check's next step after status assumption)")
}

// readReproject reads the --reproject file of a report on set and returns
// the rules that put a cut at each of its candidates' scores, in its
// order; nil without --reproject. The file must have been chosen on the
// same data.
func (s *saveFlags) readReproject(set *scores.Set, cuts []string) ([]cutrule.Rule, error) {
	if s.reproject == "" {
		return nil, nil
	}
	if len(cuts) > 0 || s.choose != "" {
		return nil, errors.New("--reproject takes the cuts and the chosen one from the decision file; --cut and --choose go without it")
	}
	f, err := decision.ReadFile(s.reproject)
	if err != nil {
		return nil, fmt.Errorf("--reproject: %w", err)
	}
	if f.Data.SHA256 != "" && set.SHA256() != "" && f.Data.SHA256 != set.SHA256() {
		return nil, fmt.Errorf("--reproject %s: chosen on other data (its data.sha256 is %s, this data's is %s); re-project it on %s",
			s.reproject, shortDigest(f.Data.SHA256), shortDigest(set.SHA256()), format.Printable(f.Data.Path))
	}
	if f.Data.LowerIsRiskier != set.LowerIsRiskier() {
		return nil, fmt.Errorf("--reproject %s: chosen with lower_is_riskier: %v; give --lower-is-riskier=%v", s.reproject, f.Data.LowerIsRiskier, f.Data.LowerIsRiskier)
	}
	// The same bytes read another way (another --positive, --counts,
	// --drop-invalid, --delim, --decimal-comma) are other cases: refuse
	// rather than re-project candidates onto them.
	if positives, negatives := set.Totals(); positives != f.Data.Positives || (f.Data.Negatives > 0 && negatives != f.Data.Negatives) {
		return nil, fmt.Errorf("--reproject %s: chosen on this data read as %s true and %s false cases, read now as %s and %s; give the reading flags it was saved with (--positive, --counts, --drop-invalid, --delim, --decimal-comma)",
			s.reproject, format.Count(f.Data.Positives), format.Count(f.Data.Negatives), format.Count(positives), format.Count(negatives))
	}
	s.from = f
	rules := make([]cutrule.Rule, len(f.Candidates))
	for i, c := range f.Candidates {
		rules[i] = cutrule.Rule{Kind: cutrule.Score, Value: c.Cut.Score}
	}
	// The candidates' own rules after them: what each picks under the
	// new assumptions, and with --bootstrap its spread, which a candidate
	// keeps where its rule still picks its cut.
	for _, c := range f.Candidates {
		if r, err := cutrule.Parse(c.Rule); err == nil && !slices.Contains(rules, r) {
			rules = append(rules, r)
		}
	}
	return rules, nil
}

func shortDigest(digest string) string {
	if len(digest) > 12 {
		return digest[:12]
	}
	return digest
}

// check rejects --choose, --force and the record flags without --save;
// --choose and the record flags also go with the sign-off page.
func (s *saveFlags) check() error {
	if s.path == "" && s.force {
		return errors.New("--force goes with --save FILE.yaml")
	}
	if s.path == "" && !s.page && (s.choose != "" || s.record.given()) {
		return errors.New("--choose, --model-name, --model-version and --chosen-by go with --save FILE.yaml or --format html")
	}
	return s.record.check()
}

// recordFlags are what a decision file records beside the figures: the
// model and who chose the cut. Nothing is guessed: a flag not given is
// recorded as not given.
type recordFlags struct {
	modelName, modelVersion, chosenBy string
}

func (r *recordFlags) register(fs *pflag.FlagSet, prefix string) {
	fs.StringVar(&r.modelName, "model-name", "", prefix+"the model's name, recorded in the decision file")
	fs.StringVar(&r.modelVersion, "model-version", "", prefix+"the model's version, recorded in the decision file")
	fs.StringVar(&r.chosenBy, "chosen-by", "", prefix+"who chose the cut, recorded in the decision file")
}

func (r *recordFlags) given() bool {
	return r.modelName != "" || r.modelVersion != "" || r.chosenBy != ""
}

// check refuses a line break in a recorded name: the file keeps one line.
func (r *recordFlags) check() error {
	for flag, text := range map[string]string{"--model-name": r.modelName, "--model-version": r.modelVersion, "--chosen-by": r.chosenBy} {
		if strings.ContainsAny(text, "\r\n") {
			return fmt.Errorf("%s %q: a line break, expected one line", flag, text)
		}
	}
	return nil
}

// model returns the model named by the flags.
func (r *recordFlags) model() decision.Model {
	return decision.Model{Name: strings.TrimSpace(r.modelName), Version: strings.TrimSpace(r.modelVersion)}
}

// write saves the outcomes as candidates, named by their specs, when
// --save is given; every outcome must be met.
func (s *saveFlags) write(ctx context.Context, res *analysis.Result, stderr io.Writer) error {
	set := res.Set
	if err := s.check(); err != nil || s.path == "" {
		return err
	}
	if info, err := os.Stat(s.path); err == nil && info.IsDir() {
		return fmt.Errorf("--save %s: a folder, expected a file name such as %s", s.path, filepath.Join(s.path, "cut.yaml"))
	}
	if info, err := os.Stat(filepath.Dir(s.path)); err != nil || !info.IsDir() {
		return fmt.Errorf("--save %s: the folder %s does not exist", s.path, filepath.Dir(s.path))
	}
	f, err := s.decision(res, "--save")
	if err != nil {
		return err
	}
	_, err = decision.Write(ctx, s.path, f, decision.WriteOptions{Force: s.force})
	if errors.Is(err, sharedfile.ErrOtherKind) {
		return fmt.Errorf("%w; add --force to replace it, or save to another file", err)
	}
	if err != nil {
		return err
	}
	c, _ := f.ChosenCandidate()
	sign := format.CutSign(set.LowerIsRiskier())
	fmt.Fprintf(stderr, "sill: saved %d %s to %s; chosen %s: flag when score %s %s\n",
		len(f.Candidates), pluralWord(len(f.Candidates), "cut", "cuts"), format.Printable(s.path), format.Printable(c.Name), sign, format.Score(c.Cut.Score))
	return nil
}

func pluralWord(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// decision builds the decision file of the result's outcomes: each a
// candidate named by its spec, every outcome met, the chosen one --choose
// (default: the first). The sign-off page is made from the same file;
// flag names what asked for it in errors.
func (s *saveFlags) decision(res *analysis.Result, flag string) (*decision.File, error) {
	if s.from != nil {
		return s.reprojected(res, flag)
	}
	var picks []decision.Pick
	var names []string
	for _, o := range res.Outcomes {
		name := o.Rule.String()
		if !o.Met {
			return nil, fmt.Errorf("%s: cut %s is not met (%s); change or drop it", flag, name, o.Reason)
		}
		for _, n := range names {
			if n == name {
				return nil, fmt.Errorf("%s: cut %s is given twice; each cut needs its own spec", flag, name)
			}
		}
		names = append(names, name)
		picks = append(picks, decision.Pick{Name: name, Rule: name, Point: o.Point})
	}
	chosen := s.choose
	if chosen != "" {
		if r, err := cutrule.Parse(chosen); err == nil {
			chosen = r.String() // --choose hit=.8 names hit=0.8
		}
		found := false
		for _, n := range names {
			found = found || n == chosen
		}
		if !found {
			return nil, fmt.Errorf("--choose %q: expected one of the cuts %s", s.choose, strings.Join(names, ", "))
		}
	}
	f, err := decision.New(res, picks, chosen, decision.Record{ToolVersion: toolVersion(), Model: s.record.model(), ChosenBy: strings.TrimSpace(s.record.chosenBy)})
	if err != nil {
		return nil, fmt.Errorf("%s: %w", flag, err)
	}
	return f, nil
}

// reprojected builds the decision file of --reproject: every candidate of
// the file read at its own score, with its name, rule and note, the same
// chosen one, the model, chosen_by and note of the file unless the flags
// give them, under res.Assume. Sign-offs are not carried over: they signed
// the earlier projection.
func (s *saveFlags) reprojected(res *analysis.Result, flag string) (*decision.File, error) {
	from := s.from
	picks := make([]decision.Pick, len(from.Candidates))
	for i, c := range from.Candidates {
		o := res.Outcomes[i]
		if !o.Met || o.Point.Score != c.Cut.Score {
			return nil, fmt.Errorf("%s: candidate %q at score %v is not a cut of this data", flag, format.Printable(c.Name), c.Cut.Score)
		}
		picks[i] = decision.Pick{Name: c.Name, Rule: c.Rule, Note: c.Note, Point: o.Point}
	}
	rec := decision.Record{ToolVersion: toolVersion(), Model: from.Model, ChosenBy: from.ChosenBy, Note: from.Note}
	if s.record.modelName != "" || s.record.modelVersion != "" {
		rec.Model = s.record.model()
	}
	if by := strings.TrimSpace(s.record.chosenBy); by != "" {
		rec.ChosenBy = by
	}
	f, err := decision.New(res, picks, from.Chosen, rec)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", flag, err)
	}
	return f, nil
}
