package depict

import (
	"slices"

	"cyclopair/huckel/molecule"
)

// graph is a compact adjacency view of the molecule with ring-bond flags. Its slices are
// reused by the next build (see Workspace).
type graph struct {
	n      int
	adj    [][]int // neighbours in bond-insertion order
	bondOf [][]int // bond index parallel to adj
	bonds  [][2]int
	order  []int  // Kekulé order per bond
	inRing []bool // per bond

	adjBuf, bondBuf []int // backing arrays of adj and bondOf
	disc, low       []int // ringBonds scratch
	stack           []dfsFrame
}

// dfsFrame is one level of the iterative DFS in ringBonds.
type dfsFrame struct{ v, parentBond, next int }

// build fills g from m, reusing g's buffers.
func (g *graph) build(m *molecule.Molecule) {
	n := len(m.Atoms)
	g.n = n
	g.adj, g.bondOf = grow(g.adj, n), grow(g.bondOf, n)
	deg := 0
	for i := range m.Atoms {
		deg += len(m.Neighbors(i))
	}
	// One backing array each for the neighbour and bond lists (capped sub-slices).
	if cap(g.adjBuf) < deg {
		g.adjBuf, g.bondBuf = make([]int, 0, deg), make([]int, 0, deg)
	}
	adj, bondOf := g.adjBuf[:0], g.bondBuf[:0]
	for i := range m.Atoms {
		k := len(adj)
		for _, e := range m.Neighbors(i) {
			adj = append(adj, e.To)
			bondOf = append(bondOf, e.Bond)
		}
		g.adj[i], g.bondOf[i] = nil, nil
		if len(adj) > k {
			g.adj[i], g.bondOf[i] = adj[k:len(adj):len(adj)], bondOf[k:len(adj):len(adj)]
		}
	}
	nb := len(m.Bonds)
	g.bonds, g.order = grow(g.bonds, nb), grow(g.order, nb)
	for bi, b := range m.Bonds {
		g.bonds[bi], g.order[bi] = [2]int{b.A, b.B}, b.Order
	}
	g.ringBonds()
}

// grow returns b resliced to length n, reallocated when its capacity is short. The
// contents are not cleared.
func grow[T any](b []T, n int) []T {
	if cap(b) < n {
		return make([]T, n, n+n/2)
	}
	return b[:n]
}

