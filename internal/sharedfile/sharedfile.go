// Package sharedfile writes files that other programs, sessions and people
// may read and write at the same time, so that no reader sees half a file
// and no writer loses another's write. Every file sill writes goes through
// Write or Update.
//
// A write:
//   - follows a symbolic link to the file it names and replaces that file;
//     the link stays a link;
//   - holds an exclusive lock beside the target (see Lock files) from the
//     moment it looks at the file until the new content is in place, so that
//     writers in this process and in others take turns and every check below
//     and the replacement are one step;
//   - replaces the file only if it is still what was read (Options.Expect:
//     size, modification time and SHA-256 of the content), and otherwise
//     refuses with a *ChangedError;
//   - shows an existing, non-empty file to Options.Kind, which refuses a file
//     that is not the kind being written (the error then matches ErrOtherKind);
//   - writes a temporary file in the target's folder, syncs it to disk,
//     renames it over the target and syncs the folder: a reader sees the old
//     content or the new, and a crash at any point leaves the old file whole;
//   - keeps an existing file's permission bits (a 0600 file stays 0600) and,
//     where the system allows, its owner and group (a member of a file's
//     group keeps the group; root keeps both); a new file gets Options.Perm,
//     or 0666 less the umask when that is 0;
//   - stops and removes its temporary file when ctx is cancelled or the
//     process receives an interrupt or termination signal before the
//     rename, leaving the target as it was (the error matches
//     ErrInterrupted).
//
// # Lock files
//
// The lock is a file named .NAME.lock in the target's folder, locked with
// flock(2) (LockFileEx on Windows). The operating system releases the lock
// when its holder exits, crash included, so a crashed writer never blocks
// the next one. On Unix the holder deletes the lock file before it releases
// the lock, so that none is left once writes are done; a writer that waited
// on a deleted lock file notices and takes the new one. A crash leaves the
// lock file behind, empty and unlocked; the next write uses it and deletes
// it. On Windows, where an open file cannot be safely deleted, the empty
// lock file stays. A writer waits for the lock at most LockWait.
package sharedfile

import (
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math/rand/v2"
	"os"
	"os/signal"
	"path/filepath"
	"strconv"
	"syscall"
	"time"
)

// Sentinel errors; the errors returned wrap them.
var (
	// ErrChanged: the file is no longer what was read (see ChangedError).
	ErrChanged = errors.New("changed since it was read")
	// ErrOtherKind: Options.Kind refused the existing file.
	ErrOtherKind = errors.New("not the kind of file being written")
	// ErrInterrupted: the write was cancelled or interrupted before the
	// rename; the file is as it was.
	ErrInterrupted = errors.New("interrupted")
	// ErrBusy: another writer held the lock for longer than LockWait.
	ErrBusy = errors.New("another writer holds its lock")
	// ErrTooLarge: Read or Update met a file larger than it takes.
	ErrTooLarge = errors.New("too large")
)

// LockWait is the longest a write waits for another writer's lock.
const LockWait = 30 * time.Second

// MaxShown is the most of an existing file, in bytes, that Kind is shown
// and that Update edits; Update refuses a larger file.
const MaxShown = 64 << 20

// Stamp is what a file was when it was read: whether it existed, its size,
// its modification time and the SHA-256 of its content. The zero Stamp is
// a file that did not exist.
type Stamp struct {
	Exists  bool
	Size    int64
	ModTime time.Time
	SHA256  [sha256.Size]byte
}

// Same reports whether s and t describe the same file content: both
// missing, or the same size, modification time and digest.
func (s Stamp) Same(t Stamp) bool {
	if !s.Exists || !t.Exists {
		return s.Exists == t.Exists
	}
	return s.Size == t.Size && s.ModTime.Equal(t.ModTime) && s.SHA256 == t.SHA256
}

// ChangedError says the file was not replaced because it is no longer what
// was read. Now is the file as found under the lock.
type ChangedError struct {
	Path string
	Now  Stamp
}

func (e *ChangedError) Error() string {
	if !e.Now.Exists {
		return fmt.Sprintf("write %s: removed since it was read", e.Path)
	}
	return fmt.Sprintf("write %s: changed since it was read (last modified at %s)", e.Path, e.Now.ModTime.Local().Format("15:04:05"))
}

