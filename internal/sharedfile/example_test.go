package sharedfile_test

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/sill-tool/sill/internal/sharedfile"
)

// A screen reads a file, and writes it back only if nobody saved it in
// between; a sign-off appends under the lock whatever the file holds now.
func Example() {
	dir, _ := os.MkdirTemp("", "sharedfile-example")
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "sign-offs.txt")
	os.WriteFile(path, []byte("approve: the desk lead\n"), 0o600)
	ctx := context.Background()

	_, stamp, _ := sharedfile.Read(path, 1<<20)
	// Meanwhile another session appends its sign-off.
	sharedfile.Update(ctx, path, sharedfile.Options{}, func(current []byte) ([]byte, error) {
		return append(current, "revise: the model owner\n"...), nil
	})
	_, err := sharedfile.Write(ctx, path, []byte("approve: the desk lead\nreject: stale copy\n"), sharedfile.Options{Expect: &stamp})
	fmt.Println(errors.Is(err, sharedfile.ErrChanged))

	// A Kind check refuses a file of another kind.
	_, err = sharedfile.Write(ctx, path, []byte("format: x\n"), sharedfile.Options{Kind: func(current []byte) error {
		if !strings.HasPrefix(string(current), "format:") {
			return errors.New("not a decision file")
		}
		return nil
	}})
	fmt.Println(errors.Is(err, sharedfile.ErrOtherKind))

	data, _ := os.ReadFile(path)
	info, _ := os.Stat(path)
	fmt.Print(string(data))
	fmt.Println(info.Mode().Perm())
	// Output:
	// true
	// true
	// approve: the desk lead
	// revise: the model owner
	// -rw-------
}
