package web

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"mime/multipart"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync"
	"testing"
	"time"
)

// fakeReport is a minimal page in the report's shape (head with a style sheet, body).
const fakeReport = "<!DOCTYPE html>\n<html><head><title>r</title><style>p{color:#000}</style></head>\n<body>\n<p>%s</p></body></html>\n"

// fake is a backend that echoes its input (as text, so the page must escape it) and can be
// told to block until released, to fill the job slots.
type fake struct {
	block   chan struct{}
	started chan struct{}
	mu      sync.Mutex
	screens []ScreenQuery
}

func (f *fake) backend() Backend {
	return Backend{
		Pair: func(ctx context.Context, q PairQuery, format string, out, log io.Writer) error {
			if f.started != nil {
				f.started <- struct{}{}
			}
			if f.block != nil {
				select {
				case <-f.block:
				case <-ctx.Done():
					return ctx.Err()
				}
			}
			if strings.Contains(q.Diene, "(") {
				return &InputError{Msg: "cyclopair: " + q.Diene + ": column 3: bad <b>SMILES</b>\n  " + q.Diene + "\n    ^"}
			}
			if format != "html" {
				fmt.Fprintf(out, "%s %s %s", format, q.Diene, q.Dienophile)
				return nil
			}
			fmt.Fprintf(out, fakeReport, q.Diene+" + "+q.Dienophile+" "+strings.Join(q.Activate, ","))
			return nil
		},
		Screen: func(ctx context.Context, q ScreenQuery, format string, out, log io.Writer) error {
			f.mu.Lock()
			f.screens = append(f.screens, q)
			f.mu.Unlock()
			fmt.Fprintf(out, fakeReport, format+" "+q.DienesName+" "+string(q.Dienes))
			fmt.Fprintf(log, "cyclopair: row <3> failed\n")
			return nil
		},
		PairFormats:   []Format{{Name: "json", Ext: ".jsonl", Label: "JSON Lines", Type: "application/jsonl"}},
		ScreenFormats: []Format{{Name: "csv", Ext: ".csv", Label: "CSV", Type: "text/csv"}},
		Modes:         []string{"none", "lewis"},
		Presets:       []string{"cyclopentadiene"},
		ListFormats:   []string{"smiles", "csv"},
	}
}

func get(t *testing.T, h http.Handler, target string) *httptest.ResponseRecorder {
	t.Helper()
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("GET", target, nil))
	return rec
}

func TestPairPageEscapesAndCarriesCSP(t *testing.T) {
	h := New((&fake{}).backend(), Limits{})
	rec := get(t, h, "/pair?diene=%3Cscript%3Ealert%3C%2Fscript%3E&dienophile=C%3DC&activate=none,lewis")
	// The fake report does not escape; the nav the page adds must. Its bookmark link carries
	// the diene and must be escaped in the attribute.
	body := rec.Body.String()
	if rec.Code != 200 {
		t.Fatalf("status %d: %s", rec.Code, body)
	}
	nav := body[strings.Index(body, "<nav"):]
	if strings.Contains(nav[:strings.Index(nav, "</nav>")], "<script") {
		t.Errorf("nav not escaped: %s", nav)
	}
	csp := rec.Header().Get("Content-Security-Policy")
	if !strings.HasPrefix(csp, "default-src 'none'; style-src 'sha256-") || strings.Contains(csp, "unsafe") || strings.Contains(csp, "http") {
		t.Errorf("CSP = %q", csp)
	}
	if n := strings.Count(csp, "'sha256-"); n != 2 {
		t.Errorf("CSP has %d style hashes, want 2 (the report's and the nav's): %s", n, csp)
	}
	if got := string(StripNav(rec.Body.Bytes())); got != fmt.Sprintf(fakeReport, "<script>alert</script> + C=C none,lewis") {
		t.Errorf("report changed by the page:\n%s", got)
	}
	if !strings.Contains(body, `href="/pair?activate=none%2clewis&amp;diene=%3cscript`) && !strings.Contains(body, `href="/pair?activate=none%2Clewis&amp;diene=%3Cscript`) {
		t.Errorf("bookmark link missing or unescaped: %s", nav[:200])
	}
	// Checkbox form: activate given twice.
	rec = get(t, h, "/pair?diene=C%3DCC%3DC&dienophile=C%3DC&activate=none&activate=lewis")
	if !strings.Contains(rec.Body.String(), "none,lewis") {
		t.Errorf("activate from checkboxes not joined")
	}
	// A download is an attachment with the same security headers.
	rec = get(t, h, "/pair?diene=C%3DCC%3DC&dienophile=C%3DC&format=json")
	if rec.Code != 200 || rec.Body.String() != "json C=CC=C C=C" || !strings.Contains(rec.Header().Get("Content-Disposition"), "pair.jsonl") {
		t.Errorf("download: %d %q %v", rec.Code, rec.Body.String(), rec.Header())
	}
	if rec := get(t, h, "/pair?diene=C&dienophile=C&format=exe"); rec.Code != 400 {
		t.Errorf("unknown format: status %d", rec.Code)
	}
}

func TestBadInputShowsPositionedErrorEscaped(t *testing.T) {
	h := New((&fake{}).backend(), Limits{})
	rec := get(t, h, "/pair?diene=C1CC(&dienophile=C%3DC")
	body := rec.Body.String()
	if rec.Code != 400 || !strings.Contains(body, "column 3: bad &lt;b&gt;SMILES&lt;/b&gt;\n  C1CC(\n    ^</pre>") {
		t.Errorf("status %d, body %s", rec.Code, body)
	}
	if rec := get(t, h, "/pair?diene=&dienophile=C"); rec.Code != 400 {
		t.Errorf("missing diene: %d", rec.Code)
	}
}

