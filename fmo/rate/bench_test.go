package rate

import (
	"testing"

	"cyclopair/fmo"
)

// BenchmarkQuickRate measures QuickScore alone and QuickScore plus the rate key
// (Model.Quick) on the same pairs, interleaved in one run; report the ratio
// (issue 10: the rate term must add under 20 %):
//
//	go test ./fmo/rate -run XXX -bench QuickRate -cpu 1
func BenchmarkQuickRate(b *testing.B) {
	opts, err := fmo.DefaultOptions()
	if err != nil {
		b.Fatal(err)
	}
	m, err := Default()
	if err != nil {
		b.Fatal(err)
	}
	var ds, es []*fmo.Partner
	for _, s := range []string{"C=CC(C)=C", "C1=CCC=C1", "C/C=C/C=C", "CO/C=C/C=C"} {
		p, err := fmo.NewPartner(s, s, fmo.RoleDiene, opts)
		if err != nil {
			b.Fatal(err)
		}
		ds = append(ds, p)
	}
	for _, s := range []string{"C=CC=O", "C=CC(=O)OC", "O=C1OC(=O)C=C1", "C=CC#N"} {
		p, err := fmo.NewPartner(s, s, fmo.RoleDienophile, opts)
		if err != nil {
			b.Fatal(err)
		}
		es = append(es, p)
	}
	conf := make([][]Conformation, len(ds))
	for i, d := range ds {
		conf[i] = PartnerConformations(d)
	}
	k := fmo.NewQuickKernel(opts)
	sink := 0.0
	b.Run("quickscore", func(b *testing.B) {
		for i := range b.N {
			q := k.Score(ds[i%4], es[(i/4)%4])
			sink += q.Best
		}
	})
	b.Run("quickscore+rate", func(b *testing.B) {
		for i := range b.N {
			d := i % 4
			q := k.Score(ds[d], es[(i/4)%4])
			sink += m.Quick(&q, &conf[d][q.DieneUnit])
		}
	})
	_ = sink
}
