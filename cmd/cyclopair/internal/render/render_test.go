package render

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"strings"
	"testing"

	goldenfile "cyclopair/cmd/cyclopair/internal/golden"
	"cyclopair/fmo"
)

// golden compares got with testdata/name, or rewrites it under -update.
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	goldenfile.Check(t, name, got)
}

// samplePairs are hand-built Pair values (numbers invented for the renderer tests, not
// analysis results) exercising: a normal-demand pair, an inverse one, a pair without any
// orientation, names needing escapes in every format, and warnings.
func samplePairs() []Row {
	p1 := &fmo.Pair{
		DieneName: "cyclopentadiene", DienophileName: "acrolein",
		Diene: "C1=CC=CC1", Dienophile: "C=CC=O", Activation: "lewis",
		ActivatedDienophile: "C=CC=O[B](F)(F)F",
		Demand:              "normal", SustmannType: "I",
		GapNormal:  fmo.Energy{Beta: 0.91234, EV: 7.1},
		GapInverse: fmo.Energy{Beta: 1.8, EV: 10.25},
		Orientations: []fmo.Orientation{{
			Label: "", Product: "O=CC1CC2C=CC1C2", Stabilization: 0.1234, Preferred: true,
		}},
		RegioMargin: 0, RegioConfidence: "no preference", Endo: "yes", Allowed: true,
		Params: "demo-params", Calibration: "demo-cal", EVDecimals: 1,
	}
	p2 := &fmo.Pair{
		DieneName: `1,2,4-triazine <script>alert(1)</script>`, DienophileName: "enamine | pipe",
		Diene: "c1cnnnc1", Dienophile: "C=CN1CCCC1", Activation: "none",
		Demand: "inverse", SustmannType: "III",
		GapNormal:  fmo.Energy{Beta: 1.5, EV: 9.0},
		GapInverse: fmo.Energy{Beta: 0.7004999, EV: 6.0049},
		Orientations: []fmo.Orientation{{
			Label: "ortho", Product: "C1CCN(C1)C1CC=NN=NC1", Stabilization: 0.05,
		}, {Label: "meta", Product: "x", Stabilization: 0.01}},
		RegioMargin: 0.04, RegioConfidence: "clear", Endo: "weak", Allowed: true,
		Params: "demo-params", Calibration: "demo-cal", EVDecimals: 2,
		Warnings: []string{"first, with comma", `second "quoted"`},
	}
	p3 := &fmo.Pair{
		DieneName: "anthracene", DienophileName: "ethylene",
		Diene: "c1ccc2cc3ccccc3cc2c1", Dienophile: "C=C", Activation: "none",
		Demand: "neutral", SustmannType: "II",
		GapNormal:  fmo.Energy{Beta: -0.0000001, EV: -0.0001},
		GapInverse: fmo.Energy{Beta: 1, EV: 2},
		Allowed:    false, Params: "", Calibration: "", EVDecimals: 1,
		Warnings: []string{"no orientation"},
	}
	return []Row{{Rank: 1, Number: 7, Pair: p1}, {Rank: 2, Number: 3, Pair: p2}, {Rank: 10, Pair: p3}}
}

func sampleReport() Report {
	return Report{
		Title: "renderer test", Source: "test.yaml", Params: "demo-params",
		Calibration: "demo-cal", CalibrationDetail: "E/eV = a + b·x (test)",
		RankBy: "normal_gap", Filters: []string{"demand = normal", "regio margin ≥ 0.010 |β|"},
	}
}

