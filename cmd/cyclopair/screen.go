package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"runtime/debug"
	"text/tabwriter"
	"unicode/utf8"

	"github.com/spf13/cobra"

	"cyclopair/cmd/cyclopair/internal/htmlreport"
	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/fmo/screen"
	"cyclopair/fmo/substrates"
	"cyclopair/huckel"
	"cyclopair/presets"
)

// screenOptions are the flags of 'cyclopair screen' (and 'cyclopair demo').
type screenOptions struct {
	file           string // substrate file, "-" for stdin, "" when only lists are given
	dienes         string // list file replacing the file's dienes
	dienophiles    string
	activate       string
	amine          string
	params         string
	calibration    string
	rankBy         string
	top            int
	demand         string
	minRegioMargin float64
	maxGap         float64
	allowedOnly    bool
	inDomain       bool
	format         string
	workers        int
	shard          string
	exhaustive     bool
	// changed records which flags the user set (they override the substrate file).
	changed     func(name string) bool
	rateModel   string  // --rate-model FILE
	temperature float64 // --temperature °C for the isomer shares
	methodOptions
	// inputFormat and nameField: --input-format and --name-field (list_format.go);
	// dienesData and dienophilesData are list contents already read (cyclopair serve).
	inputFormat, nameField      string
	dienesData, dienophilesData []byte
}

func newScreenCmd(s *streams) *cobra.Command {
	o := &screenOptions{}
	cmd := &cobra.Command{
		Use:   "screen [FILE.yaml | -]",
		Short: "Screen every diene × dienophile × activation of a substrate file, ranked",
		Long: `Screen runs the pair analysis over every diene × dienophile × activation of a
substrate file (YAML; '-' reads it from stdin) and prints the ranked pairs. Each molecule and
each activated dienophile is prepared once; pairs are scored on all cores with the fast
screening kernel, ranked, and only the rows printed get the full analysis (products, labels,
warnings).

Gaps and margins are in units of |β| (E = α + xβ, β < 0) and gaps also in eV through the
calibration named in the header. Ranking keys: rate (the default: predicted log10 k relative
to cyclopentadiene + acrylonitrile from the fitted model of 'cyclopair validate', fastest
first), normal_gap (LUMO(dienophile) − HOMO(diene), smallest first), gap (controlling gap),
stabilization, regio_margin, score (larger first), none (pair order of the input, streamed).

Instead of (or on top of) a YAML file, --dienes and --dienophiles read list files; the format
comes from the extension or --input-format: .smi/.smiles/.txt (SMILES, whitespace, then the
rest of the line as the name), .csv/.tsv (a header row naming the smiles and name columns in
any order; without one, name,smiles rows), .sdf/.mol (MDL molfiles; the title line or
--name-field PROP as the name). Command-line flags override
the file's settings. Rows that fail (bad SMILES, unknown preset, nothing to react) are listed
on stderr at the end and the exit code is 1; the other rows are screened.

Results are estimates for planning, not safety assessments.`,
		Example: `  cyclopair screen substrates.yaml
  cyclopair screen substrates.yaml --format json --top 100 > best.jsonl
  cyclopair screen --dienes dienes.csv --dienophiles dienophiles.txt --activate none,lewis
  cyclopair screen big.yaml --rank-by none --shard 3/8 --format csv > part3.csv`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			if list, _ := c.Flags().GetBool("list-presets"); list {
				return listSubstratePresets(s.out)
			}
			if len(args) == 1 {
				o.file = args[0]
			}
			if o.file == "" && (o.dienes == "" || o.dienophiles == "") {
				return &usageError{errors.New("give a substrate file, or both --dienes and --dienophiles")}
			}
			o.changed = c.Flags().Changed
			if err := checkListFormat(o); err != nil {
				return err
			}
			return runScreen(c.Context(), s, o, nil)
		},
	}
	addScreenFlags(cmd, o)
	cmd.Flags().StringVar(&o.dienes, "dienes", "", "CSV (name,smiles) or one-SMILES-per-line `file` of 4π partners (replaces the file's dienes)")
	cmd.Flags().StringVar(&o.dienophiles, "dienophiles", "", "CSV or one-SMILES-per-line `file` of 2π partners (replaces the file's dienophiles)")
	cmd.Flags().Bool("list-presets", false, "list the named common substrates usable as 'preset: NAME' and exit")
	addListFormatFlags(cmd, o)
	return cmd
}

