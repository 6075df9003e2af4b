package tui

import (
	"bytes"
	"encoding/csv"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/demo"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/review"
	"github.com/sill-tool/sill/internal/scores"
)

// noRawControl fails t when frame holds anything a terminal would act on
// (the frames are drawn with colour off, so not even a style's escape).
func noRawControl(t *testing.T, where, frame string) {
	t.Helper()
	if r, bad := format.Unsafe(frame); bad {
		t.Errorf("%s: %q reaches the screen raw:\n%s", where, r, frame)
	}
	if !strings.Contains(frame, `\x1b`) {
		t.Errorf("%s: the escape is not shown as \\x1b:\n%s", where, frame)
	}
}

// TestExplorerShowsUntrustedTextSafely reads the demo data with a file
// name, ids and segment values holding terminal controls, and checks the
// explorer's frames (header, list, segments overlay, strip of pins).
func TestExplorerShowsUntrustedTextSafely(t *testing.T) {
	// The demo data with the control text before every id and as the
	// name of one yard, written back as CSV (which quotes it).
	rows, err := csv.NewReader(bytes.NewReader(demo.CSV(demo.DefaultRows, demo.DefaultSeed))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	for i, row := range rows {
		if i > 0 {
			row[0] = format.Hostile + row[0]
			row[1] = strings.ReplaceAll(row[1], "north-yard", "north"+format.Hostile)
		}
		w.Write(row)
	}
	w.Flush()
	set, err := scores.Read(&b, "scores"+format.Hostile+".csv", scores.Options{SegmentColumn: "yard", IDColumn: "id"})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(set.ID(0), format.Hostile) || !slices.Contains(set.SegmentNames(), "north"+format.Hostile) {
		t.Fatalf("the control text did not reach the set: id %q, segments %q", set.ID(0), set.SegmentNames())
	}
	m := loaded(t, set, demoAssumptions, filepath.Join(t.TempDir(), "cut.yaml"), 140, 44)
	noRawControl(t, "explorer", m.View())
	m = keys(m, "p", "down", "down", "p", "tab")
	noRawControl(t, "strip", m.View())
	m = keys(m, "esc", "s")
	noRawControl(t, "segments", m.View())
}

// TestReviewShowsUntrustedTextSafely puts terminal controls into the
// candidates' names and notes, the file's note and the data's path, and
// checks the review screen, its note box and the text and Markdown
// writers of package review.
func TestReviewShowsUntrustedTextSafely(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	f, stamp := reviewFile(t, path)
	for i := range f.Candidates {
		if f.Candidates[i].Name == f.Chosen {
			f.Chosen = f.Candidates[i].Name + format.Hostile
		}
		f.Candidates[i].Name += format.Hostile
		f.Candidates[i].Note = "works " + format.Hostile
	}
	f.Note = "file " + format.Hostile
	f.Data.Path = "scores" + format.Hostile + ".csv"
	r := NewReview(ReviewConfig{File: f, Path: "cut" + format.Hostile + ".yaml", Stamp: stamp})
	r.saveTo = path
	r, _ = sendReview(t, r, tea.WindowSizeMsg{Width: 120, Height: 32})
	noRawControl(t, "review", r.View())
	r, _ = sendReview(t, r, keyPress("n"))
	noRawControl(t, "review note box", r.View())

	for name, write := range map[string]func(*strings.Builder) error{
		"text":     func(b *strings.Builder) error { return review.WriteText(b, f, "cut"+format.Hostile+".yaml", "") },
		"markdown": func(b *strings.Builder) error { return review.WriteMarkdown(b, f, "cut"+format.Hostile+".yaml") },
	} {
		var b strings.Builder
		if err := write(&b); err != nil {
			t.Fatal(err)
		}
		noRawControl(t, "review "+name, b.String())
	}
}
