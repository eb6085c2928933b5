package fmo

import (
	"errors"
	"fmt"
	"slices"
	"strings"

	"cyclopair/huckel"
	"cyclopair/huckel/molecule"
)

// Activation modes accepted by Activate.
const (
	ActivateNone    = "none"    // the free dienophile
	ActivateProton  = "proton"  // Brønsted acid: carbonyl O (or imine N) protonated
	ActivateLewis   = "lewis"   // Lewis acid bound at the carbonyl O (or imine N), drawn as BF3
	ActivateIminium = "iminium" // aldehyde/ketone condensed with a secondary amine to an iminium ion
)

// Modes lists the activation modes in the order the CLI documents them.
func Modes() []string {
	return []string{ActivateNone, ActivateProton, ActivateLewis, ActivateIminium}
}

// Sentinel errors of Activate; every error it returns wraps exactly one of them.
var (
	ErrUnknownMode       = errors.New("unknown activation mode")
	ErrNothingToActivate = errors.New("nothing to activate")
	ErrBadAmine          = errors.New("amine cannot form an iminium ion")
)

// DefaultAmineSMILES is the secondary amine used for iminium activation when none is given:
// pyrrolidine, the parent of the amines used in iminium organocatalysis (K. A. Ahrendt,
// C. J. Borths, D. W. C. MacMillan, J. Am. Chem. Soc. 2000, 122, 4243, used an
// imidazolidinone; pyrrolidine is the simplest cyclic secondary amine of that class).
const DefaultAmineSMILES = "C1CCNC1"

// ActivateOptions tunes Activate. The zero value (or nil) means: pyrrolidine for iminium
// activation and the parameter set's own h(O=LA) for Lewis-acid binding.
type ActivateOptions struct {
	// Amine is the secondary amine for iminium activation (nil: pyrrolidine). Its first
	// N–H nitrogen (lowest atom index) with two heavy neighbours and only single bonds
	// becomes the iminium N.
	Amine *molecule.Molecule
	// LewisStrength is the Coulomb parameter h of the Lewis-acid-bound carbonyl oxygen
	// (type O=LA, α_O = α + h·β). Following K. N. Houk and R. W. Strozier (J. Am. Chem.
	// Soc. 1973, 95, 4094), complexation is modelled like protonation, as a more
	// electronegative carbonyl oxygen: a larger h than the free carbonyl O (h = 1.0 in
	// Streitwieser's set) and at most the protonated O+ (2.5); a stronger Lewis acid means a
	// larger h. 0 (the default) keeps the O=LA entry of the parameter set in use, which is
	// 2.0 in both shipped sets — a number of ours between those two bounds, not a value
	// read from the paper (see presets/params). LewisParams applies a non-zero value.
	LewisStrength float64
}

// ActivationSite is the group Activate changes.
type ActivationSite struct {
	Acceptor int    // carbonyl O or imine N that is protonated, complexed or made the iminium N
	Carbon   int    // the carbon doubly bonded to Acceptor
	Alpha    int    // C=C/C≡C carbon bonded to Carbon (the dienophile's α-carbon), -1 if none
	Beta     int    // the other carbon of that multiple bond (the β-carbon), -1 if none
	Kind     string // "aldehyde", "ketone", "ester", "acid", "amide", "anhydride", "carbonyl", "imine"
}

// Conjugated reports whether the site is conjugated with a C=C or C≡C bond.
func (s ActivationSite) Conjugated() bool { return s.Alpha >= 0 }

