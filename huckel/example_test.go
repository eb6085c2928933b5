package huckel_test

import (
	"fmt"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// Butadiene: the four π levels, the frontier orbitals and the π energy.
func ExampleSolve() {
	m, _ := smiles.Parse("C=CC=C")
	p, _ := presets.Params("streitwieser1961")
	ps, _ := huckel.Perceive(m, p)
	o, err := huckel.Solve(ps)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, l := range o.Levels {
		fmt.Printf("level %d: x = %6.3f  occupancy %.0f  c = %6.3f\n", i, l.X, l.Occupancy, l.Coeffs)
	}
	fmt.Printf("HOMO %d, LUMO %d, E_pi = 4α + %.3fβ\n", o.HOMO, o.LUMO, o.PiEnergy)
	// Output:
	// level 0: x =  1.618  occupancy 2  c = [ 0.372  0.602  0.602  0.372]
	// level 1: x =  0.618  occupancy 2  c = [ 0.602  0.372 -0.372 -0.602]
	// level 2: x = -0.618  occupancy 0  c = [ 0.602 -0.372 -0.372  0.602]
	// level 3: x = -1.618  occupancy 0  c = [-0.372  0.602 -0.602  0.372]
	// HOMO 1, LUMO 2, E_pi = 4α + 4.472β
}

// Pyridine: the ring nitrogen is a one-electron centre with the set's h and k.
func ExamplePerceive() {
	m, _ := smiles.Parse("c1ccncc1")
	p, _ := presets.Params("streitwieser1961")
	ps, err := huckel.Perceive(m, p)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range ps.Centres {
		fmt.Printf("atom %d %-2s type %-3s h = %.2f electrons %d\n", c.Atom, c.Element, c.Type, c.H, c.Electrons)
	}
	fmt.Println("π electrons:", ps.Electrons())
	// Output:
	// atom 0 C  type C   h = 0.00 electrons 1
	// atom 1 C  type C   h = 0.00 electrons 1
	// atom 2 C  type C   h = 0.00 electrons 1
	// atom 3 N  type N=  h = 0.50 electrons 1
	// atom 4 C  type C   h = 0.00 electrons 1
	// atom 5 C  type C   h = 0.00 electrons 1
	// π electrons: 6
}
