// Package draw writes SVG pictures of molecules for cyclopair: the skeleton with heteroatom
// labels, charges and multiple bonds; the π coefficients of one orbital as circles on the
// atoms; and a cycloaddition pair facing each other in the preferred orientation with the
// forming bonds, the endo secondary contact and the frontier orbitals of the controlling
// pairing.
//
// Conventions, stated in every caption: a circle's area is proportional to c², the π density
// the orbital puts on the atom (so its radius is proportional to |c|); a solid dark circle is
// c > 0, a white circle with a dark outline and diagonal hatching is c < 0. The pair uses one
// hue plus a pattern, so it reads in grey print and for colour-blind readers.
//
// Output is deterministic (fixed-precision coordinates, no map order) and well-formed XML:
// every text that comes from the user (names, SMILES) is escaped with encoding/xml.EscapeText.
// The SVG has no XML declaration, so the same bytes can be written to a file or inlined into
// an HTML page; every id is prefixed with Options.IDPrefix so several pictures can share a
// page.
package draw

import (
	"bytes"
	"encoding/xml"
	"math"
	"strconv"
	"strings"
)

// Colours and sizes of the pictures (one hue, patterns for sign; see the package doc).
const (
	ink        = "#1b1f24" // bonds and labels
	lobeDark   = "#2f4b6e" // positive lobes, hatching, outlines
	lobeGrey   = "#c9ced6" // phase-free density (degenerate sets in the pair picture)
	scale      = 44.0      // pixels per bond length
	labelSize  = 14.0      // atom label font size, px
	textSize   = 12.0      // caption font size, px
	lineHeight = 16.0
	margin     = 18.0
	// lobeRadius is the radius, in bond lengths, of the circle for |c| = 1. Area ∝ c² then.
	// 0.6 keeps neighbouring circles of an ethylene π bond (|c| = 0.707) from touching.
	lobeRadius = 0.6
)

// num formats a coordinate with two decimals, never "-0.00".
func num(v float64) string {
	s := strconv.FormatFloat(v, 'f', 2, 64)
	if s == "-0.00" {
		return "0.00"
	}
	return s
}

// esc escapes s for XML text and attribute values.
func esc(s string) string {
	var b bytes.Buffer
	_ = xml.EscapeText(&b, []byte(s)) // writes to a buffer: cannot fail
	return b.String()
}

// canvas collects SVG elements and tracks the extent of what is drawn (pixel space, y down).
type canvas struct {
	defs                   strings.Builder
	body                   strings.Builder
	minX, minY, maxX, maxY float64
}

func newCanvas() *canvas {
	return &canvas{minX: math.Inf(1), minY: math.Inf(1), maxX: math.Inf(-1), maxY: math.Inf(-1)}
}

func (c *canvas) extend(x, y, r float64) {
	c.minX, c.maxX = math.Min(c.minX, x-r), math.Max(c.maxX, x+r)
	c.minY, c.maxY = math.Min(c.minY, y-r), math.Max(c.maxY, y+r)
}

func (c *canvas) line(x1, y1, x2, y2 float64, attrs string) {
	c.extend(x1, y1, 1)
	c.extend(x2, y2, 1)
	c.body.WriteString(`<line x1="` + num(x1) + `" y1="` + num(y1) + `" x2="` + num(x2) + `" y2="` + num(y2) + `" ` + attrs + "/>\n")
}

func (c *canvas) circle(x, y, r float64, attrs string) {
	c.extend(x, y, r+1)
	c.body.WriteString(`<circle cx="` + num(x) + `" cy="` + num(y) + `" r="` + num(r) + `" ` + attrs + "/>\n")
}

// text writes escaped text; anchor is "start", "middle" or "end". The width estimate (charWidth
// em per character) only sizes the canvas.
func (c *canvas) text(x, y float64, s string, size float64, anchor, attrs string) {
	w := charWidth * size * float64(len([]rune(s)))
	switch anchor {
	case "middle":
		c.extend(x-w/2, y, size/2)
		c.extend(x+w/2, y, size/2)
	case "end":
		c.extend(x-w, y, size/2)
		c.extend(x, y, size/2)
	default:
		c.extend(x, y, size/2)
		c.extend(x+w, y, size/2)
	}
	c.body.WriteString(`<text x="` + num(x) + `" y="` + num(y) + `" font-size="` + num(size) + `" text-anchor="` + anchor + `" ` + attrs + `>` + esc(s) + "</text>\n")
}

// raw appends trusted markup produced in this package (never user text).
func (c *canvas) raw(s string) { c.body.WriteString(s) }

// finish writes the whole <svg> element with a white background and the given accessible
// title (escaped), padded by margin.
func (c *canvas) finish(title string) []byte {
	if math.IsInf(c.minX, 0) {
		c.extend(0, 0, 1)
	}
	x0, y0 := c.minX-margin, c.minY-margin
	w, h := c.maxX-c.minX+2*margin, c.maxY-c.minY+2*margin
	var b bytes.Buffer
	b.WriteString(`<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="` + num(w) + `" height="` + num(h) +
		`" viewBox="` + num(x0) + ` ` + num(y0) + ` ` + num(w) + ` ` + num(h) + `" role="img" font-family="DejaVu Sans, Arial, Helvetica, sans-serif">` + "\n")
	b.WriteString("<title>" + esc(title) + "</title>\n")
	if c.defs.Len() > 0 {
		b.WriteString("<defs>\n" + c.defs.String() + "</defs>\n")
	}
	b.WriteString(`<rect x="` + num(x0) + `" y="` + num(y0) + `" width="` + num(w) + `" height="` + num(h) + `" fill="#ffffff"/>` + "\n")
	b.WriteString(c.body.String())
	b.WriteString("</svg>\n")
	return b.Bytes()
}

// sanitizeID keeps letters, digits, '-' and '_' so a caller's prefix is always a valid id.
func sanitizeID(s string) string {
	var b strings.Builder
	for _, r := range s {
		if r < 128 && (r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '-' || r == '_') {
			b.WriteRune(r)
		}
	}
	if b.Len() == 0 || !(b.String()[0] >= 'a' && b.String()[0] <= 'z' || b.String()[0] >= 'A' && b.String()[0] <= 'Z') {
		return "p" + b.String()
	}
	return b.String()
}

// captionChars is the caption line length for a canvas: the width of what is drawn so far
// (the molecules and their labels) in characters, but at least 56 so short pictures do not
// get tall captions.
//
// charWidth is the average advance of a character in em used to size text boxes: DejaVu Sans
// digits are 0.64 em and capitals and '=' wider, so 0.58 let caption lines with SMILES run
// past the right edge (seen in Chromium screenshots); 0.66 errs on the roomy side.
const charWidth = 0.66

func captionChars(c *canvas) int {
	w := c.maxX - math.Min(c.minX, 0)
	if math.IsInf(w, 0) || math.IsNaN(w) {
		return 64
	}
	return max(56, int(w/(charWidth*textSize)))
}

// wrap breaks each line at spaces so no piece is longer than width characters (a single
// longer word, such as a SMILES, stays whole); continuation lines are indented.
func wrap(lines []string, width int) []string {
	var out []string
	for _, l := range lines {
		words := strings.Fields(l)
		cur := ""
		for _, w := range words {
			switch {
			case cur == "":
				cur = w
			case len([]rune(cur))+1+len([]rune(w)) <= width:
				cur += " " + w
			default:
				out = append(out, cur)
				cur = "\u2003" + w // an em space: SVG strips leading ASCII spaces
			}
		}
		if cur != "" {
			out = append(out, cur)
		}
	}
	return out
}
