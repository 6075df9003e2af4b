package serve

import (
	"bytes"
	"context"
	"crypto/ed25519"
	"crypto/rand"
	"encoding/pem"
	"errors"
	"fmt"
	"io"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	gossh "golang.org/x/crypto/ssh"
	"golang.org/x/crypto/ssh/agent"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/tui"
)

// lockedBuffer is the server's log, written from its goroutines.
type lockedBuffer struct {
	mu  sync.Mutex
	buf bytes.Buffer
}

func (b *lockedBuffer) Write(p []byte) (int, error) {
	b.mu.Lock()
	defer b.mu.Unlock()
	return b.buf.Write(p)
}

func (b *lockedBuffer) String() string {
	b.mu.Lock()
	defer b.mu.Unlock()
	return b.buf.String()
}

// clientKey is a client's key and the line that lets it in.
type clientKey struct {
	signer  gossh.Signer
	private ed25519.PrivateKey
	line    string
}

func newClientKey(t *testing.T, comment string) clientKey {
	t.Helper()
	_, private, err := ed25519.GenerateKey(rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	signer, err := gossh.NewSignerFromKey(private)
	if err != nil {
		t.Fatal(err)
	}
	line := strings.TrimSpace(string(gossh.MarshalAuthorizedKey(signer.PublicKey()))) + " " + comment + "\n"
	return clientKey{signer: signer, private: private, line: line}
}

// testServer is a server on 127.0.0.1 (a free port) serving copies of the
// demo decision file.
type testServer struct {
	addr     string
	hostKey  gossh.PublicKey
	files    []string
	keysPath string
	log      *lockedBuffer
	srv      *Server
}

type serverOptions struct {
	files       int
	keys        []clientKey
	idle        time.Duration
	maxSessions int
	note        string   // a note put in each file
	explore     *Explore // the explorer beside the files
}

// demoFile copies the demo decision file to dir as name, with note.
func demoFile(t *testing.T, dir, name, note string) string {
	t.Helper()
	f, err := decision.ReadFile(filepath.Join("..", "internal", "decision", "testdata", "v1", "demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	f.Note = note
	path := filepath.Join(dir, name)
	if _, err := decision.Write(context.Background(), path, f, decision.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	return path
}

func startServer(t *testing.T, o serverOptions) *testServer {
	t.Helper()
	dir := t.TempDir()
	if o.files == 0 {
		o.files = 1
	}
	ts := &testServer{log: &lockedBuffer{}, keysPath: filepath.Join(dir, "authorized_keys")}
	for i := range o.files {
		ts.files = append(ts.files, demoFile(t, dir, fmt.Sprintf("cut-%d.yaml", i+1), o.note))
	}
	var lines strings.Builder
	for _, k := range o.keys {
		lines.WriteString(k.line)
	}
	if err := os.WriteFile(ts.keysPath, []byte(lines.String()), 0o600); err != nil {
		t.Fatal(err)
	}
	host, _, err := LoadHostKey(context.Background(), filepath.Join(dir, "host", "key"))
	if err != nil {
		t.Fatal(err)
	}
	ts.hostKey = host.PublicKey()
	srv, err := New(Config{Files: ts.files, AuthorizedKeys: ts.keysPath, HostKey: host, IdleTimeout: o.idle, MaxSessions: o.maxSessions, Log: ts.log, Explore: o.explore})
	if err != nil {
		t.Fatal(err)
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	ts.addr, ts.srv = ln.Addr().String(), srv
	done := make(chan error, 1)
	go func() { done <- srv.Serve(ln) }()
	t.Cleanup(func() {
		srv.Close()
		select {
		case err := <-done:
			if err != nil {
				t.Errorf("serve: %v", err)
			}
		case <-time.After(5 * time.Second):
			t.Error("the server did not stop within 5s")
		}
	})
	return ts
}

func (ts *testServer) dial(auth ...gossh.AuthMethod) (*gossh.Client, error) {
	return gossh.Dial("tcp", ts.addr, &gossh.ClientConfig{User: "lead", Auth: auth, HostKeyCallback: gossh.FixedHostKey(ts.hostKey), Timeout: 5 * time.Second})
}

func (ts *testServer) client(t *testing.T, k clientKey) *gossh.Client {
	t.Helper()
	c, err := ts.dial(gossh.PublicKeys(k.signer))
	if err != nil {
		t.Fatalf("dial with an authorized key: %v", err)
	}
	t.Cleanup(func() { c.Close() })
	return c
}

// run runs command (none: a shell) without a terminal and returns its
// output and exit status.
func run(t *testing.T, c *gossh.Client, command string) (stdout, stderr string, status int) {
	t.Helper()
	sess, err := c.NewSession()
	if err != nil {
		t.Fatal(err)
	}
	defer sess.Close()
	var out, errOut bytes.Buffer
	sess.Stdout, sess.Stderr = &out, &errOut
	if command == "" {
		err = sess.Shell()
		if err == nil {
			err = sess.Wait()
		}
	} else {
		err = sess.Run(command)
	}
	var exit *gossh.ExitError
	switch {
	case err == nil:
	case errors.As(err, &exit):
		status = exit.ExitStatus()
	default:
		t.Fatalf("%q: %v", command, err)
	}
	return out.String(), errOut.String(), status
}

func TestTextWithoutTerminal(t *testing.T) {
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}, files: 2})
	c := ts.client(t, lead)
	out, _, status := run(t, c, "")
	if status != 0 || !strings.HasPrefix(out, "Review of cut-1.yaml: 3 candidates") {
		t.Errorf("a shell without a terminal: status %d, output starts %q; expected 0 and the text review of cut-1.yaml", status, firstLine(out))
	}
	if strings.Contains(out, ts.files[0]) {
		t.Errorf("the text review names the server's path %s", ts.files[0])
	}
	for command, want := range map[string]string{
		"review":                              "Review of cut-1.yaml",
		"review 2":                            "Review of cut-2.yaml",
		"review cut-2.yaml":                   "Review of cut-2.yaml",
		"review --format markdown cut-2.yaml": "# ",
	} {
		out, errOut, status := run(t, c, command)
		if status != 0 || !strings.Contains(firstLine(out), want) {
			t.Errorf("%q: status %d, first line %q, stderr %q; expected 0 and %q", command, status, firstLine(out), errOut, want)
		}
	}
	c.Close()
	waitFor(t, ts.log, Fingerprint(lead.signer.PublicKey())+" review cut-1.yaml (text); ")
}

func firstLine(s string) string {
	line, _, _ := strings.Cut(s, "\n")
	return line
}

func TestCommandsRefused(t *testing.T) {
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}})
	c := ts.client(t, lead)
	for _, command := range []string{
		"ls -la", "sh", "bash -c id", "cat /etc/passwd", "review /etc/passwd", "review ../cut-1.yaml", "review 0", "review 2",
		"review --format html", "review --output x", "review cut-1.yaml cut-1.yaml", "sign", "sign --verdict maybe",
		"sign --verdict approve /etc/passwd", "scp -t /tmp", "sftp", "explore",
	} {
		out, errOut, status := run(t, c, command)
		lines := strings.Split(strings.TrimSuffix(errOut, "\n"), "\n")
		if status != 2 || out != "" || len(lines) != 1 || !strings.HasPrefix(errOut, "sill serve: ") {
			t.Errorf("%q: status %d, stdout %q, stderr %q; expected status 2, nothing on stdout and one line on stderr", command, status, out, errOut)
		}
	}
	got, err := os.ReadFile(ts.files[0])
	if err != nil {
		t.Fatal(err)
	}
	f, err := decision.Read(bytes.NewReader(got), ts.files[0])
	if err != nil || len(f.SignOffs) != 0 {
		t.Errorf("after refused commands the file reads %v with %d sign-offs; expected none", err, len(f.SignOffs))
	}
}

