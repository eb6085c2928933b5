package depict_test

import (
	"math"
	"strings"
	"testing"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/smiles"
)

// FuzzLayout checks that any molecule the SMILES reader accepts lays out without a panic,
// with finite coordinates, deterministically. (go test runs only the seed corpus: the test
// set lines plus a few awkward graphs.)
func FuzzLayout(f *testing.F) {
	for _, e := range loadSet(f) {
		f.Add(e.smiles)
	}
	for _, s := range []string{"C12C3C4C1C5C2C3C45", "C1CC11CC1", "[Na+].[Cl-].O", "C1CC2CCC1C2.C1CC1", "C%10CC%10"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if len(s) > 200 || strings.ContainsAny(s, "\x00") {
			return
		}
		m, err := smiles.Parse(s)
		if err != nil || len(m.Atoms) == 0 || len(m.Atoms) > 120 {
			return
		}
		a, err := depict.Layout(m)
		if err != nil {
			t.Fatalf("%q: %v", s, err)
		}
		b, _ := depict.Layout(m)
		for i, p := range a.Pos {
			if math.IsNaN(p.X) || math.IsNaN(p.Y) || math.IsInf(p.X, 0) || math.IsInf(p.Y, 0) {
				t.Fatalf("%q: atom %d at %v", s, i, p)
			}
			if p != b.Pos[i] {
				t.Fatalf("%q: not deterministic at atom %d", s, i)
			}
		}
	})
}
