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
// written as they are stored (flipped when the bond is written from B to A). A tetrahedral
// configuration set in code (Atom.Chiral) is written as '@' or '@@' for the neighbour order
// of the output; the reader accepts these marks but does not keep them. The Kekulé form can
// be longer than the input (and a built product longer than either partner): read it back
// with ParseOptions.MaxLength raised when it exceeds MaxLength.
//
// The output depends only on the graph and the atom order, not on the order of m.Bonds:
// each fragment starts at its lowest-numbered atom, a depth-first search visits
// neighbours in index order, and at each atom the smaller subtrees are written first as
// branches while the largest continues the chain; ring closures take the lowest free
// number. Fragments are joined with '.' in the order of
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
	m       *molecule.Molecule
	b       strings.Builder
	adj     [][]molecule.Edge // neighbours of each atom sorted by atom index
	parent  []int32           // bond to the DFS parent, -1 for a root, -2 unvisited
	ring    []bool            // bond closes a ring (not a DFS tree edge)
	digit   []int32           // ring number of a ring bond while open, 0 before, -1 after
	size    []int32           // atoms in the DFS subtree of each atom
	inUse   []bool            // ring numbers in use (index = number)
	order   []int             // atoms in output order, when asked for
	inUseBf [16]bool
	// buffers kept across reset calls (the canonical search writes many leaves)
	edges []molecule.Edge
	state []int32
	seen  []bool
	deg   []int
}

func newWriter(m *molecule.Molecule) *writer {
	w := &writer{}
	w.reset(m, false)
	return w
}

// reset prepares w to write m, reusing its buffers. With sortedBonds, m.Bonds are sorted by
// (A, B) with A < B and no bond twice, so the adjacency is filled in index order straight
// from the bonds and m's own adjacency lists are never built.
func (w *writer) reset(m *molecule.Molecule, sortedBonds bool) {
	n, nb := len(m.Atoms), len(m.Bonds)
	w.m = m
	w.b.Reset()
	w.order = nil
	if cap(w.edges) < 2*nb {
		w.edges = make([]molecule.Edge, 0, 2*nb)
	}
	if cap(w.adj) < n {
		w.adj = make([][]molecule.Edge, n)
	}
	w.adj = w.adj[:n]
	edges := w.edges[:0]
	if sortedBonds {
		if cap(w.deg) < n+1 {
			w.deg = make([]int, n+1)
		}
		deg := w.deg[:n+1]
		clear(deg)
		for _, b := range m.Bonds {
			deg[b.A+1]++
			deg[b.B+1]++
		}
		for i := 1; i <= n; i++ {
			deg[i] += deg[i-1]
		}
		edges = edges[:2*nb]
		for v := range n {
			w.adj[v] = edges[deg[v]:deg[v]:deg[v+1]]
		}
		for bi, b := range m.Bonds {
			w.adj[b.A] = append(w.adj[b.A], molecule.Edge{To: b.B, Bond: bi})
			w.adj[b.B] = append(w.adj[b.B], molecule.Edge{To: b.A, Bond: bi})
		}
	} else {
		for v := range n {
			start := len(edges)
			edges = append(edges, m.Neighbors(v)...)
			seg := edges[start:len(edges):len(edges)]
			if len(seg) > 1 {
				slices.SortFunc(seg, func(a, b molecule.Edge) int { return a.To - b.To })
			}
			w.adj[v] = seg
		}
	}
	if cap(w.state) < 2*n+nb {
		w.state = make([]int32, 2*n+nb)
	}
	state := w.state[:2*n+nb]
	clear(state)
	w.parent = state[:n]
	w.size = state[n : 2*n]
	w.digit = state[2*n:]
	for i := range w.parent {
		w.parent[i] = -2
	}
	if cap(w.ring) < nb {
		w.ring = make([]bool, nb)
	}
	w.ring = w.ring[:nb]
	clear(w.ring)
	if cap(w.seen) < nb {
		w.seen = make([]bool, nb)
	}
	w.seen = w.seen[:nb]
	clear(w.seen)
	clear(w.inUseBf[:])
	w.inUse = w.inUseBf[:1]
}

func (w *writer) write() string {
	m := w.m
	for _, b := range m.Bonds {
		if b.Order < 1 || b.Order > 3 {
			panic(fmt.Sprintf("smiles.Write: bond %d-%d has order %d (want 1, 2 or 3)", b.A, b.B, b.Order))
		}
	}
	w.b.Grow(2*len(m.Atoms) + len(m.Bonds))
	seen := w.seen
	first := true
	for root := range m.Atoms {
		if w.parent[root] != -2 {
			continue
		}
		w.parent[root] = -1
		w.walk(root, seen)
		if !first {
			w.b.WriteByte('.')
		}
		first = false
		w.emit(root, -1, -1)
	}
	return w.b.String()
}

// walk is the first pass: a depth-first search from v that marks tree edges (through
// parent) and ring-closure bonds.
func (w *writer) walk(v int, seen []bool) {
	w.size[v] = 1
	for _, e := range w.adj[v] {
		if seen[e.Bond] {
			continue
		}
		seen[e.Bond] = true
		if w.parent[e.To] != -2 {
			w.ring[e.Bond] = true // back edge to an ancestor: opens there, closes here
			continue
		}
		w.parent[e.To] = int32(e.Bond)
		w.walk(e.To, seen)
		w.size[v] += w.size[e.To]
	}
}

