package presets

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"strings"
	"testing"

	"cyclopair/huckel/smiles"
)

func mustKinetics(t *testing.T) *KineticsData {
	t.Helper()
	k, err := Kinetics()
	if err != nil {
		t.Fatal(err)
	}
	return k
}

// Every structure of the set parses with the project's own SMILES reader (the loader checks
// this too; the test states it independently of the loader's code path).
func TestKineticsSMILESParse(t *testing.T) {
	k := mustKinetics(t)
	check := func(where, s string) {
		if _, err := smiles.Parse(s); err != nil {
			t.Errorf("%s: %q: %v", where, s, err)
		}
	}
	for _, s := range k.Series {
		check(s.ID+" fixed", s.Fixed.SMILES)
		for _, r := range s.Rows {
			check(s.ID+" "+r.Partner.Name, r.Partner.SMILES)
		}
	}
	for _, e := range k.SubstituentEffects {
		check(e.ID+" fixed", e.Fixed.SMILES)
		check(e.ID+" substituted", e.Substituted.SMILES)
	}
	for _, r := range k.Regio {
		check(r.ID+" diene", r.Diene.SMILES)
		check(r.ID+" dienophile", r.Dienophile.SMILES)
	}
	for _, e := range k.Endo {
		check(e.ID+" diene", e.Diene.SMILES)
		check(e.ID+" dienophile", e.Dienophile.SMILES)
	}
}

// Issue 10 asks for at least 8 series, 80 rate rows, 30 regio ratios and 15 endo:exo ratios.
// The series count (most of them small sets, not published series of five or more) and the
// endo:exo count are met; rate rows (54 of 80) and regio ratios (19, five of them numeric, of
// 30) are not. The set was first assembled without the papers at hand, and a value went in
// only where it was recalled with reasonable confidence; a later search of stored public
// copies of papers added a few rows read there (see the file headers) but found almost no
// rate or ratio tables. The floors below are the honest counts of this version, not the targets:
// raise them as checked rows are added, and never pad the files to reach the targets.
func TestKineticsCounts(t *testing.T) {
	const (
		targetSeries, floorSeries = 8, 13
		targetRows, floorRows     = 80, 54
		targetRegio, floorRegio   = 30, 19
		targetEndo, floorEndo     = 15, 23
	)
	k := mustKinetics(t)
	numericRegio := 0
	for _, r := range k.Regio {
		if !r.Single {
			numericRegio++
		}
	}
	got := []struct {
		what          string
		n, floor, tgt int
	}{
		{"series", len(k.Series), floorSeries, targetSeries},
		{"rate rows", k.RateRowCount(), floorRows, targetRows},
		{"regio ratios (numeric or single-isomer)", len(k.Regio), floorRegio, targetRegio},
		{"endo:exo ratios", len(k.Endo), floorEndo, targetEndo},
	}
	for _, g := range got {
		if g.n < g.floor {
			t.Errorf("%s: %d, below the floor %d", g.what, g.n, g.floor)
		}
		if g.n < g.tgt {
			t.Logf("%s: %d of the issue's target %d", g.what, g.n, g.tgt)
		}
	}
	t.Logf("regio: %d with a numeric ratio, %d single-isomer (censored)", numericRegio, len(k.Regio)-numericRegio)
}

// Every row has a source and one of the two confidence words, inherited from its series or
// its own.
func TestKineticsSourced(t *testing.T) {
	k := mustKinetics(t)
	tally := map[string]int{}
	ok := func(where, source, conf string) {
		tally[conf]++
		if strings.TrimSpace(source) == "" {
			t.Errorf("%s: no source", where)
		}
		if conf != ConfidenceSourceFound && conf != ConfidenceFromMemory {
			t.Errorf("%s: confidence %q", where, conf)
		}
	}
	for _, s := range k.Series {
		for i, r := range s.Rows {
			ok(fmt.Sprintf("%s row %d", s.ID, i+1), r.Source, r.Confidence)
		}
	}
	for _, e := range k.SubstituentEffects {
		ok(e.ID, e.Source, e.Confidence)
	}
	for _, r := range k.Regio {
		ok(r.ID, r.Source, r.Confidence)
		if r.Conditions == "" {
			t.Errorf("%s: no conditions", r.ID)
		}
	}
	for _, e := range k.Endo {
		ok(e.ID, e.Source, e.Confidence)
	}
	t.Logf("confidence over all rows: %v", tally)
}

