package fmo

import (
	"cyclopair/huckel/molecule"
)

// StereoProduct is one relative configuration of an adduct: the endo or the exo approach.
type StereoProduct struct {
	Approach  string `json:"approach"`  // "endo", "exo", or "endo=exo" when both approaches give one compound
	SMILES    string `json:"smiles"`    // canonical SMILES with the relative configuration as '@'/'@@' (smiles.CanonicalStereo)
	Preferred bool   `json:"preferred"` // the approach the secondary-orbital (endo) term favours at this orientation
}

// Approaches of the 2π partner.
const (
	ApproachEndo = "endo"
	ApproachExo  = "exo"
	ApproachSame = "endo=exo"
)

// vec is a direction in the model geometry of stereoAdduct.
type vec [3]float64

func sub(a, b vec) vec { return vec{a[0] - b[0], a[1] - b[1], a[2] - b[2]} }

func det3(a, b, c vec) float64 {
	return a[0]*(b[1]*c[2]-b[2]*c[1]) - a[1]*(b[0]*c[2]-b[2]*c[0]) + a[2]*(b[0]*c[1]-b[1]*c[0])
}

// stereoSlots is the model geometry of the supra–supra approach, as directions from each
// new sp3 centre to its four neighbours. The 4π unit lies in the plane z = 0 with its termini
// at x = ∓1.3 and its interior atoms toward +y; the 2π unit lies above it (z > 0), parallel,
// each of its atoms over one terminus. A terminus keeps its in-unit neighbour (in plane), gains
// the bond up to the 2π atom, and bends its two substituents down: "inside" (toward the other
// terminus, where a ring of a cyclic diene closes) and "outside". A 2π atom keeps its partner
// (in plane), gains the bond down to the terminus, and bends its two substituents up: "endo"
// (toward +y, over the interior of the 4π unit, Alder's endo position) and "exo" (toward −y).
// side is −1 for the terminus bonded first (a, and its 2π partner x) and +1 for the other.
// Only the signs of the signed volumes matter, so the lengths are rough.
func stereoSlots(side float64) (inner, up, inside, outside, partner, down, endo, exo vec) {
	s := side
	inner = vec{-s * 0.5, 1, 0}
	up = vec{0, 0, 1}
	inside = vec{-s * 0.6, -0.8, -0.5}
	outside = vec{s, -0.1, -0.5}
	partner = vec{-s, 0, 0}
	down = vec{0, 0, -1}
	endo = vec{s * 0.5, 1, 0.5}
	exo = vec{s * 0.5, -1, 0.5}
	return
}

// chiralFrom returns the Atom.Chiral of centre v in m given the direction to each neighbour
// (molecule.ImplicitH for the implicit hydrogen), or 0 if a neighbour has no direction.
// SMILES '@' (molecule.ChiralACW): looking from the first neighbour of the reference order,
// the other three run anticlockwise, which is a negative signed volume
// det(u1−u0, u2−u0, u3−u0) (OpenSMILES specification, "Tetrahedral centers").
func chiralFrom(m *molecule.Molecule, v int, dir map[int]vec) int8 {
	order := m.StereoOrder(v)
	if len(order) != 4 {
		return 0
	}
	var u [4]vec
	for k, n := range order {
		d, ok := dir[n]
		if !ok {
			return 0
		}
		u[k] = d
	}
	vol := det3(sub(u[1], u[0]), sub(u[2], u[0]), sub(u[3], u[0]))
	switch {
	case vol < 0:
		return molecule.ChiralACW
	case vol > 0:
		return molecule.ChiralCW
	}
	return 0
}

// ringPath reports whether atom s (a neighbour of t in m) reaches target without passing
// through t or any atom in avoid: s then lies on a ring through t and target.
func ringPath(m *molecule.Molecule, s, t, target int, avoid []int) bool {
	if s == target {
		return true
	}
	seen := map[int]bool{t: true, s: true}
	for _, a := range avoid {
		seen[a] = true
	}
	queue := []int{s}
	for len(queue) > 0 {
		v := queue[0]
		queue = queue[1:]
		for _, e := range m.Neighbors(v) {
			if e.To == target {
				return true
			}
			if !seen[e.To] {
				seen[e.To] = true
				queue = append(queue, e.To)
			}
		}
	}
	return false
}

