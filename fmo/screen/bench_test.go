package screen

import (
	"context"
	"math"
	"math/rand/v2"
	"runtime"
	"strings"
	"sync"
	"sync/atomic"
	"testing"

	"cyclopair/fmo"
	"cyclopair/fmo/internal/testsupport"
	"cyclopair/fmo/substrates"
)

// The generator gives valid, distinct, deterministic molecules that the analysis accepts.
func TestSyntheticLibrary(t *testing.T) {
	a := testsupport.SyntheticLibrary(300, 300, 1)
	b := testsupport.SyntheticLibrary(300, 300, 1)
	if len(a.Dienes) != 300 || len(a.Dienophiles) != 300 {
		t.Fatalf("got %d/%d molecules", len(a.Dienes), len(a.Dienophiles))
	}
	for i := range a.Dienes {
		if a.Dienes[i].SMILES != b.Dienes[i].SMILES {
			t.Fatal("generator is not deterministic")
		}
	}
	p, err := Prepare(context.Background(), a, screenOpts(t), PrepareOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	// Every generated molecule has a π system the analysis can use; list the exceptions.
	for _, f := range p.Failures {
		t.Errorf("synthetic molecule failed: %v", f)
	}
	cores := map[string]bool{}
	for _, d := range a.Dienes {
		cores[strings.Split(d.Name, "-")[1]] = true
	}
	if len(cores) < 4 {
		t.Errorf("only %d diene cores drawn", len(cores))
	}
}

// BenchmarkPrepare measures molecules/s for the preparation stage of a screen: parse,
// perceive, solve, find reacting units (the SMILES are generated outside the timed loop),
// single worker, so the figure is per core.
func BenchmarkPrepare(b *testing.B) {
	o := screenOpts(b)
	lib := testsupport.SyntheticLibrary(200, 200, 7)
	var src []substrates.Substrate
	src = append(src, lib.Dienes...)
	src = append(src, lib.Dienophiles...)
	b.ReportAllocs()
	n := 0
	cpu0 := testsupport.CPUTime()
	for b.Loop() {
		s := src[n%len(src)]
		role := fmo.RoleDiene
		if n%len(src) >= len(lib.Dienes) {
			role = fmo.RoleDienophile
		}
		if _, err := fmo.NewPartner(s.Name, s.SMILES, role, o); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(n)/b.Elapsed().Seconds(), "molecules/s")
	if c := testsupport.CPUTime() - cpu0; c > 0 {
		b.ReportMetric(float64(n)/c.Seconds(), "molecules/cpu-s")
	}
}

// benchPrepared is a 2000 × 2000 synthetic screen prepared once per process.
var benchPrepared *Prepared

func prepared2000(b *testing.B) *Prepared {
	if benchPrepared == nil {
		lib := testsupport.SyntheticLibrary(2000, 2000, 42)
		p, err := Prepare(context.Background(), lib, screenOpts(b), PrepareOptions{Workers: 0})
		if err != nil {
			b.Fatal(err)
		}
		benchPrepared = p
	}
	return benchPrepared
}

// BenchmarkScreenKernelBaseline is the baseline for BenchmarkScreenScore: the same
// 4 million QuickScore calls on the 2000 × 2000 synthetic library as plain nested loops, no
// engine, one goroutine.
func BenchmarkScreenKernelBaseline(b *testing.B) {
	p := prepared2000(b)
	b.ReportAllocs()
	pairs := int64(0)
	cpu0 := testsupport.CPUTime()
	var sink float64
	for b.Loop() {
		for _, d := range p.Dienes {
			for j := range p.Variants {
				for _, v := range p.Variants[j] {
					if v == nil {
						continue
					}
					q := p.quick.Score(d, v)
					sink += q.GapNormal
					pairs++
				}
			}
		}
	}
	_ = sink
	b.ReportMetric(float64(pairs)/b.Elapsed().Seconds(), "pairs/s")
	if c := testsupport.CPUTime() - cpu0; c > 0 {
		b.ReportMetric(float64(pairs)/c.Seconds(), "pairs/cpu-s")
	}
}

// BenchmarkScreenScore measures pairs/s of the screen's scoring path — the engine's chunking,
// ranking into a top-100 heap and the QuickScore kernel over cached partners — on the
// 2000 × 2000 synthetic library (4 million pairs per op), then the full analysis of the 100
// rows. workers=1 against BenchmarkScreenKernelBaseline gives the engine's overhead per core.
func BenchmarkScreenScore(b *testing.B) {
	p := prepared2000(b)
	for _, workers := range []int{1, runtime.GOMAXPROCS(0)} {
		b.Run(map[bool]string{true: "workers=1", false: "workers=all"}[workers == 1], func(b *testing.B) {
			b.ReportAllocs()
			pairs := int64(0)
			cpu0 := testsupport.CPUTime()
			for b.Loop() {
				st, err := p.Screen(context.Background(), ScreenOptions{Workers: workers, RankBy: RankNormalGap, Top: 100},
					func(ScreenRow) error { return nil }, func(ScreenFailure) {})
				if err != nil {
					b.Fatal(err)
				}
				pairs += st.Scored
			}
			b.ReportMetric(float64(pairs)/b.Elapsed().Seconds(), "pairs/s")
			if c := testsupport.CPUTime() - cpu0; c > 0 {
				b.ReportMetric(float64(pairs)/c.Seconds(), "pairs/cpu-s")
			}
		})
	}
}

// BenchmarkScreenMemory runs the 2000 × 2000 screen (4 million pairs) with top-K ranking
// (K = 50) and as an unranked stream cut at 1000 rows, and reports the live heap: every
// 500 000 pairs scored (and at every output row) it forces a GC and reads HeapAlloc; the
// largest value minus the heap before the run is "peak-live-KiB". Bounded memory means it
// stays at the size of K rows and a few chunks, not of 4 million pairs (4M × 16 B = 61 MiB
// would be the cost of keeping every record). Caveat: HeapAlloc right after a forced GC also
// counts what other goroutines allocate during that GC cycle, so while the stream's workers
// run full analyses (about 0.5 MB of short-lived garbage each) the sampled peak is inflated
// by their allocation rate; the scoring phase of a ranked run allocates nothing and reads true.
func BenchmarkScreenMemory(b *testing.B) {
	p := prepared2000(b)
	for _, c := range []struct {
		name string
		so   ScreenOptions
	}{
		{"top50", ScreenOptions{RankBy: RankStabilization, Top: 50}},
		{"stream1000", ScreenOptions{RankBy: RankNone, Top: 1000}},
	} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			var ms runtime.MemStats
			runtime.GC()
			runtime.ReadMemStats(&ms)
			before := ms.HeapAlloc
			var mu sync.Mutex
			peak := uint64(0)
			sample := func() {
				mu.Lock()
				defer mu.Unlock()
				var m runtime.MemStats
				runtime.GC()
				runtime.ReadMemStats(&m)
				peak = max(peak, m.HeapAlloc)
			}
			var done atomic.Int64
			so := c.so
			so.Progress = func(n int64) {
				if d := done.Add(n); d/500_000 != (d-n)/500_000 {
					sample()
				}
			}
			for b.Loop() {
				rows := 0
				_, err := p.Screen(context.Background(), so, func(ScreenRow) error {
					if rows++; rows%100 == 0 {
						sample()
					}
					return nil
				}, func(ScreenFailure) {})
				if err != nil {
					b.Fatal(err)
				}
			}
			if peak > before {
				b.ReportMetric(float64(peak-before)/1024, "peak-live-KiB")
			} else {
				b.ReportMetric(0, "peak-live-KiB")
			}
			runtime.GC()
			runtime.ReadMemStats(&ms)
			b.ReportMetric(float64(int64(ms.HeapAlloc)-int64(before))/1024, "retained-KiB")
		})
	}
}

