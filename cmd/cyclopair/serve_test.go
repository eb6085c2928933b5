package main

import (
	"bytes"
	"context"
	"io"
	"mime/multipart"
	"net/http"
	"net/http/httptest"
	"net/url"
	"os"
	"strings"
	"testing"
	"time"

	"cyclopair/cmd/cyclopair/internal/web"
)

func serveHandler() http.Handler {
	return web.New(webBackend(), web.Limits{MaxUpload: 1 << 20, Timeout: time.Minute, MaxJobs: 2})
}

func serveGet(t *testing.T, h http.Handler, target string) *httptest.ResponseRecorder {
	t.Helper()
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("GET", target, nil))
	return rec
}

// The pair page is the CLI's 'pair --format html' page for the same inputs, byte for byte
// once the bar the page adds is removed; the JSON download is the CLI's JSON Lines.
func TestServePairEqualsCLI(t *testing.T) {
	h := serveHandler()
	q := url.Values{"diene": {"COC=CC=C"}, "dienophile": {"C=CC(=O)OC"}, "activate": {"none,lewis"}}
	rec := serveGet(t, h, "/pair?"+q.Encode())
	if rec.Code != 200 {
		t.Fatalf("status %d: %s", rec.Code, rec.Body)
	}
	cli, errOut, code := runCLI(t, "", "pair", "--diene", "COC=CC=C", "--dienophile", "C=CC(=O)OC", "--activate", "none,lewis", "--format", "html")
	if code != 0 {
		t.Fatalf("CLI exit %d: %s", code, errOut)
	}
	if got := string(web.StripNav(rec.Body.Bytes())); got != cli {
		t.Errorf("page differs from the CLI's HTML (%d vs %d bytes)", len(got), len(cli))
	}
	if !strings.Contains(rec.Body.String(), `id="bookmark"`) {
		t.Error("no bookmark link")
	}
	// Preset names work in the link as on the command line.
	rec = serveGet(t, h, "/pair?diene=cyclopentadiene&dienophile=maleic-anhydride&format=json")
	cli, _, _ = runCLI(t, "", "pair", "--diene", "cyclopentadiene", "--dienophile", "maleic-anhydride", "--format", "json")
	if rec.Code != 200 || rec.Body.String() != cli || cli == "" {
		t.Errorf("JSON download (%d) differs from the CLI's", rec.Code)
	}
	// The π method chosen on the form is the CLI's --method.
	rec = serveGet(t, h, "/pair?diene=cyclopentadiene&dienophile=maleic-anhydride&method=ppp&format=json")
	cli, _, _ = runCLI(t, "", "pair", "--diene", "cyclopentadiene", "--dienophile", "maleic-anhydride", "--method", "ppp", "--format", "json")
	if rec.Code != 200 || rec.Body.String() != cli || !strings.Contains(cli, `"method":"ppp"`) {
		t.Errorf("method=ppp (%d) differs from the CLI's --method ppp", rec.Code)
	}
	if rec := serveGet(t, h, "/pair?diene=C%3DCC%3DC&dienophile=C%3DC&method=magic"); rec.Code != 400 || !strings.Contains(rec.Body.String(), "--method") {
		t.Errorf("unknown method: %d", rec.Code)
	}
	rec = serveGet(t, h, "/pair?diene=cyclopentadiene&dienophile=maleic-anhydride&activate=none,lewis&format=sdf")
	cli, _, _ = runCLI(t, "", "pair", "--diene", "cyclopentadiene", "--dienophile", "maleic-anhydride", "--activate", "none,lewis", "--format", "sdf")
	if rec.Code != 200 || rec.Body.String() != cli || !strings.Contains(cli, "$$$$") {
		t.Errorf("SDF download (%d) differs from the CLI's", rec.Code)
	}
}

