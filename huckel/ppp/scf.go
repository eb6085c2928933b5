package ppp

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"cyclopair/huckel"
	"cyclopair/huckel/depict"
	"cyclopair/huckel/internal/grow"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// Convergence of the SCF. The iteration stops when, between two successive densities,
// max_ij |ΔP_ij| < DensityTol and |ΔE| < EnergyTol; the orbitals returned are the
// eigenvectors of the Fock matrix of that final density (so Koopmans energies and the
// density agree to about γ·DensityTol ≈ 1e-4 eV, below the two decimals eV figures are
// printed with).
const (
	// DensityTol is the largest change of a density-matrix element (electrons) accepted
	// as converged.
	DensityTol = 1e-5
	// EnergyTol is the largest change of the SCF energy (eV) accepted as converged.
	EnergyTol = 1e-6
	// MaxIter caps the SCF cycles (DIIS cycles plus, if DIIS stalls, damped cycles).
	MaxIter = 120
	// diisDepth is the number of Fock/error pairs DIIS extrapolates over.
	diisDepth = 6
	// diisCycles is how many DIIS cycles run before the solver falls back to damping.
	diisCycles = 60
	// damping is the weight of the old density in the fallback damped iteration.
	damping = 0.5
	// pseudoMax is the largest closed-shell fragment given the pseudo-diagonalisation
	// (2×2 rotations) in the SCF loop; larger fragments are diagonalised in full.
	pseudoMax = 40
	// rotTol: occupied–virtual elements (eV) below it get no rotation.
	rotTol = 1e-11
)

// maxIter is MaxIter, a variable so the failure path can be tested.
var maxIter = MaxIter

// Errors of the solver.
var (
	// ErrNoConvergence reports an SCF that did not meet DensityTol and EnergyTol within
	// MaxIter cycles; the error names the molecule.
	ErrNoConvergence = errors.New("PPP SCF did not converge")
	// ErrGeometry reports a π system without coordinates (a hand-built PiSystem without
	// a molecule: use SolveAt) or a layout failure.
	ErrGeometry = errors.New("no geometry for the π centres")
)

// Stats describes the last solve of a Solver.
type Stats struct {
	Iterations int     // SCF cycles
	EnergyEV   float64 // total π energy, electronic plus core–core repulsion (eV)
	CoreEV     float64 // the core–core repulsion Σ_{i<j} Z_i Z_j γ_ij (eV)
	DeltaP     float64 // max |ΔP_ij| of the last cycle
	DeltaE     float64 // |ΔE| of the last cycle (eV)
	Brillouin  float64 // max |(FP − PF)_ij| of the converged density (eV·electron)
	Damped     bool    // DIIS stalled and the damped fallback finished the job
}

// Solver runs PPP-SCF calculations with workspaces that grow but never shrink: once warm,
// Solve (2D layout by a reused depict.Workspace, SCF) allocates nothing for an ordinary
// substrate, and neither does SolveAt with caller-owned coordinates. The zero value is not usable: build one with
// NewSolver. A Solver is not safe for concurrent use: give each goroutine its own.
type Solver struct {
	p *Params
	// Trace, when non-nil, receives the SCF energy (eV) of every cycle's input density,
	// starting with the Hückel start (for tests and diagnostics; appending allocates).
	Trace *[]float64

	hs    huckel.Solver
	ho    huckel.Orbitals
	stats Stats

	// per-centre data in permuted (fragment-contiguous) order
	perm, inv                  []int // perm[a] = centre, inv[centre] = a
	fragOff, fragM, fragE, pkO []int // per fragment: first local index, size, electrons, packed offset
	u, g, z                    []float64
	xy                         []depict.Point
	lay                        depict.Workspace // the 2D layout of Solve
	atomXY                     []depict.Point   // layout positions per atom
	gam                        []float64        // n×n γ, permuted order
	// packed block-diagonal matrices (fragment blocks m×m, row-major, one after another)
	hc, f, fx, pd, pNew, c, eps, occ, e []float64
	fHist, eHist                        []float64                      // diisDepth packed matrices each
	hist                                int                            // DIIS pairs stored
	bdot                                [diisDepth * diisDepth]float64 // ⟨e_i, e_j⟩ by history slot
	bmat                                [(diisDepth + 1) * (diisDepth + 1)]float64
	coefs                               [diisDepth + 1]float64
	a, w, work, tmp, ct, ft             []float64
	q                                   [1]float64
	lv                                  []int
	// cT[f]: fragment f's block of c holds Cᵀ (a row per level), as the pseudo-diagonalisation
	// leaves it, so that SCF cycles need no transposes; a full diagonalisation leaves C.
	cT []bool
}

// NewSolver returns a Solver for parameter set p (which must be complete: see Parse).
func NewSolver(p *Params) *Solver { return &Solver{p: p} }

// Params returns the solver's parameter set.
func (s *Solver) Params() *Params { return s.p }

// Name returns huckel.MethodPPP.
func (s *Solver) Name() string { return huckel.MethodPPP }

// Stats returns figures of the last successful (or failed) solve.
func (s *Solver) Stats() Stats { return s.stats }

// Fock returns the Fock matrix (eV) of the converged density of the last solve, n×n
// row-major over centres in ps.Centres order, in a new slice.
func (s *Solver) Fock() []float64 {
	n := len(s.perm)
	out := make([]float64, n*n)
	for f := range s.fragM {
		m, o, po := s.fragM[f], s.fragOff[f], s.pkO[f]
		for i := 0; i < m; i++ {
			for j := 0; j < m; j++ {
				out[s.perm[o+i]*n+s.perm[o+j]] = s.fx[po+i*m+j]
			}
		}
	}
	return out
}

