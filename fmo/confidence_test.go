package fmo

import (
	"strings"
	"testing"
)

func analyzeSMILES(t *testing.T, diene, dienophile, act string) *Pair {
	t.Helper()
	opts := defaultOpts(t)
	d, err := NewPartner(diene, diene, RoleDiene, opts)
	if err != nil {
		t.Fatal(err)
	}
	e, err := NewPartner(dienophile, dienophile, RoleDienophile, opts)
	if err != nil {
		t.Fatal(err)
	}
	if act != "" && act != ActivateNone {
		if e, err = e.WithActivation(act, nil, opts); err != nil {
			t.Fatal(err)
		}
	}
	p, err := Analyze(d, e, opts)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func noteOf(p *Pair, verdict string) (ConfidenceNote, bool) {
	for _, n := range p.Confidence {
		if n.Verdict == verdict {
			return n, true
		}
	}
	return ConfidenceNote{}, false
}

func hasWarning(p *Pair, prefix string) bool {
	for _, w := range p.Warnings {
		if strings.HasPrefix(w, prefix) {
			return true
		}
	}
	return false
}

// TestConfidenceClasses checks that verdict classes are read from the pair's own reacting
// units and that the figures attached are the generated check-set table's (confidence_table.go,
// regenerated and compared by TestConfidenceTable in fmo/check). The pairs: diazomethane +
// methyl acrylate and phenyl azide are 1,3-dipolar cycloadditions (Huisgen, Angew. Chem. Int.
// Ed. 1963, 2, 565 — from memory); isoprene + methyl acrylate an all-carbon normal-demand
// Diels–Alder; dimethyl 1,2,4,5-tetrazine-3,6-dicarboxylate + ethyl vinyl ether the
// inverse-demand azadiene reaction (Sauer et al., Eur. J. Org. Chem. 1998, 2885 — from
// memory); 1,3-butadiene + formaldehyde-type C=O a hetero-Diels–Alder.
func TestConfidenceClasses(t *testing.T) {
	table, ok := CheckSetConfidence("huckel")
	if !ok || len(table.Classes) == 0 {
		t.Fatal("no generated check-set table for huckel")
	}
	rec := func(verdict, class string) ClassRecord {
		for _, r := range table.Classes {
			if r.Verdict == verdict && r.Class == class {
				return r
			}
		}
		return ClassRecord{Verdict: verdict, Class: class}
	}
	for _, tc := range []struct {
		diene, dienophile, act string
		class                  string
	}{
		{"C=[N+]=[N-]", "C=CC(=O)OC", "", ClassDipole},
		{"c1ccccc1N=[N+]=[N-]", "C=CC(=O)OC", "", ClassDipole},
		{"C=CC(C)=C", "C=CC(=O)OC", "", ClassCarbonNormal},
		{"COC(=O)c1nnc(C(=O)OC)nn1", "C=COCC", "", ClassAzadiene},
		{"C=CC=C", "O=CC(=O)OC", "", ClassHeteroDA},
	} {
		p := analyzeSMILES(t, tc.diene, tc.dienophile, tc.act)
		n, ok := noteOf(p, VerdictRegio)
		if !ok {
			t.Errorf("%s + %s: no regio note", tc.diene, tc.dienophile)
			continue
		}
		if n.Class != tc.class {
			t.Errorf("%s + %s: regio class %q, want %q", tc.diene, tc.dienophile, n.Class, tc.class)
		}
		r := rec(VerdictRegio, tc.class)
		if n.Hits != r.Hits || n.Cases != r.Cases {
			t.Errorf("%s + %s: note %d/%d, table %d/%d", tc.diene, tc.dienophile, n.Hits, n.Cases, r.Hits, r.Cases)
		}
		moot := p.RegioConfidence == "no preference" && p.RegioMargin == 0
		if want := cautionFor(r) && !moot; hasWarning(p, "caution, regio") != want {
			t.Errorf("%s + %s: regio caution %v, want %v (warnings %q)", tc.diene, tc.dienophile, !want, want, p.Warnings)
		}
		if _, ok := noteOf(p, VerdictDemand); !ok {
			t.Errorf("%s + %s: no demand note", tc.diene, tc.dienophile)
		}
	}
	// The dipole class is the one the check set says the method misses (regio-24, regio-25:
	// Houk et al. 1973 put the HOMO on the other terminus): it must be cautioned.
	if r := rec(VerdictRegio, ClassDipole); !cautionFor(r) || len(r.KnownMisses) == 0 {
		t.Errorf("1,3-dipole regio %+v is not cautioned", r)
	}
	p := analyzeSMILES(t, "C=[N+]=[N-]", "C=CC(=O)OC", "")
	if !hasWarning(p, "caution, regio (1,3-dipole): the method is right in only") {
		t.Errorf("diazomethane + methyl acrylate: no dipole caution in %q", p.Warnings)
	}
}

// TestConfidenceWords checks the word figures against the table and the rule that a word
// with fewer than three check-set cases is reported as not calibrated.
func TestConfidenceWords(t *testing.T) {
	table, _ := CheckSetConfidence("huckel")
	p := analyzeSMILES(t, "C=CC(C)=C", "C=CC(=O)OC", "") // isoprene + methyl acrylate: "para" (Alder)
	n, _ := noteOf(p, VerdictRegio)
	if n.Word != p.RegioConfidence {
		t.Fatalf("word %q, pair says %q", n.Word, p.RegioConfidence)
	}
	for _, w := range table.Words {
		if w.Verdict == VerdictRegio && w.Word == n.Word && (w.Hits != n.WordHits || w.Cases != n.WordCases) {
			t.Errorf("word %q: note %d/%d, table %d/%d", n.Word, n.WordHits, n.WordCases, w.Hits, w.Cases)
		}
	}
	few := ConfidenceTable{Words: []WordRecord{{VerdictRegio, "clear", 9, 10}, {VerdictRegio, "slight", 0, 1}}}
	if ok, why := wordSupported(few, VerdictRegio, regioWords, "slight"); ok || !strings.Contains(why, "too few") {
		t.Errorf("slight on one case: supported %v (%s)", ok, why)
	}
	inverted := ConfidenceTable{Words: []WordRecord{{VerdictRegio, "clear", 6, 10}, {VerdictRegio, "slight", 9, 10}}}
	if ok, why := wordSupported(inverted, VerdictRegio, regioWords, "clear"); ok || !strings.Contains(why, "does not support") {
		t.Errorf("clear right less often than slight: supported %v (%s)", ok, why)
	}
}

// TestReversibleAdducts: furan + maleic anhydride reverts and its endo adduct equilibrates to
// exo (Lee and Herndon, J. Org. Chem. 1978, 43, 518 — from memory); anthracene and pyrrole
// (N-H) adducts revert on heating (common practice, no source). Cyclopentadiene and
// butadiene regain no aromatic ring; the tetrazine adduct loses N₂ instead (Sauer, from
// memory), so its N-containing unit is not flagged.
func TestReversibleAdducts(t *testing.T) {
	for _, tc := range []struct {
		diene, dienophile string
		reversible, exo   bool
	}{
		{"c1ccoc1", "O=C1OC(=O)C=C1", true, true},
		{"c1ccc2cc3ccccc3cc2c1", "O=C1OC(=O)C=C1", true, false},
		{"c1cc[nH]c1", "O=C1OC(=O)C=C1", true, false},
		{"C1=CC=CC1", "O=C1OC(=O)C=C1", false, false},
		{"C=CC=C", "O=C1OC(=O)C=C1", false, false},
		{"COC(=O)c1nnc(C(=O)OC)nn1", "C=COCC", false, false},
	} {
		p := analyzeSMILES(t, tc.diene, tc.dienophile, "")
		if (p.Reversible != "") != tc.reversible {
			t.Errorf("%s + %s (%s): reversible %q", tc.diene, tc.dienophile, p.PreferredSite, p.Reversible)
		}
		if tc.exo && !strings.Contains(p.Reversible, "exo") {
			t.Errorf("%s + %s: no endo→exo note: %q", tc.diene, tc.dienophile, p.Reversible)
		}
	}
}
