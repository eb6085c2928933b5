package presets

import (
	"embed"

	"cyclopair/huckel/ppp"
)

// Built-in PPP-SCF parameter sets (presets/ppp/*.yaml), each value with its source.

//go:embed ppp/*.yaml
var pppFS embed.FS

// DefaultPPP is the PPP parameter set used when none is chosen (see
// presets/ppp/ppp-hinze1962.yaml for the sources and the choice of γ formula).
const DefaultPPP = "ppp-hinze1962"

var pppSets = &builtinSets[*ppp.Params]{
	fsys: pppFS, dir: "ppp", kind: "PPP parameter set", def: DefaultPPP,
	parse: ppp.Parse,
	name:  func(p *ppp.Params) string { return p.Name },
}

// PPPParams returns a built-in PPP parameter set by name. The value is shared: do not
// modify it (derive sets with Merge or WithCentre).
func PPPParams(name string) (*ppp.Params, error) { return pppSets.get(name) }

// PPPNames lists the built-in PPP parameter sets in sorted order.
func PPPNames() []string { return pppSets.names() }

// ResolvePPP turns a user PPP parameter file (ppp.Parse) into the set to use: with
// replace: true it stands alone; otherwise it overrides its base: set (DefaultPPP when
// absent).
func ResolvePPP(user *ppp.Params) (*ppp.Params, error) {
	return pppSets.resolve(user, user.Replace, user.Base, &ppp.Params{}, func(m *ppp.Params, base string) { m.Base = base })
}
