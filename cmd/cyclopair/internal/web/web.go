// Package web is the local web page of 'cyclopair serve': a form for one pair and a form for
// a screen (pasted or uploaded YAML substrate file, SMILES, CSV/TSV or SD lists), answered
// with the same HTML report, pictures and downloads the command line writes. The analysis
// itself is not done here: the command passes a Backend that runs the CLI's own code paths,
// so a page and the CLI's output for the same inputs are the same bytes.
//
// Safety, for a page meant to run on a chemist's own machine:
//   - nothing is written to disk: uploads are read part by part into memory, capped at
//     Limits.MaxUpload (a larger request gets a 413 page); screens kept for their download
//     links live in a small in-memory store;
//   - Limits.Timeout bounds each analysis (503 page when exceeded) and Limits.MaxJobs the
//     analyses running at once (503 page "busy");
//   - every string from the user is escaped by html/template; pages carry no scripts and a
//     Content-Security-Policy of default-src 'none' that allows only the page's own inline
//     style sheets (by hash), data: images (the report's empty icon) and forms posted to
//     the same origin;
//   - a server bound to loopback answers only requests whose Host is a loopback name, so a
//     web site cannot reach it through DNS rebinding.
package web

import (
	"bytes"
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
	"encoding/hex"
	"errors"
	"fmt"
	"html/template"
	"io"
	"mime"
	"net"
	"net/http"
	"net/url"
	"path"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"
)

// PairQuery is one pair as the form or a bookmarked link asks for it.
type PairQuery struct {
	Diene, Dienophile string   // SMILES or preset names
	Activate          []string // activation modes, in order
	Method            string   // π method, "" for the default
}

// Values is the query string of the bookmarkable link: /pair?diene=…&dienophile=…&activate=a,b.
func (q PairQuery) Values() url.Values {
	v := url.Values{}
	v.Set("diene", q.Diene)
	v.Set("dienophile", q.Dienophile)
	if len(q.Activate) > 0 {
		v.Set("activate", strings.Join(q.Activate, ","))
	}
	if q.Method != "" {
		v.Set("method", q.Method)
	}
	return v
}

// ScreenQuery is one screen as the form sends it. File contents are in memory.
type ScreenQuery struct {
	YAML                []byte // substrate file (nil: lists only)
	YAMLName            string
	Dienes, Dienophiles []byte // list files replacing the substrate file's lists (nil: none)
	DienesName          string // names with the extension that says the format
	DienophilesName     string
	InputFormat         string // "" by extension, else smiles, csv, tsv or sdf
	NameField           string // SD property holding the name
	Activate            []string
	Top                 int
	Method              string
}

// InputError is an error about the user's input: the page shows Msg with status 400.
type InputError struct{ Msg string }

func (e *InputError) Error() string { return e.Msg }

// Format is a download the backend can write.
type Format struct {
	Name  string // as passed to the backend: "csv", "json", "sdf"
	Ext   string // file extension of the download
	Label string // link text
	Type  string // Content-Type
}

// Backend runs the analyses. Each function writes the result in format ("html" or the Name
// of one of the Formats) to out and messages for people (failed rows, warnings) to log; an
// *InputError is shown as a 400 page, a context error as a time-out page.
type Backend struct {
	Pair          func(ctx context.Context, q PairQuery, format string, out, log io.Writer) error
	Screen        func(ctx context.Context, q ScreenQuery, format string, out, log io.Writer) error
	PairFormats   []Format
	ScreenFormats []Format
	Modes         []string // activation modes; the first is the default
	Methods       []string // π methods offered (empty: no choice on the form)
	Presets       []string // substrate names the pair form suggests
	ListFormats   []string // list formats for the screen form
}

// Limits protect the machine the page runs on.
type Limits struct {
	MaxUpload int64         // bytes per request body (default 4 MiB)
	Timeout   time.Duration // per analysis (default 60 s)
	MaxJobs   int           // analyses at once (default 2)
	Loopback  bool          // bound to loopback: accept loopback Host headers only
}

// Server is the http.Handler of the page.
type Server struct {
	b     Backend
	lim   Limits
	jobs  chan struct{}
	mux   *http.ServeMux
	store *store
}