func renderAll(t *testing.T, f Format) []byte {
	t.Helper()
	var buf bytes.Buffer
	w, err := New(f, &buf, sampleReport(), Layout{DieneWidth: 15, DienophileWidth: 14, ActivationWidth: 10})
	if err != nil {
		t.Fatal(err)
	}
	rows := samplePairs()
	for _, r := range rows {
		if err := w.WriteRow(r); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(Summary{Pairs: 12, Passed: 5, Shown: len(rows), Failed: 1}); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestGoldenFormats(t *testing.T) {
	for _, f := range Formats {
		t.Run(string(f), func(t *testing.T) {
			got := renderAll(t, f)
			if f != JSON { // JSON carries every Pair field: checked by TestJSONLinesKeepContract, not pinned byte for byte
				golden(t, "report."+string(f), got)
			}
			if !bytes.Contains(got, []byte(Caution)) {
				t.Errorf("%s output lacks the caution line", f)
			}
			if !bytes.Contains(got, []byte("demo-params")) || !bytes.Contains(got, []byte("demo-cal")) {
				t.Errorf("%s output does not name the parameter set and calibration", f)
			}
			if !bytes.Equal(got, renderAll(t, f)) {
				t.Errorf("%s output is not deterministic", f)
			}
		})
	}
}

func TestCSVParsesBack(t *testing.T) {
	recs, err := csv.NewReader(bytes.NewReader(renderAll(t, CSV))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 4 {
		t.Fatalf("got %d records, want header + 3", len(recs))
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	if got := recs[2][col["warnings"]]; got != `first, with comma | second "quoted"` {
		t.Errorf("warnings cell = %q", got)
	}
	if got := recs[2][col["gap_beta"]]; got != "0.700" { // controlling gap of an inverse pair is gap_inverse
		t.Errorf("gap_beta of the inverse pair = %q, want 0.700", got)
	}
	if got := recs[3][col["gap_beta"]]; got != "0.000" { // -1e-7 must not print as -0.000
		t.Errorf("gap_beta = %q, want 0.000", got)
	}
}

func TestJSONLinesKeepContract(t *testing.T) {
	lines := strings.Split(strings.TrimSpace(string(renderAll(t, JSON))), "\n")
	if len(lines) != 3 {
		t.Fatalf("got %d lines, want 3", len(lines))
	}
	for i, l := range lines {
		var m map[string]any
		if err := json.Unmarshal([]byte(l), &m); err != nil {
			t.Fatalf("line %d: %v", i+1, err)
		}
		// Keys from the DEVELOPERS.md contract plus the batch additions.
		for _, k := range []string{"demand", "gap_normal", "gap_inverse", "orientations", "allowed",
			"warnings", "activation", "diene_name", "dienophile_name", "rank", "caution", "params", "calibration"} {
			if _, ok := m[k]; !ok {
				t.Errorf("line %d lacks key %q", i+1, k)
			}
		}
	}
	// Each line is exactly the Pair's own JSON plus rank and caution.
	for i, r := range samplePairs() {
		var got, want map[string]any
		_ = json.Unmarshal([]byte(lines[i]), &got)
		cp := *r.Pair
		if cp.Params == "" {
			cp.Params, cp.Calibration = "demo-params", "demo-cal"
		}
		b, _ := json.Marshal(&cp)
		_ = json.Unmarshal(b, &want)
		want["rank"], want["caution"] = float64(r.Rank), Caution
		if r.Number > 0 {
			want["pair_number"] = float64(r.Number)
		}
		if gb, wb := mustJSON(got), mustJSON(want); gb != wb {
			t.Errorf("line %d:\n got %s\nwant %s", i+1, gb, wb)
		}
	}
	// The third pair had no params/calibration: the report's are filled in.
	var p struct{ Params, Calibration string }
	if err := json.Unmarshal([]byte(lines[2]), &p); err != nil {
		t.Fatal(err)
	}
	if p.Params != "demo-params" || p.Calibration != "demo-cal" {
		t.Errorf("params/calibration = %q/%q, want the report's", p.Params, p.Calibration)
	}
}

func TestMarkdownEscapesCells(t *testing.T) {
	md := string(renderAll(t, Markdown))
	if strings.Contains(md, "<script>") {
		t.Error("markdown contains a raw <script> tag")
	}
	if !strings.Contains(md, `enamine \| pipe`) {
		t.Error("pipe in a name is not escaped")
	}
	// Every table row has the same number of unescaped cell separators as the header.
	var want int
	for _, l := range strings.Split(md, "\n") {
		if !strings.HasPrefix(l, "|") {
			continue
		}
		n := strings.Count(l, "|") - strings.Count(l, `\|`)
		if want == 0 {
			want = n
		} else if n != want {
			t.Errorf("row has %d separators, header %d: %s", n, want, l)
		}
	}
}

func TestTableAligned(t *testing.T) {
	out := string(renderAll(t, Table))
	var header string
	var rows []string
	for _, l := range strings.Split(out, "\n") {
		switch {
		case strings.HasPrefix(l, "rank"):
			header = l
		case l != "" && !strings.HasPrefix(l, "#"):
			rows = append(rows, l)
		}
	}
	// The "gap/eV" column is right-aligned: its last rune sits at the same rune column in
	// every row whose names fit the layout.
	end := func(s, sub string) int { return len([]rune(s[:strings.Index(s, sub)+len(sub)])) }
	want := end(header, "gap/eV")
	for _, r := range rows[:1] {
		if got := end(r, " 7.1"); got != want {
			t.Errorf("gap/eV column ends at %d, header at %d:\n%s\n%s", got, want, header, r)
		}
	}
}

func TestParseFormat(t *testing.T) {
	for in, want := range map[string]Format{"table": Table, "CSV": CSV, "jsonl": JSON, "md": Markdown} {
		if got, err := ParseFormat(in); err != nil || got != want {
			t.Errorf("ParseFormat(%q) = %q, %v", in, got, err)
		}
	}
	if _, err := ParseFormat("html5"); err == nil {
		t.Error("ParseFormat(html5) succeeded")
	}
}

// mustJSON re-encodes a decoded value (map keys sorted by encoding/json).
func mustJSON(v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		panic(err)
	}
	return string(b)
}
