package huckel

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"cyclopair/huckel/internal/grow"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// Numerical conventions of the solver. They are part of the output contract: golden files
// and the fmo package rely on them.
const (
	// DegeneracyTol is the largest difference in x (units of β) between two levels of one
	// π fragment that are treated as one degenerate set. Parameters are given to two
	// decimals, so genuine near-degeneracies from parameters differ by far more than this,
	// while symmetry-degenerate levels agree to ~1e-14.
	DegeneracyTol = 1e-6

	// SignTieTol decides when two coefficients count as equally large for the sign
	// convention (the lower centre index wins the tie).
	SignTieTol = 1e-9

	// OmegaTol is the convergence threshold of the ω-technique: the iteration stops when
	// the self-consistency residual max_i |h_i⁰ + ω·q_i − h_i| (units of β) of the last
	// diagonalisation is below it, where q are the charges computed with the h_i used. The
	// returned Orbitals are those of that diagonalisation, so Orbitals.H and
	// Orbitals.Charges satisfy h_i = h_i⁰ + ω·q_i to within OmegaTol.
	OmegaTol = 1e-7

	// OmegaMaxIter caps the ω-technique cycles (diagonalisations after the first, rejected
	// trial steps included); exceeding it returns ErrNoConvergence.
	OmegaMaxIter = 200

	// omegaMix is the initial linear-mixing weight λ of the ω iteration (see Solver.Solve).
	omegaMix = 0.5
	// omegaMixMin is the smallest λ tried: below it no step along the residual lowers it,
	// which for ω > 0 only happens on a crossing of occupied and empty levels (a kink of
	// the π energy) and the iteration stops with ErrNoConvergence.
	omegaMixMin = 1.0 / (1 << 20)
	// omegaDepth is the number of previous steps Anderson mixing extrapolates over.
	omegaDepth = 6
	// omegaDropTol drops a history column from the Anderson least-squares problem when its
	// residual difference is, to this relative precision, a combination of newer ones.
	omegaDropTol = 1e-8
	// omegaCrossGap is the HOMO–LUMO gap (units of β) below which a failed ω iteration is
	// reported as a crossing of the frontier levels.
	omegaCrossGap = 1e-3
)

// Errors returned by Solve.
var (
	// ErrNoConvergence reports that the ω-technique did not reach OmegaTol within
	// OmegaMaxIter cycles, or that no step along the residual could lower it further.
	ErrNoConvergence = errors.New("ω-technique did not converge")
	// ErrOmega reports an ω that is not a finite number.
	ErrOmega = errors.New("invalid ω")
	// ErrEigen reports a failure of the symmetric eigensolver (LAPACK dsyev returned ok=false).
	ErrEigen = errors.New("eigensolver failed")
	// ErrElectrons reports a fragment with more π electrons than its centres can hold.
	ErrElectrons = errors.New("too many π electrons")
)

// Solve diagonalises every π fragment of ps with gonum's mat.EigenSym and returns the
// levels, occupations and derived quantities (see Orbitals). It allocates a fresh result;
// batch code should reuse a Solver instead.
//
// Conventions:
//   - Levels are sorted by X descending (most bonding first); equal X sort by fragment.
//   - Each fragment is diagonalised separately, so levels of separate π systems never mix,
//     and each fragment is filled (aufbau) with its own electrons.
//   - Levels of one fragment whose X differ by less than DegeneracyTol form a degenerate
//     set; their X is set to the set mean and the basis is made deterministic: the
//     projections of the unit vectors e_0, e_1, … onto the set's subspace are
//     Gram–Schmidt orthonormalised in centre order until the set is spanned.
//   - Sign: every vector is flipped so that its largest-|c| coefficient is positive; ties
//     (within SignTieTol) go to the lowest centre index.
//   - A degenerate set that cannot be filled completely gets equal fractional occupancy
//     and sets Orbitals.Partial, as does an odd electron count (SOMO).
//   - HOMO is the highest level with occupancy > 0 (for a degenerate set, its last member
//     in Levels order), LUMO the lowest with occupancy 0 (the first member of its set);
//     DegenerateSet gives the whole set. SOMO equals HOMO when that level holds fewer
//     than 2 electrons, else −1.
//
// Errors: ErrElectrons (wrapped, naming the fragment), ErrEigen, ErrNoConvergence, ErrOmega,
// and ErrTooManyCentres for a system above ps.MaxCentres (DefaultMaxCentres when 0),
// checked before anything that grows with the system is allocated.
func Solve(ps *PiSystem) (*Orbitals, error) {
	var s Solver
	s.useMat = true
	o := new(Orbitals)
	if err := s.Solve(ps, o); err != nil {
		return nil, err
	}
	return o, nil
}

