package huckel

import (
	"errors"
	"fmt"
	"slices"
	"strings"

	"cyclopair/huckel/errtext"
	"cyclopair/huckel/molecule"
)

// Errors returned by Perceive (wrapped in a *PerceiveError that names the atom).
var (
	// ErrNoParameter: an atom was typed, but the parameter set has no h for its type or
	// no k for one of its π bonds.
	ErrNoParameter = errors.New("missing Hückel parameter")
	// ErrUnsupported: an atom in or next to the π system has a bonding situation the
	// perception rules do not cover (carbene, unusual charge or valence).
	ErrUnsupported = errors.New("unsupported π centre")
)

// PerceiveError names the atom (0-based index in the input) at fault.
type PerceiveError struct {
	Atom  int    // atom index
	Label string // element with formal charge, e.g. "N+"
	Msg   string // what is wrong, with a hint
	Err   error  // ErrNoParameter or ErrUnsupported
}

func (e *PerceiveError) Error() string {
	return fmt.Sprintf("atom %d (%s): %s", e.Atom, e.Label, e.Msg)
}

func (e *PerceiveError) Unwrap() error { return e.Err }

// LargeSystemWarn is the π-centre count above which Perceive warns: gonum has no subset or
// sparse eigensolver, so every solve is a dense O(n³) diagonalisation (about 6 s with
// vectors at n = 1000 on the project's 2-core machine).
const LargeSystemWarn = 300

// atom roles during perception
const (
	roleNone     = iota
	roleCore     // has a π (multiple) bond in the kept π set
	roleAcceptor // empty or singly filled p orbital without a π bond: C+, B, carbon radical
	roleDonor    // lone pair (or C−) that joins the π system only next to a core/acceptor
	roleAlkyl    // sp3 carbon, hyperconjugative pseudo-heteroatom
)

// atomState is the per-atom working state of Perceive.
type atomState struct {
	typ      CentreType
	role     uint8
	elec     int8
	excluded bool // element or valence without π parameters
	far      bool // terminal lone-pair atom across a dropped cumulated double bond
	centre   bool
	warned   bool  // a warning already names this atom
	part     int32 // connected part of the molecule (warnParts), -1 before it is found
	queue    int32 // warnParts' breadth-first queue: the atom in queue position i is st[i].queue
}

// Perceive finds the π system of the Kekulé graph m and types its centres with p.
//
// Rules (a centre's electrons in brackets):
//   - Core centres have a multiple bond: C (1), C# for sp carbon — a triple bond or two
//     cumulated double bonds (1), N= (1), N# (1), N+= iminium/pyridinium (1), N+nitro (1),
//     N+# sp N+ of azides, diazo compounds, nitrile oxides, diazonium ions (1), O= (1),
//     O+= oxonium/protonated carbonyl (1), O=LA an O+ double-bonded to C and single-bonded
//     to a Lewis acid (B−, Al, a metal) (1), S= thione (1).
//   - Acceptors are centres on their own: C+ (0), trigonal B (0), a neutral trivalent
//     carbon radical (C, 1).
//   - Lone-pair donors join only when bonded to a core or acceptor atom: N: amine/pyrrole/
//     amide N (2), N− (2), O: (2), O− (2), S: (2), F, Cl, Br, I (2), C− carbanion (2).
//   - With p.Alkyl, an sp3 carbon bonded to a core or acceptor atom becomes an Alkyl (Me)
//     pseudo-heteroatom (2), the heteroatom model of hyperconjugation (Streitwieser 1961).
//   - One π set per sp atom: a triple bond contributes one π bond. An atom with two
//     cumulated double bonds (allene, ketene, isocyanate, azide, diazo middle atom) keeps
//     the double bond to its partner of higher degree (ties: lower atom index), the set
//     that conjugates with the substituents; the partner across the dropped bond leaves
//     the π system unless it is a terminal N, O or S, which then joins as a lone-pair
//     donor in that plane (azide and diazo terminal N−, ketene and isocyanate O).
//   - Nitro groups: both oxygens get type Onitro (one h); =O brings 1 e and O− 2 e, and
//     with FormalCharge both have a core of 1, so their π charges are equal.
//   - π bonds join centres that share a molecular bond, except two donor/alkyl centres.
//     k comes from p.K(type, type, Kekulé order).
//   - Atoms of elements without π types (P, Si, Se, metals …) and hypervalent or charged
//     sulfur stay outside; their multiple bonds are dropped with a warning. A metal atom
//     that is not the Lewis acid of an O=LA centre is named in a warning as well (see
//     warnParts); main-group σ substituents (SiMe3, PPh2 …) stay outside silently.
//   - Several molecules in one input (dot-separated parts) are perceived together; a
//     warning names the part the π system comes from and the parts left out, or says
//     that several parts are solved side by side (see warnParts).
//   - With p.Auxiliary = δ ≠ 0, a carbon centre bonded to heteroatom centres X gets
//     h_C += δ·Σh_X (auxiliary inductive parameter; Streitwieser 1961 recommends 0.1).
//   - Separate π systems get separate Fragment numbers, in order of their lowest atom.
//
// Errors are *PerceiveError wrapping ErrNoParameter, ErrUnsupported or, for more than
// DefaultMaxCentres centres, ErrTooManyCentres (PerceiveOptions raises the limit).
// Warnings (odd electron count, more than LargeSystemWarn centres, dropped multiple bonds,
// metal atoms, several molecules in one input; see warnParts) are in PiSystem.Warnings.
func Perceive(m *molecule.Molecule, p *Params) (*PiSystem, error) {
	return PerceiveOptions{}.Perceive(m, p)
}

