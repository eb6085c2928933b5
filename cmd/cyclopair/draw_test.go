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
