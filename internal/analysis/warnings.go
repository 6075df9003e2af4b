package analysis

import (
	"math"
	"strconv"
	"strings"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/scores"
)

// Warning is one thing a reader of any output should know about the data.
type Warning struct {
	Text string
	// Turn is set on the warning that the ROC AUC shows below 0.5, the
	// direction probably the wrong way round: "add" when lower scores
	// are not taken to be riskier, "drop" when they are. See Words.
	Turn string
}

// Words is the warning's text; on a wrong-way warning it adds how to
// turn the direction round with turn, the caller's own way of saying that
// lower scores are riskier (a flag, a form field), left out when "".
func (w Warning) Words(turn string) string {
	switch {
	case w.Turn == "" || turn == "":
		return w.Text
	case w.Turn == "drop":
		return w.Text + "; if higher scores mean likely true cases, drop " + turn
	}
	return w.Text + "; if lower scores mean likely true cases, add " + turn
}

// WarningWords returns the words of each warning (Warning.Words).
func WarningWords(warnings []Warning, turn string) []string {
	var out []string
	for _, w := range warnings {
		out = append(out, w.Words(turn))
	}
	return out
}

// warningsOf lists what a reader should know about set, whose summary is
// sum: dropped rows, scores that stop a set of probabilities from reading
// as one (OutsideWarning), a class missing, and a ROC AUC that shows
// below 0.500 (the direction probably the wrong way round).
func warningsOf(set *scores.Set, sum curve.Summary) []Warning {
	var w []Warning
	for _, text := range DroppedWarnings(set) {
		w = append(w, Warning{Text: text})
	}
	if text := OutsideWarning(set); text != "" {
		w = append(w, Warning{Text: text})
	}
	switch {
	case sum.Rows == 0:
	case !(sum.Positives+sum.Negatives > 0):
		w = append(w, Warning{Text: "every row weighs 0: no rate or summary figure is defined"})
	case !(sum.Positives > 0):
		w = append(w, Warning{Text: "the validation set has no true cases: hit share, AUC and average precision are undefined"})
	case !(sum.Negatives > 0):
		w = append(w, Warning{Text: "the validation set has no false cases: false positive rate and AUC are undefined"})
	case format.Rounded(sum.ROCAUC, 3) < 0.5:
		// More often than not a false case outranks a true one: most
		// likely the direction is the wrong way round. The AUC is judged
		// as shown, so that "0.500" is never called below 0.5.
		turn := "add"
		if set.LowerIsRiskier() {
			turn = "drop"
		}
		w = append(w, Warning{Text: "ROC AUC " + format.Number(sum.ROCAUC, 3) + " is below 0.5: the scores rank false cases above true ones more often than not", Turn: turn})
	}
	return w
}

// separatedWarning says, when the classes are completely separated (ROC
// AUC exactly 1 or 0: every true case scores above every false one, or
// below), that the AUC's interval, which then has zero width, tells
// nothing: DeLong's variance is the spread of each case's placement (the
// share of the other class it outranks), and with separated classes every
// placement is the same. How far to trust the separation then rests on
// the number (the weight) of cases of each class. ok is false for any other summary, and when the
// interval is undefined (no class, a confidence outside (0, 1)).
func separatedWarning(sum curve.Summary, rank Ranking) (w Warning, ok bool) {
	in := rank.ROCAUC.Interval
	if !(sum.Positives > 0 && sum.Negatives > 0) || math.IsNaN(in[0]) || math.IsNaN(in[1]) || in[0] != in[1] {
		return Warning{}, false
	}
	order := "every true case scores above every false one"
	switch sum.ROCAUC {
	case 1:
	case 0:
		order = "every false case scores above every true one"
	default:
		return Warning{}, false
	}
	return Warning{Text: "ROC AUC " + format.Number(sum.ROCAUC, 3) + ": its interval of zero width is not informative, the classes being completely separated (" + order +
		"); DeLong's interval rests on how much each case's share of the other class it outranks varies, and here none varies: " +
		"how far to trust the separation rests on the " + format.Count(sum.Positives) + " true and " + format.Count(sum.Negatives) + " false cases alone"}, true
}

// outsideShare is the largest share of rows with a score outside
// [0, 1] in a set that otherwise reads as probabilities: past it the
// scores are taken to be on another scale (logits, percentages), which is
// no surprise worth a warning.
const outsideShare = 0.05

// OutsideWarning says, for a set whose scores would read as probabilities
// but for a few rows outside [0, 1] (at most outsideShare of the rows,
// higher scores riskier), how many there are and on which lines, and
// which sections are therefore left out. It returns "" for any other set.
func OutsideWarning(set *scores.Set) string {
	o := set.Outside()
	if o.Rows == 0 || set.LowerIsRiskier() || float64(o.Rows) > outsideShare*float64(set.Len()) {
		return ""
	}
	text := format.Plural(o.Rows, "score lies", "scores lie") + " outside [0, 1]"
	if len(o.Lines) > 0 {
		lines := make([]string, len(o.Lines))
		for i, line := range o.Lines {
			lines[i] = strconv.Itoa(line)
		}
		where := "line " + lines[0]
		if len(lines) > 1 {
			where = "lines " + strings.Join(lines, ", ")
		}
		if more := o.Rows - len(o.Lines); more > 0 {
			where += " and " + strconv.Itoa(more) + " more"
		}
		text += " (" + where + ")"
	}
	return text + ", so the scores are not read as probabilities: the Brier score, log loss, calibration and net benefit are left out"
}

// DroppedWarnings says how many rows of set were dropped and why: those
// with no score by label (a counts table's rows with no score), the rest
// for an invalid score. It returns nothing when none were dropped.
func DroppedWarnings(set *scores.Set) []string {
	var w []string
	invalid := set.Dropped()
	if c := set.NoScore(); c != nil {
		text := format.Plural(c.Total(), "row was", "rows were") + " dropped for a score that was missing or not a number (" +
			format.Plural(c.Positives, "true case", "true cases") + ", " + strconv.Itoa(c.Negatives) + " false"
		if c.Neither > 0 {
			text += ", " + strconv.Itoa(c.Neither) + " with neither label"
		}
		w = append(w, text+")")
		invalid -= c.Total()
	}
	if invalid > 0 {
		w = append(w, format.Plural(invalid, "row was", "rows were")+" dropped for an invalid score")
	}
	return w
}
