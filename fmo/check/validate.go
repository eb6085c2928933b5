package check

import (
	"fmt"
	"math"
	"strings"

	"cyclopair/fmo"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// unmapped parses a case SMILES and removes its atom maps (so they do not pin the reacting
// units), returning the molecule and map number → atom index.
func unmapped(p CasePartner) (*molecule.Molecule, map[int]int, error) {
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
	m.Name = p.Name
	if len(maps) > 0 {
		m.Source = smiles.Write(m)
	}
	return m, maps, nil
}

// Case statuses in a ValidationReport.
const (
	StatusHit           = "hit"            // the engine reproduces the observation
	StatusMiss          = "miss"           // it does not, and the case records no known miss: a regression
	StatusKnownMiss     = "known miss"     // it does not, as recorded (reason in KnownMiss)
	StatusUnexpectedHit = "unexpected hit" // it does, although the case records a known miss
	StatusError         = "error"          // the case could not be analysed
)

// CaseResult is the outcome of one case.
type CaseResult struct {
	ID         string `json:"id"`
	Category   string `json:"category"`
	Diene      string `json:"diene"`
	Dienophile string `json:"dienophile"`
	Activation string `json:"activation"`
	Expected   string `json:"expected"`
	Got        string `json:"got"`
	Hit        bool   `json:"hit"`
	Status     string `json:"status"`
	KnownMiss  string `json:"known_miss,omitempty"`
	// Product is "match" or "differs" when the case gives an expected product, else "".
	Product    string  `json:"product,omitempty"`
	GotProduct string  `json:"got_product,omitempty"`
	Margin     float64 `json:"margin"` // regio or site margin of the preferred orientation, |β| (0 for other categories)
	Error      string  `json:"error,omitempty"`
	Source     string  `json:"source"`
	Confidence string  `json:"confidence"`
}

// Agrees reports whether the result is what the check set records (a hit, or a recorded
// known miss).
func (r CaseResult) Agrees() bool { return r.Status == StatusHit || r.Status == StatusKnownMiss }

// CategoryScore counts one category.
type CategoryScore struct {
	Category       string `json:"category"`
	Hits           int    `json:"hits"`
	Total          int    `json:"total"`
	KnownMisses    int    `json:"known_misses"`
	Misses         int    `json:"misses"`          // unrecorded misses (regressions)
	UnexpectedHits int    `json:"unexpected_hits"` // recorded misses that now hit
	Errors         int    `json:"errors"`
}

// SeriesPoint is one member of a series with the engine's figure.
type SeriesPoint struct {
	Name   string  `json:"name"`
	K      float64 `json:"k"`
	Log10K float64 `json:"log10_k"`
	Figure float64 `json:"figure"` // the reactivity figure (larger = predicted faster)
	Gap    float64 `json:"gap_normal"`
	Stab   float64 `json:"stabilization"`
}

// SeriesResult is the rank correlation of one series.
type SeriesResult struct {
	ID         string        `json:"id"`
	Name       string        `json:"name"`
	Figure     string        `json:"figure"`
	Rho        float64       `json:"rho"` // Spearman ρ between log k and the figure
	MinRho     float64       `json:"min_rho"`
	Pass       bool          `json:"pass"`
	KnownMiss  string        `json:"known_miss,omitempty"`
	Points     []SeriesPoint `json:"points"`
	Error      string        `json:"error,omitempty"`
	Source     string        `json:"source"`
	Confidence string        `json:"confidence"`
}

// ValidationReport is the result of running a check set.
type ValidationReport struct {
	File        string          `json:"file"`
	Params      string          `json:"params"`
	Method      string          `json:"method"` // π method of every partner ("huckel" or "ppp")
	Calibration string          `json:"calibration"`
	Categories  []CategoryScore `json:"categories"`
	Products    [2]int          `json:"products"` // [matching, checked] expected products
	Cases       []CaseResult    `json:"cases"`
	Series      []SeriesResult  `json:"series"`
}

// Agrees reports whether every case and series came out as the check set records.
func (r *ValidationReport) Agrees() bool {
	for _, c := range r.Cases {
		if !c.Agrees() {
			return false
		}
	}
	for _, s := range r.Series {
		if s.Error != "" || s.Pass == (s.KnownMiss != "") {
			return false
		}
	}
	return true
}

// Validate runs every case and series of set with opts. A case that cannot be analysed is
// reported with StatusError and the run goes on. Cases are evaluated in file order.
func Validate(set *CheckSet, opts *fmo.Options) *ValidationReport {
	rep := &ValidationReport{File: set.File, Params: opts.Params.Name, Method: opts.MethodName(), Calibration: opts.CalibrationName}
	score := map[string]*CategoryScore{}
	for _, c := range Categories() {
		score[c] = &CategoryScore{Category: c}
	}
	for _, c := range set.Cases {
		r := runCase(c, opts)
		s := score[c.Category]
		s.Total++
		switch r.Status {
		case StatusHit:
			s.Hits++
		case StatusMiss:
			s.Misses++
		case StatusKnownMiss:
			s.KnownMisses++
		case StatusUnexpectedHit:
			s.Hits++
			s.UnexpectedHits++
		case StatusError:
			s.Errors++
		}
		if r.Product != "" {
			rep.Products[1]++
			if r.Product == "match" {
				rep.Products[0]++
			}
		}
		rep.Cases = append(rep.Cases, r)
	}
	for _, c := range Categories() {
		if score[c].Total > 0 {
			rep.Categories = append(rep.Categories, *score[c])
		}
	}
	for _, s := range set.Series {
		rep.Series = append(rep.Series, runSeries(s, opts))
	}
	return rep
}

func runCase(c Case, opts *fmo.Options) CaseResult {
	r, _ := runCasePair(c, opts)
	return r
}

// runCasePair runs one case and also returns the engine's pair (nil when the case could
// not be analysed).
func runCasePair(c Case, opts *fmo.Options) (CaseResult, *fmo.Pair) {
	r := CaseResult{ID: c.ID, Category: c.Category, Diene: c.Diene.Name, Dienophile: c.Dienophile.Name,
		Activation: c.Activation, Source: c.Source, Confidence: c.Confidence, KnownMiss: c.KnownMiss}
	if r.Activation == "" {
		r.Activation = fmo.ActivateNone
	}
	r.Expected = describeExpect(c)
	errOut := func(err error) (CaseResult, *fmo.Pair) {
		r.Status, r.Error = StatusError, err.Error()
		return r, nil
	}
	dm, dmap, err := unmapped(c.Diene)
	if err != nil {
		return errOut(fmt.Errorf("diene: %w", err))
	}
	em, emap, err := unmapped(c.Dienophile)
	if err != nil {
		return errOut(fmt.Errorf("dienophile: %w", err))
	}
	dp, err := fmo.NewPartnerFromMolecule(c.Diene.Name, dm, fmo.RoleDiene, opts)
	if err != nil {
		return errOut(err)
	}
	ep, err := fmo.NewPartnerFromMolecule(c.Dienophile.Name, em, fmo.RoleDienophile, opts)
	if err != nil {
		return errOut(err)
	}
	if r.Activation != fmo.ActivateNone {
		if ep, err = ep.WithActivation(r.Activation, nil, opts); err != nil {
			return errOut(err)
		}
	}
	pair, err := fmo.Analyze(dp, ep, opts)
	if err != nil {
		return errOut(err)
	}
	best := pair.Orientations[0]
	dInv, eInv := invert(dmap), invert(emap)
	e := c.Expect
	switch c.Category {
	case CategoryRegio:
		want := make([][2]int, 0, 2)
		for _, b := range e.Bonds {
			want = append(want, [2]int{dmap[b[0]], emap[b[1]]})
		}
		got := [][2]int{best.Bonds[0], best.Bonds[1]}
		r.Hit = sameBondSet(want, got)
		r.Got = "bonds " + bondText(got, dInv, eInv)
		if best.Label != "" {
			r.Got += " (" + best.Label + ")"
		}
		r.Margin = pair.RegioMargin
	case CategorySite:
		ok := true
		var parts []string
		if len(e.DieneAtoms) > 0 {
			want := mapIdx(e.DieneAtoms, dmap)
			got := []int{best.Bonds[0][0], best.Bonds[1][0]}
			ok = ok && sameSet(want, got)
			parts = append(parts, "diene atoms "+atomsText(got, dInv))
		}
		if len(e.DienophileAtoms) > 0 {
			want := mapIdx(e.DienophileAtoms, emap)
			got := []int{best.Bonds[0][1], best.Bonds[1][1]}
			ok = ok && sameSet(want, got)
			parts = append(parts, "dienophile atoms "+atomsText(got, eInv))
		}
		// Atom maps name one site; a symmetry-equivalent site (either C=C of a quinone) builds
		// the same adduct, so a case that also gives the observed product counts the product.
		if !ok && e.Product != "" && sameMolecule(e.Product, best.Product) {
			ok = true
		}
		r.Hit = ok
		r.Got = strings.Join(parts, ", ") + " (" + best.Site + ")"
		r.Margin = pair.SiteMargin
	case CategoryEndo:
		engineEndo := pair.Endo == "yes" || pair.Endo == "weak"
		r.Hit = engineEndo == (e.Endo == "endo")
		r.Got = fmt.Sprintf("endo %s (secondary term %.4f |β|)", pair.Endo, best.EndoOverlap)
	case CategoryDemand:
		r.Hit = pair.Demand == e.Demand && (e.Sustmann == "" || pair.SustmannType == e.Sustmann)
		r.Got = fmt.Sprintf("%s, type %s (gap normal %.3f, inverse %.3f |β|)", pair.Demand, pair.SustmannType, pair.GapNormal.Beta, pair.GapInverse.Beta)
	}
	if e.Product != "" {
		r.GotProduct = best.Product
		if sameMolecule(e.Product, best.Product) {
			r.Product = "match"
		} else {
			r.Product = "differs"
		}
	}
	switch {
	case r.Hit && c.KnownMiss == "":
		r.Status = StatusHit
	case r.Hit:
		r.Status = StatusUnexpectedHit
	case c.KnownMiss != "":
		r.Status = StatusKnownMiss
	default:
		r.Status = StatusMiss
	}
	return r, pair
}

func describeExpect(c Case) string {
	e := c.Expect
	switch c.Category {
	case CategoryRegio:
		s := "bonds " + bondText(e.Bonds, nil, nil)
		if e.Label != "" {
			s += " (" + e.Label + ")"
		}
		return s
	case CategorySite:
		var parts []string
		if len(e.DieneAtoms) > 0 {
			parts = append(parts, "diene atoms "+atomsText(e.DieneAtoms, nil))
		}
		if len(e.DienophileAtoms) > 0 {
			parts = append(parts, "dienophile atoms "+atomsText(e.DienophileAtoms, nil))
		}
		return strings.Join(parts, ", ")
	case CategoryEndo:
		return e.Endo
	case CategoryDemand:
		if e.Sustmann != "" {
			return e.Demand + ", type " + e.Sustmann
		}
		return e.Demand
	}
	return ""
}

func runSeries(s Series, opts *fmo.Options) SeriesResult {
	r := SeriesResult{ID: s.ID, Name: s.Name, Figure: s.Figure, MinRho: s.MinRho, KnownMiss: s.KnownMiss,
		Source: s.Source, Confidence: s.Confidence}
	dm, _, err := unmapped(s.Diene)
	if err != nil {
		r.Error = err.Error()
		return r
	}
	dp, err := fmo.NewPartnerFromMolecule(s.Diene.Name, dm, fmo.RoleDiene, opts)
	if err != nil {
		r.Error = err.Error()
		return r
	}
	var logk, fig []float64
	for _, m := range s.Members {
		em, _, err := unmapped(CasePartner{Name: m.Name, SMILES: m.SMILES})
		if err != nil {
			r.Error = m.Name + ": " + err.Error()
			return r
		}
		ep, err := fmo.NewPartnerFromMolecule(m.Name, em, fmo.RoleDienophile, opts)
		if err != nil {
			r.Error = err.Error()
			return r
		}
		pair, err := fmo.Analyze(dp, ep, opts)
		if err != nil {
			r.Error = err.Error()
			return r
		}
		pt := SeriesPoint{Name: m.Name, K: m.K, Log10K: math.Log10(m.K), Gap: pair.GapNormal.Beta,
			Stab: pair.Orientations[0].Stabilization}
		switch s.Figure {
		case FigureGapNormal:
			pt.Figure = -pt.Gap
		case FigureStabilization:
			pt.Figure = pt.Stab
		}
		r.Points = append(r.Points, pt)
		logk = append(logk, pt.Log10K)
		fig = append(fig, pt.Figure)
	}
	r.Rho = Spearman(logk, fig)
	r.Pass = r.Rho >= s.MinRho
	return r
}
