package main

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/format"
)

// TestErrorsShowUntrustedTextSafely: an error that quotes a file name or
// a cell holding terminal controls is printed with them written out, and
// the report's text names the file the same way.
func TestErrorsShowUntrustedTextSafely(t *testing.T) {
	h := format.Hostile
	dir := t.TempDir()
	for name, args := range map[string][]string{
		"missing file": {"report", filepath.Join(dir, "no"+h+".csv")},
		"bad cell":     {"report", writeFile(t, dir, "cells.csv", []byte("score,label\n0.5,\""+h+"\"\n0.4,1\n"))},
		"bad column":   {"report", "--score", "s" + h, writeFile(t, dir, "plain.csv", []byte("score,label\n0.5,0\n0.4,1\n"))},
	} {
		r := runSill(t, "", args...)
		if r.code != 2 {
			t.Errorf("%s: exit %d, want 2 (stderr %q)", name, r.code, r.stderr)
		}
		if c, bad := format.Unsafe(r.stderr); bad || !strings.Contains(r.stderr, `\x1b`) {
			t.Errorf("%s: %q raw on stderr, or the escape not shown: %q", name, c, r.stderr)
		}
	}
	path := writeFile(t, dir, "name"+strings.ReplaceAll(h, "\x07", "")+".csv", []byte("score,label\n0.5,0\n0.4,1\n0.9,1\n0.1,0\n"))
	r := runSill(t, "", "report", path)
	if r.code != 0 {
		t.Fatalf("report: exit %d: %s", r.code, r.stderr)
	}
	if c, bad := format.Unsafe(r.stdout); bad || !strings.Contains(r.stdout, `name\x1b]0;title`) {
		t.Errorf("report: %q raw, or the name not shown escaped:\n%s", c, r.stdout)
	}
}
