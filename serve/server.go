// Package serve shows decision files to colleagues over SSH (sill serve):
// the review screen to a client with a terminal, the text review and a
// sign-off command to one without. Only keys listed in an OpenSSH
// authorized_keys file get in; there is no shell, no forwarding of any
// kind and no subsystem, and the only file ever written is a decision file
// named on the command line, by a sign-off, through internal/sharedfile.
package serve

import (
	"context"
	"errors"
	"fmt"
	"io"
	"net"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	charmlog "github.com/charmbracelet/log"
	"github.com/charmbracelet/ssh"
	gossh "golang.org/x/crypto/ssh"

	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/tui"
)

// Defaults of the command's flags.
const (
	DefaultListen      = "127.0.0.1:2222"
	DefaultIdleTimeout = 15 * time.Minute
	DefaultMaxSessions = 16
)

// Config is what the server serves and to whom.
type Config struct {
	Files          []string      // the decision files, as named on the command line; at least one
	AuthorizedKeys string        // the OpenSSH authorized_keys file: the keys let in, each comment the signer's name
	HostKey        gossh.Signer  // the server's own key (LoadHostKey)
	IdleTimeout    time.Duration // a connection with no input for this long is closed; 0 means DefaultIdleTimeout
	MaxSessions    int           // connections, and sessions, open at once; 0 means DefaultMaxSessions
	Log            io.Writer     // one line per connection; nil discards
	// Now gives the time of sign-offs and log lines; nil means time.Now.
	Now func() time.Time
	// Explore, when not nil, adds the explorer on a validation set to the
	// screen's list (--data).
	Explore *Explore
}

// Explore is the explorer served beside the decision files: each
// connection gets its own screen (cursor, pins, assumptions) on one set
// loaded once and only read, and the screen writes nothing.
type Explore struct {
	Name   string     // the set's base name, as the list shows it
	Config tui.Config // Load returns the set loaded once; Styles, Context and ReadOnly are set per connection
}

// Server is a configured server; Serve runs it.
type Server struct {
	cfg      Config
	keys     *keyList
	srv      *ssh.Server
	conns    atomic.Int64
	sessions chan struct{}
	logMu    sync.Mutex
}

// New checks cfg and returns its server.
func New(cfg Config) (*Server, error) {
	if len(cfg.Files) == 0 {
		return nil, errors.New("no decision file to serve")
	}
	if cfg.HostKey == nil {
		return nil, errors.New("no host key")
	}
	if cfg.IdleTimeout <= 0 {
		cfg.IdleTimeout = DefaultIdleTimeout
	}
	if cfg.MaxSessions <= 0 {
		cfg.MaxSessions = DefaultMaxSessions
	}
	if cfg.Log == nil {
		cfg.Log = io.Discard
	}
	if cfg.Now == nil {
		cfg.Now = time.Now
	}
	// wish's screen middleware logs a client that leaves abruptly on its
	// own logger; the server's log is one line per connection, so that
	// logger says nothing.
	charmlog.SetOutput(io.Discard)
	s := &Server{cfg: cfg, sessions: make(chan struct{}, cfg.MaxSessions)}
	s.keys = &keyList{path: cfg.AuthorizedKeys, warn: func(m string) { s.logf("warning: %s", format.Printable(m)) }}
	if _, err := readKeys(s.keys); err != nil {
		return nil, err
	}
	s.srv = &ssh.Server{
		Handler:                s.handle,
		PublicKeyHandler:       s.publicKey,
		ConnCallback:           s.connect,
		SessionRequestCallback: s.sessionRequest,
		// Every handler map is set, and empty but for what is named, so
		// that no default of the library adds forwarding or a subsystem.
		ChannelHandlers:   map[string]ssh.ChannelHandler{"session": s.sessionChannel, "default": s.refuseChannel},
		RequestHandlers:   map[string]ssh.RequestHandler{"default": s.refuseRequest},
		SubsystemHandlers: map[string]ssh.SubsystemHandler{},
		// Passwords and keyboard-interactive stay nil: not offered.
		// Port forwarding callbacks stay nil: refused.
	}
	s.srv.AddHostKey(cfg.HostKey)
	return s, nil
}

// readKeys reads the authorized_keys file once, so that a missing or
// unreadable file stops the server at start.
func readKeys(l *keyList) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	if err := l.refresh(); err != nil {
		return 0, err
	}
	return len(l.keys), nil
}

