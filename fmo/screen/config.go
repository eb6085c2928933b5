package screen

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"cyclopair/fmo"
	"cyclopair/fmo/rate"
	"cyclopair/fmo/substrates"
	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
)

// Request is a screen as the user asked for it: a substrate file and/or list files, and
// the command-line settings that override the file's. Resolve turns it into a Config.
type Request struct {
	File        string // substrate file: a path, "-" for Stdin, "" when only lists are given
	Data        []byte // the substrate file's content when already read (the demo); nil: read File
	Dienes      string // CSV or one-SMILES-per-line file replacing the file's dienes ("-": Stdin)
	Dienophiles string // the same for the dienophiles
	Stdin       io.Reader
	// DienesData and DienophilesData, when not nil, are the list files' contents already
	// read (uploads of the web page); Dienes and Dienophiles then only name them.
	DienesData, DienophilesData []byte
	// InputFormat is the format of the list files ("" chooses it from each file's name,
	// substrates.FormatOf); NameField is the SD property holding the name ("" title line).
	InputFormat substrates.Format
	NameField   string

	// Settings given on the command line; nil keeps the file's setting (or the default).
	Activate       *string // comma-separated activation modes
	RankBy         *string
	Top            *int
	Demand         *string // normal, inverse, neutral or any
	MinRegioMargin *float64
	MaxGap         *float64
	AllowedOnly    *bool
	InDomain       *bool // keep only pairs whose rate is inside the model's applicability domain

	Params      string // parameter set name or file; "" keeps the file's (else the default)
	Calibration string // "default" or a calibration file; "" keeps the file's (else default)
	Amine       string // secondary amine SMILES for iminium activation; "" keeps the file's
	Workers     int    // 0: all cores
	Shard       string // "i/n", "" for the whole pair space

	// LoadParams turns a parameter set name or file into a set ("" is the default set), and
	// LoadCalibration a calibration spec ("" or "default": the set's built-in calibration,
	// else a file) into a calibration. The CLI passes its resolvers, which know the presets
	// and the file formats and word their errors for the command line.
	LoadParams      func(spec string) (*huckel.Params, error)
	LoadCalibration func(spec string, p *huckel.Params) (huckel.Calibration, error)

	// Method is the π method ("huckel" or "ppp"); "" keeps the file's method: (else the
	// default LoadMethod picks). PPPParams is the PPP parameter set name or file; "" keeps
	// the file's ppp_params: (relative to the file), else the default set.
	Method, PPPParams string
	// LoadMethod turns a method name ("" for the default) and its parameter spec into a
	// solver factory for fmo.Options.NewMethod (nil: Hückel) and, for a method that computes
	// eV itself, its exact eV map (direct non-nil), which then replaces the calibration.
	// nil LoadMethod means Hückel only.
	LoadMethod func(method, spec string) (newMethod func() huckel.Method, direct *huckel.Calibration, err error)
}

// Config is a screen resolved in one place from file, flags and defaults: everything
// Prepare and Screen need. Build it with Resolve.
type Config struct {
	Source      string              // the inputs in words, e.g. "screen.yaml, dienes from d.csv"
	Library     *substrates.Library // the good rows, the title and the file's own settings
	Bad         []error             // rows that failed to load, in input order
	Params      *huckel.Params
	Calibration huckel.Calibration
	Method      string // π method of every partner: "huckel" or "ppp"
	Options     *fmo.Options
	Activate    *fmo.ActivateOptions // nil: defaults (pyrrolidine for iminium)
	Activations []string             // activation modes, in order, without duplicates
	RankBy      RankKey
	Top         int // 0: every row
	Filter      substrates.Filter
	Shard       Shard
	Workers     int // 0: all cores
	// RateModel and TemperatureC are handed to Prepare (nil, 0: the bundled model, 25 °C);
	// the caller sets them after Resolve.
	RateModel    *rate.Model
	TemperatureC float64
}

// UsageError marks a bad command-line setting of a Request (the CLI adds its usage hint);
// other errors of Resolve are about the input files.
type UsageError struct{ Err error }

func (e *UsageError) Error() string { return e.Err.Error() }
func (e *UsageError) Unwrap() error { return e.Err }

// AmineError is a Request.Amine that is not valid SMILES (the CLI shows the parser's
// excerpt).
type AmineError struct {
	SMILES string
	Err    error
}

