package screen

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"testing"
	"time"

	"cyclopair/fmo"
)

// fakeJob is a screenJob with arithmetic "chemistry": many tied keys, some pairs that do not
// exist, some that fail the filters and some whose full analysis fails.
type fakeJob struct{ nanEvery int64 }

var errFake = errors.New("fake analysis failure")

func (f fakeJob) scoreChunk(w int, lo, hi int64, out []chunkScore) {
	for k := lo; k < hi; k++ {
		key, pass, ok := f.score(w, k)
		out[k-lo] = chunkScore{key, pass, ok}
	}
}

func (f fakeJob) score(_ int, k int64) (float64, bool, bool) {
	if k%11 == 5 {
		return 0, false, false
	}
	key := float64(k % 7)
	if f.nanEvery > 0 && k%f.nanEvery == 0 {
		key = math.NaN()
	}
	return key, k%3 != 0, true
}

func (fakeJob) analyze(_ int, k int64) (*fmo.Pair, error) {
	if k%13 == 4 {
		return nil, fmt.Errorf("pair %d: %w", k, errFake)
	}
	return &fmo.Pair{DieneName: strconv.FormatInt(k, 10)}, nil
}

type row struct {
	rank, k int64
}

func runFake(t *testing.T, job screenJob, cfg engineConfig) ([]row, []int64, engineStats) {
	t.Helper()
	var rows []row
	var failed []int64
	st, err := engineRun(context.Background(), job, cfg, func(rank, k int64, p *fmo.Pair) error {
		if p.DieneName != strconv.FormatInt(k, 10) {
			t.Fatalf("row for pair %d carries pair %s", k, p.DieneName)
		}
		rows = append(rows, row{rank, k})
		return nil
	}, func(f pairFailure) {
		if !errors.Is(f.Err, errFake) {
			t.Errorf("failure %v does not wrap the sentinel", f.Err)
		}
		failed = append(failed, f.K)
	})
	if err != nil {
		t.Fatal(err)
	}
	return rows, failed, st
}

// reference computes the expected ranked output by brute force.
func reference(job fakeJob, lo, hi int64, top int) []int64 {
	var all []scored
	for k := lo; k < hi; k++ {
		key, pass, ok := job.score(0, k)
		if ok && pass {
			all = append(all, scored{key, k})
		}
	}
	slices.SortStableFunc(all, func(a, b scored) int {
		an, bn := math.IsNaN(a.key), math.IsNaN(b.key)
		switch {
		case an && !bn:
			return 1
		case bn && !an:
			return -1
		case !an && a.key < b.key:
			return -1
		case !an && a.key > b.key:
			return 1
		}
		return 0 // stable sort keeps index order for ties
	})
	if top > 0 && len(all) > top {
		all = all[:top]
	}
	var out []int64
	for _, s := range all {
		if s.k%13 != 4 {
			out = append(out, s.k)
		}
	}
	return out
}

func TestEngineRankedMatchesBruteForce(t *testing.T) {
	job := fakeJob{nanEvery: 17}
	for _, top := range []int{0, 1, 5, 50, 10000} {
		want := reference(job, 0, 2000, top)
		for _, workers := range []int{1, 2, 8} {
			for _, chunk := range []int{1, 7, 1024} {
				name := fmt.Sprintf("top=%d/workers=%d/chunk=%d", top, workers, chunk)
				rows, failed, st := runFake(t, job, engineConfig{Workers: workers, Ranked: true, Top: top, Lo: 0, Hi: 2000, Chunk: chunk})
				var got []int64
				for i, r := range rows {
					if r.rank != int64(i+1) {
						t.Fatalf("%s: row %d has rank %d", name, i, r.rank)
					}
					got = append(got, r.k)
				}
				if !slices.Equal(got, want) {
					t.Fatalf("%s: got %v..., want %v...", name, got[:min(10, len(got))], want[:min(10, len(want))])
				}
				if st.Emitted+st.Failed != int64(len(want))+int64(len(failed)) {
					t.Errorf("%s: counts %+v", name, st)
				}
				if st.Scored+st.Missing != 2000 {
					t.Errorf("%s: scored %d + missing %d != 2000", name, st.Scored, st.Missing)
				}
			}
		}
	}
}

func TestEngineStreamOrderAndShards(t *testing.T) {
	job := fakeJob{}
	const n = 3001
	whole, wholeFailed, st := runFake(t, job, engineConfig{Workers: 1, Lo: 0, Hi: n, Chunk: 64})
	for _, r := range whole {
		if r.rank != r.k+1 {
			t.Fatalf("unranked row rank %d for pair %d, want k+1", r.rank, r.k)
		}
	}
	if st.Scored+st.Missing != n {
		t.Errorf("stream looked at %d pairs, want %d", st.Scored+st.Missing, n)
	}
	for _, workers := range []int{2, 8} {
		got, _, _ := runFake(t, job, engineConfig{Workers: workers, Lo: 0, Hi: n, Chunk: 5})
		if !slices.Equal(got, whole) {
			t.Fatalf("workers=%d: stream differs from the single-worker stream", workers)
		}
	}
	for _, count := range []int{1, 2, 3, 7, 64} {
		var cat []row
		var catFailed []int64
		for i := 1; i <= count; i++ {
			lo, hi := Shard{Index: i, Count: count}.Range(n)
			part, f, _ := runFake(t, job, engineConfig{Workers: 3, Lo: lo, Hi: hi, Chunk: 16})
			cat = append(cat, part...)
			catFailed = append(catFailed, f...)
		}
		if !slices.Equal(cat, whole) || !slices.Equal(catFailed, wholeFailed) {
			t.Errorf("%d shards do not concatenate to the whole stream", count)
		}
	}
}

