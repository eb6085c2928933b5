package fmo

import (
	"math"
	"testing"

	"cyclopair/huckel/smiles"
)

// TestIsolatedConstitutionMatchesProductForms: isolatedConstitution (the adduct the
// side-channel check analyses, without any stereo search) has the constitution of
// productForms' isolated product for every candidate orientation of the follow-up and stereo
// cases (tetrazines, triazine, pyrones, cyclic dienes with endo/exo questions, maleate and
// fumarate, a dipole), with and without an endo preference; and AnalyzeDetail at DetailRow
// keeps the full analysis's preferred product and side channels while skipping the stereo
// forms, follow-up steps and isolated product SMILES.
func TestIsolatedConstitutionMatchesProductForms(t *testing.T) {
	pairs := append([][2]string{
		{"COC(=O)c1nnc(C(=O)OC)nn1", "C=COCC"},
		{"COC(=O)c1nnc(C(=O)OC)nn1", "C=CCCCC"},
		{"COC(=O)c1nnc(C(=O)OC)nn1", `C/C=C\C(=O)OC`},
		{"c1cnncn1", "CC(=C)N1CCCC1"},
		{"O=c1cccco1", "C#CC(=O)OC"},
		{"O=c1cccco1", "C=COC"},
		{"O=c1cccco1", `C/C=C/C(=O)OC`},
		{"C=CC=C", `COC(=O)/C=C\C(=O)OC`},
		{"C=CC=C", `COC(=O)/C=C/C(=O)OC`},
		{`C/C=C/C=C`, "C=CC(=O)OC"},
		{"[N-]=[N+]=NC", "C=CC(=O)OC"},
	}, stereoPairs...)
	o := testOptions(t)
	checked := 0
	for _, pr := range pairs {
		d := mustPartner(t, pr[0], RoleDiene, o)
		e := mustPartner(t, pr[1], RoleDienophile, o)
		for di, du := range d.Units {
			for ei, eu := range e.Units {
				for or := range 2 {
					pm, bonds := buildProduct(d, e, di, ei, or)
					key := productKey(pm)
					iso, steps := isolatedConstitution(d, du, bonds, pm)
					got := smiles.Canonical(iso)
					for _, endoPref := range []bool{false, true} {
						_, fu, want := productForms(d, e, du, eu, bonds, pm, key, endoPref)
						wm, err := smiles.Parse(want)
						if err != nil {
							t.Fatal(err)
						}
						if w := smiles.Canonical(wm); got != w || steps != (len(fu) > 0) {
							t.Errorf("%s + %s units %d/%d orientation %d endoPref %v: isolatedConstitution %s (steps %v), productForms %s (%d steps)",
								pr[0], pr[1], di, ei, or, endoPref, got, steps, w, len(fu))
						}
						checked++
					}
				}
			}
		}
		full, err := AnalyzeDetail(d, e, o, DetailAll)
		if err != nil {
			t.Fatal(err)
		}
		row, err := AnalyzeDetail(d, e, o, DetailRow)
		if err != nil {
			t.Fatal(err)
		}
		f, r := full.Orientations[0], row.Orientations[0]
		if r.Product != f.Product || r.IsolatedProduct != "" || r.StereoProducts != nil || r.FollowUp != nil {
			t.Errorf("%s + %s: DetailRow preferred %q/%q (stereo %v, steps %v), full %q",
				pr[0], pr[1], r.Product, r.IsolatedProduct, r.StereoProducts, r.FollowUp, f.Product)
		}
		fs, rs := SideChannels(d, e, full, o), SideChannels(d, e, row, o)
		if len(fs) != len(rs) {
			t.Fatalf("%s + %s: %d side channels at DetailRow, %d in full", pr[0], pr[1], len(rs), len(fs))
		}
		for i := range fs {
			// The same π system with its centres in another order: equal to rounding.
			if fs[i].Kind != rs[i].Kind || !SameSideChannel(fs[i], rs[i]) {
				t.Errorf("%s + %s: side channel %d at DetailRow %+v, full %+v", pr[0], pr[1], i, rs[i], fs[i])
			}
		}
	}
	if checked < 100 {
		t.Errorf("only %d orientations checked", checked)
	}
}

// SameSideChannel reports whether two side channels agree in kind, verdict and figures to
// 1e-9 |β| (the DetailRow and full routes solve one π system in two atom orders).
func SameSideChannel(a, b SideChannel) bool {
	near := func(x, y float64) bool { return math.Abs(x-y) <= 1e-9 }
	return a.Kind == b.Kind && a.Competes == b.Competes && near(a.Gap.Beta, b.Gap.Beta) && near(a.Gap.EV, b.Gap.EV) &&
		near(a.Margin, b.Margin) && near(a.ScoreMargin, b.ScoreMargin) && (a.Note == "") == (b.Note == "")
}
