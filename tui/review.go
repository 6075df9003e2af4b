package tui

import (
	"context"
	"errors"
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/sill-tool/sill/internal/compare"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/review"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// ReviewConfig is what the review screen needs from the command line.
type ReviewConfig struct {
	File *decision.File // as read; the screen works on a copy
	Path string         // where it was read from, and where w writes it
	// Stamp is the file as read (decision.ReadFileStamped): w writes only
	// while the file is still that, so as never to undo another's write.
	Stamp sharedfile.Stamp
	// Context ends a write in progress when it is cancelled; nil means
	// context.Background().
	Context context.Context
	// Styles and Keys; zero values take PlainStyles and DefaultKeyMap.
	Styles *Styles
	Keys   *KeyMap
	// Against, when not nil, is the decision in production, read from
	// AgainstPath: the screen shows what changes with File.
	Against     *decision.File
	AgainstPath string
	// ReadOnly turns off every key that changes the file (c, n, N, w), for
	// a screen served to others (sill serve): only a sign-off (S) is
	// written.
	ReadOnly bool
	// Signer, when not nil, is who signs: the sign-off form's name is
	// fixed to Signer.Name and each sign-off carries Signer.Key (sill
	// serve: the SSH key's comment and fingerprint).
	Signer *Signer
	// Shown, when not "", is the name the screen shows for Path (sill
	// serve shows the base name, not the server's folders).
	Shown string
}

// Signer is who signs off on a screen served over SSH.
type Signer struct {
	Name string // the key's comment in authorized_keys
	Key  string // the key's SHA256 fingerprint, as ssh-keygen -l prints it
}

// Messages of the review screen, named for what happened.
type (
	// reviewWrittenMsg says the decision file was written, and what it
	// is now.
	reviewWrittenMsg struct {
		path     string
		stamp    sharedfile.Stamp
		signOffs []decision.SignOff // as written: the screen's and any given meanwhile
	}
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
	path     string           // as shown
	saveTo   string           // where w writes: path, except in tests
	stamp    sharedfile.Stamp // the file as read or last written here
	writeCtx context.Context
	writes   *writeTracker
	writeErr error // why the last write asked for did not happen; nil after one that did
	selected int

	strip    Strip
	overlays []overlay[*Review] // the top one last

	// against is the decision in production (ReviewConfig.Against), nil
	// without one.
	against     *decision.File
	againstPath string

	changed  bool // changes not written
	status   string
	written  bool
	quitting bool    // quit once the write asked for on the way out succeeds
	readOnly bool    // ReviewConfig.ReadOnly: nothing but sign-offs is written
	signer   *Signer // ReviewConfig.Signer: who signs, fixed; nil asks
}

// NewReview returns the review screen for cfg.
func NewReview(cfg ReviewConfig) Review {
	ctx := newShared(cfg.Styles, cfg.Keys)
	working := *cfg.File
	working.Candidates = append([]decision.Candidate(nil), cfg.File.Candidates...)
	r := Review{ctx: ctx, keys: newReviewKeys(ctx.keys), file: &working, path: cfg.Path, saveTo: cfg.Path, stamp: cfg.Stamp, writeCtx: cfg.Context, writes: &writeTracker{}}
	if cfg.Shown != "" {
		r.path = cfg.Shown
	}
	r.signer = cfg.Signer
	if cfg.ReadOnly {
		for _, b := range []*key.Binding{&r.keys.Choose, &r.keys.Write, &r.keys.Note, &r.keys.FileNote} {
			b.SetEnabled(false)
		}
		r.readOnly = true
	}
	ctx.keys = r.keys.KeyMap // the overlays read the same keys as the screen
	if r.writeCtx == nil {
		r.writeCtx = context.Background()
	}
	r.strip = NewStrip(ctx.styles, r.keys.KeyMap)
	r.strip.SetScrolling(true) // every figure keeps its interval: the lead has nothing else
	r.selected = r.chosen()
	r.against, r.againstPath = cfg.Against, cfg.AgainstPath
	r.keys.Against.SetEnabled(r.against != nil)
	r.keys.Chart.SetEnabled(len(r.file.Curve) > 0)
	r.status = upgradeNotice(r.file)
	if r.against != nil {
		r.status = "d shows what changes against " + r.againstPath + ", the cut in production"
	}
	r.refresh()
	return r
}

// File returns the decision as it stands on screen, written or not.
func (r Review) File() *decision.File { return r.file }

// Written reports whether the screen wrote the file.
func (r Review) Written() bool { return r.written }

// Changed reports whether there are changes not written.
func (r Review) Changed() bool { return r.changed }

// WriteErr returns why the last write asked for did not happen, or nil
// when it did or none was asked for.
func (r Review) WriteErr() error { return r.writeErr }

// WaitForWrites starts no more writes and waits for the one in progress,
// so that the process does not exit in the middle of it.
func (r Review) WaitForWrites() { r.writes.wait() }

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
		columns[i] = review.Column(c)
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
		r.changed, r.written, r.stamp, r.writeErr = false, true, msg.stamp, nil
		kept := len(msg.signOffs) - len(r.file.SignOffs)
		r.file.SignOffs, r.file.Format = msg.signOffs, decision.Format
		c := r.file.Candidates[r.chosen()]
		r.status = fmt.Sprintf("written to %s · chosen %s", msg.path, c.Name)
		if kept > 0 {
			r.status += fmt.Sprintf(" · kept %d sign-off(s) given meanwhile", kept)
		}
		if r.quitting {
			return r, tea.Quit
		}
		return r, nil
	case reviewSignedMsg:
		r.signed(msg)
		return r, nil
	case reviewSignFailedMsg:
		r.status = "not signed: " + msg.err.Error()
		return r, nil
	case reviewWriteFailedMsg:
		r.writeErr = msg.err
		if errors.Is(msg.err, sharedfile.ErrChanged) {
			r.quitting = false
			r.overlays = push(r.overlays, r.changedQuestion(msg.err))
			return r, nil
		}
		if errors.Is(msg.err, decision.ErrDifferentData) || errors.Is(msg.err, decision.ErrNotDecisionFile) {
			r.overlays = push(r.overlays, replaceQuestion(r.ctx, r.path, msg.err.Error(), r.path+" on disk is no longer this decision's file.",
				"Replace it?",
				func(r *Review) tea.Cmd { return r.write(true) },
				func(r *Review) tea.Cmd {
					r.quitting = false
					r.status = "not written: " + r.path + " kept as it was"
					return nil
				}))
			return r, nil
		}
		r.quitting = false // stay, so that the reason can be read
		r.status = "not written: " + msg.err.Error()
		return r, nil
	case tea.KeyMsg:
		if next, cmd, split := splitKeys(r, msg); split {
			return next, cmd
		}
		if len(r.overlays) > 0 {
			// ctrl+c quits from any overlay, note box included, as q
			// does without one.
			if key.Matches(msg, r.keys.Interrupt) {
				return r.quit()
			}
			return r, keyTop(&r.overlays, &r, msg)
		}
		return r.key(msg)
	}
	return r, nil
}

