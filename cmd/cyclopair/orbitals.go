package main

import (
	"bufio"
	"errors"
	"fmt"
	"runtime"
	"slices"
	"strings"
	"sync"
	"sync/atomic"

	"cyclopair/huckel"
	"cyclopair/huckel/errtext"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"

	"github.com/spf13/cobra"
)

type orbitalsOptions struct {
	format      string  // table, json, csv
	params      string  // built-in set name or YAML file
	omega       float64 // ω-technique constant; used when omegaSet
	omegaSet    bool
	calibration string // default, or a file from 'cyclopair calibrate --out'
	methodOptions
	limits inputLimits
	// listFormat and nameField: --input-format and --name-field for '-' (orbitals_list.go).
	listFormat, nameField string
}

func newOrbitalsCmd(s *streams) *cobra.Command {
	opts := &orbitalsOptions{}
	cmd := &cobra.Command{
		Use:   "orbitals SMILES... | -",
		Short: "Hückel or PPP-SCF π levels, frontier orbitals and π charges of molecules",
		Long: `Perceive the π system of each molecule, solve the Hückel problem and print the levels
(x in E = α + xβ, and eV through a stated linear calibration), occupations, degeneracies,
HOMO/LUMO (SOMO for open shells), the frontier coefficients per atom and the π charges.
Atom numbers are 0-based positions in the SMILES as written.

With --method ppp the same π system is solved by Pariser–Parr–Pople SCF: levels are in eV
by Koopmans' theorem (no calibration) and x = (ε − α_C)/β₀ with β₀ = −2.39 eV.

With '-' molecules are read from stdin, one per line as "SMILES [name]"; blank lines and
lines starting with '#' are skipped. A bad line is reported with its line number and the
rest continue (exit status 1).

Results are estimates for planning, not safety assessments.`,
		Example: `  cyclopair orbitals C=CC=C
  cyclopair orbitals 'C=CC(=O)OC' c1ccncc1 --format json
  printf 'C=CC=C butadiene\nC=CC=O acrolein\n' | cyclopair orbitals - --format csv
  cyclopair orbitals 'C=C[CH2+]' --omega 1.4
  cyclopair orbitals c1ccncc1 --params vancatledge1980
  cyclopair orbitals C=CC=O --method ppp`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			switch opts.format {
			case "table", "json", "csv":
			default:
				return &usageError{fmt.Errorf("--format %q: want table, json or csv", opts.format)}
			}
			if err := opts.methodOptions.check(); err != nil {
				return err
			}
			opts.omegaSet = c.Flags().Changed("omega")
			if opts.omegaSet && opts.method == huckel.MethodPPP {
				return &usageError{errors.New("--omega is a Hückel device (the ω-technique); PPP-SCF treats charges self-consistently: drop --omega with --method ppp")}
			}
			if opts.omegaSet && (opts.omega < 0 || opts.omega > 5) {
				return &usageError{fmt.Errorf("--omega %g: want a value between 0 and 5 (typical 1.4)", opts.omega)}
			}
			if err := opts.limits.check(); err != nil {
				return err
			}
			for _, a := range args {
				if a == "-" && len(args) > 1 {
					return &usageError{errors.New("'-' (read stdin) cannot be combined with SMILES arguments")}
				}
			}
			return runOrbitals(s, opts, args)
		},
	}
	cmd.Flags().StringVar(&opts.format, "format", "table", "output format: table, json (JSON Lines) or csv")
	cmd.Flags().StringVar(&opts.params, "params", presets.DefaultParams, "parameter set: a built-in name (see 'cyclopair params') or a YAML file")
	_ = cmd.RegisterFlagCompletionFunc("params", completeParams)
	cmd.Flags().Float64Var(&opts.omega, "omega", 0, "ω-technique constant (e.g. 1.4; 0 = off; default: the parameter set's)")
	cmd.Flags().StringVar(&opts.calibration, "calibration", "default", "x → eV calibration: default, or a file from 'cyclopair calibrate --out'")
	addMethodFlags(cmd.Flags(), &opts.methodOptions, defaultMethod)
	opts.limits.flags(cmd, huckel.DefaultMaxCentres)
	addOrbitalsListFlags(cmd, opts)
	return cmd
}

// orbitalsInput is one molecule to compute: its text, optional name, and where it came
// from (line 0 for a command-line argument).
type orbitalsInput struct {
	smiles, name string
	line         int
}

