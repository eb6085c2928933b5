package smiles

import (
	"fmt"
	"strings"

	"cyclopair/huckel/molecule"
)

// chemistry runs after a clean scan: aromatic bonds outside rings become single,
// aromatic atoms are kekulised, implicit hydrogens are added and every atom's valence is
// checked.
func (p *parser) chemistry() {
	m := p.m
	if p.hasAromatic {
		if !p.kekuliseAll() {
			return
		}
	}
	for i := range m.Atoms {
		a := &m.Atoms[i]
		s := m.BondOrderSum(i)
		if !a.Bracket {
			vals := organicVals(a.Element)
			v := nextValence(vals, s)
			if v < 0 {
				p.errorf(a.Pos, ErrValence, "check the bond orders, or write the atom in brackets with its charge",
					"atom %d %s has %d bonds; %s allows at most %d", i+1, a.Element, s, a.Element, vals[len(vals)-1])
				continue
			}
			a.HCount = v - s
			continue
		}
		p.checkBracket(i, s+a.HCount)
	}
}

// checkBracket checks the valence (bond orders plus hydrogens) of bracket atom i.
func (p *parser) checkBracket(i, val int) {
	a := &p.m.Atoms[i]
	vals, checked, ok := allowedValences(a.Element, a.Charge)
	if !checked {
		return
	}
	text := p.atomText(i)
	if !ok {
		p.errorf(a.Pos, ErrValence, "check the charge", "atom %d %s: charge %+d is impossible for %s", i+1, text, a.Charge, a.Element)
		return
	}
	v := nextValence(vals, val)
	switch {
	case v == val:
		return
	case v < 0:
		p.errorf(a.Pos, ErrValence, "check the bond orders, hydrogen count and charge",
			"atom %d %s has valence %d; %s allows at most %d", i+1, text, val, chargedName(a.Element, a.Charge), vals[len(vals)-1])
	case v-val == 1:
		p.errorf(a.Pos, ErrRadical, "add H or a charge",
			"atom %d %s has an unpaired electron; radicals are not supported", i+1, text)
	default:
		p.errorf(a.Pos, ErrRadical, "add H or a charge",
			"atom %d %s has %d unpaired electrons; radicals and carbenes are not supported", i+1, text, v-val)
	}
}

// chargedName spells an element with its charge: "neutral C", "N+", "O-", "Fe+3".
func chargedName(el string, q int) string {
	switch {
	case q == 0:
		return "neutral " + el
	case q == 1:
		return el + "+"
	case q == -1:
		return el + "-"
	}
	return fmt.Sprintf("%s%+d", el, q)
}

// atomText is the source text of atom i (the whole bracket for bracket atoms).
func (p *parser) atomText(i int) string {
	a := p.m.Atoms[i]
	if a.Pos < 0 || a.Pos >= len(p.src) {
		return a.Element
	}
	if a.Bracket {
		if k := strings.IndexByte(p.src[a.Pos:], ']'); k >= 0 {
			return p.src[a.Pos : a.Pos+k+1]
		}
		return a.Element
	}
	return p.src[a.Pos:min(a.Pos+len(a.Element), len(p.src))]
}

