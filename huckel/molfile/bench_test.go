package molfile

import (
	"bytes"
	"os"
	"testing"

	"cyclopair/huckel/smiles"
)

// BenchmarkReadV2000 reads the V2000 fixture file (174 RDKit records); the baseline
// BenchmarkParseSameSMILES parses the same molecules from SMILES in the same run, so the
// ratio of the two says what reading a molfile costs over reading a SMILES.
func BenchmarkReadV2000(b *testing.B) {
	data, err := os.ReadFile(v2000Path)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ReadAll(bytes.NewReader(data), nil); err != nil && !isKekulizeOnly(err) {
			b.Fatal(err)
		}
	}
}

func isKekulizeOnly(err error) bool {
	l, ok := err.(ErrorList)
	if !ok {
		e, ok := err.(*Error)
		return ok && e.Err == ErrKekulize
	}
	for _, e := range l {
		if e.Err != ErrKekulize {
			return false
		}
	}
	return true
}

func BenchmarkParseSameSMILES(b *testing.B) {
	fx := loadFixture(b)
	var smis []string
	for _, m := range fx.Molecules {
		if m.File == "v2000" {
			smis = append(smis, m.Smiles)
		}
	}
	b.ReportAllocs()
	for b.Loop() {
		for _, s := range smis {
			if _, err := smiles.Parse(s); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// BenchmarkWriteSD writes the same molecules as SD records with depict layouts.
func BenchmarkWriteSD(b *testing.B) {
	fx := loadFixture(b)
	var recs []fixtureMol
	for _, m := range fx.Molecules {
		if m.File == "v2000" {
			recs = append(recs, m)
		}
	}
	b.ReportAllocs()
	for b.Loop() {
		for _, fm := range recs {
			fixtureRecord(b, fm)
		}
	}
}
