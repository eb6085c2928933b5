// Package presets holds cyclopair's built-in data — Hückel parameter sets, calibrations,
// named substrates — as YAML files embedded with go:embed, and functions that decode them.
// Every value carries its source in the files; see presets/params/*.yaml.
package presets

import (
	"embed"
	"fmt"
	"io/fs"
	"path"
	"slices"
	"strings"
	"sync"

	"cyclopair/huckel"
)

//go:embed params/*.yaml
var paramFS embed.FS

// DefaultParams is the name of the parameter set used when none is chosen: Van-Catledge's
// (1980) PPP-based values with Streitwieser's (1961) heteroatom model of methyl
// hyperconjugation switched on (see presets/params/vancatledge1980.yaml for the reasons).
const DefaultParams = "vancatledge1980"

var (
	paramOnce sync.Once
	paramSets map[string]*huckel.Params
	paramErr  error
)

func loadParams() {
	paramSets = map[string]*huckel.Params{}
	files, err := fs.Glob(paramFS, "params/*.yaml")
	if err != nil {
		paramErr = err
		return
	}
	raw := map[string]*huckel.Params{}
	for _, f := range files {
		data, err := paramFS.ReadFile(f)
		if err != nil {
			paramErr = err
			return
		}
		p, err := huckel.ParseParams(data, "presets/"+f)
		if err != nil {
			paramErr = err
			return
		}
		want := strings.TrimSuffix(path.Base(f), ".yaml")
		if p.Name != want {
			paramErr = fmt.Errorf("presets/%s: name %q does not match the file name", f, p.Name)
			return
		}
		raw[p.Name] = p
	}
	for name, p := range raw {
		if p.Base == "" {
			paramSets[name] = p
			continue
		}
		base, ok := raw[p.Base]
		if !ok || base.Base != "" {
			paramErr = fmt.Errorf("presets/params/%s.yaml: base %q is not a built-in base set", name, p.Base)
			return
		}
		merged := base.Merge(p)
		merged.Base = p.Base
		paramSets[name] = merged
	}
}

// Params returns a built-in parameter set by name. The returned value is shared: do not
// modify it (use Merge to derive a set). An unknown name gives an error that lists the
// known ones.
func Params(name string) (*huckel.Params, error) {
	paramOnce.Do(loadParams)
	if paramErr != nil {
		return nil, paramErr
	}
	p, ok := paramSets[name]
	if !ok {
		return nil, fmt.Errorf("unknown parameter set %q (known sets: %s; or pass a YAML file)",
			name, strings.Join(ParamNames(), ", "))
	}
	return p, nil
}

// ParamNames lists the built-in parameter sets in sorted order.
func ParamNames() []string {
	paramOnce.Do(loadParams)
	names := make([]string, 0, len(paramSets))
	for n := range paramSets {
		names = append(names, n)
	}
	slices.Sort(names)
	return names
}

// ResolveParams turns a user-supplied parameter file into the set to use: a file with
// replace: true stands alone; otherwise it overrides the entries of its base set (its
// base: key, or DefaultParams when absent).
func ResolveParams(user *huckel.Params) (*huckel.Params, error) {
	if user.Replace {
		return (&huckel.Params{}).Merge(user), nil
	}
	baseName := user.Base
	if baseName == "" {
		baseName = DefaultParams
	}
	base, err := Params(baseName)
	if err != nil {
		return nil, err
	}
	m := base.Merge(user)
	m.Base = baseName
	return m, nil
}
