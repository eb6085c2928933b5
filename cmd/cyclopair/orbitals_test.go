package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestOrbitalsGolden(t *testing.T) {
	tests := []struct {
		name  string
		args  []string
		stdin string
	}{
		{"orbitals_butadiene.txt", []string{"orbitals", "C=CC=C"}, ""},
		{"orbitals_cp_anion.txt", []string{"orbitals", "C1=CC=C[CH-]1"}, ""},
		{"orbitals_acrolein.json", []string{"orbitals", "C=CC=O", "--format", "json"}, ""},
		{"orbitals_batch.csv", []string{"orbitals", "-", "--format", "csv"}, "C=CC=C butadiene\n# comment\n\nC=CC(=O)OC methyl acrylate\nc1ccncc1 pyridine\n"},
		{"orbitals_isoprene_vc.txt", []string{"orbitals", "C=C(C)C=C", "--params", "vancatledge1980"}, ""},
	}
	for _, tc := range tests {
		out, errOut, code := runCLI(t, tc.stdin, tc.args...)
		if code != 0 {
			t.Fatalf("%v: exit %d, stderr %s", tc.args, code, errOut)
		}
		checkGolden(t, tc.name, []byte(out))
	}
}

// The JSON Lines contract of DEVELOPERS.md: keys and shapes other tools parse.
func TestOrbitalsJSONContract(t *testing.T) {
	out, errOut, code := runCLI(t, "", "orbitals", "C=CC=C", "c1ccccc1", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if len(lines) != 2 {
		t.Fatalf("%d JSON lines, want 2", len(lines))
	}
	for _, line := range lines {
		var rec map[string]any
		if err := json.Unmarshal([]byte(line), &rec); err != nil {
			t.Fatalf("not JSON: %v\n%s", err, line)
		}
		for _, k := range []string{"smiles", "homo", "lumo", "levels", "centres", "pi_energy", "electrons"} {
			if _, ok := rec[k]; !ok {
				t.Errorf("key %q missing", k)
			}
		}
		for _, f := range []string{"homo", "lumo"} {
			m, ok := rec[f].(map[string]any)
			if !ok {
				t.Fatalf("%s is %T", f, rec[f])
			}
			for _, k := range []string{"index", "x", "ev", "degenerate"} {
				if _, ok := m[k]; !ok {
					t.Errorf("%s.%s missing", f, k)
				}
			}
			if _, ok := m["degenerate"].(bool); !ok {
				t.Errorf("%s.degenerate is %T, want bool", f, m["degenerate"])
			}
		}
		centres := rec["centres"].([]any)
		for _, l := range rec["levels"].([]any) {
			lm := l.(map[string]any)
			for _, k := range []string{"x", "occupancy", "coefficients"} {
				if _, ok := lm[k]; !ok {
					t.Errorf("levels[].%s missing", k)
				}
			}
			if n := len(lm["coefficients"].([]any)); n != len(centres) {
				t.Errorf("%d coefficients for %d centres", n, len(centres))
			}
		}
		for _, c := range centres {
			cm := c.(map[string]any)
			for _, k := range []string{"atom", "element", "type", "h", "electrons", "charge"} {
				if _, ok := cm[k]; !ok {
					t.Errorf("centres[].%s missing", k)
				}
			}
		}
	}
	// Benzene: degenerate HOMO at x = 1 (Hückel 1931).
	var bz struct {
		HOMO struct {
			X          float64 `json:"x"`
			Degenerate bool    `json:"degenerate"`
		} `json:"homo"`
	}
	if err := json.Unmarshal([]byte(lines[1]), &bz); err != nil {
		t.Fatal(err)
	}
	if math.Abs(bz.HOMO.X-1) > 1e-6 || !bz.HOMO.Degenerate {
		t.Errorf("benzene HOMO %+v", bz.HOMO)
	}
}

func TestOrbitalsBadSMILES(t *testing.T) {
	out, errOut, code := runCLI(t, "", "orbitals", "C1CC")
	if code != 2 {
		t.Errorf("exit %d, want 2", code)
	}
	if out != "" {
		t.Errorf("stdout %q, want nothing", out)
	}
	lines := strings.Split(strings.TrimRight(errOut, "\n"), "\n")
	want := "cyclopair: C1CC: column 2: ring bond 1 never closed"
	if !strings.HasPrefix(lines[0], want) || !strings.HasSuffix(lines[0], ")") {
		t.Errorf("error line %q, want %q… (hint)", lines[0], want)
	}
	if len(lines) != 3 || strings.TrimSpace(lines[2]) != "^" {
		t.Errorf("want excerpt and caret after the error line, got %q", errOut)
	}
}

// stdin batch: a bad line is reported with its line number, the others are printed, exit 1.
func TestOrbitalsStdinBatch(t *testing.T) {
	in := "C=CC=C butadiene\nC1CC broken\n\n# skipped\nC=CC=O acrolein\n"
	out, errOut, code := runCLI(t, in, "orbitals", "-", "--format", "json")
	if code != 1 {
		t.Errorf("exit %d, want 1", code)
	}
	if n := strings.Count(out, "\n"); n != 2 {
		t.Errorf("%d output lines, want 2", n)
	}
	if !strings.Contains(errOut, "cyclopair: C1CC: line 2, column 2: ring bond 1 never closed") {
		t.Errorf("stderr %q lacks the line-numbered error", errOut)
	}
	if !strings.Contains(out, `"name":"acrolein"`) {
		t.Errorf("names not carried: %s", out)
	}
}

func TestOrbitalsErrors(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.yaml")
	os.WriteFile(bad, []byte("name: x\nh:\n  - {type: Q, h: 1, source: s}\n"), 0o644)
	tests := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"orbitals", "C=C", "--format", "xml"}, 2, "--format \"xml\""},
		{[]string{"orbitals", "C=C", "--params", "nosuch"}, 2, "nosuch: no such parameter set or file (built-in sets:"},
		{[]string{"orbitals", "C=C", "--params", bad}, 2, "bad.yaml: 3:12: h entry 1: unknown centre type \"Q\""},
		{[]string{"orbitals", "CCC"}, 2, "cyclopair: CCC: no π system"},
		{[]string{"orbitals", "C=C", "-"}, 2, "'-' (read stdin) cannot be combined"},
		{[]string{"orbitals", "C=C", "C1CC"}, 1, "cyclopair: C1CC: column 2"},
		{[]string{"orbitals"}, 2, "requires at least 1 arg"},
	}
	for _, tc := range tests {
		_, errOut, code := runCLI(t, "", tc.args...)
		if code != tc.code || !strings.Contains(errOut, tc.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d containing %q", tc.args, code, errOut, tc.code, tc.want)
		}
	}
}

