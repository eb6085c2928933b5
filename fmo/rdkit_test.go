package fmo

import (
	"bufio"
	"os"
	"slices"
	"strings"
	"testing"

	"cyclopair/huckel/smiles"
)

// TestProductsAgainstRDKit compares the adducts fmo builds with those RDKit's reaction engine
// builds from plain cycloaddition templates (fixture written by scripts/gen_adduct_fixture.py
// with RDKit 2022.09.3; see the script for the templates). Molecules are compared by our
// canonical SMILES of the parsed RDKit products, so the check covers the product graph,
// hydrogen counts, charges and bond orders, but not how either program writes SMILES.
func TestProductsAgainstRDKit(t *testing.T) {
	f, err := os.Open("testdata/adducts_rdkit.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	canon := func(smi string) string {
		m, err := smiles.Parse(smi)
		if err != nil {
			t.Fatalf("%s: %v", smi, err)
		}
		return smiles.Canonical(m)
	}
	sc := bufio.NewScanner(f)
	n := 0
	for sc.Scan() {
		line := sc.Text()
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		cols := strings.Split(line, "\t")
		if len(cols) != 5 {
			t.Fatalf("bad fixture line %q", line)
		}
		check, diene, dienophile := cols[1], cols[2], cols[3]
		var want []string
		for _, p := range strings.Fields(cols[4]) {
			want = append(want, canon(p))
		}
		slices.Sort(want)
		want = slices.Compact(want)
		p, _, _ := mustAnalyze(t, diene, dienophile)
		var got []string
		best := p.Orientations[0]
		for _, o := range p.Orientations {
			samePair := slices.Equal(o.DieneAtoms, best.DieneAtoms) && sameAtoms(o.DienophileAtoms, best.DienophileAtoms)
			if check == "exact" || samePair {
				got = append(got, canon(o.Product))
			}
		}
		slices.Sort(got)
		got = slices.Compact(got)
		switch check {
		case "exact":
			if !slices.Equal(got, want) {
				t.Errorf("%s + %s: our adducts %v; RDKit %v", diene, dienophile, got, want)
			}
		case "preferred":
			for _, g := range got {
				if !slices.Contains(want, g) {
					t.Errorf("%s + %s: our adduct %s (preferred units) is not among RDKit's %v", diene, dienophile, g, want)
				}
			}
		default:
			t.Fatalf("bad check %q", check)
		}
		n++
	}
	if n < 10 {
		t.Errorf("only %d fixture pairs read", n)
	}
}

func sameAtoms(a, b []int) bool {
	x, y := slices.Clone(a), slices.Clone(b)
	slices.Sort(x)
	slices.Sort(y)
	return slices.Equal(x, y)
}
