package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/sharedfile"
	"github.com/spf13/pflag"
)

// saveFlags are report's flags that save the cuts as a decision file.
type saveFlags struct {
	path   string
	choose string
	force  bool
	record recordFlags
}

func (s *saveFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&s.path, "save", "", "save the cuts with their evidence to this decision file (YAML, see sill review)")
	fs.StringVar(&s.choose, "choose", "", "with --save: the cut to mark as chosen, by its spec (default: the first --cut)")
	fs.BoolVar(&s.force, "force", false, "with --save: replace a file made from other data, or one that is not a decision file")
	s.record.register(fs, "with --save: ")
}

// check rejects --choose, --force and the record flags without --save.
func (s *saveFlags) check() error {
	if s.path == "" && (s.choose != "" || s.force || s.record.given()) {
		return errors.New("--choose, --force, --model-name, --model-version and --chosen-by go with --save FILE.yaml")
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
	set, outcomes := res.Set, res.Outcomes
	if err := s.check(); err != nil || s.path == "" {
		return err
	}
	if info, err := os.Stat(s.path); err == nil && info.IsDir() {
		return fmt.Errorf("--save %s: a folder, expected a file name such as %s", s.path, filepath.Join(s.path, "cut.yaml"))
	}
	if info, err := os.Stat(filepath.Dir(s.path)); err != nil || !info.IsDir() {
		return fmt.Errorf("--save %s: the folder %s does not exist", s.path, filepath.Dir(s.path))
	}
	var picks []decision.Pick
	var names []string
	for _, o := range outcomes {
		name := o.Rule.String()
		if !o.Met {
			return fmt.Errorf("--save: cut %s is not met (%s); change or drop it to save", name, o.Reason)
		}
		for _, n := range names {
			if n == name {
				return fmt.Errorf("--save: cut %s is given twice; each saved cut needs its own spec", name)
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
			return fmt.Errorf("--choose %q: expected one of the saved cuts %s", s.choose, strings.Join(names, ", "))
		}
	}
	f, err := decision.New(res, picks, chosen, decision.Record{ToolVersion: toolVersion(), Model: s.record.model(), ChosenBy: strings.TrimSpace(s.record.chosenBy)})
	if err != nil {
		return fmt.Errorf("--save: %w", err)
	}
	_, err = decision.Write(ctx, s.path, f, decision.WriteOptions{Force: s.force})
	if errors.Is(err, sharedfile.ErrOtherKind) {
		return fmt.Errorf("%w; add --force to replace it, or save to another file", err)
	}
	if err != nil {
		return err
	}
	c, _ := f.ChosenCandidate()
	sign := ">="
	if set.LowerIsRiskier {
		sign = "<="
	}
	fmt.Fprintf(stderr, "sill: saved %d %s to %s; chosen %s: flag when score %s %s\n",
		len(picks), pluralWord(len(picks), "cut", "cuts"), s.path, c.Name, sign, format.Score(c.Cut.Score))
	return nil
}

func pluralWord(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
