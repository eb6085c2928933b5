package rate

import (
	"fmt"
	"math"

	"cyclopair/fmo"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// RatioModel turns score differences into isomer ratios:
//
//	ΔΔG‡(regio) = RegioSlope · Δscore        (kcal/mol; Δscore between the two orientations at the preferred units, |β|)
//	ΔΔG‡(endo)  = EndoSlope · endo_overlap    (kcal/mol; the secondary-orbital term of the preferred orientation, |β|)
//	share       = 1 / (1 + exp(−ΔΔG‡ / RT))   at the stated temperature
//
// Both slopes are fitted through the origin to the bundled selectivity set (kinetic entries
// only); single-isomer entries are censored observations: a lower bound CensorKcal on ΔΔG‡
// that costs only when the prediction falls short of it. The residual scatter gives the
// intervals.
type RatioModel struct {
	RegioSlope     float64 `yaml:"regio_kcal_per_beta"`
	RegioSE        float64 `yaml:"regio_slope_se"`
	RegioResid     float64 `yaml:"regio_residual_kcal"`
	RegioMAE       float64 `yaml:"regio_mae_kcal"`          // mean |ΔΔG‡ error| over numeric regio ratios, leave-one-out
	RegioBaseMAE   float64 `yaml:"regio_baseline_mae_kcal"` // the same for "no preference" (ΔΔG‡ = 0)
	RegioNumeric   int     `yaml:"regio_numeric"`
	RegioCensored  int     `yaml:"regio_censored"`
	RegioCensorMet int     `yaml:"regio_censored_consistent"` // single-isomer entries predicted at or beyond the bound
	EndoSlope      float64 `yaml:"endo_kcal_per_beta"`
	EndoSE         float64 `yaml:"endo_slope_se"`
	EndoResid      float64 `yaml:"endo_residual_kcal"`
	EndoMAE        float64 `yaml:"endo_mae_kcal"`
	EndoBaseMAE    float64 `yaml:"endo_baseline_mae_kcal"`
	EndoNumeric    int     `yaml:"endo_numeric"`
	EndoCensored   int     `yaml:"endo_censored"`
	EndoCensorMet  int     `yaml:"endo_censored_consistent"`
	CensorKcal     float64 `yaml:"censor_bound_kcal"`
}

// CensorKcal: a single reported isomer is read as at least 95:5 at 25 °C (1.74 kcal/mol),
// the usual detection limit of the NMR or GC analyses of the time (common practice, no source).
const CensorKcal = 1.74

// rcal is R in kcal/(mol K).
const rcal = 0.0019872

// RatioObs is one selectivity entry with the model's quantity x (Δscore or endo term).
type RatioObs struct {
	ID       string
	X        float64 // Δscore(major − minor) or endo term, |β|
	DDG      float64 // measured ΔΔG‡, kcal/mol (NaN when censored)
	Censored bool
	Unc      float64 // of DDG, kcal/mol
}

func ddgFromLog(l10, tempC float64) float64 { return math.Ln10 * rcal * (tempC + 273.15) * l10 }

// ObserveRatios computes the model quantities of every kinetic selectivity entry.
func ObserveRatios(k *presets.KineticsData, opts *fmo.Options) (regio, endo []RatioObs, err error) {
	for _, e := range k.Regio {
		dm, dmap, err := unmapped(e.Diene)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", e.ID, err)
		}
		em, emap, err := unmapped(e.Dienophile)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", e.ID, err)
		}
		p, err := analyze(e.Diene.Name, dm, e.Dienophile.Name, em, e.Activation, opts)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", e.ID, err)
		}
		maj, min := find(p, e.Major.Bonds, dmap, emap), find(p, e.Minor.Bonds, dmap, emap)
		if maj == nil || min == nil {
			return nil, nil, fmt.Errorf("%s: the analysis has no orientation with the recorded bonds", e.ID)
		}
		t := 25.0
		if e.HasTemperature {
			t = e.TemperatureC
		}
		o := RatioObs{ID: e.ID, X: maj.Score - min.Score, Censored: e.Single, DDG: math.NaN()}
		if !e.Single {
			o.DDG = ddgFromLog(e.Log10Ratio, t)
			o.Unc = ddgFromLog(e.UncertaintyLog10, t)
		}
		regio = append(regio, o)
	}
	for _, e := range k.Endo {
		if e.Control != "kinetic" {
			continue // thermodynamic ratios are outside a kinetic model
		}
		dm, err := smiles.Parse(e.Diene.SMILES)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", e.ID, err)
		}
		em, err := smiles.Parse(e.Dienophile.SMILES)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", e.ID, err)
		}
		p, err := analyze(e.Diene.Name, dm, e.Dienophile.Name, em, e.Activation, opts)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", e.ID, err)
		}
		t := 25.0
		if e.HasTemperature {
			t = e.TemperatureC
		}
		o := RatioObs{ID: e.ID, X: p.Orientations[0].EndoOverlap, DDG: math.NaN()}
		switch e.Single {
		case "endo":
			o.Censored = true
		case "exo":
			continue // no kinetic exo-only entry is bundled; a lower bound on the exo side is not modelled
		default:
			o.DDG = ddgFromLog(e.Log10EndoExo, t)
			o.Unc = ddgFromLog(e.UncertaintyLog10, t)
		}
		endo = append(endo, o)
	}
	return regio, endo, nil
}

