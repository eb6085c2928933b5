package ppp_test

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"cyclopair/huckel"
	"cyclopair/huckel/ppp"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// residualClass sorts a π-level reference by the centre types of its π system: the
// classes in which PPP's Koopmans HOMO errors differ (acceptors first, so a molecule with
// both an acceptor and a donor counts as an acceptor).
func residualClass(ps *huckel.PiSystem) string {
	has := func(ts ...huckel.CentreType) bool {
		return slices.ContainsFunc(ps.Centres, func(c huckel.Centre) bool { return slices.Contains(ts, c.Type) })
	}
	charged := slices.ContainsFunc(ps.Centres, func(c huckel.Centre) bool { return c.FormalCharge != 0 })
	switch {
	case charged:
		return "charged or zwitterionic forms"
	case has("O=", "N=", "N#"):
		return "acceptors (C=O, aza N, C≡N)"
	case has("N:", "O:", "S:"):
		return "π donors (N:, O:, S:)"
	case has("F", "Cl", "Br", "I"):
		return "halogens"
	case has("Me"):
		return "alkyl pseudo-atoms (Me)"
	case has("C#"):
		return "sp carbon (alkynes, allene)"
	}
	return "hydrocarbons (C only)"
}

// TestIonisationResiduals is the diagnosis of the PPP HOMO figures of
// TestIonisationFigures: per-molecule residuals (PPP Koopmans HOMO − (−IE)) grouped by
// class, and the one offset no choice of β, γ_ij formula or geometry can remove.
//
// For a neutral alternant hydrocarbon PPP keeps the pairing theorem (A. D. McLachlan, Mol.
// Phys. 1959, 2, 271, from memory; TestAlternantPairing): the HOMO and LUMO lie symmetrically about
// U_C + γ_CC/2 = −(I_C + A_C)/2, −5.60 eV with the Hinze–Jaffé carbon data, whatever β,
// the γ_ij formula and the bond lengths. The measured midpoints (−IE + orbital energy of
// the LUMO reference)/2 of the hydrocarbons that have both references in
// presets/reference/pi-levels.yaml (gas-phase IEs, NIST; ETS attachment energies, K. D.
// Jordan, P. D. Burrow, Chem. Rev. 1987, 87, 557; anthracene's adiabatic EA) lie at
// −3.9 to −4.4 eV. So Koopmans PPP with valence-state carbon integrals puts both frontier
// levels of hydrocarbons 1.2–1.6 eV too low on average, and the HOMO figures cannot
// reach r² ≥ 0.9 as computed (no fit) by any general change of β, γ or geometry: a
// parameter set would have to move I_C + A_C itself away from the atomic valence-state
// values (the relaxation and correlation of the ions that Koopmans' theorem leaves out).
// The test checks that both facts still hold; the residual table is logged.
func TestIonisationResiduals(t *testing.T) {
	hp, pp := params(t)
	refs, err := presets.PiLevelReferences()
	if err != nil {
		t.Fatal(err)
	}
	c, err := ppp.Compare(refs, hp, pp)
	if err != nil {
		t.Fatal(err)
	}
	type cls struct {
		n          int
		sum, sumSq float64
	}
	classes := map[string]*cls{}
	var b strings.Builder
	homo := map[string]float64{} // SMILES → PPP HOMO
	lumoRef, homoRef := map[string]float64{}, map[string]float64{}
	for _, r := range c.Rows {
		m, err := smiles.Parse(r.Ref.SMILES)
		if err != nil {
			t.Fatal(err)
		}
		ps, err := huckel.Perceive(m, hp)
		if err != nil {
			t.Fatal(err)
		}
		if !r.Ref.Occupied {
			lumoRef[r.Ref.SMILES] = r.Ref.EnergyEV
			continue
		}
		homo[r.Ref.SMILES], homoRef[r.Ref.SMILES] = r.PPP, r.Ref.EnergyEV
		k := residualClass(ps)
		if classes[k] == nil {
			classes[k] = &cls{}
		}
		d := r.PPP - r.Ref.EnergyEV
		classes[k].n++
		classes[k].sum += d
		classes[k].sumSq += d * d
		fmt.Fprintf(&b, "%-5s %-28s %-32s IE %6.2f  PPP %7.2f  residual %+.2f\n", r.Ref.ID, r.Ref.Name, k, -r.Ref.EnergyEV, r.PPP, d)
	}
	keys := make([]string, 0, len(classes))
	for k := range classes {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	b.WriteString("by class (PPP HOMO − (−IE), eV):\n")
	mean := map[string]float64{}
	for _, k := range keys {
		v := classes[k]
		mean[k] = v.sum / float64(v.n)
		fmt.Fprintf(&b, "  %-32s N = %2d  mean %+.2f  RMSE %.2f\n", k, v.n, mean[k], math.Sqrt(v.sumSq/float64(v.n)))
	}
	b.WriteString("  charged or zwitterionic forms: no rows (the reference set holds no gas-phase π IE of a charged or zwitterionic π system)\n")
	t.Log("\n" + b.String())

	// The pairing midpoint against the measured midpoints.
	mid := pp.AlphaEV()
	for _, smi := range []string{"C=C", "C=CC=C", "c1ccccc1", "C=Cc1ccccc1", "c1ccc2ccccc2c1", "c1ccc2cc3ccccc3cc2c1"} {
		h, ok1 := homoRef[smi]
		l, ok2 := lumoRef[smi]
		if !ok1 || !ok2 {
			t.Fatalf("%s: no IE and EA pair in the reference set", smi)
		}
		s := ppp.NewSolver(pp)
		_, o := solve(t, smi, hp, s)
		pm := (o.Levels[o.HOMO].EV + o.Levels[o.LUMO].EV) / 2
		mm := (h + l) / 2
		t.Logf("%-22s PPP HOMO/LUMO midpoint %.2f eV (U_C + γ_CC/2 = %.2f), measured (−IE, LUMO reference) midpoint %.2f eV", smi, pm, mid, mm)
		if math.Abs(pm-mid) > coulsonTol {
			t.Errorf("%s: PPP midpoint %.4f eV is off U_C + γ_CC/2 = %.4f eV", smi, pm, mid)
		}
		if mm-pm < 1 {
			t.Errorf("%s: measured midpoint %.2f eV is now within 1 eV of PPP's %.2f eV: the diagnosis in this test and DEVELOPERS.md needs revisiting", smi, mm, pm)
		}
	}
	// The class findings the notes state: π donors (amine/ether N and O, two π electrons)
	// come out deeper than the hydrocarbons, and the methyl pseudo-atoms raise the HOMO by
	// less than measured (2,3-dimethyl-2-butene against ethylene).
	if d, hc := mean["π donors (N:, O:, S:)"], mean["hydrocarbons (C only)"]; !(d < hc) {
		t.Errorf("π-donor mean residual %+.2f eV is no longer below the hydrocarbons' %+.2f eV: update the notes", d, hc)
	}
	if calc, meas := homo["CC(C)=C(C)C"]-homo["C=C"], homoRef["CC(C)=C(C)C"]-homoRef["C=C"]; !(calc < meas) {
		t.Errorf("four methyls raise the PPP HOMO by %.2f eV, measured %.2f eV: the alkyl finding changed, update the notes", calc, meas)
	}
}
