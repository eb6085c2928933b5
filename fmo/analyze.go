package fmo

import (
	"fmt"
	"slices"
	"strings"

	"cyclopair/huckel/molecule"
)

// MaxListedOrientations caps the distinct adducts a Pair lists in Orientations (best
// first); every candidate is still scored and counted in OrientationsChecked, and a warning
// gives the number left out. Ordinary partners have far fewer (two units each give eight);
// the cap keeps a long polyene from costing a canonical SMILES and stereo forms for each of
// its thousands of candidate adducts (issue 14).
const MaxListedOrientations = 64

// Analyze analyses one 4π partner against one 2π partner over every pair of candidate
// reacting units, both regio-orientations and both frontier pairings.
//
// Ranking. Each orientation gets
//
//	stabilization = FrontierTerm + ChargeTerm                      (perturbation energy, |β|)
//	score         = stabilization − λ·Localization − w·min(gap_normal, gap_inverse)
//
// with λ = Options.LocalizationWeight and w = Options.GapWeight (see there for why each is
// there and how its value was chosen).
// FrontierTerm is the Klopman–Salem orbital term over the frontier levels only (HOMO(diene)–
// LUMO(dienophile) plus LUMO(diene)–HOMO(dienophile), degenerate sets summed), with the
// first-order form where a gap is too small (see score.go); Localization is the π energy both
// partners lose when the termini become sp3. Orientations are sorted by score, best first
// (ties keep the enumeration order: diene units, dienophile units, orientation 0 then 1).
// The frontier-only sum is the classic FMO answer; it was chosen over an all-orbital sum
// because the regiochemistry of substituted partners lives in the frontier coefficients
// (lower levels dilute it with terms that barely differ between orientations), it stays exact
// for degenerate sets, and it lets QuickScore reproduce Analyze exactly from a few numbers
// per unit.
//
// Margins and verdicts: RegioMargin is the score difference to the other orientation at the
// preferred pair of units; SiteMargin the difference to the best orientation at a pair of units
// giving a different adduct; confidence compares RegioMargin/FrontierTerm with
// Options.RegioClear and RegioSlight. Endo compares EndoOverlap/FrontierTerm of the
// preferred orientation with Options.EndoYes and EndoWeak. Demand compares the two gaps of
// the preferred units with Options.DemandThreshold.
//
// Analyze panics on misuse (nil partners, wrong roles, nil Options); it returns an error only
// if no orientation can be built.
func Analyze(diene, dienophile *Partner, opts *Options) (*Pair, error) {
	return AnalyzeDetail(diene, dienophile, opts, DetailAll)
}

// Detail says how much of a Pair AnalyzeDetail fills in beyond the ranking numbers.
type Detail uint8

const (
	// DetailAll fills every listed orientation: canonical product, endo/exo stereo
	// products, follow-up steps and isolated product (what Analyze does).
	DetailAll Detail = iota
	// DetailBest fills those only for the preferred orientation (Orientations[0]); the
	// other listed orientations keep everything else (bonds, sites, labels, every energy
	// term, fractions) but carry no Product, StereoProducts, FollowUp or IsolatedProduct.
	// Which orientations are listed, the margins, verdicts and warnings are the same as
	// with DetailAll: adducts are still told apart exactly. For outputs that show only the
	// preferred orientation's product (the screen's table, CSV, Markdown and SD formats),
	// where the stereo forms of the other orientations were most of a row's cost.
	DetailBest
	// DetailRow is DetailBest without the preferred orientation's StereoProducts, FollowUp
	// (left nil) and IsolatedProduct (left empty): it keeps its Product, and no stereo
	// search runs at all. The side-channel check analyses the isolated product's
	// constitution as built from the partners (isolatedConstitution), which gives the full
	// analysis's side-channel figures to rounding. When at most MaxListedOrientations
	// candidates were scored it lists the preferred orientation alone, as the other
	// candidates need not then be told apart (so the regio fractions the rate model's
	// ratio annotation puts on the orientations, and FractionInterval, are not those of the
	// full list). For the row formats that show the preferred orientation's product, label
	// and figures and the Pair's own fields only (the screen's table, CSV, Markdown and SD
	// formats); margins, verdicts, warnings, side channels and rate are as with DetailAll.
	DetailRow
)