// FindActivationSite picks the group that mode would activate in m.
//
// The choice is, in order: a carbonyl C=O conjugated with a C=C or C≡C (the activating
// group of a dienophile), an imine C=N so conjugated, any other carbonyl, any other imine
// (iminium mode takes only aldehydes and ketones). Among candidates of the same rank the
// one whose O or N has the lowest atom index wins; so for maleic anhydride or
// p-benzoquinone the first carbonyl written in the SMILES is activated. Aromatic ring N
// (pyridine-type) counts as an imine N. An error wrapping ErrNothingToActivate says when
// nothing fits; ErrUnknownMode when mode is not one of Modes().
func FindActivationSite(m *molecule.Molecule, mode string) (ActivationSite, error) {
	switch mode {
	case ActivateProton, ActivateLewis, ActivateIminium:
	case ActivateNone:
		return ActivationSite{Acceptor: -1, Carbon: -1, Alpha: -1, Beta: -1}, nil
	default:
		return ActivationSite{}, fmt.Errorf("%w %q (use one of %s)", ErrUnknownMode, mode, strings.Join(Modes(), ", "))
	}
	best, bestRank := ActivationSite{Acceptor: -1}, 99
	for bi, b := range m.Bonds {
		if b.Order != 2 {
			continue
		}
		for _, pair := range [2][2]int{{b.A, b.B}, {b.B, b.A}} {
			c, x := pair[0], pair[1]
			if m.Atoms[c].Element != "C" || m.Atoms[x].Charge != 0 || m.Atoms[c].Charge != 0 {
				continue
			}
			var kind string
			switch m.Atoms[x].Element {
			case "O":
				if m.Degree(x) != 1 || m.Atoms[x].HCount != 0 {
					continue
				}
				kind = carbonylKind(m, c, x)
			case "N":
				if m.Atoms[x].HCount+m.BondOrderSum(x) != 3 {
					continue
				}
				kind = "imine"
			default:
				continue
			}
			if mode == ActivateIminium && kind != "aldehyde" && kind != "ketone" {
				continue
			}
			alpha, beta := conjugatedPartner(m, c, bi)
			if mode == ActivateIminium && !iminiumPlausible(m, c, x, alpha, kind) {
				continue
			}
			rank := 0
			if kind == "imine" {
				rank++
			}
			if alpha < 0 {
				rank += 2
			}
			if rank < bestRank || (rank == bestRank && x < best.Acceptor) {
				best, bestRank = ActivationSite{Acceptor: x, Carbon: c, Alpha: alpha, Beta: beta, Kind: kind}, rank
			}
		}
	}
	if best.Acceptor < 0 {
		what := "no carbonyl or imine to activate (use --activate none)"
		if mode == ActivateIminium {
			what = "no α,β-unsaturated aldehyde or unhindered enone to turn into an iminium ion (quinones, ene-diones, anhydrides, esters and amides do not form one; use --activate none, proton or lewis)"
		}
		return best, fmt.Errorf("dienophile %s has %s: %w", moleculeLabel(m), what, ErrNothingToActivate)
	}
	return best, nil
}

// iminiumPlausible: iminium catalysis works with α,β-unsaturated aldehydes and unhindered
// enones (K. A. Ahrendt, C. J. Borths, D. W. C. MacMillan, J. Am. Chem. Soc. 2000, 122, 4243,
// imidazolidinone secondary-amine catalyst, enals; enones need an unhindered ketone):
// the carbonyl must be conjugated with a C=C, not part of a quinone or ene-1,4-dione (amines
// add to those in conjugate fashion), and a ketone's other substituent must be unbranched
// (at most one heavy neighbour besides the carbonyl carbon, or in a ring with it) (common
// practice, no source).
func iminiumPlausible(m *molecule.Molecule, c, o, alpha int, kind string) bool {
	if alpha < 0 {
		return false
	}
	if enedione(m, ActivationSite{Acceptor: o, Carbon: c, Alpha: alpha}) {
		return false
	}
	if kind == "ketone" {
		for _, e := range m.Neighbors(c) {
			if e.To == o || e.To == alpha {
				continue
			}
			if m.Degree(e.To) > 2 {
				return false
			}
		}
	}
	return true
}

// carbonylKind classifies the carbonyl carbon c (=O at o) by its other neighbours.
func carbonylKind(m *molecule.Molecule, c, o int) string {
	heavyC, nO, nN, anhydride := 0, 0, 0, false
	for _, e := range m.Neighbors(c) {
		if e.To == o {
			continue
		}
		switch m.Atoms[e.To].Element {
		case "C":
			heavyC++
		case "O":
			nO++
			if m.Atoms[e.To].HCount == 0 {
				for _, f := range m.Neighbors(e.To) {
					if f.To != c && isCarbonylCarbon(m, f.To) {
						anhydride = true
					}
				}
			}
		case "N":
			nN++
		}
	}
	switch {
	case anhydride:
		return "anhydride"
	case nO > 0 && hasOH(m, c, o):
		return "acid"
	case nO > 0:
		return "ester"
	case nN > 0:
		return "amide"
	case heavyC == 2:
		return "ketone"
	case heavyC <= 1 && m.Atoms[c].HCount >= 1:
		return "aldehyde"
	}
	return "carbonyl"
}

