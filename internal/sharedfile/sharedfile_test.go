package sharedfile

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"sort"
	"testing"
	"time"
)

func TestWriteReplaces(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	if _, err := Write(context.Background(), path, []byte("old"), Options{}); err != nil {
		t.Fatal(err)
	}
	if _, err := Write(context.Background(), path, []byte("new"), Options{}); err != nil {
		t.Fatal(err)
	}
	assertContent(t, path, "new")
	// No temporary file and no lock file stays behind.
	assertOnlyFiles(t, filepath.Dir(path), "cut.yaml")
}

func TestFailureBeforeRenameKeepsOldFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	writeFile(t, path, "old", 0o644)
	crash := errors.New("simulated crash")
	sawTemp := false
	defer HookBeforeRename(func(tmp string) error {
		data, err := os.ReadFile(tmp)
		sawTemp = err == nil && string(data) == "new" && filepath.Dir(tmp) == filepath.Dir(path)
		return crash
	})()
	if _, err := Write(context.Background(), path, []byte("new"), Options{}); !errors.Is(err, crash) {
		t.Fatalf("error %v, want the simulated crash", err)
	}
	if !sawTemp {
		t.Error("the complete new content was not in a temporary file beside the target before the rename")
	}
	assertContent(t, path, "old")
	assertOnlyFiles(t, filepath.Dir(path), "cut.yaml")
}

func TestWriteWhereNoFileCanBe(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct{ name, path, want string }{
		{"missing folder", filepath.Join(dir, "no-such-dir", "cut.yaml"), "the folder " + filepath.Join(dir, "no-such-dir") + " does not exist"},
		{"a folder", dir, dir + " is a folder, expected a file name"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Write(context.Background(), tc.path, []byte("x"), Options{})
			if err == nil || err.Error() != "write "+tc.path+": "+tc.want {
				t.Fatalf("error %v, want %q", err, "write "+tc.path+": "+tc.want)
			}
		})
	}
}

func TestWriteThroughSymlinkReplacesTarget(t *testing.T) {
	dir := t.TempDir()
	shared := filepath.Join(dir, "shared")
	if err := os.Mkdir(shared, 0o755); err != nil {
		t.Fatal(err)
	}
	target := filepath.Join(shared, "cut.yaml")
	writeFile(t, target, "old", 0o644)
	link := filepath.Join(dir, "cut.yaml")
	if err := os.Symlink("shared/cut.yaml", link); err != nil { // relative, as ln -s makes them
		t.Fatal(err)
	}
	if _, err := Write(context.Background(), link, []byte("new"), Options{}); err != nil {
		t.Fatal(err)
	}
	if info, err := os.Lstat(link); err != nil || info.Mode()&os.ModeSymlink == 0 {
		t.Fatalf("the link is no longer a link (%v)", err)
	}
	assertContent(t, target, "new")
	assertOnlyFiles(t, shared, "cut.yaml") // the temporary and lock files went beside the target

	// A link to a file not there yet creates the file it names.
	dangling := filepath.Join(dir, "next.yaml")
	if err := os.Symlink(filepath.Join(shared, "next.yaml"), dangling); err != nil {
		t.Fatal(err)
	}
	if _, err := Write(context.Background(), dangling, []byte("made"), Options{}); err != nil {
		t.Fatal(err)
	}
	assertContent(t, filepath.Join(shared, "next.yaml"), "made")
	if info, _ := os.Lstat(dangling); info.Mode()&os.ModeSymlink == 0 {
		t.Fatal("the dangling link was replaced by a file")
	}
}

func TestWriteKeepsMode(t *testing.T) {
	dir := t.TempDir()
	for _, mode := range []os.FileMode{0o600, 0o640, 0o664} {
		path := filepath.Join(dir, "cut-"+mode.String()+".yaml")
		writeFile(t, path, "old", mode)
		if _, err := Write(context.Background(), path, []byte("new"), Options{}); err != nil {
			t.Fatal(err)
		}
		if got := fileMode(t, path); got != mode {
			t.Errorf("mode %v after the write, want %v", got, mode)
		}
	}
	// Options.Perm sets a new file's mode exactly, whatever the umask.
	key := filepath.Join(dir, "host_key")
	if _, err := Write(context.Background(), key, []byte("secret"), Options{Perm: 0o600}); err != nil {
		t.Fatal(err)
	}
	if got := fileMode(t, key); got != 0o600 {
		t.Errorf("new file with Perm 0600 has mode %v", got)
	}
}