// AnalyzeDetail is Analyze computing the per-orientation extras the detail level asks for.
func AnalyzeDetail(diene, dienophile *Partner, opts *Options, detail Detail) (*Pair, error) {
	opts.check()
	if diene == nil || dienophile == nil {
		panic("fmo.Analyze: nil partner")
	}
	if diene.Role != RoleDiene || dienophile.Role != RoleDienophile {
		panic(fmt.Sprintf("fmo.Analyze: roles %v, %v (want diene, dienophile)", diene.Role, dienophile.Role))
	}
	k := opts.kernel()
	// A candidate is its score and units; its Orientation (site name, label, atom lists) is
	// built only if it is listed: duplicates and the candidates past the cap never need one.
	type cand struct {
		s          orientScore
		di, ei, or int
	}
	nd, ne := 0, 0
	for i := range diene.data {
		if diene.data[i].ok {
			nd++
		}
	}
	for i := range dienophile.data {
		if dienophile.data[i].ok {
			ne++
		}
	}
	cands := make([]cand, 0, 2*nd*ne)
	for di := range diene.Units {
		dd := &diene.data[di]
		if !dd.ok {
			continue
		}
		for ei := range dienophile.Units {
			ed := &dienophile.data[ei]
			if !ed.ok {
				continue
			}
			s01 := [2]orientScore{}
			s01[0], s01[1] = k.scorePair(&dd.fast, &ed.fast)
			for or := 0; or < 2; or++ {
				s := s01[or]
				s.endo = k.endoTerm(&dd.fast, &ed.fast, &diene.endo[di], &dienophile.endo[ei], or)
				cands = append(cands, cand{s: s, di: di, ei: ei, or: or})
			}
		}
	}
	orientation := func(c *cand) Orientation {
		du, eu := diene.Units[c.di], dienophile.Units[c.ei]
		dd := &diene.data[c.di]
		s := &c.s
		bonds := productBonds(du, eu, c.or)
		eAtoms := []int{bonds[0][1], bonds[1][1]}
		method := "second-order"
		if s.firstOrder {
			method = "first-order"
		}
		o := Orientation{
			Site:            siteName(diene, du, dienophile, eAtoms),
			DieneAtoms:      slices.Clone(du.Atoms),
			DienophileAtoms: eAtoms,
			Bonds:           bonds,
			Stabilization:   s.stab,
			FrontierTerm:    s.frontier,
			ChargeTerm:      s.charge,
			Localization:    s.loc,
			Score:           s.score,
			NormalTerm:      s.normal,
			InverseTerm:     s.inverse,
			Method:          method,
			Label:           regioLabel(diene, dienophile, du, eu, c.or),
			EndoOverlap:     s.endo,
			Kind:            cycloKind(du),
			RingSize:        du.RingSize(),
		}
		o.DieneLocalization, o.DieneConjugationLoss = dd.loc, dd.conj
		return o
	}
	if len(cands) == 0 {
		return nil, fmt.Errorf("%s + %s: %w: no pair of reacting units has both frontier levels",
			diene.Name, dienophile.Name, ErrNoUnit)
	}
	slices.SortStableFunc(cands, func(p, q cand) int {
		switch {
		case p.s.score > q.s.score:
			return -1
		case p.s.score < q.s.score:
			return 1
		}
		return 0
	})
	best := cands[0]
	bestO := orientation(&best)
	pair := &Pair{
		DieneName:           diene.Name,
		DienophileName:      dienophile.Name,
		Diene:               diene.SMILES,
		Dienophile:          dienophile.SMILES,
		Activation:          dienophile.Activation,
		Params:              opts.Params.Name,
		Method:              diene.Orb.Method,
		Calibration:         opts.CalibrationName,
		CalibrationDetail:   opts.calibrationDetail(),
		FormingBeta:         opts.FormingBeta,
		SecondaryBeta:       opts.SecondaryBeta,
		LocalizationWeight:  opts.LocalizationWeight,
		GapWeight:           opts.GapWeight,
		DemandThreshold:     opts.DemandThreshold,
		ScoreFormula:        ScoreFormula,
		OrbitalSum:          orbitalSum(opts),
		SideChannels:        []SideChannel{},
		Warnings:            []string{},
		ChargeTermOn:        opts.ChargeTerm,
		RegioThresholds:     [2]float64{opts.RegioClear, opts.RegioSlight},
		EndoThresholds:      [2]float64{opts.EndoYes, opts.EndoWeak},
		PreferredSite:       bestO.Site,
		PreferredKind:       bestO.Kind,
		OrientationsChecked: len(cands),
	}
	if dienophile.Activation != "none" && dienophile.Active != nil {
		pair.ActivatedDienophile = productSMILES(dienophile.Active)
	}
	// Canonical keys tell identical adducts apart from different ones. They are computed
	// lazily, and only where a graph invariant cannot already tell two adducts apart
	// (productkey.go): canonicalising every candidate costs O(n² log n) each for n atoms,
	// O(n⁴ log n) per pair on a long polyene (issue 14).
	keys := newProductKeys(len(cands), func(i int) *molecule.Molecule {
		c := &cands[i]
		pm, _ := buildProduct(diene, dienophile, c.di, c.ei, c.or)
		return pm
	}, func(i int) (uint64, []uint64) {
		c := &cands[i]
		return adductColours(diene, dienophile, c.di, c.ei, c.or) // no adduct built for a unique invariant
	})
	// One row per distinct adduct: an orientation giving the same compound as a better one
	// (the two orientations of a symmetric partner, symmetry-equivalent sites) is not listed
	// again; margins below still look at every candidate. At most MaxListedOrientations
	// rows are listed (each needs its canonical SMILES and stereo forms); the count of the
	// rest is stated in a warning.
	// same(i, j): adducts i and j are one compound. The partners show it without building
	// either adduct where their halves map onto each other (unitswap.go); the search
	// bound on j's colours is the condition keys.same puts on an isomorphism (i's are equal
	// when the two are isomorphic). Otherwise the product keys decide.
	byMaps := func(i, j int) bool {
		ci, cj := &cands[i], &cands[j]
		return i != j && sameAdduct(diene, dienophile, ci.di, ci.ei, ci.or, cj.di, cj.ei, cj.or) && searchBounded(keys.coloursOf(j))
	}
	same := func(i, j int) bool { return byMaps(i, j) || keys.same(i, j) }
	var listed []int
	unlisted := 0
	n := len(cands)
	if detail == DetailRow && n <= MaxListedOrientations {
		// Every distinct adduct would be listed, so no warning counts the rest, and the row
		// formats read only the preferred orientation: the other candidates need not be told
		// apart (the margins below compare the few they need).
		n = 1
	}
	pair.Orientations = make([]Orientation, 0, min(n, MaxListedOrientations))
	for i := range cands[:n] {
		// the partners' unit maps against every listed adduct first (no invariant of
		// adduct i needed), then the keys
		if slices.ContainsFunc(listed, func(j int) bool { return byMaps(i, j) }) ||
			slices.ContainsFunc(listed, func(j int) bool { return keys.same(i, j) }) {
			continue
		}
		if len(listed) == MaxListedOrientations {
			unlisted++
			continue
		}
		listed = append(listed, i)
		c := &cands[i]
		o := bestO
		if i != 0 {
			o = orientation(c)
		}
		o.Preferred = i == 0
		if detail != DetailAll && i != 0 {
			pair.Orientations = append(pair.Orientations, o)
			continue
		}
		// canonical product, stereo forms and follow-up steps only for the listed rows
		product := keys.canonical(i)
		o.Product = product
		du, eu := diene.Units[c.di], dienophile.Units[c.ei]
		pm, bonds := keys.mol(i), o.Bonds // the adduct canonical() was computed from
		if i == 0 {
			o.isolated, o.isolatedSteps = isolatedConstitution(diene, du, bonds, pm)
			o.src = &adductSource{diene: diene, dienophile: dienophile, di: c.di, ei: c.ei}
		}
		if detail == DetailRow {
			pair.Orientations = append(pair.Orientations, o)
			continue
		}
		endoPref := du.Kind != UnitDipole && endoDistinct(dienophile, eu) && c.s.frontier > 0 && c.s.endo/c.s.frontier >= opts.EndoWeak
		o.StereoProducts, o.FollowUp, o.IsolatedProduct = productForms(diene, dienophile, du, eu, bonds, pm, product, endoPref)
		pair.Orientations = append(pair.Orientations, o)
	}
	if unlisted > 0 {
		pair.Warnings = append(pair.Warnings, fmt.Sprintf("%d further orientations (lower scores, other adducts) are not listed: only the best %d distinct adducts are", unlisted, MaxListedOrientations))
	}

	// Margins.
	for _, c := range cands[1:] {
		if c.di == best.di && c.ei == best.ei {
			pair.RegioMargin = best.s.score - c.s.score
			break
		}
	}
	regioPartner := -1
	for i, c := range cands {
		if c.di == best.di && c.ei == best.ei && c.or != best.or {
			regioPartner = i
		}
	}
	regioSame := regioPartner >= 0 && same(regioPartner, 0) // both orientations give one adduct
	otherSite := false
	for i, c := range cands[1:] {
		// (when regioSame, differing from adduct 0 is differing from the regio partner)
		if (c.di != best.di || c.ei != best.ei) && !same(i+1, 0) && (regioPartner < 0 || regioSame || !same(i+1, regioPartner)) {
			pair.SiteMargin = best.s.score - c.s.score
			otherSite = true
			break
		}
	}
	rel := 0.0
	if best.s.frontier > 0 {
		rel = pair.RegioMargin / best.s.frontier
	}
	switch {
	case rel >= opts.RegioClear:
		pair.RegioConfidence = "clear"
	case rel >= opts.RegioSlight:
		pair.RegioConfidence = "slight"
	default:
		pair.RegioConfidence = "no preference"
	}
	if regioSame {
		pair.RegioConfidence = "no preference" // both orientations give the same adduct
	}

	// Endo.
	endoRel := 0.0
	if best.s.frontier > 0 {
		endoRel = best.s.endo / best.s.frontier
	}
	switch {
	case bestO.Kind != "[4+2]":
		pair.Endo = "no"
		pair.EndoNote = "1,3-dipolar cycloaddition: no secondary-orbital term is computed"
	case !endoDistinct(dienophile, dienophile.Units[best.ei]):
		pair.Endo = "no"
		pair.EndoNote = "no endo/exo question: no dienophile terminus carries exactly one conjugated substituent"
	case endoRel >= opts.EndoYes:
		pair.Endo = "yes"
	case endoRel >= opts.EndoWeak:
		pair.Endo = "weak"
	default:
		pair.Endo = "no"
	}

	// Gaps and demand at the preferred units.
	dd, ed := &diene.data[best.di], &dienophile.data[best.ei]
	pair.GapNormal = Energy{Beta: best.s.gapN, EV: opts.ev(ed.lumo.X, false) - opts.ev(dd.homo.X, true)}
	pair.GapInverse = Energy{Beta: best.s.gapI, EV: opts.ev(dd.lumo.X, false) - opts.ev(ed.homo.X, true)}
	pair.Demand, pair.SustmannType = demand(best.s.gapN, best.s.gapI, opts.DemandThreshold)
	pair.DieneHOMO = frontierOut(dd.homo, true, opts)
	pair.DieneLUMO = frontierOut(dd.lumo, false, opts)
	pair.DienophileHOMO = frontierOut(ed.homo, true, opts)
	pair.DienophileLUMO = frontierOut(ed.lumo, false, opts)

	// Allowedness of the preferred units.
	pair.Allowed, pair.AllowedReason = allowedness(dd, ed, diene.Units[best.di].Kind == UnitDipole, best.s)

	// Warnings.
	warn := func(s string) {
		if !slices.Contains(pair.Warnings, s) {
			pair.Warnings = append(pair.Warnings, s)
		}
	}
	for _, w := range diene.Warnings {
		warn("diene: " + w)
	}
	for _, w := range dienophile.Warnings {
		warn("dienophile: " + w)
	}
	if best.s.firstOrder {
		warn(fmt.Sprintf("frontier gap at or below the coupling (normal %.3f |β|, inverse %.3f |β|): second-order perturbation theory breaks down; the first-order (degenerate) form 2|γΣcc| was used; a polar or stepwise path may compete",
			best.s.gapN, best.s.gapI))
	}
	if best.s.gapN <= 0 || best.s.gapI <= 0 {
		warn("a frontier gap is negative (the donor's HOMO lies above the acceptor's LUMO): electron transfer is likely; treat the ranking with caution")
	}

	// Honest confidence (confidence.go) and reversibility (reversible.go).
	pair.EVDecimals = opts.evDecimals()
	if aromaticDieneRing(diene, diene.Units[best.di]) != nil {
		pair.Reversible = reversibleNote(pair.Endo == "yes" || pair.Endo == "weak")
		warn("reversible: " + pair.Reversible)
	}
	siteClass := ""
	if otherSite {
		siteClass = siteClassOf(dienophile.Activation)
	}
	addConfidence(pair, regioClassOf(diene, diene.Units[best.di], dienophile, dienophile.Units[best.ei], pair.Demand), siteClass,
		regioSame, warn)
	return pair, nil
}

