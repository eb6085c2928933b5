package huckel

import (
	"fmt"
	"strings"

	"cyclopair/huckel/errtext"
	"cyclopair/huckel/molecule"
)

// nonMetals are the elements that are not metals (hydrogen, the noble gases, the
// non-metals and the metalloids B Si Ge As Sb Te): without π parameters they are σ
// substituents (SiMe3, PPh2, SeR …) and stay outside the π system without a warning, as
// alkyl groups do in the set without the hyperconjugation model.
var nonMetals = map[string]bool{
	"H": true, "He": true, "B": true, "C": true, "N": true, "O": true, "F": true, "Ne": true,
	"Si": true, "P": true, "S": true, "Cl": true, "Ar": true, "Ge": true, "As": true, "Se": true,
	"Br": true, "Kr": true, "Sb": true, "Te": true, "I": true, "Xe": true, "At": true, "Rn": true,
}

// isMetal reports whether el is outside nonMetals (the organic elements answer without
// a map lookup: this runs for every atom of every molecule).
func isMetal(el string) bool {
	switch el {
	case "C", "H", "N", "O", "S", "F", "Cl", "Br", "I", "B", "P", "Si":
		return false
	}
	return !nonMetals[el]
}

// warnParts adds the warnings about what the π system leaves out of the input. They are
// warnings, not errors, because the input is chemically sensible and the π result of the
// rest is still what the user asked for; they say what was left out so nothing is silent.
//
//   - A metal atom (any element outside nonMetals) is outside every π type. Unless it is
//     the Lewis acid of an O=LA centre (C=CC=[O+][Al-](Cl)(Cl)Cl, the modelled form) or a
//     dropped-multiple-bond warning already names it, a warning names the atom and its
//     column and says that its orbitals, charge and inductive effect are not modelled.
//     For the Lewis-acid metals (B, Al, Ti, Sn, Zn, lanthanides …) it points to the
//     modelled ways: activating the free dienophile (--activate lewis) or binding the
//     metal to the carbonyl O.
//   - Several molecules in one input (dot-separated, not joined by a ring bond): parts
//     without π centres (counter-ions, salts, solvent) are named as left out, with the
//     part the π system comes from; when several parts have π centres, the warning says
//     that they are solved side by side without interaction, that HOMO and LUMO are taken
//     over all of them, and that each may supply reacting units.
func (ps *PiSystem) warnParts(st []atomState) {
	m := ps.Mol
	n := len(m.Atoms)
	if n == 0 {
		return
	}
	// Connected parts of the molecular graph, numbered in order of their first atom; the
	// work space lives in st, so a connected molecule costs no allocation.
	for i := range st {
		st[i].part = -1
	}
	nparts := int32(0)
	for s := 0; s < n; s++ {
		if st[s].part >= 0 {
			continue
		}
		st[s].part = nparts
		st[0].queue = int32(s)
		tail := 1
		for q := 0; q < tail; q++ {
			for _, e := range m.Neighbors(int(st[q].queue)) {
				if st[e.To].part < 0 {
					st[e.To].part = nparts
					st[tail].queue = int32(e.To)
					tail++
				}
			}
		}
		nparts++
	}

	// Metals outside the π system. A lone metal ion beside other parts is a counter-ion:
	// the parts warning below names it.
	for i := range m.Atoms {
		a := &m.Atoms[i]
		if st[i].centre || st[i].warned || !isMetal(a.Element) || ps.isLewisAcidOfCentre(i) ||
			(m.Degree(i) == 0 && nparts > 1) {
			continue
		}
		st[i].warned = true
		w := fmt.Sprintf("%s: no π parameters for %s; the atom is left out of the π system, so its orbitals, charge and inductive effect are not modelled",
			atomWhere(m, i), a.Element)
		if lewisAcidElements[a.Element] {
			w += " (" + lewisAcidHint + ")"
		}
		ps.Warnings = append(ps.Warnings, w)
	}
	if nparts < 2 {
		return
	}

	first := make([]int, 0, nparts) // first (lowest) atom of each part
	hasPi := make([]bool, nparts)
	named := make([]bool, nparts) // a metal warning already names an atom of the part
	acid := make([]bool, nparts)  // the part holds a Lewis-acid element
	for i := range m.Atoms {
		p := st[i].part
		if int(p) == len(first) {
			first = append(first, i)
		}
		if st[i].centre {
			hasPi[p] = true
		}
		if st[i].warned && isMetal(m.Atoms[i].Element) {
			named[p] = true
		}
		if lewisAcidElements[m.Atoms[i].Element] && m.Atoms[i].Element != "B" {
			acid[p] = true
		}
	}
	var pi, bare []string
	bareAcid := false
	for p, a := range first {
		switch {
		case hasPi[p]:
			pi = append(pi, partWhere(m, a))
		case !named[p]:
			bare = append(bare, partWhere(m, a))
			bareAcid = bareAcid || acid[p]
		}
	}
	why := "counter-ion, salt or solvent?"
	if bareAcid {
		why = "a metal salt is not modelled: " + lewisAcidHint
	}
	switch {
	case len(pi) == 0:
		return // no π system at all: the caller reports that
	case len(pi) == 1 && len(bare) > 0:
		ps.Warnings = append(ps.Warnings, fmt.Sprintf(
			"the input has %d separate parts: the π system is that of the part at %s; %s (%s)",
			len(first), pi[0], leftOut(bare), why))
	case len(pi) > 1:
		w := fmt.Sprintf(
			"the input has %d separate molecules with π systems (the parts at %s): they are solved side by side without interaction, HOMO and LUMO are the highest occupied and lowest empty levels over all of them, and each may supply reacting units; give one molecule per input to analyse them separately",
			len(pi), listWords(pi))
		if len(bare) > 0 {
			w += fmt.Sprintf("; %s (%s)", leftOut(bare), why)
		}
		ps.Warnings = append(ps.Warnings, w)
	}
}

