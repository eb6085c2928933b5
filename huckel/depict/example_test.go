package depict_test

import (
	"fmt"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/smiles"
)

// Lay out acrolein: a zig-zag chain with unit bonds; y points up.
func ExampleLayout() {
	m, err := smiles.Parse("C=CC=O")
	if err != nil {
		panic(err)
	}
	c, err := depict.Layout(m)
	if err != nil {
		panic(err)
	}
	for i, p := range c.Pos {
		fmt.Printf("%s%d %6.3f %6.3f\n", m.Atoms[i].Element, i+1, p.X, p.Y)
	}
	q := depict.Measure(m, c.Pos)
	fmt.Printf("closest pair %.3f, worst bond off by %.3f\n", q.MinDistance, q.MaxBondDeviation)
	// Output:
	// C1  0.000  0.250
	// C2  0.866 -0.250
	// C3  1.732  0.250
	// O4  2.598 -0.250
	// closest pair 1.000, worst bond off by 0.000
}
