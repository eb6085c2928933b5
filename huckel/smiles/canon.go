package smiles

import (
	"cmp"
	"slices"
	"strings"
	"sync"

	"cyclopair/huckel/molecule"
)

// bond types used for ranking: Kekulé orders 1–3 and bondAlt for a bond whose order may
// differ between Kekulé structures of the same molecule
const bondAlt = 4

// Canonical returns a canonical SMILES of m: isomorphic graphs give the same string
// whatever their atom order, bond order or Kekulé structure. It is meant for telling
// products apart and deduplicating them, not for display.
//
// Method. Atoms are ranked by a Morgan-style refinement (H. L. Morgan, J. Chem. Doc. 5,
// 107–113, 1965; here in the iterated partition-refinement form): the initial class of an
// atom is (degree, atomic number, isotope, charge, hydrogens, atom map, smallest ring
// through it), and classes are split by the sorted multiset of (neighbour class, bond
// type, smallest ring through the bond) until stable. Where atoms are still tied, the
// first tied class is split by individualising each of its atoms in turn and refining
// again, recursively, and every leaf of that search tree (a complete ranking) is written
// with Write in rank order; the smallest string wins (the individualisation-refinement
// scheme of canonical labelling programs, with the simplest automorphism pruning). The
// set of leaves depends only on the graph, so the result is canonical.
//
// Kekulé structures. Two Kekulé structures of the same ring system (benzene written
// C1=CC=CC=C1 from different starting atoms, or naphthalene's three forms) are different
// labelled graphs. Canonical therefore first marks the "alternation graph": atoms with
// exactly one double bond, lying in a ring, no triple bond, whose double-bond partner is
// such an atom too, joined by their ring bonds of order 1 or 2. Every Kekulé structure of
// the molecule is a perfect matching of that same graph, so its bonds get one common type
// for ranking, and for each leaf the double bonds are placed again by a perfect matching
// computed in rank order (greedy then Edmonds augmentation, both deterministic). Charge
// -separated resonance forms (a nitro group written N(=O)=O versus [N+](=O)[O-]) are
// different graphs and stay different.
//
// Limitations. Even with the pruning the search grows with the symmetry of the molecule.
// Beyond 256 leaves Canonical stops searching and breaks each remaining tie by promoting
// the lowest-index atom of the first tied class. That is still canonical when the tied
// atoms are symmetry-equivalent, which is the usual reason for a tie, but where
// refinement cannot separate non-equivalent atoms of such a highly symmetric molecule,
// two atom orders could give two strings. The error is one-sided: the result is always a
// faithful SMILES of m (Parse reads it back to m's graph), so two different molecules
// never share a string; a deduplication can at worst keep a duplicate. Stereo marks,
// chirality and the Aromatic flags are ignored; atom maps count (clear Atom.Map first to
// compare structures without them).
func Canonical(m *molecule.Molecule) string {
	if len(m.Atoms) == 0 {
		return ""
	}
	s, _ := canonical(m, smallestRings(m), false)
	return s
}

// CanonicalStereo is Canonical with the tetrahedral configurations set in Atom.Chiral
// written as '@'/'@@': two molecules with the same graph and the same relative
// configuration give the same string, mirror images and diastereomers different ones.
// A mark is kept only on a stereocentre: an atom with four neighbours (at most one of them
// an implicit hydrogen) whose neighbours are pairwise in different symmetry classes of the
// refinement; marks elsewhere (a CH2, an atom with two equivalent branches) are dropped, so
// a stray mark never splits one compound into two strings. Pseudo-asymmetric centres
// (two constitutionally equal branches of opposite configuration) are not recognised and
// lose their mark. The same search as Canonical runs over the same leaves with the marks
// included in each leaf's string, so the smallest string is again canonical; directional
// bond marks (/ \) are still ignored.
func CanonicalStereo(m *molecule.Molecule) string {
	if len(m.Atoms) == 0 {
		return ""
	}
	s, _ := canonical(m, smallestRings(m), true)
	return s
}