// Solve runs the SCF for ps at the geometry of the 2D layout of ps.Mol (huckel/depict),
// scaled so that the mean π-bond length is Params.BondLength, and fills into. It needs
// ps.Mol; a hand-built PiSystem goes through SolveAt.
//
// The result carries the same information as a Hückel solve, in the same conventions:
// Levels sorted by X descending with X = (ε − α_C)/β₀ (α_C = Params.AlphaEV, β₀ =
// Params.Beta0, so X descending is ε ascending and gaps in X are gaps in units of |β₀|),
// Level.EV = ε in eV (EVDirect), degenerate sets found with huckel.DegeneracyTol on the x
// scale and given the deterministic basis and sign rule of huckel.Solve, aufbau per
// fragment with fractional occupancy of a partly filled degenerate shell (open shells are
// then treated by the same restricted formula, i.e. the half-electron approximation),
// Charges = Electrons + FormalCharge − P_ii, BondOrders = the SCF density matrix P,
// PiEnergy = (E_π − N·α_C)/β₀ with E_π the SCF π energy including core repulsion, H the
// x-scaled Fock diagonal (α_C + H_i·β₀ = F_ii), Iterations the SCF cycles.
//
// Errors: missing parameters (wrapping huckel.ErrNoParameter, naming the atom), too many
// electrons (huckel.ErrElectrons), layout failure (ErrGeometry), no convergence
// (ErrNoConvergence, naming the molecule), eigensolver failure (huckel.ErrEigen).
func (s *Solver) Solve(ps *huckel.PiSystem, into *huckel.Orbitals) error {
	if ps.Mol == nil {
		if len(ps.Centres) == 0 {
			return s.SolveAt(ps, nil, into)
		}
		return fmt.Errorf("ppp: %w: the π system has no molecule to lay out (use SolveAt with coordinates)", ErrGeometry)
	}
	pos, err := s.lay.LayoutInto(ps.Mol, s.atomXY)
	if err != nil {
		return fmt.Errorf("ppp: %s: %w: %v", molName(ps), ErrGeometry, err)
	}
	s.atomXY = pos
	n := len(ps.Centres)
	if cap(s.xy) < n {
		s.xy = make([]depict.Point, n)
	}
	s.xy = s.xy[:n]
	for i, c := range ps.Centres {
		s.xy[i] = pos[c.Atom]
	}
	scaleLayout(ps, s.xy, s.p.BondLength)
	return s.SolveAt(ps, s.xy, into)
}

// scaleLayout multiplies xy (one point per centre, bond units) so that the mean length of
// the π bonds is L (Å); without π bonds the unit bond becomes L.
func scaleLayout(ps *huckel.PiSystem, xy []depict.Point, L float64) {
	sum := 0.0
	for _, b := range ps.Bonds {
		sum += math.Hypot(xy[b.I].X-xy[b.J].X, xy[b.I].Y-xy[b.J].Y)
	}
	k := L
	if len(ps.Bonds) > 0 && sum > 0 {
		k = L * float64(len(ps.Bonds)) / sum
	}
	for i := range xy {
		xy[i].X *= k
		xy[i].Y *= k
	}
}

// Geometry returns the coordinates (Å) Solve uses for ps: one point per centre.
func Geometry(ps *huckel.PiSystem, p *Params) ([]depict.Point, error) {
	if ps.Mol == nil {
		return nil, fmt.Errorf("ppp: %w: the π system has no molecule to lay out", ErrGeometry)
	}
	lay, err := depict.Layout(ps.Mol)
	if err != nil {
		return nil, fmt.Errorf("ppp: %s: %w: %v", molName(ps), ErrGeometry, err)
	}
	xy := make([]depict.Point, len(ps.Centres))
	for i, c := range ps.Centres {
		xy[i] = lay.Pos[c.Atom]
	}
	scaleLayout(ps, xy, p.BondLength)
	return xy, nil
}

func molName(ps *huckel.PiSystem) string {
	if ps.Mol == nil {
		return "π system"
	}
	switch {
	case ps.Mol.Name != "" && ps.Mol.Source != "":
		return ps.Mol.Name + " (" + ps.Mol.Source + ")"
	case ps.Mol.Name != "":
		return ps.Mol.Name
	case ps.Mol.Source != "":
		return ps.Mol.Source
	}
	return "molecule"
}

// SolveAt is Solve at caller-given coordinates: xy[i] is the position (Å) of centre i.
func (s *Solver) SolveAt(ps *huckel.PiSystem, xy []depict.Point, into *huckel.Orbitals) error {
	s.stats = Stats{}
	n := len(ps.Centres)
	if len(xy) != n {
		panic(fmt.Sprintf("ppp: SolveAt: %d positions for %d centres", len(xy), n))
	}
	if err := s.setup(ps, xy); err != nil {
		return err
	}
	into.ResetLevels(ps)
	into.Method, into.EVDirect = huckel.MethodPPP, true
	into.AlphaEV, into.BetaEV = s.p.AlphaEV(), s.p.Beta0
	into.HOMO, into.LUMO, into.SOMO = -1, -1, -1
	into.Electrons, into.PiEnergy, into.Iterations, into.Partial = 0, 0, 0, false
	if n == 0 {
		into.Levels = into.Levels[:0]
		return nil
	}
	if err := s.start(ps); err != nil {
		return err
	}
	if err := s.iterate(ps); err != nil {
		return err
	}
	return s.finish(ps, into)
}