func unmapped(p presets.KineticsPartner) (*molecule.Molecule, map[int]int, error) {
	m, err := smiles.Parse(p.SMILES)
	if err != nil {
		return nil, nil, err
	}
	maps := map[int]int{}
	for i := range m.Atoms {
		if n := m.Atoms[i].Map; n != 0 {
			maps[n] = i
			m.Atoms[i].Map = 0
		}
	}
	if len(maps) > 0 {
		m.Source = smiles.Write(m)
	}
	return m, maps, nil
}

func analyze(dn string, dm *molecule.Molecule, en string, em *molecule.Molecule, mode string, opts *fmo.Options) (*fmo.Pair, error) {
	dm.Name, em.Name = dn, en
	dp, err := fmo.NewPartnerFromMolecule(dn, dm, fmo.RoleDiene, opts)
	if err != nil {
		return nil, err
	}
	ep, err := fmo.NewPartnerFromMolecule(en, em, fmo.RoleDienophile, opts)
	if err != nil {
		return nil, err
	}
	if mode != "" && mode != fmo.ActivateNone {
		if ep, err = ep.WithActivation(mode, nil, opts); err != nil {
			return nil, err
		}
	}
	return fmo.Analyze(dp, ep, opts)
}

func find(p *fmo.Pair, bonds [][2]int, dmap, emap map[int]int) *fmo.Orientation {
	for i := range p.Orientations {
		o := &p.Orientations[i]
		n := 0
		for _, b := range bonds {
			w := [2]int{dmap[b[0]], emap[b[1]]}
			if o.Bonds[0] == w || o.Bonds[1] == w {
				n++
			}
		}
		if n == len(bonds) {
			return o
		}
	}
	return nil
}

// fitSlope fits ΔΔG‡ = a·x through the origin: numeric entries by least squares, censored
// ones as lower bounds (a hinge that costs only below the bound), by a few active-set passes.
// It returns a, its standard error and the residual SD over the numeric entries.
func fitSlope(obs []RatioObs, skip int) (a, se, resid float64) {
	active := map[int]bool{}
	for range 20 {
		var sxx, sxy float64
		n := 0
		for i, o := range obs {
			if i == skip {
				continue
			}
			y := o.DDG
			if o.Censored {
				if !active[i] {
					continue
				}
				y = CensorKcal
			}
			sxx += o.X * o.X
			sxy += o.X * y
			n++
		}
		if sxx == 0 {
			return 0, 0, 0
		}
		a = sxy / sxx
		changed := false
		for i, o := range obs {
			if i == skip || !o.Censored {
				continue
			}
			if short := a*o.X < CensorKcal; short != active[i] {
				active[i], changed = short, true
			}
		}
		if !changed {
			var ss, sxx2 float64
			m := 0
			for i, o := range obs {
				if i == skip || (o.Censored && !active[i]) {
					continue
				}
				y := o.DDG
				if o.Censored {
					y = CensorKcal
				}
				ss += (y - a*o.X) * (y - a*o.X)
				sxx2 += o.X * o.X
				m++
			}
			if m > 1 {
				resid = math.Sqrt(ss / float64(m-1))
				se = resid / math.Sqrt(sxx2)
			}
			return a, se, resid
		}
	}
	return a, se, resid
}

