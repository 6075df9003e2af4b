package serve

import (
	"bytes"
	"context"
	"crypto/ed25519"
	"crypto/rand"
	"encoding/pem"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"time"

	gossh "golang.org/x/crypto/ssh"

	"github.com/sill-tool/sill/internal/sharedfile"
)

// maxKeysFile is the largest authorized_keys file read, in bytes.
const maxKeysFile = 1 << 20

// allowedOptions are the authorized_keys options a key may carry: each
// only takes away what the server never gives. A key with any other
// option (from=, command=, permitopen= ...) is not let in, since the
// server would not honour the limit it sets.
var allowedOptions = map[string]bool{
	"restrict": true, "no-port-forwarding": true, "no-agent-forwarding": true,
	"no-x11-forwarding": true, "no-user-rc": true,
}

// authorizedKey is one key let in, and its comment: who signs with it.
type authorizedKey struct {
	key     gossh.PublicKey
	comment string
}

// keyList is the authorized_keys file, read again whenever its size or
// modification time changes.
type keyList struct {
	path string
	warn func(string) // told of keys skipped on each reading

	mu     sync.Mutex
	size   int64
	mod    time.Time
	loaded bool
	keys   []authorizedKey
}

// lookup returns the comment of key when the file, as it is now, lets key
// in.
func (l *keyList) lookup(key gossh.PublicKey) (comment string, ok bool) {
	l.mu.Lock()
	defer l.mu.Unlock()
	if err := l.refresh(); err != nil {
		l.warn(err.Error())
		l.keys, l.loaded = nil, false // an unreadable file lets no one in
		return "", false
	}
	want := key.Marshal()
	for _, k := range l.keys {
		if bytes.Equal(k.key.Marshal(), want) {
			return k.comment, true
		}
	}
	return "", false
}

// refresh reads the file again when it changed since the last reading.
func (l *keyList) refresh() error {
	info, err := os.Stat(l.path)
	if err != nil {
		return fmt.Errorf("authorized keys: %w", err)
	}
	if l.loaded && info.Size() == l.size && info.ModTime().Equal(l.mod) {
		return nil
	}
	data, _, err := sharedfile.Read(l.path, maxKeysFile)
	if err != nil {
		return fmt.Errorf("authorized keys: %w", err)
	}
	keys, skipped := parseAuthorizedKeys(data, l.path)
	for _, s := range skipped {
		l.warn(s)
	}
	l.keys, l.size, l.mod, l.loaded = keys, info.Size(), info.ModTime(), true
	return nil
}

// parseAuthorizedKeys reads an OpenSSH authorized_keys file, one key a
// line; it returns the keys let in and a message for each line skipped
// (path:line, 1-based, and why).
func parseAuthorizedKeys(data []byte, path string) (keys []authorizedKey, skipped []string) {
	for i, line := range bytes.Split(data, []byte("\n")) {
		line = bytes.TrimSpace(line)
		if len(line) == 0 || line[0] == '#' {
			continue
		}
		key, comment, options, _, err := gossh.ParseAuthorizedKey(line)
		if err != nil {
			skipped = append(skipped, fmt.Sprintf("%s:%d: not a public key, skipped", path, i+1))
			continue
		}
		if bad := unhonoured(options); bad != "" {
			skipped = append(skipped, fmt.Sprintf("%s:%d: option %q is not honoured here, key skipped", path, i+1, bad))
			continue
		}
		keys = append(keys, authorizedKey{key: key, comment: comment})
	}
	return keys, skipped
}

// unhonoured returns the first option not in allowedOptions, or "".
func unhonoured(options []string) string {
	for _, o := range options {
		name, _, _ := strings.Cut(o, "=")
		if !allowedOptions[strings.ToLower(name)] {
			return name
		}
	}
	return ""
}

// DefaultHostKeyPath is where the host key lives when --host-key is not
// given: the user's configuration folder, under sill.
func DefaultHostKeyPath() (string, error) {
	dir, err := os.UserConfigDir()
	if err != nil {
		return "", fmt.Errorf("host key: no configuration folder: %w", err)
	}
	return filepath.Join(dir, "sill", "serve-host-key-ed25519"), nil
}

// LoadHostKey reads the ed25519 host key at path, or creates one there
// (mode 0600, its folder 0700) when there is none. created says which. A
// key readable by others than its owner is refused.
func LoadHostKey(ctx context.Context, path string) (signer gossh.Signer, created bool, err error) {
	info, err := os.Stat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return createHostKey(ctx, path)
	case err != nil:
		return nil, false, fmt.Errorf("host key: %w", err)
	}
	if perm := info.Mode().Perm(); perm&0o077 != 0 {
		return nil, false, fmt.Errorf("host key %s: mode %04o, expected 0600 (readable by its owner only)", path, perm)
	}
	data, _, err := sharedfile.Read(path, 64<<10)
	if err != nil {
		return nil, false, fmt.Errorf("host key: %w", err)
	}
	signer, err = gossh.ParsePrivateKey(data)
	if err != nil {
		return nil, false, fmt.Errorf("host key %s: %w", path, err)
	}
	if signer.PublicKey().Type() != gossh.KeyAlgoED25519 {
		return nil, false, fmt.Errorf("host key %s: a %s key, expected ed25519", path, signer.PublicKey().Type())
	}
	return signer, false, nil
}

func createHostKey(ctx context.Context, path string) (gossh.Signer, bool, error) {
	_, private, err := ed25519.GenerateKey(rand.Reader)
	if err != nil {
		return nil, false, fmt.Errorf("host key: %w", err)
	}
	block, err := gossh.MarshalPrivateKey(private, "sill serve host key")
	if err != nil {
		return nil, false, fmt.Errorf("host key: %w", err)
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o700); err != nil {
		return nil, false, fmt.Errorf("host key: %w", err)
	}
	// Expect a file that does not exist: two servers starting at once do
	// not replace each other's key.
	if _, err := sharedfile.Write(ctx, path, pem.EncodeToMemory(block), sharedfile.Options{Expect: &sharedfile.Stamp{}, Perm: 0o600}); err != nil {
		return nil, false, fmt.Errorf("host key: %w", err)
	}
	signer, err := gossh.NewSignerFromKey(private)
	if err != nil {
		return nil, false, fmt.Errorf("host key: %w", err)
	}
	return signer, true, nil
}
