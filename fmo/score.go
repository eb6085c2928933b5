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

// coupling is one element of M: diene slot i couples to dienophile slot j with weight w.
type coupling struct {
	i, j int8
	w    float64
}

// sumSq returns S = Σ_{a,b∈M} w_a w_b P[i_a][i_b] Q[j_a][j_b].
func sumSq(p, q *[nSlots][nSlots]float64, m *[4]coupling, n int) float64 {
	s := 0.0
	for a := 0; a < n; a++ {
		ca := m[a]
		for b := 0; b < n; b++ {
			cb := m[b]
			s += ca.w * cb.w * p[ca.i][cb.i] * q[ca.j][cb.j]
		}
	}
	return s
}

// pairingTerm is the stabilisation from one frontier pairing with coupling sum S and gap g.
func pairingTerm(s, g float64) (e float64, firstOrder bool) {
	if s <= 0 {
		return 0, false
	}
	r := math.Sqrt(s)
	if g <= r {
		return 2 * r, true
	}
	return 2 * s / g, false
}

// kernel holds the Options-derived constants of the scoring.
type kernel struct {
	gamma, gammaS, locWeight, chargeCoef float64
}

// orientScore is the scored form of one orientation.
type orientScore struct {
	frontier, normal, inverse float64 // orbital term and its two pairings, |β|
	charge                    float64
	loc                       float64 // localisation energy of both partners, |β|
	stab                      float64 // frontier + charge
	score                     float64 // stab − λ·loc
	endo                      float64
	firstOrder                bool
	gapN, gapI                float64
}

// scoreOrientation scores diene unit d against dienophile unit e in orientation o
// (o = 0: diene terminus a bonds x, the other terminus bonds y; o = 1: a bonds y).
// dipole selects the three-atom layout of d (termini in slots 0 and 2, no endo term).
func (k *kernel) scoreOrientation(d, e *unitData, dipole bool, o int) orientScore {
	var r orientScore
	tEnd := int8(3)
	if dipole {
		tEnd = 2
	}
	x, y := int8(0), int8(1)
	xs, ys := int8(2), int8(3)
	if o == 1 {
		x, y, xs, ys = y, x, ys, xs
	}
	var m [4]coupling
	m[0] = coupling{0, x, k.gamma}
	m[1] = coupling{tEnd, y, k.gamma}
	n := 2
	ne := 2
	if !dipole && k.gammaS != 0 {
		if e.slots[xs] >= 0 {
			m[ne] = coupling{1, xs, k.gammaS}
			ne++
		}
		if e.slots[ys] >= 0 {
			m[ne] = coupling{2, ys, k.gammaS}
			ne++
		}
	}
	r.gapN = d.homo.X - e.lumo.X
	r.gapI = e.homo.X - d.lumo.X
	sN := sumSq(&d.homo.P, &e.lumo.P, &m, n)
	sI := sumSq(&d.lumo.P, &e.homo.P, &m, n)
	tN, f1 := pairingTerm(sN, r.gapN)
	tI, f2 := pairingTerm(sI, r.gapI)
	r.normal, r.inverse = tN, tI
	r.frontier = tN + tI
	r.firstOrder = f1 || f2
	if ne > n {
		eN, _ := pairingTerm(sumSq(&d.homo.P, &e.lumo.P, &m, ne), r.gapN)
		eI, _ := pairingTerm(sumSq(&d.lumo.P, &e.homo.P, &m, ne), r.gapI)
		r.endo = eN + eI - r.frontier
	}
	if k.chargeCoef != 0 {
		r.charge = -k.chargeCoef * (d.q[0]*e.q[x] + d.q[tEnd]*e.q[y])
	}
	r.stab = r.frontier + r.charge
	r.loc = d.loc + e.loc
	r.score = r.stab - k.locWeight*r.loc
	return r
}
