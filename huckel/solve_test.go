package huckel_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"cyclopair/huckel"

	"gonum.org/v1/gonum/floats/scalar"
)

// Tolerances, one per quantity.
const (
	tolX     = 1e-10 // eigenvalues x (units of β) against closed forms
	tolCoef  = 1e-9  // eigenvector coefficients
	tolOrtho = 1e-10 // orthonormality, A·v = λ·v residuals, trace
	tolQ     = 1e-9  // π charges
)

// carbonSystem builds an all-carbon π system (h = 0, k = 1, one electron per centre) on
// the given edges.
func carbonSystem(n int, edges [][2]int) *huckel.PiSystem {
	cs := make([]huckel.Centre, n)
	for i := range cs {
		cs[i] = huckel.Centre{Atom: i, Element: "C", Type: huckel.CSp2, Electrons: 1}
	}
	bs := make([]huckel.PiBond, len(edges))
	for i, e := range edges {
		bs[i] = huckel.PiBond{I: e[0], J: e[1], K: 1, Bond: i}
	}
	return huckel.NewPiSystem(cs, bs)
}

func chainEdges(n int) [][2]int {
	var e [][2]int
	for i := 0; i+1 < n; i++ {
		e = append(e, [2]int{i, i + 1})
	}
	return e
}

func ringEdges(n int) [][2]int { return append(chainEdges(n), [2]int{n - 1, 0}) }

func mustSolve(t *testing.T, ps *huckel.PiSystem) *huckel.Orbitals {
	t.Helper()
	o, err := huckel.Solve(ps)
	if err != nil {
		t.Fatal(err)
	}
	return o
}

// Linear polyene C_N: x_j = 2cos(jπ/(N+1)), c_ij = √(2/(N+1))·sin(ijπ/(N+1)), j = 1…N
// (closed form; e.g. Streitwieser 1961, ch. 2; Coulson, Proc. R. Soc. A 1939).
func TestLinearPolyenesClosedForm(t *testing.T) {
	for n := 2; n <= 20; n++ {
		o := mustSolve(t, carbonSystem(n, chainEdges(n)))
		if len(o.Levels) != n {
			t.Fatalf("N=%d: %d levels", n, len(o.Levels))
		}
		for j := 1; j <= n; j++ {
			l := o.Levels[j-1]
			want := 2 * math.Cos(float64(j)*math.Pi/float64(n+1))
			if !scalar.EqualWithinAbs(l.X, want, tolX) {
				t.Errorf("N=%d j=%d: x = %.12f, want %.12f", n, j, l.X, want)
			}
			if math.Abs(want) > 1e-9 && l.Degenerate != 1 { // x = 0 is single for odd N
				t.Errorf("N=%d j=%d: degenerate %d, want 1", n, j, l.Degenerate)
			}
			// Compare up to one overall sign, then check our sign convention.
			sign := 0.0
			for i := 1; i <= n; i++ {
				ref := math.Sqrt(2/float64(n+1)) * math.Sin(float64(i*j)*math.Pi/float64(n+1))
				if sign == 0 && math.Abs(ref) > 1e-3 {
					sign = math.Copysign(1, l.Coeffs[i-1]*ref)
				}
				if !scalar.EqualWithinAbs(l.Coeffs[i-1], sign*ref, tolCoef) {
					t.Errorf("N=%d j=%d i=%d: c = %.10f, want ±%.10f", n, j, i, l.Coeffs[i-1], ref)
				}
			}
			checkSignConvention(t, fmt.Sprintf("N=%d j=%d", n, j), l.Coeffs)
		}
	}
}

func checkSignConvention(t *testing.T, name string, c []float64) {
	t.Helper()
	best, bestAbs := -1, -1.0
	for i, v := range c {
		if math.Abs(v) > bestAbs+huckel.SignTieTol {
			best, bestAbs = i, math.Abs(v)
		}
	}
	if c[best] < 0 {
		t.Errorf("%s: largest coefficient c[%d] = %g is negative (sign convention)", name, best, c[best])
	}
}

