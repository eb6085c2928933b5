package render

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// The energy-level diagram (SVG). One column per partner — the 4π partner first, then the 2π
// partner once per activation variant — with every π level as a horizontal line at its
// energy (higher on the page = higher in energy, that is smaller x in E = α + xβ, β < 0).
// Degenerate levels sit side by side. Electrons are drawn as small up/down half-arrows on
// occupied levels; empty levels are dashed; the HOMO and LUMO of each column are drawn thicker
// and labelled with x and eV. The diene's HOMO and LUMO are carried across the page as thin
// dotted guide lines, and each 2π column gets two vertical gap markers: a solid double arrow
// for the normal-demand gap (LUMO(2π) − HOMO(4π)) and a dashed one for the inverse gap
// (LUMO(4π) − HOMO(2π)), each labelled in |β| and eV; the controlling gap's label is bold.
// Everything that matters is told by line style and text, so the diagram reads in grey print.
//
// Output is deterministic: coordinates use one decimal, elements come in a fixed order, and
// every user text (names, SMILES) is escaped with encoding/xml.

// DiagramLevel is one π level of a column.
type DiagramLevel struct {
	X          float64 // E = α + xβ
	Occupancy  float64 // electrons (0, 1, 2 or fractional in a partly filled degenerate set)
	Degenerate int     // size of its degenerate set (1 when not degenerate)
}

// DiagramColumn is one partner (or activated variant).
type DiagramColumn struct {
	Title    string // partner name
	Subtitle string // SMILES, or "activation: lewis"
	Levels   []DiagramLevel
	HOMO     int     // index into Levels, -1 if none
	LUMO     int     // index into Levels, -1 if none
	HOMOEV   float64 // calibrated energies of the frontier levels
	LUMOEV   float64
}

// DiagramGap is a pair of gaps between the 4π column (Columns[0]) and one 2π column.
type DiagramGap struct {
	Column      int    // index of the 2π column
	Normal      Energy // LUMO(2π) − HOMO(4π)
	Inverse     Energy // LUMO(4π) − HOMO(2π)
	Controlling string // "normal", "inverse" or "neutral"
}

// Energy is a gap in |β| and eV.
type Energy struct{ Beta, EV float64 }

// Diagram is everything WriteDiagram draws.
type Diagram struct {
	Title       string
	Columns     []DiagramColumn // Columns[0] is the 4π partner
	Gaps        []DiagramGap
	Params      string
	Calibration string
	// EVDecimals is how many decimals the eV labels get: what the calibration supports
	// (fmo.Pair.EVDecimals, huckel.Calibration.GapDecimals).
	EVDecimals int
}

// layout constants (px). The 4π column is [frontier labels | levels]; each 2π column is
// [gap labels | two gap arrows | levels | frontier labels].
const (
	dgLeft      = 60.0  // axis area
	dgLabelW    = 150.0 // frontier label area
	dgLevelW    = 84.0  // width of a level line
	dgGapW      = 130.0 // gap labels and arrows left of a 2π column's levels
	dgTop       = 92.0  // first pixel of the level area
	dgPerBeta   = 72.0  // px per unit of x
	dgBottomPad = 96.0
)

// levelLeft is the x of the left end of column ci's level lines.
func levelLeft(ci int) float64 {
	if ci == 0 {
		return dgLeft + dgLabelW
	}
	return dgLeft + dgLabelW + dgLevelW + float64(ci-1)*(dgGapW+dgLevelW+dgLabelW) + dgGapW
}

