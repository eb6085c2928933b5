package fmo

import (
	"fmt"

	"cyclopair/huckel"
	"cyclopair/presets"
)

// EVScale converts an orbital energy x (E = α + xβ) to eV. occupied selects the branch for
// occupied levels (fitted to ionisation energies) or empty levels (fitted to electron
// affinities) when the calibration has two.
type EVScale interface {
	EV(x float64, occupied bool) float64
}

// Options are the knobs of the pair analysis. Use DefaultOptions and change what you need;
// every constant used is reported in the Pair so outputs are self-describing.
type Options struct {
	// MaxCentres caps the π centres of each partner (0: DefaultMaxPairCentres). Above it
	// NewPartner fails with an error wrapping huckel.ErrTooManyCentres.
	MaxCentres int
	// Params is the Hückel parameter set (h and k values, alkyl model).
	Params *huckel.Params
	// Calibration converts x to eV; CalibrationName names it in every Pair.
	Calibration     EVScale
	CalibrationName string
	// NewMethod builds the π method that solves each partner (a new value per call: a
	// huckel.Method keeps workspaces and serves one goroutine). nil means simple Hückel
	// (huckel.Solver). Everything downstream reads the resulting huckel.Orbitals (levels
	// on the x scale, coefficients, charges) and does not depend on the method; pair it
	// with the method's eV map in Calibration (ppp.Params.Scale for PPP-SCF).
	// The localisation energy stays a Hückel quantity under every method (see
	// Partner.localization).
	NewMethod func() huckel.Method

	// FormingBeta γ is the resonance integral of each forming σ bond, in units of β.
	// Default 0.3: the forming bonds of a cycloaddition transition state are long (about
	// 2.2 Å against 1.40 Å for a π bond) and the overlap of the two p lobes there is a few
	// tenths of a π bond's; judgement, common practice in FMO treatments, no source. Orbital
	// terms scale as γ², so regio- and site-rankings within the second-order regime do not
	// depend on it; it sets the first-order switch point and the balance with localisation.
	FormingBeta float64
	// SecondaryBeta γ_s is the resonance integral of the secondary (endo) contacts between
	// the diene's inner atoms and the dienophile's conjugated substituent atoms, units of β.
	// Default 0.1, a third of FormingBeta: those contacts are about 2.9–3.0 Å (judgement,
	// no source).
	SecondaryBeta float64
	// LocalizationWeight λ weighs the localisation energy (the π energy both partners lose
	// when the termini become sp3) against the orbital term in the ranking score:
	//
	//	score = FrontierTerm + ChargeTerm − λ·Localization
	//
	// Default 0.1: an early, reactant-like transition state feels a small fraction of the
	// π energy change of the full reaction (Bell–Evans–Polanyi / Hammond reasoning;
	// the value is a judgement, no source). Localisation differs only between sites, never
	// between the two regio-orientations of one site, so λ decides which unit reacts
	// (anthracene 9,10 against 1,4, quinone C=C against C=O) but not the regiochemistry.
	LocalizationWeight float64
	// GapWeight w adds −w·min(gap_normal, gap_inverse) to the ranking score (the controlling
	// frontier gap, |β|). It is the same for both orientations and for every unit of one π
	// system, so it never changes regiochemistry or the choice between units sharing frontier
	// orbitals (anthracene 9,10 against 1,4; quinone C=C against C=O); it ranks units in
	// separate π systems of one partner (allyl acrylate: the acrylate C=C, not the allyl C=C)
	// and different pairs in a screen by the controlling gap, as rates do (Sauer & Sustmann,
	// Angew. Chem. Int. Ed. 1980, 19, 779: log k falls with the controlling gap). The
	// perturbation term alone does the opposite in Hückel theory, because frontier
	// coefficients at the reacting atoms shrink as conjugating acceptors lower the LUMO.
	//
	// Default 0.5: the smallest round value at which the score orders the cyanoethylene +
	// cyclopentadiene rate series (Sauer, Wiest & Mielert, Chem. Ber. 1964, 97, 3183) as the
	// controlling gap does (Spearman ρ = 0.81 for both; with w ≤ 0.25 the score is
	// anti-correlated with the rates, ρ ≈ −0.8, because localisation and coefficient dilution
	// dominate). A fit of one weight to one published series, stated as such.
	GapWeight float64

	// AllOrbitals replaces the frontier-only orbital term by the full second-order sum over
	// every occupied level of one partner's π system and every empty level of the other's
	// (both directions), Σ_ij 2(γΣc c)²/(x_i − x_j), each term capped by the same first-order
	// form. Off by default: the frontier-only term is the classic FMO answer and lets the
	// screening kernel run from a few cached numbers per unit (≥ 10⁷ pairs/s); the full sum
	// is slower (it loops over level pairs) and, on the bundled regio check set, differs only
	// on two 1,3-dipole cases whose margins are near zero either way. The endo term stays
	// frontier-based in both modes.
	AllOrbitals bool

	// ChargeTerm switches on the Coulomb term of the Klopman–Salem equation,
	// −Σ_bonds q_r q_s / (ε R), with π charges q, dielectric constant Dielectric and forming
	// bond length FormingDistance (Å), converted to |β| with BetaEV. Off by default: Hückel π
	// charges exaggerate polarity and the term then swamps the orbital term for neutral
	// partners (common practice, no source).
	ChargeTerm      bool
	Dielectric      float64
	FormingDistance float64 // Å
	BetaEV          float64 // |β| in eV for the Coulomb term

	// DemandThreshold (|β|): |gap_normal − gap_inverse| below it is "neutral" (Sustmann
	// type II). Default 0.15 |β| (about 0.4 eV with a 2.5–3 eV β; judgement, no source).
	// It also weighs the two frontier pairings in the orbital term (see pairingWeights): the
	// minor pairing (larger gap) counts with weight 1 − Δ/DemandThreshold, Δ = |gap_normal −
	// gap_inverse|, and not at all once the demand is clear (type I or III).
	DemandThreshold float64
	// BothPairings counts both frontier pairings with full weight whatever the demand (the
	// plain second-order sum). Off by default: see pairingWeights.
	BothPairings bool

	// Regio confidence from the relative margin between the two orientations at the
	// preferred site, margin / frontier term of the best: at least RegioClear is "clear",
	// at least RegioSlight is "slight", below that "no preference".
	RegioClear, RegioSlight float64
	// Endo verdict from the relative secondary term, EndoOverlap / FrontierTerm of the
	// preferred orientation: at least EndoYes is "yes", at least EndoWeak is "weak".
	// Defaults 0.15 and 0.05, set by judgement between two anchors: maleic anhydride with
	// cyclopentadiene (strongly endo; Alder & Stein 1937) gives about 0.3, methyl acrylate
	// (endo:exo only about 3:1 to 4:1 with cyclopentadiene; from memory) about 0.1.
	// Regio defaults 0.05 and 0.01 are a judgement too (no source).
	EndoYes, EndoWeak float64
}

