// Package molecule holds the molecular graph that every later stage of cyclopair works on:
// atoms with element, formal charge, hydrogen count and atom map, and bonds with a Kekulé
// order. The SMILES reader (package smiles) produces it; π-system perception (package huckel)
// and the cycloaddition code (package fmo) read it; product building edits copies of it.
//
// Atom indices are 0-based and follow the order in which atoms appear in the SMILES text, so
// index i is "the i-th atom of the input". Bond orders are always Kekulé orders (1, 2 or 3)
// once a Molecule leaves the SMILES reader; the Aromatic flags only record how the input was
// written.
package molecule

import (
	"fmt"
	"slices"
)

// Atom is one heavy atom (or an explicit bracket hydrogen) of the graph.
type Atom struct {
	Element  string // element symbol, capitalised as in the periodic table: "C", "N", "Cl"
	Isotope  int    // mass number from a bracket atom, 0 when not given
	Charge   int    // formal charge
	HCount   int    // hydrogens attached: implicit (organic subset) or the bracket count
	Aromatic bool   // written as an aromatic (lowercase) atom in the input
	Bracket  bool   // written in brackets in the input
	Map      int    // atom class ":n" from a bracket atom, 0 when not given
	Pos      int    // 0-based byte offset of the atom in Molecule.Source, -1 if built in code
	// Chiral is the tetrahedral configuration set by code (the SMILES reader does not keep
	// '@' marks): 0 none, ChiralACW or ChiralCW. It is relative to the atom's StereoOrder:
	// looking from the first neighbour of that order toward the atom, the other three run
	// anticlockwise (ChiralACW, SMILES '@') or clockwise (ChiralCW, '@@'). It is meaningful
	// only on an atom with four neighbours counting at most one implicit hydrogen.
	Chiral int8
}

// Tetrahedral configurations for Atom.Chiral.
const (
	ChiralACW int8 = 1  // '@'
	ChiralCW  int8 = -1 // '@@'
)

// ImplicitH stands for an atom's implicit hydrogen in a StereoOrder.
const ImplicitH = -1

// StereoOrder is the reference neighbour order of atom v for Atom.Chiral: the implicit
// hydrogen first (ImplicitH, when HCount is 1), then the neighbours in ascending atom index.
// It does not depend on the order of Bonds, so only renumbering atoms changes it.
func (m *Molecule) StereoOrder(v int) []int {
	var out []int
	if m.Atoms[v].HCount == 1 {
		out = append(out, ImplicitH)
	}
	start := len(out)
	for _, e := range m.Neighbors(v) {
		out = append(out, e.To)
	}
	slices.Sort(out[start:])
	return out
}

// OddPermutation reports whether list b is an odd permutation of list a (both hold the
// same distinct values). It panics if they do not (programmer error).
func OddPermutation(a, b []int) bool {
	if len(a) != len(b) {
		panic("molecule.OddPermutation: lists of different length")
	}
	p := slices.Clone(b)
	odd := false
	for i := range a {
		if p[i] == a[i] {
			continue
		}
		j := slices.Index(p[i+1:], a[i])
		if j < 0 {
			panic("molecule.OddPermutation: lists hold different values")
		}
		p[i], p[i+1+j] = p[i+1+j], p[i]
		odd = !odd
	}
	return odd
}

// Bond joins atoms A and B (A < B is not required).
type Bond struct {
	A, B     int
	Order    int  // Kekulé order: 1, 2 or 3
	Aromatic bool // written (or implied) as an aromatic bond in the input
	Stereo   byte // '/' or '\\' as written, 0 otherwise; kept, never interpreted
}

// Edge is one entry of an atom's adjacency list.
type Edge struct {
	To   int // neighbouring atom
	Bond int // index into Molecule.Bonds
}

// Molecule is an undirected molecular graph. The zero value is an empty molecule ready for
// AddAtom and AddBond. A Molecule is not safe for concurrent mutation; concurrent reads are fine.
type Molecule struct {
	Source string // the text it was read from, if any
	Name   string // an optional human name
	Atoms  []Atom
	Bonds  []Bond
	adj    [][]Edge
}

// AddAtom appends a copy of a and returns its index.
func (m *Molecule) AddAtom(a Atom) int {
	m.Atoms = append(m.Atoms, a)
	m.adj = append(m.adj, nil)
	return len(m.Atoms) - 1
}

