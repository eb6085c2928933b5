package main

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"cyclopair/fmo"
	"cyclopair/presets"
)

// drawRun runs the whole CLI in-process and returns exit code, stdout and stderr.
func drawRun(args ...string) (int, string, string) {
	var out, errb bytes.Buffer
	code := run(args, strings.NewReader(""), &out, &errb)
	return code, out.String(), errb.String()
}

func xmlOK(t *testing.T, doc string) {
	t.Helper()
	d := xml.NewDecoder(strings.NewReader(doc))
	for {
		_, err := d.Token()
		if errors.Is(err, io.EOF) {
			return
		}
		if err != nil {
			t.Fatalf("not well-formed XML: %v", err)
		}
	}
}

func TestDrawOrbitalCLI(t *testing.T) {
	code, out, errs := drawRun("draw", "C=CC=O", "--orbital", "lumo", "--name", "acrolein <script>")
	if code != exitOK {
		t.Fatalf("exit %d, stderr %s", code, errs)
	}
	xmlOK(t, out)
	for _, want := range []string{"LUMO of acrolein &lt;script&gt;", "area ∝ c²", "calibration:"} {
		if !strings.Contains(out, want) {
			t.Errorf("orbital SVG lacks %q", want)
		}
	}
	if strings.Contains(out, "<script") {
		t.Error("name emitted as markup")
	}
}

func TestDrawPairCLIFile(t *testing.T) {
	file := filepath.Join(t.TempDir(), "pair.svg")
	code, out, errs := drawRun("draw", "--diene", "C1=CC=CC1", "--dienophile", "O=C1OC(=O)C=C1", "--svg", file)
	if code != exitOK {
		t.Fatalf("exit %d, stderr %s", code, errs)
	}
	if out != "" {
		t.Errorf("stdout not empty with --svg: %q", out)
	}
	b, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	xmlOK(t, string(b))
	if !strings.Contains(string(b), "normal demand") {
		t.Error("cyclopentadiene + maleic anhydride picture does not name normal demand")
	}
}

// TestDrawRunnerUp draws the second orientation of isoprene + methyl acrylate: the caption
// names it as not preferred.
func TestDrawRunnerUp(t *testing.T) {
	code, out, errs := drawRun("draw", "--diene", "isoprene", "--dienophile", "methyl-acrylate", "--orientation", "2")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	xmlOK(t, out)
	if !strings.Contains(out, "Orientation 2 of") || !strings.Contains(out, "(not preferred)") {
		t.Error("runner-up picture does not say which orientation it shows")
	}
}

func TestDrawErrors(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"draw", "C=CC("}, "column 6"},
		{[]string{"draw", "CCC"}, "no π system"},
		{[]string{"draw", "C=C", "--orbital", "lumo+3"}, "LUMO+3 does not exist"},
		{[]string{"draw", "C=C", "--orbital", "sideways"}, "want homo, lumo"},
		{[]string{"draw", "--diene", "C=CC=C"}, "needs both"},
		{[]string{"draw", "C=C", "--diene", "C=CC=C", "--dienophile", "C=C"}, "not both"},
		{[]string{"draw", "--diene", "C=CC=C", "--dienophile", "C=C", "--activate", "lewis"}, "--activate lewis"},
		{[]string{"draw", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--orientation", "9"}, "found"},
		{[]string{"draw", "C=C", "--orientation", "2"}, "applies to a pair picture"},
	} {
		code, out, errs := drawRun(tc.args...)
		if code != exitUsage {
			t.Errorf("%v: exit %d, want %d", tc.args, code, exitUsage)
		}
		if out != "" {
			t.Errorf("%v: stdout %q, want nothing", tc.args, out)
		}
		if !strings.HasPrefix(errs, "cyclopair: ") || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: stderr %q, want a cyclopair: line containing %q", tc.args, errs, tc.want)
		}
	}
}

// TestPairHTML builds the pair command's HTML page through its helper (the same calls
// runPair makes for --format html) and checks it is well-formed and complete.
func TestPairHTML(t *testing.T) {
	p, err := resolveParams("")
	if err != nil {
		t.Fatal(err)
	}
	cal, err := presets.Calibration(p)
	if err != nil {
		t.Fatal(err)
	}
	fo := fmo.NewOptions(p, cal, cal.Name)
	d, err := fmo.NewPartner("cyclopentadiene", "C1=CC=CC1", fmo.RoleDiene, fo)
	if err != nil {
		t.Fatal(err)
	}
	e, err := fmo.NewPartner("acrolein <i>", "C=CC=O", fmo.RoleDienophile, fo)
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	h := newPairHTML(&streams{out: &out, err: io.Discard}, d, e, fo, nil, cal)
	for _, v := range fmo.AnalyzeVariants(d, e, []string{"none", "lewis"}, nil, fo) {
		if v.Err != nil {
			t.Fatal(v.Err)
		}
		if err := h.add(v.Pair); err != nil {
			t.Fatal(err)
		}
	}
	if err := h.close(); err != nil {
		t.Fatal(err)
	}
	xmlOK(t, out.String())
	for _, want := range []string{"cyclopair pair: cyclopentadiene + acrolein &lt;i&gt;", "lewis", "Accuracy on the literature check set", "SDS"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("pair HTML lacks %q", want)
		}
	}
}