// addScreenFlags adds the flags screen and demo share.
func addScreenFlags(cmd *cobra.Command, o *screenOptions) {
	f := cmd.Flags()
	f.StringVar(&o.activate, "activate", "", "activation `modes`, comma-separated: none, proton, lewis, iminium (default: the file's, else none)")
	f.StringVar(&o.amine, "amine", "", "`SMILES` of the secondary amine for --activate iminium (default: the file's, else pyrrolidine "+fmo.DefaultAmineSMILES+")")
	f.StringVar(&o.params, "params", "", "parameter set `name` or YAML file (default: the file's, else "+presets.DefaultParams+")")
	f.StringVar(&o.calibration, "calibration", "", "x → eV calibration: default or a `file` from 'cyclopair calibrate --out' (default: the file's, else default)")
	f.StringVar(&o.rankBy, "rank-by", "", "ranking `key`: rate (predicted rate, fastest first), normal_gap, gap, stabilization, regio_margin, score, none (default: the file's, else rate)")
	addRateFlags(f, &o.rateModel, &o.temperature)
	f.IntVar(&o.top, "top", 0, "print only the best `K` rows (0: all; default: the file's)")
	f.StringVar(&o.demand, "demand", "", "keep only pairs of this `demand`: normal, inverse, neutral, any")
	f.Float64Var(&o.minRegioMargin, "min-regio-margin", 0, "keep only pairs whose regio margin is at least `X` |β|")
	f.Float64Var(&o.maxGap, "max-gap", 0, "keep only pairs whose controlling gap is at most `X` |β|")
	f.BoolVar(&o.allowedOnly, "allowed-only", false, "keep only symmetry-allowed pairings")
	f.BoolVar(&o.inDomain, "in-domain", false, "keep only pairs whose predicted rate is inside the rate model's applicability domain (not extrapolated)")
	f.StringVar(&o.format, "format", "table", "output `format`: table, csv, json (JSON Lines), markdown, html, sdf (each row's product as an SD record)")
	f.IntVar(&o.workers, "workers", 0, "`N` worker goroutines (0: all cores)")
	f.StringVar(&o.shard, "shard", "", "screen only shard `i/n` of the pair space (outputs of 1..n concatenate when unranked)")
	f.BoolVar(&o.exhaustive, "exhaustive", false, "score every pair even with --top (the plain path, for checking: the rows are the same)")
	addMethodFlags(f, &o.methodOptions, "")
}

// screenRequest turns the flags into a screen request: a flag the user set overrides the
// substrate file's setting. data, if not nil, is the substrate file's content (the demo).
func screenRequest(s *streams, o *screenOptions, data []byte) screen.Request {
	changed := o.changed
	if changed == nil {
		changed = func(string) bool { return false }
	}
	req := screen.Request{
		File: o.file, Data: data, Dienes: o.dienes, Dienophiles: o.dienophiles, Stdin: s.in,
		Params: o.params, Calibration: o.calibration, Amine: o.amine, Workers: o.workers, Shard: o.shard,
		DienesData: o.dienesData, DienophilesData: o.dienophilesData,
		InputFormat: substrates.Format(o.inputFormat), NameField: o.nameField,
		LoadParams: resolveParams,
		LoadCalibration: func(spec string, p *huckel.Params) (huckel.Calibration, error) {
			return resolveCalibration(s, spec, p)
		},
		Method: o.method, PPPParams: o.pppParams,
		LoadMethod: func(method, spec string) (func() huckel.Method, *huckel.Calibration, error) {
			if err := (methodOptions{method: method}).check(); err != nil {
				return nil, nil, err
			}
			if method == "" {
				method = defaultMethod
			}
			if method != huckel.MethodPPP {
				if o.pppParams != "" {
					return nil, nil, &usageError{fmt.Errorf("--ppp-params %s: only used with --method ppp", o.pppParams)}
				}
				return nil, nil, nil // a file's ppp_params: is ignored under Hückel
			}
			m, err := methodModel(method, spec, "", nil, huckel.Calibration{})
			if err != nil {
				return nil, nil, err
			}
			return m.newMethod, &m.cal, nil
		},
	}
	if changed("activate") {
		req.Activate = &o.activate
	}
	if changed("rank-by") {
		req.RankBy = &o.rankBy
	}
	if changed("top") {
		req.Top = &o.top
	}
	if changed("demand") {
		req.Demand = &o.demand
	}
	if changed("min-regio-margin") {
		req.MinRegioMargin = &o.minRegioMargin
	}
	if changed("max-gap") {
		req.MaxGap = &o.maxGap
	}
	if changed("allowed-only") {
		req.AllowedOnly = &o.allowedOnly
	}
	if changed("in-domain") {
		req.InDomain = &o.inDomain
	}
	return req
}

