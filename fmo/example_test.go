package fmo_test

import (
	"fmt"
	"log"

	"cyclopair/fmo"
)

// Isoprene with methyl acrylate: the "para" adduct is preferred (Fleming, Frontier Orbitals
// and Organic Chemical Reactions, 1976).
func ExampleAnalyze() {
	opts, err := fmo.DefaultOptions()
	if err != nil {
		log.Fatal(err)
	}
	diene, err := fmo.NewPartner("isoprene", "C=CC(C)=C", fmo.RoleDiene, opts)
	if err != nil {
		log.Fatal(err)
	}
	dienophile, err := fmo.NewPartner("methyl acrylate", "C=CC(=O)OC", fmo.RoleDienophile, opts)
	if err != nil {
		log.Fatal(err)
	}
	pair, err := fmo.Analyze(diene, dienophile, opts)
	if err != nil {
		log.Fatal(err)
	}
	best := pair.Orientations[0]
	fmt.Println(pair.Demand, pair.SustmannType, pair.Allowed)
	fmt.Println(best.Label, best.Product, pair.RegioConfidence)
	fmt.Printf("gaps %.3f / %.3f |β|\n", pair.GapNormal.Beta, pair.GapInverse.Beta)
	// Output:
	// normal I true
	// para COC(=O)C1CC=C(C)CC1 clear
	// gaps 1.005 / 1.634 |β|
}

// QuickScore gives the ranking numbers of Analyze without building products.
func ExampleQuickScore() {
	opts, err := fmo.DefaultOptions()
	if err != nil {
		log.Fatal(err)
	}
	diene, _ := fmo.NewPartner("", "C1=CC=CC1", fmo.RoleDiene, opts)
	dienophile, _ := fmo.NewPartner("", "O=C1OC(=O)C=C1", fmo.RoleDienophile, opts)
	q := fmo.QuickScore(diene, dienophile, opts)
	pair, _ := fmo.Analyze(diene, dienophile, opts)
	fmt.Println(q.OK, q.Best == pair.Orientations[0].Score, q.Demand)
	// Output:
	// true true 1
}