// New returns the page's handler.
func New(b Backend, lim Limits) *Server {
	if b.Pair == nil || b.Screen == nil || len(b.Modes) == 0 {
		panic("web.New: Backend needs Pair, Screen and Modes")
	}
	if lim.MaxUpload <= 0 {
		lim.MaxUpload = 4 << 20
	}
	if lim.Timeout <= 0 {
		lim.Timeout = 60 * time.Second
	}
	if lim.MaxJobs <= 0 {
		lim.MaxJobs = 2
	}
	s := &Server{b: b, lim: lim, jobs: make(chan struct{}, lim.MaxJobs), mux: http.NewServeMux(),
		store: &store{max: 32, ttl: time.Hour, m: map[string]*stored{}}}
	s.mux.HandleFunc("GET /{$}", s.home)
	s.mux.HandleFunc("GET /pair", s.pair)
	s.mux.HandleFunc("POST /screen", s.screen)
	s.mux.HandleFunc("GET /screen/{id}/{file}", s.download)
	s.mux.HandleFunc("GET /favicon.ico", func(w http.ResponseWriter, r *http.Request) { w.WriteHeader(http.StatusNoContent) })
	return s
}

// ServeHTTP checks the Host (loopback servers) and dispatches.
func (s *Server) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	if s.lim.Loopback && !loopbackHost(r.Host) {
		s.fail(w, http.StatusMisdirectedRequest, "Wrong host name",
			"This page answers only at a loopback address (127.0.0.1, [::1] or localhost).", "")
		return
	}
	s.mux.ServeHTTP(w, r)
}

func loopbackHost(hostport string) bool {
	h := hostport
	if hh, _, err := net.SplitHostPort(hostport); err == nil {
		h = hh
	}
	h = strings.Trim(h, "[]")
	if strings.EqualFold(h, "localhost") {
		return true
	}
	ip := net.ParseIP(h)
	return ip != nil && ip.IsLoopback()
}

// ---- pages -------------------------------------------------------------------------------

func (s *Server) home(w http.ResponseWriter, r *http.Request) {
	var buf bytes.Buffer
	data := map[string]any{
		"Modes": s.b.Modes, "Methods": s.b.Methods, "Presets": s.b.Presets, "ListFormats": s.b.ListFormats,
		"MaxUpload": humanBytes(s.lim.MaxUpload), "Timeout": s.lim.Timeout.String(),
	}
	if err := homeTmpl.Execute(&buf, data); err != nil {
		http.Error(w, err.Error(), http.StatusInternalServerError)
		return
	}
	s.send(w, http.StatusOK, buf.Bytes())
}

func (s *Server) pair(w http.ResponseWriter, r *http.Request) {
	v := r.URL.Query()
	q := PairQuery{Diene: v.Get("diene"), Dienophile: v.Get("dienophile"), Method: v.Get("method")}
	for _, a := range v["activate"] {
		for _, m := range strings.Split(a, ",") {
			if m = strings.TrimSpace(m); m != "" && !slices.Contains(q.Activate, m) {
				q.Activate = append(q.Activate, m)
			}
		}
	}
	if strings.TrimSpace(q.Diene) == "" || strings.TrimSpace(q.Dienophile) == "" {
		s.fail(w, http.StatusBadRequest, "Missing partner", "Give both a diene and a dienophile (SMILES or a built-in name).", "")
		return
	}
	format := v.Get("format")
	var dl *Format
	if format != "" && format != "html" {
		for i := range s.b.PairFormats {
			if s.b.PairFormats[i].Name == format {
				dl = &s.b.PairFormats[i]
			}
		}
		if dl == nil {
			s.fail(w, http.StatusBadRequest, "Unknown format", "format="+format+" is not one of the downloads.", "")
			return
		}
	}
	out, log, ok := s.run(w, r, func(ctx context.Context, out, log io.Writer) error {
		return s.b.Pair(ctx, q, formatName(dl), out, log)
	})
	if !ok {
		return
	}
	if dl != nil {
		s.attach(w, "pair"+dl.Ext, dl.Type, out)
		return
	}
	link := "/pair?" + q.Values().Encode()
	var downloads []link_
	for _, f := range s.b.PairFormats {
		downloads = append(downloads, link_{f.Label, link + "&format=" + url.QueryEscape(f.Name)})
	}
	s.report(w, out, nav{Bookmark: link, Downloads: downloads, Log: log})
}

