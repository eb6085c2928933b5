package fmo

import (
	"hash/maphash"
	"slices"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// Telling candidate adducts apart cheaply. Analyze compares the candidate adducts of a pair
// (is the other regio-orientation the same compound? which is the best orientation giving a
// different adduct?) by their canonical SMILES, which is most of a pair analysis's cost when
// every adduct gets one. productKeys computes a canonical SMILES only when two adducts could
// be the same compound: it first compares a graph invariant (colour refinement of the atom
// elements over the bonds, the Weisfeiler–Lehman scheme: B. Weisfeiler, A. Leman, Nauchno-
// Tekhnicheskaya Informatsia 1968, 2(9), 12), which is equal for isomorphic graphs. Two
// adducts whose invariants differ are different graphs, so their canonical SMILES differ too
// (a SMILES string fixes the elements, isotopes, charges, hydrogen counts and connectivity
// of the graph it writes); the answers are those of comparing canonical SMILES throughout.
// The atoms start from those labels (atomColour); the invariant ignores bond orders and
// aromaticity (which differ between Kekulé structures of one compound), so it is coarser
// than the canonical SMILES, never finer.

// When two invariants are equal the adducts are usually the same compound (the two
// orientations of a symmetric partner, symmetry-equivalent units), and proving that by two
// canonical SMILES was most of the key cost. same first looks for an explicit isomorphism
// (equal elements, isotopes, charges, hydrogens, atom maps and bond orders, matched along
// the bonds within equal invariant colours). Canonical is computed from exactly those
// labels and the connectivity, by steps that depend on the graph and not on the atom
// numbering, so isomorphic adducts get equal canonical SMILES — unless its search gives up
// (more than 256 leaves, see smiles.Canonical), where the atom order can matter. The leaves
// are orderings of the atoms within the classes of its refined partition, which is at
// least as fine as the invariant's colour classes, so there are at most Π (class size)!
// of them; the shortcut is taken only when that product is at most 256, and the answer is
// then the canonical comparison's. Otherwise, and whenever no isomorphism is found (also
// for two Kekulé structures of one compound, which Canonical treats as equal), the
// canonical SMILES decide as before.

// Regio-isomers on one skeleton (the new double bond and its hydrogens on different
// atoms) have equal invariants but are not isomorphic, and used to fall back to two
// canonical SMILES. Once the invariants agree, same therefore compares a second invariant
// of the built adducts (bondInvariant): the same refinement with each bond labelled by the
// type smiles.Canonical ranks it by (smiles.BondTypes: the Kekulé order, or one common
// type for the bonds whose order differs between Kekulé structures, so every Kekulé
// structure of a compound gets the same labels). Equal canonical SMILES mean one graph
// with these labels (Canonical writes a Kekulé structure of the molecule, whose bond
// types are the molecule's), so different bond invariants mean different canonical
// SMILES: the answer is still that of comparing canonical SMILES.

// productKeys holds the candidate adducts of one analysis, built, hashed and canonicalised
// on demand.
type productKeys struct {
	build   func(i int) *molecule.Molecule
	colour  func(i int) (uint64, []uint64) // graphColours of adduct i without building it, or nil
	mols    []*molecule.Molecule
	inv     []uint64
	colours [][]uint64 // per adduct: each atom's invariant colour
	invDone []bool
	bondInv []uint64 // bondInvariant of each built adduct, 0 before it is computed
	key     []string
	keyDone []bool
	iso     isoScratch
}

func newProductKeys(n int, build func(i int) *molecule.Molecule, colour func(i int) (uint64, []uint64)) *productKeys {
	return &productKeys{build: build, colour: colour, mols: make([]*molecule.Molecule, n), inv: make([]uint64, n),
		colours: make([][]uint64, n), invDone: make([]bool, n), bondInv: make([]uint64, n), key: make([]string, n), keyDone: make([]bool, n)}
}

func (p *productKeys) mol(i int) *molecule.Molecule {
	if p.mols[i] == nil {
		p.mols[i] = p.build(i)
	}
	return p.mols[i]
}

func (p *productKeys) invariant(i int) uint64 {
	if !p.invDone[i] {
		if p.colour != nil {
			p.inv[i], p.colours[i] = p.colour(i)
		} else {
			p.inv[i], p.colours[i] = graphColours(p.mol(i))
		}
		p.invDone[i] = true
	}
	return p.inv[i]
}

// coloursOf is adduct i's invariant colours (computing the invariant if needed).
func (p *productKeys) coloursOf(i int) []uint64 {
	p.invariant(i)
	return p.colours[i]
}

// bondInv is bondInvariant of adduct i (built on demand), never 0.
func (p *productKeys) bondInvariant(i int) uint64 {
	if p.bondInv[i] == 0 {
		p.bondInv[i] = bondInvariant(p.mol(i)) | 1
	}
	return p.bondInv[i]
}

func (p *productKeys) canonical(i int) string {
	if !p.keyDone[i] {
		p.key[i], p.keyDone[i] = productKey(p.mol(i)), true
	}
	return p.key[i]
}

// same reports whether adducts i and j are the same compound (equal canonical SMILES).
func (p *productKeys) same(i, j int) bool {
	if i == j {
		return true
	}
	if p.invariant(i) != p.invariant(j) {
		return false
	}
	if p.keyDone[i] && p.keyDone[j] {
		return p.key[i] == p.key[j]
	}
	if searchBounded(p.colours[i]) && p.iso.isomorphic(p.mol(i), p.mol(j), p.colours[i], p.colours[j]) {
		return true
	}
	if p.bondInvariant(i) != p.bondInvariant(j) {
		return false
	}
	return p.canonical(i) == p.canonical(j)
}

// searchBounded reports whether Π (colour class size)! ≤ 256, the bound on the leaves of
// smiles.Canonical's search below which it never gives up (see above).
func searchBounded(colours []uint64) bool {
	var buf [64]uint64
	c := append(buf[:0], colours...)
	slices.Sort(c)
	prod := 1
	for k := 0; k < len(c); {
		run := 1
		for k+run < len(c) && c[k+run] == c[k] {
			run++
		}
		for f := 2; f <= run; f++ {
			if prod *= f; prod > 256 {
				return false
			}
		}
		k += run
	}
	return true
}

// isoScratch is the work space of isomorphic, kept for the adducts of one analysis.
type isoScratch struct {
	fwd, back []int // atom of b for each atom of a, and back; -1 unmapped
	order     []int // atoms of a in search order
	parent    []int // for each position in order: an earlier-mapped neighbour (atom of a), or -1
	seen      []bool
}

// isoStepLimit bounds the backtracking of isomorphic; past it the canonical SMILES decide.
const isoStepLimit = 20000

// isomorphic reports whether it found a bijection between the atoms of a and b that keeps
// element, isotope, charge, hydrogen count, atom map and invariant colour of every atom and
// maps the bonds of a one to one onto the bonds of b with their orders. false means none
// was found (none exists, or the search stopped at isoStepLimit).
func (s *isoScratch) isomorphic(a, b *molecule.Molecule, ca, cb []uint64) bool {
	n := len(a.Atoms)
	if n != len(b.Atoms) || len(a.Bonds) != len(b.Bonds) {
		return false
	}
	s.fwd = resizeInts(s.fwd, n, -1)
	s.back = resizeInts(s.back, n, -1)
	s.parent = resizeInts(s.parent, n, -1)
	s.order = s.order[:0]
	if cap(s.seen) < n {
		s.seen = make([]bool, n)
	}
	s.seen = s.seen[:n]
	clear(s.seen)
	// breadth-first order over a, each component from its lowest atom, so every atom but a
	// root has a neighbour mapped before it
	for root := range n {
		if s.seen[root] {
			continue
		}
		s.seen[root] = true
		start := len(s.order)
		s.order = append(s.order, root)
		s.parent[start] = -1
		for q := start; q < len(s.order); q++ {
			v := s.order[q]
			for _, e := range a.Neighbors(v) {
				if !s.seen[e.To] {
					s.seen[e.To] = true
					s.parent[len(s.order)] = v
					s.order = append(s.order, e.To)
				}
			}
		}
	}
	steps := 0
	var try func(k int) bool
	try = func(k int) bool {
		if k == n {
			return true
		}
		if steps++; steps > isoStepLimit {
			return false
		}
		u := s.order[k]
		fits := func(x int) bool {
			if s.back[x] >= 0 || ca[u] != cb[x] || !sameAtom(&a.Atoms[u], &b.Atoms[x]) || a.Degree(u) != b.Degree(x) {
				return false
			}
			// every mapped neighbour of u must be a neighbour of x through a bond of the same
			// order, and x must have no other mapped neighbours
			mapped := 0
			for _, e := range a.Neighbors(u) {
				if w := s.fwd[e.To]; w >= 0 {
					mapped++
					bi := b.BondBetween(x, w)
					if bi < 0 || b.Bonds[bi].Order != a.Bonds[e.Bond].Order {
						return false
					}
				}
			}
			for _, e := range b.Neighbors(x) {
				if s.back[e.To] >= 0 {
					mapped--
				}
			}
			return mapped == 0
		}
		place := func(x int) bool {
			s.fwd[u], s.back[x] = x, u
			if try(k + 1) {
				return true
			}
			s.fwd[u], s.back[x] = -1, -1
			return false
		}
		if p := s.parent[k]; p >= 0 {
			for _, e := range b.Neighbors(s.fwd[p]) {
				if fits(e.To) && place(e.To) {
					return true
				}
				if steps > isoStepLimit {
					return false
				}
			}
			return false
		}
		for x := range n {
			if fits(x) && place(x) {
				return true
			}
			if steps > isoStepLimit {
				return false
			}
		}
		return false
	}
	if !try(0) {
		return false
	}
	// check the whole bijection once more: every bond of a maps onto a bond of b of the same
	// order (with equal bond counts this makes the bond map one to one and onto)
	for _, bd := range a.Bonds {
		bi := b.BondBetween(s.fwd[bd.A], s.fwd[bd.B])
		if bi < 0 || b.Bonds[bi].Order != bd.Order {
			return false
		}
	}
	return true
}

func sameAtom(x, y *molecule.Atom) bool {
	return x.Element == y.Element && x.Isotope == y.Isotope && x.Charge == y.Charge && x.HCount == y.HCount && x.Map == y.Map
}

func resizeInts(s []int, n, fill int) []int {
	if cap(s) < n {
		s = make([]int, n)
	}
	s = s[:n]
	for i := range s {
		s[i] = fill
	}
	return s
}

var invSeed = maphash.MakeSeed()

// mix64 is the SplitMix64 finaliser (S. Vigna, public-domain reference code, 2015).
func mix64(x uint64) uint64 {
	x ^= x >> 30
	x *= 0xbf58476d1ce4e5b9
	x ^= x >> 27
	x *= 0x94d049bb133111eb
	x ^= x >> 31
	return x
}

// graphInvariant is equal for isomorphic molecules (atom labels of atomColour and
// connectivity): colour refinement with commutative neighbour sums to the stable partition,
// then a commutative sum over atoms.
func graphInvariant(m *molecule.Molecule) uint64 {
	h, _ := graphColours(m)
	return h
}

// graphColours is graphInvariant with each atom's final colour: atoms that an isomorphism
// can map onto each other have equal colours.
func graphColours(m *molecule.Molecule) (uint64, []uint64) {
	c := make([]uint64, 2*len(m.Atoms))
	for i := range m.Atoms {
		a := &m.Atoms[i]
		c[i] = atomColour(a.Element, a.Isotope, a.Charge, a.HCount)
	}
	edges := make([]colourEdge, len(m.Bonds))
	for i, b := range m.Bonds {
		edges[i] = colourEdge{a: int32(b.A), b: int32(b.B)}
	}
	return refineColours(c, edges)
}

// bondInvariant is graphInvariant with every bond labelled by its smiles.BondTypes type:
// equal for molecules with equal canonical SMILES (see above).
func bondInvariant(m *molecule.Molecule) uint64 {
	c := make([]uint64, 2*len(m.Atoms))
	for i := range m.Atoms {
		a := &m.Atoms[i]
		c[i] = atomColour(a.Element, a.Isotope, a.Charge, a.HCount)
	}
	types := smiles.BondTypes(m)
	edges := make([]colourEdge, len(m.Bonds))
	for bi, b := range m.Bonds {
		edges[bi] = colourEdge{a: int32(b.A), b: int32(b.B), t: uint64(types[bi])}
	}
	h, _ := refineColours(c, edges)
	return h
}

// atomColour is an atom's initial colour: element, isotope, charge and hydrogen count, the
// labels smiles.Canonical ranks atoms by (and writes) and which no Kekulé structure changes,
// so adducts that differ only in where a double bond and its hydrogens sit (the same
// skeleton) get different invariants instead of two canonical SMILES.
func atomColour(element string, isotope, charge, hcount int) uint64 {
	h := maphash.String(invSeed, element)
	h = mix64(h ^ uint64(int64(isotope))*0x9e3779b97f4a7c15)
	h = mix64(h ^ uint64(int64(charge)+0x100)*0xbf58476d1ce4e5b9)
	return mix64(h ^ uint64(int64(hcount)+0x10000)*0x94d049bb133111eb)
}

// adductColours is graphColours of buildProduct(dp, ep, di, ei, o) computed from the
// partners, without building the adduct: the same atoms (the diene's, then the dienophile's)
// and bonds (each partner's, then the two new ones).
func adductColours(dp, ep *Partner, di, ei, o int) (uint64, []uint64) {
	dm, em := dp.Mol, ep.Mol
	off := len(dm.Atoms)
	n := off + len(em.Atoms)
	c := make([]uint64, 2*n)
	ds, es := dp.sides[di], ep.sides[ei] // the adduct's charges, as buildProduct sets them
	for i := range dm.Atoms {
		a := &dm.Atoms[i]
		c[i] = atomColour(a.Element, a.Isotope, ds.charge[i], a.HCount)
	}
	for i := range em.Atoms {
		a := &em.Atoms[i]
		c[off+i] = atomColour(a.Element, a.Isotope, es.charge[i], a.HCount)
	}
	nb := productBonds(dp.Units[di], ep.Units[ei], o)
	edges := make([]colourEdge, 0, len(dm.Bonds)+len(em.Bonds)+2)
	for _, b := range dm.Bonds {
		edges = append(edges, colourEdge{a: int32(b.A), b: int32(b.B)})
	}
	for _, b := range em.Bonds {
		edges = append(edges, colourEdge{a: int32(b.A + off), b: int32(b.B + off)})
	}
	edges = append(edges, colourEdge{a: int32(nb[0][0]), b: int32(nb[0][1] + off)},
		colourEdge{a: int32(nb[1][0]), b: int32(nb[1][1] + off)})
	return refineColours(c, edges)
}

// refineColours runs colour refinement with commutative neighbour sums on the initial
// colours in the first half of c (the second half is work space) over edges (each with a
// label t, 0 for none, mixed into what it adds to both ends) until a round splits no class
// (at most one round per atom), then sums over atoms.
// Refining to the stable partition rather than a fixed three rounds tells apart adducts
// that differ far from any distinctive atom (regio-isomers on a large ring system), and
// makes the colour classes small enough for searchBounded where the three-round classes
// still lumped atoms that no symmetry relates: both were canonical SMILES computed only to
// compare two adducts. The number of rounds depends only on the class counts, which are
// the same for isomorphic graphs, so equal graphs still get equal invariants and colours;
// every class remains a union of classes of smiles.Canonical's refined partition (its
// refinement starts from finer atom labels and also splits by neighbour classes to
// stability, and a hash collision can only merge classes), which is what searchBounded
// relies on.
func refineColours(c []uint64, edges []colourEdge) (uint64, []uint64) {
	n := len(c) / 2
	cur, nxt := c[:n], c[n:]
	// each edge's label, spread once rather than every round
	var tbuf [128]uint64
	ts := tbuf[:0]
	if len(edges) > len(tbuf) {
		ts = make([]uint64, 0, len(edges))
	}
	for _, e := range edges {
		ts = append(ts, e.t*0xd6e8feb86659fd93)
	}
	classes := countClasses(cur)
	for range max(n, 3) {
		for i := range nxt {
			nxt[i] = cur[i] * 0x9e3779b97f4a7c15
		}
		for k, e := range edges {
			t := ts[k]
			nxt[e.a] += mix64(cur[e.b] ^ t)
			nxt[e.b] += mix64(cur[e.a] ^ t)
		}
		for i := range nxt {
			nxt[i] = mix64(nxt[i])
		}
		k := countClasses(nxt)
		if k <= classes {
			break // stable: cur's partition (nxt's colours are a relabelling of it)
		}
		cur, nxt = nxt, cur
		classes = k
	}
	var h uint64
	for _, v := range cur {
		h += mix64(v ^ 0x5851f42d4c957f2d)
	}
	return h, cur
}

// colourEdge is a bond for refineColours: its two atoms and a label t (0 for none), mixed
// into what it adds to both ends.
type colourEdge struct {
	a, b int32
	t    uint64
}

// countClasses is the number of distinct values in c (an open-addressing set on the stack
// for up to 128 atoms, sized to the molecule: a sort per refinement round was 5 % of a
// printed row, and zeroing a table for 256 atoms every round of a 40-atom adduct most of
// what was left).
func countClasses(c []uint64) int {
	if len(c) <= 64 {
		var buf [128]uint64
		var used [128]bool
		return countInto(c, buf[:], used[:])
	}
	size := 256
	for size < 2*len(c) {
		size *= 2
	}
	if size == 256 {
		var buf [256]uint64
		var used [256]bool
		return countInto(c, buf[:], used[:])
	}
	return countInto(c, make([]uint64, size), make([]bool, size))
}

// countInto counts the distinct values of c in the open-addressing table tab (occ marks the
// used slots; both zeroed, of a power-of-two length at least 2·len(c)).
func countInto(c, tab []uint64, occ []bool) int {
	mask := uint64(len(tab) - 1)
	k := 0
	for _, v := range c {
		for h := mix64(v) & mask; ; h = (h + 1) & mask {
			if !occ[h] {
				occ[h], tab[h] = true, v
				k++
				break
			}
			if tab[h] == v {
				break
			}
		}
	}
	return k
}