// [N]annulene: x_j = 2cos(2πj/N), j = 0…N−1; j and N−j form degenerate pairs
// (Hückel 1931; Frost & Musulin, J. Chem. Phys. 1953, 21, 572).
func TestAnnulenesClosedForm(t *testing.T) {
	for n := 3; n <= 20; n++ {
		o := mustSolve(t, carbonSystem(n, ringEdges(n)))
		var want []float64
		wantDeg := map[int]int{}
		for j := 0; j < n; j++ {
			want = append(want, 2*math.Cos(2*math.Pi*float64(j)/float64(n)))
		}
		slices.Sort(want)
		slices.Reverse(want)
		for i, w := range want {
			d := 2
			if scalar.EqualWithinAbs(w, 2, 1e-12) || scalar.EqualWithinAbs(w, -2, 1e-12) {
				d = 1
			}
			wantDeg[i] = d
		}
		for i, l := range o.Levels {
			if !scalar.EqualWithinAbs(l.X, want[i], tolX) {
				t.Errorf("N=%d level %d: x = %.12f, want %.12f", n, i, l.X, want[i])
			}
			if l.Degenerate != wantDeg[i] {
				t.Errorf("N=%d level %d (x=%.3f): degenerate %d, want %d", n, i, l.X, l.Degenerate, wantDeg[i])
			}
			if len(o.DegenerateSet(i)) != l.Degenerate {
				t.Errorf("N=%d level %d: DegenerateSet has %d members, Degenerate says %d", n, i, len(o.DegenerateSet(i)), l.Degenerate)
			}
		}
		checkInvariants(t, fmt.Sprintf("[%d]annulene", n), carbonSystem(n, ringEdges(n)), o)
	}
}

// checkInvariants: A·v = x·v for every level, orthonormal levels within each fragment,
// Σx = trace(A), π-electron count and charge sum.
func checkInvariants(t *testing.T, name string, ps *huckel.PiSystem, o *huckel.Orbitals) {
	t.Helper()
	n := len(ps.Centres)
	a := ps.Matrix()
	if o.H != nil { // ω-technique changes the diagonal
		for i := range n {
			a[i*n+i] = o.H[i]
		}
	}
	sum, trace := 0.0, 0.0
	for i := range n {
		trace += a[i*n+i]
	}
	for li, l := range o.Levels {
		sum += l.X
		for i := range n {
			av := 0.0
			for j := range n {
				av += a[i*n+j] * l.Coeffs[j]
			}
			if math.Abs(av-l.X*l.Coeffs[i]) > tolOrtho*float64(n) {
				t.Errorf("%s level %d: (A·v − x·v)[%d] = %g", name, li, i, av-l.X*l.Coeffs[i])
			}
		}
		for lj := li; lj < len(o.Levels); lj++ {
			m := o.Levels[lj]
			dot := 0.0
			for i := range n {
				dot += l.Coeffs[i] * m.Coeffs[i]
			}
			want := 0.0
			if li == lj {
				want = 1
			}
			if math.Abs(dot-want) > tolOrtho*float64(n) {
				t.Errorf("%s levels %d·%d = %g, want %g", name, li, lj, dot, want)
			}
		}
	}
	if math.Abs(sum-trace) > tolOrtho*float64(n) {
		t.Errorf("%s: Σx = %g, trace = %g", name, sum, trace)
	}
	occ, q, formal := 0.0, 0.0, 0
	for _, l := range o.Levels {
		occ += l.Occupancy
	}
	for i, c := range ps.Centres {
		q += o.Charges[i]
		formal += c.FormalCharge
	}
	if math.Abs(occ-float64(ps.Electrons())) > 1e-12 || o.Electrons != ps.Electrons() {
		t.Errorf("%s: Σ occupancy = %g, electrons %d/%d", name, occ, o.Electrons, ps.Electrons())
	}
	if math.Abs(q-float64(formal)) > tolQ*float64(n) {
		t.Errorf("%s: Σ charges = %g, want Σ formal charges %d", name, q, formal)
	}
}

