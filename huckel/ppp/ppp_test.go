package ppp_test

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"cyclopair/huckel"
	"cyclopair/huckel/depict"
	"cyclopair/huckel/ppp"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
	"cyclopair/presets/literature"

	"go.yaml.in/yaml/v3"
	"gonum.org/v1/gonum/mat"
)

// Named tolerances.
const (
	closedFormTol = 1e-6 // eV: SCF levels against closed forms (converged in one cycle)
	idemTol       = 1e-9 // electrons: P² = 2P for a closed shell
	densityTol    = 1e-4 // electrons: density rebuilt from the returned levels vs BondOrders (10·ppp.DensityTol)
	brillouinTol  = 1e-3 // eV·electron: max|FP − PF| of the converged density
	coulsonTol    = 1e-4 // electrons / eV: uniform charges and pairing in alternant hydrocarbons
)

var _ huckel.Method = (*ppp.Solver)(nil)
var _ huckel.Method = (*huckel.Solver)(nil)

func params(t testing.TB) (*huckel.Params, *ppp.Params) {
	t.Helper()
	hp, err := presets.Params(presets.DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	pp, err := presets.PPPParams(presets.DefaultPPP)
	if err != nil {
		t.Fatal(err)
	}
	return hp, pp
}

func solve(t testing.TB, smi string, hp *huckel.Params, s *ppp.Solver) (*huckel.PiSystem, *huckel.Orbitals) {
	t.Helper()
	m, err := smiles.Parse(smi)
	if err != nil {
		t.Fatal(err)
	}
	ps, err := huckel.Perceive(m, hp)
	if err != nil {
		t.Fatalf("%s: %v", smi, err)
	}
	o := new(huckel.Orbitals)
	if err := s.Solve(ps, o); err != nil {
		t.Fatalf("%s: %v", smi, err)
	}
	return ps, o
}

// TestClosedForms: for ethylene and benzene the SCF orbitals are fixed by symmetry, so the
// PPP levels have closed forms (J. A. Pople, Trans. Faraday Soc. 1953, 49, 1375; the
// circulant form for benzene as in R. Pariser, R. G. Parr, J. Chem. Phys. 1953, 21, 767):
// ethylene ε = U + γ₁₁/2 ± (β − γ₁₂/2); benzene (P₁₂ = 2/3, P₁₃ = 0, P₁₄ = −1/3)
// ε_k = U + γ₁₁/2 + 2(β − γ₁₂/3)cos(πk/3) + (γ₁₄/6)cos(πk).
func TestClosedForms(t *testing.T) {
	_, pp := params(t)
	s := ppp.NewSolver(pp)
	c, _ := pp.Lookup(huckel.CSp2)
	alpha := -c.IP + c.Gamma/2
	r := 1.397
	// Ethylene at r.
	eth := huckel.NewPiSystem([]huckel.Centre{{Atom: 0, Type: huckel.CSp2, Electrons: 1}, {Atom: 1, Type: huckel.CSp2, Electrons: 1}},
		[]huckel.PiBond{{I: 0, J: 1, K: 1}})
	var o huckel.Orbitals
	if err := s.SolveAt(eth, []depict.Point{{X: 0}, {X: r}}, &o); err != nil {
		t.Fatal(err)
	}
	b := pp.Beta(r) - pp.GammaIJ(c.Gamma, c.Gamma, r)/2
	if got, want := o.Levels[0].EV, alpha+b; math.Abs(got-want) > closedFormTol {
		t.Errorf("ethylene π: %.8f eV, closed form %.8f", got, want)
	}
	if got, want := o.Levels[1].EV, alpha-b; math.Abs(got-want) > closedFormTol {
		t.Errorf("ethylene π*: %.8f eV, closed form %.8f", got, want)
	}
	// Benzene: regular hexagon of side r.
	var cs []huckel.Centre
	var bs []huckel.PiBond
	var xy []depict.Point
	for i := 0; i < 6; i++ {
		cs = append(cs, huckel.Centre{Atom: i, Type: huckel.CSp2, Electrons: 1})
		bs = append(bs, huckel.PiBond{I: i, J: (i + 1) % 6, K: 1})
		a := float64(i) * math.Pi / 3
		xy = append(xy, depict.Point{X: r * math.Cos(a), Y: r * math.Sin(a)})
	}
	bz := huckel.NewPiSystem(cs, bs)
	if err := s.SolveAt(bz, xy, &o); err != nil {
		t.Fatal(err)
	}
	g12, g14 := pp.GammaIJ(c.Gamma, c.Gamma, r), pp.GammaIJ(c.Gamma, c.Gamma, 2*r)
	want := func(k int) float64 {
		return alpha + 2*(pp.Beta(r)-g12/3)*math.Cos(math.Pi*float64(k)/3) + g14/6*math.Cos(math.Pi*float64(k))
	}
	for li, k := range []int{0, 1, 1, 2, 2, 3} {
		if got := o.Levels[li].EV; math.Abs(got-want(k)) > closedFormTol {
			t.Errorf("benzene level %d: %.8f eV, closed form %.8f", li, got, want(k))
		}
	}
	if o.Levels[o.HOMO].Degenerate != 2 || o.Levels[o.LUMO].Degenerate != 2 {
		t.Errorf("benzene frontier levels should be doubly degenerate: %d, %d", o.Levels[o.HOMO].Degenerate, o.Levels[o.LUMO].Degenerate)
	}
}

// TestBenzeneSinglets: singles CI on the PPP orbitals of benzene gives the three lowest
// singlet π→π* states in the order ¹B₂ᵤ < ¹B₁ᵤ < ¹E₁ᵤ (the degenerate pair), the result
// of R. Pariser, J. Chem. Phys. 1956, 24, 250 and of the PPP method with Mataga–Nishimoto
// γ (N. Mataga, K. Nishimoto 1957), which was built to reproduce the gas-phase bands
// 4.90, 6.20 and 6.94 eV (J. N. Murrell, A. J. Harget, Semi-empirical SCF MO theory of
// molecules, 1972; values from memory). Tolerance 0.5 eV per band: PPP-CIS values
// recalled within a few tenths of an eV of experiment (from memory).
func TestBenzeneSinglets(t *testing.T) {
	hp, pp := params(t)
	s := ppp.NewSolver(pp)
	ps, o := solve(t, "c1ccccc1", hp, s)
	xy, err := ppp.Geometry(ps, pp)
	if err != nil {
		t.Fatal(err)
	}
	e := singlesCI(o, pp, xy)
	if len(e) < 4 {
		t.Fatalf("%d singlet states", len(e))
	}
	for i, want := range []float64{4.90, 6.20, 6.94, 6.94} {
		if math.Abs(e[i]-want) > 0.5 {
			t.Errorf("singlet %d: %.2f eV, experiment %.2f eV", i+1, e[i], want)
		}
	}
	if math.Abs(e[2]-e[3]) > 1e-6 {
		t.Errorf("¹E₁ᵤ pair not degenerate: %.6f, %.6f", e[2], e[3])
	}
	t.Logf("PPP-CIS benzene singlets: %.2f, %.2f, %.2f eV (exp. 4.90, 6.20, 6.94)", e[0], e[1], e[2])
}

// singlesCI returns the singlet excitation energies (ascending) of a closed-shell PPP
// solution: A_{ia,jb} = δ(ε_a − ε_i) + 2(ia|jb) − (ij|ab) with ZDO integrals
// (pq|rs) = Σ_μν c_μp c_μq γ_μν c_νr c_νs.
func singlesCI(o *huckel.Orbitals, pp *ppp.Params, xy []depict.Point) []float64 {
	n := len(o.Pi.Centres)
	g := make([]float64, n*n)
	for i := range n {
		gi, _ := pp.Lookup(o.Pi.Centres[i].Type)
		for j := range n {
			gj, _ := pp.Lookup(o.Pi.Centres[j].Type)
			g[i*n+j] = pp.GammaIJ(gi.Gamma, gj.Gamma, math.Hypot(xy[i].X-xy[j].X, xy[i].Y-xy[j].Y))
		}
	}
	var occ, vir []int
	for k, l := range o.Levels {
		if l.Occupancy == 2 {
			occ = append(occ, k)
		} else {
			vir = append(vir, k)
		}
	}
	eri := func(p, q, r, s int) float64 {
		v := 0.0
		for mu := range n {
			a := o.Levels[p].Coeffs[mu] * o.Levels[q].Coeffs[mu]
			for nu := range n {
				v += a * g[mu*n+nu] * o.Levels[r].Coeffs[nu] * o.Levels[s].Coeffs[nu]
			}
		}
		return v
	}
	dim := len(occ) * len(vir)
	a := mat.NewSymDense(dim, nil)
	for x, i := range occ {
		for y, av := range vir {
			for x2, j := range occ {
				for y2, b := range vir {
					r, c := x*len(vir)+y, x2*len(vir)+y2
					if c < r {
						continue
					}
					v := 2*eri(i, av, j, b) - eri(i, j, av, b)
					if r == c {
						v += o.Levels[av].EV - o.Levels[i].EV
					}
					a.SetSym(r, c, v)
				}
			}
		}
	}
	var es mat.EigenSym
	es.Factorize(a, false)
	return es.Values(nil)
}

// TestSCFInvariants checks, on molecules of several kinds, the properties every converged
// closed-shell SCF solution has (C. C. J. Roothaan, Rev. Mod. Phys. 1951, 23, 69):
// idempotent density (P² = 2P in the orthonormal ZDO basis), the density rebuilt from the
// returned occupied levels equal to BondOrders, the Brillouin condition (FP − PF ≈ 0, and
// the returned levels diagonalise F), populations summing to the electron count, and the
// variational principle: the energy of every cycle's (idempotent) density is not below the
// converged energy.
func TestSCFInvariants(t *testing.T) {
	hp, pp := params(t)
	for _, smi := range []string{"C=CC=O", "C=CC(=O)OC", "c1ccncc1", "c1ccoc1", "c1ccc2cccc-2cc1",
		"C=[N+]=[N-]", "C=CC=[OH+]", "C=Cc1ccccc1", "N#CC(C#N)=C(C#N)C#N", "O=C1C=CC(=O)O1", "COc1ccc(/C=C/C(=O)c2ccc(N(C)C)cc2)cc1"} {
		var trace []float64
		s := ppp.NewSolver(pp)
		s.Trace = &trace
		ps, o := solve(t, smi, hp, s)
		n := len(ps.Centres)
		st := s.Stats()
		// Idempotency per fragment (P is block diagonal).
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				v := 0.0
				for k := 0; k < n; k++ {
					v += o.BondOrder(i, k) * o.BondOrder(k, j)
				}
				if d := math.Abs(v - 2*o.BondOrder(i, j)); d > idemTol {
					t.Errorf("%s: (P²−2P)[%d][%d] = %.2g", smi, i, j, d)
				}
			}
		}
		// Density from the levels, populations, Brillouin.
		pop := 0.0
		f := s.Fock()
		for i := 0; i < n; i++ {
			pop += o.BondOrder(i, i)
			for j := 0; j < n; j++ {
				v := 0.0
				for _, l := range o.Levels {
					v += l.Occupancy * l.Coeffs[i] * l.Coeffs[j]
				}
				if d := math.Abs(v - o.BondOrder(i, j)); d > densityTol {
					t.Errorf("%s: density from levels differs at [%d][%d] by %.2g", smi, i, j, d)
				}
			}
		}
		if math.Abs(pop-float64(o.Electrons)) > idemTol || o.Electrons != ps.Electrons() {
			t.Errorf("%s: populations sum to %.10f, %d electrons", smi, pop, ps.Electrons())
		}
		q := 0.0
		for i, c := range ps.Centres {
			q += o.Charges[i] - float64(c.Electrons+c.FormalCharge) + o.BondOrder(i, i)
		}
		if math.Abs(q) > idemTol {
			t.Errorf("%s: charges inconsistent with populations by %.2g", smi, q)
		}
		if st.Brillouin > brillouinTol {
			t.Errorf("%s: max|FP − PF| = %.2g", smi, st.Brillouin)
		}
		for _, li := range []int{o.HOMO} {
			for _, la := range []int{o.LUMO} {
				v := 0.0
				for i := 0; i < n; i++ {
					for j := 0; j < n; j++ {
						v += o.Levels[li].Coeffs[i] * f[i*n+j] * o.Levels[la].Coeffs[j]
					}
				}
				if math.Abs(v) > brillouinTol {
					t.Errorf("%s: HOMO–LUMO Fock element %.2g eV", smi, v)
				}
			}
		}
		for k, e := range trace {
			if e < st.EnergyEV-ppp.EnergyTol {
				t.Errorf("%s: cycle %d energy %.8f below the converged %.8f", smi, k, e, st.EnergyEV)
			}
		}
		if len(trace) > 1 && trace[0] < trace[len(trace)-1] {
			t.Errorf("%s: SCF raised the energy from the Hückel start", smi)
		}
	}
}

