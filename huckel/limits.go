package huckel

import (
	"errors"
	"fmt"

	"cyclopair/huckel/molecule"
)

// DefaultMaxCentres is the largest π system, in centres, that Perceive accepts and Solve
// diagonalises unless told otherwise (PerceiveOptions.MaxCentres).
//
// Why 500: gonum has no subset or sparse eigensolver, so every solve is a dense symmetric
// eigendecomposition with vectors, O(n³) in time and O(n²) in memory (the matrix, the
// eigenvectors, the coefficients of every level and the n×n bond orders). Measured on the
// project's 2-core machine (huckel.Solve of a linear polyene): 250 centres 0.04 s and 4 MB,
// 500 centres 0.28 s and 16 MB, 1,000 centres 2.4 s and 61 MB, 2,000 centres 23 s and
// 246 MB; 66,668 centres (the 100 kB SMILES of issue 14) would need about 270 GB and
// ended in a runtime out-of-memory crash. 500 centres keeps one solve well under a
// second, and the cycloaddition analysis solves each partner many times (once per
// reacting unit for localisation energies), so its cost grows faster than n³. Real
// cycloaddition partners have under 60 centres. Above LargeSystemWarn Perceive warns.
const DefaultMaxCentres = 500

// ErrTooManyCentres is wrapped by the error Perceive and Solve return for a π system
// larger than the centre limit. The message names the size and the limit; a command that
// lets the user raise the limit (cyclopair orbitals --max-centres) adds how.
var ErrTooManyCentres = errors.New("π system too large")

// PerceiveOptions adjusts Perceive. The zero value gives Perceive's behaviour.
type PerceiveOptions struct {
	// MaxCentres is the largest number of π centres accepted; 0 (or less) means
	// DefaultMaxCentres. The limit is checked after the atoms are typed and before
	// anything that grows with the centre count is allocated, and it is copied into
	// PiSystem.MaxCentres so that Solve accepts what Perceive accepted.
	MaxCentres int
}

func (o PerceiveOptions) maxCentres() int {
	if o.MaxCentres <= 0 {
		return DefaultMaxCentres
	}
	return o.MaxCentres
}

// tooManyCentres is the error for a π system of n centres over limit; atom is the atom of
// the first centre beyond the limit (-1 for a system not built from a molecule).
func tooManyCentres(m *molecule.Molecule, atom, n, limit int) error {
	msg := fmt.Sprintf("the π system has %d centres, more than the limit of %d; a dense eigen-solve costs O(n³) time and O(n²) memory", n, limit)
	if atom < 0 || m == nil || atom >= len(m.Atoms) {
		return fmt.Errorf("huckel: %w: %s", ErrTooManyCentres, msg)
	}
	return &PerceiveError{Atom: atom, Label: atomLabel(&m.Atoms[atom]), Err: ErrTooManyCentres, Msg: msg}
}

// CheckSize returns an error wrapping ErrTooManyCentres when ps has more centres than
// ps.MaxCentres (DefaultMaxCentres when 0), naming the atom of the first centre beyond
// the limit. Solve calls it before allocating anything that grows with the system; any
// other solver of a PiSystem (an SCF method, say) should do the same.
func (ps *PiSystem) CheckSize() error {
	limit := ps.MaxCentres
	if limit <= 0 {
		limit = DefaultMaxCentres
	}
	if n := len(ps.Centres); n > limit {
		atom := -1
		if ps.Mol != nil {
			atom = ps.Centres[limit].Atom
		}
		return tooManyCentres(ps.Mol, atom, n, limit)
	}
	return nil
}
