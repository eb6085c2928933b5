package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"text/tabwriter"

	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo/check"
	"cyclopair/huckel"
	"cyclopair/huckel/errtext"
	"cyclopair/huckel/yamlfile"
	"cyclopair/presets"

	"github.com/spf13/cobra"
)

// calibrateOptions are the flags of 'cyclopair calibrate'.
type calibrateOptions struct {
	params string
	format string // table, json, yaml
	out    string // calibration file to write
	name   string
	rates  bool   // --rates: FILE is a rates file (presets/kinetics/rates.yaml format); fit a rate model
	sel    string // --selectivity FILE with --rates (default: the bundled selectivity set)
}

func newCalibrateCmd(s *streams) *cobra.Command {
	opts := &calibrateOptions{}
	cmd := &cobra.Command{
		Use:   "calibrate FILE.yaml | -",
		Short: "Refit the x → eV calibration from your own ionisation energies and electron affinities",
		Long: `Fit the two straight lines that turn Hückel orbital energies x (E = α + xβ) into eV:
occupied levels against −IE (ionisation energies, Koopmans-type) and empty levels against
−EA (electron affinities; an ETS vertical attachment energy, marked by "attachment energy"
in its quantity, counts as +AE). Every molecule is perceived and solved with --params.

The data file has the shape of the project's reference list:
  entries:
  - {id: IE08, kind: ionization_energy, molecule: C=CC=C, value_eV: 9.072, source: "..."}
  - {id: EA14, kind: electron_affinity, molecule: C=CC=C, value_eV: 0.62,
     quantity: "vertical attachment energy AE (ETS)", source: "..."}
Optional keys: name, uncertainty_eV, quantity, source, confidence, note, use (false keeps a
row out of the fit), why_not. Bad rows (unknown kind or key, bad SMILES, missing value) are
listed on stderr with file:line:column, the rest are fitted, and the exit status is 1.

Prints slope, intercept, r², RMSE and N per map and the residual of every point. --out
writes a calibration file that pair, orbitals and the other commands read with
--calibration FILE (use it with the parameter set it was fitted for).

Results are estimates for planning, not safety assessments.`,
		Example: `  cyclopair calibrate my-ie-ea.yaml
  cyclopair calibrate my-ie-ea.yaml --params vancatledge1980 --out my.cal.yaml
  cyclopair calibrate my-ie-ea.yaml --format json | jq .homo`,
		Args: cobra.ExactArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			if opts.rates {
				return runCalibrateRates(s, opts, args[0])
			}
			if opts.sel != "" {
				return &usageError{fmt.Errorf("--selectivity is only used with --rates")}
			}
			switch opts.format {
			case "table", "json", "yaml":
			default:
				return &usageError{fmt.Errorf("--format %q: want table, json or yaml", opts.format)}
			}
			return runCalibrate(s, opts, args[0])
		},
	}
	f := cmd.Flags()
	f.StringVar(&opts.params, "params", presets.DefaultParams, "parameter set: a built-in name (see 'cyclopair params') or a YAML file")
	f.BoolVar(&opts.rates, "rates", false, "FILE holds rate series in the format of presets/kinetics/rates.yaml: refit the rate model (write it with --out, use it with --rate-model)")
	f.StringVar(&opts.sel, "selectivity", "", "with --rates: a selectivity file in the format of presets/kinetics/selectivity.yaml (default: the bundled one)")
	f.StringVar(&opts.format, "format", "table", "output format: table, json or yaml (the calibration file itself)")
	f.StringVar(&opts.out, "out", "", "write the fitted calibration to this file (load it with --calibration)")
	f.StringVar(&opts.name, "name", "", "name of the fitted calibration (default fit-<parameter set>)")
	_ = cmd.MarkFlagFilename("out", "yaml", "yml")
	return cmd
}

// openInput opens a file argument, "-" meaning stdin.
func openInput(s *streams, path string) (io.Reader, func(), string, error) {
	if path == "-" {
		return s.in, func() {}, "stdin", nil
	}
	f, err := os.Open(path)
	if err != nil {
		hint := "check the path and permissions"
		if errors.Is(err, os.ErrNotExist) {
			hint = "no such file"
		}
		return nil, nil, path, &inputError{fmt.Errorf("%s: cannot open (%s)", path, hint)}
	}
	return f, func() { f.Close() }, path, nil
}