// FitRatios fits both slopes and their leave-one-out errors.
func FitRatios(regio, endo []RatioObs) RatioModel {
	var m RatioModel
	m.CensorKcal = CensorKcal
	m.RegioSlope, m.RegioSE, m.RegioResid = fitSlope(regio, -1)
	m.EndoSlope, m.EndoSE, m.EndoResid = fitSlope(endo, -1)
	loo := func(obs []RatioObs, full float64) (mae, base float64, num, cens, met int) {
		for i, o := range obs {
			if o.Censored {
				cens++
				if full*o.X >= CensorKcal {
					met++
				}
				continue
			}
			a, _, _ := fitSlope(obs, i)
			mae += math.Abs(a*o.X - o.DDG)
			base += math.Abs(o.DDG)
			num++
		}
		if num > 0 {
			mae /= float64(num)
			base /= float64(num)
		}
		return
	}
	m.RegioMAE, m.RegioBaseMAE, m.RegioNumeric, m.RegioCensored, m.RegioCensorMet = loo(regio, m.RegioSlope)
	m.EndoMAE, m.EndoBaseMAE, m.EndoNumeric, m.EndoCensored, m.EndoCensorMet = loo(endo, m.EndoSlope)
	for _, p := range []*float64{&m.RegioSlope, &m.RegioSE, &m.RegioResid, &m.RegioMAE, &m.RegioBaseMAE,
		&m.EndoSlope, &m.EndoSE, &m.EndoResid, &m.EndoMAE, &m.EndoBaseMAE} {
		*p = r(*p)
	}
	return m
}

// Share returns the share of the favoured isomer for ΔΔG‡ ddg (kcal/mol) at tempC.
func Share(ddg, tempC float64) float64 {
	return 1 / (1 + math.Exp(-ddg/(rcal*(tempC+273.15))))
}

// ratioInterval is the 90 % interval of ΔΔG‡ = a·x: t·sqrt(resid² + x²·se²), with the normal
// quantile 1.645 (the selectivity set is small; the interval is a guide).
func ratioInterval(a, se, resid, x float64) (lo, hi float64) {
	half := 1.645 * math.Sqrt(resid*resid+x*x*se*se)
	return a*x - half, a*x + half
}

func (m *RatioModel) annotate(p *fmo.Pair, tempC float64) {
	p.RatioTemperatureC = tempC
	if len(p.Orientations) == 0 {
		return
	}
	best := &p.Orientations[0]
	same := func(o *fmo.Orientation) bool {
		return sameSet(o.DieneAtoms, best.DieneAtoms) && sameSet(o.DienophileAtoms, best.DienophileAtoms)
	}
	var den float64
	rt := rcal * (tempC + 273.15)
	for i := range p.Orientations {
		o := &p.Orientations[i]
		o.Fraction = 0
		if same(o) {
			den += math.Exp(m.RegioSlope * (o.Score - best.Score) / rt)
		}
	}
	var other *fmo.Orientation
	for i := range p.Orientations {
		o := &p.Orientations[i]
		if same(o) {
			o.Fraction = round6(math.Exp(m.RegioSlope*(o.Score-best.Score)/rt) / den)
			if i > 0 && other == nil {
				other = o
			}
		}
	}
	if other != nil {
		lo, hi := ratioInterval(m.RegioSlope, m.RegioSE, m.RegioResid, best.Score-other.Score)
		iv := [2]float64{round6(Share(lo, tempC)), round6(Share(hi, tempC))}
		p.FractionInterval = &iv
	}
	if p.EndoNote == "" && best.Kind == "[4+2]" {
		ddg := m.EndoSlope * best.EndoOverlap
		f := round6(Share(ddg, tempC))
		p.EndoFraction = &f
		lo, hi := ratioInterval(m.EndoSlope, m.EndoSE, m.EndoResid, best.EndoOverlap)
		iv := [2]float64{round6(Share(lo, tempC)), round6(Share(hi, tempC))}
		p.EndoFractionInterval = &iv
	}
}

func sameSet(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for _, x := range a {
		found := false
		for _, y := range b {
			if x == y {
				found = true
			}
		}
		if !found {
			return false
		}
	}
	return true
}
