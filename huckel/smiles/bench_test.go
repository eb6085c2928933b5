package smiles

import "testing"

// benchInputs are typical substrates of 10–30 atoms (names from memory).
var benchInputs = []string{
	"COC=CC(=C)O[Si](C)(C)C",                // 1-methoxy-3-trimethylsilyloxybutadiene, 10 heavy atoms
	"O=C1C=CC(=O)N1c1ccccc1",                // N-phenylmaleimide, 13
	"c1ccc(-c2nnc(-c3ccccn3)nn2)nc1",        // 3,6-di(2-pyridyl)tetrazine, 18
	"CC(=O)CC(c1ccccc1)c1c(O)c2ccccc2oc1=O", // warfarin, 23
	"Cn1c(=O)c2c(ncn2C)n(C)c1=O",            // caffeine, 14
	"C=CC=[O+][B-](F)(F)F",                  // acrolein-BF3, 8
}

func BenchmarkParse(b *testing.B) {
	for _, s := range benchInputs {
		b.Run(s, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Parse(s); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkParseAliphatic is the baseline: a 10-atom chain with no aromatic atoms, so no
// ring search or kekulisation.
func BenchmarkParseAliphatic(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Parse("CC=CC=CC(=O)OCC"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkWrite(b *testing.B) {
	m, err := Parse("CC(=O)CC(c1ccccc1)c1c(O)c2ccccc2oc1=O")
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		Write(m)
	}
}

// BenchmarkCanonical: a cycloadduct-sized molecule (the Diels–Alder adduct of
// cyclopentadiene and N-phenylmaleimide, 19 heavy atoms) and warfarin (23).
func BenchmarkCanonical(b *testing.B) {
	for _, s := range []string{"O=C1C2C3C=CC(C3)C2C(=O)N1c1ccccc1", "CC(=O)CC(c1ccccc1)c1c(O)c2ccccc2oc1=O"} {
		m, err := Parse(s)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(s, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Canonical(m)
			}
		})
	}
}

// BenchmarkCanonicalSymmetric: molecules whose ties need the search (benzene: 12
// leaves; tri-tert-butylbenzene; cubane: 48).
func BenchmarkCanonicalSymmetric(b *testing.B) {
	for _, s := range []string{"c1ccccc1", "CC(C)(C)c1cc(C(C)(C)C)cc(C(C)(C)C)c1", "C12C3C4C1C5C2C3C45"} {
		m, err := Parse(s)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(s, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Canonical(m)
			}
		})
	}
}