// CanonicalStereoMirror returns CanonicalStereo(m) and CanonicalStereo of m's mirror image
// (every Atom.Chiral negated) from one search: the refinement ignores configurations, so
// both run over the same leaves, and a leaf's string for the mirror image is its string for
// m with every '@' and '@@' exchanged (the writer's mark is the configuration times the
// parity of the output neighbour order, and '@' appears nowhere else in a SMILES).
func CanonicalStereoMirror(m *molecule.Molecule) (s, mirror string) {
	if len(m.Atoms) == 0 {
		return "", ""
	}
	s, mirror, _ = canonicalSearch(m, smallestRings(m), true, true)
	return s, mirror
}

// swapChirality exchanges '@' and '@@' in a SMILES written by Write.
func swapChirality(s string) string {
	at := strings.IndexByte(s, '@')
	if at < 0 {
		return s
	}
	b := make([]byte, 0, len(s)+4)
	b = append(b, s[:at]...)
	for i := at; i < len(s); i++ {
		if s[i] != '@' {
			b = append(b, s[i])
			continue
		}
		if i+1 < len(s) && s[i+1] == '@' {
			b = append(b, '@')
			i++
		} else {
			b = append(b, '@', '@')
		}
	}
	return string(b)
}

// stereoCentres returns Atom.Chiral per atom, kept only where the atom is a stereocentre by
// the refined classes rank (see CanonicalStereo), or nil when no atom keeps a mark.
func stereoCentres(m *molecule.Molecule, rank []int) []int8 {
	var out []int8
	for v, a := range m.Atoms {
		if a.Chiral == 0 || a.HCount > 1 || m.Degree(v)+a.HCount != 4 {
			continue
		}
		seen := map[int]bool{}
		distinct := true
		for _, e := range m.Neighbors(v) {
			if seen[rank[e.To]] {
				distinct = false
			}
			seen[rank[e.To]] = true
		}
		if !distinct {
			continue
		}
		if out == nil {
			out = make([]int8, len(m.Atoms))
		}
		out[v] = a.Chiral
	}
	return out
}

// canonical is Canonical with the ring-size invariants given (tests pass zeros to check
// the search on its own); exact is false when the search gave up.
func canonical(m *molecule.Molecule, ringSizes []int, stereo bool) (s string, exact bool) {
	s, _, exact = canonicalSearch(m, ringSizes, stereo, false)
	return s, exact
}

// canonicalSearch is canonical that also returns, when mirror is set, the smallest leaf
// string of m's mirror image (see CanonicalStereoMirror).
func canonicalSearch(m *molecule.Molecule, ringSizes []int, stereo, mirror bool) (s, ms string, exact bool) {
	btype, inAlt := alternation(m)
	cw := canonWorks.Get().(*canonWork)
	defer func() {
		cw.r.m, cw.lw.old, cw.lw.w.m = nil, nil, nil // keep no molecule reachable from the pool
		canonWorks.Put(cw)
	}()
	r := &cw.r
	r.reset(m, btype, ringSizes)
	rank := r.initial()
	r.refine(rank)
	var chiral []int8
	if stereo {
		chiral = stereoCentres(m, rank)
	}
	lw := &cw.lw
	writeRanked := func(m *molecule.Molecule, btype []int8, inAlt int, rank []int) string {
		return lw.write(m, btype, inAlt, rank, chiral)
	}
	swap := func(s string) string {
		if !mirror {
			return ""
		}
		return swapChirality(s)
	}
	if r.classes(rank) == len(rank) {
		s := writeRanked(m, btype, inAlt, rank)
		return s, swap(s), true
	}
	// Depth-first search over individualisations. A leaf whose string equals an earlier
	// leaf's reveals an automorphism mapping the earlier path onto this one, so the
	// subtree below their deepest common node is a copy of one already searched and is
	// skipped (the automorphism pruning of B. D. McKay, "Practical graph isomorphism",
	// Congressus Numerantium 30, 45–87, 1981, in its simplest form).
	best, bestMirror, leaves := "", "", 0
	seen := map[string][]int{} // leaf string → path that produced it
	var path []int
	const abort = -2
	// search returns -1 to go on, abort to give up, or the depth of the node whose next
	// child the search should continue with.
	var search func(rank []int) int
	search = func(rank []int) int {
		cell := r.firstTiedCell(rank)
		if cell == nil {
			leaves++
			s := writeRanked(m, btype, inAlt, rank)
			if p, ok := seen[s]; ok {
				d := 0
				for d < len(p) && d < len(path) && p[d] == path[d] {
					d++
				}
				return d
			}
			seen[s] = slices.Clone(path)
			if best == "" || s < best {
				best = s
			}
			if mirror {
				if sm := swapChirality(s); bestMirror == "" || sm < bestMirror {
					bestMirror = sm
				}
			}
			if leaves > maxCanonicalLeaves {
				return abort
			}
			return -1
		}
		depth := len(path)
		for k, c := range cell {
			if pruneTwins && twinOfAny(m, btype, chiral, c, cell[:k]) {
				continue // its subtree is an image of a twin's, already searched
			}
			next := slices.Clone(rank)
			r.individualise(next, c)
			r.refine(next)
			path = append(path, k)
			res := search(next)
			path = path[:depth]
			if res == abort || (res >= 0 && res < depth) {
				return res
			}
		}
		return -1
	}
	if search(rank) != abort {
		return best, bestMirror, true
	}
	// too symmetric to search: promote the lowest-index atom of each first tied class
	for {
		cell := r.firstTiedCell(rank)
		if cell == nil {
			s := writeRanked(m, btype, inAlt, rank)
			return s, swap(s), false
		}
		r.individualise(rank, cell[0])
		r.refine(rank)
	}
}