// lewisAcidHint points from a metal in the input to the two modelled forms of Lewis-acid
// activation.
const lewisAcidHint = "for a Lewis-acid-activated carbonyl dienophile give the free dienophile with --activate lewis, or bind the metal to the carbonyl O as in C=CC=[O+][Al-](Cl)(Cl)Cl"

// leftOut says which parts without π centres were left out.
func leftOut(bare []string) string {
	if len(bare) == 1 {
		return "the part at " + bare[0] + " has no π centres and is left out"
	}
	return "the parts at " + listWords(bare) + " have no π centres and are left out"
}

// isLewisAcidOfCentre reports whether atom i is bonded to an O=LA centre (it is then the
// modelled Lewis acid of that centre).
func (ps *PiSystem) isLewisAcidOfCentre(i int) bool {
	for _, e := range ps.Mol.Neighbors(i) {
		if c := ps.CentreOf(e.To); c >= 0 && ps.Centres[c].Type == OLewis {
			return true
		}
	}
	return false
}

// atomWhere names atom i for a warning: "atom 3 (Fe, column 4)"; the column (1-based,
// in m.Source) is left out for atoms built in code.
func atomWhere(m *molecule.Molecule, i int) string {
	a := &m.Atoms[i]
	if a.Pos < 0 || a.Pos >= len(m.Source) {
		return fmt.Sprintf("atom %d (%s)", i, atomLabel(a))
	}
	return fmt.Sprintf("atom %d (%s, column %d)", i, atomLabel(a), a.Pos+1)
}

// partWhere names the part whose first atom is a: "column 12 ([Cl-])", the text being the
// dot-separated piece of the SMILES that holds the atom (shortened and escaped for a
// message); "atom 12" for molecules built in code.
func partWhere(m *molecule.Molecule, a int) string {
	pos := m.Atoms[a].Pos
	if pos < 0 || pos >= len(m.Source) {
		return fmt.Sprintf("atom %d", a)
	}
	src := m.Source
	start := strings.LastIndexByte(src[:pos], '.') + 1
	end := len(src)
	if k := strings.IndexByte(src[pos:], '.'); k >= 0 {
		end = pos + k
	}
	return fmt.Sprintf("column %d (%s)", pos+1, errtext.Clip(src[start:end]))
}

// listWords joins "a", "a and b", "a, b and c".
func listWords(xs []string) string {
	switch len(xs) {
	case 0:
		return ""
	case 1:
		return xs[0]
	}
	return strings.Join(xs[:len(xs)-1], ", ") + " and " + xs[len(xs)-1]
}