// ScoreFormula is the ranking formula, reported in every Pair.
const ScoreFormula = "score = frontier_term + charge_term − localization_weight·localization − gap_weight·min(gap_normal, gap_inverse); " +
	"frontier_term = Σ_pairings w_p·2(γΣ_bonds c_r c_s)²/gap over the reacting unit's frontier sets (first-order 2|γΣcc| when gap ≤ |γΣcc|); " +
	"w_p = 1 for the smaller gap, max(0, 1 − |gap_normal − gap_inverse|/demand_threshold) for the other"

// endoDistinct reports whether endo and exo approaches of the 2π unit differ at all: some
// terminus must carry exactly one conjugated substituent (a one-electron π centre outside
// the unit), so that one group or the other lies under the diene. Tetracyanoethylene (two
// cyano groups on each carbon) and ethylene have no endo/exo question.
func endoDistinct(p *Partner, u Unit) bool {
	for i, x := range u.Atoms {
		y := u.Atoms[1-i]
		n := 0
		for _, e := range p.Mol.Neighbors(x) {
			if e.To == y {
				continue
			}
			if c := p.Pi.CentreOf(e.To); c >= 0 && oneElectron(p.Pi.Centres[c]) {
				n++
			}
		}
		if n == 1 {
			return true
		}
	}
	return false
}

