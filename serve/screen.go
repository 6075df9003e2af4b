package serve

import (
	"context"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/ssh"
	bm "github.com/charmbracelet/wish/bubbletea"
	"github.com/charmbracelet/x/ansi"
	"github.com/muesli/termenv"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/tui"
)

// screen runs the review screen (several files: the picker first) in the
// session's terminal, with the client's colours, until the client quits
// or the connection closes.
func (s *Server) screen(sess ssh.Session, who user, rec *record) {
	rec.note("screen")
	handler := func(sess ssh.Session) *tea.Program {
		renderer := newRenderer(sess)
		styles := tui.DefaultStyles(renderer)
		model := newPicker(s, &styles, rec, who)
		model.ctx = sess.Context()
		return tea.NewProgram(model, tea.WithInput(idleReader{r: sess, touch: func() { rec.touch(s.cfg.IdleTimeout) }}),
			tea.WithOutput(sess), tea.WithAltScreen(), tea.WithoutSignalHandler(), tea.WithContext(sess.Context()),
			tea.WithEnvironment(sess.Environ()))
	}
	// The minimum colour profile is ASCII: the client's own is never
	// forced up.
	bm.MiddlewareWithProgramHandler(handler, termenv.Ascii)(func(ssh.Session) {})(sess)
}

// newRenderer returns the renderer of the client's terminal: its colours
// follow the client's TERM and COLORTERM, and none with NO_COLOR set or a
// dumb terminal. Unlike wish's own, it asks the terminal nothing (a
// client that does not answer would hold the screen until a keystroke,
// and lose that keystroke).
func newRenderer(sess ssh.Session) *lipgloss.Renderer {
	env := environ(sess.Environ())
	pty, _, _ := sess.Pty()
	if pty.Term == "" || pty.Term == "dumb" || env.Getenv("NO_COLOR") != "" {
		return lipgloss.NewRenderer(sess, termenv.WithProfile(termenv.Ascii))
	}
	env = append(env, "TERM="+pty.Term)
	return lipgloss.NewRenderer(sess, termenv.WithEnvironment(env), termenv.WithUnsafe(), termenv.WithColorCache(true))
}

// environ is the client's environment, as the session took it.
type environ []string

func (e environ) Environ() []string { return e }

// Getenv returns the value of the last name=value in e.
func (e environ) Getenv(name string) string {
	value := ""
	for _, v := range e {
		if n, val, ok := strings.Cut(v, "="); ok && n == name {
			value = val
		}
	}
	return value
}

// idleReader is the session's input: each keystroke puts off the idle
// timeout.
type idleReader struct {
	r     io.Reader
	touch func()
}

func (r idleReader) Read(p []byte) (int, error) {
	n, err := r.r.Read(p)
	if n > 0 {
		r.touch()
	}
	return n, err
}

// pickerKeys are the picker's keys.
type pickerKeys struct {
	Up, Down, Open, Quit key.Binding
}

func newPickerKeys() pickerKeys {
	return pickerKeys{
		Up:   key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/k", "up")),
		Down: key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↓/j", "down")),
		Open: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "open")),
		Quit: key.NewBinding(key.WithKeys("q", "ctrl+c"), key.WithHelp("q", "quit")),
	}
}

// backMsg says the review screen quit: back to the picker.
type backMsg struct{}

// picker lists the files served and opens the review screen of one; with
// one file it opens it at once and quitting the review ends the session.
type picker struct {
	s      *Server
	styles *tui.Styles
	rec    *record
	who    user
	keys   pickerKeys

	width, height int
	cursor        int
	status        string
	review        *tui.Review // the open review screen, or nil
	explorer      *tui.Model  // the open explorer, or nil
	ctx           context.Context
}

func newPicker(s *Server, styles *tui.Styles, rec *record, who user) picker {
	return picker{s: s, styles: styles, rec: rec, who: who, keys: newPickerKeys()}
}

func (p picker) single() bool { return len(p.s.cfg.Files) == 1 && p.s.cfg.Explore == nil }

// entries is the number of lines of the list: the files, then the
// explorer when there is one.
func (p picker) entries() int {
	if p.s.cfg.Explore != nil {
		return len(p.s.cfg.Files) + 1
	}
	return len(p.s.cfg.Files)
}

// Init opens the only file at once.
func (p picker) Init() tea.Cmd {
	if p.single() {
		return func() tea.Msg { return openMsg{0} }
	}
	return nil
}

// openMsg asks for file i's review screen.
type openMsg struct{ i int }