// WriteDiagram writes d as a standalone SVG document.
func WriteDiagram(w io.Writer, d *Diagram) error {
	if len(d.Columns) == 0 {
		return fmt.Errorf("render: diagram without columns")
	}
	xmin, xmax := math.Inf(1), math.Inf(-1)
	for _, c := range d.Columns {
		for _, l := range c.Levels {
			xmin = math.Min(xmin, l.X)
			xmax = math.Max(xmax, l.X)
		}
	}
	if math.IsInf(xmin, 0) {
		xmin, xmax = -1, 1
	}
	xmin = math.Floor(xmin*2-0.5) / 2
	xmax = math.Ceil(xmax*2+0.5) / 2
	y := func(x float64) float64 { return dgTop + (x-xmin)*dgPerBeta }
	width := levelLeft(len(d.Columns)-1) + dgLevelW + dgLabelW + 10
	if len(d.Columns) == 1 {
		width = levelLeft(0) + dgLevelW + 40
	}
	width = math.Max(width, 760) // room for the header and footer lines
	height := y(xmax) + dgBottomPad

	var b svgBuf
	b.raw(`<?xml version="1.0" encoding="UTF-8"?>` + "\n")
	b.raw(fmt.Sprintf(`<svg xmlns="http://www.w3.org/2000/svg" width="%s" height="%s" viewBox="0 0 %s %s" font-family="sans-serif" font-size="12">`+"\n",
		n1(width), n1(height), n1(width), n1(height)))
	b.raw(`<defs><marker id="dg-arrow" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,1 L9,5 L0,9 z" fill="#000"/></marker></defs>` + "\n")
	b.raw(`<rect x="0" y="0" width="` + n1(width) + `" height="` + n1(height) + `" fill="#fff"/>` + "\n")
	title := d.Title
	if title == "" {
		title = "π energy levels"
	}
	b.text(16, 22, "start", `font-size="15" font-weight="bold"`, title)
	b.text(16, 40, "start", `font-size="11"`, "E = α + xβ with β < 0: higher on the page is higher in energy. Solid gap arrow: normal demand; dashed: inverse demand; bold label: controlling gap.")

	// axis
	b.raw(fmt.Sprintf(`<g class="axis"><line x1="%s" y1="%s" x2="%s" y2="%s" stroke="#000" stroke-width="1"/>`+"\n",
		n1(dgLeft-14), n1(y(xmin)), n1(dgLeft-14), n1(y(xmax))))
	for t := math.Ceil(xmin); t <= xmax+1e-9; t++ {
		b.raw(fmt.Sprintf(`<line x1="%s" y1="%s" x2="%s" y2="%s" stroke="#000"/>`, n1(dgLeft-18), n1(y(t)), n1(dgLeft-14), n1(y(t))))
		b.text(dgLeft-22, y(t)+4, "end", `font-size="11"`, fmtSigned(t, 0))
	}
	b.text(dgLeft-40, y(xmin)-14, "start", `font-size="11"`, "x")
	b.raw(fmt.Sprintf(`<line x1="%s" y1="%s" x2="%s" y2="%s" stroke="#999" stroke-dasharray="1 3"/>`, n1(dgLeft-10), n1(y(0)), n1(width-20), n1(y(0))))
	b.raw("</g>\n")

	// diene guide lines
	d0 := d.Columns[0]
	guides := [2]struct {
		idx   int
		label string
	}{{d0.HOMO, "HOMO(4π)"}, {d0.LUMO, "LUMO(4π)"}}
	for _, g := range guides {
		if g.idx < 0 || g.idx >= len(d0.Levels) {
			continue
		}
		gy := y(d0.Levels[g.idx].X)
		b.raw(fmt.Sprintf(`<line class="guide" x1="%s" y1="%s" x2="%s" y2="%s" stroke="#000" stroke-width="0.6" stroke-dasharray="2 3"/>`+"\n",
			n1(levelLeft(0)+dgLevelW), n1(gy), n1(width-20), n1(gy)))
	}

	for ci, c := range d.Columns {
		cx := levelLeft(ci) + dgLevelW/2 // centre of the level lines
		b.raw(fmt.Sprintf(`<g class="column" data-column="%d">`+"\n", ci))
		b.text(cx, 60, "middle", `font-weight="bold"`, clip(c.Title, 40))
		b.text(cx, 75, "middle", `font-size="10"`, clip(c.Subtitle, 48))
		// degenerate sets side by side
		for i := 0; i < len(c.Levels); {
			n := 1
			for i+n < len(c.Levels) && math.Abs(c.Levels[i+n].X-c.Levels[i].X) < 1e-6 {
				n++
			}
			segW := (dgLevelW - 6*float64(n-1)) / float64(n)
			for k := 0; k < n; k++ {
				li := i + k
				l := c.Levels[li]
				x1 := cx - dgLevelW/2 + float64(k)*(segW+6)
				ly := y(l.X)
				attrs := `stroke="#000" stroke-width="1.4"`
				if l.Occupancy == 0 {
					attrs = `stroke="#000" stroke-width="1.4" stroke-dasharray="5 3"`
				}
				role := ""
				if li == c.HOMO {
					role, attrs = "homo", strings.Replace(attrs, `stroke-width="1.4"`, `stroke-width="3"`, 1)
				} else if li == c.LUMO {
					role, attrs = "lumo", strings.Replace(attrs, `stroke-width="1.4"`, `stroke-width="3"`, 1)
				}
				b.raw(fmt.Sprintf(`<line class="level" data-x="%s" data-occupancy="%s" data-frontier="%s" x1="%s" y1="%s" x2="%s" y2="%s" %s/>`+"\n",
					strconv.FormatFloat(l.X, 'f', 4, 64), strconv.FormatFloat(l.Occupancy, 'f', 2, 64), role,
					n1(x1), n1(ly), n1(x1+segW), n1(ly), attrs))
				electrons(&b, x1+segW/2, ly, l.Occupancy)
			}
			i += n
		}
		// frontier labels, right of the level lines (left for the first column)
		for _, f := range []struct {
			idx  int
			name string
			ev   float64
		}{{c.HOMO, "HOMO", c.HOMOEV}, {c.LUMO, "LUMO", c.LUMOEV}} {
			if f.idx < 0 || f.idx >= len(c.Levels) {
				continue
			}
			l := c.Levels[f.idx]
			lx, anchor := cx+dgLevelW/2+6, "start"
			if ci == 0 {
				lx, anchor = cx-dgLevelW/2-6, "end"
			}
			dy := 4.0
			if f.name == "HOMO" && c.LUMO >= 0 && math.Abs(y(c.Levels[c.LUMO].X)-y(l.X)) < 26 {
				dy = 14 // keep HOMO and LUMO labels apart when the gap is small
			} else if f.name == "LUMO" && c.HOMO >= 0 && math.Abs(y(c.Levels[c.HOMO].X)-y(l.X)) < 26 {
				dy = -6
			}
			b.text(lx, y(l.X)+dy, anchor, `font-size="10"`, fmt.Sprintf("%s x = %s (%s eV)", f.name, fmtSigned(l.X, 3), fmtSigned(f.ev, d.EVDecimals)))
		}
		b.raw("</g>\n")
	}

	// gap markers
	for _, g := range d.Gaps {
		if g.Column <= 0 || g.Column >= len(d.Columns) {
			continue
		}
		c := d.Columns[g.Column]
		ax := levelLeft(g.Column) - 10 // normal gap arrow
		bx := levelLeft(g.Column) - 22 // inverse gap arrow
		b.raw(fmt.Sprintf(`<g class="gaps" data-column="%d">`+"\n", g.Column))
		normalMid := math.NaN()
		if d0.HOMO >= 0 && c.LUMO >= 0 {
			y1, y2 := y(d0.Levels[d0.HOMO].X), y(c.Levels[c.LUMO].X)
			b.raw(fmt.Sprintf(`<line class="gap gap-normal" x1="%s" y1="%s" x2="%s" y2="%s" stroke="#000" stroke-width="1.2" marker-start="url(#dg-arrow)" marker-end="url(#dg-arrow)"/>`+"\n",
				n1(ax), n1(y1), n1(ax), n1(y2)))
			normalMid = (y1 + y2) / 2
			b.gapLabel(bx-6, normalMid, "normal", g.Normal, g.Controlling == "normal" || g.Controlling == "neutral" && g.Normal.Beta <= g.Inverse.Beta, d.EVDecimals)
		}
		if d0.LUMO >= 0 && c.HOMO >= 0 {
			y1, y2 := y(c.Levels[c.HOMO].X), y(d0.Levels[d0.LUMO].X)
			b.raw(fmt.Sprintf(`<line class="gap gap-inverse" x1="%s" y1="%s" x2="%s" y2="%s" stroke="#000" stroke-width="1.2" stroke-dasharray="4 3" marker-start="url(#dg-arrow)" marker-end="url(#dg-arrow)"/>`+"\n",
				n1(bx), n1(y1), n1(bx), n1(y2)))
			mid := (y1 + y2) / 2
			if !math.IsNaN(normalMid) && math.Abs(mid-normalMid) < 30 {
				mid = normalMid + 30 // keep the two labels apart
			}
			b.gapLabel(bx-6, mid, "inverse", g.Inverse, g.Controlling == "inverse" || g.Controlling == "neutral" && g.Inverse.Beta < g.Normal.Beta, d.EVDecimals)
		}
		b.raw("</g>\n")
	}

	fy := y(xmax) + 30
	cal := d.Calibration
	if cal == "" {
		cal = "none"
	}
	b.text(16, fy, "start", `font-size="11"`, "eV from calibration "+cal+"; parameter set "+orDash(d.Params)+". Gaps: |β| and eV.")
	b.text(16, fy+16, "start", `font-size="11"`, "Electrons: half-arrows on each level. Dashed level: empty. Thick level: HOMO or LUMO. Faint dotted line: α (x = 0).")
	b.text(16, fy+32, "start", `font-size="10" font-style="italic"`, Caution)
	b.raw("</svg>\n")
	_, err := w.Write(b.Bytes())
	return err
}

