package rate

import (
	"fmt"

	"cyclopair/fmo"
	"cyclopair/huckel/molecule"
)

// Descriptors are the computed quantities the rate model combines, for one pair under one
// activation, at the preferred reacting units and orientation (as fmo.Analyze and
// fmo.QuickScore choose them). Energies are in units of |β|.
type Descriptors struct {
	// GapNormal and GapInverse are the two frontier gaps at the preferred units (LUMO of the
	// dienophile − HOMO of the diene, and the inverse); Gap is the smaller, the controlling
	// one: a smaller gap, a faster reaction (Sauer & Sustmann 1980).
	GapNormal, GapInverse, Gap float64
	// Frontier is the Klopman–Salem frontier term of the preferred orientation (both
	// pairings), the orbital stabilisation of the early transition state.
	Frontier float64
	// Localization is the π energy both partners lose when the four (or three) termini
	// become sp3 (fmo.Orientation.Localization), DieneLocalization the 4π partner's part of
	// it; the rest, Localization − DieneLocalization, is the dienophile's.
	Localization, DieneLocalization float64
	// DieneConjugation is the diene's conjugation loss: its localisation energy with the
	// hyperconjugative alkyl pseudo-atoms left out (fmo.Partner.UnitConjugationLoss), the
	// Hückel para-localisation energy of Brown and Dewar (butadiene 2.472, furan 2.917,
	// anthracene at 9,10 3.314, benzene 4.000 |β|; H. C. Brown, J. Chem. Soc. 1950, 691;
	// M. J. S. Dewar, J. Am. Chem. Soc. 1952, 74, 3357; A. Streitwieser, Molecular Orbital
	// Theory for Organic Chemists, Wiley 1961, ch. 11; from memory). The π aromaticity and
	// conjugation a diene gives up in the transition state (furan, anthracene, benzo rings,
	// 1-donors) — the part of the distortion energy of D. H. Ess, K. N. Houk, J. Am. Chem.
	// Soc. 2007, 129, 10646 that a graph and a Hückel matrix can compute.
	DieneConjugation float64
	// Conformation holds the graph-derived diene terms (SCis, Reach).
	Conformation Conformation
	// Activation is the mode of the dienophile (fmo.ActivateNone, ActivateLewis, ...): it
	// acts through the orbitals and, for a Lewis acid, through the fitted mode term.
	Activation string
	// FirstOrder is true when the preferred orientation used the first-order (degenerate)
	// form of the frontier term: the gap is at or below the coupling, outside the regime the
	// model's gap term describes (CheckDomain). Not a model term.
	FirstOrder bool
}

// DienophileLocalization is the dienophile's part of the localisation energy, |β|.
func (d *Descriptors) DienophileLocalization() float64 { return d.Localization - d.DieneLocalization }

// Vector returns the descriptors in the order of Names, signed so that each is expected to
// raise the rate: −gap, frontier, −diene conjugation loss, −dienophile localisation, s-cis,
// −reach, Lewis acid (1 or 0).
func (d *Descriptors) Vector() [NumTerms]float64 {
	return [NumTerms]float64{-d.Gap, d.Frontier, -d.DieneConjugation, -d.DienophileLocalization(),
		d.Conformation.SCis, -d.Conformation.Reach, lewisIndicator(d.Activation)}
}

func lewisIndicator(mode string) float64 {
	if mode == fmo.ActivateLewis {
		return 1
	}
	return 0
}

// NumTerms is the number of descriptors (and model coefficients).
const NumTerms = 7

// Term indices into Vector, Names, Model.Coef.
const (
	TermGap = iota
	TermFrontier
	TermDieneConjugation
	TermDienophileLocalization
	TermSCis
	TermReach
	TermLewis
)

// Names are the descriptor names in the order of Vector, as the model file spells them.
var Names = [NumTerms]string{"neg_gap", "frontier", "neg_diene_conjugation", "neg_dienophile_localization", "s_cis", "neg_reach", "lewis_acid"}

// Explain describes each descriptor in words, for reports and help texts.
var Explain = [NumTerms]string{
	"−min(gap_normal, gap_inverse), |β|: the controlling frontier gap (smaller gap, faster)",
	"frontier term of the preferred orientation, |β|: Klopman–Salem orbital stabilisation of both pairings",
	"−diene conjugation loss, |β|: the π energy the diene gives up at its termini without alkyl hyperconjugation (para-localisation energy: aromaticity of furan or anthracene, donor conjugation)",
	"−dienophile localisation, |β|: the π energy the dienophile gives up at its termini",
	"log10 of the estimated s-cis population of the diene (0 ring-locked, about −1.7 open-chain, lower for (Z)-1-substituents)",
	"−(d14 − 2.90 Å): how much closer the diene termini are than in planar s-cis butadiene (ring size of locked dienes)",
	"1 for a Lewis-acid-bound dienophile, else 0: what the O=LA Hückel parameter does not carry of the catalysis (fitted on every catalysed/uncatalysed pair of the set)",
}

// FromPair computes the descriptors of an analysed pair; diene is the 4π partner's
// molecule (Pair.Orientations[0].DieneAtoms index into it).
func FromPair(p *fmo.Pair, diene *molecule.Molecule) (Descriptors, error) {
	if p == nil || len(p.Orientations) == 0 {
		return Descriptors{}, fmt.Errorf("rate: pair without orientations")
	}
	o := &p.Orientations[0]
	d := Descriptors{
		GapNormal:         p.GapNormal.Beta,
		GapInverse:        p.GapInverse.Beta,
		Frontier:          o.FrontierTerm,
		Localization:      o.Localization,
		DieneLocalization: o.DieneLocalization,
		DieneConjugation:  o.DieneConjugationLoss,
		Conformation:      ConformationOf(diene, o.DieneAtoms),
		Activation:        p.Activation,
		FirstOrder:        o.Method == "first-order",
	}
	d.Gap = min(d.GapNormal, d.GapInverse)
	return d, nil
}

// FromQuick computes the descriptors from a QuickScore result with the conformation of the
// preferred diene unit (Partner.Units[q.DieneUnit]); conf comes from Prepared.
func FromQuick(q *fmo.Quick, conf Conformation, activation string) Descriptors {
	return Descriptors{
		GapNormal: q.GapNormal, GapInverse: q.GapInverse, Gap: min(q.GapNormal, q.GapInverse),
		Frontier: q.Frontier, Localization: q.Localization, DieneLocalization: q.DieneLocalization,
		DieneConjugation: q.DieneConjugationLoss, Conformation: conf, Activation: activation,
		FirstOrder: q.FirstOrder,
	}
}

// PartnerConformations returns the conformation descriptors of every reacting unit of a 4π
// partner, parallel to p.Units; computed once per partner for screening loops.
func PartnerConformations(p *fmo.Partner) []Conformation {
	out := make([]Conformation, len(p.Units))
	for i, u := range p.Units {
		out[i] = ConformationOf(p.Mol, u.Atoms)
	}
	return out
}
