package smiles

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"cyclopair/huckel/molecule"
)

// TestParseDetails checks what the RDKit fixture does not: hydrogen counts and bond
// orders of named cases, positions, flags, maps and stereo marks.
func TestParseDetails(t *testing.T) {
	cases := []struct {
		in      string
		h       string // HCount per atom
		doubles int    // number of double bonds in the Kekulé form
	}{
		{"c1ccccc1", "111111", 3},
		{"c1=cc=cc=c1", "111111", 3},                  // aromatic atoms with explicit double bonds
		{"c1ccc2ccccc2c1", "1110111101", 5},           // naphthalene
		{"c1ccc2cccc2cc1", "1110111011", 5},           // azulene: 5-7 fused, odd rings
		{"c1ccc2[nH]ccc2c1", "111011101", 4},          // indole
		{"c1ncc2nc[nH]c2n1", "101001100", 4},          // purine
		{"c1ccc2ncccc2c1", "1110011101", 5},           // quinoline
		{"c1ccc2cc3ccccc3cc2c1", "11101011110101", 7}, // anthracene
		{"c1ncnnn1", "101000", 3},                     // tetrazine-like ring
		{"O=c1cccc[nH]1", "0011111", 3},               // 2-pyridone: C=O plus two ring C=C
		{"Cn1cccc1", "301111", 2},                     // N-methylpyrrole
		{"[cH-]1cccc1", "11111", 2},                   // cyclopentadienide
		{"c1cc[o+]cc1", "111011", 3},                  // pyrylium
		{"[O-][n+]1ccccc1", "0011111", 3},             // pyridine N-oxide
		{"c1ccccc1c1ccccc1", "111110011111", 6},       // biphenyl, implicit biaryl bond
		{"C=CC=[O+][B-](F)(F)F", "21100000", 2},       // acrolein-BF3
		{"[NH4+]", "4", 0},
		{"[Fe+3]", "0", 0},
		{"[Na+].[Cl-]", "00", 0},
		{"N(=O)(=O)C", "0003", 2}, // nitro written with pentavalent N
		{"C#N", "10", 0},
		{"[2H]C([2H])([2H])[2H]", "00000", 0},
		{"[C@@H](Cl)(F)Br", "1000", 0},
	}
	for _, tc := range cases {
		m, err := Parse(tc.in)
		if err != nil {
			t.Errorf("Parse(%q): %v", tc.in, err)
			continue
		}
		var h strings.Builder
		doubles := 0
		for _, a := range m.Atoms {
			h.WriteString(fmt.Sprint(a.HCount))
		}
		for _, b := range m.Bonds {
			if b.Order == 2 {
				doubles++
			}
		}
		if h.String() != tc.h {
			t.Errorf("Parse(%q): H counts %s, want %s", tc.in, h.String(), tc.h)
		}
		if doubles != tc.doubles {
			t.Errorf("Parse(%q): %d double bonds, want %d", tc.in, doubles, tc.doubles)
		}
		if bad := valenceProblems(m); bad != "" {
			t.Errorf("Parse(%q): %s", tc.in, bad)
		}
		if m.Source != tc.in {
			t.Errorf("Parse(%q): Source = %q", tc.in, m.Source)
		}
	}
}

