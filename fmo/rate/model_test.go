package rate

import (
	"bytes"
	"flag"
	"os"
	"testing"

	"cyclopair/fmo"
	"cyclopair/presets"
)

var update = flag.Bool("update", false, "rewrite presets/kinetics/model.yaml from a fresh fit")

// The bundled model must be the fit of the bundled data with the current code: the
// checksum of the kinetics set and the refitted file must both match.
func TestEmbeddedModel(t *testing.T) {
	m, err := FitBundled()
	if err != nil {
		t.Fatal(err)
	}
	b, err := m.Marshal(ModelHeader)
	if err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.WriteFile("../../presets/kinetics/model.yaml", b, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	emb, err := Default()
	if err != nil {
		t.Fatalf("bundled model: %v (regenerate: go test ./fmo/rate -run TestEmbeddedModel -update)", err)
	}
	if emb.Checksum != presets.KineticsChecksum() {
		t.Fatalf("bundled model was fitted on other data (checksum %s, data %s): regenerate with go test ./fmo/rate -run TestEmbeddedModel -update", emb.Checksum, presets.KineticsChecksum())
	}
	if !bytes.Equal(b, presets.RateModelYAML()) {
		t.Fatalf("bundled model is stale: a refit differs (regenerate with go test ./fmo/rate -run TestEmbeddedModel -update)")
	}
}

// A model file read back predicts what the fitted model predicts (to the file's rounding).
func TestModelRoundTrip(t *testing.T) {
	m, err := FitBundled()
	if err != nil {
		t.Fatal(err)
	}
	b, err := m.Marshal("")
	if err != nil {
		t.Fatal(err)
	}
	back, err := ParseModel(b, "round-trip")
	if err != nil {
		t.Fatal(err)
	}
	d := Descriptors{Gap: 0.6, Frontier: 0.1, Localization: 5.5, DieneLocalization: 2.6, DieneConjugation: 2.5,
		Conformation: Conformation{SCis: -1.7, Reach: 0}, Activation: fmo.ActivateLewis}
	a, c := m.Predict(&d), back.Predict(&d)
	if abs(a.Log10KRel-c.Log10KRel) > 1e-4 || abs(a.Hi-c.Hi) > 1e-4 {
		t.Errorf("round trip: %+v, back %+v", a, c)
	}
	if _, err := ParseModel([]byte("format: other\n"), "x"); err == nil {
		t.Error("a file of another format was accepted")
	}
}

// The conformation descriptors of known dienes, from the graph (values follow from the
// constants and the regular-polygon geometry: chord of a regular pentagon of 1.45 Å sides
// 2.346 Å, of a hexagon 2.90 Å).
func TestConformation(t *testing.T) {
	opts, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		smi      string
		locked   bool
		z, bulky int
		reach    float64
	}{
		{"C1=CCC=C1", true, 0, 0, 2.346 - 2.90},
		{"C1=CC=CCC1", true, 0, 0, 0},
		{"C=CC=C", false, 0, 0, 0},
		{"C/C=C/C=C", false, 0, 0, 0},
		{"C/C=C\\C=C", false, 1, 0, 0},
		{"C=CC(=C)C(C)(C)C", false, 0, 1, 0},
		{"C=C1CCCCC1=C", true, 0, 0, 0},
	}
	for _, c := range cases {
		p, err := fmo.NewPartner(c.smi, c.smi, fmo.RoleDiene, opts)
		if err != nil {
			t.Fatal(err)
		}
		var got *Conformation
		for i, u := range p.Units {
			if u.Kind == fmo.UnitDiene {
				cf := PartnerConformations(p)[i]
				got = &cf
				break
			}
		}
		if got == nil {
			t.Fatalf("%s: no diene unit", c.smi)
		}
		if got.Locked != c.locked || got.ZSubstituents != c.z || got.BulkyInner != c.bulky || abs(got.Reach-c.reach) > 0.002 {
			t.Errorf("%s: %+v", c.smi, *got)
		}
	}
}

// A series the data file marks outside_model is listed and predicted but does not move the
// fit: the coefficients are those of the fit without it, and its statistics say why.
func TestOutsideModelNotFitted(t *testing.T) {
	obs := bundledObs(t)
	var without []SeriesObs
	outside := ""
	for _, s := range obs {
		if s.OutsideModel != "" {
			outside = s.ID
			continue
		}
		without = append(without, s)
	}
	if outside == "" {
		t.Skip("no series of the bundled set is marked outside_model")
	}
	all, err := Fit(obs, DefaultFitOptions())
	if err != nil {
		t.Fatal(err)
	}
	part, err := Fit(without, DefaultFitOptions())
	if err != nil {
		t.Fatal(err)
	}
	for j := range all.Coef {
		if abs(all.Coef[j]-part.Coef[j]) > 1e-12 {
			t.Errorf("%s: coefficient %s %g with %s listed, %g without it", outside, Names[j], all.Coef[j], outside, part.Coef[j])
		}
	}
	for _, st := range all.Series {
		if st.ID == outside && (st.InModel || st.Outside == "" || st.Rows == 0) {
			t.Errorf("%s: statistics %+v, want listed (rows, RMSE) with in_model false and a reason", outside, st)
		}
	}
}
