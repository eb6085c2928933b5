package smiles

import "cyclopair/huckel/molecule"

// This file exports the chemistry of the reader for other structure-file readers (package
// huckel/molfile), so that a molecule read from a file gets exactly the valences and the
// Kekulé structure Parse would give it.

// DefaultValences returns the default valences of an organic-subset element (B C N O P S F
// Cl Br I), the list from which Parse takes the implicit hydrogens of an atom written without
// brackets (the smallest valence at least the sum of its bond orders); nil for any other
// element. The slice is shared: do not modify it.
func DefaultValences(element string) []int { return organicVals(element) }

// AllowedValences returns the valences (bond orders plus hydrogens) Parse accepts for a
// bracket atom of the given element and charge, smallest first: those of the isoelectronic
// neutral element (N+ bonds like C, O+ like N, C- like N, B- like C), period-2 atoms
// keeping the octet and heavier ones expanding by twos. checked is false for elements the
// reader does not check (metals, noble gases); ok is false when the charge is impossible
// for the element (C+5). The slice is shared: do not modify it.
func AllowedValences(element string, charge int) (vals []int, checked, ok bool) {
	return allowedValences(element, charge)
}

// RingBonds reports for every bond of m whether it lies in a ring (is not a bridge of the
// graph).
func RingBonds(m *molecule.Molecule) []bool {
	return ringBondsInto(m, make([]bool, len(m.Bonds)))
}

// Kekulize gives the bonds of m flagged Aromatic a Kekulé structure with the matcher Parse
// uses (a greedy pass completed by Edmonds' blossom algorithm): every atom with need[i]
// (len(need) == len(m.Atoms)) gets exactly one double bond among its aromatic bonds to
// other such atoms, and every other aromatic bond becomes single. Bonds not flagged
// Aromatic are left alone. It returns -1 on success, or the index of an atom with need set
// that no Kekulé structure can serve (the orders are then unspecified). need is not
// modified.
func Kekulize(m *molecule.Molecule, need []bool) int {
	if len(need) != len(m.Atoms) {
		panic("smiles: Kekulize: need has the wrong length")
	}
	return kekulise(m, need, nil)
}

// AromaticSystem returns, in index order, the atoms with need set that are joined to start
// through aromatic bonds between such atoms: the conjugated system a failed kekulisation
// names in its message.
func AromaticSystem(m *molecule.Molecule, need []bool, start int) []int {
	return aromaticSystem(m, need, start)
}

// BondTypes returns the bond types Canonical ranks by, one per bond of m: the Kekulé order
// (1–3), or 4 for a bond whose order may differ between Kekulé structures of m (a bond of
// the alternation graph described at Canonical). Every Kekulé structure of a molecule gets
// the same types, so two molecules with equal canonical SMILES have the same graph with
// these bond labels; a finer test than the graph without bond orders that never tells
// apart what Canonical takes as equal.
func BondTypes(m *molecule.Molecule) []int8 {
	t, _ := alternation(m)
	return t
}
