package fmo

import (
	"errors"
	"fmt"
	"math"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// Side-channel kinds.
const (
	SideDieneDimerisation = "diene_dimerisation"
	SideProductDienophile = "product_as_dienophile"
)

// DefaultSideChannelBeta is the margin (|β|) within which a side channel's controlling gap
// counts as competing with the pair's: Competes when side gap − pair gap ≤ this value (a side
// channel with a smaller gap always competes). The value comes from the measured Sauer series
// in the check set (J. Sauer, H. Wiest, A. Mielert, Chem. Ber. 1964, 97, 3183, rate constants
// from memory): with the default parameters its rate constants span 10.6 powers of ten over
// 0.46 |β| of normal gap, about 0.045 |β| per factor of ten, so 0.1 |β| is roughly two
// orders of magnitude in rate at equal concentrations — close enough that concentrations,
// temperature and the neglected terms decide. A judgement built on that figure, not a
// published threshold.
const DefaultSideChannelBeta = 0.1

// controllingGap is the smaller of the pair's two gaps at its preferred units (the pairing
// that controls the rate in the FMO picture, whatever the demand label).
func controllingGap(p *Pair) Energy {
	if p.GapInverse.Beta < p.GapNormal.Beta {
		return p.GapInverse
	}
	return p.GapNormal
}

// SideChannels checks the competing reactions of a pair already analysed by Analyze:
//
//   - diene_dimerisation: the 4π partner reacting with itself, its own π bonds acting as the
//     2π partner (cyclopentadiene dimerising to dicyclopentadiene, 1,3-dienes to
//     vinylcyclohexenes);
//   - product_as_dienophile: the preferred adduct's remaining π bonds acting as the 2π
//     partner toward the same 4π partner (a second cycloaddition, e.g. the bis-adduct of a
//     quinone), only when the adduct has a reacting 2π unit. The adduct is the isolated
//     product's constitution as Analyze built it from the partners (their atom order and
//     Kekulé structures); dienophile is the pair's 2π partner or its unactivated form.
//
// A channel's gap is the controlling gap (the smaller of normal and inverse) at the reacting
// units the pair analysis itself prefers for that side reaction — the same ranking score,
// localisation included, that picks the units of the main pair — so a benzene ring conjugated
// with the reacting group (phenyl azide, styrene) is not mistaken for the side channel's
// reacting bond merely because every unit of one π system shares its frontier levels. The
// pair's gap is the controlling gap at its
// preferred units. Margin = side gap − pair gap (|β|) and ScoreMargin = pair score − side
// score (|β|); the channel Competes when both are ≤ DefaultSideChannelBeta: the gap says the
// side reaction is about as fast by the frontier criterion (Sauer & Sustmann 1980), and the
// score, which carries the localisation energy, says it does not pay for that with a loss of
// aromaticity the main pair avoids (phenyl azide is not flagged as dimerising through its
// benzene ring) (SideChannelsWithin takes another margin). The comparison is per encounter: the
// concentrations, which a chemist controls (slow addition, excess of one partner), are not
// in it. A channel whose partner has no reacting unit is left out; one that fails otherwise
// is listed with the reason in its Note. The pair is not modified; see
// (*Pair).AttachSideChannels.
func SideChannels(diene, dienophile *Partner, pair *Pair, opts *Options) []SideChannel {
	return SideChannelsWithin(diene, dienophile, pair, opts, DefaultSideChannelBeta)
}

// SideChannelsWithin is SideChannels with a competition margin of margin |β|
// (DefaultSideChannelBeta when margin ≤ 0).
func SideChannelsWithin(diene, dienophile *Partner, pair *Pair, opts *Options, margin float64) []SideChannel {
	return sideChannels(diene, dienophile, pair, opts, margin, nil)
}

// SideChannelCache memoises the part of the side-channel check that depends on the 4π
// partner alone (its self-dimerisation), so a screen that analyses one diene with many
// dienophiles solves that side reaction once per diene instead of once per row. It is safe for
// concurrent use; the zero value is ready. Results are the same with or without it.
//
// It also keeps the second-adduct check of recent rows, keyed by the 4π partner, the 2π
// partner passed to SideChannels and the two bonds that join them: the activated variants of
// one dienophile give the same adduct (products are built from the unactivated molecules),
// so a screen over several activations checks each adduct once as long as it passes the
// unactivated partner. That part holds at most sideAdductCap entries (it is emptied when
// full), so memory does not grow with the number of rows.
type SideChannelCache struct {
	dimers   onceMap[*Partner, sideResult]
	adducts  onceMap[adductKey, sideResult]
	residues onceMap[residueKey, residue] // each partner's half of its adducts (residue.go)
}

// adductKey names an adduct by its partners and the two bonds that join them: the
// dienophile is the unactivated partner (or any variant with the same molecule), since
// products are built from the unactivated molecules.
type adductKey struct {
	diene, dienophile *Partner
	bonds             [2][2]int
	smiles            string // the isolated product's SMILES where the note names it
}

// sideAdductCap bounds the adduct part of SideChannelCache.
const sideAdductCap = 4096

func (c *SideChannelCache) adduct(k adductKey, f func() sideResult) sideResult {
	return *c.adducts.get(k, sideAdductCap, f)
}

// SideChannels is the package-level SideChannels with the dimerisation looked up in (and
// stored into) the cache.
func (c *SideChannelCache) SideChannels(diene, dienophile *Partner, pair *Pair, opts *Options) []SideChannel {
	return sideChannels(diene, dienophile, pair, opts, DefaultSideChannelBeta, c)
}

func (c *SideChannelCache) dimerisation(diene *Partner, opts *Options) sideResult {
	return *c.dimers.get(diene, 0, func() sideResult { return dimerisation(diene, opts) })
}

// sideResult is one side reaction analysed on its own, before it is compared with a pair.
type sideResult struct {
	kind, what string
	skip       bool   // the side partner has no reacting unit: nothing to report
	failed     string // non-empty: the check could not be made, and why
	gap        Energy
	site       string
	score      float64
}

// analyseSide prepares m as a 2π partner and analyses it with diene.
func analyseSide(kind, what string, diene *Partner, m *molecule.Molecule, opts *Options) sideResult {
	r := sideResult{kind: kind, what: what}
	// The partner is read by preferredGap only (scores and gaps, never the conjugation
	// loss): it skips that term's solves.
	sp := &Partner{Name: m.Name, SMILES: m.Source, Role: RoleDienophile, Mol: m, Activation: "none", Active: m, noConj: true}
	if sp.Name == "" {
		sp.Name = sp.SMILES
	}
	err := sp.prepare(opts)
	if err != nil {
		if errors.Is(err, ErrNoUnit) {
			r.skip = true
		} else {
			r.failed = err.Error()
		}
		return r
	}
	g, site, score, err := preferredGap(diene, sp, opts)
	if err != nil {
		r.failed = err.Error()
		return r
	}
	r.gap, r.site, r.score = g, site, score
	return r
}

// dimerisation analyses the 4π partner with itself; atom maps (pins) are dropped so any π
// bond may react.
func dimerisation(diene *Partner, opts *Options) sideResult {
	self := diene.Mol.Clone()
	for i := range self.Atoms {
		self.Atoms[i].Map = 0
	}
	if self.Source != "" {
		self.Source = smiles.Write(self)
	}
	self.Name = diene.Name
	return analyseSide(SideDieneDimerisation, diene.Name+" dimerisation", diene, self, opts)
}

func sideChannels(diene, dienophile *Partner, pair *Pair, opts *Options, margin float64, cache *SideChannelCache) []SideChannel {
	if diene == nil || pair == nil || len(pair.Orientations) == 0 {
		panic("fmo.SideChannels: nil diene or unanalysed pair")
	}
	if margin <= 0 {
		margin = DefaultSideChannelBeta
	}
	ref := controllingGap(pair)
	refScore := pair.Orientations[0].Score
	out := []SideChannel{}
	add := func(r sideResult) {
		switch {
		case r.skip:
			return
		case r.failed != "":
			out = append(out, SideChannel{Kind: r.kind, Note: r.what + ": not checked: " + r.failed})
			return
		}
		sc := SideChannel{Kind: r.kind, Gap: r.gap, Margin: snapTie(r.gap.Beta - ref.Beta), ScoreMargin: snapTie(refScore - r.score)}
		sc.Competes = sc.Margin <= margin && sc.ScoreMargin <= margin
		verdict := "does not compete"
		switch {
		case sc.Competes:
			verdict = "competes"
		case sc.Margin <= margin:
			verdict = "does not compete: the gap is close, but the π energy lost at that site (localisation) puts its ranking score " +
				fmt.Sprintf("%.3f |β| below the pair's", sc.ScoreMargin)
		}
		sc.Note = fmt.Sprintf("%s at %s: controlling gap %.3f |β| against %.3f |β| for the pair (margin %+.3f |β|; competes within %.2f |β|): %s",
			r.what, r.site, r.gap.Beta, ref.Beta, sc.Margin, margin, verdict)
		out = append(out, sc)
	}

	if cache != nil {
		add(cache.dimerisation(diene, opts))
	} else {
		add(dimerisation(diene, opts))
	}

	// The remaining π bonds of the isolated product (after any loss of N₂, CO₂ or an
	// alcohol: the bridged N=N of a tetrazine adduct is gone before a second diene could
	// meet it) with the 4π partner.
	o := &pair.Orientations[0]
	var check func() sideResult
	key := adductKey{diene: diene, dienophile: dienophile, bonds: o.Bonds}
	switch {
	case o.IsolatedProduct != "" || o.isolated == nil:
		// The isolated product as its SMILES reads (the full analysis, or a Pair decoded
		// from JSON): the note's atom numbers are those of the SMILES it shows.
		prodSMILES := o.IsolatedProduct
		if prodSMILES == "" {
			prodSMILES = o.Product
		}
		key.smiles = prodSMILES // the configuration in it may differ between activations
		check = func() sideResult {
			pm, err := smiles.Parse(prodSMILES)
			if err != nil {
				return sideResult{kind: SideProductDienophile, what: "adduct " + prodSMILES, failed: err.Error()}
			}
			pm.Name = "adduct " + prodSMILES
			return analyseSide(SideProductDienophile, pm.Name+" as dienophile toward "+diene.Name, diene, pm, opts)
		}
	default:
		// fmo.DetailRow writes no isolated-product SMILES (its stereo searches were most
		// of a row's cost): the constitution as built, in partner atom order. Its π system
		// is the same up to the order of the centres, so gaps and scores agree with the
		// SMILES route to rounding; only the note's atom numbers refer to that order.
		what := "adduct " + o.Product
		if o.isolatedSteps {
			what = "isolated product of adduct " + o.Product
		}
		iso := o.isolated
		if r, ok := residueSide(diene, o, what, opts, cache); ok {
			check = func() sideResult { return r }
			break
		}
		check = func() sideResult {
			pm := iso.Clone()
			pm.Name = what
			return analyseSide(SideProductDienophile, what+" as dienophile toward "+diene.Name, diene, pm, opts)
		}
	}
	if cache != nil && dienophile != nil {
		add(cache.adduct(key, check))
	} else {
		add(check())
	}
	return out
}

// residueSide is the product_as_dienophile check of orientation o assembled from the two
// partners' residues (residue.go), or false where that route does not apply.
func residueSide(diene *Partner, o *Orientation, what string, opts *Options, cache *SideChannelCache) (sideResult, bool) {
	src := o.src
	if src == nil || o.isolatedSteps || !residueRouteOK(opts) {
		return sideResult{}, false
	}
	var halves [2]*residue
	if cache != nil {
		halves = [2]*residue{cache.residue(src.diene, src.di, opts), cache.residue(src.dienophile, src.ei, opts)}
	} else {
		d, e := residueOf(src.diene, src.di, opts), residueOf(src.dienophile, src.ei, opts)
		halves = [2]*residue{&d, &e}
	}
	for _, h := range halves {
		if h.err != nil || h.joins {
			return sideResult{}, false
		}
	}
	adduct := &molecule.Molecule{Name: what, Atoms: o.isolated.Atoms, Bonds: o.isolated.Bonds}
	r := sideResult{kind: SideProductDienophile, what: what + " as dienophile toward " + diene.Name}
	g, site, score, ok, err := residueGap(diene, halves, adduct, len(src.diene.Mol.Atoms), opts)
	switch {
	case !ok:
		r.skip = true
	case err != nil:
		r.failed = err.Error()
	default:
		r.gap, r.site, r.score = g, site, score
	}
	return r, true
}

// tieTol (|β|) is the rounding noise of a gap or score difference: two solves of one π
// system with its centres in different orders agree to about 1e-15 |β|, far below the
// 0.001 |β| the reports print. A side channel whose gap equals the pair's (the adduct keeps a
// π unit identical to the one that reacted) must not read "above" or "below" by the sign of
// that noise.
const tieTol = 1e-9

// snapTie returns 0 for a difference within tieTol of zero, else d.
func snapTie(d float64) float64 {
	if math.Abs(d) <= tieTol {
		return 0
	}
	return d
}

// preferredGap analyses diene (4π) with side (2π) and returns the controlling gap at the
// preferred orientation, its site description and its ranking score: exactly what Analyze
// would report as controllingGap(p), p.Orientations[0].Site and .Score (same kernel, same
// enumeration order, the first strictly better orientation wins ties as Analyze's stable sort
// does), without building the candidate adducts and their canonical SMILES, which only
// Analyze's margins need and which made up most of a screened row's cost.
func preferredGap(diene, side *Partner, opts *Options) (Energy, string, float64, error) {
	opts.check()
	k := opts.kernel()
	bd, be, bo := -1, -1, 0
	var best orientScore
	for di := range diene.Units {
		dd := &diene.data[di]
		if !dd.ok {
			continue
		}
		for ei := range side.Units {
			ed := &side.data[ei]
			if !ed.ok {
				continue
			}
			s0, s1 := k.scorePair(&dd.fast, &ed.fast)
			if bd < 0 || s0.score > best.score {
				best, bd, be, bo = s0, di, ei, 0
			}
			if s1.score > best.score {
				best, bd, be, bo = s1, di, ei, 1
			}
		}
	}
	if bd < 0 {
		return Energy{}, "", 0, fmt.Errorf("%s + %s: %w: no pair of reacting units has both frontier levels",
			diene.Name, side.Name, ErrNoUnit)
	}
	dd, ed := &diene.data[bd], &side.data[be]
	g := Energy{Beta: best.gapN, EV: opts.ev(ed.lumo.X, false) - opts.ev(dd.homo.X, true)}
	if best.gapI < best.gapN {
		g = Energy{Beta: best.gapI, EV: opts.ev(dd.lumo.X, false) - opts.ev(ed.homo.X, true)}
	}
	eu := side.Units[be]
	x, y := eu.Atoms[0], eu.Atoms[1]
	if bo == 1 {
		x, y = y, x
	}
	return g, siteName(diene, diene.Units[bd], side, []int{x, y}), best.score, nil
}

// AttachSideChannels stores channels in the pair and adds a warning for each competing one.
func (p *Pair) AttachSideChannels(channels []SideChannel) {
	p.SideChannels = append(p.SideChannels[:0], channels...)
	ref := controllingGap(p).Beta
	for _, c := range channels {
		if !c.Competes {
			continue
		}
		cmp := fmt.Sprintf("below the pair's %.3f |β|", ref)
		switch {
		case c.Margin == 0:
			cmp = fmt.Sprintf("equal to the pair's %.3f |β|", ref)
		case c.Margin > 0:
			cmp = fmt.Sprintf("only %.3f |β| above the pair's %.3f |β|", c.Margin, ref)
		}
		var w string
		switch c.Kind {
		case SideDieneDimerisation:
			w = fmt.Sprintf("side channel: the diene may dimerise — its self-cycloaddition gap %.3f |β| is %s; keep the diene cold and dilute, add it slowly to excess dienophile, or crack it fresh (common practice, no source)", c.Gap.Beta, cmp)
		case SideProductDienophile:
			w = fmt.Sprintf("side channel: the adduct's remaining π bond can take a second equivalent of the diene — its gap %.3f |β| is %s; use the dienophile in excess to limit the bis-adduct (common practice, no source)", c.Gap.Beta, cmp)
		default:
			w = "side channel competes: " + c.Note
		}
		p.Warnings = append(p.Warnings, w)
	}
}
