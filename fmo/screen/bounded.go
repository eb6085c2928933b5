package screen

import (
	"cmp"
	"context"
	"math"
	"slices"
	"sync"
	"sync/atomic"

	"cyclopair/fmo"
	"cyclopair/fmo/substrates"
)

// Exact top-K by bounds. With Top = K a ranked screen needs the K best pairs by (key, pair
// index), not a score for every pair. The bounded search sorts the dienes and the dienophiles
// (all activated variants of one dienophile kept together) by how good a pair with them could
// at best be, cuts both lists into blocks, and gives each block pair an admissible lower
// bound of the ranking key (fmo.QuickKernel.Bound over the blocks' FrontierBoxes). Block pairs
// are scored best bound first on the worker pool; once some worker holds K records, a block
// pair whose bound is worse than that worker's K-th key cannot hold a row of the result
// (there are already K better pairs) and is skipped. A bound equal to the K-th key is still
// scored, so ties by pair index come out as in the exhaustive ranking. The result is the
// exhaustive result whatever the order, the blocks or the workers (tests compare both on
// random libraries for every key and filter).
//
// Filters take part: per block pair the filter ranges give "every pair passes", "no pair
// passes" (skipped, counted as not passing) or "some may" (scored, since the footer's count of
// passing pairs must stay exact). Pairs whose molecules have no reacting unit with both
// frontier levels never pass (QuickScore gives OK = false) and are only counted.

// keyBounds gives, for each rank key with a bound, an admissible lower bound of rankValue
// over every pair of a block pair. A new key supplies its own entry (the rate key, which also
// needs per-partner terms, is in preparedJob.keyBound):
// any function of the QuickBound ranges that no pair of the block can beat. Keys without an
// entry are ranked exhaustively.
var keyBounds = map[RankKey]func(b *fmo.QuickBound) float64{
	RankNormalGap:     func(b *fmo.QuickBound) float64 { return b.GapNormal[0] },
	RankGap:           func(b *fmo.QuickBound) float64 { return b.Gap[0] },
	RankStabilization: func(b *fmo.QuickBound) float64 { return -b.StabMax },
	RankRegioMargin:   func(b *fmo.QuickBound) float64 { return -b.MarginMax },
	RankScore:         func(b *fmo.QuickBound) float64 { return -b.BestMax },
}

// filterRange says whether every pair of a block passes the QuickScore filters (all), or none
// does (none); neither means the pairs must be scored to tell. Pairs without frontier data
// are not in blocks. Decisions keep a margin of 1e-9 |β| from the thresholds, so rounding in
// the ranges never decides.
func filterRange(f *substrates.Filter, b *fmo.QuickBound, thr float64) (all, none bool) {
	const eps = 1e-9
	all = true
	d := b.DemandDiff
	switch f.Demand {
	case "normal": // Demand = +1 ⇔ diff ≥ thr
		if d[1] < thr-eps {
			return false, true
		}
		all = all && d[0] >= thr+eps
	case "inverse": // −1 ⇔ −diff ≥ thr
		if d[0] > -thr+eps {
			return false, true
		}
		all = all && d[1] <= -thr-eps
	case "neutral":
		if d[0] >= thr+eps || d[1] <= -thr-eps {
			return false, true
		}
		all = all && d[0] > -thr+eps && d[1] < thr-eps
	}
	if f.MinRegioMargin > 0 {
		if b.MarginMax < f.MinRegioMargin-eps {
			return false, true
		}
		all = false // the margin has no useful lower bound
	}
	if f.InDomain {
		all = false // the rate model's domain is decided pair by pair
	}
	if f.MaxGap > 0 {
		if b.Gap[0] > f.MaxGap+eps {
			return false, true
		}
		all = all && b.Gap[1] <= f.MaxGap-eps
	}
	return all, false
}

// boundedBlock is a run of molecules in bound order with the box over their units.
type boundedBlock struct {
	idx  []int32 // molecule indices (dienes, or dienophiles with all their variants)
	box  fmo.FrontierBox
	side sideTerm // the key's one-partner part over the block (keyBound)
}

// blockSize is the number of molecules per block: small enough for tight bounds, large enough
// that a block pair (blockSize² × activations pairs) is a worthwhile work unit.
const blockSize = 32

// blockBound gives an admissible lower bound of the ranking key over every pair of a block
// pair from the QuickBound of the two boxes and each side's own term (dx for the dienes, ex
// for the dienophiles; see sideTerms).
type blockBound func(b *fmo.QuickBound, dx, ex sideTerm) float64

// sideTerm is the largest value over a set of molecules of the part of the ranking key that
// depends on one partner alone, and the largest sum of its absolute terms (for the rounding
// margin). Keys without such a part use the zero value.
type sideTerm struct{ v, abs float64 }

func (a *sideTerm) widen(o sideTerm) { a.v, a.abs = max(a.v, o.v), max(a.abs, o.abs) }

var noSide = sideTerm{v: math.Inf(-1)}