// Perceive is the package-level Perceive with the options' centre limit.
func (o PerceiveOptions) Perceive(m *molecule.Molecule, p *Params) (*PiSystem, error) {
	n := len(m.Atoms)
	limit := o.maxCentres()
	ps := &PiSystem{Mol: m, Params: p, Omega: p.Omega, MaxCentres: limit}
	// One allocation for all per-atom state, one for per-bond state.
	st := make([]atomState, n)
	dropped := make([]bool, len(m.Bonds)) // bond takes no part in the π system

	for i := range m.Atoms {
		a := &m.Atoms[i]
		switch a.Element {
		case "C", "N", "O", "F", "Cl", "Br", "I", "B", "H":
		case "S":
			if a.Charge != 0 && !(a.Charge == -1 && m.Valence(i) == 1) || m.Valence(i) > 2 {
				st[i].excluded = true
			}
		default:
			st[i].excluded = true
		}
		if st[i].excluded {
			var partners []string
			for _, e := range m.Neighbors(i) {
				if m.Bonds[e.Bond].Order > 1 {
					dropped[e.Bond] = true
					partners = append(partners, fmt.Sprint(e.To))
				}
			}
			if len(partners) > 0 {
				st[i].warned = true
				ps.Warnings = append(ps.Warnings, fmt.Sprintf(
					"atom %d (%s): no π parameters for this atom; its multiple bonds (to atom %s) are left out of the π system and its inductive effect is not modelled",
					i, atomLabel(a), strings.Join(partners, ", ")))
			}
		}
	}
	// Cumulated double bonds: keep one π set per sp atom.
	for i := range m.Atoms {
		if st[i].excluded {
			continue
		}
		best, nd := -1, 0
		for _, e := range m.Neighbors(i) {
			if m.Bonds[e.Bond].Order != 2 || dropped[e.Bond] {
				continue
			}
			nd++
			if best < 0 || m.Degree(e.To) > m.Degree(otherEnd(m.Bonds[best], i)) ||
				(m.Degree(e.To) == m.Degree(otherEnd(m.Bonds[best], i)) && e.To < otherEnd(m.Bonds[best], i)) {
				best = e.Bond
			}
		}
		if nd < 2 {
			continue
		}
		for _, e := range m.Neighbors(i) {
			if e.Bond == best || m.Bonds[e.Bond].Order != 2 || dropped[e.Bond] {
				continue
			}
			dropped[e.Bond] = true
			if m.Degree(e.To) == 1 {
				switch m.Atoms[e.To].Element {
				case "N", "O", "S":
					st[e.To].far = true
				}
			}
		}
	}

	// Type every atom.
	for i := range m.Atoms {
		a := &m.Atoms[i]
		if st[i].excluded || a.Element == "H" {
			continue
		}
		np, maxOrder, cumulated := 0, 0, false
		nd := 0
		for _, e := range m.Neighbors(i) {
			o := m.Bonds[e.Bond].Order
			if o == 2 && !st[e.To].excluded {
				nd++
			}
			if o > 1 && !dropped[e.Bond] {
				np++
				maxOrder = max(maxOrder, o)
			}
		}
		cumulated = nd >= 2
		val := m.Valence(i)
		set := func(r uint8, t CentreType, e int8) { st[i].role, st[i].typ, st[i].elec = r, t, e }
		unsupported := func(what string) error {
			return &PerceiveError{Atom: i, Label: atomLabel(a), Err: ErrUnsupported,
				Msg: what + " (write the neutral closed-shell form, or a charged form with a formal charge on this atom)"}
		}
		if np == 0 && !st[i].far && touchesDropped(m, i, dropped) {
			continue // its only multiple bonds were dropped: outside the π system
		}
		if np == 0 && st[i].far {
			switch {
			case a.Element == "O" && a.Charge == 0:
				set(roleDonor, OEther, 2)
			case a.Element == "S" && a.Charge == 0:
				set(roleDonor, SThio, 2)
			case a.Element == "N" && a.Charge == -1:
				set(roleDonor, NAnion, 2)
			case a.Element == "N" && a.Charge == 0:
				set(roleDonor, NPyrrole, 2)
			}
			continue
		}
		switch a.Element {
		case "C":
			switch {
			case np > 0 && a.Charge == 0:
				if maxOrder == 3 || cumulated {
					set(roleCore, CSp, 1)
				} else {
					set(roleCore, CSp2, 1)
				}
			case np > 0 && a.Charge == 1:
				set(roleCore, CSp, 1) // vinyl cation: the empty orbital lies in the σ plane
			case np > 0 && a.Charge == -1:
				// vinyl anion or isocyanide carbon: the lone pair lies in the σ plane
				if maxOrder == 3 || cumulated {
					set(roleCore, CSp, 1)
				} else {
					set(roleCore, CSp2, 1)
				}
			case np > 0:
				return nil, unsupported(fmt.Sprintf("carbon with charge %+d and a multiple bond is not supported", a.Charge))
			case a.Charge == 1 && val == 3:
				set(roleAcceptor, CCation, 0)
			case a.Charge == -1 && val == 3:
				set(roleDonor, CAnion, 2)
			case a.Charge == 0 && val == 3:
				set(roleAcceptor, CSp2, 1) // carbon radical
			case a.Charge == 0 && val == 4:
				if p.Alkyl {
					set(roleAlkyl, Alkyl, 2)
				}
			default:
				if touchesMultiple(m, i, dropped) {
					return nil, unsupported(fmt.Sprintf("carbon with charge %+d and valence %d (carbene or similar) is not supported", a.Charge, val))
				}
			}
		case "N":
			switch {
			case np > 0 && a.Charge == 0:
				if maxOrder == 3 {
					set(roleCore, NNitrile, 1)
				} else if val == 3 && !cumulated {
					set(roleCore, NPyridine, 1)
				} else {
					return nil, unsupported(fmt.Sprintf("neutral nitrogen with valence %d and a multiple bond is not supported", val))
				}
			case np > 0 && a.Charge == 1:
				if maxOrder == 3 || cumulated {
					set(roleCore, NSpCation, 1)
				} else if isNitroN(m, i, dropped) {
					set(roleCore, NNitro, 1)
				} else {
					set(roleCore, NIminium, 1)
				}
			case np > 0 && a.Charge == -1:
				set(roleCore, NPyridine, 1)
			case np > 0:
				return nil, unsupported(fmt.Sprintf("nitrogen with charge %+d and a multiple bond is not supported", a.Charge))
			case a.Charge == 0 && val == 3:
				set(roleDonor, NPyrrole, 2)
			case a.Charge == 0 && val == 2:
				set(roleAcceptor, NPyridine, 1) // aminyl radical: one electron in p
			case a.Charge == -1 && val == 2:
				set(roleDonor, NAnion, 2)
			}
		case "O":
			switch {
			case np > 0 && a.Charge == 0 && maxOrder == 2:
				set(roleCore, OCarbonyl, 1)
			case np > 0 && a.Charge == 1 && maxOrder == 2:
				if boundToLewisAcid(m, i, dropped) {
					set(roleCore, OLewis, 1)
				} else {
					set(roleCore, OOxonium, 1)
				}
			case np > 0:
				return nil, unsupported(fmt.Sprintf("oxygen with charge %+d and a bond of order %d is not supported", a.Charge, maxOrder))
			case a.Charge == 0 && val == 2:
				set(roleDonor, OEther, 2)
			case a.Charge == -1 && val == 1:
				set(roleDonor, OAnion, 2)
			}
		case "S":
			switch {
			case np > 0 && maxOrder == 2:
				set(roleCore, SThione, 1)
			case np > 0:
				return nil, unsupported("sulfur with a triple bond is not supported")
			default:
				set(roleDonor, SThio, 2) // thioether, thiophene, thiolate
			}
		case "F", "Cl", "Br", "I":
			if a.Charge == 0 && val == 1 {
				set(roleDonor, CentreType(a.Element), 2)
			}
		case "B":
			switch {
			case np == 0 && a.Charge == 0 && val == 3:
				set(roleAcceptor, Boron, 0)
			case np > 0:
				return nil, unsupported("boron with a multiple bond is not supported")
			}
		}
	}

	// Donors and alkyl groups join only next to a core or acceptor.
	for i := range m.Atoms {
		switch st[i].role {
		case roleCore, roleAcceptor:
			st[i].centre = true
		case roleDonor, roleAlkyl:
			for _, e := range m.Neighbors(i) {
				if r := st[e.To].role; r == roleCore || r == roleAcceptor {
					st[i].centre = true
					break
				}
			}
		}
	}
	// Nitro oxygens share one type (their charges agree through FormalCharge).
	for i := range m.Atoms {
		if !st[i].centre || st[i].typ != NNitro {
			continue
		}
		for _, e := range m.Neighbors(i) {
			j := e.To
			if m.Atoms[j].Element != "O" || !st[j].centre {
				continue
			}
			switch st[j].typ {
			case OCarbonyl, OAnion:
				st[j].typ = ONitro
			}
		}
	}

	// Centres in atom order, counted (and checked against the limit) before anything
	// that grows with their number is allocated.
	nc := 0
	for i := range m.Atoms {
		if st[i].centre {
			nc++
		}
	}
	if nc > limit {
		first := -1 // the atom of the first centre beyond the limit
		for i, k := 0, 0; i < n && first < 0; i++ {
			if st[i].centre {
				if k == limit {
					first = i
				}
				k++
			}
		}
		return nil, tooManyCentres(m, first, nc, limit)
	}
	ps.AtomCentre = make([]int, n)
	ps.Centres = make([]Centre, 0, nc)
	for i := range m.Atoms {
		ps.AtomCentre[i] = -1
		if !st[i].centre {
			continue
		}
		typ := st[i].typ
		h, ok := p.H(typ)
		if !ok {
			return nil, &PerceiveError{Atom: i, Label: atomLabel(&m.Atoms[i]), Err: ErrNoParameter,
				Msg: fmt.Sprintf("no h parameter for type %s in set %s (add it with --params FILE)", typ, errtext.Clip(p.Name))}
		}
		ps.AtomCentre[i] = len(ps.Centres)
		ps.Centres = append(ps.Centres, Centre{Atom: i, Element: m.Atoms[i].Element, Type: typ,
			H: h, Electrons: int(st[i].elec), FormalCharge: m.Atoms[i].Charge})
	}
	ps.Bonds = make([]PiBond, 0, len(m.Bonds))
	for bi, b := range m.Bonds {
		ci, cj := ps.AtomCentre[b.A], ps.AtomCentre[b.B]
		if ci < 0 || cj < 0 {
			continue
		}
		ra, rb := st[b.A].role, st[b.B].role
		if (ra == roleDonor || ra == roleAlkyl) && (rb == roleDonor || rb == roleAlkyl) {
			continue
		}
		if dropped[bi] {
			// The dropped bond of a cumulated atom: its far partner (a terminal lone-pair
			// donor) still overlaps in the kept plane through the σ framework's p orbital.
			if !st[b.A].far && !st[b.B].far {
				continue
			}
		}
		order := b.Order
		if dropped[bi] {
			order = 1
		}
		k, ok := p.K(st[b.A].typ, st[b.B].typ, order)
		if !ok {
			at := b.A
			if st[b.A].typ == CSp2 {
				at = b.B
			}
			return nil, &PerceiveError{Atom: at, Label: atomLabel(&m.Atoms[at]), Err: ErrNoParameter,
				Msg: fmt.Sprintf("no k parameter for the %s–%s bond to atom %d (Kekulé order %d) in set %s (add it with --params FILE)",
					st[b.A].typ, st[b.B].typ, b.A+b.B-at, b.Order, errtext.Clip(p.Name))}
		}
		if ci > cj {
			ci, cj = cj, ci
		}
		ps.Bonds = append(ps.Bonds, PiBond{I: ci, J: cj, K: k, Bond: bi})
	}
	if p.Auxiliary != 0 {
		applyAuxiliary(ps, p.Auxiliary)
	}
	ps.recomputeFragments()
	if e := ps.Electrons(); e%2 == 1 {
		ps.Warnings = append(ps.Warnings, fmt.Sprintf(
			"odd number of π electrons (%d): open shell, the singly occupied level is reported as SOMO", e))
	} else if len(ps.Fragments) > 1 {
		for f, frag := range ps.Fragments {
			fe := 0
			for _, c := range frag {
				fe += ps.Centres[c].Electrons
			}
			if fe%2 == 1 {
				ps.Warnings = append(ps.Warnings, fmt.Sprintf(
					"π fragment %d (atoms from %d) has an odd number of π electrons (%d): open shell", f, ps.Centres[frag[0]].Atom, fe))
			}
		}
	}
	if nc > LargeSystemWarn {
		ps.Warnings = append(ps.Warnings, fmt.Sprintf(
			"%d π centres: gonum has no subset or sparse eigensolver, so each solve is a dense O(n³) diagonalisation and may take seconds", nc))
	}
	ps.warnParts(st)
	return ps, nil
}

