package tui

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/share"
)

// helpView draws every key of groups in two columns, in a box.
func helpView(ctx *shared, groups []helpGroup) string {
	st := ctx.styles
	render := func(g helpGroup) []string {
		keyW := 0
		for _, b := range g.bindings {
			keyW = max(keyW, ansi.StringWidth(b.Help().Key))
		}
		lines := []string{st.Title.Render(g.title)}
		for _, b := range g.bindings {
			lines = append(lines, st.Key.Render(pad(b.Help().Key, keyW, false))+"  "+b.Help().Desc)
		}
		return lines
	}
	// Two columns, the groups in order within each, split so that the
	// taller column is as short as it can be (the first such split, with
	// the first group on the left).
	rendered := make([][]string, len(groups))
	for i, g := range groups {
		rendered[i] = render(g)
	}
	split := func(mask int) (left, right []string) {
		for i, lines := range rendered {
			col := &left
			if mask&(1<<i) != 0 {
				col = &right
			}
			if len(*col) > 0 {
				*col = append(*col, "")
			}
			*col = append(*col, lines...)
		}
		return left, right
	}
	best, bestH := 0, -1
	for mask := 0; mask < 1<<len(groups); mask += 2 { // bit 0 clear: the first group on the left
		l, r := split(mask)
		if h := max(len(l), len(r)); bestH < 0 || h < bestH {
			best, bestH = mask, h
		}
	}
	left, right := split(best)
	leftW := 0
	for _, l := range left {
		leftW = max(leftW, ansi.StringWidth(l))
	}
	var rows []string
	for i := 0; i < max(len(left), len(right)); i++ {
		l, r := "", ""
		if i < len(left) {
			l = left[i]
		}
		if i < len(right) {
			r = right[i]
		}
		rows = append(rows, fitLine(l, leftW)+"   "+r)
	}
	rows = append(rows,
		st.Muted.Render("marks: ● true case · ▌ flagged · ▶ the cut's tie group · ◆ chosen · ◇ pinned"),
		st.Muted.Render("candidate keys act in the strip (tab) · here tab: terms explained · ? closes"),
		st.Warning.Render(evidence.ShortCaution))
	return overlayBox(ctx, "keys", strings.Join(rows, "\n"))
}

// overlayBox frames body in the overlay style at its natural size, no
// larger than the screen.
func overlayBox(ctx *shared, title, body string) string {
	st := ctx.styles
	w, h := 0, 0
	for _, l := range strings.Split(body, "\n") {
		w = max(w, ansi.StringWidth(l))
		h++
	}
	w = max(w, ansi.StringWidth(title)+4)
	width := min(w+st.Overlay.GetHorizontalFrameSize(), ctx.width)
	height := min(h+st.Overlay.GetVerticalFrameSize(), ctx.height)
	return framed(st.Overlay, st.OverlayEdge, st.Title, title, body, width, height)
}

// formField is one line of the assumptions form.
type formField struct {
	label string
	hint  string
	input textField
	err   string
}

// The fields of the assumptions form, in order.
const (
	fieldBaseRate = iota
	fieldVolume
	fieldCapacity
	fieldCostFalseAlert
	fieldCostMiss
	fieldCostHit
	fieldConfidence
	fieldCount
)

// formPane is the assumptions form, an overlay of the explorer. Entries
// are checked when applied; a refused entry stays open with its reason
// beside it.
type formPane struct {
	ctx                *shared
	fields             []formField
	focused            int
	validationBaseRate float64
	sample             *design.Sample // how the set was drawn, which the form does not change
}

// newFormPane returns the form filled from a; an empty base rate is the
// validation set's.
func newFormPane(ctx *shared, a projection.Assumptions, validationBaseRate float64) *formPane {
	p := &formPane{ctx: ctx}
	specs := []struct{ label, hint string }{
		{"base rate", "production share of true cases: 0.07 or 7%"},
		{"volume per shift", "cases scored per shift; empty: not given"},
		{"capacity per shift", "alerts a shift can work; needs a volume"},
		{"cost of a wrong alert", "per wrong alert; all costs empty: none"},
		{"cost of a miss", "per true case not flagged"},
		{"cost of a hit", "per true case flagged; negative: a benefit"},
		{"confidence", "level of every interval, 0.95 or 95%"},
	}
	for _, s := range specs {
		in := newTextField(24)
		p.fields = append(p.fields, formField{label: s.label, hint: s.hint, input: in})
	}
	p.load(a, validationBaseRate)
	return p
}

