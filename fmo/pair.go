// Package fmo analyses thermal cycloaddition partners with frontier-orbital perturbation
// theory on top of Hückel orbitals from package huckel: which frontier gap controls a pair
// (normal or inverse electron demand), which regio-orientation and which reacting sites are
// preferred and by what margin, the secondary-orbital (endo) term, whether the supra–supra
// thermal pairing is symmetry-allowed, how activation of the dienophile changes the picture, and
// whether side channels compete. It knows nothing of terminals or output formats.
// Around it: fmo/substrates reads substrate files and lists, fmo/screen screens whole
// libraries with QuickScore and Analyze, fmo/check runs the literature check set and fits
// calibrations; none of them is imported here.
//
// # Pair analysis
//
// NewPartner (or NewPartnerFromMolecule) perceives and solves a molecule with the Options'
// Hückel parameters and finds its candidate reacting units (Sites): 4π diene and hetero-diene
// units and charge-separated 1,3-dipoles for the 4π partner, 2π units for the dienophile, all
// found over the π centres rather than one Kekulé structure, and each kept only if the adduct
// has a valid closed-shell Kekulé structure. SMILES atom maps pin the reacting atoms. Per unit
// it caches the frontier-set projectors at the unit atoms and the localisation energy, so
// Analyze and QuickScore only combine cached numbers.
//
// Analyze scores every pair of units in both regio-orientations:
//
//	frontier_term = Σ_pairings 2·(γ Σ_bonds c_r c_s)² / gap   (first-order 2|γΣcc| when gap ≤ |γΣcc|)
//	stabilization = frontier_term + charge_term                   (charge term off by default)
//	score         = stabilization − λ·localization − w·min(gap_normal, gap_inverse)
//
// with γ = Options.FormingBeta (0.3), λ = LocalizationWeight (0.1), w = GapWeight (0.5); the
// Options fields give the reasoning for each value. The two pairings are HOMO(diene)–
// LUMO(dienophile) and LUMO(diene)–HOMO(dienophile), each over whole degenerate sets. Only the
// frontier term differs between the two orientations of one site, so regiochemistry is pure
// frontier-orbital theory; localisation and the controlling gap decide between sites. The
// preferred orientation's adduct is built from the unactivated partners (diene atoms first),
// with a re-derived Kekulé structure, and written as SMILES; ortho/meta/para labels, the
// secondary-orbital endo term and the supra–supra allowedness from the terminus phases of the
// frontier orbitals complete the Pair.
//
// Failure modes: bad SMILES come back as the reader's *smiles.Error; perception and solver
// errors from package huckel are wrapped with the partner's name; a partner without a
// reacting unit, or with atom maps matching no unit or several, gives a *SiteError wrapping
// ErrNoUnit, ErrPinNoMatch or ErrPinAmbiguous. Misuse (nil partners, swapped roles, nil
// Options) panics. Results are estimates for planning, not safety assessments.
//
// Known limitations (kept as documented misses, not tuned away): Hückel puts the HOMO of
// charge-separated 1,3-dipoles on the anionic terminus, so dipole regiochemistry often
// disagrees with experiment; steric effects (methyl-substituted quinones, methacrolein
// exo) and thermodynamic control (furan adducts) are outside the model; the one-π-set model of
// sp atoms excludes nitriles as dienophiles.
package fmo

import "cyclopair/huckel/molecule"

// Energy is a quantity in units of |β| and in eV (through the calibration named in the Pair).
type Energy struct {
	Beta float64 `json:"beta"`
	EV   float64 `json:"ev"`
}

// Frontier describes one frontier level of a partner.
type Frontier struct {
	Index      int     `json:"index"`      // index into the partner's levels (bonding first)
	X          float64 `json:"x"`          // E = α + xβ
	EV         float64 `json:"ev"`         // calibrated orbital energy
	Degenerate bool    `json:"degenerate"` // part of a degenerate set
}