// Is makes errors.Is(err, ErrChanged) true.
func (e *ChangedError) Is(target error) bool { return target == ErrChanged }

// kindError is Kind's refusal: its message is Kind's, and it matches both
// ErrOtherKind and whatever Kind's error wraps.
type kindError struct{ err error }

func (e *kindError) Error() string        { return e.err.Error() }
func (e *kindError) Unwrap() error        { return e.err }
func (e *kindError) Is(target error) bool { return target == ErrOtherKind }

// Options say what a write checks and the mode of a new file.
type Options struct {
	// Expect, when not nil, is the file as it was read (from Read or
	// StampOf, or the Stamp a previous write returned): the write goes
	// ahead only if the file is still exactly that.
	Expect *Stamp
	// Kind, when not nil, is shown the content of an existing, non-empty
	// file (at most MaxShown bytes); an error refuses the write. Callers
	// leave it nil to force the replacement (a --force flag).
	Kind func(current []byte) error
	// Perm is the permission bits of a new file; 0 means 0666 less the
	// umask. An existing file keeps its own.
	Perm fs.FileMode
}

// Read reads the file at path, following symbolic links, and returns its
// content with its Stamp. A file larger than limit bytes is an error
// matching ErrTooLarge.
func Read(path string, limit int64) ([]byte, Stamp, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, Stamp{}, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, Stamp{}, err
	}
	if info.IsDir() {
		return nil, Stamp{}, fmt.Errorf("%s is a folder, expected a file", path)
	}
	data, stamp, err := readStamped(f, info, limit)
	if err != nil {
		return nil, Stamp{}, fmt.Errorf("read %s: %w", path, err)
	}
	return data, stamp, nil
}

// StampOf returns the Stamp of the file at path as it is now, following
// symbolic links; a missing file has the zero Stamp and no error.
func StampOf(path string) (Stamp, error) {
	f, err := os.Open(path)
	if errors.Is(err, fs.ErrNotExist) {
		return Stamp{}, nil
	}
	if err != nil {
		return Stamp{}, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return Stamp{}, err
	}
	_, stamp, err := readStamped(f, info, 0)
	return stamp, err
}

// readStamped hashes all of f and keeps its first keep bytes (0: none).
// With keep > 0, a file longer than keep is an error matching ErrTooLarge.
func readStamped(f *os.File, info fs.FileInfo, keep int64) ([]byte, Stamp, error) {
	h := sha256.New()
	var data []byte
	var n int64
	var err error
	if keep > 0 {
		data, err = io.ReadAll(io.LimitReader(f, keep+1))
		if err != nil {
			return nil, Stamp{}, err
		}
		if int64(len(data)) > keep {
			return nil, Stamp{}, fmt.Errorf("%w: larger than %d bytes", ErrTooLarge, keep)
		}
		h.Write(data)
		n = int64(len(data))
	} else if n, err = io.Copy(h, f); err != nil {
		return nil, Stamp{}, err
	}
	s := Stamp{Exists: true, Size: n, ModTime: info.ModTime()}
	h.Sum(s.SHA256[:0])
	return data, s, nil
}

// Write replaces the file at path with data, with every guarantee of the
// package, and returns the Stamp of the file it wrote, for the next write
// to Expect. Errors name path as given.
func Write(ctx context.Context, path string, data []byte, o Options) (Stamp, error) {
	return update(ctx, path, o, func([]byte) ([]byte, error) { return data, nil }, false)
}

// Update is Write for content made from the file's current content: under
// the lock, once the checks have passed, edit gets the current content (nil
// when there is none) and returns the new content; an error from edit
// leaves the file as it was and is returned wrapped. An existing file
// larger than MaxShown is refused (ErrTooLarge).
func Update(ctx context.Context, path string, o Options, edit func(current []byte) ([]byte, error)) (Stamp, error) {
	return update(ctx, path, o, edit, true)
}