// TestAlternantPairing: in PPP-SCF the Coulson–Rushbrooke theorem holds for alternant
// hydrocarbons with equal carbon parameters — all π populations 1 and levels paired
// symmetrically about α_C = U + γ/2 (J. A. Pople, Trans. Faraday Soc. 1953, 49, 1375;
// A. D. McLachlan, Mol. Phys. 1959, 2, 271). Azulene (non-alternant) is the control.
func TestAlternantPairing(t *testing.T) {
	hp, pp := params(t)
	s := ppp.NewSolver(pp)
	for _, smi := range []string{"C=CC=C", "C=CC=CC=C", "C=Cc1ccccc1", "c1ccc2ccccc2c1", "c1ccc2cc3ccccc3cc2c1", "C=CC(=C)C=C"} {
		ps, o := solve(t, smi, hp, s)
		n := len(ps.Centres)
		for i := range ps.Centres {
			if math.Abs(o.Charges[i]) > coulsonTol {
				t.Errorf("%s: centre %d charge %.2g", smi, i, o.Charges[i])
			}
		}
		for k := 0; k < n/2; k++ {
			if d := o.Levels[k].EV + o.Levels[n-1-k].EV - 2*pp.AlphaEV(); math.Abs(d) > coulsonTol {
				t.Errorf("%s: levels %d and %d not paired about α (off by %.2g eV)", smi, k, n-1-k, d)
			}
		}
	}
	ps, o := solve(t, "c1ccc2cccc-2cc1", hp, s)
	paired := true
	for k := 0; k < len(ps.Centres)/2; k++ {
		paired = paired && math.Abs(o.Levels[k].EV+o.Levels[len(ps.Centres)-1-k].EV-2*pp.AlphaEV()) < coulsonTol
	}
	if paired {
		t.Error("azulene (non-alternant) came out paired")
	}
}

