//go:build browser

// The browser test renders the report in headless Chromium (Debian's chromium package) and
// checks that the page loads without console messages and is not blank. It needs the
// browser, so it only builds with -tags browser (.ci/browser-check.sh installs chromium and
// runs it): go test -tags browser ./cmd/cyclopair/internal/htmlreport -run Browser
package htmlreport

import (
	"bytes"
	"context"
	"encoding/xml"
	"errors"
	"image"
	"image/png"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// chromium returns the browser binary: $CHROMIUM, else chromium or chromium-browser on PATH.
func chromium(t *testing.T) string {
	t.Helper()
	if c := os.Getenv("CHROMIUM"); c != "" {
		return c
	}
	for _, n := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(n); err == nil {
			return p
		}
	}
	t.Fatal("chromium not found: install Debian's chromium package (.ci/browser-check.sh does) or set CHROMIUM")
	return ""
}

// shoot renders file in headless Chromium and returns the screenshot and the console lines.
func shoot(t *testing.T, file string, w, h int) (image.Image, []string) {
	t.Helper()
	dir := t.TempDir()
	png1 := filepath.Join(dir, "shot.png")
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, chromium(t),
		"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--user-data-dir="+filepath.Join(dir, "profile"),
		"--window-size="+strconv.Itoa(w)+","+strconv.Itoa(h),
		"--screenshot="+png1, "--enable-logging=stderr", "--v=0",
		"file://"+file)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	cmd.Stdout = &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium: %v\n%s", err, stderr.String())
	}
	var console []string
	for _, l := range strings.Split(stderr.String(), "\n") {
		if strings.Contains(l, ":CONSOLE") {
			console = append(console, l)
		}
	}
	f, err := os.Open(png1)
	if err != nil {
		t.Fatalf("no screenshot: %v\n%s", err, stderr.String())
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	return img, console
}

// inkFraction is the share of pixels that are clearly not white (any channel below 230/255).
func inkFraction(img image.Image) float64 {
	b := img.Bounds()
	ink, all := 0, 0
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			all++
			if r < 230<<8 || g < 230<<8 || bl < 230<<8 {
				ink++
			}
		}
	}
	return float64(ink) / float64(all)
}

func TestBrowserRendersReport(t *testing.T) {
	doc := sample(t)
	dir := t.TempDir()
	file := filepath.Join(dir, "report.html")
	if err := os.WriteFile(file, doc, 0o644); err != nil {
		t.Fatal(err)
	}
	img, console := shoot(t, file, 1280, 2400)
	if len(console) > 0 {
		t.Errorf("console messages while loading the report:\n%s", strings.Join(console, "\n"))
	}
	// A blank or unstyled-error page has almost no ink; the report's first 2400 px hold the
	// caution box, the table and the first pair picture. 2 % is a loose floor (judgement,
	// no source); the report measures about 5-8 %.
	frac := inkFraction(img)
	t.Logf("report screenshot: %.1f %% non-white pixels", 100*frac)
	if frac < 0.02 {
		t.Errorf("report screenshot is (nearly) blank: %.2f %% non-white pixels", 100*frac)
	}
	if out := os.Getenv("CYCLOPAIR_SCREENSHOT"); out != "" {
		f, err := os.Create(out)
		if err == nil {
			_ = png.Encode(f, img)
			f.Close()
		}
	}
}

// TestBrowserControl checks the checker: a page that logs an error and a blank page must be
// caught, otherwise a silent browser would make the real test pass vacuously.
func TestBrowserControl(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.html")
	if err := os.WriteFile(bad, []byte(`<!DOCTYPE html><html><body><script>console.error("control");</script></body></html>`), 0o644); err != nil {
		t.Fatal(err)
	}
	img, console := shoot(t, bad, 400, 300)
	if len(console) == 0 {
		t.Error("console error of the control page not detected: the console check is blind")
	}
	if frac := inkFraction(img); frac > 0.001 {
		t.Errorf("blank control page has %.2f %% ink: the blank check is blind", 100*frac)
	}
}

// TestBrowserFiles renders the pages and pictures .ci/browser-check.sh built with the real
// commands (space-separated paths in $CYCLOPAIR_BROWSER_FILES): each must be well-formed XML,
// load without console messages and not be blank.
func TestBrowserFiles(t *testing.T) {
	files := strings.Fields(os.Getenv("CYCLOPAIR_BROWSER_FILES"))
	if len(files) == 0 {
		t.Skip("CYCLOPAIR_BROWSER_FILES not set (.ci/browser-check.sh sets it)")
	}
	for _, file := range files {
		doc, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		d := xml.NewDecoder(bytes.NewReader(doc))
		d.Strict = true
		w, h := 1280, 1600
		first := true
		for {
			tok, err := d.Token()
			if errors.Is(err, io.EOF) {
				break
			}
			if err != nil {
				t.Fatalf("%s is not well-formed: %v", file, err)
			}
			// a standalone SVG is shot at its own size, so the ink share is the picture's
			if se, ok := tok.(xml.StartElement); ok && first {
				first = false
				if se.Name.Local == "svg" {
					for _, a := range se.Attr {
						v, err := strconv.ParseFloat(a.Value, 64)
						if err != nil {
							continue
						}
						switch a.Name.Local {
						case "width":
							w = int(v + 0.5)
						case "height":
							h = int(v + 0.5)
						}
					}
				}
			}
		}
		abs, err := filepath.Abs(file)
		if err != nil {
			t.Fatal(err)
		}
		img, console := shoot(t, abs, w, h)
		if len(console) > 0 {
			t.Errorf("%s: console messages:\n%s", file, strings.Join(console, "\n"))
		}
		if frac := inkFraction(img); frac < 0.01 {
			t.Errorf("%s renders (nearly) blank: %.2f %% non-white pixels", file, 100*frac)
		} else {
			t.Logf("%s: %.1f %% non-white pixels", file, 100*frac)
		}
	}
}
