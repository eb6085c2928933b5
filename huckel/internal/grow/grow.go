// Package grow holds the one buffer-reuse helper the solvers of package huckel and its
// sub-packages share.
package grow

// Slice returns b resliced to length n when its capacity allows, else a new slice of length
// n with room for half as much again. The contents are not cleared.
func Slice[T any](b []T, n int) []T {
	if cap(b) < n {
		return make([]T, n, n+n/2)
	}
	return b[:n]
}
