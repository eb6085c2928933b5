package screen

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// PairSpace enumerates diene × dienophile × activation triples. Index k stands for
// diene k / (Dienophiles·Activations), dienophile (k / Activations) mod Dienophiles and
// activation k mod Activations: dienes vary slowest, activations fastest.
type PairSpace struct {
	Dienes, Dienophiles, Activations int
}

// Len is the number of triples.
func (s PairSpace) Len() int64 {
	return int64(s.Dienes) * int64(s.Dienophiles) * int64(s.Activations)
}

// Split returns the diene, dienophile and activation indices of pair k.
func (s PairSpace) Split(k int64) (diene, dienophile, activation int) {
	a := int(k % int64(s.Activations))
	k /= int64(s.Activations)
	return int(k / int64(s.Dienophiles)), int(k % int64(s.Dienophiles)), a
}

// Shard selects a deterministic slice of the pair space: shard Index of Count (1-based).
// The zero value (and 1/1) is the whole space. Shards are contiguous index ranges, so the
// unranked outputs of shards 1..Count concatenate to the unsharded unranked output.
type Shard struct {
	Index, Count int
}

// ErrBadShard is wrapped by ParseShard and Range for an impossible shard.
var ErrBadShard = errors.New("bad shard")

// ParseShard reads "i/n" with 1 ≤ i ≤ n.
func ParseShard(s string) (Shard, error) {
	a, b, ok := strings.Cut(strings.TrimSpace(s), "/")
	i, err1 := strconv.Atoi(a)
	n, err2 := strconv.Atoi(b)
	if !ok || err1 != nil || err2 != nil {
		return Shard{}, fmt.Errorf("%w %q (write i/n, e.g. 2/8 for the second of eight shards)", ErrBadShard, s)
	}
	if n < 1 || i < 1 || i > n {
		return Shard{}, fmt.Errorf("%w %q (need 1 ≤ i ≤ n)", ErrBadShard, s)
	}
	return Shard{Index: i, Count: n}, nil
}

// String is "i/n", or "" for the whole space.
func (sh Shard) String() string {
	if sh.Count <= 1 {
		return ""
	}
	return fmt.Sprintf("%d/%d", sh.Index, sh.Count)
}

// Range returns the half-open index range [lo, hi) of the shard within n pairs.
func (sh Shard) Range(n int64) (lo, hi int64) {
	if sh.Count <= 1 {
		return 0, n
	}
	if sh.Index < 1 || sh.Index > sh.Count {
		panic(fmt.Sprintf("fmo: shard %d/%d out of range", sh.Index, sh.Count))
	}
	c := int64(sh.Count)
	i := int64(sh.Index)
	// n·i/c without overflow for any realistic n (n < 2^62/c).
	return n/c*(i-1) + n%c*(i-1)/c, n/c*i + n%c*i/c
}
