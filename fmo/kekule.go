package fmo

import (
	"errors"
	"fmt"
	"sync"

	"cyclopair/huckel/molecule"
)

// errNoKekule: the partner has no closed-shell Kekulé structure once the unit's termini are
// saturated, so the unit cannot react to a neutral adduct.
var errNoKekule = errors.New("no valid Kekulé structure for the adduct")

// side is one partner's half of an adduct: the new Kekulé bond orders of the partner's own
// bonds and the formal-charge changes, for a given reacting unit. Both regio-orientations share
// it, since only the pairing of the new σ bonds differs between them.
type side struct {
	orders []int // new Kekulé order of every bond of the partner molecule
	charge []int // new formal charge of every atom
}

// adductSide derives a valid Kekulé structure of the partner after cycloaddition through unit u.
//
// Rules: each terminus gains one σ bond (to the other partner) and keeps its hydrogens and
// total valence, so a carbon terminus becomes sp3; for a 1,3-dipole the charge separation
// collapses (the positive middle atom loses its charge and one unit of valence, the anionic
// terminus loses its charge and gains one unit of valence: nitrone → isoxazolidine, azide →
// triazoline, diazoalkane → 1-pyrazoline, nitrile oxide → isoxazoline). Every other atom
// keeps its valence and charge. The conjugated region around the unit (atoms reachable from it
// through atoms that carry a multiple bond in the written structure) has all its bond orders
// reset to 1 and is then re-matched: each atom gets exactly the number of π bonds its valence
// leaves free, preferring the bonds that were multiple in the input. Aromatic rings elsewhere
// therefore keep a valid alternation (the benzo rings of an anthracene 9,10-adduct, the
// N=N bridges of a 1,2,4,5-tetrazine bicyclic adduct before N₂ loss).
//
// The working arrays come from a pool (kekuleScratch); only the result is allocated.
func adductSide(m *molecule.Molecule, u Unit) (*side, error) {
	n := len(m.Atoms)
	s := &side{orders: make([]int, len(m.Bonds)), charge: make([]int, n)}
	ks := kekuleScratches.Get().(*kekuleScratch)
	defer kekuleScratches.Put(ks)
	valence := ks.ints(&ks.valence, n)
	unsat := ks.bools(&ks.unsat, n)
	for i := range m.Atoms {
		valence[i] = m.Valence(i)
		s.charge[i] = m.Atoms[i].Charge
	}
	for bi, b := range m.Bonds {
		s.orders[bi] = b.Order
		if b.Order > 1 {
			unsat[b.A], unsat[b.B] = true, true
		}
	}
	extraSigma := ks.ints(&ks.extraSigma, n) // σ bonds to the other partner
	t0, t1 := u.Termini()
	extraSigma[t0]++
	extraSigma[t1]++
	if u.Kind == UnitDipole {
		mid := u.Atoms[1]
		anion := t0
		if m.Atoms[t1].Charge == -1 {
			anion = t1
		}
		if m.Atoms[mid].Charge != 1 || m.Atoms[anion].Charge != -1 {
			return nil, fmt.Errorf("%w: dipole %v is not charge-separated", errNoKekule, u.Atoms)
		}
		s.charge[mid]--
		valence[mid]--
		s.charge[anion]++
		valence[anion]++
	}
	// Conjugated region around the unit.
	region := ks.bools(&ks.region, n)
	queue := append(ks.queue[:0], u.Atoms...)
	defer func() { ks.queue = queue }()
	for _, a := range u.Atoms {
		region[a] = true
	}
	for q := 0; q < len(queue); q++ {
		for _, e := range m.Neighbors(queue[q]) {
			if !region[e.To] && unsat[e.To] {
				region[e.To] = true
				queue = append(queue, e.To)
			}
		}
	}
	free := ks.free[:0] // bonds inside the region whose order is re-derived
	defer func() { ks.free = free }()
	for bi, b := range m.Bonds {
		if region[b.A] && region[b.B] {
			s.orders[bi] = 1
			free = append(free, bi)
		}
	}
	need := ks.ints(&ks.need, n)
	for i := range m.Atoms {
		if !region[i] {
			continue
		}
		sum := m.Atoms[i].HCount + extraSigma[i]
		for _, e := range m.Neighbors(i) {
			sum += s.orders[e.Bond]
		}
		need[i] = valence[i] - sum
		if need[i] < 0 {
			return nil, fmt.Errorf("%w: atom %d would exceed its valence", errNoKekule, i+1)
		}
	}
	k := kekulizer{m: m, need: need, orders: s.orders, orig: m.Bonds, free: free, isFree: ks.bools(&ks.isFree, len(m.Bonds)), ks: ks}
	for _, bi := range free {
		k.isFree[bi] = true
	}
	if !k.feasible() || !k.solve() {
		return nil, errNoKekule
	}
	return s, nil
}