// pruneTwins switches twinOfAny's pruning on (off only in the test that compares both).
var pruneTwins = true

// twinOfAny reports whether atom c is a twin of one of the atoms done: same labels
// (element, isotope, charge, hydrogens, map, no kept configuration) and the same
// neighbours through bonds of the same order and ranking type, apart from each other
// (the two methyls of an NMe2, the fluorines of a CF3). Swapping two twins and fixing every
// other atom is an automorphism of the labelled graph that fixes every atom individualised
// so far (twins in one tied cell were never individualised), so it maps the subtree of one
// twin onto the other's: the same leaf strings, the same minimum. Skipping it is the
// automorphism pruning of canonicalSearch, found without descending.
func twinOfAny(m *molecule.Molecule, btype []int8, chiral []int8, c int, done []int) bool {
	for _, d := range done {
		if twins(m, btype, chiral, c, d) {
			return true
		}
	}
	return false
}

func twins(m *molecule.Molecule, btype []int8, chiral []int8, u, v int) bool {
	a, b := &m.Atoms[u], &m.Atoms[v]
	if a.Element != b.Element || a.Isotope != b.Isotope || a.Charge != b.Charge || a.HCount != b.HCount || a.Map != b.Map {
		return false
	}
	if chiral != nil && (chiral[u] != 0 || chiral[v] != 0) {
		return false
	}
	nu, nv := m.Neighbors(u), m.Neighbors(v)
	if len(nu) != len(nv) {
		return false
	}
	for _, e := range nu {
		if e.To == v {
			continue
		}
		found := false
		for _, f := range nv {
			if f.To == e.To && m.Bonds[f.Bond].Order == m.Bonds[e.Bond].Order && btype[f.Bond] == btype[e.Bond] {
				found = true
				break
			}
		}
		if !found {
			return false
		}
	}
	return true
}

// maxCanonicalLeaves bounds the search of Canonical (see its Limitations).
const maxCanonicalLeaves = 256

// rankedBond is a bond of the renumbered molecule: ends a < b, ranking type t, order.
type rankedBond struct{ a, b, t, order int }

// leafWriter writes m with atoms renumbered by rank (a permutation), re-kekulising the
// alternation graph in rank order; chiral (nil for none) gives each atom's Atom.Chiral in
// m's numbering, carried over to the new numbering. Its buffers are kept from one leaf of
// the canonical search to the next (up to maxCanonicalLeaves strings per molecule).
type leafWriter struct {
	atoms []molecule.Atom
	bonds []rankedBond
	out   []molecule.Bond
	need  []bool
	sc    scratch
	w     writer
	old   [][]int // per atom of m with a kept configuration: m.StereoOrder, computed once
}

