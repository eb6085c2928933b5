package fmo

import (
	"math"
	"testing"
)

// TestLewisAcidAldehydeReactsAtCO: (E)-1-methoxy-3-trimethylsilyloxy-1,3-butadiene
// and benzaldehyde under Lewis-acid catalysis give the hetero-Diels–Alder
// adduct at the C=O (the dihydropyranone precursor), never an adduct across the benzene ring
// (S. Danishefsky, T. Kitahara, J. Am. Chem. Soc. 1974, 96, 7807; S. Danishefsky,
// J. F. Kerwin, S. Kobayashi, J. Am. Chem. Soc. 1982, 104, 358). Two parts of the model carry
// it: the Lewis acid's shift of the O Coulomb integral is credited to the σ electron of the O
// terminus, and an arene C=C pays its ring's whole delocalisation energy.
func TestLewisAcidAldehydeReactsAtCO(t *testing.T) {
	o := testOptions(t)
	d := mustPartner(t, "COC=CC(=C)O[Si](C)(C)C", RoleDiene, o)
	e := mustPartner(t, "O=Cc1ccccc1", RoleDienophile, o)
	for _, mode := range []string{ActivateNone, ActivateLewis} {
		ea, err := e.WithActivation(mode, nil, o)
		if err != nil {
			t.Fatal(err)
		}
		p, err := Analyze(d, ea, o)
		if err != nil {
			t.Fatal(err)
		}
		at := p.Orientations[0].DienophileAtoms
		if !(at[0] == 0 && at[1] == 1 || at[0] == 1 && at[1] == 0) {
			t.Errorf("%s: preferred dienophile atoms %v (%s), want the C=O (0, 1)", mode, at, p.PreferredSite)
		}
	}
}

// TestBenzenoidLocalisation: an arene C=C as a 2π unit costs the ring's whole delocalisation
// energy. Benzene: E_π = 8|β|; with C1, C2 sp3 the two remaining C=C count as localised
// (2 × 2|β|), so L = 4|β| (closed form), not the plain Hückel 8 − 4.472 = 3.528 |β| that
// credits the cyclohexadiene with a butadiene's delocalisation (Dewar & de Llano, J. Am. Chem.
// Soc. 1969, 91, 789; Hess & Schaad, J. Am. Chem. Soc. 1971, 93, 305: acyclic conjugation is
// the non-aromatic reference). Benzene's para-localisation as a 4π unit stays 8 − 4 = 4|β|
// (R. D. Brown, J. Chem. Soc. 1950, 3249, para-localisation energies; from memory), and
// naphthalene, whose remnant atoms stay in an intact ring, keeps the plain Hückel value.
func TestBenzenoidLocalisation(t *testing.T) {
	o := testOptions(t)
	const tol = 1e-6 // closed forms, |β|
	e := mustPartner(t, "c1ccccc1", RoleDienophile, o)
	for i, u := range e.Units {
		if got := e.data[i].loc; math.Abs(got-4) > tol {
			t.Errorf("benzene 2π unit %v: L = %.6f, want 4", u.Atoms, got)
		}
	}
	d := mustPartner(t, "c1ccccc1", RoleDiene, o)
	for i, u := range d.Units {
		if got := d.data[i].loc; math.Abs(got-4) > tol {
			t.Errorf("benzene 4π unit %v: L = %.6f, want 4", u.Atoms, got)
		}
	}
	// naphthalene C1=C2 (atoms 2, 1 of c1ccc2ccccc2c1): plain Hückel, the fused ring is left
	// alone; the rest is a styrene: E_π(naphthalene) − E_π(styrene) = 13.683 − 10.424 |β|
	// (C. A. Coulson, A. Streitwieser, Dictionary of π-Electron Calculations, 1965; from memory).
	n := mustPartner(t, "c1ccc2ccccc2c1", RoleDienophile, o)
	plain := 13.683 - 10.424
	for i, u := range n.Units {
		if u.Atoms[0] == 1 && u.Atoms[1] == 2 {
			if got := n.data[i].loc; math.Abs(got-plain) > 2e-3 {
				t.Errorf("naphthalene C1=C2: L = %.4f, want the plain Hückel %.4f", got, plain)
			}
		}
	}
}