func TestParseFlags(t *testing.T) {
	m, err := Parse("[CH2:1]=[CH:2]/C=C/c1ccccc1.[13CH4]")
	if err != nil {
		t.Fatal(err)
	}
	if m.Atoms[0].Map != 1 || m.Atoms[1].Map != 2 || m.Atoms[2].Map != 0 {
		t.Errorf("maps %d %d %d, want 1 2 0", m.Atoms[0].Map, m.Atoms[1].Map, m.Atoms[2].Map)
	}
	if got := m.AtomByMap(2); len(got) != 1 || got[0] != 1 {
		t.Errorf("AtomByMap(2) = %v", got)
	}
	if m.Atoms[1].Pos != 8 || m.Atoms[2].Pos != 15 {
		t.Errorf("positions %d %d, want 8 15", m.Atoms[1].Pos, m.Atoms[2].Pos)
	}
	if !m.Atoms[0].Bracket || m.Atoms[2].Bracket {
		t.Error("Bracket flags wrong")
	}
	if b := m.Bonds[m.BondBetween(1, 2)]; b.Stereo != '/' || b.Order != 1 {
		t.Errorf("bond 1-2 = %+v, want single with stereo '/'", b)
	}
	if !m.Atoms[4].Aromatic || m.Atoms[3].Aromatic {
		t.Error("Aromatic atom flags wrong")
	}
	if b := m.Bonds[m.BondBetween(3, 4)]; b.Aromatic {
		t.Error("bond from an aliphatic atom into the ring marked aromatic")
	}
	if b := m.Bonds[m.BondBetween(4, 5)]; !b.Aromatic {
		t.Error("ring bond not marked aromatic")
	}
	if a := m.Atoms[10]; a.Isotope != 13 || a.HCount != 4 {
		t.Errorf("[13CH4] = %+v", a)
	}
	if c := m.Components(); len(c) != 2 {
		t.Errorf("%d components, want 2", len(c))
	}
	// the biaryl bond written implicitly between aromatic atoms is an ordinary single bond
	m, _ = Parse("c1ccccc1c1ccccc1")
	if b := m.Bonds[m.BondBetween(5, 6)]; b.Aromatic || b.Order != 1 {
		t.Errorf("biaryl bond = %+v, want single, not aromatic", b)
	}
	// chirality marks are accepted and ignored
	for _, s := range []string{"N[C@@H](C)C(=O)O", "N[C@H](C)C(=O)O", "N[C@TH1H](C)C(=O)O", "F[Co@OH12](Cl)(Br)(I)(C)N"} {
		if _, err := Parse(s); err != nil {
			t.Errorf("Parse(%q): %v", s, err)
		}
	}
	// charges
	for s, q := range map[string]int{"[NH4+]": 1, "[Fe++]": 2, "[Fe+2]": 2, "[O-2]": -2, "[O--]": -2, "[Cu+]": 1} {
		m, err := Parse(s)
		if err != nil {
			t.Errorf("Parse(%q): %v", s, err)
			continue
		}
		if m.Atoms[0].Charge != q {
			t.Errorf("Parse(%q): charge %d, want %d", s, m.Atoms[0].Charge, q)
		}
	}
}

// sameGraph reports how b (read back from Write(a) with output order order) differs from
// a, or "" when it is the same graph: b's atom k is a's atom order[k].
func sameGraph(a, b *molecule.Molecule, order []int) string {
	if len(a.Atoms) != len(b.Atoms) || len(a.Bonds) != len(b.Bonds) || len(order) != len(a.Atoms) {
		return fmt.Sprintf("%d atoms %d bonds, want %d atoms %d bonds", len(b.Atoms), len(b.Bonds), len(a.Atoms), len(a.Bonds))
	}
	for k, i := range order {
		x, y := a.Atoms[i], b.Atoms[k]
		if x.Element != y.Element || x.Charge != y.Charge || x.HCount != y.HCount || x.Isotope != y.Isotope || x.Map != y.Map {
			return fmt.Sprintf("atom %d %+v came back as %+v", i, x, y)
		}
	}
	for _, bb := range b.Bonds {
		bi := a.BondBetween(order[bb.A], order[bb.B])
		if bi < 0 {
			return fmt.Sprintf("bond %d-%d is new", order[bb.A], order[bb.B])
		}
		if a.Bonds[bi].Order != bb.Order {
			return fmt.Sprintf("bond %d-%d order %d came back as %d", order[bb.A], order[bb.B], a.Bonds[bi].Order, bb.Order)
		}
	}
	return ""
}

// roundTrip checks Parse(Write(m)) against m and returns the written string.
func roundTrip(t testing.TB, m *molecule.Molecule) string {
	t.Helper()
	w, order := writeOrder(m)
	if w2 := Write(m); w2 != w {
		t.Fatalf("Write is not deterministic: %q then %q", w, w2)
	}
	// The Kekulé form can be longer than the input (c1ccccc1 → C1=CC=CC=C1), so an input
	// near MaxLength may write past it: read it back without the limit.
	back, err := ParseOptions{MaxLength: math.MaxInt}.Parse(w)
	if err != nil {
		t.Fatalf("Write gave %q which does not parse: %v", w, err)
	}
	if d := sameGraph(m, back, order); d != "" {
		t.Fatalf("Write gave %q: %s", w, d)
	}
	return w
}

