package depict

import (
	"math"
	"math/rand/v2"
	"slices"

	"cyclopair/huckel/molecule"
)

// layouter holds the state of one layout. Its slices are buffers that the next layout with
// the same Workspace reuses.
type layouter struct {
	g      *graph
	m      *molecule.Molecule
	pos    []Point
	placed []bool
	turn   []int8 // zig-zag turn sign used when leaving an atom (+1 left, −1 right, 0 unset)
	rings  [][]int

	systems  []ringSystem
	systemOf []int   // atom → ring system index, −1 for chain atoms
	local    []Point // atom → block coordinates in its ring system's frame (ring atoms only)

	ez []ezRule // double-bond geometries fixed by '/' and '\' marks

	// scratch buffers
	ringParent, owner, sysOfRoot []int
	block                        blockPos
	compFlat, compOff            []int
	comps                        [][]int
	queue, bfs, dist, mark       []int
	stamp                        int
	placedDirs, dirs, tryA, tryB []Point
	todo, size, idx, ordered     []int
	angs                         []float64
	gaps                         []gapT
	arc                          [2][]Point
	inSide, inComp, seen         []bool
	prev, pathBuf, side          []int
	scratch, bestPos             []Point
	tried                        map[[2]int]bool
}

// ringSystem is a set of rings connected through shared atoms, laid out as one rigid block
// (its block coordinates are in layouter.local).
type ringSystem struct {
	atoms []int   // sorted
	rings [][]int // SSSR rings of the system
}

// blockPos holds trial block coordinates of a ring system by atom index; ok marks the atoms
// placed so far.
type blockPos struct {
	p  []Point
	ok []bool
}

func newBlockPos(n int) blockPos { return blockPos{p: make([]Point, n), ok: make([]bool, n)} }

func (b blockPos) has(a int) bool     { return b.ok[a] }
func (b blockPos) set(a int, p Point) { b.p[a], b.ok[a] = p, true }

// gapT is a free angular gap around an atom: start angle and size (radians).
type gapT struct{ start, size float64 }

func (l *layouter) buildSystems() {
	n := l.g.n
	l.systemOf = grow(l.systemOf, n)
	for i := range l.systemOf {
		l.systemOf[i] = -1
	}
	l.local = grow(l.local, n)
	// union-find over rings sharing an atom
	l.ringParent = grow(l.ringParent, len(l.rings))
	parent := l.ringParent
	for i := range parent {
		parent[i] = i
	}
	find := func(x int) int {
		for parent[x] != x {
			parent[x] = parent[parent[x]]
			x = parent[x]
		}
		return x
	}
	l.owner = grow(l.owner, n)
	owner := l.owner
	for i := range owner {
		owner[i] = -1
	}
	for ri, r := range l.rings {
		for _, a := range r {
			if owner[a] >= 0 {
				x, y := find(owner[a]), find(ri)
				if x != y {
					if x < y {
						parent[y] = x
					} else {
						parent[x] = y
					}
				}
			} else {
				owner[a] = ri
			}
		}
	}
	l.sysOfRoot = grow(l.sysOfRoot, len(l.rings)) // root ring → system
	for i := range l.sysOfRoot {
		l.sysOfRoot[i] = -1
	}
	l.systems = l.systems[:0]
	for ri := range l.rings {
		root := find(ri)
		si := l.sysOfRoot[root]
		if si < 0 {
			si = len(l.systems)
			l.sysOfRoot[root] = si
			if len(l.systems) < cap(l.systems) { // reuse an old system's slices
				l.systems = l.systems[:si+1]
				l.systems[si].atoms, l.systems[si].rings = l.systems[si].atoms[:0], l.systems[si].rings[:0]
			} else {
				l.systems = append(l.systems, ringSystem{})
			}
		}
		s := &l.systems[si]
		s.rings = append(s.rings, l.rings[ri])
		for _, a := range l.rings[ri] {
			if l.systemOf[a] < 0 {
				l.systemOf[a] = si
				s.atoms = append(s.atoms, a)
			}
		}
	}
	for i := range l.systems {
		s := &l.systems[i]
		slices.Sort(s.atoms)
		l.layoutSystem(s)
	}
}

