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
	// become sp3 — the Hückel measure of the aromaticity or conjugation given up (furan,
	// anthracene) and of the "distortion" a partner must pay (D. H. Ess, K. N. Houk, J. Am.
	// Chem. Soc. 2007, 129, 10646).
	Localization float64
	// Conformation holds the graph-derived diene terms (SCis, Reach).
	Conformation Conformation
	// Activation is the mode of the dienophile: it enters only through the orbitals (a
	// Lewis acid or an iminium ion lowers the LUMO and polarises it), never as a constant.
	Activation string
}

// Vector returns the descriptors in the order of Names, signed so that each is expected to
// raise the rate: −gap, frontier, −localisation, s-cis, −reach.
func (d *Descriptors) Vector() [NumTerms]float64 {
	return [NumTerms]float64{-d.Gap, d.Frontier, -d.Localization, d.Conformation.SCis, -d.Conformation.Reach}
}

// NumTerms is the number of descriptors (and model coefficients).
const NumTerms = 5

// Names are the descriptor names in the order of Vector, as the model file spells them.
var Names = [NumTerms]string{"neg_gap", "frontier", "neg_localization", "s_cis", "neg_reach"}

// Explain describes each descriptor in words, for reports and help texts.
var Explain = [NumTerms]string{
	"−min(gap_normal, gap_inverse), |β|: the controlling frontier gap (smaller gap, faster)",
	"frontier term of the preferred orientation, |β|: Klopman–Salem orbital stabilisation of both pairings",
	"−localisation, |β|: the π energy both partners give up at the termini (aromaticity, conjugation lost)",
	"log10 of the estimated s-cis population of the diene (0 ring-locked, about −1.7 open-chain, lower for (Z)-1-substituents)",
	"−(d14 − 2.90 Å): how much closer the diene termini are than in planar s-cis butadiene (ring size of locked dienes)",
}

// FromPair computes the descriptors of an analysed pair; diene is the 4π partner's
// molecule (Pair.Orientations[0].DieneAtoms index into it).
func FromPair(p *fmo.Pair, diene *molecule.Molecule) (Descriptors, error) {
	if p == nil || len(p.Orientations) == 0 {
		return Descriptors{}, fmt.Errorf("rate: pair without orientations")
	}
	o := &p.Orientations[0]
	d := Descriptors{
		GapNormal:    p.GapNormal.Beta,
		GapInverse:   p.GapInverse.Beta,
		Frontier:     o.FrontierTerm,
		Localization: o.Localization,
		Conformation: ConformationOf(diene, o.DieneAtoms),
		Activation:   p.Activation,
	}
	d.Gap = min(d.GapNormal, d.GapInverse)
	return d, nil
}

// FromQuick computes the descriptors from a QuickScore result with the conformation of the
// preferred diene unit (Partner.Units[q.DieneUnit]); conf comes from Prepared.
func FromQuick(q *fmo.Quick, conf Conformation, activation string) Descriptors {
	return Descriptors{
		GapNormal: q.GapNormal, GapInverse: q.GapInverse, Gap: min(q.GapNormal, q.GapInverse),
		Frontier: q.Frontier, Localization: q.Localization, Conformation: conf, Activation: activation,
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