// runCalibrate is the testable body of 'cyclopair calibrate'.
func runCalibrate(s *streams, opts *calibrateOptions, path string) error {
	p, err := resolveParams(opts.params)
	if err != nil {
		return err
	}
	r, done, name, err := openInput(s, path)
	if err != nil {
		return err
	}
	defer done()
	rows, bad, err := check.LoadCalibrationData(r, name)
	if err != nil {
		return &inputError{err}
	}
	fit, bad2, err := check.FitCalibrationData(rows, p, name, opts.name)
	bad = append(bad, bad2...)
	for _, b := range bad {
		fmt.Fprintf(s.err, "cyclopair: %v\n", b)
	}
	if err != nil {
		return &inputError{fmt.Errorf("%s: %v (each map needs at least %d usable points with different x)", name, err, huckel.MinCalibrationPoints)}
	}
	if opts.out != "" {
		var buf bytes.Buffer
		if err := check.WriteCalibrationFile(&buf, fit); err != nil {
			return err
		}
		if err := os.WriteFile(opts.out, buf.Bytes(), 0o644); err != nil {
			return &inputError{fmt.Errorf("%s: cannot write (%v)", opts.out, err)}
		}
		fmt.Fprintf(s.err, "cyclopair: wrote calibration %s to %s (load it with --calibration %s)\n", fit.Calibration.Name, opts.out, opts.out)
	}
	switch opts.format {
	case "yaml":
		if err := check.WriteCalibrationFile(s.out, fit); err != nil {
			return err
		}
	case "json":
		if err := writeCalibrateJSON(s.out, fit, bad); err != nil {
			return err
		}
	default:
		writeCalibrateTable(s.out, fit)
	}
	if len(bad) > 0 {
		return &partialError{failed: len(bad), total: len(rows) + len(bad) - len(bad2)}
	}
	return nil
}

type calMapJSON struct {
	Intercept num `json:"intercept"`
	Slope     num `json:"slope"`
	N         int `json:"n"`
	R2        num `json:"r2"`
	RMSE      num `json:"rmse_ev"`
}

type fitPointJSON struct {
	ID       string `json:"id"`
	Name     string `json:"name,omitempty"`
	SMILES   string `json:"smiles"`
	Level    string `json:"level"`
	X        num    `json:"x"`
	EnergyEV num    `json:"energy_ev"`
	FitEV    num    `json:"fit_ev"`
	Residual num    `json:"residual_ev"`
}

type calibrateJSON struct {
	Name    string         `json:"name"`
	Params  string         `json:"params"`
	Data    string         `json:"data"`
	Source  string         `json:"source"`
	HOMO    calMapJSON     `json:"homo"`
	LUMO    calMapJSON     `json:"lumo"`
	N       int            `json:"n"`
	R2      num            `json:"r2"`
	RMSE    num            `json:"rmse_ev"`
	Points  []fitPointJSON `json:"points"`
	Skipped []fitPointJSON `json:"skipped"`
	BadRows []string       `json:"bad_rows"`
	Caution string         `json:"caution"`
}

func pointsJSON(pts []check.FitPoint) []fitPointJSON {
	out := make([]fitPointJSON, 0, len(pts))
	for _, p := range pts {
		out = append(out, fitPointJSON{ID: p.ID, Name: p.Name, SMILES: p.SMILES, Level: p.Level, X: num(p.X),
			EnergyEV: num(p.EnergyEV), FitEV: num(p.FitEV), Residual: num(p.Residual)})
	}
	return out
}