// The ranking relies on QuickScore giving the numbers Analyze reports. Check it on 400
// random pairs of synthetic partners with several reacting units each (tolerance 1e-9 |β|,
// summation order).
func TestQuickAgreesWithAnalyzeSynthetic(t *testing.T) {
	lib := testsupport.SyntheticLibrary(60, 60, 9)
	p, err := Prepare(context.Background(), lib, screenOpts(t), PrepareOptions{Workers: 2})
	if err != nil || len(p.Failures) > 0 {
		t.Fatal(err, p.Failures)
	}
	rnd := rand.New(rand.NewPCG(3, 3))
	const tol = 1e-9
	for range 400 {
		d, e := rnd.IntN(len(p.Dienes)), rnd.IntN(len(p.Dienophiles))
		q := fmo.QuickScore(p.Dienes[d], p.Dienophiles[e], p.Opts)
		pair, err := fmo.Analyze(p.Dienes[d], p.Dienophiles[e], p.Opts)
		if err != nil {
			t.Errorf("%s + %s: %v", p.Dienes[d].SMILES, p.Dienophiles[e].SMILES, err)
			continue
		}
		if math.Abs(q.GapNormal-pair.GapNormal.Beta) > tol || math.Abs(q.Stabilization-pair.Orientations[0].Stabilization) > tol ||
			math.Abs(q.RegioMargin-pair.RegioMargin) > tol {
			t.Errorf("%s + %s: quick %v/%v/%v, analysis %v/%v/%v", p.Dienes[d].SMILES, p.Dienophiles[e].SMILES,
				q.GapNormal, q.Stabilization, q.RegioMargin, pair.GapNormal.Beta, pair.Orientations[0].Stabilization, pair.RegioMargin)
		}
	}
}