func (r Review) key(msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	k := r.keys
	switch {
	case key.Matches(msg, k.Quit):
		return r.quit()
	case key.Matches(msg, k.Help):
		r.overlays = push(r.overlays, &helpOverlay[*Review]{ctx: r.ctx, draw: r.helpView})
	case key.Matches(msg, k.Left):
		r.selected = max(r.selected-1, 0)
		r.refresh()
	case key.Matches(msg, k.Right):
		r.selected = min(r.selected+1, len(r.file.Candidates)-1)
		r.refresh()
	case key.Matches(msg, k.ScrollUp):
		r.strip.Scroll(-1)
	case key.Matches(msg, k.ScrollDown):
		r.strip.Scroll(1)
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
	case key.Matches(msg, k.Sign):
		if r.saveTo == "-" || r.saveTo == "" {
			r.status = "read from standard input: sign the file with sill review FILE"
			break
		}
		r.overlays = push(r.overlays, overlay[*Review](newSignForm(r.ctx, r.signer)))
	case key.Matches(msg, k.Chart):
		if o := newChartOverlay(r.ctx, r.file); o != nil {
			r.overlays = push(r.overlays, overlay[*Review](o))
		}
	case key.Matches(msg, k.Against):
		r.overlays = push(r.overlays, overlay[*Review](&helpOverlay[*Review]{ctx: r.ctx, draw: r.againstView}))
	}
	return r, nil
}