// Default values of the numeric options (see the Options fields for the reasoning).
const (
	DefaultFormingBeta        = 0.3
	DefaultSecondaryBeta      = 0.1
	DefaultLocalizationWeight = 0.1
	DefaultGapWeight          = 0.5
	DefaultDemandThreshold    = 0.15
	DefaultRegioClear         = 0.05
	DefaultRegioSlight        = 0.01
	DefaultEndoYes            = 0.15
	DefaultEndoWeak           = 0.05
	DefaultDielectric         = 4.0
	DefaultFormingDistance    = 2.2
	DefaultBetaEV             = 2.5
)

// NewOptions returns options with the default constants for the given parameter set and
// calibration.
func NewOptions(p *huckel.Params, cal EVScale, calName string) *Options {
	return &Options{
		Params:             p,
		Calibration:        cal,
		CalibrationName:    calName,
		FormingBeta:        DefaultFormingBeta,
		SecondaryBeta:      DefaultSecondaryBeta,
		LocalizationWeight: DefaultLocalizationWeight,
		GapWeight:          DefaultGapWeight,
		Dielectric:         DefaultDielectric,
		FormingDistance:    DefaultFormingDistance,
		BetaEV:             DefaultBetaEV,
		DemandThreshold:    DefaultDemandThreshold,
		RegioClear:         DefaultRegioClear,
		RegioSlight:        DefaultRegioSlight,
		EndoYes:            DefaultEndoYes,
		EndoWeak:           DefaultEndoWeak,
	}
}

