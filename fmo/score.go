package fmo

import "math"

// This file is the scoring kernel shared by Analyze and QuickScore, so the two agree by
// construction.
//
// The orbital term is the Klopman–Salem second-order term restricted to the frontier levels
// (Klopman 1968; Salem 1968), summed over both frontier pairings:
//
//	ΔE_orb = Σ_pairings 2·S / g,    S = Σ_{i∈occupied set, j∈empty set} (Σ_bonds γ_rs c_ri c_sj)²
//
// where g = x(occupied) − x(empty) is the pairing's gap in |β| and the inner sum runs over
// the two forming σ bonds with resonance integral γ (Options.FormingBeta). A degenerate
// frontier level is summed over its whole set, which makes S independent of the basis chosen
// inside the set: S = Σ_{klmn} M_km M_ln P_kl Q_mn with the set projectors P, Q restricted to
// the unit atoms and M the coupling matrix (γ on the forming bonds, γ_s on the secondary
// contacts for the endo term).
//
// Where second-order theory breaks down (g ≤ √S: near-degenerate or crossed frontier levels,
// strong donor with strong acceptor, charged partners) the pairing switches to the first-order
// (degenerate) form 2·√S — the stabilisation of two electrons in two levels coupled by √S at
// zero gap. The switch point g = √S is where the two forms are equal, so the score is
// continuous in g.

// pairingTerm is the stabilisation from one frontier pairing with coupling sum S and gap g.
func pairingTerm(s, g float64) (e float64, firstOrder bool) { return term(s, g) }

// kernel holds the Options-derived constants of the scoring.
type kernel struct {
	gamma, gammaS, locWeight, chargeCoef float64
	g2                                   float64 // γ²
	gapWeight                            float64 // w in −w·min(gap_normal, gap_inverse)
	allOrbitals                          bool    // Options.AllOrbitals
	demand                               float64 // Options.DemandThreshold, for pairingWeights
	bothPairings                         bool    // Options.BothPairings
}

// pairingWeights returns the weights of the normal (HOMO(diene)–LUMO(dienophile)) and inverse
// pairings in the orbital term. Where one gap is clearly the smaller (type I or III, the gaps
// differ by at least Options.DemandThreshold) only that pairing counts; in the neutral band
// (type II) the minor pairing fades in linearly, to full weight at equal gaps, so the score
// stays continuous in the gaps:
//
//	w_minor = max(0, 1 − |gap_normal − gap_inverse| / DemandThreshold),  w_major = 1
//
// This is how the frontier-orbital treatment of cycloadditions is applied in practice: in
// type I and III reactions the regiochemistry and reactivity follow the coefficients of the
// dominant interaction alone, and both interactions are considered only when neither
// dominates (K. N. Houk, Acc. Chem. Res. 1975, 8, 361; R. Sustmann, Pure Appl. Chem. 1974, 40,
// 569). Summing the minor pairing at full weight let a pairing with four times the gap decide
// a site (2-methoxy- and 2-methyl-p-benzoquinone with butadiene: the quinone HOMO sits on the
// substituted C=C, the normal-demand LUMO term prefers the unsubstituted one). The ramp
// shape is a judgement (no source); its only constant is the demand threshold.
func (k *kernel) pairingWeights(gN, gI float64) (wN, wI float64) {
	if k.bothPairings {
		return 1, 1
	}
	d := gI - gN // > 0: normal demand
	if k.demand <= 0 {
		switch {
		case d > 0:
			return 1, 0
		case d < 0:
			return 0, 1
		}
		return 1, 1
	}
	minor := max(0, 1-math.Abs(d)/k.demand)
	if d >= 0 {
		return 1, minor
	}
	return minor, 1
}

// orientScore is the scored form of one orientation.
type orientScore struct {
	frontier, normal, inverse float64 // orbital term and its two pairings, |β|
	charge                    float64
	loc                       float64 // localisation energy of both partners, |β|
	stab                      float64 // frontier + charge
	score                     float64 // stab − λ·loc
	endo                      float64 // filled by endoTerm, not by scorePair
	firstOrder                bool
	gapN, gapI                float64
}