func TestWriteRefusesChangedFile(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	path := filepath.Join(dir, "cut.yaml")
	writeFile(t, path, "as read", 0o644)
	_, read, err := Read(path, 1<<20)
	if err != nil {
		t.Fatal(err)
	}
	mtime := read.ModTime
	for _, tc := range []struct {
		name   string
		change func()
	}{
		{"rewritten", func() { writeFile(t, path, "another's", 0o644) }},
		// Same size and modification time, other content: only the digest tells.
		{"same size and time", func() {
			writeFile(t, path, "as reaD", 0o644)
			os.Chtimes(path, mtime, mtime)
		}},
		// Same content, touched: the time tells.
		{"touched", func() {
			writeFile(t, path, "as read", 0o644)
			os.Chtimes(path, mtime.Add(time.Second), mtime.Add(time.Second))
		}},
		{"removed", func() { os.Remove(path) }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			tc.change()
			before, _ := os.ReadFile(path)
			_, err := Write(ctx, path, []byte("mine"), Options{Expect: &read})
			var changed *ChangedError
			if !errors.Is(err, ErrChanged) || !errors.As(err, &changed) || changed.Path != path {
				t.Fatalf("error %v, want a *ChangedError for %s", err, path)
			}
			after, _ := os.ReadFile(path)
			if !bytes.Equal(before, after) {
				t.Fatalf("the refused write changed the file: %q", after)
			}
			writeFile(t, path, "as read", 0o644)
			os.Chtimes(path, mtime, mtime)
		})
	}
	// Unchanged: replaced, and the returned stamp is what a later read sees.
	stamp, err := Write(ctx, path, []byte("mine"), Options{Expect: &read})
	if err != nil {
		t.Fatal(err)
	}
	if now, err := StampOf(path); err != nil || !now.Same(stamp) {
		t.Fatalf("stamp of the written file %+v, StampOf says %+v (%v)", stamp, now, err)
	}
	// A file that did not exist when read, made since: refused.
	fresh := filepath.Join(dir, "fresh.yaml")
	absent, err := StampOf(fresh)
	if err != nil || absent.Exists {
		t.Fatalf("StampOf a missing file: %+v, %v", absent, err)
	}
	writeFile(t, fresh, "another's", 0o644)
	if _, err := Write(ctx, fresh, []byte("mine"), Options{Expect: &absent}); !errors.Is(err, ErrChanged) {
		t.Fatalf("error %v, want ErrChanged for a file made since", err)
	}
}

func TestWriteRefusesOtherKind(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	errNotYAML := errors.New("not a decision file")
	isYAML := func(current []byte) error {
		if !bytes.HasPrefix(current, []byte("format:")) {
			return errNotYAML
		}
		return nil
	}
	scores := filepath.Join(dir, "scores.csv")
	writeFile(t, scores, "score,label\n0.5,1\n", 0o644)
	_, err := Write(ctx, scores, []byte("format: x\n"), Options{Kind: isYAML})
	if !errors.Is(err, ErrOtherKind) || !errors.Is(err, errNotYAML) {
		t.Fatalf("error %v, want ErrOtherKind wrapping the kind check's error", err)
	}
	if err.Error() != "write "+scores+": not a decision file" {
		t.Errorf("message %q", err)
	}
	assertContent(t, scores, "score,label\n0.5,1\n")
	assertOnlyFiles(t, dir, "scores.csv")

	// The same kind, an empty file and (forced) no check: replaced.
	yaml := filepath.Join(dir, "cut.yaml")
	writeFile(t, yaml, "format: old\n", 0o644)
	empty := filepath.Join(dir, "empty.yaml")
	writeFile(t, empty, "", 0o644)
	for _, path := range []string{yaml, empty} {
		if _, err := Write(ctx, path, []byte("format: new\n"), Options{Kind: isYAML}); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := Write(ctx, scores, []byte("format: new\n"), Options{}); err != nil {
		t.Fatal(err)
	}
	assertContent(t, scores, "format: new\n")
}

func TestCancelledWriteLeavesOldFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "cut.yaml")
	writeFile(t, path, "old", 0o644)

	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Write(cancelled, path, []byte("new"), Options{}); !errors.Is(err, ErrInterrupted) {
		t.Fatalf("error %v, want ErrInterrupted", err)
	}
	assertContent(t, path, "old")
	assertOnlyFiles(t, dir, "cut.yaml")

	// Cancelled while the temporary file is complete but not yet renamed.
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	defer HookBeforeRename(func(string) error { cancel(); return nil })()
	_, err := Write(ctx, path, bytes.Repeat([]byte("x"), 3*chunk), Options{})
	if !errors.Is(err, ErrInterrupted) || err.Error() != "write "+path+": interrupted; the file is as it was" {
		t.Fatalf("error %v, want ErrInterrupted", err)
	}
	assertContent(t, path, "old")
	assertOnlyFiles(t, dir, "cut.yaml")
}

