package depict

import (
	"slices"

	"cyclopair/huckel/molecule"
)

// graph is a compact adjacency view of the molecule with ring-bond flags.
type graph struct {
	n      int
	adj    [][]int // neighbours in bond-insertion order
	bondOf [][]int // bond index parallel to adj
	bonds  [][2]int
	order  []int  // Kekulé order per bond
	inRing []bool // per bond
}

func newGraph(m *molecule.Molecule) *graph {
	n := len(m.Atoms)
	g := &graph{n: n, adj: make([][]int, n), bondOf: make([][]int, n)}
	deg := 0
	for i := range m.Atoms {
		deg += len(m.Neighbors(i))
	}
	// One backing array each for the neighbour and bond lists (capped sub-slices).
	adj, bondOf := make([]int, 0, deg), make([]int, 0, deg)
	for i := range m.Atoms {
		k := len(adj)
		for _, e := range m.Neighbors(i) {
			adj = append(adj, e.To)
			bondOf = append(bondOf, e.Bond)
		}
		if len(adj) > k {
			g.adj[i], g.bondOf[i] = adj[k:len(adj):len(adj)], bondOf[k:len(adj):len(adj)]
		}
	}
	g.bonds, g.order = make([][2]int, len(m.Bonds)), make([]int, len(m.Bonds))
	for bi, b := range m.Bonds {
		g.bonds[bi], g.order[bi] = [2]int{b.A, b.B}, b.Order
	}
	g.inRing = g.ringBonds()
	return g
}

// ringBonds marks bonds that lie on a cycle (non-bridges), by an iterative DFS with low links.
func (g *graph) ringBonds() []bool {
	inRing := make([]bool, len(g.bonds))
	disc := make([]int, g.n)
	low := make([]int, g.n)
	for i := range disc {
		disc[i] = -1
	}
	t := 0
	type frame struct{ v, parentBond, next int }
	for s := 0; s < g.n; s++ {
		if disc[s] >= 0 {
			continue
		}
		stack := []frame{{s, -1, 0}}
		disc[s], low[s] = t, t
		t++
		for len(stack) > 0 {
			f := &stack[len(stack)-1]
			if f.next < len(g.adj[f.v]) {
				w, b := g.adj[f.v][f.next], g.bondOf[f.v][f.next]
				f.next++
				if b == f.parentBond {
					continue
				}
				if disc[w] < 0 {
					disc[w], low[w] = t, t
					t++
					stack = append(stack, frame{w, b, 0})
				} else {
					inRing[b] = true // a back edge always closes a cycle
					if disc[w] < low[f.v] {
						low[f.v] = disc[w]
					}
				}
				continue
			}
			v, pb := f.v, f.parentBond
			stack = stack[:len(stack)-1]
			if len(stack) > 0 {
				u := stack[len(stack)-1].v
				if low[v] < low[u] {
					low[u] = low[v]
				}
				if low[v] <= disc[u] { // v–u is on a cycle
					inRing[pb] = true
				}
			}
		}
	}
	// Parallel bonds (the same pair joined twice) cannot occur in a simple molecule graph, so
	// the low-link test above is exact.
	return inRing
}

