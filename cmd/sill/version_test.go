package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime/debug"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
)

// buildInfo fabricates the build information of a binary with the given
// main module version and settings (key, value, key, value, ...).
func buildInfo(moduleVersion string, settings ...string) *debug.BuildInfo {
	info := &debug.BuildInfo{Main: debug.Module{Path: "github.com/sill-tool/sill", Version: moduleVersion}}
	for i := 0; i+1 < len(settings); i += 2 {
		info.Settings = append(info.Settings, debug.BuildSetting{Key: settings[i], Value: settings[i+1]})
	}
	return info
}

// TestDescribeBuild checks the name of a build from fabricated build
// information; the expected strings are the wording chosen for issue 14.
func TestDescribeBuild(t *testing.T) {
	const hash = "1e7ee410391a5a031ac842ba40bc65c9e5e4eb3c"
	cases := []struct {
		name            string
		version, commit string // -ldflags of the release build
		info            *debug.BuildInfo
		want            string
	}{
		{"release build", "1.2.0", "abc1234", buildInfo("(devel)"), "sill 1.2.0 (commit abc1234)"},
		{"release build with v", "v1.2.0", "", nil, "sill 1.2.0"},
		{"ldflags win over build information", "1.2.0", "", buildInfo("v0.9.0", "vcs.revision", hash), "sill 1.2.0"},
		{"go install module@version", "", "", buildInfo("v1.2.0"), "sill 1.2.0"},
		{"go install module@branch", "", "", buildInfo("v0.0.0-20261202003458-1e7ee410391a"), "sill 0.0.0-20261202003458-1e7ee410391a"},
		{"checkout, clean", "", "", buildInfo("v0.0.0-20261202003458-1e7ee410391a", "vcs", "git", "vcs.revision", hash, "vcs.modified", "false"),
			"sill (commit 1e7ee41)"},
		{"checkout, modified", "", "", buildInfo("v0.0.0-20261202003458-1e7ee410391a+dirty", "vcs.revision", hash, "vcs.modified", "true"),
			"sill (commit 1e7ee41, modified)"},
		{"checkout before go 1.24", "", "", buildInfo("(devel)", "vcs.revision", hash, "vcs.modified", "true"),
			"sill (commit 1e7ee41, modified)"},
		{"checkout at a release tag", "", "", buildInfo("v1.2.0", "vcs.revision", hash, "vcs.modified", "false"),
			"sill 1.2.0 (commit 1e7ee41)"},
		{"checkout at a release tag, modified", "", "", buildInfo("v1.2.0+dirty", "vcs.revision", hash, "vcs.modified", "true"),
			"sill 1.2.0 (commit 1e7ee41, modified)"},
		{"pre-release pseudo-version", "", "", buildInfo("v1.3.0-rc.1.0.20261202003458-1e7ee410391a", "vcs.revision", hash),
			"sill (commit 1e7ee41)"},
		{"nothing known", "", "", buildInfo("(devel)"), "sill (unknown build)"},
		{"no build information", "", "", nil, "sill (unknown build)"},
		{"empty module version", "", "", buildInfo(""), "sill (unknown build)"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := describeBuild(tc.version, tc.commit, tc.info); got != tc.want {
				t.Errorf("describeBuild = %q, want %q", got, tc.want)
			}
		})
	}
}

// buildForms matches every name describeBuild gives.
var buildForms = regexp.MustCompile(`^sill (\S+|\S+ \(commit [0-9a-f]+(, modified)?\)|\(commit [0-9a-f]+(, modified)?\)|\(unknown build\))\n$`)

// TestVersionFlag runs `sill --version` in-process (a test binary carries
// no commit) and as a binary built the way README says, then with the
// release build's -ldflags.
func TestVersionFlag(t *testing.T) {
	r := runSill(t, "", "--version")
	if r.code != 0 || r.stdout != toolVersion()+"\n" || strings.Contains(r.stdout, "dev") || !buildForms.MatchString(r.stdout) {
		t.Errorf("in-process --version: exit %d, %q", r.code, r.stdout)
	}
	if testing.Short() {
		t.Skip("builds the binary twice")
	}
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("the go tool is not on PATH")
	}
	dir := t.TempDir()
	for _, tc := range []struct {
		name  string
		flags []string
		want  string // "" for any of buildForms
	}{
		{"go build", nil, ""},
		{"release ldflags", []string{"-ldflags", "-X main.version=1.2.0 -X main.commit=abc1234"}, "sill 1.2.0 (commit abc1234)\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			binary := filepath.Join(dir, "sill")
			args := append(append([]string{"build", "-o", binary}, tc.flags...), ".")
			out, err := exec.Command(goTool, args...).CombinedOutput()
			if err != nil && strings.Contains(string(out), "error obtaining VCS status") {
				// A checkout git will not read (another owner, say): build
				// without the commit, as the go tool's message suggests.
				t.Logf("go build: %s; building with -buildvcs=false", strings.TrimSpace(string(out)))
				args = append([]string{"build", "-buildvcs=false"}, args[1:]...)
				out, err = exec.Command(goTool, args...).CombinedOutput()
			}
			if err != nil {
				t.Fatalf("go build: %v\n%s", err, out)
			}
			out, err = exec.Command(binary, "--version").Output()
			if err != nil {
				t.Fatalf("sill --version: %v", err)
			}
			got := string(out)
			if strings.Contains(got, "dev") || !buildForms.MatchString(got) || (tc.want != "" && got != tc.want) {
				t.Errorf("sill --version printed %q, want %q", got, tc.want)
			}
			os.Remove(binary)
		})
	}
}

// TestDecisionFileToolVersion: a saved decision file names the build that
// wrote it as --version does, so that it never reads "dev".
func TestDecisionFileToolVersion(t *testing.T) {
	dir := t.TempDir()
	scoresPath := writeFile(t, dir, "scores.csv", []byte(goodTable))
	cutPath := filepath.Join(dir, "cut.yaml")
	if r := runSill(t, "", "report", scoresPath, "--cut", "base", "--save", cutPath); r.code != 0 {
		t.Fatalf("report --save: exit %d, %s", r.code, r.stderr)
	}
	f, err := decision.ReadFile(cutPath)
	if err != nil {
		t.Fatal(err)
	}
	version := runSill(t, "", "--version").stdout
	if f.ToolVersion+"\n" != version || f.WrittenBy() != f.ToolVersion || strings.Contains(f.ToolVersion, "dev") {
		t.Errorf("tool_version %q, --version %q", f.ToolVersion, version)
	}
}
