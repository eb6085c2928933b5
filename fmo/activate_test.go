package fmo

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

func mustParse(t testing.TB, s string) *molecule.Molecule {
	t.Helper()
	m, err := smiles.Parse(s)
	if err != nil {
		t.Fatalf("smiles.Parse(%q): %v", s, err)
	}
	return m
}

// TestActivateStructure checks the graph edits of each mode: which atom is changed, that
// atoms 0..n-1 keep their index and element (except the iminium O→N), and what is appended.
func TestActivateStructure(t *testing.T) {
	tests := []struct {
		smiles   string
		mode     string
		acceptor int    // atom that changes
		element  string // its element afterwards
		charge   int
		hcount   int
		added    int // atoms appended
		kind     string
		alpha    int
		beta     int
	}{
		{"C=CC=O", ActivateProton, 3, "O", 1, 1, 0, "aldehyde", 1, 0},
		{"C=CC=O", ActivateLewis, 3, "O", 1, 0, 4, "aldehyde", 1, 0},
		{"C=CC=O", ActivateIminium, 3, "N", 1, 0, 4, "aldehyde", 1, 0},
		{"C=CC(=O)OC", ActivateLewis, 3, "O", 1, 0, 4, "ester", 1, 0},
		{"C=CC(C)=O", ActivateProton, 4, "O", 1, 1, 0, "ketone", 1, 0},
		{"C/C=C/C=O", ActivateIminium, 4, "N", 1, 0, 4, "aldehyde", 2, 1},
		{"O=C/C=C/c1ccccc1", ActivateIminium, 0, "N", 1, 0, 4, "aldehyde", 2, 3},
		// maleic anhydride: two equivalent carbonyls, the first O by index (atom 0) wins.
		{"O=C1C=CC(=O)O1", ActivateLewis, 0, "O", 1, 0, 4, "anhydride", 2, 3},
		// the conjugated carbonyl wins over an earlier unconjugated one
		{"CC(=O)CCC(=O)C=C", ActivateProton, 6, "O", 1, 1, 0, "ketone", 7, 8},
		// an imine is protonated on N
		{"C=CC=NC", ActivateProton, 3, "N", 1, 1, 0, "imine", 1, 0},
		// a carbonyl that is not conjugated is still found when it is the only one (hetero-dienophile)
		{"O=CC(=O)OCC", ActivateLewis, 0, "O", 1, 0, 4, "aldehyde", -1, -1},
	}
	for _, tc := range tests {
		t.Run(tc.smiles+"/"+tc.mode, func(t *testing.T) {
			m := mustParse(t, tc.smiles)
			site, err := FindActivationSite(m, tc.mode)
			if err != nil {
				t.Fatal(err)
			}
			if site.Acceptor != tc.acceptor || site.Kind != tc.kind || site.Alpha != tc.alpha || site.Beta != tc.beta {
				t.Errorf("site = %+v, want acceptor %d kind %s alpha %d beta %d", site, tc.acceptor, tc.kind, tc.alpha, tc.beta)
			}
			act, _, err := Activate(m, tc.mode, nil)
			if err != nil {
				t.Fatal(err)
			}
			if got := len(act.Atoms) - len(m.Atoms); got != tc.added {
				t.Errorf("appended %d atoms, want %d", got, tc.added)
			}
			for i, a := range m.Atoms {
				b := act.Atoms[i]
				if i == tc.acceptor {
					if b.Element != tc.element || b.Charge != tc.charge || b.HCount != tc.hcount {
						t.Errorf("acceptor became %s charge %d H%d, want %s %d H%d", b.Element, b.Charge, b.HCount, tc.element, tc.charge, tc.hcount)
					}
					continue
				}
				if a.Element != b.Element || a.Charge != b.Charge || a.HCount != b.HCount {
					t.Errorf("atom %d changed: %+v -> %+v", i, a, b)
				}
			}
			// every original bond is still there between the same atoms, same order
			for _, b := range m.Bonds {
				j := act.BondBetween(b.A, b.B)
				if j < 0 || act.Bonds[j].Order != b.Order {
					t.Errorf("bond %d-%d lost or changed", b.A, b.B)
				}
			}
			// the input is untouched
			if m2 := mustParse(t, tc.smiles); len(m2.Atoms) != len(m.Atoms) || m.Atoms[tc.acceptor] != m2.Atoms[tc.acceptor] {
				t.Errorf("Activate modified its input")
			}
			checkValences(t, act)
		})
	}
}