func TestRoundTrip(t *testing.T) {
	for _, s := range readInputs(t) {
		m, err := Parse(s)
		if err != nil {
			continue
		}
		roundTrip(t, m)
		// the output does not depend on the order of the bond list
		p := m.Clone()
		rng := rand.New(rand.NewPCG(1, uint64(len(s))))
		rng.Shuffle(len(p.Bonds), func(i, j int) { p.Bonds[i], p.Bonds[j] = p.Bonds[j], p.Bonds[i] })
		for i := range p.Bonds {
			if rng.IntN(2) == 0 {
				b := &p.Bonds[i]
				b.A, b.B = b.B, b.A
				if b.Stereo != 0 {
					b.Stereo = symUp + symDown - b.Stereo
				}
			}
		}
		p.Reindex()
		if w, wp := Write(m), Write(p); w != wp {
			t.Errorf("%s: Write depends on bond order: %q vs %q", s, w, wp)
		}
	}
}

func TestWriteBuiltInCode(t *testing.T) {
	// a molecule built in code: hydroxide next to a sodium ion, and a cyclopropene
	var m molecule.Molecule
	m.AddAtom(molecule.Atom{Element: "O", Charge: -1, HCount: 1, Pos: -1})
	m.AddAtom(molecule.Atom{Element: "Na", Charge: 1, Pos: -1})
	a := m.AddAtom(molecule.Atom{Element: "C", HCount: 1, Pos: -1})
	b := m.AddAtom(molecule.Atom{Element: "C", HCount: 1, Pos: -1})
	c := m.AddAtom(molecule.Atom{Element: "C", HCount: 2, Pos: -1})
	m.AddBond(a, b, 2)
	m.AddBond(b, c, 1)
	m.AddBond(c, a, 1)
	if got, want := roundTrip(t, &m), "[OH-].[Na+].C1=CC1"; got != want {
		t.Errorf("Write = %q, want %q", got, want)
	}
	// a non-default hydrogen count is kept with brackets
	var s molecule.Molecule
	s.AddAtom(molecule.Atom{Element: "S", HCount: 4, Pos: -1})
	if got, want := roundTrip(t, &s), "[SH4]"; got != want {
		t.Errorf("Write = %q, want %q", got, want)
	}
	// a ladder of 40 atoms with rungs i–(i+20) keeps many rings open at once
	var big molecule.Molecule
	for i := 0; i < 40; i++ {
		big.AddAtom(molecule.Atom{Element: "C", Pos: -1})
		if i > 0 {
			big.AddBond(i-1, i, 1)
		}
	}
	for i := 0; i < 20; i++ {
		big.AddBond(i, i+20, 1)
	}
	for i := range big.Atoms {
		big.Atoms[i].HCount = 4 - big.BondOrderSum(i)
	}
	if w := roundTrip(t, &big); !strings.Contains(w, "%1") {
		t.Errorf("expected two-digit ring numbers in %s", w)
	}
}

func TestWritePanicsOnBadOrder(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("Write did not panic on a bond of order 0")
		}
	}()
	var m molecule.Molecule
	m.AddAtom(molecule.Atom{Element: "C"})
	m.AddAtom(molecule.Atom{Element: "C"})
	m.AddBond(0, 1, 0)
	Write(&m)
}

// permute returns m with atoms renumbered by a random permutation and bonds shuffled.
func permute(m *molecule.Molecule, rng *rand.Rand) *molecule.Molecule {
	n := len(m.Atoms)
	perm := rng.Perm(n)
	p := &molecule.Molecule{Atoms: make([]molecule.Atom, n)}
	for i, a := range m.Atoms {
		p.Atoms[perm[i]] = a
	}
	for _, b := range m.Bonds {
		p.Bonds = append(p.Bonds, molecule.Bond{A: perm[b.A], B: perm[b.B], Order: b.Order})
	}
	rng.Shuffle(len(p.Bonds), func(i, j int) { p.Bonds[i], p.Bonds[j] = p.Bonds[j], p.Bonds[i] })
	p.Reindex()
	return p
}