// method returns a new solver of the configured π method.
func (o *Options) method() huckel.Method {
	if o.NewMethod == nil {
		return new(huckel.Solver)
	}
	return o.NewMethod()
}

// MethodName is the name of the configured π method (huckel.MethodHuckel or
// huckel.MethodPPP).
func (o *Options) MethodName() string { return o.method().Name() }

// check panics on options that are programmer errors.
func (o *Options) check() {
	if o == nil || o.Params == nil {
		panic("fmo: Options without Params (use DefaultOptions or NewOptions)")
	}
	if o.FormingBeta <= 0 {
		panic(fmt.Sprintf("fmo: FormingBeta %g must be positive", o.FormingBeta))
	}
}

func (o *Options) kernel() kernel {
	k := kernel{gamma: o.FormingBeta, gammaS: o.SecondaryBeta, locWeight: o.LocalizationWeight,
		g2: o.FormingBeta * o.FormingBeta, gapWeight: o.GapWeight, allOrbitals: o.AllOrbitals,
		demand: o.DemandThreshold, bothPairings: o.BothPairings}
	if o.ChargeTerm && o.Dielectric > 0 && o.FormingDistance > 0 && o.BetaEV > 0 {
		const coulombEVAngstrom = 14.3996 // e²/(4πε₀) in eV·Å (CODATA)
		k.chargeCoef = coulombEVAngstrom / (o.Dielectric * o.FormingDistance) / o.BetaEV
	}
	return k
}

// ev converts x to eV with the calibration (0 without one: JSON has no NaN).
func (o *Options) ev(x float64, occupied bool) float64 {
	if o.Calibration == nil {
		return 0
	}
	return o.Calibration.EV(x, occupied)
}

// DefaultOptions returns the defaults with the default parameter set (presets.DefaultParams)
// and its default calibration (presets.Calibration).
func DefaultOptions() (*Options, error) {
	p, err := presets.Params(presets.DefaultParams)
	if err != nil {
		return nil, err
	}
	cal, err := presets.Calibration(p)
	if err != nil {
		return nil, fmt.Errorf("calibration for parameter set %s: %w", p.Name, err)
	}
	return NewOptions(p, cal, cal.Name), nil
}

// calibrationDetail describes the calibration in one line when it can (fmt.Stringer).
func (o *Options) calibrationDetail() string {
	if s, ok := o.Calibration.(fmt.Stringer); ok {
		return s.String()
	}
	return ""
}

// evDecimals is how many decimals the calibration's eV figures deserve: its GapDecimals when
// it has one (huckel.Calibration), else 2.
func (o *Options) evDecimals() int {
	if d, ok := o.Calibration.(interface{ GapDecimals() int }); ok {
		return d.GapDecimals()
	}
	return 2
}

// DefaultMaxPairCentres is the default π-centre limit of a pair partner. The analysis solves
// the partner once per reacting unit for the localisation energies and scores every pair of
// units, so its cost grows faster than one dense solve: measured on linear polyenes with
// acrolein (project machine, 2026-12): 0.08 s of CPU at 50 centres, 0.4 s at 100, 4.1 s at
// 200, about n^3.3. 200 keeps one pair within seconds and one bad row from stalling a screen;
// real cycloaddition partners have well under 50.
const DefaultMaxPairCentres = 200

func (o *Options) maxCentres() int {
	if o.MaxCentres > 0 {
		return o.MaxCentres
	}
	return DefaultMaxPairCentres
}