// applyAuxiliary adds δ·h_X to every carbon centre for each heteroatom centre X it is
// π-bonded to (the auxiliary inductive parameter; alkyl pseudo-atoms excluded). The base
// h values are read before any change, so the result does not depend on bond order.
func applyAuxiliary(ps *PiSystem, delta float64) {
	isC := func(t CentreType) bool { return t == CSp2 || t == CCation || t == CAnion || t == CSp }
	add := make([]float64, len(ps.Centres))
	for _, b := range ps.Bonds {
		ci, cj := &ps.Centres[b.I], &ps.Centres[b.J]
		switch {
		case isC(ci.Type) && !isC(cj.Type) && cj.Type != Alkyl:
			add[b.I] += delta * cj.H
		case isC(cj.Type) && !isC(ci.Type) && ci.Type != Alkyl:
			add[b.J] += delta * ci.H
		}
	}
	for i := range ps.Centres {
		ps.Centres[i].H += add[i]
	}
}

func otherEnd(b molecule.Bond, i int) int {
	if b.A == i {
		return b.B
	}
	return b.A
}

// atomLabel is the element with its formal charge: "N+", "O-", "C".
func atomLabel(a *molecule.Atom) string {
	switch {
	case a.Charge == 0:
		return a.Element
	case a.Charge == 1:
		return a.Element + "+"
	case a.Charge == -1:
		return a.Element + "-"
	case a.Charge > 0:
		return fmt.Sprintf("%s+%d", a.Element, a.Charge)
	}
	return fmt.Sprintf("%s%d", a.Element, a.Charge)
}