func multipartBody(t *testing.T, fields map[string]string, files map[string][2]string) (*bytes.Buffer, string) {
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
	return &b, mw.FormDataContentType()
}

func TestScreenFormAndDownloads(t *testing.T) {
	f := &fake{}
	h := New(f.backend(), Limits{})
	body, ct := multipartBody(t, map[string]string{"dienophiles": "C=C\r\nC=CC=O acrolein", "activate": "lewis", "top": "5", "input_format": "auto"},
		map[string][2]string{"dienes_file": {`C:\data\my <dienes>.smi`, "C=CC=C 1,3-butadiene"}})
	req := httptest.NewRequest("POST", "/screen", body)
	req.Header.Set("Content-Type", ct)
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	if rec.Code != 200 {
		t.Fatalf("status %d: %s", rec.Code, rec.Body)
	}
	q := f.screens[0]
	if q.DienesName != "my <dienes>.smi" || string(q.Dienes) != "C=CC=C 1,3-butadiene" || q.DienophilesName != "pasted-dienophiles.smi" ||
		string(q.Dienophiles) != "C=C\nC=CC=O acrolein" || q.Top != 5 || strings.Join(q.Activate, ",") != "lewis" || q.InputFormat != "" {
		t.Errorf("query %+v", q)
	}
	out := rec.Body.String()
	if !strings.Contains(out, "cyclopair: row &lt;3&gt; failed") {
		t.Errorf("run log not shown escaped")
	}
	i := strings.Index(out, "/screen/")
	link := out[i : i+strings.Index(out[i:], `"`)]
	rec = get(t, h, link)
	if rec.Code != 200 || !strings.HasPrefix(rec.Body.String(), "<!DOCTYPE html>") || !strings.Contains(rec.Body.String(), "csv my <dienes>.smi") {
		t.Errorf("download %s: %d %s", link, rec.Code, rec.Body)
	}
	if rec := get(t, h, "/screen/0123/screen.csv"); rec.Code != 404 {
		t.Errorf("unknown screen id: %d", rec.Code)
	}
	// Nothing to screen.
	body, ct = multipartBody(t, map[string]string{"dienes": "C=CC=C"}, nil)
	req = httptest.NewRequest("POST", "/screen", body)
	req.Header.Set("Content-Type", ct)
	rec = httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	if rec.Code != 400 || !strings.Contains(rec.Body.String(), "both a diene list and a dienophile list") {
		t.Errorf("one list only: %d", rec.Code)
	}
}

func TestOversizeUploadRefused(t *testing.T) {
	h := New((&fake{}).backend(), Limits{MaxUpload: 4096})
	body, ct := multipartBody(t, nil, map[string][2]string{"dienes_file": {"big.smi", strings.Repeat("C", 10000)}})
	req := httptest.NewRequest("POST", "/screen", body)
	req.Header.Set("Content-Type", ct)
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	if rec.Code != http.StatusRequestEntityTooLarge || !strings.Contains(rec.Body.String(), "larger than the limit of 4 KiB") {
		t.Errorf("status %d: %s", rec.Code, rec.Body)
	}
	if rec.Header().Get("Content-Security-Policy") == "" {
		t.Error("error page without CSP")
	}
}

func TestJobLimitAndTimeout(t *testing.T) {
	f := &fake{block: make(chan struct{}), started: make(chan struct{}, 4)}
	h := New(f.backend(), Limits{MaxJobs: 1, Timeout: 300 * time.Millisecond})
	var wg sync.WaitGroup
	wg.Add(1)
	var first *httptest.ResponseRecorder
	go func() { defer wg.Done(); first = get(t, h, "/pair?diene=C%3DCC%3DC&dienophile=C%3DC") }()
	<-f.started
	if rec := get(t, h, "/pair?diene=C%3DCC%3DC&dienophile=C%3DC"); rec.Code != 503 || !strings.Contains(rec.Body.String(), "Busy") || rec.Header().Get("Retry-After") == "" {
		t.Errorf("second job: %d %s", rec.Code, rec.Body)
	}
	wg.Wait() // the first times out (the fake honours the context)
	if first.Code != 503 || !strings.Contains(first.Body.String(), "did not finish within the limit of 300ms") {
		t.Errorf("timed-out job: %d %s", first.Code, first.Body)
	}
	close(f.block)
	time.Sleep(50 * time.Millisecond) // the slot frees when the job goroutine ends
	f.started = nil
	if rec := get(t, h, "/pair?diene=C%3DCC%3DC&dienophile=C%3DC"); rec.Code != 200 {
		t.Errorf("after the time-out: %d", rec.Code)
	}
}

func TestHomeAndHostCheck(t *testing.T) {
	h := New((&fake{}).backend(), Limits{Loopback: true})
	req := httptest.NewRequest("GET", "/", nil)
	req.Host = "127.0.0.1:8080"
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), `name="activate" value="lewis"`) || !strings.Contains(rec.Body.String(), `enctype="multipart/form-data"`) {
		t.Errorf("home: %d", rec.Code)
	}
	if strings.Contains(rec.Body.String(), "<script") {
		t.Error("home has a script")
	}
	req.Host = "evil.example:8080"
	rec = httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	if rec.Code != http.StatusMisdirectedRequest {
		t.Errorf("rebound host: %d", rec.Code)
	}
	for _, host := range []string{"localhost:8080", "127.0.0.1:1", "[::1]:80"} {
		req.Host = host
		rec = httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		if rec.Code != 200 {
			t.Errorf("host %s: %d", host, rec.Code)
		}
	}
}