// setup checks electrons and parameters and builds γ, the core Hamiltonian and the
// fragment-contiguous ordering.
func (s *Solver) setup(ps *huckel.PiSystem, xy []depict.Point) error {
	n := len(ps.Centres)
	nf := len(ps.Fragments)
	s.perm, s.inv = grow.Slice(s.perm, n), grow.Slice(s.inv, n)
	s.fragOff, s.fragM, s.fragE, s.pkO = grow.Slice(s.fragOff, nf), grow.Slice(s.fragM, nf), grow.Slice(s.fragE, nf), grow.Slice(s.pkO, nf+1)
	a, pk := 0, 0
	for f, frag := range ps.Fragments {
		s.fragOff[f], s.fragM[f], s.pkO[f], s.fragE[f] = a, len(frag), pk, 0
		for _, c := range frag {
			s.perm[a], s.inv[c] = c, a
			a++
		}
		pk += len(frag) * len(frag)
	}
	s.pkO[nf] = pk
	if a != n {
		panic(fmt.Sprintf("ppp: fragments cover %d of %d centres", a, n))
	}
	s.u, s.g, s.z = grow.Slice(s.u, n), grow.Slice(s.g, n), grow.Slice(s.z, n)
	for i := range ps.Centres {
		c := &ps.Centres[i]
		par, ok := s.p.Lookup(c.Type)
		if !ok {
			return fmt.Errorf("ppp: %s: atom %d (%s): %w: no PPP parameters for centre type %s in set %s (add a centres entry with a user parameter file)",
				molName(ps), c.Atom, c.Element, huckel.ErrNoParameter, c.Type, s.p.Name)
		}
		if c.Electrons < 0 || c.Electrons > 2 {
			return fmt.Errorf("ppp: %s: centre %d (atom %d): %w: %d electrons on one centre", molName(ps), i, c.Atom, huckel.ErrElectrons, c.Electrons)
		}
		ai := s.inv[i]
		s.u[ai], s.g[ai], s.z[ai] = -par.IP, par.Gamma, par.Z
		s.fragE[c.Fragment] += c.Electrons
	}
	for f := range s.fragM {
		if s.fragE[f] > 2*s.fragM[f] {
			return fmt.Errorf("ppp: %s: π fragment %d: %w: %d electrons on %d centres", molName(ps), f, huckel.ErrElectrons, s.fragE[f], s.fragM[f])
		}
	}
	// γ (full, permuted) and core–core repulsion.
	s.gam = grow.Slice(s.gam, n*n)
	ecc := 0.0
	for i := 0; i < n; i++ {
		s.gam[i*n+i] = s.g[i]
		pi := xy[s.perm[i]]
		for j := i + 1; j < n; j++ {
			pj := xy[s.perm[j]]
			v := s.p.GammaIJ(s.g[i], s.g[j], math.Hypot(pi.X-pj.X, pi.Y-pj.Y))
			s.gam[i*n+j], s.gam[j*n+i] = v, v
			ecc += s.z[i] * s.z[j] * v
		}
	}
	s.stats.CoreEV = ecc
	// Core Hamiltonian, packed blocks: U_i − Σ_{j≠i} Z_j γ_ij on the diagonal, β_ij = k·β(r)
	// for π bonds.
	s.hc = grow.Slice(s.hc, pk)
	clear(s.hc)
	for f := range s.fragM {
		m, o, po := s.fragM[f], s.fragOff[f], s.pkO[f]
		for i := 0; i < m; i++ {
			v := s.u[o+i]
			row := s.gam[(o+i)*n : (o+i+1)*n]
			for j := 0; j < n; j++ {
				if j != o+i {
					v -= s.z[j] * row[j]
				}
			}
			s.hc[po+i*m+i] = v
		}
	}
	for _, b := range ps.Bonds {
		f := ps.Centres[b.I].Fragment
		m, o, po := s.fragM[f], s.fragOff[f], s.pkO[f]
		i, j := s.inv[b.I]-o, s.inv[b.J]-o
		r := math.Hypot(xy[b.I].X-xy[b.J].X, xy[b.I].Y-xy[b.J].Y)
		v := b.K * s.p.Beta(r)
		s.hc[po+i*m+j] += v
		s.hc[po+j*m+i] += v
	}
	for _, buf := range []*[]float64{&s.f, &s.fx, &s.pd, &s.pNew, &s.c, &s.e} {
		*buf = grow.Slice(*buf, pk)
	}
	s.eps, s.occ = grow.Slice(s.eps, n), grow.Slice(s.occ, n)
	s.fHist, s.eHist = grow.Slice(s.fHist, diisDepth*pk), grow.Slice(s.eHist, diisDepth*pk)
	return nil
}

// start fills s.c with the Hückel vectors of every fragment (ascending energy) and s.pd
// with the Hückel density.
func (s *Solver) start(ps *huckel.PiSystem) error {
	clear(s.c)
	s.cT = grow.Slice(s.cT, len(s.fragM))
	clear(s.cT)
	if s.denseStart(ps) {
		s.occupy()
		s.density(s.pd)
		return nil
	}
	if err := s.hs.Solve(ps, &s.ho); err != nil {
		// The Hückel start failed (e.g. an ω iteration): start from the core Hamiltonian.
		copy(s.f, s.hc)
		if err := s.diagonalise(false); err != nil {
			return err
		}
	} else {
		s.lv = grow.Slice(s.lv, len(s.fragM))
		next := s.lv
		clear(next)
		scale := math.Abs(s.p.Beta0)
		for _, l := range s.ho.Levels { // X descending = energy ascending
			f := l.Fragment
			m, o, po := s.fragM[f], s.fragOff[f], s.pkO[f]
			k := next[f]
			next[f]++
			for i := 0; i < m; i++ {
				s.c[po+i*m+k] = l.Coeffs[s.perm[o+i]]
			}
			// Hückel energies in eV-like units only order the start (degenerate sets stay
			// degenerate, so a partly filled shell starts with fractional occupancy).
			s.eps[o+k] = -l.X * scale
		}
	}
	s.occupy()
	s.density(s.pd)
	return nil
}

