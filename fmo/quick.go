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
	Demand                int8    // +1 normal, −1 inverse, 0 neutral (Options.DemandThreshold)
	DieneUnit             int16   // index into diene.Units of the preferred unit, −1 if none
	DienophileUnit        int16   // index into dienophile.Units
	Orientation           int8    // 0: diene terminus a bonds dienophile atom x; 1: a bonds y
	FirstOrder            bool    // a pairing of the preferred orientation used the first-order form
	OK                    bool    // false when no pair of units has both frontier levels
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
	var best, other orientScore
	for di := range diene.data {
		dd := &diene.data[di]
		if !dd.ok {
			continue
		}
		dipole := diene.Units[di].Kind == UnitDipole
		for ei := range dienophile.data {
			ed := &dienophile.data[ei]
			if !ed.ok {
				continue
			}
			s0 := k.scoreOrientation(dd, ed, dipole, 0)
			s1 := k.scoreOrientation(dd, ed, dipole, 1)
			// Analyze sorts stably by score over the enumeration order (di, ei, o), so the
			// first strictly better candidate wins ties.
			if !r.OK || s0.score > best.score {
				best, other = s0, s1
				r.DieneUnit, r.DienophileUnit, r.Orientation, r.OK = int16(di), int16(ei), 0, true
			}
			if s1.score > best.score {
				best, other = s1, s0
				r.DieneUnit, r.DienophileUnit, r.Orientation = int16(di), int16(ei), 1
			}
		}
	}
	if !r.OK {
		return r
	}
	r.Best = best.score
	r.Stabilization = best.stab
	r.RegioMargin = best.score - other.score
	r.Endo = best.endo
	r.GapNormal, r.GapInverse = best.gapN, best.gapI
	r.FirstOrder = best.firstOrder
	switch {
	case best.gapI-best.gapN >= threshold:
		r.Demand = 1
	case best.gapN-best.gapI >= threshold:
		r.Demand = -1
	}
	return r
}
