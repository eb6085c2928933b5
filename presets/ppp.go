package presets

import (
	"embed"
	"fmt"
	"io/fs"
	"path"
	"slices"
	"strings"
	"sync"

	"cyclopair/huckel/ppp"
)

// Built-in PPP-SCF parameter sets (presets/ppp/*.yaml), each value with its source.

//go:embed ppp/*.yaml
var pppFS embed.FS

// DefaultPPP is the PPP parameter set used when none is chosen (see
// presets/ppp/ppp-hinze1962.yaml for the sources and the choice of γ formula).
const DefaultPPP = "ppp-hinze1962"

var (
	pppOnce sync.Once
	pppSets map[string]*ppp.Params
	pppErr  error
)

func loadPPP() {
	pppSets = map[string]*ppp.Params{}
	files, err := fs.Glob(pppFS, "ppp/*.yaml")
	if err != nil {
		pppErr = err
		return
	}
	for _, f := range files {
		data, err := pppFS.ReadFile(f)
		if err != nil {
			pppErr = err
			return
		}
		p, err := ppp.Parse(data, "presets/"+f)
		if err != nil {
			pppErr = err
			return
		}
		if want := strings.TrimSuffix(path.Base(f), ".yaml"); p.Name != want {
			pppErr = fmt.Errorf("presets/%s: name %q does not match the file name", f, p.Name)
			return
		}
		pppSets[p.Name] = p
	}
}

// PPPParams returns a built-in PPP parameter set by name. The value is shared: do not
// modify it (derive sets with Merge or WithCentre).
func PPPParams(name string) (*ppp.Params, error) {
	pppOnce.Do(loadPPP)
	if pppErr != nil {
		return nil, pppErr
	}
	p, ok := pppSets[name]
	if !ok {
		return nil, fmt.Errorf("unknown PPP parameter set %q (known sets: %s; or pass a YAML file)",
			name, strings.Join(PPPNames(), ", "))
	}
	return p, nil
}

// PPPNames lists the built-in PPP parameter sets in sorted order.
func PPPNames() []string {
	pppOnce.Do(loadPPP)
	names := make([]string, 0, len(pppSets))
	for n := range pppSets {
		names = append(names, n)
	}
	slices.Sort(names)
	return names
}

// ResolvePPP turns a user PPP parameter file (ppp.Parse) into the set to use: with
// replace: true it stands alone; otherwise it overrides its base: set (DefaultPPP when
// absent).
func ResolvePPP(user *ppp.Params) (*ppp.Params, error) {
	if user.Replace {
		return (&ppp.Params{}).Merge(user), nil
	}
	base := user.Base
	if base == "" {
		base = DefaultPPP
	}
	b, err := PPPParams(base)
	if err != nil {
		return nil, err
	}
	m := b.Merge(user)
	m.Base = base
	return m, nil
}
