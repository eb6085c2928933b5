package molecule

import (
	"slices"
	"testing"
)

// buildPropenal builds acrolein C=CC=O by hand (atoms 0..3) plus a detached water O (atom 4).
func buildPropenal() *Molecule {
	var m Molecule
	for _, el := range []string{"C", "C", "C", "O", "O"} {
		m.AddAtom(Atom{Element: el, Pos: -1})
	}
	m.AddBond(0, 1, 2)
	m.AddBond(1, 2, 1)
	m.AddBond(2, 3, 2)
	m.Atoms[0].HCount = 2
	m.Atoms[1].HCount = 1
	m.Atoms[2].HCount = 1
	m.Atoms[4].HCount = 2
	return &m
}

func TestGraphQueries(t *testing.T) {
	m := buildPropenal()
	tests := []struct {
		name      string
		got, want int
	}{
		{"degree of C1", m.Degree(1), 2},
		{"degree of O3", m.Degree(3), 1},
		{"bond between 1 and 2", m.BondBetween(1, 2), 1},
		{"bond between 2 and 1 (symmetric)", m.BondBetween(2, 1), 1},
		{"no bond between 0 and 3", m.BondBetween(0, 3), -1},
		{"bond-order sum of C2", m.BondOrderSum(2), 3},
		// Carbon is tetravalent: C2 of acrolein has 1 + 2 bond orders and one H.
		{"valence of C2", m.Valence(2), 4},
		{"valence of C0", m.Valence(0), 4},
		{"heavy atoms", m.HeavyAtomCount(), 5},
	}
	for _, tt := range tests {
		if tt.got != tt.want {
			t.Errorf("%s = %d, want %d", tt.name, tt.got, tt.want)
		}
	}
}

func TestComponentsAndClone(t *testing.T) {
	m := buildPropenal()
	comps := m.Components()
	want := [][]int{{0, 1, 2, 3}, {4}}
	if len(comps) != len(want) {
		t.Fatalf("Components() = %v, want %v", comps, want)
	}
	for i := range want {
		if !slices.Equal(comps[i], want[i]) {
			t.Errorf("component %d = %v, want %v", i, comps[i], want[i])
		}
	}

	c := m.Clone()
	c.Atoms[3].Charge = 1
	c.AddBond(3, 4, 1)
	if m.Atoms[3].Charge != 0 || m.BondBetween(3, 4) != -1 || len(m.Components()) != 2 {
		t.Error("editing the clone changed the original")
	}
	if len(c.Components()) != 1 {
		t.Errorf("clone with O3–O4 bond has %d components, want 1", len(c.Components()))
	}
}

func TestReindexAfterDirectEdit(t *testing.T) {
	m := buildPropenal()
	// Drop the C1–C2 bond directly from the slice, then rebuild adjacency.
	m.Bonds = slices.Delete(m.Bonds, 1, 2)
	m.Reindex()
	if m.BondBetween(1, 2) != -1 {
		t.Error("bond 1–2 still found after deletion and Reindex")
	}
	if got := m.BondBetween(2, 3); got != 1 {
		t.Errorf("bond 2–3 has index %d after deletion, want 1", got)
	}
	if n := len(m.Components()); n != 3 {
		t.Errorf("%d components after splitting acrolein, want 3", n)
	}
}

func TestAtomByMap(t *testing.T) {
	m := buildPropenal()
	m.Atoms[0].Map = 1
	m.Atoms[2].Map = 1
	m.Atoms[3].Map = 2
	if got := m.AtomByMap(1); !slices.Equal(got, []int{0, 2}) {
		t.Errorf("AtomByMap(1) = %v, want [0 2]", got)
	}
	if got := m.AtomByMap(7); got != nil {
		t.Errorf("AtomByMap(7) = %v, want nil", got)
	}
}

func TestAddBondMisusePanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("AddBond(0, 0) did not panic")
		}
	}()
	m := buildPropenal()
	m.AddBond(0, 0, 1)
}