func touchesDropped(m *molecule.Molecule, i int, dropped []bool) bool {
	for _, e := range m.Neighbors(i) {
		if dropped[e.Bond] && m.Bonds[e.Bond].Order > 1 {
			return true
		}
	}
	return false
}

func touchesMultiple(m *molecule.Molecule, i int, dropped []bool) bool {
	for _, e := range m.Neighbors(i) {
		if m.Bonds[e.Bond].Order > 1 && !dropped[e.Bond] {
			return true
		}
		for _, f := range m.Neighbors(e.To) {
			if m.Bonds[f.Bond].Order > 1 && !dropped[f.Bond] {
				return true
			}
		}
	}
	return false
}

// isNitroN: N+ with a kept double bond to O and a single bond to O−.
func isNitroN(m *molecule.Molecule, i int, dropped []bool) bool {
	dbl, anion := false, false
	for _, e := range m.Neighbors(i) {
		o := &m.Atoms[e.To]
		if o.Element != "O" {
			continue
		}
		b := m.Bonds[e.Bond]
		switch {
		case b.Order == 2 && !dropped[e.Bond] && o.Charge == 0:
			dbl = true
		case b.Order == 1 && o.Charge == -1 && m.Degree(e.To) == 1:
			anion = true
		}
	}
	return dbl && anion
}

