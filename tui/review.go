package tui

import (
	"errors"
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/report"
)

// ReviewConfig is what the review screen needs from the command line.
type ReviewConfig struct {
	File *decision.File // as read; the screen works on a copy
	Path string         // where it was read from, and where w writes it
	// Styles and Keys; zero values take PlainStyles and DefaultKeyMap.
	Styles *Styles
	Keys   *KeyMap
}

// reviewOverlay is one layer over the review screen.
type reviewOverlay int

const (
	reviewHelp    reviewOverlay = iota // every key
	reviewNote                         // editing a note
	reviewQuit                         // quitting with changes not written
	reviewReplace                      // the file on disk was made from other data
)

// Messages of the review screen, named for what happened.
type (
	// reviewWrittenMsg says the decision file was written.
	reviewWrittenMsg struct{ path string }
	// reviewWriteFailedMsg says it was not.
	reviewWriteFailedMsg struct{ err error }
)

// noteLimit is the longest note the screen takes, in characters.
const noteLimit = 400

// Review is the review screen: the candidates of a decision file side by
// side in the comparison strip, each figure against the chosen one (◆),
// for a lead who may not have the data. Left and right select a candidate
// (▸), c makes it the chosen one, n notes on it, N notes on the whole
// file, w writes the file back with the same atomic writer as the
// explorer, q quits and asks first when there are changes not written.
//
// The candidates' evidence is never changed: only the choice and the notes.
type Review struct {
	ctx      *shared
	keys     reviewKeys
	file     *decision.File
	path     string // as shown
	saveTo   string // where w writes: path, except in tests
	selected int

	strip    Strip
	overlays []reviewOverlay
	note     textField
	noteFor  int // the candidate whose note is edited; -1 for the file's
	reason   string

	changed  bool // changes not written
	status   string
	written  bool
	quitting bool // quit once the write asked for on the way out succeeds
}

// reviewKeys are the explorer's keys plus the two note keys.
type reviewKeys struct {
	KeyMap
	Note     key.Binding // note on the selected candidate
	FileNote key.Binding // note on the whole file
}

func newReviewKeys(k KeyMap) reviewKeys {
	k.Choose.SetHelp("c", "choose this candidate")
	k.Write.SetHelp("w", "write the file")
	k.Left.SetHelp("←/h", "previous candidate")
	k.Right.SetHelp("→/l", "next candidate")
	k.Accept.SetHelp("enter", "keep the note")
	k.enableReview()
	return reviewKeys{
		KeyMap:   k,
		Note:     key.NewBinding(key.WithKeys("n"), key.WithHelp("n", "note on this candidate")),
		FileNote: key.NewBinding(key.WithKeys("N"), key.WithHelp("N", "note on the file")),
	}
}

// NewReview returns the review screen for cfg.
func NewReview(cfg ReviewConfig) Review {
	ctx := newShared(cfg.Styles, cfg.Keys)
	working := *cfg.File
	working.Candidates = append([]decision.Candidate(nil), cfg.File.Candidates...)
	r := Review{ctx: ctx, keys: newReviewKeys(ctx.keys), file: &working, path: cfg.Path, saveTo: cfg.Path, note: newTextField(noteLimit), noteFor: -1}
	r.strip = NewStrip(ctx.styles, r.keys.KeyMap)
	r.selected = r.chosen()
	r.refresh()
	return r
}

// File returns the decision as it stands on screen, written or not.
func (r Review) File() *decision.File { return r.file }

// Written reports whether the screen wrote the file.
func (r Review) Written() bool { return r.written }

// Changed reports whether there are changes not written.
func (r Review) Changed() bool { return r.changed }

// chosen returns the index of the chosen candidate.
func (r Review) chosen() int {
	for i, c := range r.file.Candidates {
		if c.Name == r.file.Chosen {
			return i
		}
	}
	return 0
}