// components returns the connected components of the molecule, each sorted, in the order
// of their lowest atom (as molecule.Components), in buffers of l.
func (l *layouter) components() [][]int {
	n := l.g.n
	l.seen = grow(l.seen, n)
	seen := l.seen
	clear(seen)
	flat, off := l.compFlat[:0], l.compOff[:0]
	for s := 0; s < n; s++ {
		if seen[s] {
			continue
		}
		o := len(flat)
		off = append(off, o)
		flat = append(flat, s)
		seen[s] = true
		for q := o; q < len(flat); q++ {
			for _, w := range l.g.adj[flat[q]] {
				if !seen[w] {
					seen[w] = true
					flat = append(flat, w)
				}
			}
		}
		slices.Sort(flat[o:])
	}
	l.compFlat, l.compOff = flat, off
	l.comps = splitFlat(l.comps[:0], flat, off)
	return l.comps
}

// splitFlat appends to dst the lists stored back to back in flat, list k starting at
// off[k] (each capped at its end, so appending to one cannot overwrite the next).
func splitFlat(dst [][]int, flat, off []int) [][]int {
	for k, o := range off {
		e := len(flat)
		if k+1 < len(off) {
			e = off[k+1]
		}
		dst = append(dst, flat[o:e:e])
	}
	return dst
}

// layoutComponent places every atom of one connected component.
func (l *layouter) layoutComponent(comp []int) {
	// Root: the largest ring system in the component, else one end of the longest chain.
	root := -1
	best := 0
	for _, a := range comp {
		if si := l.systemOf[a]; si >= 0 && len(l.systems[si].atoms) > best {
			best = len(l.systems[si].atoms)
			root = a
		}
	}
	queue := l.queue[:0]
	if root >= 0 {
		s := &l.systems[l.systemOf[root]]
		for _, a := range s.atoms {
			l.pos[a] = l.local[a]
			l.placed[a] = true
			queue = append(queue, a)
		}
	} else {
		start := l.chainEnd(comp)
		l.pos[start] = Point{}
		l.placed[start] = true
		l.turn[start] = -1
		queue = append(queue, start)
	}
	for h := 0; h < len(queue); h++ {
		queue = l.expand(queue[h], queue)
	}
	l.queue = queue
}

// chainEnd returns one end of a longest shortest path in a ring-free component (two BFS).
func (l *layouter) chainEnd(comp []int) int {
	l.dist = grow(l.dist, l.g.n)
	dist := l.dist // −1: not reached
	far := func(s int) int {
		for i := range dist {
			dist[i] = -1
		}
		dist[s] = 0
		q := append(l.bfs[:0], s)
		last := s
		for h := 0; h < len(q); h++ {
			v := q[h]
			if dist[v] > dist[last] || (dist[v] == dist[last] && v < last) {
				last = v
			}
			for _, w := range l.g.adj[v] {
				if dist[w] < 0 {
					dist[w] = dist[v] + 1
					q = append(q, w)
				}
			}
		}
		l.bfs = q
		return last
	}
	a := far(comp[0])
	b := far(a)
	return min(a, b)
}

// isLinear reports whether atom v should have its two bonds collinear: a triple bond or two
// cumulated double bonds (allene, ketene, azide, CO2).
func (l *layouter) isLinear(v int) bool {
	doubles := 0
	for k := range l.g.adj[v] {
		switch l.g.order[l.g.bondOf[v][k]] {
		case 3:
			return true
		case 2:
			doubles++
		}
	}
	return doubles >= 2 && len(l.g.adj[v]) == 2
}