// TestPresetsConverge runs the SCF over every molecule the project ships: named
// substrates, the demo (which uses them), both partners of every literature case, the
// calibration points and the π-level references, each free and in the activated forms
// the activation step builds (protonated carbonyl, Lewis-acid complex drawn with BF₃,
// pyrrolidine iminium), written here as SMILES. Each must converge, or fail with a clear
// error (ErrNoConvergence or a missing parameter) naming the molecule; the counts are
// logged.
func TestPresetsConverge(t *testing.T) {
	hp, pp := params(t)
	seen := map[string]bool{}
	var list []string
	add := func(smi string) {
		if smi != "" && !seen[smi] {
			seen[smi] = true
			list = append(list, smi)
		}
	}
	for _, sub := range presets.Substrates() {
		add(sub.SMILES)
	}
	var cases struct {
		Cases []struct {
			Diene, Dienophile struct{ SMILES string }
		}
	}
	if err := yaml.Unmarshal(literature.CasesYAML, &cases); err != nil {
		t.Fatal(err)
	}
	for _, c := range cases.Cases {
		add(c.Diene.SMILES)
		add(c.Dienophile.SMILES)
	}
	cal, err := presets.CalibrationEntries()
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range cal {
		add(e.SMILES)
	}
	refs, err := presets.PiLevelReferences()
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range refs {
		add(r.SMILES)
	}
	for _, smi := range []string{"C=CC=O", "C=CC(=O)OC", "C=CC(C)=O", "O=C1C=CC(=O)O1", "O=C1C=CC(=O)C=C1", "O=Cc1ccccc1"} {
		add(strings.Replace(smi, "=O", "=[OH+]", 1))
		add(strings.Replace(smi, "=O", "=[O+][B-](F)(F)F", 1))
	}
	add("C=CC=[N+]1CCCC1")
	add("CC(=[N+]1CCCC1)C=C")
	s := ppp.NewSolver(pp)
	var o huckel.Orbitals
	ok, perceiveFail, noConv, noParam := 0, 0, 0, 0
	for _, smi := range list {
		m, err := smiles.Parse(smi)
		if err != nil {
			t.Errorf("%s: %v", smi, err)
			continue
		}
		ps, err := huckel.Perceive(m, hp)
		if err != nil {
			perceiveFail++
			t.Logf("%s: Hückel perception fails too: %v", smi, err)
			continue
		}
		err = s.Solve(ps, &o)
		switch {
		case err == nil:
			ok++
		case errors.Is(err, ppp.ErrNoConvergence):
			noConv++
			if !strings.Contains(err.Error(), smi) {
				t.Errorf("error does not name the molecule: %v", err)
			}
			t.Logf("no convergence: %v", err)
		case errors.Is(err, huckel.ErrNoParameter):
			noParam++
			t.Logf("missing parameter: %v", err)
		default:
			t.Errorf("%s: %v", smi, err)
		}
	}
	t.Logf("%d molecules: %d converged, %d no convergence, %d missing PPP parameter, %d not perceived", len(list), ok, noConv, noParam, perceiveFail)
	if ok+noConv+noParam+perceiveFail != len(list) || noParam > 0 {
		t.Errorf("every molecule must converge or fail cleanly; %d lack PPP parameters", noParam)
	}
}

