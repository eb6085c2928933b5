package fmo

import (
	"slices"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// FollowUpStep is one step from the primary cycloadduct toward the isolated product.
type FollowUpStep struct {
	Kind     string `json:"kind"`      // "retro_diels_alder" (extrusion of a two-atom bridge) | "elimination" (loss of H–X giving an aromatic ring)
	Lost     string `json:"lost"`      // SMILES of the small molecule lost: "N#N", "O=C=O", "CCO", ...
	LostName string `json:"lost_name"` // "N₂", "CO₂", or "H–X (X = <SMILES of the leaving group>)"
	Product  string `json:"product"`   // canonical SMILES after the step (relative configuration kept where defined)
	Basis    string `json:"basis"`     // the rule and its literature basis
	Note     string `json:"note,omitempty"`
}

// Follow-up step kinds.
const (
	StepRetroDA     = "retro_diels_alder"
	StepElimination = "elimination"
)

// Literature basis of the follow-up rules.
const (
	basisN2 = "retro-Diels–Alder loss of N₂ from the N=N-bridged bicyclic adduct of a 1,2,4,5-tetrazine or 1,2,4-triazine " +
		"(J. Sauer et al., Eur. J. Org. Chem. 1998, 2885; D. L. Boger, Chem. Rev. 1986, 86, 781)"
	basisCO2 = "retro-Diels–Alder loss of CO₂ from the lactone-bridged bicyclic adduct of a 2-pyrone " +
		"(K. Afarinkia, V. Vinader, T. D. Nelson, G. H. Posner, Tetrahedron 1992, 48, 9111)"
	basisElim = "elimination of H–X (alcohol, amine, hydrogen halide) from a ring carbon next to a C–H, where the double bond " +
		"formed completes an aromatic six-membered ring: enol ethers and enamines as alkyne equivalents " +
		"(D. L. Boger, Chem. Rev. 1986, 86, 781; J. Sauer et al., Eur. J. Org. Chem. 1998, 2885; " +
		"K. Afarinkia et al., Tetrahedron 1992, 48, 9111)"
	noteDihydro = "a 4,5-dihydropyridazine: it tautomerises to the 1,4-dihydropyridazine and is oxidised to the pyridazine " +
		"in air or by excess tetrazine (J. Sauer et al., Eur. J. Org. Chem. 1998, 2885)"
	noteCO2Alkene = "with an alkene the bicyclic lactone may be isolable and lose CO₂ only on heating; the cyclohexadiene " +
		"formed can add a second equivalent of dienophile (K. Afarinkia et al., Tetrahedron 1992, 48, 9111)"
)

// followUp applies the follow-up rules to adduct m (diene atoms first, as from buildProduct,
// with Atom.Chiral set or not) whose new ring is ring = [a, b, c, d, y, x] for a [4+2]
// adduct (a, d the former diene termini, b, c its interior atoms, x bonded to a). It returns
// the steps and the final molecule (m itself when no rule applies). The rules are graph
// rules, not a list of compounds:
//
//  1. Extrusion: a two-atom bridge P–Q between a and d outside the new ring, with b=c a
//     double bond, leaves as a small molecule by retro-Diels–Alder, and a=b, c=d become
//     double bonds: P=Q both N, each bonded only to its terminus and to the other → N₂;
//     P an ring O and Q a C(=O) → CO₂.
//  2. Elimination: a ring atom of the new ring carrying a leaving group X (an O or N with
//     only single bonds and no charge, or Cl, Br, I), next to a ring atom with a hydrogen,
//     loses H–X when the double bond formed gives the six-membered ring three alternating
//     double bonds (an aromatic ring). Repeated while it applies.
//
// Configurations on atoms whose neighbours change are cleared.
func followUp(m *molecule.Molecule, ring []int) ([]FollowUpStep, *molecule.Molecule) {
	return followUpSteps(m, ring, true)
}

// followUpSteps is followUp; with names false the steps carry only their Kind (no product
// or lost-molecule SMILES, whose canonical searches only the listed steps need).
func followUpSteps(m *molecule.Molecule, ring []int, names bool) ([]FollowUpStep, *molecule.Molecule) {
	steps := []FollowUpStep{}
	if len(ring) != 6 {
		return steps, m
	}
	// cur is m until a rule changes it (then a clone: m is the caller's). m's neighbour
	// lists are in bond order, as a clone's are (buildProduct and stereoAdduct index
	// after adding every bond), so the rules see the same order either way.
	cur := m
	ring = slices.Clone(ring)
	a, b, c, d := ring[0], ring[1], ring[2], ring[3]
	inRing := func(v int) bool { return slices.Contains(ring, v) }
	// Rule 1: extrusion.
	if bc := cur.BondBetween(b, c); bc >= 0 && cur.Bonds[bc].Order == 2 {
		for _, ep := range cur.Neighbors(a) {
			p := ep.To
			if inRing(p) {
				continue
			}
			for _, eq := range cur.Neighbors(p) {
				q := eq.To
				if q == a || inRing(q) || cur.BondBetween(q, d) < 0 {
					continue
				}
				lost, name, basis, extra := bridgeKind(cur, p, q, a, d)
				if lost == "" {
					continue
				}
				del := map[int]bool{p: true, q: true}
				for _, x := range extra {
					del[x] = true
				}
				cur = cur.Clone()
				cur.Bonds[cur.BondBetween(a, b)].Order = 2
				cur.Bonds[bc].Order = 1
				cur.Bonds[cur.BondBetween(c, d)].Order = 2
				cur.Atoms[a].Chiral, cur.Atoms[d].Chiral = 0, 0
				var remap []int
				cur, remap = removeAtoms(cur, del)
				for i := range ring {
					ring[i] = remap[ring[i]]
				}
				step := FollowUpStep{Kind: StepRetroDA, Lost: lost, LostName: name, Basis: basis}
				if names {
					step.Product = relativeStereo(cur)
				}
				if name == "N₂" && !aromaticRing(cur, ring) && countElement(cur, ring, "N") == 2 {
					step.Note = noteDihydro
				}
				if name == "CO₂" && !aromaticRing(cur, ring) {
					step.Note = noteCO2Alkene
				}
				steps = append(steps, step)
				goto elim
			}
		}
	}
elim:
	// Rule 2: elimination to an aromatic ring.
	for range 3 {
		applied := false
		for i, u := range ring {
			for _, v := range []int{ring[(i+1)%6], ring[(i+5)%6]} {
				if applied || cur.Atoms[v].HCount < 1 || cur.BondBetween(u, v) < 0 || cur.Bonds[cur.BondBetween(u, v)].Order != 1 {
					continue
				}
				for _, e := range cur.Neighbors(u) {
					if inRingIdx(ring, e.To) || !leavingGroup(cur, e.To, e.Bond) {
						continue
					}
					// the leaving group's side of the u–X bond; X must not lead back into
					// the ring (a ring O of a fused lactone is no leaving group here)
					side := sideOf(cur, e.To, u)
					if slices.ContainsFunc(side, func(w int) bool { return inRingIdx(ring, w) }) {
						continue
					}
					trial := cur.Clone()
					trial.Bonds[trial.BondBetween(u, v)].Order = 2
					if !aromaticRing(trial, ring) {
						continue
					}
					var lost, lostName string
					if names {
						lostMol := subMolecule(cur, side)
						lostMol.Atoms[slices.Index(side, e.To)].HCount++
						lostMol.Atoms[slices.Index(side, e.To)].Chiral = 0
						lost, lostName = smiles.Canonical(lostMol), leavingName(lostMol, slices.Index(side, e.To))
					}
					trial.Atoms[v].HCount--
					trial.Atoms[u].Chiral, trial.Atoms[v].Chiral = 0, 0
					del := map[int]bool{}
					for _, x := range side {
						del[x] = true
					}
					var remap []int
					trial, remap = removeAtoms(trial, del)
					for k := range ring {
						ring[k] = remap[ring[k]]
					}
					cur = trial
					step := FollowUpStep{Kind: StepElimination, Lost: lost, LostName: lostName, Basis: basisElim}
					if names {
						step.Product = relativeStereo(cur)
					}
					steps = append(steps, step)
					applied = true
					break
				}
			}
			if applied {
				break
			}
		}
		if !applied {
			break
		}
	}
	return steps, cur
}

// bridgeKind classifies the two-atom bridge p–q between termini a (bonded to p) and d
// (bonded to q): N₂ for an N=N bridge, CO₂ for an O–C(=O) bridge (either way round). It
// returns "" when the bridge is neither; extra lists further atoms that leave with it (the
// carbonyl O).
func bridgeKind(m *molecule.Molecule, p, q, a, d int) (lost, name, basis string, extra []int) {
	pa, qa := m.Atoms[p], m.Atoms[q]
	if pa.Charge != 0 || qa.Charge != 0 {
		return "", "", "", nil
	}
	pq := m.Bonds[m.BondBetween(p, q)].Order
	if pa.Element == "N" && qa.Element == "N" && pq == 2 && m.Degree(p) == 2 && m.Degree(q) == 2 {
		return "N#N", "N₂", basisN2, nil
	}
	o, cc := p, q
	if pa.Element == "C" {
		o, cc = q, p
	}
	if m.Atoms[o].Element != "O" || m.Atoms[cc].Element != "C" || pq != 1 || m.Degree(o) != 2 || m.Degree(cc) != 3 {
		return "", "", "", nil
	}
	for _, e := range m.Neighbors(cc) {
		if e.To != o && e.To != a && e.To != d && m.Atoms[e.To].Element == "O" && m.Bonds[e.Bond].Order == 2 && m.Degree(e.To) == 1 {
			return "O=C=O", "CO₂", basisCO2, []int{e.To}
		}
	}
	return "", "", "", nil
}

// aromaticRing reports whether the six ring atoms carry three alternating ring double bonds
// (each atom in exactly one).
func aromaticRing(m *molecule.Molecule, ring []int) bool {
	if len(ring) != 6 {
		return false
	}
	for i, u := range ring {
		n := 0
		for _, v := range []int{ring[(i+1)%6], ring[(i+5)%6]} {
			if bi := m.BondBetween(u, v); bi >= 0 && m.Bonds[bi].Order == 2 {
				n++
			} else if bi < 0 {
				return false
			}
		}
		if n != 1 {
			return false
		}
	}
	return true
}

func countElement(m *molecule.Molecule, atoms []int, el string) int {
	n := 0
	for _, a := range atoms {
		if m.Atoms[a].Element == el {
			n++
		}
	}
	return n
}

func inRingIdx(ring []int, v int) bool { return slices.Contains(ring, v) }

// leavingGroup reports whether atom x, joined to a ring atom by bond bi, can leave as H–X:
// an uncharged O or N with only single bonds, or Cl, Br, I.
func leavingGroup(m *molecule.Molecule, x, bi int) bool {
	a := m.Atoms[x]
	if a.Charge != 0 || m.Bonds[bi].Order != 1 {
		return false
	}
	switch a.Element {
	case "Cl", "Br", "I":
		return true
	case "O", "N":
		for _, e := range m.Neighbors(x) {
			if m.Bonds[e.Bond].Order != 1 {
				return false
			}
		}
		return true
	}
	return false
}

// leavingName names the molecule H–X lost, from its atom x.
func leavingName(lost *molecule.Molecule, x int) string {
	a := lost.Atoms[x]
	switch a.Element {
	case "Cl", "Br", "I":
		return "hydrogen halide"
	case "N":
		return "amine"
	}
	if lost.Degree(x) == 0 {
		return "water"
	}
	for _, e := range lost.Neighbors(x) {
		for _, f := range lost.Neighbors(e.To) {
			if f.To != x && lost.Bonds[f.Bond].Order == 2 && lost.Atoms[f.To].Element == "O" {
				return "carboxylic acid"
			}
		}
	}
	return "alcohol"
}

// sideOf returns the atoms reached from x without passing through atom from (x first).
func sideOf(m *molecule.Molecule, x, from int) []int {
	seen := map[int]bool{x: true, from: true}
	out := []int{x}
	for q := 0; q < len(out); q++ {
		for _, e := range m.Neighbors(out[q]) {
			if !seen[e.To] {
				seen[e.To] = true
				out = append(out, e.To)
			}
		}
	}
	return out
}

// subMolecule copies the atoms listed (in that order) and the bonds among them.
func subMolecule(m *molecule.Molecule, atoms []int) *molecule.Molecule {
	idx := map[int]int{}
	s := &molecule.Molecule{}
	for i, a := range atoms {
		idx[a] = i
		at := m.Atoms[a]
		at.Chiral = 0
		s.AddAtom(at)
	}
	for _, b := range m.Bonds {
		i, ok1 := idx[b.A]
		j, ok2 := idx[b.B]
		if ok1 && ok2 {
			s.AddBond(i, j, b.Order)
		}
	}
	return s
}

// removeAtoms returns m without the atoms in del and the map from old to new indices (−1
// for a removed atom). Surviving atoms keep their relative order, so a configuration
// (Atom.Chiral, relative to ascending neighbour indices) stays valid on every atom whose
// neighbours are unchanged; an atom that lost a neighbour loses its configuration.
func removeAtoms(m *molecule.Molecule, del map[int]bool) (*molecule.Molecule, []int) {
	remap := make([]int, len(m.Atoms))
	out := &molecule.Molecule{Name: m.Name}
	for i, a := range m.Atoms {
		if del[i] {
			remap[i] = -1
			continue
		}
		remap[i] = len(out.Atoms)
		out.Atoms = append(out.Atoms, a)
	}
	for _, b := range m.Bonds {
		if del[b.A] || del[b.B] {
			for _, v := range []int{b.A, b.B} {
				if !del[v] {
					out.Atoms[remap[v]].Chiral = 0
				}
			}
			continue
		}
		out.Bonds = append(out.Bonds, molecule.Bond{A: remap[b.A], B: remap[b.B], Order: b.Order})
	}
	out.Reindex()
	return out, remap
}