// runScreen is the whole screen command: resolve the flags and files into one
// screen.Config, prepare, screen, render, report failures. data, if not nil, replaces
// reading o.file (used by the demo).
func runScreen(ctx context.Context, s *streams, o *screenOptions, data []byte) error {
	if ctx == nil {
		ctx = context.Background()
	}
	format := o.format
	if format != "html" {
		f, err := render.ParseFormat(format)
		if err != nil {
			return &usageError{fmt.Errorf("--format: %v", err)}
		}
		format = string(f)
	}
	cfg, err := screen.Resolve(screenRequest(s, o, data))
	var ue *screen.UsageError
	var ae *screen.AmineError
	switch {
	case errors.As(err, &ue):
		return &usageError{ue.Err}
	case errors.As(err, &ae):
		return smilesErr(ae.SMILES, ae.Err)
	case err != nil:
		return &inputError{err}
	}
	lib := cfg.Library
	if cfg.RateModel, err = loadRateModel(o.rateModel); err != nil {
		return err
	}
	cfg.TemperatureC = o.temperature
	// From here on a signal stops the work and the rows already complete are flushed.
	s.cancellable.Store(true)
	defer s.cancellable.Store(false)
	if cfg.RankBy != screen.RankNone && cfg.Top > 0 && len(lib.Dienes)+len(lib.Dienophiles) >= 10_000 && os.Getenv("GOGC") == "" {
		// A large ranked top-K screen keeps compact partners (some 5 kB per molecule with
		// its input row) and makes most of its garbage while preparing them: a GC target of
		// 50 % instead of 100 % keeps the peak nearer the live heap. Measured on 20,000 ×
		// 20,000 × 3 (top 50): max RSS 604 → 467 MB for ~6 % more CPU. Small screens keep
		// the default (2,000 × 2,000: 13 % more CPU to save 14 MB). GOGC in the
		// environment decides when set.
		defer debug.SetGCPercent(debug.SetGCPercent(50))
	}
	if cfg.Top == 0 && len(lib.Dienes)+len(lib.Dienophiles) < 10_000 && os.Getenv("GOGC") == "" {
		// Every passing pair gets the full analysis (--top 0): the rows make short-lived
		// garbage (adducts, canonical searches, side-channel partners) over a small live
		// heap (partners of fewer than 10,000 molecules, the ranked pairs), and at the
		// default target the collector was about a quarter of the CPU. A target of 400 %
		// trades a few tens of MB for it: measured on 200 × 200 of the bench library (CSV),
		// 18.6 → 14.2 s CPU and 46 → 80 MB max RSS in one run. GOGC in the environment
		// decides when set.
		defer debug.SetGCPercent(debug.SetGCPercent(400))
	}
	prepProg := newProgress(s.rawErr, s.errIsTerminal, "prepare", int64(len(lib.Dienes)+len(lib.Dienophiles)*(1+len(cfg.Activations))))
	prep, err := cfg.Prepare(ctx, prepProg.Add)
	prepProg.Stop()
	if err != nil {
		if ctx.Err() != nil {
			return interrupted(ctx, "stopped while preparing molecules, no rows written")
		}
		return fmt.Errorf("preparing molecules: %w", err)
	}
	failures := append([]error(nil), cfg.Bad...)
	for _, f := range prep.Failures {
		failures = append(failures, f)
	}
	if len(prep.Dienes) == 0 || len(prep.Dienophiles) == 0 {
		printFailures(s, failures)
		return &inputError{fmt.Errorf("%s: nothing to screen: %d usable dienes, %d usable dienophiles (the failed rows are listed above)",
			cfg.Source, len(prep.Dienes), len(prep.Dienophiles))}
	}

	cal := cfg.Calibration
	paramsText := cfg.Params.Name
	if cfg.Method != huckel.MethodHuckel {
		paramsText += " (perception and k), π method " + cfg.Method
	}
	rep := render.Report{
		Title:             lib.Title,
		Source:            cfg.Source,
		Params:            paramsText,
		Calibration:       cal.Name,
		CalibrationDetail: cal.Detail(),
		RankBy:            string(cfg.RankBy),
		Filters:           cfg.Filter.Describe(),
		Shard:             cfg.Shard.String(),
	}
	lay := render.Layout{}
	for _, r := range prep.DieneRows {
		lay.DieneWidth = max(lay.DieneWidth, utf8.RuneCountInString(r.Name))
	}
	for _, r := range prep.DphRows {
		lay.DienophileWidth = max(lay.DienophileWidth, utf8.RuneCountInString(r.Name))
	}
	for _, a := range prep.Activations {
		lay.ActivationWidth = max(lay.ActivationWidth, utf8.RuneCountInString(a))
	}
	var w render.Writer
	if format == "html" {
		w = htmlreport.New(s.out, rep, htmlreport.Config{Options: cfg.Options, Calibration: &cal, Kind: "screen",
			Diagram: func(rows []render.Row) ([]byte, error) { return screenDiagram(prep, rows, cal) }})
	} else {
		w, err = render.New(render.Format(format), s.out, rep, lay)
		if err != nil {
			return err
		}
	}

	space := prep.Space()
	lo, hi := cfg.Shard.Range(space.Len())
	if cfg.Top == 0 && hi-lo > 100_000 {
		fmt.Fprintf(s.err, "cyclopair: note: %d pairs and no --top: every passing pair gets the full analysis (about 0.1 ms of CPU each; 160,000 rows take some 15–20 s of CPU); --top K prints only the best K\n", hi-lo)
	}
	prog := newProgress(s.rawErr, s.errIsTerminal, "screen", hi-lo)
	var rowProg *progress // full analyses of the selected rows (ranked screens)
	var pairFailures []error
	so := cfg.ScreenOptions()
	so.Exhaustive = o.exhaustive
	if format != "html" && render.Format(format).BestOnly() {
		so.Detail = fmo.DetailRow // the rows print only the preferred orientation's product
	}
	so.Progress = prog.Add
	so.Selected = func(n int64) {
		prog.Stop()
		prog = nil
		rowProg = newProgress(s.rawErr, s.errIsTerminal && n >= 200, "analyse", n)
	}
	st, runErr := prep.Screen(ctx, so, func(r screen.ScreenRow) error {
		rowProg.Add(1)
		return w.WriteRow(render.Row{Rank: int(r.Rank), Number: r.Index + 1, Pair: r.Pair})
	}, func(f screen.ScreenFailure) {
		rowProg.Add(1)
		pairFailures = append(pairFailures, f)
	})
	prog.Stop()
	rowProg.Stop()
	failures = append(failures, pairFailures...)
	sum := render.Summary{Pairs: int(st.Scored), Passed: int(st.Passed), Shown: int(st.Shown),
		Failed: len(failures), Canceled: st.Canceled}
	if err := w.Close(sum); err != nil && runErr == nil {
		runErr = err
	}
	printFailures(s, failures)
	if runErr != nil {
		if errors.Is(runErr, context.Canceled) {
			return interrupted(ctx, fmt.Sprintf("%d complete rows written before the stop", st.Shown))
		}
		return runErr
	}
	if prep.NotApplicable > 0 {
		fmt.Fprintf(s.err, "cyclopair: note: %d dienophile × activation combinations skipped: the mode has nothing to act on\n", prep.NotApplicable)
	}
	if len(failures) > 0 {
		total := len(lib.Dienes) + len(lib.Dienophiles) + len(cfg.Bad) + int(st.Scored)
		return &partialError{failed: len(failures), total: total}
	}
	return nil
}