// keyBound returns the block bound of j's key, with the per-diene and per-dienophile terms
// (a dienophile's over all its activated variants), or nil when the key has no bound.
//
// The rate key (−rate.Model.Quick, lower is better) is bounded term by term: Quick is at most
// the gap and frontier terms' maximum over the boxes (rate.Model.PairTermsMax) plus the
// largest diene part over the block's dienes plus the largest dienophile part over the
// block's dienophiles; the bound subtracts a rounding margin of 1e-9 (Σ|terms| + 1).
func (j *preparedJob) keyBound() (kb blockBound, dTerm func(d int) sideTerm, eTerm func(e int) sideTerm) {
	none := func(int) sideTerm { return noSide }
	if j.rank == RankRate {
		m := j.p.rate
		if m == nil || !m.Bounded() {
			return nil, nil, nil
		}
		kb = func(b *fmo.QuickBound, dx, ex sideTerm) float64 {
			pv, pa := m.PairTermsMax(b)
			v := pv + dx.v + ex.v
			return -(v + 1e-9*(pa+dx.abs+ex.abs+1))
		}
		dTerm = func(d int) sideTerm {
			v, a := m.DieneTermsMax(j.p.Dienes[d], j.p.dieneConf[d])
			return sideTerm{v, a}
		}
		eTerm = func(e int) sideTerm {
			t := noSide
			for _, v := range j.p.Variants[e] {
				if v != nil {
					x, a := m.DienophileTermsMax(v)
					t.widen(sideTerm{x, a})
				}
			}
			return t
		}
		return kb, dTerm, eTerm
	}
	f := keyBounds[j.rank]
	if f == nil {
		return nil, nil, nil
	}
	return func(b *fmo.QuickBound, _, _ sideTerm) float64 { return f(b) }, none, none
}

// keyOf is the ranking key of a scored pair of diene d, as the exhaustive path computes it.
func (j *preparedJob) keyOf(d int32, q *fmo.Quick) float64 {
	if j.rank == RankRate {
		return -j.p.rate.Quick(q, &j.p.dieneConf[d][q.DieneUnit])
	}
	return rankValue(j.rank, q)
}

// boundedSelect is the bounded phase 1 for preparedJob (engineConfig.Select), or nil when the
// key has no bound, K is 0 or the kernel cannot be bounded (all-orbital scoring).
func (j *preparedJob) boundedSelect(top int, lo, hi int64, progress func(int64)) func(context.Context, int) ([]scored, engineStats, error) {
	kb, dTerm, eTerm := j.keyBound()
	if kb == nil || top <= 0 || j.p.Opts.AllOrbitals {
		return nil
	}
	return func(ctx context.Context, workers int) ([]scored, engineStats, error) {
		return j.bounded(ctx, workers, top, lo, hi, kb, dTerm, eTerm, progress)
	}
}

