package screen

import (
	"context"
	"fmt"

	"cyclopair/fmo"
	"cyclopair/fmo/substrates"
)

// ScreenOptions drive one screen.
type ScreenOptions struct {
	Workers int     // ≤ 0: runtime.GOMAXPROCS(0)
	RankBy  RankKey // RankNone streams in pair order
	Top     int     // keep at most Top rows, 0 = all
	Filter  substrates.Filter
	Shard   Shard
	// Exhaustive scores every pair even when Top > 0; otherwise a ranked screen with a Top
	// skips blocks of pairs that provably cannot reach the top K (bounded.go). Both give the
	// same rows.
	Exhaustive bool
	Activate   *fmo.ActivateOptions // nil: defaults (pyrrolidine for iminium, the set's O=LA for Lewis)
	// Detail is how much of each row's Pair the full analysis fills (fmo.DetailAll, the
	// zero value, or fmo.DetailBest / fmo.DetailRow for outputs that show only the preferred
	// orientation's product); the rows and their order do not depend on it.
	Detail fmo.Detail
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

// ScreenRow is one output row of a screen.
type ScreenRow struct {
	Rank  int64 // 1-based rank, or the pair's 1-based number in the pair space when unranked
	Index int64 // 0-based index of the pair in the whole (unsharded) pair space, the tie-breaker of every ranking
	Pair  *fmo.Pair
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

// preparedJob adapts a Prepared library to the engine.
type preparedJob struct {
	p      *Prepared
	space  PairSpace
	rank   RankKey
	flt    substrates.Filter
	detail fmo.Detail
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
			key := 0.0
			if j.rank == RankRate {
				if q.OK {
					key = -j.p.rate.Quick(&q, &j.p.dieneConf[d][q.DieneUnit])
				}
			} else {
				key = rankValue(j.rank, &q)
			}
			out[i] = chunkScore{key: key, pass: j.passes(d, &q), ok: true}
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

func (j *preparedJob) analyze(_ int, k int64) (*fmo.Pair, error) {
	d, e, a := j.space.Split(k)
	return j.p.AnalyzeAtDetail(d, e, a, j.detail)
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
	job := &preparedJob{p: p, space: space, rank: so.RankBy, flt: so.Filter, detail: so.Detail}
	cfg := engineConfig{Workers: so.Workers, Ranked: so.RankBy != RankNone && so.RankBy != "", Top: so.Top,
		Lo: lo, Hi: hi, Progress: so.Progress, Selected: so.Selected}
	if cfg.Ranked && !so.Exhaustive {
		cfg.Select = job.boundedSelect(so.Top, lo, hi, so.Progress)
	}
	var st ScreenStats
	st.Pairs = hi - lo
	rank := int64(0)
	es, err := engineRun(ctx, job, cfg, func(r, k int64, pair *fmo.Pair) error {
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
