//go:build unix

package sharedfile

import (
	"errors"
	"os"

	"golang.org/x/sys/unix"
)

// tryLock takes an exclusive flock on f without waiting; held is false
// when another holds it.
func tryLock(f *os.File) (held bool, err error) {
	for {
		err = unix.Flock(int(f.Fd()), unix.LOCK_EX|unix.LOCK_NB)
		switch {
		case err == nil:
			return true, nil
		case errors.Is(err, unix.EWOULDBLOCK):
			return false, nil
		case errors.Is(err, unix.EINTR):
			continue
		}
		return false, err
	}
}

// release deletes the lock file, then lets it go, so that a writer
// waiting on it sees it gone and takes a new one.
func (l *lock) release() {
	os.Remove(l.path)
	l.file.Close()
}