func (lw *leafWriter) write(m *molecule.Molecule, btype []int8, inAlt int, rank []int, chiral []int8) string {
	n := len(m.Atoms)
	if cap(lw.atoms) < n {
		lw.atoms = make([]molecule.Atom, n)
	}
	// a new header each time: the molecule's own adjacency is never built (the writer
	// takes its adjacency from the sorted bonds), so none can go stale between leaves
	c := &molecule.Molecule{Atoms: lw.atoms[:n]}
	for i, a := range m.Atoms {
		c.Atoms[rank[i]] = molecule.Atom{Element: a.Element, Isotope: a.Isotope, Charge: a.Charge, HCount: a.HCount, Map: a.Map, Pos: -1}
	}
	bonds := lw.bonds[:0]
	for i, b := range m.Bonds {
		x, y := rank[b.A], rank[b.B]
		if x > y {
			x, y = y, x
		}
		bonds = append(bonds, rankedBond{x, y, int(btype[i]), b.Order})
	}
	lw.bonds = bonds
	slices.SortFunc(bonds, func(p, q rankedBond) int {
		if p.a != q.a {
			return p.a - q.a
		}
		return p.b - q.b
	})
	c.Bonds = lw.out[:0]
	for _, b := range bonds {
		c.Bonds = append(c.Bonds, molecule.Bond{A: b.a, B: b.b, Order: b.order, Aromatic: b.t == bondAlt})
	}
	lw.out = c.Bonds
	if inAlt > 0 {
		if cap(lw.need) < n {
			lw.need = make([]bool, n)
		}
		need := lw.need[:n]
		clear(need)
		for _, b := range c.Bonds {
			if b.Aromatic {
				need[b.A], need[b.B] = true, true
			}
		}
		if kekulise(c, need, &lw.sc) >= 0 {
			// Cannot happen (m's own double bonds are a perfect matching of this graph);
			// keep m's orders rather than write a broken structure.
			for i := range c.Bonds {
				c.Bonds[i].Order = bonds[i].order
			}
		}
		for i := range c.Bonds {
			c.Bonds[i].Aromatic = false
		}
	}
	lw.w.reset(c, true)
	if chiral != nil && lw.old == nil {
		lw.old = make([][]int, n)
		for i, x := range chiral {
			if x != 0 {
				lw.old[i] = m.StereoOrder(i)
			}
		}
	}
	for i, x := range chiral {
		if x == 0 {
			continue
		}
		var oldBuf, newBuf [4]int
		old := append(oldBuf[:0], lw.old[i]...)
		for k, nb := range old {
			if nb != molecule.ImplicitH {
				old[k] = rank[nb]
			}
		}
		if oddPermutation4(lw.w.stereoOrder(rank[i], newBuf[:0]), old) {
			x = -x
		}
		c.Atoms[rank[i]].Chiral = x
	}
	return lw.w.write()
}

// alternation returns each bond's ranking type (its order, or bondAlt for a bond of the
// alternation graph described at Canonical) and the number of such bonds.
func alternation(m *molecule.Molecule) ([]int8, int) {
	n := len(m.Atoms)
	btype := make([]int8, len(m.Bonds))
	double := make([]int, n) // index of the only double bond, -1 none, -2 several or a triple
	for i := range double {
		double[i] = -1
	}
	for bi, b := range m.Bonds {
		btype[bi] = int8(b.Order)
		for _, a := range [2]int{b.A, b.B} {
			switch {
			case b.Order == 3:
				double[a] = -2
			case b.Order == 2 && double[a] == -1:
				double[a] = bi
			case b.Order == 2:
				double[a] = -2
			}
		}
	}
	var inRing []bool
	// inGraph: a's only double bond lies in a ring and is also its partner's only one
	inGraph := func(a int) bool {
		d := double[a]
		if d < 0 || !inRing[d] {
			return false
		}
		p := m.Bonds[d].A
		if p == a {
			p = m.Bonds[d].B
		}
		return double[p] == d
	}
	count := 0
	for bi, b := range m.Bonds {
		if b.Order != 1 && b.Order != 2 {
			continue
		}
		if double[b.A] < 0 || double[b.B] < 0 {
			continue
		}
		if inRing == nil {
			inRing = ringBondsInto(m, make([]bool, len(m.Bonds)))
		}
		if !inRing[bi] || !inGraph(b.A) || !inGraph(b.B) {
			continue
		}
		btype[bi] = bondAlt
		count++
	}
	return btype, count
}