// Serve accepts connections on ln until Close.
func (s *Server) Serve(ln net.Listener) error {
	err := s.srv.Serve(ln)
	if errors.Is(err, ssh.ErrServerClosed) {
		return nil
	}
	return err
}

// Close closes the listener and every connection.
func (s *Server) Close() error { return s.srv.Close() }

// Fingerprint is the SHA256 fingerprint of a key, as ssh-keygen -l prints it.
func Fingerprint(key gossh.PublicKey) string { return gossh.FingerprintSHA256(key) }

// Loopback reports whether addr (host:port) listens on the loopback
// interface only: a loopback IP or "localhost". An empty host listens
// everywhere.
func Loopback(addr string) bool {
	host, _, err := net.SplitHostPort(addr)
	if err != nil {
		return false
	}
	if strings.EqualFold(host, "localhost") {
		return true
	}
	ip := net.ParseIP(host)
	return ip != nil && ip.IsLoopback()
}

// logf writes one line to the log.
func (s *Server) logf(f string, args ...any) {
	s.logMu.Lock()
	defer s.logMu.Unlock()
	fmt.Fprintf(s.cfg.Log, "%s %s\n", s.cfg.Now().UTC().Format(time.RFC3339), fmt.Sprintf(f, args...))
}

// record is what one connection did, for its log line.
type record struct {
	remote string
	idle   *time.Timer

	mu      sync.Mutex
	offered string // the fingerprint of the last key offered
	key     string // the fingerprint of the key let in, once a session runs
	done    []string
}

func (r *record) note(what string) {
	r.mu.Lock()
	defer r.mu.Unlock()
	if len(r.done) < 32 { // a client asking again and again makes no longer line
		r.done = append(r.done, what)
	}
}

// touch puts off the idle timeout: the client did something.
func (r *record) touch(timeout time.Duration) { r.idle.Reset(timeout) }

func (r *record) line() string {
	r.mu.Lock()
	defer r.mu.Unlock()
	key := r.key
	if key == "" {
		key = "-"
		if r.offered != "" {
			r.done = append([]string{"key " + r.offered + " not let in"}, r.done...)
		}
	}
	done := strings.Join(r.done, "; ")
	if done == "" {
		done = "nothing"
	}
	return fmt.Sprintf("%s %s %s", r.remote, key, done)
}

type recordKey struct{}

// recordOf returns the record of the connection of ctx; after
// authentication it names the key let in.
func recordOf(ctx context.Context) *record {
	r, _ := ctx.Value(recordKey{}).(*record)
	if r == nil {
		return &record{idle: time.NewTimer(time.Hour)}
	}
	if key, ok := ctx.Value(ssh.ContextKeyPublicKey).(gossh.PublicKey); ok && key != nil {
		r.mu.Lock()
		r.key = Fingerprint(key)
		r.mu.Unlock()
	}
	return r
}

// trackedConn logs its connection's line and frees its place once closed.
type trackedConn struct {
	net.Conn
	once    sync.Once
	onClose func()
}

func (c *trackedConn) Close() error {
	err := c.Conn.Close()
	c.once.Do(c.onClose)
	return err
}

// connect admits a connection when fewer than MaxSessions are open, and
// starts its idle timer: no input for IdleTimeout closes it, handshake
// included.
func (s *Server) connect(ctx ssh.Context, conn net.Conn) net.Conn {
	remote := conn.RemoteAddr().String()
	if n := s.conns.Add(1); n > int64(s.cfg.MaxSessions) {
		s.conns.Add(-1)
		s.logf("%s - refused: %d connections open already", remote, s.cfg.MaxSessions)
		return nil
	}
	rec := &record{remote: remote}
	rec.idle = time.AfterFunc(s.cfg.IdleTimeout, func() {
		rec.note(fmt.Sprintf("closed after %s without input", s.cfg.IdleTimeout))
		conn.Close()
	})
	ctx.SetValue(recordKey{}, rec)
	return &trackedConn{Conn: conn, onClose: func() {
		rec.idle.Stop()
		s.conns.Add(-1)
		s.logf("%s", rec.line())
	}}
}

// publicKey lets in the keys of the authorized_keys file as it is now.
func (s *Server) publicKey(ctx ssh.Context, key ssh.PublicKey) bool {
	rec := recordOf(ctx)
	rec.mu.Lock()
	rec.offered = Fingerprint(key)
	rec.mu.Unlock()
	_, ok := s.keys.lookup(key)
	return ok
}

