package screen

import (
	"context"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"cyclopair/fmo"
)

// This file holds the batch machinery of Screen, independent of the chemistry: a pair space
// enumerated in a fixed order, sharding, a worker pool that scores chunks of the space, a
// bounded top-K selection with deterministic tie-breaking and an in-order streamer. The
// chemistry (QuickScore, Analyze) is plugged in through screenJob (preparedJob in screen.go).
//
// Determinism: every pair has a fixed index in the pair space; ranking compares (key, index)
// pairs, a strict total order, so the selected rows and their order do not depend on how the
// space was split between workers. The unranked stream emits chunks strictly in index order.

// scored is the ranking record of one pair: lower key is better (keys that rank
// "largest first" are negated when they are made), ties go to the lower index.
type scored struct {
	key float64
	k   int64
}

// better is the strict total order of the ranking. NaN keys rank last.
func better(a, b scored) bool {
	an, bn := math.IsNaN(a.key), math.IsNaN(b.key)
	switch {
	case an != bn:
		return bn
	case !an && a.key != b.key:
		return a.key < b.key
	}
	return a.k < b.k
}

func compareScored(a, b scored) int {
	if better(a, b) {
		return -1
	}
	if better(b, a) {
		return 1
	}
	return 0
}

// topK keeps the K best records seen so far in a binary max-heap (the worst kept record at
// the root), so each offer costs O(log K) and memory is O(K) whatever the number of pairs.
type topK struct {
	k int
	h []scored
}

func (t *topK) offer(s scored) {
	if len(t.h) < t.k {
		t.h = append(t.h, s)
		// sift up
		i := len(t.h) - 1
		for i > 0 {
			p := (i - 1) / 2
			if !better(t.h[p], t.h[i]) { // parent is not better = parent worse or equal
				break
			}
			t.h[p], t.h[i] = t.h[i], t.h[p]
			i = p
		}
		return
	}
	if t.k == 0 || !better(s, t.h[0]) {
		return
	}
	t.h[0] = s
	// sift down: keep the worst at the root
	i := 0
	for {
		l, r, w := 2*i+1, 2*i+2, i
		if l < len(t.h) && better(t.h[w], t.h[l]) {
			w = l
		}
		if r < len(t.h) && better(t.h[w], t.h[r]) {
			w = r
		}
		if w == i {
			break
		}
		t.h[w], t.h[i] = t.h[i], t.h[w]
		i = w
	}
}

// screenJob is the chemistry a screen run needs. Both methods must be safe for concurrent
// use on different pairs; the worker argument identifies the calling worker (0..workers-1)
// so implementations can keep per-worker workspaces.
type screenJob interface {
	// scoreChunk scores pairs lo..hi-1 into out[0 : hi-lo]: the ranking key (lower is
	// better), whether the pair passes the filters, and ok=false for a pair that does not
	// exist (activation not applicable). Scoring a whole chunk per call keeps the per-pair
	// cost to the kernel itself (no interface call, no index division per pair).
	scoreChunk(worker int, lo, hi int64, out []chunkScore)
	// analyze runs the full analysis of pair k.
	analyze(worker int, k int64) (*fmo.Pair, error)
}

// chunkScore is one scored pair of a chunk.
type chunkScore struct {
	key      float64
	pass, ok bool
}

// engineConfig drives one engine run.
type engineConfig struct {
	Workers int
	Ranked  bool  // rank by key; otherwise stream in pair order
	Top     int   // keep at most Top rows (0 = all)
	Lo, Hi  int64 // pair index range
	Chunk   int   // pairs per work unit (default 1024 ranked, 32 streamed)
	// Progress, if not nil, is called from worker goroutines with the number of pairs just
	// scored; it must be safe for concurrent use.
	Progress func(n int64)
	// Selected, if not nil, is called (from the calling goroutine) when a ranked run has
	// scored every pair, with the number of rows that will get the full analysis.
	Selected func(n int64)
	// Select, if not nil, replaces phase 1 of a ranked run (scoring every pair): it returns
	// the records of the selected rows (any order; the engine sorts and cuts them to Top)
	// and the counts. The bounded top-K search (bounded.go) plugs in here.
	Select func(ctx context.Context, workers int) ([]scored, engineStats, error)
}