// smallestRings returns for each bond the size of the smallest ring containing it (0 for
// a bond in no ring): one breadth-first search per ring bond for the shortest path between
// its ends that avoids it.
func smallestRings(m *molecule.Molecule) []int {
	n := len(m.Atoms)
	size := make([]int, len(m.Bonds))
	inRing := ringBondsInto(m, make([]bool, len(m.Bonds)))
	dist := make([]int, n)
	queue := make([]int, 0, n)
	for bi, b := range m.Bonds {
		if !inRing[bi] {
			continue
		}
		for i := range dist {
			dist[i] = -1
		}
		dist[b.A] = 0
		queue = append(queue[:0], b.A)
		for q := 0; q < len(queue) && dist[b.B] < 0; q++ {
			v := queue[q]
			for _, e := range m.Neighbors(v) {
				if e.Bond == bi || dist[e.To] >= 0 || !inRing[e.Bond] {
					continue
				}
				dist[e.To] = dist[v] + 1
				queue = append(queue, e.To)
			}
		}
		size[bi] = dist[b.B] + 1
	}
	return size
}

// ranker holds the invariants and work space of the refinement.
type ranker struct {
	m       *molecule.Molecule
	keys    [][7]int
	code    []int // per bond: type + 8·smallest ring size
	sig     [][]int
	order   []int
	newRank []int
	count   []int
	start   []int // counting-sort offsets, 2n+1
	// buffers kept between molecules (canonWork)
	ints, sigBuf []int
}

func newRanker(m *molecule.Molecule, btype []int8, ring []int) *ranker {
	r := new(ranker)
	r.reset(m, btype, ring)
	return r
}

// reset prepares r for m, reusing its buffers.
func (r *ranker) reset(m *molecule.Molecule, btype []int8, ring []int) {
	n := len(m.Atoms)
	r.m = m
	r.keys = growSlice(r.keys, n)
	r.code = growSlice(r.code, len(m.Bonds))
	for bi := range m.Bonds {
		r.code[bi] = int(btype[bi]) + 8*min(ring[bi], 255)
	}
	for i, a := range m.Atoms {
		small := 0 // smallest ring through the atom
		for _, e := range m.Neighbors(i) {
			if s := ring[e.Bond]; s > 0 && (small == 0 || s < small) {
				small = s
			}
		}
		// degree first, so the string starts at a terminal atom (CC(=O)..., O=C1...)
		r.keys[i] = [7]int{m.Degree(i), AtomicNumber(a.Element), a.Isotope, a.Charge, a.HCount, a.Map, small}
	}
	r.ints = growSlice(r.ints, 5*n+1)
	ints := r.ints
	r.order, r.newRank, r.count, r.start = ints[:n], ints[n:2*n], ints[2*n:3*n], ints[3*n:]
	r.sigBuf = growSlice(r.sigBuf, n+2*len(m.Bonds))
	r.sig = growSlice(r.sig, n)
	off := 0
	for i := range r.sig {
		d := 1 + m.Degree(i)
		r.sig[i] = r.sigBuf[off : off : off+d]
		off += d
	}
}

// growSlice returns b with length n, reallocated only when its capacity is short (the
// contents are not cleared).
func growSlice[T any](b []T, n int) []T {
	if cap(b) < n {
		return make([]T, n, n+n/2)
	}
	return b[:n]
}

