package huckel_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
	"time"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// checkEnergy asserts that EnergySolver.PiEnergy gives Solve's PiEnergy bit for bit (or the
// same error): the localisation energies the pair analysis prints and ranks by come from it.
func checkEnergy(t *testing.T, s *huckel.EnergySolver, what string, ps *huckel.PiSystem) {
	t.Helper()
	got, gotErr := s.PiEnergy(ps)
	o, wantErr := huckel.Solve(ps)
	if (gotErr == nil) != (wantErr == nil) || (gotErr != nil && gotErr.Error() != wantErr.Error()) {
		t.Errorf("%s: error %v, Solve: %v", what, gotErr, wantErr)
		return
	}
	if wantErr != nil {
		return
	}
	if math.Float64bits(got) != math.Float64bits(o.PiEnergy) {
		t.Errorf("%s: PiEnergy %v (%#x), Solve %v (%#x)", what, got, math.Float64bits(got), o.PiEnergy, math.Float64bits(o.PiEnergy))
	}
}

// Against Solve on every bundled substrate and each system left when one or two π centres
// (every bonded pair: the localisation residues) are removed, under both bundled parameter
// sets. These hold degenerate sets (benzene rings, cyclopentadienyl-like residues), odd
// electron counts, partly filled shells and several fragments with equal levels.
func TestEnergySolverMatchesSolvePresets(t *testing.T) {
	var s huckel.EnergySolver // one workspace for all: reuse must not leak state
	var reused huckel.PiSystem
	systems := 0
	for _, name := range presets.ParamNames() {
		params, err := presets.Params(name)
		if err != nil {
			t.Fatal(err)
		}
		for _, sub := range presets.Substrates() {
			m, err := smiles.Parse(sub.SMILES)
			if err != nil {
				t.Fatal(err)
			}
			ps, err := huckel.Perceive(m, params)
			if err != nil {
				continue // not every substrate has a π system under every set
			}
			checkEnergy(t, &s, name+" "+sub.Name, ps)
			systems++
			for _, b := range ps.Bonds {
				rest := ps.Without(b.I, b.J)
				checkEnergy(t, &s, name+" "+sub.Name+" without a bond", rest)
				ps.WithoutInto(&reused, b.I, b.J)
				checkResidue(t, name+" "+sub.Name, rest, &reused)
				systems++
			}
			for c := range ps.Centres {
				checkEnergy(t, &s, name+" "+sub.Name+" without a centre", ps.Without(c))
				systems++
			}
		}
	}
	if systems < 1000 {
		t.Errorf("only %d systems compared", systems)
	}
}

// checkResidue asserts that WithoutInto into a reused PiSystem gives what Without gives.
func checkResidue(t *testing.T, what string, want, got *huckel.PiSystem) {
	t.Helper()
	if !slices.Equal(want.Centres, got.Centres) || !slices.Equal(want.Bonds, got.Bonds) ||
		!slices.Equal(want.AtomCentre, got.AtomCentre) || !slices.EqualFunc(want.Fragments, got.Fragments, slices.Equal) ||
		want.Omega != got.Omega || want.MaxCentres != got.MaxCentres || want.Mol != got.Mol || want.Params != got.Params {
		t.Errorf("%s: WithoutInto differs from Without:\n%+v\n%+v", what, got, want)
	}
}

