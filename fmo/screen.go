package fmo

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
)

// Screening. A screen takes a Library (substrate file), prepares every molecule once —
// parse, perceive, solve, find reacting units; each dienophile once per activation mode —
// then scores every diene × dienophile × activation triple with the allocation-free
// QuickScore kernel on a worker pool, ranks by the chosen key and runs the full Analyze only
// for the rows that are output.
//
// Guarantees:
//   - Output is the same, row for row, whatever the number of workers (pairs are ranked by
//     (key, pair index), a strict total order; see screen_engine.go).
//   - With Top = K the ranking keeps K records (a heap), and the unranked stream keeps a few
//     chunks in flight, so memory does not grow with the number of pairs. Ranking every pair
//     (Top = 0 with a rank key) keeps 16 bytes per passing pair (about three times that
//     while the workers' lists are merged).
//   - Bad inputs never stop the screen: molecules that fail to prepare and pairs whose full
//     analysis fails are reported as ScreenFailures and the rest goes on.
//   - A Shard selects a contiguous slice of the pair space; the unranked outputs of shards
//     1..n concatenate to the unsharded unranked output.

// ScreenOptions drive one screen.
type ScreenOptions struct {
	Workers  int     // ≤ 0: runtime.GOMAXPROCS(0)
	RankBy   RankKey // RankNone streams in pair order
	Top      int     // keep at most Top rows, 0 = all
	Filter   Filter
	Shard    Shard
	Activate *ActivateOptions // nil: defaults (pyrrolidine for iminium, the set's O=LA for Lewis)
	// Progress, if not nil, is called concurrently from workers with the number of pairs
	// just scored.
	Progress func(n int64)
	// Selected, if not nil, is called once a ranked screen has scored every pair, with the
	// number of rows that now get the full analysis (before the first row is emitted).
	Selected func(n int64)
}

// ScreenFailure is an input of the screen that failed: a substrate row that could not be
// prepared, an activation that could not be applied, or a pair whose analysis failed.
type ScreenFailure struct {
	Where string // "file: line:col" of the row, or "" for a pair
	What  string // e.g. `diene "cyclopentadiene"` or `pair isoprene + acrolein (lewis)`
	Err   error
}

func (f ScreenFailure) Error() string {
	if f.Where == "" {
		return fmt.Sprintf("%s: %v", f.What, f.Err)
	}
	return fmt.Sprintf("%s: %s: %v", f.Where, f.What, f.Err)
}

func (f ScreenFailure) Unwrap() error { return f.Err }

// Prepared is a library with every molecule prepared, ready to be screened any number of
// times (with different ranking, filters, shards). It is safe for concurrent use.
type Prepared struct {
	Opts        *Options
	Activations []string
	Dienes      []*Partner // one per good diene row, in file order
	DieneRows   []Substrate
	Dienophiles []*Partner // free dienophiles, one per good row
	DphRows     []Substrate
	// Variants[j][a] is dienophile j under Activations[a]; nil when the mode does not apply
	// to it (nothing to activate) or failed (then it is in Failures).
	Variants [][]*Partner
	Failures []ScreenFailure // preparation failures, in file order
	// NotApplicable counts (dienophile, mode) combinations skipped because the mode has
	// nothing to act on (e.g. iminium activation of acrylonitrile).
	NotApplicable int
	activate      *ActivateOptions
	quick         *QuickKernel
	sides         SideChannelCache // dimerisation per diene, shared by every row of that diene
}

// Space is the pair space of the prepared library.
func (p *Prepared) Space() PairSpace {
	return PairSpace{Dienes: len(p.Dienes), Dienophiles: len(p.Dienophiles), Activations: len(p.Activations)}
}

// PrepareOptions tune Prepare.
type PrepareOptions struct {
	Workers  int              // ≤ 0: runtime.GOMAXPROCS(0)
	Activate *ActivateOptions // nil: defaults (pyrrolidine for iminium, the set's O=LA for Lewis)
	// Progress, if not nil, is called concurrently from workers with the number of
	// molecules (or activated variants) just prepared.
	Progress func(n int64)
}