// Coulson–Rushbrooke pairing theorem (Coulson & Rushbrooke, Proc. Camb. Phil. Soc. 1940,
// 36, 193): the spectrum of an alternant (bipartite) hydrocarbon is symmetric about x = 0,
// and at half filling every π population is exactly 1 (charges zero). Property test over
// seeded random connected bipartite graphs.
func TestPairingTheoremRandomAlternants(t *testing.T) {
	rnd := rand.New(rand.NewPCG(1, 2))
	for trial := range 300 {
		n := 2 + rnd.IntN(24)
		// colour each vertex, then add a random spanning tree plus extra edges, all between
		// colours.
		colour := make([]int, n)
		for i := range colour {
			colour[i] = rnd.IntN(2)
		}
		colour[0], colour[1] = 0, 1
		var edges [][2]int
		has := map[[2]int]bool{}
		add := func(a, b int) {
			if a > b {
				a, b = b, a
			}
			if a != b && colour[a] != colour[b] && !has[[2]int{a, b}] {
				has[[2]int{a, b}] = true
				edges = append(edges, [2]int{a, b})
			}
		}
		for i := 1; i < n; i++ { // connect i to an earlier vertex of the other colour
			var opp []int
			for j := 0; j < i; j++ {
				if colour[j] != colour[i] {
					opp = append(opp, j)
				}
			}
			if len(opp) == 0 {
				colour[i] = 1 - colour[i]
				for j := 0; j < i; j++ {
					if colour[j] != colour[i] {
						opp = append(opp, j)
					}
				}
			}
			add(i, opp[rnd.IntN(len(opp))])
		}
		for range rnd.IntN(n) {
			add(rnd.IntN(n), rnd.IntN(n))
		}
		ps := carbonSystem(n, edges)
		o := mustSolve(t, ps)
		name := fmt.Sprintf("trial %d (n=%d, %d bonds)", trial, n, len(edges))
		for i := range o.Levels {
			x, y := o.Levels[i].X, o.Levels[len(o.Levels)-1-i].X
			if math.Abs(x+y) > 1e-9 {
				t.Errorf("%s: x[%d] = %g but x[%d] = %g (pairing)", name, i, x, len(o.Levels)-1-i, y)
			}
		}
		for i, q := range o.Charges {
			if math.Abs(q) > 1e-9 {
				t.Errorf("%s: charge[%d] = %g at half filling", name, i, q)
			}
		}
		checkInvariants(t, name, ps, o)
	}
}

// Energies do not depend on the atom numbering: permuting the centres of random
// heteroatom-like systems leaves the spectrum unchanged.
func TestRelabellingInvariance(t *testing.T) {
	rnd := rand.New(rand.NewPCG(7, 7))
	for trial := range 100 {
		n := 2 + rnd.IntN(15)
		cs := make([]huckel.Centre, n)
		for i := range cs {
			cs[i] = huckel.Centre{Atom: i, Element: "C", H: float64(rnd.IntN(5)) * 0.5, Electrons: 1 + rnd.IntN(2)}
		}
		var bs []huckel.PiBond
		for i := 1; i < n; i++ {
			bs = append(bs, huckel.PiBond{I: rnd.IntN(i), J: i, K: 0.5 + rnd.Float64()})
		}
		perm := rnd.Perm(n)
		cs2 := make([]huckel.Centre, n)
		for i, c := range cs {
			c.Atom = perm[i]
			cs2[perm[i]] = c
		}
		bs2 := make([]huckel.PiBond, len(bs))
		for i, b := range bs {
			bs2[i] = huckel.PiBond{I: perm[b.I], J: perm[b.J], K: b.K}
		}
		o1 := mustSolve(t, huckel.NewPiSystem(cs, bs))
		o2 := mustSolve(t, huckel.NewPiSystem(cs2, bs2))
		for i := range o1.Levels {
			if !scalar.EqualWithinAbs(o1.Levels[i].X, o2.Levels[i].X, 1e-9) ||
				!scalar.EqualWithinAbs(o1.Levels[i].Occupancy, o2.Levels[i].Occupancy, 1e-12) {
				t.Errorf("trial %d level %d: %g (%g e) vs relabelled %g (%g e)", trial, i,
					o1.Levels[i].X, o1.Levels[i].Occupancy, o2.Levels[i].X, o2.Levels[i].Occupancy)
			}
		}
		if !scalar.EqualWithinAbs(o1.PiEnergy, o2.PiEnergy, 1e-9) {
			t.Errorf("trial %d: Eπ %g vs %g", trial, o1.PiEnergy, o2.PiEnergy)
		}
		for i := range n {
			if !scalar.EqualWithinAbs(o1.Charges[i], o2.Charges[perm[i]], 1e-8) {
				t.Errorf("trial %d centre %d: charge %g vs relabelled %g", trial, i, o1.Charges[i], o2.Charges[perm[i]])
			}
		}
	}
}

