package smiles

import (
	"math/rand/v2"
	"testing"

	"cyclopair/huckel/molecule"
)

// withChiral parses s and sets Atom.Chiral on the atoms given (atom index → configuration
// relative to molecule.StereoOrder).
func withChiral(t *testing.T, s string, chiral map[int]int8) *molecule.Molecule {
	t.Helper()
	m, err := Parse(s)
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range chiral {
		m.Atoms[i].Chiral = c
	}
	return m
}

// permuteStereo renumbers m at random and carries each Atom.Chiral over to the new
// reference order, so the result is the same stereo-molecule.
func permuteStereo(m *molecule.Molecule, rng *rand.Rand) *molecule.Molecule {
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
	for i, a := range m.Atoms {
		if a.Chiral == 0 {
			continue
		}
		old := m.StereoOrder(i)
		for k, nb := range old {
			if nb != molecule.ImplicitH {
				old[k] = perm[nb]
			}
		}
		if molecule.OddPermutation(p.StereoOrder(perm[i]), old) {
			p.Atoms[perm[i]].Chiral = -a.Chiral
		}
	}
	return p
}

// TestWriteChirality checks the '@'/'@@' marks Write derives from Atom.Chiral against
// SMILES written by hand from the OpenSMILES definition (looking from the first neighbour,
// the others anticlockwise for '@'; the implicit hydrogen counts where it is written): the
// reference order of alanine's alpha carbon is (H, N, CH3, COOH), so '@' there is
// N[C@@H](C)C(=O)O as written from N (L-alanine; OpenSMILES specification, Craig A. James,
// 2007–2016, "Tetrahedral centers"; L-alanine as N[C@@H](C)C(=O)O from memory).
func TestWriteChirality(t *testing.T) {
	m := withChiral(t, "NC(C)C(=O)O", map[int]int8{1: molecule.ChiralACW})
	if got, want := Write(m), "N[C@@H](C)C(=O)O"; got != want {
		t.Errorf("Write = %s, want %s", got, want)
	}
	m.Atoms[1].Chiral = molecule.ChiralCW
	if got, want := Write(m), "N[C@H](C)C(=O)O"; got != want {
		t.Errorf("Write (mirror) = %s, want %s", got, want)
	}
	// A chiral mark on an atom without four neighbours is not written.
	c := withChiral(t, "CC=C", map[int]int8{1: molecule.ChiralACW})
	if got := Write(c); got != "CC=C" {
		t.Errorf("mark on an sp2 atom written: %s", got)
	}
}

// TestCanonicalStereo checks CanonicalStereo: random renumberings of one stereo-molecule
// give one string; the mirror image of a chiral molecule and a diastereomer give other
// strings; a meso compound and its "mirror image" give the same string (cis-1,2-
// dimethylcyclohexane is meso: textbook fact, e.g. Eliel & Wilen, Stereochemistry of Organic
// Compounds, 1994, from memory); a mark on a non-stereocentre is dropped.
func TestCanonicalStereo(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 9))
	same := func(m *molecule.Molecule) string {
		t.Helper()
		want := CanonicalStereo(m)
		for k := 0; k < 25; k++ {
			if got := CanonicalStereo(permuteStereo(m, rng)); got != want {
				t.Fatalf("renumbering %d of %s: %s, want %s", k, Write(m), got, want)
			}
		}
		return want
	}
	mirror := func(m *molecule.Molecule) *molecule.Molecule {
		c := m.Clone()
		for i := range c.Atoms {
			c.Atoms[i].Chiral = -c.Atoms[i].Chiral
		}
		return c
	}
	ala := withChiral(t, "NC(C)C(=O)O", map[int]int8{1: molecule.ChiralACW})
	if same(ala) == same(mirror(ala)) {
		t.Error("alanine and its mirror image share a canonical string")
	}
	if got := CanonicalStereo(ala); got != "C[C@H](N)C(=O)O" && got != "C[C@@H](N)C(=O)O" && got == Canonical(ala) {
		t.Errorf("alanine: no mark in %s", got)
	}
	// 1,2-dimethylcyclohexane: atoms 1 and 6 are the ring centres
	cis := withChiral(t, "CC1CCCCC1C", map[int]int8{1: molecule.ChiralACW, 6: molecule.ChiralACW})
	trans := withChiral(t, "CC1CCCCC1C", map[int]int8{1: molecule.ChiralACW, 6: molecule.ChiralCW})
	a, b := same(cis), same(trans)
	if a == b {
		t.Errorf("the two diastereomers of 1,2-dimethylcyclohexane share %s", a)
	}
	// one of them is meso (its mirror image is itself), the other chiral
	meso := 0
	for _, m := range []*molecule.Molecule{cis, trans} {
		if same(m) == same(mirror(m)) {
			meso++
		}
	}
	if meso != 1 {
		t.Errorf("%d of the two 1,2-dimethylcyclohexane diastereomers are meso, want 1", meso)
	}
	// a mark on a CH2 and on C with two methyls is dropped
	neo := withChiral(t, "CC(C)(O)CC", map[int]int8{1: molecule.ChiralACW, 4: molecule.ChiralCW})
	if got, want := CanonicalStereo(neo), Canonical(neo); got != want {
		t.Errorf("marks on non-stereocentres kept: %s, want %s", got, want)
	}
}