// Update handles a message.
func (p picker) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	if size, ok := msg.(tea.WindowSizeMsg); ok {
		p.width, p.height = size.Width, size.Height
	}
	switch msg := msg.(type) {
	case openMsg:
		return p.open(msg.i)
	case backMsg:
		p.review, p.explorer = nil, nil
		if p.single() {
			return p, tea.Quit
		}
		return p, nil
	}
	if p.explorer != nil {
		next, cmd := p.explorer.Update(msg)
		m := next.(tui.Model)
		p.explorer = &m
		return p, back(cmd)
	}
	if p.review != nil {
		before := len(p.review.File().SignOffs)
		next, cmd := p.review.Update(msg)
		r := next.(tui.Review)
		p.review = &r
		if signOffs := r.File().SignOffs; len(signOffs) > before {
			last := signOffs[len(signOffs)-1]
			p.rec.note(fmt.Sprintf("signed %s on the screen: %s", filepath.Base(p.s.cfg.Files[p.cursor]), last.Verdict))
		}
		return p, back(cmd)
	}
	if k, ok := msg.(tea.KeyMsg); ok {
		switch {
		case key.Matches(k, p.keys.Quit):
			return p, tea.Quit
		case key.Matches(k, p.keys.Up):
			p.cursor = max(p.cursor-1, 0)
		case key.Matches(k, p.keys.Down):
			p.cursor = min(p.cursor+1, p.entries()-1)
		case key.Matches(k, p.keys.Open):
			return p.open(p.cursor)
		}
	}
	return p, nil
}

// open reads file i as it is now and opens its review screen, read-only.
func (p picker) open(i int) (tea.Model, tea.Cmd) {
	p.cursor = i
	if i == len(p.s.cfg.Files) {
		return p.explore()
	}
	path := p.s.cfg.Files[i]
	name := filepath.Base(path)
	f, err := decision.ReadFile(path)
	if err != nil {
		p.status = p.s.hidePath(err, i).Error()
		if p.single() {
			return p, tea.Sequence(tea.Printf("sill serve: %s", format.Printable(p.status)), tea.Quit)
		}
		return p, nil
	}
	p.rec.note("review screen " + name)
	safeFile(f)
	// Read-only: only a sign-off by the key's name is written, through
	// the file's lock (decision.AppendSignOff).
	r := tui.NewReview(tui.ReviewConfig{File: f, Path: path, Shown: name, Styles: p.styles, ReadOnly: true,
		Signer: &tui.Signer{Name: p.who.name, Key: p.who.key}, Context: p.ctx})
	next, _ := r.Update(tea.WindowSizeMsg{Width: p.width, Height: p.height})
	r = next.(tui.Review)
	p.review = &r
	return p, nil
}

// explore opens this connection's own explorer on the shared set, with
// its write key off.
func (p picker) explore() (tea.Model, tea.Cmd) {
	cfg := p.s.cfg.Explore.Config
	cfg.Styles, cfg.Context, cfg.ReadOnly, cfg.Out = p.styles, p.ctx, true, ""
	p.rec.note("explorer " + p.s.cfg.Explore.Name)
	m := tui.New(cfg)
	next, _ := m.Update(tea.WindowSizeMsg{Width: p.width, Height: p.height})
	m = next.(tui.Model)
	p.explorer = &m
	return p, m.Init()
}

// back turns the review screen's quit into a return to the picker.
func back(cmd tea.Cmd) tea.Cmd {
	if cmd == nil {
		return nil
	}
	return func() tea.Msg {
		switch msg := cmd().(type) {
		case tea.QuitMsg:
			return backMsg{}
		case tea.BatchMsg:
			cmds := make([]tea.Cmd, len(msg))
			for i, c := range msg {
				cmds[i] = back(c)
			}
			return tea.BatchMsg(cmds)
		default:
			return msg
		}
	}
}

// View draws the open review screen, or the list of files.
func (p picker) View() string {
	if p.review != nil {
		return p.review.View()
	}
	if p.explorer != nil {
		return p.explorer.View()
	}
	w, h := p.width, p.height
	if w <= 0 || h <= 0 {
		return ""
	}
	st := p.styles
	lines := []string{st.Title.Render("sill serve · decision files"), ""}
	for i, path := range p.s.cfg.Files {
		mark := "  "
		line := fmt.Sprintf("%d  %s", i+1, format.Printable(filepath.Base(path)))
		if i == p.cursor {
			mark = "▸ "
			line = st.Selected.Render(line)
		}
		lines = append(lines, mark+line)
	}
	if e := p.s.cfg.Explore; e != nil {
		mark, line := "  ", fmt.Sprintf("%d  explore %s (yours alone; writes nothing)", len(p.s.cfg.Files)+1, format.Printable(e.Name))
		if p.cursor == len(p.s.cfg.Files) {
			mark, line = "▸ ", st.Selected.Render(line)
		}
		lines = append(lines, mark+line)
	}
	lines = append(lines, "")
	if p.status != "" {
		lines = append(lines, st.Warning.Render(format.Printable(p.status)), "")
	}
	var hints []string
	for _, b := range []key.Binding{p.keys.Up, p.keys.Down, p.keys.Open, p.keys.Quit} {
		hints = append(hints, st.Key.Render(b.Help().Key)+" "+st.Footer.Render(b.Help().Desc))
	}
	lines = append(lines, strings.Join(hints, " · "))
	for len(lines) < h {
		lines = append(lines, "")
	}
	lines = lines[:h]
	for i, line := range lines {
		if ansi.StringWidth(line) > w {
			line = ansi.Truncate(line, w, "…")
		}
		lines[i] = line + strings.Repeat(" ", max(w-ansi.StringWidth(line), 0))
	}
	return strings.Join(lines, "\n")
}
