package molfile

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"flag"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

var dumpWrite = flag.Bool("dumpwrite", false, "write ../../testdata/molfile/ours_write.sdf for scripts/gen_molfile_fixture.py")

var oursPath = filepath.Join(fixtureDir, "ours_write.sdf")

// fixtureRecord is our SD record for a fixture molecule: the molecule parsed from its
// SMILES, laid out by depict, with its name, our SMILES and its fixture index as data items.
func fixtureRecord(t testing.TB, fm fixtureMol) []byte {
	t.Helper()
	m := mustParse(t, fm.Smiles)
	m.Name = fm.Name
	props := []Prop{{PropSMILES, smiles.Write(m)}, {"fixture_index", strconv.Itoa(fm.I)}}
	b, err := AppendSD(nil, m, nil, props)
	if err != nil {
		t.Fatalf("%s: %v", fm.Smiles, err)
	}
	return b
}

// TestDumpWrite writes our record for every fixture molecule, the first step of
// regenerating the fixture (see scripts/gen_molfile_fixture.py).
func TestDumpWrite(t *testing.T) {
	if !*dumpWrite {
		t.Skip("run with -dumpwrite to refresh " + oursPath)
	}
	var out []byte
	for _, fm := range loadFixture(t).Molecules {
		out = append(out, fixtureRecord(t, fm)...)
	}
	if err := os.WriteFile(oursPath, out, 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestWriterFixture checks our writer against RDKit: for every fixture molecule RDKit
// read our record back to the canonical SMILES of the input with the title and data
// items intact (the script's verdict), and the writer still produces exactly the bytes
// RDKit checked.
func TestWriterFixture(t *testing.T) {
	fx := loadFixture(t)
	if len(fx.Write) != len(fx.Molecules) {
		t.Fatalf("fixture checked %d of our records for %d molecules: rerun the two steps in scripts/gen_molfile_fixture.py", len(fx.Write), len(fx.Molecules))
	}
	ok := 0
	for k, w := range fx.Write {
		fm := fx.Molecules[k]
		if w.I != fm.I {
			t.Fatalf("write entry %d is for molecule %d", k, w.I)
		}
		sum := sha256.Sum256(fixtureRecord(t, fm))
		if got := hex.EncodeToString(sum[:8]); got != w.SHA256 {
			t.Errorf("molecule %d %s: our record changed since RDKit checked it: rerun the two steps in scripts/gen_molfile_fixture.py", fm.I, fm.Smiles)
			continue
		}
		if !w.OK {
			t.Errorf("molecule %d %s: RDKit does not read our record back: %s", fm.I, fm.Smiles, w.Note)
			continue
		}
		ok++
	}
	t.Logf("RDKit %s reads %d of our %d records back to the input molecule", fx.RDKitVersion, ok, len(fx.Write))
}

// smilesInputs returns the SMILES of the SMILES reader's fixture inputs.
func smilesInputs(t testing.TB) []string {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "..", "testdata", "smiles", "inputs.txt"))
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
	return out
}

// sameGraph reports the first difference between two molecules with the same atom
// order: elements, charges, isotopes, maps, hydrogen counts, and bonds in the same order.
func sameGraph(a, b *molecule.Molecule) string {
	if len(a.Atoms) != len(b.Atoms) || len(a.Bonds) != len(b.Bonds) {
		return "atom or bond count differs: " + strconv.Itoa(len(a.Atoms)) + "/" + strconv.Itoa(len(a.Bonds)) +
			" vs " + strconv.Itoa(len(b.Atoms)) + "/" + strconv.Itoa(len(b.Bonds))
	}
	for i := range a.Atoms {
		if x, y := atomToken(a.Atoms[i]), atomToken(b.Atoms[i]); x != y {
			return "atom " + strconv.Itoa(i+1) + ": " + x + " vs " + y
		}
	}
	for i := range a.Bonds {
		x, y := a.Bonds[i], b.Bonds[i]
		if x.A != y.A || x.B != y.B || x.Order != y.Order {
			return "bond " + strconv.Itoa(i+1) + " differs"
		}
	}
	return ""
}