// Prepare builds every partner of lib with opts. Each distinct SMILES (with the same pins)
// of a role is perceived and solved once. Failures are collected in the result; the error
// is non-nil only when ctx is canceled.
func Prepare(ctx context.Context, lib *Library, opts *Options, po PrepareOptions) (*Prepared, error) {
	workers, act := po.Workers, po.Activate
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	tick := func() {
		if po.Progress != nil {
			po.Progress(1)
		}
	}
	p := &Prepared{Opts: opts, Activations: slices.Clone(lib.Activations), activate: act, quick: NewQuickKernel(opts)}
	if len(p.Activations) == 0 {
		p.Activations = []string{ActivateNone}
	}
	type job struct {
		sub  *Substrate
		role Role
	}
	rows := make([]job, 0, len(lib.Dienes)+len(lib.Dienophiles))
	for i := range lib.Dienes {
		rows = append(rows, job{&lib.Dienes[i], RoleDiene})
	}
	for i := range lib.Dienophiles {
		rows = append(rows, job{&lib.Dienophiles[i], RoleDienophile})
	}
	// Distinct molecules per role: rows with the same SMILES and pins share one partner.
	type molKey struct {
		role Role
		smi  string
		pin  string
	}
	first := map[molKey]int{}
	owner := make([]int, len(rows)) // row -> row index that builds the partner
	for i, r := range rows {
		k := molKey{r.role, r.sub.SMILES, fmt.Sprint(r.sub.Pin)}
		if f, ok := first[k]; ok {
			owner[i] = f
		} else {
			first[k] = i
			owner[i] = i
		}
	}
	built := make([]*Partner, len(rows))
	errs := make([]error, len(rows))
	err := parallelFor(ctx, workers, len(rows), func(i int) {
		defer tick()
		if owner[i] != i {
			return
		}
		r := rows[i]
		m := r.sub.Mol
		if m == nil {
			errs[i] = fmt.Errorf("%w: row was not parsed", ErrBadSMILES)
			return
		}
		part, err := NewPartnerFromMolecule(r.sub.Name, m, r.role, opts)
		if err != nil {
			errs[i] = err
			return
		}
		part.SMILES = r.sub.SMILES
		built[i] = part
	})
	if err != nil {
		return nil, err
	}
	for i, r := range rows {
		o := owner[i]
		what := fmt.Sprintf("%s %q", r.role, r.sub.Name)
		if errs[o] != nil {
			p.Failures = append(p.Failures, ScreenFailure{Where: r.sub.Where(), What: what, Err: errs[o]})
			continue
		}
		part := built[o]
		if o != i { // same molecule under another name
			c := *part
			c.Name = r.sub.Name
			part = &c
		}
		if r.role == RoleDiene {
			p.Dienes = append(p.Dienes, part)
			p.DieneRows = append(p.DieneRows, *r.sub)
		} else {
			p.Dienophiles = append(p.Dienophiles, part)
			p.DphRows = append(p.DphRows, *r.sub)
		}
	}
	// Activated variants, one per (dienophile, mode).
	na := len(p.Activations)
	p.Variants = make([][]*Partner, len(p.Dienophiles))
	verr := make([]error, len(p.Dienophiles)*na)
	for j := range p.Variants {
		p.Variants[j] = make([]*Partner, na)
	}
	err = parallelFor(ctx, workers, len(p.Dienophiles)*na, func(i int) {
		defer tick()
		j, a := i/na, i%na
		mode := p.Activations[a]
		if mode == ActivateNone {
			p.Variants[j][a] = p.Dienophiles[j]
			return
		}
		v, err := p.Dienophiles[j].WithActivation(mode, act, opts)
		if err != nil {
			verr[i] = err
			return
		}
		p.Variants[j][a] = v
	})
	if err != nil {
		return nil, err
	}
	for i, e := range verr {
		if e == nil {
			continue
		}
		j, a := i/na, i%na
		if errors.Is(e, ErrNothingToActivate) {
			p.NotApplicable++
			continue
		}
		p.Failures = append(p.Failures, ScreenFailure{Where: p.DphRows[j].Where(),
			What: fmt.Sprintf("dienophile %q activated (%s)", p.DphRows[j].Name, p.Activations[a]), Err: e})
	}
	return p, nil
}

// parallelFor calls f(i) for i in [0, n) on up to workers goroutines.
func parallelFor(ctx context.Context, workers, n int, f func(i int)) error {
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(workers, max(n, 1)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for ctx.Err() == nil {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				f(i)
			}
		}()
	}
	wg.Wait()
	return ctx.Err()
}

// ScreenRow is one output row of a screen.
type ScreenRow struct {
	Rank  int64 // 1-based rank, or the pair's 1-based number in the pair space when unranked
	Index int64 // 0-based index of the pair in the whole (unsharded) pair space, the tie-breaker of every ranking
	Pair  *Pair
}

// ScreenStats counts what a screen did.
type ScreenStats struct {
	Pairs         int64 // triples in the (sharded) pair space
	Scored        int64 // pairs scored (activation applicable)
	NotApplicable int64 // pairs skipped: activation mode has nothing to act on, or failed
	Passed        int64 // scored pairs that passed the filters
	Shown         int64 // rows emitted
	Failed        int64 // pairs whose full analysis failed
	Canceled      bool
}

// rankValue is the ranking key of a QuickScore result, lower is better.
func rankValue(key RankKey, q *Quick) float64 {
	switch key {
	case RankGap:
		return math.Min(q.GapNormal, q.GapInverse)
	case RankStabilization:
		return -q.Stabilization
	case RankRegioMargin:
		return -q.RegioMargin
	case RankScore:
		return -q.Best
	}
	return q.GapNormal
}