// The reusable Solver (lapack64.Syev) and Solve (mat.EigenSym) agree, and the Solver's
// results do not depend on what it solved before.
func TestSolverMatchesSolve(t *testing.T) {
	systems := []*huckel.PiSystem{
		carbonSystem(6, ringEdges(6)), carbonSystem(4, chainEdges(4)), carbonSystem(9, chainEdges(9)),
		carbonSystem(5, ringEdges(5)), carbonSystem(2, chainEdges(2)),
	}
	var s huckel.Solver
	var into huckel.Orbitals
	for round := range 2 {
		for k, ps := range systems {
			want := mustSolve(t, ps)
			if err := s.Solve(ps, &into); err != nil {
				t.Fatal(err)
			}
			for i := range want.Levels {
				if !scalar.EqualWithinAbs(want.Levels[i].X, into.Levels[i].X, 1e-12) {
					t.Errorf("round %d system %d level %d: %g vs %g", round, k, i, want.Levels[i].X, into.Levels[i].X)
				}
				for c := range want.Levels[i].Coeffs {
					if !scalar.EqualWithinAbs(want.Levels[i].Coeffs[c], into.Levels[i].Coeffs[c], 1e-9) {
						t.Errorf("round %d system %d level %d c%d: %g vs %g", round, k, i, c,
							want.Levels[i].Coeffs[c], into.Levels[i].Coeffs[c])
					}
				}
			}
			if into.HOMO != want.HOMO || into.LUMO != want.LUMO || !scalar.EqualWithinAbs(into.PiEnergy, want.PiEnergy, 1e-10) {
				t.Errorf("round %d system %d: HOMO/LUMO/E %d/%d/%g vs %d/%d/%g", round, k,
					into.HOMO, into.LUMO, into.PiEnergy, want.HOMO, want.LUMO, want.PiEnergy)
			}
		}
	}
}

func TestSolverZeroAllocs(t *testing.T) {
	ps := carbonSystem(10, ringEdges(10))
	var s huckel.Solver
	var into huckel.Orbitals
	if err := s.Solve(ps, &into); err != nil {
		t.Fatal(err)
	}
	allocs := testing.AllocsPerRun(100, func() {
		if err := s.Solve(ps, &into); err != nil {
			t.Fatal(err)
		}
	})
	if allocs != 0 {
		t.Errorf("Solver.Solve allocates %v times per call after warm-up, want 0", allocs)
	}
}

// Two identical isolated ethylenes: their levels stay in separate fragments, never form
// one degenerate set, and each fragment is filled with its own electrons.
func TestSeparateFragmentsDoNotMix(t *testing.T) {
	ps := carbonSystem(4, [][2]int{{0, 1}, {2, 3}})
	if len(ps.Fragments) != 2 {
		t.Fatalf("%d fragments, want 2", len(ps.Fragments))
	}
	o := mustSolve(t, ps)
	for i, l := range o.Levels {
		if l.Degenerate != 1 {
			t.Errorf("level %d: degenerate %d across fragments", i, l.Degenerate)
		}
		nz := 0
		for _, c := range l.Coeffs {
			if c != 0 {
				nz++
			}
		}
		if nz != 2 {
			t.Errorf("level %d spreads over %d centres, want 2 (one ethylene)", i, nz)
		}
		if len(o.DegenerateSet(i)) != 1 {
			t.Errorf("level %d: DegenerateSet %v", i, o.DegenerateSet(i))
		}
	}
	if o.Levels[0].Fragment != 0 || o.Levels[1].Fragment != 1 {
		t.Errorf("equal levels not ordered by fragment: %d, %d", o.Levels[0].Fragment, o.Levels[1].Fragment)
	}
	checkInvariants(t, "2 ethylenes", ps, o)
}