func orbitalSum(o *Options) string {
	if o.AllOrbitals {
		return "all-orbital"
	}
	return "frontier"
}

func cycloKind(u Unit) string {
	if u.Kind == UnitDipole {
		return "[3+2]"
	}
	return "[4+2]"
}

func siteName(dp *Partner, du Unit, ep *Partner, eAtoms []int) string {
	var b strings.Builder
	b.WriteString(du.Describe(dp.Mol))
	b.WriteString(" + ")
	b.WriteString(Unit{Kind: UnitPi, Atoms: eAtoms}.Describe(ep.Mol))
	return b.String()
}

// demand classifies the pair from the two gaps (|β|): normal (Sustmann type I) when the
// normal gap is smaller by at least threshold, inverse (type III) when the inverse gap is,
// neutral (type II) otherwise.
func demand(gapN, gapI, threshold float64) (string, string) {
	switch {
	case gapI-gapN >= threshold:
		return "normal", "I"
	case gapN-gapI >= threshold:
		return "inverse", "III"
	}
	return "neutral", "II"
}

func frontierOut(fs frontierSet, occupied bool, opts *Options) Frontier {
	return Frontier{Index: fs.Level, X: fs.X, EV: opts.ev(fs.X, occupied), Degenerate: fs.N > 1}
}

