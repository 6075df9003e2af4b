package main

import (
	"bytes"
	"fmt"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// bothClasses refuses a set that does not have true and false cases both
// weighing more than 0: no cut can be chosen on it, since every rate that
// weighs the alerts caught against the alerts wasted is undefined. what
// says what was asked for ("explore", "--save"). The report itself only
// warns (report.Warnings).
func bothClasses(set *scores.Set, what string) error {
	positives, negatives := set.Totals()
	if positives > 0 && negatives > 0 {
		return nil
	}
	source := set.Source()
	if source == "-" {
		source = "standard input"
	}
	found := fmt.Sprintf("%s true and %s false cases", format.Count(positives), format.Count(negatives))
	if set.Weighted() {
		found = fmt.Sprintf("true cases weighing %s and false cases weighing %s", format.Count(positives), format.Count(negatives))
	}
	if set.LabelColumn() != "" {
		found += fmt.Sprintf(" in column %q", set.LabelColumn())
	}
	return fmt.Errorf("%s: %s has %s; choosing a cut needs both classes, expected at least one true and one false case",
		what, format.Printable(source), found)
}

// checkOut tells before the explorer opens whether the write key could
// save to path (--out): its folder exists, is a folder and takes new
// files, and a file already there is a decision file.
func checkOut(path string) error {
	err := sharedfile.Check(path, func(current []byte) error {
		if _, err := decision.Read(bytes.NewReader(current), path); err != nil {
			return fmt.Errorf("%w, so the write key would not replace it; name a new file or a decision file", decision.ErrNotDecisionFile)
		}
		return nil
	})
	if err != nil {
		return fmt.Errorf("--out %s: %w", format.Printable(path), err)
	}
	return nil
}
