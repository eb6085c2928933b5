package fmo

import "testing"

// TestSameAdductSound: whenever the partners' unit maps say two candidate adducts are one
// compound, their canonical SMILES are equal (the reference productKeys.same answers by),
// over every pair of candidates of symmetric and unsymmetric partners; and the shortcut
// does fire on the symmetric ones (the two orientations at maleimide, the equivalent C=C
// of p-benzoquinone, butadiene's termini).
func TestSameAdductSound(t *testing.T) {
	dienes := []string{"C=CC=C", "C1=CCC=C1", "COC=CC=C", "CC(=C)C=C", "c1ccc2cc3ccccc3cc2c1", "C1=COC=C1",
		"CC1=CC=C(C)O1", "[N-]=[N+]=NC", "C[N+]([O-])=CC1=CC=CC=C1", "COC(=O)c1nnc(C(=O)OC)nn1", "C=CC(C=C)=C"}
	dienophiles := []string{"C=CC(=O)OC", "O=C1C=CC(=O)C=C1", "O=C1C=CC(=O)N1C", "CCOC(=O)N=NC(=O)OCC", "C=C",
		"N#CC(C#N)=C(C#N)C#N", "COC(=O)/C=C/C(=O)OC", "O=Cc1ccccc1", "COC(=O)C#CC(=O)OC", "C=CC=C", "O=C1C(Cl)=CC(=O)C=C1"}
	o := testOptions(t)
	fired, checked := 0, 0
	eachPair(t, dienes, dienophiles, o, func(ds, es string, d, e *Partner) {
		var ids [][3]int
		for di := range d.Units {
			for ei := range e.Units {
				ids = append(ids, [3]int{di, ei, 0}, [3]int{di, ei, 1})
			}
		}
		key := make([]string, len(ids))
		for k, id := range ids {
			pm, _ := buildProduct(d, e, id[0], id[1], id[2])
			key[k] = productKey(pm)
		}
		for i, a := range ids {
			for j, b := range ids {
				if !sameAdduct(d, e, a[0], a[1], a[2], b[0], b[1], b[2]) {
					continue
				}
				checked++
				if i != j {
					fired++
				}
				if key[i] != key[j] {
					t.Errorf("%s + %s: candidates %v and %v called one adduct, canonical SMILES %s and %s", ds, es, a, b, key[i], key[j])
				}
			}
		}
	})
	if fired < 200 {
		t.Errorf("the unit maps proved only %d pairs of distinct candidates equal (%d checked)", fired, checked)
	}
}
