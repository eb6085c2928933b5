package huckel_test

import (
	"errors"
	"math"
	"testing"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
)

// FuzzPerceive feeds arbitrary SMILES through Parse → Perceive → Solve: nothing may panic,
// and every solved system must keep its electron count and produce finite numbers.
func FuzzPerceive(f *testing.F) {
	for _, s := range []string{
		"C=CC=C", "c1ccccc1", "c1ccncc1", "C=CC=O", "C=C(C)C=C", "[N-]=[N+]=NC", "C=[N+]=[N-]",
		"CC#[N+][O-]", "C[N+]([O-])=C", "C=C[N+](=O)[O-]", "C=CC=[O+][B-](F)(F)F", "C=CC=[OH+]",
		"C=CC=[N+]1CCCC1", "C1=CC=C[CH-]1", "C=C[CH2+]", "CC(C)=C=C", "C=C=O", "O=C=O", "N#N",
		"CS(=O)(=O)C=C", "C=CB(O)O", "c1ccc2cccc2cc1", "N1=NN=NC=C1", "O=C1C=CC(=O)O1",
		"C=C.C=C", "[Na+].[O-]c1ccccc1", "C=C[Si](C)(C)C", "FC(F)=C(F)F", "IC=CBr", "C#CC#N",
		"[CH2-][N+](C)=C", "C=C[S-]", "CC(=S)C", "c1ccsc1", "c1cc[nH]c1", "c1ccoc1",
	} {
		f.Add(s)
	}
	p := defaultParams(f)
	f.Fuzz(func(t *testing.T, s string) {
		m, err := smiles.Parse(s)
		if err != nil {
			return
		}
		ps, err := huckel.Perceive(m, p)
		if err != nil {
			return
		}
		if len(ps.Centres) > 200 {
			return // keep each fuzz case fast
		}
		o, err := huckel.Solve(ps)
		if err != nil {
			return
		}
		occ := 0.0
		for _, l := range o.Levels {
			if math.IsNaN(l.X) || math.IsInf(l.X, 0) {
				t.Fatalf("%q: non-finite level %v", s, l.X)
			}
			occ += l.Occupancy
		}
		if math.Abs(occ-float64(ps.Electrons())) > 1e-9 {
			t.Fatalf("%q: occupancy %g for %d electrons", s, occ, ps.Electrons())
		}
		for i := range ps.Centres {
			if math.IsNaN(o.Charges[i]) {
				t.Fatalf("%q: NaN charge", s)
			}
		}
		if len(ps.Centres) > 0 {
			w := ps.Without(0)
			if _, err := huckel.Solve(w); err != nil && !errors.Is(err, huckel.ErrElectrons) {
				t.Fatalf("%q without centre 0: %v", s, err)
			}
		}
	})
}
