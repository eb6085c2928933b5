package draw

import (
	"math"
	"strconv"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/molecule"
)

// figure is one molecule placed on a canvas: coordinates in bond units (y up) and the pixel
// origin of the bond-unit frame.
type figure struct {
	m      *molecule.Molecule
	pos    []depict.Point
	coords *depict.Coords
	ox, oy float64
}

func newFigure(m *molecule.Molecule) (*figure, error) {
	c, err := depict.Layout(m)
	if err != nil {
		return nil, err
	}
	return &figure{m: m, pos: c.Pos, coords: c}, nil
}

// px returns the pixel position of atom i.
func (f *figure) px(i int) (float64, float64) {
	return f.ox + f.pos[i].X*scale, f.oy - f.pos[i].Y*scale
}

// bounds returns the pixel bounding box of the atoms.
func (f *figure) bounds() (x0, y0, x1, y1 float64) {
	x0, y0, x1, y1 = math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for i := range f.pos {
		x, y := f.px(i)
		x0, x1 = math.Min(x0, x), math.Max(x1, x)
		y0, y1 = math.Min(y0, y), math.Max(y1, y)
	}
	return
}

// labelled reports whether atom i gets an element label: every non-carbon, charged or
// isotope-labelled atom and an isolated carbon (methane).
func labelled(m *molecule.Molecule, i int) bool {
	a := m.Atoms[i]
	return a.Element != "C" || a.Charge != 0 || a.Isotope != 0 || m.Degree(i) == 0
}

// lobe is the circle drawn for one coefficient.
type lobe struct {
	atom  int
	c     float64 // coefficient (signed) or √density for phase-free lobes
	phase bool    // false: density only, drawn grey without sign
}

// lobeMin is the smallest |c| drawn; below it the atom sits on (or next to) a node.
const lobeMin = 0.02

// drawLobes draws circles of radius lobeRadius·|c| bond lengths (area ∝ c²).
func (f *figure) drawLobes(cv *canvas, lobes []lobe, id string) {
	for _, l := range lobes {
		if math.Abs(l.c) < lobeMin {
			continue
		}
		x, y := f.px(l.atom)
		r := lobeRadius * math.Abs(l.c) * scale
		switch {
		case !l.phase:
			cv.circle(x, y, r, `fill="`+lobeGrey+`" stroke="`+lobeDark+`" stroke-width="1.2" stroke-dasharray="3 2"`)
		case l.c > 0:
			cv.circle(x, y, r, `fill="`+lobeDark+`" stroke="`+lobeDark+`" stroke-width="1.2"`)
		default:
			cv.circle(x, y, r, `fill="url(#`+id+`-neg)" stroke="`+lobeDark+`" stroke-width="1.6"`)
		}
	}
}

// hatchDef is the pattern negative lobes are filled with.
func hatchDef(id string) string {
	return `<pattern id="` + id + `-neg" patternUnits="userSpaceOnUse" width="5" height="5" patternTransform="rotate(45)">` +
		`<rect width="5" height="5" fill="#ffffff"/><line x1="0" y1="0" x2="0" y2="5" stroke="` + lobeDark + `" stroke-width="1.7"/></pattern>` + "\n"
}

// drawSkeleton draws bonds (single, double, triple; ring double bonds with the second line
// inside the ring) and atom labels. numbers adds small 0-based atom indices.
func (f *figure) drawSkeleton(cv *canvas, numbers bool) {
	m := f.m
	const (
		trimLabel = 0.32 // bond units cut at a labelled atom
		dblOff    = 0.17 // offset of the inner line of a ring double bond
		dblTrim   = 0.16 // shortening of that inner line at each end
		symOff    = 0.085
		triOff    = 0.15
	)
	bondStyle := `stroke="` + ink + `" stroke-width="1.6" stroke-linecap="round"`
	halo := `stroke="#ffffff" stroke-width="4.6" stroke-linecap="round"`
	type seg struct{ x1, y1, x2, y2 float64 }
	var segs []seg
	for _, b := range m.Bonds {
		p, q := f.pos[b.A], f.pos[b.B]
		d := depict.Point{X: q.X - p.X, Y: q.Y - p.Y}
		L := math.Hypot(d.X, d.Y)
		if L < 1e-9 {
			continue
		}
		u := depict.Point{X: d.X / L, Y: d.Y / L}
		n := depict.Point{X: -u.Y, Y: u.X}
		t0, t1 := 0.0, 0.0
		if labelled(m, b.A) {
			t0 = trimLabel
		}
		if labelled(m, b.B) {
			t1 = trimLabel
		}
		at := func(t, off float64) depict.Point { // point along the bond at t (bond units), offset off
			return depict.Point{X: p.X + u.X*t + n.X*off, Y: p.Y + u.Y*t + n.Y*off}
		}
		add := func(ta, tb, off float64) {
			if tb-ta < 0.05 {
				return
			}
			a, c := at(ta, off), at(tb, off)
			segs = append(segs, seg{f.ox + a.X*scale, f.oy - a.Y*scale, f.ox + c.X*scale, f.oy - c.Y*scale})
		}
		switch b.Order {
		case 2:
			if cen, ok := f.ringCentre(b.A, b.B); ok {
				side := 1.0
				if (cen.X-p.X)*n.X+(cen.Y-p.Y)*n.Y < 0 {
					side = -1
				}
				add(t0, L-t1, 0)
				add(math.Max(t0, dblTrim), L-math.Max(t1, dblTrim), side*dblOff)
			} else {
				add(t0, L-t1, symOff)
				add(t0, L-t1, -symOff)
			}
		case 3:
			add(t0, L-t1, 0)
			add(t0, L-t1, triOff)
			add(t0, L-t1, -triOff)
		default:
			add(t0, L-t1, 0)
		}
	}
	for _, s := range segs { // white halos first so bonds stay readable over lobes
		cv.line(s.x1, s.y1, s.x2, s.y2, halo)
	}
	for _, s := range segs {
		cv.line(s.x1, s.y1, s.x2, s.y2, bondStyle)
	}
	for i := range m.Atoms {
		if labelled(m, i) {
			f.drawLabel(cv, i)
		}
		if numbers {
			x, y := f.px(i)
			cv.text(x+7, y+12, strconv.Itoa(i+1), 8, "start", `fill="#5a6270"`)
		}
	}
}