// BenchmarkAnalyzeRows measures the full analysis of printed rows (AnalyzeAt: pair analysis,
// activation effect, side channels) over every pair of a 30 × 30 × 3 synthetic library, one
// goroutine: the per-row cost of `screen --top 0`.
func BenchmarkAnalyzeRows(b *testing.B) {
	lib := testsupport.SyntheticLibrary(30, 30, 5)
	lib.Activations = []string{fmo.ActivateNone, fmo.ActivateLewis, fmo.ActivateIminium}
	p, err := Prepare(context.Background(), lib, screenOpts(b), PrepareOptions{Workers: 1})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	rows := 0
	for b.Loop() {
		for d := range p.Dienes {
			for e := range p.Dienophiles {
				for a := range p.Activations {
					if p.Variants[e][a] == nil {
						continue
					}
					if _, err := p.AnalyzeAt(d, e, a); err != nil {
						b.Fatal(err)
					}
					rows++
				}
			}
		}
	}
	b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
}

// BenchmarkRowDetail measures the per-row path of `screen --top 0` for the formats that
// print only the preferred orientation (table, CSV, Markdown, SD: fmo.DetailRow) against
// fmo.DetailBest and the full rows JSON prints (fmo.DetailAll, the same-run baseline): each
// op analyses every pair of a 30 × 30 synthetic library (one activation, as `screen` without
// --activate) at the three levels, interleaved, one goroutine. "row-rows/cpu-s" is the CSV
// path's rate, "x-vs-all" and "x-vs-best" its speed-up over the full rows and DetailBest.
func BenchmarkRowDetail(b *testing.B) {
	lib := testsupport.SyntheticLibrary(30, 30, 5)
	p, err := Prepare(context.Background(), lib, screenOpts(b), PrepareOptions{Workers: 1})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	var t [3]float64 // DetailAll, DetailBest, DetailRow
	rows := 0
	for b.Loop() {
		for i, detail := range []fmo.Detail{fmo.DetailAll, fmo.DetailBest, fmo.DetailRow} {
			cpu0 := testsupport.CPUTime()
			for d := range p.Dienes {
				for e := range p.Dienophiles {
					if _, err := p.AnalyzeAtDetail(d, e, 0, detail); err != nil {
						b.Fatal(err)
					}
					if detail == fmo.DetailRow {
						rows++
					}
				}
			}
			t[i] += (testsupport.CPUTime() - cpu0).Seconds()
		}
	}
	if t[2] > 0 {
		b.ReportMetric(float64(rows)/t[2], "row-rows/cpu-s")
		b.ReportMetric(t[0]/t[2], "x-vs-all")
		b.ReportMetric(t[1]/t[2], "x-vs-best")
	}
}

