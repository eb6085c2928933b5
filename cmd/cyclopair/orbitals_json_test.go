package main

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
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
		res, err := computeOrbitals(in, p, opts, solver, nil)
		if err != nil {
			t.Fatal(err)
		}
		check(toJSON(res, p, cal))
	}
	omega := &orbitalsOptions{omega: 1.4, omegaSet: true}
	res, err := computeOrbitals(orbitalsInput{smiles: "C=C[CH2+]"}, p, omega, solver, nil)
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

// The stdin batch formats JSON on its workers, which reuse one Orbitals each: a molecule's
// warnings must still be its own. Cyclobutadiene (Hückel closed form x = 2, 0, 0, −2: two
// electrons in the degenerate pair at x = 0, an open-shell warning; A. Streitwieser, Molecular
// Orbital Theory for Organic Chemists, Wiley 1961, from memory) between closed-shell molecules warns once per cyclobutadiene line, and only there.
func TestOrbitalsBatchWarningsStayWithTheirMolecule(t *testing.T) {
	var in strings.Builder
	n := 0
	for i := range 600 { // more than one batch, so every worker solves both kinds
		if i%7 == 3 {
			in.WriteString("C1=CC=C1 cbd\n")
			n++
		} else {
			in.WriteString("C=CC=C butadiene\n")
		}
	}
	out, errOut, code := runCLI(t, in.String(), "orbitals", "-", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	lines := strings.Split(strings.TrimSpace(errOut), "\n")
	if len(lines) != n {
		t.Fatalf("%d warning lines for %d cyclobutadiene inputs:\n%s", len(lines), n, errOut)
	}
	for _, l := range lines {
		if !strings.HasPrefix(l, "cyclopair: C1=CC=C1: warning: ") {
			t.Errorf("warning on the wrong molecule: %s", l)
		}
	}
	for i, l := range strings.Split(strings.TrimSpace(out), "\n") {
		cbd := strings.Contains(l, `"name":"cbd"`)
		warned := !strings.Contains(l, `"warnings":[]`)
		if cbd != warned {
			t.Errorf("JSON line %d: cyclobutadiene %v, warnings shown %v: %.200s", i+1, cbd, warned, l)
		}
	}
}

// TestAppendRound6: the integer writer gives strconv's shortest 'f' digits of round6(v) on
// random values over twelve orders of magnitude, both signs, values on the rounding
// boundary of the sixth decimal, and the edges of its range.
func TestAppendRound6(t *testing.T) {
	rnd := rand.New(rand.NewPCG(6, 2026))
	vals := []float64{0, math.Copysign(0, -1), 1e-7, -1e-7, 4e-7, 5e-7, -5e-7, 1.5e-6, 0.1, 0.3, 1.0000005,
		-2.4999995, 123456.7890125, 999999999.999999, -999999999.9999995, 1e9 - 1e-6, 1e9, 2e14, 9.99e8, 1e15, -3e16}
	for range 200000 {
		v := (rnd.Float64()*2 - 1) * math.Pow(10, float64(rnd.IntN(12)-4))
		vals = append(vals, v, math.Round(v*1e6)/1e6+5e-7, math.Round(v*2e6)/2e6)
	}
	for _, v := range vals {
		want := strconv.AppendFloat(nil, round6(v), 'f', -1, 64)
		if got := appendRound6(nil, v); string(got) != string(want) {
			t.Fatalf("appendRound6(%v) = %s, strconv gives %s", v, got, want)
		}
	}
}