// table lays out the candidates in the file's order against the chosen one.
func (r Review) table() compare.Table {
	f := r.file
	columns := make([]compare.Column, len(f.Candidates))
	for i, c := range f.Candidates {
		columns[i] = compare.Column{Name: c.Name, Rule: c.Rule, Cut: c.Cut}
	}
	return compare.New(columns, r.chosen(), compare.Options{Assumptions: f.Assumptions, BaseRateChanged: f.BaseRateChanged(), LowerIsRiskier: f.Data.LowerIsRiskier})
}

// refresh brings the strip up to date with the file and the selection.
func (r *Review) refresh() {
	r.strip.SetTable(r.table())
	r.strip.SetSelected(r.selected)
	r.resize()
}

// Init starts nothing: the file is read before the screen opens.
func (r Review) Init() tea.Cmd { return nil }

// Update handles a message.
func (r Review) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	switch msg := msg.(type) {
	case tea.WindowSizeMsg:
		r.ctx.width, r.ctx.height = msg.Width, msg.Height
		r.resize()
		return r, nil
	case reviewWrittenMsg:
		r.changed, r.written = false, true
		c := r.file.Candidates[r.chosen()]
		r.status = fmt.Sprintf("written to %s · chosen %s", msg.path, c.Name)
		if r.quitting {
			return r, tea.Quit
		}
		return r, nil
	case reviewWriteFailedMsg:
		if errors.Is(msg.err, decision.ErrDifferentData) || errors.Is(msg.err, decision.ErrNotDecisionFile) {
			r.reason = msg.err.Error()
			r.overlays = append(r.overlays, reviewReplace)
			return r, nil
		}
		r.quitting = false // stay, so that the reason can be read
		r.status = "not written: " + msg.err.Error()
		return r, nil
	case tea.KeyMsg:
		// Esc and a key pressed soon after can arrive as one alt key; no
		// alt key is bound, so take them as the two keys they were.
		if msg.Alt && !msg.Paste {
			return escThen(r, msg)
		}
		if len(r.overlays) > 0 {
			return r.overlayKey(msg)
		}
		return r.key(msg)
	}
	return r, nil
}

func (r Review) key(msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	k := r.keys
	switch {
	case key.Matches(msg, k.Quit):
		if r.changed {
			r.overlays = append(r.overlays, reviewQuit)
			return r, nil
		}
		return r, tea.Quit
	case key.Matches(msg, k.Help):
		r.overlays = append(r.overlays, reviewHelp)
	case key.Matches(msg, k.Left):
		r.selected = max(r.selected-1, 0)
		r.refresh()
	case key.Matches(msg, k.Right):
		r.selected = min(r.selected+1, len(r.file.Candidates)-1)
		r.refresh()
	case key.Matches(msg, k.Choose):
		name := r.file.Candidates[r.selected].Name
		if name == r.file.Chosen {
			r.status = name + " is already the chosen one"
			break
		}
		r.file.Chosen = name
		r.changed = true
		r.status = "chosen: " + name + " (not written yet: w writes)"
		r.refresh()
	case key.Matches(msg, k.Note):
		r.editNote(r.selected)
	case key.Matches(msg, k.FileNote):
		r.editNote(-1)
	case key.Matches(msg, k.Write):
		return r, r.write(false)
	}
	return r, nil
}

// editNote opens the note box for candidate i, or for the file when i < 0.
func (r *Review) editNote(i int) {
	r.noteFor = i
	if i < 0 {
		r.note.SetValue(r.file.Note)
	} else {
		r.note.SetValue(r.file.Candidates[i].Note)
	}
	r.note.Focus()
	r.overlays = append(r.overlays, reviewNote)
}