// A series of kind "series" has at least 5 members with distinct structures; every series'
// reference row is its own zero of log10 k_rel.
func TestKineticsSeriesMembers(t *testing.T) {
	k := mustKinetics(t)
	for _, s := range k.Series {
		if s.Kind == "series" {
			distinct := map[string]bool{}
			for _, r := range s.Rows {
				distinct[structureKey(r.Partner.SMILES)] = true
			}
			if len(distinct) < 5 {
				t.Errorf("%s: kind series with %d distinct members", s.ID, len(distinct))
			}
		}
		ref := s.ReferenceRow()
		if ref.Partner.Name != s.Reference || ref.Log10KRel != 0 || ref.Activation != "none" {
			t.Errorf("%s: reference row %+v", s.ID, ref)
		}
	}
}

// No reaction appears twice in one series, and no selectivity entry twice; ids are unique.
// Stated independently of the loader's own duplicate check.
func TestKineticsNoDuplicates(t *testing.T) {
	k := mustKinetics(t)
	ids := map[string]bool{}
	id := func(s string) {
		if ids[s] {
			t.Errorf("duplicate id %s", s)
		}
		ids[s] = true
	}
	for _, s := range k.Series {
		id(s.ID)
		seen := map[string]bool{}
		for _, r := range s.Rows {
			key := fmt.Sprint(structureKey(r.Partner.SMILES), r.Activation, r.Solvent, r.TemperatureC)
			if seen[key] {
				t.Errorf("%s: %s twice", s.ID, r.Partner.Name)
			}
			seen[key] = true
		}
	}
	for _, e := range k.SubstituentEffects {
		id(e.ID)
	}
	seen := map[string]bool{}
	for _, r := range k.Regio {
		id(r.ID)
		key := fmt.Sprint("regio", structureKey(r.Diene.SMILES), structureKey(r.Dienophile.SMILES), r.Activation, r.Solvent, r.TemperatureC)
		if seen[key] {
			t.Errorf("%s: duplicate regio entry", r.ID)
		}
		seen[key] = true
	}
	for _, e := range k.Endo {
		id(e.ID)
		key := fmt.Sprint("endo", structureKey(e.Diene.SMILES), structureKey(e.Dienophile.SMILES), e.Activation, e.Solvent, e.TemperatureC)
		if seen[key] {
			t.Errorf("%s: duplicate endo entry", e.ID)
		}
		seen[key] = true
	}
}

func rowLog(t *testing.T, s *RateSeries, name, activation, solvent string) float64 {
	t.Helper()
	for _, r := range s.Rows {
		if r.Partner.Name == name && r.Activation == activation && (solvent == "" || r.Solvent == solvent) {
			return r.Log10KRel
		}
	}
	t.Fatalf("%s: no row %q (%s, %s)", s.ID, name, activation, solvent)
	return 0
}

func series(t *testing.T, id string) *RateSeries {
	t.Helper()
	s, ok := mustKinetics(t).SeriesByID(id)
	if !ok {
		t.Fatalf("no series %s", id)
	}
	return s
}

