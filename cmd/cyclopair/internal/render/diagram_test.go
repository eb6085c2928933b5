package render

import (
	"bytes"
	"encoding/xml"
	"io"
	"strings"
	"testing"
)

// butadiene and ethylene: Hückel levels x = ±1.618, ±0.618 and ±1 (closed forms:
// x_j = 2cos(jπ/(n+1)) for a linear polyene of n centres; E. Hückel 1931, any textbook).
func sampleDiagram() *Diagram {
	return &Diagram{
		Title:       "π levels: <script>alert('x')</script> & co",
		Params:      "test-params",
		Calibration: "test-cal",
		EVDecimals:  2,
		Columns: []DiagramColumn{
			{Title: "butadiene <b>", Subtitle: "C=CC=C", HOMO: 1, LUMO: 2, HOMOEV: -9.1, LUMOEV: 0.6,
				Levels: []DiagramLevel{{1.618, 2, 1}, {0.618, 2, 1}, {-0.618, 0, 1}, {-1.618, 0, 1}}},
			{Title: "ethylene", Subtitle: "free", HOMO: 0, LUMO: 1, HOMOEV: -10.5, LUMOEV: 1.8,
				Levels: []DiagramLevel{{1, 2, 1}, {-1, 0, 1}}},
			{Title: "benzene-like", Subtitle: "degenerate test", HOMO: 2, LUMO: 3, HOMOEV: -9.2, LUMOEV: 1.1,
				Levels: []DiagramLevel{{2, 2, 1}, {1, 2, 2}, {1, 2, 2}, {-1, 0, 2}, {-1, 0, 2}, {-2, 0, 1}}},
		},
		Gaps: []DiagramGap{
			{Column: 1, Normal: Energy{0.382, 9.7}, Inverse: Energy{1.618, 11.1}, Controlling: "normal"},
			{Column: 2, Normal: Energy{1.618, 10.3}, Inverse: Energy{1.618, 10.3}, Controlling: "neutral"},
		},
	}
}

// walk decodes the SVG with encoding/xml and returns, per data-column, the number of level
// lines and of frontier-marked levels, plus all text content.
func walk(t *testing.T, svg []byte) (levels map[string]int, frontiers map[string][]string, texts []string) {
	t.Helper()
	levels = map[string]int{}
	frontiers = map[string][]string{}
	dec := xml.NewDecoder(bytes.NewReader(svg))
	var col []string // stack of data-column values of open <g>
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			attr := func(name string) string {
				for _, a := range e.Attr {
					if a.Name.Local == name {
						return a.Value
					}
				}
				return ""
			}
			cur := ""
			if len(col) > 0 {
				cur = col[len(col)-1]
			}
			if e.Name.Local == "g" {
				if c := attr("data-column"); c != "" {
					cur = c
				}
				col = append(col, cur)
			}
			if e.Name.Local == "line" && attr("class") == "level" {
				levels[cur]++
				if f := attr("data-frontier"); f != "" {
					frontiers[cur] = append(frontiers[cur], f)
				}
			}
		case xml.EndElement:
			if e.Name.Local == "g" {
				col = col[:len(col)-1]
			}
		case xml.CharData:
			if s := strings.TrimSpace(string(e)); s != "" {
				texts = append(texts, s)
			}
		}
	}
	return levels, frontiers, texts
}

func TestDiagramStructure(t *testing.T) {
	d := sampleDiagram()
	var buf bytes.Buffer
	if err := WriteDiagram(&buf, d); err != nil {
		t.Fatal(err)
	}
	svg := buf.Bytes()
	levels, frontiers, texts := walk(t, svg)
	for i, c := range d.Columns {
		key := string(rune('0' + i))
		if levels[key] != len(c.Levels) {
			t.Errorf("column %d: %d level lines, want %d (one per π level)", i, levels[key], len(c.Levels))
		}
		if got := strings.Join(frontiers[key], ","); got != "homo,lumo" {
			t.Errorf("column %d: frontier marks %q, want homo,lumo", i, got)
		}
	}
	all := strings.Join(texts, "\n")
	for _, want := range []string{"normal 0.382 |β|", "inverse 1.618 |β|", "9.70 eV (controls)", "HOMO x = 0.618 (−9.10 eV)",
		"LUMO x = −0.618 (0.60 eV)", "calibration test-cal", Caution} {
		if !strings.Contains(all, want) {
			t.Errorf("diagram text lacks %q", want)
		}
	}
	// User text is escaped: the decoder gives back the raw name, the bytes hold no raw tag.
	if !strings.Contains(all, "<script>alert('x')</script> & co") || bytes.Contains(svg, []byte("<script")) || bytes.Contains(svg, []byte("<b>")) {
		t.Error("user text is not escaped in the SVG")
	}
	if !bytes.Contains(svg, []byte("&lt;script&gt;")) {
		t.Error("escaped name not found")
	}
	var again bytes.Buffer
	_ = WriteDiagram(&again, sampleDiagram())
	if !bytes.Equal(svg, again.Bytes()) {
		t.Error("diagram bytes are not deterministic")
	}
	golden(t, "diagram.svg", svg)
}

func TestDiagramEmpty(t *testing.T) {
	if err := WriteDiagram(io.Discard, &Diagram{}); err == nil {
		t.Error("diagram without columns accepted")
	}
}
