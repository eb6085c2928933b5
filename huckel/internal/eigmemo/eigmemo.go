// Package eigmemo remembers the results of recent symmetric eigenproblems by the exact
// contents of their matrix, for the solvers of package huckel.
//
// A screen prepares thousands of molecules that share π fragments: the localisation energy
// of each reacting unit re-solves every fragment the unit does not touch, and the adducts
// the side-channel check prepares repeat the fragments of their partners (the ester group of
// one dienophile in its adduct with every diene). A fragment's eigenvalues and eigenvectors
// are a deterministic function of its matrix as the solver builds it, so a result looked up
// by that matrix, compared element for element (bit patterns, so −0 and +0 and NaNs are
// told apart), is the number a new solve would give, bit for bit.
package eigmemo

import (
	"math"
	"math/bits"
)

// MinOrder is the smallest matrix order worth remembering: below it the solvers' closed
// forms and the LAPACK call cost about as much as hashing and copying.
const MinOrder = 3

// maxFloats bounds the memory of one Memo (keys and values, 8 bytes each): 2 MiB. When it
// is full the Memo forgets everything and starts again, so a stream of unrelated molecules
// costs no more than the hashing.
const maxFloats = 1 << 18

// Memo maps matrices to results. The zero value is ready; a Memo is not safe for
// concurrent use (each solver owns one).
type Memo struct {
	index   map[uint64]int32 // hash -> first entry with that hash
	entries []entry
	arena   []float64 // keys and values, back to back
}

type entry struct {
	key, val   int32 // offsets into arena
	nKey, nVal int32
	next       int32 // next entry with the same hash, -1 at the end
}

// Hash returns the hash of matrix a (its bit patterns).
func Hash(a []float64) uint64 {
	h := uint64(len(a))*0x9E3779B97F4A7C15 ^ 0xD6E8FEB86659FD93
	for _, v := range a {
		h ^= math.Float64bits(v)
		hi, lo := bits.Mul64(h, 0x9FB21C651E98DF25)
		h = hi ^ lo
	}
	return h
}

// Get returns the result stored for matrix a (hash h = Hash(a)), or false. The returned
// slice belongs to the Memo: copy it before the next Put.
func (c *Memo) Get(h uint64, a []float64) ([]float64, bool) {
	i, ok := c.index[h]
	if !ok {
		return nil, false
	}
	for i >= 0 {
		e := &c.entries[i]
		if sameBits(c.arena[e.key:e.key+e.nKey], a) {
			return c.arena[e.val : e.val+e.nVal], true
		}
		i = e.next
	}
	return nil, false
}

// Put stores val as the result for matrix a (hash h = Hash(a)); both are copied.
func (c *Memo) Put(h uint64, a, val []float64) {
	need := len(a) + len(val)
	if need > maxFloats/4 {
		return // too large to be worth a quarter of the memory
	}
	if len(c.arena)+need > maxFloats || len(c.entries) >= math.MaxInt32/2 {
		clear(c.index)
		c.entries = c.entries[:0]
		c.arena = c.arena[:0]
	}
	if c.index == nil {
		c.index = make(map[uint64]int32)
	}
	e := entry{key: int32(len(c.arena)), nKey: int32(len(a)), nVal: int32(len(val)), next: -1}
	c.arena = append(c.arena, a...)
	e.val = int32(len(c.arena))
	c.arena = append(c.arena, val...)
	if first, ok := c.index[h]; ok {
		e.next = first
	}
	c.index[h] = int32(len(c.entries))
	c.entries = append(c.entries, e)
}

func sameBits(x, y []float64) bool {
	if len(x) != len(y) {
		return false
	}
	for i := range x {
		if math.Float64bits(x[i]) != math.Float64bits(y[i]) {
			return false
		}
	}
	return true
}
