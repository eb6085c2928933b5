package smiles

import (
	"bufio"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"cyclopair/huckel/molecule"
)

var dumpWrite = flag.Bool("dumpwrite", false, "write ../../testdata/smiles/ours_write.tsv for scripts/gen_smiles_fixture.py")

var (
	inputsPath  = filepath.Join("..", "..", "testdata", "smiles", "inputs.txt")
	oursPath    = filepath.Join("..", "..", "testdata", "smiles", "ours_write.tsv")
	fixturePath = filepath.Join("..", "..", "testdata", "smiles", "rdkit_fixture.json")
)

// fixtureAtom is [element, formal charge, hydrogens, isotope, atom map] in the JSON.
type fixtureAtom struct {
	El             string
	Q, H, Iso, Map int
}

func (a *fixtureAtom) UnmarshalJSON(b []byte) error {
	var raw [5]json.RawMessage
	if err := json.Unmarshal(b, &raw); err != nil {
		return err
	}
	if err := json.Unmarshal(raw[0], &a.El); err != nil {
		return err
	}
	for i, p := range []*int{&a.Q, &a.H, &a.Iso, &a.Map} {
		if err := json.Unmarshal(raw[i+1], p); err != nil {
			return err
		}
	}
	return nil
}

type fixtureMol struct {
	Smiles     string        `json:"smiles"`
	Name       string        `json:"name"`
	RDKitOK    bool          `json:"rdkit_ok"`
	RDKitError string        `json:"rdkit_error"`
	Canonical  string        `json:"canonical"`
	RingBonds  int           `json:"ring_bonds"`
	Atoms      []fixtureAtom `json:"atoms"`
	Random     []string      `json:"random"`
	Write      string        `json:"write"`
	WriteOK    *bool         `json:"write_ok"`
	WriteNote  string        `json:"write_note"`
}

type fixture struct {
	Generator    string       `json:"generator"`
	RDKitVersion string       `json:"rdkit_version"`
	Molecules    []fixtureMol `json:"molecules"`
}

func readInputs(t *testing.T) []string {
	t.Helper()
	f, err := os.Open(inputsPath)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var out []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.TrimSpace(line) == "" || strings.HasPrefix(line, "#") {
			continue
		}
		smi, _, _ := strings.Cut(line, "\t")
		out = append(out, smi)
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return out
}