// TestCanonical checks Canonical against RDKit's view of identity: for every fixture
// molecule, the input and three RDKit random SMILES of it (other atom orders, and for
// aromatic input other Kekulé structures after our kekulisation) must give one string,
// so must random permutations of the graph, and two fixture molecules must share a
// canonical string exactly when RDKit gives them the same canonical SMILES.
func TestCanonical(t *testing.T) {
	fx := loadFixture(t)
	rng := rand.New(rand.NewPCG(7, 11))
	ours := map[string]string{}   // our canonical → RDKit canonical
	theirs := map[string]string{} // RDKit canonical → our canonical
	for _, rec := range fx.Molecules {
		if !rec.RDKitOK {
			continue
		}
		m, err := Parse(rec.Smiles)
		if err != nil {
			t.Errorf("%s: %v", rec.Smiles, err)
			continue
		}
		c := Canonical(m)
		back, err := Parse(c)
		if err != nil {
			t.Errorf("%s: Canonical gave %q which does not parse: %v", rec.Smiles, c, err)
			continue
		}
		if c2 := Canonical(back); c2 != c {
			t.Errorf("%s: Canonical is not idempotent: %q then %q", rec.Smiles, c, c2)
		}
		for _, r := range rec.Random {
			mr, err := Parse(r)
			if err != nil {
				t.Errorf("%s: random form %q: %v", rec.Smiles, r, err)
				continue
			}
			if cr := Canonical(mr); cr != c {
				t.Errorf("%s: Canonical %q, but %q (same molecule) gives %q", rec.Smiles, c, r, cr)
			}
		}
		for k := 0; k < 3; k++ {
			if cp := Canonical(permute(m, rng)); cp != c {
				t.Errorf("%s: Canonical %q, permuted graph gives %q", rec.Smiles, c, cp)
			}
		}
		if prev, ok := ours[c]; ok && prev != rec.Canonical {
			t.Errorf("Canonical %q is shared by RDKit-different %q and %q", c, prev, rec.Canonical)
		}
		if prev, ok := theirs[rec.Canonical]; ok && prev != c {
			t.Errorf("RDKit-identical %q gets two canonical strings %q and %q", rec.Canonical, prev, c)
		}
		ours[c] = rec.Canonical
		theirs[rec.Canonical] = c
	}
	if len(ours) < 300 {
		t.Errorf("only %d distinct molecules checked", len(ours))
	}
}

func TestCanonicalKekule(t *testing.T) {
	// Two Kekulé structures each of naphthalene, benzene, biphenylene, anthracene and
	// 2-pyridone, written by hand; RDKit 2022.09.3 gives each pair one canonical SMILES.
	pairs := [][2]string{
		{"C1=CC=C2C=CC=CC2=C1", "C1C=CC2=CC=CC=C2C=1"},
		{"C1=CC=CC=C1", "C=1C=CC=CC=1"},
		{"C1=CC=C2C(=C1)C1=CC=CC=C12", "C1C=CC2=C(C=1)C1=C2C=CC=C1"},
		{"C1=CC=C2C=C3C=CC=CC3=CC2=C1", "C1C=CC2=CC3=CC=CC=C3C=C2C=1"},
		{"O=C1C=CC=CN1", "N1C=CC=CC1=O"},
	}
	for _, p := range pairs {
		a, err := Parse(p[0])
		if err != nil {
			t.Fatal(err)
		}
		b, err := Parse(p[1])
		if err != nil {
			t.Fatal(err)
		}
		if ca, cb := Canonical(a), Canonical(b); ca != cb {
			t.Errorf("%s and %s: Canonical %q vs %q", p[0], p[1], ca, cb)
		}
	}
	// Different molecules stay different: 1,3- and 1,4-cyclohexadiene, nitro forms.
	distinct := []string{"C1=CC=CCC1", "C1=CCC=CC1", "C[N+](=O)[O-]", "CN(=O)=O", "[CH2:1]=C", "C=C"}
	seen := map[string]string{}
	for _, s := range distinct {
		m, err := Parse(s)
		if err != nil {
			t.Fatal(err)
		}
		c := Canonical(m)
		if prev, ok := seen[c]; ok {
			t.Errorf("%s and %s share Canonical %q", prev, s, c)
		}
		seen[c] = s
	}
	if Canonical(&molecule.Molecule{}) != "" {
		t.Error("Canonical of the empty molecule is not empty")
	}
}

