package smiles

import (
	"math/rand/v2"
	"os"
	"strings"
	"testing"
)

// fuzzSeeds adds the fixture inputs and the malformed corpus to a fuzz target.
func fuzzSeeds(f *testing.F) {
	data, err := os.ReadFile(inputsPath)
	if err != nil {
		f.Fatal(err)
	}
	for _, line := range strings.Split(string(data), "\n") {
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		smi, _, _ := strings.Cut(line, "\t")
		f.Add(smi)
	}
	for _, tc := range malformed {
		f.Add(tc.in)
	}
}

// FuzzParse: Parse never panics; an error is a positioned *Error (or list of them); a
// molecule has valid Kekulé valences and survives Write → Parse as the same graph.
func FuzzParse(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, s string) {
		if len(s) > 2*MaxLength {
			return // longer inputs take the same ErrTooLong path
		}
		checkParse(t, s)
	})
}

// FuzzRoundTrip: for every molecule Parse accepts, Write∘Parse gives the same graph, and
// Canonical is the same for the molecule, its written form and a random renumbering.
func FuzzRoundTrip(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, s string) {
		if len(s) > 1024 {
			return
		}
		m, err := Parse(s)
		if err != nil {
			return
		}
		w := roundTrip(t, m)
		back, err := Parse(w)
		if err != nil {
			t.Fatal(err)
		}
		c := Canonical(m)
		if cb := Canonical(back); cb != c {
			t.Fatalf("Parse(%q): Canonical %q, of Write output %q gives %q", s, c, w, cb)
		}
		rng := rand.New(rand.NewPCG(uint64(len(s)), 3))
		if cp := Canonical(permute(m, rng)); cp != c {
			t.Fatalf("Parse(%q): Canonical %q, of a renumbering %q", s, c, cp)
		}
		cm, err := Parse(c)
		if err != nil {
			t.Fatalf("Canonical(%q) = %q does not parse: %v", s, c, err)
		}
		if c2 := Canonical(cm); c2 != c {
			t.Fatalf("Canonical(%q) not idempotent: %q then %q", s, c, c2)
		}
	})
}
