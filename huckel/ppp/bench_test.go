package ppp_test

import (
	"fmt"
	"testing"
	"time"

	"cyclopair/huckel"
	"cyclopair/huckel/ppp"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// The substrates of huckel's BenchmarkPipeline (about 10, 20 and 30 π centres with the
// default Hückel set, alkyl model on).
var benchMolecules = []string{
	"C=CC(=O)c1ccccc1",                                // phenyl vinyl ketone, 10 centres
	"COc1ccc(/C=C/C(=O)c2ccc(N(C)C)cc2)cc1",           // push–pull chalcone, ~20
	"COC(=O)/C=C/c1ccc(-c2ccc(-c3ccc(C=C)cc3)cc2)cc1", // oligophenylene acrylate, ~30
}

// BenchmarkPipeline measures SMILES → Parse → Perceive → PPP-SCF (2D layout, Hückel start,
// DIIS, reused Solver and Orbitals) in molecules/s, and as the same-run baseline the Hückel
// pipeline (Parse → Perceive → huckel.Solver) of the same molecule, interleaved in the
// same loop so that machine load affects both alike. x_huckel is PPP time / Hückel time.
// Run: go test ./huckel/ppp -run XXX -bench Pipeline -cpu 1
func BenchmarkPipeline(b *testing.B) {
	hp, err := presets.Params(presets.DefaultParams)
	if err != nil {
		b.Fatal(err)
	}
	pp, err := presets.PPPParams(presets.DefaultPPP)
	if err != nil {
		b.Fatal(err)
	}
	for _, smi := range benchMolecules {
		m0, _ := smiles.Parse(smi)
		ps0, err := huckel.Perceive(m0, hp)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("centres=%d", len(ps0.Centres)), func(b *testing.B) {
			s := ppp.NewSolver(pp)
			var hs huckel.Solver
			var o, h huckel.Orbitals
			var tPPP, tHuckel time.Duration
			iters := 0
			b.ReportAllocs()
			for b.Loop() {
				t0 := time.Now()
				m, err := smiles.Parse(smi)
				if err != nil {
					b.Fatal(err)
				}
				ps, err := huckel.Perceive(m, hp)
				if err != nil {
					b.Fatal(err)
				}
				if err := s.Solve(ps, &o); err != nil {
					b.Fatal(err)
				}
				t1 := time.Now()
				m, err = smiles.Parse(smi)
				if err != nil {
					b.Fatal(err)
				}
				ps, err = huckel.Perceive(m, hp)
				if err != nil {
					b.Fatal(err)
				}
				if err := hs.Solve(ps, &h); err != nil {
					b.Fatal(err)
				}
				tPPP += t1.Sub(t0)
				tHuckel += time.Since(t1)
				iters += s.Stats().Iterations
			}
			b.ReportMetric(float64(b.N)/tPPP.Seconds(), "ppp_molecules/s")
			b.ReportMetric(float64(b.N)/tHuckel.Seconds(), "huckel_molecules/s")
			b.ReportMetric(tPPP.Seconds()/tHuckel.Seconds(), "x_huckel")
			b.ReportMetric(float64(iters)/float64(b.N), "scf_cycles")
		})
	}
}
