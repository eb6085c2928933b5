package huckel_test

import (
	"fmt"
	"testing"
	"time"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// Typical cycloaddition substrates of about 10, 20 and 30 π centres (default set, alkyl
// model on).
var benchMolecules = []string{
	"C=CC(=O)c1ccccc1",                                // phenyl vinyl ketone, 10 centres
	"COc1ccc(/C=C/C(=O)c2ccc(N(C)C)cc2)cc1",           // push–pull chalcone, ~20
	"COC(=O)/C=C/c1ccc(-c2ccc(-c3ccc(C=C)cc3)cc2)cc1", // oligophenylene acrylate, ~30
}

// BenchmarkPipeline measures SMILES → Parse → Perceive → Solver.Solve (reused workspace
// and Orbitals) in molecules/s and allocations per molecule. As a same-run baseline every
// iteration also runs the bare lapack64.Syev of the same Hückel matrix; both are timed
// separately and interleaved, so the ratio x_syev (pipeline time / Syev time) is robust to
// load changes on a shared machine. ns/op covers both halves; molecules/s only the
// pipeline.
func BenchmarkPipeline(b *testing.B) {
	p := defaultParams(b)
	for _, smi := range benchMolecules {
		ps0 := perceive(b, smi, p)
		n := len(ps0.Centres)
		b.Run(fmt.Sprintf("centres=%d", n), func(b *testing.B) {
			src := ps0.Matrix()
			a := blas64.Symmetric{N: n, Stride: n, Uplo: blas.Upper, Data: make([]float64, n*n)}
			w := make([]float64, n)
			q := []float64{0}
			lapack64.Syev(lapack.EVCompute, a, w, q, -1)
			work := make([]float64, int(q[0]))
			var s huckel.Solver
			var o huckel.Orbitals
			var tPipe, tSyev time.Duration
			b.ReportAllocs()
			for b.Loop() {
				t0 := time.Now()
				m, err := smiles.Parse(smi)
				if err != nil {
					b.Fatal(err)
				}
				ps, err := huckel.Perceive(m, p)
				if err != nil {
					b.Fatal(err)
				}
				if err := s.Solve(ps, &o); err != nil {
					b.Fatal(err)
				}
				t1 := time.Now()
				copy(a.Data, src)
				lapack64.Syev(lapack.EVCompute, a, w, work, len(work))
				tPipe += t1.Sub(t0)
				tSyev += time.Since(t1)
			}
			b.ReportMetric(float64(b.N)/tPipe.Seconds(), "molecules/s")
			b.ReportMetric(tPipe.Seconds()/tSyev.Seconds(), "x_syev")
		})
	}
}

// BenchmarkStages splits the pipeline: parse, perceive, solve (Solver) and solve (Solve,
// mat.EigenSym), each on the same molecule, with the bare Syev baseline.
func BenchmarkStages(b *testing.B) {
	p := defaultParams(b)
	for _, smi := range benchMolecules {
		ps := perceive(b, smi, p)
		n := len(ps.Centres)
		b.Run(fmt.Sprintf("centres=%d/syev", n), func(b *testing.B) { b.ReportAllocs(); syevLoop(b, ps) })
		b.Run(fmt.Sprintf("centres=%d/parse", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := smiles.Parse(smi); err != nil {
					b.Fatal(err)
				}
			}
		})
		m, _ := smiles.Parse(smi)
		b.Run(fmt.Sprintf("centres=%d/perceive", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := huckel.Perceive(m, p); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(fmt.Sprintf("centres=%d/solver", n), func(b *testing.B) {
			var s huckel.Solver
			var o huckel.Orbitals
			b.ReportAllocs()
			for b.Loop() {
				if err := s.Solve(ps, &o); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(fmt.Sprintf("centres=%d/solve-eigensym", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := huckel.Solve(ps); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// syevLoop diagonalises the Hückel matrix of ps with caller-owned buffers (the floor any
// dense solve pays).
func syevLoop(b *testing.B, ps *huckel.PiSystem) {
	src := ps.Matrix()
	n := len(ps.Centres)
	a := blas64.Symmetric{N: n, Stride: n, Uplo: blas.Upper, Data: make([]float64, n*n)}
	w := make([]float64, n)
	q := []float64{0}
	lapack64.Syev(lapack.EVCompute, a, w, q, -1)
	work := make([]float64, int(q[0]))
	for b.Loop() {
		copy(a.Data, src)
		if !lapack64.Syev(lapack.EVCompute, a, w, work, len(work)) {
			b.Fatal("syev failed")
		}
	}
}