// TestDumpWrite writes our Write output for every fixture input, the first step of
// regenerating the fixture (see scripts/gen_smiles_fixture.py).
func TestDumpWrite(t *testing.T) {
	if !*dumpWrite {
		t.Skip("run with -dumpwrite to refresh " + oursPath)
	}
	var b strings.Builder
	for _, smi := range readInputs(t) {
		m, err := Parse(smi)
		if err != nil {
			fmt.Fprintf(&b, "%s\t!%v\n", smi, err)
			continue
		}
		fmt.Fprintf(&b, "%s\t%s\n", smi, Write(m))
	}
	if err := os.WriteFile(oursPath, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

func loadFixture(t *testing.T) fixture {
	t.Helper()
	data, err := os.ReadFile(fixturePath)
	if err != nil {
		t.Fatal(err)
	}
	var fx fixture
	if err := json.Unmarshal(data, &fx); err != nil {
		t.Fatal(err)
	}
	return fx
}

// TestRDKitFixture compares the reader with RDKit (Greg Landrum et al., RDKit:
// open-source cheminformatics, Debian python3-rdkit; version in the fixture) on every
// input of testdata/smiles/inputs.txt: atom count and order, element, formal charge,
// isotope, atom map, attached hydrogens, number of ring bonds, and whether RDKit reads our
// Kekulé output back to the same canonical SMILES as the input.
func TestRDKitFixture(t *testing.T) {
	fx := loadFixture(t)
	if n := len(fx.Molecules); n < 300 {
		t.Fatalf("fixture has %d molecules, want at least 300", n)
	}
	inputs := readInputs(t)
	if len(inputs) != len(fx.Molecules) {
		t.Fatalf("inputs.txt has %d entries but the fixture %d: regenerate it (scripts/gen_smiles_fixture.py)", len(inputs), len(fx.Molecules))
	}
	agree := 0
	for i, rec := range fx.Molecules {
		if rec.Smiles != inputs[i] {
			t.Fatalf("fixture entry %d is %q, inputs.txt has %q: regenerate the fixture", i, rec.Smiles, inputs[i])
		}
		m, err := Parse(rec.Smiles)
		if !rec.RDKitOK {
			if err == nil {
				t.Errorf("%s (%s): RDKit rejects it (%s) but Parse accepted it", rec.Smiles, rec.Name, rec.RDKitError)
			} else {
				agree++
			}
			continue
		}
		if err != nil {
			t.Errorf("%s (%s): RDKit accepts it, Parse says %v", rec.Smiles, rec.Name, err)
			continue
		}
		ok := true
		fail := func(format string, args ...any) {
			t.Errorf("%s (%s): "+format, append([]any{rec.Smiles, rec.Name}, args...)...)
			ok = false
		}
		if len(m.Atoms) != len(rec.Atoms) {
			fail("%d atoms, RDKit %d", len(m.Atoms), len(rec.Atoms))
			continue
		}
		for k, ra := range rec.Atoms {
			a := m.Atoms[k]
			if a.Element != ra.El || a.Charge != ra.Q || a.HCount != ra.H || a.Isotope != ra.Iso || a.Map != ra.Map {
				fail("atom %d: got %s q=%d H=%d iso=%d map=%d, RDKit %s q=%d H=%d iso=%d map=%d",
					k, a.Element, a.Charge, a.HCount, a.Isotope, a.Map, ra.El, ra.Q, ra.H, ra.Iso, ra.Map)
			}
		}
		if got := countRingBonds(m); got != rec.RingBonds {
			fail("%d ring bonds, RDKit %d", got, rec.RingBonds)
		}
		if bad := valenceProblems(m); bad != "" {
			fail("Kekulé form has a bad valence: %s", bad)
		}
		if w := Write(m); w != rec.Write {
			fail("Write gives %q but the fixture checked %q: rerun the two steps in scripts/gen_smiles_fixture.py", w, rec.Write)
		}
		if rec.WriteOK == nil || !*rec.WriteOK {
			fail("RDKit does not read our output %q back to the input's canonical SMILES %q: %s", rec.Write, rec.Canonical, rec.WriteNote)
		}
		if ok {
			agree++
		}
	}
	t.Logf("agreement with RDKit %s: %d of %d inputs", fx.RDKitVersion, agree, len(fx.Molecules))
}

func countRingBonds(m *molecule.Molecule) int {
	n := 0
	for _, r := range ringBondsInto(m, make([]bool, len(m.Bonds))) {
		if r {
			n++
		}
	}
	return n
}

// valenceProblems checks every atom against the valences this package allows (the
// organic-subset defaults for atoms written without brackets, the charge-shifted lists
// for bracket atoms); it returns a description of the first problem or "".
func valenceProblems(m *molecule.Molecule) string {
	for i, a := range m.Atoms {
		for _, e := range m.Neighbors(i) {
			if o := m.Bonds[e.Bond].Order; o < 1 || o > 3 {
				return fmt.Sprintf("bond %d has order %d", e.Bond, o)
			}
		}
		val := m.Valence(i)
		var vals []int
		if a.Bracket {
			v, checked, ok := allowedValences(a.Element, a.Charge)
			if !checked {
				continue
			}
			if !ok {
				return fmt.Sprintf("atom %d charge %d", i, a.Charge)
			}
			vals = v
		} else {
			vals = organicVals(a.Element)
		}
		found := false
		for _, v := range vals {
			found = found || v == val
		}
		if !found {
			return fmt.Sprintf("atom %d %s has valence %d, allowed %v", i, a.Element, val, vals)
		}
	}
	return ""
}