func TestUpdateSeesCurrentContent(t *testing.T) {
	path := filepath.Join(t.TempDir(), "log")
	for _, line := range []string{"a\n", "b\n"} {
		_, err := Update(context.Background(), path, Options{}, func(current []byte) ([]byte, error) {
			return append(current, line...), nil
		})
		if err != nil {
			t.Fatal(err)
		}
	}
	assertContent(t, path, "a\nb\n")
	refuse := errors.New("edit refused")
	_, err := Update(context.Background(), path, Options{}, func([]byte) ([]byte, error) { return nil, refuse })
	if !errors.Is(err, refuse) {
		t.Fatalf("error %v, want the edit's", err)
	}
	assertContent(t, path, "a\nb\n")
}

func TestReadTooLarge(t *testing.T) {
	path := filepath.Join(t.TempDir(), "big")
	writeFile(t, path, "0123456789", 0o644)
	if _, _, err := Read(path, 9); !errors.Is(err, ErrTooLarge) {
		t.Fatalf("error %v, want ErrTooLarge", err)
	}
	data, stamp, err := Read(path, 10)
	if err != nil || string(data) != "0123456789" || stamp.Size != 10 {
		t.Fatalf("Read at the limit: %q, %+v, %v", data, stamp, err)
	}
}

func writeFile(t *testing.T, path, content string, mode os.FileMode) {
	t.Helper()
	if err := os.WriteFile(path, []byte(content), mode); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(path, mode); err != nil { // exactly, whatever the umask
		t.Fatal(err)
	}
}

func fileMode(t *testing.T, path string) os.FileMode {
	t.Helper()
	info, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	return info.Mode().Perm()
}

func assertContent(t *testing.T, path, want string) {
	t.Helper()
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if string(got) != want {
		t.Fatalf("%s holds %q, want %q", filepath.Base(path), got, want)
	}
}

func assertOnlyFiles(t *testing.T, dir string, names ...string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	sort.Strings(names)
	if len(got) != len(names) {
		t.Fatalf("folder holds %v, want %v", got, names)
	}
	for i := range got {
		if got[i] != names[i] {
			t.Fatalf("folder holds %v, want %v", got, names)
		}
	}
}

// TestCheck: Check tells what a write would meet (a missing folder, a file
// where the folder should be, a folder where the file should be, a file
// kind refuses) and leaves nothing behind; through a symbolic link it
// checks the file linked to.
func TestCheck(t *testing.T) {
	dir := t.TempDir()
	notes := filepath.Join(dir, "notes.txt")
	writeFile(t, notes, "not a decision", 0o644)
	empty := filepath.Join(dir, "empty.yaml")
	writeFile(t, empty, "", 0o644)
	link := filepath.Join(dir, "link.yaml")
	if err := os.Symlink(notes, link); err != nil {
		t.Fatal(err)
	}
	errNotMine := errors.New("not one of ours")
	kind := func(current []byte) error {
		if string(current) != "ours" {
			return errNotMine
		}
		return nil
	}
	cases := []struct {
		path, want string
		other      bool // matches ErrOtherKind
	}{
		{filepath.Join(dir, "new.yaml"), "", false},
		{empty, "", false}, // an empty file is shown to no kind, as Write does
		{filepath.Join(dir, "missing", "cut.yaml"), "the folder " + filepath.Join(dir, "missing") + " does not exist", false},
		{filepath.Join(notes, "cut.yaml"), notes + " is not a folder", false},
		{dir, dir + " is a folder, expected a file name", false},
		{notes, "not one of ours", true},
		{link, "not one of ours", true},
	}
	for _, tc := range cases {
		err := Check(tc.path, kind)
		got := ""
		if err != nil {
			got = err.Error()
		}
		if got != tc.want || errors.Is(err, ErrOtherKind) != tc.other || tc.other && !errors.Is(err, errNotMine) {
			t.Errorf("Check(%s): %v, want %q (other kind: %v)", tc.path, err, tc.want, tc.other)
		}
	}
	if err := Check(notes, nil); err != nil {
		t.Errorf("Check with no kind: %v", err)
	}
	assertOnlyFiles(t, dir, "empty.yaml", "link.yaml", "notes.txt")
}