// sideFlag returns +1 or −1 for the side of the double bond x=y on which neighbour n of x
// lies, from the directional marks of the input ('/' and '\' as stored from Bond.A to
// Bond.B), or 0 when x carries no mark. A mark on n's own bond gives the side directly; a
// mark only on x's other substituent gives the opposite side. Two substituents on the two
// ends of the double bond with equal flags are cis (OpenSMILES, "Directional bonds": F/C=C/F
// is trans).
func sideFlag(m *molecule.Molecule, x, y, n int) int {
	flag := func(nb int) int {
		bi := m.BondBetween(x, nb)
		if bi < 0 {
			return 0
		}
		b := m.Bonds[bi]
		var s int
		switch b.Stereo {
		case '/':
			s = 1
		case '\\':
			s = -1
		default:
			return 0
		}
		if b.A == x { // written x→nb: the mark describes nb as seen from x
			s = -s
		}
		return s
	}
	if f := flag(n); f != 0 {
		return f
	}
	for _, e := range m.Neighbors(x) {
		if e.To != y && e.To != n {
			if f := flag(e.To); f != 0 {
				return -f
			}
		}
	}
	return 0
}

// cisAcross reports whether substituent p of x and substituent q of y lie on the same side
// of the input double bond x=y: 1 cis, −1 trans, 0 unknown (no double bond, or no marks).
func cisAcross(m *molecule.Molecule, x, y, p, q int) int {
	bi := m.BondBetween(x, y)
	if bi < 0 || m.Bonds[bi].Order != 2 {
		return 0
	}
	f, g := sideFlag(m, x, y, p), sideFlag(m, y, x, q)
	if f == 0 || g == 0 {
		return 0
	}
	if f == g {
		return 1
	}
	return -1
}

// substituents returns the neighbours of atom v in m other than those in not, plus
// molecule.ImplicitH once per implicit hydrogen.
func substituents(m *molecule.Molecule, v int, not ...int) []int {
	var out []int
	for _, e := range m.Neighbors(v) {
		skip := false
		for _, n := range not {
			if e.To == n {
				skip = true
			}
		}
		if !skip {
			out = append(out, e.To)
		}
	}
	for range m.Atoms[v].HCount {
		out = append(out, molecule.ImplicitH)
	}
	return out
}

// place puts two substituents into two slots: first into the slot where the rule put it,
// the other into the remaining slot. It returns false when the two are not exactly two.
func place(subs []int, first int, firstSlot, otherSlot vec, dir map[int]vec) bool {
	if len(subs) != 2 {
		return false
	}
	other := subs[0]
	if other == first {
		other = subs[1]
	}
	dir[first] = firstSlot
	dir[other] = otherSlot
	return true
}