func (s *Server) screen(w http.ResponseWriter, r *http.Request) {
	q, err := s.readScreenForm(w, r)
	if err != nil {
		var tooBig *http.MaxBytesError
		if errors.As(err, &tooBig) {
			s.fail(w, http.StatusRequestEntityTooLarge, "Upload too large",
				fmt.Sprintf("The files and text sent together are larger than the limit of %s. Screen fewer molecules at once, or run 'cyclopair screen' on the command line.", humanBytes(s.lim.MaxUpload)), "")
			return
		}
		s.fail(w, http.StatusBadRequest, "Cannot read the form", err.Error(), "")
		return
	}
	out, log, ok := s.run(w, r, func(ctx context.Context, out, log io.Writer) error {
		return s.b.Screen(ctx, q, "html", out, log)
	})
	if !ok {
		return
	}
	id := s.store.put(q)
	var downloads []link_
	for _, f := range s.b.ScreenFormats {
		downloads = append(downloads, link_{f.Label, "/screen/" + id + "/screen" + f.Ext})
	}
	s.report(w, out, nav{Downloads: downloads, Log: log})
}

func (s *Server) download(w http.ResponseWriter, r *http.Request) {
	q, ok := s.store.get(r.PathValue("id"))
	if !ok {
		s.fail(w, http.StatusNotFound, "Screen no longer kept",
			"Downloads are kept in memory for an hour (the last 32 screens). Submit the screen again.", "")
		return
	}
	file := r.PathValue("file")
	var dl *Format
	for i := range s.b.ScreenFormats {
		if "screen"+s.b.ScreenFormats[i].Ext == file {
			dl = &s.b.ScreenFormats[i]
		}
	}
	if dl == nil {
		s.fail(w, http.StatusNotFound, "No such download", "", "")
		return
	}
	out, _, ok := s.run(w, r, func(ctx context.Context, out, log io.Writer) error {
		return s.b.Screen(ctx, q, dl.Name, out, log)
	})
	if ok {
		s.attach(w, file, dl.Type, out)
	}
}

func formatName(f *Format) string {
	if f == nil {
		return "html"
	}
	return f.Name
}

// run runs one analysis under the job and time limits. When it fails it has written the
// error page and returns ok false.
func (s *Server) run(w http.ResponseWriter, r *http.Request, job func(ctx context.Context, out, log io.Writer) error) (out []byte, log string, ok bool) {
	select {
	case s.jobs <- struct{}{}:
	default:
		w.Header().Set("Retry-After", "10")
		s.fail(w, http.StatusServiceUnavailable, "Busy",
			fmt.Sprintf("%d analyses are already running, the most this page runs at once. Try again in a moment.", s.lim.MaxJobs), "")
		return nil, "", false
	}
	ctx, cancel := context.WithTimeout(r.Context(), s.lim.Timeout)
	defer cancel()
	type result struct {
		out, log []byte
		err      error
	}
	done := make(chan result, 1)
	go func() {
		// The slot is freed when the job ends, not when the page gives up waiting: an
		// analysis that ignores the context still counts against MaxJobs.
		defer func() { <-s.jobs }()
		var o, l bytes.Buffer
		err := job(ctx, &o, &l)
		done <- result{o.Bytes(), l.Bytes(), err}
	}()
	var res result
	select {
	case res = <-done:
	case <-ctx.Done():
		res.err = ctx.Err()
	}
	if res.err == nil && ctx.Err() != nil {
		res.err = ctx.Err()
	}
	var ie *InputError
	switch {
	case res.err == nil:
		return res.out, string(res.log), true
	case errors.Is(res.err, context.DeadlineExceeded) || errors.Is(res.err, context.Canceled) || ctx.Err() != nil:
		s.fail(w, http.StatusServiceUnavailable, "Took too long",
			fmt.Sprintf("The analysis did not finish within the limit of %s. Screen fewer molecules, use a smaller top K, or run 'cyclopair screen' on the command line.", s.lim.Timeout), "")
	case errors.As(res.err, &ie):
		s.fail(w, http.StatusBadRequest, "Cannot analyse this input", "", strings.TrimRight(ie.Msg+"\n"+string(res.log), "\n"))
	default:
		s.fail(w, http.StatusInternalServerError, "Internal error", res.err.Error(), string(res.log))
	}
	return nil, "", false
}