func hasOH(m *molecule.Molecule, c, o int) bool {
	for _, e := range m.Neighbors(c) {
		if e.To != o && m.Atoms[e.To].Element == "O" && m.Atoms[e.To].HCount > 0 {
			return true
		}
	}
	return false
}

func isCarbonylCarbon(m *molecule.Molecule, c int) bool {
	if m.Atoms[c].Element != "C" {
		return false
	}
	for _, e := range m.Neighbors(c) {
		if m.Bonds[e.Bond].Order == 2 && m.Atoms[e.To].Element == "O" {
			return true
		}
	}
	return false
}

// conjugatedPartner finds a carbon neighbour of c (other than through bond skip) that is
// part of a C=C or C≡C, returning that carbon (α) and its multiple-bond partner (β); the
// lowest-index α wins. (-1, -1) when c is not conjugated with a carbon multiple bond.
func conjugatedPartner(m *molecule.Molecule, c, skip int) (alpha, beta int) {
	alpha, beta = -1, -1
	for _, e := range m.Neighbors(c) {
		if e.Bond == skip || m.Atoms[e.To].Element != "C" || m.Bonds[e.Bond].Order != 1 {
			continue
		}
		a := e.To
		for _, f := range m.Neighbors(a) {
			if f.To == c || m.Bonds[f.Bond].Order < 2 || m.Atoms[f.To].Element != "C" {
				continue
			}
			if alpha < 0 || a < alpha || (a == alpha && f.To < beta) {
				alpha, beta = a, f.To
			}
		}
	}
	return alpha, beta
}

func moleculeLabel(m *molecule.Molecule) string {
	switch {
	case m.Name != "":
		return m.Name
	case m.Source != "":
		return m.Source
	}
	return "(unnamed)"
}

// Activate returns a copy of m activated by mode, the cautions that apply, and an error
// when m has nothing mode can act on (wrapping ErrNothingToActivate), the mode is unknown
// (ErrUnknownMode) or the amine is unusable (ErrBadAmine). m is not modified.
//
// The copy keeps atoms 0..len(m.Atoms)−1 with their indices (changing only charges,
// hydrogen counts and, for iminium, the element of the carbonyl O) and appends new atoms
// after them, so bonds and products found on the activated molecule map back to m:
//
//   - proton: C=O → C=[OH+]; an imine C=N gets the proton on N (C=[NH+]).
//   - lewis: C=O → C=[O+][B-](F)(F)F, perceived as a Lewis-acid-bound carbonyl O (type
//     O=LA); BF3 stands for any Lewis acid, whose strength enters only through h(O=LA)
//     (ActivateOptions.LewisStrength, applied by LewisParams). An imine N is complexed
//     the same way (C=[N+][B-](F)(F)F).
//   - iminium: R–CH=O + HNR'2 → R–CH=[N+]R'2: the carbonyl O becomes the iminium N and the
//     amine's other atoms are appended; only aldehydes and ketones qualify.
//   - none: an unchanged copy.
//
// Which group is activated is documented at FindActivationSite. The activated molecule has
// Source "" (it was not read from text) and m's Name.
func Activate(m *molecule.Molecule, mode string, o *ActivateOptions) (*molecule.Molecule, []string, error) {
	if m == nil {
		panic("fmo.Activate: nil molecule")
	}
	site, err := FindActivationSite(m, mode)
	if err != nil {
		return nil, nil, err
	}
	out := m.Clone()
	if mode == ActivateNone {
		return out, nil, nil
	}
	out.Source = ""
	var warns []string
	x := site.Acceptor
	a := &out.Atoms[x]
	switch mode {
	case ActivateProton:
		a.Charge, a.HCount, a.Bracket = 1, a.HCount+1, true
	case ActivateLewis:
		a.Charge, a.Bracket = 1, true
		b := out.AddAtom(molecule.Atom{Element: "B", Charge: -1, Bracket: true, Pos: -1})
		out.AddBond(x, b, 1)
		for range 3 {
			f := out.AddAtom(molecule.Atom{Element: "F", Pos: -1})
			out.AddBond(b, f, 1)
		}
	case ActivateIminium:
		amine := DefaultAmine()
		if o != nil && o.Amine != nil {
			amine = o.Amine
		}
		n, err := secondaryAmineN(amine)
		if err != nil {
			return nil, nil, err
		}
		a.Element, a.Charge, a.HCount, a.Bracket = "N", 1, 0, true
		idx := make([]int, len(amine.Atoms))
		for i, at := range amine.Atoms {
			if i == n {
				idx[i] = x
				continue
			}
			at.Pos, at.Map = -1, 0
			idx[i] = out.AddAtom(at)
		}
		for _, b := range amine.Bonds {
			nb := out.AddBond(idx[b.A], idx[b.B], b.Order)
			out.Bonds[nb].Aromatic = b.Aromatic
		}
		if site.Kind == "ketone" {
			warns = append(warns, fmt.Sprintf("%s is a ketone: ketones form iminium ions with secondary amines slowly, so the activated species may be minor (common practice, no source)", moleculeLabel(m)))
		}
		if enedione(m, site) {
			warns = append(warns, fmt.Sprintf("%s is a quinone or ene-1,4-dione: secondary amines add to such acceptors in conjugate fashion (amino-quinones, with redox side reactions) rather than forming a usable iminium ion, so treat this variant as hypothetical (common practice, no source)", moleculeLabel(m)))
		}
		if hasAlphaH(m, site) {
			warns = append(warns, fmt.Sprintf("%s has α-hydrogens on an sp3 carbon next to the carbonyl: with a secondary amine it may form an enamine instead of the iminium ion (common practice, no source)", moleculeLabel(m)))
		}
	}
	return out, warns, nil
}

