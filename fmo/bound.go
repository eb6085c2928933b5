package fmo

import "math"

// Bounds for exact top-K screening. A screen that keeps only the K best pairs need not score
// a block of pairs whose best possible key is worse than the K-th key found so far. The
// FrontierBox of a set of partners (a molecule, an activated dienophile's variants, a block
// of molecules) holds, over every reacting unit with both frontier levels, the range of each
// per-unit quantity the QuickScore kernel reads; QuickKernel.Bound turns two boxes into
// ranges that hold for every pair drawn from them. Every range is admissible: QuickScore's
// value for any such pair lies inside it (tests check this on random libraries).
//
// The kernel pieces and why each bound holds (notation of score.go):
//   - gaps gN = hx(d) − lx(e), gI = hx(e) − lx(d): floating-point subtraction is monotone,
//     so the box extremes bound the computed values exactly;
//   - S = h0·l0' + h1·l1' + 2·h2·l2' ≤ (h0 + h1)(l0' + l1') for set projectors (|h2| ≤ √(h0h1),
//     then Cauchy–Schwarz), in either orientation;
//   - term(s, g) grows with s and falls with g (2s/g above g = √s, 2√s at and below it), so
//     term(γ²·Hmax·Lmax, g_min) bounds each pairing;
//   - the pairing weights are at most 1, and at most their value at the smallest gap
//     difference where the boxes are clearly of one demand type;
//   - the penalties and the charge term take their box extremes.
// The score bounds carry a relative safety margin of 1e-9 against rounding.

// FrontierBox is the range, over a set of reacting units, of the per-unit data the ranking
// kernel reads. The zero value is the empty box (Units = 0).
type FrontierBox struct {
	Units       int        // units with both frontier levels
	HX, LX      [2]float64 // [min, max] of x(HOMO set), x(LUMO set)
	HSum, LSum  [2]float64 // [min, max] of the summed terminus projector diagonals
	Loc         [2]float64 // localisation energy
	QAbs        float64    // max |π charge| at a terminus
	AllOrbitals bool       // some unit carries all-orbital data (no bounds then)
}

func widen(r *[2]float64, v float64, first bool) {
	if first {
		*r = [2]float64{v, v}
		return
	}
	r[0], r[1] = min(r[0], v), max(r[1], v)
}

// Box returns the FrontierBox of p's reacting units.
func (p *Partner) Box() FrontierBox {
	var b FrontierBox
	for i := range p.fast {
		f := &p.fast[i]
		if !f.ok {
			continue
		}
		first := b.Units == 0
		b.Units++
		widen(&b.HX, f.hx, first)
		widen(&b.LX, f.lx, first)
		widen(&b.HSum, f.h[0]+f.h[1], first)
		widen(&b.LSum, f.l[0]+f.l[1], first)
		widen(&b.Loc, f.loc, first)
		b.QAbs = max(b.QAbs, math.Abs(f.q0), math.Abs(f.q1))
	}
	return b
}

// UnitHasFrontier reports whether reacting unit i has both frontier levels: only such units
// enter a FrontierBox, and only they can be QuickScore's preferred unit.
func (p *Partner) UnitHasFrontier(i int) bool { return i >= 0 && i < len(p.fast) && p.fast[i].ok }

// Union widens b to cover o.
func (b *FrontierBox) Union(o *FrontierBox) {
	if o.Units == 0 {
		return
	}
	if b.Units == 0 {
		*b = *o
		return
	}
	b.Units += o.Units
	for _, p := range [][2]*[2]float64{{&b.HX, &o.HX}, {&b.LX, &o.LX}, {&b.HSum, &o.HSum}, {&b.LSum, &o.LSum}, {&b.Loc, &o.Loc}} {
		p[0][0], p[0][1] = min(p[0][0], p[1][0]), max(p[0][1], p[1][1])
	}
	b.QAbs = max(b.QAbs, o.QAbs)
}

