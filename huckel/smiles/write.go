package smiles

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"cyclopair/huckel/molecule"
)

// Write returns a SMILES for m in Kekulé form: uppercase atoms, explicit '=' and '#',
// brackets only where the atom needs them (an element outside the organic subset, a
// charge, an isotope, an atom map, or a hydrogen count other than the default-valence
// one). Parse(Write(m)) gives back a graph isomorphic to m with the same elements,
// charges, isotopes, hydrogen counts, bond orders and atom maps; stereo marks on bonds are
// written as they are stored (flipped when the bond is written from B to A), chirality is
// not kept by the reader and so never written.
//
// The output depends only on the graph and the atom order, not on the order of m.Bonds:
// each fragment starts at its lowest-numbered atom, neighbours are visited in index order,
// the last neighbour continues the chain and earlier ones become branches, and ring
// closures take the lowest free number. Fragments are joined with '.' in the order of
// their lowest atom.
//
// Write panics if a bond order is not 1, 2 or 3 (molecules from Parse never have one).
func Write(m *molecule.Molecule) string {
	w := newWriter(m)
	return w.write()
}

// writeOrder is Write that also returns the atoms in the order they were written, so
// order[k] is the index in m of the k-th atom of the output.
func writeOrder(m *molecule.Molecule) (string, []int) {
	w := newWriter(m)
	w.order = make([]int, 0, len(m.Atoms))
	s := w.write()
	return s, w.order
}

type writer struct {
	m        *molecule.Molecule
	b        strings.Builder
	visited  []bool
	children [][]molecule.Edge // tree edges to children, in visiting order
	rings    [][]int           // ring-closure bonds at each atom, in discovery order
	digit    []int             // digit of each ring-closure bond while open, 0 otherwise
	inUse    []bool            // ring numbers in use (index = number)
	order    []int             // atoms in output order, when asked for
}

func newWriter(m *molecule.Molecule) *writer {
	n := len(m.Atoms)
	return &writer{
		m:        m,
		visited:  make([]bool, n),
		children: make([][]molecule.Edge, n),
		rings:    make([][]int, n),
		digit:    make([]int, len(m.Bonds)),
		inUse:    make([]bool, 1, 10),
	}
}

func (w *writer) write() string {
	m := w.m
	for _, b := range m.Bonds {
		if b.Order < 1 || b.Order > 3 {
			panic(fmt.Sprintf("smiles.Write: bond %d-%d has order %d (want 1, 2 or 3)", b.A, b.B, b.Order))
		}
	}
	w.b.Grow(2 * len(m.Atoms))
	bondSeen := make([]bool, len(m.Bonds))
	first := true
	for root := range m.Atoms {
		if w.visited[root] {
			continue
		}
		w.walk(root, -1, bondSeen)
		if !first {
			w.b.WriteByte('.')
		}
		first = false
		w.emit(root, -1, -1)
	}
	return w.b.String()
}

// sortedNeighbors returns atom v's edges ordered by neighbour index.
func (w *writer) sortedNeighbors(v int) []molecule.Edge {
	nb := w.m.Neighbors(v)
	out := make([]molecule.Edge, len(nb))
	copy(out, nb)
	slices.SortFunc(out, func(a, b molecule.Edge) int { return a.To - b.To })
	return out
}

// walk is the first pass: a depth-first search from v that records tree children and
// ring-closure bonds.
func (w *writer) walk(v, parentBond int, bondSeen []bool) {
	w.visited[v] = true
	for _, e := range w.sortedNeighbors(v) {
		if e.Bond == parentBond || bondSeen[e.Bond] {
			continue
		}
		bondSeen[e.Bond] = true
		if w.visited[e.To] {
			// back edge to an ancestor: it opens there and closes here
			w.rings[e.To] = append(w.rings[e.To], e.Bond)
			w.rings[v] = append(w.rings[v], e.Bond)
			continue
		}
		w.children[v] = append(w.children[v], e)
		w.walk(e.To, e.Bond, bondSeen)
	}
}