func (r Review) overlayKey(msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	k := r.keys
	top := r.overlays[len(r.overlays)-1]
	pop := func() { r.overlays = r.overlays[:len(r.overlays)-1] }
	switch top {
	case reviewHelp:
		if key.Matches(msg, k.Help) || key.Matches(msg, k.Cancel) || key.Matches(msg, k.Quit) {
			pop()
		}
	case reviewNote:
		switch {
		case key.Matches(msg, k.Cancel):
			pop()
			r.note.Blur()
		case key.Matches(msg, k.Accept):
			pop()
			r.note.Blur()
			text := strings.Join(strings.Fields(r.note.Value()), " ")
			if r.noteFor < 0 {
				r.changed = r.changed || text != r.file.Note
				r.file.Note = text
				r.status = "file note set (not written yet: w writes)"
			} else {
				c := &r.file.Candidates[r.noteFor]
				r.changed = r.changed || text != c.Note
				c.Note = text
				r.status = "note on " + c.Name + " set (not written yet: w writes)"
			}
		default:
			r.note, _ = r.note.Update(msg)
		}
	case reviewQuit:
		switch {
		case key.Matches(msg, k.Write):
			pop()
			r.quitting = true
			return r, r.write(false)
		case key.Matches(msg, k.Quit):
			return r, tea.Quit
		case key.Matches(msg, k.Cancel):
			pop()
		}
	case reviewReplace:
		switch {
		case key.Matches(msg, k.Yes):
			pop()
			return r, r.write(true)
		case key.Matches(msg, k.No):
			pop()
			r.quitting = false
			r.status = "not written: " + r.path + " kept as it was"
		}
	}
	return r, nil
}

// write saves the file as it stands; force replaces a file made from
// other data.
func (r Review) write(force bool) tea.Cmd {
	f := *r.file
	f.Candidates = append([]decision.Candidate(nil), r.file.Candidates...)
	path, shown := r.saveTo, r.path
	return func() tea.Msg {
		if err := decision.Write(path, &f, force); err != nil {
			return reviewWriteFailedMsg{err}
		}
		return reviewWrittenMsg{shown}
	}
}

// Minimum terminal size of the review screen; below it only a notice.
const (
	reviewMinWidth  = 60
	reviewMinHeight = 16
)

// reviewLayout holds each part's rectangle, borders included.
type reviewLayout struct {
	tooSmall bool
	header   rect // two lines: the file and the assumptions
	strip    rect
	notes    rect
	footer   rect
}

// notesLines is the content of the notes pane: the selected candidate's
// note, the file's note and the chosen cut's rule.
const notesLines = 3

// layoutReview places the parts in a width×height terminal: the header on
// top, the strip with every figure it has room for (stripLines of content
// at most), the notes pane in the rest and the key hints at the bottom.
// The notes pane gets at least notesLines of content; the strip gives way
// first, dropping detail rows.
func layoutReview(width, height, stripLines int, frame frameSize) reviewLayout {
	if width < reviewMinWidth || height < reviewMinHeight {
		return reviewLayout{tooSmall: true}
	}
	body := height - 2 - 1
	stripH := min(body-(notesLines+frame.H), stripLines+frame.H)
	return reviewLayout{
		header: rect{0, 0, width, 2},
		strip:  rect{0, 2, width, stripH},
		notes:  rect{0, 2 + stripH, width, body - stripH},
		footer: rect{0, height - 1, width, 1},
	}
}

func (r *Review) screen() reviewLayout {
	st := r.ctx.styles
	return layoutReview(r.ctx.width, r.ctx.height, r.strip.Lines(), frameSize{W: st.Pane.GetHorizontalFrameSize(), H: st.Pane.GetVerticalFrameSize()})
}

func (r *Review) resize() {
	if l := r.screen(); !l.tooSmall {
		r.strip.SetSize(l.strip.W, l.strip.H)
	}
}

// View draws the screen at exactly the terminal's size.
func (r Review) View() string {
	w, h := r.ctx.width, r.ctx.height
	if w <= 0 || h <= 0 {
		return ""
	}
	l := r.screen()
	if l.tooSmall {
		notice := fmt.Sprintf("sill review needs a terminal of at least %d×%d;\nthis one is %d×%d.\nEnlarge it, or press q to quit.", reviewMinWidth, reviewMinHeight, w, h)
		return lipgloss.Place(w, h, lipgloss.Center, lipgloss.Center, notice)
	}
	frame := strings.Join([]string{r.header(w), r.strip.View(true), r.notesView(l.notes), r.footer(w)}, "\n")
	if len(r.overlays) > 0 {
		frame = drawOver(frame, r.overlayView(), w, h)
	}
	return fit(frame, w, h)
}