// readScreenForm reads the multipart (or URL-encoded) screen form into memory, part by
// part, never past Limits.MaxUpload in all.
func (s *Server) readScreenForm(w http.ResponseWriter, r *http.Request) (ScreenQuery, error) {
	r.Body = http.MaxBytesReader(w, r.Body, s.lim.MaxUpload)
	fields := map[string][]byte{}
	files := map[string]string{} // field → uploaded file name
	ct, _, _ := mime.ParseMediaType(r.Header.Get("Content-Type"))
	var activate []string
	if ct == "multipart/form-data" {
		mr, err := r.MultipartReader()
		if err != nil {
			return ScreenQuery{}, err
		}
		for {
			p, err := mr.NextPart()
			if err == io.EOF {
				break
			}
			if err != nil {
				return ScreenQuery{}, err
			}
			data, err := io.ReadAll(p) // bounded by MaxBytesReader
			if err != nil {
				return ScreenQuery{}, err
			}
			name := p.FormName()
			if name == "activate" {
				activate = append(activate, string(data))
				continue
			}
			if fn := p.FileName(); fn != "" || strings.HasSuffix(name, "_file") {
				if len(data) == 0 {
					continue // an empty file input
				}
				files[name] = path.Base(strings.ReplaceAll(fn, "\\", "/"))
			}
			fields[name] = data
		}
	} else {
		if err := r.ParseForm(); err != nil {
			return ScreenQuery{}, err
		}
		for k, v := range r.PostForm {
			if k == "activate" {
				activate = v
				continue
			}
			fields[k] = []byte(strings.Join(v, "\n"))
		}
	}
	q := ScreenQuery{InputFormat: strings.TrimSpace(string(fields["input_format"])), NameField: strings.TrimSpace(string(fields["name_field"])),
		Method: strings.TrimSpace(string(fields["method"]))}
	if q.InputFormat == "auto" {
		q.InputFormat = ""
	}
	for _, a := range activate {
		for _, m := range strings.Split(a, ",") {
			if m = strings.TrimSpace(m); m != "" && !slices.Contains(q.Activate, m) {
				q.Activate = append(q.Activate, m)
			}
		}
	}
	if t := strings.TrimSpace(string(fields["top"])); t != "" {
		n, err := strconv.Atoi(t)
		if err != nil || n < 0 {
			return q, fmt.Errorf("top: %q is not a whole number ≥ 0", clip(t))
		}
		q.Top = n
	}
	pick := func(field, pasted string) ([]byte, string) {
		if d, ok := fields[field+"_file"]; ok && len(d) > 0 {
			return d, files[field+"_file"]
		}
		if d := fields[field]; len(bytes.TrimSpace(d)) > 0 {
			return bytes.ReplaceAll(d, []byte("\r\n"), []byte("\n")), pasted
		}
		return nil, ""
	}
	q.YAML, q.YAMLName = pick("yaml", "pasted.yaml")
	q.Dienes, q.DienesName = pick("dienes", "pasted-dienes.smi")
	q.Dienophiles, q.DienophilesName = pick("dienophiles", "pasted-dienophiles.smi")
	if q.YAML == nil && (q.Dienes == nil || q.Dienophiles == nil) {
		return q, errors.New("give a substrate file (YAML), or both a diene list and a dienophile list")
	}
	return q, nil
}

// ---- writing pages -----------------------------------------------------------------------

type link_ struct{ Label, Href string }

// nav is the bar put at the top of a report: a way back, the bookmarkable link, the
// downloads and what the run said about failed rows.
type nav struct {
	Bookmark  string
	Downloads []link_
	Log       string
}

var bodyTag = regexp.MustCompile(`<body[^>]*>`)

// report sends the CLI's HTML report with the nav bar inserted after <body> (and its style
// sheet before </head>). The report itself is unchanged between the markers
// "<!-- cyclopair serve: nav -->" and "<!-- /cyclopair serve: nav -->".
func (s *Server) report(w http.ResponseWriter, page []byte, n nav) {
	var bar bytes.Buffer
	if err := navTmpl.Execute(&bar, n); err != nil {
		http.Error(w, err.Error(), http.StatusInternalServerError)
		return
	}
	loc := bodyTag.FindIndex(page)
	head := bytes.Index(page, []byte("</head>"))
	if loc == nil || head < 0 || head > loc[0] {
		s.fail(w, http.StatusInternalServerError, "Internal error", "the report has no <head> and <body>", "")
		return
	}
	var b bytes.Buffer
	b.Write(page[:head])
	b.WriteString(NavStart + "<style>" + navCSS + "</style>" + NavEnd)
	b.Write(page[head:loc[1]])
	b.WriteString(NavStart)
	b.Write(bar.Bytes())
	b.WriteString(NavEnd)
	b.Write(page[loc[1]:])
	s.send(w, http.StatusOK, b.Bytes())
}

// NavStart and NavEnd enclose what the page adds to the CLI's report; removing every such
// span gives back the CLI's bytes.
const (
	NavStart = "<!-- cyclopair serve: nav -->"
	NavEnd   = "<!-- /cyclopair serve: nav -->"
)

