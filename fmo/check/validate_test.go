package check

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"cyclopair/fmo"
	"cyclopair/presets/literature"
)

// runBundled runs the shipped literature check set (presets/literature/cases.yaml) with the
// default options once per test binary.
func runBundled(t *testing.T) (*CheckSet, *ValidationReport) {
	t.Helper()
	set, err := BundledCheckSet()
	if err != nil {
		t.Fatal(err)
	}
	opts, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	return set, Validate(set, opts)
}

// TestCheckSetComposition pins the size of the check set the brief asks for: at least 20
// regiochemistry cases (including hetero-Diels–Alder, inverse-demand azadiene and
// 1,3-dipolar ones), 5 endo/exo facts, 5 demand types and one measured series, each with a
// source and a confidence.
func TestCheckSetComposition(t *testing.T) {
	set, err := BundledCheckSet()
	if err != nil {
		t.Fatal(err)
	}
	n := map[string]int{}
	for _, c := range set.Cases {
		n[c.Category]++
		if c.Source == "" || c.Confidence == "" {
			t.Errorf("%s: missing source or confidence", c.ID)
		}
	}
	for cat, min := range map[string]int{CategoryRegio: 20, CategoryEndo: 5, CategoryDemand: 5, CategorySite: 3} {
		if n[cat] < min {
			t.Errorf("%d %s cases, want at least %d", n[cat], cat, min)
		}
	}
	if len(set.Series) < 1 || len(set.Series[0].Members) < 6 {
		t.Errorf("want the Sauer cyanoethylene series with 6 members")
	}
}

// TestValidateBundled is the literature check: every case must come out as the check set
// records it — a hit, or a documented known miss (the reasons are in cases.yaml). A
// regression turns a hit into a "miss"; an improvement turns a known miss into an
// "unexpected hit": both fail here so the record is updated on purpose.
func TestValidateBundled(t *testing.T) {
	_, rep := runBundled(t)
	for _, c := range rep.Cases {
		if !c.Agrees() {
			t.Errorf("%s (%s + %s, %s): %s — expected %s, got %s %s", c.ID, c.Diene, c.Dienophile, c.Activation, c.Status, c.Expected, c.Got, c.Error)
		}
		// a hit regio case must also build the observed product: the bonds and the product
		// SMILES of an orientation describe the same adduct
		if c.Category == CategoryRegio && c.Hit && c.Product != "match" {
			t.Errorf("%s: regio hit but product %s differs from the observed one", c.ID, c.GotProduct)
		}
	}
	for _, s := range rep.Categories {
		t.Logf("%-7s %2d/%2d hits, %d known misses", s.Category, s.Hits, s.Total, s.KnownMisses)
	}
}

// TestValidateSauerSeries: J. Sauer, H. Wiest, A. Mielert, Chem. Ber. 1964, 97, 3183
// (rate constants from memory). Recorded as a known miss: with the normal gap as the figure
// rho = 0.81 (Hückel puts the 1,1-dicyanoethylene LUMO above the 1,2-isomers'), below the
// 0.9 the check set asks for. The test asserts that recorded state — rho below 0.9, and every
// member except 1,1-dicyanoethylene in the measured order (rho ≥ 0.9 without it) — so a
// regression of the rest of the series and a fix of the 1,1 case both show.
func TestValidateSauerSeries(t *testing.T) {
	_, rep := runBundled(t)
	var s *SeriesResult
	for i := range rep.Series {
		if rep.Series[i].ID == "sauer-1964" {
			s = &rep.Series[i]
		}
	}
	if s == nil || s.Error != "" {
		t.Fatalf("sauer-1964 missing or failed: %+v", s)
	}
	if s.Figure != FigureGapNormal || s.KnownMiss == "" {
		t.Fatalf("series record changed: figure %s, known miss %q", s.Figure, s.KnownMiss)
	}
	const tol = 0.005 // rank correlations of 6 points move in steps of about 0.03
	if s.Pass || math.Abs(s.Rho-0.812) > tol {
		t.Errorf("rho = %.3f (pass %v), recorded 0.812 ± %.3f as a known miss", s.Rho, s.Pass, tol)
	}
	var lk, fig []float64
	for _, p := range s.Points {
		if p.Name == "1,1-dicyanoethylene" {
			continue
		}
		lk = append(lk, p.Log10K)
		fig = append(fig, p.Figure)
	}
	if rho := Spearman(lk, fig); rho < 0.9 {
		t.Errorf("without 1,1-dicyanoethylene rho = %.3f, want ≥ 0.9", rho)
	}
	if !rep.Agrees() {
		t.Errorf("report does not agree with the check-set record")
	}
}