// emit is the second pass: it writes the subtree of v reached through bond inBond from
// atom from.
func (w *writer) emit(v, from, inBond int) {
	if inBond >= 0 {
		w.bondSymbol(inBond, from)
	}
	w.atom(v, w.chirality(v, from))
	if w.order != nil {
		w.order = append(w.order, v)
	}
	// closures first (their numbers were given out at the opening atom), then openings;
	// numbers freed here are reused only from the next atom on
	var freedBuf [8]int32
	freed := freedBuf[:0]
	for _, e := range w.adj[v] {
		if w.ring[e.Bond] && w.digit[e.Bond] > 0 {
			d := w.digit[e.Bond]
			w.ringNumber(int(d))
			freed = append(freed, d)
			w.digit[e.Bond] = -1
		}
	}
	for _, e := range w.adj[v] {
		if w.ring[e.Bond] && w.digit[e.Bond] == 0 {
			w.bondSymbol(e.Bond, v)
			d := w.takeNumber()
			w.digit[e.Bond] = int32(d)
			w.ringNumber(d)
		}
	}
	for _, d := range freed {
		w.inUse[d] = false
	}
	// children smallest subtree first (ties by index), so side groups become short
	// branches, C(=O)..., and the largest subtree continues the chain
	var kidBuf [8]molecule.Edge
	kids := kidBuf[:0]
	for _, e := range w.adj[v] {
		if w.parent[e.To] == int32(e.Bond) && e.To != from {
			kids = append(kids, e)
		}
	}
	if len(kids) > 1 {
		slices.SortStableFunc(kids, func(a, b molecule.Edge) int { return int(w.size[a.To] - w.size[b.To]) })
	}
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

// chirality returns the '@'/'@@' mark of atom v reached from atom from (-1 for a root) as
// the writer will order its neighbours: the atom it came from, its implicit hydrogen, the
// ring-closure digits in the order emit writes them (closures, then openings), then the
// branches and the chain continuation. It returns 0 when v carries no configuration or
// does not have four neighbours counting one implicit hydrogen.
func (w *writer) chirality(v, from int) int8 {
	a := w.m.Atoms[v]
	if a.Chiral == 0 || a.HCount > 1 || len(w.adj[v])+a.HCount != 4 {
		return 0
	}
	var buf [4]int
	got := buf[:0]
	if from >= 0 {
		got = append(got, from)
	}
	if a.HCount == 1 {
		got = append(got, molecule.ImplicitH)
	}
	for _, e := range w.adj[v] {
		if w.ring[e.Bond] && w.digit[e.Bond] > 0 {
			got = append(got, e.To)
		}
	}
	for _, e := range w.adj[v] {
		if w.ring[e.Bond] && w.digit[e.Bond] == 0 {
			got = append(got, e.To)
		}
	}
	var kidBuf [4]molecule.Edge
	kids := kidBuf[:0]
	for _, e := range w.adj[v] {
		if !w.ring[e.Bond] && e.To != from && w.parent[e.To] == int32(e.Bond) {
			kids = append(kids, e)
		}
	}
	slices.SortStableFunc(kids, func(p, q molecule.Edge) int { return int(w.size[p.To] - w.size[q.To]) })
	for _, e := range kids {
		got = append(got, e.To)
	}
	if len(got) != 4 {
		return 0
	}
	var ref [4]int
	if oddPermutation4(w.stereoOrder(v, ref[:0]), got) {
		return -a.Chiral
	}
	return a.Chiral
}

// stereoOrder is molecule.StereoOrder(v) (the implicit hydrogen first when there is one,
// then the neighbours by index) from the writer's adjacency, which is sorted by index,
// appended to out.
func (w *writer) stereoOrder(v int, out []int) []int {
	if w.m.Atoms[v].HCount == 1 {
		out = append(out, molecule.ImplicitH)
	}
	for _, e := range w.adj[v] {
		out = append(out, e.To)
	}
	return out
}

// oddPermutation4 is molecule.OddPermutation for lists of at most four entries, without
// allocating: the number of transpositions that sort b into a, modulo 2.
func oddPermutation4(a, b []int) bool {
	if len(a) != len(b) || len(a) > 4 {
		return molecule.OddPermutation(a, b)
	}
	var buf [4]int
	p := buf[:len(b)]
	copy(p, b)
	odd := false
	for i := range a {
		if p[i] == a[i] {
			continue
		}
		j := i + 1
		for j < len(p) && p[j] != a[i] {
			j++
		}
		if j == len(p) {
			return molecule.OddPermutation(a, b) // not a permutation: its panic
		}
		p[i], p[j] = p[j], p[i]
		odd = !odd
	}
	return odd
}

// bondOrderSum is molecule.BondOrderSum(v) from the writer's adjacency.
func (w *writer) bondOrderSum(v int) int {
	s := 0
	for _, e := range w.adj[v] {
		s += w.m.Bonds[e.Bond].Order
	}
	return s
}

// atom writes atom v with tetrahedral mark chiral (0, molecule.ChiralACW or ChiralCW), in
// brackets only when needed.
func (w *writer) atom(v int, chiral int8) {
	a := w.m.Atoms[v]
	if chiral == 0 && !needsBracket(a, w.bondOrderSum(v)) {
		w.b.WriteString(a.Element)
		return
	}
	w.b.WriteByte('[')
	if a.Isotope > 0 {
		w.b.WriteString(strconv.Itoa(a.Isotope))
	}
	w.b.WriteString(a.Element)
	switch chiral {
	case molecule.ChiralACW:
		w.b.WriteByte('@')
	case molecule.ChiralCW:
		w.b.WriteString("@@")
	}
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
