package fmo

import (
	"strings"
	"testing"
)

// TestRoleCheck: a pair typed the wrong way round gets the roles warning, pairs typed the
// right way do not.
func TestRoleCheck(t *testing.T) {
	tests := []struct {
		name, diene, dienophile string
		warn                    bool
	}{
		// p-benzoquinone is the dienophile toward butadiene, giving the carbocyclic
		// tetrahydronaphthoquinone (O. Diels, K. Alder, Liebigs Ann. Chem. 1928, 460, 98; from
		// memory): typed with the quinone as the 4π partner, the tool must say so.
		{"quinone typed as diene", "O=C1C=CC(=O)C=C1", "C=CC=C", true},
		{"butadiene + quinone", "C=CC=C", "O=C1C=CC(=O)C=C1", false},
		// isoprene + methyl acrylate, the para adduct (T. Inukai, T. Kojima, J. Org. Chem.
		// 1966, 31, 1121; from memory), typed both ways.
		{"isoprene + methyl acrylate", "C=CC(C)=C", "C=CC(=O)OC", false},
		{"acrylate typed as diene", "C=CC(=O)OC", "C=CC(C)=C", true},
		// acrolein is the hetero-diene toward ethyl vinyl ether (2-ethoxy-3,4-dihydro-2H-pyran;
		// C. W. Smith, D. G. Norton, S. A. Ballard, J. Am. Chem. Soc. 1951, 73, 5273; from
		// memory): the right way round gets no warning.
		{"acrolein hetero-diene + enol ether", "C=CC=O", "C=COCC", false},
		// cyclopentadiene dimerisation: the same molecule both ways, never a warning.
		{"cyclopentadiene with itself", "C1=CC=CC1", "C1=CC=CC1", false},
	}
	opts := defaultOpts(t)
	for _, tt := range tests {
		d := mustPartner(t, tt.diene, RoleDiene, opts)
		e := mustPartner(t, tt.dienophile, RoleDienophile, opts)
		p, err := Analyze(d, e, opts)
		if err != nil {
			t.Fatalf("%s: %v", tt.name, err)
		}
		w := RoleCheck(d, e, p, opts)
		if (w != "") != tt.warn {
			t.Errorf("%s: warning %q, want warning %v", tt.name, w, tt.warn)
		}
		if w != "" && !strings.Contains(w, "check --diene and --dienophile") {
			t.Errorf("%s: warning %q does not say what to do", tt.name, w)
		}
	}
}