// TestMethoxyQuinoneSite: 2-methoxy-p-benzoquinone adds butadiene at its unsubstituted C=C;
// the methoxy-bearing C=C is a vinylogous ester and is deactivated (common textbook example,
// e.g. J. Sauer, Angew. Chem. Int. Ed. Engl. 1966, 5, 211; from memory). In this clearly
// normal-demand pair only the LUMO(quinone) pairing counts (pairingWeights); the quinone
// HOMO, which sits on the methoxy-bearing C=C, no longer decides the site.
func TestMethoxyQuinoneSite(t *testing.T) {
	o := testOptions(t)
	d := mustPartner(t, "C=CC=C", RoleDiene, o)
	e := mustPartner(t, "COC1=CC(=O)C=CC1=O", RoleDienophile, o)
	p, err := Analyze(d, e, o)
	if err != nil {
		t.Fatal(err)
	}
	at := p.Orientations[0].DienophileAtoms
	if !(min(at[0], at[1]) == 6 && max(at[0], at[1]) == 7) {
		t.Errorf("preferred dienophile atoms %v (%s), want the unsubstituted C=C (6, 7)", at, p.PreferredSite)
	}
	if p.Demand != "normal" {
		t.Errorf("demand %s, want normal", p.Demand)
	}
}

// TestTetrazineEnolEtherRanksAboveAcceptorAlkenes: dimethyl 1,2,4,5-tetrazine-3,6-
// dicarboxylate reacts with electron-rich alkenes (ethyl vinyl ether) far faster than with
// electron-poor ones (methyl acrylate, N-phenylmaleimide, cinnamaldehyde): inverse electron
// demand (J. Sauer, D. K. Heldmann, J. Hetzenegger, J. Krauthan, H. Sichert, J. Schuster,
// Eur. J. Org. Chem. 1998, 2885; D. L. Boger, Chem. Rev. 1986, 86, 781). The ranking score
// must order them so, through both Analyze and QuickScore, and the phenyl ring of
// N-phenylmaleimide or cinnamaldehyde must not supply the dienophile HOMO of the pair.
func TestTetrazineEnolEtherRanksAboveAcceptorAlkenes(t *testing.T) {
	o := testOptions(t)
	tz := mustPartner(t, "COC(=O)c1nnc(C(=O)OC)nn1", RoleDiene, o)
	score := func(smi string) (float64, *Pair) {
		e := mustPartner(t, smi, RoleDienophile, o)
		p, err := Analyze(tz, e, o)
		if err != nil {
			t.Fatal(err)
		}
		q := QuickScore(tz, e, o)
		if q.Best != p.Orientations[0].Score {
			t.Errorf("%s: QuickScore %v, Analyze %v", smi, q.Best, p.Orientations[0].Score)
		}
		return p.Orientations[0].Score, p
	}
	eve, pe := score("C=COCC")
	if pe.Demand != "inverse" {
		t.Errorf("tetrazine + ethyl vinyl ether: demand %s, want inverse", pe.Demand)
	}
	for _, smi := range []string{"C=CC(=O)OC", "O=C1C=CC(=O)N1c1ccccc1", "O=C/C=C/c1ccccc1"} {
		s, p := score(smi)
		if s >= eve {
			t.Errorf("tetrazine + %s scores %.4f, not below ethyl vinyl ether %.4f", smi, s, eve)
		}
		if p.Demand != "inverse" && p.Demand != "neutral" {
			t.Errorf("tetrazine + %s: demand %s, want inverse or neutral", smi, p.Demand)
		}
	}
}

// TestUnitFrontierSkipsRemoteRing: in N-phenylmaleimide the top occupied π level lies on the
// phenyl ring with little amplitude at the maleimide C=C; the reacting unit's HOMO is a lower
// level that lives on the C=C (superdelocalizability criterion, unitFrontier; the FERMO
// argument of da Silva et al., J. Phys. Chem. A 2006, 110, 1031). Checked here by its
// definition: the chosen level has a larger c² at the C=C than the molecule's HOMO.
func TestUnitFrontierSkipsRemoteRing(t *testing.T) {
	o := testOptions(t)
	e := mustPartner(t, "O=C1C=CC(=O)N1c1ccccc1", RoleDienophile, o)
	w := func(level int) float64 {
		c0, c1 := e.Orb.Coefficient(level, 2), e.Orb.Coefficient(level, 3)
		return c0*c0 + c1*c1
	}
	for i, u := range e.Units {
		if u.Atoms[0] != 2 || u.Atoms[1] != 3 {
			continue
		}
		h := e.data[i].homo.Level
		if h == e.Orb.HOMO {
			t.Fatalf("C=C unit uses the molecule's HOMO (weight %.3f at the C=C)", w(h))
		}
		if w(h) <= w(e.Orb.HOMO) {
			t.Errorf("unit HOMO %d has weight %.3f at the C=C, not above the molecule HOMO's %.3f", h, w(h), w(e.Orb.HOMO))
		}
		return
	}
	t.Fatal("no C2=C3 unit in N-phenylmaleimide")
}