// Solver diagonalises π systems with lapack64.Syev into buffers that grow but never
// shrink, so repeated solves of similar molecules allocate nothing once warmed up (when the
// Orbitals value is reused too). It gives the same results as Solve. The zero value is ready
// to use. A Solver is not safe for concurrent use: give each worker goroutine its own.
type Solver struct {
	useMat bool // diagonalise through mat.EigenSym (the path of Solve)

	a, w, work []float64
	q          [1]float64 // workspace-query slot (a local array would escape)
	loc        []int      // centre -> index inside its fragment
	h, hNew    []float64  // ω-technique Coulomb parameters
	omega      omegaWork  // ω-technique mixing workspace
	proj, tmp  []float64  // degenerate-set basis construction
	fragE      []int      // electrons per fragment
	levelX     []float64  // per-fragment scratch: eigenvalues in descending order
}

// Solve fills into with the solution of ps, reusing into's slices. On error into is left
// in an unspecified state. See the package-level Solve for the conventions.
//
// # ω-technique
//
// With ps.Omega = ω ≠ 0 the Coulomb parameters are made self-consistent with the π
// charges, h_i = h_i⁰ + ω·q_i (Wheland & Mann, J. Chem. Phys. 1949, 17, 264; Streitwieser,
// Molecular Orbital Theory for Organic Chemists, 1961, ch. 4, who recommends ω = 1.4).
// Write r(h) = h⁰ + ω·q(h) − h for the residual of a trial h. Plain substitution
// (h ← h + r) oscillates for zwitterions and small ions: its Jacobian is −ω·Π, Π the
// atom–atom polarisability matrix, whose largest eigenvalue grows as the HOMO–LUMO gap
// shrinks (nitrile oxides, nitrones, azides and diazoalkanes have ωμ_max > 1).
//
// For ω > 0 there is at most one fixed point, and exactly one unless the solution sits on a
// crossing of occupied and empty levels. By Hellmann–Feynman ∂E_π/∂h_i = P_ii, so r is the
// gradient of Φ(h) = Σ_i (h_i⁰ + ω·Z_i)·h_i − ½‖h‖² − ω·E_π(h), with Z_i = Electrons +
// FormalCharge. E_π = Σ n_j x_j with aufbau occupations is a non-negative combination of
// sums of the k largest eigenvalues of diag(h) + K, each convex in h (Ky Fan), so Φ is
// strictly concave and coercive and has one maximiser; where E_π is differentiable there,
// it is the fixed point. The Jacobian of r, −(I + ω·Π), is negative definite (Π, the
// Hessian of E_π, is positive semidefinite), so a small enough step along r lowers ‖r‖.
//
// The scheme is Anderson mixing (D. G. Anderson, J. ACM 1965, 12, 547; in the form of
// H. F. Walker & P. Ni, SIAM J. Numer. Anal. 2011, 49, 1715, the same extrapolation as
// Pulay's DIIS) on h, equivalently on the input charges q_in = (h − h⁰)/ω, with linear
// mixing weight λ and adaptive damping:
//
//	h_{k+1} = h_k + λ·r_k − (ΔH + λ·ΔR)·γ,   γ = argmin ‖r_k − ΔR·γ‖₂
//
// where the columns of ΔH and ΔR are the differences of the last omegaDepth accepted
// h and r (with no history this is linear mixing, q_in ← (1−λ)·q_in + λ·q_out). The
// least-squares problem is solved by modified Gram–Schmidt QR, dropping near-dependent
// columns. λ starts at 0.5. A step whose ‖r‖₂ exceeds that of the current point is
// rejected: λ is halved and the history cleared. The iteration stops when max_i |r_i| <
// OmegaTol for the diagonalisation just made (whose orbitals are returned, with
// Orbitals.H the h used and Orbitals.Iterations the cycles spent), or fails with
// ErrNoConvergence after OmegaMaxIter cycles or when λ falls below omegaMixMin (no step
// lowers ‖r‖: the charges jump between two occupations across a crossing of occupied and
// empty levels, so no closed-shell self-consistent solution exists). For a neutral
// alternant hydrocarbon every q_i is 0 (Coulson–Rushbrooke), r(h⁰) = 0 and no cycle runs.
//
// The ω path allocates only while its workspace grows; with ω = 0 nothing of it runs.
func (s *Solver) Solve(ps *PiSystem, into *Orbitals) error {
	if err := ps.CheckSize(); err != nil {
		return err
	}
	n := len(ps.Centres)
	s.h = grow.Slice(s.h, n)
	for i := range ps.Centres {
		s.h[i] = ps.Centres[i].H
	}
	if err := s.checkElectrons(ps); err != nil {
		return err
	}
	if ps.Omega != 0 && (math.IsNaN(ps.Omega) || math.IsInf(ps.Omega, 0)) {
		return fmt.Errorf("huckel: %w: ω = %g is not a finite number", ErrOmega, ps.Omega)
	}
	if err := s.solveOnce(ps, s.h, into); err != nil {
		return err
	}
	into.Iterations = 0
	if ps.Omega != 0 && n > 0 {
		if err := s.omegaIterate(ps, into); err != nil {
			return err
		}
	}
	into.H = grow.Slice(into.H, n)
	copy(into.H, s.h)
	return nil
}

