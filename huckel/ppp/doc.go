// Package ppp solves the π system perceived by package huckel with the self-consistent
// Pariser–Parr–Pople method (R. Pariser, R. G. Parr, J. Chem. Phys. 1953, 21, 466 and
// 767; J. A. Pople, Trans. Faraday Soc. 1953, 49, 1375): closed-shell restricted SCF over
// the π centres in the zero-differential-overlap approximation. Orbital energies come out
// in eV and stand, by Koopmans' theorem, for −IE (HOMO) and −EA (LUMO) without a fitted
// calibration.
//
// # Data flow
//
//	m, _ := smiles.Parse("C=CC=O")
//	ps, _ := huckel.Perceive(m, hp)         // the same PiSystem the Hückel solver takes
//	s := ppp.NewSolver(pp)                  // pp from presets.PPPParams or ppp.Parse
//	var o huckel.Orbitals
//	err := s.Solve(ps, &o)                  // o.Levels[o.HOMO].EV in eV, X on the x scale
//
// *Solver and *huckel.Solver both implement huckel.Method, and both fill a
// huckel.Orbitals, so code that reads frontier levels, coefficients, charges and bond
// orders does not switch on the method; eV figures come from Orbitals.LevelEV, which uses
// Level.EV for PPP (EVDirect) and a huckel.Calibration for Hückel. PPP levels also carry
// X = (ε − α_C)/β₀ with α_C = U_C + γ_CC/2 (the Fock diagonal of a neutral carbon) and
// β₀ = −2.39 eV, so sorting by X, gaps in |β| and perturbation sums keep their meaning.
//
// # Model
//
//   - Fock matrix: F_ii = U_i + ½P_ii γ_ii + Σ_{j≠i} (P_jj − Z_j) γ_ij,
//     F_ij = β_ij − ½P_ij γ_ij; energy ½Σ P_ij (H_ij + F_ij) + Σ_{i<j} Z_i Z_j γ_ij.
//   - Core integrals U_i = −IP_i from valence-state ionisation potentials, γ_ii = I − A
//     (Hinze & Jaffé 1962 values for C, N, O; stated rules for S, halogens, B and the
//     methyl pseudo-atom), core charges Z; one entry per centre type in the parameter file
//     (presets/ppp/*.yaml), every value with its source.
//   - Two-centre repulsion by Mataga–Nishimoto (default) or Ohno (Params.Gamma): the
//     default was chosen on the bundled π-ionisation set, where it gives the smaller RMSE
//     of Koopmans HOMO energies (TestIonisationFigures logs both).
//   - Resonance integrals β_ij = k_ij·β(r_ij) for the π bonds of the PiSystem, with k_ij the
//     Hückel resonance parameter the PiSystem carries (the default Hückel set,
//     Van-Catledge 1980, derived its k from PPP calculations) and β(r) ∝ the overlap of two
//     carbon 2pπ Slater orbitals (Mulliken), −2.39 eV at 1.397 Å.
//   - Geometry: the 2D layout of package huckel/depict (equal bonds, regular polygons,
//     120° chains) scaled so that the mean length of the π bonds is 1.40 Å — the idealised
//     geometry of Pariser & Parr 1953. All bonds are therefore about 1.40 Å; bond-length
//     alternation and heteroatom bond lengths are not modelled.
//   - Separate π fragments are diagonalised separately and filled with their own
//     electrons, as in huckel.Solve, but feel each other's charges through γ.
//   - Open shells (odd electron counts, partly filled degenerate sets) are filled
//     fractionally and treated with the same restricted formula (half-electron
//     approximation); a warning says so.
//
// # SCF
//
// Start: the Hückel vectors and occupations of the same PiSystem. Cycles: Fock build, DIIS
// extrapolation (P. Pulay, Chem. Phys. Lett. 1980, 73, 393) over the last 6 Fock/error
// pairs (error FP − PF), and a pseudo-diagonalisation (Stewart, Császár & Pulay, J. Comput.
// Chem. 1982, 3, 227: occupied–virtual Jacobi rotations of the previous vectors) in place
// of a full diagonalisation; after 60 DIIS cycles without convergence the solver falls
// back to damped cycles. Convergence: max|ΔP| < DensityTol and |ΔE| < EnergyTol; the
// returned levels are a full diagonalisation (Jacobi, or lapack64.Syev above 40 centres)
// of the Fock matrix of the converged density, with degenerate sets (huckel.DegeneracyTol
// on the x scale) and signs fixed by the conventions of huckel.Solve. A Solver reuses its
// workspaces: once warm the SCF loop allocates nothing (the 2D layout does, per
// molecule).
//
// # Failure modes
//
// A centre type without PPP parameters (wrapping huckel.ErrNoParameter), too many
// electrons (huckel.ErrElectrons), a failed layout (ErrGeometry), no convergence within
// MaxIter cycles (ErrNoConvergence) — each error names the molecule (its SMILES or name).
// A parameter file with bad content gives a *yamlfile.Error (wrapping huckel.ErrParams) with file:line:column.
// Programmer misuse (coordinates that do not match the centres) panics.
//
// Results are estimates for planning, not safety assessments.
package ppp