func TestAuthenticationRefused(t *testing.T) {
	lead, stranger := newClientKey(t, "Ada Quist"), newClientKey(t, "Stranger")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}})
	cases := map[string][]gossh.AuthMethod{
		"unknown key": {gossh.PublicKeys(stranger.signer)},
		"password":    {gossh.Password("secret")},
		"keyboard-interactive": {gossh.KeyboardInteractive(func(string, string, []string, []bool) ([]string, error) {
			return []string{"secret"}, nil
		})},
		"none": {},
	}
	for name, auth := range cases {
		c, err := ts.dial(auth...)
		if err == nil {
			c.Close()
			t.Errorf("%s: let in", name)
		}
	}
}

func TestForwardingRefused(t *testing.T) {
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}})
	c := ts.client(t, lead)
	// A listener the forwarding would reach, were it allowed.
	target, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer target.Close()
	if conn, err := c.Dial("tcp", target.Addr().String()); err == nil {
		conn.Close()
		t.Error("direct-tcpip (local port forwarding) was accepted")
	}
	if ln, err := c.Listen("tcp", "127.0.0.1:0"); err == nil {
		ln.Close()
		t.Error("tcpip-forward (remote port forwarding) was accepted")
	}
	sess, err := c.NewSession()
	if err != nil {
		t.Fatal(err)
	}
	defer sess.Close()
	if err := agent.RequestAgentForwarding(sess); err == nil {
		t.Error("agent forwarding was accepted")
	}
	if ok, err := sess.SendRequest("x11-req", true, gossh.Marshal(struct {
		Single           bool
		Protocol, Cookie string
		Screen           uint32
	}{false, "MIT-MAGIC-COOKIE-1", "00", 0})); ok || err != nil {
		t.Errorf("x11-req: accepted %v, error %v; expected a refusal", ok, err)
	}
	if err := sess.RequestSubsystem("sftp"); err == nil {
		t.Error("the sftp subsystem was accepted")
	}
	if _, _, err := c.OpenChannel("auth-agent@openssh.com", nil); err == nil {
		t.Error("an agent channel was accepted")
	}
	c.Close()
	if log := waitFor(t, ts.log, "refused agent forwarding"); !strings.Contains(log, "refused channel direct-tcpip") ||
		!strings.Contains(log, "refused request tcpip-forward") || !strings.Contains(log, "refused subsystem sftp") {
		t.Errorf("log %q: expected each refusal", log)
	}
}