// sessionRequest takes a shell (no command) or a command; a subsystem
// (sftp and the like) is refused.
func (s *Server) sessionRequest(sess ssh.Session, requestType string) bool {
	if requestType == "shell" || requestType == "exec" {
		return true
	}
	recordOf(sess.Context()).note("refused " + format.Printable(requestType) + " " + format.Printable(sess.Subsystem()))
	return false
}

// refuseChannel refuses every channel but a session: direct-tcpip
// (forwarding a local port), X11 and agent channels.
func (s *Server) refuseChannel(_ *ssh.Server, _ *gossh.ServerConn, ch gossh.NewChannel, ctx ssh.Context) {
	recordOf(ctx).note("refused channel " + format.Printable(ch.ChannelType()))
	_ = ch.Reject(gossh.Prohibited, "only sessions are served here")
}

// refuseRequest refuses every global request (tcpip-forward, that is a
// remote port forwarding, among them); keep-alives are not noted.
func (s *Server) refuseRequest(ctx ssh.Context, _ *ssh.Server, req *gossh.Request) (bool, []byte) {
	if !strings.HasPrefix(req.Type, "keepalive@") {
		recordOf(ctx).note("refused request " + format.Printable(req.Type))
	}
	return false, nil
}

// sessionChannel runs a session when fewer than MaxSessions run, with the
// agent and X11 requests refused and only a few variables of the
// environment taken.
func (s *Server) sessionChannel(srv *ssh.Server, conn *gossh.ServerConn, ch gossh.NewChannel, ctx ssh.Context) {
	select {
	case s.sessions <- struct{}{}:
		defer func() { <-s.sessions }()
	default:
		recordOf(ctx).note("refused a session: too many open")
		_ = ch.Reject(gossh.ResourceShortage, "too many sessions open")
		return
	}
	ssh.DefaultSessionHandler(srv, conn, filteredChannel{NewChannel: ch, rec: recordOf(ctx)}, ctx)
}

// allowedEnv are the client's variables a session takes: what the screen
// needs to draw in the client's terminal.
var allowedEnv = map[string]bool{"TERM": true, "COLORTERM": true, "NO_COLOR": true}

// filteredChannel is a session channel whose requests pass a filter
// before the library sees them.
type filteredChannel struct {
	gossh.NewChannel
	rec *record
}

func (c filteredChannel) Accept() (gossh.Channel, <-chan *gossh.Request, error) {
	ch, in, err := c.NewChannel.Accept()
	if err != nil {
		return ch, in, err
	}
	out := make(chan *gossh.Request)
	go func() {
		defer close(out)
		for req := range in {
			if refused, why := c.refuse(req); refused {
				if why != "" {
					c.rec.note(why)
				}
				if req.WantReply {
					_ = req.Reply(false, nil)
				}
				continue
			}
			out <- req
		}
	}()
	return ch, out, nil
}

// refuse says whether req is refused, and what to note of it.
func (c filteredChannel) refuse(req *gossh.Request) (bool, string) {
	switch req.Type {
	case "auth-agent-req@openssh.com":
		return true, "refused agent forwarding"
	case "x11-req":
		return true, "refused X11 forwarding"
	case "env":
		var kv struct{ Key, Value string }
		if err := gossh.Unmarshal(req.Payload, &kv); err != nil || !allowedEnv[kv.Key] {
			return true, ""
		}
	}
	return false, ""
}

// user is who a session runs for: the key's comment in authorized_keys
// and its fingerprint.
type user struct {
	name, key string
}

// handle runs a session: the screen for a terminal without a command, a
// command otherwise.
func (s *Server) handle(sess ssh.Session) {
	rec := recordOf(sess.Context())
	rec.touch(s.cfg.IdleTimeout)
	key := sess.PublicKey()
	if key == nil {
		rec.note("refused a session without a key")
		_ = sess.Exit(2)
		return
	}
	fingerprint := Fingerprint(key)
	rec.mu.Lock()
	rec.key = fingerprint
	rec.mu.Unlock()
	name, ok := s.keys.lookup(key)
	if !ok { // taken out of the file since the connection began
		rec.note("refused: key no longer in " + filepath.Base(s.cfg.AuthorizedKeys))
		fmt.Fprintln(sess.Stderr(), "sill serve: this key is no longer let in")
		_ = sess.Exit(2)
		return
	}
	who := user{name: name, key: fingerprint}
	if _, _, pty := sess.Pty(); pty && len(sess.Command()) == 0 {
		s.screen(sess, who, rec)
		return
	}
	code := s.command(sess, who, rec)
	_ = sess.Exit(code)
}
