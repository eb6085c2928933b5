package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"cyclopair/fmo"
	"cyclopair/huckel"
	"cyclopair/huckel/ppp"
	"cyclopair/presets"

	"github.com/spf13/pflag"
)

// defaultMethod is the π method used when --method (or a substrate file's method: key)
// does not say. Hückel, chosen by measurement on the whole bundled check set (README,
// "π method"): PPP-SCF reproduces fewer regio and site outcomes of the literature check
// set, although its LUMO energies track electron affinities more closely.
const defaultMethod = huckel.MethodHuckel

// methods are the values --method accepts.
var methods = []string{huckel.MethodHuckel, huckel.MethodPPP}

// methodOptions are the --method and --ppp-params flags shared by every command that
// solves molecules. The Hückel parameter set (--params) is used under both methods: PPP
// takes the π centres, their types and the resonance parameters k from Hückel perception.
type methodOptions struct {
	method    string // huckel or ppp; "" keeps the file's (screen) or the default
	pppParams string // PPP parameter set name or YAML file; "" for presets.DefaultPPP
}

// addMethodFlags registers --method and --ppp-params. def is the flag default shown in help
// ("" for commands where a file may decide).
func addMethodFlags(f *pflag.FlagSet, o *methodOptions, def string) {
	help := "π method: huckel (simple Hückel, eV by a stated calibration) or ppp (Pariser–Parr–Pople SCF, eV by Koopmans' theorem)"
	if def == "" {
		help += " (default: the file's, else " + defaultMethod + ")"
	}
	f.StringVar(&o.method, "method", def, help)
	f.StringVar(&o.pppParams, "ppp-params", "", "PPP parameter set with --method ppp: a built-in name ("+strings.Join(presets.PPPNames(), ", ")+") or a YAML file overriding it (default "+presets.DefaultPPP+")")
}

// check validates the flags alone (before any file is read).
func (o methodOptions) check() error {
	if o.method != "" && !slices.Contains(methods, o.method) {
		return &usageError{fmt.Errorf("--method %q: want %s", o.method, strings.Join(methods, " or "))}
	}
	return nil
}

// maxPPPFile caps a user PPP parameter file read from disk.
const maxPPPFile = 1 << 20

// resolvePPP turns a --ppp-params value into a PPP parameter set: a built-in name or a YAML
// file in the same format, which overrides its base: set (presets.DefaultPPP when it names
// none) or, with replace: true, stands alone. Empty means the default set.
func resolvePPP(spec string) (*ppp.Params, error) {
	if spec == "" {
		spec = presets.DefaultPPP
	}
	if slices.Contains(presets.PPPNames(), spec) {
		return presets.PPPParams(spec)
	}
	f, err := os.Open(spec)
	if err != nil {
		if errors.Is(err, os.ErrNotExist) {
			return nil, &inputError{fmt.Errorf("%s: no such PPP parameter set or file (built-in sets: %s)",
				spec, strings.Join(presets.PPPNames(), ", "))}
		}
		return nil, &inputError{fmt.Errorf("%s: %v (check the path and permissions)", spec, err)}
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, maxPPPFile+1))
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s: %v (check the file)", spec, err)}
	}
	if len(data) > maxPPPFile {
		return nil, &inputError{fmt.Errorf("%s: larger than %d bytes (a PPP parameter file is a few kB)", spec, maxPPPFile)}
	}
	user, err := ppp.Parse(data, spec)
	if err != nil {
		return nil, &inputError{fmt.Errorf("%v (the format is that of presets/ppp/%s.yaml)", err, presets.DefaultPPP)}
	}
	p, err := presets.ResolvePPP(user)
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s: %v", spec, err)}
	}
	return p, nil
}

// solveModel is everything a command needs to solve molecules: the Hückel parameter set
// (perception, and the π method when it is Hückel), the eV map, and the π method.
type solveModel struct {
	params *huckel.Params
	cal    huckel.Calibration
	method string
	// newMethod builds a solver of the method; nil for Hückel (fmo.Options' default).
	newMethod func() huckel.Method
}

// methodModel resolves the method flags for parameter set p: Hückel keeps the calibration
// cal; PPP replaces it by the PPP set's exact Koopmans map (ppp.Params.Scale). A
// calibration file given explicitly (calSpec not "" or "default") with PPP is a usage
// error, since PPP energies are not calibrated.
func methodModel(method, pppSpec, calSpec string, p *huckel.Params, cal huckel.Calibration) (*solveModel, error) {
	if method == "" {
		method = defaultMethod
	}
	m := &solveModel{params: p, cal: cal, method: method}
	if method != huckel.MethodPPP {
		if pppSpec != "" {
			return nil, &usageError{fmt.Errorf("--ppp-params %s: only used with --method ppp", pppSpec)}
		}
		return m, nil
	}
	if calSpec != "" && calSpec != "default" {
		return nil, &usageError{fmt.Errorf("--calibration %s: PPP orbital energies are in eV by Koopmans' theorem and take no calibration (drop --calibration or use --method huckel)", calSpec)}
	}
	pp, err := resolvePPP(pppSpec)
	if err != nil {
		return nil, err
	}
	m.cal = pp.Scale()
	m.newMethod = ppp.Factory(pp)
	return m, nil
}

// resolveSolveModel resolves --params, --calibration, --method and --ppp-params together.
// Under PPP the calibration is not loaded at all.
func resolveSolveModel(s *streams, params, calibration string, mo methodOptions) (*solveModel, error) {
	if err := mo.check(); err != nil {
		return nil, err
	}
	p, err := resolveParams(params)
	if err != nil {
		return nil, err
	}
	var cal huckel.Calibration
	if mo.method != huckel.MethodPPP && !(mo.method == "" && defaultMethod == huckel.MethodPPP) {
		if cal, err = resolveCalibration(s, calibration, p); err != nil {
			return nil, err
		}
	}
	return methodModel(mo.method, mo.pppParams, calibration, p, cal)
}

// options returns fmo options with the default constants for this model.
func (m *solveModel) options() *fmo.Options {
	o := fmo.NewOptions(m.params, m.cal, m.cal.Name)
	o.NewMethod = m.newMethod
	return o
}

// solver returns a new solver of the model's method.
func (m *solveModel) solver() huckel.Method {
	if m.newMethod == nil {
		return new(huckel.Solver)
	}
	return m.newMethod()
}
