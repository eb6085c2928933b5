package depict_test

import (
	"bufio"
	"errors"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

var update = flag.Bool("update", false, "rewrite golden files")

// Layout contract tolerances (task statement of issue #5; common practice for 2D depiction,
// no source): no two atoms closer than half a bond, every bond within 10 % of the standard.
const (
	minAtomDistance = 0.5
	bondTolerance   = 0.10
)

type setEntry struct {
	line      int
	smiles    string
	name      string
	knownMiss bool
}

func loadSet(t testing.TB) []setEntry {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "..", "testdata", "depict", "smiles.txt"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var out []setEntry
	sc := bufio.NewScanner(f)
	for ln := 1; sc.Scan(); ln++ {
		s := strings.TrimSpace(sc.Text())
		if s == "" || strings.HasPrefix(s, "#") {
			continue
		}
		e := setEntry{line: ln}
		if rest, ok := strings.CutPrefix(s, "known-miss "); ok {
			e.knownMiss = true
			s = rest
		}
		e.smiles, e.name, _ = strings.Cut(s, " ")
		out = append(out, e)
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return out
}

func meets(m *molecule.Molecule, c *depict.Coords) (bool, string) {
	q := depict.Measure(m, c.Pos)
	if len(c.Pos) > 1 && q.MinDistance < minAtomDistance {
		return false, fmt.Sprintf("atoms %d and %d only %.3f apart", q.MinPair[0], q.MinPair[1], q.MinDistance)
	}
	if q.WorstBond >= 0 && q.MaxBondDeviation > bondTolerance {
		b := m.Bonds[q.WorstBond]
		return false, fmt.Sprintf("bond %d-%d off by %.3f", b.A, b.B, q.MaxBondDeviation)
	}
	return true, ""
}

// TestLayoutSet checks the layout contract on every molecule of testdata/depict/smiles.txt.
func TestLayoutSet(t *testing.T) {
	set := loadSet(t)
	if len(set) < 200 {
		t.Fatalf("test set has %d molecules, want at least 200", len(set))
	}
	pass, misses := 0, 0
	for _, e := range set {
		m, err := smiles.Parse(e.smiles)
		if err != nil {
			t.Errorf("line %d %s: %v", e.line, e.smiles, err)
			continue
		}
		c, err := depict.Layout(m)
		if err != nil {
			t.Errorf("line %d %s: %v", e.line, e.smiles, err)
			continue
		}
		if len(c.Pos) != len(m.Atoms) {
			t.Fatalf("line %d: %d positions for %d atoms", e.line, len(c.Pos), len(m.Atoms))
		}
		for i, p := range c.Pos {
			if math.IsNaN(p.X) || math.IsNaN(p.Y) || math.IsInf(p.X, 0) || math.IsInf(p.Y, 0) {
				t.Fatalf("line %d %s: atom %d at %v", e.line, e.smiles, i, p)
			}
		}
		ok, why := meets(m, c)
		switch {
		case ok && !e.knownMiss:
			pass++
		case !ok && e.knownMiss:
			misses++
		case ok && e.knownMiss:
			t.Errorf("line %d %s (%s): listed as known-miss but now passes: remove the marker", e.line, e.smiles, e.name)
		default:
			t.Errorf("line %d %s (%s): %s", e.line, e.smiles, e.name, why)
		}
	}
	t.Logf("%d of %d molecules meet the layout contract; %d documented known misses", pass, len(set), misses)
}

func TestDeterministic(t *testing.T) {
	for _, e := range loadSet(t) {
		m, err := smiles.Parse(e.smiles)
		if err != nil {
			continue // reported by TestLayoutSet
		}
		a, err1 := depict.Layout(m)
		m2, _ := smiles.Parse(e.smiles)
		b, err2 := depict.Layout(m2)
		if err1 != nil || err2 != nil {
			continue
		}
		for i := range a.Pos {
			if a.Pos[i] != b.Pos[i] { // bit-identical, no tolerance
				t.Fatalf("%s: atom %d at %v then %v", e.smiles, i, a.Pos[i], b.Pos[i])
			}
		}
	}
}

// TestRings checks the ring perception against ring counts of well-known skeletons (the
// cyclomatic number E − V + 1 and the face sizes are textbook graph facts).
func TestRings(t *testing.T) {
	cases := []struct {
		smiles string
		sizes  []int // sorted ring sizes of the smallest set of smallest rings
	}{
		{"CCCC", nil},
		{"c1ccccc1", []int{6}},
		{"c1ccc2ccccc2c1", []int{6, 6}},
		{"c1ccc2c(c1)ccc1ccccc12", []int{6, 6, 6}},
		{"C1CC2CCC1C2", []int{5, 5}},                 // norbornane
		{"C1CC2CCC1CC2", []int{6, 6}},                // bicyclo[2.2.2]octane
		{"C1C2CC3CC1CC(C2)C3", []int{6, 6, 6}},       // adamantane
		{"C12C3C4C1C5C2C3C45", []int{4, 4, 4, 4, 4}}, // cubane (6 faces, 5 independent)
		{"C1CCC2(C1)CCCC2", []int{5, 5}},             // spiro[4.4]nonane
		{"c1ccc(cc1)-c1ccccc1", []int{6, 6}},
	}
	for _, tc := range cases {
		m, err := smiles.Parse(tc.smiles)
		if err != nil {
			t.Fatal(err)
		}
		c, err := depict.Layout(m)
		if err != nil {
			t.Fatal(err)
		}
		var got []int
		for _, r := range c.Rings {
			got = append(got, len(r))
			for k, a := range r {
				if m.BondBetween(a, r[(k+1)%len(r)]) < 0 {
					t.Errorf("%s: ring %v not closed by bonds at %d", tc.smiles, r, a)
				}
			}
		}
		if fmt.Sprint(got) != fmt.Sprint(tc.sizes) {
			t.Errorf("%s: ring sizes %v, want %v", tc.smiles, got, tc.sizes)
		}
	}
}

// TestShapes checks textbook geometry: benzene is a regular hexagon (all 1–4 distances 2,
// circumradius 1), a triple bond is straight, a long chain zig-zags with 120° angles.
func TestShapes(t *testing.T) {
	const tol = 1e-9 // exact construction, only rounding error
	m, _ := smiles.Parse("c1ccccc1")
	c, _ := depict.Layout(m)
	for i := 0; i < 3; i++ {
		if d := dist(c.Pos[i], c.Pos[i+3]); math.Abs(d-2) > tol {
			t.Errorf("benzene 1-4 distance %v, want 2", d)
		}
	}
	m, _ = smiles.Parse("CC#CC")
	c, _ = depict.Layout(m)
	if d := dist(c.Pos[0], c.Pos[3]); math.Abs(d-3) > tol {
		t.Errorf("2-butyne end-to-end %v, want 3 (linear)", d)
	}
	m, _ = smiles.Parse("CCCCCC")
	c, _ = depict.Layout(m)
	for i := 0; i+2 < 6; i++ {
		if d := dist(c.Pos[i], c.Pos[i+2]); math.Abs(d-math.Sqrt(3)) > tol {
			t.Errorf("hexane 1-3 distance %v, want √3 (120°)", d)
		}
	}
	for i := 0; i+3 < 6; i++ { // zig-zag (all anti), not a curl: 1-4 distance 2·... = √7
		if d := dist(c.Pos[i], c.Pos[i+3]); math.Abs(d-math.Sqrt(7)) > tol {
			t.Errorf("hexane 1-4 distance %v, want √7 (zig-zag)", d)
		}
	}
	// norbornane drawn as a hexagon with the bridge through its centre
	m, _ = smiles.Parse("C1CC2CCC1C2")
	c, _ = depict.Layout(m)
	if ok, why := meets(m, c); !ok {
		t.Errorf("norbornane: %s", why)
	}
}

func dist(a, b depict.Point) float64 { return math.Hypot(a.X-b.X, a.Y-b.Y) }

func TestFragmentsSideBySide(t *testing.T) {
	m, _ := smiles.Parse("c1ccccc1.C=CC#N")
	c, _ := depict.Layout(m)
	maxA := math.Inf(-1)
	for i := 0; i < 6; i++ {
		maxA = math.Max(maxA, c.Pos[i].X)
	}
	for i := 6; i < 10; i++ {
		if c.Pos[i].X < maxA+1.0 {
			t.Errorf("fragment 2 atom %d at x=%.3f overlaps fragment 1 (max x %.3f)", i, c.Pos[i].X, maxA)
		}
	}
}

func TestErrors(t *testing.T) {
	if _, err := depict.Layout(&molecule.Molecule{}); !errors.Is(err, depict.ErrEmpty) {
		t.Errorf("empty molecule: %v, want ErrEmpty", err)
	}
	big := &molecule.Molecule{}
	for i := 0; i <= depict.MaxAtoms; i++ {
		big.AddAtom(molecule.Atom{Element: "C", Pos: -1})
	}
	if _, err := depict.Layout(big); !errors.Is(err, depict.ErrTooLarge) {
		t.Errorf("huge molecule: %v, want ErrTooLarge", err)
	}
}

// TestGolden pins the coordinates of a few molecules (refresh with -update after a deliberate
// layout change; look at the pictures first).
func TestGolden(t *testing.T) {
	var b strings.Builder
	for _, s := range []string{"C=CC=C", "c1ccc2ccccc2c1", "O=C1OC(=O)C2C1C1C=CC2C1", "CC(C)(C)c1ccc(O)cc1", "C1CCC2(C1)CCCC2"} {
		m, err := smiles.Parse(s)
		if err != nil {
			t.Fatal(err)
		}
		c, err := depict.Layout(m)
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(&b, "%s\n", s)
		for i, p := range c.Pos {
			fmt.Fprintf(&b, "  %2d %-2s %8.4f %8.4f\n", i, m.Atoms[i].Element, p.X, p.Y)
		}
	}
	golden := filepath.Join("testdata", "layout.golden")
	if *update {
		if err := os.WriteFile(golden, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test -update once)", err)
	}
	if string(want) != b.String() {
		t.Errorf("layout changed; got\n%s", b.String())
	}
}

func BenchmarkLayout(b *testing.B) {
	m, err := smiles.Parse("CC(C)CCCC(C)C1CCC2C1(CCC1C2CC=C2CC(O)CCC12C)C")
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := depict.Layout(m); err != nil {
			b.Fatal(err)
		}
	}
}

// TestDoubleBondGeometry: '/' and '\' marks fix cis/trans drawing (OpenSMILES specification,
// "Stereochemistry: cis/trans"): F/C=C/F and C(\F)=C/F are trans, F/C=C\F and C(/F)=C/F cis.
func TestDoubleBondGeometry(t *testing.T) {
	for _, tc := range []struct {
		smiles  string
		c1, c2  int // the double bond
		x, y    int // the marked substituents
		wantCis bool
	}{
		{"F/C=C/F", 1, 2, 0, 3, false},
		{"F/C=C\\F", 1, 2, 0, 3, true},
		{"C(/F)=C/F", 0, 2, 1, 3, true},
		{"C(\\F)=C/F", 0, 2, 1, 3, false},
		{"COC(=O)/C=C\\C(=O)OC", 4, 5, 2, 6, true}, // dimethyl maleate
		{"COC(=O)/C=C/C(=O)OC", 4, 5, 2, 6, false}, // dimethyl fumarate
		{"C/C=C\\C=C", 1, 2, 0, 3, true},           // (Z)-piperylene
		{"CCCC/C=C\\CCCCCCCC", 4, 5, 3, 6, true},   // a cis chain alkene
	} {
		m, err := smiles.Parse(tc.smiles)
		if err != nil {
			t.Fatal(err)
		}
		c, err := depict.Layout(m)
		if err != nil {
			t.Fatal(err)
		}
		a, b := c.Pos[tc.c1], c.Pos[tc.c2]
		side := func(p depict.Point) float64 { return (b.X-a.X)*(p.Y-a.Y) - (b.Y-a.Y)*(p.X-a.X) }
		cis := side(c.Pos[tc.x])*side(c.Pos[tc.y]) > 0
		if cis != tc.wantCis {
			t.Errorf("%s drawn cis=%v, want cis=%v", tc.smiles, cis, tc.wantCis)
		}
		if ok, why := meets(m, c); !ok {
			t.Errorf("%s: %s", tc.smiles, why)
		}
	}
}

// BenchmarkParseBaseline parses the molecule BenchmarkLayout lays out: the layout cost is
// reported as a ratio to this baseline measured in the same run.
func BenchmarkParseBaseline(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := smiles.Parse("CC(C)CCCC(C)C1CCC2C1(CCC1C2CC=C2CC(O)CCC12C)C"); err != nil {
			b.Fatal(err)
		}
	}
}
