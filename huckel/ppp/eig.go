package ppp

import "math"

// eigQLMaxIter caps the implicit QL iterations per eigenvalue in symEig.
const eigQLMaxIter = 60

// symEig diagonalises the symmetric m×m matrix a (row-major, both triangles) in place,
// without allocating: on return the columns of a are orthonormal eigenvectors and d holds
// the eigenvalues, in the order the QL sweep leaves them (callers sort). e is scratch of
// length m. It reports false when an eigenvalue needs more than eigQLMaxIter QL steps.
//
// Householder reduction to tridiagonal form with accumulated transformations (tred2,
// R. S. Martin, C. Reinsch, J. H. Wilkinson, Numer. Math. 1968, 11, 181) followed by the
// implicit QL method with shifts (tql2, H. Bowdler, R. S. Martin, C. Reinsch,
// J. H. Wilkinson, Numer. Math. 1968, 11, 293), as in the EISPACK routines of the same
// names; for the small blocks of a π system it needs about a third of
// the work of cyclic Jacobi from the unit matrix.
func symEig(a []float64, m int, d, e []float64) bool {
	if m == 1 {
		d[0], a[0] = a[0], 1
		return true
	}
	tred2(a, m, d, e)
	return tql2(a, m, d, e)
}

func tred2(v []float64, n int, d, e []float64) {
	last := v[(n-1)*n : n*n]
	copy(d[:n], last)
	for i := n - 1; i > 0; i-- {
		scale, h := 0.0, 0.0
		for k := 0; k < i; k++ {
			scale += math.Abs(d[k])
		}
		if scale == 0 {
			e[i] = d[i-1]
			for j := 0; j < i; j++ {
				d[j] = v[(i-1)*n+j]
				v[i*n+j] = 0
				v[j*n+i] = 0
			}
		} else {
			for k := 0; k < i; k++ {
				d[k] /= scale
				h += d[k] * d[k]
			}
			f := d[i-1]
			g := math.Sqrt(h)
			if f > 0 {
				g = -g
			}
			e[i] = scale * g
			h -= f * g
			d[i-1] = f - g
			for j := 0; j < i; j++ {
				e[j] = 0
			}
			for j := 0; j < i; j++ {
				f = d[j]
				v[j*n+i] = f
				g = e[j] + v[j*n+j]*f
				for k := j + 1; k <= i-1; k++ {
					vkj := v[k*n+j]
					g += vkj * d[k]
					e[k] += vkj * f
				}
				e[j] = g
			}
			f = 0
			for j := 0; j < i; j++ {
				e[j] /= h
				f += e[j] * d[j]
			}
			hh := f / (h + h)
			for j := 0; j < i; j++ {
				e[j] -= hh * d[j]
			}
			for j := 0; j < i; j++ {
				f, g = d[j], e[j]
				for k := j; k <= i-1; k++ {
					v[k*n+j] -= f*e[k] + g*d[k]
				}
				d[j] = v[(i-1)*n+j]
				v[i*n+j] = 0
			}
		}
		d[i] = h
	}
	// Accumulate the transformations.
	for i := 0; i < n-1; i++ {
		v[(n-1)*n+i] = v[i*n+i]
		v[i*n+i] = 1
		h := d[i+1]
		if h != 0 {
			for k := 0; k <= i; k++ {
				d[k] = v[k*n+i+1] / h
			}
			for j := 0; j <= i; j++ {
				g := 0.0
				for k := 0; k <= i; k++ {
					g += v[k*n+i+1] * v[k*n+j]
				}
				for k := 0; k <= i; k++ {
					v[k*n+j] -= g * d[k]
				}
			}
		}
		for k := 0; k <= i; k++ {
			v[k*n+i+1] = 0
		}
	}
	for j := 0; j < n; j++ {
		d[j] = v[(n-1)*n+j]
		v[(n-1)*n+j] = 0
	}
	v[(n-1)*n+n-1] = 1
	e[0] = 0
}

func tql2(v []float64, n int, d, e []float64) bool {
	for i := 1; i < n; i++ {
		e[i-1] = e[i]
	}
	e[n-1] = 0
	f, tst1 := 0.0, 0.0
	const eps = 0x1p-52
	for l := 0; l < n; l++ {
		tst1 = max(tst1, math.Abs(d[l])+math.Abs(e[l]))
		m := l
		for m < n-1 && math.Abs(e[m]) > eps*tst1 {
			m++
		}
		if m > l {
			for iter := 0; ; iter++ {
				if iter == eigQLMaxIter {
					return false
				}
				g := d[l]
				p := (d[l+1] - g) / (2 * e[l])
				// |e[l]| > eps·tst1 bounds |p| by about 1/eps, so p² cannot overflow and
				// the plain square roots replace EISPACK's pythag.
				r := math.Sqrt(p*p + 1)
				if p < 0 {
					r = -r
				}
				d[l] = e[l] / (p + r)
				d[l+1] = e[l] * (p + r)
				dl1 := d[l+1]
				h := g - d[l]
				for i := l + 2; i < n; i++ {
					d[i] -= h
				}
				f += h
				p = d[m]
				c, c2, c3 := 1.0, 1.0, 1.0
				el1 := e[l+1]
				s, s2 := 0.0, 0.0
				for i := m - 1; i >= l; i-- {
					c3, c2, s2 = c2, c, s
					g = c * e[i]
					h = c * p
					r = math.Sqrt(p*p + e[i]*e[i])
					e[i+1] = s * r
					s = e[i] / r
					c = p / r
					p = c*d[i] - s*g
					d[i+1] = h + s*(c*g+s*d[i])
					for k := 0; k < n; k++ {
						row := v[k*n : k*n+n]
						h = row[i+1]
						row[i+1] = s*row[i] + c*h
						row[i] = c*row[i] - s*h
					}
				}
				p = -s * s2 * c3 * el1 * e[l] / dl1
				e[l] = s * p
				d[l] = c * p
				if !(math.Abs(e[l]) > eps*tst1) {
					break
				}
			}
		}
		d[l] += f
		e[l] = 0
	}
	return true
}