// TestErrorsNameMolecule: a missing PPP parameter and an SCF that does not converge give
// errors that wrap the sentinels and name the molecule and atom (the CLI prints them as
// one line).
func TestErrorsNameMolecule(t *testing.T) {
	hp, pp := params(t)
	var o huckel.Orbitals
	bad := pp.Merge(&ppp.Params{Replace: true, Name: "tiny", Gamma: ppp.GammaOhno, GammaSource: "test", Beta0: -2.39, R0: 1.397, Zeta: 1.625, BondLength: 1.4,
		Centres: []ppp.Centre{{Type: huckel.CSp2, IP: 11.16, Gamma: 11.13, Z: 1, Source: "test"}}})
	m, _ := smiles.Parse("C=CC=O")
	ps, err := huckel.Perceive(m, hp)
	if err != nil {
		t.Fatal(err)
	}
	err = ppp.NewSolver(bad).Solve(ps, &o)
	if !errors.Is(err, huckel.ErrNoParameter) || !strings.Contains(err.Error(), "C=CC=O") || !strings.Contains(err.Error(), "atom 3") {
		t.Errorf("missing O= parameter: got %v", err)
	}
	defer ppp.SetMaxIter(2)()
	err = ppp.NewSolver(pp).Solve(ps, &o)
	if !errors.Is(err, ppp.ErrNoConvergence) || !strings.Contains(err.Error(), "C=CC=O") {
		t.Errorf("two-cycle cap: got %v", err)
	}
}

