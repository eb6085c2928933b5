package screen

import (
	"context"
	"fmt"
	"slices"
	"testing"

	"cyclopair/fmo"
	"cyclopair/fmo/internal/testsupport"
	"cyclopair/fmo/substrates"
)

// selection runs phase 1 of a ranked screen, bounded or exhaustive, and returns the sorted
// top records and the counts.
func selection(t *testing.T, p *Prepared, so ScreenOptions, bounded bool) ([]scored, engineStats) {
	t.Helper()
	space := p.Space()
	lo, hi := so.Shard.Range(space.Len())
	job := &preparedJob{p: p, space: space, rank: so.RankBy, flt: so.Filter}
	cfg := engineConfig{Workers: so.Workers, Ranked: true, Top: so.Top, Lo: lo, Hi: hi, Chunk: 257}
	var sel []scored
	var st engineStats
	var err error
	if bounded {
		f := job.boundedSelect(so.Top, lo, hi, nil)
		if f == nil {
			t.Fatalf("%s: no bounded search", so.RankBy)
		}
		sel, st, err = f(context.Background(), so.Workers)
	} else {
		sel, st, err = engineScoreAll(context.Background(), job, cfg)
	}
	if err != nil {
		t.Fatal(err)
	}
	slices.SortFunc(sel, compareScored)
	if len(sel) > so.Top {
		sel = sel[:so.Top]
	}
	return sel, st
}