func (e *AmineError) Error() string { return fmt.Sprintf("%s: %v", e.SMILES, e.Err) }
func (e *AmineError) Unwrap() error { return e.Err }

func usage(format string, args ...any) error {
	return &UsageError{fmt.Errorf(format, args...)}
}

// Resolve reads the files of req and settles every setting: a command-line setting wins
// over the file's, the file's over the default. Paths in the file (params_file, a
// calibration file) are relative to the file. Rows that fail to load are collected in
// Config.Bad; the error is non-nil when the screen cannot run at all (a *UsageError for a
// bad setting of req).
func Resolve(req Request) (*Config, error) {
	c := &Config{Workers: req.Workers}
	if req.Shard != "" {
		sh, err := ParseShard(req.Shard)
		if err != nil {
			return nil, usage("--shard: %v", err)
		}
		c.Shard = sh
	}
	if req.Workers < 0 {
		return nil, usage("--workers: must be 0 (all cores) or positive")
	}
	dir, err := c.load(req)
	if err != nil {
		return nil, err
	}
	if err := c.settings(req); err != nil {
		return nil, err
	}
	if c.Params, err = c.params(req, dir); err != nil {
		return nil, err
	}
	newMethod, direct, err := c.method(req, dir)
	if err != nil {
		return nil, err
	}
	if direct != nil {
		if req.Calibration != "" && req.Calibration != "default" {
			return nil, usage("--calibration %s: method %s gives eV directly and takes no calibration", req.Calibration, c.Method)
		}
		if cs := c.Library.Calibration; cs != "" && cs != "default" {
			return nil, fmt.Errorf("%s: calibration: method %s gives eV directly and takes no calibration (drop the calibration: key)", c.Library.Where("calibration"), c.Method)
		}
		c.Calibration = *direct
	} else if c.Calibration, err = c.calibration(req, dir); err != nil {
		return nil, err
	}
	c.Options = fmo.NewOptions(c.Params, c.Calibration, c.Calibration.Name)
	c.Options.NewMethod = newMethod
	if c.Method != huckel.MethodHuckel && c.RankBy == RankRate {
		// the rate model's gap coefficient is per Hückel |β|; PPP gaps are about three
		// times larger, so the model would put every PPP pair orders of magnitude off
		if req.RankBy != nil {
			return nil, usage("--rank-by rate: %v", rate.ErrMethod)
		}
		if c.Library.Set["rank_by"] {
			return nil, fmt.Errorf("%s: rank_by: rate: %v", c.Library.Where("rank_by"), rate.ErrMethod)
		}
		c.RankBy = RankScore // the default key under another method (see DEVELOPERS.md)
	}
	if c.Method != huckel.MethodHuckel && c.Filter.InDomain {
		// the domain is the rate model's, which does not apply under another method
		if req.InDomain != nil {
			return nil, usage("--in-domain: %v", rate.ErrMethod)
		}
		return nil, fmt.Errorf("%s: filter: in_domain: %v", c.Library.Where("filter"), rate.ErrMethod)
	}
	switch {
	case req.Amine != "":
		am, err := smiles.Parse(req.Amine)
		if err != nil {
			return nil, &AmineError{SMILES: req.Amine, Err: err}
		}
		c.Activate = &fmo.ActivateOptions{Amine: am}
	case c.Library.AmineMol != nil:
		c.Activate = &fmo.ActivateOptions{Amine: c.Library.AmineMol}
	}
	c.Source = source(req)
	return c, nil
}

