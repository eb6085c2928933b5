package huckel_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"

	"gonum.org/v1/gonum/floats/scalar"
)

// ω = 1.4, the value recommended by Streitwieser (Molecular Orbital Theory for Organic
// Chemists, 1961, ch. 4) and used in Streitwieser, J. Am. Chem. Soc. 1960, 82, 4123.
const omegaStd = 1.4

// Tolerances of the ω tests.
const (
	tolSelf  = huckel.OmegaTol // h_i = h_i⁰ + ω·q_i on the returned solution (the stopping rule)
	tolFixed = 1e-6            // h from Solve and Solver (two eigensolvers, one fixed point)
	tolRing  = 1e-7            // closed-form ring values (OmegaTol, divided by 1 + ω·μ ≥ 1)
)

// omegaCases are charged π systems and zwitterions on which the plain ω iteration
// oscillates or converges slowly: ions, the four 1,3-dipole families and activated
// dienophiles (protonated, Lewis-acid-bound, iminium).
var omegaCases = []struct{ name, smiles string }{
	{"allyl cation", "C=C[CH2+]"},
	{"allyl anion", "C=C[CH2-]"},
	{"tropylium", "c1cc[cH+]ccc1"},
	{"cyclopentadienyl anion", "C1=CC=C[CH-]1"},
	{"formonitrile oxide", "C#[N+][O-]"},
	{"benzonitrile oxide", "c1ccccc1C#[N+][O-]"},
	{"N-methyl nitrone", "C=[N+]([O-])C"},
	{"C-phenyl N-methyl nitrone", "C[N+]([O-])=Cc1ccccc1"},
	{"methyl azide", "[N-]=[N+]=NC"},
	{"phenyl azide", "[N-]=[N+]=Nc1ccccc1"},
	{"diazomethane (C=N+=N−)", "C=[N+]=[N-]"},
	{"diazomethane (C−–N+≡N)", "[CH2-][N+]#N"},
	{"ethyl diazoacetate", "N#[N+][CH-]C(=O)OCC"},
	{"protonated acrolein", "C=CC=[OH+]"},
	{"acrolein·BF3", "C=CC=[O+][B-](F)(F)F"},
	{"iminium of acrolein and pyrrolidine", "C=CC=[N+]1CCCC1"},
	{"nitroethylene", "C=C[N+](=O)[O-]"},
}

// checkSelfConsistent asserts the fixed-point condition h_i = h_i⁰ + ω·q_i on the returned
// solution, charge conservation Σq_i = Σ formal charges (independent of ω), and the
// eigen-invariants with the self-consistent diagonal.
func checkSelfConsistent(t *testing.T, name string, ps *huckel.PiSystem, o *huckel.Orbitals) {
	t.Helper()
	sumQ, sumF := 0.0, 0
	for i, c := range ps.Centres {
		want := c.H + ps.Omega*o.Charges[i]
		if d := math.Abs(o.H[i] - want); d > tolSelf {
			t.Errorf("%s: centre %d: h = %.9f, h⁰ + ω·q = %.9f (|Δ| %.2g > %g)", name, i, o.H[i], want, d, tolSelf)
		}
		sumQ += o.Charges[i]
		sumF += c.FormalCharge
	}
	if !scalar.EqualWithinAbs(sumQ, float64(sumF), tolQ*float64(len(ps.Centres))) {
		t.Errorf("%s: Σq = %.12f, want the formal π charge %d", name, sumQ, sumF)
	}
	checkInvariants(t, name, ps, o)
}

