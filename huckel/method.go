package huckel

import "cyclopair/huckel/internal/grow"

// Method names carried in Orbitals.Method (and in the "method" key of JSON output).
const (
	MethodHuckel = "huckel" // simple Hückel (this package's Solver)
	MethodPPP    = "ppp"    // Pariser–Parr–Pople SCF (package huckel/ppp)
)

// Method turns a perceived π system into orbitals. *Solver (Hückel) and *ppp.Solver
// implement it, so code that analyses orbitals (frontier levels, coefficients, charges,
// bond orders) can take either without switching on the method; eV figures come from
// Orbitals.LevelEV, which uses the method's own eV when it has them. A Method value keeps
// reusable workspaces and is used by one goroutine at a time.
type Method interface {
	// Name is MethodHuckel or MethodPPP.
	Name() string
	// Solve fills into (reusing its buffers) with the orbitals of ps.
	Solve(ps *PiSystem, into *Orbitals) error
}

// Name returns MethodHuckel.
func (s *Solver) Name() string { return MethodHuckel }

// LevelEV returns the energy of level i in eV: the method's own value when EVDirect
// (PPP-SCF, Koopmans), otherwise c.EV(X, occupied) with the occupied-level map for levels
// holding electrons. It panics if i is out of range.
func (o *Orbitals) LevelEV(i int, c Calibration) float64 {
	l := &o.Levels[i]
	if o.EVDirect {
		return l.EV
	}
	return c.EV(l.X, l.Occupancy > 0)
}

// ResetLevels prepares o to be filled by a method other than this package's Solver: it
// sets Pi, sizes Levels to n = len(ps.Centres) levels whose Coeffs are zeroed slices of
// o's own backing store (reused across calls, like Solver does), and sizes Charges,
// BondOrders (zeroed) and H. Scalar fields and the remaining level fields are left for the
// caller to set.
func (o *Orbitals) ResetLevels(ps *PiSystem) {
	n := len(ps.Centres)
	o.Pi = ps
	o.coef = grow.Slice(o.coef, n*n)
	clear(o.coef)
	if cap(o.Levels) < n {
		o.Levels = make([]Level, n)
	}
	o.Levels = o.Levels[:n]
	for i := range o.Levels {
		o.Levels[i] = Level{Coeffs: o.coef[i*n : (i+1)*n : (i+1)*n]}
	}
	o.Charges = grow.Slice(o.Charges, n)
	o.BondOrders = grow.Slice(o.BondOrders, n*n)
	clear(o.BondOrders)
	o.H = grow.Slice(o.H, n)
	o.Warnings = o.Warnings[:0]
}