// checkValences asserts that the activated graph has chemically sensible valences: C 4,
// neutral N 3, N+ 4, neutral O 2, O+ 3, B− 4, F 1 (counting bond orders and hydrogens).
func checkValences(t *testing.T, m *molecule.Molecule) {
	t.Helper()
	want := map[string]int{"C0": 4, "N0": 3, "N1": 4, "O0": 2, "O1": 3, "B-1": 4, "F0": 1}
	for i, a := range m.Atoms {
		key := fmt.Sprintf("%s%d", a.Element, a.Charge)
		w, ok := want[key]
		if !ok {
			continue
		}
		if v := m.Valence(i); v != w {
			t.Errorf("atom %d %s charge %d has valence %d, want %d", i, a.Element, a.Charge, v, w)
		}
	}
}

func TestActivateIminiumAmine(t *testing.T) {
	m := mustParse(t, "C/C=C/C=O")
	// dimethylamine: the appended atoms are its two carbons
	act, _, err := Activate(m, ActivateIminium, &ActivateOptions{Amine: mustParse(t, "CNC")})
	if err != nil {
		t.Fatal(err)
	}
	if len(act.Atoms) != len(m.Atoms)+2 || act.Degree(4) != 3 {
		t.Errorf("dimethyliminium: %d atoms, N degree %d; want %d atoms, degree 3", len(act.Atoms), act.Degree(4), len(m.Atoms)+2)
	}
	// a tertiary amine cannot form an iminium ion from an aldehyde
	_, _, err = Activate(m, ActivateIminium, &ActivateOptions{Amine: mustParse(t, "CN(C)C")})
	if !errors.Is(err, ErrBadAmine) {
		t.Errorf("tertiary amine: err = %v, want ErrBadAmine", err)
	}
}

func TestActivateErrors(t *testing.T) {
	for _, tc := range []struct {
		smiles, mode string
		want         error
		text         string
	}{
		{"C=C", ActivateLewis, ErrNothingToActivate, "dienophile ethylene has no carbonyl or imine to activate (use --activate none)"},
		{"C=CC#N", ActivateProton, ErrNothingToActivate, "no carbonyl or imine"},
		{"C=CC(=O)OC", ActivateIminium, ErrNothingToActivate, "no α,β-unsaturated aldehyde"},
		{"CCC=O", ActivateIminium, ErrNothingToActivate, "no α,β-unsaturated aldehyde"},            // saturated aldehyde: no C=C to activate
		{"O=C1C=CC(=O)C=C1", ActivateIminium, ErrNothingToActivate, "no α,β-unsaturated aldehyde"}, // quinone
		{"C=CC(=O)C(C)(C)C", ActivateIminium, ErrNothingToActivate, "unhindered enone"},            // hindered enone
		{"C=CC=O", "heat", ErrUnknownMode, `unknown activation mode "heat"`},
	} {
		m := mustParse(t, tc.smiles)
		if tc.smiles == "C=C" {
			m.Name = "ethylene"
		}
		_, _, err := Activate(m, tc.mode, nil)
		if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("Activate(%s, %s) = %v, want %v containing %q", tc.smiles, tc.mode, err, tc.want, tc.text)
		}
	}
}

