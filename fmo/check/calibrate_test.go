package check

import (
	"bytes"
	"errors"
	"math"
	"os"
	"strings"
	"testing"

	"cyclopair/huckel"
	"cyclopair/huckel/yamlfile"
)

// olsFit is the closed-form least-squares line y = a + b x (b = Sxy/Sxx), written out here
// independently of gonum so the refit is checked against the textbook formula.
func olsFit(x, y []float64) (a, b float64) {
	var mx, my float64
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= float64(len(x))
	my /= float64(len(y))
	var sxy, sxx float64
	for i := range x {
		sxy += (x[i] - mx) * (y[i] - my)
		sxx += (x[i] - mx) * (x[i] - mx)
	}
	b = sxy / sxx
	return my - b*mx, b
}

func loadPolyenes(t *testing.T) ([]CalibrationRow, yamlfile.ErrorList) {
	t.Helper()
	f, err := os.Open("testdata/calibration/polyenes.yaml")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, bad, err := LoadCalibrationData(f, "polyenes.yaml")
	if err != nil {
		t.Fatal(err)
	}
	return rows, bad
}

// TestFitCalibrationData refits the x → eV maps from polyenes and acenes whose Hückel x
// values are closed forms (x_HOMO: ethylene 1, butadiene 2cos(2π/5) = 0.618034, hexatriene
// 2cos(3π/7) = 0.445042, benzene 1, naphthalene 0.618034; x_LUMO the negatives, anthracene
// −(√2 − 1)) and compares slope and intercept with the closed-form least-squares line; bad
// rows are reported with their positions and left out.
func TestFitCalibrationData(t *testing.T) {
	rows, bad := loadPolyenes(t)
	// BAD1 (kind), BAD3 (unknown key), BAD4 (no value) are caught while loading
	wantLoad := []string{"polyenes.yaml: 92:9: BAD1: unknown kind \"proton_affinity\"", "polyenes.yaml: 102:3: BAD3: unknown key \"valu_eV\"", "BAD4: missing or non-finite value_eV"}
	if len(bad) != len(wantLoad) {
		t.Fatalf("load: %d bad rows %v, want %d", len(bad), bad, len(wantLoad))
	}
	for i, w := range wantLoad {
		if !strings.Contains(bad[i].Error(), w) || !errors.Is(bad[i], ErrCalibrationData) {
			t.Errorf("bad row %d: %v, want %q", i, bad[i], w)
		}
	}
	p := defaultOpts(t).Params
	fit, bad2, err := FitCalibrationData(rows, p, "polyenes.yaml", "")
	if err != nil {
		t.Fatal(err)
	}
	if len(bad2) != 1 || !strings.Contains(bad2[0].Error(), `polyenes.yaml: 97:20: BAD2: SMILES "C=CC(=C": unclosed branch`) || !strings.Contains(bad2[0].Error(), "BAD2") {
		t.Errorf("fit: bad rows %v, want BAD2's SMILES error with its line", bad2)
	}
	phi := 2 * math.Cos(2*math.Pi/5)
	hx := []float64{1, phi, 2 * math.Cos(3*math.Pi/7), 1, phi}
	hy := []float64{-10.5138, -9.072, -8.3, -9.24378, -8.144}
	lx := []float64{-1, -phi, -1, -phi, -(math.Sqrt2 - 1)}
	ly := []float64{1.78, 0.62, 1.12, -0.19, -0.53} // +AE for ETS values, −EA for the adiabatic EA
	ha, hb := olsFit(hx, hy)
	la, lb := olsFit(lx, ly)
	c := fit.Calibration
	const tol = 1e-9 // eV; x values agree with the closed forms to ~1e-12
	for _, chk := range []struct {
		name      string
		got, want float64
	}{
		{"HOMO intercept", c.HOMOIntercept, ha}, {"HOMO slope", c.HOMOSlope, hb},
		{"LUMO intercept", c.LUMOIntercept, la}, {"LUMO slope", c.LUMOSlope, lb},
	} {
		if math.Abs(chk.got-chk.want) > tol {
			t.Errorf("%s = %.9f, want %.9f", chk.name, chk.got, chk.want)
		}
	}
	if c.HOMON != 5 || c.LUMON != 5 || len(fit.Points) != 10 || len(fit.Skipped) != 1 {
		t.Errorf("N = %d/%d, %d points, %d skipped; want 5/5, 10, 1 (acrolein use: false)", c.HOMON, c.LUMON, len(fit.Points), len(fit.Skipped))
	}
	// residuals sum to zero per map (least squares with an intercept)
	var sh, sl float64
	for _, pt := range fit.Points {
		if pt.Level == "homo" {
			sh += pt.Residual
		} else {
			sl += pt.Residual
		}
	}
	if math.Abs(sh) > 1e-9 || math.Abs(sl) > 1e-9 {
		t.Errorf("residual sums %.3g, %.3g, want 0", sh, sl)
	}
	if c.Name != "fit-"+p.Name || !strings.Contains(c.Source, "polyenes.yaml") {
		t.Errorf("name %q source %q", c.Name, c.Source)
	}
}

