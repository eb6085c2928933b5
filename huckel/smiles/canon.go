package smiles

import (
	"cmp"
	"slices"

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
// atom is (atomic number, isotope, charge, hydrogens, degree, atom map, smallest ring
// through it), and classes are split by the sorted multiset of (neighbour class, bond
// type, smallest ring through the bond) until stable. The ring sizes are there because
// refinement alone cannot tell, for example, a phenyl ipso carbon from a ring-fusion carbon
// of a larger ring with the same neighbours (a case the fuzzer found). When atoms
// are still tied, the tied class with the lowest rank is split by promoting its
// lowest-index atom, and refinement resumes, until every atom has its own rank. The
// molecule is then written with Write in rank order.
//
// Kekulé structures. Two Kekulé structures of the same ring system (benzene written
// C1=CC=CC=C1 from different starting atoms, or naphthalene's three forms) are different
// labelled graphs. Canonical therefore first marks the "alternation graph": atoms with
// exactly one double bond, lying in a ring, no triple bond, whose double-bond partner is
// such an atom too, joined by their ring bonds of order 1 or 2. Every Kekulé structure of
// the molecule is a perfect matching of that same graph, so its bonds get one common type
// for ranking, and after ranking the double bonds are placed again by a perfect matching
// computed in rank order (greedy then Edmonds augmentation, both deterministic). Charge
// -separated resonance forms (a nitro group written N(=O)=O versus [N+](=O)[O-]) are
// different graphs and stay different.
//
// Limitations. Ties are broken by input index after refinement has converged; when the
// tied atoms are symmetry-equivalent (the usual case) every choice gives the same string,
// but colour refinement cannot separate every pair of non-equivalent atoms (some highly
// regular polycyclic graphs), and there two atom orders of one molecule could give two
// strings. The error is one-sided: the result is always a faithful SMILES of m (Parse
// reads it back to m's graph), so two different molecules never share a string; a
// deduplication can at worst keep a duplicate. Cost grows roughly as n² log n for n atoms
// in the worst (highly symmetric) case: tens of microseconds for cycloadduct-sized
// molecules, seconds for symmetric molecules of thousands of atoms. Stereo marks, chirality and the Aromatic flags are ignored; atom maps count (clear
// Atom.Map first to compare structures without them).
func Canonical(m *molecule.Molecule) string {
	n := len(m.Atoms)
	if n == 0 {
		return ""
	}
	btype, inAlt := alternation(m)
	rank := canonicalRanks(m, btype, smallestRings(m))

	// Build the molecule in rank order.
	c := &molecule.Molecule{Atoms: make([]molecule.Atom, n), Bonds: make([]molecule.Bond, 0, len(m.Bonds))}
	for i, a := range m.Atoms {
		c.Atoms[rank[i]] = molecule.Atom{Element: a.Element, Isotope: a.Isotope, Charge: a.Charge, HCount: a.HCount, Map: a.Map, Pos: -1}
	}
	type cb struct{ a, b, t, order int }
	bonds := make([]cb, len(m.Bonds))
	for i, b := range m.Bonds {
		x, y := rank[b.A], rank[b.B]
		if x > y {
			x, y = y, x
		}
		bonds[i] = cb{x, y, int(btype[i]), b.Order}
	}
	slices.SortFunc(bonds, func(p, q cb) int {
		if p.a != q.a {
			return p.a - q.a
		}
		return p.b - q.b
	})
	for _, b := range bonds {
		c.Bonds = append(c.Bonds, molecule.Bond{A: b.a, B: b.b, Order: b.order, Aromatic: b.t == bondAlt})
	}
	c.Reindex()
	if inAlt > 0 {
		need := make([]bool, n)
		for _, b := range c.Bonds {
			if b.Aromatic {
				need[b.A], need[b.B] = true, true
			}
		}
		if kekulise(c, need, nil) >= 0 {
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
	return Write(c)
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

// canonicalRanks returns a permutation rank[atom] in 0..n-1 (see Canonical).
func canonicalRanks(m *molecule.Molecule, btype []int8, ring []int) []int {
	n := len(m.Atoms)
	type key [7]int
	keys := make([]key, n)
	for i, a := range m.Atoms {
		small := 0 // smallest ring through the atom
		for _, e := range m.Neighbors(i) {
			if r := ring[e.Bond]; r > 0 && (small == 0 || r < small) {
				small = r
			}
		}
		keys[i] = key{AtomicNumber(a.Element), a.Isotope, a.Charge, a.HCount, m.Degree(i), a.Map, small}
	}
	// bond code: type and smallest ring size (capped; 0 outside rings)
	code := func(bi int) int { return int(btype[bi]) + 8*min(ring[bi], 255) }
	cmpAtoms := func(x, y int) int {
		if c := slices.Compare(keys[x][:], keys[y][:]); c != 0 {
			return c
		}
		return cmp.Compare(m.Atoms[x].Element, m.Atoms[y].Element)
	}
	ints := make([]int, 3*n)
	rank, order, newRank := ints[:n], ints[n:2*n], ints[2*n:]
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, cmpAtoms)
	classes := 0
	for k, i := range order {
		if k > 0 && cmpAtoms(order[k-1], i) != 0 {
			classes++
		}
		rank[i] = classes
	}
	classes++

	// signature of atom i: its rank, then the sorted (neighbour rank, bond type) codes
	sigBuf := make([]int, n+2*len(m.Bonds))
	sig := make([][]int, n)
	off := 0
	for i := range sig {
		d := 1 + m.Degree(i)
		sig[i] = sigBuf[off : off : off+d]
		off += d
	}
	refine := func() {
		for {
			for i := range m.Atoms {
				s := append(sig[i][:0], rank[i])
				for _, e := range m.Neighbors(i) {
					s = append(s, rank[e.To]*2048+code(e.Bond))
				}
				slices.Sort(s[1:])
				sig[i] = s
			}
			slices.SortStableFunc(order, func(x, y int) int { return slices.Compare(sig[x], sig[y]) })
			next := 0
			for k, i := range order {
				if k > 0 && slices.Compare(sig[order[k-1]], sig[i]) != 0 {
					next++
				}
				newRank[i] = next
			}
			next++
			copy(rank, newRank)
			if next == classes {
				return
			}
			classes = next
		}
	}
	refine()
	for classes < n {
		// order is sorted by rank: find the lowest tied class and promote its lowest index
		best := -1
		for k := 1; k < n && best < 0; k++ {
			r := rank[order[k]]
			if r != rank[order[k-1]] {
				continue
			}
			for j := k - 1; j < n && rank[order[j]] == r; j++ {
				if best < 0 || order[j] < best {
					best = order[j]
				}
			}
		}
		for i := range rank {
			rank[i] *= 2
		}
		rank[best]--
		slices.SortStableFunc(order, func(x, y int) int { return rank[x] - rank[y] })
		next := 0
		for k, i := range order {
			if k > 0 && rank[order[k-1]] != rank[i] {
				next++
			}
			newRank[i] = next
		}
		copy(rank, newRank)
		classes = next + 1
		refine()
	}
	return rank
}
