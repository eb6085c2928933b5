package depict

import "math"

// clashDistance is the distance below which two non-bonded atoms count as crowded in the
// relief pass (bond units). The layout contract only promises 0.5; aiming higher keeps labels
// and lobes readable.
const clashDistance = 0.9

// relieve removes close contacts in one component by mirroring or turning branches about
// acyclic bonds on the path between the two crowded atoms. Each step takes the move that
// lowers the total crowding most; it stops when nothing is crowded or no move helps.
func (l *layouter) relieve(comp []int) {
	if len(comp) < 4 {
		return
	}
	bonded := func(a, b int) bool { return l.g.bondIndex(a, b) >= 0 }
	penalty := func() float64 {
		s := 0.0
		for i, a := range comp {
			for _, b := range comp[i+1:] {
				if d := l.pos[a].dist(l.pos[b]); d < clashDistance && !bonded(a, b) {
					s += (clashDistance - d) * (clashDistance - d)
					if d < 0.5 {
						s += 1 // a hard clash costs more than any number of soft ones nearby
					}
				}
			}
		}
		return s
	}
	// cross is the part of the penalty between the atoms of side and the rest: a rigid move
	// of side changes only that part, so candidates are scored in O(|side|·n).
	l.inSide = grow(l.inSide, l.g.n)
	inSide := l.inSide
	clear(inSide)
	cross := func(side []int) float64 {
		for _, a := range side {
			inSide[a] = true
		}
		s := 0.0
		for _, a := range side {
			for _, b := range comp {
				if inSide[b] {
					continue
				}
				if d := l.pos[a].dist(l.pos[b]); d < clashDistance && !bonded(a, b) {
					s += (clashDistance - d) * (clashDistance - d)
					if d < 0.5 {
						s++
					}
				}
			}
		}
		for _, a := range side {
			inSide[a] = false
		}
		return s
	}
	cur := penalty()
	if cur == 0 {
		return
	}
	if l.tried == nil {
		l.tried = map[[2]int]bool{}
	}
	tried := l.tried // looked up only
	clear(tried)
	l.scratch = grow(l.scratch, len(l.pos))
	scratch := l.scratch
	for iter := 0; iter < 60 && cur > 0; iter++ {
		// the closest crowded pair not yet given up on
		pa, pb, best := -1, -1, clashDistance
		for i, a := range comp {
			for _, b := range comp[i+1:] {
				if tried[[2]int{a, b}] || bonded(a, b) {
					continue
				}
				if d := l.pos[a].dist(l.pos[b]); d < best {
					pa, pb, best = a, b, d
				}
			}
		}
		if pa < 0 {
			return
		}
		path := l.path(pa, pb)
		bestPen := cur
		bestPos := l.bestPos[:0]
		found := false
		for k := 0; k+1 < len(path); k++ {
			p, q := path[k], path[k+1]
			bi := l.g.bondIndex(p, q)
			if bi < 0 || l.g.inRing[bi] {
				continue
			}
			side := l.sideOf(p, q)
			pivot := p
			if len(side) > len(comp)/2 { // move the smaller part
				side = l.sideOf(q, p)
				pivot, q = q, p
			}
			axis := l.pos[q].sub(l.pos[pivot]).unit()
			moves := []func(Point) Point{
				func(x Point) Point { // mirror across the bond line
					r := x.sub(l.pos[pivot])
					proj := axis.scale(r.dot(axis))
					return proj.scale(2).sub(r).add(l.pos[pivot])
				},
			}
			for _, deg := range []float64{30, -30, 60, -60, 90, -90, 120, -120, 180} {
				c, s := math.Cos(deg*math.Pi/180), math.Sin(deg*math.Pi/180)
				moves = append(moves, func(x Point) Point { return x.sub(l.pos[pivot]).rot(c, s).add(l.pos[pivot]) })
				// turn about the far atom too, keeping the bond direction
				qq := q
				moves = append(moves, func(x Point) Point { return x.sub(l.pos[qq]).rot(c, s).add(l.pos[qq]) })
			}
			base := cur - cross(side)
			for mi, mv := range moves {
				copy(scratch, l.pos)
				for _, a := range side {
					if mi > 0 && mi%2 == 0 && a == q { // rotation about q leaves q in place
						continue
					}
					l.pos[a] = mv(l.pos[a])
				}
				if pen := base + cross(side); pen < bestPen-1e-9 && (len(l.ez) == 0 || l.ezOK()) {
					bestPen = pen
					bestPos = append(bestPos[:0], l.pos...)
					found = true
				}
				copy(l.pos, scratch)
			}
		}
		l.bestPos = bestPos
		if !found {
			tried[[2]int{pa, pb}] = true
			continue
		}
		copy(l.pos, bestPos)
		cur = penalty() // recomputed in full so rounding never accumulates
		clear(tried)
	}
}

// path returns the atoms on a shortest path from a to b (inclusive), lowest-index tie-break.
// The result is a buffer of l, valid until the next call.
func (l *layouter) path(a, b int) []int {
	l.prev = grow(l.prev, l.g.n)
	prev := l.prev
	for i := range prev {
		prev[i] = -2
	}
	prev[a] = -1
	q := append(l.bfs[:0], a)
	for h := 0; h < len(q) && prev[b] == -2; h++ {
		v := q[h]
		for _, w := range l.g.adj[v] {
			if prev[w] == -2 {
				prev[w] = v
				q = append(q, w)
			}
		}
	}
	l.bfs = q
	if prev[b] == -2 {
		return nil
	}
	p := l.pathBuf[:0]
	for v := b; v >= 0; v = prev[v] {
		p = append(p, v)
	}
	l.pathBuf = p
	return p
}

// sideOf returns the atoms reachable from q without crossing bond p–q (q included).
// The result is a buffer of l, valid until the next call.
func (l *layouter) sideOf(p, q int) []int {
	st := l.nextStamp() // l.mark[x] == st: x seen
	l.mark[p], l.mark[q] = st, st
	out := append(l.side[:0], q)
	for i := 0; i < len(out); i++ {
		for _, w := range l.g.adj[out[i]] {
			if l.mark[w] != st {
				l.mark[w] = st
				out = append(out, w)
			}
		}
	}
	l.side = out
	return out
}