// Every case converges with ω = 1.4 through Solve and through a reused Solver, to the same
// fixed point, and the fixed-point condition holds within OmegaTol.
func TestOmegaConvergesOnChargedSystems(t *testing.T) {
	p := defaultParams(t)
	var s huckel.Solver
	var into huckel.Orbitals
	for _, tc := range omegaCases {
		t.Run(tc.name, func(t *testing.T) {
			ps := perceive(t, tc.smiles, p)
			ps.Omega = omegaStd
			o, err := huckel.Solve(ps)
			if err != nil {
				t.Fatalf("%s: %v", tc.smiles, err)
			}
			if o.Iterations < 1 || o.Iterations > huckel.OmegaMaxIter {
				t.Errorf("%s: %d cycles", tc.smiles, o.Iterations)
			}
			checkSelfConsistent(t, tc.smiles, ps, o)
			if err := s.Solve(ps, &into); err != nil {
				t.Fatalf("%s (Solver): %v", tc.smiles, err)
			}
			checkSelfConsistent(t, tc.smiles+" (Solver)", ps, &into)
			for i := range ps.Centres {
				if !scalar.EqualWithinAbs(o.H[i], into.H[i], tolFixed) {
					t.Errorf("%s centre %d: Solve h %.9f, Solver h %.9f", tc.smiles, i, o.H[i], into.H[i])
				}
			}
			t.Logf("%-40s %3d cycles, HOMO x %.4f", tc.name, o.Iterations, o.Levels[o.HOMO].X)
		})
	}
}

// Closed form for the symmetric ions: in C_nH_n rings (D_nh) every centre carries the same
// charge q = z/n, so the ω-technique shifts every h by ω·z/n and every level by the same
// amount: x_j = ω·z/n + 2cos(2πj/n) (Hückel ring levels, e.g. Streitwieser 1961, ch. 10;
// the uniform shift follows from symmetry, no source needed).
func TestOmegaSymmetricRingsClosedForm(t *testing.T) {
	p := noAlkyl(t)
	for _, tc := range []struct {
		smiles string
		n, z   int
	}{
		{"c1cc[cH+]ccc1", 7, 1},  // tropylium
		{"C1=CC=C[CH-]1", 5, -1}, // cyclopentadienyl anion
		{"C1=C[CH+]1", 3, 1},     // cyclopropenyl cation
	} {
		ps := perceive(t, tc.smiles, p)
		ps.Omega = omegaStd
		o := mustSolve(t, ps)
		shift := omegaStd * float64(tc.z) / float64(tc.n)
		for i := range ps.Centres {
			if !scalar.EqualWithinAbs(o.H[i], shift, tolRing) {
				t.Errorf("%s centre %d: h = %.9f, want ω·z/n = %.9f", tc.smiles, i, o.H[i], shift)
			}
		}
		want := make([]float64, tc.n)
		for j := range tc.n {
			want[j] = shift + 2*math.Cos(2*math.Pi*float64(j)/float64(tc.n))
		}
		sortDesc(want)
		for j, l := range o.Levels {
			if !scalar.EqualWithinAbs(l.X, want[j], tolRing) {
				t.Errorf("%s level %d: x = %.9f, want %.9f", tc.smiles, j, l.X, want[j])
			}
		}
		checkSelfConsistent(t, tc.smiles, ps, o)
	}
}

func sortDesc(v []float64) {
	for i := range v {
		for j := i + 1; j < len(v); j++ {
			if v[j] > v[i] {
				v[i], v[j] = v[j], v[i]
			}
		}
	}
}

// Coulson–Rushbrooke pairing theorem (Coulson & Rushbrooke, Proc. Cambridge Philos. Soc.
// 1940, 36, 193): every centre of a neutral alternant hydrocarbon has π charge 0, so
// h⁰ + ω·q = h⁰, the ω-technique needs no cycle and changes nothing. The alkyl model is
// off (its pseudo-heteroatoms make a molecule non-alternant).
func TestOmegaAlternantUnchanged(t *testing.T) {
	p := noAlkyl(t)
	for _, smi := range []string{"C=C", "C=CC=C", "C=CC=CC=C", "c1ccccc1", "c1ccc2ccccc2c1",
		"C=Cc1ccccc1", "C=CC(=C)C=C", "c1ccc2cc3ccccc3cc2c1", "C=CC=CC=CC=C"} {
		ps := perceive(t, smi, p)
		plain := mustSolve(t, ps)
		ps.Omega = omegaStd
		o := mustSolve(t, ps)
		if o.Iterations != 0 {
			t.Errorf("%s: %d ω cycles, want 0 (all charges zero)", smi, o.Iterations)
		}
		for i := range ps.Centres {
			if math.Abs(o.Charges[i]) > tolQ || o.H[i] != ps.Centres[i].H {
				t.Errorf("%s centre %d: q = %g, h = %g (h⁰ %g)", smi, i, o.Charges[i], o.H[i], ps.Centres[i].H)
			}
		}
		for j := range plain.Levels {
			if plain.Levels[j].X != o.Levels[j].X {
				t.Errorf("%s level %d: x %g with ω, %g without", smi, j, o.Levels[j].X, plain.Levels[j].X)
			}
		}
	}
}

