package ppp

import "cyclopair/huckel"

// Scale returns the exact x → eV map of this parameter set's levels, ε = α_C + x·β₀ on
// both branches (huckel.Calibration with Direct set): Solve stores X = (ε − α_C)/β₀ on
// every level, so code that converts x to eV through a huckel.Calibration (the pair
// analysis, the pictures, the reports) gets the Koopmans energies back unchanged, with no
// fitted calibration. Its Detail reads huckel.DirectDetail.
func (p *Params) Scale() huckel.Calibration {
	return huckel.DirectScale("koopmans-"+p.Name, p.AlphaEV(), p.Beta0,
		"Koopmans' theorem on the PPP-SCF orbital energies of parameter set "+p.Name)
}

// Factory returns a function that builds a new Solver for p each call: the form
// fmo.Options.NewMethod takes, so every goroutine that builds partners gets its own
// workspaces.
func Factory(p *Params) func() huckel.Method {
	return func() huckel.Method { return NewSolver(p) }
}