// stereoAdduct sets Atom.Chiral on the new sp3 centres of adduct pm (built by buildProduct
// for diene unit du and dienophile unit eu joined by bonds) for the endo or the exo approach,
// and returns it. Which substituent goes where follows the partners' own structure, with no
// table of compounds:
//   - a terminus substituent on a ring through both termini (the CH2 of cyclopentadiene, the
//     O of furan, the lactone of a 2-pyrone, the N=N of a tetrazine) points inside;
//     otherwise the input's directional marks decide (cis to the unit's next atom = inside);
//     a terminus whose geometry the input does not fix is left without a configuration;
//   - on the 2π unit, a substituent on a ring through both 2π atoms (maleic anhydride,
//     benzoquinone) is the endo group of its atom, so both ring branches go endo together
//     (cis); otherwise a single conjugated substituent (a one-electron π centre: C=O, C≡N,
//     aryl) is the endo group (Alder's rule of maximum accumulation of unsaturation,
//     K. Alder, G. Stein, Angew. Chem. 1937, 50, 510; from memory). The second 2π atom of an
//     acyclic unit follows the first through the input's cis/trans marks; without marks it is
//     left without a configuration.
//
// CanonicalStereo then drops a mark on any atom that is not a stereocentre.
func stereoAdduct(dp, ep *Partner, du, eu Unit, bonds [2][2]int, pm *molecule.Molecule, endo bool) *molecule.Molecule {
	m := pm.Clone()
	off := len(dp.Mol.Atoms)
	n := len(du.Atoms)
	terms := [2]int{du.Atoms[0], du.Atoms[n-1]}
	inners := [2]int{du.Atoms[1], du.Atoms[n-2]}
	nexts := [2]int{du.Atoms[min(2, n-1)], du.Atoms[max(n-3, 0)]} // the unit atom after the inner one
	xs := [2]int{bonds[0][1], bonds[1][1]}
	// Diene termini.
	for k, t := range terms {
		side := float64(2*k - 1)
		inner, up, inside, outside, _, _, _, _ := stereoSlots(side)
		dir := map[int]vec{inners[k]: inner, xs[k] + off: up}
		subs := substituents(dp.Mol, t, inners[k])
		ok := false
		for _, s := range subs {
			if s != molecule.ImplicitH && ringPath(dp.Mol, s, t, terms[1-k], du.Atoms[1:n-1]) {
				ok = place(subs, s, inside, outside, dir)
				break
			}
		}
		if !ok && n == 4 {
			for _, s := range subs {
				if s == molecule.ImplicitH {
					continue
				}
				switch cisAcross(dp.Mol, t, inners[k], s, nexts[k]) {
				case 1:
					ok = place(subs, s, inside, outside, dir)
				case -1:
					ok = place(subs, s, outside, inside, dir)
				}
				if ok {
					break
				}
			}
		}
		if ok {
			m.Atoms[t].Chiral = chiralFrom(m, t, dir)
		}
	}
	// Dienophile atoms: the first one whose endo group is known, then the other.
	endoSlot := func(k int) (vec, vec, vec, vec) {
		_, _, _, _, partner, down, en, ex := stereoSlots(float64(2*k - 1))
		if !endo {
			en, ex = ex, en
		}
		return partner, down, en, ex
	}
	group := [2]int{-1, -1} // the endo group of each 2π atom (index in ep.Mol)
	ringed := false
	for k, x := range xs {
		y := xs[1-k]
		subs := substituents(ep.Mol, x, y)
		for _, s := range subs {
			if s != molecule.ImplicitH && ringPath(ep.Mol, s, x, y, nil) {
				group[k], ringed = s, true
				break
			}
		}
		if group[k] >= 0 {
			continue
		}
		conj := -1
		nconj := 0
		for _, s := range subs {
			if s == molecule.ImplicitH {
				continue
			}
			if c := ep.Pi.CentreOf(s); c >= 0 && oneElectron(ep.Pi.Centres[c]) {
				conj, nconj = s, nconj+1
			}
		}
		if nconj == 1 {
			group[k] = conj
		}
	}
	if !ringed && group[0] >= 0 && group[1] >= 0 {
		group[1] = -1 // the second atom follows the first through the alkene geometry
	}
	first := 0
	if group[0] < 0 {
		first = 1
	}
	if group[first] < 0 {
		return m
	}
	done := [2]bool{}
	for _, k := range []int{first, 1 - first} {
		x, y := xs[k], xs[1-k]
		partner, down, en, ex := endoSlot(k)
		dir := map[int]vec{y + off: partner, terms[k]: down}
		subs := substituents(ep.Mol, x, y)
		// shift dienophile indices to the adduct's numbering
		sh := make([]int, len(subs))
		for i, s := range subs {
			sh[i] = s
			if s != molecule.ImplicitH {
				sh[i] = s + off
			}
		}
		ok := false
		switch {
		case group[k] >= 0:
			ok = place(sh, group[k]+off, en, ex, dir)
		case done[1-k] && !ringed:
			// cis/trans to the first atom's endo group through the input marks
			for _, s := range subs {
				if s == molecule.ImplicitH {
					continue
				}
				switch cisAcross(ep.Mol, x, y, s, group[1-k]) {
				case 1:
					ok = place(sh, s+off, en, ex, dir)
				case -1:
					ok = place(sh, s+off, ex, en, dir)
				}
				if ok {
					break
				}
			}
		}
		if ok {
			m.Atoms[x+off].Chiral = chiralFrom(m, x+off, dir)
			done[k] = true
		}
	}
	return m
}