// ω = 5, far above the recommended 1.4, on the allyl cation: the undamped iteration (and
// the fixed 0.5-damped one this package used before) oscillates, the adaptive scheme
// reaches the fixed point, which exists and is unique for any ω > 0 (see Solver.Solve).
func TestOmegaLargeOmegaConverges(t *testing.T) {
	ps := perceive(t, "C=C[CH2+]", noAlkyl(t))
	for _, w := range []float64{omegaStd, 5, 50} {
		ps.Omega = w
		o, err := huckel.Solve(ps)
		if err != nil {
			t.Fatalf("ω = %g: %v", w, err)
		}
		checkSelfConsistent(t, fmt.Sprintf("allyl cation, ω = %g", w), ps, o)
		if !scalar.EqualWithinAbs(o.H[0], o.H[2], tolFixed) {
			t.Errorf("ω = %g: termini h %g, %g: symmetry lost", w, o.H[0], o.H[2])
		}
	}
}

// A π system whose self-consistent solution would sit on a crossing of the HOMO and the
// LUMO: trimethylenemethane C(CH2)3 with 4 electrons and one terminus made slightly
// electronegative (h = 0.1). The closed-shell aufbau puts both NBMO electrons into the
// level with more weight on that terminus; ω then makes it negative, lowers its h and
// pushes that level above the other, and the electrons jump. The π energy has a kink there
// and no closed-shell fixed point exists: the result must be ErrNoConvergence, naming the
// crossing, never a silent answer. (Constructed case; the argument is in Solver.Solve.)
func TestOmegaNonConvergence(t *testing.T) {
	cs := make([]huckel.Centre, 4)
	for i := range cs {
		cs[i] = huckel.Centre{Atom: i, Element: "C", Type: huckel.CSp2, Electrons: 1}
	}
	cs[3].H = 0.1
	ps := huckel.NewPiSystem(cs, []huckel.PiBond{{I: 0, J: 1, K: 1}, {I: 0, J: 2, K: 1}, {I: 0, J: 3, K: 1}})
	ps.Omega = omegaStd
	_, err := huckel.Solve(ps)
	if !errors.Is(err, huckel.ErrNoConvergence) {
		t.Fatalf("err = %v, want ErrNoConvergence", err)
	}
	t.Log(err)
	if msg := err.Error(); !strings.Contains(msg, "ω = 1.4") || !strings.Contains(msg, "HOMO and LUMO cross") {
		t.Errorf("message %q: want ω and the level crossing named", msg)
	}
	var s huckel.Solver
	var into huckel.Orbitals
	if err := s.Solve(ps, &into); !errors.Is(err, huckel.ErrNoConvergence) {
		t.Errorf("Solver: err = %v, want ErrNoConvergence", err)
	}
	for _, w := range []float64{math.NaN(), math.Inf(1)} {
		ps.Omega = w
		if _, err := huckel.Solve(ps); !errors.Is(err, huckel.ErrOmega) {
			t.Errorf("ω = %g: err = %v, want ErrOmega", w, err)
		}
	}
}