// The bounded top-K search gives exactly the exhaustive ranking — the same pairs in the same
// order, ties by pair index included, and the same counts of scored and passing pairs — for
// every rank key with a bound, with and without each filter, for several K, shards and worker
// counts, on random synthetic libraries with several reacting units per molecule and three
// activation modes.
func TestBoundedEqualsExhaustive(t *testing.T) {
	filters := []substrates.Filter{
		{},
		{Demand: "normal"},
		{Demand: "inverse"},
		{Demand: "neutral"},
		{MaxGap: 0.9},
		{MinRegioMargin: 0.01},
		{Demand: "normal", MaxGap: 1.2, MinRegioMargin: 0.002},
		{InDomain: true},
		{InDomain: true, Demand: "normal", MaxGap: 1.0},
	}
	pruned, total := int64(0), int64(0)
	ratePruned, rateTotal := int64(0), int64(0)
	inDomainRows := 0 // rows selected under an in_domain filter: that filter must be exercised
	for _, seed := range []uint64{3, 17} {
		lib := testsupport.SyntheticLibrary(70, 90, seed)
		lib.Activations = []string{fmo.ActivateNone, fmo.ActivateLewis, fmo.ActivateIminium}
		p, err := Prepare(context.Background(), lib, screenOpts(t), PrepareOptions{Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		keys := []RankKey{RankRate}
		for key := range keyBounds {
			keys = append(keys, key)
		}
		for _, key := range keys {
			for fi, flt := range filters {
				for _, c := range []struct {
					top, workers int
					shard        Shard
				}{{1, 1, Shard{}}, {20, 2, Shard{}}, {300, 3, Shard{}}, {15, 2, Shard{2, 3}}} {
					so := ScreenOptions{RankBy: key, Top: c.top, Filter: flt, Workers: c.workers, Shard: c.shard}
					want, wst := selection(t, p, so, false)
					got, gst := selection(t, p, so, true)
					name := fmt.Sprintf("seed %d %s filter %d top %d shard %v", seed, key, fi, c.top, c.shard)
					if !slices.Equal(got, want) {
						t.Errorf("%s: bounded selection differs from the exhaustive one\n got %v\nwant %v", name, got, want)
					}
					if gst.Scored != wst.Scored || gst.Missing != wst.Missing || gst.Passed != wst.Passed {
						t.Errorf("%s: counts %+v, exhaustive %+v", name, gst, wst)
					}
					if flt.InDomain {
						inDomainRows += len(want)
					}
					if len(want) == 0 && fi == 0 {
						t.Errorf("%s: empty selection", name)
					}
					if fi == 0 && c.top == 1 && (key == RankNormalGap || key == RankGap) {
						pruned += gst.Scored - gst.Kernel
						total += gst.Scored
					}
					if fi == 0 && c.top == 1 && key == RankRate {
						ratePruned += gst.Scored - gst.Kernel
						rateTotal += gst.Scored
					}
				}
			}
		}
	}
	// Not a timing: the search must actually skip pairs, or it is only the exhaustive path
	// in another order. Checked for the gap keys, whose bounds are tight; the score bounds
	// are looser (the first-order cap 2√S where gaps are small) and on a library this small
	// (3 × 3 blocks) may skip nothing — BenchmarkBoundedTopK reports their share.
	if pruned*2 < total {
		t.Errorf("top 1 without filters: only %d of %d pairs skipped", pruned, total)
	}
	t.Logf("rate, top 1 without filters: %d of %d pairs skipped", ratePruned, rateTotal)
	if inDomainRows == 0 {
		t.Error("no pair passed an in_domain filter: the filter's bound path is not exercised")
	}
}

// Bound admissibility, directly: for random pairs, every QuickScore number lies in the ranges
// QuickKernel.Bound gives for the two molecules' boxes, and the rate key is never below the
// rate bound of the two molecules (all variants of the dienophile).
func TestQuickBoundAdmissible(t *testing.T) {
	lib := testsupport.SyntheticLibrary(40, 40, 29)
	lib.Activations = []string{fmo.ActivateNone, fmo.ActivateLewis}
	p, err := Prepare(context.Background(), lib, screenOpts(t), PrepareOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	job := &preparedJob{p: p, space: p.Space(), rank: RankRate}
	kb, dTerm, eTerm := job.keyBound()
	if kb == nil {
		t.Fatal("rate: no bound")
	}
	for di, d := range p.Dienes {
		db := d.Box()
		for ei, vs := range p.Variants {
			for _, v := range vs {
				if v == nil {
					continue
				}
				eb := v.Box()
				b := p.quick.Bound(&db, &eb)
				q := p.quick.Score(d, v)
				if !b.OK || !q.OK {
					continue
				}
				n++
				g := min(q.GapNormal, q.GapInverse)
				if rv := -p.rate.Quick(&q, &p.dieneConf[di][q.DieneUnit]); rv < kb(&b, dTerm(di), eTerm(ei)) {
					t.Errorf("%s + %s: rate key %v below its bound %v", d.SMILES, v.SMILES, rv, kb(&b, dTerm(di), eTerm(ei)))
				}
				if q.GapNormal < b.GapNormal[0] || q.GapNormal > b.GapNormal[1] || g < b.Gap[0] || g > b.Gap[1] ||
					q.GapInverse-q.GapNormal < b.DemandDiff[0] || q.GapInverse-q.GapNormal > b.DemandDiff[1] ||
					q.Best > b.BestMax || q.Stabilization > b.StabMax || q.RegioMargin > b.MarginMax {
					t.Errorf("%s + %s: %+v outside %+v", d.SMILES, v.SMILES, q, b)
				}
			}
		}
	}
	if n < 1000 {
		t.Errorf("only %d pairs checked", n)
	}
}

// The in_domain filter keeps exactly the pairs whose printed rate is inside the rate model's
// applicability domain: on the demo (whose unfiltered top 20 holds eight extrapolated Lewis-
// acid quinone and anthracene rows), every row the filtered screen prints carries
// rate.in_domain true, the rows it drops are the out-of-domain ones of the full screen, and
// the filter removes some rows but not all.
func TestInDomainFilter(t *testing.T) {
	p := demoPrepared(t)
	rows := func(flt substrates.Filter) []*fmo.Pair {
		var out []*fmo.Pair
		_, err := p.Screen(context.Background(), ScreenOptions{RankBy: RankRate, Filter: flt, Workers: 2},
			func(r ScreenRow) error { out = append(out, r.Pair); return nil }, func(f ScreenFailure) { t.Errorf("failure %v", f) })
		if err != nil {
			t.Fatal(err)
		}
		return out
	}
	all, kept := rows(substrates.Filter{}), rows(substrates.Filter{InDomain: true})
	in := 0
	for _, r := range all {
		if r.Rate == nil {
			t.Fatalf("%s + %s: no rate", r.DieneName, r.DienophileName)
		}
		if r.Rate.InDomain {
			in++
		}
	}
	if len(kept) != in || in == 0 || in == len(all) {
		t.Fatalf("filtered screen prints %d rows; the full screen has %d rows, %d inside the domain", len(kept), len(all), in)
	}
	j := 0
	for _, r := range all {
		if !r.Rate.InDomain {
			continue
		}
		k := kept[j]
		j++
		if k.DieneName != r.DieneName || k.DienophileName != r.DienophileName || k.Activation != r.Activation || !k.Rate.InDomain {
			t.Errorf("row %d: filtered %s + %s (%s, in domain %v), want %s + %s (%s)", j, k.DieneName, k.DienophileName,
				k.Activation, k.Rate.InDomain, r.DieneName, r.DienophileName, r.Activation)
		}
	}
	t.Logf("demo: %d of %d pairs inside the rate model's domain", in, len(all))
}