// Relative-rate facts the literature states, checked against the data as entered.
func TestKineticsOrderingFacts(t *testing.T) {
	// Ring size: cyclopentadiene > 1,3-cyclohexadiene > 1,3-cycloheptadiene toward maleic
	// anhydride. J. Sauer, R. Sustmann, Angew. Chem. Int. Ed. Engl. 1980, 19, 779 (from
	// memory); R. Sustmann, M. Böhm, J. Sauer, Chem. Ber. 1979, 112, 883 (abstract read: log k2
	// falls as the diene 1,4-distance grows).
	conf := series(t, "ma-dienes-conformation")
	cpd := rowLog(t, conf, "cyclopentadiene", "none", "")
	chd := rowLog(t, conf, "1,3-cyclohexadiene", "none", "")
	chpd := rowLog(t, conf, "1,3-cycloheptadiene", "none", "")
	if !(cpd > chd && chd > chpd) {
		t.Errorf("ring size: log k_rel CPD %.2f, CHD %.2f, CHpD %.2f, want decreasing", cpd, chd, chpd)
	}
	// (E)-piperylene reacts faster than (Z)-piperylene, whose (Z)-methyl hinders the s-cis
	// conformation. D. Craig, J. J. Shipman, R. B. Fowler, J. Am. Chem. Soc. 1961, 83, 2885
	// (from memory).
	if e, z := rowLog(t, conf, "(E)-piperylene", "none", ""), rowLog(t, conf, "(Z)-piperylene", "none", ""); !(e > z) {
		t.Errorf("piperylene: log k_rel (E) %.2f, (Z) %.2f, want (E) > (Z)", e, z)
	}
	// Cyclopentadiene is the fastest diene of the maleic anhydride table, and methyl groups
	// on C2/C3 accelerate: 2,3-dimethylbutadiene > isoprene > butadiene > chloroprene.
	// J. Sauer, D. Lang, H. Wiest, Chem. Ber. 1964, 97, 3208 (from memory).
	ma := series(t, "sauer1964-ma-dienes")
	order := []string{"cyclopentadiene", "2,3-dimethyl-1,3-butadiene", "isoprene", "1,3-butadiene", "chloroprene"}
	for i := 1; i < len(order); i++ {
		if a, b := rowLog(t, ma, order[i-1], "none", ""), rowLog(t, ma, order[i], "none", ""); !(a > b) {
			t.Errorf("maleic anhydride: %s (%.2f) not faster than %s (%.2f)", order[i-1], a, order[i], b)
		}
	}
	// Each cyano group accelerates, TCNE is fastest; the trans diester beats the cis one.
	// J. Sauer, H. Wiest, A. Mielert, Chem. Ber. 1964, 97, 3183 (from memory).
	cpdS := series(t, "sauer1964-cpd")
	cyano := []string{"tetracyanoethylene", "1,1-dicyanoethylene", "fumaronitrile", "acrylonitrile"}
	for i := 1; i < len(cyano); i++ {
		if a, b := rowLog(t, cpdS, cyano[i-1], "none", ""), rowLog(t, cpdS, cyano[i], "none", ""); !(a > b) {
			t.Errorf("cyclopentadiene: %s (%.2f) not faster than %s (%.2f)", cyano[i-1], a, cyano[i], b)
		}
	}
	if a, b := rowLog(t, cpdS, "dimethyl fumarate", "none", ""), rowLog(t, cpdS, "dimethyl maleate", "none", ""); !(a > b) {
		t.Errorf("dimethyl fumarate (%.2f) not faster than dimethyl maleate (%.2f)", a, b)
	}
	// 9,10-Dimethylanthracene spreads the cyano-ethylenes wider than cyclopentadiene and is
	// slowed by cis-disubstitution (same source).
	dma := series(t, "sauer1964-dma")
	if a, b := rowLog(t, dma, "tetracyanoethylene", "none", ""), rowLog(t, cpdS, "tetracyanoethylene", "none", ""); !(a > b) {
		t.Errorf("TCNE k_rel: DMA %.2f not above CPD %.2f", a, b)
	}
	if a, b := rowLog(t, dma, "fumaronitrile", "none", ""), rowLog(t, dma, "maleonitrile", "none", ""); !(a > b) {
		t.Errorf("DMA: fumaronitrile (%.2f) not faster than maleonitrile (%.2f)", a, b)
	}
	// Lewis acids accelerate: T. Inukai, T. Kojima, J. Org. Chem. 1967, 32, 869; S. Otto,
	// F. Bertoncin, J. B. F. N. Engberts, J. Am. Chem. Soc. 1996, 118, 7702 (from memory).
	for _, id := range []string{"inukai-kojima-alcl3", "otto-engberts-cu"} {
		s := series(t, id)
		for _, r := range s.Rows {
			if r.Activation == "lewis" && r.Log10KRel < 2 {
				t.Errorf("%s: Lewis-acid row log k_rel %.2f, want a large acceleration", id, r.Log10KRel)
			}
		}
	}
	// Hydrophobic acceleration: water > methanol > isooctane. D. C. Rideout, R. Breslow,
	// J. Am. Chem. Soc. 1980, 102, 7816 (from memory).
	sol := series(t, "rideout-breslow-solvent")
	// isooctane is the reference (log k_rel 0)
	w, m := rowLog(t, sol, "methyl vinyl ketone", "none", "water"), rowLog(t, sol, "methyl vinyl ketone", "none", "methanol")
	if !(w > m && m > 0) {
		t.Errorf("solvent: water %.2f, methanol %.2f, isooctane 0, want decreasing", w, m)
	}
}

