package main

import (
	"encoding/json"
	"math"
	"testing"

	"cyclopair/huckel"
	"cyclopair/presets"
)

// The appending encoder writes exactly what encoding/json writes for the same record: real
// molecules (closed and open shell, ω-technique, several fragments, heteroatoms) and records
// with the awkward cases (names needing escapes, invalid UTF-8, NaN, nil parts).
func TestOrbitalsJSONEncoder(t *testing.T) {
	p, err := presets.Params(presets.DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	cal, err := presets.Calibration(p)
	if err != nil {
		t.Fatal(err)
	}
	solver := new(huckel.Solver)
	check := func(j orbitalsJSON) {
		t.Helper()
		want, err := json.Marshal(j)
		if err != nil {
			t.Fatal(err)
		}
		if got := appendOrbitalsJSON(nil, &j); string(got) != string(want) {
			t.Errorf("encoder differs from encoding/json\n got %s\nwant %s", got, want)
		}
	}
	opts := &orbitalsOptions{}
	for _, in := range []orbitalsInput{
		{smiles: "C=CC=C", name: "butadiene"}, {smiles: "C=CC=O"}, {smiles: "c1ccncc1", name: `a "quoted" <name> & more`},
		{smiles: "C1=CC=C1", name: "cyclobutadiene"}, {smiles: "[CH2-]C=C"}, {smiles: "C=CC=C.C=O", name: "two\tparts\n"},
		{smiles: "O=C1C=CC(=O)C=C1", name: "p-benzoquinone \u2028 \xff"}, {smiles: "c1ccc2ccccc2c1"},
	} {
		res, err := computeOrbitals(in, p, opts, solver)
		if err != nil {
			t.Fatal(err)
		}
		check(toJSON(res, p, cal))
	}
	omega := &orbitalsOptions{omega: 1.4, omegaSet: true}
	res, err := computeOrbitals(orbitalsInput{smiles: "C=C[CH2+]"}, p, omega, solver)
	if err != nil {
		t.Fatal(err)
	}
	j := toJSON(res, p, cal)
	if j.Iterations == 0 {
		t.Error("ω run without iterations: the omega_iterations key is not exercised")
	}
	check(j)
	check(orbitalsJSON{SMILES: "C=C", Method: "ppp", SCFCycles: 7, Calibration: calJSON(cal)})
	check(orbitalsJSON{SMILES: "\x01\x1f", PiEnergy: num(math.NaN()), Omega: num(math.Inf(-1)), Calibration: calJSON(cal)})
	check(orbitalsJSON{HOMO: &frontierJSON{Index: 2, X: -0.0000001}, SOMO: &frontierJSON{Set: []int{}},
		Levels: []levelJSON{{X: 1, Coefficients: nil}, {Coefficients: []num{0.5, -0.5}}}, Centres: []centreJSON{{Element: "N", Type: "N2"}}, Warnings: []string{"w<1>"}})
}