// load reads the substrate file and the list files; dir is the substrate file's directory
// ("" when it was not read from disk).
func (c *Config) load(req Request) (dir string, err error) {
	if req.File != "" {
		data := req.Data
		if data == nil {
			data, err = readInput(req.Stdin, req.File, substrates.DefaultMaxFileBytes)
			if err != nil {
				return "", err
			}
			if req.File != "-" {
				dir = filepath.Dir(req.File)
			}
		}
		name := req.File
		if name == "-" {
			name = "stdin"
		}
		lib, bad, err := substrates.ParseLibrary(data, FileOptions(name))
		if err != nil {
			return "", err
		}
		c.Library = lib
		for _, b := range bad {
			c.Bad = append(c.Bad, b)
		}
	} else {
		c.Library = &substrates.Library{Activations: []string{fmo.ActivateNone}, RankBy: string(RankRate), Set: map[string]bool{}}
	}
	for _, side := range []struct {
		file string
		data []byte
		dst  *[]substrates.Substrate
		max  int
	}{{req.Dienes, req.DienesData, &c.Library.Dienes, 4}, {req.Dienophiles, req.DienophilesData, &c.Library.Dienophiles, 2}} {
		if side.file == "" {
			continue
		}
		var r io.Reader = bytes.NewReader(side.data)
		closeFn := func() {}
		if side.data == nil {
			r, closeFn, err = openInput(req.Stdin, side.file)
			if err != nil {
				return "", err
			}
		}
		subs, bad, err := substrates.LoadListAs(r, side.file, substrates.ListOptions{Format: req.InputFormat,
			NameField: req.NameField, PinMax: side.max, MaxBytes: substrates.DefaultMaxFileBytes})
		closeFn()
		if err != nil {
			return "", err
		}
		*side.dst = subs
		for _, b := range bad {
			c.Bad = append(c.Bad, b)
		}
	}
	return dir, nil
}

// openInput opens a file, or stdin for "-".
func openInput(stdin io.Reader, name string) (io.Reader, func(), error) {
	if name == "-" {
		return stdin, func() {}, nil
	}
	f, err := os.Open(name)
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, nil, fmt.Errorf("%s: cannot open (%v)", name, err)
	}
	return f, func() { f.Close() }, nil
}

// readInput reads a whole file (or stdin) up to max bytes.
func readInput(stdin io.Reader, name string, max int64) ([]byte, error) {
	r, closeFn, err := openInput(stdin, name)
	if err != nil {
		return nil, err
	}
	defer closeFn()
	data, err := io.ReadAll(io.LimitReader(r, max+1))
	if err != nil {
		return nil, fmt.Errorf("%s: cannot read (%v)", name, err)
	}
	if int64(len(data)) > max {
		return nil, fmt.Errorf("%s: larger than %d bytes (split the screen, or use --shard)", name, max)
	}
	return data, nil
}

// settings applies the command-line settings over the file's.
func (c *Config) settings(req Request) error {
	lib := c.Library
	c.Activations, c.Top, c.Filter = lib.Activations, lib.Top, lib.Filter
	if req.Activate != nil {
		var modes []string
		for _, m := range strings.Split(*req.Activate, ",") {
			m = strings.ToLower(strings.TrimSpace(m))
			if m == "" {
				continue
			}
			if !slices.Contains(fmo.Modes(), m) {
				return usage("--activate: unknown mode %q (modes: %s)", m, strings.Join(fmo.Modes(), ", "))
			}
			if !slices.Contains(modes, m) {
				modes = append(modes, m)
			}
		}
		if len(modes) == 0 {
			return usage("--activate: no mode given")
		}
		c.Activations = modes
	}
	rank := lib.RankBy
	if req.RankBy != nil {
		rank = *req.RankBy
	}
	k, err := ParseRankKey(rank)
	if err != nil {
		return usage("--rank-by: %v", err) // the file's key was checked when it was read
	}
	c.RankBy = k
	if req.Top != nil {
		if *req.Top < 0 {
			return usage("--top: must be 0 (all) or positive")
		}
		c.Top = *req.Top
	}
	if req.Demand != nil {
		switch d := *req.Demand; d {
		case "normal", "inverse", "neutral":
			c.Filter.Demand = d
		case "any", "":
			c.Filter.Demand = ""
		default:
			return usage("--demand %q: want normal, inverse, neutral or any", d)
		}
	}
	if req.MinRegioMargin != nil {
		if *req.MinRegioMargin < 0 {
			return usage("--min-regio-margin: must be ≥ 0")
		}
		c.Filter.MinRegioMargin = *req.MinRegioMargin
	}
	if req.MaxGap != nil {
		if *req.MaxGap < 0 {
			return usage("--max-gap: must be ≥ 0 (0: no limit)")
		}
		c.Filter.MaxGap = *req.MaxGap
	}
	if req.AllowedOnly != nil {
		c.Filter.AllowedOnly = *req.AllowedOnly
	}
	if req.InDomain != nil {
		c.Filter.InDomain = *req.InDomain
	}
	return nil
}

