package rate

import (
	"fmt"

	"cyclopair/fmo"
	"cyclopair/presets"
)

// FitKinetics fits the rate model and the ratio model to a kinetics set with opts and the
// default fit options; checksum names the data ("" for none). The reference vector is that
// of DefaultReference computed with opts, so predictions are relative to it whatever data
// the model was fitted on.
func FitKinetics(k *presets.KineticsData, opts *fmo.Options, checksum string) (*Model, error) {
	obs, err := Observe(k, opts)
	if err != nil {
		return nil, err
	}
	m, err := Fit(obs, DefaultFitOptions())
	if err != nil {
		return nil, err
	}
	m.Checksum = checksum
	m.Reference = DefaultReference
	if m.RefVector, err = ReferenceVector(opts); err != nil {
		return nil, err
	}
	regio, endo, err := ObserveRatios(k, opts)
	if err != nil {
		return nil, err
	}
	if len(regio) > 0 || len(endo) > 0 {
		m.Ratios = FitRatios(regio, endo)
	}
	return m, nil
}

// FitBundled fits the model to the bundled kinetics set with the default options (what
// presets/kinetics/model.yaml holds).
func FitBundled() (*Model, error) {
	k, err := presets.Kinetics()
	if err != nil {
		return nil, err
	}
	opts, err := fmo.DefaultOptions()
	if err != nil {
		return nil, err
	}
	return FitKinetics(k, opts, presets.KineticsChecksum())
}

// ReferenceVector computes the descriptor vector of the reference reaction.
func ReferenceVector(opts *fmo.Options) ([NumTerms]float64, error) {
	d, err := fmo.NewPartner("cyclopentadiene", DefaultReference.Diene, fmo.RoleDiene, opts)
	if err != nil {
		return [NumTerms]float64{}, err
	}
	e, err := fmo.NewPartner("acrylonitrile", DefaultReference.Dienophile, fmo.RoleDienophile, opts)
	if err != nil {
		return [NumTerms]float64{}, err
	}
	p, err := fmo.Analyze(d, e, opts)
	if err != nil {
		return [NumTerms]float64{}, fmt.Errorf("reference reaction: %w", err)
	}
	desc, err := FromPair(p, d.Mol)
	if err != nil {
		return [NumTerms]float64{}, err
	}
	return desc.Vector(), nil
}

// ModelHeader is the comment block written at the top of a model file.
const ModelHeader = `# cyclopair rate model: log10 k_rel = Σ coefficient·(descriptor − reference_value), relative
# to the reference reaction below; isomer shares from ΔΔG‡ = slope·Δscore (see fmo/rate).
# Written by the fit, not by hand: bundled file regenerated with
#   go test ./fmo/rate -run TestEmbeddedModel -update
# a user's own file with: cyclopair calibrate --rates RATES.yaml --selectivity SEL.yaml -o model.yaml
`