// Orientation is one way the two reacting units can join: which sites, which regio-orientation,
// the product and the scores. Bonds are the two new σ bonds, diene (4π partner) atom first,
// as 0-based atom indices in each partner's own SMILES.
type Orientation struct {
	Site            string    `json:"site"`             // human description of the reacting units, e.g. "C1-C2-C3-C4 + C1-C2" (element + 1-based atom number in each partner's SMILES)
	DieneAtoms      []int     `json:"diene_atoms"`      // reacting unit of the 4π partner, terminus first (4 atoms, or 3 for a dipole)
	DienophileAtoms []int     `json:"dienophile_atoms"` // reacting 2π unit (2 atoms), in bond order: DieneAtoms[0] bonds to DienophileAtoms[0]
	Bonds           [2][2]int `json:"bonds"`            // [[diene atom, dienophile atom], [diene atom, dienophile atom]]
	Product         string    `json:"product"`          // canonical SMILES (smiles.Canonical, no configuration) of the primary cycloadduct built from the unactivated partners
	Stabilization   float64   `json:"stabilization"`    // total perturbation energy, units of |β|, larger is better
	FrontierTerm    float64   `json:"frontier_term"`    // orbital (Klopman–Salem second- or first-order) part, |β|
	ChargeTerm      float64   `json:"charge_term"`      // Coulomb part, |β| (0 when switched off)
	Localization    float64   `json:"localization"`     // π energy both partners lose on forming the adduct, |β| (a cost)
	Method          string    `json:"method"`           // "second-order" or "first-order" (near-degenerate frontier levels)
	Label           string    `json:"label"`            // "ortho" | "meta" | "para" | ""
	EndoOverlap     float64   `json:"endo_overlap"`     // secondary-orbital term, |β|
	Preferred       bool      `json:"preferred"`

	Score       float64 `json:"score"`        // ranking score (Pair.ScoreFormula), |β|
	NormalTerm  float64 `json:"normal_term"`  // orbital term of the HOMO(diene)–LUMO(dienophile) pairing, |β|
	InverseTerm float64 `json:"inverse_term"` // orbital term of the LUMO(diene)–HOMO(dienophile) pairing, |β|
	Kind        string  `json:"kind"`         // "[4+2]" or "[3+2]"
	RingSize    int     `json:"ring_size"`    // size of the new ring

	// StereoProducts are the endo and exo primary adducts as canonical SMILES with their
	// relative configuration (one entry "endo=exo" when both give one compound; empty when
	// the adduct has no stereocentre the input fixes); the endo entry is Preferred when the
	// secondary-orbital term favours it at this orientation.
	StereoProducts []StereoProduct `json:"stereo_products"`
	// FollowUp lists the steps from the primary adduct to the isolated product (loss of N₂,
	// CO₂, an alcohol or amine), each with its literature basis; empty when none applies.
	FollowUp []FollowUpStep `json:"follow_up"`
	// IsolatedProduct is the canonical SMILES of the product after FollowUp (with the
	// relative configuration where it survives), equal to the primary adduct when there are
	// no follow-up steps.
	IsolatedProduct string `json:"isolated_product"`
	// Fraction is the predicted share of this orientation among the orientations at the
	// preferred reacting units (0–1), from the fitted ratio model of fmo/rate; 0 at other
	// units and when no model was applied.
	Fraction float64 `json:"fraction"`

	// DieneLocalization is the 4π partner's part of Localization (the rest is the
	// dienophile's), for the rate model (fmo/rate); not in the JSON output.
	DieneLocalization float64 `json:"-"`
	// DieneConjugationLoss is the 4π partner's localisation energy without hyperconjugative
	// alkyl pseudo-atoms (Partner.UnitConjugationLoss), for the rate model; not in the JSON.
	DieneConjugationLoss float64 `json:"-"`

	// isolated is the isolated product's constitution as built (partner atom order, no
	// configuration), kept on the preferred orientation for the side-channel check;
	// isolatedSteps says whether follow-up steps led to it from the primary adduct.
	isolated      *molecule.Molecule
	isolatedSteps bool
	src           *adductSource // the partners and units the adduct was built from
}