// AddBond joins atoms a and b with the given order and returns the bond index.
// It panics if either index is out of range or a == b (programmer error).
func (m *Molecule) AddBond(a, b, order int) int {
	if a < 0 || b < 0 || a >= len(m.Atoms) || b >= len(m.Atoms) || a == b {
		panic(fmt.Sprintf("molecule: AddBond(%d, %d) on %d atoms", a, b, len(m.Atoms)))
	}
	m.ensureAdj()
	m.Bonds = append(m.Bonds, Bond{A: a, B: b, Order: order})
	i := len(m.Bonds) - 1
	m.adj[a] = append(m.adj[a], Edge{To: b, Bond: i})
	m.adj[b] = append(m.adj[b], Edge{To: a, Bond: i})
	return i
}

// ensureAdj rebuilds the adjacency lists when Atoms or Bonds were filled directly.
func (m *Molecule) ensureAdj() {
	if len(m.adj) == len(m.Atoms) {
		return
	}
	m.Reindex()
}

// Reindex rebuilds the adjacency lists from Bonds. Call it after editing Atoms or Bonds
// directly (for example after deleting bonds from the slice).
func (m *Molecule) Reindex() {
	// One backing array for all lists (three allocations in all); each list is capped at its
	// length so a later AddBond appends into a fresh array instead of a neighbour's list.
	m.adj = make([][]Edge, len(m.Atoms))
	deg := make([]int, len(m.Atoms)+1)
	for _, b := range m.Bonds {
		deg[b.A+1]++
		deg[b.B+1]++
	}
	for i := 1; i < len(deg); i++ {
		deg[i] += deg[i-1]
	}
	all := make([]Edge, 2*len(m.Bonds))
	for i := range m.adj {
		m.adj[i] = all[deg[i]:deg[i]:deg[i+1]]
	}
	for i, b := range m.Bonds {
		m.adj[b.A] = append(m.adj[b.A], Edge{To: b.B, Bond: i})
		m.adj[b.B] = append(m.adj[b.B], Edge{To: b.A, Bond: i})
	}
}

// Neighbors returns the adjacency list of atom i in bond-insertion order. The slice is
// owned by the molecule: do not modify it.
func (m *Molecule) Neighbors(i int) []Edge {
	m.ensureAdj()
	return m.adj[i]
}

// Degree is the number of explicit neighbours of atom i (hydrogens in HCount not counted).
func (m *Molecule) Degree(i int) int { return len(m.Neighbors(i)) }

// BondBetween returns the index of the bond joining a and b, or -1.
func (m *Molecule) BondBetween(a, b int) int {
	for _, e := range m.Neighbors(a) {
		if e.To == b {
			return e.Bond
		}
	}
	return -1
}

// BondOrderSum is the sum of Kekulé bond orders of atom i's explicit bonds.
func (m *Molecule) BondOrderSum(i int) int {
	s := 0
	for _, e := range m.Neighbors(i) {
		s += m.Bonds[e.Bond].Order
	}
	return s
}

// Valence is BondOrderSum plus the attached hydrogens.
func (m *Molecule) Valence(i int) int { return m.BondOrderSum(i) + m.Atoms[i].HCount }

// Clone returns a deep copy.
func (m *Molecule) Clone() *Molecule {
	c := &Molecule{Source: m.Source, Name: m.Name}
	c.Atoms = append([]Atom(nil), m.Atoms...)
	c.Bonds = append([]Bond(nil), m.Bonds...)
	c.Reindex()
	return c
}

// Components returns the connected components as sorted lists of atom indices, ordered by
// their lowest atom index.
func (m *Molecule) Components() [][]int {
	m.ensureAdj()
	seen := make([]bool, len(m.Atoms))
	var out [][]int
	for s := range m.Atoms {
		if seen[s] {
			continue
		}
		comp := []int{s}
		seen[s] = true
		for q := 0; q < len(comp); q++ {
			for _, e := range m.adj[comp[q]] {
				if !seen[e.To] {
					seen[e.To] = true
					comp = append(comp, e.To)
				}
			}
		}
		slices.Sort(comp)
		out = append(out, comp)
	}
	return out
}

// AtomByMap returns the atoms carrying atom-map number n (SMILES atom class), in index order.
func (m *Molecule) AtomByMap(n int) []int {
	var out []int
	for i, a := range m.Atoms {
		if a.Map == n {
			out = append(out, i)
		}
	}
	return out
}

// HeavyAtomCount counts atoms that are not hydrogen.
func (m *Molecule) HeavyAtomCount() int {
	n := 0
	for _, a := range m.Atoms {
		if a.Element != "H" {
			n++
		}
	}
	return n
}