// Open shells: cyclobutadiene (4 e) fills its degenerate x = 0 pair with one electron
// each (equal fractional occupancy rule) and is flagged; the allyl radical has a SOMO.
func TestOpenShells(t *testing.T) {
	o := mustSolve(t, carbonSystem(4, ringEdges(4)))
	if !o.Partial || o.Levels[1].Occupancy != 1 || o.Levels[2].Occupancy != 1 || o.Levels[1].Degenerate != 2 {
		t.Errorf("cyclobutadiene: partial=%v occupancies %g %g degenerate %d",
			o.Partial, o.Levels[1].Occupancy, o.Levels[2].Occupancy, o.Levels[1].Degenerate)
	}
	if len(o.Warnings) != 1 || !strings.Contains(o.Warnings[0], "fractional occupancy") {
		t.Errorf("cyclobutadiene warnings %q", o.Warnings)
	}
	// HOMO is the last member (in Levels order) of the highest occupied set.
	if o.HOMO != 2 || o.SOMO != 2 || o.LUMO != 3 {
		t.Errorf("cyclobutadiene: HOMO %d SOMO %d LUMO %d, want 2 2 3", o.HOMO, o.SOMO, o.LUMO)
	}
	o = mustSolve(t, carbonSystem(3, chainEdges(3)))
	if o.SOMO != 1 || o.HOMO != 1 || o.LUMO != 2 || o.Levels[1].Occupancy != 1 || !o.Partial {
		t.Errorf("allyl radical: HOMO %d SOMO %d LUMO %d occ %g", o.HOMO, o.SOMO, o.LUMO, o.Levels[1].Occupancy)
	}
}

// The deterministic degenerate basis: benzene's HOMO pair is the Gram–Schmidt of the
// projections of e_0 and e_1, so the first vector is (2,1,−1,−2,−1,1)/√12 and the second
// has c_0 = 0 (projection of e_0 first, e_1 orthogonalised against it).
func TestDegenerateBasisDeterministic(t *testing.T) {
	o := mustSolve(t, carbonSystem(6, ringEdges(6)))
	first := o.Levels[1].Coeffs
	want := []float64{2, 1, -1, -2, -1, 1}
	for i := range want {
		if !scalar.EqualWithinAbs(first[i], want[i]/math.Sqrt(12), tolCoef) {
			t.Errorf("benzene HOMO(a) c%d = %g, want %g", i, first[i], want[i]/math.Sqrt(12))
		}
	}
	if !scalar.EqualWithinAbs(o.Levels[2].Coeffs[0], 0, tolCoef) {
		t.Errorf("benzene HOMO(b) c0 = %g, want 0", o.Levels[2].Coeffs[0])
	}
	// Per-atom Σc² over the set is basis independent: 1/3 on every atom.
	for i := range 6 {
		s := first[i]*first[i] + o.Levels[2].Coeffs[i]*o.Levels[2].Coeffs[i]
		if !scalar.EqualWithinAbs(s, 1.0/3, tolCoef) {
			t.Errorf("benzene HOMO set Σc² on atom %d = %g, want 1/3", i, s)
		}
	}
}