// fastUnit is the part of a unit's frontier data the ranking score needs, laid out for the
// screening loop: projector elements at the two termini (t0, t1) of the HOMO and LUMO sets.
type fastUnit struct {
	hx, lx float64    // x of the HOMO and LUMO sets
	h, l   [3]float64 // [P(t0,t0), P(t1,t1), P(t0,t1)] of the HOMO and LUMO sets
	q0, q1 float64    // π charges at the termini
	loc    float64    // localisation energy, |β|
	conj   float64    // conjugation loss (loc without alkyl pseudo-atoms), |β|
	ok     bool       // both frontier sets exist
	// all holds every occupied and empty level of the unit's π fragment with the
	// coefficients at the two termini, for Options.AllOrbitals (behind a pointer: the
	// screening loop and compact partners need only the fields above; nil in a Compact
	// partner prepared without AllOrbitals).
	all *unitLevels
}

// unitLevels are the levels of a unit's fragment for all-orbital scoring.
type unitLevels struct {
	occ, emp []termLevel
}

// termLevel is one level's x and its coefficients at the unit's two termini.
type termLevel struct{ x, c0, c1 float64 }

// sumAll is the all-orbital form of the orbital term for one direction of charge transfer:
// every occupied level of one partner with every empty level of the other,
// Σ_ij 2(γ Σ_bonds c c)²/(x_i − x_j), each term with the same first-order cap, for both
// orientations (t0: terminus 0 bonds terminus 0).
func (k *kernel) sumAll(occ, emp []termLevel) (t0, t1 float64, firstOrder bool) {
	for _, a := range occ {
		for _, b := range emp {
			g := a.x - b.x
			v0 := a.c0*b.c0 + a.c1*b.c1
			v1 := a.c0*b.c1 + a.c1*b.c0
			e0, f0 := term(k.g2*v0*v0, g)
			e1, f1 := term(k.g2*v1*v1, g)
			t0 += e0
			t1 += e1
			firstOrder = firstOrder || f0 || f1
		}
	}
	return t0, t1, firstOrder
}

func (d *unitData) fastUnit(tEnd int) fastUnit {
	return fastUnit{
		hx: d.homo.X, lx: d.lumo.X,
		h:  [3]float64{d.homo.P[0][0], d.homo.P[tEnd][tEnd], d.homo.P[0][tEnd]},
		l:  [3]float64{d.lumo.P[0][0], d.lumo.P[tEnd][tEnd], d.lumo.P[0][tEnd]},
		q0: d.q[0], q1: d.q[tEnd],
		loc: d.loc, conj: d.conj,
		ok: d.ok,
	}
}

// term is pairingTerm without the square root on the common (second-order) path.
func term(s, g float64) (float64, bool) {
	if s <= 0 {
		return 0, false
	}
	if g > 0 && g*g > s {
		return 2 * s / g, false
	}
	return 2 * math.Sqrt(s), true
}

// scores returns the ranking scores of both orientations of diene unit d with dienophile
// unit e: o = 0 joins the diene terminus t0 to dienophile atom x (e's t0), o = 1 joins it to
// y. It is the whole of the screening inner loop; scorePair (used by Analyze) takes its score
// from here, so Analyze and QuickScore rank with bit-identical numbers.
func (k *kernel) scores(d, e *fastUnit) (sc0, sc1 float64) {
	gN := d.hx - e.lx
	gI := e.hx - d.lx
	var n0, n1, i0, i1 float64
	if k.allOrbitals {
		n0, n1, _ = k.sumAll(d.all.occ, e.all.emp)
		i0, i1, _ = k.sumAll(e.all.occ, d.all.emp)
	} else {
		cN := 2 * d.h[2] * e.l[2]
		cI := 2 * d.l[2] * e.h[2]
		n0, _ = term(k.g2*(d.h[0]*e.l[0]+d.h[1]*e.l[1]+cN), gN)
		i0, _ = term(k.g2*(d.l[0]*e.h[0]+d.l[1]*e.h[1]+cI), gI)
		n1, _ = term(k.g2*(d.h[0]*e.l[1]+d.h[1]*e.l[0]+cN), gN)
		i1, _ = term(k.g2*(d.l[0]*e.h[1]+d.l[1]*e.h[0]+cI), gI)
	}
	pen := k.locWeight*(d.loc+e.loc) + k.gapWeight*min(gN, gI)
	wN, wI := k.pairingWeights(gN, gI)
	sc0 = wN*n0 + wI*i0 - pen
	sc1 = wN*n1 + wI*i1 - pen
	if k.chargeCoef != 0 {
		sc0 -= k.chargeCoef * (d.q0*e.q0 + d.q1*e.q1)
		sc1 -= k.chargeCoef * (d.q0*e.q1 + d.q1*e.q0)
	}
	return sc0, sc1
}

