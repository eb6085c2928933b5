package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"cyclopair/presets"
)

// The rate model's applicability domain in every output (issue 10). Anthracene +
// p-benzoquinone has a controlling gap of 0.212 |β|, below the smallest gap of the fitted
// rows (tetracyanoethylene + 9,10-dimethylanthracene, 0.304 |β|): the text says
// "extrapolated", the JSON rate says in_domain false with the note, the CSV row carries the
// two added columns. Cyclopentadiene + maleic anhydride, a fitted row, is inside.
func TestRateDomainOutputs(t *testing.T) {
	out, errOut, code := runCLI(t, "", "pair", "--diene", "c1ccc2cc3ccccc3cc2c1", "--dienophile", "O=C1C=CC(=O)C=C1")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(out, "extrapolated: controlling frontier gap 0.212 |β| outside the fitted range (0.304 to 1.150 |β|)") {
		t.Errorf("pair text lacks the extrapolation line:\n%s", out)
	}
	for _, c := range []struct {
		diene, dienophile string
		in                bool
	}{{"c1ccc2cc3ccccc3cc2c1", "O=C1C=CC(=O)C=C1", false}, {"C1=CCC=C1", "O=C1OC(=O)C=C1", true}} {
		out, errOut, code := runCLI(t, "", "pair", "--diene", c.diene, "--dienophile", c.dienophile, "--format", "json")
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errOut)
		}
		var p struct {
			Rate struct {
				InDomain   *bool     `json:"in_domain"`
				DomainNote string    `json:"domain_note"`
				Leverage   *float64  `json:"leverage"`
				Interval   []float64 `json:"interval"`
			} `json:"rate"`
		}
		if err := json.Unmarshal([]byte(out), &p); err != nil {
			t.Fatal(err)
		}
		r := p.Rate
		if r.InDomain == nil || *r.InDomain != c.in || (r.DomainNote != "") == c.in || r.Leverage == nil || len(r.Interval) != 2 {
			t.Errorf("%s + %s: rate %+v, want in_domain %v", c.diene, c.dienophile, r, c.in)
		}
	}
	out, errOut, code = runCLI(t, "", "demo", "--format", "csv")
	if code != 0 {
		t.Fatalf("demo exit %d: %s", code, errOut)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	in, note := col["rate_in_domain"], col["rate_domain_note"]
	if in == 0 || note == 0 {
		t.Fatalf("CSV header lacks rate_in_domain/rate_domain_note: %v", recs[0])
	}
	flagged := 0
	for _, r := range recs[1:] {
		if r[in] == "false" {
			flagged++
			if !strings.HasPrefix(r[note], "extrapolated: ") {
				t.Errorf("row %s: in domain false, note %q", r[0], r[note])
			}
		} else if r[in] != "true" || r[note] != "" {
			t.Errorf("row %s: rate_in_domain %q, note %q", r[0], r[in], r[note])
		}
	}
	if flagged == 0 {
		t.Error("no demo row outside the domain (the Lewis-acid p-benzoquinone rows have gaps below the fitted range)")
	}
}

// A rate model file written before the domain was stored still loads with --rate-model;
// its predictions are not claimed inside a domain (in_domain false, the note says why).
func TestRateModelWithoutDomain(t *testing.T) {
	b := presets.RateModelYAML()
	i := bytes.Index(b, []byte("\ndomain:\n"))
	if i < 0 {
		t.Fatal("bundled model has no domain key")
	}
	path := filepath.Join(t.TempDir(), "old.yaml")
	if err := os.WriteFile(path, b[:i+1], 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI(t, "", "pair", "--diene", "C1=CCC=C1", "--dienophile", "O=C1OC(=O)C=C1", "--rate-model", path, "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(out, `"in_domain":false`) || !strings.Contains(out, "no applicability domain") {
		t.Errorf("old model file: %s", out)
	}
}

// validate states the domain next to the fit figures: the fitted rows, each descriptor's
// range and the warning leverage (computed by the fit; TestDomainFittedRows checks the rows).
func TestValidateDomainLine(t *testing.T) {
	out, errOut, code := runCLI(t, "", "validate")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{"applicability domain over the 49 fitted rows", "controlling frontier gap 0.304 to 1.150 |β|",
		"Lewis-acid indicator 0 to 1", "at most 0.245 (3p/n)"} {
		if !strings.Contains(out, want) {
			t.Errorf("validate output lacks %q", want)
		}
	}
}

// calibrate --rates writes the domain into the user's model file, and --rate-model reads it
// back: a fitted reaction is inside, a pair with a gap below the fitted range outside.
func TestCalibrateRatesWritesDomain(t *testing.T) {
	rates, _ := presets.KineticsYAML()
	dir := t.TempDir()
	in, model := filepath.Join(dir, "rates.yaml"), filepath.Join(dir, "model.yaml")
	if err := os.WriteFile(in, rates, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, errOut, code := runCLI(t, "", "calibrate", in, "--rates", "--out", model); code != 0 {
		t.Fatalf("calibrate exit %d: %s", code, errOut)
	}
	b, err := os.ReadFile(model)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(b, []byte("\ndomain:\n")) {
		t.Fatal("the written model has no domain")
	}
	for _, c := range []struct {
		diene, dienophile, want string
	}{{"C1=CCC=C1", "O=C1OC(=O)C=C1", `"in_domain":true`}, {"c1ccc2cc3ccccc3cc2c1", "O=C1C=CC(=O)C=C1", `"in_domain":false`}} {
		out, errOut, code := runCLI(t, "", "pair", "--diene", c.diene, "--dienophile", c.dienophile, "--rate-model", model, "--format", "json")
		if code != 0 || !strings.Contains(out, c.want) {
			t.Errorf("%s + %s with the refitted model: exit %d, want %s (%s)", c.diene, c.dienophile, code, c.want, errOut)
		}
	}
}

// screen --in-domain prints only rates the model can vouch for: on the demo file every CSV
// row then has rate_in_domain true and the header states the filter; under --method ppp,
// where the rate model does not apply, the flag is a usage error naming the reason.
func TestScreenInDomainFlag(t *testing.T) {
	name, data := presets.DemoFile()
	path := filepath.Join(t.TempDir(), filepath.Base(name))
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI(t, "", "screen", path, "--in-domain", "--top", "0", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := -1
	for i, h := range recs[0] {
		if h == "rate_in_domain" {
			col = i
		}
	}
	if col < 0 || len(recs) < 2 {
		t.Fatalf("no rate_in_domain column or no rows: %v", recs[0])
	}
	for _, r := range recs[1:] {
		if r[col] != "true" {
			t.Errorf("row %v: rate_in_domain %q under --in-domain", r[:7], r[col])
		}
	}
	tab, _, code := runCLI(t, "", "screen", path, "--in-domain")
	if code != 0 || !strings.Contains(tab, "# filters: rate inside the model's applicability domain only") || strings.Contains(tab, "extrapolated") {
		t.Errorf("table under --in-domain (exit %d) lacks the filter line or shows extrapolated rates:\n%s", code, tab)
	}
	_, errOut, code = runCLI(t, "", "screen", path, "--in-domain", "--method", "ppp", "--rank-by", "score")
	if code != 2 || !strings.Contains(errOut, "--in-domain") || !strings.Contains(errOut, "Hückel descriptors") {
		t.Errorf("--in-domain with --method ppp: exit %d, %q", code, errOut)
	}
}