// sssr returns a smallest set of smallest rings: a minimum cycle basis over the ring bonds,
// built from Horton's candidate cycles (shortest path r→x, edge x–y, shortest path y→r) and
// Gaussian elimination over GF(2) on the bond sets. Ties are broken by size, then by the sorted
// atom list, so the result is deterministic.
//
// Reference: J. D. Horton, "A polynomial-time algorithm to find the shortest cycle basis of a
// graph", SIAM J. Comput. 16 (1987) 358–366.
func (g *graph) sssr() [][]int {
	// ring atoms and the number of independent cycles
	ringAtom := make([]bool, g.n)
	nRingBonds := 0
	for b, r := range g.inRing {
		if r {
			ringAtom[g.bonds[b][0]], ringAtom[g.bonds[b][1]] = true, true
			nRingBonds++
		}
	}
	if nRingBonds == 0 {
		return nil
	}
	// cyclomatic number of the ring-bond subgraph: E − V + components
	nRingAtoms := 0
	for _, r := range ringAtom {
		if r {
			nRingAtoms++
		}
	}
	comps := 0
	seen := make([]bool, g.n)
	for s := 0; s < g.n; s++ {
		if !ringAtom[s] || seen[s] {
			continue
		}
		comps++
		q := []int{s}
		seen[s] = true
		for len(q) > 0 {
			v := q[0]
			q = q[1:]
			for k, w := range g.adj[v] {
				if g.inRing[g.bondOf[v][k]] && !seen[w] {
					seen[w] = true
					q = append(q, w)
				}
			}
		}
	}
	need := nRingBonds - nRingAtoms + comps

	type cand struct {
		atoms []int // ring order
		key   []int // sorted atoms
		bits  []uint64
	}
	words := (len(g.bonds) + 63) / 64
	var cands []cand
	seenKey := map[string]bool{} // dedup only; never iterated
	parent := make([]int, g.n)
	parentBond := make([]int, g.n)
	depth := make([]int, g.n)
	onX := make([]int, g.n) // onX[v] == stamp: v is on the current path r … x
	stamp := 0
	// Buffers reused across roots and candidate bonds.
	var q, px, py, cyc, key []int
	var kb []byte
	pathTo := func(p []int, x int) []int { // x … r
		p = p[:0]
		for v := x; v >= 0; v = parent[v] {
			p = append(p, v)
		}
		return p
	}
	for r := 0; r < g.n; r++ {
		if !ringAtom[r] {
			continue
		}
		for i := range parent {
			parent[i], depth[i] = -2, -1
		}
		parent[r], depth[r], parentBond[r] = -1, 0, -1
		q = append(q[:0], r)
		for h := 0; h < len(q); h++ {
			v := q[h]
			for k, w := range g.adj[v] {
				b := g.bondOf[v][k]
				if !g.inRing[b] || depth[w] >= 0 {
					continue
				}
				depth[w], parent[w], parentBond[w] = depth[v]+1, v, b
				q = append(q, w)
			}
		}
		for b, isRing := range g.inRing {
			if !isRing {
				continue
			}
			x, y := g.bonds[b][0], g.bonds[b][1]
			if depth[x] < 0 || depth[y] < 0 || parentBond[x] == b || parentBond[y] == b {
				continue
			}
			px, py = pathTo(px, x), pathTo(py, y)
			// the paths must meet only at r
			stamp++
			for _, v := range px[:len(px)-1] {
				onX[v] = stamp
			}
			ok := true
			for _, v := range py[:len(py)-1] {
				if onX[v] == stamp {
					ok = false
					break
				}
			}
			if !ok {
				continue
			}
			// cycle: r … x (reverse of px), then y … r without repeating r
			cyc = cyc[:0]
			for i := len(px) - 1; i >= 0; i-- {
				cyc = append(cyc, px[i])
			}
			cyc = append(cyc, py[:len(py)-1]...)
			key = append(key[:0], cyc...)
			slices.Sort(key)
			kb = appendKey(kb[:0], key)
			if seenKey[string(kb)] {
				continue
			}
			seenKey[string(kb)] = true
			bits := make([]uint64, words)
			for i, v := range cyc {
				w := cyc[(i+1)%len(cyc)]
				bi := g.bondIndex(v, w)
				bits[bi/64] |= 1 << (bi % 64)
			}
			cands = append(cands, cand{atoms: slices.Clone(cyc), key: slices.Clone(key), bits: bits})
		}
	}
	slices.SortStableFunc(cands, func(a, b cand) int {
		if len(a.key) != len(b.key) {
			return len(a.key) - len(b.key)
		}
		return slices.Compare(a.key, b.key)
	})
	// Gaussian elimination: keep a candidate if it is independent of those kept so far.
	var basis [][]uint64 // reduced rows with distinct pivots
	var pivots []int
	var out [][]int
	for _, c := range cands {
		if len(out) == need {
			break
		}
		v := slices.Clone(c.bits)
		for i, row := range basis {
			p := pivots[i]
			if v[p/64]&(1<<(p%64)) != 0 {
				for w := range v {
					v[w] ^= row[w]
				}
			}
		}
		p := -1
		for w := range v {
			if v[w] != 0 {
				for bit := 0; bit < 64; bit++ {
					if v[w]&(1<<bit) != 0 {
						p = w*64 + bit
						break
					}
				}
				break
			}
		}
		if p < 0 {
			continue
		}
		// keep rows reduced on the new pivot so later reductions stay correct
		for i, row := range basis {
			if row[p/64]&(1<<(p%64)) != 0 {
				for w := range row {
					basis[i][w] ^= v[w]
				}
			}
		}
		basis = append(basis, v)
		pivots = append(pivots, p)
		out = append(out, canonicalRing(c.atoms))
	}
	return out
}

func (g *graph) bondIndex(a, b int) int {
	for k, w := range g.adj[a] {
		if w == b {
			return g.bondOf[a][k]
		}
	}
	return -1
}

// canonicalRing rotates a ring to start at its lowest atom and go towards the lower neighbour.
func canonicalRing(r []int) []int {
	n := len(r)
	lo := 0
	for i := range r {
		if r[i] < r[lo] {
			lo = i
		}
	}
	out := make([]int, 0, n)
	if r[(lo+1)%n] < r[(lo+n-1)%n] {
		for i := 0; i < n; i++ {
			out = append(out, r[(lo+i)%n])
		}
	} else {
		for i := 0; i < n; i++ {
			out = append(out, r[(lo-i+n)%n])
		}
	}
	return out
}

// appendKey appends the bytes of key (4 per atom index) to b: the dedup key of a ring.
func appendKey(b []byte, key []int) []byte {
	for _, v := range key {
		b = append(b, byte(v>>24), byte(v>>16), byte(v>>8), byte(v))
	}
	return b
}
