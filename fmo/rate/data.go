package rate

import (
	"errors"
	"fmt"

	"cyclopair/fmo"
	"cyclopair/presets"
)

// Observation is one rate row of a kinetics set with its descriptors.
type Observation struct {
	Series     string  // series id
	SeriesKind string  // "series" or "set"
	Varied     string  // what the series varies
	Name       string  // the varied partner's name (with the activation when not none)
	Log10KRel  float64 // measured, relative to the series' reference row
	Unc        float64 // uncertainty of Log10KRel as entered
	Ref        bool    // the series' reference row
	D          Descriptors
}

// SeriesObs is one series of observations; Ref indexes its reference row in Rows.
type SeriesObs struct {
	ID, Kind, Varied, Title, Source string
	// OutsideModel is the data file's reason for listing the series without fitting it
	// ("" for a fitted series).
	OutsideModel string
	Rows         []Observation
	Ref          int
}

// InModel reports whether the series enters the fit and the statistics: a series varying
// only the solvent is outside the model (it has no solvent term), and so is one the data
// file marks outside_model (its rows differ in something the descriptors cannot represent);
// both are listed and predicted, not fitted.
func (s *SeriesObs) InModel() bool { return s.Varied != "solvent" && s.OutsideModel == "" }

// OutsideReason says in a few words why a series is not fitted ("" when it is).
func (s *SeriesObs) OutsideReason() string {
	switch {
	case s.OutsideModel != "":
		return s.OutsideModel
	case s.Varied == "solvent":
		return "solvent only"
	}
	return ""
}

// partnerCache builds each (SMILES, role, activation) partner once.
type partnerCache struct {
	opts *fmo.Options
	m    map[string]*fmo.Partner
}

func (c *partnerCache) get(name, smi string, role fmo.Role, mode string) (*fmo.Partner, error) {
	key := fmt.Sprintf("%d|%s|%s", role, smi, mode)
	if p, ok := c.m[key]; ok {
		return p, nil
	}
	var p *fmo.Partner
	if mode != "" && mode != fmo.ActivateNone {
		free, err := c.get(name, smi, role, fmo.ActivateNone)
		if err != nil {
			return nil, err
		}
		if p, err = free.WithActivation(mode, nil, c.opts); err != nil {
			return nil, err
		}
	} else {
		var err error
		if p, err = fmo.NewPartner(name, smi, role, c.opts); err != nil {
			return nil, err
		}
	}
	c.m[key] = p
	return p, nil
}

// Observe computes the descriptors of every rate row of k with opts. Every row must be
// analysable: an error names the series and row.
func Observe(k *presets.KineticsData, opts *fmo.Options) ([]SeriesObs, error) {
	c := &partnerCache{opts: opts, m: map[string]*fmo.Partner{}}
	var out []SeriesObs
	for si := range k.Series {
		s := &k.Series[si]
		so := SeriesObs{ID: s.ID, Kind: s.Kind, Varied: s.Varied, Title: s.Title, Source: s.Source, Ref: s.RefIndex,
			OutsideModel: s.OutsideModel}
		for _, r := range s.Rows {
			dn, en := s.Pair(r)
			d, err := c.get(dn.Name, dn.SMILES, fmo.RoleDiene, fmo.ActivateNone)
			if err != nil {
				return nil, fmt.Errorf("%s: %s: %w", s.ID, r.Partner.Name, err)
			}
			e, err := c.get(en.Name, en.SMILES, fmo.RoleDienophile, r.Activation)
			if err != nil {
				return nil, fmt.Errorf("%s: %s (%s): %w", s.ID, r.Partner.Name, r.Activation, err)
			}
			p, err := fmo.Analyze(d, e, opts)
			if err != nil {
				return nil, fmt.Errorf("%s: %s: %w", s.ID, r.Partner.Name, err)
			}
			desc, err := FromPair(p, d.Mol)
			if err != nil {
				return nil, fmt.Errorf("%s: %s: %w", s.ID, r.Partner.Name, err)
			}
			name := r.Partner.Name
			if r.Activation != "" && r.Activation != fmo.ActivateNone {
				name += " (" + r.Activation + ")"
			}
			if s.Varied == "solvent" {
				name += " in " + r.Solvent
			}
			so.Rows = append(so.Rows, Observation{Series: s.ID, SeriesKind: s.Kind, Varied: s.Varied, Name: name,
				Log10KRel: r.Log10KRel, Unc: r.UncertaintyLog10, D: desc})
		}
		so.Rows[so.Ref].Ref = true
		out = append(out, so)
	}
	if len(out) == 0 {
		return nil, errors.New("rate: no series")
	}
	return out, nil
}