// BenchmarkBoundedTopK runs the 2000 × 2000 synthetic screen ranked with top 50 twice per op,
// by bounds and exhaustively (the same-run baseline), for the default key and the score, and
// reports the ratio of their times ("x-vs-exhaustive") and the share of pairs the bounded
// search put through the kernel. The rows are the same (TestBoundedEqualsExhaustive).
func BenchmarkBoundedTopK(b *testing.B) {
	p := prepared2000(b)
	for _, key := range []RankKey{RankRate, RankNormalGap, RankScore} {
		b.Run(string(key), func(b *testing.B) {
			var tb, te float64
			var kernel, scored int64
			for b.Loop() {
				for _, exhaustive := range []bool{false, true} {
					cpu0 := testsupport.CPUTime()
					so := ScreenOptions{RankBy: key, Top: 50, Exhaustive: exhaustive}
					space := p.Space()
					job := &preparedJob{p: p, space: space, rank: key, flt: so.Filter}
					cfg := engineConfig{Workers: runtime.GOMAXPROCS(0), Ranked: true, Top: 50, Lo: 0, Hi: space.Len(), Chunk: 1024}
					var st engineStats
					var err error
					if exhaustive {
						_, st, err = engineScoreAll(context.Background(), job, cfg)
					} else {
						_, st, err = job.boundedSelect(50, 0, space.Len(), nil)(context.Background(), cfg.Workers)
						kernel += st.Kernel
						scored += st.Scored
					}
					if err != nil {
						b.Fatal(err)
					}
					d := (testsupport.CPUTime() - cpu0).Seconds()
					if exhaustive {
						te += d
					} else {
						tb += d
					}
				}
			}
			if tb > 0 {
				b.ReportMetric(te/tb, "x-vs-exhaustive")
			}
			if scored > 0 {
				b.ReportMetric(float64(kernel)/float64(scored), "kernel-share")
			}
		})
	}
}

// BenchmarkPrepareMemory prepares a 1000 × 1000 synthetic library under three activations
// (none, lewis, iminium) in full and in compact form (PrepareOptions.Compact, the form of
// ranked screens with a top K) in the same run and reports the heap each Prepared keeps per
// molecule ("full-B/molecule", "compact-B/molecule": live heap after a forced GC with the
// Prepared reachable, minus the heap before, over the 2,000 input molecules; activated
// variants are counted in their molecule's share), the parsed library's own share
// ("library-B/molecule", the rows and their molecules, kept by both forms), and the CPU-time
// ratio of the two preparations ("x-compact-cpu", full over compact).
func BenchmarkPrepareMemory(b *testing.B) {
	o := screenOpts(b)
	var ms runtime.MemStats
	heap := func() uint64 {
		runtime.GC()
		runtime.ReadMemStats(&ms)
		return ms.HeapAlloc
	}
	h0 := heap()
	lib := testsupport.SyntheticLibrary(1000, 1000, 21)
	lib.Activations = []string{fmo.ActivateNone, fmo.ActivateLewis, fmo.ActivateIminium}
	nMol := float64(len(lib.Dienes) + len(lib.Dienophiles))
	libBytes := float64(heap()) - float64(h0)
	var perFull, perCompact, cpuFull, cpuCompact float64
	for b.Loop() {
		for _, compact := range []bool{false, true} {
			before := heap()
			cpu0 := testsupport.CPUTime()
			p, err := Prepare(context.Background(), lib, o, PrepareOptions{Workers: 1, Compact: compact})
			cpu := (testsupport.CPUTime() - cpu0).Seconds()
			if err != nil {
				b.Fatal(err)
			}
			per := (float64(heap()) - float64(before)) / nMol
			runtime.KeepAlive(p)
			if compact {
				perCompact, cpuCompact = per, cpuCompact+cpu
			} else {
				perFull, cpuFull = per, cpuFull+cpu
			}
		}
	}
	b.ReportMetric(perFull, "full-B/molecule")
	b.ReportMetric(perCompact, "compact-B/molecule")
	b.ReportMetric(libBytes/nMol, "library-B/molecule")
	if cpuCompact > 0 {
		b.ReportMetric(cpuFull/cpuCompact, "x-compact-cpu")
	}
}
