package main

import (
	"bytes"
	"encoding/json"
	"io"
	"strings"
	"testing"
	"time"

	"cyclopair/huckel"
	"cyclopair/presets"
)

// BenchmarkOrbitalsBatch runs `orbitals - --format json` on 1,000 synthetic molecules per op
// and reports, against same-run baselines, the ratio of the appending encoder to
// encoding/json on the same records ("x-encoder") and of the whole batch to computing and
// encoding the molecules one at a time with encoding/json, as before ("x-batch").
func BenchmarkOrbitalsBatch(b *testing.B) {
	// 1,000 distinct conjugated molecules: polyene chains of 2–9 double bonds with a
	// substituent at each end, and substituted aromatics.
	subs := []string{"", "C", "OC", "C#N", "C(=O)OC", "N(C)C", "Cl", "C=O", "[N+](=O)[O-]", "c1ccccc1"}
	pre := []string{"", "C", "CO", "N#C", "COC(=O)", "CN(C)", "Cl", "O=C", "[O-][N+](=O)", "c1ccccc1"}
	var in strings.Builder
	var ins []orbitalsInput
	for i := range 1000 {
		smi := pre[i%10] + strings.Repeat("C=C", 2+i/100) + subs[(i/10)%10]
		if i%7 == 0 {
			smi = pre[i%10] + "c1ccc(cc1)" + subs[(i/10)%10]
		}
		in.WriteString(smi + "\n")
		ins = append(ins, orbitalsInput{smiles: smi})
	}
	p, err := presets.Params(presets.DefaultParams)
	if err != nil {
		b.Fatal(err)
	}
	cal, err := presets.Calibration(p)
	if err != nil {
		b.Fatal(err)
	}
	opts := &orbitalsOptions{format: "json"}
	var records []orbitalsJSON
	solver := new(huckel.Solver)
	for _, x := range ins {
		r, err := computeOrbitals(x, p, opts, solver, nil)
		if err != nil {
			b.Fatal(err)
		}
		records = append(records, toJSON(r, p, cal))
	}
	var tEnc, tRefl, tBatch, tSeq time.Duration
	var buf []byte
	for b.Loop() {
		t0 := time.Now()
		for i := range records {
			buf = append(appendOrbitalsJSON(buf[:0], &records[i]), '\n')
		}
		t1 := time.Now()
		for i := range records {
			if _, err := json.Marshal(records[i]); err != nil {
				b.Fatal(err)
			}
		}
		t2 := time.Now()
		s := &streams{in: strings.NewReader(in.String()), out: io.Discard, err: io.Discard}
		if err := runOrbitals(s, opts, []string{"-"}); err != nil {
			b.Fatal(err)
		}
		t3 := time.Now()
		var out bytes.Buffer
		for _, x := range ins {
			r, _ := computeOrbitals(x, p, opts, solver, nil)
			line, _ := json.Marshal(toJSON(r, p, cal))
			out.Write(line)
		}
		t4 := time.Now()
		tEnc, tRefl, tBatch, tSeq = tEnc+t1.Sub(t0), tRefl+t2.Sub(t1), tBatch+t3.Sub(t2), tSeq+t4.Sub(t3)
	}
	b.ReportMetric(float64(tRefl)/float64(tEnc), "x-encoder")
	b.ReportMetric(float64(tSeq)/float64(tBatch), "x-batch")
}