// editNote opens the note box for candidate i, or for the file when i < 0.
func (r *Review) editNote(i int) {
	title, text := "note on the file", r.file.Note
	if i >= 0 {
		title, text = "note on "+r.file.Candidates[i].Name, r.file.Candidates[i].Note
	}
	box := newTextBox(r.ctx, title, text, noteLimit, func(r *Review, text string) error { r.setNote(i, text); return nil })
	box.count = true
	box.notes = []string{"enter keeps the note · esc leaves it as it was · ctrl+u clears"}
	box.enter, box.esc = "keep the note", "leave it"
	r.overlays = push(r.overlays, box)
}

// setNote sets the note of candidate i, or of the file when i < 0, to
// text with its runs of white space made single spaces.
func (r *Review) setNote(i int, text string) {
	text = strings.Join(strings.Fields(text), " ")
	if i < 0 {
		r.changed = r.changed || text != r.file.Note
		r.file.Note = text
		r.status = "file note set (not written yet: w writes)"
		return
	}
	c := &r.file.Candidates[i]
	r.changed = r.changed || text != c.Note
	c.Note = text
	r.status = "note on " + c.Name + " set (not written yet: w writes)"
}

// quitTitle is the title of the question before quitting with changes
// not written.
const quitTitle = "changes not written"

// quit quits, after asking when there are changes not written; asked
// again while the question is open, it quits.
func (r Review) quit() (tea.Model, tea.Cmd) {
	if !r.changed {
		return r, tea.Quit
	}
	if n := len(r.overlays); n > 0 {
		if q, ok := r.overlays[n-1].(*question[*Review]); ok && q.title == quitTitle {
			return r, tea.Quit
		}
	}
	r.overlays = push(r.overlays, r.quitQuestion())
	return r, nil
}

// quitQuestion asks before quitting with changes not written.
func (r *Review) quitQuestion() *question[*Review] {
	st, k := r.ctx.styles, r.keys
	return &question[*Review]{ctx: r.ctx, title: quitTitle, body: strings.Join([]string{
		"The choice or the notes changed since " + r.path + " was written.",
		st.Key.Render("w") + " writes and quits · " + st.Key.Render("q") + " quits without writing · " + st.Key.Render("esc") + " stays",
	}, "\n"), answers: []answer[*Review]{
		{key: k.Write, what: "write and quit", do: func(r *Review) tea.Cmd { r.quitting = true; return r.write(false) }},
		{key: k.Quit, what: "quit without writing", do: func(*Review) tea.Cmd { return tea.Quit }},
		{key: k.Cancel, what: "stay"},
	}}
}

// write saves the file as it stands; force replaces a file made from
// other data.
func (r Review) write(force bool) tea.Cmd {
	f := *r.file
	f.Candidates = append([]decision.Candidate(nil), r.file.Candidates...)
	path, shown, ctx, expect, writes := r.saveTo, r.path, r.writeCtx, r.stamp, r.writes
	return func() tea.Msg {
		return writes.run(func() tea.Msg {
			// Sign-offs given meanwhile (sill review --sign, another
			// screen) are kept; any other change is refused.
			stamp, signOffs, err := decision.Rewrite(ctx, path, &f, expect, force)
			if err != nil {
				return reviewWriteFailedMsg{err}
			}
			return reviewWrittenMsg{path: shown, stamp: stamp, signOffs: signOffs}
		}, reviewWriteFailedMsg{errScreenEnded})
	}
}

// changedQuestion offers what to do when the file changed on disk since
// the screen read or wrote it: reload it, dropping the changes made here,
// or write them to another file.
func (r *Review) changedQuestion(err error) *question[*Review] {
	k, st := r.keys, r.ctx.styles
	choices := st.Key.Render("r") + " reloads it, dropping the changes here · " + st.Key.Render("o") + " writes them to another file · " + st.Key.Render("esc") + " keeps them on screen"
	return changedQuestion(r.ctx, r.path, err, choices, []answer[*Review]{
		{key: k.Reload, what: "reload", do: func(r *Review) tea.Cmd { r.reload(); return nil }},
		{key: k.WriteElsewhere, what: "write elsewhere", do: func(r *Review) tea.Cmd {
			r.overlays = push(r.overlays, writeToBox(r.ctx, r.path,
				func(r *Review, path string) {
					r.path, r.saveTo = path, path
					r.stamp, _ = sharedfile.StampOf(path) // what is there now may be replaced if it is this decision's kind
				},
				func(r *Review) tea.Cmd { return r.write(false) }))
			return nil
		}},
		{key: k.Cancel, what: "keep editing"},
	})
}