// electrons draws up to two half-arrows (spin up and down) on a level at (x, y).
func electrons(b *svgBuf, x, y, occ float64) {
	n := int(math.Round(occ))
	if occ > 0 && n == 0 {
		n = 1
	}
	for e := 0; e < n && e < 2; e++ {
		ex := x - 5 + 10*float64(e)
		if n == 1 {
			ex = x
		}
		if e == 0 { // up: shaft with a barb at the top
			b.raw(fmt.Sprintf(`<path class="electron" d="M%s,%s V%s l-3,4" fill="none" stroke="#000" stroke-width="1.2"/>`,
				n1(ex), n1(y+6), n1(y-7)))
		} else { // down: barb at the bottom
			b.raw(fmt.Sprintf(`<path class="electron" d="M%s,%s V%s l3,-4" fill="none" stroke="#000" stroke-width="1.2"/>`,
				n1(ex), n1(y-7), n1(y+6)))
		}
	}
	if n > 0 {
		b.raw("\n")
	}
	if frac := occ - math.Round(occ); math.Abs(frac) > 1e-6 {
		b.text(x+12, y-3, "start", `font-size="9"`, strconv.FormatFloat(occ, 'f', 2, 64)+" e")
	}
}

// gapLabel writes the value of a gap, right-aligned at x, centred on my.
func (b *svgBuf) gapLabel(x, my float64, kind string, e Energy, controlling bool, evDecimals int) {
	attrs := `font-size="10"`
	if controlling {
		attrs = `font-size="10" font-weight="bold"`
	}
	b.text(x, my-2, "end", attrs, fmt.Sprintf("%s %s |β|", kind, strconv.FormatFloat(e.Beta, 'f', 3, 64)))
	ev := strconv.FormatFloat(e.EV, 'f', evDecimals, 64) + " eV"
	if controlling {
		ev += " (controls)"
	}
	b.text(x, my+10, "end", attrs, ev)
}

// svgBuf collects the document.
type svgBuf struct{ bytes.Buffer }

func (b *svgBuf) raw(s string) { b.WriteString(s) }

// text writes an escaped <text> element; attrs is trusted markup from this file.
func (b *svgBuf) text(x, y float64, anchor, attrs, s string) {
	// A white halo (stroke painted under the glyphs) keeps guide lines from striking
	// through labels.
	b.WriteString(`<text x="` + n1(x) + `" y="` + n1(y) + `" text-anchor="` + anchor + `" stroke="#fff" stroke-width="3" stroke-linejoin="round" paint-order="stroke"`)
	if attrs != "" {
		b.WriteString(" " + attrs)
	}
	b.WriteString(">")
	_ = xml.EscapeText(b, []byte(s))
	b.WriteString("</text>\n")
}

// n1 formats a coordinate with one decimal ("-0.0" never appears).
func n1(v float64) string { return fixed(v, 1) }

// fmtSigned writes a number with a true minus sign and fixed precision.
func fmtSigned(v float64, prec int) string {
	s := fixed(v, prec)
	if strings.HasPrefix(s, "-") {
		return "−" + s[1:]
	}
	return s
}

// clip shortens long text for a column heading.
func clip(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return string(r[:n-1]) + "…"
}