// waitFor waits, up to 5s, for want in the log and returns the log.
func waitFor(t *testing.T, log *lockedBuffer, want string) string {
	t.Helper()
	deadline := time.Now().Add(5 * time.Second)
	for time.Now().Before(deadline) {
		if s := log.String(); strings.Contains(s, want) {
			return s
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatalf("log %q: no %q within 5s", log.String(), want)
	return ""
}

// readUntil reads r until want appears, for at most limit, and returns
// what was read.
func readUntil(t *testing.T, r io.Reader, want string, limit time.Duration) string {
	t.Helper()
	var got lockedBuffer
	found := make(chan struct{})
	go func() {
		buf := make([]byte, 4096)
		for {
			n, err := r.Read(buf)
			got.Write(buf[:n])
			if strings.Contains(got.String(), want) {
				close(found)
				return
			}
			if err != nil {
				close(found)
				return
			}
		}
	}()
	select {
	case <-found:
	case <-time.After(limit):
		t.Fatalf("no %q within %s; read %q", want, limit, got.String())
	}
	if !strings.Contains(got.String(), want) {
		t.Fatalf("output ended without %q: %q", want, got.String())
	}
	return got.String()
}

func TestScreenWithTerminal(t *testing.T) {
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}, note: "night crew \x1b]0;owned\x07 \x1b[2J reads this"})
	c := ts.client(t, lead)
	sess, err := c.NewSession()
	if err != nil {
		t.Fatal(err)
	}
	defer sess.Close()
	if err := sess.Setenv("NO_COLOR", "1"); err != nil {
		t.Fatal(err)
	}
	if err := sess.RequestPty("xterm-256color", 30, 100, gossh.TerminalModes{}); err != nil {
		t.Fatal(err)
	}
	stdout, err := sess.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	stdin, err := sess.StdinPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := sess.Shell(); err != nil {
		t.Fatal(err)
	}
	screen := readUntil(t, stdout, "reads this", 10*time.Second)
	for _, want := range []string{"sill review · cut-1.yaml", "comparison strip", "file note: night crew"} {
		if !strings.Contains(screen, want) {
			t.Errorf("the screen shows no %q", want)
		}
	}
	for _, hostile := range []string{"\x1b]0;owned", "\x1b[2J reads"} {
		if strings.Contains(screen, hostile) {
			t.Errorf("the note's control sequence %q reached the client", hostile)
		}
	}
	if strings.Contains(screen, "\x1b[38;") {
		t.Error("NO_COLOR was sent, yet the screen has colours")
	}
	// w writes nothing here; S opens the sign-off form on the role, the
	// name being the key's; enter signs.
	if _, err := stdin.Write([]byte("wS")); err != nil {
		t.Fatal(err)
	}
	readUntil(t, stdout, "your key's name", 10*time.Second)
	if _, err := stdin.Write([]byte("shift lead\tapprove\r")); err != nil {
		t.Fatal(err)
	}
	readUntil(t, stdout, "signed: approve by Ada Quist", 10*time.Second)
	if _, err := stdin.Write([]byte("q")); err != nil {
		t.Fatal(err)
	}
	waited := make(chan error, 1)
	go func() { waited <- sess.Wait() }()
	select {
	case err := <-waited:
		if err != nil {
			t.Errorf("the session ended with %v after q", err)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("q did not end the session within 10s")
	}
	f, err := decision.ReadFile(ts.files[0])
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(f.Note, "night crew \x1b]0;") {
		t.Errorf("the file's note is now %q; the screen is to write nothing but the sign-off", f.Note)
	}
	if len(f.SignOffs) != 1 || f.SignOffs[0].Name != "Ada Quist" || f.SignOffs[0].Role != "shift lead" ||
		f.SignOffs[0].Key != Fingerprint(lead.signer.PublicKey()) {
		t.Errorf("sign-offs %+v; expected one by Ada Quist, shift lead, with the key's fingerprint", f.SignOffs)
	}
	c.Close()
	waitFor(t, ts.log, "signed cut-1.yaml on the screen: approve")
}

