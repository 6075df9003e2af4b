package main

import (
	"context"
	"errors"
	"os"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/demo"
)

// TestLoadStopsWhenCancelled: once the context ends, loading stops with
// its error whatever the route (a file, a counts table, standard input
// redirected from a file or piped), and a live context reads as before.
func TestLoadStopsWhenCancelled(t *testing.T) {
	dir := t.TempDir()
	path := writeFile(t, dir, "bearings.csv", demo.CSV(2000, 3))
	counts := writeFile(t, dir, "counts.csv", []byte("score,positives,negatives\n0.9,3,1\n0.2,1,5\n"))
	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	redirected := func(t *testing.T) *os.File {
		f, err := os.Open(path)
		if err != nil {
			t.Fatal(err)
		}
		t.Cleanup(func() { f.Close() })
		return f
	}
	for _, c := range []struct {
		name string
		load func(ctx context.Context) error
	}{
		{"file", func(ctx context.Context) error {
			_, err := (&inputFlags{}).load(ctx, path, nil, nil)
			return err
		}},
		{"counts", func(ctx context.Context) error {
			_, err := (&inputFlags{counts: true}).load(ctx, counts, nil, nil)
			return err
		}},
		{"redirected", func(ctx context.Context) error {
			_, err := (&inputFlags{}).load(ctx, "-", redirected(t), nil)
			return err
		}},
		{"piped", func(ctx context.Context) error {
			_, err := (&inputFlags{}).load(ctx, "-", strings.NewReader(string(demo.CSV(2000, 3))), nil)
			return err
		}},
	} {
		if err := c.load(cancelled); !errors.Is(err, context.Canceled) {
			t.Errorf("%s, cancelled: %v, want context.Canceled", c.name, err)
		}
		if err := c.load(context.Background()); err != nil {
			t.Errorf("%s: %v", c.name, err)
		}
	}
}
