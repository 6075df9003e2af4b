//go:build unix

package sharedfile

import (
	"io/fs"
	"os"
	"syscall"
)

// keepOwner gives f the owner and group of old where the system lets this
// process: both as root, the group alone as a member of it. Otherwise f
// keeps the writer's, as a file the writer made would.
func keepOwner(f *os.File, old fs.FileInfo) {
	st, ok := old.Sys().(*syscall.Stat_t)
	if !ok {
		return
	}
	if f.Chown(int(st.Uid), int(st.Gid)) != nil {
		f.Chown(-1, int(st.Gid))
	}
}