// TestSpearman checks the rank correlation against hand-computed values: the closed form
// 1 − 6Σd²/(n(n²−1)) for untied ranks, and the mid-rank rule for ties.
func TestSpearman(t *testing.T) {
	const tol = 1e-12
	for _, tc := range []struct {
		x, y []float64
		want float64
	}{
		{[]float64{1, 2, 3, 4, 5}, []float64{10, 20, 30, 40, 50}, 1},
		{[]float64{1, 2, 3, 4, 5}, []float64{5, 4, 3, 2, 1}, -1},
		{[]float64{1, 2, 3, 4, 5}, []float64{2, 1, 4, 3, 5}, 0.8}, // Σd² = 4: 1 − 24/120
		// ties: y ranks 1, 2.5, 2.5, 4 → Pearson of (1,2,3,4) and (1,2.5,2.5,4) = 0.9486832980505138
		{[]float64{1, 2, 3, 4}, []float64{0.1, 0.5, 0.5, 0.9}, 0.9486832980505138},
	} {
		if got := Spearman(tc.x, tc.y); math.Abs(got-tc.want) > tol {
			t.Errorf("Spearman(%v, %v) = %.15f, want %.15f", tc.x, tc.y, got, tc.want)
		}
	}
}

func TestLoadCheckSetErrors(t *testing.T) {
	good := `cases:
- id: a
  category: regio
  diene: {name: isoprene, smiles: "[CH2:1]=C(C)C=[CH2:4]"}
  dienophile: {name: acrylate, smiles: "[CH2:5]=[CH:6]C(=O)OC"}
  expect: {bonds: [[1, 5], [4, 6]]}
  source: "A. Author, J. Chem. 1970, 1, 1"
  confidence: from memory
`
	if _, err := LoadCheckSet(strings.NewReader(good), "good.yaml"); err != nil {
		t.Fatalf("good file: %v", err)
	}
	for _, tc := range []struct {
		name, edit, want string
	}{
		{"unknown key", strings.Replace(good, "  source:", "  sorce: x\n  source:", 1), `bad.yaml: 7:3: unknown key "sorce" (known here: id, category`},
		{"unknown expect key", strings.Replace(good, "{bonds:", "{bond: 1, bonds:", 1), `bad.yaml: 6:12: unknown key "bond"`},
		{"bad category", strings.Replace(good, "category: regio", "category: regiox", 1), `bad.yaml: 3:13: a: unknown category "regiox"`},
		{"missing map", strings.Replace(good, "[4, 6]", "[4, 7]", 1), "atom map 7 does not occur in the dienophile SMILES"},
		{"bad smiles", strings.Replace(good, "C=[CH2:4]", "C=[CH2:4", 1), "bad.yaml: 4:"},
		{"bad confidence", strings.Replace(good, "from memory", "sure", 1), `confidence "sure"`},
		{"no source", strings.Replace(good, `  source: "A. Author, J. Chem. 1970, 1, 1"`+"\n", "", 1), "missing source"},
		{"duplicate id", good + strings.TrimPrefix(good, "cases:\n"), "duplicate id a"},
		{"alias", good + "  observed: &x y\n- id: b\n  category: endo\n  observed: *x\n", "aliases are not allowed"},
		{"syntax", "cases: [\n", "bad.yaml: yaml:"},
		{"empty", "cases: []\n", "no cases and no series"},
	} {
		_, err := LoadCheckSet(strings.NewReader(tc.edit), "bad.yaml")
		if err == nil || !errors.Is(err, ErrCheckSet) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: err = %v, want ErrCheckSet containing %q", tc.name, err, tc.want)
		}
	}
}

// TestSameMolecule: isomorphic SMILES (different atom orders, Kekulé forms or atom maps)
// agree, regioisomers differ.
func TestSameMolecule(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		same bool
	}{
		{"CC1=CCC(CC1)C(=O)OC", "COC(=O)C1CCC(C)=CC1", true},  // para adduct written two ways
		{"CC1=CCC(CC1)C(=O)OC", "CC1=CCCC(C1)C(=O)OC", false}, // para vs meta
		{"COC(=O)C1CCC=CC1C(=O)OC", "COC(=O)C1C=CCCC1C(=O)OC", true},
		{"c1ccc(cc1)C1=NOC(C1)c1ccccc1", "c1ccc(cc1)C1=NOCC1c1ccccc1", false}, // 5- vs 4-phenyl
		{"[CH3:1]C", "CC", true},
		{"C1=CC=CC=C1C1CC=CCC1", "c1ccc(cc1)C1CCC=CC1", true}, // two Kekulé forms of the phenyl
		{"C1CC1", "C(", false},
	} {
		if got := sameMolecule(tc.a, tc.b); got != tc.same {
			t.Errorf("sameMolecule(%s, %s) = %v, want %v", tc.a, tc.b, got, tc.same)
		}
	}
}

func ExampleSpearman() {
	logk := []float64{-5, -4.1, -4.0, -0.3, 2.7, 5.6} // measured, increasing
	figure := []float64{1, 2, 2, 4, 5, 6}             // predicted, one tie
	fmt.Printf("%.4f\n", Spearman(logk, figure))
	// Output:
	// 0.9856
}

