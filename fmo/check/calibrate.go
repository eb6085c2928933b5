package check

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
	"cyclopair/huckel/yamlfile"
)

// This file refits the x → eV calibration from a user's data and reads and writes the
// calibration files other commands load with --calibration.
//
// Data files have the shape of the reference list the bundled calibration points were taken
// from (see presets/calibration/points.yaml and fmo/check/testdata/calibration/):
//
//	entries:
//	- id: IE08                        # optional; the row number is used when absent
//	  kind: ionization_energy         # or electron_affinity
//	  molecule: C=CC=C                # SMILES
//	  value_eV: 9.072
//	  name: 1,3-butadiene             # optional, like every key below
//	  uncertainty_eV: 0.007
//	  quantity: first ionization energy
//	  source: NIST Chemistry WebBook
//	  confidence: source-found
//	  note: ...
//	  use: false                      # keep the row for reference without fitting it
//	  why_not: first band is n_O
//
// Orbital energies (Koopmans-type): an ionization energy IE gives E_HOMO = −IE; an electron
// affinity EA gives E_LUMO = −EA; a vertical attachment energy from electron transmission
// spectroscopy, recognised by "attachment energy" in quantity, gives E_LUMO = +AE (the
// reference list's convention: EA_vertical = −AE).

// Data kinds.
const (
	KindIonization = "ionization_energy"
	KindAffinity   = "electron_affinity"
)

// ErrCalibrationData is wrapped by every error about a calibration data or calibration file.
// Those errors are *yamlfile.Error values; one about a single entry (Path holds its ID)
// leaves the other entries usable.
var ErrCalibrationData = errors.New("invalid calibration data")

// CalibrationRow is one entry of a calibration data file.
type CalibrationRow struct {
	ID            string   `yaml:"id"`
	Kind          string   `yaml:"kind"`
	Molecule      string   `yaml:"molecule"`
	Name          string   `yaml:"name"`
	ValueEV       *float64 `yaml:"value_eV"`
	UncertaintyEV float64  `yaml:"uncertainty_eV"`
	Quantity      string   `yaml:"quantity"`
	Source        string   `yaml:"source"`
	Confidence    string   `yaml:"confidence"`
	Note          string   `yaml:"note"`
	Use           *bool    `yaml:"use"`
	WhyNot        string   `yaml:"why_not"`

	Line, Col   int `yaml:"-"` // position of the entry
	molLine     int
	molCol      int
	kindLine    int
	kindCol     int
	valueLine   int
	valueColumn int
}

var calibrationRowKeys = []string{"id", "kind", "molecule", "name", "value_eV", "uncertainty_eV",
	"quantity", "source", "confidence", "note", "use", "why_not"}

// maxFileSize caps a check-set, calibration data or calibration file.
const maxFileSize = 4 << 20

// readCapped reads a file of this package, at most maxFileSize bytes; errors wrap sentinel,
// and readHint is the hint of a read error.
func readCapped(r io.Reader, filename string, sentinel error, readHint string) ([]byte, error) {
	data, tooLarge, err := yamlfile.ReadLimited(r, maxFileSize)
	if err != nil {
		return nil, &yamlfile.Error{File: filename, Msg: err.Error(), Hint: readHint, Err: sentinel}
	}
	if tooLarge {
		return nil, &yamlfile.Error{File: filename, Msg: fmt.Sprintf("file larger than %d bytes", maxFileSize), Err: sentinel}
	}
	return data, nil
}

// parseYAMLRoot parses data into a node tree, rejecting aliases, and returns the top mapping.
func parseYAMLRoot(data []byte, filename, want string) (*yaml.Node, error) {
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return nil, &yamlfile.Error{File: filename, Msg: err.Error(), Hint: "fix the YAML syntax", Err: ErrCalibrationData}
	}
	if len(root.Content) == 0 {
		return nil, &yamlfile.Error{File: filename, Msg: "empty file", Hint: want, Err: ErrCalibrationData}
	}
	top := root.Content[0]
	if top.Kind != yaml.MappingNode {
		return nil, &yamlfile.Error{File: filename, Line: top.Line, Col: top.Column, Msg: "top level is not a mapping", Hint: want, Err: ErrCalibrationData}
	}
	if err := rejectAliasRows(top, filename); err != nil {
		return nil, err
	}
	return top, nil
}

func rejectAliasRows(n *yaml.Node, file string) error {
	if a := yamlfile.FirstAlias(n); a != nil {
		return &yamlfile.Error{File: file, Line: a.Line, Col: a.Column, Msg: "YAML aliases are not allowed", Hint: "write the value out", Err: ErrCalibrationData}
	}
	return nil
}

