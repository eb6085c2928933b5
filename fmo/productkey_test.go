package fmo

import (
	"slices"
	"testing"

	"cyclopair/fmo/internal/testsupport"
	"cyclopair/huckel/molecule"
)

// The invariant pre-check never changes an answer of the canonical-SMILES comparison: for
// every candidate adduct pair of a set of real and synthetic partners (symmetric ones such as
// butadiene, cyclopentadiene, maleic anhydride and p-benzoquinone included, where
// orientations give the same adduct), same(i, j) equals canonical(i) == canonical(j), and
// every isomorphism the shortcut of same accepts joins adducts with equal canonical SMILES.
func TestProductKeysAgreeWithCanonical(t *testing.T) {
	o := testOptions(t)
	dienes := []string{"C=CC=C", "C1=CCC=C1", "CC(=C)C=C", "COC=CC=C", "c1ccoc1", "C=CC(=C)C=C"}
	dphs := []string{"C=CC=O", "O=C1OC(=O)C=C1", "O=C1C=CC(=O)C=C1", "C=C", "N#CC=CC#N", "C=CC(=O)C=C"}
	lib := testsupport.SyntheticLibrary(12, 12, 21)
	for _, s := range lib.Dienes {
		dienes = append(dienes, s.SMILES)
	}
	for _, s := range lib.Dienophiles {
		dphs = append(dphs, s.SMILES)
	}
	pairs, equal, byIso := 0, 0, 0
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
	if equal == 0 || pairs < 500 || byIso < equal/2 {
		t.Errorf("%d comparisons, %d of different candidates equal, %d shown by an isomorphism: the test does not exercise every answer", pairs, equal, byIso)
	}
	t.Logf("%d comparisons, %d of different candidates equal, %d shown by an isomorphism", pairs, equal, byIso)
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
