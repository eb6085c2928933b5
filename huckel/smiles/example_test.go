package smiles_test

import (
	"errors"
	"fmt"

	"cyclopair/huckel/smiles"
)

func ExampleParse() {
	// 2-pyridone: the exocyclic C=O means the ring carbon takes no ring double bond.
	m, err := smiles.Parse("O=c1cccc[nH]1")
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, a := range m.Atoms {
		fmt.Printf("%d %s H%d aromatic=%v\n", i, a.Element, a.HCount, a.Aromatic)
	}
	for _, b := range m.Bonds {
		fmt.Printf("%d-%d order %d\n", b.A, b.B, b.Order)
	}
	// Output:
	// 0 O H0 aromatic=false
	// 1 C H0 aromatic=true
	// 2 C H1 aromatic=true
	// 3 C H1 aromatic=true
	// 4 C H1 aromatic=true
	// 5 C H1 aromatic=true
	// 6 N H1 aromatic=true
	// 0-1 order 2
	// 1-2 order 1
	// 2-3 order 2
	// 3-4 order 1
	// 4-5 order 2
	// 5-6 order 1
	// 1-6 order 1
}

func ExampleParse_error() {
	_, err := smiles.Parse("C1=CC=CC=C")
	var e *smiles.Error
	if errors.As(err, &e) {
		fmt.Println(e)
		fmt.Println(e.Excerpt())
		fmt.Println(errors.Is(err, smiles.ErrRingNotClosed))
	}
	// Output:
	// column 2: ring bond 1 never closed (close it with a second '1' or remove it)
	// C1=CC=CC=C
	//  ^
	// true
}

func ExampleWrite() {
	for _, s := range []string{"c1ccc2[nH]ccc2c1", "C=CC=[O+][B-](F)(F)F", "[CH2:1]=[CH:2]C=C"} {
		m, err := smiles.Parse(s)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Println(smiles.Write(m))
	}
	// Output:
	// C1=CC=C2NC=CC2=C1
	// C=CC=[O+][B-](F)(F)F
	// [CH2:1]=[CH:2]C=C
}

func ExampleCanonical() {
	// The same cycloadduct written from two ends, and with a different Kekulé structure
	// of its phenyl ring, gives one canonical string.
	a, _ := smiles.Parse("O=C1C2C3C=CC(C3)C2C(=O)N1C1=CC=CC=C1")
	b, _ := smiles.Parse("C1=CC=C(C=C1)N1C(=O)C2C3CC(C=C3)C2C1=O")
	fmt.Println(smiles.Canonical(a) == smiles.Canonical(b))
	fmt.Println(smiles.Canonical(a))
	// Output:
	// true
	// O=C1C2C3C=CC(C3)C2C(=O)N1C1=CC=CC=C1
}