// nodeRatio: a frontier set whose smaller terminus amplitude is below this fraction of the
// larger one (|c_min|/|c_max|, from the set projector's diagonal) has a node at a terminus and
// cannot decide the phase question; the other pairing then decides (judgement, no source).
const nodeRatio = 0.1

// phasePairing is one frontier pairing's terminus phases: prod = (Σ c_a c_d)(Σ c_1 c_2) over
// the two sets, nodal when either set has (nearly) no amplitude at one terminus.
type phasePairing struct {
	name  string
	prod  float64
	nodal bool
}

func nodal(paa, pdd float64) bool {
	lo, hi := min(paa, pdd), max(paa, pdd)
	return hi <= 0 || lo < nodeRatio*nodeRatio*hi
}

func pairingPhase(name string, p, q *[nSlots][nSlots]float64, tEnd int) phasePairing {
	return phasePairing{name: name, prod: p[0][tEnd] * q[0][1],
		nodal: nodal(p[0][0], p[tEnd][tEnd]) || nodal(q[0][0], q[1][1])}
}

// allowedness decides whether the supra–supra thermal pairing is symmetry-allowed from the
// phases of the frontier orbitals at the termini: with both partners approaching suprafacially,
// the two forming bonds are simultaneously bonding in a pairing exactly when
// (c_a·c_d of one partner's level) and (c_1·c_2 of the other's) have the same sign. For a
// degenerate set the products are the projector elements Σ_members c_a c_d, which do not
// depend on the basis chosen inside the set. The verdict is taken from the pairing that
// contributes more to the orbital term, unless that pairing has a node at a terminus
// (nodeRatio), when the other pairing decides; a disagreement is stated in the reason.
// This gives [4+2] and [3+2] allowed and [2+2] and [4+4] forbidden without a rule table.
func allowedness(d, e *unitData, dipole bool, s orientScore) (bool, string) {
	tEnd := 3
	if dipole {
		tEnd = 2
	}
	n := pairingPhase("HOMO(diene)–LUMO(dienophile)", &d.homo.P, &e.lumo.P, tEnd)
	i := pairingPhase("LUMO(diene)–HOMO(dienophile)", &d.lumo.P, &e.homo.P, tEnd)
	return phaseVerdict(n, i, s.normal >= s.inverse)
}