// expand places the unplaced neighbours of placed atom v and appends the atoms newly placed
// to queue.
func (l *layouter) expand(v int, queue []int) []int {
	placedDirs := l.placedDirs[:0]
	todo := l.todo[:0]
	for _, w := range l.g.adj[v] {
		if l.placed[w] {
			placedDirs = append(placedDirs, l.pos[w].sub(l.pos[v]).unit())
		} else {
			todo = append(todo, w)
		}
	}
	l.placedDirs, l.todo = placedDirs, todo
	if len(todo) == 0 {
		return queue
	}
	// heaviest branch first: it takes the zig-zag continuation
	l.size = grow(l.size, len(todo))
	size := l.size
	for i, w := range todo {
		size[i] = l.branchSize(v, w)
	}
	l.idx = grow(l.idx, len(todo))
	idx := l.idx
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int { return size[b] - size[a] })
	l.ordered = grow(l.ordered, len(todo))
	ordered := l.ordered
	for i, k := range idx {
		ordered[i] = todo[k]
	}

	dirs := l.directions(v, placedDirs, len(ordered))
	for i, w := range ordered {
		queue = l.attach(v, w, dirs[i], queue)
	}
	return queue
}

// directions chooses len = k unit vectors for new bonds from v, given the unit vectors to the
// neighbours already placed.
// The result is a buffer of l, valid until the next call.
func (l *layouter) directions(v int, placedDirs []Point, k int) []Point {
	out := l.dirs[:0]
	defer func() { l.dirs = out[:0] }()
	switch len(placedDirs) {
	case 0:
		base := Point{1, 0}.rotDeg(30)
		if k == 1 {
			out = append(out, base)
			return out
		}
		for i := 0; i < k; i++ {
			out = append(out, base.rotDeg(360*float64(i)/float64(k)))
		}
		return out
	case 1:
		in := placedDirs[0].scale(-1) // direction of travel into v
		if k == 1 {
			if l.isLinear(v) {
				out = append(out, in)
				return out
			}
			p := l.parentOf(v)
			s := int8(1)
			if p >= 0 && l.turn[p] != 0 {
				s = -l.turn[p]
			}
			cand := in.rotDeg(60 * float64(s))
			alt := in.rotDeg(-60 * float64(s))
			if l.crowding(l.pos[v].add(cand)) > l.crowding(l.pos[v].add(alt))+1e-9 {
				cand, s = alt, -s
			}
			l.turn[v] = s
			out = append(out, cand)
			return out
		}
		for i := 0; i < k; i++ {
			ang := -180 + 360*float64(i+1)/float64(k+1)
			out = append(out, in.rotDeg(ang))
		}
		return out
	}
	// two or more placed: spread the new bonds evenly in the widest free angular gap
	l.angs = grow(l.angs, len(placedDirs))
	angs := l.angs
	for i, d := range placedDirs {
		angs[i] = math.Atan2(d.Y, d.X)
	}
	slices.Sort(angs)
	// Among the widest gaps (within 10°: the three equal gaps at a ring-fusion atom) take the
	// one whose middle is least crowded, so a substituent never points into a ring.
	gaps := l.gaps[:0]
	widest := 0.0
	for i := range angs {
		a, b := angs[i], angs[(i+1)%len(angs)]
		gap := b - a
		if i == len(angs)-1 {
			gap += 2 * math.Pi
		}
		gaps = append(gaps, gapT{a, gap})
		widest = math.Max(widest, gap)
	}
	l.gaps = gaps
	bestGap, bestStart, bestCrowd := -1.0, 0.0, math.Inf(1)
	for _, g := range gaps {
		if g.size < widest-10*math.Pi/180 {
			continue
		}
		mid := g.start + g.size/2
		c := l.crowding(l.pos[v].add(Point{math.Cos(mid), math.Sin(mid)}))
		if c < bestCrowd-1e-9 || (math.Abs(c-bestCrowd) <= 1e-9 && g.size > bestGap+1e-9) {
			bestGap, bestStart, bestCrowd = g.size, g.start, c
		}
	}
	for i := 0; i < k; i++ {
		a := bestStart + bestGap*float64(i+1)/float64(k+1)
		out = append(out, Point{math.Cos(a), math.Sin(a)})
	}
	return out
}

