package htmlreport

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"os"
	"regexp"
	"strings"
	"testing"

	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/fmo/check"
	"cyclopair/presets"
)

// sample builds a small report: three pairs (one with a hostile name), the bundled check set
// and the default calibration. It is shared with the browser test.
func sample(t testing.TB) []byte {
	t.Helper()
	p, err := presets.Params(presets.DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	cal, err := presets.Calibration(p)
	if err != nil {
		t.Fatal(err)
	}
	opts := fmo.NewOptions(p, cal, cal.Name)
	set, err := check.BundledCheckSet()
	if err != nil {
		t.Fatal(err)
	}
	val := check.Validate(set, opts)
	rep := render.Report{Title: `demo <script>alert("x")</script> & friends`, Source: "fixture.yaml",
		Params: p.Name, Calibration: cal.Name, CalibrationDetail: cal.String(), RankBy: "gap"}
	w := New(nil, rep, Config{Options: opts, Calibration: &cal, Validation: val})
	var buf bytes.Buffer
	w.w = &buf
	for i, tc := range []struct{ dn, d, en, e, act string }{
		{"cyclopentadiene", "C1=CC=CC1", "maleic anhydride", "O=C1OC(=O)C=C1", "none"},
		{"1-methoxybutadiene", "COC=CC=C", `<b>methyl acrylate</b>`, "C=CC(=O)OC", "lewis"},
		{"dimethyl tetrazine", "Cc1nnc(C)nn1", "ethyl vinyl ether", "C=COCC", "none"},
	} {
		d, err := fmo.NewPartner(tc.dn, tc.d, fmo.RoleDiene, opts)
		if err != nil {
			t.Fatal(err)
		}
		e, err := fmo.NewPartner(tc.en, tc.e, fmo.RoleDienophile, opts)
		if err != nil {
			t.Fatal(err)
		}
		if tc.act != "none" {
			if e, err = e.WithActivation(tc.act, nil, opts); err != nil {
				t.Fatal(err)
			}
		}
		pr, err := fmo.Analyze(d, e, opts)
		if err != nil {
			t.Fatal(err)
		}
		pr.DieneName, pr.DienophileName = tc.dn, tc.en
		if i == 1 { // a warning with markup in it, as user-derived text can carry
			pr.Warnings = append(pr.Warnings, `fixture warning <i>not markup</i> & escaped`)
		}
		if err := w.WriteRow(render.Row{Rank: i + 1, Pair: pr}); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(render.Summary{Pairs: 3, Passed: 3, Shown: 3}); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestWellFormedAndEscaped(t *testing.T) {
	doc := sample(t)
	if dir := os.Getenv("CYCLOPAIR_DRAW_DIR"); dir != "" {
		_ = os.WriteFile(dir+"/report.html", doc, 0o644)
	}
	d := xml.NewDecoder(bytes.NewReader(doc))
	d.Strict = true
	elements := 0
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatalf("report is not well-formed XML: %v", err)
		}
		if se, ok := tok.(xml.StartElement); ok {
			elements++
			if strings.EqualFold(se.Name.Local, "script") {
				t.Fatal("report contains a <script> element")
			}
		}
	}
	if elements < 50 {
		t.Errorf("only %d elements: report suspiciously small", elements)
	}
	s := string(doc)
	if !strings.Contains(s, "demo &lt;script&gt;") || strings.Contains(s, "<b>") || strings.Contains(s, "<i>") ||
		!strings.Contains(s, "fixture warning &lt;i&gt;not markup&lt;/i&gt; &amp; escaped") {
		t.Error("user text not escaped")
	}
	for _, want := range []string{render.Caution, "SDS", "hazard review", "Ranked pairs", "Pictures of the top pairs",
		"Accuracy on the literature check set", "Calibration (x → eV)", "Coulomb (h) and resonance (k) parameters", "circle area ∝ c²",
		"Warnings and competing side reactions", `href="#accuracy"`} {
		if !strings.Contains(s, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	// self-contained: nothing fetched (no src/href to anything but fragments and data:)
	for _, re := range []string{`src=`, `href="(https?:|//|[^#d])`, `url\((?:[^#])`, `@import`} {
		if m := regexp.MustCompile(re).FindString(s); m != "" {
			t.Errorf("report references an external resource: %q", m)
		}
	}
	// every pattern id is unique on the page (several inline SVGs share it)
	ids := regexp.MustCompile(`id="([^"]+)"`).FindAllStringSubmatch(s, -1)
	seen := map[string]bool{}
	for _, m := range ids {
		if seen[m[1]] {
			t.Errorf("duplicate id %q", m[1])
		}
		seen[m[1]] = true
	}
	// three pairs, each: pair picture, level diagram, 4 orbital pictures
	if n := strings.Count(s, "<svg "); n != 18 {
		t.Errorf("%d inline SVG pictures, want 18 (3 pairs × (pair + levels + 4 orbitals))", n)
	}
	if strings.Contains(s, "<?xml") {
		t.Error("an inlined SVG kept its XML declaration")
	}
}

func TestEmptyReport(t *testing.T) {
	p, _ := presets.Params(presets.DefaultParams)
	var buf bytes.Buffer
	w := New(&buf, render.Report{Params: p.Name}, Config{Options: fmo.NewOptions(p, nil, ""), NoValidation: true})
	if err := w.Close(render.Summary{}); err != nil {
		t.Fatal(err)
	}
	s := buf.String()
	if !strings.Contains(s, "No pair passed the filters.") || !strings.Contains(s, render.Caution) {
		t.Errorf("empty report lacks the empty-table sentence or the caution")
	}
	if !strings.Contains(s, "was not run for this report") {
		t.Errorf("missing validation is not stated")
	}
}

// TestRunsCheckSet: without a Validation the report runs the bundled check set itself and
// shows one row per category.
func TestRunsCheckSet(t *testing.T) {
	p, _ := presets.Params(presets.DefaultParams)
	var buf bytes.Buffer
	w := New(&buf, render.Report{Params: p.Name}, Config{Options: fmo.NewOptions(p, nil, "")})
	if err := w.Close(render.Summary{}); err != nil {
		t.Fatal(err)
	}
	s := buf.String()
	if !strings.Contains(s, "hit rate") {
		t.Fatal("check-set table missing")
	}
	for _, c := range check.Categories() {
		if !strings.Contains(s, "<td>"+c+"</td>") {
			t.Errorf("category %q missing from the accuracy table", c)
		}
	}
}
