package main

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"os"
	"strings"
	"testing"

	"cyclopair/cmd/cyclopair/internal/golden"
	"cyclopair/huckel/molfile"
)

// --format sdf of screen and pair: the committed samples are what the writer produces now,
// and RDKit (scripts/check_sdf_output.py, RDKit's SDMolSupplier with sanitisation, run once;
// verdict in testdata/sdf/rdkit_readback.json) read every record of exactly these bytes: a
// molecule, 2D coordinates, the structure the row names, every data item as written.
func TestSDFOutput(t *testing.T) {
	samples := map[string]func() (string, string, int){
		"screen_small.sdf": func() (string, string, int) {
			t.Chdir("../../testdata/screen")
			defer t.Chdir("../../cmd/cyclopair")
			return runCLI(t, "", "screen", "small.yaml", "--format", "sdf")
		},
		"pair_cp_ma.sdf": func() (string, string, int) {
			return runCLI(t, "", "pair", "--diene", "cyclopentadiene", "--dienophile", "maleic-anhydride", "--activate", "none,lewis", "--format", "sdf")
		},
	}
	var verdict struct {
		Files []struct {
			File    string `json:"file"`
			SHA256  string `json:"sha256"`
			Records int    `json:"records"`
			AllOK   bool   `json:"all_ok"`
		} `json:"files"`
	}
	data, err := os.ReadFile("../../testdata/sdf/rdkit_readback.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(data, &verdict); err != nil {
		t.Fatal(err)
	}
	for name, gen := range samples {
		out, errOut, code := gen()
		if code > 1 {
			t.Fatalf("%s: exit %d: %s", name, code, errOut)
		}
		path := "../../testdata/sdf/" + name
		if golden.Updating() {
			if err := os.WriteFile(path, []byte(out), 0o644); err != nil {
				t.Fatal(err)
			}
			t.Logf("%s rewritten: rerun /usr/bin/python3 scripts/check_sdf_output.py", path)
			continue
		}
		want, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if out != string(want) {
			t.Errorf("%s: the SD writer's output changed; rerun with -update, then scripts/check_sdf_output.py", name)
		}
		sum := sha256.Sum256(want)
		found := false
		for _, f := range verdict.Files {
			if strings.HasSuffix(f.File, "/"+name) {
				found = true
				n := strings.Count(out, "$$$$\n")
				if f.SHA256 != hex.EncodeToString(sum[:]) {
					t.Errorf("%s: RDKit checked another version of the sample; rerun scripts/check_sdf_output.py", name)
				}
				if !f.AllOK || f.Records != n || n == 0 {
					t.Errorf("%s: RDKit verdict: all_ok %v, %d records read of %d written", name, f.AllOK, f.Records, n)
				}
			}
		}
		if !found {
			t.Errorf("%s: no RDKit verdict", name)
		}
		// Our own reader reads it back too, names and data items intact.
		recs, err := molfile.ReadAll(strings.NewReader(out), nil)
		if err != nil || len(recs) == 0 {
			t.Fatalf("%s: molfile.ReadAll: %d records, %v", name, len(recs), err)
		}
		if v, ok := recs[0].Prop("cyclopair_product"); !ok || v == "" || recs[0].Title == "" {
			t.Errorf("%s: first record title %q, product %q", name, recs[0].Title, v)
		}
	}
}