// parentOf returns a placed neighbour of v (the one it was reached from in chains).
func (l *layouter) parentOf(v int) int {
	for _, w := range l.g.adj[v] {
		if l.placed[w] {
			return w
		}
	}
	return -1
}

// crowding is a clash score of a trial position against every placed atom.
func (l *layouter) crowding(p Point) float64 {
	s := 0.0
	for i, ok := range l.placed {
		if !ok {
			continue
		}
		if d := p.dist(l.pos[i]); d < 1.2 {
			s += (1.2 - d) * (1.2 - d)
		}
	}
	return s
}

// branchSize counts the atoms reachable from w without passing through v.
func (l *layouter) branchSize(v, w int) int {
	st := l.nextStamp() // l.mark[x] == st: x seen
	l.mark[v], l.mark[w] = st, st
	q := append(l.bfs[:0], w)
	n := 0
	for h := 0; h < len(q); h++ {
		x := q[h]
		n++
		for _, y := range l.g.adj[x] {
			if l.mark[y] != st && !l.placed[y] {
				l.mark[y] = st
				q = append(q, y)
			}
		}
	}
	l.bfs = q
	return n
}

// nextStamp returns a fresh mark for l.mark (sized to the graph): an atom x is marked when
// l.mark[x] equals it.
func (l *layouter) nextStamp() int {
	l.mark = grow(l.mark, l.g.n)
	l.stamp++
	return l.stamp
}

// attach places w bonded to v in direction d (a ring atom brings its whole ring system) and
// appends the atoms placed to queue.
func (l *layouter) attach(v, w int, d Point, queue []int) []int {
	si := l.systemOf[w]
	if si < 0 {
		l.pos[w] = l.pos[v].add(d)
		l.placed[w] = true
		return append(queue, w)
	}
	s := &l.systems[si]
	// In block coordinates, w's outward direction points away from its ring neighbours; turn
	// the block so that direction points back at v.
	var in Point
	for _, x := range l.g.adj[w] {
		if l.systemOf[x] == si {
			in = in.add(l.local[x].sub(l.local[w]).unit())
		}
	}
	out := in.scale(-1).unit()
	if in.norm() < 1e-9 {
		out = Point{1, 0}
	}
	target := d.scale(-1)
	ang := math.Atan2(target.Y, target.X) - math.Atan2(out.Y, out.X)
	co, sn := math.Cos(ang), math.Sin(ang)
	anchor := l.pos[v].add(d)
	// t[i] is the position of s.atoms[i]
	try := func(t []Point, mirror bool) []Point {
		t = grow(t, len(s.atoms))
		for i, a := range s.atoms {
			p := l.local[a].sub(l.local[w]).rot(co, sn) // w at origin, outward along target
			if mirror {                                 // reflect across the axis through w along d
				u := d
				proj := u.scale(p.dot(u))
				p = proj.scale(2).sub(p)
			}
			t[i] = anchor.add(p)
		}
		return t
	}
	l.tryA, l.tryB = try(l.tryA, false), try(l.tryB, true)
	a0, a1 := l.tryA, l.tryB
	score := func(t []Point) float64 {
		sc := 0.0
		for i := range s.atoms {
			sc += l.crowding(t[i])
		}
		return sc
	}
	chosen := a0
	if score(a1) < score(a0)-1e-9 {
		chosen = a1
	}
	queue = append(queue, w)
	for i, a := range s.atoms {
		l.pos[a] = chosen[i]
		l.placed[a] = true
		if a != w {
			queue = append(queue, a)
		}
	}
	return queue
}

