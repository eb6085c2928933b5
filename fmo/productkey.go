package fmo

import (
	"hash/maphash"

	"cyclopair/huckel/molecule"
)

// Telling candidate adducts apart cheaply. Analyze compares the candidate adducts of a pair
// (is the other regio-orientation the same compound? which is the best orientation giving a
// different adduct?) by their canonical SMILES, which is most of a pair analysis's cost when
// every adduct gets one. productKeys computes a canonical SMILES only when two adducts could
// be the same compound: it first compares a graph invariant (colour refinement of the atom
// elements over the bonds, the Weisfeiler–Lehman scheme: B. Weisfeiler, A. Leman, Nauchno-
// Tekhnicheskaya Informatsia 1968, 2(9), 12), which is equal for isomorphic graphs. Two
// adducts whose invariants differ are different graphs, so their canonical SMILES differ too
// (a SMILES string fixes the elements and connectivity of the graph it writes); the answers
// are those of comparing canonical SMILES throughout. The invariant ignores bond orders,
// charges, hydrogens and aromaticity, so it is coarser than the canonical SMILES, never finer.

// productKeys holds the candidate adducts of one analysis, built, hashed and canonicalised
// on demand.
type productKeys struct {
	build   func(i int) *molecule.Molecule
	mols    []*molecule.Molecule
	inv     []uint64
	invDone []bool
	key     []string
	keyDone []bool
}

func newProductKeys(n int, build func(i int) *molecule.Molecule) *productKeys {
	return &productKeys{build: build, mols: make([]*molecule.Molecule, n), inv: make([]uint64, n),
		invDone: make([]bool, n), key: make([]string, n), keyDone: make([]bool, n)}
}

func (p *productKeys) mol(i int) *molecule.Molecule {
	if p.mols[i] == nil {
		p.mols[i] = p.build(i)
	}
	return p.mols[i]
}

func (p *productKeys) invariant(i int) uint64 {
	if !p.invDone[i] {
		p.inv[i], p.invDone[i] = graphInvariant(p.mol(i)), true
	}
	return p.inv[i]
}

func (p *productKeys) canonical(i int) string {
	if !p.keyDone[i] {
		p.key[i], p.keyDone[i] = productKey(p.mol(i)), true
	}
	return p.key[i]
}

// same reports whether adducts i and j are the same compound (equal canonical SMILES).
func (p *productKeys) same(i, j int) bool {
	if i == j {
		return true
	}
	if p.invariant(i) != p.invariant(j) {
		return false
	}
	return p.canonical(i) == p.canonical(j)
}

var invSeed = maphash.MakeSeed()

// mix64 is the SplitMix64 finaliser (S. Vigna, public-domain reference code, 2015).
func mix64(x uint64) uint64 {
	x ^= x >> 30
	x *= 0xbf58476d1ce4e5b9
	x ^= x >> 27
	x *= 0x94d049bb133111eb
	x ^= x >> 31
	return x
}

// graphInvariant is equal for isomorphic molecules (elements and connectivity): three rounds
// of colour refinement with commutative neighbour sums, then a commutative sum over atoms.
func graphInvariant(m *molecule.Molecule) uint64 {
	n := len(m.Atoms)
	c := make([]uint64, 2*n)
	cur, nxt := c[:n], c[n:]
	for i := range m.Atoms {
		cur[i] = maphash.String(invSeed, m.Atoms[i].Element)
	}
	for range 3 {
		for i := range nxt {
			nxt[i] = cur[i] * 0x9e3779b97f4a7c15
		}
		for _, b := range m.Bonds {
			nxt[b.A] += mix64(cur[b.B])
			nxt[b.B] += mix64(cur[b.A])
		}
		for i := range nxt {
			nxt[i] = mix64(nxt[i])
		}
		cur, nxt = nxt, cur
	}
	var h uint64
	for _, v := range cur {
		h += mix64(v ^ 0x5851f42d4c957f2d)
	}
	return h
}
