package atomicfile

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

func TestWriteReplaces(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	if err := Write(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Write(path, []byte("new"), 0o644); err != nil {
		t.Fatal(err)
	}
	got, _ := os.ReadFile(path)
	if string(got) != "new" {
		t.Fatalf("content %q, want %q", got, "new")
	}
	assertOnlyFile(t, filepath.Dir(path), "cut.yaml")
}

func TestFailureBeforeRenameKeepsOldFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	if err := Write(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	crash := errors.New("simulated crash")
	beforeRename = func(string) error { return crash }
	defer func() { beforeRename = nil }()
	if err := Write(path, []byte("new"), 0o644); !errors.Is(err, crash) {
		t.Fatalf("error %v, want the simulated crash", err)
	}
	got, _ := os.ReadFile(path)
	if string(got) != "old" {
		t.Fatalf("content %q after failed write, want %q", got, "old")
	}
	assertOnlyFile(t, filepath.Dir(path), "cut.yaml")
}

func TestWriteToMissingFolder(t *testing.T) {
	path := filepath.Join(t.TempDir(), "no-such-dir", "cut.yaml")
	if err := Write(path, []byte("x"), 0o644); err == nil {
		t.Fatal("no error writing into a missing folder")
	}
}

func assertOnlyFile(t *testing.T, dir, name string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 1 || entries[0].Name() != name {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		t.Fatalf("folder holds %v, want only %s", names, name)
	}
}