// FuzzLoadCheckSet: the check-set reader never panics and returns positioned errors.
func FuzzLoadCheckSet(f *testing.F) {
	f.Add(string(literature.CasesYAML))
	f.Add("cases:\n- id: a\n  category: endo\n  diene: {name: cp, smiles: C1=CCC=C1}\n  dienophile: {name: e, smiles: C=C}\n  expect: {endo: endo}\n  source: x\n  confidence: from memory\n")
	f.Add("series: [{id: s, figure: gap_normal, source: x, confidence: from memory, diene: {smiles: C=CC=C}, members: [{smiles: C=C, k: 1}]}]")
	f.Fuzz(func(t *testing.T, s string) {
		_, err := LoadCheckSet(strings.NewReader(s), "f.yaml")
		if err != nil && (!errors.Is(err, ErrCheckSet) || !strings.HasPrefix(err.Error(), "f.yaml")) {
			t.Fatalf("error %q not a positioned ErrCheckSet", err)
		}
	})
}

// TestSiteCaseSymmetryEquivalent: p-benzoquinone's two C=C bonds are equivalent, so a site
// case that maps one of them must count the other when the case also gives the observed
// adduct (butadiene + p-benzoquinone gives the cis-fused 4a,5,8,8a-tetrahydronaphthoquinone;
// O. Diels, K. Alder, Liebigs Ann. Chem. 1928, 460, 98; from memory). Without the product, the
// atom maps alone decide, so mapping the C=C the engine does not choose is then a miss.
func TestSiteCaseSymmetryEquivalent(t *testing.T) {
	opts, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	// Which C=C the engine picks: try the maps on each in turn.
	probe := func(dienophile, product string) CaseResult {
		t.Helper()
		y := `cases:
- id: t-1
  category: site
  diene: {name: butadiene, smiles: "C=CC=C"}
  dienophile: {name: quinone, smiles: "` + dienophile + `"}
  expect: {dienophile_atoms: [5, 6]` + product + `}
  observed: "adds at a C=C"
  source: "O. Diels, K. Alder, Liebigs Ann. Chem. 1928, 460, 98"
  confidence: from memory
`
		set, err := LoadCheckSet(strings.NewReader(y), "t.yaml")
		if err != nil {
			t.Fatal(err)
		}
		return Validate(set, opts).Cases[0]
	}
	a := probe("O=C1[CH:5]=[CH:6]C(=O)C=C1", "")
	b := probe("O=C1C=CC(=O)[CH:5]=[CH:6]1", "")
	if a.Hit == b.Hit {
		t.Fatalf("maps on either C=C: hit %v and %v; want exactly one to match the engine's choice", a.Hit, b.Hit)
	}
	other := "O=C1[CH:5]=[CH:6]C(=O)C=C1"
	if a.Hit {
		other = "O=C1C=CC(=O)[CH:5]=[CH:6]1"
	}
	if r := probe(other, `, product: "O=C1C=CC(=O)C2CC=CCC12"`); !r.Hit {
		t.Errorf("equivalent C=C with the observed product: %s, want a hit (got %s, product %s)", r.Status, r.Got, r.GotProduct)
	}
}

func defaultOpts(t testing.TB) *fmo.Options {
	t.Helper()
	o, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	return o
}

func mustPartner(t testing.TB, smi string, role fmo.Role, o *fmo.Options) *fmo.Partner {
	t.Helper()
	p, err := fmo.NewPartner("", smi, role, o)
	if err != nil {
		t.Fatalf("%s: %v", smi, err)
	}
	return p
}

// The screening score of package fmo, measured against a rate series with this package's
// Spearman.
func TestScoreTracksSauerSeries(t *testing.T) {
	// Rate constants of cyclopentadiene with cyanoethylenes, dioxane, 20 °C (Sauer, Wiest &
	// Mielert, Chem. Ber. 1964, 97, 3183; log10 k from memory, as in the bundled check set).
	// The ranking score must correlate positively with log k (Spearman ρ ≥ 0.8); the single
	// inversion is 1,1-dicyanoethylene, whose Hückel LUMO lies too high (known miss of the
	// method, recorded in the check set).
	o := defaultOpts(t)
	names := []string{"C=CC#N", "N#C/C=C/C#N", "N#C/C=C\\C#N", "C=C(C#N)C#N", "N#CC=C(C#N)C#N", "N#CC(C#N)=C(C#N)C#N"}
	logk := []float64{-4.98, -4.09, -4.04, -0.35, 2.68, 5.63}
	d := mustPartner(t, "C1=CC=CC1", fmo.RoleDiene, o)
	var sc []float64
	for _, n := range names {
		sc = append(sc, fmo.QuickScore(d, mustPartner(t, n, fmo.RoleDienophile, o), o).Best)
	}
	if rho := Spearman(sc, logk); rho < 0.8 {
		t.Errorf("Spearman(score, log k) = %.3f; want ≥ 0.8 (scores %v)", rho, sc)
	}
}