// engineStats counts what a run did.
type engineStats struct {
	Scored   int64 // pairs that exist and were scored
	Missing  int64 // pairs that do not exist (activation not applicable)
	Passed   int64 // scored pairs that passed the filters
	Emitted  int64 // rows handed to emit
	Failed   int64 // pairs whose full analysis failed
	Kernel   int64 // pairs that went through the scoring kernel (bounded search: fewer than Scored)
	Canceled bool
}

// pairFailure is a pair whose full analysis failed.
type pairFailure struct {
	K   int64
	Err error
}

// engineRun scores pairs [Lo, Hi) and calls emit (from the calling goroutine, in output
// order) with each output row: rank is the 1-based position in the ranking, or k+1 (the
// pair's number in the whole space) when unranked. emit returning an error stops the run.
// Failures of the full analysis are passed to fail (from the calling goroutine) and the run
// goes on. When ctx is canceled the run stops taking new work; the unranked stream still
// emits, in order, the rows of chunks already finished before the first gap, and the run
// returns ctx.Err() with Canceled set.
func engineRun(ctx context.Context, job screenJob, cfg engineConfig,
	emit func(rank int64, k int64, p *fmo.Pair) error, fail func(pairFailure)) (engineStats, error) {
	if cfg.Workers <= 0 {
		cfg.Workers = runtime.GOMAXPROCS(0)
	}
	if cfg.Chunk <= 0 {
		// Ranked runs only score in phase 1: big chunks keep synchronisation out of the
		// kernel's way. The unranked stream runs the full analysis (tens of µs and a few
		// hundred kB of garbage per pair) on every passing pair of a chunk, and up to
		// 2·Workers chunks are in flight: small chunks keep that memory and the work done
		// past a --top cut small.
		cfg.Chunk = 1024
		if !cfg.Ranked {
			cfg.Chunk = 32
		}
	}
	if cfg.Hi < cfg.Lo {
		panic("fmo: engineRun with Hi < Lo")
	}
	if cfg.Ranked {
		return engineRanked(ctx, job, cfg, emit, fail)
	}
	return engineStream(ctx, job, cfg, emit, fail)
}

// chunkOf returns the index range of chunk c.
func (cfg *engineConfig) chunkOf(c int64) (lo, hi int64) {
	lo = cfg.Lo + c*int64(cfg.Chunk)
	return lo, min(lo+int64(cfg.Chunk), cfg.Hi)
}

func (cfg *engineConfig) chunks() int64 {
	return (cfg.Hi - cfg.Lo + int64(cfg.Chunk) - 1) / int64(cfg.Chunk)
}

// engineRanked: phase 1 scores every pair with per-worker selections (a top-K heap, or all
// passing records when Top is 0), phase 2 merges them and runs the full analysis of the
// selected rows in parallel, emitting in rank order.
func engineRanked(ctx context.Context, job screenJob, cfg engineConfig,
	emit func(rank int64, k int64, p *fmo.Pair) error, fail func(pairFailure)) (engineStats, error) {
	var st engineStats
	var sel []scored
	if cfg.Select != nil {
		var err error
		sel, st, err = cfg.Select(ctx, cfg.Workers)
		if err != nil {
			st.Canceled = ctx.Err() != nil
			return st, err
		}
	} else {
		var err error
		sel, st, err = engineScoreAll(ctx, job, cfg)
		if err != nil {
			return st, err
		}
	}
	return emitSelected(ctx, job, cfg, sel, st, emit, fail)
}