// A bad SMILES gives the CLI's positioned error line with its caret, escaped, status 400.
func TestServeBadSMILES(t *testing.T) {
	rec := serveGet(t, serveHandler(), "/pair?diene="+url.QueryEscape("C=CC(=C<b>")+"&dienophile=C%3DC")
	_, cliErr, _ := runCLI(t, "", "pair", "--diene", "C=CC(=C<b>", "--dienophile", "C=C")
	body := rec.Body.String()
	first := strings.SplitN(strings.TrimSpace(cliErr), "\n", 2)[0]
	if rec.Code != 400 || !strings.Contains(body, "column 8") || strings.Contains(body, "<b>") {
		t.Fatalf("status %d: %s", rec.Code, body)
	}
	esc := strings.NewReplacer("<", "&lt;", ">", "&gt;", "'", "&#39;", `"`, "&#34;").Replace(first)
	if !strings.Contains(body, esc) {
		t.Errorf("page lacks the CLI's error line %q", esc)
	}
}

func postScreen(t *testing.T, h http.Handler, fields map[string]string, files map[string][2]string) *httptest.ResponseRecorder {
	t.Helper()
	var b bytes.Buffer
	mw := multipart.NewWriter(&b)
	for k, v := range fields {
		_ = mw.WriteField(k, v)
	}
	for k, f := range files {
		w, _ := mw.CreateFormFile(k, f[0])
		_, _ = w.Write([]byte(f[1]))
	}
	_ = mw.Close()
	req := httptest.NewRequest("POST", "/screen", &b)
	req.Header.Set("Content-Type", mw.FormDataContentType())
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec
}

// A screen uploaded to the page is the CLI's screen of the same file: the HTML report and
// the CSV download byte for byte, the failed rows in the page's messages.
func TestServeScreenEqualsCLI(t *testing.T) {
	t.Chdir("../../testdata/screen")
	data, err := os.ReadFile("small.yaml")
	if err != nil {
		t.Fatal(err)
	}
	h := serveHandler()
	rec := postScreen(t, h, nil, map[string][2]string{"yaml_file": {"small.yaml", string(data)}})
	if rec.Code != 200 {
		t.Fatalf("status %d: %s", rec.Code, rec.Body)
	}
	cli, cliErr, _ := runCLI(t, "", "screen", "small.yaml", "--format", "html")
	if got := string(web.StripNav(rec.Body.Bytes())); got != cli {
		t.Errorf("screen page differs from the CLI's HTML (%d vs %d bytes)", len(got), len(cli))
	}
	firstErr := strings.SplitN(cliErr, "\n", 2)[0]
	if !strings.Contains(rec.Body.String(), strings.ReplaceAll(strings.ReplaceAll(firstErr, `"`, "&#34;"), "'", "&#39;")) {
		t.Errorf("page lacks the failed row %q", firstErr)
	}
	body := rec.Body.String()
	i := strings.Index(body, "/screen/")
	link := body[i : i+strings.Index(body[i:], `"`)]
	if !strings.HasSuffix(link, ".csv") {
		t.Fatalf("first download %q is not the CSV", link)
	}
	dl := serveGet(t, h, link)
	cliCSV, _, _ := runCLI(t, "", "screen", "small.yaml", "--format", "csv")
	if dl.Code != 200 || dl.Body.String() != cliCSV {
		t.Errorf("CSV download (%d) differs from the CLI's", dl.Code)
	}
	// Lists pasted and uploaded: the same as --dienes/--dienophiles files.
	dienes, _ := os.ReadFile("../lists/dienes.smi")
	dph, _ := os.ReadFile("../lists/dienophiles.csv")
	rec = postScreen(t, h, map[string]string{"activate": "none,lewis", "top": "5"},
		map[string][2]string{"dienes_file": {"dienes.smi", string(dienes)}, "dienophiles_file": {"dienophiles.csv", string(dph)}})
	t.Chdir("../lists")
	cli, _, _ = runCLI(t, "", "screen", "--dienes", "dienes.smi", "--dienophiles", "dienophiles.csv", "--activate", "none,lewis", "--top", "5", "--format", "html")
	if rec.Code != 200 || string(web.StripNav(rec.Body.Bytes())) != cli {
		t.Errorf("list screen (%d) differs from the CLI's", rec.Code)
	}
	// The π method of the screen form is the CLI's --method.
	rec = postScreen(t, h, map[string]string{"method": "ppp", "top": "3", "dienophiles": "C=CC=O acrolein\nC=CC(=O)OC methyl acrylate"},
		map[string][2]string{"dienes_file": {"dienes.smi", string(dienes)}})
	dl = serveGet(t, h, downloadLink(t, rec.Body.String(), ".csv"))
	cli, _, _ = runCLI(t, "C=CC=O acrolein\nC=CC(=O)OC methyl acrylate", "screen", "--dienes", "dienes.smi", "--dienophiles", "-", "--method", "ppp", "--top", "3", "--format", "csv")
	if dl.Code != 200 || dl.Body.String() != cli || !strings.Contains(cli, "ppp") {
		t.Errorf("method=ppp screen (%d) differs from the CLI's:\n%s\nwant\n%s", dl.Code, dl.Body, cli)
	}
}

