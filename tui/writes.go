package tui

import (
	"errors"
	"fmt"
	"os"
	"strings"
	"sync"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/sharedfile"
)

// writeTracker counts a screen's writes in progress, so that the command
// can wait for them before the process exits: a write the exit cut short
// could leave its temporary file behind. It is shared by every copy of the
// screen's model.
type writeTracker struct {
	mu     sync.Mutex
	wg     sync.WaitGroup
	closed bool
}

// run runs write unless the screen has ended; then it returns ended.
func (w *writeTracker) run(write func() tea.Msg, ended tea.Msg) tea.Msg {
	w.mu.Lock()
	if w.closed {
		w.mu.Unlock()
		return ended
	}
	w.wg.Add(1)
	w.mu.Unlock()
	defer w.wg.Done()
	return write()
}

// wait starts no more writes and waits for those in progress.
func (w *writeTracker) wait() {
	w.mu.Lock()
	w.closed = true
	w.mu.Unlock()
	w.wg.Wait()
}

// errScreenEnded is the error of a write asked for as the screen ended.
var errScreenEnded = errors.New("the screen ended before the write began")

// changedQuestion tells that path changed on disk since the screen read or
// last wrote it (err says when) and offers the screen's answers, each
// explained on the line choices.
func changedQuestion[H any](ctx *shared, path string, err error, choices string, answers []answer[H]) *question[H] {
	st := ctx.styles
	when := err.Error()
	var changed *sharedfile.ChangedError
	if errors.As(err, &changed) {
		when = "It was removed since."
		if changed.Now.Exists {
			when = "It was written at " + changed.Now.ModTime.Local().Format("15:04:05") + " by another program or session."
		}
	}
	lines := []string{st.Warning.Render(path + " changed on disk since this screen read or wrote it.")}
	for _, l := range wrapWords(when, 60) {
		lines = append(lines, st.Muted.Render(l))
	}
	lines = append(lines, "", choices)
	return &question[H]{ctx: ctx, title: path + " changed", body: strings.Join(lines, "\n"), answers: answers}
}

// writeToBox asks for another file to write to, starting from path; take
// receives a path that can be a file (not empty, not a folder), then write
// runs.
func writeToBox[H any](ctx *shared, path string, take func(H, string), write func(H) tea.Cmd) *textBox[H] {
	box := newTextBox(ctx, "write to another file", path, 400, func(host H, text string) error {
		text = strings.TrimSpace(text)
		if text == "" {
			return errors.New("expected a file name")
		}
		if info, err := os.Stat(text); err == nil && info.IsDir() {
			return fmt.Errorf("%s is a folder, expected a file name", text)
		}
		take(host, text)
		return nil
	})
	box.then = write
	box.label = "file: "
	box.notes = []string{"enter writes there · esc writes nothing"}
	box.enter, box.esc = "write", "write nothing"
	return box
}

// WriteErr returns why the last write asked for did not happen, or nil
// when it did or none was asked for.
func (m Model) WriteErr() error { return m.writeErr }

// WaitForWrites starts no more writes and waits for the one in progress,
// so that the process does not exit in the middle of it.
func (m Model) WaitForWrites() { m.writes.wait() }

// changedQuestion offers what to do when the decision file changed on
// disk since the explorer found it or last wrote it: replace it anyway,
// write to another file, or keep it.
func (m *Model) changedQuestion(err error) *question[*Model] {
	k, st, path := m.ctx.keys, m.ctx.styles, m.cfg.Out
	choices := st.Key.Render("y") + " replaces it with this decision · " + st.Key.Render("o") + " writes to another file · " + st.Key.Render("n") + "/esc keeps it"
	return changedQuestion(m.ctx, path, err, choices, []answer[*Model]{
		{key: k.Yes, what: "replace it", do: func(m *Model) tea.Cmd { m.outStamp = nil; return m.write(false) }},
		{key: k.WriteElsewhere, what: "write elsewhere", do: func(m *Model) tea.Cmd {
			m.push(writeToBox(m.ctx, path,
				func(m *Model, path string) {
					m.cfg.Out = path
					m.outStamp = nil
					if stamp, err := sharedfile.StampOf(path); err == nil {
						m.outStamp = &stamp
					}
				},
				func(m *Model) tea.Cmd { return m.write(false) }))
			return nil
		}},
		{key: k.No, what: "keep it", do: func(m *Model) tea.Cmd { m.status = "not written: " + path + " kept as it was"; return nil }},
	})
}

// quitQuestion asks before quitting with n pinned candidates (or the
// assumptions they were pinned under) not written: y quits, n or esc
// stays.
func (m *Model) quitQuestion(n int) *question[*Model] {
	st, k := m.ctx.styles, m.ctx.keys
	what := "The pinned candidate is not written; quitting now drops it."
	if n > 1 {
		what = fmt.Sprintf("The %d pinned candidates are not written; quitting now drops them.", n)
	}
	if m.written != "" {
		what = fmt.Sprintf("The pins or the assumptions changed since %s was written; quitting now drops the changes.", m.written)
	}
	lines := wrapWords(what, 60)
	lines = append(lines, "", "Quit anyway? "+st.Key.Render("y")+" quits · "+st.Key.Render("n")+"/esc stays ("+st.Key.Render("w")+" then writes to "+m.cfg.Out+")")
	return &question[*Model]{ctx: m.ctx, title: "pins not written", body: strings.Join(lines, "\n"), answers: []answer[*Model]{
		{key: k.Yes, what: "quit", do: func(m *Model) tea.Cmd { m.stopResampling(); return tea.Quit }},
		{key: k.No, what: "stay"},
	}}
}

// Path returns the file the screen writes to: the one it opened, or the
// one it was last told to write to instead.
func (r Review) Path() string { return r.path }