// header is two lines: the file and its data, then the assumptions.
func (r Review) header(width int) string {
	st, f := r.ctx.styles, r.file
	d, a := f.Data, f.Assumptions
	left := "sill review · " + r.path
	if r.changed {
		left += " (changed)"
	}
	right := fmt.Sprintf("chosen on %s · %s rows · %s true", d.Path, report.Count(float64(d.Rows)), report.Count(d.Positives))
	rightW := max(min(ansi.StringWidth(right), width-ansi.StringWidth(left)-2), width/3)
	first := st.Header.Render(fitLine(left, width-rightW-2)) + "  " + st.Muted.Render(fitLine(right, rightW))
	parts := []string{"base rate " + report.Percent(a.BaseRate)}
	if total := d.Positives + d.Negatives; total > 0 && f.BaseRateChanged() {
		parts[0] += " (validation " + report.Percent(d.Positives/total) + ")"
	}
	if a.Volume > 0 {
		parts = append(parts, report.Count(a.Volume)+" per shift")
	}
	if a.Capacity > 0 {
		parts = append(parts, "capacity "+report.Count(a.Capacity))
	}
	if c := a.Costs; c != nil {
		parts = append(parts, fmt.Sprintf("costs: wrong alert %s · miss %s · hit %s", report.Money(c.FalseAlert), report.Money(c.Miss), report.Money(c.Hit)))
	}
	parts = append(parts, fmt.Sprintf("%g%% intervals", 100*a.Confidence))
	return first + "\n" + st.Muted.Render(fitLine(strings.Join(parts, " · "), width))
}

// notesView is the pane under the strip: the selected candidate's note,
// the file's note and the chosen cut as deployment reads it.
func (r Review) notesView(at rect) string {
	st := r.ctx.styles
	f := r.file
	selected := f.Candidates[r.selected]
	chosen := f.Candidates[r.chosen()]
	sign := ">="
	if f.Data.LowerIsRiskier {
		sign = "<="
	}
	innerW := at.W - st.Pane.GetHorizontalFrameSize()
	// note wraps a labelled note to the pane's width.
	note := func(label, text string) []string {
		if text == "" {
			return []string{st.Label.Render(label) + st.Muted.Render("none")}
		}
		wrapped := wrapWords(label+text, innerW)
		wrapped[0] = st.Label.Render(label) + strings.TrimPrefix(wrapped[0], label)
		return wrapped
	}
	deploy := st.Muted.Render(fmt.Sprintf("deployment reads: flag a case when its score %s %s (%s) · file written %s by sill %s",
		sign, report.Score(chosen.Cut.Score), chosen.Name, f.Created.UTC().Format("2006-01-02 15:04"), f.ToolVersion))
	lines := append(note("note on "+selected.Name+": ", selected.Note), note("file note: ", f.Note)...)
	innerH := at.H - st.Pane.GetVerticalFrameSize()
	if len(lines) >= innerH {
		// Mark the cut, so that a note cut short does not read as whole.
		lines = lines[:max(innerH-1, 0)]
		if n := len(lines); n > 0 {
			lines[n-1] = ansi.Truncate(lines[n-1], max(innerW-2, 1), "…") + " …"
		}
	}
	lines = append(lines, deploy)
	return framed(st.Pane, st.PaneEdge, st.Title, "notes", strings.Join(lines, "\n"), at.W, at.H)
}

