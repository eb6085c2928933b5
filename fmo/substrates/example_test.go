package substrates_test

import (
	"fmt"

	"cyclopair/fmo"
	"cyclopair/fmo/screen"
	"cyclopair/fmo/substrates"
)

// A substrate file with one bad row: the good rows load, the bad one is reported with its
// position inside the SMILES.
func ExampleParseLibrary() {
	src := []byte(`dienes:
  - preset: cyclopentadiene
  - {name: typo, smiles: C1=CC=C(C1}
dienophiles:
  - {name: acrolein, smiles: C=CC=O}
activations: [none, lewis]
top: 5
`)
	lib, bad, err := substrates.ParseLibrary(src, substrates.LoadOptions{Name: "screen.yaml", Modes: fmo.Modes(), RankKeys: screen.RankKeyNames()})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, d := range lib.Dienes {
		fmt.Println("diene:", d.Name, d.SMILES)
	}
	fmt.Println("activations:", lib.Activations, "rank by:", lib.RankBy, "top:", lib.Top)
	for _, b := range bad {
		fmt.Println("bad:", b)
	}
	// Output:
	// diene: cyclopentadiene C1=CC=CC1
	// activations: [none lewis] rank by: rate top: 5
	// bad: screen.yaml: 3:36: dienes[1] "typo": SMILES "C1=CC=C(C1" column 11: unclosed branch opened at column 8 (add ')' to close it)
}