// TestCanonicalSearch checks that the individualisation search alone, without the
// ring-size invariants, separates what colour refinement cannot: in the boron compound the
// fuzzer found, the phenyl ipso carbon and the two ring carbons bonded to B look alike to
// refinement. It also checks that no fixture molecule is too symmetric for the search.
func TestCanonicalSearch(t *testing.T) {
	m, err := Parse("c1ccc(B(c2ccccc2)2)cccccc2cc1")
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(5, 5))
	noRings := make([]int, len(m.Bonds))
	want, exact := canonical(m, noRings, false)
	if !exact {
		t.Fatal("search gave up")
	}
	for k := 0; k < 20; k++ {
		p := permute(m, rng)
		if got, _ := canonical(p, make([]int, len(p.Bonds)), false); got != want {
			t.Fatalf("renumbering %d: %q, want %q", k, got, want)
		}
	}
	for _, s := range readInputs(t) {
		m, err := Parse(s)
		if err != nil {
			continue
		}
		if _, exact := canonical(m, smallestRings(m), false); !exact {
			t.Errorf("%s: Canonical search exceeded %d leaves", s, maxCanonicalLeaves)
		}
	}
}

func TestParseNeverPanicsOnPrefixes(t *testing.T) {
	// every prefix of every corpus input gives a molecule or a positioned error
	for _, s := range readInputs(t) {
		for k := 0; k <= len(s); k++ {
			checkParse(t, s[:k])
		}
	}
}

// checkParse applies the invariants shared with the fuzz targets.
func checkParse(t testing.TB, s string) {
	t.Helper()
	m, err := Parse(s)
	if err != nil {
		var e *Error
		if !errors.As(err, &e) {
			t.Fatalf("Parse(%q): error %T %v is not an *Error", s, err, err)
		}
		var list ErrorList
		if errors.As(err, &list) {
			for _, x := range list {
				checkError(t, s, x)
			}
		} else {
			checkError(t, s, e)
		}
		if m != nil {
			t.Fatalf("Parse(%q): molecule returned with an error", s)
		}
		return
	}
	if m.Source != s {
		t.Fatalf("Parse(%q): Source %q", s, m.Source)
	}
	if bad := valenceProblems(m); bad != "" {
		t.Fatalf("Parse(%q): %s", s, bad)
	}
	for _, a := range m.Atoms {
		if a.Pos < 0 || a.Pos >= len(s) {
			t.Fatalf("Parse(%q): atom position %d out of range", s, a.Pos)
		}
	}
	roundTrip(t, m)
}

func checkError(t testing.TB, s string, e *Error) {
	t.Helper()
	if e.Pos < 0 || e.Pos > len(s) || e.Input != s || e.Msg == "" || e.Err == nil {
		t.Fatalf("Parse(%q): malformed error %+v", s, e)
	}
	_ = e.Error()
	_ = e.Excerpt()
}

// TestParseConcurrent runs Parse from several goroutines at once (the pooled work space
// must not leak between calls); run with -race to check.
func TestParseConcurrent(t *testing.T) {
	inputs := readInputs(t)
	want := make([]string, len(inputs))
	for i, s := range inputs {
		if m, err := Parse(s); err == nil {
			want[i] = Write(m)
		} else {
			want[i] = "!" + err.Error()
		}
	}
	done := make(chan string, 4)
	for g := 0; g < 4; g++ {
		go func(g int) {
			for k := range inputs {
				i := (k*7 + g*13) % len(inputs)
				got := ""
				if m, err := Parse(inputs[i]); err == nil {
					got = Write(m)
				} else {
					got = "!" + err.Error()
				}
				if got != want[i] {
					done <- fmt.Sprintf("%s: %q, want %q", inputs[i], got, want[i])
					return
				}
			}
			done <- ""
		}(g)
	}
	for g := 0; g < 4; g++ {
		if msg := <-done; msg != "" {
			t.Error(msg)
		}
	}
}
