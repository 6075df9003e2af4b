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
)

// entryForm is a form of a few one-line fields, an overlay of either
// screen: tab and shift+tab move between fields, enter hands the values to
// accept, which acts on the screen or refuses them with a reason and the
// field to fix, and esc closes it and changes nothing.
type entryForm[H any] struct {
	ctx     *shared
	title   string
	labels  []string
	fields  []textField
	focused int
	err     string
	notes   []string // muted lines under the fields
	enter   string   // what enter does, in a few words, for the footer
	// fixed are the fields shown but not edited, each with a word on
	// why (sill serve's signer name: "your key's name").
	fixed map[int]string
	// accept takes the values; a reason refuses them, with the field to
	// fix (-1: stay where the cursor is).
	accept func(host H, values []string) (cmd tea.Cmd, field int, reason string)
}

func newEntryForm[H any](ctx *shared, title string, labels []string, limits []int, values []string) *entryForm[H] {
	f := &entryForm[H]{ctx: ctx, title: title, labels: labels}
	for i, limit := range limits {
		field := newTextField(limit)
		if i < len(values) {
			field.SetValue(values[i])
		}
		f.fields = append(f.fields, field)
	}
	f.fields[0].Focus()
	return f
}

// focus moves to field i, or on past it in the same direction while the
// field is fixed.
func (f *entryForm[H]) focus(i int) {
	f.fields[f.focused].Blur()
	n, step := len(f.fields), 1
	if i < f.focused {
		step = -1
	}
	next := (i + n) % n
	for range n {
		if _, fixed := f.fixed[next]; !fixed {
			break
		}
		next = (next + step + n) % n
	}
	f.focused = next
	f.fields[f.focused].Focus()
}

// Update moves between fields, hands the values to accept on enter and
// closes on esc.
func (f *entryForm[H]) Update(host H, msg tea.KeyMsg) (bool, tea.Cmd) {
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
		values := make([]string, len(f.fields))
		for i, field := range f.fields {
			values[i] = field.Value()
		}
		cmd, field, reason := f.accept(host, values)
		if reason == "" {
			return true, cmd
		}
		f.err = reason
		if field >= 0 {
			f.focus(field)
		}
		return false, nil
	}
	var cmd tea.Cmd
	f.fields[f.focused], cmd = f.fields[f.focused].Update(msg)
	f.err = ""
	return false, cmd
}

// View draws the form.
func (f *entryForm[H]) View() string {
	st := f.ctx.styles
	labelW := 0
	for _, l := range f.labels {
		labelW = max(labelW, len(l))
	}
	var lines []string
	for i := range f.fields {
		marker := " "
		if i == f.focused {
			marker = st.Selected.Render("▸")
		}
		field := f.fields[i].View()
		if why, fixed := f.fixed[i]; fixed {
			field = f.fields[i].Value() + st.Muted.Render(" ("+why+")")
		}
		lines = append(lines, marker+pad(f.labels[i], labelW, false)+"  "+fitLine(field, 44))
	}
	if f.err != "" {
		lines = append(lines, "  "+st.Warning.Render("✗ "+f.err))
	}
	lines = append(lines, "")
	for _, n := range f.notes {
		lines = append(lines, st.Muted.Render(n))
	}
	return overlayBox(f.ctx, f.title, strings.Join(lines, "\n"))
}

// ShortHelp lists the form's keys.
func (f *entryForm[H]) ShortHelp() []key.Binding {
	k := f.ctx.keys
	return []key.Binding{hint(k.NextField, "", "next field"), hint(k.Accept, "", f.enter), hint(k.Cancel, "", "cancel")}
}

// newSignForm is the sign-off form of the review screen: who, in what
// role, the verdict and a note. Enter appends the sign-off to the file on
// disk (decision.AppendSignOff, under the file's lock). With signer, the
// name is the signer's and is not edited, and the sign-off carries the
// signer's key.
func newSignForm(ctx *shared, signer *Signer) *entryForm[*Review] {
	var values []string
	if signer != nil {
		values = []string{format.Printable(signer.Name)}
	}
	f := newEntryForm[*Review](ctx, "sign off", []string{"name", "role", "verdict", "note"}, []int{80, 80, 7, noteLimit}, values)
	if signer != nil {
		f.fixed = map[int]string{signName: "your key's name"}
		f.focus(signRole)
	}
	f.notes = []string{"verdict: approve, revise or reject · role and note may stay empty",
		"tab/↓ next · enter signs (written at once) · esc cancels"}
	f.enter = "sign"
	f.accept = func(r *Review, values []string) (tea.Cmd, int, string) {
		name, signedKey := strings.TrimSpace(values[signName]), ""
		if signer != nil {
			name, signedKey = strings.TrimSpace(signer.Name), signer.Key
		}
		verdict, err := decision.ParseVerdict(strings.TrimSpace(values[signVerdict]))
		switch {
		case name == "" && signer != nil:
			return nil, -1, "this key has no name (comment) in the authorized keys file; ask who runs the server"
		case name == "":
			return nil, signName, "who signs? a name is needed"
		case err != nil:
			return nil, signVerdict, "the verdict is approve, revise or reject"
		case r.changed:
			return nil, -1, "write the changes first (esc, then w): a sign-off is for the choice in the file"
		}
		s := decision.SignOff{Name: name, Role: strings.TrimSpace(values[signRole]), Verdict: verdict,
			Note: strings.Join(strings.Fields(values[signNote]), " "), At: time.Now().UTC().Truncate(time.Second), Key: signedKey}
		return r.sign(s), 0, ""
	}
	return f
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
// chose, the ranking figures with their intervals when the file has them,
// then the sign-offs, or how to give one.
func (r Review) recordLines(width int) []string {
	st, f := r.ctx.styles, r.file
	chosenBy := "not recorded"
	if f.ChosenBy != "" {
		chosenBy = format.Printable(f.ChosenBy)
	}
	lines := []string{st.Label.Render("model: ") + review.ModelName(f.Model) + st.Label.Render(" · chosen by: ") + chosenBy}
	if ranking := review.RankingLine(f.Data.Ranking); ranking != "" {
		const label = "ranking: "
		lines = append(lines, st.Label.Render(label)+ansi.Truncate(ranking, max(width-len(label), 1), "…"))
	}
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

// newRecordForm is the explorer's form of what the decision file records
// beside the figures: the model's name and version and who chose the cut
// (--model-name, --model-version, --chosen-by). Empty fields are written
// as not given; nothing is guessed.
func newRecordForm(ctx *shared, model decision.Model, chosenBy string) *entryForm[*Model] {
	f := newEntryForm[*Model](ctx, "model and who chose", []string{"model name", "model version", "chosen by"},
		[]int{80, 80, 80}, []string{model.Name, model.Version, chosenBy})
	f.notes = []string{"written into the decision file by w · empty: not recorded", "tab/↓ next · enter keeps · esc cancels"}
	f.enter = "keep"
	f.accept = func(m *Model, values []string) (tea.Cmd, int, string) {
		next := decision.Model{Name: strings.TrimSpace(values[0]), Version: strings.TrimSpace(values[1])}
		by := strings.TrimSpace(values[2])
		if next != m.record.model || by != m.record.chosenBy {
			m.record.model, m.record.chosenBy = next, by
			m.unwritten = true
			m.status = "model and who chose set (not written yet: w writes)"
		}
		return nil, 0, ""
	}
	return f
}