// lewisAcidElements are the acceptors that make an O+ double-bonded to carbon an O=LA
// centre (B and Al as the ate complexes B−/Al−, or any of these metals).
var lewisAcidElements = map[string]bool{
	"B": true, "Al": true, "Ga": true, "In": true, "Li": true, "Na": true, "K": true, "Mg": true,
	"Ca": true, "Sc": true, "Y": true, "La": true, "Ce": true, "Eu": true, "Yb": true, "Ti": true,
	"Zr": true, "Hf": true, "Cr": true, "Mn": true, "Fe": true, "Co": true, "Ni": true, "Cu": true,
	"Ag": true, "Au": true, "Zn": true, "Cd": true, "Hg": true, "Sn": true, "Bi": true, "Sb": true,
}

func boundToLewisAcid(m *molecule.Molecule, i int, dropped []bool) bool {
	for _, e := range m.Neighbors(i) {
		if m.Bonds[e.Bond].Order != 1 {
			continue
		}
		la := &m.Atoms[e.To]
		if la.Element == "B" && la.Charge >= 0 && m.Valence(e.To) < 4 {
			continue // a neutral trigonal boron ester O, not an ate complex
		}
		if lewisAcidElements[la.Element] {
			return true
		}
	}
	return false
}

// recomputeFragments fills Fragments and Centres[i].Fragment from Bonds (three
// allocations whatever the size: adjacency in CSR form, the BFS order that backs every
// fragment slice, and the fragment list).
func (ps *PiSystem) recomputeFragments() {
	ps.recomputeFragmentsIn(make([]int, 2*len(ps.Centres)+1+2*len(ps.Bonds)))
}