// A warm Solver allocates nothing, with ω = 0 and with ω = 1.4.
func TestOmegaSolverZeroAllocs(t *testing.T) {
	p := defaultParams(t)
	for _, tc := range []struct {
		smiles string
		omega  float64
	}{{"C=[N+]([O-])Cc1ccccc1", 0}, {"C=[N+]([O-])Cc1ccccc1", omegaStd}, {"C=CC=[N+]1CCCC1", omegaStd}} {
		ps := perceive(t, tc.smiles, p)
		ps.Omega = tc.omega
		var s huckel.Solver
		var into huckel.Orbitals
		if err := s.Solve(ps, &into); err != nil {
			t.Fatal(err)
		}
		allocs := testing.AllocsPerRun(50, func() {
			if err := s.Solve(ps, &into); err != nil {
				t.Fatal(err)
			}
		})
		if allocs != 0 {
			t.Errorf("%s, ω = %g: %v allocations per warm Solve, want 0", tc.smiles, tc.omega, allocs)
		}
	}
}

// BenchmarkOmega times a warm Solver on charged partners with ω = 1.4 against the same
// molecule with ω = 0 in the same run (x_plain = ω time / plain time; cycles = ω cycles).
func BenchmarkOmega(b *testing.B) {
	p := defaultParams(b)
	for _, smi := range []string{"C#[N+][O-]", "C[N+]([O-])=Cc1ccccc1", "O=CC=CC=[N+]1CCCC1"} {
		ps := perceive(b, smi, p)
		b.Run(fmt.Sprintf("centres=%d", len(ps.Centres)), func(b *testing.B) {
			var s huckel.Solver
			var into huckel.Orbitals
			var cycles int
			b.ReportAllocs()
			var tPlain, tOmega time.Duration
			for b.Loop() {
				ps.Omega = 0
				t0 := time.Now()
				if err := s.Solve(ps, &into); err != nil {
					b.Fatal(err)
				}
				ps.Omega = omegaStd
				t1 := time.Now()
				if err := s.Solve(ps, &into); err != nil {
					b.Fatal(err)
				}
				tPlain += t1.Sub(t0)
				tOmega += time.Since(t1)
				cycles = into.Iterations
			}
			b.ReportMetric(tOmega.Seconds()/tPlain.Seconds(), "x_plain")
			b.ReportMetric(float64(cycles), "cycles")
		})
	}
}

// FuzzOmega runs arbitrary SMILES through the ω-technique (ω = 1.4): nothing may panic, and
// a returned solution satisfies the fixed-point condition h_i = h_i⁰ + ω·q_i within
// OmegaTol; the only admissible failure of the iteration is ErrNoConvergence.
func FuzzOmega(f *testing.F) {
	for _, tc := range omegaCases {
		f.Add(tc.smiles)
	}
	for _, s := range []string{"C=CC=C", "c1ccncc1", "C=CC=O", "O=C1C=CC(=O)C=C1", "C=C[CH2]",
		"[CH2]C(=C)[CH2]", "c1ccc2cccc2cc1", "[O-][N+](=Cc1ccccc1)c1ccccc1", "C=CC=CC=[N+](C)C",
		"[N-]=[N+]=[N-]", "N#N", "[C-]#[O+]", "C1=CC=CC=CC=C1", "[CH-]1C=CC=CC=C1", "C1=C[CH+]1"} {
		f.Add(s)
	}
	p := defaultParams(f)
	f.Fuzz(func(t *testing.T, s string) {
		m, err := smiles.Parse(s)
		if err != nil {
			return
		}
		ps, err := huckel.Perceive(m, p)
		if err != nil || len(ps.Centres) > 100 {
			return
		}
		ps.Omega = omegaStd
		o, err := huckel.Solve(ps)
		if errors.Is(err, huckel.ErrNoConvergence) {
			if !strings.Contains(err.Error(), "ω = 1.4") {
				t.Fatalf("%q: message without ω: %v", s, err)
			}
			return
		}
		if err != nil {
			return // electron-count errors are Solve's, not the ω iteration's
		}
		for i, c := range ps.Centres {
			if d := math.Abs(o.H[i] - c.H - omegaStd*o.Charges[i]); !(d <= tolSelf) {
				t.Fatalf("%q centre %d: |h − h⁰ − ω·q| = %g > %g", s, i, d, tolSelf)
			}
		}
	})
}
