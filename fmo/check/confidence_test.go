package check

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"cyclopair/fmo"
	"cyclopair/huckel/ppp"
	"cyclopair/presets"
)

var update = flag.Bool("update", false, "rewrite ../confidence_table.go from the bundled check set")

// confidenceOptions returns DefaultOptions for each π method the table covers: Hückel (the
// default) and PPP-SCF with its Koopmans eV map (as TestValidatePPP runs it).
func confidenceOptions(t *testing.T) []*fmo.Options {
	t.Helper()
	h, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	p := *h
	pp, err := presets.PPPParams(presets.DefaultPPP)
	if err != nil {
		t.Fatal(err)
	}
	p.NewMethod = ppp.Factory(pp)
	sc := pp.Scale()
	p.Calibration, p.CalibrationName = sc, sc.Name
	return []*fmo.Options{h, &p}
}

// TestConfidenceTable regenerates fmo/confidence_table.go from the bundled literature check
// set (presets/literature/cases.yaml: every case with its published source) and fails when
// the committed file differs, so the hit rates printed with every verdict cannot go stale.
// Refresh with `go test ./fmo/check -run TestConfidenceTable -update` after a change that
// moves a check-set outcome, and review the diff.
func TestConfidenceTable(t *testing.T) {
	set, err := BundledCheckSet()
	if err != nil {
		t.Fatal(err)
	}
	var tables []fmo.ConfidenceTable
	for _, o := range confidenceOptions(t) {
		tables = append(tables, ConfidenceTable(set, o))
	}
	src, err := ConfidenceSource(tables)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join("..", "confidence_table.go")
	if *update {
		if err := os.WriteFile(path, src, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	have, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(have, src) {
		t.Errorf("%s is stale: run go test ./fmo/check -run TestConfidenceTable -update and review the diff", path)
	}
}
