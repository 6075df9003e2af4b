package main

import (
	"strings"
	"testing"
)

// TestExploreWithoutTerminal: the tests run without a terminal, so explore
// refuses with a way forward instead of drawing into a pipe, and standard
// input cannot be both the scores and the keys.
func TestExploreWithoutTerminal(t *testing.T) {
	path := writeFile(t, t.TempDir(), "scores.csv", []byte("score,label\n0.9,1\n0.2,0\n"))
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"explore", path}, "sill report " + path},
		{[]string{"explore", "-"}, "cannot read scores from standard input"},
		{[]string{"explore"}, "accepts 1 arg"},
		{[]string{"explore", path, "--volume", "x"}, "invalid argument"},
	}
	for _, tc := range cases {
		r := runSill(t, "", tc.args...)
		if r.code != 2 || !strings.Contains(r.stderr, tc.want) {
			t.Errorf("sill %s: status %d, stderr %q; want 2 and %q", strings.Join(tc.args, " "), r.code, r.stderr, tc.want)
		}
		if r.stdout != "" {
			t.Errorf("sill %s wrote to stdout: %q", strings.Join(tc.args, " "), r.stdout)
		}
	}
}
