package fmo

import (
	"strings"
	"testing"
	"time"

	"cyclopair/fmo/internal/testsupport"
	"cyclopair/huckel/molecule"
)

// cpuTime is the process's user+system CPU time (see testsupport.CPUTime).
var cpuTime = testsupport.CPUTime

func reportPairs(b *testing.B, n int, cpu0 time.Duration) {
	b.ReportMetric(float64(n)/b.Elapsed().Seconds(), "pairs/s")
	if c := cpuTime() - cpu0; c > 0 {
		b.ReportMetric(float64(n)/c.Seconds(), "pairs/cpu-s")
	}
}

// BenchmarkQuickScore scores one diene against a rotating set of dienophiles from cached
// orbitals, the inner loop of a screen. Reported: pairs/s per core.
func BenchmarkQuickScore(b *testing.B) {
	o := testOptions(b)
	d := mustPartner(b, "C=CC(C)=C", RoleDiene, o) // isoprene: one diene unit
	var es []*Partner
	for _, s := range []string{"C=CC(=O)OC", "C=CC=O", "O=C1OC(=O)C=C1", "C=CC#N"} {
		es = append(es, mustPartner(b, s, RoleDienophile, o))
	}
	k := NewQuickKernel(o)
	b.ReportAllocs()
	n := 0
	cpu0 := cpuTime()
	var sink float64
	for b.Loop() {
		q := k.Score(d, es[n&3])
		sink += q.Best
		n++
	}
	reportPairs(b, n, cpu0)
	_ = sink
}

// BenchmarkQuickScoreMultiSite is the same kernel with many candidate units per partner
// (anthracene × p-benzoquinone).
func BenchmarkQuickScoreMultiSite(b *testing.B) {
	o := testOptions(b)
	d := mustPartner(b, "c1ccc2cc3ccccc3cc2c1", RoleDiene, o)
	e := mustPartner(b, "O=C1C=CC(=O)C=C1", RoleDienophile, o)
	k := NewQuickKernel(o)
	b.ReportAllocs()
	n := 0
	cpu0 := cpuTime()
	for b.Loop() {
		k.Score(d, e)
		n++
	}
	reportPairs(b, n, cpu0)
	b.ReportMetric(float64(len(d.Units)*len(e.Units)*2), "orientations/pair")
}

// BenchmarkAnalyze is the full analysis with products of a prepared pair.
func BenchmarkAnalyze(b *testing.B) {
	o := testOptions(b)
	d := mustPartner(b, "C=CC(C)=C", RoleDiene, o)
	e := mustPartner(b, "C=CC(=O)OC", RoleDienophile, o)
	b.ReportAllocs()
	n := 0
	cpu0 := cpuTime()
	for b.Loop() {
		if _, err := Analyze(d, e, o); err != nil {
			b.Fatal(err)
		}
		n++
	}
	reportPairs(b, n, cpu0)
}

// BenchmarkNewPartner is the per-molecule preparation (parse, perceive, solve, units,
// localisation) that QuickScore amortises: the baseline for the ratios in the report.
func BenchmarkNewPartner(b *testing.B) {
	o := testOptions(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := NewPartner("", "C=CC(=O)OC", RoleDienophile, o); err != nil {
			b.Fatal(err)
		}
	}
}

func TestQuickScoreAllocs(t *testing.T) {
	o := testOptions(t)
	d := mustPartner(t, "C=CC(C)=C", RoleDiene, o)
	e := mustPartner(t, "C=CC(=O)OC", RoleDienophile, o)
	k := NewQuickKernel(o)
	if n := testing.AllocsPerRun(100, func() { k.Score(d, e) }); n != 0 {
		t.Errorf("QuickKernel.Score allocates %.0f times per call; want 0", n)
	}
	if n := testing.AllocsPerRun(100, func() { QuickScore(d, e, o) }); n != 0 {
		t.Errorf("QuickScore allocates %.0f times per call; want 0", n)
	}
}