func writeCalibrateJSON(w io.Writer, fit *check.CalibrationFit, bad yamlfile.ErrorList) error {
	c := fit.Calibration
	j := calibrateJSON{
		Name: c.Name, Params: fit.Params, Data: fit.Data, Source: c.Source,
		HOMO: calMapJSON{num(c.HOMOIntercept), num(c.HOMOSlope), c.HOMON, num(c.HOMOR2), num(c.HOMORMSE)},
		LUMO: calMapJSON{num(c.LUMOIntercept), num(c.LUMOSlope), c.LUMON, num(c.LUMOR2), num(c.LUMORMSE)},
		N:    c.N, R2: num(c.R2), RMSE: num(c.RMSE),
		Points: pointsJSON(fit.Points), Skipped: pointsJSON(fit.Skipped), BadRows: []string{},
		Caution: render.Caution,
	}
	for _, b := range bad {
		j.BadRows = append(j.BadRows, b.Error())
	}
	b, err := json.Marshal(j)
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

func writeCalibrateTable(w io.Writer, fit *check.CalibrationFit) {
	c := fit.Calibration
	fmt.Fprintf(w, "calibration %s: least-squares fit of %s with parameter set %s\n", c.Name, fit.Data, fit.Params)
	fmt.Fprintf(w, "E(eV) = intercept + slope·x, E = α + xβ (x > 0 bonding); occupied levels against −IE, empty against −EA\n\n")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "map\tN\tintercept/eV\tslope/eV\tr²\tRMSE/eV")
	fmt.Fprintf(tw, "homo (−IE)\t%d\t%.3f\t%.3f\t%.3f\t%.3f\n", c.HOMON, c.HOMOIntercept, c.HOMOSlope, c.HOMOR2, c.HOMORMSE)
	fmt.Fprintf(tw, "lumo (−EA)\t%d\t%.3f\t%.3f\t%.3f\t%.3f\n", c.LUMON, c.LUMOIntercept, c.LUMOSlope, c.LUMOR2, c.LUMORMSE)
	fmt.Fprintf(tw, "both\t%d\t\t\t%.3f\t%.3f\n", c.N, c.R2, c.RMSE)
	tw.Flush()
	fmt.Fprintln(w)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "id\tname\tlevel\tx\tE/eV\tfit/eV\tresidual/eV\t")
	row := func(p check.FitPoint, note string) {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%.4f\t%.3f\t%.3f\t%+.3f\t%s\n", p.ID, dash(p.Name), p.Level, zero(p.X), p.EnergyEV, p.FitEV, zero(p.Residual), note)
	}
	for _, p := range fit.Points {
		row(p, "")
	}
	for _, p := range fit.Skipped {
		row(p, "not fitted (use: false)")
	}
	tw.Flush()
	fmt.Fprintf(w, "\n%s\n", render.Caution)
}

func dash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// resolveCalibration returns the calibration a --calibration value names for parameter set
// p: "" or "default" is the built-in calibration fitted for p; anything else is a calibration
// file written by 'cyclopair calibrate --out'. A file fitted for another parameter set is
// used with a warning on stderr. Errors are inputErrors in the CLI's one-line format.
// resolveModel resolves the --params and --calibration flags together: the parameter set
// first, then the calibration fitted for it (or the user's file, with a warning when it was
// fitted for another set).
func resolveModel(s *streams, params, calibration string) (*huckel.Params, huckel.Calibration, error) {
	p, err := resolveParams(params)
	if err != nil {
		return nil, huckel.Calibration{}, err
	}
	cal, err := resolveCalibration(s, calibration, p)
	if err != nil {
		return nil, huckel.Calibration{}, err
	}
	return p, cal, nil
}

func resolveCalibration(s *streams, spec string, p *huckel.Params) (huckel.Calibration, error) {
	if spec == "" || spec == "default" {
		cal, err := presets.Calibration(p)
		if err != nil {
			return cal, fmt.Errorf("calibration for parameter set %s: %w", p.Name, err)
		}
		return cal, nil
	}
	f, err := openRegular(spec, "calibration")
	if err != nil {
		var ie *inputError
		if errors.As(err, &ie) {
			return huckel.Calibration{}, err
		}
		hint := "check the path and permissions"
		if errors.Is(err, os.ErrNotExist) {
			hint = "no such file; write one with 'cyclopair calibrate DATA.yaml --out " + spec + "', or use default"
		}
		return huckel.Calibration{}, &inputError{fmt.Errorf("%s: cannot open calibration (%s)", spec, hint)}
	}
	defer f.Close()
	lc, err := check.LoadCalibrationFile(f, spec)
	if err != nil {
		return huckel.Calibration{}, &inputError{err}
	}
	if err := lc.Calibration.Check(); err != nil { // physical ranges (the loader checks syntax and signs)
		return huckel.Calibration{}, &inputError{fmt.Errorf("%s: %v (refit with 'cyclopair calibrate DATA.yaml --out %s')", errtext.Clip(spec), err, errtext.Clip(spec))}
	}
	if lc.Params != "" && lc.Params != p.Name {
		fmt.Fprintf(s.err, "cyclopair: warning: calibration %s was fitted with parameter set %s and is used with %s: its eV figures may be off (refit with 'cyclopair calibrate --params %s')\n",
			strings.TrimSpace(lc.Calibration.Name), lc.Params, p.Name, p.Name)
	}
	return lc.Calibration, nil
}