// denseStart is the Hückel start without a huckel.Solver: when ps asks for no ω
// iteration, it builds each fragment's Hückel matrix (h_i on the diagonal, k_ij for the π
// bonds, as huckel.Solve does) in s.c and diagonalises it in place by Householder
// reduction and implicit QL (symEig) into s.c and s.eps. The start vectors are then the
// Hückel eigenvectors up to the basis chosen inside degenerate sets, which the SCF does not
// depend on (a degenerate set is occupied evenly). It returns false (and leaves the work
// to the huckel.Solver path) for an ω iteration or when QL fails.
func (s *Solver) denseStart(ps *huckel.PiSystem) bool {
	if ps.Omega != 0 {
		return false
	}
	for f, m := range s.fragM {
		o, po := s.fragOff[f], s.pkO[f]
		for i := 0; i < m; i++ {
			s.c[po+i*m+i] = ps.Centres[s.perm[o+i]].H
		}
	}
	for _, b := range ps.Bonds {
		f := ps.Centres[b.I].Fragment
		m, o, po := s.fragM[f], s.fragOff[f], s.pkO[f]
		i, j := s.inv[b.I]-o, s.inv[b.J]-o
		s.c[po+i*m+j] += b.K
		s.c[po+j*m+i] += b.K
	}
	scale := math.Abs(s.p.Beta0)
	for f, m := range s.fragM {
		o, po := s.fragOff[f], s.pkO[f]
		cb, eps := s.c[po:po+m*m], s.eps[o:o+m]
		s.w = grow.Slice(s.w, m)
		if !symEig(cb, m, eps, s.w[:m]) {
			clear(s.c)
			return false
		}
		for i := 0; i < m; i++ {
			eps[i] = -eps[i] * scale // x descending = energy ascending
		}
		sortColumns(eps, cb, m)
	}
	return true
}

// occupy sets s.occ by aufbau per fragment from s.eps (ascending within each fragment),
// with equal fractional occupancy of a partly filled degenerate set.
func (s *Solver) occupy() {
	tol := huckel.DegeneracyTol * math.Abs(s.p.Beta0)
	for f, m := range s.fragM {
		o := s.fragOff[f]
		left := s.fragE[f]
		for k := 0; k < m; {
			e := k + 1
			for e < m && s.eps[o+e]-s.eps[o+e-1] < tol {
				e++
			}
			d := e - k
			occ := 0.0
			if left >= 2*d {
				occ, left = 2, left-2*d
			} else if left > 0 {
				occ, left = float64(left)/float64(d), 0
			}
			for j := k; j < e; j++ {
				s.occ[o+j] = occ
			}
			k = e
		}
	}
}

// density writes P = Σ_k n_k c_k c_kᵀ (packed blocks) into p.
func (s *Solver) density(p []float64) {
	for f, m := range s.fragM {
		o, po := s.fragOff[f], s.pkO[f]
		blk := p[po : po+m*m]
		clear(blk)
		cb := s.c[po : po+m*m]
		if s.cT[f] { // rows of cb are the levels: the same sums over contiguous rows
			for k := 0; k < m; k++ {
				nk := s.occ[o+k]
				if nk == 0 {
					continue
				}
				ck := cb[k*m : k*m+m]
				for i, cik := range ck {
					ci := nk * cik
					if ci == 0 {
						continue
					}
					row := blk[i*m : i*m+m]
					row = row[:len(ck)]
					for j, cjk := range ck {
						row[j] += ci * cjk
					}
				}
			}
			continue
		}
		for k := 0; k < m; k++ {
			nk := s.occ[o+k]
			if nk == 0 {
				continue
			}
			for i := 0; i < m; i++ {
				ci := nk * cb[i*m+k]
				if ci == 0 {
					continue
				}
				row := blk[i*m : i*m+m]
				for j := 0; j < m; j++ {
					row[j] += ci * cb[j*m+k]
				}
			}
		}
	}
}

// fock builds F(P) into f (packed) and returns the SCF energy (eV, with core repulsion):
// F_ii = H_ii + ½P_ii γ_ii + Σ_{j≠i} P_jj γ_ij, F_ij = H_ij − ½P_ij γ_ij.
func (s *Solver) fock(p, f []float64) float64 {
	n := len(s.perm)
	copy(f, s.hc)
	en := 0.0
	for fr, m := range s.fragM {
		o, po := s.fragOff[fr], s.pkO[fr]
		for i := 0; i < m; i++ {
			gi := s.gam[(o+i)*n : (o+i+1)*n]
			pi := p[po+i*m : po+i*m+m]
			fi := f[po+i*m : po+i*m+m]
			hi := s.hc[po+i*m : po+i*m+m]
			gf := gi[o : o+m] // γ to the centres of this fragment
			fi, hi, gf = fi[:len(pi)], hi[:len(pi)], gf[:len(pi)]
			// Coulomb from every centre (all fragments).
			v := 0.5 * pi[i] * gi[o+i]
			for f2, m2 := range s.fragM {
				o2, po2 := s.fragOff[f2], s.pkO[f2]
				g2 := gi[o2 : o2+m2]
				for j := 0; j < m2; j++ {
					if o2+j != o+i {
						v += p[po2+j*m2+j] * g2[j]
					}
				}
			}
			fi[i] += v
			for j, pij := range pi {
				if j != i {
					fi[j] -= 0.5 * pij * gf[j]
				}
				en += pij * (hi[j] + fi[j])
			}
		}
	}
	return 0.5*en + s.stats.CoreEV
}

