package screen

import (
	"bytes"
	"context"
	"testing"

	"cyclopair/fmo"
	"cyclopair/fmo/internal/testsupport"
	"cyclopair/fmo/substrates"
)

// A compact preparation (PrepareOptions.Compact) gives byte-identical screens to the full
// one, for every rank key, filters, all three activations, duplicate rows under other names,
// 1 and 2 preparation workers, ranked and unranked; its partners hold no orbitals, and
// Diene/Dienophile/Variant give the full partners back.
func TestCompactPrepareIdentical(t *testing.T) {
	lib := testsupport.SyntheticLibrary(40, 40, 11)
	lib.Activations = []string{fmo.ActivateNone, fmo.ActivateLewis, fmo.ActivateIminium}
	// duplicate rows (same SMILES, another name) on both sides
	for _, side := range []*[]substrates.Substrate{&lib.Dienes, &lib.Dienophiles} {
		for _, i := range []int{3, 17} {
			dup := (*side)[i]
			dup.Name += "-again"
			*side = append(*side, dup)
		}
	}
	opts := screenOpts(t)
	full, err := Prepare(context.Background(), lib, opts, PrepareOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, workers := range []int{1, 2} {
		small, err := Prepare(context.Background(), lib, opts, PrepareOptions{Workers: workers, Compact: true})
		if err != nil {
			t.Fatal(err)
		}
		if len(small.Failures) != len(full.Failures) || small.NotApplicable != full.NotApplicable ||
			len(small.Dienes) != len(full.Dienes) || len(small.Dienophiles) != len(full.Dienophiles) {
			t.Fatalf("compact preparation differs: %d/%d failures, %d/%d not applicable", len(small.Failures), len(full.Failures),
				small.NotApplicable, full.NotApplicable)
		}
		for d := range small.Dienes {
			if !small.Dienes[d].IsCompact() {
				t.Fatalf("diene %d is not compact", d)
			}
			fp, err := small.Diene(d)
			if err != nil || fp.IsCompact() || fp.Name != full.Dienes[d].Name || fp.Orb.PiEnergy != full.Dienes[d].Orb.PiEnergy {
				t.Fatalf("diene %d rebuilt: %v", d, err)
			}
		}
		for e := range small.Variants {
			for a := range small.Variants[e] {
				if (small.Variants[e][a] == nil) != (full.Variants[e][a] == nil) {
					t.Fatalf("variant %d/%d exists in one preparation only", e, a)
				}
			}
		}
		for _, so := range []ScreenOptions{
			{RankBy: RankRate, Top: 15},
			{RankBy: RankNormalGap, Top: 10},
			{RankBy: RankGap, Top: 10, Filter: substrates.Filter{Demand: "normal"}},
			{RankBy: RankStabilization, Top: 12, Exhaustive: true},
			{RankBy: RankRegioMargin, Top: 8, Filter: substrates.Filter{MaxGap: 1.5}},
			{RankBy: RankScore, Top: 20},
			{RankBy: RankNone, Top: 40},
		} {
			so.Workers = 2
			want, _ := screenBytes(t, full, so)
			got, _ := screenBytes(t, small, so)
			if !bytes.Equal(want, got) || len(want) == 0 {
				t.Errorf("%+v (preparation workers %d): compact screen differs from the full one (or is empty)", so, workers)
			}
		}
	}
}
