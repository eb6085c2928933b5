package fmo

import (
	"slices"

	"cyclopair/huckel"
)

// Reversibility. A Diels–Alder adduct whose 4π partner gave up an aromatic ring to react
// gets it back on retro-Diels–Alder, so such adducts revert at elevated temperature and,
// where endo and exo adducts interconvert through the free partners, the kinetic endo
// adduct equilibrates to the more stable exo adduct: furan + maleic anhydride gives the exo
// adduct under equilibrium (Lee and Herndon, J. Org. Chem. 1978, 43, 518; Rulíšek, Šebek,
// Havlas, Hrabal, Čapek and Svatoš, J. Org. Chem. 2005, 70, 6295; both from memory), and
// anthracene adducts crack back on heating (common practice, no source).
//
// The rule is read from the graph, not from names: the four atoms of the preferred 4π unit
// are all carbon and lie, consecutively, in one five- or six-membered ring of π centres
// carrying six π electrons (a Hückel 4n+2 ring: furan, pyrrole, thiophene — the heteroatom
// outside the unit — and the central ring of anthracene, a benzo ring). Units that hold a
// heteroatom (tetrazines, triazines, oxazoles) are left out: their primary adducts lose N₂
// or a nitrile instead of reverting. Cyclopentadiene (its CH2 is no π centre) is not flagged,
// although its dimer cracks too: that retro-reaction regains no aromaticity. Under an alkyl
// model that makes the CH2 a hyperconjugative pseudo-atom (huckel.Alkyl, 2 e) the ring has
// six π electrons on paper; an sp3 ring member is therefore never counted as aromatic.

// aromaticDieneRing returns the ring (atom indices) that makes the diene unit u a
// reversible aromatic 4π unit, or nil.
func aromaticDieneRing(p *Partner, u Unit) []int {
	if u.Kind != UnitDiene || len(u.Atoms) != 4 {
		return nil
	}
	for _, a := range u.Atoms {
		if p.Mol.Atoms[a].Element != "C" || p.Pi.CentreOf(a) < 0 {
			return nil
		}
	}
	a0, a3 := u.Atoms[0], u.Atoms[3]
	electrons := func(ring []int) int {
		n := 0
		for _, a := range ring {
			c := p.Pi.CentreOf(a)
			if c < 0 || p.Pi.Centres[c].Type == huckel.Alkyl {
				return -1 // an sp3 carbon (hyperconjugative pseudo-atom) breaks the ring
			}
			n += p.Pi.Centres[c].Electrons
		}
		return n
	}
	inUnit := func(x int) bool { return slices.Contains(u.Atoms, x) }
	for _, e := range p.Mol.Neighbors(a3) {
		x := e.To
		if inUnit(x) || p.Pi.CentreOf(x) < 0 {
			continue
		}
		if p.Mol.BondBetween(x, a0) >= 0 { // five-membered ring a0 a1 a2 a3 x
			ring := append(slices.Clone(u.Atoms), x)
			if electrons(ring) == 6 {
				return ring
			}
		}
		for _, f := range p.Mol.Neighbors(x) {
			y := f.To
			if y == a3 || inUnit(y) || p.Pi.CentreOf(y) < 0 || p.Mol.BondBetween(y, a0) < 0 {
				continue
			}
			ring := append(slices.Clone(u.Atoms), x, y) // six-membered ring
			if electrons(ring) == 6 {
				return ring
			}
		}
	}
	return nil
}

// reversibleNote is the note for a pair whose preferred diene unit is a reversible aromatic
// 4π unit; endo says whether the endo adduct is the predicted one.
func reversibleNote(endo bool) string {
	s := "the 4π partner regains an aromatic ring on retro-Diels–Alder, so the adduct can revert at elevated temperature (furan, pyrrole and anthracene-type adducts)"
	if endo {
		s += "; the kinetic endo adduct can equilibrate through the free partners to the more stable exo adduct (furan + maleic anhydride: Lee and Herndon, J. Org. Chem. 1978, 43, 518), so the endo verdict holds only for short times at low temperature"
	}
	return s
}
