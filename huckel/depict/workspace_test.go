package depict_test

import (
	"slices"
	"testing"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// TestWorkspaceMatchesLayout: one Workspace reused over the whole layout set, forwards and
// backwards (so every buffer is reused at other sizes), gives bit-identical coordinates and
// the same rings as a fresh Layout of each molecule.
func TestWorkspaceMatchesLayout(t *testing.T) {
	set := loadSet(t)
	var mols []*molecule.Molecule
	for _, e := range set {
		m, err := smiles.Parse(e.smiles)
		if err != nil {
			continue // reported by TestLayoutSet
		}
		mols = append(mols, m)
	}
	want := make([]*depict.Coords, len(mols))
	for i, m := range mols {
		c, err := depict.Layout(m)
		if err != nil {
			t.Fatalf("%s: %v", m.Source, err)
		}
		want[i] = c
	}
	var w depict.Workspace
	var pos []depict.Point
	check := func(i int) {
		var err error
		pos, err = w.LayoutInto(mols[i], pos)
		if err != nil {
			t.Fatalf("%s: %v", mols[i].Source, err)
		}
		if !slices.Equal(pos, want[i].Pos) {
			t.Errorf("%s: workspace coordinates differ from Layout", mols[i].Source)
		}
		rings := w.Rings()
		if len(rings) != len(want[i].Rings) {
			t.Fatalf("%s: %d rings, Layout found %d", mols[i].Source, len(rings), len(want[i].Rings))
		}
		for k := range rings {
			if !slices.Equal(rings[k], want[i].Rings[k]) {
				t.Errorf("%s: ring %d %v, Layout %v", mols[i].Source, k, rings[k], want[i].Rings[k])
			}
		}
	}
	for i := range mols {
		check(i)
	}
	for i := len(mols) - 1; i >= 0; i-- {
		check(i)
	}
	if _, err := w.LayoutInto(&molecule.Molecule{}, pos); err == nil {
		t.Error("empty molecule: no error")
	}
}

// TestWorkspaceAllocs: once warm, laying out ordinary substrates (chains, fused and linked
// rings, marked double bonds, two fragments) allocates nothing.
func TestWorkspaceAllocs(t *testing.T) {
	var w depict.Workspace
	pos := make([]depict.Point, 64)
	for _, smi := range []string{
		"C=CC(=O)c1ccccc1",
		"COc1ccc(/C=C/C(=O)c2ccc(N(C)C)cc2)cc1",
		"COC(=O)/C=C/c1ccc(-c2ccc(-c3ccc(C=C)cc3)cc2)cc1",
		"c1ccc2ccccc2c1",
		"C1CCC2(C1)CCCC2",
		"O=C1OC(=O)C=C1.C1=CCC=C1",
		"CC(C)(C)c1ccc(O)cc1",
	} {
		m, err := smiles.Parse(smi)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.LayoutInto(m, pos); err != nil {
			t.Fatal(err)
		}
		if n := testing.AllocsPerRun(20, func() { _, _ = w.LayoutInto(m, pos) }); n != 0 {
			t.Errorf("%s: %.0f allocations per layout with a warm workspace", smi, n)
		}
	}
}

func BenchmarkWorkspace(b *testing.B) {
	m, err := smiles.Parse("CC(C)CCCC(C)C1CCC2C1(CCC1C2CC=C2CC(O)CCC12C)C")
	if err != nil {
		b.Fatal(err)
	}
	var w depict.Workspace
	var pos []depict.Point
	b.ReportAllocs()
	for b.Loop() {
		if pos, err = w.LayoutInto(m, pos); err != nil {
			b.Fatal(err)
		}
	}
}