// omegaWork is the workspace of the ω-technique mixing, reused across solves.
type omegaWork struct {
	r, rNew []float64 // residuals at the current point and at the trial point
	dh, dr  []float64 // history: omegaDepth columns of length n (ΔH, ΔR), oldest first
	qr      []float64 // Gram–Schmidt copy of the ΔR columns
	cols    int       // history columns in use
	rt      [omegaDepth * omegaDepth]float64
	gamma   [omegaDepth]float64
	kept    [omegaDepth]bool
}

// omegaResidual sets r = h⁰ + ω·q − h from the charges in into and returns max|r| and ‖r‖₂.
func omegaResidual(ps *PiSystem, h []float64, into *Orbitals, r []float64) (maxAbs, norm2 float64) {
	for i := range ps.Centres {
		d := ps.Centres[i].H + ps.Omega*into.Charges[i] - h[i]
		r[i] = d
		maxAbs = max(maxAbs, math.Abs(d))
		norm2 += d * d
	}
	return maxAbs, math.Sqrt(norm2)
}

// omegaIterate runs the ω-technique from the solution of h⁰ already in into (see Solve).
// On success s.h and into hold the self-consistent solution.
func (s *Solver) omegaIterate(ps *PiSystem, into *Orbitals) error {
	n := len(ps.Centres)
	w := &s.omega
	w.r, w.rNew = grow.Slice(w.r, n), grow.Slice(w.rNew, n)
	w.dh, w.dr, w.qr = grow.Slice(w.dh, omegaDepth*n), grow.Slice(w.dr, omegaDepth*n), grow.Slice(w.qr, omegaDepth*n)
	w.cols = 0
	s.hNew = grow.Slice(s.hNew, n)
	rMax, rNorm := omegaResidual(ps, s.h, into, w.r)
	if rMax < OmegaTol {
		return nil
	}
	lambda := omegaMix
	for it := 1; it <= OmegaMaxIter; it++ {
		into.Iterations = it
		s.andersonStep(n, lambda)
		if err := s.solveOnce(ps, s.hNew, into); err != nil {
			return err
		}
		newMax, newNorm := omegaResidual(ps, s.hNew, into, w.rNew)
		if newMax < OmegaTol {
			s.h, s.hNew = s.hNew, s.h
			return nil
		}
		if !(newNorm <= rNorm) { // also rejects NaN
			lambda /= 2
			w.cols = 0
			if lambda < omegaMixMin {
				return s.omegaFailure(ps, into, it, rMax, "no step along the residual lowers it")
			}
			continue
		}
		// Accept: push (Δh, Δr) into the history, oldest column dropped when full.
		if w.cols == omegaDepth {
			copy(w.dh, w.dh[n:omegaDepth*n])
			copy(w.dr, w.dr[n:omegaDepth*n])
			w.cols--
		}
		dh, dr := w.dh[w.cols*n:(w.cols+1)*n], w.dr[w.cols*n:(w.cols+1)*n]
		for i := 0; i < n; i++ {
			dh[i] = s.hNew[i] - s.h[i]
			dr[i] = w.rNew[i] - w.r[i]
		}
		w.cols++
		s.h, s.hNew = s.hNew, s.h
		w.r, w.rNew = w.rNew, w.r
		rMax, rNorm = newMax, newNorm
	}
	return s.omegaFailure(ps, into, OmegaMaxIter, rMax, "cycle cap reached")
}