// TestParamsFile: the YAML loader is strict and positioned, and a user file overrides
// entries of its base set.
func TestParamsFile(t *testing.T) {
	_, pp := params(t)
	for _, tc := range []struct{ in, want string }{
		{"name: x\nbogus: 1\n", "user.yaml: 2:1: unknown key \"bogus\""},
		{"base: ppp-hinze1962\ncentres:\n  - {type: C, ip: 11, gamma: 11, z: 1}\n", "missing source"},
		{"base: ppp-hinze1962\ncentres:\n  - {type: Q, ip: 11, gamma: 11, z: 1, source: s}\n", "unknown centre type"},
		{"gamma: slater\ngamma_source: s\n", "unknown gamma formula"},
		{"name: lone\nbeta: {value: -2.39, r0: 1.397, zeta: 1.625, source: s}\n", "incomplete parameter set"},
		{"centres: &a []\nx: *a\n", "aliases"},
	} {
		_, err := ppp.Parse([]byte(tc.in), "user.yaml")
		if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, huckel.ErrParams) {
			t.Errorf("%q: got %v, want an ErrParams mentioning %q", tc.in, err, tc.want)
		}
	}
	user, err := ppp.Parse([]byte("base: ppp-hinze1962\ngamma: ohno\ngamma_source: test\ncentres:\n  - {type: \"O=LA\", ip: 20, gamma: 16, z: 1.2, source: \"assumed: test\"}\n"), "user.yaml")
	if err != nil {
		t.Fatal(err)
	}
	m, err := presets.ResolvePPP(user)
	if err != nil {
		t.Fatal(err)
	}
	la, _ := m.Lookup(huckel.OLewis)
	c, _ := m.Lookup(huckel.CSp2)
	if la.IP != 20 || m.Gamma != ppp.GammaOhno || c.IP != 11.16 || m.Beta0 != pp.Beta0 {
		t.Errorf("override: O=LA ip %g, gamma %s, C ip %g, β0 %g", la.IP, m.Gamma, c.IP, m.Beta0)
	}
	if pl, _ := pp.Lookup(huckel.OLewis); pl.IP == 20 {
		t.Error("Merge modified the built-in set")
	}
}