// scorePair returns the full breakdown of both orientations (see scores).
func (k *kernel) scorePair(d, e *fastUnit) (s0, s1 orientScore) {
	g2 := k.g2
	gN := d.hx - e.lx
	gI := e.hx - d.lx
	cN := 2 * d.h[2] * e.l[2]
	cI := 2 * d.l[2] * e.h[2]
	loc := d.loc + e.loc
	wN, wI := k.pairingWeights(gN, gI)
	fill := func(r *orientScore, sN, sI, qx, qy float64) {
		var f1, f2 bool
		r.gapN, r.gapI = gN, gI
		r.normal, f1 = term(g2*sN, gN)
		r.inverse, f2 = term(g2*sI, gI)
		r.normal *= wN
		r.inverse *= wI
		r.firstOrder = (f1 && wN > 0) || (f2 && wI > 0)
		r.frontier = r.normal + r.inverse
		if k.chargeCoef != 0 {
			r.charge = -k.chargeCoef * (d.q0*qx + d.q1*qy)
		}
		r.stab = r.frontier + r.charge
		r.loc = loc
	}
	fill(&s0, d.h[0]*e.l[0]+d.h[1]*e.l[1]+cN, d.l[0]*e.h[0]+d.l[1]*e.h[1]+cI, e.q0, e.q1)
	fill(&s1, d.h[0]*e.l[1]+d.h[1]*e.l[0]+cN, d.l[0]*e.h[1]+d.l[1]*e.h[0]+cI, e.q1, e.q0)
	if k.allOrbitals {
		n0, n1, fn := k.sumAll(d.all.occ, e.all.emp)
		i0, i1, fi := k.sumAll(e.all.occ, d.all.emp)
		for _, x := range []struct {
			r    *orientScore
			n, i float64
		}{{&s0, n0, i0}, {&s1, n1, i1}} {
			x.r.normal, x.r.inverse = wN*x.n, wI*x.i
			x.r.frontier = x.r.normal + x.r.inverse
			x.r.firstOrder = (fn && wN > 0) || (fi && wI > 0)
			x.r.stab = x.r.frontier + x.r.charge
		}
	}
	s0.score, s1.score = k.scores(d, e)
	return s0, s1
}

// endoUnit holds the projector elements the secondary-orbital term needs, per frontier set
// (index 0 HOMO set, 1 LUMO set). For a diene unit a,b,c,d: [P_ab, P_ac, P_db, P_dc, P_bb,
// P_cc, P_bc]; for a 2π unit x,y with conjugated substituent atoms x', y': [Q_xx', Q_xy',
// Q_yx', Q_yy', Q_x'x', Q_y'y', Q_x'y'] (zero where a substituent is absent).
type endoUnit struct {
	e  [2][7]float64
	ok bool // a diene unit (not a dipole), or a 2π unit with at least one substituent
}

func (d *unitData) endoUnit(kind UnitKind) endoUnit {
	var u endoUnit
	switch kind {
	case UnitDiene:
		u.ok = true
		for s, fs := range [2]*frontierSet{&d.homo, &d.lumo} {
			p := &fs.P
			u.e[s] = [7]float64{p[0][1], p[0][2], p[3][1], p[3][2], p[1][1], p[2][2], p[1][2]}
		}
	case UnitPi:
		u.ok = d.slots[2] >= 0 || d.slots[3] >= 0
		for s, fs := range [2]*frontierSet{&d.homo, &d.lumo} {
			q := &fs.P
			u.e[s] = [7]float64{q[0][2], q[0][3], q[1][2], q[1][3], q[2][2], q[3][3], q[2][3]}
		}
	}
	return u
}