// load fills the form from a.
func (p *formPane) load(a projection.Assumptions, validationBaseRate float64) {
	p.validationBaseRate = validationBaseRate
	p.sample = a.Sample
	// An empty base rate is the validation set's: say what that is.
	p.fields[fieldBaseRate].hint = "production share of true cases, 0.01 or 1%; empty: " + format.Share(validationBaseRate)
	text := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	given := func(v float64) string {
		if v == 0 {
			return ""
		}
		return text(v)
	}
	values := make([]string, fieldCount)
	if a.BaseRate != validationBaseRate {
		values[fieldBaseRate] = text(a.BaseRate)
	}
	values[fieldVolume] = given(a.Volume)
	values[fieldCapacity] = given(a.Capacity)
	if c := a.Costs; c != nil {
		values[fieldCostFalseAlert] = text(c.FalseAlert)
		values[fieldCostMiss] = text(c.Miss)
		values[fieldCostHit] = text(c.Hit)
	}
	values[fieldConfidence] = text(a.Confidence)
	for i := range p.fields {
		p.fields[i].input.SetValue(values[i])
		p.fields[i].err = ""
	}
	p.focus(0)
}

func (p *formPane) focus(i int) {
	p.focused = (i + fieldCount) % fieldCount
	for j := range p.fields {
		if j == p.focused {
			p.fields[j].input.Focus()
		} else {
			p.fields[j].input.Blur()
		}
	}
}

// Update handles a key: enter applies the assumptions to the explorer
// when every entry is accepted, esc closes the form without them.
func (p *formPane) Update(m *Model, msg tea.KeyMsg) (bool, tea.Cmd) {
	k := p.ctx.keys
	switch {
	case key.Matches(msg, k.Cancel):
		return true, nil
	case key.Matches(msg, k.Accept):
		a, ok := p.parse()
		if !ok {
			return false, nil
		}
		return true, m.applyAssumptions(a)
	case key.Matches(msg, k.NextField):
		p.focus(p.focused + 1)
		return false, nil
	case key.Matches(msg, k.PrevField):
		p.focus(p.focused - 1)
		return false, nil
	}
	var cmd tea.Cmd
	p.fields[p.focused].input, cmd = p.fields[p.focused].input.Update(msg)
	p.fields[p.focused].err = ""
	return false, cmd
}

// ShortHelp lists the form's keys.
func (p *formPane) ShortHelp() []key.Binding {
	k := p.ctx.keys
	return []key.Binding{hint(k.NextField, "", "next field"), hint(k.PrevField, "↑", "previous"),
		hint(k.Accept, "", "apply"), hint(k.Cancel, "", "cancel")}
}

// parse reads every field, marks the refused ones with their reason and
// reports whether all were accepted.
func (p *formPane) parse() (projection.Assumptions, bool) {
	ok := true
	refuse := func(i int, reason string) {
		p.fields[i].err = reason
		if ok {
			p.focus(i)
		}
		ok = false
	}
	number := func(i int) (float64, bool, bool) { // value, given, valid
		text := strings.TrimSpace(p.fields[i].input.Value())
		if text == "" {
			return 0, false, true
		}
		v, err := strconv.ParseFloat(strings.ReplaceAll(text, "_", ""), 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			refuse(i, fmt.Sprintf("%q is not a number", p.fields[i].input.Value()))
			return 0, true, false
		}
		return v, true, true
	}
	// shareOf reads a share field as package share does: 0.05 or 5%.
	shareOf := func(i int) (float64, bool, bool) { // value, given, valid
		text := p.fields[i].input.Value()
		if strings.TrimSpace(text) == "" {
			return 0, false, true
		}
		v, err := share.Parse(text)
		var e *share.Error
		if errors.As(err, &e) {
			// The entry is on the line above: the reason need not repeat it,
			// and so fits an 80-column screen.
			refuse(i, "this "+e.Problem+"; expected 0 to 1 or 0% to 100%")
			return 0, true, false
		}
		return v, true, true
	}
	for i := range p.fields {
		p.fields[i].err = ""
	}
	a := projection.Assumptions{Sample: p.sample}
	if v, given, valid := shareOf(fieldBaseRate); valid {
		a.BaseRate = v
		if !given {
			a.BaseRate = p.validationBaseRate
		}
	}
	volumeValid := true
	if v, given, valid := number(fieldVolume); !valid {
		volumeValid = false
	} else if given {
		if v <= 0 {
			volumeValid = false
			refuse(fieldVolume, "expected more than 0 cases per shift, or empty for none")
		} else {
			a.Volume = v
		}
	}
	if v, given, valid := number(fieldCapacity); valid && given {
		switch {
		case v <= 0:
			refuse(fieldCapacity, "expected more than 0 alerts, or empty")
		case a.Volume == 0 && volumeValid:
			refuse(fieldCapacity, "needs a volume per shift: the queue is projected from it")
		case a.Volume == 0:
			// The volume is refused already; judge the capacity once it is fixed.
		default:
			a.Capacity = v
		}
	}
	var costs projection.Costs
	anyCost := false
	for i, dst := range map[int]*float64{fieldCostFalseAlert: &costs.FalseAlert, fieldCostMiss: &costs.Miss, fieldCostHit: &costs.Hit} {
		if v, given, valid := number(i); valid && given {
			*dst = v
			anyCost = true
		}
	}
	if anyCost {
		a.Costs = &costs
	}
	if v, given, valid := shareOf(fieldConfidence); valid {
		switch {
		case !given:
			a.Confidence = projection.DefaultConfidence
		case !(v > 0 && v < 1):
			refuse(fieldConfidence, "expected a level above 0 and below 1, such as 0.95 or 95%")
		default:
			a.Confidence = v
		}
	}
	if ok {
		if err := a.Validate(); err != nil {
			refuse(fieldBaseRate, err.Error())
		}
	}
	return a, ok
}

