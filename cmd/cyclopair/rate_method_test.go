package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestRateUnderPPP: the rate model is fitted on Hückel descriptors (gap coefficient per
// Hückel |β|; PPP gaps are about 3× larger), so under --method ppp it is refused where asked
// for and left out elsewhere, never applied silently.
func TestRateUnderPPP(t *testing.T) {
	_, errOut, code := runCLI(t, "", "screen", filepath.Join("..", "..", "presets", "demo.yaml"), "--method", "ppp", "--rank-by", "rate")
	if code != 2 || !strings.Contains(errOut, "--rank-by rate: the rate model is fitted on Hückel descriptors") {
		t.Errorf("screen --method ppp --rank-by rate: exit %d, %q", code, errOut)
	}
	dir := t.TempDir()
	file := filepath.Join(dir, "s.yaml")
	if err := os.WriteFile(file, []byte("dienes:\n  - {name: butadiene, smiles: C=CC=C}\ndienophiles:\n  - {name: acrolein, smiles: C=CC=O}\nmethod: ppp\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI(t, "", "screen", file)
	if code != 0 || !strings.Contains(out, "ranked by: score") {
		t.Errorf("screen under PPP without a rank key: exit %d, %s\n%s", code, errOut, out)
	}
	out, _, code = runCLI(t, "", "screen", file, "--format", "json")
	if code != 0 || strings.Contains(out, `"rate"`) {
		t.Errorf("screen JSON under PPP carries a rate (exit %d):\n%s", code, out)
	}
	out, errOut, code = runCLI(t, "", "pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--method", "ppp", "--format", "json")
	if code != 0 || strings.Contains(out, `"rate"`) || !strings.Contains(errOut, "no rate or isomer shares") {
		t.Errorf("pair --method ppp: exit %d, stderr %q, rate in JSON: %v", code, errOut, strings.Contains(out, `"rate"`))
	}
	out, _, code = runCLI(t, "", "pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--format", "json")
	if code != 0 || !strings.Contains(out, `"rate"`) {
		t.Errorf("pair under Hückel lacks the rate (exit %d)", code)
	}
}
