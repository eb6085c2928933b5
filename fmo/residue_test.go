package fmo

import (
	"math"
	"testing"
)

// TestResidueRouteMatchesAdduct: the second-adduct check assembled from the two partners'
// residues (residue.go) gives the check of the adduct itself — same skip or failure, gap
// and score to 1e-9 |β| (two sums of one set of fragment energies) — for dienes, dipoles and
// 2π partners with carbonyl, nitrile, nitro, azo and quinone groups. The adduct route is
// the reference: it prepares the whole adduct molecule as Analyze builds it. An alkyne's
// adduct keeps a C=C at the new bonds, so hyperconjugation joins its fragments across them:
// the residue route must decline it, as it declines an azide's triazoline (N=N at a
// terminus) and the follow-up cases (tetrazine).
func TestResidueRouteMatchesAdduct(t *testing.T) {
	dienes := []string{"C=CC=C", "C1=CCC=C1", "COC=CC=C", "CC(=C)C=C", "C=CC=CC(=O)OC", "c1ccc2cc3ccccc3cc2c1",
		"C1=COC=C1", "C=CC(=C)O[Si](C)(C)C", "[N-]=[N+]=NC", "C[N+]([O-])=CC1=CC=CC=C1", "C=CC=O", "COC(=O)c1nnc(C(=O)OC)nn1"}
	dienophiles := []string{"C=CC(=O)OC", "O=C1C=CC(=O)C=C1", "C=CC#N", "O=C1C=CC(=O)N1C", "CCOC(=O)N=NC(=O)OCC",
		"C=C[N+](=O)[O-]", "O=Cc1ccccc1", "C=CC=CC(=O)C", "COC(=O)C#CC(=O)OC", "C=COCC", "O=C1OC(=O)C=C1", "C=CC1=CC=CC=C1"}
	o := testOptions(t)
	used, declined := 0, 0
	eachPair(t, dienes, dienophiles, o, func(ds, es string, d, e *Partner) {
		row, err := AnalyzeDetail(d, e, o, DetailRow)
		if err != nil {
			return // no reacting pair (checked elsewhere)
		}
		or := &row.Orientations[0]
		got, ok := residueSide(d, or, "adduct", o, nil)
		if !ok {
			// Declined only where a terminus stays a core centre (the alkyne's C=C, the
			// triazoline's N=N of an azide) or follow-up steps rebuild the ring.
			declined++
			rd, re := residueOf(d, or.src.di, o), residueOf(e, or.src.ei, o)
			if !(rd.joins || re.joins || or.isolatedSteps) {
				t.Errorf("%s + %s: residue route declined (errors %v, %v)", ds, es, rd.err, re.err)
			}
			return
		}
		if es == "COC(=O)C#CC(=O)OC" {
			t.Errorf("%s + %s: residue route taken for an alkyne adduct", ds, es)
		}
		used++
		pm := or.isolated.Clone()
		pm.Name = "adduct"
		want := analyseSide(SideProductDienophile, "adduct as dienophile toward "+d.Name, d, pm, o)
		near := func(x, y float64) bool { return math.Abs(x-y) <= 1e-9 }
		if got.skip != want.skip || (got.failed == "") != (want.failed == "") ||
			!near(got.gap.Beta, want.gap.Beta) || !near(got.gap.EV, want.gap.EV) || !near(got.score, want.score) {
			t.Errorf("%s + %s: residues give %+v, the adduct %+v", ds, es, got, want)
		}
	})
	if used < 80 || declined < 12 {
		t.Errorf("residue route used %d times, declined %d: the test no longer covers both", used, declined)
	}
}

// eachPair prepares every diene of dienes with every dienophile of dienophiles (SMILES)
// and calls f with both.
func eachPair(t *testing.T, dienes, dienophiles []string, o *Options, f func(ds, es string, d, e *Partner)) {
	t.Helper()
	for _, ds := range dienes {
		d := mustPartner(t, ds, RoleDiene, o)
		for _, es := range dienophiles {
			f(ds, es, d, mustPartner(t, es, RoleDienophile, o))
		}
	}
}