// andersonStep writes the next trial point into s.hNew from s.h, the residual s.omega.r
// and the history (see Solve).
func (s *Solver) andersonStep(n int, lambda float64) {
	w := &s.omega
	m := w.cols
	// Modified Gram–Schmidt QR of the ΔR columns; a column whose remainder is below
	// omegaDropTol of its length is dropped (γ = 0 for it).
	copy(w.qr[:m*n], w.dr[:m*n])
	for a := 0; a < m; a++ {
		qa := w.qr[a*n : (a+1)*n]
		w.kept[a], w.gamma[a] = false, 0
		n0 := norm(qa)
		if n0 == 0 {
			continue
		}
		for b := 0; b < a; b++ {
			if !w.kept[b] {
				continue
			}
			qb := w.qr[b*n : (b+1)*n]
			d := dot(qb, qa)
			w.rt[b*omegaDepth+a] = d
			for i := range qa {
				qa[i] -= d * qb[i]
			}
		}
		na := norm(qa)
		if na <= omegaDropTol*n0 {
			continue
		}
		for i := range qa {
			qa[i] /= na
		}
		w.rt[a*omegaDepth+a] = na
		w.kept[a] = true
	}
	// γ = R⁻¹·Qᵀ·r over the kept columns.
	for a := m - 1; a >= 0; a-- {
		if !w.kept[a] {
			continue
		}
		g := dot(w.qr[a*n:(a+1)*n], w.r)
		for b := a + 1; b < m; b++ {
			if w.kept[b] {
				g -= w.rt[a*omegaDepth+b] * w.gamma[b]
			}
		}
		w.gamma[a] = g / w.rt[a*omegaDepth+a]
	}
	for i := 0; i < n; i++ {
		v := s.h[i] + lambda*w.r[i]
		for a := 0; a < m; a++ {
			if w.kept[a] {
				v -= (w.dh[a*n+i] + lambda*w.dr[a*n+i]) * w.gamma[a]
			}
		}
		s.hNew[i] = v
	}
}

