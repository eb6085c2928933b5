package presets

import (
	_ "embed"
	"fmt"
	"sync"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"

	"go.yaml.in/yaml/v3"
)

//go:embed calibration/points.yaml
var calibrationYAML []byte

// CalibrationEntry is one reference point of presets/calibration/points.yaml.
type CalibrationEntry struct {
	ID         string  `yaml:"id"`
	Name       string  `yaml:"name"`
	SMILES     string  `yaml:"smiles"`
	Level      string  `yaml:"level"`             // "homo" or "lumo"
	EnergyEV   float64 `yaml:"orbital_energy_eV"` // −IE or −EA
	ValueEV    float64 `yaml:"value_eV"`          // the measured quantity as published
	Quantity   string  `yaml:"quantity"`
	Source     string  `yaml:"source"`
	Confidence string  `yaml:"confidence"`
	Note       string  `yaml:"note"`
	Use        *bool   `yaml:"use"` // false: kept for reference, not fitted
	WhyNot     string  `yaml:"why_not"`
}

// CalibrationSource describes the data behind the default calibration.
const CalibrationSource = "presets/calibration/points.yaml: gas-phase IE (NIST WebBook evaluated values) and ETS attachment energies / EAs, sources per entry"

var (
	calOnce    sync.Once
	calEntries []CalibrationEntry
	calErr     error
	calCache   sync.Map // *huckel.Params -> huckel.Calibration
)

// CalibrationEntries returns the reference points (including those marked use: false).
func CalibrationEntries() ([]CalibrationEntry, error) {
	calOnce.Do(func() {
		var f struct {
			Points []CalibrationEntry `yaml:"points"`
		}
		if err := yaml.Unmarshal(calibrationYAML, &f); err != nil {
			calErr = fmt.Errorf("presets/calibration/points.yaml: %w", err)
			return
		}
		calEntries = f.Points
	})
	return calEntries, calErr
}

// Calibration fits the default x → eV calibration for parameter set p: every usable point
// is perceived and solved with p, and huckel.FitCalibration fits the occupied and empty
// maps. Results for the same *Params are cached. A point that p cannot perceive is skipped
// (the count is in Calibration.N).
func Calibration(p *huckel.Params) (huckel.Calibration, error) {
	if c, ok := calCache.Load(p); ok {
		return c.(huckel.Calibration), nil
	}
	entries, err := CalibrationEntries()
	if err != nil {
		return huckel.Calibration{}, err
	}
	var pts []huckel.CalibrationPoint
	var s huckel.Solver
	var o huckel.Orbitals
	for _, e := range entries {
		if e.Use != nil && !*e.Use {
			continue
		}
		m, err := smiles.Parse(e.SMILES)
		if err != nil {
			return huckel.Calibration{}, fmt.Errorf("presets/calibration/points.yaml: %s: %w", e.ID, err)
		}
		ps, err := huckel.Perceive(m, p)
		if err != nil {
			continue
		}
		if err := s.Solve(ps, &o); err != nil {
			continue
		}
		occ := e.Level == "homo"
		idx := o.LUMO
		if occ {
			idx = o.HOMO
		}
		if idx < 0 {
			continue
		}
		pts = append(pts, huckel.CalibrationPoint{ID: e.ID, Name: e.Name, SMILES: e.SMILES,
			Occupied: occ, X: o.Levels[idx].X, EnergyEV: e.EnergyEV})
	}
	c, err := huckel.FitCalibration(pts)
	if err != nil {
		return c, err
	}
	c.Name = "default-" + p.Name
	c.Source = CalibrationSource
	calCache.Store(p, c)
	return c, nil
}
