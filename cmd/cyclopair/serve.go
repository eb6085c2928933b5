package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"os/signal"
	"slices"
	"strings"
	"syscall"
	"time"

	"github.com/spf13/cobra"

	"cyclopair/cmd/cyclopair/internal/web"
	"cyclopair/fmo"
	"cyclopair/fmo/screen"
	"cyclopair/fmo/substrates"
	"cyclopair/huckel/errtext"
	"cyclopair/presets"
)

// serveOptions are the flags of 'cyclopair serve'.
type serveOptions struct {
	addr      string
	maxUpload int64
	timeout   time.Duration
	maxJobs   int
}

const defaultServeAddr = "127.0.0.1:8080"

func newServeCmd(s *streams) *cobra.Command {
	o := &serveOptions{}
	cmd := &cobra.Command{
		Use:   "serve [--addr HOST:PORT]",
		Short: "A local web page for pairs and screens, for people who prefer a browser",
		Long: `Serve a web page on this machine (default http://` + defaultServeAddr + `/) with a form for
one pair (diene, dienophile, activations) and a form for a screen (paste or upload a YAML
substrate file, SMILES lists, CSV/TSV or SD files). Results are the same HTML report, pictures
and downloads (CSV, JSON Lines, SDF) the command line writes; a pair result has a link to
bookmark or send (/pair?diene=…&dienophile=…&activate=none,lewis).

The page writes nothing to disk, runs no scripts and loads nothing from elsewhere. Uploads are
capped (--max-upload), each analysis has a time limit (--timeout) and only --max-jobs run at
once. It answers on the loopback interface unless --addr names another address, which makes
the page reachable by other machines on the network (a warning is printed). Ctrl-C (SIGINT)
or SIGTERM stops it after the analyses in progress end.

Results are estimates for planning, not safety assessments.`,
		Example: `  cyclopair serve
  cyclopair serve --addr 127.0.0.1:9000 --max-jobs 1`,
		Args: cobra.NoArgs,
		RunE: func(c *cobra.Command, args []string) error {
			if o.maxUpload < 1024 || o.maxUpload > substrates.DefaultMaxFileBytes {
				return &usageError{fmt.Errorf("--max-upload %d: want 1024 to %d bytes", o.maxUpload, substrates.DefaultMaxFileBytes)}
			}
			if o.timeout < time.Second || o.timeout > time.Hour {
				return &usageError{fmt.Errorf("--timeout %s: want 1s to 1h", o.timeout)}
			}
			if o.maxJobs < 1 || o.maxJobs > 64 {
				return &usageError{fmt.Errorf("--max-jobs %d: want 1 to 64", o.maxJobs)}
			}
			ctx, stop := signal.NotifyContext(c.Context(), os.Interrupt, syscall.SIGTERM)
			defer stop()
			return runServe(ctx, s, o, nil)
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.addr, "addr", defaultServeAddr, "`HOST:PORT` to listen on (an address other than loopback makes the page reachable from the network)")
	f.Int64Var(&o.maxUpload, "max-upload", 4<<20, "largest request (files and text together), in `bytes`")
	f.DurationVar(&o.timeout, "timeout", 60*time.Second, "time limit of one analysis")
	f.IntVar(&o.maxJobs, "max-jobs", 2, "analyses run at once; more wait for a 'busy' page")
	return cmd
}

// runServe listens on o.addr and serves until ctx ends, then shuts down gracefully.
// ready, if not nil, gets the address actually listened on (tests listen on port 0).
func runServe(ctx context.Context, s *streams, o *serveOptions, ready chan<- string) error {
	host, _, err := net.SplitHostPort(o.addr)
	if err != nil {
		return &usageError{fmt.Errorf("--addr %q: want HOST:PORT, e.g. %s", o.addr, defaultServeAddr)}
	}
	loopback := isLoopbackName(host)
	if !loopback {
		fmt.Fprintf(s.err, "cyclopair: warning: --addr %s is not a loopback address: anyone who can reach this machine on the network can use the page and its CPU\n", o.addr)
	}
	ln, err := net.Listen("tcp", o.addr)
	if err != nil {
		return &inputError{fmt.Errorf("--addr %s: %v", o.addr, err)}
	}
	h := web.New(webBackend(), web.Limits{MaxUpload: o.maxUpload, Timeout: o.timeout, MaxJobs: o.maxJobs, Loopback: loopback})
	srv := &http.Server{
		Handler:           h,
		ReadHeaderTimeout: 10 * time.Second,
		ReadTimeout:       2 * time.Minute,
		WriteTimeout:      o.timeout + time.Minute,
		IdleTimeout:       2 * time.Minute,
		MaxHeaderBytes:    64 << 10,
	}
	fmt.Fprintf(s.err, "cyclopair: serving on http://%s/ (Ctrl-C to stop)\n", ln.Addr())
	if ready != nil {
		ready <- ln.Addr().String()
	}
	errc := make(chan error, 1)
	go func() { errc <- srv.Serve(ln) }()
	select {
	case err := <-errc:
		return err
	case <-ctx.Done():
	}
	fmt.Fprintln(s.err, "cyclopair: stopping: waiting for the analyses in progress")
	sctx, cancel := context.WithTimeout(context.Background(), o.timeout+5*time.Second)
	defer cancel()
	if err := srv.Shutdown(sctx); err != nil {
		return fmt.Errorf("shutdown: %v", err)
	}
	return nil
}

func isLoopbackName(host string) bool {
	if strings.EqualFold(host, "localhost") {
		return true
	}
	ip := net.ParseIP(host)
	return ip != nil && ip.IsLoopback()
}

// webBackend runs the page's analyses through the CLI's own code: a pair is the 'pair'
// command run in-process with the same flags; a screen is runScreen with the uploaded
// contents in memory. So a page shows the bytes the CLI writes for the same inputs.
func webBackend() web.Backend {
	var names []string
	for _, sub := range presets.Substrates() {
		names = append(names, sub.Name)
	}
	var listFormats []string
	for _, f := range substrates.Formats {
		listFormats = append(listFormats, string(f))
	}
	return web.Backend{
		Pair:   webPair,
		Screen: webScreen,
		PairFormats: []web.Format{
			{Name: "json", Ext: ".jsonl", Label: "JSON Lines", Type: "application/jsonl; charset=utf-8"},
			{Name: "sdf", Ext: ".sdf", Label: "SD file (products)", Type: "chemical/x-mdl-sdfile"},
		},
		ScreenFormats: []web.Format{
			{Name: "csv", Ext: ".csv", Label: "CSV", Type: "text/csv; charset=utf-8"},
			{Name: "json", Ext: ".jsonl", Label: "JSON Lines", Type: "application/jsonl; charset=utf-8"},
			{Name: "sdf", Ext: ".sdf", Label: "SD file (products)", Type: "chemical/x-mdl-sdfile"},
		},
		Modes:       fmo.Modes(),
		Methods:     methods,
		Presets:     names,
		ListFormats: listFormats,
	}
}

// webPair is 'cyclopair pair --diene D --dienophile E --activate A [--method M] --format F'.
func webPair(ctx context.Context, q web.PairQuery, format string, out, log io.Writer) error {
	args := []string{"pair", "--diene=" + q.Diene, "--dienophile=" + q.Dienophile, "--format=" + format}
	if len(q.Activate) > 0 {
		args = append(args, "--activate="+strings.Join(q.Activate, ","))
	}
	if q.Method != "" {
		args = append(args, "--method="+q.Method)
	}
	s := &streams{in: strings.NewReader(""), out: out, err: log}
	root := newRootCmd(s)
	root.SetArgs(args)
	root.SetIn(s.in)
	root.SetOut(out)
	root.SetErr(log)
	return webError(ctx, log, root.ExecuteContext(ctx))
}

// webScreen is runScreen with the form's files in memory (screenOptions.*Data).
func webScreen(ctx context.Context, q web.ScreenQuery, format string, out, log io.Writer) error {
	// The flags' defaults, exactly as 'cyclopair screen' binds them, then the form's values.
	o := &screenOptions{}
	defaults := &cobra.Command{}
	addScreenFlags(defaults, o)
	addListFormatFlags(defaults, o)
	o.format, o.inputFormat, o.nameField = format, q.InputFormat, q.NameField
	set := map[string]bool{}
	if q.YAML != nil {
		o.file = q.YAMLName
		if err := refuseLocalFiles(q.YAML, q.YAMLName); err != nil {
			return err
		}
	}
	if q.Dienes != nil {
		o.dienes, o.dienesData = q.DienesName, q.Dienes
	}
	if q.Dienophiles != nil {
		o.dienophiles, o.dienophilesData = q.DienophilesName, q.Dienophiles
	}
	if len(q.Activate) > 0 {
		o.activate, set["activate"] = strings.Join(q.Activate, ","), true
	}
	if q.Top > 0 {
		o.top, set["top"] = q.Top, true
	}
	if q.Method != "" {
		o.method = q.Method
		if err := o.methodOptions.check(); err != nil {
			return webError(ctx, log, err)
		}
	}
	o.changed = func(name string) bool { return set[name] }
	s := &streams{in: strings.NewReader(""), out: out, err: log}
	if err := checkListFormat(o); err != nil {
		return webError(ctx, log, err)
	}
	return webError(ctx, log, runScreen(ctx, s, o, q.YAML))
}

// refuseLocalFiles rejects an uploaded substrate file that names a parameter or
// calibration file: on a page the path would be read on the server's disk.
func refuseLocalFiles(data []byte, name string) error {
	lib, _, err := substrates.ParseLibrary(data, screen.FileOptions(name))
	if err != nil || lib == nil {
		return nil // the screen reports it, positioned
	}
	bad := ""
	switch {
	case lib.ParamsFile != "":
		bad = "params_file"
	case lib.Params != "" && !slices.Contains(presets.ParamNames(), lib.Params):
		bad = "params"
	case lib.Calibration != "" && lib.Calibration != "default":
		bad = "calibration"
	case lib.PPPParams != "" && !slices.Contains(presets.PPPNames(), lib.PPPParams):
		bad = "ppp_params"
	}
	if bad != "" {
		return &web.InputError{Msg: fmt.Sprintf("cyclopair: %s: %s names a file: the web page reads no files from the server's disk (use a built-in parameter set and the default calibration, or run 'cyclopair screen' on the command line)", errtext.Clip(lib.Where(bad)), bad)}
	}
	return nil
}

// webError turns a command error into what the page shows: nil for a batch where some rows
// failed (the rows are in log, as on stderr), the context error when the time ran out, and
// the CLI's one error line as an *web.InputError otherwise.
func webError(ctx context.Context, log io.Writer, err error) error {
	if err == nil {
		return nil
	}
	if ctx.Err() != nil {
		return ctx.Err()
	}
	var pe *partialError
	if errors.As(err, &pe) {
		fmt.Fprintf(log, "cyclopair: %v\n", err)
		return nil
	}
	return &web.InputError{Msg: "cyclopair: " + escapeLines(strings.TrimPrefix(err.Error(), "cyclopair: "))}
}