// layoutSystem lays out one ring system in its own frame. For bridged systems several ring
// orders are tried and the one with the fewest clashes and bond distortions is kept. The
// result goes to l.local.
func (l *layouter) layoutSystem(s *ringSystem) {
	rings := s.rings
	bridged := false
	for i := range rings {
		for j := i + 1; j < len(rings); j++ {
			if sharedCount(rings[i], rings[j]) > 2 {
				bridged = true
			}
		}
	}
	if !bridged {
		if len(l.block.p) < l.g.n {
			l.block = newBlockPos(l.g.n)
		}
		if sc := l.placeRings(s, rings, 0, l.block); sc < 1e-9 {
			l.setLocal(s, l.block)
			return
		}
		// fused polygons that collide (a cage such as cubane, or a helicene) go on below
	}
	// add envelopes (symmetric differences of ring pairs that form a simple cycle): the
	// outer ring of a bicyclo[2.2.1] system drawn as a hexagon with a bridge across it
	all := slices.Clone(rings)
	for i := range rings {
		for j := i + 1; j < len(rings); j++ {
			if sharedCount(rings[i], rings[j]) >= 2 {
				if env := l.envelope(rings[i], rings[j]); env != nil {
					all = append(all, env)
				}
			}
		}
	}
	var bestPos blockPos
	bestScore := math.Inf(1)
	limit := min(len(all), 16)
	var starts []blockPos
	for start := 0; start < limit; start++ {
		pos := newBlockPos(l.g.n)
		sc := l.placeRings(s, all, start, pos)
		starts = append(starts, pos)
		if sc < bestScore-1e-9 {
			bestPos, bestScore = pos, sc
		}
	}
	if bestScore < 1e-9 || len(s.atoms) > maxRelaxAtoms {
		l.setLocal(s, bestPos)
		return
	}
	// No construction drew the cage cleanly (bicyclo[2.2.2], adamantane, cubane): relax each
	// start with springs and keep the best result.
	for _, pos := range starts {
		l.relaxBlock(s, pos, 1.0, 1.0)
		if sc := l.blockScore(s, pos); sc < bestScore-1e-9 {
			bestPos, bestScore = pos, sc
		}
	}
	// Small cages (cubane) can still end crowded: try a few scattered starts from a
	// fixed-seed generator, so the result stays the same on every run.
	if bestScore >= 1 && len(s.atoms) <= maxScatterAtoms {
		rng := rand.New(rand.NewPCG(uint64(len(s.atoms)), 0x5eed))
		side := math.Sqrt(float64(len(s.atoms))) * 1.2
		for try := 0; try < scatterTries && bestScore >= 1; try++ {
			pos := newBlockPos(l.g.n)
			for _, a := range s.atoms {
				pos.set(a, Point{rng.Float64() * side, rng.Float64() * side})
			}
			// a short, stiff repulsion: bonds keep their length, only near contacts are
			// pushed apart (a crossed perspective drawing is acceptable)
			l.relaxBlock(s, pos, 0.7, 3.0)
			if sc := l.blockScore(s, pos); sc < bestScore-1e-9 {
				bestPos, bestScore = pos, sc
			}
		}
	}
	l.setLocal(s, bestPos)
}

// setLocal copies the block coordinates of s's atoms from pos to l.local (the origin for
// every atom when no layout scored, as a lookup in an empty map gave).
func (l *layouter) setLocal(s *ringSystem, pos blockPos) {
	for _, a := range s.atoms {
		if pos.p == nil {
			l.local[a] = Point{}
			continue
		}
		l.local[a] = pos.p[a]
	}
}

// Scattered restarts for small crowded cages: at most scatterTries starts, only for ring
// systems of at most maxScatterAtoms atoms.
const (
	scatterTries    = 24
	maxScatterAtoms = 16
)

// maxRelaxAtoms bounds the ring systems that get the spring relaxation (quadratic per step).
const maxRelaxAtoms = 40