// enedione reports a second C=O carbon conjugated with the activated one through a C=C
// (O=C–C=C–C=O: p-quinones, ene-1,4-diones) or directly bonded to it (o-quinones,
// 1,2-diones).
func enedione(m *molecule.Molecule, s ActivationSite) bool {
	other := func(c int) bool { return c != s.Carbon && isCarbonylCarbon(m, c) }
	for _, e := range m.Neighbors(s.Carbon) {
		a := e.To
		if other(a) {
			return true
		}
		for _, f := range m.Neighbors(a) {
			if f.To == s.Carbon || m.Bonds[f.Bond].Order != 2 || m.Atoms[f.To].Element != "C" {
				continue
			}
			for _, g := range m.Neighbors(f.To) {
				if g.To != a && other(g.To) {
					return true
				}
			}
		}
	}
	return false
}

// hasAlphaH reports an sp3 carbon bearing H next to the carbonyl carbon (enamine risk).
func hasAlphaH(m *molecule.Molecule, s ActivationSite) bool {
	for _, e := range m.Neighbors(s.Carbon) {
		t := e.To
		if t == s.Acceptor || m.Atoms[t].Element != "C" || m.Atoms[t].HCount == 0 {
			continue
		}
		sp3 := true
		for _, f := range m.Neighbors(t) {
			if m.Bonds[f.Bond].Order > 1 {
				sp3 = false
			}
		}
		if sp3 {
			return true
		}
	}
	return false
}

// DefaultAmine returns a fresh pyrrolidine graph (DefaultAmineSMILES), atoms in the order
// of that SMILES: C0 C1 C2 N3 C4, ring closed C4–C0.
func DefaultAmine() *molecule.Molecule {
	m := &molecule.Molecule{Source: DefaultAmineSMILES, Name: "pyrrolidine"}
	for i := range 5 {
		el, h := "C", 2
		if i == 3 {
			el, h = "N", 1
		}
		m.AddAtom(molecule.Atom{Element: el, HCount: h, Pos: i})
	}
	for i := range 4 {
		m.AddBond(i, i+1, 1)
	}
	m.AddBond(4, 0, 1)
	return m
}

