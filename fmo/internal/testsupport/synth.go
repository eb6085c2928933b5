// Package testsupport holds what the benchmarks and tests of several fmo packages share:
// a synthetic substrate library for measuring speed and memory at scale, and a CPU clock.
// It is not part of the production code (no non-test package imports it).
package testsupport

import (
	"fmt"
	"math/rand/v2"
	"strings"

	"cyclopair/fmo/substrates"
	"cyclopair/huckel/smiles"
)

// SyntheticLibrary generates a benchmark library: nDienes dienes and nDienophiles dienophiles
// built combinatorially from real cores (butadiene, cyclopentadiene, cyclohexa-1,3-diene,
// furan, anthracene's 9,10-positions; ethylene, maleimide, p-benzoquinone, cyclic enones)
// carrying one to three substituents from a list of common ones (alkyl, alkoxy, amino,
// halogen, phenyl, ester, ketone, aldehyde, nitrile, nitro, silyloxy ...). Every SMILES is
// valid and distinct (by canonical SMILES); the molecules are synthetic, not a catalogue of
// compounds anyone made, and are only meant for measuring speed and memory at scale.
//
// The result is deterministic for a seed. It panics if more molecules are asked for than the
// templates can produce (about 10⁴ of each kind) — a programmer error.
func SyntheticLibrary(nDienes, nDienophiles int, seed uint64) *substrates.Library {
	rnd := rand.New(rand.NewPCG(seed, seed^0x5eed))
	lib := &substrates.Library{
		Source:      "synthetic",
		Title:       fmt.Sprintf("synthetic benchmark library (%d dienes × %d dienophiles, seed %d)", nDienes, nDienophiles, seed),
		Activations: []string{"none"}, // fmo.ActivateNone
		RankBy:      "normal_gap",
		Set:         map[string]bool{},
	}
	lib.Dienes = synthesize(rnd, "diene", nDienes, dieneTemplates, dieneSubstituents)
	lib.Dienophiles = synthesize(rnd, "dienophile", nDienophiles, dienophileTemplates, dienophileSubstituents)
	return lib
}

// A template is SMILES text with %s slots; each slot becomes "" (hydrogen) or "(R)".
// Substituents use ring-closure digit 9, which no template uses.
type synthTemplate struct {
	core   string
	smiles string
	maxSub int // most substituents placed on it
}

var dieneTemplates = []synthTemplate{
	{"butadiene", "C%s=C%sC%s=C%s", 3},
	{"cyclopentadiene", "C1%s=C%sC%s=C%sC1", 2},
	{"cyclohexadiene", "C1%s=C%sC%s=C%sCC1", 2},
	{"furan", "c1%sc%soc%sc1%s", 2},
	{"anthracene", "c1ccc2c%sc3ccccc3c%sc2c1", 2},
}

var dieneSubstituents = []string{
	"C", "CC", "C(C)C", "OC", "OCC", "N(C)C", "Cl", "F", "c9ccccc9", "O[Si](C)(C)C",
	"SC", "CO", "C(F)(F)F", "OC(C)=O", "C(=O)OC", "N9CCCC9",
}

var dienophileTemplates = []synthTemplate{
	{"ethylene", "C%s%s=C%s%s", 3},
	{"maleimide", "O=C1C%s=C%sC(=O)N1%s", 2},
	{"p-benzoquinone", "O=C1C%s=C%sC(=O)C%s=C1%s", 2},
	{"cyclohexenone", "O=C1C%s=C%sCCC1", 2},
	{"cyclopentenone", "O=C1C%s=C%sCC1", 2},
}

var dienophileSubstituents = []string{
	"C=O", "C(C)=O", "C(=O)OC", "C(=O)OCC", "C#N", "[N+](=O)[O-]", "C(=O)N(C)C",
	"C", "CC", "OC", "Cl", "c9ccccc9", "OC(C)=O", "C(F)(F)F", "SC",
}

// synthesize draws n distinct molecules of one kind.
func synthesize(rnd *rand.Rand, kind string, n int, tpls []synthTemplate, subs []string) []substrates.Substrate {
	out := make([]substrates.Substrate, 0, n)
	seen := map[string]bool{}
	for tries := 0; len(out) < n; tries++ {
		if tries > 50*n+10000 {
			panic(fmt.Sprintf("testsupport: SyntheticLibrary cannot make %d distinct %ss", n, kind))
		}
		t := tpls[rnd.IntN(len(tpls))]
		slots := strings.Count(t.smiles, "%s")
		fill := make([]any, slots)
		for i := range fill {
			fill[i] = ""
		}
		k := 1 + rnd.IntN(min(t.maxSub, slots))
		for _, s := range rnd.Perm(slots)[:k] {
			fill[s] = "(" + subs[rnd.IntN(len(subs))] + ")"
		}
		smi := fmt.Sprintf(t.smiles, fill...)
		m, err := smiles.Parse(smi)
		if err != nil {
			panic(fmt.Sprintf("testsupport: synthetic %s %q does not parse: %v", kind, smi, err))
		}
		canon := smiles.Canonical(m)
		if seen[canon] {
			continue
		}
		seen[canon] = true
		name := fmt.Sprintf("%s-%s-%04d", kind, t.core, len(out)+1)
		m.Name = name
		out = append(out, substrates.Substrate{Name: name, SMILES: smi, Mol: m, File: "synthetic"})
	}
	return out
}