// kekuliseAll finds ring bonds, makes aromatic bonds outside rings single, and assigns a
// Kekulé structure to the aromatic atoms. It reports false after recording an error.
func (p *parser) kekuliseAll() bool {
	m := p.m
	n := len(m.Atoms)
	inRing := ringBonds(m, p.sc.bools(&p.sc.b1, len(m.Bonds)), &p.sc)
	atomInRing := p.sc.bools(&p.sc.b2, n)
	for bi := range m.Bonds {
		b := &m.Bonds[bi]
		if inRing[bi] {
			atomInRing[b.A] = true
			atomInRing[b.B] = true
			continue
		}
		if b.Aromatic {
			b.Aromatic = false
		}
	}
	ok := true
	for bi, b := range m.Bonds {
		if p.bondSyms[bi] == symArom && !(m.Atoms[b.A].Aromatic && m.Atoms[b.B].Aromatic) {
			at := b.A
			if m.Atoms[at].Aromatic {
				at = b.B
			}
			p.errorf(m.Atoms[at].Pos, ErrKekulize, "write both atoms in lowercase, or use '-' for a single bond",
				"aromatic bond ':' joins non-aromatic atom %d %s", at+1, p.atomText(at))
			ok = false
		}
	}
	for i, a := range m.Atoms {
		if a.Aromatic && !atomInRing[i] {
			p.errorf(a.Pos, ErrKekulize, "only ring atoms can be aromatic; write it with a capital letter",
				"aromatic atom %d %s is not in a ring", i+1, p.atomText(i))
			ok = false
		}
	}
	if !ok {
		return false
	}
	// Which aromatic atoms need a double bond?
	need := atomInRing // reuse the buffer
	clear(need)
	for i, a := range m.Atoms {
		if !a.Aromatic {
			continue
		}
		s := 0 // aromatic bonds still count 1
		hasMultiple := false
		for _, e := range m.Neighbors(i) {
			b := m.Bonds[e.Bond]
			s += b.Order
			hasMultiple = hasMultiple || (!b.Aromatic && b.Order > 1)
		}
		if hasMultiple {
			// an explicit double or triple bond (exocyclic C=O, or c1=cc=cc=c1 written
			// with its double bonds) already supplies this atom's π bond
			continue
		}
		var vals []int
		if a.Bracket {
			s += a.HCount
			v, checked, good := allowedValences(a.Element, a.Charge)
			if !checked || !good {
				continue
			}
			vals = v
		} else {
			vals = organicVals(a.Element)
		}
		if v := nextValence(vals, s); v >= 0 && v-s >= 1 {
			need[i] = true
		}
	}
	unmatched := kekulise(m, need, &p.sc) // reads need, does not change it
	if unmatched >= 0 {
		a := m.Atoms[unmatched]
		why := ""
		if k := len(aromaticSystem(m, need, unmatched)); k%2 == 1 {
			why = fmt.Sprintf("; %d atoms of this ring system need one, an odd number", k)
		}
		p.errorf(a.Pos, ErrKekulize, kekuleHint(a),
			"aromatic ring cannot be kekulised: atom %d %s gets no double bond%s", unmatched+1, p.atomText(unmatched), why)
		return false
	}
	return true
}

// aromaticSystem returns, in index order, the atoms with need set that are joined to start
// through aromatic bonds between such atoms.
func aromaticSystem(m *molecule.Molecule, need []bool, start int) []int {
	seen := map[int]bool{start: true}
	stack := []int{start}
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, e := range m.Neighbors(v) {
			if m.Bonds[e.Bond].Aromatic && need[e.To] && !seen[e.To] {
				seen[e.To] = true
				stack = append(stack, e.To)
			}
		}
	}
	out := make([]int, 0, len(seen))
	for i := range m.Atoms {
		if seen[i] {
			out = append(out, i)
		}
	}
	return out
}

func kekuleHint(a molecule.Atom) string {
	if a.Element == "N" || a.Element == "P" {
		return "a pyrrole-type nitrogen is written [nH], an N-substituted one with its substituent"
	}
	return "check the ring: aromatic atoms needing a double bond must pair up; write pyrrole-type N as [nH]"
}

// ringBondsInto marks in inRing (len(m.Bonds)) the bonds that lie in at least one ring,
// that is every bond that is not a bridge (Tarjan's bridge-finding DFS, iterative).
func ringBondsInto(m *molecule.Molecule, inRing []bool) []bool {
	return ringBonds(m, inRing, nil)
}

// ringBonds is ringBondsInto with work space from sc (nil: allocate).
func ringBonds(m *molecule.Molecule, inRing []bool, sc *scratch) []bool {
	n := len(m.Atoms)
	for i := range inRing {
		inRing[i] = true
	}
	if len(m.Bonds) == 0 {
		return inRing
	}
	if sc == nil {
		sc = new(scratch)
	}
	disc := sc.int32s(&sc.i1, 2*n)
	low := disc[n:]
	disc = disc[:n]
	type frame struct {
		v, pe, it int32
	}
	var buf [32]frame
	stack := buf[:0]
	var timer int32
	for root := 0; root < n; root++ {
		if disc[root] != 0 {
			continue
		}
		timer++
		disc[root], low[root] = timer, timer
		stack = append(stack[:0], frame{int32(root), -1, 0})
		for len(stack) > 0 {
			f := &stack[len(stack)-1]
			nb := m.Neighbors(int(f.v))
			if int(f.it) < len(nb) {
				e := nb[f.it]
				f.it++
				if int32(e.Bond) == f.pe {
					continue
				}
				if disc[e.To] == 0 {
					timer++
					disc[e.To], low[e.To] = timer, timer
					stack = append(stack, frame{int32(e.To), int32(e.Bond), 0})
				} else if disc[e.To] < low[f.v] {
					low[f.v] = disc[e.To]
				}
				continue
			}
			v, pe := f.v, f.pe
			stack = stack[:len(stack)-1]
			if len(stack) > 0 {
				u := stack[len(stack)-1].v
				if low[v] < low[u] {
					low[u] = low[v]
				}
				if low[v] > disc[u] {
					inRing[pe] = false
				}
			}
		}
	}
	return inRing
}