// Selectivity facts the literature states, checked against the data as entered.
func TestKineticsSelectivityFacts(t *testing.T) {
	k := mustKinetics(t)
	endo := map[string]EndoRatio{}
	for _, e := range k.Endo {
		endo[e.ID] = e
	}
	regio := map[string]RegioRatio{}
	for _, r := range k.Regio {
		regio[r.ID] = r
	}
	get := func(id string) float64 {
		e, ok := endo[id]
		if !ok {
			t.Fatalf("no endo entry %s", id)
		}
		return e.Log10EndoExo
	}
	// Berson's Ω: the endo share rises with solvent polarity, methanol > ethanol >
	// triethylamine. J. A. Berson, Z. Hamlet, W. A. Mueller, J. Am. Chem. Soc. 1962, 84, 297.
	if !(get("ee-cpd-macr-methanol") > get("ee-cpd-macr-ethanol") && get("ee-cpd-macr-ethanol") > get("ee-cpd-macr-triethylamine")) {
		t.Error("Berson Ω order methanol > ethanol > triethylamine does not hold")
	}
	// AlCl3 raises the endo share. J. Sauer, J. Kredel, Tetrahedron Lett. 1966, 7, 731.
	if !(get("ee-cpd-macr-alcl3") > get("ee-cpd-macr-thermal")) {
		t.Error("AlCl3 does not raise the endo share of cyclopentadiene + methyl acrylate")
	}
	// Water raises it further than ethanol or the neat diene. R. Breslow, U. Maitra,
	// D. Rideout, Tetrahedron Lett. 1983, 24, 1901.
	if !(get("ee-cpd-mvk-water") > get("ee-cpd-mvk-ethanol") && get("ee-cpd-mvk-ethanol") > get("ee-cpd-mvk-neat")) {
		t.Error("water > ethanol > neat endo order does not hold")
	}
	// Simplest dienophiles with butadiene: close to 1:1. W. J. Lording, T. Fallon,
	// M. S. Sherburn, M. N. Paddon-Row, Chem. Sci. 2020, 11, 11915 (abstract read).
	for _, e := range k.Endo {
		if strings.HasPrefix(e.ID, "ee-butadiene-") && math.Abs(e.Log10EndoExo) > 0.2 {
			t.Errorf("%s: log10 endo/exo %.2f, the source says close to 1:1", e.ID, e.Log10EndoExo)
		}
	}
	// Furan + maleic anhydride: exo at equilibrium (thermodynamic control).
	if f := endo["ee-furan-maleic-anhydride"]; f.Single != "exo" || f.Control != "thermodynamic" {
		t.Errorf("furan + maleic anhydride: %+v", f)
	}
	// Lewis acids raise the 'para' share of isoprene additions. T. Inukai, T. Kojima,
	// J. Org. Chem. 1966, 31, 1121; E. F. Lutz, G. M. Bailey, J. Am. Chem. Soc. 1964, 86, 3899.
	for _, p := range [][2]string{{"rr-isoprene-macr-alcl3", "rr-isoprene-macr-thermal"}, {"rr-isoprene-mvk-sncl4", "rr-isoprene-mvk-thermal"}} {
		if !(regio[p[0]].Log10Ratio > regio[p[1]].Log10Ratio) || regio[p[0]].Major.Label != "para" {
			t.Errorf("%s does not raise the para share over %s", p[0], p[1])
		}
	}
}

