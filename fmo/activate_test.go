package fmo

import (
	"errors"
	"fmt"
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
		{"C=CC(=O)OC", ActivateIminium, ErrNothingToActivate, "no aldehyde or ketone"},
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
		{"C=CC=O", nil},                // acrolein: no α-H on sp3 carbon, aldehyde
		{"CCC=O", []string{"enamine"}}, // propanal: α-CH2
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
