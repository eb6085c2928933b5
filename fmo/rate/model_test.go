package rate

import (
	"bytes"
	"flag"
	"os"
	"testing"

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