func TestHostileTextOverTheWire(t *testing.T) {
	eve := newClientKey(t, "Eve \x1b[31mRed\x1b[0m")
	ts := startServer(t, serverOptions{keys: []clientKey{eve}, note: "\x1b]52;c;ZWNobyBoaQ==\x07copied"})
	c := ts.client(t, eve)
	out, errOut, status := run(t, c, `sign --verdict approve --note "`+"\x1b[2Jwiped"+`"`)
	if status != 0 {
		t.Fatalf("sign: status %d, stderr %q", status, errOut)
	}
	for _, command := range []string{"", "review --format markdown"} {
		text, _, _ := run(t, c, command)
		out += text
	}
	if strings.ContainsRune(out, 0x1b) || strings.ContainsRune(out, 0x07) {
		t.Errorf("an escape or bell from the file or the key's comment reached the client: %q", out)
	}
	if !strings.Contains(out, "wiped") || !strings.Contains(out, "Red") {
		t.Errorf("the sign-off's note or name is missing from the output: %q", out)
	}
}

func TestConcurrentSignOffs(t *testing.T) {
	var keys []clientKey
	for i := range 6 {
		keys = append(keys, newClientKey(t, fmt.Sprintf("Signer %d", i+1)))
	}
	ts := startServer(t, serverOptions{keys: keys})
	var wg sync.WaitGroup
	errs := make(chan string, len(keys))
	for i, k := range keys {
		wg.Add(1)
		go func() {
			defer wg.Done()
			c, err := ts.dial(gossh.PublicKeys(k.signer))
			if err != nil {
				errs <- err.Error()
				return
			}
			defer c.Close()
			sess, err := c.NewSession()
			if err != nil {
				errs <- err.Error()
				return
			}
			defer sess.Close()
			verdict := []string{"approve", "revise", "reject"}[i%3]
			if out, err := sess.CombinedOutput("sign --verdict " + verdict + " --role 'shift lead' cut-1.yaml"); err != nil {
				errs <- fmt.Sprintf("signer %d: %v: %s", i+1, err, out)
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
	f, err := decision.ReadFile(ts.files[0])
	if err != nil {
		t.Fatal(err)
	}
	if len(f.SignOffs) != len(keys) {
		t.Fatalf("%d sign-offs in the file; expected %d", len(f.SignOffs), len(keys))
	}
	byKey := map[string]decision.SignOff{}
	for _, s := range f.SignOffs {
		byKey[s.Key] = s
	}
	for i, k := range keys {
		s, ok := byKey[Fingerprint(k.signer.PublicKey())]
		if !ok || s.Name != fmt.Sprintf("Signer %d", i+1) || s.Role != "shift lead" {
			t.Errorf("signer %d: sign-off %+v; expected its name from authorized_keys and its key's fingerprint", i+1, s)
		}
	}
}

func TestIdleTimeout(t *testing.T) {
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}, idle: 400 * time.Millisecond})
	c := ts.client(t, lead)
	sess, err := c.NewSession()
	if err != nil {
		t.Fatal(err)
	}
	if err := sess.RequestPty("xterm", 30, 100, gossh.TerminalModes{}); err != nil {
		t.Fatal(err)
	}
	if err := sess.Shell(); err != nil {
		t.Fatal(err)
	}
	ended := make(chan struct{})
	go func() { _ = c.Wait(); close(ended) }()
	select {
	case <-ended:
	case <-time.After(10 * time.Second):
		t.Fatal("an idle connection was still open after 10s with a 400ms idle timeout")
	}
	waitFor(t, ts.log, "closed after 400ms without input")
}