// runOrbitals computes and prints every input. It is the testable body of the command.
func runOrbitals(s *streams, opts *orbitalsOptions, args []string) error {
	mod, err := resolveSolveModel(s, opts.params, opts.calibration, opts.methodOptions)
	if err != nil {
		return err
	}
	p, cal := mod.params, mod.cal
	var emit func(in orbitalsInput, res *orbitalsResult, err error) error
	// Output is buffered (the table format is many small writes per molecule) and flushed
	// before returning, also on error.
	bw := bufio.NewWriterSize(s.out, 1<<16)
	defer bw.Flush()
	out := newOrbitalsWriter(bw, opts.format, p, cal)
	solver := mod.solver()
	failed, total := 0, 0
	var single error
	handle := func(in orbitalsInput) error {
		res, err := computeOrbitals(in, p, opts, solver, nil)
		return emit(in, res, err)
	}
	emit = func(in orbitalsInput, res *orbitalsResult, err error) error {
		total++
		if err != nil {
			failed++
			if in.line == 0 && len(args) == 1 {
				single = err
				return nil
			}
			fmt.Fprintf(s.err, "cyclopair: %v\n", err)
			return nil
		}
		for _, w := range res.warnings() {
			fmt.Fprintf(s.err, "cyclopair: %s: warning: %s\n", errtext.Clip(in.smiles), w)
		}
		return out.write(res)
	}
	if len(args) == 1 && args[0] == "-" && opts.listFormat != "" {
		n, bad, err := readOrbitalsList(s, opts, handle)
		if err != nil {
			return err
		}
		failed, total = failed+bad, total+bad
		if n+bad == 0 {
			return &inputError{errors.New("stdin: no molecules read")}
		}
	} else if len(args) == 1 && args[0] == "-" {
		sc := bufio.NewScanner(s.in)
		sc.Buffer(make([]byte, 64*1024), 1<<20)
		line := 0
		batch := newOrbitalsBatch(p, opts, mod)
		if opts.format == "json" {
			batch.format = func(r *orbitalsResult) {
				j := toJSON(r, p, cal)
				buf := jsonLines.Get().(*[]byte)
				r.line = append(appendOrbitalsJSON((*buf)[:0], &j), '\n')
			}
		}
		for sc.Scan() {
			line++
			text := sc.Text()
			if line == 1 {
				text = strings.TrimPrefix(text, "\ufeff") // a byte-order mark from an editor
			}
			text = strings.TrimSpace(text)
			if text == "" || strings.HasPrefix(text, "#") {
				continue
			}
			var smi, name string
			if i := strings.IndexAny(text, " \t"); i >= 0 {
				smi, name = text[:i], strings.TrimSpace(text[i+1:])
			} else {
				smi, name = text, ""
			}
			if batch.add(orbitalsInput{smiles: smi, name: name, line: line}) {
				if err := batch.run(emit); err != nil {
					return err
				}
			}
		}
		if err := batch.run(emit); err != nil {
			return err
		}
		if err := sc.Err(); err != nil {
			return &inputError{fmt.Errorf("stdin: line %d: %v (lines are limited to 1 MiB)", line+1, err)}
		}
		if total == 0 {
			return &inputError{errors.New("stdin: no molecules read (expected lines of 'SMILES [name]')")}
		}
	} else {
		for _, a := range args {
			if err := handle(orbitalsInput{smiles: a}); err != nil {
				return err
			}
		}
	}
	if err := out.flush(); err != nil {
		return err
	}
	if err := bw.Flush(); err != nil {
		return err
	}
	if single != nil {
		return &inputError{single}
	}
	if failed > 0 {
		return &partialError{failed: failed, total: total}
	}
	return nil
}

// orbitalsResult is one solved molecule.
type orbitalsResult struct {
	in  orbitalsInput
	ps  *huckel.PiSystem
	orb *huckel.Orbitals
	// line is the result's JSON line, formatted by the batch worker that solved it so the
	// writer only copies bytes (nil when the output is not JSON). Such a result keeps no
	// orbitals (orb is nil: the worker reuses its own) and carries their warnings in warn.
	line []byte
	warn []string
}

// warnings are the solved molecule's warnings, for stderr.
func (r *orbitalsResult) warnings() []string {
	if r.orb == nil {
		return r.warn
	}
	return r.orb.Warnings
}

