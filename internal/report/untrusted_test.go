package report_test

import (
	"context"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/report"
	"github.com/sill-tool/sill/internal/scores"
)

// TestWritersShowUntrustedTextSafely reads a table whose file name,
// column names and segment values hold terminal controls: the text and
// Markdown reports write them out visibly, and JSON escapes them.
func TestWritersShowUntrustedTextSafely(t *testing.T) {
	h := format.Hostile
	column := "yard\x1b]0;t\x07" // a header cell keeps no trailing CR
	table := "score,label,\"" + column + "\"\n" +
		"0.9,1,\"north" + h + "\"\n0.8,0,\"north" + h + "\"\n0.7,1,south\n0.6,0,south\n0.4,1,\"north" + h + "\"\n0.2,0,south\n"
	set, err := scores.Read(strings.NewReader(table), "scores"+h+".csv", scores.Options{SegmentColumn: column})
	if err != nil {
		t.Fatal(err)
	}
	res, err := analysis.Run(context.Background(), set, validation(set), analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := report.New(res, report.Options{})
	for name, write := range map[string]func(*strings.Builder) error{
		"text":     func(b *strings.Builder) error { return report.WriteText(b, r) },
		"markdown": func(b *strings.Builder) error { return report.WriteMarkdown(b, r, nil) },
	} {
		var b strings.Builder
		if err := write(&b); err != nil {
			t.Fatal(err)
		}
		out := b.String()
		if c, bad := format.Unsafe(out); bad {
			t.Errorf("%s: %q reaches the output raw:\n%s", name, c, out)
		}
		if !strings.Contains(out, `north\x1b]0;title\a\x1b[2J\x9b31m\u202eevil\r`) {
			t.Errorf("%s: the segment value is not shown escaped:\n%s", name, out)
		}
	}
	var b strings.Builder
	if err := report.WriteJSON(&b, r, nil); err != nil {
		t.Fatal(err)
	}
	if c, bad := format.Unsafe(b.String()); bad {
		t.Errorf("json: %q written raw:\n%s", c, b.String())
	}
}
