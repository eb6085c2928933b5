package presets

import (
	_ "embed"
	"fmt"
	"slices"
	"strings"
	"sync"

	"go.yaml.in/yaml/v3"
)

// Named common substrates (substrates.yaml) and the demo substrate file (demo.yaml).

//go:embed substrates.yaml
var substratesYAML []byte

//go:embed demo.yaml
var demoYAML []byte

// Substrate is one named common substrate.
type Substrate struct {
	Name   string `yaml:"name"`   // the key users type, e.g. "maleic-anhydride"
	SMILES string `yaml:"smiles"` // structure
	Role   string `yaml:"role"`   // usual slot: "diene", "dipole" (both 4π partners) or "dienophile"; a hint only
	Notes  string `yaml:"notes"`  // IUPAC name and handling remarks
}

var (
	subOnce sync.Once
	subList []Substrate
	subErr  error
)

func loadSubstrates() {
	var f struct {
		Substrates []Substrate `yaml:"substrates"`
	}
	dec := yaml.NewDecoder(strings.NewReader(string(substratesYAML)))
	dec.KnownFields(true)
	if err := dec.Decode(&f); err != nil {
		subErr = fmt.Errorf("presets/substrates.yaml: %w", err)
		return
	}
	seen := map[string]bool{}
	for _, s := range f.Substrates {
		switch {
		case s.Name == "" || s.SMILES == "":
			subErr = fmt.Errorf("presets/substrates.yaml: entry %q lacks a name or SMILES", s.Name)
		case seen[s.Name]:
			subErr = fmt.Errorf("presets/substrates.yaml: duplicate name %q", s.Name)
		case s.Role != "diene" && s.Role != "dipole" && s.Role != "dienophile":
			subErr = fmt.Errorf("presets/substrates.yaml: %s: bad role %q", s.Name, s.Role)
		}
		if subErr != nil {
			return
		}
		seen[s.Name] = true
	}
	subList = f.Substrates
}

// Substrates returns the named common substrates in file order. The slice is shared: do not
// modify it. It panics if the embedded file is malformed (a build defect the tests catch).
func Substrates() []Substrate {
	subOnce.Do(loadSubstrates)
	if subErr != nil {
		panic(subErr)
	}
	return subList
}

// LookupSubstrate returns the named substrate. Names are matched case-insensitively, and
// spaces or underscores count as hyphens ("Maleic anhydride" finds "maleic-anhydride").
func LookupSubstrate(name string) (Substrate, bool) {
	key := normalizeName(name)
	for _, s := range Substrates() {
		if s.Name == key {
			return s, true
		}
	}
	return Substrate{}, false
}

// SubstrateNames lists the substrate names in sorted order.
func SubstrateNames() []string {
	var names []string
	for _, s := range Substrates() {
		names = append(names, s.Name)
	}
	slices.Sort(names)
	return names
}

// SuggestSubstrates returns up to n substrate names close to name (sharing its first
// letters or containing it), for "did you mean" hints.
func SuggestSubstrates(name string, n int) []string {
	key := normalizeName(name)
	var out []string
	for _, s := range SubstrateNames() {
		if len(out) == n {
			break
		}
		if key != "" && (strings.Contains(s, key) || strings.Contains(key, s) ||
			(len(key) >= 3 && len(s) >= 3 && s[:3] == key[:3])) {
			out = append(out, s)
		}
	}
	return out
}

func normalizeName(name string) string {
	return strings.Map(func(r rune) rune {
		if r == ' ' || r == '_' {
			return '-'
		}
		return r
	}, strings.ToLower(strings.TrimSpace(name)))
}

// DemoFile returns the embedded demo substrate file (an invented planning scenario) and the
// name to show for it in messages.
func DemoFile() (name string, data []byte) {
	return "presets/demo.yaml", demoYAML
}