func downloadLink(t *testing.T, body, ext string) string {
	t.Helper()
	for _, part := range strings.Split(body, `"`) {
		if strings.HasPrefix(part, "/screen/") && strings.HasSuffix(part, ext) {
			return part
		}
	}
	t.Fatalf("no %s download link", ext)
	return ""
}

func TestServeRefusesServerFiles(t *testing.T) {
	for _, extra := range []string{"params: /etc/passwd", "params_file: x.yaml", "calibration: my-cal.yaml", "method: ppp\nppp_params: /etc/passwd"} {
		yaml := "dienes: [{name: b, smiles: C=CC=C}]\ndienophiles: [{name: e, smiles: C=C}]\n" + extra + "\n"
		rec := postScreen(t, serveHandler(), map[string]string{"yaml": yaml}, nil)
		if rec.Code != 400 || !strings.Contains(rec.Body.String(), "reads no files from the server") {
			t.Errorf("%s: status %d: %s", extra, rec.Code, rec.Body)
		}
	}
}

func TestServeOversize(t *testing.T) {
	h := web.New(webBackend(), web.Limits{MaxUpload: 2048})
	rec := postScreen(t, h, map[string]string{"dienophiles": "C=C"}, map[string][2]string{"dienes_file": {"d.smi", strings.Repeat("C=CC=C x\n", 1000)}})
	if rec.Code != http.StatusRequestEntityTooLarge {
		t.Errorf("status %d", rec.Code)
	}
}

// runServe listens, answers and stops when its context ends (SIGINT/SIGTERM in the
// command); a non-loopback address is warned about.
func TestRunServeShutsDown(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	ready := make(chan string, 1)
	var errb bytes.Buffer
	s := &streams{in: strings.NewReader(""), out: io.Discard, err: &errb}
	done := make(chan error, 1)
	go func() {
		done <- runServe(ctx, s, &serveOptions{addr: "127.0.0.1:0", maxUpload: 1 << 20, timeout: 10 * time.Second, maxJobs: 1}, ready)
	}()
	addr := <-ready
	resp, err := http.Get("http://" + addr + "/")
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != 200 || !strings.HasPrefix(resp.Header.Get("Content-Security-Policy"), "default-src 'none'") {
		t.Errorf("GET /: %d %v", resp.StatusCode, resp.Header)
	}
	cancel()
	select {
	case err := <-done:
		if err != nil {
			t.Errorf("runServe: %v", err)
		}
	case <-time.After(15 * time.Second):
		t.Fatal("server did not stop")
	}
	if !strings.Contains(errb.String(), "serving on http://127.0.0.1:") || strings.Contains(errb.String(), "warning") {
		t.Errorf("stderr: %s", errb.String())
	}
	_, errOut, code := runCLI(t, "", "serve", "--addr", "nonsense")
	if code != 2 || !strings.Contains(errOut, "HOST:PORT") {
		t.Errorf("bad --addr: %d %s", code, errOut)
	}
}
