package fmo

import "testing"

// TestIsolatedProductMatchesProductForms: isolatedProduct (DetailRow's isolated product, with
// only the stereo searches that decide it) gives productForms' third result for every
// candidate orientation of the follow-up and stereo cases (tetrazines, triazine, pyrones,
// cyclic dienes with endo/exo questions, maleate and fumarate, a dipole), with and without
// an endo preference; and AnalyzeDetail at DetailRow keeps the full analysis's preferred
// product and isolated product.
func TestIsolatedProductMatchesProductForms(t *testing.T) {
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
					for _, endoPref := range []bool{false, true} {
						_, _, want := productForms(d, e, du, eu, bonds, pm, key, endoPref)
						if got := isolatedProduct(d, e, du, eu, bonds, pm, key, endoPref); got != want {
							t.Errorf("%s + %s units %d/%d orientation %d endoPref %v: isolatedProduct %s, productForms %s",
								pr[0], pr[1], di, ei, or, endoPref, got, want)
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
		if r.Product != f.Product || r.IsolatedProduct != f.IsolatedProduct || r.StereoProducts != nil || r.FollowUp != nil {
			t.Errorf("%s + %s: DetailRow preferred %q/%q (stereo %v, steps %v), full %q/%q",
				pr[0], pr[1], r.Product, r.IsolatedProduct, r.StereoProducts, r.FollowUp, f.Product, f.IsolatedProduct)
		}
	}
	if checked < 100 {
		t.Errorf("only %d orientations checked", checked)
	}
}