// kekulise gives each atom with need[i] exactly one double bond among its aromatic bonds
// to other such atoms, setting Order 2 there and 1 on the other aromatic bonds. It returns
// -1 on success or an atom left without a partner.
func kekulise(m *molecule.Molecule, need []bool, sc *scratch) int {
	if sc == nil {
		sc = new(scratch)
	}
	// local numbering of the atoms that need a double bond
	n := 0
	for _, x := range need {
		if x {
			n++
		}
	}
	for bi := range m.Bonds {
		if m.Bonds[bi].Aromatic {
			m.Bonds[bi].Order = 1
		}
	}
	if n == 0 {
		return -1
	}
	buf := sc.ints(&sc.n1, 4*n+1+len(need))
	local := buf[:len(need)]
	global := buf[len(need) : len(need)+n]
	mate := buf[len(need)+n : len(need)+2*n]
	start := buf[len(need)+2*n : len(need)+3*n+1]
	deg := buf[len(need)+3*n+1:]
	k := 0
	for i, x := range need {
		local[i] = -1
		if x {
			local[i] = k
			global[k] = i
			k++
		}
	}
	// compressed adjacency over candidate bonds
	edges := 0
	for _, b := range m.Bonds {
		if b.Aromatic && need[b.A] && need[b.B] {
			deg[local[b.A]]++
			deg[local[b.B]]++
			edges++
		}
	}
	start[0] = 0
	for v := 0; v < n; v++ {
		start[v+1] = start[v] + deg[v]
	}
	adj := sc.int32s(&sc.i1, 2*edges)
	fill := deg // reuse as fill pointers
	for v := 0; v < n; v++ {
		fill[v] = start[v]
	}
	for _, b := range m.Bonds {
		if b.Aromatic && need[b.A] && need[b.B] {
			a, c := local[b.A], local[b.B]
			adj[fill[a]] = int32(c)
			fill[a]++
			adj[fill[c]] = int32(a)
			fill[c]++
		}
	}
	g := matchGraph{n: n, start: start, adj: adj, mate: mate, sc: sc}
	if !g.perfect() {
		for v := 0; v < n; v++ {
			if mate[v] < 0 {
				return global[v]
			}
		}
	}
	for v := 0; v < n; v++ {
		w := mate[v]
		if w > v {
			bi := m.BondBetween(global[v], global[w])
			m.Bonds[bi].Order = 2
		}
	}
	return -1
}

// matchGraph is a small undirected graph in compressed form for maximum matching.
type matchGraph struct {
	n     int
	start []int   // adjacency of v is adj[start[v]:start[v+1]]
	adj   []int32 // neighbours
	mate  []int   // filled by perfect: partner or -1
	sc    *scratch
}

func (g *matchGraph) nbrs(v int) []int32 { return g.adj[g.start[v]:g.start[v+1]] }

// perfect computes a maximum matching into g.mate and reports whether it is perfect.
// A greedy pass that always serves the vertex with the fewest free neighbours first
// settles chains and simple rings; Edmonds' blossom algorithm (J. Edmonds, "Paths, trees,
// and flowers", Canad. J. Math. 17, 449–467, 1965) augments whatever is left, so odd rings
// in fused systems (azulene, indolizine, purine) are handled exactly.
func (g *matchGraph) perfect() bool {
	n := g.n
	for v := range g.mate[:n] {
		g.mate[v] = -1
	}
	g.greedy()
	free := 0
	for v := 0; v < n; v++ {
		if g.mate[v] < 0 {
			free++
		}
	}
	if free == 0 {
		return true
	}
	e := newEdmonds(*g)
	for v := 0; v < n && free > 1; v++ {
		if g.mate[v] < 0 && e.augment(v) {
			free -= 2
		}
	}
	return free == 0
}