// computeOrbitals parses, perceives and solves one input. Errors are formatted as
// "<SMILES>: [line N, ]<position>: <what> (<hint>)", with the SMILES excerpt and caret on
// the following lines for syntax errors.
//
// into, when not nil, receives the orbitals (reusing its buffers); nil allocates new ones.
func computeOrbitals(in orbitalsInput, p *huckel.Params, opts *orbitalsOptions, solver huckel.Method, into *huckel.Orbitals) (*orbitalsResult, error) {
	where := errtext.Clip(in.smiles)
	if in.line > 0 {
		where = fmt.Sprintf("%s: line %d", where, in.line)
	}
	m, err := opts.limits.parse(in.smiles)
	if err != nil {
		var se *smiles.Error
		if errors.As(err, &se) {
			sep := ": "
			if in.line > 0 {
				sep = ", "
			}
			return nil, fmt.Errorf("%s%s%s%s", where, sep, se.Error(), excerptLines(se))
		}
		return nil, fmt.Errorf("%s: %v", where, err)
	}
	m.Name = in.name
	ps, err := opts.limits.perceive(m, p)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", where, err)
	}
	if opts.omegaSet {
		ps.Omega = opts.omega
	}
	if len(ps.Centres) == 0 {
		return nil, fmt.Errorf("%s: %s", where, noPiSystem(ps, "compute"))
	}
	o := into
	if o == nil {
		o = new(huckel.Orbitals)
	}
	if err := solver.Solve(ps, o); err != nil {
		return nil, fmt.Errorf("%s: %v (try without --omega or with a smaller value)", where, err)
	}
	o.Warnings = append(o.Warnings, ps.Warnings...)
	return &orbitalsResult{in: in, ps: ps, orb: o}, nil
}

// indent prefixes every line of s with two spaces (the SMILES excerpt under an error).
func indent(s string) string {
	return "  " + strings.ReplaceAll(s, "\n", "\n  ")
}

// jsonLines recycles the JSON line buffers the batch workers format into and the writer
// empties (orbitalsWriter.write): without it every line grew from nothing, and growing and
// clearing the slices was a quarter of the CPU of 5,000 molecules as JSON.
var jsonLines = sync.Pool{New: func() any { b := make([]byte, 0, 8<<10); return &b }}

// orbitalsBatch computes the molecules of a stdin batch on all cores (one solver workspace
// per worker) and hands the results on in input order, so output and messages are the same
// as one at a time. A batch holds at most orbitalsBatchSize molecules: memory stays bounded
// however long the input.
type orbitalsBatch struct {
	p       *huckel.Params
	opts    *orbitalsOptions
	ins     []orbitalsInput
	res     []*orbitalsResult
	errs    []error
	solvers []huckel.Method // one per worker
	// format, when set, turns a solved result into its output bytes on the worker, so the
	// formatting runs on all cores instead of the single writer (JSON Lines).
	format func(*orbitalsResult)
}

const orbitalsBatchSize = 512

func newOrbitalsBatch(p *huckel.Params, opts *orbitalsOptions, mod *solveModel) *orbitalsBatch {
	b := &orbitalsBatch{p: p, opts: opts}
	for range runtime.GOMAXPROCS(0) {
		b.solvers = append(b.solvers, mod.solver())
	}
	return b
}

// add queues one input and reports whether the batch is full.
func (b *orbitalsBatch) add(in orbitalsInput) bool {
	b.ins = append(b.ins, in)
	return len(b.ins) >= orbitalsBatchSize
}

// run computes the queued inputs and calls emit for each, in order.
func (b *orbitalsBatch) run(emit func(orbitalsInput, *orbitalsResult, error) error) error {
	n := len(b.ins)
	if n == 0 {
		return nil
	}
	b.res = append(b.res[:0], make([]*orbitalsResult, n)...)
	b.errs = append(b.errs[:0], make([]error, n)...)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := range min(len(b.solvers), n) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var orb *huckel.Orbitals // reused when the worker formats the result itself
			if b.format != nil {
				orb = new(huckel.Orbitals)
			}
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				b.res[i], b.errs[i] = computeOrbitals(b.ins[i], b.p, b.opts, b.solvers[w], orb)
				if r := b.res[i]; b.errs[i] == nil && b.format != nil {
					b.format(r)
					r.warn = slices.Clone(r.orb.Warnings)
					r.orb, r.ps = nil, nil
				}
			}
		}()
	}
	wg.Wait()
	for i := range n {
		if err := emit(b.ins[i], b.res[i], b.errs[i]); err != nil {
			return err
		}
		b.res[i] = nil
	}
	b.ins = b.ins[:0]
	return nil
}

// excerptLines is the indented excerpt with caret that follows a SMILES error line, or
// nothing for an over-long input (its error line says everything; an excerpt would only
// show 100 characters of the middle of it).
func excerptLines(se *smiles.Error) string {
	if errors.Is(se, smiles.ErrTooLong) {
		return ""
	}
	return "\n" + indent(se.Excerpt())
}

// noPiSystem is the message for a molecule without π centres, naming what perception
// left out (a metal atom, say) when it warned about it.
func noPiSystem(ps *huckel.PiSystem, verb string) string {
	if len(ps.Warnings) > 0 {
		return fmt.Sprintf("no π system, nothing to %s: %s", verb, ps.Warnings[0])
	}
	return fmt.Sprintf("no π system (no conjugated atoms found; nothing to %s)", verb)
}
