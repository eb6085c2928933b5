package fmo

import (
	"errors"
	"testing"

	"cyclopair/huckel/smiles"
)

// FuzzPartner feeds arbitrary SMILES to site perception and the pair analysis as either
// partner: no input may panic, every failure must be an error, and every product must read
// back with smiles.Parse. Under 'go test' only the seed corpus runs.
func FuzzPartner(f *testing.F) {
	for _, s := range []string{
		"C=CC=C", "C=CC(C)=C", "c1ccc2cc3ccccc3cc2c1", "O=C1C=CC(=O)C=C1", "[N-]=[N+]=Nc1ccccc1",
		"C=[N+]=[N-]", "[O-][N+](C)=Cc1ccccc1", "c1ccccc1C#[N+][O-]", "COC(=O)c1nnc(C(=O)OC)nn1",
		"O=c1cccco1", "c1ccoc1", "C1=CC=CC1", "C=CC=O", "C#CC(=O)OC", "N#CC(C#N)=C(C#N)C#N",
		"C=C[N+](=O)[O-]", "c1ncncn1", "C1=CC=C1", "[CH2:1]=CC=[CH2:2]", "C=CC=C[O-]", "CC",
		"C=C=C", "C=C=O", "O=NC", "N=N", "c1ccc2ccccc2c1", "C=CC=CC=C",
	} {
		f.Add(s)
	}
	o, err := DefaultOptions()
	if err != nil {
		f.Fatal(err)
	}
	eth, err := NewPartner("", "C=C", RoleDienophile, o)
	if err != nil {
		f.Fatal(err)
	}
	bd, err := NewPartner("", "C=CC=C", RoleDiene, o)
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, s string) {
		m, err := smiles.Parse(s)
		if err != nil || len(m.Atoms) > 40 {
			return
		}
		for _, role := range []Role{RoleDiene, RoleDienophile} {
			p, err := NewPartnerFromMolecule(s, m, role, o)
			if err != nil {
				var se *SiteError
				if errors.As(err, &se) && se.Err == nil {
					t.Fatalf("%s: SiteError without sentinel", s)
				}
				continue
			}
			var pair *Pair
			if role == RoleDiene {
				pair, err = Analyze(p, eth, o)
			} else {
				pair, err = Analyze(bd, p, o)
			}
			if err != nil {
				continue
			}
			for _, or := range pair.Orientations {
				if _, err := smiles.Parse(or.Product); err != nil {
					t.Fatalf("%s as %v: product %s does not parse: %v", s, role, or.Product, err)
				}
			}
		}
	})
}