func TestActivateWarnings(t *testing.T) {
	for _, tc := range []struct {
		smiles string
		want   []string // substrings, in order; nil = no warning
	}{
		{"C=CC=O", nil}, // acrolein: no α-H on sp3 carbon, aldehyde
		{"C=CC(=O)CC", []string{"ketone", "enamine"}}, // ethyl vinyl ketone: α-CH2
		{"C=CC(C)=O", []string{"ketone", "enamine"}},
		{"C/C=C/C=O", nil},
	} {
		_, w, err := Activate(mustParse(t, tc.smiles), ActivateIminium, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(w) != len(tc.want) {
			t.Errorf("%s: warnings %q, want %d matching %q", tc.smiles, w, len(tc.want), tc.want)
			continue
		}
		for i, s := range tc.want {
			if !strings.Contains(w[i], s) {
				t.Errorf("%s: warning %q lacks %q", tc.smiles, w[i], s)
			}
		}
	}
}

func TestDieneCautions(t *testing.T) {
	for _, tc := range []struct {
		smiles, mode, want string
	}{
		{"C=CC=C", ActivateLewis, ""},
		{"COC=CC=C", ActivateLewis, "enol ether"},
		{"CO/C=C/C(O[Si](C)(C)C)=C", ActivateProton, "enol ether, silyl enol ether"},
		{"C=CC=CN(C)C", ActivateLewis, "enamine"},
		{"COC=CC=C", ActivateNone, ""},
		{"c1ccoc1", ActivateLewis, ""}, // furan O is aromatic, not an enol ether here
	} {
		got := DieneCautions(mustParse(t, tc.smiles), tc.mode)
		if tc.want == "" {
			if len(got) != 0 {
				t.Errorf("%s/%s: cautions %q, want none", tc.smiles, tc.mode, got)
			}
			continue
		}
		if len(got) != 1 || !strings.Contains(got[0], tc.want) {
			t.Errorf("%s/%s: cautions %q, want one naming %q", tc.smiles, tc.mode, got, tc.want)
		}
	}
}

func defaultOpts(t testing.TB) *Options {
	t.Helper()
	o, err := DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	return o
}

// TestActivationHoukStrozier checks the three trends K. N. Houk and R. W. Strozier (J. Am.
// Chem. Soc. 1973, 95, 4094) gave for Lewis-acid (and proton) complexation of α,β-unsaturated
// carbonyl dienophiles: the LUMO is lowered, its coefficient at the β-carbon grows relative
// to the α-carbon (c²(Cβ) − c²(Cα) increases: higher regioselectivity), and the LUMO
// coefficient at the carbonyl carbon — the secondary (endo) contact — grows. Cyclopentadiene
// is the diene for the endo term.
func TestActivationHoukStrozier(t *testing.T) {
	opts := defaultOpts(t)
	cp, err := NewPartner("cyclopentadiene", "C1=CCC=C1", RoleDiene, opts)
	if err != nil {
		t.Fatal(err)
	}
	for _, d := range []struct{ name, smiles string }{
		{"acrolein", "C=CC=O"},
		{"methyl acrylate", "C=CC(=O)OC"},
		{"methyl vinyl ketone", "C=CC(C)=O"},
		{"crotonaldehyde", "C/C=C/C=O"},
	} {
		free, err := NewPartner(d.name, d.smiles, RoleDienophile, opts)
		if err != nil {
			t.Fatal(err)
		}
		vs := AnalyzeVariants(cp, free, []string{ActivateNone, ActivateLewis, ActivateProton}, nil, opts)
		if len(vs) != 3 {
			t.Fatalf("%d variants", len(vs))
		}
		if vs[0].Err != nil || vs[0].Pair.Activated != nil {
			t.Errorf("%s none: err %v, effect %+v (want no effect on the free variant)", d.name, vs[0].Err, vs[0].Pair.Activated)
		}
		for _, v := range vs[1:] {
			if v.Err != nil {
				t.Errorf("%s %s: %v", d.name, v.Mode, v.Err)
				continue
			}
			e := v.Pair.Activated
			const tol = 1e-6 // |β|; a real change is orders of magnitude larger
			if e == nil || e.LUMOLowering.Beta <= tol {
				t.Errorf("%s %s: LUMO lowering %+v, want > 0", d.name, v.Mode, e)
				continue
			}
			if e.BetaAsymmetry <= e.BetaAsymmetryFree+tol {
				t.Errorf("%s %s: β-carbon asymmetry %.4f, free %.4f: want an increase", d.name, v.Mode, e.BetaAsymmetry, e.BetaAsymmetryFree)
			}
			if e.BetaAsymmetryFree <= 0 {
				t.Errorf("%s: free LUMO asymmetry %.4f, want the β-carbon larger already (Houk 1973)", d.name, e.BetaAsymmetryFree)
			}
			// Houk–Strozier's endo argument: the LUMO coefficient at the carbonyl carbon grows.
			if e.CarbonylLUMO <= e.CarbonylLUMOFree+tol {
				t.Errorf("%s %s: c² at the carbonyl carbon %.4f, free %.4f: want an increase", d.name, v.Mode, e.CarbonylLUMO, e.CarbonylLUMOFree)
			}
			// Houk–Strozier's endo argument carried to the pair: the secondary-orbital term
			// (in the controlling HOMO(diene)–LUMO(dienophile) pairing) grows on activation
			// (J. Sauer, J. Kredel, Tetrahedron Lett. 1966, 7, 731, for the higher endo
			// selectivity of Lewis-acid catalysis; from memory).
			if e.EndoChange <= tol {
				t.Errorf("%s %s: endo change %.4f |β|, want an increase", d.name, v.Mode, e.EndoChange)
			}
			if v.Pair.Activation != v.Mode || v.Pair.ActivatedDienophile == "" {
				t.Errorf("%s %s: pair activation %q, activated %q", d.name, v.Mode, v.Pair.Activation, v.Pair.ActivatedDienophile)
			}
			t.Logf("%-20s %-6s LUMO lowered %.3f |β|, asym %.3f → %.3f, c²(C=O) %.3f → %.3f, endo %+.4f", d.name, v.Mode, e.LUMOLowering.Beta, e.BetaAsymmetryFree, e.BetaAsymmetry, e.CarbonylLUMOFree, e.CarbonylLUMO, e.EndoChange)
		}
		// protonation (O+, h 2.5) is the stronger perturbation than the default Lewis acid (O=LA, h 2.0)
		if vs[1].Err == nil && vs[2].Err == nil && vs[2].Pair.Activated.LUMOLowering.Beta <= vs[1].Pair.Activated.LUMOLowering.Beta {
			t.Errorf("%s: proton lowers the LUMO by %.3f, Lewis acid by %.3f: want proton > lewis with h(O+=) > h(O=LA)", d.name,
				vs[2].Pair.Activated.LUMOLowering.Beta, vs[1].Pair.Activated.LUMOLowering.Beta)
		}
	}
}

// TestActivationIminium: iminium formation lowers the LUMO of enals (K. A. Ahrendt,
// C. J. Borths, D. W. C. MacMillan, J. Am. Chem. Soc. 2000, 122, 4243: LUMO-lowering
// organocatalysis of the Diels–Alder reaction with cinnamaldehyde and crotonaldehyde
// iminium ions), and products still come from the unactivated aldehyde.
func TestActivationIminium(t *testing.T) {
	opts := defaultOpts(t)
	cp, err := NewPartner("cyclopentadiene", "C1=CCC=C1", RoleDiene, opts)
	if err != nil {
		t.Fatal(err)
	}
	for _, d := range []struct{ name, smiles string }{
		{"cinnamaldehyde", "O=C/C=C/c1ccccc1"},
		{"crotonaldehyde", "C/C=C/C=O"},
	} {
		free, err := NewPartner(d.name, d.smiles, RoleDienophile, opts)
		if err != nil {
			t.Fatal(err)
		}
		vs := AnalyzeVariants(cp, free, []string{ActivateIminium}, nil, opts)
		if vs[0].Err != nil {
			t.Fatalf("%s: %v", d.name, vs[0].Err)
		}
		p := vs[0].Pair
		if e := p.Activated; e == nil || e.LUMOLowering.Beta <= 0 {
			t.Errorf("%s iminium: effect %+v, want the LUMO lowered", d.name, p.Activated)
		}
		// the product is the aldehyde adduct: no N in it
		if prod := p.Orientations[0].Product; strings.Contains(prod, "N") {
			t.Errorf("%s iminium: product %s carries the amine", d.name, prod)
		}
	}
}

// TestActivationVariantErrors: a dienophile without a carbonyl gets a clear error for the
// activated variants while the free variant is still analysed.
func TestActivationVariantErrors(t *testing.T) {
	opts := defaultOpts(t)
	cp, _ := NewPartner("cyclopentadiene", "C1=CCC=C1", RoleDiene, opts)
	eth, err := NewPartner("ethylene", "C=C", RoleDienophile, opts)
	if err != nil {
		t.Fatal(err)
	}
	vs := AnalyzeVariants(cp, eth, []string{ActivateNone, ActivateLewis}, nil, opts)
	if vs[0].Err != nil || vs[0].Pair == nil {
		t.Errorf("free ethylene: %v", vs[0].Err)
	}
	if !errors.Is(vs[1].Err, ErrNothingToActivate) || !strings.Contains(vs[1].Err.Error(), "dienophile ethylene has no carbonyl or imine to activate (use --activate none)") {
		t.Errorf("lewis ethylene: err = %v", vs[1].Err)
	}
}

// TestLewisStrength: a larger h(O=LA) lowers the LUMO further (monotone in the strength).
func TestLewisStrength(t *testing.T) {
	opts := defaultOpts(t)
	free, err := NewPartner("acrolein", "C=CC=O", RoleDienophile, opts)
	if err != nil {
		t.Fatal(err)
	}
	prev := math.Inf(-1)
	for _, h := range []float64{1.5, 2.0, 2.5, 3.0} {
		ap, err := free.WithActivation(ActivateLewis, &ActivateOptions{LewisStrength: h}, opts)
		if err != nil {
			t.Fatal(err)
		}
		e := Effect(free, ap, ActivateLewis, nil, nil, opts)
		if e.LUMOLowering.Beta <= prev {
			t.Errorf("h(O=LA) = %.1f: LUMO lowering %.4f not above %.4f", h, e.LUMOLowering.Beta, prev)
		}
		prev = e.LUMOLowering.Beta
	}
	if got := LewisParams(opts.Params, 0); got != opts.Params {
		t.Errorf("LewisParams(h=0) must return the base set unchanged")
	}
}

// Activation keeps the atoms of the input at their indices and appends the Lewis acid (drawn
// as BF3), so bonds found on the activated molecule map back to the user's SMILES.
func ExampleActivate() {
	m, _ := smiles.Parse("C=CC=O") // acrolein
	act, warnings, err := Activate(m, ActivateLewis, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(smiles.Write(act), len(act.Atoms)-len(m.Atoms), "atoms appended,", len(warnings), "warnings")
	site, _ := FindActivationSite(m, ActivateLewis)
	fmt.Printf("complexed O %d, carbonyl C %d, α-C %d, β-C %d (%s)\n", site.Acceptor, site.Carbon, site.Alpha, site.Beta, site.Kind)

	_, _, err = Activate(mustParseExample("C=C"), ActivateLewis, nil)
	fmt.Println(err)
	// Output:
	// C=CC=[O+][B-](F)(F)F 4 atoms appended, 0 warnings
	// complexed O 3, carbonyl C 2, α-C 1, β-C 0 (aldehyde)
	// dienophile C=C has no carbonyl or imine to activate (use --activate none): nothing to activate
}

func mustParseExample(s string) *molecule.Molecule {
	m, err := smiles.Parse(s)
	if err != nil {
		panic(err)
	}
	m.Source = s
	return m
}

// TestActivationDieneCaution: an activated variant with an enol-ether diene carries the
// acid-sensitivity caution; the free variant does not.
func TestActivationDieneCaution(t *testing.T) {
	opts := defaultOpts(t)
	d, err := NewPartner("1-methoxybutadiene", "CO/C=C/C=C", RoleDiene, opts)
	if err != nil {
		t.Fatal(err)
	}
	e, _ := NewPartner("acrolein", "C=CC=O", RoleDienophile, opts)
	vs := AnalyzeVariants(d, e, []string{ActivateNone, ActivateLewis}, nil, opts)
	has := func(p *Pair) bool {
		for _, w := range p.Warnings {
			if strings.Contains(w, "acid-sensitive donor group (enol ether)") {
				return true
			}
		}
		return false
	}
	if has(vs[0].Pair) || !has(vs[1].Pair) {
		t.Errorf("caution on free %v, on lewis %v; want only on lewis: %q", has(vs[0].Pair), has(vs[1].Pair), vs[1].Pair.Warnings)
	}
}
