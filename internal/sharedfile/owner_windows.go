//go:build windows

package sharedfile

import (
	"io/fs"
	"os"
)

// keepOwner does nothing on Windows, where a renamed file keeps the
// access rules of the file it was made as.
func keepOwner(*os.File, fs.FileInfo) {}