// commutator writes e = FP − PF (packed) and returns max |e_ij|. F and P are symmetric,
// so PF = (FP)ᵀ and one product suffices.
func (s *Solver) commutator(f, p, e []float64) float64 {
	mx := 0.0
	for fr, m := range s.fragM {
		po := s.pkO[fr]
		fb, pb, eb := f[po:po+m*m], p[po:po+m*m], e[po:po+m*m]
		// (FP)_ij = Σ_k F_ik P_kj, summed over k ascending from +0 (zero F_ik skipped: a ±0
		// term would leave the sum unchanged). Four columns at a time in registers.
		for i := 0; i < m; i++ {
			ei := eb[i*m : i*m+m]
			fi := fb[i*m : i*m+m]
			j := 0
			for ; j+3 < m; j += 4 {
				a0, a1, a2, a3 := 0.0, 0.0, 0.0, 0.0
				for k, fik := range fi {
					if fik == 0 {
						continue
					}
					pk := pb[k*m+j : k*m+j+4]
					a0 += fik * pk[0]
					a1 += fik * pk[1]
					a2 += fik * pk[2]
					a3 += fik * pk[3]
				}
				ei[j], ei[j+1], ei[j+2], ei[j+3] = a0, a1, a2, a3
			}
			for ; j < m; j++ {
				a := 0.0
				for k, fik := range fi {
					if fik == 0 {
						continue
					}
					a += fik * pb[k*m+j]
				}
				ei[j] = a
			}
		}
		for i := 0; i < m; i++ {
			for j := i; j < m; j++ {
				v := eb[i*m+j] - eb[j*m+i]
				eb[i*m+j], eb[j*m+i] = v, -v
				if v < 0 {
					v = -v
				}
				if v > mx {
					mx = v
				}
			}
		}
	}
	return mx
}

// iterate runs DIIS-accelerated Roothaan cycles from the density in s.pd, with a damped
// fallback when DIIS stalls. On success s.pd holds the converged density.
func (s *Solver) iterate(ps *huckel.PiSystem) error {
	pk := s.pkO[len(s.fragM)]
	s.hist = 0
	ePrev := math.Inf(1)
	dP := math.Inf(1)
	damped := false
	for it := 1; it <= maxIter; it++ {
		en := s.fock(s.pd, s.f)
		if s.Trace != nil {
			*s.Trace = append(*s.Trace, en)
		}
		dE := math.Abs(en - ePrev)
		s.stats.Iterations, s.stats.DeltaP, s.stats.DeltaE, s.stats.EnergyEV = it-1, dP, dE, en
		if dP < DensityTol && dE < EnergyTol {
			s.stats.Damped = damped
			return nil
		}
		ePrev = en
		if !damped && it > diisCycles {
			damped = true
			s.hist = 0
		}
		if !damped {
			slot := s.hist % diisDepth
			s.commutator(s.f, s.pd, s.eHist[slot*pk:(slot+1)*pk])
			copy(s.fHist[slot*pk:(slot+1)*pk], s.f)
			s.hist++
			s.extrapolate(pk)
		}
		if err := s.diagonalise(true); err != nil {
			return err
		}
		s.occupy()
		s.density(s.pNew)
		dP = 0
		pNew, pd := s.pNew[:pk], s.pd[:pk]
		if damped {
			for i := range pNew {
				pNew[i] = (1-damping)*pNew[i] + damping*pd[i]
			}
		}
		for i, x := range pNew {
			// max(dP, |ΔP_ij|) as the builtin gives it (a NaN sticks), without its
			// signed-zero handling: both operands are ≥ +0 or NaN.
			if d := math.Abs(x - pd[i]); d > dP || d != d {
				dP = d
			}
		}
		if math.IsNaN(dP) {
			break
		}
		s.pd, s.pNew = s.pNew, s.pd
	}
	return fmt.Errorf("ppp: %s: %w after %d cycles: max|ΔP| = %.2g (tolerance %g), |ΔE| = %.2g eV (tolerance %g eV); the frontier levels may cross (try another parameter set, or check the structure)",
		molName(ps), ErrNoConvergence, maxIter, s.stats.DeltaP, DensityTol, s.stats.DeltaE, EnergyTol)
}

