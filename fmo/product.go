package fmo

import (
	"slices"
	"strings"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// buildProduct assembles the cycloadduct of diene unit di with dienophile unit ei in
// orientation o from the UNACTIVATED partner molecules (Partner.Mol): the atoms are the
// diene's in their own order followed by the dienophile's (dienophile atom i becomes
// len(diene.Mol.Atoms)+i), the two new σ bonds are added, and each partner takes the
// Kekulé structure and charges derived for it by adductSide (termini sp3 with their
// hydrogens unchanged, the shifted double bond(s), aromatic rings elsewhere re-matched).
// A 1,2,4,5-tetrazine gives the bicyclic primary adduct, before the retro-Diels–Alder loss of
// N₂ that normally follows. Atom maps are cleared so the product SMILES is plain, and the
// directional bond marks (/ \) of the inputs are dropped: the cycloaddition moves the double
// bonds they referred to, and the tool does not model stereochemistry (the endo/exo question
// is answered separately), so a kept mark would describe a configuration nobody computed.
//
// bonds are the new σ bonds as [diene atom, dienophile atom] in each partner's own numbering.
func buildProduct(dp, ep *Partner, di, ei, o int) (m *molecule.Molecule, bonds [2][2]int) {
	ds, es := dp.sides[di], ep.sides[ei]
	off := len(dp.Mol.Atoms)
	m = &molecule.Molecule{Name: "adduct",
		Atoms: make([]molecule.Atom, 0, len(dp.Mol.Atoms)+len(ep.Mol.Atoms)),
		Bonds: make([]molecule.Bond, 0, len(dp.Mol.Bonds)+len(ep.Mol.Bonds)+2)}
	appendHalf(m, dp.Mol, ds, 0)
	appendHalf(m, ep.Mol, es, off)
	bonds = productBonds(dp.Units[di], ep.Units[ei], o)
	// the two new bonds last, then one adjacency build (the lists AddBond would give)
	m.Bonds = append(m.Bonds, molecule.Bond{A: bonds[0][0], B: bonds[0][1] + off, Order: 1},
		molecule.Bond{A: bonds[1][0], B: bonds[1][1] + off, Order: 1})
	m.Reindex()
	return m, bonds
}

// appendHalf appends src after reaction (side sd: product bond orders and charges) to m,
// its atoms numbered from offset, atom maps, aromatic flags and positions cleared: one
// partner's half of an adduct.
func appendHalf(m *molecule.Molecule, src *molecule.Molecule, sd *side, offset int) {
	for i, a := range src.Atoms {
		a.Charge = sd.charge[i]
		a.Map = 0
		a.Aromatic = false
		a.Pos = -1
		m.Atoms = append(m.Atoms, a)
	}
	for bi, b := range src.Bonds {
		m.Bonds = append(m.Bonds, molecule.Bond{A: b.A + offset, B: b.B + offset, Order: sd.orders[bi]})
	}
}

// half is partner p's half of its adducts through unit u, as a molecule of its own
// (indexed; the termini lack their new bonds).
func half(p *Partner, u int) *molecule.Molecule {
	m := &molecule.Molecule{Atoms: make([]molecule.Atom, 0, len(p.Mol.Atoms)), Bonds: make([]molecule.Bond, 0, len(p.Mol.Bonds))}
	appendHalf(m, p.Mol, p.sides[u], 0)
	m.Reindex()
	return m
}

// productBonds are the two new σ bonds of buildProduct, [diene atom, dienophile atom] in
// each partner's own numbering, without building the adduct.
func productBonds(du, eu Unit, o int) [2][2]int {
	a, d := du.Termini()
	x, y := eu.Atoms[0], eu.Atoms[1]
	if o == 1 {
		x, y = y, x
	}
	return [2][2]int{{a, x}, {d, y}}
}

// productSMILES writes a molecule for display (Kekulé form, atoms in partner order).
func productSMILES(m *molecule.Molecule) string { return smiles.Write(m) }

// productKey is the canonical SMILES of the adduct: equal for the two orientations of a
// symmetric partner and for symmetry-equivalent sites, so margins compare different adducts.
func productKey(m *molecule.Molecule) string { return smiles.Canonical(m) }

// regioLabel names the ortho/meta/para relationship of the adduct's two substituents, or ""
// when it does not apply. It applies to [4+2] adducts where each partner carries exactly one
// substituent on its reacting unit: a heavy atom bonded to a unit atom that is not itself in
// the unit (for a cyclic diene the ring atoms count, so cyclopentadiene never gets a label).
// The label is the distance, around the new six-membered ring a–b–c–d–y–x (a bonded to x, d
// to y), between the ring atom carrying the diene's substituent and the ring atom carrying the
// dienophile's: 1 = "ortho" (1,2-relationship), 2 = "meta" (1,3), 3 = "para" (1,4). So a
// 1-substituted diene gives ortho or meta, a 2-substituted diene meta or para.
func regioLabel(dp, ep *Partner, du, eu Unit, o int) string {
	if du.Kind != UnitDiene {
		return ""
	}
	sd := substituted(dp.Mol, du.Atoms)
	se := substituted(ep.Mol, eu.Atoms)
	if len(sd) != 1 || len(se) != 1 {
		return ""
	}
	x, y := eu.Atoms[0], eu.Atoms[1]
	if o == 1 {
		x, y = y, x
	}
	// ring positions 0..5: a b c d y x
	pos := -1
	for i, at := range du.Atoms {
		if at == sd[0] {
			pos = i
		}
	}
	epos := 5
	if se[0] == y {
		epos = 4
	}
	dist := epos - pos
	if dist < 0 {
		dist = -dist
	}
	if dist > 3 {
		dist = 6 - dist
	}
	switch dist {
	case 1:
		return "ortho"
	case 2:
		return "meta"
	case 3:
		return "para"
	}
	return ""
}

// substituted returns the unit atoms that carry a substituent, one entry per substituent.
func substituted(m *molecule.Molecule, unit []int) []int {
	var out []int
	for _, a := range unit {
		for _, e := range m.Neighbors(a) {
			if !slices.Contains(unit, e.To) && m.Atoms[e.To].Element != "H" {
				out = append(out, a)
			}
		}
	}
	return out
}

// productForms derives, for the adduct pm (canonical SMILES key) of units du and eu joined
// by bonds, the endo and exo stereo adducts, the follow-up steps and the isolated product.
// endoPref marks the endo adduct as preferred; the follow-up steps are those of the
// preferred adduct (of the endo one when neither is preferred: the steps do not depend on
// the configuration), and the isolated product keeps a configuration only where the two
// approaches agree on it or one approach is preferred.
func productForms(dp, ep *Partner, du, eu Unit, bonds [2][2]int, pm *molecule.Molecule, key string, endoPref bool) ([]StereoProduct, []FollowUpStep, string) {
	en := stereoAdduct(dp, ep, du, eu, bonds, pm, true)
	ex := stereoAdduct(dp, ep, du, eu, bonds, pm, false)
	es, xs := key, key
	if hasChiral(en) || hasChiral(ex) {
		es, xs = relativeStereo(en), relativeStereo(ex)
	}
	stereo := []StereoProduct{}
	switch {
	case es == xs && es != key:
		stereo = append(stereo, StereoProduct{Approach: ApproachSame, SMILES: es})
	case es != xs:
		stereo = append(stereo, StereoProduct{Approach: ApproachEndo, SMILES: es, Preferred: endoPref},
			StereoProduct{Approach: ApproachExo, SMILES: xs})
	}
	primary := key // the isolated product when nothing follows: the preferred stereo adduct where known
	for _, sp := range stereo {
		if sp.Preferred || sp.Approach == ApproachSame {
			primary = sp.SMILES
		}
	}
	if du.Kind != UnitDiene {
		return stereo, []FollowUpStep{}, primary
	}
	off := len(dp.Mol.Atoms)
	ring := []int{du.Atoms[0], du.Atoms[1], du.Atoms[2], du.Atoms[3], bonds[1][1] + off, bonds[0][1] + off}
	steps, endoFinal := followUp(en, ring)
	if len(steps) == 0 {
		return stereo, steps, primary
	}
	_, exoFinal := followUpSteps(ex, ring, false)
	iso := relativeStereo(endoFinal)
	if xi := relativeStereo(exoFinal); xi != iso && !endoPref {
		_, plain := followUpSteps(pm, ring, false)
		iso = smiles.Canonical(plain)
	}
	return stereo, steps, iso
}

// isolatedConstitution is the isolated product of adduct pm (built by buildProduct with
// bonds) without configuration: pm itself when no follow-up step applies, else the product
// of the steps (followUp on pm; the steps do not depend on the configuration). steps says
// whether any applied. Atoms stay in partner order.
func isolatedConstitution(dp *Partner, du Unit, bonds [2][2]int, pm *molecule.Molecule) (m *molecule.Molecule, steps bool) {
	if du.Kind != UnitDiene {
		return pm, false
	}
	off := len(dp.Mol.Atoms)
	ring := []int{du.Atoms[0], du.Atoms[1], du.Atoms[2], du.Atoms[3], bonds[1][1] + off, bonds[0][1] + off}
	st, plain := followUpSteps(pm, ring, false)
	if len(st) == 0 {
		return pm, false
	}
	return plain, true
}

// relativeStereo is the canonical SMILES of m's relative configuration: of the two mirror
// images (every Atom.Chiral inverted or not) the smaller smiles.CanonicalStereo string, so
// a racemate is one compound. Adducts of achiral partners form as racemates, and the two
// enantiomers of one relative configuration are one product.
func relativeStereo(m *molecule.Molecule) string {
	marks := 0
	for _, at := range m.Atoms {
		if at.Chiral != 0 {
			marks++
		}
	}
	if marks < 2 {
		return smiles.Canonical(m) // nothing to write: skip the two stereo searches
	}
	a, b := smiles.CanonicalStereoMirror(m) // m and its mirror image, one search
	if b < a {
		a = b
	}
	if strings.Count(a, "@")-strings.Count(a, "@@") < 2 {
		return smiles.Canonical(m) // one stereocentre: a racemate has no relative configuration
	}
	return a
}

// hasChiral reports whether any atom of m carries a configuration (at least two are needed
// for a relative configuration).
func hasChiral(m *molecule.Molecule) bool {
	n := 0
	for _, a := range m.Atoms {
		if a.Chiral != 0 {
			n++
		}
	}
	return n >= 2
}