// recomputeFragmentsIn is recomputeFragments with buf (length 2n+1+2·bonds, zeroed) as its
// storage: the fragment slices point into it.
func (ps *PiSystem) recomputeFragmentsIn(buf []int) {
	n := len(ps.Centres)
	start, order, adj := buf[:n+1], buf[n+1:2*n+1], buf[2*n+1:]
	for _, b := range ps.Bonds {
		start[b.I+1]++
		start[b.J+1]++
	}
	for i := 0; i < n; i++ {
		start[i+1] += start[i]
	}
	fill := order // temporarily: next free slot per centre
	copy(fill, start[:n])
	for _, b := range ps.Bonds {
		adj[fill[b.I]] = b.J
		fill[b.I]++
		adj[fill[b.J]] = b.I
		fill[b.J]++
	}
	for i := range ps.Centres {
		ps.Centres[i].Fragment = -1
	}
	ps.Fragments = ps.Fragments[:0]
	head := 0
	for s := 0; s < n; s++ {
		if ps.Centres[s].Fragment >= 0 {
			continue
		}
		f := len(ps.Fragments)
		begin := head
		order[head] = s
		head++
		ps.Centres[s].Fragment = f
		for q := begin; q < head; q++ {
			c := order[q]
			for _, t := range adj[start[c]:start[c+1]] {
				if ps.Centres[t].Fragment < 0 {
					ps.Centres[t].Fragment = f
					order[head] = t
					head++
				}
			}
		}
		comp := order[begin:head:head]
		slices.Sort(comp)
		ps.Fragments = append(ps.Fragments, comp)
	}
}