// greedy builds a maximal matching in O(n + m): a vertex left with one free neighbour is
// matched to it at once (that choice is always safe), otherwise the next free vertex in
// index order takes its free neighbour of fewest free neighbours.
func (g *matchGraph) greedy() {
	n := g.n
	buf := g.sc.ints(&g.sc.n2, 2*n)
	freeDeg, forced := buf[:n], buf[n:n]
	for v := 0; v < n; v++ {
		freeDeg[v] = len(g.nbrs(v))
		if freeDeg[v] == 1 {
			forced = append(forced, v)
		}
	}
	next := 0
	for {
		v := -1
		for len(forced) > 0 && v < 0 {
			x := forced[len(forced)-1]
			forced = forced[:len(forced)-1]
			if g.mate[x] < 0 && freeDeg[x] > 0 {
				v = x
			}
		}
		for v < 0 && next < n {
			if g.mate[next] < 0 && freeDeg[next] > 0 {
				v = next
			}
			next++
		}
		if v < 0 {
			return
		}
		w := -1
		for _, u := range g.nbrs(v) {
			if g.mate[u] < 0 && (w < 0 || freeDeg[u] < freeDeg[w]) {
				w = int(u)
			}
		}
		g.mate[v], g.mate[w] = w, v
		for _, x := range [2]int{v, w} {
			for _, u := range g.nbrs(x) {
				if g.mate[u] < 0 {
					freeDeg[u]--
					if freeDeg[u] == 1 {
						forced = append(forced, int(u))
					}
				}
			}
		}
	}
}

// edmonds holds the work arrays of the blossom search.
type edmonds struct {
	g                     matchGraph
	parent, base          []int
	used, blossom, onPath []bool
	queue                 []int
}

func newEdmonds(g matchGraph) *edmonds {
	n := g.n
	ints := make([]int, 2*n)
	bools := make([]bool, 3*n)
	return &edmonds{g: g, parent: ints[:n], base: ints[n:], used: bools[:n], blossom: bools[n : 2*n], onPath: bools[2*n:], queue: make([]int, 0, n)}
}

func (e *edmonds) lca(a, b int) int {
	mate := e.g.mate
	clear(e.onPath)
	for {
		a = e.base[a]
		e.onPath[a] = true
		if mate[a] < 0 {
			break
		}
		a = e.parent[mate[a]]
	}
	for {
		b = e.base[b]
		if e.onPath[b] {
			return b
		}
		b = e.parent[mate[b]]
	}
}

func (e *edmonds) markPath(v, b, child int) {
	mate := e.g.mate
	for e.base[v] != b {
		e.blossom[e.base[v]] = true
		e.blossom[e.base[mate[v]]] = true
		e.parent[v] = child
		child = mate[v]
		v = e.parent[mate[v]]
	}
}

// augment searches an augmenting path from the free vertex root and flips it.
func (e *edmonds) augment(root int) bool {
	g := e.g
	mate := g.mate
	n := g.n
	for i := 0; i < n; i++ {
		e.parent[i] = -1
		e.base[i] = i
		e.used[i] = false
	}
	e.used[root] = true
	e.queue = append(e.queue[:0], root)
	for qi := 0; qi < len(e.queue); qi++ {
		v := e.queue[qi]
		for _, t := range g.nbrs(v) {
			to := int(t)
			if e.base[v] == e.base[to] || mate[v] == to {
				continue
			}
			if to == root || (mate[to] >= 0 && e.parent[mate[to]] >= 0) {
				cur := e.lca(v, to)
				clear(e.blossom)
				e.markPath(v, cur, to)
				e.markPath(to, cur, v)
				for i := 0; i < n; i++ {
					if e.blossom[e.base[i]] {
						e.base[i] = cur
						if !e.used[i] {
							e.used[i] = true
							e.queue = append(e.queue, i)
						}
					}
				}
			} else if e.parent[to] < 0 {
				e.parent[to] = v
				if mate[to] < 0 {
					// flip the path
					for x := to; x >= 0; {
						pv := e.parent[x]
						ppv := mate[pv]
						mate[x] = pv
						mate[pv] = x
						x = ppv
					}
					return true
				}
				e.used[mate[to]] = true
				e.queue = append(e.queue, mate[to])
			}
		}
	}
	return false
}

// scratch holds reusable work space for one parser (see parserPool); functions that take
// one make their own when given nil.
type scratch struct {
	b1, b2 []bool
	i1     []int32
	n1, n2 []int
}

func (sc *scratch) bools(f *[]bool, n int) []bool {
	if cap(*f) < n {
		*f = make([]bool, n, max(n, 32))
	}
	s := (*f)[:n]
	clear(s)
	return s
}

func (sc *scratch) int32s(f *[]int32, n int) []int32 {
	if cap(*f) < n {
		*f = make([]int32, n, max(n, 64))
	}
	s := (*f)[:n]
	clear(s)
	return s
}

func (sc *scratch) ints(f *[]int, n int) []int {
	if cap(*f) < n {
		*f = make([]int, n, max(n, 64))
	}
	s := (*f)[:n]
	clear(s)
	return s
}
