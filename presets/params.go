// Package presets holds cyclopair's built-in data — Hückel parameter sets, calibrations,
// named substrates — as YAML files embedded with go:embed, and functions that decode them.
// Every value carries its source in the files; see presets/params/*.yaml.
package presets

import (
	"embed"
	"fmt"

	"cyclopair/huckel"
)

//go:embed params/*.yaml
var paramFS embed.FS

// DefaultParams is the name of the parameter set used when none is chosen: Van-Catledge's
// (1980) PPP-based values with Streitwieser's (1961) heteroatom model of methyl
// hyperconjugation switched on (see presets/params/vancatledge1980.yaml for the reasons).
const DefaultParams = "vancatledge1980"

var paramSets = &builtinSets[*huckel.Params]{
	fsys: paramFS, dir: "params", kind: "parameter set", def: DefaultParams,
	parse: huckel.ParseParams,
	name:  func(p *huckel.Params) string { return p.Name },
	// A set with a base: key is stored merged onto that base, which must be a built-in set
	// without a base of its own.
	finish: func(name string, p *huckel.Params, raw func(string) (*huckel.Params, error)) (*huckel.Params, error) {
		if p.Base == "" {
			return p, nil
		}
		base, err := raw(p.Base)
		if err != nil || base.Base != "" {
			return nil, fmt.Errorf("presets/params/%s.yaml: base %q is not a built-in base set", name, p.Base)
		}
		merged := base.Merge(p)
		merged.Base = p.Base
		return merged, nil
	},
}

// Params returns a built-in parameter set by name. The returned value is shared: do not
// modify it (use Merge to derive a set). An unknown name gives an error that lists the
// known ones.
func Params(name string) (*huckel.Params, error) { return paramSets.get(name) }

// ParamNames lists the built-in parameter sets in sorted order.
func ParamNames() []string { return paramSets.names() }

// ResolveParams turns a user-supplied parameter file into the set to use: a file with
// replace: true stands alone; otherwise it overrides the entries of its base set (its
// base: key, or DefaultParams when absent).
func ResolveParams(user *huckel.Params) (*huckel.Params, error) {
	return paramSets.resolve(user, user.Replace, user.Base, &huckel.Params{}, func(m *huckel.Params, base string) { m.Base = base })
}