// engineScoreAll is phase 1 of a ranked run: every pair is scored, with per-worker
// selections (a top-K heap, or all passing records when Top is 0).
func engineScoreAll(ctx context.Context, job screenJob, cfg engineConfig) ([]scored, engineStats, error) {
	var st engineStats
	nChunks := cfg.chunks()
	var next atomic.Int64
	type local struct {
		heap                    topK
		all                     []scored
		scoredN, missing, passN int64
	}
	locals := make([]local, cfg.Workers)
	var wg sync.WaitGroup
	for w := range cfg.Workers {
		locals[w].heap.k = cfg.Top
		wg.Add(1)
		go func() {
			defer wg.Done()
			loc := &locals[w]
			buf := make([]chunkScore, cfg.Chunk)
			for {
				c := next.Add(1) - 1
				if c >= nChunks || ctx.Err() != nil {
					return
				}
				lo, hi := cfg.chunkOf(c)
				out := buf[:hi-lo]
				job.scoreChunk(w, lo, hi, out)
				for i := range out {
					r := &out[i]
					if !r.ok {
						loc.missing++
						continue
					}
					loc.scoredN++
					if !r.pass {
						continue
					}
					loc.passN++
					if cfg.Top > 0 {
						if len(loc.heap.h) < loc.heap.k || better(scored{r.key, lo + int64(i)}, loc.heap.h[0]) {
							loc.heap.offer(scored{r.key, lo + int64(i)})
						}
					} else {
						loc.all = append(loc.all, scored{r.key, lo + int64(i)})
					}
				}
				if cfg.Progress != nil {
					cfg.Progress(hi - lo)
				}
			}
		}()
	}
	wg.Wait()
	var sel []scored
	for i := range locals {
		st.Scored += locals[i].scoredN
		st.Missing += locals[i].missing
		st.Passed += locals[i].passN
		sel = append(sel, locals[i].heap.h...)
		sel = append(sel, locals[i].all...)
		locals[i] = local{}
	}
	if err := ctx.Err(); err != nil {
		st.Canceled = true
		return nil, st, err
	}
	return sel, st, nil
}

// emitSelected is phase 2 of a ranked run: the selected records are sorted, cut to Top, and
// get the full analysis in parallel; rows are emitted in rank order.
func emitSelected(ctx context.Context, job screenJob, cfg engineConfig, sel []scored, st engineStats,
	emit func(rank int64, k int64, p *fmo.Pair) error, fail func(pairFailure)) (engineStats, error) {
	slices.SortFunc(sel, compareScored)
	if cfg.Top > 0 && len(sel) > cfg.Top {
		sel = sel[:cfg.Top]
	}
	if cfg.Selected != nil {
		cfg.Selected(int64(len(sel)))
	}
	// Phase 2: full analysis of the selected rows (up to milliseconds each) on every worker,
	// at most window rows ahead of the one being emitted: memory stays bounded, the first
	// rows come out soon, a cancel is seen quickly, and no worker waits for a slow row of
	// another (no barrier between batches). Rows are emitted in rank order from this
	// goroutine; row k's result lives in slot k % window until emitted.
	window := max(cfg.Workers*4, 8)
	type slot struct {
		pair *fmo.Pair
		err  error
		done chan struct{}
	}
	slots := make([]slot, window)
	for i := range slots {
		slots[i].done = make(chan struct{}, 1)
	}
	tokens := make(chan struct{}, window) // a worker holds one per row claimed and not yet emitted
	wctx, stop := context.WithCancel(ctx)
	var nextIdx atomic.Int64
	var wg sync.WaitGroup
	for w := range min(cfg.Workers, len(sel)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				select {
				case tokens <- struct{}{}:
				case <-wctx.Done():
					return
				}
				i := int(nextIdx.Add(1) - 1)
				if i >= len(sel) {
					return
				}
				sl := &slots[i%window]
				sl.pair, sl.err = job.analyze(w, sel[i].k)
				sl.done <- struct{}{}
			}
		}()
	}
	finish := func() { stop(); wg.Wait() }
	rank := int64(0)
	for i, s := range sel {
		sl := &slots[i%window]
		select {
		case <-sl.done:
		case <-ctx.Done():
			finish()
			st.Canceled = true
			return st, ctx.Err()
		}
		pair, err := sl.pair, sl.err
		sl.pair, sl.err = nil, nil
		<-tokens
		if err := ctx.Err(); err != nil {
			finish()
			st.Canceled = true
			return st, err
		}
		if err != nil {
			st.Failed++
			fail(pairFailure{K: s.k, Err: err})
			continue
		}
		rank++
		st.Emitted++
		if err := emit(rank, s.k, pair); err != nil {
			finish()
			return st, err
		}
	}
	finish()
	return st, nil
}

