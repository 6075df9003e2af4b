package sharedfile

import (
	"context"
	"fmt"
	"os"
	"time"
)

// lock is a held lock file.
type lock struct {
	file *os.File
	path string
}

// acquire takes the lock file at path, creating it if need be, waiting
// for another holder until ctx ends or LockWait has passed.
func acquire(ctx context.Context, path string) (*lock, error) {
	deadline := time.Now().Add(LockWait)
	delay := time.Millisecond
	for {
		f, err := os.OpenFile(path, os.O_RDONLY|os.O_CREATE, 0o666)
		if err != nil {
			return nil, fmt.Errorf("lock: %w", err)
		}
		for {
			held, err := tryLock(f)
			if err != nil {
				f.Close()
				return nil, fmt.Errorf("lock %s: %w", path, err)
			}
			if held {
				break
			}
			if time.Now().After(deadline) {
				f.Close()
				return nil, fmt.Errorf("%w %s (waited %s)", ErrBusy, path, LockWait)
			}
			select {
			case <-ctx.Done():
				f.Close()
				return nil, ctx.Err()
			case <-time.After(delay):
			}
			delay = min(2*delay, 20*time.Millisecond)
		}
		// The previous holder may have deleted the file this one opened
		// before it released its lock: then the lock is on a file no one
		// else will open, and the one at path is the real one.
		if same, err := stillAt(f, path); err != nil {
			f.Close()
			return nil, fmt.Errorf("lock %s: %w", path, err)
		} else if same {
			return &lock{file: f, path: path}, nil
		}
		f.Close()
	}
}

// stillAt reports whether path still names the open file f.
func stillAt(f *os.File, path string) (bool, error) {
	open, err := f.Stat()
	if err != nil {
		return false, err
	}
	named, err := os.Stat(path)
	if os.IsNotExist(err) {
		return false, nil
	}
	if err != nil {
		return false, err
	}
	return os.SameFile(open, named), nil
}
