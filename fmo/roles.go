package fmo

import "fmt"

// roleTol (|β|) absorbs rounding when the swapped assignment scores the same (a symmetric
// pair such as cyclopentadiene with itself).
const roleTol = 1e-9

// RoleCheck analyses the two partners with their roles swapped — the given 2π partner as the
// 4π component, the given 4π partner as the 2π component — and returns a warning when the
// tool's own ranking score prefers that assignment to the pair as given (no margin: the
// warning only reports what the ranking says; the chemist decides). It catches the common
// slip of typing a cycloaddition the wrong way round (p-benzoquinone is the dienophile toward
// butadiene, not a hetero-diene). It returns "" when the swapped assignment has no reacting
// unit or scores no better. Both partners are taken unactivated, from their input molecules
// (Partner.Mol), so the check is about the substrates, not the activation.
func RoleCheck(diene, dienophile *Partner, pair *Pair, opts *Options) string {
	if diene == nil || dienophile == nil || pair == nil || len(pair.Orientations) == 0 {
		return ""
	}
	d2, err := NewPartnerFromMolecule(dienophile.Name, dienophile.Mol, RoleDiene, opts)
	if err != nil {
		return ""
	}
	e2, err := NewPartnerFromMolecule(diene.Name, diene.Mol, RoleDienophile, opts)
	if err != nil {
		return ""
	}
	swapped, err := Analyze(d2, e2, opts)
	if err != nil || len(swapped.Orientations) == 0 {
		return ""
	}
	given, other := pair.Orientations[0].Score, swapped.Orientations[0].Score
	if other-given <= roleTol {
		return ""
	}
	return fmt.Sprintf("roles: %s reacts better as the 4π partner and %s as the 2π partner (score %.3f against %.3f |β| as given; product %s): check --diene and --dienophile",
		partnerLabel(dienophile), partnerLabel(diene), other, given, swapped.Orientations[0].Product)
}

func partnerLabel(p *Partner) string {
	if p.Name != "" {
		return p.Name
	}
	return p.SMILES
}