// chunkResult is one scored chunk of the unranked stream.
type chunkResult struct {
	c       int64
	ks      []int64
	pairs   []*fmo.Pair
	errs    []error
	scoredN int64
	missing int64
	passN   int64
}

// engineStream scores and fully analyses chunks in parallel and emits them strictly in index
// order. At most 2·Workers chunks are in flight, so memory is bounded by the chunk size, not
// by the number of pairs.
func engineStream(ctx context.Context, job screenJob, cfg engineConfig,
	emit func(rank int64, k int64, p *fmo.Pair) error, fail func(pairFailure)) (engineStats, error) {
	var st engineStats
	nChunks := cfg.chunks()
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	inFlight := make(chan struct{}, 2*cfg.Workers) // tokens: a worker takes one per chunk
	results := make(chan *chunkResult, 2*cfg.Workers)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := range cfg.Workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			buf := make([]chunkScore, cfg.Chunk)
			for {
				select {
				case inFlight <- struct{}{}:
				case <-ctx.Done():
					return
				}
				c := next.Add(1) - 1
				if c >= nChunks {
					<-inFlight
					return
				}
				lo, hi := cfg.chunkOf(c)
				r := &chunkResult{c: c}
				out := buf[:hi-lo]
				job.scoreChunk(w, lo, hi, out)
				for i := range out {
					k := lo + int64(i)
					if !out[i].ok {
						r.missing++
						continue
					}
					r.scoredN++
					if !out[i].pass {
						continue
					}
					r.passN++
					p, err := job.analyze(w, k)
					r.ks = append(r.ks, k)
					r.pairs = append(r.pairs, p)
					r.errs = append(r.errs, err)
				}
				if cfg.Progress != nil {
					cfg.Progress(hi - lo)
				}
				select {
				case results <- r:
				case <-ctx.Done():
					<-inFlight
					return
				}
			}
		}()
	}
	go func() { wg.Wait(); close(results) }()

	pending := map[int64]*chunkResult{}
	want := int64(0)
	var runErr error
	emitted := int64(0)
	for r := range results {
		pending[r.c] = r
		for runErr == nil {
			cr, ok := pending[want]
			if !ok {
				break
			}
			delete(pending, want)
			want++
			st.Scored += cr.scoredN
			st.Missing += cr.missing
			st.Passed += cr.passN
			for i, k := range cr.ks {
				if cr.errs[i] != nil {
					st.Failed++
					fail(pairFailure{K: k, Err: cr.errs[i]})
					continue
				}
				if cfg.Top > 0 && emitted >= int64(cfg.Top) {
					continue
				}
				emitted++
				st.Emitted++
				if err := emit(k+1, k, cr.pairs[i]); err != nil {
					runErr = err
					cancel()
					break
				}
			}
			<-inFlight
			if cfg.Top > 0 && emitted >= int64(cfg.Top) && runErr == nil {
				// Enough rows: stop scoring (the counts then cover the pairs looked at).
				cancel()
			}
		}
	}
	if runErr != nil {
		return st, runErr
	}
	if cfg.Top > 0 && emitted >= int64(cfg.Top) {
		return st, nil
	}
	if err := ctx.Err(); err != nil || want < nChunks {
		st.Canceled = true
		if err == nil {
			err = context.Canceled
		}
		return st, err
	}
	return st, nil
}