// update is Update; edits refuses a file too large to be shown to edit.
func update(ctx context.Context, path string, o Options, edit func(current []byte) ([]byte, error), edits bool) (Stamp, error) {
	ctx, stop := signal.NotifyContext(ctx, os.Interrupt, syscall.SIGTERM)
	defer stop()
	wrap := func(err error) error { return fmt.Errorf("write %s: %w", path, err) }
	target, err := resolve(path)
	if err != nil {
		return Stamp{}, wrap(err)
	}
	dir := filepath.Dir(target)
	if info, err := os.Stat(dir); err != nil || !info.IsDir() {
		return Stamp{}, wrap(fmt.Errorf("the folder %s does not exist", dir))
	}
	l, err := acquire(ctx, filepath.Join(dir, "."+filepath.Base(target)+".lock"))
	if err != nil {
		if ctx.Err() != nil {
			return Stamp{}, interrupted(path)
		}
		return Stamp{}, wrap(err)
	}
	defer l.release()

	current, info, stamp, err := readCurrent(target)
	if err != nil {
		return Stamp{}, wrap(err)
	}
	if o.Expect != nil && !o.Expect.Same(stamp) {
		return Stamp{}, &ChangedError{Path: path, Now: stamp}
	}
	if len(current) > 0 && o.Kind != nil {
		if err := o.Kind(current); err != nil {
			return Stamp{}, wrap(&kindError{err})
		}
	}
	if edits && stamp.Size > MaxShown {
		return Stamp{}, wrap(fmt.Errorf("%w: the file is larger than %d bytes", ErrTooLarge, MaxShown))
	}
	data, err := edit(current)
	if err != nil {
		return Stamp{}, wrap(err)
	}
	perm, exact := o.Perm, o.Perm != 0
	if info != nil {
		perm, exact = info.Mode().Perm(), true
	} else if perm == 0 {
		perm = 0o666
	}
	written, err := replace(ctx, target, data, perm, exact, info)
	if errors.Is(err, ErrInterrupted) {
		return Stamp{}, interrupted(path)
	}
	if err != nil {
		return Stamp{}, wrap(err)
	}
	return written, nil
}

// Check tells, before any work is done, whether a later Write to path
// could succeed: the folder it would go in exists, is a folder and takes a
// new file (a temporary file is created there and removed), and an
// existing file is a regular file that kind, when not nil, accepts (its
// first MaxShown bytes are shown to it). It takes no lock and writes
// nothing that stays: the file may still change before the write, which
// makes its own checks. Errors name the folder; kind's error is returned
// as it is, matching ErrOtherKind too.
func Check(path string, kind func(current []byte) error) error {
	target, err := resolve(path)
	if errors.Is(err, syscall.ENOTDIR) {
		target = path // a file where a folder of the path should be: told below
	} else if err != nil {
		return err
	}
	dir := filepath.Dir(target)
	info, err := os.Stat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist) || errors.Is(err, syscall.ENOTDIR):
		return fmt.Errorf("the folder %s does not exist", dir)
	case err != nil:
		return fmt.Errorf("the folder %s: %w", dir, err)
	case !info.IsDir():
		return fmt.Errorf("%s is not a folder", dir)
	}
	probe, err := createTemp(dir, "."+filepath.Base(target)+".probe-", 0o600)
	if err != nil {
		return fmt.Errorf("the folder %s does not take new files (%v)", dir, errors.Unwrap(err))
	}
	probe.Close()
	os.Remove(probe.Name())
	current, _, stamp, err := readCurrent(target)
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if stamp.Exists && len(current) > 0 && kind != nil {
		if err := kind(current); err != nil {
			return &kindError{err}
		}
	}
	return nil
}

func interrupted(path string) error {
	return fmt.Errorf("write %s: %w; the file is as it was", path, ErrInterrupted)
}

// resolve follows symbolic links from path to the file they name, which
// need not exist yet.
func resolve(path string) (string, error) {
	for range 40 {
		info, err := os.Lstat(path)
		if errors.Is(err, fs.ErrNotExist) {
			return path, nil
		}
		if err != nil {
			return "", err
		}
		if info.Mode()&fs.ModeSymlink == 0 {
			if info.IsDir() {
				return "", fmt.Errorf("%s is a folder, expected a file name", path)
			}
			if !info.Mode().IsRegular() {
				return "", fmt.Errorf("%s is not a regular file", path)
			}
			return path, nil
		}
		link, err := os.Readlink(path)
		if err != nil {
			return "", err
		}
		if !filepath.IsAbs(link) {
			link = filepath.Join(filepath.Dir(path), link)
		}
		path = link
	}
	return "", fmt.Errorf("%s: too many symbolic links", path)
}

