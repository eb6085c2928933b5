package huckel

import (
	"fmt"
	"math"

	"cyclopair/huckel/internal/eigmemo"
	"cyclopair/huckel/internal/grow"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/lapack"
	lapackgonum "gonum.org/v1/gonum/lapack/gonum"
)

// EnergySolver computes the total π energy of a PiSystem without eigenvectors, charges or
// bond orders: what localisation energies need (a π energy before and after removing
// centres). Its result equals Solve(ps).PiEnergy bit for bit, so callers can switch to it
// without moving any printed digit or ranking tie:
//   - each fragment's matrix is built as Solve builds it and reduced by the same LAPACK
//     steps as the dsyev Solve calls (same scaling test, the same Householder
//     tridiagonalisation with the same blocking), then the tridiagonal QL/QR iteration runs
//     without accumulating rotations; the eigenvalue recurrences of that iteration do not
//     depend on whether rotations are kept, so the eigenvalues are the same numbers;
//   - degenerate sets (DegeneracyTol), their mean x, the aufbau filling (equal fractional
//     occupancy of a partly filled set), the order of levels (x descending, fragment
//     ascending) and the summation Σ n_j·x_j follow Solve step by step.
//
// With ps.Omega ≠ 0 (the ω-technique needs charges) and on any input Solve rejects, it
// calls Solve, so results and errors are those of Solve in every case.
// TestEnergySolverMatchesSolve checks the equality on random and preset systems.
//
// The zero value is ready to use; buffers grow and are reused, so repeated calls allocate
// nothing once warm. An EnergySolver is not safe for concurrent use.
type EnergySolver struct {
	// Memo makes the solver remember the eigenvalues of its recent fragments by their exact
	// matrix and reuse them, which are then the numbers a new solve would give, bit for bit
	// (huckel/internal/eigmemo, up to 2 MiB per solver): worth it where fragments recur (a
	// partner's localisation residues share every fragment the unit does not touch, and a
	// screen's partners share substituent groups), not for unrelated molecules.
	Memo bool

	a, d, e, tau, work, x []float64
	loc, fragE            []int
	occ                   []energyLevel
	key                   []float64    // the matrix being solved, kept for memo
	memo                  eigmemo.Memo // fragment eigenvalues by matrix (exact, see eigmemo)
}

// energyLevel is one occupied level as Solve's sorted level list would hold it.
type energyLevel struct {
	x, occ float64
	frag   int
}

// PiEnergy returns Solve(ps).PiEnergy (units of β), or Solve's error.
func (s *EnergySolver) PiEnergy(ps *PiSystem) (float64, error) {
	if ps.Omega != 0 {
		return solveEnergy(ps)
	}
	if err := ps.CheckSize(); err != nil {
		return 0, err
	}
	n := len(ps.Centres)
	nf := len(ps.Fragments)
	s.fragE = grow.Slice(s.fragE, nf)
	clear(s.fragE)
	for i := range ps.Centres {
		c := &ps.Centres[i]
		if c.Electrons < 0 || c.Electrons > 2 || c.Fragment < 0 || c.Fragment >= nf {
			return solveEnergy(ps) // Solve's error (or panic) for a malformed system
		}
		s.fragE[c.Fragment] += c.Electrons
	}
	s.loc = grow.Slice(s.loc, n)
	for _, frag := range ps.Fragments {
		for li, c := range frag {
			s.loc[c] = li
		}
	}
	s.occ = s.occ[:0]
	for f, frag := range ps.Fragments {
		m := len(frag)
		if m == 0 {
			continue
		}
		if s.fragE[f] > 2*m {
			return solveEnergy(ps)
		}
		s.a = grow.Slice(s.a, m*m)
		fragmentMatrix(s.a, ps, f, frag, s.loc, nil)
		if !s.values(m) {
			return solveEnergy(ps)
		}
		// s.d ascending; levels in descending x as Solve lists them.
		s.x = grow.Slice(s.x, m)
		for j := 0; j < m; j++ {
			s.x[j] = s.d[m-1-j]
		}
		left := s.fragE[f]
		for j := 0; j < m && left > 0; {
			e, mean := degenerateRun(s.x[:m], j)
			d := e - j
			occ := 0.0
			if left >= 2*d {
				occ = 2
				left -= 2 * d
			} else {
				occ = float64(left) / float64(d)
				left = 0
			}
			for k := j; k < e; k++ {
				s.occ = append(s.occ, energyLevel{x: mean, occ: occ, frag: f})
			}
			j = e
		}
	}
	// Solve's level order (x descending, equal x by fragment, stable) for the summation.
	// Empty levels add ±0 to a sum that starts at +0 and so never change it.
	for i := 1; i < len(s.occ); i++ {
		for j := i; j > 0 && energyBefore(s.occ[j], s.occ[j-1]); j-- {
			s.occ[j], s.occ[j-1] = s.occ[j-1], s.occ[j]
		}
	}
	energy := 0.0
	for i := range s.occ {
		l := &s.occ[i]
		energy += l.occ * l.x
	}
	return energy, nil
}

// energyBefore is the strict order of Solve's level sort.
func energyBefore(a, b energyLevel) bool {
	if a.x != b.x {
		return a.x > b.x
	}
	return a.frag < b.frag
}