// RateEstimate is a predicted rate from the fitted model of fmo/rate: log10 of the rate
// constant relative to the named reference reaction, with its prediction interval.
type RateEstimate struct {
	Log10KRel float64    `json:"log10_k_rel"`
	Interval  [2]float64 `json:"interval"` // [lo, hi] of log10_k_rel
	Reference string     `json:"reference"`
	// Log10VsFree is log10 of the rate relative to the same pair without activation (only on
	// activated variants whose free pair was analysed).
	Log10VsFree *float64 `json:"log10_vs_unactivated,omitempty"`
	// InDomain reports whether the pair lies inside the model's applicability domain
	// (fmo/rate domain.go: perturbation regime, the fitted descriptor ranges, the leverage);
	// outside, DomainNote says which descriptor is extrapolated and Interval is widened.
	InDomain   bool   `json:"in_domain"`
	DomainNote string `json:"domain_note,omitempty"`
	// Leverage is h = xᵀ(XᵀX)⁻¹x of the pair's descriptors against the fitted rows (absent
	// when the model file stores no domain).
	Leverage *float64 `json:"leverage,omitempty"`
}

// SideChannel is a competing reaction the pair analysis checked.
type SideChannel struct {
	Kind   string  `json:"kind"`   // "diene_dimerisation" | "product_as_dienophile"
	Gap    Energy  `json:"gap"`    // controlling frontier gap of the side reaction
	Margin float64 `json:"margin"` // side-channel gap minus the pair's controlling gap, |β| (small or negative = competes)
	// ScoreMargin is the pair's ranking score minus the side channel's, |β| (small or
	// negative = the side reaction is as favourable once localisation is counted).
	ScoreMargin float64 `json:"score_margin"`
	Competes    bool    `json:"competes"`
	Note        string  `json:"note"`
}

// ActivationEffect summarises what activating the dienophile changed, relative to the free
// (unactivated) dienophile.
type ActivationEffect struct {
	LUMOLowering      Energy  `json:"lumo_lowering"`       // LUMO(free) − LUMO(activated) in energy terms: positive = lowered
	BetaAsymmetry     float64 `json:"beta_asymmetry"`      // c²(β-C) − c²(α-C) of the LUMO in the activated dienophile
	BetaAsymmetryFree float64 `json:"beta_asymmetry_free"` // same for the free dienophile
	EndoChange        float64 `json:"endo_change"`         // endo term (activated) − endo term (free), |β|
	CarbonylLUMO      float64 `json:"carbonyl_lumo"`       // c² of the LUMO at the activated carbonyl (imine) carbon
	CarbonylLUMOFree  float64 `json:"carbonyl_lumo_free"`  // same for the free dienophile
}

