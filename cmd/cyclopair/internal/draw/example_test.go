package draw_test

import (
	"fmt"
	"strings"

	"cyclopair/cmd/cyclopair/internal/draw"
	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// Draw the LUMO of acrolein: one circle per π centre (area ∝ c²), the level in the caption.
func ExampleOrbital() {
	m, _ := smiles.Parse("C=CC=O")
	p, _ := presets.Params(presets.DefaultParams)
	pi, _ := huckel.Perceive(m, p)
	orb, _ := huckel.Solve(pi)
	svg, err := draw.Orbital(orb, orb.LUMO, draw.OrbitalOptions{Name: "acrolein", SMILES: "C=CC=O", Which: "LUMO"})
	if err != nil {
		panic(err)
	}
	s := string(svg)
	fmt.Println(strings.HasPrefix(s, "<svg "), strings.Contains(s, "<title>LUMO of acrolein</title>"))
	fmt.Println("lobes:", strings.Count(s, "<circle")-2) // two circles belong to the legend
	// Output:
	// true true
	// lobes: 4
}