func solveEnergy(ps *PiSystem) (float64, error) {
	o, err := Solve(ps)
	if err != nil {
		return 0, err
	}
	return o.PiEnergy, nil
}

// eigenvalues puts the eigenvalues of the symmetric m×m matrix whose upper triangle is in
// s.a (row-major) into s.d in ascending order: the dsyev of gonum (the routine Solve reaches
// through mat.EigenSym) with its eigenvector steps (dorgtr, rotations in dsteqr) left out.
// values leaves in s.d the eigenvalues of the m×m matrix in s.a, ascending, as eigenvalues
// computes them, looking them up in s.memo first (the same numbers, bit for bit).
func (s *EnergySolver) values(m int) bool {
	if !s.Memo || m < eigmemo.MinOrder {
		return s.eigenvalues(m)
	}
	h := eigmemo.Hash(s.a[:m*m])
	if d, ok := s.memo.Get(h, s.a[:m*m]); ok {
		s.d = grow.Slice(s.d, m)
		copy(s.d, d)
		return true
	}
	s.key = append(s.key[:0], s.a[:m*m]...)
	if !s.eigenvalues(m) {
		return false
	}
	s.memo.Put(h, s.key, s.d[:m])
	return true
}

func (s *EnergySolver) eigenvalues(m int) bool {
	var impl lapackgonum.Implementation
	s.d = grow.Slice(s.d, m)
	if m == 1 {
		s.d[0] = s.a[0]
		return true
	}
	// dsyev's scaling thresholds from LAPACK's machine constants (dlamch 'S' and 'P').
	const dlamchS, dlamchP = 0x1p-1022, 2 * 0x1p-53
	smlnum := dlamchS / dlamchP
	bignum := 1 / smlnum
	rmin, rmax := math.Sqrt(smlnum), math.Sqrt(bignum)
	anrm := impl.Dlansy(lapack.MaxAbs, blas.Upper, m, s.a, m, nil)
	scaled := false
	var sigma float64
	if anrm > 0 && anrm < rmin {
		scaled, sigma = true, rmin/anrm
	} else if anrm > rmax {
		scaled, sigma = true, rmax/anrm
	}
	if scaled {
		impl.Dlascl(lapack.UpperTri, 0, 0, 1, sigma, m, m, s.a, m)
	}
	nb := impl.Ilaenv(1, "DSYTRD", "U", m, -1, -1, -1)
	s.e = grow.Slice(s.e, m)
	s.tau = grow.Slice(s.tau, m)
	s.work = grow.Slice(s.work, max(1, nb*m))
	impl.Dsytrd(blas.Upper, m, s.a, m, s.d, s.e, s.tau, s.work, len(s.work))
	if !impl.Dsteqr(lapack.EVCompNone, m, s.d, s.e, nil, 1, nil) {
		return false
	}
	if scaled {
		for i := range s.d[:m] {
			s.d[i] *= 1 / sigma
		}
	}
	return true
}

// WithoutInto is Without writing into dst, whose slices are reused, so a loop over many
// residues of one system allocates nothing once dst has grown (the localisation energies of
// every reacting unit of a partner). dst gets the same centres, bonds, AtomCentre, fragments,
// Omega and MaxCentres as Without would give; it shares ps's Mol, Params and Warnings
// (read-only). dst must not be ps. It panics on an out-of-range index.
func (ps *PiSystem) WithoutInto(dst *PiSystem, centres ...int) {
	if dst == ps {
		panic("huckel: WithoutInto with dst == ps")
	}
	n := len(ps.Centres)
	nb := len(ps.Bonds)
	dst.scratch = grow.Slice(dst.scratch, n+2*n+1+2*nb)
	newIdx, fragBuf := dst.scratch[:n], dst.scratch[n:]
	for i := range newIdx {
		newIdx[i] = 0
	}
	for _, c := range centres {
		if c < 0 || c >= n {
			panic(fmt.Sprintf("huckel: Without(%d) on %d centres", c, n))
		}
		newIdx[c] = -1
	}
	dst.Mol, dst.Params, dst.Omega, dst.MaxCentres, dst.Warnings = ps.Mol, ps.Params, ps.Omega, ps.MaxCentres, ps.Warnings
	dst.Centres = dst.Centres[:0]
	for i, c := range ps.Centres {
		if newIdx[i] < 0 {
			continue
		}
		newIdx[i] = len(dst.Centres)
		dst.Centres = append(dst.Centres, c)
	}
	dst.Bonds = dst.Bonds[:0]
	for _, b := range ps.Bonds {
		i, j := newIdx[b.I], newIdx[b.J]
		if i < 0 || j < 0 {
			continue
		}
		dst.Bonds = append(dst.Bonds, PiBond{I: i, J: j, K: b.K, Bond: b.Bond})
	}
	if cap(dst.AtomCentre) < len(ps.AtomCentre) {
		dst.AtomCentre = make([]int, len(ps.AtomCentre))
	}
	dst.AtomCentre = dst.AtomCentre[:len(ps.AtomCentre)]
	for a, c := range ps.AtomCentre {
		if c < 0 {
			dst.AtomCentre[a] = -1
		} else {
			dst.AtomCentre[a] = newIdx[c]
		}
	}
	m := len(dst.Centres)
	fragBuf = fragBuf[:2*m+1+2*len(dst.Bonds)]
	clear(fragBuf)
	dst.recomputeFragmentsIn(fragBuf)
}