// The loader's log10 figures, against hand arithmetic on the entered values.
func TestKineticsLog10(t *testing.T) {
	const tol = 1e-9 // floating-point only: the inputs are exact decimals
	cpdS := series(t, "sauer1964-cpd")
	for _, c := range []struct {
		name       string
		krel, logk float64
	}{
		{"acrylonitrile", 0, math.Log10(1.04e-5)},
		{"tetracyanoethylene", math.Log10(4.3e7), math.Log10(4.3e7 * 1.04e-5)},
		{"dimethyl maleate", math.Log10(0.6), math.Log10(0.6 * 1.04e-5)},
	} {
		for _, r := range cpdS.Rows {
			if r.Partner.Name != c.name {
				continue
			}
			if !r.HasK || math.Abs(r.Log10KRel-c.krel) > tol || math.Abs(r.Log10K-c.logk) > tol {
				t.Errorf("%s: log k_rel %v, log k %v (has %v), want %v, %v", c.name, r.Log10KRel, r.Log10K, r.HasK, c.krel, c.logk)
			}
		}
	}
	// k2 rows against a k2 reference: log10(1.54e-4 / 6.83e-5).
	ma := series(t, "sauer1964-ma-dienes")
	if got, want := rowLog(t, ma, "isoprene", "none", ""), math.Log10(1.54e-4/6.83e-5); math.Abs(got-want) > tol {
		t.Errorf("isoprene log k_rel %v, want %v", got, want)
	}
	// A set with only relative values has no absolute k.
	for _, r := range series(t, "inukai-kojima-alcl3").Rows {
		if r.HasK {
			t.Errorf("inukai-kojima-alcl3: %s has an absolute k", r.Partner.Name)
		}
	}
	k := mustKinetics(t)
	for _, e := range k.Endo {
		if e.ID == "ee-cpd-cinnamaldehyde-iminium" && math.Abs(e.Log10EndoExo-math.Log10(1/1.3)) > tol {
			t.Errorf("%s: %v", e.ID, e.Log10EndoExo)
		}
		if e.Single != "" && !math.IsNaN(e.Log10EndoExo) {
			t.Errorf("%s: single entry with a log ratio", e.ID)
		}
	}
	for _, r := range k.Regio {
		if r.Single != math.IsNaN(r.Log10Ratio) {
			t.Errorf("%s: single %v, log ratio %v", r.ID, r.Single, r.Log10Ratio)
		}
	}
}

// Pair puts the fixed partner in its role's slot.
func TestKineticsPairRoles(t *testing.T) {
	ma := series(t, "sauer1964-ma-dienes")
	d, p := ma.Pair(ma.Rows[1])
	if p.Name != "maleic anhydride" || d.Name != "isoprene" {
		t.Errorf("maleic anhydride series: Pair = %v, %v", d, p)
	}
	cpd := series(t, "sauer1964-cpd")
	d, p = cpd.Pair(cpd.Rows[1])
	if d.Name != "cyclopentadiene" || p.Name != "fumaronitrile" {
		t.Errorf("cyclopentadiene series: Pair = %v, %v", d, p)
	}
}

// Every regio bond names atom maps carried by exactly one atom of its partner.
func TestKineticsRegioMaps(t *testing.T) {
	for _, r := range mustKinetics(t).Regio {
		d, err1 := smiles.Parse(r.Diene.SMILES)
		p, err2 := smiles.Parse(r.Dienophile.SMILES)
		if err1 != nil || err2 != nil {
			t.Fatalf("%s: %v %v", r.ID, err1, err2)
		}
		for _, o := range []Orientation{r.Major, r.Minor} {
			for _, b := range o.Bonds {
				if len(d.AtomByMap(b[0])) != 1 || len(p.AtomByMap(b[1])) != 1 {
					t.Errorf("%s: bond %v does not resolve", r.ID, b)
				}
			}
		}
	}
}

// The checksum follows its documented recipe and moves with any byte of either file.
func TestKineticsChecksum(t *testing.T) {
	rates, sel := KineticsYAML()
	h := sha256.New()
	fmt.Fprintf(h, "presets/kinetics/rates.yaml\n%d\n", len(rates))
	h.Write(rates)
	fmt.Fprintf(h, "presets/kinetics/selectivity.yaml\n%d\n", len(sel))
	h.Write(sel)
	want := hex.EncodeToString(h.Sum(nil))
	if got := KineticsChecksum(); got != want || len(got) != 64 {
		t.Fatalf("KineticsChecksum = %s, want %s", got, want)
	}
	edited := append([]byte{}, sel...)
	edited[len(edited)-2] ^= 1
	if kineticsChecksum(rates, edited) == want {
		t.Error("checksum did not change with the selectivity bytes")
	}
	if kineticsChecksum(append(rates, '\n'), sel) == want {
		t.Error("checksum did not change with the rates bytes")
	}
}