// Pair is the analysis of one 4π partner ("diene": diene, hetero-diene or 1,3-dipole) with one
// 2π partner ("dienophile") under one activation. Field names in JSON are a contract that other
// tools parse (DEVELOPERS.md, "Output contracts"): keep them stable.
type Pair struct {
	DieneName      string `json:"diene_name,omitempty"`
	DienophileName string `json:"dienophile_name,omitempty"`
	// DieneNotes and DienophileNotes are the partners' notes from the substrate list (extra
	// CSV/TSV columns, SD data items, a YAML row's notes), set by the screen; empty otherwise.
	DieneNotes          string `json:"diene_notes,omitempty"`
	DienophileNotes     string `json:"dienophile_notes,omitempty"`
	Diene               string `json:"diene"`      // SMILES as given
	Dienophile          string `json:"dienophile"` // SMILES as given (unactivated)
	Activation          string `json:"activation"` // "none" | "proton" | "lewis" | "iminium"
	ActivatedDienophile string `json:"activated_dienophile,omitempty"`

	Demand          string  `json:"demand"`           // "normal" | "inverse" | "neutral"
	SustmannType    string  `json:"sustmann_type"`    // "I" | "II" | "III"
	DemandThreshold float64 `json:"demand_threshold"` // |gap_normal − gap_inverse| below this (|β|) is "neutral"/type II
	GapNormal       Energy  `json:"gap_normal"`       // LUMO(dienophile) − HOMO(diene), positive
	GapInverse      Energy  `json:"gap_inverse"`      // LUMO(diene) − HOMO(dienophile), positive

	DieneHOMO      Frontier `json:"diene_homo"`
	DieneLUMO      Frontier `json:"diene_lumo"`
	DienophileHOMO Frontier `json:"dienophile_homo"`
	DienophileLUMO Frontier `json:"dienophile_lumo"`

	Orientations    []Orientation `json:"orientations"`        // best first
	RegioMargin     float64       `json:"regio_margin"`        // stabilization(best) − stabilization(best of the other regio-orientation at the same sites), |β|
	SiteMargin      float64       `json:"site_margin"`         // stabilization(best) − best at another site combination, |β| (0 if only one)
	RegioConfidence string        `json:"regio_confidence"`    // "clear" | "slight" | "no preference"
	Endo            string        `json:"endo"`                // "yes" | "weak" | "no": endo favoured by secondary overlap
	EndoNote        string        `json:"endo_note,omitempty"` // why the verdict is "no" without looking at the number, when that is so

	Allowed       bool   `json:"allowed"`        // supra–supra thermal pairing symmetry-allowed
	AllowedReason string `json:"allowed_reason"` // from the frontier phases at the termini

	Activated    *ActivationEffect `json:"activation_effect,omitempty"`
	SideChannels []SideChannel     `json:"side_channels"`

	Params      string   `json:"params"`       // parameter set name
	Method      string   `json:"method"`       // π method of both partners' orbitals: "huckel" or "ppp"
	Calibration string   `json:"calibration"`  // calibration name used for every eV figure
	FormingBeta float64  `json:"forming_beta"` // resonance integral assumed for each forming σ bond, units of β
	Warnings    []string `json:"warnings"`

	SecondaryBeta       float64    `json:"secondary_beta"`               // resonance integral of the secondary (endo) contacts, units of β
	LocalizationWeight  float64    `json:"localization_weight"`          // λ in score = stabilization − λ·localization − w·controlling gap
	GapWeight           float64    `json:"gap_weight"`                   // w in the same formula
	ScoreFormula        string     `json:"score_formula"`                // how the ranking score is built
	OrbitalSum          string     `json:"orbital_sum"`                  // "frontier" (default) or "all-orbital" (Options.AllOrbitals)
	ChargeTermOn        bool       `json:"charge_term_on"`               // whether the Coulomb term was included
	RegioThresholds     [2]float64 `json:"regio_thresholds"`             // [clear, slight] on regio_margin / frontier_term of the best
	EndoThresholds      [2]float64 `json:"endo_thresholds"`              // [yes, weak] on endo_overlap / frontier_term of the preferred
	PreferredSite       string     `json:"preferred_site"`               // the winning reacting units
	PreferredKind       string     `json:"preferred_kind"`               // "[4+2]" or "[3+2]"
	OrientationsChecked int        `json:"orientations_checked"`         // unit pairs × 2 orientations scored
	CalibrationDetail   string     `json:"calibration_detail,omitempty"` // the calibration's lines and fit statistics

	// Rate is the predicted rate (fmo/rate); nil when no rate model was applied.
	Rate *RateEstimate `json:"rate,omitempty"`
	// EndoFraction is the predicted share of the endo adduct at the preferred orientation
	// (0–1), null where there is no endo/exo question (EndoNote) or no model was applied.
	EndoFraction *float64 `json:"endo_fraction"`
	// RatioInterval gives the 90 % intervals of the preferred orientation's Fraction and of
	// EndoFraction, [lo, hi] each, when a model was applied.
	FractionInterval     *[2]float64 `json:"fraction_interval,omitempty"`
	EndoFractionInterval *[2]float64 `json:"endo_fraction_interval,omitempty"`
	// RatioTemperatureC is the temperature (°C) the fractions are for.
	RatioTemperatureC float64 `json:"ratio_temperature_C,omitempty"`

	// Confidence gives, per verdict (regio, site, endo, demand), the check-set hit rate of
	// the verdict's class and of the confidence word printed (confidence.go).
	Confidence []ConfidenceNote `json:"confidence"`
	// Reversible is a note when the adduct can revert by retro-Diels–Alder because the 4π
	// partner regains an aromatic ring (furan, pyrrole, anthracene-type), else empty.
	Reversible string `json:"reversible,omitempty"`
	// EVDecimals is how many decimals the eV figures of this pair deserve (human formats
	// round to it; JSON keeps full precision): from the calibration's branch RMSE
	// (huckel.Calibration.GapDecimals).
	EVDecimals int `json:"ev_decimals"`
}