// TestParamsCoverPerception: the built-in set has an entry, with a source, for every
// centre type huckel.Perceive assigns (N+: is declared but never assigned), and its core
// charge is the centre's electrons plus formal charge — the rule the charges follow —
// except the Lewis-acid-bound O, whose fractional core charge is the stated supplement.
func TestParamsCoverPerception(t *testing.T) {
	_, pp := params(t)
	elec := map[huckel.CentreType]float64{huckel.CSp2: 1, huckel.CCation: 1, huckel.CAnion: 1, huckel.CSp: 1,
		huckel.NPyridine: 1, huckel.NPyrrole: 2, huckel.NIminium: 2, huckel.NNitro: 2, huckel.NNitrile: 1,
		huckel.NSpCation: 2, huckel.NAnion: 1, huckel.OCarbonyl: 1, huckel.OEther: 2, huckel.OOxonium: 2,
		huckel.OAnion: 1, huckel.ONitro: 1, huckel.SThio: 2, huckel.SThione: 1, huckel.Fluoro: 2, huckel.Chloro: 2,
		huckel.Bromo: 2, huckel.Iodo: 2, huckel.Boron: 0, huckel.Alkyl: 2}
	for _, ty := range huckel.AllCentreTypes {
		if ty == huckel.NAmmonioA {
			continue
		}
		c, ok := pp.Lookup(ty)
		if !ok || c.Source == "" {
			t.Errorf("type %s: no entry with a source", ty)
			continue
		}
		if z, ok := elec[ty]; ok && c.Z != z {
			t.Errorf("type %s: z = %g, electrons + formal charge = %g", ty, c.Z, z)
		}
	}
}

// TestIonisationFigures compares HOMO energies with the bundled gas-phase π ionisation
// energies and LUMO energies with electron affinities / attachment energies
// (presets/reference/pi-levels.yaml, sources per row): PPP by Koopmans' theorem with no
// fit, Hückel through a linear calibration fitted on the same rows. The figures are
// logged; the assertions pin the measured figures (a regression guard, not a goal — the
// goal r² ≥ 0.9 for π ionisations is not reached, see DEVELOPERS.md).
func TestIonisationFigures(t *testing.T) {
	hp, pp := params(t)
	refs, err := presets.PiLevelReferences()
	if err != nil {
		t.Fatal(err)
	}
	c, err := ppp.Compare(refs, hp, pp)
	if err != nil {
		t.Fatal(err)
	}
	t.Log("\n" + c.Summary())
	if c.PPPHOMO.N < 40 || c.PPPLUMO.N < 15 || len(c.Failed) > 0 {
		t.Errorf("references: %d HOMO, %d LUMO, failed %v", c.PPPHOMO.N, c.PPPLUMO.N, c.Failed)
	}
	if c.PPPHOMO.PearsonR2 < 0.55 || c.PPPHOMO.RMSE > 1.2 || c.PPPHOMO.PearsonR2 <= c.HuckelHOMO.R2 {
		t.Errorf("PPP HOMO figures moved: correlation r² %.3f, RMSE %.2f (Hückel r² %.3f)", c.PPPHOMO.PearsonR2, c.PPPHOMO.RMSE, c.HuckelHOMO.R2)
	}
	if c.PPPLUMO.PearsonR2 < 0.85 {
		t.Errorf("PPP LUMO correlation r² %.3f", c.PPPLUMO.PearsonR2)
	}
	// Ohno γ on the same rows, for the record of the choice of formula.
	oh, err := ppp.Compare(refs, hp, pp.Merge(&ppp.Params{Gamma: ppp.GammaOhno, GammaSource: "comparison"}))
	if err != nil {
		t.Fatal(err)
	}
	t.Log("with Ohno γ:\n" + oh.Summary())
	if oh.PPPHOMO.RMSE <= c.PPPHOMO.RMSE {
		t.Errorf("Ohno γ now gives the smaller HOMO RMSE (%.2f vs %.2f eV): revisit the default", oh.PPPHOMO.RMSE, c.PPPHOMO.RMSE)
	}
}

