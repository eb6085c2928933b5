package check

import (
	"slices"
	"testing"

	"cyclopair/fmo"
	"cyclopair/huckel"
	"cyclopair/huckel/ppp"
	"cyclopair/presets"
)

// TestValidatePPP records the bundled check set with PPP-SCF orbitals (Options.NewMethod,
// eV by Koopmans' theorem) beside the Hückel default, per category, and the cases where
// the two methods differ. This is the measurement that keeps Hückel the default
// (README, "π method"). With the site-specific frontier levels and pairing weights the
// regio cases agree (22 of 25 each); PPP gains site-06 (a Hückel known miss) but loses
// site-07 ((E)-1-methoxy-3-trimethylsilyloxy-1,3-butadiene + benzaldehyde with a Lewis acid); why each flips has not
// been examined yet. PPP also loses demand-05 (phenyl azide + styrene: PPP's Koopmans gaps are about three times wider in
// |β₀| than Hückel gaps, and the 0.15 |β| neutral band no longer covers the 0.6 |β₀|
// difference). Totals: Hückel 39 of 48, PPP 38 of 48; the rate series is ranked worse (ρ 0.77
// against 0.81). The test fails when any of these figures moves, so the README is kept
// in step.
func TestValidatePPP(t *testing.T) {
	set, hrep := runBundled(t)
	def, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	opts := *def
	pp, err := presets.PPPParams(presets.DefaultPPP)
	if err != nil {
		t.Fatal(err)
	}
	opts.NewMethod = ppp.Factory(pp)
	sc := pp.Scale()
	opts.Calibration, opts.CalibrationName = sc, sc.Name
	prep := Validate(set, &opts)
	if prep.Method != huckel.MethodPPP || hrep.Method != huckel.MethodHuckel {
		t.Fatalf("report methods %q, %q", prep.Method, hrep.Method)
	}
	want := map[string][2]int{ // category: {Hückel hits, PPP hits}
		CategoryRegio: {22, 22}, CategorySite: {6, 6}, CategoryEndo: {5, 5}, CategoryDemand: {6, 5},
	}
	for i, hc := range hrep.Categories {
		pc := prep.Categories[i]
		t.Logf("%-7s Hückel %2d/%2d, PPP %2d/%2d", hc.Category, hc.Hits, hc.Total, pc.Hits, pc.Total)
		if w, ok := want[hc.Category]; ok && (hc.Hits != w[0] || pc.Hits != w[1]) {
			t.Errorf("%s: hits Hückel %d, PPP %d; recorded %d, %d (update the README's method section)", hc.Category, hc.Hits, pc.Hits, w[0], w[1])
		}
		if pc.Errors != 0 {
			t.Errorf("%s: %d cases failed under PPP", pc.Category, pc.Errors)
		}
	}
	var differ []string
	for i, hc := range hrep.Cases {
		if hc.Hit != prep.Cases[i].Hit {
			differ = append(differ, hc.ID)
		}
	}
	if want := []string{"site-06", "site-07", "demand-05"}; !slices.Equal(differ, want) {
		t.Errorf("cases where the methods differ: %v, recorded %v", differ, want)
	}
	for _, s := range prep.Series {
		t.Logf("%s: PPP rho %.3f", s.ID, s.Rho)
	}
}