func (f *figure) ringCentre(a, b int) (depict.Point, bool) {
	if f.coords == nil {
		return depict.Point{}, false
	}
	// the ring centre in the current (possibly moved) frame: average of current positions
	for _, r := range f.coords.Rings {
		for k, i := range r {
			j := r[(k+1)%len(r)]
			if (i == a && j == b) || (i == b && j == a) {
				var s depict.Point
				for _, x := range r {
					s.X += f.pos[x].X
					s.Y += f.pos[x].Y
				}
				return depict.Point{X: s.X / float64(len(r)), Y: s.Y / float64(len(r))}, true
			}
		}
	}
	return depict.Point{}, false
}

// drawLabel writes the element symbol centred on the atom, attached hydrogens on the side
// away from the bonds, and the charge at the upper right.
func (f *figure) drawLabel(cv *canvas, i int) {
	m := f.m
	a := m.Atoms[i]
	x, y := f.px(i)
	halo := `stroke="#ffffff" stroke-width="3.5" stroke-linejoin="round" paint-order="stroke" fill="` + ink + `" dominant-baseline="central"`
	sym := a.Element
	if a.Isotope != 0 {
		sym = strconv.Itoa(a.Isotope) + sym
	}
	cv.text(x, y, sym, labelSize, "middle", halo)
	ew := 0.62 * labelSize * float64(len(sym)) / 2 // half width of the symbol
	// hydrogens go where the bonds are not
	chargeX := x + ew + 1
	if a.HCount > 0 {
		dx := 0.0
		for _, e := range m.Neighbors(i) {
			dx += f.pos[e.To].X - f.pos[i].X
		}
		left := dx > 0.1 // bonds to the right: write H on the left
		if m.Degree(i) == 0 && a.Element != "C" && a.Element != "N" && a.Element != "B" {
			left = true // H2O, H2S, HCl: hydrogens first, as usually written
		}
		cv.hydrogens(x, y, ew, a.HCount, left, halo)
		if !left {
			digits := 0
			if a.HCount > 1 {
				digits = len(strconv.Itoa(a.HCount))
			}
			chargeX += 0.62 * labelSize * (1 + 0.7*float64(digits))
		}
	}
	if a.Charge != 0 {
		s := "+"
		if a.Charge < 0 {
			s = "−"
		}
		if n := a.Charge; n > 1 || n < -1 {
			s = strconv.Itoa(int(math.Abs(float64(n)))) + s
		}
		cv.text(chargeX, y-8, s, 10, "start", halo)
	}
}

// hydrogens writes "H" or "H" with a subscript count beside an element symbol of half width
// ew centred at (x, y): on the left (anchored at its end) or on the right.
func (c *canvas) hydrogens(x, y, ew float64, n int, left bool, attrs string) {
	sub, digits := "", 0
	if n > 1 {
		sub = `<tspan font-size="` + num(labelSize*0.72) + `" dy="4">` + strconv.Itoa(n) + `</tspan>`
		digits = len(strconv.Itoa(n))
	}
	w := 0.62 * labelSize * (1 + 0.7*float64(digits))
	anchor, hx := "start", x+ew
	if left {
		anchor, hx = "end", x-ew
		c.extend(hx-w, y, labelSize/2)
	} else {
		c.extend(hx+w, y, labelSize/2)
	}
	c.body.WriteString(`<text x="` + num(hx) + `" y="` + num(y) + `" font-size="` + num(labelSize) + `" text-anchor="` + anchor + `" ` + attrs + `>H` + sub + "</text>\n")
}
