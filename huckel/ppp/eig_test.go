package ppp

import (
	"math"
	"math/rand/v2"
	"testing"
)

// eigTol: residual |A v − λ v| and |VᵀV − 1| of symEig on matrices with entries of order
// one (a few hundred ulps of the matrix norm).
const eigTol = 1e-12

// TestSymEig checks the Householder–QL eigensolver by its defining identities (A v = λ v,
// orthonormal V) on random symmetric matrices, on matrices with exactly degenerate levels
// (the cycle graph of benzene, Hückel x = 2cos(2πk/6)) and on a diagonal matrix.
func TestSymEig(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	var cases [][]float64
	var sizes []int
	for m := 1; m <= 24; m++ {
		a := make([]float64, m*m)
		for i := 0; i < m; i++ {
			for j := i; j < m; j++ {
				v := r.NormFloat64()
				a[i*m+j], a[j*m+i] = v, v
			}
		}
		cases, sizes = append(cases, a), append(sizes, m)
	}
	ring := make([]float64, 36)
	for i := 0; i < 6; i++ {
		j := (i + 1) % 6
		ring[i*6+j], ring[j*6+i] = 1, 1
	}
	cases, sizes = append(cases, ring), append(sizes, 6)
	diag := make([]float64, 16)
	for i := 0; i < 4; i++ {
		diag[i*4+i] = float64(3 - i)
	}
	cases, sizes = append(cases, diag), append(sizes, 4)
	for ci, a0 := range cases {
		m := sizes[ci]
		v := append([]float64(nil), a0...)
		d, e := make([]float64, m), make([]float64, m)
		if !symEig(v, m, d, e) {
			t.Fatalf("case %d: no convergence", ci)
		}
		for k := 0; k < m; k++ {
			for i := 0; i < m; i++ {
				av := 0.0
				for j := 0; j < m; j++ {
					av += a0[i*m+j] * v[j*m+k]
				}
				if res := math.Abs(av - d[k]*v[i*m+k]); res > eigTol*float64(m) {
					t.Errorf("case %d (m=%d): |Av−λv| = %g", ci, m, res)
				}
			}
			for l := 0; l < m; l++ {
				dot := 0.0
				for i := 0; i < m; i++ {
					dot += v[i*m+k] * v[i*m+l]
				}
				want := 0.0
				if k == l {
					want = 1
				}
				if math.Abs(dot-want) > eigTol*float64(m) {
					t.Errorf("case %d (m=%d): (VᵀV)_%d%d = %g", ci, m, k, l, dot)
				}
			}
		}
	}
}

func BenchmarkSymEig10(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	const m = 10
	a0 := make([]float64, m*m)
	for i := 0; i < m; i++ {
		for j := i; j < m; j++ {
			v := r.NormFloat64()
			a0[i*m+j], a0[j*m+i] = v, v
		}
	}
	a := make([]float64, m*m)
	d, e := make([]float64, m), make([]float64, m)
	for b.Loop() {
		copy(a, a0)
		symEig(a, m, d, e)
	}
}