// relaxBlock moves the atoms of a bridged ring system by gradient descent on an energy with
// unit-length bond springs and a repulsion of strength push between non-bonded atoms closer
// than reach (bond lengths). Start points
// that coincide are pulled apart by fixed, index-dependent offsets (no randomness).
func (l *layouter) relaxBlock(s *ringSystem, pos blockPos, reach, push float64) {
	at := s.atoms
	nr := len(at)
	sys := l.systemOf[at[0]]
	p := make([]Point, nr)
	for i, a := range at {
		p[i] = pos.p[a]
	}
	for i := range p {
		for j := 0; j < i; j++ {
			if p[i].dist(p[j]) < 1e-3 {
				p[i] = p[i].add(Point{0.11 * float64(1+i%3), -0.07 * float64(1+i%2)})
			}
		}
	}
	// Ghosts: one free particle per substituent bond, so the cage keeps room for the
	// substituents that will be attached later.
	var ghostOf []int // ring-atom index (into at) of each ghost
	for i, a := range at {
		var in Point
		k := 0
		for _, w := range l.g.adj[a] {
			if l.systemOf[w] == sys {
				in = in.add(pos.p[w].sub(pos.p[a]).unit())
			} else {
				k++
			}
		}
		out := in.scale(-1).unit()
		for j := 0; j < k; j++ {
			ghostOf = append(ghostOf, i)
			p = append(p, p[i].add(out.rotDeg(40*float64(j)-20*float64(k-1))))
		}
	}
	n := len(p)
	bonded := make([]bool, n*n)
	for i, a := range at {
		for j, b := range at {
			bonded[i*n+j] = l.g.bondIndex(a, b) >= 0
		}
	}
	for gi, ri := range ghostOf {
		g := nr + gi
		bonded[g*n+ri], bonded[ri*n+g] = true, true
	}
	f := make([]Point, n)
	const step = 0.05
	for it := 0; it < 4000; it++ {
		clear(f)
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				d := p[j].sub(p[i])
				r := d.norm()
				if r < 1e-9 {
					d, r = Point{1e-3, 1e-3 * float64(j-i)}, 1e-3
				}
				u := d.scale(1 / r)
				var g float64 // force along u on j (negative pulls together)
				if bonded[i*n+j] {
					g = -6 * (r - 1)
				} else if r < reach {
					g = push * (reach - r)
				}
				f[j] = f[j].add(u.scale(g))
				f[i] = f[i].sub(u.scale(g))
			}
		}
		for i := range p {
			p[i] = p[i].add(f[i].scale(step))
		}
	}
	for i, a := range at {
		pos.set(a, p[i])
	}
}

func sharedCount(a, b []int) int {
	n := 0
	for _, x := range a {
		if slices.Contains(b, x) {
			n++
		}
	}
	return n
}

// envelope returns the cycle formed by the bonds in exactly one of rings a and b, or nil if
// that set is not one simple cycle.
func (l *layouter) envelope(a, b []int) []int {
	type e struct{ x, y int }
	edges := func(r []int) []e {
		var out []e
		for i, x := range r {
			y := r[(i+1)%len(r)]
			out = append(out, e{min(x, y), max(x, y)})
		}
		return out
	}
	ea, eb := edges(a), edges(b)
	var sym []e
	for _, x := range ea {
		if !slices.Contains(eb, x) {
			sym = append(sym, x)
		}
	}
	for _, x := range eb {
		if !slices.Contains(ea, x) {
			sym = append(sym, x)
		}
	}
	if len(sym) < 3 {
		return nil
	}
	// walk the cycle
	nb := func(v int) []int {
		var out []int
		for _, x := range sym {
			if x.x == v {
				out = append(out, x.y)
			} else if x.y == v {
				out = append(out, x.x)
			}
		}
		return out
	}
	start := sym[0].x
	cyc := []int{start}
	prev, cur := -1, start
	for {
		ns := nb(cur)
		if len(ns) != 2 {
			return nil
		}
		next := ns[0]
		if next == prev {
			next = ns[1]
		}
		if next == start {
			break
		}
		if slices.Contains(cyc, next) {
			return nil
		}
		cyc = append(cyc, next)
		prev, cur = cur, next
	}
	if len(cyc) != len(sym) {
		return nil
	}
	return canonicalRing(cyc)
}