// LoadCalibrationData reads a calibration data file. Problems with the file as a whole
// (unreadable, bad YAML, no entries: list, an unknown top-level key) are returned as err
// and nothing is usable. Problems with single entries — an unknown key, a missing or
// non-numeric value_eV, an unknown kind, a missing molecule — are returned as bad (in file
// order) and those entries are left out of rows; SMILES are checked by FitCalibrationData.
func LoadCalibrationData(r io.Reader, filename string) (rows []CalibrationRow, bad yamlfile.ErrorList, err error) {
	data, err := readCapped(r, filename, ErrCalibrationData, "check the file")
	if err != nil {
		return nil, nil, err
	}
	const want = "expected a mapping with the key entries: (a list of {kind, molecule, value_eV, ...})"
	top, err := parseYAMLRoot(data, filename, want)
	if err != nil {
		return nil, nil, err
	}
	var entries *yaml.Node
	for i := 0; i+1 < len(top.Content); i += 2 {
		k, v := top.Content[i], top.Content[i+1]
		if k.Value != "entries" {
			return nil, nil, &yamlfile.Error{File: filename, Line: k.Line, Col: k.Column, Msg: fmt.Sprintf("unknown top-level key %q", k.Value), Hint: want, Err: ErrCalibrationData}
		}
		entries = v
	}
	if entries == nil || entries.Kind != yaml.SequenceNode || len(entries.Content) == 0 {
		return nil, nil, &yamlfile.Error{File: filename, Line: top.Line, Col: top.Column, Msg: "no entries", Hint: want, Err: ErrCalibrationData}
	}
	for i, e := range entries.Content {
		id := fmt.Sprintf("entry %d", i+1)
		fail := func(n *yaml.Node, msg, hint string) {
			bad = append(bad, &yamlfile.Error{File: filename, Line: n.Line, Col: n.Column, Path: id, Msg: msg, Hint: hint, Err: ErrCalibrationData})
		}
		if e.Kind != yaml.MappingNode {
			fail(e, "entry is not a mapping", "write {kind: ..., molecule: ..., value_eV: ...}")
			continue
		}
		for j := 0; j+1 < len(e.Content); j += 2 {
			if e.Content[j].Value == "id" && e.Content[j+1].Value != "" {
				id = e.Content[j+1].Value
			}
		}
		row := CalibrationRow{Line: e.Line, Col: e.Column}
		ok := true
		for j := 0; j+1 < len(e.Content); j += 2 {
			k, v := e.Content[j], e.Content[j+1]
			if !slices.Contains(calibrationRowKeys, k.Value) {
				fail(k, fmt.Sprintf("unknown key %q", k.Value), "known keys: "+strings.Join(calibrationRowKeys, ", "))
				ok = false
				break
			}
			switch k.Value {
			case "molecule":
				row.molLine, row.molCol = v.Line, v.Column
				if v.Style&(yaml.DoubleQuotedStyle|yaml.SingleQuotedStyle) != 0 {
					row.molCol++ // the SMILES starts after the quote
				}
			case "kind":
				row.kindLine, row.kindCol = v.Line, v.Column
			case "value_eV":
				row.valueLine, row.valueColumn = v.Line, v.Column
			}
		}
		if !ok {
			continue
		}
		if err := e.Decode(&row); err != nil {
			fail(e, "cannot read entry: "+strings.ReplaceAll(err.Error(), "\n", "; "), "value_eV and uncertainty_eV are numbers, use is true or false")
			continue
		}
		if row.ID == "" {
			row.ID = id
		}
		switch {
		case row.Kind != KindIonization && row.Kind != KindAffinity:
			bad = append(bad, &yamlfile.Error{File: filename, Line: calNZ(row.kindLine, e.Line), Col: calNZ(row.kindCol, e.Column), Path: row.ID,
				Msg: fmt.Sprintf("unknown kind %q", row.Kind), Hint: "use " + KindIonization + " or " + KindAffinity, Err: ErrCalibrationData})
		case row.Molecule == "":
			fail(e, "missing molecule", "give the SMILES as molecule:")
		case row.ValueEV == nil || math.IsNaN(*row.ValueEV) || math.IsInf(*row.ValueEV, 0):
			bad = append(bad, &yamlfile.Error{File: filename, Line: calNZ(row.valueLine, e.Line), Col: calNZ(row.valueColumn, e.Column), Path: row.ID,
				Msg: "missing or non-finite value_eV", Hint: "give the measured value in eV", Err: ErrCalibrationData})
		default:
			rows = append(rows, row)
		}
	}
	return rows, bad, nil
}