// params picks the parameter set: the request's, else the file's params_file (relative to
// the file), else its params, else the default.
func (c *Config) params(req Request, dir string) (*huckel.Params, error) {
	lib := c.Library
	switch {
	case req.Params != "":
		return req.LoadParams(req.Params)
	case lib.ParamsFile != "":
		path := lib.ParamsFile
		if !filepath.IsAbs(path) && dir != "" {
			path = filepath.Join(dir, path)
		}
		p, err := req.LoadParams(path)
		if err != nil {
			return nil, fmt.Errorf("%s: params_file: %v", lib.Where("params_file"), err)
		}
		return p, nil
	case lib.Params != "":
		p, err := req.LoadParams(lib.Params)
		if err != nil {
			return nil, fmt.Errorf("%s: params: %v", lib.Where("params"), err)
		}
		return p, nil
	}
	return req.LoadParams("")
}

// method picks the π method: the request's, else the file's method:, else LoadMethod's
// default; and its parameter spec: the request's, else the file's ppp_params: (a path
// relative to the file when such a file exists there).
func (c *Config) method(req Request, dir string) (func() huckel.Method, *huckel.Calibration, error) {
	lib := c.Library
	name, spec := req.Method, req.PPPParams
	fromFile := false
	if name == "" {
		name, fromFile = lib.Method, lib.Method != ""
	}
	if spec == "" && lib.PPPParams != "" {
		spec = lib.PPPParams
		if !filepath.IsAbs(spec) && dir != "" {
			if _, err := os.Stat(filepath.Join(dir, spec)); err == nil {
				spec = filepath.Join(dir, spec)
			}
		}
	}
	if req.LoadMethod == nil {
		if name != "" && name != huckel.MethodHuckel {
			return nil, nil, usage("method %s: not available here", name)
		}
		c.Method = huckel.MethodHuckel
		return nil, nil, nil
	}
	nm, direct, err := req.LoadMethod(name, spec)
	if err != nil {
		if fromFile {
			return nil, nil, fmt.Errorf("%s: method: %v", lib.Where("method"), err)
		}
		return nil, nil, err
	}
	c.Method = huckel.MethodHuckel
	if nm != nil {
		c.Method = nm().Name()
	}
	return nm, direct, nil
}

// calibration picks the calibration: the request's, else the file's calibration: key (a
// file is taken relative to the substrate file), else the built-in calibration fitted for
// the parameter set ("default").
func (c *Config) calibration(req Request, dir string) (huckel.Calibration, error) {
	if req.Calibration != "" {
		return req.LoadCalibration(req.Calibration, c.Params)
	}
	spec := c.Library.Calibration
	if spec != "" && spec != "default" && !filepath.IsAbs(spec) && dir != "" {
		spec = filepath.Join(dir, spec)
	}
	cal, err := req.LoadCalibration(spec, c.Params)
	if err != nil && c.Library.Calibration != "" {
		return cal, fmt.Errorf("%s: calibration: %v", c.Library.Where("calibration"), err)
	}
	return cal, err
}

// source names the inputs of a request in words.
func source(req Request) string {
	var parts []string
	if req.File != "" {
		if req.File == "-" {
			parts = append(parts, "stdin")
		} else {
			parts = append(parts, req.File)
		}
	}
	if req.Dienes != "" {
		parts = append(parts, "dienes from "+req.Dienes)
	}
	if req.Dienophiles != "" {
		parts = append(parts, "dienophiles from "+req.Dienophiles)
	}
	return strings.Join(parts, ", ")
}

// Prepare builds every partner of the configured library (see Prepare), in compact form for
// a ranked screen with a top K; progress, if not nil, is called as in PrepareOptions.
func (c *Config) Prepare(ctx context.Context, progress func(n int64)) (*Prepared, error) {
	lib := *c.Library
	lib.Activations = c.Activations
	// A ranked screen with a top K prints few rows: keep the compact partners and rebuild
	// the full ones of the printed rows (PrepareOptions.Compact).
	compact := c.RankBy != RankNone && c.RankBy != "" && c.Top > 0
	return Prepare(ctx, &lib, c.Options, PrepareOptions{Workers: c.Workers, Activate: c.Activate, Progress: progress,
		RateModel: c.RateModel, TemperatureC: c.TemperatureC, Compact: compact})
}

// ScreenOptions are the configured ranking, filters, shard and workers as options for
// Prepared.Screen (add Progress and Selected hooks as needed).
func (c *Config) ScreenOptions() ScreenOptions {
	return ScreenOptions{Workers: c.Workers, RankBy: c.RankBy, Top: c.Top, Filter: c.Filter, Shard: c.Shard}
}
