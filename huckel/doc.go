// Package huckel perceives the π system of a molecular graph and solves it in the simple
// Hückel approximation with published heteroatom parameters.
//
// # Data flow
//
//	m, _ := smiles.Parse("C=CC=O")          // Kekulé graph (package smiles)
//	ps, err := huckel.Perceive(m, params)   // π centres with type, h, electrons; π bonds with k
//	o, err := huckel.Solve(ps)              // levels, occupations, HOMO/LUMO, charges, bond orders
//
// Energies are x in E = α + xβ with β < 0, so bonding levels have x > 0; the Hückel matrix
// (Matrix) holds h_i on the diagonal and k_ij for π bonds, in units of β. A Calibration
// maps x to eV with separate lines for occupied and empty levels.
//
// # Parameters
//
// A Params holds h per CentreType and k per pair of types (optionally per Kekulé bond
// order), each with a source; sets are YAML data (ParseParams; built-in sets in package
// presets). Params.Alkyl switches on the hyperconjugative heteroatom model of alkyl
// groups; Params.Omega the ω-technique.
//
// # Perception
//
// Perceive types every atom from its element, formal charge, Kekulé bonds and
// neighbours; the rules are listed on Perceive. Separate π systems are separate fragments
// and are diagonalised separately, so their levels never mix. An atom the rules type but
// the set has no parameter for is an error naming the atom (ErrNoParameter); a bonding
// situation the rules do not cover is ErrUnsupported. Odd electron counts, dropped
// multiple bonds of atoms without π parameters (sulfonyl S, P, Si …) and systems above
// LargeSystemWarn centres produce warnings in PiSystem.Warnings.
//
// # Solving
//
// Solve uses gonum's mat.EigenSym; Solver uses lapack64.Syev with reused buffers and
// allocates nothing once warm (one Solver per goroutine). Both give identical results and
// follow one convention: levels sorted by x descending, degenerate sets (|Δx| <
// DegeneracyTol within a fragment) given a deterministic basis, a fixed sign rule,
// aufbau filling per fragment with equal fractional occupancy of a partly filled
// degenerate shell (Orbitals.Partial). gonum has no subset or sparse eigensolver: every
// solve is a dense O(n³) diagonalisation of each fragment. With PiSystem.Omega ≠ 0 the
// ω-technique makes h self-consistent with the charges by Anderson mixing with adaptive
// damping (scheme, tolerance OmegaTol and cap OmegaMaxIter on Solver.Solve); it returns
// ErrNoConvergence at the cap or when no step lowers the residual (crossing frontier levels).
//
// # Failure modes
//
// Bad data (a parameter file, an unsupported atom, more electrons than a fragment can
// hold, an ω iteration that does not converge, a non-finite ω) returns an error that wraps one of the
// package's sentinel errors. A π system above DefaultMaxCentres (500) centres is refused
// by Perceive and Solve with ErrTooManyCentres before the O(n²) memory of a dense solve
// is allocated (PerceiveOptions.MaxCentres raises the limit). Parameter files must keep
// h and k within physical ranges (MaxAbsH, MaxK; see ParseParams), and Calibration.Check
// does the same for calibrations read from files. Messages quote user input through
// package errtext (control characters escaped, at most 100 characters shown). Programmer misuse (out-of-range indices, inconsistent
// fragments in a hand-built PiSystem) panics. Nothing here reads files or the terminal.
//
// Results are estimates for planning, not safety assessments.
package huckel