// reload reads the file again, dropping the changes made on screen.
func (r *Review) reload() {
	f, stamp, err := decision.ReadFileStamped(r.saveTo)
	if err != nil {
		r.status = "not reloaded: " + err.Error()
		return
	}
	r.file, r.stamp, r.changed, r.writeErr = f, stamp, false, nil
	r.selected = r.chosen()
	r.refresh()
	r.status = "reloaded " + r.path + "; the changes made here were dropped"
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

// notesLines is the content of the notes pane at the least: the selected
// candidate's note, the file's note and the chosen cut's rule.
const notesLines = 3

// notesRecordLines is the content of the notes pane when the strip can
// spare it: the record too (model and who chose, the ranking, the
// sign-offs), so that the sign-off hint shows. The strip keeps at least
// stripKeeps lines, borders included, before the notes grow.
const (
	notesRecordLines = 6
	stripKeeps       = 14
)

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
	notes := notesLines
	if body-(notesRecordLines+frame.H) >= stripKeeps {
		notes = notesRecordLines
	}
	stripH := min(body-(notes+frame.H), stripLines+frame.H)
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
		return tooSmallNotice("sill review", reviewMinWidth, reviewMinHeight, w, h, len(r.overlays) > 0)
	}
	frame := withFooter(strings.Join([]string{r.header(w), r.strip.View(true), r.notesView(l.notes)}, "\n"), r.footer())
	if n := len(r.overlays); n > 0 {
		frame = drawOver(frame, r.overlays[n-1].View(), w, h)
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
	right := fmt.Sprintf("chosen on %s · %s rows · %s true", d.Path, format.Count(float64(d.Rows)), format.Count(d.Positives))
	first := statusBar{r.ctx}.header(left, right, max(min(ansi.StringWidth(right), width-ansi.StringWidth(left)-2), width/3))
	parts := []string{"base rate " + format.Share(a.BaseRate)}
	if total := d.Positives + d.Negatives; total > 0 && f.BaseRateChanged() {
		parts[0] += " (validation " + format.Share(d.Positives/total) + ")"
	}
	if a.Volume > 0 {
		parts = append(parts, format.Count(a.Volume)+" per shift")
	}
	if a.Capacity > 0 {
		parts = append(parts, "capacity "+format.Count(a.Capacity))
	}
	if c := a.Costs; c != nil {
		parts = append(parts, fmt.Sprintf("costs: wrong alert %s, miss %s, hit %s", format.Money(c.FalseAlert), format.Money(c.Miss), format.Money(c.Hit)))
	}
	parts = append(parts, fmt.Sprintf("%g%% intervals", 100*a.Confidence))
	// Whole clauses only, so that no figure is cut inside ("miss 1…").
	return first + "\n" + st.Muted.Render(fitLine(fitStatus(strings.Join(parts, " · "), width), width))
}

// notesView is the pane under the strip: the selected candidate's note,
// the file's note and the chosen cut as deployment reads it.
func (r Review) notesView(at rect) string {
	st := r.ctx.styles
	f := r.file
	selected := f.Candidates[r.selected]
	chosen := f.Candidates[r.chosen()]
	sign := format.CutSign(f.Data.LowerIsRiskier)
	innerW := at.W - st.Pane.GetHorizontalFrameSize()
	// note wraps a labelled note to the pane's width.
	note := func(label, text string) []string {
		if text == "" {
			return []string{st.Label.Render(label) + st.Muted.Render("none")}
		}
		label, text = format.Printable(label), format.Printable(text) // notes and names from the file
		wrapped := wrapWords(label+text, innerW)
		wrapped[0] = st.Label.Render(label) + strings.TrimPrefix(wrapped[0], label)
		return wrapped
	}
	// The deployment line wraps at words where the pane has room, and
	// otherwise keeps its whole first clause, the cut as deployed.
	deployment := fmt.Sprintf("deployment reads: flag a case when its score %s %s (%s) · file written %s by %s",
		sign, format.Score(chosen.Cut.Score), format.Printable(chosen.Name), f.Created.UTC().Format("2006-01-02 15:04"), f.WrittenBy())
	deploy := wrapWords(deployment, innerW)
	lines := append(note("note on "+selected.Name+": ", selected.Note), note("file note: ", f.Note)...)
	lines = append(lines, r.recordLines(innerW)...)
	innerH := at.H - st.Pane.GetVerticalFrameSize()
	if promise := promiseLines(selected, innerW, st); len(lines)+len(promise)+len(deploy) <= innerH {
		// Where there is room: what the selected candidate's rule
		// promises, after its note.
		at := len(note("note on "+selected.Name+": ", selected.Note))
		lines = append(lines[:at], append(promise, lines[at:]...)...)
	}
	if len(deploy) > 1 && len(lines)+len(deploy) > innerH {
		deploy = []string{fitStatus(deployment, innerW)}
	}
	for i := range deploy {
		deploy[i] = st.Muted.Render(deploy[i])
	}
	if len(lines)+len(deploy) > innerH {
		// Mark the cut, so that a note cut short does not read as whole.
		lines = lines[:max(innerH-len(deploy), 0)]
		if n := len(lines); n > 0 {
			lines[n-1] = ansi.Truncate(lines[n-1], max(innerW-2, 1), "…") + " …"
		}
	}
	lines = append(lines, deploy...)
	return framed(st.Pane, st.PaneEdge, st.Title, "notes", strings.Join(lines, "\n"), at.W, at.H)
}