// View draws the form.
func (p *formPane) View() string {
	st := p.ctx.styles
	var lines []string
	for i, f := range p.fields {
		label := pad(f.label, 22, false)
		value := f.input.View()
		if i == fieldBaseRate && f.input.Value() == "" {
			value += st.Muted.Render("validation " + format.Share(p.validationBaseRate))
		}
		line := label + " " + fitLine(value, 17)
		if i == p.focused {
			line = st.Selected.Render("▸") + line
		} else {
			line = " " + line
		}
		lines = append(lines, line)
		if f.err != "" {
			lines = append(lines, "   "+st.Warning.Render("✗ "+f.err))
		}
	}
	// The hint line is as wide as the widest hint, so that the box keeps
	// its width as the focus moves from field to field.
	hintW := 0
	for _, f := range p.fields {
		hintW = max(hintW, ansi.StringWidth(f.hint))
	}
	lines = append(lines, "", st.Muted.Render(fitLine(p.fields[p.focused].hint, hintW)))
	lines = append(lines, st.Muted.Render("tab/↓ next · enter applies · esc cancels"))
	return overlayBox(p.ctx, "assumptions", strings.Join(lines, "\n"))
}

// renameBox asks for the selected candidate's new name; a name that is
// empty or taken is refused with the reason in the box.
func renameBox(ctx *shared, name string) *textBox[*Model] {
	box := newTextBox(ctx, "rename candidate", name, 40, func(m *Model, text string) error {
		if err := m.s.rename(strings.TrimSpace(text)); err != nil {
			return err
		}
		m.unwritten = true
		m.refresh()
		return nil
	})
	box.label, box.width = "new name: ", 31
	box.notes = []string{"enter renames · esc keeps the name"}
	box.enter, box.esc = "rename", "keep the name"
	return box
}

// replaceQuestion asks before replacing path, a file on disk that is not
// the one being written (made from other data, or no decision file), for
// reason; headline says what was found and ask what is asked. y runs
// replace, n or esc runs keep.
func replaceQuestion[H any](ctx *shared, path, reason, headline, ask string, replace, keep func(H) tea.Cmd) *question[H] {
	path, reason, headline = format.Printable(path), format.Printable(reason), format.Printable(headline)
	st, k := ctx.styles, ctx.keys
	lines := []string{st.Warning.Render(headline)}
	for _, l := range wrapWords(reason, 60) {
		lines = append(lines, st.Muted.Render(l))
	}
	lines = append(lines, "", ask+" "+st.Key.Render("y")+" replaces · "+st.Key.Render("n")+"/esc keeps it")
	return &question[H]{ctx: ctx, title: "replace " + path + "?", body: strings.Join(lines, "\n"),
		answers: []answer[H]{{key: k.Yes, what: "replace", do: replace}, {key: k.No, what: "keep it", do: keep}}}
}

// wrapWords breaks text into lines of at most width columns at spaces; a
// word longer than width stays whole on its own line.
func wrapWords(text string, width int) []string {
	var lines []string
	line := ""
	for _, word := range strings.Fields(text) {
		switch {
		case line == "":
			line = word
		case ansi.StringWidth(line)+1+ansi.StringWidth(word) <= width:
			line += " " + word
		default:
			lines = append(lines, line)
			line = word
		}
	}
	if line != "" {
		lines = append(lines, line)
	}
	return lines
}