// readCurrent reads the target under the lock: its content (the first
// MaxShown bytes), its information and its Stamp; a missing file has nil
// information and the zero Stamp.
func readCurrent(target string) ([]byte, fs.FileInfo, Stamp, error) {
	f, err := os.Open(target)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil, Stamp{}, nil
	}
	if err != nil {
		return nil, nil, Stamp{}, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, nil, Stamp{}, err
	}
	h := sha256.New()
	current, err := io.ReadAll(io.TeeReader(io.LimitReader(f, MaxShown), h))
	if err != nil {
		return nil, nil, Stamp{}, err
	}
	rest, err := io.Copy(h, f)
	if err != nil {
		return nil, nil, Stamp{}, err
	}
	s := Stamp{Exists: true, Size: int64(len(current)) + rest, ModTime: info.ModTime()}
	h.Sum(s.SHA256[:0])
	return current, info, s, nil
}

// beforeRename, when set by a test, runs after the temporary file is
// written and synced and before it replaces the target; an error aborts
// the write as a crash at that point would.
var beforeRename func(tmpPath string) error

// HookBeforeRename is a test seam for other packages: it installs hook to
// run where beforeRename does, so a test can simulate a crash between the
// write and the rename, and returns a function that removes it. Tests
// only; it is not safe for concurrent use.
func HookBeforeRename(hook func(tmpPath string) error) (restore func()) {
	beforeRename = hook
	return func() { beforeRename = nil }
}

// chunk is how much replace writes between looks at ctx.
const chunk = 1 << 20

// replace writes data to a temporary file beside target, syncs it, renames
// it over target and syncs the folder. The new file has mode perm, exactly
// when exact and less the umask otherwise, and the owner and group of old,
// the file replaced (nil for none), as far as the system lets this
// process give them. On any error, and when ctx ends
// before the rename (ErrInterrupted), the temporary file is removed and
// target is untouched.
func replace(ctx context.Context, target string, data []byte, perm fs.FileMode, exact bool, old fs.FileInfo) (stamp Stamp, err error) {
	dir := filepath.Dir(target)
	tmp, err := createTemp(dir, "."+filepath.Base(target)+".tmp-", perm)
	if err != nil {
		return Stamp{}, err
	}
	tmpPath := tmp.Name()
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmpPath)
		}
	}()
	done := func() error {
		if ctx.Err() != nil {
			return ErrInterrupted
		}
		return nil
	}
	if old != nil {
		keepOwner(tmp, old) // before the mode: a change of owner may clear mode bits
	}
	if exact {
		if err = tmp.Chmod(perm); err != nil {
			return Stamp{}, err
		}
	}
	for rest := data; len(rest) > 0; {
		if err = done(); err != nil {
			return Stamp{}, err
		}
		n := min(len(rest), chunk)
		if _, err = tmp.Write(rest[:n]); err != nil {
			return Stamp{}, err
		}
		rest = rest[n:]
	}
	if err = tmp.Sync(); err != nil {
		return Stamp{}, err
	}
	info, err := tmp.Stat()
	if err != nil {
		return Stamp{}, err
	}
	if err = tmp.Close(); err != nil {
		return Stamp{}, err
	}
	if beforeRename != nil {
		if err = beforeRename(tmpPath); err != nil {
			return Stamp{}, err
		}
	}
	if err = done(); err != nil {
		return Stamp{}, err
	}
	if err = os.Rename(tmpPath, target); err != nil {
		return Stamp{}, err
	}
	if d, derr := os.Open(dir); derr == nil {
		d.Sync() // best effort: makes the rename itself durable
		d.Close()
	}
	return Stamp{Exists: true, Size: int64(len(data)), ModTime: info.ModTime(), SHA256: sha256.Sum256(data)}, nil
}

// createTemp creates a new file named prefix and a random suffix in dir,
// with mode perm less the umask.
func createTemp(dir, prefix string, perm fs.FileMode) (*os.File, error) {
	for range 100 {
		name := filepath.Join(dir, prefix+strconv.FormatUint(rand.Uint64(), 36))
		f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, perm)
		if errors.Is(err, fs.ErrExist) {
			continue
		}
		return f, err
	}
	return nil, fmt.Errorf("no free temporary file name in %s", dir)
}
