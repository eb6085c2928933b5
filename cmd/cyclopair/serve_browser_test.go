//go:build browser

// The web page in a real browser (issue 12): headless Chromium driven over the Chrome
// DevTools Protocol by github.com/chromedp/chromedp (a maintained driver; hand-writing a
// CDP client would mean our own websocket and protocol code for no gain). Run by
// .ci/browser-check.sh:
//
//	CHROMIUM=/usr/bin/chromium go test -tags browser -run Browser ./cmd/cyclopair
package main

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/log"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
)

func TestBrowserServe(t *testing.T) {
	exe := os.Getenv("CHROMIUM")
	if exe == "" {
		exe = "/usr/bin/chromium"
	}
	if _, err := os.Stat(exe); err != nil {
		t.Fatalf("no chromium at %s (set CHROMIUM): %v", exe, err)
	}
	// The server, in-process, on a free loopback port, with a small upload limit.
	sctx, stopServer := context.WithCancel(context.Background())
	ready := make(chan string, 1)
	served := make(chan error, 1)
	var serr bytes.Buffer
	go func() {
		served <- runServe(sctx, &streams{in: strings.NewReader(""), out: io.Discard, err: &serr},
			&serveOptions{addr: "127.0.0.1:0", maxUpload: 64 << 10, timeout: time.Minute, maxJobs: 2}, ready)
	}()
	base := "http://" + <-ready
	defer func() {
		stopServer()
		if err := <-served; err != nil {
			t.Errorf("server: %v", err)
		}
	}()

	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(exe),
		chromedp.Flag("headless", true), chromedp.NoSandbox, chromedp.DisableGPU,
		chromedp.Flag("disable-quic", true), chromedp.NoFirstRun,
		chromedp.Flag("disable-background-networking", true), chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true), chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1280, 1600),
	}
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	defer cancelAlloc()
	ctx, cancel := chromedp.NewContext(actx)
	defer cancel()
	ctx, cancelT := context.WithTimeout(ctx, 3*time.Minute)
	defer cancelT()

	// Every console message and log entry (CSP violations, failed loads) is kept.
	var mu sync.Mutex
	var console []string
	chromedp.ListenTarget(ctx, func(ev any) {
		mu.Lock()
		defer mu.Unlock()
		switch e := ev.(type) {
		case *runtime.EventConsoleAPICalled:
			var parts []string
			for _, a := range e.Args {
				parts = append(parts, string(a.Value))
			}
			console = append(console, fmt.Sprintf("console.%s: %s", e.Type, strings.Join(parts, " ")))
		case *runtime.EventExceptionThrown:
			console = append(console, "exception: "+e.ExceptionDetails.Text)
		case *log.EventEntryAdded:
			console = append(console, fmt.Sprintf("log %s/%s: %s %s", e.Entry.Source, e.Entry.Level, e.Entry.Text, e.Entry.URL))
		}
	})
	// takeConsole returns the messages since the last call, leaving out the browser's
	// report of the error status of a page we asked to fail (expected, status named).
	takeConsole := func(expectedStatus int) []string {
		mu.Lock()
		defer mu.Unlock()
		var out []string
		for _, c := range console {
			if expectedStatus != 0 && strings.Contains(c, fmt.Sprintf("status of %d", expectedStatus)) {
				t.Logf("expected: %s", c)
				continue
			}
			out = append(out, c)
		}
		console = nil
		return out
	}
	// The listener works: a message logged by the page is caught (so "no messages" below
	// means none, not a deaf listener).
	var probe any
	if err := chromedp.Run(ctx, log.Enable(), runtime.Enable(), chromedp.Navigate(base+"/"),
		chromedp.Evaluate(`console.error("probe")`, &probe)); err != nil {
		t.Fatal(err)
	}
	time.Sleep(200 * time.Millisecond)
	if c := takeConsole(0); len(c) != 1 || !strings.Contains(c[0], "probe") {
		t.Fatalf("console listener: %q", c)
	}

	// 1. The pair form: fill, tick lewis as well, submit; the result has the table (a row per
	// activation) and SVG pictures.
	var rows, svgs int
	var url, title string
	err := chromedp.Run(ctx,
		chromedp.Navigate(base+"/"),
		chromedp.WaitVisible("#pair-submit", chromedp.ByID),
		chromedp.SendKeys("#diene", "COC=CC=C", chromedp.ByID),
		chromedp.SendKeys("#dienophile", "C=CC(=O)OC", chromedp.ByID),
		chromedp.Click(`#pair-form + form input[value="lewis"]`, chromedp.ByQuery),
		chromedp.Click("#pair-submit", chromedp.ByID),
		chromedp.WaitVisible("#bookmark", chromedp.ByID),
		chromedp.Location(&url),
		chromedp.Title(&title),
		chromedp.Evaluate(`document.querySelectorAll("#ranking table tbody tr, #ranking ~ table tbody tr").length || document.querySelectorAll("table tbody tr").length`, &rows),
		chromedp.Evaluate(`document.querySelectorAll("svg").length`, &svgs),
	)
	if err != nil {
		t.Fatalf("pair form: %v", err)
	}
	if !strings.Contains(url, "/pair?") || !strings.Contains(url, "activate=none") || !strings.Contains(url, "lewis") {
		t.Errorf("result URL %s", url)
	}
	if !strings.Contains(title, "COC=CC=C + C=CC(=O)OC") || rows < 2 || svgs < 1 {
		t.Errorf("pair page: title %q, %d table rows, %d SVGs", title, rows, svgs)
	}
	if c := takeConsole(0); len(c) > 0 {
		t.Errorf("console messages on the pair page:\n%s", strings.Join(c, "\n"))
	}

	// 2. A bad SMILES shows the positioned error with its caret.
	var detail string
	err = chromedp.Run(ctx,
		chromedp.Navigate(base+"/"),
		chromedp.WaitVisible("#pair-submit", chromedp.ByID),
		chromedp.SendKeys("#diene", "C1CC(", chromedp.ByID),
		chromedp.SendKeys("#dienophile", "C=C", chromedp.ByID),
		chromedp.Click("#pair-submit", chromedp.ByID),
		chromedp.WaitVisible("#error-detail", chromedp.ByID),
		chromedp.Text("#error-detail", &detail, chromedp.ByID),
	)
	if err != nil {
		t.Fatalf("bad SMILES: %v", err)
	}
	if !strings.Contains(detail, "C1CC(: column 6:") || !strings.Contains(detail, "^") {
		t.Errorf("bad SMILES page: %q", detail)
	}
	if c := takeConsole(400); len(c) > 0 {
		t.Errorf("console messages on the error page:\n%s", strings.Join(c, "\n"))
	}

	// 3. A screen from uploaded files (SMILES names with commas, CSV): table and SVG.
	dir := t.TempDir() // the browser uploads from disk; the server writes nothing
	dienes, _ := filepath.Abs("../../testdata/lists/dienes.smi")
	dph, _ := filepath.Abs("../../testdata/lists/dienophiles.csv")
	err = chromedp.Run(ctx,
		chromedp.Navigate(base+"/"),
		chromedp.WaitVisible("#screen-submit", chromedp.ByID),
		chromedp.SetUploadFiles("#dienes_file", []string{dienes}, chromedp.ByID),
		chromedp.SetUploadFiles("#dienophiles_file", []string{dph}, chromedp.ByID),
		chromedp.Click("#screen-submit", chromedp.ByID),
		chromedp.WaitVisible("nav.serve", chromedp.ByQuery),
		chromedp.Evaluate(`document.querySelectorAll("table tbody tr").length`, &rows),
		chromedp.Evaluate(`document.querySelectorAll("svg").length`, &svgs),
		chromedp.Title(&title),
	)
	if err != nil {
		t.Fatalf("screen form: %v", err)
	}
	if rows < 12 || svgs < 1 {
		t.Errorf("screen page %q: %d table rows (want ≥ 12: 4 dienes × 3 dienophiles), %d SVGs", title, rows, svgs)
	}
	if c := takeConsole(0); len(c) > 0 {
		t.Errorf("console messages on the screen page:\n%s", strings.Join(c, "\n"))
	}

	// 4. An upload over the limit is refused with the 413 page.
	big := filepath.Join(dir, "big.smi")
	if err := os.WriteFile(big, bytes.Repeat([]byte("C=CC=C butadiene\n"), 8000), 0o600); err != nil {
		t.Fatal(err)
	}
	var h1 string
	err = chromedp.Run(ctx,
		chromedp.Navigate(base+"/"),
		chromedp.WaitVisible("#screen-submit", chromedp.ByID),
		chromedp.SetUploadFiles("#dienes_file", []string{big}, chromedp.ByID),
		chromedp.SendKeys("#dienophiles", "C=CC=O acrolein", chromedp.ByID),
		chromedp.Click("#screen-submit", chromedp.ByID),
		chromedp.WaitVisible("#error-title", chromedp.ByID),
		chromedp.Text("#error-title", &h1, chromedp.ByID),
		chromedp.Text("#error-message", &detail, chromedp.ByID),
	)
	if err != nil {
		t.Fatalf("oversize upload: %v", err)
	}
	if h1 != "Upload too large" || !strings.Contains(detail, "64 KiB") {
		t.Errorf("oversize page: %q %q", h1, detail)
	}
	if c := takeConsole(413); len(c) > 0 {
		t.Errorf("console messages on the 413 page:\n%s", strings.Join(c, "\n"))
	}
	t.Logf("browser check passed: pair, bad SMILES, screen upload, oversize upload; server log:\n%s", serr.String())
}