func phaseVerdict(n, i phasePairing, normalDominant bool) (bool, string) {
	describe := func(p phasePairing) string {
		switch {
		case p.nodal:
			return fmt.Sprintf("%s: node at a terminus (%+.4f)", p.name, p.prod)
		case p.prod > 0:
			return fmt.Sprintf("%s: in phase at both termini (c_a·c_d × c_1·c_2 = %+.4f)", p.name, p.prod)
		}
		return fmt.Sprintf("%s: out of phase at one terminus (c_a·c_d × c_1·c_2 = %+.4f)", p.name, p.prod)
	}
	dom, other := n, i
	if !normalDominant {
		dom, other = i, n
	}
	decider := dom
	if dom.nodal && !other.nodal {
		decider = other
	}
	allowed := !decider.nodal && decider.prod > 0
	var verdict string
	switch {
	case decider.nodal:
		verdict = "supra–supra undetermined (both pairings have a node at a terminus; treated as not allowed): "
	case allowed:
		verdict = "supra–supra allowed: "
	default:
		verdict = "supra–supra forbidden: "
	}
	reason := verdict + describe(dom) + "; " + describe(other)
	if decider.name != dom.name {
		reason += "; decided by the second pairing"
	}
	if !dom.nodal && !other.nodal && (dom.prod > 0) != (other.prod > 0) {
		reason += "; the two pairings disagree, the larger orbital term decides"
	}
	return allowed, reason
}

// SupraSupra decides the supra–supra thermal allowedness of joining terminus pair ta of
// partner a with terminus pair tb of partner b by the frontier-phase rule of Analyze, for
// any two π units (so [2+2] and [4+4] can be checked too). The frontier sets are those of
// the π fragments containing the termini; a is taken as the donor of the dominant pairing
// when its HOMO–LUMO(b) gap is the smaller one.
func SupraSupra(a *Partner, ta [2]int, b *Partner, tb [2]int) (bool, string) {
	type sets struct {
		homo, lumo [nSlots][nSlots]float64
		hx, lx     float64
	}
	proj := func(p *Partner, t [2]int) sets {
		var s sets
		f := p.Pi.Centres[p.Pi.CentreOf(t[0])].Fragment
		h, l := fragmentFrontier(p.Orb, f)
		if h < 0 || l < 0 {
			return s
		}
		slots := [nSlots]int{t[0], t[1], -1, -1}
		hs, ls := p.frontier(h, slots), p.frontier(l, slots)
		s.homo, s.lumo, s.hx, s.lx = hs.P, ls.P, hs.X, ls.X
		return s
	}
	sa, sb := proj(a, ta), proj(b, tb)
	n := pairingPhase("HOMO(first)–LUMO(second)", &sa.homo, &sb.lumo, 1)
	i := pairingPhase("LUMO(first)–HOMO(second)", &sa.lumo, &sb.homo, 1)
	return phaseVerdict(n, i, sa.hx-sb.lx <= sb.hx-sa.lx)
}