const kinTestRates = `series:
- id: s1
  title: t
  kind: set
  fixed: {role: diene, name: cpd, smiles: "C1=CCC=C1"}
  varied: dienophile
  temperature_C: 20
  solvent: dioxane
  reference: a
  source: src
  confidence: from memory
  rows:
  - {name: a, smiles: "C=CC#N", k2: 1.0e-5, uncertainty_log10: 0.1}
  - {name: b, smiles: "C=CC(=O)OC", k_rel: 2, uncertainty_log10: 0.1}
`

const kinTestSel = `regio:
- id: r1
  diene: {name: isoprene, smiles: "[CH2:1]=C(C)C=[CH2:4]"}
  dienophile: {name: ma, smiles: "[CH2:5]=[CH:6]C(=O)OC"}
  conditions: thermal
  major: {bonds: [[1, 5], [4, 6]], label: para}
  minor: {bonds: [[1, 6], [4, 5]], label: meta}
  ratio: [70, 30]
  uncertainty_log10: 0.1
  source: src
  confidence: from memory
endo:
- id: e1
  diene: {name: cpd, smiles: "C1=CCC=C1"}
  dienophile: {name: ma, smiles: "C=CC(=O)OC"}
  control: kinetic
  conditions: thermal
  ratio: [3, 1]
  uncertainty_log10: 0.1
  source: src
  confidence: from memory
`

// Bad files are rejected with the file, the entry and what is wrong.
func TestParseKineticsRejects(t *testing.T) {
	if k, err := ParseKinetics([]byte(kinTestRates), []byte(kinTestSel)); err != nil || k.RateRowCount() != 2 {
		t.Fatalf("the minimal valid pair: %v", err)
	}
	cases := []struct {
		rates    bool // edit rates (else selectivity)
		old, new string
		want     string
	}{
		{true, "k_rel: 2,", "k_rel: 2, colour: red,", "colour"},
		{true, `"C=CC(=O)OC"`, `"C=CC(=O"`, "SMILES"},
		{true, "k_rel: 2,", "k_rel: 2, k2: 1,", "exactly one of k2 and k_rel"},
		{true, "k_rel: 2,", "k_rel: -2,", "not a positive number"},
		{true, "source: src", `source: ""`, "no source"},
		{true, "confidence: from memory", "confidence: sure", "confidence"},
		{true, "kind: set", "kind: series", "at least 5"},
		{true, "reference: a", "reference: z", "names no row"},
		{true, "varied: dienophile", "varied: diene", "varied"},
		{true, "k_rel: 2, uncertainty_log10: 0.1", "k_rel: 2", "no uncertainty_log10"},
		{true, "k_rel: 2,", "k_rel: 2, activation: lewis,", "needs a catalyst"},
		{true, `name: b, smiles: "C=CC(=O)OC"`, `name: b, smiles: "C=CC#N"`, "same reaction"},
		{true, "title: t", "title: &x t", "anchors and aliases"},
		{false, "[[1, 5], [4, 6]], label: para", "[[1, 5], [7, 6]], label: para", "atom map 7"},
		{false, "[[1, 6], [4, 5]], label: meta", "[[1, 5], [4, 6]], label: meta", "the same"},
		{false, "ratio: [70, 30]", "ratio: [30, 70]", "major isomer comes first"},
		{false, "ratio: [3, 1]", "ratio: [3, 1]\n  single: endo", "exactly one of ratio"},
		{false, "id: e1", "id: s1", "duplicate id"},
		{false, "control: kinetic", "control: fast", "control"},
		{false, "  conditions: thermal\n  ratio: [3, 1]", "  ratio: [3, 1]", "no conditions"},
	}
	for _, c := range cases {
		r, s := kinTestRates, kinTestSel
		if c.rates {
			if !strings.Contains(r, c.old) {
				t.Fatalf("test edit %q not found", c.old)
			}
			r = strings.Replace(r, c.old, c.new, 1)
		} else {
			if !strings.Contains(s, c.old) {
				t.Fatalf("test edit %q not found", c.old)
			}
			s = strings.Replace(s, c.old, c.new, 1)
		}
		_, err := ParseKinetics([]byte(r), []byte(s))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("edit %q -> %q: error %v, want one mentioning %q", c.old, c.new, err, c.want)
			continue
		}
		file := KineticsSelectivityName
		if c.rates {
			file = KineticsRatesName
		}
		if !strings.HasPrefix(err.Error(), file+":") || strings.Contains(err.Error(), "\n") {
			t.Errorf("error %q does not start with %s: or spans lines", err, file)
		}
	}
	// Semantic errors carry the line of the entry.
	_, err := ParseKinetics([]byte(strings.Replace(kinTestRates, "reference: a", "reference: z", 1)), []byte(kinTestSel))
	if err == nil || !strings.HasPrefix(err.Error(), KineticsRatesName+":2: s1: ") {
		t.Errorf("error %v, want it at %s:2: s1", err, KineticsRatesName)
	}
}

