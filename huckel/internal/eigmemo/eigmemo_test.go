package eigmemo

import (
	"math"
	"testing"
)

// A stored result comes back only for a matrix equal bit for bit, colliding hashes are told
// apart, and a full Memo starts again instead of growing.
func TestMemoExactAndBounded(t *testing.T) {
	var c Memo
	a := []float64{1, 0.5, 0, 2}
	h := Hash(a)
	if _, ok := c.Get(h, a); ok {
		t.Fatal("hit in an empty memo")
	}
	c.Put(h, a, []float64{3, 4})
	if v, ok := c.Get(h, []float64{1, 0.5, 0, 2}); !ok || v[0] != 3 || v[1] != 4 {
		t.Fatalf("stored result not found: %v %v", v, ok)
	}
	// −0 and +0 are different bit patterns (a solver may treat them alike, the memo must not
	// assume it), and so are two matrices sharing a hash.
	negZero := []float64{1, 0.5, math.Copysign(0, -1), 2}
	if _, ok := c.Get(h, negZero); ok {
		t.Error("−0 matched +0")
	}
	other := []float64{9, 9, 9, 9}
	c.Put(h, other, []float64{7}) // forced collision: same hash, other matrix
	if v, ok := c.Get(h, other); !ok || len(v) != 1 || v[0] != 7 {
		t.Errorf("colliding entry: %v %v", v, ok)
	}
	if v, ok := c.Get(h, a); !ok || v[0] != 3 {
		t.Errorf("first entry lost after a collision: %v %v", v, ok)
	}
	// Fill past the bound: memory stays within maxFloats.
	big := make([]float64, 1000)
	for i := range 2 * maxFloats / 1000 {
		big[0] = float64(i)
		c.Put(Hash(big), big, big[:10])
		if len(c.arena) > maxFloats {
			t.Fatalf("arena %d floats, bound %d", len(c.arena), maxFloats)
		}
	}
	if _, ok := c.Get(h, a); ok {
		t.Error("an entry survived the reset")
	}
	// Oversized results are not stored.
	huge := make([]float64, maxFloats/2)
	c.Put(Hash(huge), huge, nil)
	if _, ok := c.Get(Hash(huge), huge); ok {
		t.Error("oversized matrix stored")
	}
}