func calNZ(a, b int) int {
	if a != 0 {
		return a
	}
	return b
}

// FitPoint is one fitted data point with its residual.
type FitPoint struct {
	ID       string  `json:"id" yaml:"id"`
	Name     string  `json:"name,omitempty" yaml:"name,omitempty"`
	SMILES   string  `json:"smiles" yaml:"smiles"`
	Level    string  `json:"level" yaml:"level"` // "homo" or "lumo"
	X        float64 `json:"x" yaml:"x"`
	EnergyEV float64 `json:"energy_ev" yaml:"energy_eV"` // −IE, −EA or +AE
	FitEV    float64 `json:"fit_ev" yaml:"fit_eV"`
	Residual float64 `json:"residual_ev" yaml:"residual_eV"` // EnergyEV − FitEV
}

// CalibrationFit is a refitted calibration with the points behind it.
type CalibrationFit struct {
	Calibration huckel.Calibration
	Params      string // parameter set the x values come from
	Data        string // the data file
	Points      []FitPoint
	Skipped     []FitPoint // rows marked use: false (not fitted), with x and the energy
}

// orbitalEnergy converts a row's measured value into the orbital energy the fit uses.
func orbitalEnergy(r CalibrationRow) (level string, e float64) {
	v := *r.ValueEV
	if r.Kind == KindIonization {
		return "homo", -v
	}
	if strings.Contains(strings.ToLower(r.Quantity), "attachment energy") {
		return "lumo", v
	}
	return "lumo", -v
}

// FitCalibrationData perceives and solves every row with p and fits the occupied map (−IE
// against x_HOMO) and the empty map (−EA against x_LUMO) with huckel.FitCalibration. Rows
// whose SMILES does not parse or whose π system cannot be perceived or solved are returned
// in bad and left out. err is set (wrapping huckel.ErrCalibration) when a map has too few
// usable points. name names the result (default "fit-" + p.Name).
func FitCalibrationData(rows []CalibrationRow, p *huckel.Params, dataFile, name string) (*CalibrationFit, yamlfile.ErrorList, error) {
	fit := &CalibrationFit{Params: p.Name, Data: dataFile}
	var bad yamlfile.ErrorList
	var pts []huckel.CalibrationPoint
	var solver huckel.Solver
	for _, r := range rows {
		pos := func() (int, int) { return calNZ(r.molLine, r.Line), calNZ(r.molCol, r.Col) }
		m, err := smiles.Parse(r.Molecule)
		if err != nil {
			l, c := pos()
			msg := err.Error()
			var se *smiles.Error
			if errors.As(err, &se) {
				c += se.Pos // molCol is the column of the SMILES' first character
				msg = fmt.Sprintf("SMILES %q: %s", r.Molecule, se.Msg)
				bad = append(bad, &yamlfile.Error{File: dataFile, Line: l, Col: c, Path: r.ID, Msg: msg, Hint: se.Hint, Err: ErrCalibrationData})
				continue
			}
			bad = append(bad, &yamlfile.Error{File: dataFile, Line: l, Col: c, Path: r.ID, Msg: fmt.Sprintf("SMILES %q: %s", r.Molecule, msg), Err: ErrCalibrationData})
			continue
		}
		ps, err := huckel.Perceive(m, p)
		if err != nil {
			l, c := pos()
			bad = append(bad, &yamlfile.Error{File: dataFile, Line: l, Col: c, Path: r.ID, Msg: err.Error(), Hint: "the parameter set cannot describe this π system", Err: ErrCalibrationData})
			continue
		}
		var orb huckel.Orbitals
		if err := solver.Solve(ps, &orb); err != nil {
			l, c := pos()
			bad = append(bad, &yamlfile.Error{File: dataFile, Line: l, Col: c, Path: r.ID, Msg: err.Error(), Err: ErrCalibrationData})
			continue
		}
		level, e := orbitalEnergy(r)
		idx := orb.HOMO
		if level == "lumo" {
			idx = orb.LUMO
		}
		if idx < 0 {
			l, c := pos()
			bad = append(bad, &yamlfile.Error{File: dataFile, Line: l, Col: c, Path: r.ID, Msg: "no π " + strings.ToUpper(level) + " to fit", Err: ErrCalibrationData})
			continue
		}
		fp := FitPoint{ID: r.ID, Name: r.Name, SMILES: r.Molecule, Level: level, X: orb.Levels[idx].X, EnergyEV: e}
		if r.Use != nil && !*r.Use {
			fit.Skipped = append(fit.Skipped, fp)
			continue
		}
		fit.Points = append(fit.Points, fp)
		pts = append(pts, huckel.CalibrationPoint{ID: r.ID, Name: r.Name, SMILES: r.Molecule, Occupied: level == "homo", X: fp.X, EnergyEV: e})
	}
	cal, err := huckel.FitCalibration(pts)
	if err != nil {
		return nil, bad, err
	}
	if name == "" {
		name = "fit-" + p.Name
	}
	cal.Name = name
	cal.Source = fmt.Sprintf("least-squares fit of %s (%d points, parameter set %s)", dataFile, cal.N, p.Name)
	fit.Calibration = cal
	for _, set := range [][]FitPoint{fit.Points, fit.Skipped} {
		for i := range set {
			set[i].FitEV = cal.EV(set[i].X, set[i].Level == "homo")
			set[i].Residual = set[i].EnergyEV - set[i].FitEV
		}
	}
	return fit, bad, nil
}

