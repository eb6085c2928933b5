package fmo

import (
	"math"
	"testing"

	"cyclopair/huckel"
	"cyclopair/huckel/ppp"
	"cyclopair/presets"
)

// pppOptions are the default options with PPP-SCF orbitals and the exact Koopmans map.
func pppOptions(t testing.TB) (*Options, *ppp.Params) {
	t.Helper()
	opts, err := DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	pp, err := presets.PPPParams(presets.DefaultPPP)
	if err != nil {
		t.Fatal(err)
	}
	o := *opts
	o.NewMethod = ppp.Factory(pp)
	sc := pp.Scale()
	o.Calibration, o.CalibrationName = sc, sc.Name
	return &o, pp
}

// TestMethodThroughOptions: Options.NewMethod reaches every partner, the pair reports the
// method, the eV figures of the analysis are the PPP orbital energies themselves (the
// Direct map inverts the x scale exactly), and the localisation energy is the Hückel one
// under both methods (Partner.localization).
func TestMethodThroughOptions(t *testing.T) {
	const evTol = 1e-9 // eV: the Direct map is exact up to rounding
	hop, err := DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	pop, pp := pppOptions(t)
	build := func(o *Options) (*Partner, *Partner, *Pair) {
		d, err := NewPartner("butadiene", "C=CC=C", RoleDiene, o)
		if err != nil {
			t.Fatal(err)
		}
		e, err := NewPartner("acrolein", "C=CC=O", RoleDienophile, o)
		if err != nil {
			t.Fatal(err)
		}
		p, err := Analyze(d, e, o)
		if err != nil {
			t.Fatal(err)
		}
		return d, e, p
	}
	hd, he, hpair := build(hop)
	pd, pe, ppair := build(pop)
	if hpair.Method != huckel.MethodHuckel || ppair.Method != huckel.MethodPPP {
		t.Errorf("pair methods %q, %q; want huckel, ppp", hpair.Method, ppair.Method)
	}
	if pd.Orb.Method != huckel.MethodPPP || !pd.Orb.EVDirect {
		t.Fatalf("PPP partner orbitals: method %q, EVDirect %v", pd.Orb.Method, pd.Orb.EVDirect)
	}
	// The normal gap in eV is LUMO(acrolein) − HOMO(butadiene) straight from the SCF.
	s := ppp.NewSolver(pp)
	var od, oe huckel.Orbitals
	if err := s.Solve(pd.Pi, &od); err != nil {
		t.Fatal(err)
	}
	if err := s.Solve(pe.Pi, &oe); err != nil {
		t.Fatal(err)
	}
	want := oe.Levels[oe.LUMO].EV - od.Levels[od.HOMO].EV
	if math.Abs(ppair.GapNormal.EV-want) > evTol {
		t.Errorf("PPP gap_normal.ev %.6f, Koopmans difference %.6f", ppair.GapNormal.EV, want)
	}
	for i := range hd.data {
		if math.Abs(hd.data[i].loc-pd.data[i].loc) > 1e-9 {
			t.Errorf("diene unit %d: localisation %.6f (Hückel) vs %.6f (PPP run): should be the Hückel value", i, hd.data[i].loc, pd.data[i].loc)
		}
	}
	for i := range he.data {
		if math.Abs(he.data[i].loc-pe.data[i].loc) > 1e-9 {
			t.Errorf("dienophile unit %d: localisation differs between methods", i)
		}
	}
}

// TestLewisAcidLoweringKnownMiss records the LUMO lowering of acrolein and methyl acrylate
// by Lewis-acid complexation (BF₃ standing for the acid, as Activate draws it) and by
// iminium formation (acrolein only), through the pair analysis (Pair.Activated.LUMOLowering.EV), with
// both methods. Comparison: K. N. Houk, R. W. Strozier, J. Am. Chem. Soc. 1973, 95, 4094
// (CNDO/2 on Lewis-acid-complexed and protonated acrolein): a Lewis acid lowers the LUMO by
// roughly 1–1.5 eV (the summary of semi-empirical complexes; from memory).
//
// Measured (default sets): Hückel 0.47 eV (acrolein) and 0.40 eV (methyl acrylate), below
// that range; PPP 3.1 and 3.2 eV, above it. Both are documented known misses: the Hückel
// one because h(O=LA) is a modest shift of one Coulomb integral, the PPP one because the
// O=LA centre (an assumed half-way point between C=O and protonated O in ip, γ and core
// charge; presets/ppp/ppp-hinze1962.yaml) carries 1.5 core charges with no counter-charge
// on the acid. No published PPP parameter for a Lewis-acid-bound carbonyl O was at hand,
// so the assumption stands; it is not tuned to the 1–1.5 eV figure. The test fails when
// either figure moves into the comparison range, so the record gets updated.
func TestLewisAcidLoweringKnownMiss(t *testing.T) {
	const lo, hi = 1.0, 1.5 // eV, Houk & Strozier 1973 (from memory)
	hop, err := DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	pop, _ := pppOptions(t)
	diene := func(o *Options) *Partner {
		d, err := NewPartner("butadiene", "C=CC=C", RoleDiene, o)
		if err != nil {
			t.Fatal(err)
		}
		return d
	}
	for _, tc := range []struct {
		name, smi string
		modes     []string
	}{
		{"acrolein", "C=CC=O", []string{ActivateLewis, ActivateIminium}},
		{"methyl acrylate", "C=CC(=O)OC", []string{ActivateLewis}}, // an ester forms no iminium
	} {
		lower := map[string]map[string]float64{}
		for _, m := range []struct {
			name string
			o    *Options
		}{{huckel.MethodHuckel, hop}, {huckel.MethodPPP, pop}} {
			e, err := NewPartner(tc.name, tc.smi, RoleDienophile, m.o)
			if err != nil {
				t.Fatal(err)
			}
			lower[m.name] = map[string]float64{}
			for _, v := range AnalyzeVariants(diene(m.o), e, tc.modes, nil, m.o) {
				if v.Err != nil {
					t.Fatalf("%s %s %s: %v", tc.name, m.name, v.Mode, v.Err)
				}
				lower[m.name][v.Mode] = v.Pair.Activated.LUMOLowering.EV
			}
		}
		t.Logf("%s LUMO lowering: Lewis acid Hückel %.2f eV, PPP %.2f eV (Houk & Strozier 1973: %.1f–%.1f eV); iminium Hückel %.2f eV, PPP %.2f eV (0 = not formed)",
			tc.name, lower["huckel"]["lewis"], lower["ppp"]["lewis"], lo, hi, lower["huckel"]["iminium"], lower["ppp"]["iminium"])
		if h := lower["huckel"]["lewis"]; !(h > 0 && h < lo) {
			t.Errorf("%s: Hückel Lewis-acid lowering %.2f eV: the known miss (below %.1f eV) changed: update this record", tc.name, h, lo)
		}
		if p := lower["ppp"]["lewis"]; !(p > hi) {
			t.Errorf("%s: PPP Lewis-acid lowering %.2f eV: the known miss (above %.1f eV) changed: update this record", tc.name, p, hi)
		}
		for _, m := range []string{"huckel", "ppp"} {
			if v, ok := lower[m]["iminium"]; ok && v <= 0 {
				t.Errorf("%s: %s iminium formation does not lower the LUMO (%.2f eV)", tc.name, m, lower[m]["iminium"])
			}
		}
	}
}