// placeRings places the rings of a system starting from rings[start] and returns the block
// coordinates into pos (cleared first) and a badness score (clashes and bond-length errors).
func (l *layouter) placeRings(s *ringSystem, rings [][]int, start int, pos blockPos) float64 {
	clear(pos.ok)
	has := pos.has
	// first ring: a regular polygon with a flat bottom edge
	r0 := rings[start]
	n := len(r0)
	rad := 1 / (2 * math.Sin(math.Pi/float64(n)))
	for k, a := range r0 {
		ang := -math.Pi/2 - math.Pi/float64(n) + 2*math.Pi*float64(k)/float64(n)
		pos.set(a, Point{rad * math.Cos(ang), rad * math.Sin(ang)})
	}
	l.seen = grow(l.seen, len(rings))
	done := l.seen
	clear(done)
	done[start] = true
	for {
		// next ring: most placed atoms first (fused and bridged before spiro), then size, index
		pick, pickPlaced := -1, 0
		for i, r := range rings {
			if done[i] {
				continue
			}
			np := 0
			for _, a := range r {
				if has(a) {
					np++
				}
			}
			if np == len(r) {
				done[i] = true
				continue
			}
			if np == 0 {
				continue
			}
			better := pick < 0 || np >= 2 && pickPlaced < 2 ||
				(np >= 2) == (pickPlaced >= 2) && len(r) < len(rings[pick])
			if better {
				pick, pickPlaced = i, np
			}
		}
		if pick < 0 {
			break
		}
		r := rings[pick]
		done[pick] = true
		if pickPlaced == 1 {
			l.placeSpiro(pos, r)
			continue
		}
		// place every maximal run of unplaced atoms between two placed atoms on an arc
		nr := len(r)
		for k := 0; k < nr; k++ {
			if !has(r[k]) || has(r[(k+1)%nr]) {
				continue
			}
			run := l.pathBuf[:0]
			j := (k + 1) % nr
			for !has(r[j]) {
				run = append(run, r[j])
				j = (j + 1) % nr
			}
			l.pathBuf = run
			l.placeArc(pos, s.atoms, r[k], r[j], run)
		}
	}
	// atoms of the system not reached (cannot happen for a connected system) get a fallback
	for _, a := range s.atoms {
		if !has(a) {
			pos.set(a, Point{float64(a), 3})
		}
	}
	return l.blockScore(s, pos)
}

// placeSpiro places ring r, of which exactly one atom is placed, as a regular polygon on the
// far side of that atom.
func (l *layouter) placeSpiro(pos blockPos, r []int) {
	k0 := 0
	for k, a := range r {
		if pos.has(a) {
			k0 = k
		}
	}
	a := r[k0]
	var in Point
	for _, w := range l.g.adj[a] {
		if pos.has(w) {
			in = in.add(pos.p[w].sub(pos.p[a]).unit())
		}
	}
	out := in.scale(-1).unit()
	n := len(r)
	rad := 1 / (2 * math.Sin(math.Pi/float64(n)))
	c := pos.p[a].add(out.scale(rad))
	base := math.Atan2(-out.Y, -out.X) // angle of a seen from the centre
	for i := 1; i < n; i++ {
		ang := base + 2*math.Pi*float64(i)/float64(n)
		pos.set(r[(k0+i)%n], c.add(Point{rad * math.Cos(ang), rad * math.Sin(ang)}))
	}
}