func TestEngineStreamTop(t *testing.T) {
	job := fakeJob{}
	all, _, _ := runFake(t, job, engineConfig{Workers: 1, Lo: 0, Hi: 5000})
	got, _, _ := runFake(t, job, engineConfig{Workers: 4, Lo: 0, Hi: 5000, Top: 25, Chunk: 3})
	if !slices.Equal(got, all[:25]) {
		t.Errorf("unranked --top 25 is not the first 25 rows of the stream")
	}
}

func TestEngineCancel(t *testing.T) {
	for _, ranked := range []bool{false, true} {
		ctx, cancel := context.WithCancel(context.Background())
		n := 0
		done := make(chan struct{})
		var err error
		var st engineStats
		go func() {
			defer close(done)
			st, err = engineRun(ctx, fakeJob{}, engineConfig{Workers: 4, Ranked: ranked, Lo: 0, Hi: 1 << 40, Chunk: 100},
				func(rank, k int64, p *fmo.Pair) error {
					n++
					if n == 10 {
						cancel()
					}
					return nil
				}, func(pairFailure) {})
		}()
		if ranked {
			time.Sleep(20 * time.Millisecond) // let phase 1 start on an endless space
			cancel()
		}
		select {
		case <-done:
		case <-time.After(20 * time.Second):
			t.Fatalf("ranked=%v: run did not stop after cancel", ranked)
		}
		if !errors.Is(err, context.Canceled) || !st.Canceled {
			t.Errorf("ranked=%v: err = %v, canceled = %v; want context.Canceled", ranked, err, st.Canceled)
		}
	}
}

func TestEngineEmitError(t *testing.T) {
	stop := errors.New("disk full")
	_, err := engineRun(context.Background(), fakeJob{}, engineConfig{Workers: 3, Lo: 0, Hi: 100000, Chunk: 10},
		func(rank, k int64, p *fmo.Pair) error {
			if rank > 3 {
				return stop
			}
			return nil
		}, func(pairFailure) {})
	if !errors.Is(err, stop) {
		t.Errorf("err = %v, want the emit error", err)
	}
}

func TestTopKHeap(t *testing.T) {
	rnd := rand.New(rand.NewPCG(4, 4))
	for _, k := range []int{1, 2, 3, 10, 100} {
		h := topK{k: k}
		var all []scored
		for i := range 1000 {
			s := scored{float64(rnd.IntN(20)), int64(i)}
			all = append(all, s)
			h.offer(s)
		}
		slices.SortFunc(all, compareScored)
		got := slices.Clone(h.h)
		slices.SortFunc(got, compareScored)
		if !slices.Equal(got, all[:k]) {
			t.Errorf("k=%d: heap kept %v, want %v", k, got, all[:k])
		}
	}
}

func TestShard(t *testing.T) {
	for _, n := range []int64{0, 1, 5, 1000, 1001, 4_000_000} {
		for _, count := range []int{1, 2, 3, 8, 13} {
			prev := int64(0)
			for i := 1; i <= count; i++ {
				lo, hi := Shard{Index: i, Count: count}.Range(n)
				if lo != prev || hi < lo {
					t.Fatalf("n=%d shard %d/%d = [%d,%d), previous ended at %d", n, i, count, lo, hi, prev)
				}
				if d := hi - lo; d < n/int64(count) || d > n/int64(count)+1 {
					t.Errorf("n=%d shard %d/%d has %d pairs: unbalanced", n, i, count, d)
				}
				prev = hi
			}
			if prev != n {
				t.Errorf("n=%d: %d shards end at %d", n, count, prev)
			}
		}
	}
	for _, bad := range []string{"", "3", "0/4", "5/4", "a/b", "1/0", "-1/3", "1/2/3"} {
		if _, err := ParseShard(bad); !errors.Is(err, ErrBadShard) {
			t.Errorf("ParseShard(%q) err = %v", bad, err)
		}
	}
	if sh, err := ParseShard(" 2/8"); err != nil || sh != (Shard{2, 8}) {
		t.Errorf("ParseShard(2/8) = %v, %v", sh, err)
	}
}

func TestPairSpaceSplit(t *testing.T) {
	s := PairSpace{Dienes: 3, Dienophiles: 4, Activations: 2}
	k := int64(0)
	for i := range 3 {
		for j := range 4 {
			for a := range 2 {
				if gi, gj, ga := s.Split(k); gi != i || gj != j || ga != a {
					t.Fatalf("Split(%d) = %d,%d,%d want %d,%d,%d", k, gi, gj, ga, i, j, a)
				}
				k++
			}
		}
	}
	if s.Len() != k {
		t.Errorf("Len = %d, want %d", s.Len(), k)
	}
}
