package fmo

import (
	"errors"
	"fmt"

	"cyclopair/huckel/molecule"
)

// The second-adduct check of a row (product_as_dienophile) analyses the adduct as a 2π
// partner. Where the adduct's π system falls apart into pieces of one partner each, it can
// be assembled from the two partners' residues instead of being prepared per row:
//
// In the adduct the four termini are joined by two new σ bonds. A π bond could cross from
// one partner's atoms to the other's only along those bonds, and only if both ends were π
// centres not both lone-pair donors or alkyl pseudo-atoms (huckel.Perceive's rule). When no
// terminus is a core or acceptor centre (a terminus that keeps a multiple bond, as the C=C
// of an alkyne's adduct does, is one), no such bond exists, and whether a terminus joins the
// π system as an alkyl pseudo-atom or donor depends on its core neighbours within its own
// partner alone. The adduct's π fragments are then exactly the fragments of the two
// residues: each partner after the reaction (its product Kekulé structure and charges, the
// side of kekule.go) with each new σ bond replaced by a hydrogen on the terminus. Hückel
// orbitals do not mix across fragments, the 2π units (piUnits: one π bond each) and their
// Kekulé re-matching (adductSide) stay within them, and a unit's localisation is the π energy
// of its own fragment before and after, so every unit's frontier levels, terminus
// projections, charges and localisation are those of the adduct, to rounding (two π
// systems summed in another order). A screen computes each residue once per partner and
// unit (SideChannelCache) instead of preparing every row's adduct.
//
// The residue route is taken only for the Hückel method without the ω-technique (PPP and
// ω couple fragments through the electron repulsion or the self-consistency loop) and for
// adducts without follow-up steps (N₂ or CO₂ loss rebuilds the ring across both partners);
// otherwise, and whenever a residue cannot be prepared, the adduct itself is analysed.

// adductSource names the partners and units an orientation's adduct was built from.
type adductSource struct {
	diene, dienophile *Partner
	di, ei            int
}

// residueUnit is one 2π unit of a residue: its atoms in the partner's numbering and the
// numbers the side-channel score reads.
type residueUnit struct {
	x, y int
	fast fastUnit
}

// residue is one partner's half of an adduct, prepared as a 2π partner.
type residue struct {
	units []residueUnit // units with both frontier levels, in the partner's unit order
	// joins: a terminus is a core or acceptor centre, so π bonds may cross to the other
	// partner (use the adduct itself).
	joins bool
	err   error // the residue could not be prepared (use the adduct itself)
}

// residueRouteOK reports whether the method allows the residue route at all.
func residueRouteOK(opts *Options) bool {
	return opts.NewMethod == nil && opts.Params.Omega == 0
}

// residueOf prepares partner p's half of its adducts through unit ui.
func residueOf(p *Partner, ui int, opts *Options) residue {
	m := half(p, ui)
	m.Name = p.Name + " after reaction"
	// each new σ bond of the termini (the atoms that form them) becomes a hydrogen
	t0, t1 := p.Units[ui].Termini()
	m.Atoms[t0].HCount++
	m.Atoms[t1].HCount++
	sp := &Partner{Name: m.Name, Role: RoleDienophile, Mol: m, Activation: "none", Active: m, noConj: true}
	err := sp.prepare(opts)
	var r residue
	if sp.Pi != nil {
		for _, t := range [2]int{t0, t1} {
			if c := sp.Pi.CentreOf(t); c >= 0 && sp.Pi.Centres[c].Electrons < 2 {
				r.joins = true
			}
		}
	}
	switch {
	case err == nil:
		for i, su := range sp.Units {
			if d := &sp.data[i]; d.ok {
				r.units = append(r.units, residueUnit{x: su.Atoms[0], y: su.Atoms[1], fast: d.fast})
			}
		}
	case errors.Is(err, ErrNoUnit): // nothing of this half can react again
	default:
		r.err = err
	}
	return r
}

// residueGap is preferredGap over the adduct assembled from two residues: diene units
// outermost, then the diene residue's units and the dienophile residue's (the adduct's unit
// order: buildProduct numbers the diene's atoms and bonds first). adduct describes the site;
// off is the dienophile's atom offset in it. ok is false when the adduct has no 2π unit
// (product_as_dienophile is then skipped, as analyseSide skips it).
func residueGap(diene *Partner, halves [2]*residue, adduct *molecule.Molecule, off int, opts *Options) (g Energy, site string, score float64, ok bool, err error) {
	opts.check()
	k := opts.kernel()
	bd, bh, be, bo := -1, -1, -1, 0
	var best orientScore
	if len(halves[0].units)+len(halves[1].units) == 0 {
		return Energy{}, "", 0, false, nil
	}
	for di := range diene.Units {
		dd := &diene.data[di]
		if !dd.ok {
			continue
		}
		for h, r := range halves {
			for ei := range r.units {
				ef := &r.units[ei].fast
				s0, s1 := k.scorePair(&dd.fast, ef)
				if bd < 0 || s0.score > best.score {
					best, bd, bh, be, bo = s0, di, h, ei, 0
				}
				if s1.score > best.score {
					best, bd, bh, be, bo = s1, di, h, ei, 1
				}
			}
		}
	}
	if bd < 0 {
		return Energy{}, "", 0, true, fmt.Errorf("%s + %s: %w: no pair of reacting units has both frontier levels",
			diene.Name, adduct.Name, ErrNoUnit)
	}
	dd, eu := &diene.data[bd], &halves[bh].units[be]
	g = Energy{Beta: best.gapN, EV: opts.ev(eu.fast.lx, false) - opts.ev(dd.homo.X, true)}
	if best.gapI < best.gapN {
		g = Energy{Beta: best.gapI, EV: opts.ev(dd.lumo.X, false) - opts.ev(eu.fast.hx, true)}
	}
	x, y := eu.x, eu.y
	if bh == 1 {
		x, y = x+off, y+off
	}
	if bo == 1 {
		x, y = y, x
	}
	return g, siteName(diene, diene.Units[bd], &Partner{Mol: adduct}, []int{x, y}), best.score, true, nil
}

type residueKey struct {
	p  *Partner
	ui int
}

// residueCap bounds the residues of a SideChannelCache (emptied when full): a residue is a
// few hundred bytes.
const residueCap = 1 << 16

// residue is residueOf, once per partner and unit.
func (c *SideChannelCache) residue(p *Partner, ui int, opts *Options) *residue {
	return c.residues.get(residueKey{p, ui}, residueCap, func() residue { return residueOf(p, ui, opts) })
}