// feasible is a quick necessary condition checked before the search: in every connected
// group of atoms that still need π bonds (joined by usable bonds) the needs must add up to
// an even number, since each π bond serves two atoms. It rejects most impossible units
// (odd rings, radicals left behind) without any backtracking.
func (k *kekulizer) feasible() bool {
	n := len(k.need)
	seen := k.ks.bools(&k.ks.seen, n)
	stack := k.ks.stack[:0]
	defer func() { k.ks.stack = stack }()
	for s := 0; s < n; s++ {
		if seen[s] || k.need[s] <= 0 {
			continue
		}
		sum := 0
		seen[s] = true
		stack = append(stack[:0], s)
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			sum += k.need[v]
			for _, e := range k.m.Neighbors(v) {
				if j, ok := k.usable(e.Bond, v); ok && !seen[j] {
					seen[j] = true
					stack = append(stack, j)
				}
			}
		}
		if sum%2 != 0 {
			return false
		}
	}
	return true
}

// kekulizer assigns extra bond orders so that every atom's remaining need reaches zero.
// It is a depth-first search choosing, at each step, the atom with the fewest usable bonds
// (most-constrained first); bonds that were multiple in the input are tried first so the
// written Kekulé form is kept wherever it is still valid.
type kekulizer struct {
	m      *molecule.Molecule
	need   []int
	orders []int
	orig   []molecule.Bond
	free   []int
	isFree []bool
	steps  int
	ks     *kekuleScratch
}

// kekuleScratch holds adductSide's working arrays between calls.
type kekuleScratch struct {
	valence, extraSigma, need, queue, free, stack []int
	unsat, region, isFree, seen                   []bool
}

var kekuleScratches = sync.Pool{New: func() any { return new(kekuleScratch) }}

// ints returns (*b)[:n] zeroed, growing *b when needed.
func (ks *kekuleScratch) ints(b *[]int, n int) []int {
	if cap(*b) < n {
		*b = make([]int, n)
	}
	*b = (*b)[:n]
	clear(*b)
	return *b
}

// bools returns (*b)[:n] all false, growing *b when needed.
func (ks *kekuleScratch) bools(b *[]bool, n int) []bool {
	if cap(*b) < n {
		*b = make([]bool, n)
	}
	*b = (*b)[:n]
	clear(*b)
	return *b
}

// kekuleStepLimit bounds the search per unit; with most-constrained-first ordering real
// molecules need about one step per π bond, so hitting it means "no structure" in practice.
const kekuleStepLimit = 1 << 16

func (k *kekulizer) usable(bi, i int) (int, bool) {
	if !k.isFree[bi] || k.orders[bi] >= 3 {
		return 0, false
	}
	b := k.m.Bonds[bi]
	j := b.A
	if j == i {
		j = b.B
	}
	return j, k.need[j] > 0
}

func (k *kekulizer) solve() bool {
	k.steps++
	if k.steps > kekuleStepLimit {
		return false
	}
	best, bestCount := -1, 1<<30
	for i, nd := range k.need {
		if nd <= 0 {
			continue
		}
		c := 0
		for _, e := range k.m.Neighbors(i) {
			if _, ok := k.usable(e.Bond, i); ok {
				c++
			}
		}
		if c == 0 {
			return false
		}
		if c < bestCount {
			best, bestCount = i, c
		}
	}
	if best < 0 {
		return true
	}
	// Two passes: bonds that were multiple in the input first.
	for pass := 0; pass < 2; pass++ {
		for _, e := range k.m.Neighbors(best) {
			j, ok := k.usable(e.Bond, best)
			if !ok {
				continue
			}
			wasMultiple := k.orig[e.Bond].Order > 1
			if (pass == 0) != wasMultiple {
				continue
			}
			k.orders[e.Bond]++
			k.need[best]--
			k.need[j]--
			if k.solve() {
				return true
			}
			k.orders[e.Bond]--
			k.need[best]++
			k.need[j]++
		}
	}
	return false
}