// TestCanonicalStereoMirror: the one-search pair equals CanonicalStereo of the molecule and
// of its mirror image computed separately, on every parsable fixture input with random
// configurations on its four-connected atoms (and on two renumberings of each).
func TestCanonicalStereoMirror(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 13))
	n := 0
	// saturated and symmetric ring systems (many four-connected atoms, tied classes)
	extra := []string{"OC1C(O)C(O)C(O)C(O)C1O", "CC1CCC(C)CC1", "C1CC2CCC1C2", "OCC(O)C(O)C(O)C(O)C=O",
		"C12C3C4C1C5C2C3C45", "CC1CCC2CCCCC2C1", "OC1C2CC3CC1CC(C2)C3", "CC(N)C(O)C(C)C(=O)O",
		"C1CC2C3CCC4CC3C2CC14", "ClC1C(Cl)C(Br)C(Br)C1", "CC1(C)C2CCC1(C)C(=O)C2", "O=C1OC(=O)C2C3CC(C=C3)C12"}
	for _, smi := range append(extra, readInputs(t)...) {
		m, err := Parse(smi)
		if err != nil || len(m.Atoms) > 60 {
			continue
		}
		marks := 0
		for v := range m.Atoms {
			if m.Degree(v)+m.Atoms[v].HCount == 4 && m.Atoms[v].HCount <= 1 && rng.IntN(3) > 0 {
				m.Atoms[v].Chiral = []int8{molecule.ChiralACW, molecule.ChiralCW}[rng.IntN(2)]
				marks++
			}
		}
		for _, x := range []*molecule.Molecule{m, permuteStereo(m, rng), permuteStereo(m, rng)} {
			mirror := x.Clone()
			for i := range mirror.Atoms {
				mirror.Atoms[i].Chiral = -mirror.Atoms[i].Chiral
			}
			a, b := CanonicalStereoMirror(x)
			if wa, wb := CanonicalStereo(x), CanonicalStereo(mirror); a != wa || b != wb {
				t.Fatalf("%s: CanonicalStereoMirror = %s, %s; separately %s, %s", smi, a, b, wa, wb)
			}
		}
		if marks >= 2 {
			n++
		}
	}
	if n < 20 {
		t.Errorf("only %d inputs with two or more marks", n)
	}
}

// TestTwinPruningChangesNothing: skipping the twins of an already searched atom
// (twinOfAny) leaves every canonical string as the full search writes it, with and without
// configurations and for the mirror image, on the fixture molecules, renumberings of them,
// and molecules rich in twins (tert-butyl, CF3, NMe2, gem-dimethyl next to stereocentres).
func TestTwinPruningChangesNothing(t *testing.T) {
	inputs := []string{"CC(C)(C)C(F)(F)F", "CN(C)c1ccc(N(C)C)cc1", "C[C@H](N(C)C)[C@@H](C(C)(C)C)C(F)(F)F",
		"CC1(C)C[C@H](O)[C@@H](C(C)(C)C)C1", "FC(F)(F)C(F)(F)C(F)(F)F", "C1CC2CCC1CC2", "C12C3C4C1C5C2C3C45",
		"O=[N+]([O-])C(C)(C)[N+](=O)[O-]", "CC(C)(C)[Si](C)(C)OC=CC(=C)O[Si](C)(C)C(C)(C)C"}
	fx := loadFixture(t)
	for _, rec := range fx.Molecules {
		inputs = append(inputs, rec.Smiles)
	}
	rng := rand.New(rand.NewPCG(3, 9))
	defer func() { pruneTwins = true }()
	checked := 0
	for _, s := range inputs {
		m, err := Parse(s)
		if err != nil {
			continue
		}
		for k := range 2 {
			mm := m
			if k == 1 {
				mm = permute(m, rng)
			}
			var got, want [4]string
			for _, prune := range []bool{true, false} {
				pruneTwins = prune
				out := &got
				if !prune {
					out = &want
				}
				out[0] = Canonical(mm)
				out[1] = CanonicalStereo(mm)
				out[2], out[3] = CanonicalStereoMirror(mm)
			}
			if got != want {
				t.Errorf("%s (renumbering %d): with twin pruning %q, full search %q", s, k, got, want)
			}
			checked++
		}
	}
	if checked < 600 {
		t.Errorf("only %d molecules checked", checked)
	}
}
