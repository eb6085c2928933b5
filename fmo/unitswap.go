package fmo

import (
	"sync"
)

// Are two candidate adducts of one pair the same compound? An adduct is the diene's half
// (the diene after reaction through its unit: product bond orders and charges, the side of
// kekule.go) and the dienophile's half, joined by two new bonds. If an isomorphism τ of the
// diene's halves for units di and di' takes the termini of one to the termini of the other
// (in order, or exchanged), and one σ of the dienophile's halves does the same for ei and
// ei', then τ and σ together map one adduct onto the other with every label kept (elements,
// isotopes, charges, hydrogens, bond orders) exactly when they carry the new bonds onto the
// new bonds: when exactly one of them exchanges and the orientations differ, or neither or
// both exchange and the orientations agree. That is the isomorphism productKeys.same looks
// for in the two built adducts (the same units of a symmetric partner, symmetry-equivalent
// units of a quinone), found once per partner and pair of units in the partner alone.

// Kinds of terminus map of unitMaps.
const (
	mapKeep = 1 << iota // first terminus to first, last to last
	mapSwap             // first to last, last to first
)

// unitMapTable memoises unitMaps per ordered pair of units of one partner (shared by the
// partner's plain copies, which have the same molecule and sides).
type unitMapTable struct {
	n int
	e []unitMapEntry
}

type unitMapEntry struct {
	once sync.Once
	mask uint8
}

func newUnitMapTable(units int) *unitMapTable {
	return &unitMapTable{n: units, e: make([]unitMapEntry, units*units)}
}

// unitMaps returns the kinds of terminus map (mapKeep, mapSwap) realised by an
// isomorphism of the partner's half after reaction through unit u onto its half after
// reaction through unit v. A kind is left out also when the search gave up (the adducts
// are then compared as before).
func (p *Partner) unitMaps(u, v int) uint8 {
	t := p.unitMapsT
	if t == nil || u >= t.n || v >= t.n {
		return 0
	}
	e := &t.e[u*t.n+v]
	e.once.Do(func() { e.mask = unitMaps(p, u, v) })
	return e.mask
}

// sameAdduct reports whether the partners show adducts (di, ei, or) and (dj, ej, oj) of
// diene d and dienophile e to be one compound (see above); false means unknown.
func sameAdduct(d, e *Partner, di, ei, or, dj, ej, oj int) bool {
	md, me := d.unitMaps(di, dj), e.unitMaps(ei, ej)
	if md == 0 || me == 0 {
		return false
	}
	flip := or != oj
	for _, kd := range [2]uint8{mapKeep, mapSwap} {
		for _, ke := range [2]uint8{mapKeep, mapSwap} {
			if md&kd != 0 && me&ke != 0 && ((kd == mapSwap) != (ke == mapSwap)) == flip {
				return true
			}
		}
	}
	return false
}

func unitMaps(p *Partner, u, v int) uint8 {
	a, b := half(p, u), half(p, v)
	_, ca := graphColours(a)
	_, cb := graphColours(b)
	a0, a1 := p.Units[u].Termini()
	b0, b1 := p.Units[v].Termini()
	const s0, s1 = 0x5bd1e995a1b2c3d4, 0x27d4eb2f165667c5 // two colours to pin the termini
	for _, c := range append(ca[:len(ca):len(ca)], cb...) {
		if c == s0 || c == s1 {
			return 0 // a refinement colour equal to a pin (about 2⁻⁶³): do not guess
		}
	}
	var iso isoScratch
	try := func(x0, x1 int) bool {
		if ca[a0] != cb[x0] || ca[a1] != cb[x1] {
			return false // refinement colours are kept by every isomorphism
		}
		pa, pb := append([]uint64(nil), ca...), append([]uint64(nil), cb...)
		pa[a0], pa[a1] = s0, s1
		pb[x0], pb[x1] = s0, s1
		return iso.isomorphic(a, b, pa, pb)
	}
	var mask uint8
	if u == v || try(b0, b1) {
		mask |= mapKeep
	}
	if try(b1, b0) {
		mask |= mapSwap
	}
	return mask
}
