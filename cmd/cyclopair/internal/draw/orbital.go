package draw

import (
	"errors"
	"fmt"
	"math"
	"strconv"

	"cyclopair/fmo"
	"cyclopair/huckel"
)

// ErrNoLevel is returned when the requested orbital does not exist (no HOMO in a π system
// without electrons, a level number out of range).
var ErrNoLevel = errors.New("no such orbital level")

// OrbitalOptions describe one orbital picture.
type OrbitalOptions struct {
	Name        string      // molecule name for the heading; may be empty (the SMILES is used)
	SMILES      string      // as given by the user
	Which       string      // how the level was asked for: "HOMO", "LUMO", "level 3"
	Params      string      // parameter set name, printed in the caption
	Calibration fmo.EVScale // nil: no eV figure
	CalName     string      // calibration name, printed with every eV figure
	IDPrefix    string      // prefix for ids inside the SVG (pattern fills); sanitised
	Numbers     bool        // print 1-based atom positions (as in the site names)
}

// Orbital draws level of orb (an index into orb.Levels) on the molecule orb.Pi.Mol. A level
// in a degenerate set is drawn with every member of the set side by side, since no single
// member is more meaningful than another.
func Orbital(orb *huckel.Orbitals, level int, o OrbitalOptions) ([]byte, error) {
	if orb == nil || orb.Pi == nil || orb.Pi.Mol == nil {
		panic("draw.Orbital: nil orbitals")
	}
	if level < 0 || level >= len(orb.Levels) {
		return nil, fmt.Errorf("%w: %s (the π system has %d levels)", ErrNoLevel, o.Which, len(orb.Levels))
	}
	set := orb.DegenerateSet(level)
	id := sanitizeID(o.IDPrefix + "orb")
	cv := newCanvas()
	cv.defs.WriteString(hatchDef(id))

	name := o.Name
	if name == "" {
		name = o.SMILES
	}
	lv := orb.Levels[level]
	heading := fmt.Sprintf("%s of %s", o.Which, name)
	cv.text(0, 0, heading, 15, "start", `font-weight="bold" fill="`+ink+`"`)

	var x0 float64
	y0 := 30.0
	var bottom float64
	for k, li := range set {
		f, err := newFigure(orb.Pi.Mol)
		if err != nil {
			return nil, err
		}
		bx0, by0, _, _ := f.bounds()
		f.ox, f.oy = x0-bx0+lobeRadius*scale, y0-by0+lobeRadius*scale
		var lobes []lobe
		for a := range orb.Pi.Mol.Atoms {
			if c := orb.Coefficient(li, a); c != 0 {
				lobes = append(lobes, lobe{atom: a, c: c, phase: true})
			}
		}
		f.drawLobes(cv, lobes, id)
		f.drawSkeleton(cv, o.Numbers)
		cx0, _, bx1, by1 := f.bounds()
		if len(set) > 1 {
			cv.text((cx0+bx1)/2, by1+lobeRadius*scale+14, "member "+strconv.Itoa(k+1)+" of "+strconv.Itoa(len(set)), textSize, "middle", `fill="`+ink+`"`)
			by1 += 18
		}
		x0 = bx1 + 2*lobeRadius*scale + 30
		bottom = math.Max(bottom, by1+lobeRadius*scale)
	}

	energy := fmt.Sprintf("E = α %sβ (x = %s)", signed(lv.X), fixed(lv.X, 3))
	if o.Calibration != nil {
		energy += fmt.Sprintf(" ≈ %s eV (calibration: %s)", fixed(o.Calibration.EV(lv.X, lv.Occupancy > 0), 2), o.CalName)
	}
	lines := []string{
		energy,
		fmt.Sprintf("level %d of %d (0-based, bonding first), %s (%s e)", level, len(orb.Levels), occupancyWord(lv.Occupancy), fixed(lv.Occupancy, 1)),
	}
	if len(set) > 1 {
		lines = append(lines, fmt.Sprintf("Degenerate set of %d levels, all drawn: any orthonormal mix of them is an equally valid orbital.", len(set)))
	}
	if o.Params != "" {
		lines = append(lines, "Hückel parameters: "+o.Params+"; SMILES: "+o.SMILES)
	}
	y := bottom + 20
	for _, l := range wrap(lines, captionChars(cv)) {
		cv.text(0, y, l, textSize, "start", `fill="`+ink+`"`)
		y += lineHeight
	}
	legend(cv, 0, y+4, id, false)
	return cv.finish(heading), nil
}

// legend draws the key to the circles at (x, y) (pixel top-left of the legend line).
func legend(cv *canvas, x, y float64, id string, withGrey bool) {
	x0 := x
	r := 6.0
	cv.circle(x+r, y, r, `fill="`+lobeDark+`" stroke="`+lobeDark+`" stroke-width="1.2"`)
	cv.text(x+2*r+5, y, "c > 0", textSize, "start", `dominant-baseline="central" fill="`+ink+`"`)
	x += 70
	cv.circle(x+r, y, r, `fill="url(#`+id+`-neg)" stroke="`+lobeDark+`" stroke-width="1.6"`)
	cv.text(x+2*r+5, y, "c < 0 (hatched)", textSize, "start", `dominant-baseline="central" fill="`+ink+`"`)
	x += 125
	if withGrey {
		cv.circle(x+r, y, r, `fill="`+lobeGrey+`" stroke="`+lobeDark+`" stroke-width="1.2" stroke-dasharray="3 2"`)
		cv.text(x+2*r+5, y, "density of a degenerate set (no phase)", textSize, "start", `dominant-baseline="central" fill="`+ink+`"`)
	}
	_ = x
	cv.text(x0, y+lineHeight+2, "circle area ∝ c² (π density on the atom); no circle: |c| < 0.02", textSize, "start", `dominant-baseline="central" fill="`+ink+`"`)
}

func occupancyWord(n float64) string {
	switch {
	case n >= 1.999:
		return "occupied"
	case n > 0.001:
		return "partly occupied"
	}
	return "empty"
}

// fixed formats v with prec decimals and never "-0.000".
func fixed(v float64, prec int) string {
	s := strconv.FormatFloat(v, 'f', prec, 64)
	if z := strconv.FormatFloat(0, 'f', prec, 64); s == "-"+z {
		return z
	}
	return s
}

// signed writes "+ 0.618" or "− 0.618" for use after "α".
func signed(x float64) string {
	if x < 0 && fixed(x, 3) != "0.000" {
		return "− " + fixed(-x, 3) + " "
	}
	return "+ " + fixed(x, 3) + " "
}