// footer is the status, then the keys in a few words each, the most
// used first.
func (r Review) footer(width int) string {
	st, k := r.ctx.styles, r.keys
	hints := []struct {
		b    key.Binding
		what string
	}{{k.Left, "select"}, {k.Choose, "choose"}, {k.Write, "write"}, {k.Note, "note"}, {k.FileNote, "file note"}, {k.Help, "all keys"}, {k.Quit, "quit"}}
	var parts []string
	for _, h := range hints {
		name := h.b.Help().Key
		if h.b.Help().Key == k.Left.Help().Key {
			name = "←→"
		}
		parts = append(parts, st.Key.Render(name)+" "+st.Footer.Render(h.what))
	}
	separator := st.Footer.Render(" · ")
	// The way to every key and the way out always show: the other hints
	// drop from the end while they do not fit, and a long status is cut.
	tail := parts[len(parts)-2] + separator + parts[len(parts)-1]
	parts = parts[:len(parts)-2]
	lead := ""
	if r.status != "" {
		bar := st.Footer.Render("  │ ")
		lead = st.Status.Render(fitStatus(r.status, width-ansi.StringWidth(bar)-ansi.StringWidth(tail))) + bar
	}
	for len(parts) > 0 && ansi.StringWidth(lead)+ansi.StringWidth(strings.Join(parts, separator))+ansi.StringWidth(separator+tail) > width {
		parts = parts[:len(parts)-1]
	}
	return fitLine(lead+strings.Join(append(parts, tail), separator), width)
}

// overlayView draws the top overlay.
func (r Review) overlayView() string {
	st, k := r.ctx.styles, r.keys
	switch r.overlays[len(r.overlays)-1] {
	case reviewHelp:
		var lines []string
		for _, b := range []key.Binding{k.Left, k.Right, k.Choose, k.Note, k.FileNote, k.Write, k.Help, k.Quit} {
			lines = append(lines, st.Key.Render(pad(b.Help().Key, 6, false))+"  "+b.Help().Desc)
		}
		lines = append(lines, "", st.Muted.Render("the figures are the file's evidence and do not change;"),
			st.Muted.Render("only the choice and the notes are written back"), st.Muted.Render("? or esc closes"),
			"", st.Warning.Render(evidence.ShortCaution))
		return overlayBox(r.ctx, "review keys", strings.Join(lines, "\n"))
	case reviewNote:
		title := "note on the file"
		if r.noteFor >= 0 {
			title = "note on " + r.file.Candidates[r.noteFor].Name
		}
		width := min(64, max(r.ctx.width-8, 20))
		return overlayBox(r.ctx, title, strings.Join([]string{
			noteLine(r.note, width),
			st.Muted.Render(fmt.Sprintf("%d of %d characters", len([]rune(r.note.Value())), noteLimit)),
			st.Muted.Render("enter keeps the note · esc leaves it as it was · ctrl+u clears"),
		}, "\n"))
	case reviewQuit:
		return overlayBox(r.ctx, "changes not written", strings.Join([]string{
			"The choice or the notes changed since " + r.path + " was written.",
			st.Key.Render("w") + " writes and quits · " + st.Key.Render("q") + " quits without writing · " + st.Key.Render("esc") + " stays",
		}, "\n"))
	case reviewReplace:
		lines := []string{st.Warning.Render(r.path + " on disk is no longer this decision's file.")}
		for _, l := range wrapWords(r.reason, 60) {
			lines = append(lines, st.Muted.Render(l))
		}
		lines = append(lines, "", "Replace it? "+st.Key.Render("y")+" replaces · "+st.Key.Render("n")+"/esc keeps it")
		return overlayBox(r.ctx, "replace "+r.path+"?", strings.Join(lines, "\n"))
	}
	return ""
}

// noteLine draws the note field in width columns, keeping the cursor in
// view: a long note shows its end, with … where the start is cut.
func noteLine(f textField, width int) string {
	text := f.View()
	if ansi.StringWidth(text) <= width {
		return fitLine(text, width)
	}
	runes := []rune(text)
	cursorAt := f.cursor
	start := max(0, cursorAt-width+2)
	end := min(len(runes), start+width-1)
	return fitLine("…"+string(runes[start:end]), width)
}
