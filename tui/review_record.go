package tui

import (
	"fmt"
	"strings"
	"time"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/review"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// What the review screen shows of the record beyond the candidates: the
// sign-off form, the sign-offs, the change against the cut in production
// and the trade-off drawn from the stored curve.

// reviewSignedMsg says a sign-off was appended to the file on disk.
type reviewSignedMsg struct {
	file  *decision.File
	stamp sharedfile.Stamp
}

// reviewSignFailedMsg says it was not.
type reviewSignFailedMsg struct{ err error }

// The fields of the sign-off form, in order.
const (
	signName = iota
	signRole
	signVerdict
	signNote
	signFields
)

// signForm is the sign-off form, an overlay of the review screen: who,
// in what role, the verdict and a note. Enter appends the sign-off to the
// file on disk (decision.AppendSignOff, under the file's lock); esc closes
// it and records nothing.
type signForm struct {
	ctx     *shared
	fields  [signFields]textField
	focused int
	err     string
}

func newSignForm(ctx *shared) *signForm {
	f := &signForm{ctx: ctx}
	for i, limit := range []int{80, 80, 7, noteLimit} {
		f.fields[i] = newTextField(limit)
	}
	f.fields[signName].Focus()
	return f
}

func (f *signForm) focus(i int) {
	f.fields[f.focused].Blur()
	f.focused = (i + signFields) % signFields
	f.fields[f.focused].Focus()
}

// Update moves between fields, signs on enter when the entries are
// accepted and closes on esc.
func (f *signForm) Update(r *Review, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := f.ctx.keys
	switch {
	case key.Matches(msg, k.Cancel):
		return true, nil
	case key.Matches(msg, k.NextField):
		f.focus(f.focused + 1)
		return false, nil
	case key.Matches(msg, k.PrevField):
		f.focus(f.focused - 1)
		return false, nil
	case key.Matches(msg, k.Accept):
		name := strings.TrimSpace(f.fields[signName].Value())
		verdict, err := decision.ParseVerdict(strings.TrimSpace(f.fields[signVerdict].Value()))
		switch {
		case name == "":
			f.err, f.focused = "who signs? a name is needed", signName
		case err != nil:
			f.err = "the verdict is approve, revise or reject"
			f.focus(signVerdict)
		case r.changed:
			f.err = "write the changes first (esc, then w): a sign-off is for the choice in the file"
		default:
			s := decision.SignOff{Name: name, Role: strings.TrimSpace(f.fields[signRole].Value()), Verdict: verdict,
				Note: strings.Join(strings.Fields(f.fields[signNote].Value()), " "), At: time.Now().UTC().Truncate(time.Second)}
			return true, r.sign(s)
		}
		return false, nil
	}
	var cmd tea.Cmd
	f.fields[f.focused], cmd = f.fields[f.focused].Update(msg)
	f.err = ""
	return false, cmd
}

// View draws the form.
func (f *signForm) View() string {
	st := f.ctx.styles
	labels := [signFields]string{"name", "role", "verdict", "note"}
	var lines []string
	for i := range f.fields {
		marker := " "
		if i == f.focused {
			marker = st.Selected.Render("▸")
		}
		lines = append(lines, marker+pad(labels[i], 8, false)+" "+fitLine(f.fields[i].View(), 44))
	}
	if f.err != "" {
		lines = append(lines, "  "+st.Warning.Render("✗ "+f.err))
	}
	lines = append(lines, "", st.Muted.Render("verdict: approve, revise or reject · role and note may stay empty"),
		st.Muted.Render("tab/↓ next · enter signs (written at once) · esc cancels"))
	return overlayBox(f.ctx, "sign off", strings.Join(lines, "\n"))
}

// ShortHelp lists the form's keys.
func (f *signForm) ShortHelp() []key.Binding {
	k := f.ctx.keys
	return []key.Binding{hint(k.NextField, "", "next field"), hint(k.Accept, "", "sign"), hint(k.Cancel, "", "cancel")}
}

// sign appends s to the file on disk, as sill review --sign does.
func (r Review) sign(s decision.SignOff) tea.Cmd {
	path, ctx, writes := r.saveTo, r.writeCtx, r.writes
	return func() tea.Msg {
		return writes.run(func() tea.Msg {
			f, stamp, err := decision.AppendSignOff(ctx, path, s)
			if err != nil {
				return reviewSignFailedMsg{err}
			}
			return reviewSignedMsg{file: f, stamp: stamp}
		}, reviewSignFailedMsg{errScreenEnded})
	}
}

// signed takes the file as the sign-off left it: with every sign-off on
// disk, its own included, and the format upgraded.
func (r *Review) signed(msg reviewSignedMsg) {
	r.file.SignOffs = msg.file.SignOffs
	r.file.Format = msg.file.Format
	r.stamp, r.written = msg.stamp, true
	last := msg.file.SignOffs[len(msg.file.SignOffs)-1]
	r.status = fmt.Sprintf("signed: %s by %s, written to %s", last.Verdict, format.Printable(last.Name), r.path)
}

// recordLines are the notes pane's lines on the record: the model and who
// chose, then the sign-offs, or how to give one.
func (r Review) recordLines(width int) []string {
	st, f := r.ctx.styles, r.file
	chosenBy := "not recorded"
	if f.ChosenBy != "" {
		chosenBy = format.Printable(f.ChosenBy)
	}
	lines := []string{st.Label.Render("model: ") + review.ModelName(f.Model) + st.Label.Render(" · chosen by: ") + chosenBy}
	signOffs := review.SignOffLines(f)
	if len(signOffs) == 0 {
		lines = append(lines, st.Label.Render("sign-offs: ")+st.Muted.Render("none yet; S signs off"))
	}
	for i, s := range signOffs {
		label := "sign-off: "
		if len(signOffs) > 1 {
			label = fmt.Sprintf("sign-off %d: ", i+1)
		}
		lines = append(lines, st.Label.Render(label)+ansi.Truncate(s, max(width-len(label), 1), "…"))
	}
	return lines
}

// upgradeNotice is the status a sill-cut/1 file opens with.
func upgradeNotice(f *decision.File) string {
	if !f.Upgraded() {
		return ""
	}
	return "a " + decision.FormatV1 + " file: writing it (w) or signing it (S) writes it as " + decision.Format
}

// againstView draws what changes from the cut in production to this file's.
func (r Review) againstView() string {
	var b strings.Builder
	_ = review.WriteAgainstText(&b, review.Against(r.file, r.path, r.against, r.againstPath))
	// The printed sections are the title, the facts, the assumptions, the
	// figures, the change per shift and the caution. On screen the change
	// per shift comes first, where a short terminal still shows it, and
	// the standing caution stays in the help.
	sections := strings.Split(strings.TrimRight(b.String(), "\n"), "\n\n")
	order := []int{0, 4, 2, 3, 1}
	if len(sections) != 6 { // no change per shift without a volume
		order = []int{0, 2, 3, 1}
	}
	var lines []string
	for i, k := range order {
		if i > 0 {
			lines = append(lines, "")
		}
		lines = append(lines, strings.Split(sections[k], "\n")...)
	}
	st := r.ctx.styles
	innerW := r.ctx.width - st.Overlay.GetHorizontalFrameSize()
	innerH := r.ctx.height - st.Overlay.GetVerticalFrameSize()
	if len(lines) > innerH {
		lines = append(lines[:max(innerH-1, 0)], "…")
	}
	for i, l := range lines {
		lines[i] = ansi.Truncate(l, max(innerW, 1), "…")
	}
	return overlayBox(r.ctx, "against the cut in production", strings.Join(lines, "\n"))
}

// chartOverlay draws the file's stored curve with the explorer's chart
// pane: the candidates marked as pins, the chosen one as the cursor. v
// changes the view as in the explorer.
type chartOverlay struct {
	ctx  *shared
	pane curvePane
}

// newChartOverlay rebuilds a set whose curve is f's stored curve: at each
// stored cut, the true and false cases it adds over the stricter one, as
// two weighted rows. Its cuts are then exactly the stored ones, and the
// explorer's chart draws them. It returns nil for a file with no curve (a
// sill-cut/1 file).
func newChartOverlay(ctx *shared, f *decision.File) *chartOverlay {
	if len(f.Curve) == 0 {
		return nil
	}
	var sc, weights []float64
	var labels []bool
	prevTP, prevFP := 0.0, 0.0
	for _, p := range f.Curve {
		dTP, dFP := max(p.TP-prevTP, 0), max(p.FP-prevFP, 0)
		if dTP > 0 || dFP == 0 {
			sc, labels, weights = append(sc, p.Score), append(labels, true), append(weights, dTP)
		}
		if dFP > 0 {
			sc, labels, weights = append(sc, p.Score), append(labels, false), append(weights, dFP)
		}
		prevTP, prevFP = p.TP, p.FP
	}
	// Cases the curve's last cut does not flag (none when it ends at the
	// loosest cut, as the file's curve does).
	if rest := f.Data.Positives - prevTP; rest > 0 {
		sc, labels, weights = append(sc, looserThanAll(f)), append(labels, true), append(weights, rest)
	}
	if rest := f.Data.Negatives - prevFP; rest > 0 {
		sc, labels, weights = append(sc, looserThanAll(f)), append(labels, false), append(weights, rest)
	}
	set, err := scores.New(sc, labels, weights, f.Data.LowerIsRiskier)
	if err != nil {
		return nil
	}
	s := &session{set: set, curve: curve.New(set), assume: f.Assumptions}
	for _, c := range f.Candidates {
		for i := range s.curve.Len() {
			if s.curve.At(i).Score == c.Cut.Score {
				s.pins = append(s.pins, pin{name: c.Name, rule: c.Rule, cut: i})
				if c.Name == f.Chosen {
					s.reference, s.cursor = len(s.pins)-1, i
				}
				break
			}
		}
	}
	return &chartOverlay{ctx: ctx, pane: newCurvePane(s, ctx)}
}

// looserThanAll is a score looser than every stored cut.
func looserThanAll(f *decision.File) float64 {
	last := f.Curve[len(f.Curve)-1].Score
	if f.Data.LowerIsRiskier {
		return last + 1
	}
	return last - 1
}

// Update changes the view on v and closes on esc, q or the chart key.
func (o *chartOverlay) Update(r *Review, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := r.keys
	switch {
	case key.Matches(msg, k.Cancel), key.Matches(msg, k.Quit), key.Matches(msg, k.Chart):
		return true, nil
	case key.Matches(msg, k.CurveView):
		o.pane, _ = o.pane.Update(msg)
	}
	return false, nil
}

// View draws the chart over most of the screen.
func (o *chartOverlay) View() string {
	o.pane.SetSize(max(o.ctx.width-4, 20), max(o.ctx.height-4, 6))
	return o.pane.View()
}

// ShortHelp lists the chart's keys.
func (o *chartOverlay) ShortHelp() []key.Binding {
	k := o.ctx.keys
	return []key.Binding{k.CurveView, hint(k.Cancel, "esc/t", "close")}
}