// TestActivationLowering: the LUMO of acrolein and methyl acrylate falls on protonation,
// Lewis-acid complexation (BF₃ standing for the acid, as the activation step draws it) and
// iminium formation. Semi-empirical comparison: K. N. Houk, R. W. Strozier, J. Am. Chem.
// Soc. 1973, 95, 4094 (CNDO/2 on protonated and Lewis-acid-complexed acrolein): a Lewis
// acid lowers the LUMO by roughly 1–1.5 eV and a proton by more (from memory). Checked:
// both methods order free > Lewis acid > proton, and PPP's Lewis-acid lowering is positive
// and below 4 eV. Measured figures are logged; PPP's Lewis-acid lowering (about 3 eV) is
// larger than the semi-empirical estimate because the half-charged O=LA core (our
// supplement) sees no counter-charge on the acid — a documented known miss.
func TestActivationLowering(t *testing.T) {
	hp, pp := params(t)
	cal, err := presets.Calibration(hp)
	if err != nil {
		t.Fatal(err)
	}
	s := ppp.NewSolver(pp)
	var hs huckel.Solver
	lumo := func(smi string) (float64, float64) {
		ps, o := solve(t, smi, hp, s)
		var h huckel.Orbitals
		if err := hs.Solve(ps, &h); err != nil {
			t.Fatal(err)
		}
		return o.Levels[o.LUMO].EV, h.LevelEV(h.LUMO, cal)
	}
	for _, tc := range []struct{ name, free, proton, lewis, iminium string }{
		{"acrolein", "C=CC=O", "C=CC=[OH+]", "C=CC=[O+][B-](F)(F)F", "C=CC=[N+]1CCCC1"},
		{"methyl acrylate", "C=CC(=O)OC", "C=CC(=[OH+])OC", "C=CC(=[O+][B-](F)(F)F)OC", ""},
	} {
		p0, h0 := lumo(tc.free)
		pH, hH := lumo(tc.proton)
		pL, hL := lumo(tc.lewis)
		line := fmt.Sprintf("%s LUMO: PPP %.2f eV, lowering by H+ %.2f, LA %.2f; Hückel (calibrated) %.2f eV, lowering by H+ %.2f, LA %.2f",
			tc.name, p0, p0-pH, p0-pL, h0, h0-hH, h0-hL)
		if tc.iminium != "" {
			pI, hI := lumo(tc.iminium)
			line += fmt.Sprintf("; iminium PPP %.2f, Hückel %.2f", p0-pI, h0-hI)
		}
		t.Log(line)
		if !(p0 > pL && pL > pH) || !(h0 > hL && hL > hH) {
			t.Errorf("%s: expected LUMO order free > Lewis acid > proton", tc.name)
		}
		if d := p0 - pL; d <= 0 || d > 4 {
			t.Errorf("%s: PPP Lewis-acid lowering %.2f eV", tc.name, d)
		}
	}
}