// endoTerm is the secondary-orbital (endo) term of diene unit d with dienophile unit e in
// orientation o: the extra stabilisation when the diene's inner atoms b and c also couple,
// with γ_s, to the dienophile's conjugated substituent atoms x' and y' (b sits over the
// substituent of the atom a bonds to, c over that of the atom d bonds to), in the controlling
// frontier pairing (the smaller gap: HOMO(diene)–LUMO(dienophile) for normal demand), with the
// same second-/first-order form as the frontier term:
//
//	endo = E(S_primary + 2γγ_s·X + γ_s²·Y) − E(S_primary)
//
// Only the controlling pairing counts because that is the interaction the secondary-orbital
// argument is about (R. Hoffmann, R. B. Woodward, J. Am. Chem. Soc. 1965, 87, 4388: diene
// HOMO with the dienophile LUMO at the carbonyl carbon). Summing the minor pairing too made
// the term fall on Lewis-acid activation — its diene-LUMO part shrinks as the activated
// dienophile's HOMO drops — against the growth of endo selectivity that catalysis shows and
// that Houk & Strozier (J. Am. Chem. Soc. 1973, 95, 4094) explain by the larger LUMO
// coefficient at the carbonyl carbon.
//
// where, for o = 0 (a–x, d–y) with set projectors P (diene) and Q (dienophile),
// S_primary = γ²(P_aa Q_xx + P_dd Q_yy + 2 P_ad Q_xy), X = P_ab Q_xx' + P_ac Q_xy' + P_db Q_yx'
// + P_dc Q_yy' and Y = P_bb Q_x'x' + P_cc Q_y'y' + 2 P_bc Q_x'y' (o = 1 swaps x↔y, x'↔y').
// This is Σ over set members of (Σ_contacts w c c)² expanded, so it is basis-independent for
// degenerate sets. Zero for 1,3-dipoles and for dienophiles without a conjugated substituent.
func (k *kernel) endoTerm(d, e *fastUnit, de, ee *endoUnit, o int) float64 {
	if !de.ok || !ee.ok || k.gammaS == 0 {
		return 0
	}
	cross := 2 * k.gamma * k.gammaS
	sec := k.gammaS * k.gammaS
	// Pairing 0: diene HOMO (set 0) × dienophile LUMO (set 1); pairing 1: LUMO × HOMO. Only
	// the controlling one (smaller gap) is used.
	pr := 0
	dh, el, g := &d.h, &e.l, d.hx-e.lx
	if gi := e.hx - d.lx; gi < g {
		pr, dh, el, g = 1, &d.l, &e.h, gi
	}
	P, Q := &de.e[pr], &ee.e[1-pr]
	var prim, x, y float64
	if o == 0 {
		prim = dh[0]*el[0] + dh[1]*el[1] + 2*dh[2]*el[2]
		x = P[0]*Q[0] + P[1]*Q[1] + P[2]*Q[2] + P[3]*Q[3]
		y = P[4]*Q[4] + P[5]*Q[5] + 2*P[6]*Q[6]
	} else {
		prim = dh[0]*el[1] + dh[1]*el[0] + 2*dh[2]*el[2]
		// x↔y, x'↔y': Q_xx'→Q_yy', Q_xy'→Q_yx', Q_yx'→Q_xy', Q_yy'→Q_xx'
		x = P[0]*Q[3] + P[1]*Q[2] + P[2]*Q[1] + P[3]*Q[0]
		y = P[4]*Q[5] + P[5]*Q[4] + 2*P[6]*Q[6]
	}
	sp := k.g2 * prim
	f, _ := term(sp+cross*x+sec*y, g)
	p0, _ := term(sp, g)
	return f - p0
}
