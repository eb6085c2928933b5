package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCalibrateCLI pins every output format of 'cyclopair calibrate' on a data file of
// polyenes and acenes (closed-form Hückel x values; the fit itself is checked against the
// closed-form least-squares line in package fmo). Two bad rows are reported on stderr with
// file:line:column and the exit status is 1.
func TestCalibrateCLI(t *testing.T) {
	data := filepath.Join("testdata", "calibrate", "data.yaml")
	for _, format := range []string{"table", "json", "yaml"} {
		out, errOut, code := runCLI(t, "", "calibrate", data, "--format", format)
		if code != exitPartial {
			t.Errorf("%s: exit %d, want %d (bad rows)\n%s", format, code, exitPartial, errOut)
		}
		for _, want := range []string{
			`cyclopair: testdata/calibrate/data.yaml: 14:20: BAD1: unknown kind "electron_afinity" (use ionization_energy or electron_affinity)`,
			"testdata/calibrate/data.yaml: 15:54: BAD2: SMILES \"C=C[Xx]\": unknown element Xx",
			"cyclopair: 2 of 10 inputs failed",
		} {
			if !strings.Contains(errOut, want) {
				t.Errorf("%s: stderr lacks %q:\n%s", format, want, errOut)
			}
		}
		ext := map[string]string{"table": "txt", "json": "json", "yaml": "yaml"}[format]
		checkGolden(t, "calibrate/out."+ext, []byte(out))
	}
	out, _, _ := runCLI(t, "", "calibrate", data, "--format", "json")
	var j struct {
		HOMO struct {
			N     int     `json:"n"`
			Slope float64 `json:"slope"`
		} `json:"homo"`
		BadRows []string `json:"bad_rows"`
	}
	if err := json.Unmarshal([]byte(out), &j); err != nil {
		t.Fatal(err)
	}
	if j.HOMO.N != 4 || j.HOMO.Slope >= 0 || len(j.BadRows) != 2 {
		t.Errorf("json: homo N %d slope %g, %d bad rows", j.HOMO.N, j.HOMO.Slope, len(j.BadRows))
	}
}

// TestCalibrateOutAndLoad: --out writes a file that --calibration loads; a calibration
// fitted for another parameter set is used with a warning; a broken file is rejected with
// its position.
func TestCalibrateOutAndLoad(t *testing.T) {
	dir := t.TempDir()
	cal := filepath.Join(dir, "my.cal.yaml")
	_, errOut, _ := runCLI(t, "", "calibrate", filepath.Join("testdata", "calibrate", "data.yaml"), "--out", cal, "--name", "polyene-fit")
	if !strings.Contains(errOut, "wrote calibration polyene-fit to "+cal) {
		t.Fatalf("stderr: %s", errOut)
	}
	cases := filepath.Join("testdata", "validate", "small.yaml")
	out, errOut, code := runCLI(t, "", "validate", "--cases", cases, "--calibration", cal)
	if code != exitOK || !strings.Contains(out, "calibration polyene-fit") {
		t.Errorf("validate with the fitted calibration: exit %d\n%s\n%s", code, out, errOut)
	}
	// the calibration was fitted with the default set (vancatledge1980)
	_, errOut, _ = runCLI(t, "", "validate", "--cases", cases, "--calibration", cal, "--params", "streitwieser1961")
	if !strings.Contains(errOut, "was fitted with parameter set vancatledge1980 and is used with streitwieser1961") {
		t.Errorf("no parameter-set warning: %s", errOut)
	}
	bad := filepath.Join(dir, "bad.cal.yaml")
	if err := os.WriteFile(bad, []byte("format: cyclopair-calibration/1\nname: x\nhomo: {intercept: -6, slope: 2}\nlumo: {intercept: 1, slope: -2}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code = runCLI(t, "", "validate", "--cases", cases, "--calibration", bad)
	if code != exitUsage || !strings.Contains(errOut, "bad.cal.yaml: 3:30: homo: slope 2 must be negative") {
		t.Errorf("bad calibration: exit %d, stderr %s", code, errOut)
	}
	_, errOut, code = runCLI(t, "", "validate", "--calibration", filepath.Join(dir, "none.yaml"))
	if code != exitUsage || !strings.Contains(errOut, "none.yaml: cannot open calibration (no such file") {
		t.Errorf("missing calibration: exit %d, stderr %s", code, errOut)
	}
}

func TestCalibrateUsage(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want string
		code int
	}{
		{[]string{"calibrate"}, "accepts 1 arg", exitUsage},
		{[]string{"calibrate", "x.yaml", "--format", "csv"}, `--format "csv": want table, json or yaml`, exitUsage},
		{[]string{"calibrate", "no-such-file.yaml"}, "no-such-file.yaml: cannot open (no such file)", exitUsage},
	} {
		_, errOut, code := runCLI(t, "", tc.args...)
		if code != tc.code || !strings.Contains(errOut, tc.want) {
			t.Errorf("%v: exit %d, stderr %q; want %d and %q", tc.args, code, errOut, tc.code, tc.want)
		}
	}
	// unreadable YAML from stdin is exit 2 with the position
	_, errOut, code := runCLI(t, "entries: [\n", "calibrate", "-")
	if code != exitUsage || !strings.Contains(errOut, "cyclopair: stdin: yaml:") {
		t.Errorf("stdin syntax error: exit %d, stderr %q", code, errOut)
	}
}

// TestPairActivationFlags: 'pair --calibration FILE' reports eV through the loaded
// calibration, and --lewis-h sets the Lewis-acid strength (a larger h(O=LA) lowers the
// acrolein LUMO further: K. N. Houk, R. W. Strozier, J. Am. Chem. Soc. 1973, 95, 4094).
func TestPairActivationFlags(t *testing.T) {
	dir := t.TempDir()
	cal := filepath.Join(dir, "c.yaml")
	runCLI(t, "", "calibrate", filepath.Join("testdata", "calibrate", "data.yaml"), "--out", cal, "--name", "polyene-fit")
	lumo := func(args ...string) (float64, string) {
		t.Helper()
		out, errOut, code := runCLI(t, "", append([]string{"pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--format", "json"}, args...)...)
		if code != exitOK {
			t.Fatalf("%v: exit %d: %s", args, code, errOut)
		}
		var p struct {
			Calibration string `json:"calibration"`
			Effect      *struct {
				Lowering struct {
					Beta float64 `json:"beta"`
				} `json:"lumo_lowering"`
			} `json:"activation_effect"`
		}
		if err := json.Unmarshal([]byte(out), &p); err != nil {
			t.Fatal(err)
		}
		if p.Effect == nil {
			return 0, p.Calibration
		}
		return p.Effect.Lowering.Beta, p.Calibration
	}
	if _, name := lumo("--calibration", cal); name != "polyene-fit" {
		t.Errorf("calibration %q, want polyene-fit", name)
	}
	def, _ := lumo("--activate", "lewis")
	strong, _ := lumo("--activate", "lewis", "--lewis-h", "3")
	if !(def > 0 && strong > def) {
		t.Errorf("LUMO lowering default %.4f, h 3.0 %.4f: want 0 < default < strong", def, strong)
	}
	_, errOut, code := runCLI(t, "", "pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--lewis-h", "2")
	if code != exitUsage || !strings.Contains(errOut, "--lewis-h 2: needs --activate lewis") {
		t.Errorf("--lewis-h without lewis: exit %d, %q", code, errOut)
	}
}