// promiseLines are what c's rule promises about production and, for the
// least-cost candidate, how much its projected cost understates its own
// cost (review.PromiseLines's words), wrapped to width; nil without
// either.
func promiseLines(c decision.Candidate, width int, st Styles) []string {
	var out []string
	for _, line := range [][2]string{{"promise: ", c.Promise}, {"least cost: ", review.OptimismLine(c)}} {
		label, text := line[0], line[1]
		if text == "" {
			continue
		}
		wrapped := wrapWords(label+format.Printable(text), width)
		wrapped[0] = st.Label.Render(label) + strings.TrimPrefix(wrapped[0], label)
		out = append(out, wrapped...)
	}
	return out
}

// footer is the status, then the keys in a few words each, the most
// used first.
func (r Review) footer() string {
	k := r.keys
	if n := len(r.overlays); n > 0 {
		// The overlay's keys only: the others go to it, and q may be
		// typed into a note.
		return statusBar{r.ctx}.footer(r.status, "", r.overlays[n-1].ShortHelp(), []key.Binding{hint(k.Interrupt, "", "quit")})
	}
	hints := r.strip.ShortHelp()
	if r.strip.Scrollable() {
		hints = append(hints[:1], append([]key.Binding{hint(k.ScrollDown, "↑↓", "more rows")}, hints[1:]...)...)
	}
	hints = append(hints, r.ShortHelp()...)
	return statusBar{r.ctx}.footer(r.status, "", hints, []key.Binding{hint(k.Help, "", "all keys"), hint(k.Quit, "", "quit")})
}

// ShortHelp lists the screen's own keys beside the strip's, in a few words
// each, for the footer.
func (r Review) ShortHelp() []key.Binding {
	k := r.keys
	return []key.Binding{hint(k.Write, "", "write"), hint(k.Note, "", "note"), hint(k.FileNote, "", "file note"),
		hint(k.Sign, "", "sign off"), hint(k.Chart, "", "chart"), hint(k.Against, "", "vs production")}
}

// FullHelp lists every key of the screen, for the help.
func (r Review) FullHelp() [][]key.Binding {
	k := r.keys
	return [][]key.Binding{{k.Left, k.Right, k.ScrollUp, k.ScrollDown, k.Choose, k.Note, k.FileNote, k.Write, k.Sign, k.Chart, k.Against, k.Help, k.Quit}}
}

// helpView draws every key of the screen in a box.
func (r Review) helpView() string {
	st := r.ctx.styles
	var lines []string
	for _, group := range r.FullHelp() {
		for _, b := range group {
			if !b.Enabled() {
				continue // d without --against, t without a stored curve
			}
			lines = append(lines, st.Key.Render(pad(b.Help().Key, 6, false))+"  "+b.Help().Desc)
		}
	}
	written := []string{"only the choice and the notes are written back;", "a sign-off is appended to the file at once"}
	if r.readOnly {
		written = []string{"a sign-off is appended to the file; nothing else is written"}
	}
	for i, w := range written {
		written[i] = st.Muted.Render(w)
	}
	lines = append(lines, "", st.Muted.Render("the figures are the file's evidence and do not change;"),
		strings.Join(written, "\n"), st.Muted.Render("? or esc closes"),
		"", st.Warning.Render(evidence.ShortCaution))
	return overlayBox(r.ctx, "review keys", strings.Join(lines, "\n"))
}