// passes applies the filters that QuickScore can decide.
func (f *Filter) passes(q *Quick) bool {
	if !q.OK {
		return false
	}
	switch f.Demand {
	case "normal":
		if q.Demand != 1 {
			return false
		}
	case "inverse":
		if q.Demand != -1 {
			return false
		}
	case "neutral":
		if q.Demand != 0 {
			return false
		}
	}
	if f.MinRegioMargin > 0 && !(q.RegioMargin >= f.MinRegioMargin) {
		return false
	}
	if f.MaxGap > 0 && !(math.Min(q.GapNormal, q.GapInverse) <= f.MaxGap) {
		return false
	}
	return true
}

// preparedJob adapts a Prepared library to the engine.
type preparedJob struct {
	p     *Prepared
	space PairSpace
	rank  RankKey
	flt   Filter
}

func (j *preparedJob) scoreChunk(_ int, lo, hi int64, out []chunkScore) {
	d, e, a := j.space.Split(lo)
	na, ne := j.space.Activations, j.space.Dienophiles
	diene := j.p.Dienes[d]
	for i := range out[:hi-lo] {
		if v := j.p.Variants[e][a]; v == nil {
			out[i] = chunkScore{}
		} else {
			q := j.p.quick.Score(diene, v)
			out[i] = chunkScore{key: rankValue(j.rank, &q), pass: j.flt.passes(&q), ok: true}
		}
		if a++; a == na {
			a = 0
			if e++; e == ne {
				e = 0
				if d++; d < len(j.p.Dienes) {
					diene = j.p.Dienes[d]
				}
			}
		}
	}
}

func (j *preparedJob) analyze(_ int, k int64) (*Pair, error) {
	d, e, a := j.space.Split(k)
	return j.p.AnalyzeAt(d, e, a)
}

// AnalyzeAt runs the full analysis of diene d with dienophile e under activation a (indices
// into Dienes, Dienophiles and Activations), as the pair command does: an activated pair
// carries the activation effect against the free dienophile and the diene cautions of the
// mode, and the side channels (diene dimerisation, product as dienophile) are checked.
func (p *Prepared) AnalyzeAt(d, e, a int) (*Pair, error) {
	v := p.Variants[e][a]
	if v == nil {
		return nil, fmt.Errorf("activation %s does not apply to %s", p.Activations[a], p.Dienophiles[e].Name)
	}
	diene := p.Dienes[d]
	pair, err := Analyze(diene, v, p.Opts)
	if err != nil {
		return nil, err
	}
	if mode := p.Activations[a]; mode != ActivateNone {
		free, err := Analyze(diene, p.Dienophiles[e], p.Opts)
		if err != nil {
			free = nil
		}
		pair.Activated = Effect(p.Dienophiles[e], v, mode, free, pair, p.Opts)
		for _, w := range DieneCautions(diene.Mol, mode) {
			if !slices.Contains(pair.Warnings, w) {
				pair.Warnings = append(pair.Warnings, w)
			}
		}
	}
	pair.AttachSideChannels(p.sides.SideChannels(diene, p.Dienophiles[e], pair, p.Opts))
	pair.DieneName = p.DieneRows[d].Name
	pair.DienophileName = p.DphRows[e].Name
	return pair, nil
}

// Screen scores the prepared pairs and calls emit, from the calling goroutine and in output
// order, with each row; emit returning an error stops the screen with that error. Pairs
// whose full analysis fails go to fail (also from the calling goroutine) and the screen
// goes on. On cancellation the rows already emitted stay emitted, Stats.Canceled is set and
// the error is ctx.Err().
//
// Filters: demand, min_regio_margin and max_gap are decided on the QuickScore numbers,
// before ranking; allowed_only needs the full analysis and is applied to the ranked rows,
// so with Top = K and allowed_only fewer than K rows can come out.
func (p *Prepared) Screen(ctx context.Context, so ScreenOptions, emit func(ScreenRow) error, fail func(ScreenFailure)) (ScreenStats, error) {
	space := p.Space()
	lo, hi := so.Shard.Range(space.Len())
	job := &preparedJob{p: p, space: space, rank: so.RankBy, flt: so.Filter}
	cfg := engineConfig{Workers: so.Workers, Ranked: so.RankBy != RankNone && so.RankBy != "", Top: so.Top,
		Lo: lo, Hi: hi, Progress: so.Progress, Selected: so.Selected}
	var st ScreenStats
	st.Pairs = hi - lo
	rank := int64(0)
	es, err := engineRun(ctx, job, cfg, func(r, k int64, pair *Pair) error {
		if so.Filter.AllowedOnly && !pair.Allowed {
			return nil
		}
		rank++
		if !cfg.Ranked {
			rank = r
		}
		st.Shown++
		return emit(ScreenRow{Rank: rank, Index: k, Pair: pair})
	}, func(f pairFailure) {
		d, e, a := space.Split(f.K)
		fail(ScreenFailure{What: fmt.Sprintf("pair %q + %q (%s)", p.DieneRows[d].Name, p.DphRows[e].Name, p.Activations[a]), Err: f.Err})
	})
	st.Scored, st.NotApplicable, st.Passed, st.Failed, st.Canceled = es.Scored, es.Missing, es.Passed, es.Failed, es.Canceled
	return st, err
}
