package fmo

// Quick is the result of QuickScore: the numbers a screen ranks by, without products, labels
// or text. Best equals the score of the first orientation Analyze returns for the same pair
// and options (same kernel, same enumeration order, same tie-breaking).
type Quick struct {
	GapNormal, GapInverse float64 // |β|, at the preferred units
	Best                  float64 // ranking score of the preferred orientation, |β|
	Stabilization         float64 // its perturbation energy (frontier + charge), |β|
	RegioMargin           float64 // score difference to the other orientation at the preferred units, |β|
	Endo                  float64 // secondary-orbital term of the preferred orientation, |β|
	Frontier              float64 // its frontier (orbital) term, |β| (Stabilization without the charge term)
	Localization          float64 // localisation energy of both partners at the preferred units, |β|
	Demand                int8    // +1 normal, −1 inverse, 0 neutral (Options.DemandThreshold)
	DieneUnit             int16   // index into diene.Units of the preferred unit, −1 if none
	DienophileUnit        int16   // index into dienophile.Units
	Orientation           int8    // 0: diene terminus a bonds dienophile atom x; 1: a bonds y
	FirstOrder            bool    // a pairing of the preferred orientation used the first-order form
	OK                    bool    // false when no pair of units has both frontier levels

	// DieneLocalization and DienophileLocalization are the two parts of Localization (the
	// diene's at its preferred unit, the dienophile's at its): the rate model weighs them
	// separately (fmo/rate).
	DieneLocalization, DienophileLocalization float64
	// DieneConjugationLoss is the diene's localisation energy without the hyperconjugative
	// alkyl pseudo-atoms (Partner.UnitConjugationLoss): its aromaticity and conjugation cost.
	DieneConjugationLoss float64
	// Activation is the dienophile's activation mode (Partner.Activation).
	Activation string
}

// QuickScore scores the pair from the per-unit frontier data cached on the partners: every
// pair of units and both orientations through the same kernel as Analyze, keeping the best.
// It does not allocate and is safe for concurrent use; the kernel constants come from opts
// (pass the same Options value Analyze would get).
func QuickScore(diene, dienophile *Partner, opts *Options) Quick {
	k := opts.kernel()
	return quickScore(diene, dienophile, &k, opts.DemandThreshold)
}

// QuickKernel is a prepared QuickScore for screening loops: the Options-derived constants are
// computed once.
type QuickKernel struct {
	k         kernel
	threshold float64
}

// NewQuickKernel prepares the constants of opts.
func NewQuickKernel(opts *Options) *QuickKernel {
	return &QuickKernel{k: opts.kernel(), threshold: opts.DemandThreshold}
}

// Score is QuickScore with prepared constants.
func (q *QuickKernel) Score(diene, dienophile *Partner) Quick {
	return quickScore(diene, dienophile, &q.k, q.threshold)
}

func quickScore(diene, dienophile *Partner, k *kernel, threshold float64) Quick {
	r := Quick{DieneUnit: -1, DienophileUnit: -1}
	best, other := 0.0, 0.0
	bd, be, bo := -1, -1, 0
	ef := dienophile.fast
	for di := range diene.fast {
		dd := &diene.fast[di]
		if !dd.ok {
			continue
		}
		for ei := range ef {
			ed := &ef[ei]
			if !ed.ok {
				continue
			}
			s0, s1 := k.scores(dd, ed)
			// Analyze sorts stably by score over the enumeration order (di, ei, o), so the
			// first strictly better candidate wins ties.
			if bd < 0 || s0 > best {
				best, other, bd, be, bo = s0, s1, di, ei, 0
			}
			if s1 > best {
				best, other, bd, be, bo = s1, s0, di, ei, 1
			}
		}
	}
	if bd < 0 {
		return r
	}
	dd, ed := &diene.fast[bd], &ef[be]
	r.OK = true
	r.DieneUnit, r.DienophileUnit, r.Orientation = int16(bd), int16(be), int8(bo)
	r.Best = best
	r.RegioMargin = best - other
	r.GapNormal, r.GapInverse = dd.hx-ed.lx, ed.hx-dd.lx
	r.Localization = dd.loc + ed.loc
	r.DieneLocalization, r.DienophileLocalization = dd.loc, ed.loc
	r.DieneConjugationLoss = dd.conj
	r.Activation = dienophile.Activation
	r.Stabilization = best + k.locWeight*r.Localization + k.gapWeight*min(r.GapNormal, r.GapInverse)
	r.Frontier = r.Stabilization
	// first-order flag of the preferred orientation: g ≤ √S in either pairing
	x, y := 0, 1
	if bo == 1 {
		x, y = 1, 0
	}
	if k.chargeCoef != 0 {
		qx, qy := ed.q0, ed.q1
		if bo == 1 {
			qx, qy = ed.q1, ed.q0
		}
		r.Frontier += k.chargeCoef * (dd.q0*qx + dd.q1*qy)
	}
	sN := k.g2 * (dd.h[0]*ed.l[x] + dd.h[1]*ed.l[y] + 2*dd.h[2]*ed.l[2])
	sI := k.g2 * (dd.l[0]*ed.h[x] + dd.l[1]*ed.h[y] + 2*dd.l[2]*ed.h[2])
	_, f1 := term(sN, r.GapNormal)
	_, f2 := term(sI, r.GapInverse)
	wN, wI := k.pairingWeights(r.GapNormal, r.GapInverse)
	r.FirstOrder = (f1 && wN > 0) || (f2 && wI > 0)
	if k.allOrbitals {
		s0, s1 := k.scorePair(dd, ed)
		r.FirstOrder = s0.firstOrder || s1.firstOrder
	}
	r.Endo = k.endoTerm(dd, ed, &diene.endo[bd], &dienophile.endo[be], bo)
	switch {
	case r.GapInverse-r.GapNormal >= threshold:
		r.Demand = 1
	case r.GapNormal-r.GapInverse >= threshold:
		r.Demand = -1
	}
	return r
}