// CalibrationFormat is the value of the format: key of calibration files.
const CalibrationFormat = "cyclopair-calibration/1"

type calMapFile struct {
	Intercept *float64 `yaml:"intercept"`
	Slope     *float64 `yaml:"slope"`
	N         int      `yaml:"n"`
	R2        float64  `yaml:"r2"`
	RMSE      float64  `yaml:"rmse_eV"`
}

type calFile struct {
	Format string     `yaml:"format"`
	Name   string     `yaml:"name"`
	Params string     `yaml:"params"`
	Source string     `yaml:"source"`
	HOMO   calMapFile `yaml:"homo"`
	LUMO   calMapFile `yaml:"lumo"`
	N      int        `yaml:"n"`
	R2     float64    `yaml:"r2"`
	RMSE   float64    `yaml:"rmse_eV"`
	Points []FitPoint `yaml:"points"`
}

// calFmt formats a number with at most 6 decimals, deterministically.
func calFmt(v float64) string {
	if v == 0 {
		return "0"
	}
	return strconv.FormatFloat(math.Round(v*1e6)/1e6, 'f', -1, 64)
}

// WriteCalibrationFile writes fit in the calibration file format that LoadCalibrationFile
// reads (YAML, keys in a fixed order, numbers rounded to 6 decimals).
func WriteCalibrationFile(w io.Writer, fit *CalibrationFit) error {
	c := fit.Calibration
	var b bytes.Buffer
	fmt.Fprintf(&b, "# cyclopair calibration: orbital energy E(eV) = intercept + slope·x, where E = α + xβ\n")
	fmt.Fprintf(&b, "# (x > 0 bonding). homo maps occupied levels (fitted to −IE), lumo empty levels (−EA).\n")
	fmt.Fprintf(&b, "# Load it with --calibration FILE; use it with the parameter set it was fitted for.\n")
	fmt.Fprintf(&b, "format: %s\n", CalibrationFormat)
	fmt.Fprintf(&b, "name: %s\n", calQuote(c.Name))
	fmt.Fprintf(&b, "params: %s\n", calQuote(fit.Params))
	fmt.Fprintf(&b, "source: %s\n", calQuote(c.Source))
	mp := func(key string, icpt, slope float64, n int, r2, rmse float64) {
		fmt.Fprintf(&b, "%s: {intercept: %s, slope: %s, n: %d, r2: %s, rmse_eV: %s}\n",
			key, calFmt(icpt), calFmt(slope), n, calFmt(r2), calFmt(rmse))
	}
	mp("homo", c.HOMOIntercept, c.HOMOSlope, c.HOMON, c.HOMOR2, c.HOMORMSE)
	mp("lumo", c.LUMOIntercept, c.LUMOSlope, c.LUMON, c.LUMOR2, c.LUMORMSE)
	fmt.Fprintf(&b, "n: %d\nr2: %s\nrmse_eV: %s\n", c.N, calFmt(c.R2), calFmt(c.RMSE))
	if len(fit.Points) > 0 {
		b.WriteString("points:\n")
		for _, p := range fit.Points {
			fmt.Fprintf(&b, "- {id: %s, name: %s, smiles: %s, level: %s, x: %s, energy_eV: %s, fit_eV: %s, residual_eV: %s}\n",
				calQuote(p.ID), calQuote(p.Name), calQuote(p.SMILES), p.Level, calFmt(p.X),
				calFmt(p.EnergyEV), calFmt(p.FitEV), calFmt(p.Residual))
		}
	}
	_, err := w.Write(b.Bytes())
	return err
}