// BenchmarkQuickScoreAllOrbitals is BenchmarkQuickScore with Options.AllOrbitals: the
// full occupied × empty sum instead of the cached frontier projectors.
func BenchmarkQuickScoreAllOrbitals(b *testing.B) {
	o := testOptions(b)
	o.AllOrbitals = true
	d := mustPartner(b, "C=CC(C)=C", RoleDiene, o)
	var es []*Partner
	for _, s := range []string{"C=CC(=O)OC", "C=CC=O", "O=C1OC(=O)C=C1", "C=CC#N"} {
		es = append(es, mustPartner(b, s, RoleDienophile, o))
	}
	k := NewQuickKernel(o)
	b.ReportAllocs()
	n := 0
	cpu0 := cpuTime()
	for b.Loop() {
		k.Score(d, es[n&3])
		n++
	}
	reportPairs(b, n, cpu0)
}

// BenchmarkPolyeneScaling times the whole pair analysis a 'cyclopair pair' run does (analysis,
// role check, side channels) for a linear polyene of 50 and of 100 π centres against acrolein,
// and reports the ratio of the two CPU times: 8 for cubic growth in centres, 16 for quartic
// (issue 14: before canonical product keys were made lazy the ratio was about 10 and the
// 100-centre pair took 10 s). Measured figures are in DEVELOPERS.md.
func BenchmarkPolyeneScaling(b *testing.B) {
	o := testOptions(b)
	e := mustPartner(b, "C=CC=O", RoleDienophile, o)
	run := func(centres int) time.Duration {
		t0 := cpuTime()
		d := mustPartner(b, strings.Repeat("C=C", centres/2), RoleDiene, o)
		p, err := Analyze(d, e, o)
		if err != nil {
			b.Fatal(err)
		}
		RoleCheck(d, e, p, o)
		SideChannels(d, e, p, o)
		return cpuTime() - t0
	}
	var t50, t100 time.Duration
	for b.Loop() {
		t50 += run(50)
		t100 += run(100)
	}
	if t50 > 0 {
		b.ReportMetric(t100.Seconds()/t50.Seconds(), "cpu100/cpu50")
	}
	b.ReportMetric(t100.Seconds()/float64(b.N), "cpu-s/pair100")
}

// BenchmarkProductKeys is the duplicate check of Analyze over every pair of candidate
// adducts of synthetic partners (several units each): productKeys.same (invariant, then an
// isomorphism, then canonical SMILES) against the same-run baseline of comparing canonical
// SMILES after the invariant (the check before the isomorphism shortcut). Reported:
// "x-vs-canonical", the baseline's CPU time over same's; both give the same answers
// (TestProductKeysAgreeWithCanonical).
func BenchmarkProductKeys(b *testing.B) {
	o := testOptions(b)
	lib := testsupport.SyntheticLibrary(6, 6, 31)
	type set struct {
		d, e *Partner
		ids  [][3]int
	}
	var sets []set
	for _, ds := range lib.Dienes {
		d := mustPartner(b, ds.SMILES, RoleDiene, o)
		for _, es := range lib.Dienophiles {
			e := mustPartner(b, es.SMILES, RoleDienophile, o)
			st := set{d: d, e: e}
			for di := range d.Units {
				for ei := range e.Units {
					for or := range 2 {
						st.ids = append(st.ids, [3]int{di, ei, or})
					}
				}
			}
			sets = append(sets, st)
		}
	}
	run := func(shortcut bool) (time.Duration, int) {
		cpu0 := cpuTime()
		equal := 0
		for _, st := range sets {
			build := func(i int) *molecule.Molecule {
				m, _ := buildProduct(st.d, st.e, st.ids[i][0], st.ids[i][1], st.ids[i][2])
				return m
			}
			colour := func(i int) (uint64, []uint64) {
				return adductColours(st.d, st.e, st.ids[i][0], st.ids[i][1], st.ids[i][2])
			}
			k := newProductKeys(len(st.ids), build, colour)
			for i := range st.ids {
				for j := range i {
					var same bool
					if shortcut {
						same = k.same(i, j)
					} else {
						same = k.invariant(i) == k.invariant(j) && k.canonical(i) == k.canonical(j)
					}
					if same {
						equal++
					}
				}
			}
		}
		return cpuTime() - cpu0, equal
	}
	var tShort, tCanon time.Duration
	b.ReportAllocs()
	for b.Loop() {
		ts, n1 := run(true)
		tc, n2 := run(false)
		if n1 != n2 {
			b.Fatalf("%d equal pairs by same, %d by canonical SMILES", n1, n2)
		}
		tShort += ts
		tCanon += tc
	}
	if tShort > 0 {
		b.ReportMetric(float64(tCanon)/float64(tShort), "x-vs-canonical")
	}
}