// extrapolate replaces s.f by the DIIS combination Σ c_k F_k minimising |Σ c_k e_k| with
// Σ c_k = 1 (P. Pulay, Chem. Phys. Lett. 1980, 73, 393). On a singular system it keeps
// s.f (the plain Roothaan step).
func (s *Solver) extrapolate(pk int) {
	k := min(s.hist, diisDepth)
	dim := k + 1
	b := s.bmat[:dim*dim]
	last := (s.hist - 1) % diisDepth // the slot just written: update its row of ⟨e_i, e_j⟩
	el := s.eHist[last*pk : (last+1)*pk]
	j := 0
	// Two products at a time: two independent sums, each in its own order, overlap in the
	// pipeline where one sum would wait on every addition.
	for ; j+1 < k; j += 2 {
		e0 := s.eHist[j*pk : (j+1)*pk]
		e1 := s.eHist[(j+1)*pk : (j+2)*pk]
		e0, e1 = e0[:len(el)], e1[:len(el)]
		v0, v1 := 0.0, 0.0
		for t, x := range el {
			v0 += x * e0[t]
			v1 += x * e1[t]
		}
		s.bdot[last*diisDepth+j], s.bdot[j*diisDepth+last] = v0, v0
		s.bdot[last*diisDepth+j+1], s.bdot[(j+1)*diisDepth+last] = v1, v1
	}
	if j < k {
		ej := s.eHist[j*pk : (j+1)*pk]
		ej = ej[:len(el)]
		v := 0.0
		for t, x := range el {
			v += x * ej[t]
		}
		s.bdot[last*diisDepth+j], s.bdot[j*diisDepth+last] = v, v
	}
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			b[i*dim+j] = s.bdot[i*diisDepth+j]
		}
		b[i*dim+k], b[k*dim+i] = -1, -1
		s.coefs[i] = 0
	}
	b[k*dim+k] = 0
	s.coefs[k] = -1
	// Scale the error block so the pivots are of order one.
	sc := 0.0
	for i := 0; i < k; i++ {
		sc = max(sc, b[i*dim+i])
	}
	if sc == 0 {
		return
	}
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			b[i*dim+j] /= sc
		}
	}
	if k < 2 || !solveSmall(b, s.coefs[:dim], dim) {
		return
	}
	clear(s.f)
	for i := 0; i < k; i++ {
		ci := s.coefs[i]
		fi := s.fHist[i*pk : (i+1)*pk]
		f := s.f[:len(fi)]
		for t, x := range fi {
			f[t] += ci * x
		}
	}
}

// solveSmall solves a·x = rhs (rhs in x) by Gaussian elimination with partial pivoting;
// false when a pivot vanishes. a is destroyed.
func solveSmall(a, x []float64, n int) bool {
	for c := 0; c < n; c++ {
		piv := c
		for r := c + 1; r < n; r++ {
			if math.Abs(a[r*n+c]) > math.Abs(a[piv*n+c]) {
				piv = r
			}
		}
		if math.Abs(a[piv*n+c]) < 1e-14 {
			return false
		}
		if piv != c {
			for j := 0; j < n; j++ {
				a[c*n+j], a[piv*n+j] = a[piv*n+j], a[c*n+j]
			}
			x[c], x[piv] = x[piv], x[c]
		}
		for r := c + 1; r < n; r++ {
			fct := a[r*n+c] / a[c*n+c]
			if fct == 0 {
				continue
			}
			for j := c; j < n; j++ {
				a[r*n+j] -= fct * a[c*n+j]
			}
			x[r] -= fct * x[c]
		}
	}
	for r := n - 1; r >= 0; r-- {
		v := x[r]
		for j := r + 1; j < n; j++ {
			v -= a[r*n+j] * x[j]
		}
		x[r] = v / a[r*n+r]
	}
	return true
}

// diagonalise replaces s.c and s.eps by the eigenvectors and eigenvalues (ascending) of
// every fragment block of s.f, by Householder reduction and implicit QL (symEig; LAPACK's
// dsyev through gonum if QL should fail). With occVirt (inside the SCF loop) a
// closed-shell block of up to pseudoMax centres gets the cheaper pseudo-diagonalisation in
// the basis of the current s.c instead (see pseudoDiag); the final diagonalisation is full.
func (s *Solver) diagonalise(occVirt bool) error {
	for f, m := range s.fragM {
		o, po := s.fragOff[f], s.pkO[f]
		fb, cb := s.f[po:po+m*m], s.c[po:po+m*m]
		eps := s.eps[o : o+m]
		if m == 1 {
			cb[0], eps[0] = 1, fb[0]
			continue
		}
		if occVirt && m <= pseudoMax {
			if nocc := s.closedShell(f); nocc > 0 && nocc < m {
				s.pseudoDiag(fb, cb, eps, m, nocc, s.cT[f]) // sorts the levels too
				s.cT[f] = true
				continue
			}
		}
		s.cT[f] = false
		copy(cb, fb)
		s.w = grow.Slice(s.w, m)
		if symEig(cb, m, eps, s.w[:m]) {
			sortColumns(eps, cb, m)
			continue
		}
		s.a = grow.Slice(s.a, m*m)
		copy(s.a, fb)
		sym := blas64.Symmetric{N: m, Stride: m, Uplo: blas.Upper, Data: s.a[:m*m]}
		lapack64.Syev(lapack.EVCompute, sym, s.w, s.q[:], -1)
		s.work = grow.Slice(s.work, int(s.q[0]))
		if !lapack64.Syev(lapack.EVCompute, sym, s.w, s.work, len(s.work)) {
			return fmt.Errorf("ppp: %w on a %d×%d Fock matrix", huckel.ErrEigen, m, m)
		}
		copy(cb, s.a[:m*m])
		copy(eps, s.w[:m])
	}
	return nil
}

// closedShell returns the number of doubly occupied levels of fragment f when its
// occupations (s.occ, from the previous cycle) are all 2 or 0, else −1.
func (s *Solver) closedShell(f int) int {
	o, m := s.fragOff[f], s.fragM[f]
	n := 0
	for _, v := range s.occ[o : o+m] {
		switch v {
		case 2:
			n++
		case 0:
		default:
			return -1
		}
	}
	return n
}