// calQuote quotes s as a YAML double-quoted scalar (JSON string syntax is valid YAML).
func calQuote(s string) string { return strconv.Quote(s) }

// LoadedCalibration is a calibration read from a file, with the parameter set it was
// fitted for.
type LoadedCalibration struct {
	Calibration huckel.Calibration
	Params      string
}

// LoadCalibrationFile reads a calibration file written by WriteCalibrationFile (or by hand
// in the same format). Decoding is strict: unknown keys, a wrong format: value, missing or
// non-finite intercepts and slopes and non-negative slopes (x > 0 is bonding, so orbital
// energies must fall as x grows) are *yamlfile.Error values (wrapping ErrCalibrationData) with file:line:column.
func LoadCalibrationFile(r io.Reader, filename string) (*LoadedCalibration, error) {
	data, err := readCapped(r, filename, ErrCalibrationData, "check the file")
	if err != nil {
		return nil, err
	}
	const want = "expected a calibration file written by 'cyclopair calibrate --out'"
	top, err := parseYAMLRoot(data, filename, want)
	if err != nil {
		return nil, err
	}
	pos := func(key ...string) (int, int) { return yamlfile.FieldPos(top, key...) }
	if err := yamlfile.CheckKeys(top, calibrationFileKeys, filename, want, ErrCalibrationData); err != nil {
		return nil, err
	}
	var f calFile
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(&f); err != nil {
		l, c := 0, 0
		msg := strings.ReplaceAll(err.Error(), "\n", ";")
		// yaml reports "line N: ..." without a column: point at that line
		if i := strings.Index(msg, "line "); i >= 0 {
			fmt.Sscanf(msg[i:], "line %d", &l)
			c = 1
		}
		return nil, &yamlfile.Error{File: filename, Line: l, Col: c, Msg: msg, Hint: want, Err: ErrCalibrationData}
	}
	fail := func(msg string, key ...string) error {
		l, c := pos(key...)
		return &yamlfile.Error{File: filename, Line: l, Col: c, Msg: msg, Hint: want, Err: ErrCalibrationData}
	}
	if f.Format != CalibrationFormat {
		return nil, fail(fmt.Sprintf("format %q, want %q", f.Format, CalibrationFormat), "format")
	}
	if f.Name == "" {
		return nil, fail("missing name", "name")
	}
	for _, m := range []struct {
		key string
		v   calMapFile
	}{{"homo", f.HOMO}, {"lumo", f.LUMO}} {
		if m.v.Intercept == nil || m.v.Slope == nil {
			return nil, fail(m.key+": needs intercept and slope", m.key)
		}
		if !calFinite(*m.v.Intercept) || !calFinite(*m.v.Slope) {
			return nil, fail(m.key+": intercept and slope must be finite numbers", m.key)
		}
		if *m.v.Slope >= 0 {
			return nil, fail(fmt.Sprintf("%s: slope %g must be negative (x > 0 is bonding: orbital energies fall as x grows)", m.key, *m.v.Slope), m.key, "slope")
		}
	}
	c := huckel.Calibration{
		Name: f.Name, Source: f.Source,
		HOMOIntercept: *f.HOMO.Intercept, HOMOSlope: *f.HOMO.Slope,
		LUMOIntercept: *f.LUMO.Intercept, LUMOSlope: *f.LUMO.Slope,
		R2: f.R2, RMSE: f.RMSE, N: f.N,
		HOMOR2: f.HOMO.R2, HOMORMSE: f.HOMO.RMSE, HOMON: f.HOMO.N,
		LUMOR2: f.LUMO.R2, LUMORMSE: f.LUMO.RMSE, LUMON: f.LUMO.N,
	}
	return &LoadedCalibration{Calibration: c, Params: f.Params}, nil
}

var calibrationFileKeys = map[string][]string{
	"":         {"format", "name", "params", "source", "homo", "lumo", "n", "r2", "rmse_eV", "points"},
	"homo":     {"intercept", "slope", "n", "r2", "rmse_eV"},
	"lumo":     {"intercept", "slope", "n", "r2", "rmse_eV"},
	"points[]": {"id", "name", "smiles", "level", "x", "energy_eV", "fit_eV", "residual_eV"},
}

func calFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