// QuickBound holds ranges of the Quick fields over every pair of two boxes. OK is false when
// no bound can be given (an empty box, or all-orbital scoring); then nothing may be skipped.
type QuickBound struct {
	OK         bool
	GapNormal  [2]float64 // [min, max] of Quick.GapNormal
	GapInverse [2]float64
	Gap        [2]float64 // of min(GapNormal, GapInverse)
	DemandDiff [2]float64 // of GapInverse − GapNormal (Quick.Demand compares it with the threshold)
	BestMax    float64    // upper bound of Quick.Best
	StabMax    float64    // upper bound of Quick.Stabilization
	MarginMax  float64    // upper bound of Quick.RegioMargin
	// FrontierMax is an upper bound of Quick.Frontier: the stabilisation's bound plus the
	// largest charge term |c|·(|q0 qx| + |q1 qy|) (for the rate model's frontier term).
	FrontierMax float64
}

// Bound returns the ranges of QuickScore's numbers over every diene unit of d with every
// dienophile unit of e.
func (q *QuickKernel) Bound(d, e *FrontierBox) QuickBound {
	k := &q.k
	if d.Units == 0 || e.Units == 0 || k.allOrbitals {
		return QuickBound{}
	}
	var r QuickBound
	r.OK = true
	r.GapNormal = [2]float64{d.HX[0] - e.LX[1], d.HX[1] - e.LX[0]}
	r.GapInverse = [2]float64{e.HX[0] - d.LX[1], e.HX[1] - d.LX[0]}
	r.Gap = [2]float64{min(r.GapNormal[0], r.GapInverse[0]), min(r.GapNormal[1], r.GapInverse[1])}
	// GapInverse − GapNormal = (hx(e) + lx(e)) − (hx(d) + lx(d)); the interval difference of
	// the two gap ranges holds it too (wider, but with no new rounding to argue about).
	r.DemandDiff = [2]float64{r.GapInverse[0] - r.GapNormal[1], r.GapInverse[1] - r.GapNormal[0]}
	tN, _ := term(k.g2*d.HSum[1]*e.LSum[1], r.GapNormal[0])
	tI, _ := term(k.g2*d.LSum[1]*e.HSum[1], r.GapInverse[0])
	ch := 0.0
	if k.chargeCoef != 0 {
		ch = math.Abs(k.chargeCoef) * 2 * d.QAbs * e.QAbs
	}
	// The pairing weights (pairingWeights) are at most 1, and smaller where every pair of
	// the boxes is clearly of one demand type: the minor pairing's weight falls with the
	// gap difference, which the DemandDiff range bounds from below.
	wN, wI := 1.0, 1.0
	if !k.bothPairings {
		lo, hi := r.DemandDiff[0], r.DemandDiff[1]
		if k.demand <= 0 {
			if lo > 0 {
				wI = 0
			}
			if hi < 0 {
				wN = 0
			}
		} else {
			if lo >= 0 {
				wI = max(0, 1-lo/k.demand)
			}
			if hi < 0 {
				wN = max(0, 1-(-hi)/k.demand)
			}
		}
	}
	tN, tI = wN*tN, wI*tI
	stab := tN + tI + ch
	// penalty = locWeight·(loc_d + loc_e) + gapWeight·min(gN, gI), smallest possible value
	locLo := d.Loc[0] + e.Loc[0]
	if k.locWeight < 0 {
		locLo = d.Loc[1] + e.Loc[1]
	}
	gapLo := r.Gap[0]
	if k.gapWeight < 0 {
		gapLo = r.Gap[1]
	}
	pen := k.locWeight*locLo + k.gapWeight*gapLo
	safe := func(v float64) float64 { return v + 1e-9*(math.Abs(v)+1) }
	r.BestMax = safe(stab - pen)
	r.StabMax = safe(stab)
	// RegioMargin = s0 − s1 (or s1 − s0): the pairing terms are each in [0, tN] and [0, tI],
	// the penalty cancels, the charge terms differ by at most 2·ch.
	r.MarginMax = safe(tN + tI + 2*ch)
	r.FrontierMax = safe(r.StabMax + ch)
	if math.IsNaN(r.BestMax) || math.IsNaN(r.FrontierMax) || math.IsNaN(r.StabMax) || math.IsNaN(r.MarginMax) || math.IsNaN(r.Gap[0]) || math.IsNaN(r.DemandDiff[0]) {
		return QuickBound{}
	}
	return r
}

// DemandThreshold is the threshold Quick.Demand compares the gaps with.
func (q *QuickKernel) DemandThreshold() float64 { return q.threshold }