// TestWriteRoundTrip writes every molecule of the SMILES fixture inputs and reads it back:
// the same graph in the same order, the title, the data items and the coordinates; and
// writing twice gives the same bytes.
func TestWriteRoundTrip(t *testing.T) {
	n := 0
	for _, smi := range smilesInputs(t) {
		m, err := smiles.Parse(smi)
		if err != nil {
			continue // the malformed and rejected inputs
		}
		m.Name = "round trip " + smi
		c, err := depict.Layout(m)
		if err != nil {
			t.Fatalf("%s: %v", smi, err)
		}
		props := []Prop{{PropSMILES, smiles.Write(m)}, {"note", "two\nlines"}, {"empty", ""}}
		b, err := AppendSD(nil, m, c.Pos, props)
		if err != nil {
			t.Errorf("%s: %v", smi, err)
			continue
		}
		if b2, _ := AppendSD(nil, m, c.Pos, props); !bytes.Equal(b, b2) {
			t.Errorf("%s: two writes differ", smi)
		}
		recs, err := ReadAll(bytes.NewReader(b), &Options{KeepHydrogens: true})
		if err != nil || len(recs) != 1 {
			t.Errorf("%s: reading our record: %v\n%s", smi, err, b)
			continue
		}
		r := recs[0]
		if d := sameGraph(m, r.Mol); d != "" {
			t.Errorf("%s: %s\n%s", smi, d, b)
		}
		if want := truncateUTF8(m.Name, maxTitle); r.Title != want || r.Mol.Name != want {
			t.Errorf("%s: title %q", smi, r.Title)
		}
		if len(r.Props) != len(props) {
			t.Errorf("%s: data items %v", smi, r.Props)
		} else {
			for k := range props {
				if r.Props[k] != props[k] {
					t.Errorf("%s: data item %d: %q, wrote %q", smi, k, r.Props[k], props[k])
				}
			}
		}
		for i, p := range c.Pos {
			q := r.Coords[i]
			// coordinates are written with four decimals
			if math.Abs(q.X-p.X*BondLength) > 5e-5 || math.Abs(q.Y-p.Y*BondLength) > 5e-5 || q.Z != 0 {
				t.Errorf("%s: atom %d at %v, wrote %v", smi, i+1, q, p)
				break
			}
		}
		if len(r.Notes) > 0 {
			t.Errorf("%s: notes on our own output: %v", smi, r.Notes)
		}
		n++
	}
	if n < 500 {
		t.Errorf("round-tripped %d molecules, want at least 500", n)
	}
}

// TestWriteErrors: what V2000 or the SD format cannot hold is refused with ErrWrite.
func TestWriteErrors(t *testing.T) {
	m := mustParse(t, "C=CC=O")
	for _, tc := range []struct {
		name  string
		props []Prop
		edit  func(*molecule.Molecule)
		pos   []depict.Point
		want  string
	}{
		{name: "empty name", props: []Prop{{"", "x"}}, want: "data item name"},
		{name: "angle bracket", props: []Prop{{"a>b", "x"}}, want: "data item name"},
		{name: "blank line", props: []Prop{{"a", "x\n\ny"}}, want: "blank line"},
		{name: "terminator", props: []Prop{{"a", "x\n$$$$"}}, want: "\"$$$$\""},
		{name: "carriage return", props: []Prop{{"a", "x\ry"}}, want: "line breaks"},
		{name: "map", edit: func(m *molecule.Molecule) { m.Atoms[0].Map = 1000 }, want: "atom map 1000"},
		{name: "wildcard", edit: func(m *molecule.Molecule) { m.Atoms[0].Element = "*" }, want: "not an element"},
		{name: "order", edit: func(m *molecule.Molecule) { m.Bonds[0].Order = 4 }, want: "order 4"},
		{name: "valence", edit: func(m *molecule.Molecule) { m.Atoms[0].HCount = 20 }, want: "above 14"},
		{name: "positions", pos: []depict.Point{{X: 0, Y: 0}}, want: "1 positions for 4 atoms"},
		{name: "nan", pos: []depict.Point{{X: math.NaN()}, {}, {}, {}}, want: "does not fit"},
	} {
		c := m.Clone()
		if tc.edit != nil {
			tc.edit(c)
		}
		_, err := AppendSD(nil, c, tc.pos, tc.props)
		if !errors.Is(err, ErrWrite) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want ErrWrite with %q", tc.name, err, tc.want)
		}
	}
	var buf bytes.Buffer
	w := NewWriter(&buf)
	if err := w.Write(m, nil, []Prop{{"a", "x\n\ny"}}); err == nil || buf.Len() != 0 {
		t.Errorf("Writer wrote %d bytes of a bad record (err %v)", buf.Len(), err)
	}
	if err := w.Write(m, nil, nil); err != nil || !strings.HasSuffix(buf.String(), "M  END\n$$$$\n") {
		t.Errorf("Writer: %v\n%s", err, buf.String())
	}
}

// TestWriteValenceField: the valence field is written exactly where the default valence
// model would not give the hydrogen count back.
func TestWriteValenceField(t *testing.T) {
	for _, tc := range []struct {
		smi  string
		want []int // valence field per atom
	}{
		{"CC=O", []int{0, 0, 0}},
		{"C[N+](C)(C)C", []int{0, 0, 0, 0, 0}}, // N+ default valence 4
		{"[NH4+]", []int{0}},
		{"[Na+].[Cl-]", []int{15, 0}}, // metals always; Cl- has valence 0 by default
		{"[LiH]", []int{1}},
		{"C[Li]", []int{0, 1}},
		{"[SiH4]", []int{0}},
		{"[PH5]", []int{5}},      // P has 3 and 5; a bare P takes 3 by default
		{"[SH2]=O", []int{4, 0}}, // S with one double bond takes 2 by default
		{"[H]C([H])([H])[H]", []int{0, 0, 0, 0, 0}},
	} {
		m := mustParse(t, tc.smi)
		b, err := Marshal(m, nil)
		if err != nil {
			t.Fatalf("%s: %v", tc.smi, err)
		}
		lines := strings.Split(string(b), "\n")
		for i, want := range tc.want {
			got, _ := strconv.Atoi(strings.TrimSpace(lines[4+i][48:51]))
			if got != want {
				t.Errorf("%s: atom %d valence field %d, want %d", tc.smi, i+1, got, want)
			}
		}
	}
}