// canonWork is the reusable work space of one canonical search.
type canonWork struct {
	r  ranker
	lw leafWriter
}

var canonWorks = sync.Pool{New: func() any { return new(canonWork) }}

// initial ranks atoms by their invariants (dense ranks from 0).
func (r *ranker) initial() []int {
	m := r.m
	cmpAtoms := func(x, y int) int {
		if c := slices.Compare(r.keys[x][:], r.keys[y][:]); c != 0 {
			return c
		}
		return cmp.Compare(m.Atoms[x].Element, m.Atoms[y].Element)
	}
	for i := range r.order {
		r.order[i] = i
	}
	slices.SortFunc(r.order, cmpAtoms)
	rank := make([]int, len(m.Atoms))
	next := 0
	for k, i := range r.order {
		if k > 0 && cmpAtoms(r.order[k-1], i) != 0 {
			next++
		}
		rank[i] = next
	}
	return rank
}

func (r *ranker) classes(rank []int) int {
	clear(r.count)
	k := 0
	for _, x := range rank {
		if r.count[x] == 0 {
			k++
		}
		r.count[x]++
	}
	return k
}

// refine splits rank classes by neighbour classes until stable; ranks stay dense and keep
// their relative order (a refinement never reorders existing classes).
func (r *ranker) refine(rank []int) {
	m := r.m
	n := len(rank)
	classes := r.classes(rank)
	for classes < n {
		// Atoms in rank order (a counting sort: ranks are dense), class by class. A new
		// rank orders atoms by (rank, sorted neighbour codes), as one sort of the whole
		// signatures would; only classes of two or more atoms need their codes compared.
		start := r.start[:classes+1]
		clear(start)
		for _, x := range rank {
			start[x+1]++
		}
		for x := 1; x <= classes; x++ {
			start[x] += start[x-1]
		}
		for i, x := range rank {
			r.order[start[x]] = i
			start[x]++
		}
		next := 0
		lo := 0
		for x := 0; x < classes; x++ {
			hi := start[x] // end of class x in r.order (start was advanced past it)
			seg := r.order[lo:hi]
			if len(seg) == 1 {
				r.newRank[seg[0]] = next
				next++
				lo = hi
				continue
			}
			for _, i := range seg {
				s := r.sig[i][:0]
				for _, e := range m.Neighbors(i) {
					s = append(s, rank[e.To]*2048+r.code[e.Bond])
				}
				slices.Sort(s)
				r.sig[i] = s
			}
			slices.SortFunc(seg, func(a, b int) int { return slices.Compare(r.sig[a], r.sig[b]) })
			for k, i := range seg {
				if k > 0 && slices.Compare(r.sig[seg[k-1]], r.sig[i]) != 0 {
					next++
				}
				r.newRank[i] = next
			}
			next++
			lo = hi
		}
		copy(rank, r.newRank)
		if next == classes {
			return
		}
		classes = next
	}
}

// firstTiedCell returns, in index order, the atoms of the lowest-ranked class with more
// than one atom, or nil when every atom has its own rank.
func (r *ranker) firstTiedCell(rank []int) []int {
	clear(r.count)
	for _, x := range rank {
		r.count[x]++
	}
	for x, c := range r.count {
		if c > 1 {
			var cell []int
			for i, y := range rank {
				if y == x {
					cell = append(cell, i)
				}
			}
			return cell
		}
	}
	return nil
}

// individualise gives atom c a rank of its own just below the rest of its class.
func (r *ranker) individualise(rank []int, c int) {
	n := len(rank)
	// ranks are dense in [0, n); doubled they are even, and c's 2r−1 (−1 for r = 0) sits
	// just below its class: the new dense rank of a value is the number of values in use
	// below it (slot v+1 of used holds value v)
	used := r.start[:2*n]
	clear(used)
	for i := range rank {
		rank[i] *= 2
	}
	rank[c]--
	for _, x := range rank {
		used[x+1] = 1
	}
	sum := 0
	for k, p := range used {
		used[k] = sum
		sum += p
	}
	for i, x := range rank {
		rank[i] = used[x+1]
	}
}