func (j *preparedJob) bounded(ctx context.Context, workers, top int, lo, hi int64, kb blockBound,
	dTerm, eTerm func(int) sideTerm, progress func(int64)) ([]scored, engineStats, error) {
	p := j.p
	quick := p.quick
	thr := quick.DemandThreshold()
	nd, ne, na := len(p.Dienes), len(p.Dienophiles), len(p.Activations)
	var st engineStats

	// Scored and Missing over [lo, hi) from prefix sums of existing variants (flat e·na + a).
	exist := make([]int64, ne*na+1)
	okVar := make([]int32, ne) // variants of dienophile e with frontier data
	okV := make([]bool, ne*na) // variant (e, a) has frontier data
	eBox := make([]fmo.FrontierBox, ne)
	for e := range ne {
		for a := range na {
			n := int64(0)
			if v := p.Variants[e][a]; v != nil {
				n = 1
				b := v.Box()
				if b.Units > 0 {
					okV[e*na+a] = true
					okVar[e]++
					eBox[e].Union(&b)
				}
			}
			exist[e*na+a+1] = exist[e*na+a] + n
		}
	}
	per := int64(ne * na)
	for d := range nd {
		a0, b0 := max(lo-int64(d)*per, 0), min(hi-int64(d)*per, per)
		if a0 < b0 {
			st.Scored += exist[b0] - exist[a0]
		}
	}
	st.Missing = hi - lo - st.Scored

	dBox := make([]fmo.FrontierBox, nd)
	dSide, eSide := make([]sideTerm, nd), make([]sideTerm, ne)
	var allD, allE fmo.FrontierBox
	allDS, allES := noSide, noSide
	var dIdx, eIdx []int32
	for d := range nd {
		dBox[d] = p.Dienes[d].Box()
		if dBox[d].Units > 0 {
			allD.Union(&dBox[d])
			dIdx = append(dIdx, int32(d))
			dSide[d] = dTerm(d)
			allDS.widen(dSide[d])
		}
	}
	for e := range ne {
		if okVar[e] > 0 {
			allE.Union(&eBox[e])
			eIdx = append(eIdx, int32(e))
			eSide[e] = eTerm(e)
			allES.widen(eSide[e])
		}
	}
	// Bound order: each molecule against everything on the other side.
	order := func(idx []int32, key func(i int32) float64) {
		keys := make([]float64, len(idx))
		pos := make(map[int32]int, len(idx))
		for n, i := range idx {
			keys[n] = key(i)
			if math.IsNaN(keys[n]) {
				keys[n] = math.Inf(1)
			}
			pos[i] = n
		}
		slices.SortStableFunc(idx, func(a, b int32) int { return cmp.Compare(keys[pos[a]], keys[pos[b]]) })
	}
	order(dIdx, func(d int32) float64 { b := quick.Bound(&dBox[d], &allE); return kb(&b, dSide[d], allES) })
	order(eIdx, func(e int32) float64 { b := quick.Bound(&allD, &eBox[e]); return kb(&b, allDS, eSide[e]) })
	blocks := func(idx []int32, box []fmo.FrontierBox, side []sideTerm) []boundedBlock {
		var out []boundedBlock
		for s := 0; s < len(idx); s += blockSize {
			blk := boundedBlock{idx: idx[s:min(s+blockSize, len(idx))], side: noSide}
			for _, i := range blk.idx {
				blk.box.Union(&box[i])
				blk.side.widen(side[i])
			}
			out = append(out, blk)
		}
		return out
	}
	dBlocks, eBlocks := blocks(dIdx, dBox, dSide), blocks(eIdx, eBox, eSide)

	type blockPair struct {
		d, e      int32
		lower     float64
		all, none bool
		bounded   bool // the key bound may be used to skip
	}
	pairs := make([]blockPair, 0, len(dBlocks)*len(eBlocks))
	for di := range dBlocks {
		for ei := range eBlocks {
			b := quick.Bound(&dBlocks[di].box, &eBlocks[ei].box)
			bp := blockPair{d: int32(di), e: int32(ei), lower: math.Inf(-1)}
			if b.OK {
				bp.lower = kb(&b, dBlocks[di].side, eBlocks[ei].side)
				bp.bounded = !math.IsNaN(bp.lower)
				bp.all, bp.none = filterRange(&j.flt, &b, thr)
			}
			pairs = append(pairs, bp)
		}
	}
	slices.SortStableFunc(pairs, func(a, b blockPair) int { return cmp.Compare(a.lower, b.lower) })

	// The pruning threshold: the smallest K-th key over the workers whose heap is full.
	var threshold atomic.Uint64
	threshold.Store(math.Float64bits(math.Inf(1)))
	lowerThreshold := func(v float64) {
		for {
			old := threshold.Load()
			if !(v < math.Float64frombits(old)) || threshold.CompareAndSwap(old, math.Float64bits(v)) {
				return
			}
		}
	}
	inRange := func(k int64) bool { return k >= lo && k < hi }
	type local struct {
		heap          topK
		passN, kernel int64
	}
	locals := make([]local, workers)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := range workers {
		locals[w].heap.k = top
		wg.Add(1)
		go func() {
			defer wg.Done()
			loc := &locals[w]
			for ctx.Err() == nil {
				n := next.Add(1) - 1
				if n >= int64(len(pairs)) {
					return
				}
				bp := &pairs[n]
				db, eb := &dBlocks[bp.d], &eBlocks[bp.e]
				if bp.none {
					continue
				}
				skip := bp.bounded && bp.lower > math.Float64frombits(threshold.Load())
				if skip && bp.all {
					// Every pair passes and none can rank: count them without scoring.
					for _, d := range db.idx {
						for _, e := range eb.idx {
							base := (int64(d)*int64(ne) + int64(e)) * int64(na)
							if base >= lo && base+int64(na) <= hi {
								loc.passN += int64(okVar[e])
								continue
							}
							for a := range na {
								if okV[int(e)*na+a] && inRange(base+int64(a)) {
									loc.passN++
								}
							}
						}
					}
					continue
				}
				for _, d := range db.idx {
					diene := p.Dienes[d]
					for _, e := range eb.idx {
						base := (int64(d)*int64(ne) + int64(e)) * int64(na)
						if base+int64(na) <= lo || base >= hi {
							continue
						}
						for a, v := range p.Variants[e] {
							k := base + int64(a)
							if v == nil || !inRange(k) {
								continue
							}
							q := quick.Score(diene, v)
							loc.kernel++
							if !j.passes(int(d), &q) {
								continue
							}
							loc.passN++
							if skip {
								continue
							}
							s := scored{j.keyOf(d, &q), k}
							if len(loc.heap.h) < loc.heap.k || better(s, loc.heap.h[0]) {
								loc.heap.offer(s)
							}
						}
					}
				}
				if len(loc.heap.h) == top && !math.IsNaN(loc.heap.h[0].key) {
					lowerThreshold(loc.heap.h[0].key)
				}
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		st.Canceled = true
		return nil, st, err
	}
	var sel []scored
	for i := range locals {
		st.Passed += locals[i].passN
		st.Kernel += locals[i].kernel
		sel = append(sel, locals[i].heap.h...)
	}
	if progress != nil {
		progress(hi - lo)
	}
	return sel, st, nil
}