func unwrapPathError(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// printFailures lists failed inputs on stderr, one line each, in input order.
func printFailures(s *streams, failures []error) {
	for _, f := range failures {
		fmt.Fprintf(s.err, "cyclopair: %v\n", f)
	}
}

// screenDiagram draws the energy-level diagram of the top row's partners: its diene and its
// dienophile under every activation of the screen that applies.
func screenDiagram(prep *screen.Prepared, rows []render.Row, cal huckel.Calibration) ([]byte, error) {
	if len(rows) == 0 {
		return nil, nil
	}
	top := rows[0].Pair
	d, e := -1, -1
	for i, r := range prep.DieneRows {
		if r.Name == top.DieneName {
			d = i
		}
	}
	for i, r := range prep.DphRows {
		if r.Name == top.DienophileName {
			e = i
		}
	}
	if d < 0 || e < 0 {
		return nil, fmt.Errorf("top row %s + %s not found in the screen", top.DieneName, top.DienophileName)
	}
	var parts []*fmo.Partner
	var pairs []*fmo.Pair
	for a := range prep.Variants[e] {
		v, err := prep.Variant(e, a) // the full partner (the screen may keep compact ones)
		if v == nil || err != nil {
			continue
		}
		pr, err := prep.AnalyzeAt(d, e, a)
		if err != nil {
			continue
		}
		parts = append(parts, v)
		pairs = append(pairs, pr)
	}
	if len(parts) == 0 {
		return nil, nil
	}
	diene, err := prep.Diene(d)
	if err != nil {
		return nil, err
	}
	dg := pairDiagram(diene, parts, pairs, prep.Opts.Params.Name, cal)
	var buf bytes.Buffer
	if err := render.WriteDiagram(&buf, dg); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// listSubstratePresets prints the named common substrates as an aligned table.
func listSubstratePresets(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "NAME\tROLE\tSMILES\tNOTES")
	for _, sub := range presets.Substrates() {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\n", sub.Name, sub.Role, sub.SMILES, sub.Notes)
	}
	return tw.Flush()
}