// Random systems: random h (two-decimal parameter values and arbitrary reals), k, electrons
// 0–2 per centre, several fragments, sizes up to 70 centres (past the blocked
// tridiagonalisation of systems above 32 centres), plus exact copies of one fragment
// (equal levels in different fragments) and regular rings (degenerate sets).
func TestEnergySolverMatchesSolveRandom(t *testing.T) {
	rnd := rand.New(rand.NewPCG(13, 2026))
	s := huckel.EnergySolver{Memo: true} // repeated fragments hit the memo
	for trial := range 3000 {
		n := 1 + rnd.IntN(12)
		if trial%20 == 0 {
			n = 30 + rnd.IntN(41)
		}
		var cs []huckel.Centre
		var bs []huckel.PiBond
		addFragment := func(size int, ring bool, h func() float64, k func() float64) {
			base := len(cs)
			for i := range size {
				cs = append(cs, huckel.Centre{Atom: base + i, H: h(), Electrons: rnd.IntN(3)})
				if i > 0 {
					bs = append(bs, huckel.PiBond{I: base + i - 1, J: base + i, K: k()})
				}
			}
			if ring && size > 2 {
				bs = append(bs, huckel.PiBond{I: base, J: base + size - 1, K: k()})
			}
			// random cross-links
			for range rnd.IntN(size/3 + 1) {
				i, j := rnd.IntN(size), rnd.IntN(size)
				if i != j {
					bs = append(bs, huckel.PiBond{I: base + i, J: base + j, K: k()})
				}
			}
		}
		two := func() float64 { return math.Round((rnd.Float64()*3-0.5)*100) / 100 }
		real := func() float64 { return rnd.NormFloat64() }
		one := func() float64 { return 1 }
		zero := func() float64 { return 0 }
		switch trial % 4 {
		case 0:
			addFragment(n, rnd.IntN(2) == 0, two, two)
		case 1:
			addFragment(n, false, real, real)
			addFragment(1+rnd.IntN(6), true, two, two)
		case 2: // regular ring: degenerate pairs
			size := 3 + rnd.IntN(10)
			base := len(cs)
			for i := range size {
				cs = append(cs, huckel.Centre{Atom: base + i, Electrons: rnd.IntN(3)})
				bs = append(bs, huckel.PiBond{I: base + i, J: base + (i+1)%size, K: 1})
			}
			addFragment(1+rnd.IntN(4), false, zero, one)
		case 3: // two copies of one fragment: equal x in different fragments
			addFragment(n, rnd.IntN(2) == 0, two, two)
			nc, nb := len(cs), len(bs)
			for i := range nc {
				c := cs[i]
				c.Atom += nc
				cs = append(cs, c)
			}
			for i := range nb {
				b := bs[i]
				b.I, b.J = b.I+nc, b.J+nc
				bs = append(bs, b)
			}
		}
		ps := huckel.NewPiSystem(cs, bs)
		checkEnergy(t, &s, "random", ps)
		if t.Failed() {
			t.Fatalf("trial %d: centres %+v bonds %+v", trial, cs, bs)
		}
	}
}

// Inputs Solve rejects give Solve's error; an ω system gives Solve's self-consistent energy.
func TestEnergySolverErrorsAndOmega(t *testing.T) {
	var s huckel.EnergySolver
	over := carbonSystem(2, [][2]int{{0, 1}})
	over.Centres[0].Electrons, over.Centres[1].Electrons = 2, 2
	over.Centres[0].Electrons = 3
	if _, err := s.PiEnergy(over); !errors.Is(err, huckel.ErrElectrons) {
		t.Errorf("3 electrons on one centre: %v", err)
	}
	big := carbonSystem(5, chainEdges(5))
	big.MaxCentres = 4
	if _, err := s.PiEnergy(big); !errors.Is(err, huckel.ErrTooManyCentres) {
		t.Errorf("over the limit: %v", err)
	}
	m, err := smiles.Parse("C=CC=O")
	if err != nil {
		t.Fatal(err)
	}
	params, err := presets.Params(presets.DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	ps, err := huckel.Perceive(m, params)
	if err != nil {
		t.Fatal(err)
	}
	ps.Omega = 1.4 // Streitwieser's recommended ω (Molecular Orbital Theory for Organic Chemists, 1961, ch. 4)
	checkEnergy(t, &s, "acrolein with ω", ps)
}

// BenchmarkResidueEnergy measures the localisation step of the pair analysis on the
// benchmark molecules: for every π bond, the π energy of the system without its two centres.
// Both ways run interleaved in one loop and are timed separately: the way before
// EnergySolver (Without and huckel.Solve, a fresh result each time) and the energy-only
// way (WithoutInto a reused system and EnergySolver.PiEnergy). "x-vs-solve" is the time
// ratio (old over new), "residues/s" the new way's rate; allocations per op cover both.
func BenchmarkResidueEnergy(b *testing.B) {
	p := defaultParams(b)
	for _, smi := range benchMolecules {
		ps := perceive(b, smi, p)
		b.Run(fmt.Sprintf("centres=%d", len(ps.Centres)), func(b *testing.B) {
			var s huckel.EnergySolver
			var rest huckel.PiSystem
			var tOld, tNew time.Duration
			residues := 0
			sink := 0.0
			b.ReportAllocs()
			for b.Loop() {
				t0 := time.Now()
				for _, bd := range ps.Bonds {
					o, err := huckel.Solve(ps.Without(bd.I, bd.J))
					if err != nil {
						b.Fatal(err)
					}
					sink += o.PiEnergy
				}
				t1 := time.Now()
				for _, bd := range ps.Bonds {
					ps.WithoutInto(&rest, bd.I, bd.J)
					e, err := s.PiEnergy(&rest)
					if err != nil {
						b.Fatal(err)
					}
					sink += e
				}
				t2 := time.Now()
				tOld += t1.Sub(t0)
				tNew += t2.Sub(t1)
				residues += len(ps.Bonds)
			}
			_ = sink // equality is TestEnergySolverMatchesSolve*'s job
			if tNew > 0 {
				b.ReportMetric(float64(tOld)/float64(tNew), "x-vs-solve")
				b.ReportMetric(float64(residues)/tNew.Seconds(), "residues/s")
			}
		})
	}
}