// omegaFailure builds the ErrNoConvergence error: cycles spent, ω, the smallest residual
// reached, and whether the frontier levels at that point cross (a partly filled degenerate
// set of an even-electron system, or a HOMO–LUMO gap below omegaCrossGap).
func (s *Solver) omegaFailure(ps *PiSystem, into *Orbitals, cycles int, rMax float64, why string) error {
	cross := ""
	if err := s.solveOnce(ps, s.h, into); err == nil { // the best point, not the last trial
		gap, ok := into.Gap()
		if into.Partial && into.Electrons%2 == 0 {
			gap, ok = 0, true
		}
		if ok && math.Abs(gap) < omegaCrossGap {
			cross = fmt.Sprintf("; the HOMO and LUMO cross there (gap %.2g |β|), so the charges switch between two occupations and no closed-shell self-consistent solution exists", gap)
		}
	}
	return fmt.Errorf("huckel: %w after %d cycles (ω = %g): %s; residual max|h⁰ + ω·q − h| = %.2g β, tolerance %g β%s",
		ErrNoConvergence, cycles, ps.Omega, why, rMax, OmegaTol, cross)
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

func norm(a []float64) float64 { return math.Sqrt(dot(a, a)) }

func (s *Solver) checkElectrons(ps *PiSystem) error {
	nf := len(ps.Fragments)
	s.fragE = grow.Slice(s.fragE, nf)
	clear(s.fragE)
	for i := range ps.Centres {
		c := &ps.Centres[i]
		if c.Electrons < 0 || c.Electrons > 2 {
			return fmt.Errorf("huckel: centre %d (atom %d): %w: %d electrons on one centre",
				i, c.Atom, ErrElectrons, c.Electrons)
		}
		if c.Fragment < 0 || c.Fragment >= nf {
			panic(fmt.Sprintf("huckel: centre %d has fragment %d of %d", i, c.Fragment, nf))
		}
		s.fragE[c.Fragment] += c.Electrons
	}
	return nil
}

// solveOnce diagonalises every fragment with Coulomb parameters h and fills into.
func (s *Solver) solveOnce(ps *PiSystem, h []float64, into *Orbitals) error {
	n := len(ps.Centres)
	into.Pi = ps
	into.Method, into.EVDirect, into.AlphaEV, into.BetaEV = MethodHuckel, false, 0, 0
	into.coef = grow.Slice(into.coef, n*n)
	clear(into.coef)
	if cap(into.Levels) < n {
		into.Levels = make([]Level, n)
	}
	into.Levels = into.Levels[:n]
	into.Warnings = into.Warnings[:0]
	into.Partial = false
	s.loc = grow.Slice(s.loc, n)
	for _, frag := range ps.Fragments {
		for li, c := range frag {
			s.loc[c] = li
		}
	}
	lv := 0
	electrons := 0
	for f, frag := range ps.Fragments {
		m := len(frag)
		if m == 0 {
			continue
		}
		if s.fragE[f] > 2*m {
			return fmt.Errorf("huckel: π fragment %d: %w: %d electrons on %d centres",
				f, ErrElectrons, s.fragE[f], m)
		}
		electrons += s.fragE[f]
		s.a = grow.Slice(s.a, m*m)
		s.w = grow.Slice(s.w, m)
		fragmentMatrix(s.a, ps, f, frag, s.loc, h)
		if err := s.eigen(m); err != nil {
			return err
		}
		// s.w ascending, column c of s.a (row-major m×m) is vector c.
		s.levelX = grow.Slice(s.levelX, m)
		for j := 0; j < m; j++ {
			s.levelX[j] = s.w[m-1-j]
		}
		// Degenerate sets, fixed basis and signs, written into the level slots.
		for j := 0; j < m; {
			e, mean := degenerateRun(s.levelX[:m], j)
			d := e - j
			if d > 1 {
				s.fixDegenerate(m, m-e, d)
			}
			for k := j; k < e; k++ {
				col := m - 1 - k
				coeffs := into.coef[(lv+k)*n : (lv+k+1)*n]
				for li, c := range frag {
					coeffs[c] = s.a[li*m+col]
				}
				fixSign(coeffs, frag)
				into.Levels[lv+k] = Level{X: mean, Coeffs: coeffs, Fragment: f, Degenerate: d}
			}
			j = e
		}
		// Aufbau within the fragment.
		left := s.fragE[f]
		for j := 0; j < m; {
			d := into.Levels[lv+j].Degenerate
			occ := 0.0
			if left >= 2*d {
				occ = 2
				left -= 2 * d
			} else if left > 0 {
				occ = float64(left) / float64(d)
				if d > 1 {
					into.Warnings = append(into.Warnings, fmt.Sprintf(
						"π fragment %d: degenerate set of %d levels at x = %.4f holds %d electrons: equal fractional occupancy %.3g each (open shell)",
						f, d, into.Levels[lv+j].X, left, occ))
				}
				left = 0
				into.Partial = true
			}
			for k := j; k < j+d; k++ {
				into.Levels[lv+k].Occupancy = occ
			}
			j += d
		}
		lv += m
	}
	into.Levels = into.Levels[:lv]
	slices.SortStableFunc(into.Levels, func(a, b Level) int {
		switch {
		case a.X > b.X:
			return -1
		case a.X < b.X:
			return 1
		}
		return a.Fragment - b.Fragment
	})
	into.Electrons = electrons
	into.HOMO, into.LUMO, into.SOMO = -1, -1, -1
	into.PiEnergy = 0
	for i := range into.Levels {
		l := &into.Levels[i]
		into.PiEnergy += l.Occupancy * l.X
		if l.Occupancy > 0 {
			into.HOMO = i
		}
	}
	// LUMO: the empty level of lowest energy (largest X) over all fragments.
	for i := range into.Levels {
		if into.Levels[i].Occupancy == 0 {
			into.LUMO = i
			break
		}
	}
	if into.HOMO >= 0 && into.Levels[into.HOMO].Occupancy < 2 {
		into.SOMO = into.HOMO
	}
	// Charges and bond orders.
	into.Charges = grow.Slice(into.Charges, n)
	for i := range ps.Centres {
		into.Charges[i] = float64(ps.Centres[i].Electrons + ps.Centres[i].FormalCharge)
	}
	into.BondOrders = grow.Slice(into.BondOrders, n*n)
	clear(into.BondOrders)
	for i := range into.Levels {
		l := &into.Levels[i]
		if l.Occupancy == 0 {
			continue
		}
		frag := ps.Fragments[l.Fragment]
		for _, a := range frag {
			ca := l.Occupancy * l.Coeffs[a]
			if ca == 0 {
				continue
			}
			row := into.BondOrders[a*n : (a+1)*n]
			for _, b := range frag {
				row[b] += ca * l.Coeffs[b]
			}
		}
	}
	for i := range ps.Centres {
		into.Charges[i] -= into.BondOrders[i*n+i]
	}
	return nil
}

// eigen diagonalises the m×m upper triangle in s.a in place: eigenvalues ascending in s.w,
// eigenvectors in the columns of s.a.
func (s *Solver) eigen(m int) error {
	if s.useMat {
		sym := mat.NewSymDense(m, append([]float64(nil), s.a[:m*m]...))
		var es mat.EigenSym
		if !es.Factorize(sym, true) {
			return fmt.Errorf("huckel: %w on a %d×%d matrix", ErrEigen, m, m)
		}
		es.Values(s.w[:m])
		var v mat.Dense
		es.VectorsTo(&v)
		raw := v.RawMatrix()
		for r := 0; r < m; r++ {
			copy(s.a[r*m:(r+1)*m], raw.Data[r*raw.Stride:r*raw.Stride+m])
		}
		return nil
	}
	switch m {
	case 1: // a single centre: x = h
		s.w[0], s.a[0] = s.a[0], 1
		return nil
	case 2: // closed form of [[p, r], [r, q]] (r = k > 0 for a two-centre fragment)
		p, r, q := s.a[0], s.a[1], s.a[3]
		mid, half := (p+q)/2, math.Hypot((p-q)/2, r)
		lo, hi := mid-half, mid+half
		s.w[0], s.w[1] = lo, hi
		// (r, λ−p) and (λ−q, r) are both eigenvectors for λ; take the longer one, which
		// avoids cancellation when |p − q| ≫ r.
		for c, l := range [2]float64{lo, hi} {
			v0, v1 := r, l-p
			if u0, u1 := l-q, r; math.Hypot(u0, u1) > math.Hypot(v0, v1) {
				v0, v1 = u0, u1
			}
			if math.Abs(v0)+math.Abs(v1) < 1e-300 { // r = 0 cannot happen in a fragment
				v0, v1 = float64(1-c), float64(c)
			}
			nv := math.Hypot(v0, v1)
			s.a[0*2+c], s.a[1*2+c] = v0/nv, v1/nv
		}
		return nil
	}
	a := blas64.Symmetric{N: m, Stride: m, Uplo: blas.Upper, Data: s.a[:m*m]}
	lapack64.Syev(lapack.EVCompute, a, s.w[:m], s.q[:], -1)
	s.work = grow.Slice(s.work, int(s.q[0]))
	if !lapack64.Syev(lapack.EVCompute, a, s.w[:m], s.work, len(s.work)) {
		return fmt.Errorf("huckel: %w on a %d×%d matrix", ErrEigen, m, m)
	}
	return nil
}

// fragmentMatrix fills a (m×m for the m centres of frag, row-major) with the Hückel matrix
// of fragment f: the Coulomb term of each centre on the diagonal (h[c], or the centre's H
// when h is nil) and each bond's k added above it (loc: centre -> index in its fragment).
// Solve and EnergySolver both build their matrices here, so one system gives them one
// matrix, bit for bit.
func fragmentMatrix(a []float64, ps *PiSystem, f int, frag, loc []int, h []float64) {
	m := len(frag)
	clear(a[:m*m])
	for li, c := range frag {
		if h != nil {
			a[li*m+li] = h[c]
		} else {
			a[li*m+li] = ps.Centres[c].H
		}
	}
	for _, b := range ps.Bonds {
		if ps.Centres[b.I].Fragment != f {
			continue
		}
		i, j := loc[b.I], loc[b.J]
		if i > j {
			i, j = j, i
		}
		a[i*m+j] += b.K
	}
}

// fixDegenerate replaces columns c0..c0+d-1 of the m×m eigenvector matrix s.a with the
// deterministic basis of their span: Gram–Schmidt of P·e_0, P·e_1, … (P the projector).
func (s *Solver) fixDegenerate(m, c0, d int) {
	s.proj = grow.Slice(s.proj, m*m)
	for r := 0; r < m; r++ {
		for c := 0; c < m; c++ {
			v := 0.0
			for k := c0; k < c0+d; k++ {
				v += s.a[r*m+k] * s.a[c*m+k]
			}
			s.proj[r*m+c] = v
		}
	}
	s.tmp = grow.Slice(s.tmp, m*d)
	got := 0
	for e := 0; e < m && got < d; e++ {
		u := s.tmp[got*m : (got+1)*m]
		for r := 0; r < m; r++ {
			u[r] = s.proj[r*m+e]
		}
		for pass := 0; pass < 2; pass++ { // re-orthogonalise once for stability
			for g := 0; g < got; g++ {
				prev := s.tmp[g*m : (g+1)*m]
				dot := 0.0
				for r := 0; r < m; r++ {
					dot += prev[r] * u[r]
				}
				for r := 0; r < m; r++ {
					u[r] -= dot * prev[r]
				}
			}
		}
		nrm := 0.0
		for r := 0; r < m; r++ {
			nrm += u[r] * u[r]
		}
		nrm = math.Sqrt(nrm)
		if nrm < 1e-6 {
			continue
		}
		for r := 0; r < m; r++ {
			u[r] /= nrm
		}
		got++
	}
	if got < d {
		// Cannot happen for an orthonormal input (the e_k span everything); keep LAPACK's basis.
		return
	}
	// Store descending-level order: column c0+d-1 is the first level of the set.
	for g := 0; g < d; g++ {
		col := c0 + d - 1 - g
		u := s.tmp[g*m : (g+1)*m]
		for r := 0; r < m; r++ {
			s.a[r*m+col] = u[r]
		}
	}
}

// fixSign makes the largest-|c| coefficient (over the fragment's centres) positive; ties
// within SignTieTol go to the lowest centre index.
func fixSign(c []float64, frag []int) {
	best, bestAbs := -1, -1.0
	for _, i := range frag { // frag is in ascending centre order
		a := math.Abs(c[i])
		if a > bestAbs+SignTieTol {
			best, bestAbs = i, a
		}
	}
	if best >= 0 && c[best] < 0 {
		for _, i := range frag {
			c[i] = -c[i]
		}
	}
}

// Coefficient returns the coefficient of the given level on the atom with index atom (in
// the input molecule's numbering); 0 if the atom is not a π centre. It panics if level is
// out of range.
func (o *Orbitals) Coefficient(level, atom int) float64 {
	if atom < 0 || atom >= len(o.Pi.AtomCentre) {
		return 0
	}
	c := o.Pi.AtomCentre[atom]
	if c < 0 {
		return 0
	}
	return o.Levels[level].Coeffs[c]
}

// DegenerateSet returns the indices (into Levels) of the degenerate set that contains
// level, in ascending order; a non-degenerate level gives a one-element slice.
func (o *Orbitals) DegenerateSet(level int) []int {
	l := o.Levels[level]
	var out []int
	for i := range o.Levels {
		if o.Levels[i].Fragment == l.Fragment && o.Levels[i].X == l.X {
			out = append(out, i)
		}
	}
	return out
}

// BondOrder returns the Coulson π bond order p_ij = Σ n_k c_ik c_jk between centres i and j
// (p_ii is the π population of centre i).
func (o *Orbitals) BondOrder(i, j int) float64 {
	n := len(o.Pi.Centres)
	return o.BondOrders[i*n+j]
}

// Gap returns X(HOMO) − X(LUMO) in units of |β| (positive), and false when either level is
// missing.
func (o *Orbitals) Gap() (float64, bool) {
	if o.HOMO < 0 || o.LUMO < 0 {
		return 0, false
	}
	return o.Levels[o.HOMO].X - o.Levels[o.LUMO].X, true
}

// degenerateRun returns the end e (exclusive) of the degenerate set of the descending levels
// x that starts at j — neighbours closer than DegeneracyTol — and the mean of x over it. Solve
// and EnergySolver share it, so their level energies agree bit for bit.
func degenerateRun(x []float64, j int) (e int, mean float64) {
	e = j + 1
	for e < len(x) && x[e-1]-x[e] < DegeneracyTol {
		e++
	}
	for k := j; k < e; k++ {
		mean += x[k]
	}
	return e, mean / float64(e-j)
}
