package ppp_test

import (
	"fmt"
	"runtime"
	"testing"
	"time"

	"cyclopair/huckel"
	"cyclopair/huckel/ppp"
	"cyclopair/huckel/smiles"
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
	eachBenchMolecule(b, func(b *testing.B, smi string, _ *huckel.PiSystem, hp *huckel.Params, pp *ppp.Params) {
		s := ppp.NewSolver(pp)
		var hs huckel.Solver
		var o, h huckel.Orbitals
		var tPPP, tHuckel time.Duration
		iters := 0
		b.ReportAllocs()
		for b.Loop() {
			t0 := time.Now()
			runPipeline(b, smi, hp, s, &o)
			t1 := time.Now()
			runPipeline(b, smi, hp, &hs, &h)
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

// BenchmarkPipelineCPU is BenchmarkPipeline timed by the CPU clock of the benchmark's
// thread (Linux; elsewhere the wall clock): on a machine shared with other jobs the wall
// clock charges either pipeline with the time the thread waited for a core, so its
// molecules/s and ratio swing with the load; thread CPU time does not (GC work done by
// other threads is not charged). Each iteration runs `cpuBatch` molecules through the PPP
// pipeline, then `cpuBatch` through the Hückel pipeline, reading the clock three times, so
// the clock reads cost under 1 % (allocs/op and B/op are per cpuBatch pairs).
// Run: go test ./huckel/ppp -run XXX -bench PipelineCPU -cpu 1
func BenchmarkPipelineCPU(b *testing.B) {
	const cpuBatch = 8
	eachBenchMolecule(b, func(b *testing.B, smi string, _ *huckel.PiSystem, hp *huckel.Params, pp *ppp.Params) {
		runtime.LockOSThread() // the thread clock must stay with this goroutine
		defer runtime.UnlockOSThread()
		s := ppp.NewSolver(pp)
		var hs huckel.Solver
		var o, h huckel.Orbitals
		var tPPP, tHuckel time.Duration
		b.ReportAllocs()
		for b.Loop() {
			t0 := threadCPU()
			for range cpuBatch {
				runPipeline(b, smi, hp, s, &o)
			}
			t1 := threadCPU()
			for range cpuBatch {
				runPipeline(b, smi, hp, &hs, &h)
			}
			t2 := threadCPU()
			tPPP += t1 - t0
			tHuckel += t2 - t1
		}
		if !threadCPUClock {
			b.Log("no thread CPU clock on this system: wall clock")
		}
		n := float64(b.N * cpuBatch)
		b.ReportMetric(n/tPPP.Seconds(), "ppp_cpu_molecules/s")
		b.ReportMetric(n/tHuckel.Seconds(), "huckel_cpu_molecules/s")
		b.ReportMetric(tPPP.Seconds()/tHuckel.Seconds(), "x_huckel_cpu")
	})
}

// BenchmarkSolve measures Solver.Solve alone (2D layout and SCF, reused Solver and
// Orbitals) on the perceived π systems of benchMolecules; cpu_ns/solve is the thread CPU
// time per solve (see BenchmarkPipelineCPU).
// Run: go test ./huckel/ppp -run XXX -bench Solve -cpu 1
func BenchmarkSolve(b *testing.B) {
	eachBenchMolecule(b, func(b *testing.B, _ string, ps *huckel.PiSystem, _ *huckel.Params, pp *ppp.Params) {
		runtime.LockOSThread()
		defer runtime.UnlockOSThread()
		s := ppp.NewSolver(pp)
		var o huckel.Orbitals
		b.ReportAllocs()
		t0 := threadCPU()
		for b.Loop() {
			if err := s.Solve(ps, &o); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(threadCPU()-t0)/float64(b.N), "cpu_ns/solve")
	})
}

// eachBenchMolecule runs f as a sub-benchmark "centres=N" for every benchMolecules entry,
// with the default Hückel and PPP parameter sets and the molecule's perceived π system.
func eachBenchMolecule(b *testing.B, f func(b *testing.B, smi string, ps *huckel.PiSystem, hp *huckel.Params, pp *ppp.Params)) {
	hp, pp := params(b)
	for _, smi := range benchMolecules {
		m, err := smiles.Parse(smi)
		if err != nil {
			b.Fatal(err)
		}
		ps, err := huckel.Perceive(m, hp)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("centres=%d", len(ps.Centres)), func(b *testing.B) { f(b, smi, ps, hp, pp) })
	}
}

// runPipeline takes smi through SMILES parsing, perception with hp and method's solve into
// into: one molecule of the pipeline benchmarks.
func runPipeline(b *testing.B, smi string, hp *huckel.Params, method huckel.Method, into *huckel.Orbitals) {
	m, err := smiles.Parse(smi)
	if err != nil {
		b.Fatal(err)
	}
	ps, err := huckel.Perceive(m, hp)
	if err != nil {
		b.Fatal(err)
	}
	if err := method.Solve(ps, into); err != nil {
		b.Fatal(err)
	}
}