// ω-technique from the command line: the allyl cation converges and reports its cycles.
func TestOrbitalsOmega(t *testing.T) {
	out, errOut, code := runCLI(t, "", "orbitals", "C=C[CH2+]", "--omega", "1.4", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var rec struct {
		Omega      float64 `json:"omega"`
		Iterations int     `json:"omega_iterations"`
		Centres    []struct {
			H float64 `json:"h"`
		} `json:"centres"`
	}
	if err := json.Unmarshal([]byte(out), &rec); err != nil {
		t.Fatal(err)
	}
	if rec.Omega != 1.4 || rec.Iterations == 0 || math.Abs(rec.Centres[0].H-rec.Centres[2].H) > 1e-5 || rec.Centres[0].H <= 0 {
		t.Errorf("ω run: %+v", rec)
	}
}

func TestParamsCommand(t *testing.T) {
	out, _, code := runCLI(t, "", "params")
	if code != 0 || !strings.Contains(out, "streitwieser1961") || !strings.Contains(out, "vancatledge1980") {
		t.Errorf("params list: exit %d\n%s", code, out)
	}
	checkGolden(t, "params_list.txt", []byte(out))
	out, _, code = runCLI(t, "", "params", "show", "streitwieser1961")
	if code != 0 {
		t.Fatal(code)
	}
	checkGolden(t, "params_show_streitwieser1961.txt", []byte(out))
	// The YAML dump is a valid --params file that reproduces the set.
	out, _, code = runCLI(t, "", "params", "show", "vancatledge1980", "--format", "yaml")
	if code != 0 {
		t.Fatal(code)
	}
	f := filepath.Join(t.TempDir(), "vc.yaml")
	os.WriteFile(f, []byte(out), 0o644)
	a, _, _ := runCLI(t, "", "orbitals", "c1ccncc1", "--params", f, "--format", "csv")
	b, _, _ := runCLI(t, "", "orbitals", "c1ccncc1", "--params", "vancatledge1980", "--format", "csv")
	if a != b {
		t.Errorf("YAML round trip changes results:\n%s\n%s", a, b)
	}
	out, _, code = runCLI(t, "", "params", "show", "streitwieser1961", "--format", "json")
	var doc map[string]any
	if code != 0 || json.Unmarshal([]byte(out), &doc) != nil || doc["name"] != "streitwieser1961" {
		t.Errorf("params show --format json: exit %d\n%s", code, out)
	}
}
