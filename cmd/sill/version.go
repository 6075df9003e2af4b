package main

import (
	"regexp"
	"runtime/debug"
	"strings"
)

// Set by the release build (-X main.version=... -X main.commit=..., see
// .goreleaser.yaml); empty in every other build.
var (
	version = ""
	commit  = ""
)

// toolVersion names this build of sill, as `sill --version` prints it and
// a decision file's tool_version keeps it: "sill 1.2.0", "sill 1.2.0
// (commit abc1234)", "sill (commit abc1234, modified)" or "sill (unknown
// build)". See describeBuild.
func toolVersion() string {
	info, _ := debug.ReadBuildInfo()
	return describeBuild(version, commit, info)
}

// pseudoVersion matches the timestamp and commit that the go tool puts in
// a version it makes up for an untagged commit, such as
// v0.0.0-20261201223000-abcdef123456.
var pseudoVersion = regexp.MustCompile(`\d{14}-[0-9a-f]{12}(\+.*)?$`)

// describeBuild names a build from what is known about it, most telling
// first:
//   - the version and commit the release build sets with -ldflags;
//   - for a build from a checkout, the commit the build information
//     records (its first 7 hex digits) with "modified" when the checkout
//     had changes, after the version when the commit carries a release tag;
//   - for `go install module@version`, the module version;
//   - otherwise "unknown build".
//
// info may be nil (a binary without build information). A leading "v" is
// dropped from versions, so that a release reads the same however it was
// built.
func describeBuild(version, commit string, info *debug.BuildInfo) string {
	if version != "" {
		if commit != "" {
			return "sill " + strings.TrimPrefix(version, "v") + " (commit " + shortCommit(commit) + ")"
		}
		return "sill " + strings.TrimPrefix(version, "v")
	}
	if info == nil {
		return "sill (unknown build)"
	}
	var revision string
	var modified bool
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			revision = s.Value
		case "vcs.modified":
			modified = s.Value == "true"
		}
	}
	module := info.Main.Version
	if module == "(devel)" {
		module = ""
	}
	if revision != "" {
		what := "commit " + shortCommit(revision)
		if modified {
			what += ", modified"
		}
		// A tagged commit has a release version (with "+dirty" after it
		// when modified); an untagged one a made-up version, which says no
		// more than the commit.
		release, _, _ := strings.Cut(module, "+")
		if release == "" || pseudoVersion.MatchString(module) {
			return "sill (" + what + ")"
		}
		return "sill " + strings.TrimPrefix(release, "v") + " (" + what + ")"
	}
	if module != "" {
		return "sill " + strings.TrimPrefix(module, "v")
	}
	return "sill (unknown build)"
}

// shortCommit keeps the first 7 hex digits of a commit hash, as git
// abbreviates it.
func shortCommit(hash string) string {
	if len(hash) > 7 {
		return hash[:7]
	}
	return hash
}