// secondaryAmineN finds the iminium-forming nitrogen of amine: neutral N with one H, two
// heavy neighbours and only single bonds; the lowest index wins.
func secondaryAmineN(amine *molecule.Molecule) (int, error) {
	for i, a := range amine.Atoms {
		if a.Element != "N" || a.Charge != 0 || a.HCount != 1 || amine.Degree(i) != 2 || a.Aromatic {
			continue
		}
		single := true
		for _, e := range amine.Neighbors(i) {
			if amine.Bonds[e.Bond].Order != 1 {
				single = false
			}
		}
		if single {
			return i, nil
		}
	}
	return -1, fmt.Errorf("amine %s has no secondary N–H nitrogen (give a secondary amine such as %s): %w", moleculeLabel(amine), DefaultAmineSMILES, ErrBadAmine)
}

// LewisParams returns the parameter set to perceive a Lewis-acid-activated molecule with:
// base itself when h is 0, otherwise base merged with h(O=LA) = h (see
// ActivateOptions.LewisStrength). base is not modified.
func LewisParams(base *huckel.Params, h float64) *huckel.Params {
	if h == 0 {
		return base
	}
	return base.Merge(&huckel.Params{HEntries: []huckel.HEntry{{
		Type: huckel.OLewis, H: h,
		Source: fmt.Sprintf("--lewis-h %g: Lewis-acid complexation as a more electronegative carbonyl O (K. N. Houk, R. W. Strozier, J. Am. Chem. Soc. 1973, 95, 4094)", h),
	}}})
}

// DieneCautions lists cautions for running mode with this 4π partner: a Brønsted or Lewis
// acid (also the acid co-catalyst of iminium catalysis) may hydrolyse or polymerise enol
// ethers, silyl enol ethers and enamines (common practice, no source).
func DieneCautions(diene *molecule.Molecule, mode string) []string {
	if mode == ActivateNone || diene == nil {
		return nil
	}
	var groups []string
	seen := map[string]bool{}
	for i, a := range diene.Atoms {
		if a.Element != "O" && a.Element != "N" {
			continue
		}
		if a.Charge != 0 || a.Aromatic || (a.Element == "O" && (a.HCount != 0 || diene.Degree(i) != 2)) ||
			(a.Element == "N" && a.HCount+diene.Degree(i) != 3) {
			continue
		}
		vinyl, silyl := false, false
		for _, e := range diene.Neighbors(i) {
			t := e.To
			if diene.Bonds[e.Bond].Order != 1 {
				vinyl = false
				break
			}
			if diene.Atoms[t].Element == "Si" {
				silyl = true
			}
			if diene.Atoms[t].Element == "C" && !diene.Atoms[t].Aromatic {
				for _, f := range diene.Neighbors(t) {
					if diene.Bonds[f.Bond].Order == 2 && diene.Atoms[f.To].Element == "C" {
						vinyl = true
					}
				}
			}
		}
		if !vinyl {
			continue
		}
		g := "enol ether"
		switch {
		case a.Element == "N":
			g = "enamine"
		case silyl:
			g = "silyl enol ether"
		}
		if !seen[g] {
			seen[g] = true
			groups = append(groups, g)
		}
	}
	if len(groups) == 0 {
		return nil
	}
	acid := "a Brønsted acid"
	switch mode {
	case ActivateLewis:
		acid = "a Lewis acid"
	case ActivateIminium:
		acid = "the acid co-catalyst of iminium catalysis"
	}
	return []string{fmt.Sprintf("%s bears an acid-sensitive donor group (%s): %s may hydrolyse or polymerise it before it reacts (common practice, no source)", moleculeLabel(diene), strings.Join(groups, ", "), acid)}
}