func TestMaxSessions(t *testing.T) {
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}, maxSessions: 1})
	first := ts.client(t, lead)
	if c, err := ts.dial(gossh.PublicKeys(lead.signer)); err == nil {
		c.Close()
		t.Error("a second connection was let in with --max-sessions 1")
	}
	first.Close()
	deadline := time.Now().Add(5 * time.Second)
	for {
		c, err := ts.dial(gossh.PublicKeys(lead.signer))
		if err == nil {
			c.Close()
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("no connection let in within 5s of the first one closing: %v", err)
		}
		time.Sleep(20 * time.Millisecond)
	}
}

func TestAuthorizedKeysReread(t *testing.T) {
	lead, late := newClientKey(t, "Ada Quist"), newClientKey(t, "Late Comer")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}})
	if c, err := ts.dial(gossh.PublicKeys(late.signer)); err == nil {
		c.Close()
		t.Fatal("a key not yet in the file was let in")
	}
	if err := os.WriteFile(ts.keysPath, []byte(lead.line+late.line), 0o600); err != nil {
		t.Fatal(err)
	}
	c, err := ts.dial(gossh.PublicKeys(late.signer))
	if err != nil {
		t.Fatalf("a key added to the file was refused: %v", err)
	}
	c.Close()
	if err := os.WriteFile(ts.keysPath, []byte("command=\"ls\" "+late.line), 0o600); err != nil {
		t.Fatal(err)
	}
	for _, k := range []clientKey{lead, late} {
		if c, err := ts.dial(gossh.PublicKeys(k.signer)); err == nil {
			c.Close()
			t.Error("a key taken out of the file, or carrying an option not honoured, was let in")
		}
	}
	waitFor(t, ts.log, `option "command" is not honoured here`)
}

