package presets

import (
	_ "embed"
	"fmt"
	"strings"
	"sync"

	"cyclopair/huckel/ppp"

	"go.yaml.in/yaml/v3"
)

//go:embed reference/pi-levels.yaml
var piLevelsYAML []byte

// PiLevelEntry is one row of presets/reference/pi-levels.yaml.
type PiLevelEntry struct {
	ID         string  `yaml:"id"`
	Name       string  `yaml:"name"`
	SMILES     string  `yaml:"smiles"`
	Level      string  `yaml:"level"`             // "homo" or "lumo"
	ValueEV    float64 `yaml:"value_eV"`          // the measured quantity as published
	EnergyEV   float64 `yaml:"orbital_energy_eV"` // −IE, +AE or −EA
	Quantity   string  `yaml:"quantity"`
	Source     string  `yaml:"source"`
	Confidence string  `yaml:"confidence"`
	Note       string  `yaml:"note"`
}

var (
	plOnce    sync.Once
	plEntries []PiLevelEntry
	plErr     error
)

// PiLevelEntries returns the π-level reference set: gas-phase π ionisation energies
// (HOMO) and electron affinities / attachment energies (LUMO), each with its source.
func PiLevelEntries() ([]PiLevelEntry, error) {
	plOnce.Do(func() {
		var f struct {
			References []PiLevelEntry `yaml:"references"`
		}
		dec := yaml.NewDecoder(strings.NewReader(string(piLevelsYAML)))
		dec.KnownFields(true)
		if err := dec.Decode(&f); err != nil {
			plErr = fmt.Errorf("presets/reference/pi-levels.yaml: %w", err)
			return
		}
		for _, e := range f.References {
			if e.Level != "homo" && e.Level != "lumo" || e.SMILES == "" || e.Source == "" {
				plErr = fmt.Errorf("presets/reference/pi-levels.yaml: %s: needs level homo|lumo, smiles and source", e.ID)
				return
			}
		}
		plEntries = f.References
	})
	return plEntries, plErr
}

// PiLevelReferences returns PiLevelEntries in the form ppp.Compare takes.
func PiLevelReferences() ([]ppp.Reference, error) {
	es, err := PiLevelEntries()
	if err != nil {
		return nil, err
	}
	out := make([]ppp.Reference, len(es))
	for i, e := range es {
		out[i] = ppp.Reference{ID: e.ID, Name: e.Name, SMILES: e.SMILES, Occupied: e.Level == "homo", EnergyEV: e.EnergyEV, Source: e.Source}
	}
	return out, nil
}