// pseudoDiag is the SCF-cycle step for a closed-shell block: the pseudo-diagonalisation of
// J. J. P. Stewart, P. Császár, P. Pulay (J. Comput. Chem. 1982, 3, 227). With fc = F·C
// (f the m×m block of F, c of C),
// it forms the diagonal and the occupied–virtual block of Cᵀ F C and applies to the
// columns of C, for every occupied i and virtual v, the 2×2 rotation that would zero
// (CᵀFC)_iv. The density depends only on the occupied space, so this is all a Roothaan
// step needs; the rotations keep C orthonormal, the neglected couplings between
// rotations vanish as the SCF converges, and the final diagonalisation is a full one.
// eps receives the diagonal (the level order for aufbau). The rotations work on Cᵀ, so
// that the levels are contiguous rows, and leave Cᵀ in c; cT says c holds Cᵀ already.
func (s *Solver) pseudoDiag(f, c, eps []float64, m, nocc int, cT bool) {
	s.ft = grow.Slice(s.ft, m*m)
	ft := s.ft[:m*m]
	ct := c
	if !cT {
		s.ct = grow.Slice(s.ct, m*m)
		ct = s.ct[:m*m]
		transpose(ct, c, m)
	}
	// (F·C)ᵀ directly: element (j, i) is row i of F dotted with row j of Cᵀ, summed over k
	// ascending from +0 as the row-oriented product F·C summed it (that product skipped
	// the zero F_ik; adding a ±0 term leaves a sum that starts at +0 bit-identical). Four
	// elements at a time: four independent sums overlap in the pipeline.
	for i := 0; i < m; i++ {
		fi := f[i*m : i*m+m]
		j := 0
		for ; j+3 < m; j += 4 {
			c0, c1, c2, c3 := ct[j*m:j*m+m], ct[(j+1)*m:(j+1)*m+m], ct[(j+2)*m:(j+2)*m+m], ct[(j+3)*m:(j+3)*m+m]
			c0, c1, c2, c3 = c0[:len(fi)], c1[:len(fi)], c2[:len(fi)], c3[:len(fi)]
			v0, v1, v2, v3 := 0.0, 0.0, 0.0, 0.0
			for k, x := range fi {
				v0 += x * c0[k]
				v1 += x * c1[k]
				v2 += x * c2[k]
				v3 += x * c3[k]
			}
			ft[j*m+i], ft[(j+1)*m+i], ft[(j+2)*m+i], ft[(j+3)*m+i] = v0, v1, v2, v3
		}
		for ; j < m; j++ {
			cj := ct[j*m : j*m+m]
			cj = cj[:len(fi)]
			v := 0.0
			for k, x := range fi {
				v += x * cj[k]
			}
			ft[j*m+i] = v
		}
	}
	for k := 0; k < m; k++ {
		ck, fk := ct[k*m:k*m+m], ft[k*m:k*m+m]
		v := 0.0
		for r, x := range ck {
			v += x * fk[r]
		}
		eps[k] = v
	}
	for i := 0; i < nocc; i++ {
		ci := ct[i*m : i*m+m]
		for v := nocc; v < m; v++ {
			fv := ft[v*m : v*m+m]
			fv = fv[:len(ci)]
			fiv := 0.0
			for r, x := range ci {
				fiv += x * fv[r]
			}
			if math.Abs(fiv) < rotTol {
				continue
			}
			theta := (eps[v] - eps[i]) / (2 * fiv)
			t := 1 / (math.Abs(theta) + math.Sqrt(theta*theta+1))
			if theta < 0 {
				t = -t
			}
			cs := 1 / math.Sqrt(t*t+1)
			sn := t * cs
			cv := ct[v*m : v*m+m]
			cv = cv[:len(ci)]
			for r, x := range ci {
				y := cv[r]
				ci[r] = cs*x - sn*y
				cv[r] = sn*x + cs*y
			}
		}
	}
	// Sort the levels (rows of Cᵀ) ascending.
	for i := 1; i < m; i++ {
		for j := i; j > 0 && eps[j] < eps[j-1]; j-- {
			eps[j], eps[j-1] = eps[j-1], eps[j]
			rj, rk := ct[j*m:j*m+m], ct[(j-1)*m:j*m]
			for k := range rj {
				rj[k], rk[k] = rk[k], rj[k]
			}
		}
	}
	if !cT {
		copy(c, ct)
	}
}

// transpose writes the transpose of the m×m matrix src into dst.
func transpose(dst, src []float64, m int) {
	for i := 0; i < m; i++ {
		row := src[i*m : i*m+m]
		for j, x := range row {
			dst[j*m+i] = x
		}
	}
}

// sortColumns orders eps ascending, permuting the columns of c alike (insertion sort:
// the order rarely changes between SCF cycles).
func sortColumns(eps, c []float64, m int) {
	for i := 1; i < m; i++ {
		for j := i; j > 0 && eps[j] < eps[j-1]; j-- {
			eps[j], eps[j-1] = eps[j-1], eps[j]
			for k := 0; k < m; k++ {
				c[k*m+j], c[k*m+j-1] = c[k*m+j-1], c[k*m+j]
			}
		}
	}
}