// Electrons is the total number of π electrons (sum over centres).
func (ps *PiSystem) Electrons() int {
	e := 0
	for i := range ps.Centres {
		e += ps.Centres[i].Electrons
	}
	return e
}

// Matrix returns the Hückel matrix in units of β, n×n row-major over centres: h_i on the
// diagonal, k_ij off the diagonal for each π bond, 0 elsewhere.
func (ps *PiSystem) Matrix() []float64 {
	n := len(ps.Centres)
	a := make([]float64, n*n)
	for i := range ps.Centres {
		a[i*n+i] = ps.Centres[i].H
	}
	for _, b := range ps.Bonds {
		a[b.I*n+b.J] += b.K
		a[b.J*n+b.I] += b.K
	}
	return a
}

// Without returns a copy of ps with the given centres (centre indices) removed, as when
// those atoms become sp3 in a cycloadduct. Their electrons are dropped with them; the
// caller may edit Centres[i].Electrons of the copy afterwards (Solve reads them). Bonds
// to removed centres disappear, fragments and AtomCentre are recomputed, Mol, Params,
// Omega, MaxCentres and Warnings are carried over. It panics on an out-of-range index.
func (ps *PiSystem) Without(centres ...int) *PiSystem {
	n := len(ps.Centres)
	drop := make([]bool, n)
	for _, c := range centres {
		if c < 0 || c >= n {
			panic(fmt.Sprintf("huckel: Without(%d) on %d centres", c, n))
		}
		drop[c] = true
	}
	newIdx := make([]int, n)
	out := &PiSystem{Mol: ps.Mol, Params: ps.Params, Omega: ps.Omega, MaxCentres: ps.MaxCentres,
		Warnings: slices.Clone(ps.Warnings)}
	for i, c := range ps.Centres {
		if drop[i] {
			newIdx[i] = -1
			continue
		}
		newIdx[i] = len(out.Centres)
		out.Centres = append(out.Centres, c)
	}
	for _, b := range ps.Bonds {
		i, j := newIdx[b.I], newIdx[b.J]
		if i < 0 || j < 0 {
			continue
		}
		out.Bonds = append(out.Bonds, PiBond{I: i, J: j, K: b.K, Bond: b.Bond})
	}
	out.AtomCentre = make([]int, len(ps.AtomCentre))
	for a, c := range ps.AtomCentre {
		if c < 0 {
			out.AtomCentre[a] = -1
		} else {
			out.AtomCentre[a] = newIdx[c]
		}
	}
	out.recomputeFragments()
	return out
}

// CentreOf returns the centre index of atom a, or -1.
func (ps *PiSystem) CentreOf(a int) int {
	if a < 0 || a >= len(ps.AtomCentre) {
		return -1
	}
	return ps.AtomCentre[a]
}

// NewPiSystem builds a PiSystem directly from centres and bonds (for model systems and
// tests that bypass perception). Centre.Fragment values are recomputed; AtomCentre maps
// each Centre.Atom to its centre. Bonds must use centre indices; I and J are normalised so
// that I < J. It panics on an out-of-range or self bond.
func NewPiSystem(centres []Centre, bonds []PiBond) *PiSystem {
	ps := &PiSystem{Centres: slices.Clone(centres), Bonds: slices.Clone(bonds)}
	maxAtom := -1
	for _, c := range ps.Centres {
		maxAtom = max(maxAtom, c.Atom)
	}
	ps.AtomCentre = make([]int, maxAtom+1)
	for i := range ps.AtomCentre {
		ps.AtomCentre[i] = -1
	}
	for i, c := range ps.Centres {
		if c.Atom >= 0 {
			ps.AtomCentre[c.Atom] = i
		}
	}
	for i := range ps.Bonds {
		b := &ps.Bonds[i]
		if b.I == b.J || b.I < 0 || b.J < 0 || b.I >= len(centres) || b.J >= len(centres) {
			panic(fmt.Sprintf("huckel: NewPiSystem bond %d–%d on %d centres", b.I, b.J, len(centres)))
		}
		if b.I > b.J {
			b.I, b.J = b.J, b.I
		}
	}
	ps.recomputeFragments()
	return ps
}
