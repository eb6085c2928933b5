package main

import (
	"encoding/json"
	"strings"
	"testing"
)

func TestPairGolden(t *testing.T) {
	cases := []struct {
		name, golden string
		args         []string
	}{
		{"isoprene table", "pair_isoprene_acrylate.txt",
			[]string{"pair", "--diene", "C=CC(C)=C", "--dienophile", "C=CC(=O)OC"}},
		{"cp maleic anhydride json", "pair_cp_ma.jsonl",
			[]string{"pair", "--diene", "C1=CC=CC1", "--dienophile", "O=C1OC(=O)C=C1", "--format", "json"}},
		{"activations json", "pair_butadiene_acrolein_act.jsonl",
			[]string{"pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--activate", "none,lewis,iminium", "--format", "json"}},
		{"tetrazine table", "pair_tetrazine_enolether.txt",
			[]string{"pair", "--diene", "COC(=O)c1nnc(C(=O)OC)nn1", "--dienophile", "C=COCC"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			out, errs, code := runCLI(t, "", c.args...)
			if code != exitOK {
				t.Fatalf("exit %d, stderr %s", code, errs)
			}
			checkGolden(t, c.golden, []byte(out))
		})
	}
}

// TestPairJSONContract checks the keys DEVELOPERS.md ("Output contracts") promises for 'pair --format json'.
func TestPairJSONContract(t *testing.T) {
	out, errs, code := runCLI(t, "", "pair", "--diene", "C=CC(C)=C", "--dienophile", "C=CC(=O)OC", "--activate", "none,lewis", "--format", "json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if len(lines) != 2 {
		t.Fatalf("%d JSON lines; want 2 (one per activation)", len(lines))
	}
	for i, line := range lines {
		var obj map[string]any
		if err := json.Unmarshal([]byte(line), &obj); err != nil {
			t.Fatalf("line %d: %v", i+1, err)
		}
		for _, k := range []string{"demand", "gap_normal", "gap_inverse", "orientations", "allowed", "warnings", "activation"} {
			if _, ok := obj[k]; !ok {
				t.Errorf("line %d: key %q missing", i+1, k)
			}
		}
		for _, g := range []string{"gap_normal", "gap_inverse"} {
			m, _ := obj[g].(map[string]any)
			b, _ := m["beta"].(float64)
			ev, _ := m["ev"].(float64)
			if b <= 0 || ev <= 0 {
				t.Errorf("line %d: %s = %v; want positive beta and ev", i+1, g, obj[g])
			}
		}
		ors, _ := obj["orientations"].([]any)
		if len(ors) == 0 {
			t.Fatalf("line %d: no orientations", i+1)
		}
		for j, o := range ors {
			om := o.(map[string]any)
			for _, k := range []string{"product", "bonds", "stabilization", "label", "endo_overlap", "preferred"} {
				if _, ok := om[k]; !ok {
					t.Errorf("line %d orientation %d: key %q missing", i+1, j, k)
				}
			}
			if pref := om["preferred"].(bool); pref != (j == 0) {
				t.Errorf("line %d orientation %d: preferred %v", i+1, j, pref)
			}
		}
		want := []string{"none", "lewis"}[i]
		if obj["activation"] != want {
			t.Errorf("line %d: activation %v; want %s", i+1, obj["activation"], want)
		}
	}
}

func TestPairErrors(t *testing.T) {
	cases := []struct {
		name string
		args []string
		code int
		want string // substring of stderr
	}{
		{"bad SMILES", []string{"pair", "--diene", "C=CC(C", "--dienophile", "C=C"}, exitUsage,
			"cyclopair: C=CC(C: column 7: unclosed branch"},
		{"no reacting unit", []string{"pair", "--diene", "CCCC", "--dienophile", "C=C"}, exitUsage,
			"cyclopair: CCCC: diene: no reacting unit"},
		{"no dienophile unit", []string{"pair", "--diene", "C=CC=C", "--dienophile", "CCO"}, exitUsage,
			"cyclopair: CCO: dienophile: no reacting unit"},
		{"pin matches nothing", []string{"pair", "--diene", "[CH2:1]=[CH:2]C=C", "--dienophile", "C=C"}, exitUsage,
			"mapped atoms match no reacting unit (mapped atoms 0, 1)"},
		{"unknown mode", []string{"pair", "--diene", "C=CC=C", "--dienophile", "C=C", "--activate", "heat"}, exitUsage,
			"unknown mode"},
		{"missing flag", []string{"pair", "--diene", "C=CC=C"}, exitUsage, "both --diene and --dienophile are required"},
		{"one activation fails", []string{"pair", "--diene", "C=CC=C", "--dienophile", "C=C", "--activate", "none,lewis"}, exitPartial,
			"--activate lewis: dienophile C=C has no carbonyl"},
		{"bad format", []string{"pair", "--diene", "C=CC=C", "--dienophile", "C=C", "--format", "xml"}, exitUsage, "--format"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, errs, code := runCLI(t, "", c.args...)
			if code != c.code || !strings.Contains(errs, c.want) {
				t.Errorf("exit %d, stderr %q; want exit %d and %q", code, errs, c.code, c.want)
			}
			if strings.Contains(errs, "panic") || strings.Contains(errs, "goroutine") {
				t.Errorf("stderr has a stack trace: %s", errs)
			}
		})
	}
}

func TestPairTableCaution(t *testing.T) {
	out, _, code := runCLI(t, "", "pair", "--diene", "C=CC=C", "--dienophile", "C=C")
	if code != exitOK {
		t.Fatal(code)
	}
	for _, want := range []string{"calibration: ", "Sustmann type II", "allowed (supra–supra, thermal): yes", "no preference", pairCaution} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
}

func TestPairSubstrateNames(t *testing.T) {
	// Built-in substrate names stand in for SMILES; the JSON keeps the SMILES and the name.
	out, errs, code := runCLI(t, "", "pair", "--diene", "cyclopentadiene", "--dienophile", "maleic-anhydride", "--format", "json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var obj map[string]any
	if err := json.Unmarshal([]byte(strings.TrimSpace(out)), &obj); err != nil {
		t.Fatal(err)
	}
	if obj["diene_name"] != "cyclopentadiene" || obj["diene"] != "C1=CC=CC1" || obj["dienophile_name"] != "maleic-anhydride" {
		t.Errorf("names/SMILES: %v %v %v", obj["diene_name"], obj["diene"], obj["dienophile_name"])
	}
}