// placeArc puts the atoms of run (bonded in sequence a–run[0]–…–run[m−1]–b) on a circular arc
// through a and b with every bond of length 1, bulging to the side with fewer clashes. When a
// and b are too far apart for the run, the atoms go on the straight line (bonds stretched).
func (l *layouter) placeArc(pos blockPos, atoms []int, a, b int, run []int) {
	pa, pb := pos.p[a], pos.p[b]
	m := len(run)
	segs := float64(m + 1)
	d := pa.dist(pb)
	u := pb.sub(pa).unit()
	nrm := Point{-u.Y, u.X}
	mid := pa.add(pb).scale(0.5)
	sides := &l.arc
	for si, sgn := range [2]float64{1, -1} {
		l.arc[si] = grow(l.arc[si], m)
		pts := l.arc[si]
		if d >= segs-1e-9 || d < 1e-9 {
			for i := range pts {
				t := float64(i+1) / segs
				pts[i] = pa.add(pb.sub(pa).scale(t))
				if d < 1e-9 {
					pts[i] = pa.add(nrm.scale(sgn * float64(i+1)))
				}
			}
			sides[si] = pts
			continue
		}
		// total angle Φ with sin(Φ/2)/sin(Φ/(2(m+1))) = d: the left side decreases on (0, 2π)
		lo, hi := 1e-9, 2*math.Pi-1e-9
		f := func(phi float64) float64 { return math.Sin(phi/2)/math.Sin(phi/(2*segs)) - d }
		for it := 0; it < 100; it++ {
			midPhi := (lo + hi) / 2
			if f(midPhi) > 0 {
				lo = midPhi
			} else {
				hi = midPhi
			}
		}
		phi := (lo + hi) / 2
		R := 1 / (2 * math.Sin(phi/(2*segs)))
		w := nrm.scale(sgn)
		centre := mid.sub(w.scale(R * math.Cos(phi/2)))
		step := phi / segs
		// rotate a about the centre towards the bulge side
		va := pa.sub(centre)
		dirSign := 1.0
		apex := mid.add(w.scale(R - R*math.Cos(phi/2)))
		if va.rot(math.Cos(phi/2), math.Sin(phi/2)).add(centre).dist(apex) >
			va.rot(math.Cos(-phi/2), math.Sin(-phi/2)).add(centre).dist(apex) {
			dirSign = -1
		}
		for i := range pts {
			t := dirSign * step * float64(i+1)
			pts[i] = va.rot(math.Cos(t), math.Sin(t)).add(centre)
		}
		sides[si] = pts
	}
	score := func(pts []Point) float64 {
		s := 0.0
		for _, p := range pts {
			for _, x := range atoms {
				if pos.has(x) {
					if dd := p.dist(pos.p[x]); dd < 1.2 {
						s += (1.2 - dd) * (1.2 - dd)
					}
				}
			}
		}
		return s
	}
	choice := sides[0]
	s0, s1 := score(sides[0]), score(sides[1])
	if s1 < s0-1e-9 {
		choice = sides[1]
	} else if math.Abs(s1-s0) <= 1e-9 {
		// tie: away from the centroid of what is placed
		var c Point
		k := 0
		for _, x := range atoms {
			if pos.has(x) {
				c = c.add(pos.p[x])
				k++
			}
		}
		c = c.scale(1 / float64(k))
		if len(sides[1]) > 0 && meanDist(sides[1], c) > meanDist(sides[0], c)+1e-9 {
			choice = sides[1]
		}
	}
	for i, x := range run {
		pos.set(x, choice[i])
	}
}

func meanDist(pts []Point, c Point) float64 {
	s := 0.0
	for _, p := range pts {
		s += p.dist(c)
	}
	return s / float64(len(pts))
}

// blockScore is the badness of a ring-system layout: close contacts plus bond-length errors.
func (l *layouter) blockScore(s *ringSystem, pos blockPos) float64 {
	sc := 0.0
	for i, a := range s.atoms {
		for _, b := range s.atoms[i+1:] {
			if l.g.bondIndex(a, b) >= 0 {
				dev := math.Abs(pos.p[a].dist(pos.p[b]) - 1)
				sc += 10 * dev * dev
				if dev > 0.1 {
					sc += 5
				}
				continue
			}
			if d := pos.p[a].dist(pos.p[b]); d < 0.8 {
				sc += (0.8 - d) * (0.8 - d) * 10
				if d < 0.5 {
					sc += 5
				}
			}
		}
	}
	return sc
}
