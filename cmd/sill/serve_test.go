package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestServeBadInput: each mistake is refused before anything listens,
// with exit status 2 and a line naming what was expected.
func TestServeBadInput(t *testing.T) {
	dir := t.TempDir()
	cut := filepath.Join("..", "..", "internal", "decision", "testdata", "v1", "demo.yaml")
	keys := writeFile(t, dir, "keys", []byte("# nobody yet\n"))
	notDecision := writeFile(t, dir, "scores.csv", []byte("score,label\n0.1,0\n"))
	hostKey := filepath.Join(dir, "host")
	cases := map[string]struct {
		args []string
		want string
	}{
		"no file":           {[]string{"serve", "--authorized-keys", keys}, "one or more decision files"},
		"no keys":           {[]string{"serve", cut, "--host-key", hostKey}, "--authorized-keys FILE is required"},
		"missing keys file": {[]string{"serve", cut, "--authorized-keys", filepath.Join(dir, "none"), "--host-key", hostKey, "--listen", "127.0.0.1:0"}, "authorized keys"},
		"not a decision":    {[]string{"serve", notDecision, "--authorized-keys", keys, "--host-key", hostKey}, "scores.csv"},
		"zero idle":         {[]string{"serve", cut, "--authorized-keys", keys, "--idle-timeout", "0s"}, "--idle-timeout"},
		"zero sessions":     {[]string{"serve", cut, "--authorized-keys", keys, "--max-sessions", "0"}, "--max-sessions 0"},
		"address taken/bad": {[]string{"serve", cut, "--authorized-keys", keys, "--host-key", hostKey, "--listen", "127.0.0.1:99999"}, "--listen 127.0.0.1:99999"},
	}
	for name, c := range cases {
		r := runSill(t, "", c.args...)
		if r.code != 2 || !strings.Contains(r.stderr, c.want) {
			t.Errorf("%s: exit %d, stderr %q; expected 2 and %q", name, r.code, r.stderr, c.want)
		}
	}
	if info, err := os.Stat(hostKey); err == nil && info.Mode().Perm() != 0o600 {
		t.Errorf("host key made with mode %04o; expected 0600", info.Mode().Perm())
	}
}

// TestServeDataRefused: a --data set that does not load, or a bad explore
// flag, stops serve before it listens.
func TestServeDataRefused(t *testing.T) {
	dir := t.TempDir()
	cut := filepath.Join("..", "..", "internal", "decision", "testdata", "v1", "demo.yaml")
	keys := writeFile(t, dir, "keys", []byte("# nobody yet\n"))
	oneClass := writeFile(t, dir, "one.csv", []byte("score,label\n0.1,0\n0.2,0\n"))
	both := writeFile(t, dir, "both.csv", []byte("score,label\n0.1,0\n0.2,1\n0.3,0\n0.9,1\n"))
	base := []string{"serve", cut, "--authorized-keys", keys, "--host-key", filepath.Join(dir, "host"), "--listen", "127.0.0.1:0"}
	for name, c := range map[string]struct {
		args []string
		want string
	}{
		"missing set":    {[]string{"--data", filepath.Join(dir, "none.csv")}, "none.csv"},
		"one class":      {[]string{"--data", oneClass}, "one.csv"},
		"standard input": {[]string{"--data", "-"}, "--data takes a file"},
		"bad volume":     {[]string{"--data", both, "--volume", "-3"}, "--volume"},
	} {
		r := runSill(t, "", append(base, c.args...)...)
		if r.code != 2 || !strings.Contains(r.stderr, c.want) {
			t.Errorf("%s: exit %d, stderr %q; expected 2 and %q", name, r.code, r.stderr, c.want)
		}
	}
}
