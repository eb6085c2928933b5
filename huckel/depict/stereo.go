package depict

// Double-bond geometry from the SMILES marks '/' and '\' (molecule.Bond.Stereo, read in the
// direction Bond.A → Bond.B). F/C=C/F is drawn trans and F/C=C\F cis; an acyclic double bond
// with a marked neighbour on each end is drawn with that geometry. Unmarked double bonds are
// drawn as the layout finds best (usually the zig-zag, trans-like form); the picture then
// makes no claim about E/Z.

// ezRule says that x (bonded to c1) and y (bonded to c2) lie on the same side of the
// c1=c2 bond (cis) or on opposite sides.
type ezRule struct {
	c1, c2, x, y int
	cis          bool
}

// stereoMark returns the mark of bond bi read in the direction from → the other atom, 0 if
// the bond has none.
func (l *layouter) stereoMark(bi, from int) byte {
	b := l.m.Bonds[bi]
	if b.Stereo != '/' && b.Stereo != '\\' {
		return 0
	}
	if from == b.A {
		return b.Stereo
	}
	if b.Stereo == '/' {
		return '\\'
	}
	return '/'
}

// ezRules collects the rules of every acyclic double bond with a marked neighbour bond on
// each end.
func (l *layouter) ezRules() []ezRule {
	out := l.ez[:0]
	for bi, b := range l.m.Bonds {
		if b.Order != 2 || l.g.inRing[bi] {
			continue
		}
		c1, c2 := b.A, b.B
		x, sx := l.markedNeighbour(c1, c2, true)
		y, sy := l.markedNeighbour(c2, c1, false)
		if x < 0 || y < 0 {
			continue
		}
		out = append(out, ezRule{c1: c1, c2: c2, x: x, y: y, cis: sx != sy})
	}
	return out
}

// markedNeighbour finds a neighbour of c (other than the double-bond partner) joined by a
// marked bond and returns it with the mark read towards c (toward = true: neighbour → c) or
// away from c (c → neighbour).
func (l *layouter) markedNeighbour(c, partner int, toward bool) (int, byte) {
	for k, w := range l.g.adj[c] {
		if w == partner {
			continue
		}
		bi := l.g.bondOf[c][k]
		from := c
		if toward {
			from = w
		}
		if s := l.stereoMark(bi, from); s != 0 {
			return w, s
		}
	}
	return -1, 0
}

// ezOK reports whether every rule holds in the current coordinates.
func (l *layouter) ezOK() bool {
	for _, r := range l.ez {
		if !l.ruleHolds(r) {
			return false
		}
	}
	return true
}

func (l *layouter) ruleHolds(r ezRule) bool {
	a, b := l.pos[r.c1], l.pos[r.c2]
	d := b.sub(a)
	sx := d.cross(l.pos[r.x].sub(a))
	sy := d.cross(l.pos[r.y].sub(a))
	return (sx*sy > 0) == r.cis
}

// applyEZ mirrors the far side of each double bond whose drawing contradicts its marks
// across the bond's line.
func (l *layouter) applyEZ(comp []int) {
	l.inComp = grow(l.inComp, l.g.n)
	in := l.inComp
	clear(in)
	for _, a := range comp {
		in[a] = true
	}
	for _, r := range l.ez {
		if !in[r.c1] || l.ruleHolds(r) {
			continue
		}
		side := l.sideOf(r.c1, r.c2)
		a := l.pos[r.c1]
		u := l.pos[r.c2].sub(a).unit()
		for _, i := range side {
			p := l.pos[i].sub(a)
			l.pos[i] = u.scale(2 * p.dot(u)).sub(p).add(a)
		}
	}
}
