package screen_test

import (
	"fmt"

	"cyclopair/fmo/screen"
)

// Shards split the pair space into contiguous ranges that cover it exactly.
func ExampleShard_Range() {
	for i := 1; i <= 3; i++ {
		lo, hi := screen.Shard{Index: i, Count: 3}.Range(100)
		fmt.Printf("shard %d/3: pairs %d..%d\n", i, lo, hi-1)
	}
	// Output:
	// shard 1/3: pairs 0..32
	// shard 2/3: pairs 33..65
	// shard 3/3: pairs 66..99
}