// finish diagonalises the Fock matrix of the converged density and fills into.
func (s *Solver) finish(ps *huckel.PiSystem, into *huckel.Orbitals) error {
	n := len(ps.Centres)
	en := s.stats.EnergyEV // iterate returned with s.f = F(s.pd) and its energy
	copy(s.fx, s.f)
	s.stats.EnergyEV = en
	s.stats.Brillouin = s.commutator(s.f, s.pd, s.e)
	if err := s.diagonalise(false); err != nil {
		return err
	}
	s.occupy()
	alpha, beta := s.p.AlphaEV(), s.p.Beta0
	tol := huckel.DegeneracyTol * math.Abs(beta)
	lv := 0
	electrons := 0
	for f, m := range s.fragM {
		o, po := s.fragOff[f], s.pkO[f]
		cb := s.c[po : po+m*m]
		eps := s.eps[o : o+m]
		electrons += s.fragE[f]
		frag := ps.Fragments[f]
		for k := 0; k < m; {
			e := k + 1
			for e < m && eps[e]-eps[e-1] < tol {
				e++
			}
			d := e - k
			mean := 0.0
			for j := k; j < e; j++ {
				mean += eps[j]
			}
			mean /= float64(d)
			if d > 1 {
				s.fixDegenerate(cb, m, k, d)
			}
			for j := k; j < e; j++ {
				l := &into.Levels[lv+j]
				for i := 0; i < m; i++ {
					l.Coeffs[s.perm[o+i]] = cb[i*m+j]
				}
				fixSign(l.Coeffs, frag)
				l.X, l.EV, l.Fragment, l.Degenerate, l.Occupancy = (mean-alpha)/beta, mean, f, d, s.occ[o+j]
				if l.Occupancy > 0 && l.Occupancy < 2 {
					into.Partial = true
				}
			}
			if occ := s.occ[o+k]; d > 1 && occ > 0 && occ < 2 {
				into.Warnings = append(into.Warnings, fmt.Sprintf(
					"π fragment %d: degenerate set of %d levels at %.4f eV holds %.0f electrons: equal fractional occupancy %.3g each (open shell, half-electron treatment)",
					f, d, mean, occ*float64(d), occ))
			}
			k = e
		}
		lv += m
	}
	slices.SortStableFunc(into.Levels, func(a, b huckel.Level) int {
		switch {
		case a.X > b.X:
			return -1
		case a.X < b.X:
			return 1
		}
		return a.Fragment - b.Fragment
	})
	into.Electrons = electrons
	for i := range into.Levels {
		if into.Levels[i].Occupancy > 0 {
			into.HOMO = i
		}
	}
	for i := range into.Levels {
		if into.Levels[i].Occupancy == 0 {
			into.LUMO = i
			break
		}
	}
	if into.HOMO >= 0 && into.Levels[into.HOMO].Occupancy < 2 {
		into.SOMO = into.HOMO
	}
	// Density, charges, effective h, energy on the x scale.
	for f, m := range s.fragM {
		o, po := s.fragOff[f], s.pkO[f]
		for i := 0; i < m; i++ {
			ci := s.perm[o+i]
			for j := 0; j < m; j++ {
				into.BondOrders[ci*n+s.perm[o+j]] = s.pd[po+i*m+j]
			}
			into.H[ci] = (s.fx[po+i*m+i] - alpha) / beta
		}
	}
	for i := range ps.Centres {
		c := &ps.Centres[i]
		into.Charges[i] = float64(c.Electrons+c.FormalCharge) - into.BondOrders[i*n+i]
	}
	into.PiEnergy = (en - float64(electrons)*alpha) / beta
	into.Iterations = s.stats.Iterations
	return nil
}

// fixDegenerate replaces columns k..k+d−1 of the m×m matrix c by the deterministic basis
// of their span used by huckel.Solve: Gram–Schmidt of the projections of e_0, e_1, … in
// local (ascending centre) order.
func (s *Solver) fixDegenerate(c []float64, m, k, d int) {
	s.tmp = grow.Slice(s.tmp, m*d)
	s.a = grow.Slice(s.a, m*m)
	proj := s.a[:m*m]
	for r := 0; r < m; r++ {
		for q := 0; q < m; q++ {
			v := 0.0
			for j := k; j < k+d; j++ {
				v += c[r*m+j] * c[q*m+j]
			}
			proj[r*m+q] = v
		}
	}
	got := 0
	for e := 0; e < m && got < d; e++ {
		u := s.tmp[got*m : (got+1)*m]
		for r := 0; r < m; r++ {
			u[r] = proj[r*m+e]
		}
		for pass := 0; pass < 2; pass++ {
			for g := 0; g < got; g++ {
				prev := s.tmp[g*m : (g+1)*m]
				dt := 0.0
				for r := range u {
					dt += prev[r] * u[r]
				}
				for r := range u {
					u[r] -= dt * prev[r]
				}
			}
		}
		nrm := 0.0
		for _, v := range u {
			nrm += v * v
		}
		nrm = math.Sqrt(nrm)
		if nrm < 1e-6 {
			continue
		}
		for r := range u {
			u[r] /= nrm
		}
		got++
	}
	if got < d {
		return
	}
	for g := 0; g < d; g++ {
		for r := 0; r < m; r++ {
			c[r*m+k+g] = s.tmp[g*m+r]
		}
	}
}

// fixSign makes the largest-|c| coefficient over the fragment positive (ties within
// huckel.SignTieTol go to the lowest centre index), the convention of huckel.Solve.
func fixSign(c []float64, frag []int) {
	best, bestAbs := -1, -1.0
	for _, i := range frag {
		if a := math.Abs(c[i]); a > bestAbs+huckel.SignTieTol {
			best, bestAbs = i, a
		}
	}
	if best >= 0 && c[best] < 0 {
		for _, i := range frag {
			c[i] = -c[i]
		}
	}
}