// The loader never panics, whatever the bytes; the seeds are the bundled files.
func FuzzParseKinetics(f *testing.F) {
	rates, sel := KineticsYAML()
	f.Add(rates, sel)
	f.Add([]byte(kinTestRates), []byte(kinTestSel))
	f.Fuzz(func(t *testing.T, rates, sel []byte) {
		k, err := ParseKinetics(rates, sel)
		if err == nil && len(k.Series) == 0 {
			t.Error("a set without series was accepted")
		}
	})
}

// A series whose source does not state its temperature omits temperature_C: it loads with
// HasTemperature false on the series and its rows, a stated one sets it (no temperature is
// ever filled in for the source).
func TestKineticsOptionalTemperature(t *testing.T) {
	k, err := ParseKinetics([]byte(strings.Replace(kinTestRates, "  temperature_C: 20\n", "", 1)), []byte(kinTestSel))
	if err != nil {
		t.Fatal(err)
	}
	s := k.Series[0]
	if s.HasTemperature || s.Rows[0].HasTemperature || s.Rows[1].HasTemperature {
		t.Errorf("series without temperature_C: HasTemperature %v, rows %v %v", s.HasTemperature, s.Rows[0].HasTemperature, s.Rows[1].HasTemperature)
	}
	k, err = ParseKinetics([]byte(kinTestRates), []byte(kinTestSel))
	if err != nil {
		t.Fatal(err)
	}
	if s := k.Series[0]; !s.HasTemperature || s.TemperatureC != 20 || !s.Rows[1].HasTemperature {
		t.Errorf("series with temperature_C 20: HasTemperature %v, %v °C", s.HasTemperature, s.TemperatureC)
	}
	for _, s := range mustKinetics(t).Series {
		for _, r := range s.Rows {
			if !r.HasTemperature && !strings.Contains(s.Note+r.Note, "temperature is not stated") && !strings.Contains(s.Note+r.Note, "no single temperature") {
				t.Errorf("%s: %s: no temperature and no note saying the source does not state one", s.ID, r.Partner.Name)
			}
		}
	}
}

// outside_model is read (trimmed) and kept with the series; a series without it has none.
func TestKineticsOutsideModel(t *testing.T) {
	r := strings.Replace(kinTestRates, "  reference: a\n", "  reference: a\n  outside_model: \" steric, not in the descriptors \"\n", 1)
	k, err := ParseKinetics([]byte(r), []byte(kinTestSel))
	if err != nil {
		t.Fatal(err)
	}
	if got := k.Series[0].OutsideModel; got != "steric, not in the descriptors" {
		t.Errorf("outside_model read as %q", got)
	}
	k, err = ParseKinetics([]byte(kinTestRates), []byte(kinTestSel))
	if err != nil {
		t.Fatal(err)
	}
	if got := k.Series[0].OutsideModel; got != "" {
		t.Errorf("no outside_model, got %q", got)
	}
}
