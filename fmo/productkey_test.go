package fmo

import (
	"slices"
	"testing"

	"cyclopair/fmo/internal/testsupport"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// The invariant pre-check never changes an answer of the canonical-SMILES comparison: for
// every candidate adduct pair of a set of real and synthetic partners (symmetric ones such as
// butadiene, cyclopentadiene, maleic anhydride and p-benzoquinone included, where
// orientations give the same adduct), same(i, j) equals canonical(i) == canonical(j), and
// every isomorphism the shortcut of same accepts joins adducts with equal canonical SMILES.
func TestProductKeysAgreeWithCanonical(t *testing.T) {
	o := testOptions(t)
	// 5-phenylpenta-2,4-dienal (its benzene ring also reacts as a diene) with
	// phenylacetylene gives regio-isomers that the invariant without bond orders cannot tell
	// apart; the bond-typed invariant must, without splitting equal ones
	dienes := []string{"C=CC=C", "C1=CCC=C1", "CC(=C)C=C", "COC=CC=C", "c1ccoc1", "C=CC(=C)C=C", "O=CC=CC=Cc1ccccc1"}
	dphs := []string{"C=CC=O", "O=C1OC(=O)C=C1", "O=C1C=CC(=O)C=C1", "C=C", "N#CC=CC#N", "C=CC(=O)C=C", "C#Cc1ccccc1"}
	lib := testsupport.SyntheticLibrary(12, 12, 21)
	for _, s := range lib.Dienes {
		dienes = append(dienes, s.SMILES)
	}
	for _, s := range lib.Dienophiles {
		dphs = append(dphs, s.SMILES)
	}
	pairs, equal, byIso, byBonds := 0, 0, 0, 0
	var iso isoScratch
	for _, ds := range dienes {
		d := mustPartner(t, ds, RoleDiene, o)
		for _, es := range dphs {
			e := mustPartner(t, es, RoleDienophile, o)
			var built []*molecule.Molecule
			for di := range d.Units {
				for ei := range e.Units {
					for or := range 2 {
						pm, _ := buildProduct(d, e, di, ei, or)
						built = append(built, pm)
					}
				}
			}
			var ids [][3]int
			for di := range d.Units {
				for ei := range e.Units {
					for or := range 2 {
						ids = append(ids, [3]int{di, ei, or})
					}
				}
			}
			keys := newProductKeys(len(built), func(i int) *molecule.Molecule { return built[i] },
				func(i int) (uint64, []uint64) { return adductColours(d, e, ids[i][0], ids[i][1], ids[i][2]) })
			for i, m := range built {
				// the colours from the partners are those of the built adduct
				h, c := graphColours(m)
				h2, c2 := adductColours(d, e, ids[i][0], ids[i][1], ids[i][2])
				if h != h2 || !slices.Equal(c, c2) {
					t.Fatalf("%s + %s: adduct %d: colours from the partners differ from the built adduct's", ds, es, i)
				}
			}
			canon := make([]string, len(built))
			for i, m := range built {
				canon[i] = productKey(m)
			}
			for i := range built {
				for j := range built {
					want := canon[i] == canon[j]
					// an isomorphism found where the search bound holds must mean equal
					// canonical SMILES (the shortcut same takes)
					ci, cj := keys.colours[i], keys.colours[j]
					if ci == nil {
						_, ci = graphColours(built[i])
					}
					if cj == nil {
						_, cj = graphColours(built[j])
					}
					if i != j && searchBounded(ci) && iso.isomorphic(built[i], built[j], ci, cj) {
						byIso++
						if !want {
							t.Errorf("%s + %s: adducts %d, %d isomorphic but canonical SMILES differ:\n%s\n%s", ds, es, i, j, canon[i], canon[j])
						}
					}
					// equal canonical SMILES must mean equal bond-labelled invariants (the
					// second filter same applies)
					bi, bj := bondInvariant(built[i]), bondInvariant(built[j])
					if want && bi != bj {
						t.Errorf("%s + %s: adducts %d, %d: equal canonical SMILES %s but bond invariants differ", ds, es, i, j, canon[i])
					}
					if !want && bi != bj && graphInvariant(built[i]) == graphInvariant(built[j]) {
						byBonds++
					}
					if got := keys.same(i, j); got != want {
						t.Errorf("%s + %s: adducts %d, %d: same = %v, canonical SMILES say %v", ds, es, i, j, got, want)
					}
					pairs++
					if want && i != j {
						equal++
					}
				}
			}
		}
	}
	if equal == 0 || pairs < 500 || byIso < equal/2 || byBonds == 0 {
		t.Errorf("%d comparisons, %d of different candidates equal, %d shown by an isomorphism, %d told apart by bond types only: the test does not exercise every answer", pairs, equal, byIso, byBonds)
	}
	t.Logf("%d comparisons, %d of different candidates equal, %d shown by an isomorphism, %d told apart by bond types only", pairs, equal, byIso, byBonds)
}

// Kekulé structures of one compound (written from different atoms, or with the double
// bonds placed differently) get one bond invariant, as they get one canonical SMILES;
// compounds that differ in where a double bond sits get different ones (here; in general
// equal invariants can still hide different compounds, which same leaves to the canonical
// SMILES).
func TestBondInvariantKekule(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		same bool
	}{
		{"C1=CC=CC=C1C", "CC1=CC=CC=C1", true},
		{"C1=CC=C2C=CC=CC2=C1", "C1=CC2=CC=CC=C2C=C1", true}, // naphthalene, two structures
		{"C1=CC=C2C=CC=CC2=C1", "C1C=C2C=CC=CC2=CC=1", true}, // and the third
		{"OC1=CC=C(C=C1)C=O", "O=CC1=CC=C(O)C=C1", true},     // 4-hydroxybenzaldehyde
		{"C1CC2C=CC1C=C2", "C1CC2C=CC1C=C2", true},           // not alternating
		{"CC1=CCC(C)CC1", "CC1CC=C(C)CC1", true},             // renumbered
		{"C1=CC2CCC1C=C2", "C1=CC2C=CC1CC2", true},           // bicyclo[2.2.2]octa-2,5-diene
		{"C1=CCC=CC1", "C1=CC=CCC1", false},                  // 1,4- vs 1,3-cyclohexadiene
		{"C=C1CCC=C1", "CC1=CCC=C1", false},                  // exocyclic vs endocyclic
	} {
		ma, err := smiles.Parse(tc.a)
		if err != nil {
			t.Fatal(err)
		}
		mb, err := smiles.Parse(tc.b)
		if err != nil {
			t.Fatal(err)
		}
		canonSame := smiles.Canonical(ma) == smiles.Canonical(mb)
		if canonSame != tc.same {
			t.Fatalf("%s, %s: canonical SMILES equal = %v, the case says %v", tc.a, tc.b, canonSame, tc.same)
		}
		if got := bondInvariant(ma) == bondInvariant(mb); got != tc.same {
			t.Errorf("%s, %s: bond invariants equal = %v, want %v", tc.a, tc.b, got, tc.same)
		}
	}
}

// preferredGap (the side-channel shortcut) reports what Analyze reports for the preferred
// orientation: controlling gap in |β| and eV, site and score.
func TestPreferredGapMatchesAnalyze(t *testing.T) {
	o := testOptions(t)
	lib := testsupport.SyntheticLibrary(10, 10, 23)
	for _, ds := range lib.Dienes {
		d := mustPartner(t, ds.SMILES, RoleDiene, o)
		for _, es := range lib.Dienophiles {
			e := mustPartner(t, es.SMILES, RoleDienophile, o)
			p, err := Analyze(d, e, o)
			g, site, score, err2 := preferredGap(d, e, o)
			if (err == nil) != (err2 == nil) {
				t.Fatalf("%s + %s: errors %v / %v", ds.SMILES, es.SMILES, err, err2)
			}
			if err != nil {
				continue
			}
			if g != controllingGap(p) || site != p.Orientations[0].Site || score != p.Orientations[0].Score {
				t.Errorf("%s + %s: got %v %q %v, Analyze %v %q %v", ds.SMILES, es.SMILES, g, site, score,
					controllingGap(p), p.Orientations[0].Site, p.Orientations[0].Score)
			}
		}
	}
}