// emit is the second pass: it writes the subtree of v reached through bond inBond from
// atom from.
func (w *writer) emit(v, from, inBond int) {
	if inBond >= 0 {
		w.bondSymbol(inBond, from)
	}
	w.atom(v)
	if w.order != nil {
		w.order = append(w.order, v)
	}
	// closures first (their numbers were given out at the opening atom), then openings
	var closed [8]int
	freed := closed[:0]
	for _, bi := range w.rings[v] {
		if d := w.digit[bi]; d > 0 {
			w.ringNumber(d)
			freed = append(freed, d)
			w.digit[bi] = -1
		}
	}
	for _, bi := range w.rings[v] {
		if w.digit[bi] == 0 {
			w.bondSymbol(bi, v)
			d := w.takeNumber()
			w.digit[bi] = d
			w.ringNumber(d)
		}
	}
	for _, d := range freed {
		w.inUse[d] = false
	}
	kids := w.children[v]
	for k, e := range kids {
		if k < len(kids)-1 {
			w.b.WriteByte('(')
			w.emit(e.To, v, e.Bond)
			w.b.WriteByte(')')
		} else {
			w.emit(e.To, v, e.Bond)
		}
	}
}

func (w *writer) takeNumber() int {
	for d := 1; d < len(w.inUse); d++ {
		if !w.inUse[d] {
			w.inUse[d] = true
			return d
		}
	}
	w.inUse = append(w.inUse, true)
	return len(w.inUse) - 1
}

func (w *writer) ringNumber(d int) {
	switch {
	case d < 10:
		w.b.WriteByte(byte('0' + d))
	case d < 100:
		w.b.WriteByte('%')
		w.b.WriteString(strconv.Itoa(d))
	default:
		w.b.WriteString("%(")
		w.b.WriteString(strconv.Itoa(d))
		w.b.WriteByte(')')
	}
}

// bondSymbol writes the symbol of bond bi as written from atom from.
func (w *writer) bondSymbol(bi, from int) {
	b := w.m.Bonds[bi]
	switch b.Order {
	case 2:
		w.b.WriteByte('=')
	case 3:
		w.b.WriteByte('#')
	default:
		if b.Stereo == symUp || b.Stereo == symDown {
			s := b.Stereo
			if from != b.A {
				s = symUp + symDown - s
			}
			w.b.WriteByte(s)
		}
	}
}

// atom writes atom v, in brackets only when needed.
func (w *writer) atom(v int) {
	a := w.m.Atoms[v]
	if !needsBracket(a, w.m.BondOrderSum(v)) {
		w.b.WriteString(a.Element)
		return
	}
	w.b.WriteByte('[')
	if a.Isotope > 0 {
		w.b.WriteString(strconv.Itoa(a.Isotope))
	}
	w.b.WriteString(a.Element)
	if a.HCount > 0 {
		w.b.WriteByte('H')
		if a.HCount > 1 {
			w.b.WriteString(strconv.Itoa(a.HCount))
		}
	}
	switch {
	case a.Charge == 1:
		w.b.WriteByte('+')
	case a.Charge == -1:
		w.b.WriteByte('-')
	case a.Charge > 1:
		w.b.WriteByte('+')
		w.b.WriteString(strconv.Itoa(a.Charge))
	case a.Charge < -1:
		w.b.WriteByte('-')
		w.b.WriteString(strconv.Itoa(-a.Charge))
	}
	if a.Map != 0 {
		w.b.WriteByte(':')
		w.b.WriteString(strconv.Itoa(a.Map))
	}
	w.b.WriteByte(']')
}

// needsBracket reports whether atom a with the given bond-order sum must be written in
// brackets to read back with the same hydrogen count.
func needsBracket(a molecule.Atom, bondSum int) bool {
	if a.Isotope != 0 || a.Charge != 0 || a.Map != 0 {
		return true
	}
	vals := organicVals(a.Element)
	if vals == nil {
		return true
	}
	v := nextValence(vals, bondSum)
	return v < 0 || v-bondSum != a.HCount
}
