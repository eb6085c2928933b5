package smiles

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TestRefineMatchesReference: the class-by-class refinement and the counting individualise
// give the ranks of the whole-signature sort they replaced (kept below as the reference),
// on every fixture molecule, renumberings of it, and random individualisation sequences, so
// canonical strings cannot move.
func TestRefineMatchesReference(t *testing.T) {
	fx := loadFixture(t)
	rng := rand.New(rand.NewPCG(21, 4))
	checked := 0
	for _, rec := range fx.Molecules {
		m0, err := Parse(rec.Smiles)
		if err != nil || len(m0.Atoms) == 0 {
			continue
		}
		for k := range 3 {
			m := m0
			if k > 0 {
				m = permute(m0, rng)
			}
			btype, _ := alternation(m)
			ring := smallestRings(m)
			r, ref := newRanker(m, btype, ring), newRanker(m, btype, ring)
			got, want := r.initial(), ref.initial()
			for step := 0; ; step++ {
				r.refine(got)
				ref.refineReference(want)
				if !slices.Equal(got, want) {
					t.Fatalf("%s (renumbering %d, step %d): refine %v, reference %v", rec.Smiles, k, step, got, want)
				}
				checked++
				cell := r.firstTiedCell(got)
				if cell == nil {
					break
				}
				c := cell[rng.IntN(len(cell))]
				r.individualise(got, c)
				ref.individualiseReference(want, c)
				if !slices.Equal(got, want) {
					t.Fatalf("%s (renumbering %d, step %d): individualise %v, reference %v", rec.Smiles, k, step, got, want)
				}
			}
		}
	}
	if checked < 1000 {
		t.Errorf("only %d refinements checked", checked)
	}
}

// refineReference is refine as it was before the class-by-class sort: one sort of every
// atom by its whole signature (rank, sorted neighbour codes).
func (r *ranker) refineReference(rank []int) {
	m := r.m
	classes := r.classes(rank)
	for {
		for i := range m.Atoms {
			s := append(r.sig[i][:0], rank[i])
			for _, e := range m.Neighbors(i) {
				s = append(s, rank[e.To]*2048+r.code[e.Bond])
			}
			slices.Sort(s[1:])
			r.sig[i] = s
		}
		for i := range r.order {
			r.order[i] = i
		}
		slices.SortFunc(r.order, func(x, y int) int { return slices.Compare(r.sig[x], r.sig[y]) })
		next := 0
		for k, i := range r.order {
			if k > 0 && slices.Compare(r.sig[r.order[k-1]], r.sig[i]) != 0 {
				next++
			}
			r.newRank[i] = next
		}
		next++
		copy(rank, r.newRank)
		if next == classes {
			return
		}
		classes = next
	}
}

// individualiseReference is individualise as it was: densified by a sort.
func (r *ranker) individualiseReference(rank []int, c int) {
	for i := range rank {
		rank[i] *= 2
	}
	rank[c]--
	// densify, keeping the order
	for i := range r.order {
		r.order[i] = i
	}
	slices.SortFunc(r.order, func(x, y int) int { return rank[x] - rank[y] })
	next := 0
	for k, i := range r.order {
		if k > 0 && rank[r.order[k-1]] != rank[i] {
			next++
		}
		r.newRank[i] = next
	}
	copy(rank, r.newRank)
}