func TestCalibrationFileRoundTrip(t *testing.T) {
	rows, _ := loadPolyenes(t)
	fit, _, err := FitCalibrationData(rows, defaultOpts(t).Params, "polyenes.yaml", "mine")
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteCalibrationFile(&buf, fit); err != nil {
		t.Fatal(err)
	}
	got, err := LoadCalibrationFile(bytes.NewReader(buf.Bytes()), "mine.yaml")
	if err != nil {
		t.Fatalf("%v\n%s", err, buf.String())
	}
	const tol = 1e-6 // the file keeps 6 decimals
	a, b := fit.Calibration, got.Calibration
	for _, x := range []float64{-1.5, 0, 0.7} {
		for _, occ := range []bool{true, false} {
			if d := math.Abs(a.EV(x, occ) - b.EV(x, occ)); d > 3*tol {
				t.Errorf("EV(%g, %v) differs by %g after the round trip", x, occ, d)
			}
		}
	}
	if got.Params != fit.Params || b.Name != "mine" || b.N != a.N {
		t.Errorf("round trip: params %q name %q N %d", got.Params, b.Name, b.N)
	}
	// writing is deterministic
	var buf2 bytes.Buffer
	_ = WriteCalibrationFile(&buf2, fit)
	if buf.String() != buf2.String() {
		t.Errorf("two writes differ")
	}
}

func TestLoadCalibrationFileErrors(t *testing.T) {
	good := "format: cyclopair-calibration/1\nname: x\nparams: streitwieser1961\nhomo: {intercept: -6.5, slope: -2.9}\nlumo: {intercept: 0.9, slope: -1.8}\n"
	if _, err := LoadCalibrationFile(strings.NewReader(good), "c.yaml"); err != nil {
		t.Fatalf("good: %v", err)
	}
	for _, tc := range []struct{ name, text, want string }{
		{"unknown key", good + "extra: 1\n", `c.yaml: 6:1: unknown key "extra" (known here: format, name`},
		{"unknown map key", strings.Replace(good, "slope: -2.9", "slop: -2.9", 1), `c.yaml: 4:25: unknown key "slop"`},
		{"bad number", strings.Replace(good, "-2.9", "steep", 1), "c.yaml: 4:1: yaml: unmarshal errors"},
		{"format", strings.Replace(good, "/1", "/9", 1), `c.yaml: 1:9: format "cyclopair-calibration/9"`},
		{"positive slope", strings.Replace(good, "slope: -1.8", "slope: 1.8", 1), "c.yaml: 5:31: lumo: slope 1.8 must be negative"},
		{"missing slope", strings.Replace(good, ", slope: -2.9", "", 1), "c.yaml: 4:7: homo: needs intercept and slope"},
		{"syntax", "format: [\n", "c.yaml: yaml:"},
		{"not a mapping", "- 1\n", "top level is not a mapping"},
	} {
		_, err := LoadCalibrationFile(strings.NewReader(tc.text), "c.yaml")
		if err == nil || !errors.Is(err, ErrCalibrationData) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: err = %v, want containing %q", tc.name, err, tc.want)
		}
	}
}

func TestLoadCalibrationDataFatal(t *testing.T) {
	for _, tc := range []struct{ text, want string }{
		{"entries: []\n", "no entries"},
		{"points: []\n", `unknown top-level key "points"`},
		{"entries: [\n", "yaml:"},
		{"entries:\n- &a {kind: ionization_energy}\n- *a\n", "aliases are not allowed"},
	} {
		_, _, err := LoadCalibrationData(strings.NewReader(tc.text), "d.yaml")
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: err = %v, want %q", tc.text, err, tc.want)
		}
	}
	// too few usable points is a fit error, not a panic
	rows, _, err := LoadCalibrationData(strings.NewReader("entries:\n- {kind: ionization_energy, molecule: C=C, value_eV: 10.5}\n"), "d.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := FitCalibrationData(rows, defaultOpts(t).Params, "d.yaml", ""); !errors.Is(err, huckel.ErrCalibration) {
		t.Errorf("one point: err = %v, want huckel.ErrCalibration", err)
	}
}

// FuzzLoadCalibrationData: the data and calibration-file readers never panic, and every
// error they return is positioned in the named file.
func FuzzLoadCalibrationData(f *testing.F) {
	seed, err := os.ReadFile("testdata/calibration/polyenes.yaml")
	if err != nil {
		f.Fatal(err)
	}
	f.Add(string(seed))
	f.Add("entries:\n- {kind: ionization_energy, molecule: C=C, value_eV: 10.5}\n")
	f.Add("format: cyclopair-calibration/1\nname: x\nhomo: {intercept: -6, slope: -2}\nlumo: {intercept: 1, slope: -2}\n")
	f.Add("entries: [{kind: electron_affinity, molecule: '[Xx]', value_eV: .nan}]")
	f.Fuzz(func(t *testing.T, s string) {
		rows, bad, err := LoadCalibrationData(strings.NewReader(s), "f.yaml")
		for _, e := range append(bad, asFileError(err)...) {
			if !strings.HasPrefix(e.Error(), "f.yaml") {
				t.Fatalf("unpositioned error %q", e)
			}
		}
		if err == nil && len(rows) > 0 && len(rows) < 50 {
			_, _, _ = FitCalibrationData(rows, defaultOpts(t).Params, "f.yaml", "")
		}
		if _, err := LoadCalibrationFile(strings.NewReader(s), "f.yaml"); err != nil && !strings.HasPrefix(err.Error(), "f.yaml") {
			t.Fatalf("unpositioned error %q", err)
		}
	})
}

func asFileError(err error) yamlfile.ErrorList {
	var re *yamlfile.Error
	if errors.As(err, &re) {
		return yamlfile.ErrorList{re}
	}
	return nil
}
