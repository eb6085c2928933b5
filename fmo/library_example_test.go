package fmo_test

import (
	"fmt"

	"cyclopair/fmo"
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
	lib, bad, err := fmo.ParseLibrary(src, fmo.LoadOptions{Name: "screen.yaml"})
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
	// activations: [none lewis] rank by: normal_gap top: 5
	// bad: screen.yaml: 3:36: dienes[1] "typo": SMILES "C1=CC=C(C1" column 11: unclosed branch opened at column 8 (add ')' to close it)
}

// Shards split the pair space into contiguous ranges that cover it exactly.
func ExampleShard_Range() {
	for i := 1; i <= 3; i++ {
		lo, hi := fmo.Shard{Index: i, Count: 3}.Range(100)
		fmt.Printf("shard %d/3: pairs %d..%d\n", i, lo, hi-1)
	}
	// Output:
	// shard 1/3: pairs 0..32
	// shard 2/3: pairs 33..65
	// shard 3/3: pairs 66..99
}