// StripNav removes what the page added to a report.
func StripNav(page []byte) []byte {
	for {
		i := bytes.Index(page, []byte(NavStart))
		if i < 0 {
			return page
		}
		j := bytes.Index(page[i:], []byte(NavEnd))
		if j < 0 {
			return page
		}
		page = append(page[:i:i], page[i+j+len(NavEnd):]...)
	}
}

// fail sends an error page. detail is preformatted text (the CLI's error line with its
// excerpt and caret).
func (s *Server) fail(w http.ResponseWriter, status int, title, msg, detail string) {
	var buf bytes.Buffer
	_ = errorTmpl.Execute(&buf, map[string]any{"Title": title, "Msg": msg, "Detail": detail, "Status": status})
	s.send(w, status, buf.Bytes())
}

func (s *Server) attach(w http.ResponseWriter, name, ctype string, data []byte) {
	h := w.Header()
	setSecurityHeaders(h, nil)
	h.Set("Content-Type", ctype)
	h.Set("Content-Disposition", mime.FormatMediaType("attachment", map[string]string{"filename": name}))
	h.Set("Content-Length", strconv.Itoa(len(data)))
	w.WriteHeader(http.StatusOK)
	_, _ = w.Write(data)
}

var styleEl = regexp.MustCompile(`(?s)<style>(.*?)</style>`)

// send writes an HTML page with the security headers; the CSP allows the page's own
// inline style sheets by their SHA-256 hashes and nothing else.
func (s *Server) send(w http.ResponseWriter, status int, page []byte) {
	var hashes []string
	for _, m := range styleEl.FindAllSubmatch(page, -1) {
		sum := sha256.Sum256(m[1])
		h := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
		if !slices.Contains(hashes, h) {
			hashes = append(hashes, h)
		}
	}
	setSecurityHeaders(w.Header(), hashes)
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	w.Header().Set("Content-Length", strconv.Itoa(len(page)))
	w.WriteHeader(status)
	_, _ = w.Write(page)
}

// CSP is the Content-Security-Policy of a page with the given style hashes.
func CSP(styleHashes []string) string {
	style := "'none'"
	if len(styleHashes) > 0 {
		style = strings.Join(styleHashes, " ")
	}
	return "default-src 'none'; style-src " + style + "; img-src data:; form-action 'self'; base-uri 'none'; frame-ancestors 'none'"
}

func setSecurityHeaders(h http.Header, styleHashes []string) {
	h.Set("Content-Security-Policy", CSP(styleHashes))
	h.Set("X-Content-Type-Options", "nosniff")
	h.Set("Referrer-Policy", "no-referrer")
	h.Set("X-Frame-Options", "DENY")
	h.Set("Cache-Control", "no-store")
}

// ---- the download store ------------------------------------------------------------------

type stored struct {
	q  ScreenQuery
	at time.Time
}

// store keeps the last screens for their download links, in memory only.
type store struct {
	mu    sync.Mutex
	max   int
	ttl   time.Duration
	m     map[string]*stored
	order []string
}

func (st *store) put(q ScreenQuery) string {
	var b [16]byte
	_, _ = rand.Read(b[:])
	id := hex.EncodeToString(b[:])
	st.mu.Lock()
	defer st.mu.Unlock()
	st.m[id] = &stored{q: q, at: time.Now()}
	st.order = append(st.order, id)
	for len(st.order) > st.max {
		delete(st.m, st.order[0])
		st.order = st.order[1:]
	}
	return id
}

func (st *store) get(id string) (ScreenQuery, bool) {
	st.mu.Lock()
	defer st.mu.Unlock()
	e, ok := st.m[id]
	if !ok || time.Since(e.at) > st.ttl {
		return ScreenQuery{}, false
	}
	return e.q, true
}

// ---- helpers -----------------------------------------------------------------------------

func humanBytes(n int64) string {
	switch {
	case n >= 1<<20 && n%(1<<20) == 0:
		return fmt.Sprintf("%d MiB", n>>20)
	case n >= 1<<10 && n%(1<<10) == 0:
		return fmt.Sprintf("%d KiB", n>>10)
	}
	return fmt.Sprintf("%d bytes", n)
}

func clip(s string) string {
	if len(s) > 40 {
		return s[:40] + "…"
	}
	return s
}

var (
	homeTmpl  = template.Must(template.New("home").Parse(homeHTML))
	navTmpl   = template.Must(template.New("nav").Parse(navHTML))
	errorTmpl = template.Must(template.New("error").Parse(errorHTML))
)