func TestHostKey(t *testing.T) {
	path := filepath.Join(t.TempDir(), "sill", "host-key")
	first, created, err := LoadHostKey(context.Background(), path)
	if err != nil || !created {
		t.Fatalf("first run: created %v, error %v", created, err)
	}
	info, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if info.Mode().Perm() != 0o600 {
		t.Errorf("host key mode %04o; expected 0600", info.Mode().Perm())
	}
	if first.PublicKey().Type() != gossh.KeyAlgoED25519 {
		t.Errorf("host key type %s; expected ed25519", first.PublicKey().Type())
	}
	again, created, err := LoadHostKey(context.Background(), path)
	if err != nil || created || Fingerprint(again.PublicKey()) != Fingerprint(first.PublicKey()) {
		t.Errorf("second run: created %v, error %v, same key %v; expected the first key reused", created, err,
			err == nil && Fingerprint(again.PublicKey()) == Fingerprint(first.PublicKey()))
	}
	if err := os.Chmod(path, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := LoadHostKey(context.Background(), path); err == nil || !strings.Contains(err.Error(), "expected 0600") {
		t.Errorf("a host key readable by others: error %v; expected a refusal naming 0600", err)
	}
}

func TestLoopback(t *testing.T) {
	for addr, want := range map[string]bool{
		"127.0.0.1:2222": true, "[::1]:2222": true, "localhost:2222": true,
		":2222": false, "0.0.0.0:2222": false, "10.0.0.5:2222": false, "[::]:22": false, "nonsense": false,
	} {
		if got := Loopback(addr); got != want {
			t.Errorf("Loopback(%q) = %v; expected %v", addr, got, want)
		}
	}
}

// TestRealClient runs OpenSSH's ssh client against the server. Under CI
// (CI set, where .ci/run installs openssh-client) a missing ssh fails the
// test; elsewhere it skips.
func TestRealClient(t *testing.T) {
	sshPath, err := exec.LookPath("ssh")
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatal("no ssh client under CI: .ci/run installs openssh-client")
		}
		t.Skip("no ssh client on this machine")
	}
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}})
	block, err := gossh.MarshalPrivateKey(lead.private, "")
	if err != nil {
		t.Fatal(err)
	}
	keyPath := filepath.Join(t.TempDir(), "id")
	if err := os.WriteFile(keyPath, pem.EncodeToMemory(block), 0o600); err != nil {
		t.Fatal(err)
	}
	_, port, _ := net.SplitHostPort(ts.addr)
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	base := []string{"-i", keyPath, "-p", port, "-o", "StrictHostKeyChecking=no", "-o", "UserKnownHostsFile=/dev/null",
		"-o", "BatchMode=yes", "-o", "IdentitiesOnly=yes", "-o", "LogLevel=ERROR", "-F", "/dev/null"}
	out, err := exec.CommandContext(ctx, sshPath, append(base, "-T", "127.0.0.1")...).CombinedOutput()
	if err != nil || !strings.HasPrefix(string(out), "Review of cut-1.yaml") {
		t.Fatalf("ssh -T: %v, output %q; expected the text review", err, out)
	}
	out, err = exec.CommandContext(ctx, sshPath, append(base, "127.0.0.1", "sign", "--verdict", "approve", "--note", "'fits the night crew'")...).CombinedOutput()
	if err != nil || !strings.Contains(string(out), "signed cut-1.yaml: approve by Ada Quist") {
		t.Fatalf("ssh sign: %v, output %q", err, out)
	}
	cmd := exec.CommandContext(ctx, sshPath, append(base, "127.0.0.1", "id")...)
	out, err = cmd.CombinedOutput()
	var exit *exec.ExitError
	if !errors.As(err, &exit) || exit.ExitCode() != 2 {
		t.Errorf("ssh host id: %v, output %q; expected exit status 2", err, out)
	}
	f, err := decision.ReadFile(ts.files[0])
	if err != nil {
		t.Fatal(err)
	}
	if len(f.SignOffs) != 1 || f.SignOffs[0].Note != "fits the night crew" || f.SignOffs[0].Key != Fingerprint(lead.signer.PublicKey()) {
		t.Errorf("sign-offs %+v; expected one by the key, with its note", f.SignOffs)
	}
}