// Without removes centres and their electrons; fragments are recomputed.
func TestWithout(t *testing.T) {
	ps := carbonSystem(4, chainEdges(4)) // butadiene
	w := ps.Without(0, 3)                // Diels–Alder: the termini become sp3
	if len(w.Centres) != 2 || len(w.Bonds) != 1 || w.Electrons() != 2 || len(w.Fragments) != 1 {
		t.Fatalf("Without(0,3): %d centres, %d bonds, %d e, %d fragments", len(w.Centres), len(w.Bonds), w.Electrons(), len(w.Fragments))
	}
	if w.AtomCentre[0] != -1 || w.AtomCentre[1] != 0 || w.AtomCentre[2] != 1 || w.AtomCentre[3] != -1 {
		t.Errorf("AtomCentre %v", w.AtomCentre)
	}
	o := mustSolve(t, w)
	if !scalar.EqualWithinAbs(o.Levels[0].X, 1, tolX) {
		t.Errorf("central C=C: x = %g, want 1", o.Levels[0].X)
	}
	split := ps.Without(1)
	if len(split.Fragments) != 2 {
		t.Errorf("Without(1): %d fragments, want 2", len(split.Fragments))
	}
	if len(ps.Centres) != 4 {
		t.Errorf("Without modified its receiver")
	}
}

// ω-technique on the allyl cation: converges, keeps the symmetry, and raises h at the
// positive termini (Wheland & Mann, J. Chem. Phys. 1949, 17, 264; ω = 1.4 as recommended
// by Streitwieser 1961, ch. 4).
func TestOmegaTechniqueAllylCation(t *testing.T) {
	ps := carbonSystem(3, chainEdges(3))
	ps.Centres[2].Electrons, ps.Centres[2].FormalCharge = 0, 1
	ps.Omega = 1.4
	o := mustSolve(t, ps)
	if o.Iterations == 0 || o.Iterations >= huckel.OmegaMaxIter {
		t.Errorf("iterations %d", o.Iterations)
	}
	if !scalar.EqualWithinAbs(o.H[0], o.H[2], 1e-6) || o.H[0] <= 0 {
		t.Errorf("ω h = %v: want equal positive terminal values", o.H)
	}
	for i := range 3 {
		want := 1.4 * o.Charges[i]
		if !scalar.EqualWithinAbs(o.H[i], want, 1e-5) {
			t.Errorf("centre %d: h = %g, want h⁰ + ω·q = %g (self-consistency)", i, o.H[i], want)
		}
	}
	checkInvariants(t, "allyl cation ω", ps, o)
}

func TestTooManyElectrons(t *testing.T) {
	ps := carbonSystem(2, chainEdges(2))
	ps.Centres[0].Electrons = 3
	if _, err := huckel.Solve(ps); err == nil {
		t.Error("3 electrons on one centre: no error")
	}
}

// The Solver's closed-form two-centre path agrees with mat.EigenSym on random two-centre
// systems (different h, any k), including equal-h ethylene.
func TestTwoCentreClosedForm(t *testing.T) {
	rnd := rand.New(rand.NewPCG(3, 4))
	var s huckel.Solver
	var into huckel.Orbitals
	for trial := range 200 {
		h0, h1 := float64(rnd.IntN(7))*0.5-1, float64(rnd.IntN(7))*0.5-1
		if trial == 0 {
			h0, h1 = 0, 0
		}
		k := 0.2 + rnd.Float64()
		ps := huckel.NewPiSystem([]huckel.Centre{{Atom: 0, H: h0, Electrons: 1}, {Atom: 1, H: h1, Electrons: 1 + rnd.IntN(2)}},
			[]huckel.PiBond{{I: 0, J: 1, K: k}})
		want := mustSolve(t, ps)
		if err := s.Solve(ps, &into); err != nil {
			t.Fatal(err)
		}
		for i := range 2 {
			if !scalar.EqualWithinAbs(want.Levels[i].X, into.Levels[i].X, 1e-12) {
				t.Errorf("trial %d level %d: x %g vs %g", trial, i, into.Levels[i].X, want.Levels[i].X)
			}
			for c := range 2 {
				if !scalar.EqualWithinAbs(want.Levels[i].Coeffs[c], into.Levels[i].Coeffs[c], 1e-12) {
					t.Errorf("trial %d level %d c%d: %g vs %g", trial, i, c, into.Levels[i].Coeffs[c], want.Levels[i].Coeffs[c])
				}
			}
		}
		checkInvariants(t, "two-centre", ps, &into)
	}
}
