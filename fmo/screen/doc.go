// Package screen is the batch engine of cyclopair: it screens every diene × dienophile ×
// activation of a substrate library with the pair theory of package fmo, ranks and filters
// the pairs and runs the full analysis only for the rows that are output.
//
// The flow: Resolve turns a substrate file (package substrates) and command-line settings
// into one Config; Config.Prepare builds every partner once (prepare.go); Prepared.Screen
// scores the pair space on a worker pool (engine.go, space.go), ranks (rank.go) and emits rows.
//
// A screen takes a Library (substrate file), prepares every molecule once —
// parse, perceive, solve, find reacting units; each dienophile once per activation mode —
// then scores every diene × dienophile × activation triple with the allocation-free
// QuickScore kernel on a worker pool, ranks by the chosen key and runs the full Analyze only
// for the rows that are output.
//
// Guarantees:
//   - Output is the same, row for row, whatever the number of workers (pairs are ranked by
//     (key, pair index), a strict total order; see engine.go).
//   - With Top = K the ranking keeps K records (a heap), and the unranked stream keeps a few
//     chunks in flight, so memory does not grow with the number of pairs. Ranking every pair
//     (Top = 0 with a rank key) keeps 16 bytes per passing pair (about three times that
//     while the workers' lists are merged).
//   - Bad inputs never stop the screen: molecules that fail to prepare and pairs whose full
//     analysis fails are reported as ScreenFailures and the rest goes on.
//   - A Shard selects a contiguous slice of the pair space; the unranked outputs of shards
//     1..n concatenate to the unsharded unranked output.
package screen
