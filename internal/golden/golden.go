// Package golden compares what a test produced with its golden file,
// testdata/<Test>/<name>.golden, and rewrites the file when the test
// binary runs with -update. The test package registers the -update flag
// (flag.Bool("update", ...)); Check reads it by name.
package golden

import (
	"context"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/sharedfile"
)

// Updating reports whether the test binary was given -update.
func Updating() bool {
	f := flag.Lookup("update")
	return f != nil && f.Value.String() == "true"
}

// Check compares got with dir/<Test>/<name>.golden, <Test> the top-level
// test's name, and rewrites the file instead under -update.
func Check(t testing.TB, dir, name, got string) {
	t.Helper()
	top := strings.SplitN(t.Name(), "/", 2)[0]
	path := filepath.Join(dir, top, name+".golden")
	if Updating() {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if _, err := sharedfile.Write(context.Background(), path, []byte(got), sharedfile.Options{}); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if string(want) != got {
		t.Errorf("%s differs from the golden file; got:\n%s\nwant:\n%s", path, got, want)
	}
}
