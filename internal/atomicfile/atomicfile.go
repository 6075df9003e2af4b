// Package atomicfile writes files so that readers see either the old
// content or the new, never a half-written file.
package atomicfile

import (
	"fmt"
	"os"
	"path/filepath"
)

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

// Write writes data to path through a temporary file in the same folder:
// write, fsync, rename, then fsync the folder. On any error the target is
// untouched and the temporary file is removed.
func Write(path string, data []byte, perm os.FileMode) (err error) {
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	tmpPath := tmp.Name()
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmpPath)
		}
	}()
	if _, err = tmp.Write(data); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = tmp.Chmod(perm); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = tmp.Sync(); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if beforeRename != nil {
		if err = beforeRename(tmpPath); err != nil {
			return fmt.Errorf("write %s: %w", path, err)
		}
	}
	if err = os.Rename(tmpPath, path); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if d, derr := os.Open(dir); derr == nil {
		d.Sync() // best effort: makes the rename itself durable
		d.Close()
	}
	return nil
}
