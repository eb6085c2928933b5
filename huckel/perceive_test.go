package huckel_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"cyclopair/huckel"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"

	"gonum.org/v1/gonum/floats/scalar"
)

// defaultParams is the Streitwieser (1961) set: the published worked values these tests check
// (pyridine, acrolein, the ortho/para coefficient facts) were computed with it, so the tests
// pin that set rather than whichever set is the tool's default.
func defaultParams(t testing.TB) *huckel.Params {
	t.Helper()
	p, err := presets.Params("streitwieser1961")
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func perceive(t testing.TB, s string, p *huckel.Params) *huckel.PiSystem {
	t.Helper()
	m, err := smiles.Parse(s)
	if err != nil {
		t.Fatalf("%s: %v", s, err)
	}
	ps, err := huckel.Perceive(m, p)
	if err != nil {
		t.Fatalf("%s: %v", s, err)
	}
	return ps
}

// noAlkyl is the default set with the alkyl model off, for textbook comparisons that
// treat the carbon skeleton alone.
func noAlkyl(t testing.TB) *huckel.Params {
	off, err := huckel.ParseParams([]byte("alkyl: false\n"), "noalkyl.yaml")
	if err != nil {
		t.Fatal(err)
	}
	return defaultParams(t).Merge(off)
}

// Perception rules: centre type and electrons per atom index ("-" = not a centre).
func TestPerceiveTypes(t *testing.T) {
	tests := []struct {
		smiles string
		want   string // space-separated type:electrons per atom, "-" for non-centres
		frags  int
	}{
		{"C=CC=C", "C:1 C:1 C:1 C:1", 1},
		{"c1ccncc1", "C:1 C:1 C:1 N=:1 C:1 C:1", 1},
		{"c1cc[nH]c1", "C:1 C:1 C:1 N::2 C:1", 1},
		{"c1ccoc1", "C:1 C:1 C:1 O::2 C:1", 1},
		{"c1ccsc1", "C:1 C:1 C:1 S::2 C:1", 1},
		{"C=CC=O", "C:1 C:1 C:1 O=:1", 1},
		{"C=CC(=O)OC", "C:1 C:1 C:1 O=:1 O::2 -", 1},              // ester: O-methyl is next to a donor only
		{"C=CC=[N+]1CCCC1", "C:1 C:1 C:1 N+=:1 Me:2 - - Me:2", 1}, // iminium; N-CH2 hyperconjugate
		{"C=CC=[OH+]", "C:1 C:1 C:1 O+=:1", 1},
		{"C=CC=[O+][B-](F)(F)F", "C:1 C:1 C:1 O=LA:1 - - - -", 1}, // BF3-bound acrolein
		{"C=C[N+](=O)[O-]", "C:1 C:1 N+nitro:1 Onitro:1 Onitro:2", 1},
		{"CC(=S)C", "Me:2 C:1 S=:1 Me:2", 1},
		{"C=CCl", "C:1 C:1 Cl:2", 1},
		{"C=CB(O)O", "C:1 C:1 B:0 O::2 O::2", 1},
		{"C=C[CH2+]", "C:1 C:1 C+:0", 1},
		{"C=C[CH2-]", "C:1 C:1 C-:2", 1},
		{"C#N", "C#:1 N#:1", 1},
		{"CC#CC", "Me:2 C#:1 C#:1 Me:2", 1},
		{"[N-]=[N+]=NC", "N-:2 N+#:1 N=:1 Me:2", 1},  // azide: keeps N1=N2 (substituted side)
		{"C=[N+]=[N-]", "C:1 N+#:1 N-:2", 1},         // diazomethane
		{"CC#[N+][O-]", "Me:2 C#:1 N+#:1 O-:2", 1},   // nitrile oxide
		{"C[N+]([O-])=C", "Me:2 N+=:1 O-:2 C:1", 1},  // nitrone
		{"C=C=O", "C:1 C#:1 O::2", 1},                // ketene: C=C set, in-plane O lone pair
		{"CC(C)=C=C", "Me:2 C:1 Me:2 C#:1 -", 1},     // allene: the substituted C=C is kept
		{"C=C.C=C", "C:1 C:1 C:1 C:1", 2},            // separate molecules
		{"C=CCCC=C", "C:1 C:1 Me:2 Me:2 C:1 C:1", 2}, // two alkyl pseudo-atoms are not bonded
		{"CCOC", "- - - -", 0},
		{"C[N+]#[C-]", "Me:2 N+#:1 C#:1", 1},              // methyl isocyanide                            // nothing conjugated
		{"N1=NN=NC=C1", "N=:1 N=:1 N=:1 N=:1 C:1 C:1", 1}, // 1,2,3,4-tetrazine
	}
	p := defaultParams(t)
	for _, tc := range tests {
		ps := perceive(t, tc.smiles, p)
		var got []string
		for a := range ps.Mol.Atoms {
			c := ps.AtomCentre[a]
			if c < 0 {
				got = append(got, "-")
				continue
			}
			got = append(got, string(ps.Centres[c].Type)+":"+string(rune('0'+ps.Centres[c].Electrons)))
		}
		if strings.Join(got, " ") != tc.want {
			t.Errorf("%s: types %q, want %q", tc.smiles, strings.Join(got, " "), tc.want)
		}
		if len(ps.Fragments) != tc.frags {
			t.Errorf("%s: %d fragments, want %d", tc.smiles, len(ps.Fragments), tc.frags)
		}
	}
}

func TestPerceiveSulfoneWarns(t *testing.T) {
	ps := perceive(t, "CS(=O)(=O)C=C", defaultParams(t))
	if len(ps.Centres) != 2 || len(ps.Warnings) == 0 {
		t.Errorf("vinyl sulfone: %d centres, warnings %q; want the vinyl group only and a warning", len(ps.Centres), ps.Warnings)
	}
}

func TestPerceiveMissingParameter(t *testing.T) {
	bare, err := huckel.ParseParams([]byte(`
name: carbononly
h:
  - {type: C, h: 0, source: "definition"}
k:
  - {types: [C, C], k: 1, source: "definition"}
`), "carbononly.yaml")
	if err != nil {
		t.Fatal(err)
	}
	m, _ := smiles.Parse("C=C[N+](=O)[O-]")
	_, err = huckel.Perceive(m, bare)
	if !errors.Is(err, huckel.ErrNoParameter) {
		t.Fatalf("err = %v, want ErrNoParameter", err)
	}
	want := "atom 2 (N+): no h parameter for type N+nitro in set carbononly (add it with --params FILE)"
	if err.Error() != want {
		t.Errorf("error\n %q\nwant\n %q", err.Error(), want)
	}
	var pe *huckel.PerceiveError
	if !errors.As(err, &pe) || pe.Atom != 2 {
		t.Errorf("PerceiveError atom = %+v", pe)
	}
}

func TestPerceiveOddElectronsWarns(t *testing.T) {
	// Allyl radical built by hand (the SMILES reader refuses radicals).
	var m molecule.Molecule
	a := m.AddAtom(molecule.Atom{Element: "C", HCount: 2, Pos: -1})
	b := m.AddAtom(molecule.Atom{Element: "C", HCount: 1, Pos: -1})
	c := m.AddAtom(molecule.Atom{Element: "C", HCount: 2, Pos: -1})
	m.AddBond(a, b, 2)
	m.AddBond(b, c, 1)
	ps, err := huckel.Perceive(&m, defaultParams(t))
	if err != nil {
		t.Fatal(err)
	}
	if ps.Electrons() != 3 || len(ps.Warnings) != 1 || !strings.Contains(ps.Warnings[0], "odd") {
		t.Errorf("allyl radical: %d e, warnings %q", ps.Electrons(), ps.Warnings)
	}
	o := mustSolve(t, ps)
	if o.SOMO != 1 || !scalar.EqualWithinAbs(o.Levels[1].X, 0, tolX) {
		t.Errorf("allyl radical SOMO %d x %g", o.SOMO, o.Levels[1].X)
	}
}

// Published Hückel results. Tolerances match the published precision (3 decimals).
const tolPub = 5e-4

func TestPublishedValues(t *testing.T) {
	p := noAlkyl(t)
	t.Run("butadiene", func(t *testing.T) {
		// HOMO α + 0.618β with coefficients 0.602, 0.372, −0.372, −0.602 (Streitwieser 1961,
		// ch. 2; Fleming, Frontier Orbitals and Organic Chemical Reactions, Wiley 1976, ch. 1).
		o := mustSolve(t, perceive(t, "C=CC=C", p))
		h := o.Levels[o.HOMO]
		want := []float64{0.602, 0.372, -0.372, -0.602}
		if !scalar.EqualWithinAbs(h.X, 0.618, tolPub) {
			t.Errorf("HOMO x = %.4f", h.X)
		}
		for i, w := range want {
			if !scalar.EqualWithinAbs(h.Coeffs[i], w, tolPub) {
				t.Errorf("HOMO c%d = %.4f, want %.3f", i, h.Coeffs[i], w)
			}
		}
		if !scalar.EqualWithinAbs(o.PiEnergy, 4.472, tolPub) { // Eπ = 4α + 4.472β (same sources)
			t.Errorf("Eπ = %.4f", o.PiEnergy)
		}
	})
	t.Run("benzene", func(t *testing.T) {
		o := mustSolve(t, perceive(t, "c1ccccc1", p))
		want := []struct {
			x float64
			d int
		}{{2, 1}, {1, 2}, {1, 2}, {-1, 2}, {-1, 2}, {-2, 1}}
		for i, w := range want {
			if !scalar.EqualWithinAbs(o.Levels[i].X, w.x, tolX) || o.Levels[i].Degenerate != w.d {
				t.Errorf("level %d: x %g d %d, want %g d %d", i, o.Levels[i].X, o.Levels[i].Degenerate, w.x, w.d)
			}
		}
		if o.HOMO != 2 || o.LUMO != 3 || !scalar.EqualWithinAbs(o.PiEnergy, 8, tolX) {
			t.Errorf("HOMO %d LUMO %d Eπ %g", o.HOMO, o.LUMO, o.PiEnergy)
		}
	})
	t.Run("naphthalene", func(t *testing.T) {
		// HOMO 0.618, LUMO −0.618, Eπ = 10α + 13.683β (Streitwieser 1961; Coulson &
		// Streitwieser, Dictionary of π-Electron Calculations, 1965; from memory).
		o := mustSolve(t, perceive(t, "c1ccc2ccccc2c1", p))
		checkFrontier(t, o, 0.618, -0.618)
		if !scalar.EqualWithinAbs(o.PiEnergy, 13.683, tolPub) {
			t.Errorf("Eπ = %.4f, want 13.683", o.PiEnergy)
		}
	})
	t.Run("azulene", func(t *testing.T) {
		// HOMO 0.477, LUMO −0.400 (Coulson & Streitwieser 1965 Dictionary; from memory).
		checkFrontier(t, mustSolve(t, perceive(t, "c1ccc2cccc2cc1", p)), 0.477, -0.400)
	})
	t.Run("pyridine", func(t *testing.T) {
		// With h_N = 0.5, k_CN = 1.0: x = 2.107, 1.167, 1.000, −0.841, −1.000, −1.934
		// (Streitwieser 1961 parameters; eigenvalues from memory of the worked example).
		o := mustSolve(t, perceive(t, "c1ccncc1", p))
		for i, w := range []float64{2.107, 1.167, 1.000, -0.841, -1.000, -1.934} {
			if !scalar.EqualWithinAbs(o.Levels[i].X, w, tolPub) {
				t.Errorf("level %d: x = %.4f, want %.3f", i, o.Levels[i].X, w)
			}
		}
	})
	t.Run("acrolein", func(t *testing.T) {
		// With h_O = 1, k_CO = 1: x = 1.879, 1.000, −0.347, −1.532; the LUMO is largest at
		// the β carbon (0.657) — Fleming 1976, ch. 4 (from memory).
		o := mustSolve(t, perceive(t, "C=CC=O", p))
		for i, w := range []float64{1.879, 1.000, -0.347, -1.532} {
			if !scalar.EqualWithinAbs(o.Levels[i].X, w, tolPub) {
				t.Errorf("level %d: x = %.4f, want %.3f", i, o.Levels[i].X, w)
			}
		}
		if c := o.Coefficient(o.LUMO, 0); !scalar.EqualWithinAbs(c, 0.657, tolPub) {
			t.Errorf("LUMO c(β-C) = %.4f, want 0.657", c)
		}
	})
	t.Run("allyl ions", func(t *testing.T) {
		// Allyl: x = √2, 0, −√2; cation 2 e (LUMO the non-bonding level), anion 4 e (HOMO).
		cat := mustSolve(t, perceive(t, "C=C[CH2+]", p))
		an := mustSolve(t, perceive(t, "C=C[CH2-]", p))
		if cat.Electrons != 2 || cat.HOMO != 0 || cat.LUMO != 1 || an.Electrons != 4 || an.HOMO != 1 || an.LUMO != 2 {
			t.Errorf("cation e=%d HOMO %d LUMO %d; anion e=%d HOMO %d LUMO %d",
				cat.Electrons, cat.HOMO, cat.LUMO, an.Electrons, an.HOMO, an.LUMO)
		}
		if !scalar.EqualWithinAbs(cat.Levels[0].X, math.Sqrt2, tolX) || !scalar.EqualWithinAbs(an.Levels[1].X, 0, tolX) {
			t.Errorf("allyl levels %g %g", cat.Levels[0].X, an.Levels[1].X)
		}
		// Charges +½ on both termini of the cation, −½ on both of the anion, 0 in the middle.
		for i, w := range []float64{0.5, 0, 0.5} {
			if !scalar.EqualWithinAbs(cat.Charges[i], w, tolQ) || !scalar.EqualWithinAbs(an.Charges[i], -w, tolQ) {
				t.Errorf("centre %d: cation q %g, anion q %g", i, cat.Charges[i], an.Charges[i])
			}
		}
	})
	t.Run("fulvene, styrene, anthracene", func(t *testing.T) {
		// Fulvene x = 2.115, 1.000, 0.618, −0.254, −1.618, −1.861; styrene HOMO 0.662 /
		// LUMO −0.662; anthracene HOMO 0.414 / LUMO −0.414 (Coulson & Streitwieser,
		// Dictionary of π-Electron Calculations, 1965; from memory).
		o := mustSolve(t, perceive(t, "C=C1C=CC=C1", p))
		for i, w := range []float64{2.115, 1.000, 0.618, -0.254, -1.618, -1.861} {
			if !scalar.EqualWithinAbs(o.Levels[i].X, w, tolPub) {
				t.Errorf("fulvene level %d: x = %.4f, want %.3f", i, o.Levels[i].X, w)
			}
		}
		checkFrontier(t, mustSolve(t, perceive(t, "C=Cc1ccccc1", p)), 0.662, -0.662)
		checkFrontier(t, mustSolve(t, perceive(t, "c1ccc2cc3ccccc3cc2c1", p)), 0.414, -0.414)
	})
	t.Run("cyclopentadienyl anion", func(t *testing.T) {
		// 6 π electrons; x = 2, 0.618 (×2), −1.618 (×2); the HOMO pair is degenerate and full.
		o := mustSolve(t, perceive(t, "C1=CC=C[CH-]1", p))
		if o.Electrons != 6 || o.Partial || !scalar.EqualWithinAbs(o.Levels[o.HOMO].X, 0.618, tolPub) ||
			o.Levels[o.HOMO].Degenerate != 2 || len(o.DegenerateSet(o.HOMO)) != 2 {
			t.Errorf("e=%d partial=%v HOMO x=%g d=%d", o.Electrons, o.Partial, o.Levels[o.HOMO].X, o.Levels[o.HOMO].Degenerate)
		}
		for i := range 5 { // equal charges −0.2 by symmetry
			if !scalar.EqualWithinAbs(o.Charges[i], -0.2, tolQ) {
				t.Errorf("charge %d = %g, want −0.2", i, o.Charges[i])
			}
		}
	})
}

func checkFrontier(t *testing.T, o *huckel.Orbitals, homo, lumo float64) {
	t.Helper()
	if !scalar.EqualWithinAbs(o.Levels[o.HOMO].X, homo, tolPub) || !scalar.EqualWithinAbs(o.Levels[o.LUMO].X, lumo, tolPub) {
		t.Errorf("HOMO %.4f LUMO %.4f, want %.3f %.3f", o.Levels[o.HOMO].X, o.Levels[o.LUMO].X, homo, lumo)
	}
}

// Isoprene with the alkyl model: the HOMO is larger at C1 (next to the methylated C2)
// than at C4, the FMO basis of the "para" preference of 2-substituted dienes with
// acrylates (Houk, J. Am. Chem. Soc. 1973, 95, 4092; Fleming 1976, ch. 4).
func TestIsopreneHOMOAlkylModel(t *testing.T) {
	o := mustSolve(t, perceive(t, "C=C(C)C=C", defaultParams(t))) // atoms: C1 C2 Me C3 C4
	c1, c4 := math.Abs(o.Coefficient(o.HOMO, 0)), math.Abs(o.Coefficient(o.HOMO, 4))
	if c1 <= c4 {
		t.Errorf("isoprene HOMO |c1| = %.3f ≤ |c4| = %.3f", c1, c4)
	}
}

// Every molecule of a mixed table satisfies the eigen invariants through both solver paths.
func TestInvariantsOnMolecules(t *testing.T) {
	p := defaultParams(t)
	var s huckel.Solver
	var into huckel.Orbitals
	for _, smi := range []string{"C=CC=C", "c1ccncc1", "C=CC=O", "C=C(C)C=C", "c1ccc2cccc2cc1",
		"C=C[N+](=O)[O-]", "[N-]=[N+]=NC", "C=CC=[O+][B-](F)(F)F", "N1=NN=NC=C1", "COc1ccc(C=CC(=O)OC)cc1",
		"C1=CC=C[CH-]1", "C=C[CH2+]", "C=C.C=CC=C", "O=C1C=CC(=O)O1"} {
		ps := perceive(t, smi, p)
		o := mustSolve(t, ps)
		checkInvariants(t, smi, ps, o)
		if err := s.Solve(ps, &into); err != nil {
			t.Fatal(err)
		}
		checkInvariants(t, smi+" (Solver)", ps, &into)
	}
}

func TestLargeSystemWarns(t *testing.T) {
	smi := strings.Repeat("C=C", 151) // 302 centres
	ps := perceive(t, smi, noAlkyl(t))
	found := false
	for _, w := range ps.Warnings {
		found = found || strings.Contains(w, "O(n³)")
	}
	if len(ps.Centres) != 302 || !found {
		t.Errorf("%d centres, warnings %q", len(ps.Centres), ps.Warnings)
	}
}

// The bond-alternation variant (k = 0.9 single / 1.1 double): for the chain with weights
// a, b, a (a = 1.1 double, b = 0.9 single) the secular equation is
// x⁴ − (2a² + b²)x² + a⁴ = 0 (expansion of the 4×4 tridiagonal determinant), so the
// HOMO is x² = ((2a²+b²) − √((2a²+b²)² − 4a⁴))/2.
func TestBondOrderVariantButadiene(t *testing.T) {
	bo, err := presets.Params("streitwieser1961-bondorder")
	if err != nil {
		t.Fatal(err)
	}
	o := mustSolve(t, perceive(t, "C=CC=C", bo))
	k1, k2 := 0.9, 1.1
	b := 2*k2*k2 + k1*k1
	homo := math.Sqrt((b - math.Sqrt(b*b-4*k2*k2*k2*k2)) / 2)
	if !scalar.EqualWithinAbs(o.Levels[o.HOMO].X, homo, tolX) {
		t.Errorf("HOMO x = %.10f, want %.10f", o.Levels[o.HOMO].X, homo)
	}
}

// Coulson bond orders: butadiene p12 = 0.894, p23 = 0.447; benzene 0.667 (Coulson, Proc. R.
// Soc. A 1939, 169, 413; Streitwieser 1961, ch. 2). Gap of butadiene 2·0.618 = 1.236|β|.
func TestBondOrdersAndGap(t *testing.T) {
	p := noAlkyl(t)
	o := mustSolve(t, perceive(t, "C=CC=C", p))
	if !scalar.EqualWithinAbs(o.BondOrder(0, 1), 0.894, tolPub) || !scalar.EqualWithinAbs(o.BondOrder(1, 2), 0.447, tolPub) ||
		!scalar.EqualWithinAbs(o.BondOrder(0, 0), 1, tolQ) || o.BondOrder(0, 1) != o.BondOrder(1, 0) {
		t.Errorf("butadiene p12 %.4f p23 %.4f p11 %.4f", o.BondOrder(0, 1), o.BondOrder(1, 2), o.BondOrder(0, 0))
	}
	if g, ok := o.Gap(); !ok || !scalar.EqualWithinAbs(g, 1.236, tolPub) {
		t.Errorf("gap %g %v", g, ok)
	}
	bz := mustSolve(t, perceive(t, "c1ccccc1", p))
	for i := range 6 {
		if !scalar.EqualWithinAbs(bz.BondOrder(i, (i+1)%6), 2.0/3, tolQ) {
			t.Errorf("benzene p(%d,%d) = %g, want 2/3", i, (i+1)%6, bz.BondOrder(i, (i+1)%6))
		}
	}
}

// Qualitative frontier-orbital facts behind the ortho/para rule (Houk, J. Am. Chem. Soc.
// 1973, 95, 4092; Fleming 1976, ch. 4; Houk & Strozier, J. Am. Chem. Soc. 1973, 95, 4094
// for Lewis-acid complexation): which terminus carries the larger frontier coefficient.
func TestFrontierCoefficientFacts(t *testing.T) {
	p := defaultParams(t)
	tests := []struct {
		name, smiles string
		homo         bool // HOMO (true) or LUMO
		big, small   int  // atom indices: |c(big)| > |c(small)|
	}{
		{"1-methoxybutadiene HOMO: remote terminus C4", "C=CC=COC", true, 0, 3},
		{"2-methoxybutadiene HOMO: C1 next to C2–OMe", "C=C(OC)C=C", true, 0, 5},
		{"isoprene HOMO: C1 next to C2–Me", "C=C(C)C=C", true, 0, 4},
		{"piperylene HOMO: remote terminus", "C=CC=CC", true, 0, 3},
		{"methyl vinyl ether HOMO: β carbon", "C=COC", true, 0, 1},
		{"methyl acrylate LUMO: β carbon", "C=CC(=O)OC", false, 0, 1},
		{"acrylonitrile LUMO: β carbon", "C=CC#N", false, 0, 1},
		{"nitroethylene LUMO: β carbon", "C=C[N+](=O)[O-]", false, 0, 1},
		{"BF3–acrolein LUMO: β carbon", "C=CC=[O+][B-](F)(F)F", false, 0, 1},
	}
	for _, tc := range tests {
		o := mustSolve(t, perceive(t, tc.smiles, p))
		lv := o.LUMO
		if tc.homo {
			lv = o.HOMO
		}
		if o.Levels[lv].Degenerate != 1 {
			t.Errorf("%s: frontier level degenerate", tc.name)
			continue
		}
		b, s := math.Abs(o.Coefficient(lv, tc.big)), math.Abs(o.Coefficient(lv, tc.small))
		if b <= s {
			t.Errorf("%s: |c%d| = %.3f ≤ |c%d| = %.3f", tc.name, tc.big, b, tc.small, s)
		}
	}
	// Complexation lowers the LUMO and raises the β-carbon coefficient (Houk & Strozier 1973).
	free := mustSolve(t, perceive(t, "C=CC=O", p))
	bound := mustSolve(t, perceive(t, "C=CC=[O+][B-](F)(F)F", p))
	if bound.Levels[bound.LUMO].X <= free.Levels[free.LUMO].X ||
		math.Abs(bound.Coefficient(bound.LUMO, 0)) <= math.Abs(free.Coefficient(free.LUMO, 0)) {
		t.Errorf("BF3 complexation: LUMO x %.3f → %.3f, c(β) %.3f → %.3f",
			free.Levels[free.LUMO].X, bound.Levels[bound.LUMO].X, free.Coefficient(free.LUMO, 0), bound.Coefficient(bound.LUMO, 0))
	}
}

// Auxiliary inductive parameter δ = 0.1: in pyridine only C2 and C6 (bonded to N,
// h_N = 0.5) change, to h = 0.05 (Streitwieser 1961, ch. 5; from memory).
func TestAuxiliaryInductive(t *testing.T) {
	aux, err := presets.Params("streitwieser1961-aux")
	if err != nil {
		t.Fatal(err)
	}
	ps := perceive(t, "c1ccncc1", aux) // atoms 2 and 4 are bonded to N3
	for i, want := range []float64{0, 0, 0.05, 0.5, 0.05, 0} {
		if !scalar.EqualWithinAbs(ps.Centres[i].H, want, 1e-12) {
			t.Errorf("centre %d (%s): h = %g, want %g", i, ps.Centres[i].Type, ps.Centres[i].H, want)
		}
	}
	// Alkyl pseudo-atoms do not induce.
	ps = perceive(t, "C=CC", aux)
	if ps.Centres[1].H != 0 {
		t.Errorf("propene C2 h = %g, want 0", ps.Centres[1].H)
	}
}