// TestDipoleHOMO records where the HOMO of four 1,3-dipoles has its largest coefficient in
// both methods. Finding (as the design notes' earlier trial): the SCF does not move it off
// the anionic terminus — diazomethane and azide keep it on the terminal N⁻, nitrile oxide
// and nitrone on O⁻ — although PPP raises the carbon terminus' share. Regiochemistry of
// these dipoles is not fixed by the SCF alone (compare the known misses in
// presets/literature/cases.yaml).
func TestDipoleHOMO(t *testing.T) {
	hp, pp := params(t)
	s := ppp.NewSolver(pp)
	var hs huckel.Solver
	for _, tc := range []struct {
		name, smi string
		anion     int // atom index of the anionic terminus
		carbon    int // the carbon terminus
	}{
		{"diazomethane", "C=[N+]=[N-]", 2, 0},
		{"methyl azide", "CN=[N+]=[N-]", 3, 1},
		{"formonitrile oxide", "C#[N+][O-]", 2, 0},
		{"N-methylnitrone", "C=[N+](C)[O-]", 3, 0},
	} {
		ps, o := solve(t, tc.smi, hp, s)
		var h huckel.Orbitals
		if err := hs.Solve(ps, &h); err != nil {
			t.Fatal(err)
		}
		pa, pc := math.Abs(o.Coefficient(o.HOMO, tc.anion)), math.Abs(o.Coefficient(o.HOMO, tc.carbon))
		ha, hc := math.Abs(h.Coefficient(h.HOMO, tc.anion)), math.Abs(h.Coefficient(h.HOMO, tc.carbon))
		t.Logf("%s HOMO |c|: anionic terminus PPP %.2f Hückel %.2f; other terminus PPP %.2f Hückel %.2f", tc.name, pa, ha, pc, hc)
		if pa <= pc || ha <= hc {
			t.Errorf("%s: largest HOMO coefficient moved off the anionic terminus", tc.name)
		}
	}
}

// TestSolveAtAllocs: once warm, a solve at given coordinates (Hückel start, SCF loop,
// final diagonalisation), and a Solve with its 2D layout, allocate nothing when the Solver
// and Orbitals are reused.
func TestSolveAtAllocs(t *testing.T) {
	hp, pp := params(t)
	m, _ := smiles.Parse("C=CC(=O)c1ccccc1")
	ps, err := huckel.Perceive(m, hp)
	if err != nil {
		t.Fatal(err)
	}
	xy, err := ppp.Geometry(ps, pp)
	if err != nil {
		t.Fatal(err)
	}
	s := ppp.NewSolver(pp)
	var o huckel.Orbitals
	if err := s.SolveAt(ps, xy, &o); err != nil {
		t.Fatal(err)
	}
	if a := testing.AllocsPerRun(20, func() {
		if err := s.SolveAt(ps, xy, &o); err != nil {
			t.Fatal(err)
		}
	}); a != 0 {
		t.Errorf("%.0f allocations per warm solve", a)
	}
	// Solve adds the 2D layout, by the Solver's reused depict.Workspace: still nothing.
	if err := s.Solve(ps, &o); err != nil {
		t.Fatal(err)
	}
	if a := testing.AllocsPerRun(20, func() {
		if err := s.Solve(ps, &o); err != nil {
			t.Fatal(err)
		}
	}); a != 0 {
		t.Errorf("%.0f allocations per warm Solve (layout included)", a)
	}
}

// A reused Orbitals carries no warning of the molecule solved before it: an open-shell
// system (cyclobutadiene: square D4h π system with a half-filled degenerate pair, the
// textbook open shell of Hückel and SCF alike, from memory: a warning) followed by a closed-shell
// one (butadiene) leaves the second with the warnings of a fresh solve (none).
func TestSolveReusedOrbitalsWarnings(t *testing.T) {
	hp, pp := params(t)
	s := ppp.NewSolver(pp)
	var reused huckel.Orbitals
	warned := false
	for _, smi := range []string{"C1=CC=C1", "C=CC=C"} {
		m, err := smiles.Parse(smi)
		if err != nil {
			t.Fatal(err)
		}
		ps, err := huckel.Perceive(m, hp)
		if err != nil {
			t.Fatal(err)
		}
		var fresh huckel.Orbitals
		errF, errR := s.Solve(ps, &fresh), s.Solve(ps, &reused)
		if (errF == nil) != (errR == nil) {
			t.Fatalf("%s: fresh error %v, reused %v", smi, errF, errR)
		}
		if !slices.Equal(fresh.Warnings, reused.Warnings) {
			t.Errorf("%s: warnings %q with a reused Orbitals, %q fresh", smi, reused.Warnings, fresh.Warnings)
		}
		warned = warned || len(fresh.Warnings) > 0
	}
	if !warned {
		t.Error("no molecule of the test gave a warning: the reuse is not exercised")
	}
}
