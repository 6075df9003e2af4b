package page_test

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"

	"github.com/sill-tool/sill/internal/page"
)

// browser starts Debian's chromium headless for one test, with requests
// to any network blocked and every request the page makes recorded. Under
// CI a missing chromium fails the test (.ci/run installs it); elsewhere
// the test skips.
func browser(t *testing.T) (ctx context.Context, requests func() []string) {
	t.Helper()
	path, err := exec.LookPath("chromium")
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("chromium not found (%v); .ci/run installs Debian's chromium", err)
		}
		t.Skip("chromium not found; install Debian's chromium to load the page in a browser")
	}
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(path),
		chromedp.NoSandbox, // as root, chromium refuses to start sandboxed
		chromedp.DisableGPU,
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1100, 1400),
	)
	allocCtx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	var mu sync.Mutex
	var seen []string
	ctx, cancelTab := chromedp.NewContext(allocCtx, chromedp.WithListener(func(ev any) {
		if e, ok := ev.(*network.EventRequestWillBeSent); ok && e.Request != nil {
			mu.Lock()
			seen = append(seen, e.Request.URL)
			mu.Unlock()
		}
	}))
	ctx, cancelTime := context.WithTimeout(ctx, 90*time.Second)
	t.Cleanup(func() { cancelTime(); cancelTab(); cancelAlloc() })
	// Block every request that would leave the machine; the recorded
	// list tells whether the page tried.
	blocked := []*network.BlockPattern{}
	for _, scheme := range []string{"http", "https", "ws", "wss", "ftp"} {
		blocked = append(blocked, &network.BlockPattern{URLPattern: scheme + "://*:*/*", Block: true})
	}
	if _, err := chromedp.Call(ctx, network.SetBlockedURLs, network.SetBlockedURLsParams{URLPatterns: blocked}); err != nil {
		t.Fatalf("block the network: %v", err)
	}
	return ctx, func() []string {
		mu.Lock()
		defer mu.Unlock()
		return append([]string(nil), seen...)
	}
}

// load opens the file at path and waits until it is drawn.
func load(t *testing.T, ctx context.Context, path string) {
	t.Helper()
	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+path), chromedp.WaitReady("body")); err != nil {
		t.Fatalf("load %s: %v", path, err)
	}
}

// others are the requests other than the page itself.
func others(requests []string, path string) []string {
	var out []string
	for _, u := range requests {
		if u != "file://"+path {
			out = append(out, u)
		}
	}
	return out
}

// TestInBrowser loads the page from a file in headless chromium with the
// network blocked: no request leaves it, the charts are drawn with every
// candidate's label, and it prints to PDF. The screenshot and the PDF are
// kept in the test's temporary folder (go test -v prints where).
func TestInBrowser(t *testing.T) {
	ctx, requests := browser(t)
	dir := t.TempDir()

	// The control: a page that does ask for an image off the machine is
	// seen asking, so that the check below can fail.
	control := filepath.Join(dir, "control.html")
	if err := os.WriteFile(control, []byte(`<!DOCTYPE html><title>control</title><img src="http://192.0.2.1/x.png">`), 0o644); err != nil {
		t.Fatal(err)
	}
	load(t, ctx, control)
	if len(others(requests(), control)) == 0 {
		t.Fatal("the control page's request was not seen; the request count cannot be trusted")
	}

	f := fixture(t)
	var b bytes.Buffer
	if err := page.Write(&b, f, page.Options{Name: "parcels-cut.yaml"}); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "sign-off.html")
	if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	before := len(requests())
	load(t, ctx, path)
	if extra := others(requests()[before:], path); len(extra) > 0 {
		t.Errorf("the page asked for %d things from elsewhere: %v", len(extra), extra)
	}

	// Drawn charts: three SVGs with a size, and each candidate's label
	// drawn in them as text (on the trade-off, the ROC and the workload).
	drawn, err := chromedp.Run(ctx, chromedp.Evaluate[int](`[...document.querySelectorAll("figure svg")].filter(s => s.getBoundingClientRect().width > 200 && s.getBoundingClientRect().height > 100).length`))
	if err != nil || drawn != 3 {
		t.Errorf("%d charts drawn with a size (err %v), want 3", drawn, err)
	}
	labels, err := chromedp.Run(ctx, chromedp.Evaluate[map[string]int](`(() => {
		const count = {};
		for (const t of document.querySelectorAll("figure svg text")) {
			const box = t.getBBox();
			if (box.width > 0) count[t.textContent] = (count[t.textContent] || 0) + 1;
		}
		return count;
	})()`))
	if err != nil {
		t.Fatal(err)
	}
	for label, want := range map[string]int{"hit=0.8 (chosen)": 3, "top=6%": 3, "A&B <late>": 3} {
		if labels[label] != want {
			t.Errorf("label %q drawn %d times, want %d (labels drawn: %v)", label, labels[label], want, labels)
		}
	}
	// The note's markup is text on the page, not an element.
	scripts, err := chromedp.Run(ctx, chromedp.Evaluate[int](`document.scripts.length`))
	if err != nil || scripts != 0 {
		t.Errorf("%d scripts on the page (err %v), want none", scripts, err)
	}

	shot, err := chromedp.Run(ctx, chromedp.FullScreenshot(90))
	if err != nil || len(shot) == 0 {
		t.Fatalf("screenshot: %d bytes, %v", len(shot), err)
	}
	if err := os.WriteFile(filepath.Join(dir, "sign-off.png"), shot, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, paper := range []struct {
		name string
		size chromedp.PaperSize
	}{{"a4", chromedp.PaperA4}, {"letter", chromedp.PaperLetter}} {
		pdf, err := chromedp.Run(ctx, chromedp.PrintToPDF(chromedp.PDFPaper(paper.size), chromedp.PDFPreferCSSPageSize()))
		if err != nil {
			t.Fatalf("print to PDF on %s: %v", paper.name, err)
		}
		if !bytes.HasPrefix(pdf, []byte("%PDF")) {
			t.Fatalf("PDF on %s starts %q, want %%PDF", paper.name, pdf[:min(len(pdf), 8)])
		}
		if err := os.WriteFile(filepath.Join(dir, "sign-off-"+paper.name+".pdf"), pdf, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	t.Logf("screenshot and PDFs in %s", dir)
}