// ringBonds marks bonds that lie on a cycle (non-bridges), by an iterative DFS with low links.
// The result is g.inRing.
func (g *graph) ringBonds() {
	g.inRing = grow(g.inRing, len(g.bonds))
	inRing := g.inRing
	clear(inRing)
	g.disc, g.low = grow(g.disc, g.n), grow(g.low, g.n)
	disc, low := g.disc, g.low
	for i := range disc {
		disc[i] = -1
	}
	t := 0
	stack := g.stack[:0]
	for s := 0; s < g.n; s++ {
		if disc[s] >= 0 {
			continue
		}
		stack = append(stack[:0], dfsFrame{s, -1, 0})
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
					stack = append(stack, dfsFrame{w, b, 0})
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
	g.stack = stack
	// Parallel bonds (the same pair joined twice) cannot occur in a simple molecule graph, so
	// the low-link test above is exact.
}

// ringScratch holds the buffers of sssr, reused from one call to the next.
type ringScratch struct {
	ringAtom, seen            []bool
	parent, parentBond, depth []int
	onX                       []int
	q, px, py, cyc            []int
	cands                     []ringCand
	candAtoms, candKeys       []int    // ring order and sorted atoms of every candidate
	candBits                  []uint64 // bond sets, words per candidate
	basis                     []uint64 // reduced rows, words per row
	pivots                    []int
	flat                      []int   // the rings found, one after another
	ringOff                   []int   // start of ring k in flat
	rings                     [][]int // sub-slices of flat
}

// ringCand is a Horton candidate cycle: its atoms (ring order) at candAtoms[off:off+size],
// its sorted atoms at candKeys[off:off+size], its bond set at candBits[bit:bit+words].
type ringCand struct{ off, size, bit int }

// sssr returns a smallest set of smallest rings: a minimum cycle basis over the ring bonds,
// built from Horton's candidate cycles (shortest path r→x, edge x–y, shortest path y→r) and
// Gaussian elimination over GF(2) on the bond sets. Ties are broken by size, then by the sorted
// atom list, so the result is deterministic. The rings are sub-slices of w's buffers, valid
// until the next call with w.
//
// Reference: J. D. Horton, "A polynomial-time algorithm to find the shortest cycle basis of a
// graph", SIAM J. Comput. 16 (1987) 358–366.
func (g *graph) sssr(w *ringScratch) [][]int {
	// ring atoms and the number of independent cycles
	w.ringAtom = grow(w.ringAtom, g.n)
	ringAtom := w.ringAtom
	clear(ringAtom)
	nRingBonds := 0
	for b, r := range g.inRing {
		if r {
			ringAtom[g.bonds[b][0]], ringAtom[g.bonds[b][1]] = true, true
			nRingBonds++
		}
	}
	w.rings = w.rings[:0]
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
	w.seen = grow(w.seen, g.n)
	seen := w.seen
	clear(seen)
	q := w.q[:0]
	for s := 0; s < g.n; s++ {
		if !ringAtom[s] || seen[s] {
			continue
		}
		comps++
		q = append(q[:0], s)
		seen[s] = true
		for h := 0; h < len(q); h++ {
			v := q[h]
			for k, x := range g.adj[v] {
				if g.inRing[g.bondOf[v][k]] && !seen[x] {
					seen[x] = true
					q = append(q, x)
				}
			}
		}
	}
	need := nRingBonds - nRingAtoms + comps

	words := (len(g.bonds) + 63) / 64
	cands := w.cands[:0]
	candAtoms, candKeys, candBits := w.candAtoms[:0], w.candKeys[:0], w.candBits[:0]
	w.parent, w.parentBond, w.depth, w.onX = grow(w.parent, g.n), grow(w.parentBond, g.n), grow(w.depth, g.n), grow(w.onX, g.n)
	parent, parentBond, depth := w.parent, w.parentBond, w.depth
	onX := w.onX // onX[v] == stamp: v is on the current path r … x
	clear(onX)
	stamp := 0
	px, py, cyc := w.px, w.py, w.cyc
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
			for k, x := range g.adj[v] {
				b := g.bondOf[v][k]
				if !g.inRing[b] || depth[x] >= 0 {
					continue
				}
				depth[x], parent[x], parentBond[x] = depth[v]+1, v, b
				q = append(q, x)
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
			off := len(candKeys)
			candKeys = append(candKeys, cyc...)
			key := candKeys[off:]
			slices.Sort(key)
			dup := false
			for _, c := range cands { // dedup on the sorted atoms
				if c.size == len(key) && slices.Equal(candKeys[c.off:c.off+c.size], key) {
					dup = true
					break
				}
			}
			if dup {
				candKeys = candKeys[:off]
				continue
			}
			candAtoms = append(candAtoms, cyc...)
			bit := len(candBits)
			for range words {
				candBits = append(candBits, 0)
			}
			bits := candBits[bit:]
			for i, v := range cyc {
				u := cyc[(i+1)%len(cyc)]
				bi := g.bondIndex(v, u)
				bits[bi/64] |= 1 << (bi % 64)
			}
			cands = append(cands, ringCand{off: off, size: len(cyc), bit: bit})
		}
	}
	w.px, w.py, w.cyc, w.q = px, py, cyc, q
	w.cands, w.candAtoms, w.candKeys, w.candBits = cands, candAtoms, candKeys, candBits
	slices.SortStableFunc(cands, func(a, b ringCand) int {
		if a.size != b.size {
			return a.size - b.size
		}
		return slices.Compare(candKeys[a.off:a.off+a.size], candKeys[b.off:b.off+b.size])
	})
	// Gaussian elimination: keep a candidate if it is independent of those kept so far.
	basis := w.basis[:0] // reduced rows with distinct pivots, words each
	pivots := w.pivots[:0]
	flat, ringOff := w.flat[:0], w.ringOff[:0]
	for _, c := range cands {
		if len(ringOff) == need {
			break
		}
		off := len(basis)
		basis = append(basis, candBits[c.bit:c.bit+words]...)
		v := basis[off:]
		for i := range pivots {
			row := basis[i*words : (i+1)*words]
			p := pivots[i]
			if v[p/64]&(1<<(p%64)) != 0 {
				for k := range v {
					v[k] ^= row[k]
				}
			}
		}
		p := -1
		for k := range v {
			if v[k] != 0 {
				for bit := 0; bit < 64; bit++ {
					if v[k]&(1<<bit) != 0 {
						p = k*64 + bit
						break
					}
				}
				break
			}
		}
		if p < 0 {
			basis = basis[:off]
			continue
		}
		// keep rows reduced on the new pivot so later reductions stay correct
		for i := range pivots {
			row := basis[i*words : (i+1)*words]
			if row[p/64]&(1<<(p%64)) != 0 {
				for k := range row {
					row[k] ^= v[k]
				}
			}
		}
		pivots = append(pivots, p)
		ringOff = append(ringOff, len(flat))
		flat = appendCanonicalRing(flat, candAtoms[c.off:c.off+c.size])
	}
	w.basis, w.pivots, w.flat, w.ringOff = basis, pivots, flat, ringOff
	w.rings = splitFlat(w.rings, flat, ringOff)
	return w.rings
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
func canonicalRing(r []int) []int { return appendCanonicalRing(make([]int, 0, len(r)), r) }

// appendCanonicalRing appends the canonical rotation of r (see canonicalRing) to out.
func appendCanonicalRing(out, r []int) []int {
	n := len(r)
	lo := 0
	for i := range r {
		if r[i] < r[lo] {
			lo = i
		}
	}
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