// TestExplorerShared: two connections explore one set loaded once, each
// with its own cursor and pins, at the same time; w writes nothing and q
// goes back to the list. Run with -race, it checks that the set is only
// read.
func TestExplorerShared(t *testing.T) {
	set, err := scores.Read(strings.NewReader(string(demo.CSV(demo.DefaultRows, demo.DefaultSeed))), demo.Source, scores.Options{SegmentColumn: "yard", IDColumn: "id"})
	if err != nil {
		t.Fatal(err)
	}
	loads := 0
	var loadMu sync.Mutex
	cfg := tui.Config{
		Load: func(func(int)) (*scores.Set, error) {
			loadMu.Lock()
			loads++
			loadMu.Unlock()
			return set, nil
		},
		Assume: func(set *scores.Set) (projection.Assumptions, error) {
			positives, negatives := set.Totals()
			return projection.Assumptions{BaseRate: positives / (positives + negatives), Volume: 1500, Capacity: 90, Confidence: 0.95}, nil
		},
	}
	lead := newClientKey(t, "Ada Quist")
	ts := startServer(t, serverOptions{keys: []clientKey{lead}, explore: &Explore{Name: "bearings.csv", Config: cfg}})
	dir, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	var wg sync.WaitGroup
	for i := range 2 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			c, err := ts.dial(gossh.PublicKeys(lead.signer))
			if err != nil {
				t.Error(err)
				return
			}
			defer c.Close()
			sess, err := c.NewSession()
			if err != nil {
				t.Error(err)
				return
			}
			defer sess.Close()
			if err := sess.RequestPty("xterm", 32, 110, gossh.TerminalModes{}); err != nil {
				t.Error(err)
				return
			}
			stdout, _ := sess.StdoutPipe()
			stdin, _ := sess.StdinPipe()
			if err := sess.Shell(); err != nil {
				t.Error(err)
				return
			}
			readUntil(t, stdout, "explore bearings.csv", 10*time.Second)
			// down to the explorer, open it, move the cursor by a
			// different amount on each connection, pin, write, quit.
			moves := strings.Repeat("j", 3+5*i)
			if _, err := stdin.Write([]byte("j\r")); err != nil {
				t.Error(err)
				return
			}
			readUntil(t, stdout, "ranked list", 10*time.Second)
			if _, err := stdin.Write([]byte(moves + "pwq")); err != nil {
				t.Error(err)
				return
			}
			readUntil(t, stdout, "sill serve · decision files", 10*time.Second)
			if _, err := stdin.Write([]byte("q")); err != nil {
				t.Error(err)
				return
			}
			ended := make(chan error, 1)
			go func() { ended <- sess.Wait() }()
			select {
			case <-ended:
			case <-time.After(10 * time.Second):
				t.Error("q on the list did not end the session within 10s")
			}
		}()
	}
	wg.Wait()
	if loads != 2 {
		t.Errorf("the set was handed to %d explorers; expected 2", loads)
	}
	for _, path := range []string{filepath.Join(dir, "cut.yaml"), filepath.Join(filepath.Dir(ts.files[0]), "cut.yaml")} {
		if _, err := os.Stat(path); err == nil {
			t.Errorf("the explorer wrote %s", path)
		}
	}
	waitFor(t, ts.log, "explorer bearings.csv")
}