// Effect compares an activated dienophile with its free form: how far the LUMO came down,
// how the LUMO coefficients at the β- and α-carbons of the activated group's C=C moved apart
// (c²(Cβ) − c²(Cα); Cα is the carbon bonded to the carbonyl or imine carbon), and how the
// secondary-orbital (endo) term of the preferred orientation changed. K. N. Houk and
// R. W. Strozier (J. Am. Chem. Soc. 1973, 95, 4094) explained Lewis-acid catalysis by these
// three changes: a lower LUMO (faster), a larger coefficient at Cβ (more regioselective) and a
// larger coefficient at the carbonyl carbon (more endo-selective); the last is reported as
// CarbonylLUMO, c² of the LUMO at the carbonyl (or imine) carbon, beside the change of the
// pair's whole endo term, which also holds the inverse pairing.
//
// The LUMO is that of the π system containing the activated group. freePair and actPair are
// the analyses of the same diene with free and activated; either may be nil, and then
// EndoChange is 0. mode names the activation of activated (to find its group again); for a
// group not conjugated with a C=C or C≡C both asymmetries are 0.
func Effect(free, activated *Partner, mode string, freePair, actPair *Pair, opts *Options) *ActivationEffect {
	eff := &ActivationEffect{}
	site, err := FindActivationSite(free.Mol, mode)
	anchor := 0
	if err == nil && site.Carbon >= 0 {
		anchor = site.Carbon
	}
	xf, asymF, ccF, okF := lumoAt(free, anchor, site)
	xa, asymA, ccA, okA := lumoAt(activated, anchor, site)
	if okF && okA {
		eff.LUMOLowering = Energy{Beta: xa - xf, EV: opts.ev(xf, false) - opts.ev(xa, false)}
	}
	eff.BetaAsymmetryFree, eff.BetaAsymmetry = asymF, asymA
	eff.CarbonylLUMOFree, eff.CarbonylLUMO = ccF, ccA
	if freePair != nil && actPair != nil && len(freePair.Orientations) > 0 && len(actPair.Orientations) > 0 {
		eff.EndoChange = actPair.Orientations[0].EndoOverlap - freePair.Orientations[0].EndoOverlap
	}
	return eff
}

// lumoAt returns x of the LUMO of the π fragment holding atom anchor, c²(β) − c²(α) of that
// LUMO and its c² at the carbonyl/imine carbon (each summed over a degenerate set).
func lumoAt(p *Partner, anchor int, site ActivationSite) (x, asym, cc float64, ok bool) {
	c := p.Pi.CentreOf(anchor)
	if c < 0 {
		return 0, 0, 0, false
	}
	_, l := fragmentFrontier(p.Orb, p.Pi.Centres[c].Fragment)
	if l < 0 {
		return 0, 0, 0, false
	}
	x = p.Orb.Levels[l].X
	for _, li := range p.Orb.DegenerateSet(l) {
		if site.Alpha >= 0 && site.Beta >= 0 {
			cb := p.Orb.Coefficient(li, site.Beta)
			ca := p.Orb.Coefficient(li, site.Alpha)
			asym += cb*cb - ca*ca
		}
		if site.Carbon >= 0 {
			k := p.Orb.Coefficient(li, site.Carbon)
			cc += k * k
		}
	}
	return x, asym, cc, true
}

// Variant is the analysis of one activation mode of a dienophile with a diene.
type Variant struct {
	Mode string
	Pair *Pair // nil when Err is set
	Err  error
}

// AnalyzeVariants analyses diene with dienophile under each mode in order (dienophile must be
// the free, unactivated partner). Each activated variant's Pair gets Activated (the Effect
// against the free dienophile, which is analysed once even when "none" is not among modes)
// and the cautions of DieneCautions and Activate in its Warnings. A mode that cannot be
// applied (nothing to activate, bad amine) yields a Variant with Err and the others go on;
// an error of the free analysis is returned for every variant.
func AnalyzeVariants(diene, dienophile *Partner, modes []string, act *ActivateOptions, opts *Options) []Variant {
	out := make([]Variant, 0, len(modes))
	freePair, freeErr := Analyze(diene, dienophile, opts)
	for _, mode := range modes {
		v := Variant{Mode: mode}
		switch {
		case freeErr != nil:
			v.Err = freeErr
		case mode == ActivateNone:
			p := *freePair
			v.Pair = &p
		default:
			ap, err := dienophile.WithActivation(mode, act, opts)
			if err != nil {
				v.Err = err
				break
			}
			pair, err := Analyze(diene, ap, opts)
			if err != nil {
				v.Err = err
				break
			}
			pair.Activated = Effect(dienophile, ap, mode, freePair, pair, opts)
			for _, w := range DieneCautions(diene.Mol, mode) {
				if !slices.Contains(pair.Warnings, w) {
					pair.Warnings = append(pair.Warnings, w)
				}
			}
			v.Pair = pair
		}
		out = append(out, v)
	}
	return out
}
