package main

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"go.yaml.in/yaml/v3"
)

// TestManual generates the man pages with the hidden manual command, as
// the release build does, and checks that every command a user can run
// has its page, named as man looks for it, listing every flag it takes.
func TestManual(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "man")
	r := runSill(t, "", "manual", dir)
	if r.code != 0 || r.stdout != "" || !strings.Contains(r.stderr, "man pages to "+dir) {
		t.Fatalf("sill manual: exit %d, stdout %q, stderr %q", r.code, r.stdout, r.stderr)
	}
	// The commands of a fresh tree, with the completion command and the
	// --version flag cobra adds when the binary runs.
	root := newRootCmd()
	root.InitDefaultCompletionCmd()
	root.InitDefaultVersionFlag()
	if root.Flags().Lookup("version") == nil {
		t.Fatal("no --version flag to look for")
	}
	var want []string
	var visit func(cmd *cobra.Command)
	visit = func(cmd *cobra.Command) {
		name := strings.ReplaceAll(cmd.CommandPath(), " ", "-")
		want = append(want, name+".1")
		page, err := os.ReadFile(filepath.Join(dir, name+".1"))
		if err != nil {
			t.Errorf("%s: no page: %v", cmd.CommandPath(), err)
			return
		}
		text := string(page)
		if title := `.TH "` + strings.ToUpper(name) + `" "1"`; !strings.Contains(text, title) {
			t.Errorf("%s.1 lacks the header %s", name, title)
		}
		if !strings.Contains(text, cmd.Short) {
			t.Errorf("%s.1 lacks the summary %q", name, cmd.Short)
		}
		check := func(f *pflag.Flag) {
			if !f.Hidden && !strings.Contains(text, `\fB--`+f.Name+`\fP`) {
				t.Errorf("%s.1 lacks --%s", name, f.Name)
			}
		}
		cmd.NonInheritedFlags().VisitAll(check)
		cmd.InheritedFlags().VisitAll(check)
		for _, sub := range cmd.Commands() {
			if sub.IsAvailableCommand() {
				visit(sub)
			}
		}
	}
	visit(root)
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	slices.Sort(got)
	slices.Sort(want)
	if !slices.Equal(got, want) {
		t.Errorf("pages %v, want %v", got, want)
	}
	for _, page := range []string{"sill-report.1", "sill-explore.1", "sill-check.1"} {
		if !slices.Contains(got, page) {
			t.Errorf("no %s", page)
		}
	}
	if slices.Contains(got, "sill-manual.1") {
		t.Error("the hidden manual command has a page")
	}
}

// TestManualErrors: the folder is required, and a file in its place is
// named in one line.
func TestManualErrors(t *testing.T) {
	if r := runSill(t, "", "manual"); r.code != 2 || !strings.Contains(r.stderr, "manual takes one argument, FOLDER") {
		t.Errorf("no folder: exit %d, %q", r.code, r.stderr)
	}
	file := writeFile(t, t.TempDir(), "taken", []byte("x"))
	if r := runSill(t, "", "manual", file); r.code != 2 || !strings.Contains(r.stderr, "sill: manual: mkdir "+file) {
		t.Errorf("a file in the folder's place: exit %d, %q", r.code, r.stderr)
	}
}

// TestReleaseConfig reads .goreleaser.yaml (goreleaser itself is not run
// here) and checks that a before-hook generates the man pages with the
// manual command and that every archive packs the folder it writes, and
// that the build sets the version variables this package declares.
func TestReleaseConfig(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("..", "..", ".goreleaser.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	var config struct {
		Version int `yaml:"version"`
		Before  struct {
			Hooks []string `yaml:"hooks"`
		} `yaml:"before"`
		Builds []struct {
			Main    string   `yaml:"main"`
			Ldflags []string `yaml:"ldflags"`
		} `yaml:"builds"`
		Archives []struct {
			Files []yaml.Node `yaml:"files"`
		} `yaml:"archives"`
	}
	if err := yaml.Unmarshal(data, &config); err != nil {
		t.Fatalf(".goreleaser.yaml: %v", err)
	}
	if config.Version != 2 {
		t.Errorf("version %d, want 2", config.Version)
	}
	folder := ""
	for _, hook := range config.Before.Hooks {
		fields := strings.Fields(hook)
		if i := slices.Index(fields, "manual"); i > 0 && i+1 < len(fields) && slices.Contains(fields, "./cmd/sill") && fields[0] == "go" && fields[1] == "run" {
			folder = fields[i+1]
		}
	}
	if folder == "" {
		t.Fatalf("no before-hook runs go run ./cmd/sill manual FOLDER: %q", config.Before.Hooks)
	}
	if len(config.Builds) == 0 || len(config.Archives) == 0 {
		t.Fatalf("%d builds, %d archives", len(config.Builds), len(config.Archives))
	}
	for _, b := range config.Builds {
		flags := strings.Join(b.Ldflags, " ")
		if b.Main != "./cmd/sill" || !strings.Contains(flags, "-X main.version=") || !strings.Contains(flags, "-X main.commit=") {
			t.Errorf("build of %s with ldflags %q: want ./cmd/sill setting main.version and main.commit", b.Main, flags)
		}
	}
	for i, a := range config.Archives {
		packed := false
		for _, f := range a.Files {
			var entry struct {
				Src, Dst string
			}
			if f.Kind == yaml.MappingNode && f.Decode(&entry) == nil && entry.Src == folder+"/*.1" && entry.Dst == "man/man1" {
				packed = true
			}
		}
		if !packed {
			t.Errorf("archive %d does not pack %s/*.1 into man/man1", i, folder)
		}
	}
}
