// Package stats holds the rank statistics shared by fmo/check and fmo/rate.
package stats

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/stat"
)

// Ranks returns the 1-based ranks of v, tied values sharing the mean of the ranks they span
// (mid-rank convention). With tol 0 only equal values tie; with tol > 0 a value ties with the
// smallest of its run when it exceeds it by at most tol·max(1, |smallest|).
func Ranks(v []float64, tol float64) []float64 {
	idx := make([]int, len(v))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		switch {
		case v[a] < v[b]:
			return -1
		case v[a] > v[b]:
			return 1
		}
		return 0
	})
	tie := func(lo, x float64) bool { return x == lo }
	if tol > 0 {
		tie = func(lo, x float64) bool { return x-lo <= tol*math.Max(1, math.Abs(lo)) }
	}
	r := make([]float64, len(v))
	for i := 0; i < len(idx); {
		j := i
		for j+1 < len(idx) && tie(v[idx[i]], v[idx[j+1]]) {
			j++
		}
		mid := float64(i+j)/2 + 1
		for k := i; k <= j; k++ {
			r[idx[k]] = mid
		}
		i = j + 1
	}
	return r
}

// Spearman returns Spearman's rank correlation of x and y: the Pearson correlation of their
// Ranks (with the given tie tolerance). It panics if the lengths differ; NaN when either has
// no spread.
func Spearman(x, y []float64, tol float64) float64 {
	return stat.Correlation(Ranks(x, tol), Ranks(y, tol), nil)
}
