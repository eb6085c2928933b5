package draw

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"cyclopair/fmo"
	"cyclopair/huckel"
	"cyclopair/huckel/depict"
)

// ErrNoOrientation is returned when the pair has no orientation to draw.
var ErrNoOrientation = errors.New("pair has no reacting orientation")

// PairOptions describe a pair picture.
type PairOptions struct {
	IDPrefix string // prefix for ids inside the SVG; sanitised
	// Orientation selects which entry of Pair.Orientations to draw (0, the default, is the
	// preferred one; the list is ranked best first).
	Orientation int
	Numbers     bool // print 1-based atom positions (C1, C2 … as in the site names)
}

// approach is the distance between the diene termini line and the dienophile's reacting bond,
// in bond lengths: a transition state's forming bonds are roughly 1.5 times a C–C bond
// (about 2.2 Å against 1.5 Å; common practice, no source), drawn somewhat longer for room.
const approach = 2.2

// clearance is the least distance kept between an atom of the diene and one of the
// dienophile in the pair picture, bond lengths.
const clearance = 1.0

// Pair draws one orientation of p (the preferred one, p.Orientations[0], unless
// o.Orientation says otherwise): the 4π partner on top with
// its reacting termini facing down, the 2π partner below with its reacting bond parallel, the
// two forming bonds dashed, the endo secondary contact dotted, and the frontier
// lobes of the controlling pairing (HOMO of the diene and LUMO of the dienophile for normal
// demand, the other two for inverse demand, the smaller gap for neutral demand). The
// molecules drawn are the ones whose orbitals were used (an activated dienophile is drawn
// with its proton, Lewis acid or amine).
func Pair(diene, dienophile *fmo.Partner, p *fmo.Pair, o PairOptions) ([]byte, error) {
	if diene == nil || dienophile == nil || p == nil {
		panic("draw.Pair: nil argument")
	}
	if len(p.Orientations) == 0 {
		return nil, ErrNoOrientation
	}
	if o.Orientation < 0 || o.Orientation >= len(p.Orientations) {
		return nil, fmt.Errorf("%w: orientation %d requested, the analysis has %d (1 to %d)", ErrNoOrientation, o.Orientation+1, len(p.Orientations), len(p.Orientations))
	}
	or := p.Orientations[o.Orientation]
	if len(or.DieneAtoms) < 3 || len(or.DienophileAtoms) != 2 {
		return nil, fmt.Errorf("%w: reacting units %v and %v", ErrNoOrientation, or.DieneAtoms, or.DienophileAtoms)
	}
	id := sanitizeID(o.IDPrefix + "pair")
	cv := newCanvas()
	cv.defs.WriteString(hatchDef(id))

	g, err := pairGeometry(diene, dienophile, p, o.Orientation)
	if err != nil {
		return nil, err
	}
	top, bot := g.top, g.bot
	a, d, e := g.a, g.d, g.e
	sec, secDiene := g.sec, g.secDiene
	normal, dLevel, eLevel, dWord, eWord := g.normal, g.dLevel, g.eLevel, g.dWord, g.eWord

	// headings and frames
	const headH = 24.0
	name := func(pt *fmo.Partner) string {
		if pt.Name != "" {
			return pt.Name
		}
		return pt.SMILES
	}
	tx0, ty0, _, _ := top.bounds() // with ox = oy = 0
	bx0, _, _, _ := bot.bounds()
	left := math.Min(tx0, bx0)
	top.ox, top.oy = -left+lobeRadius*scale, -ty0+headH+lobeRadius*scale
	bot.ox, bot.oy = top.ox, top.oy
	_, _, tx1, _ := top.bounds()
	_, _, bx1, by1 := bot.bounds()
	right := math.Max(tx1, bx1)
	title := fmt.Sprintf("%s + %s", name(diene), name(dienophile))
	if p.Activation != "" && p.Activation != "none" {
		title += " (" + p.Activation + " activation)"
	}
	cv.text(0, 0, title, 15, "start", `font-weight="bold" fill="`+ink+`"`)
	cv.text(right+lobeRadius*scale+10, top.oy-top.pos[a].Y*scale-20, name(diene)+": "+dWord, textSize, "start", `fill="`+ink+`"`)
	cv.text(right+lobeRadius*scale+10, bot.oy-bot.pos[e].Y*scale+24, name(dienophile)+": "+eWord, textSize, "start", `fill="`+ink+`"`)

	drawFrontier(cv, top, diene.Orb, dLevel, id)
	drawFrontier(cv, bot, dienophile.Orb, eLevel, id)

	// forming bonds, dashed
	for _, b := range or.Bonds {
		x1, y1 := top.px(b[0])
		x2, y2 := bot.px(b[1])
		x1, y1, x2, y2 = trimSeg(x1, y1, x2, y2, 4)
		cv.line(x1, y1, x2, y2, `stroke="#ffffff" stroke-width="4.5" stroke-linecap="butt"`) // halo over lobes
		cv.line(x1, y1, x2, y2, `stroke="`+ink+`" stroke-width="2" stroke-dasharray="7 4" stroke-linecap="butt"`)
	}
	// endo secondary contact, dotted (described in the caption)
	endoLabel := ""
	if sec >= 0 && secDiene >= 0 && p.Endo != "no" {
		x1, y1 := top.px(secDiene)
		x2, y2 := bot.px(sec)
		x1, y1, x2, y2 = trimSeg(x1, y1, x2, y2, 6)
		// bow the dotted path outwards so it does not run along a forming bond
		mx, my := (x1+x2)/2, (y1+y2)/2
		cx := mx - 0.6*scale
		if mx > (top.ox + (top.pos[a].X+top.pos[d].X)/2*scale) {
			cx = mx + 0.6*scale
		}
		cv.extend(cx, my, 2)
		pathD := `M ` + num(x1) + ` ` + num(y1) + ` Q ` + num(cx) + ` ` + num(my) + ` ` + num(x2) + ` ` + num(y2)
		cv.raw(`<path d="` + pathD + `" fill="none" stroke="#ffffff" stroke-width="4" stroke-linecap="round"/>` + "\n")
		cv.raw(`<path d="` + pathD + `" fill="none" stroke="` + ink + `" stroke-width="1.8" stroke-dasharray="1.5 3.5" stroke-linecap="round"/>` + "\n")
		endoLabel = fmt.Sprintf("Dotted: endo secondary contact %s%d···%s%d, secondary-orbital term %s |β|.",
			diene.Active.Atoms[secDiene].Element, secDiene+1, dienophile.Active.Atoms[sec].Element, sec+1, fixed(or.EndoOverlap, 3))
	}
	top.drawSkeleton(cv, o.Numbers)
	bot.drawSkeleton(cv, o.Numbers)

	// caption
	gap := p.GapNormal
	pairing := fmt.Sprintf("normal demand: HOMO(%s) → LUMO(%s)", name(diene), name(dienophile))
	if !normal {
		gap = p.GapInverse
		pairing = fmt.Sprintf("inverse demand: HOMO(%s) → LUMO(%s)", name(dienophile), name(diene))
	}
	if p.Demand == "neutral" {
		pairing = "neutral demand (gaps within " + fixed(p.DemandThreshold, 2) + " |β|), smaller gap shown — " + pairing
	}
	lines := []string{
		pairing + gapText(gap, p.Calibration),
		fmt.Sprintf("%s: %s%s, stabilisation %s |β|; regio margin %s |β| (%s); endo: %s",
			rankWord(o.Orientation, len(p.Orientations)), or.Site, labelSuffix(or.Label), fixed(or.Stabilization, 4), fixed(p.RegioMargin, 4), orDash(p.RegioConfidence), orDash(p.Endo)),
		"Dashed: the two forming σ bonds (diene atom to dienophile atom as in the product). Parameters: " + orDash(p.Params) +
			", forming-bond β " + fixed(p.FormingBeta, 2),
	}
	if endoLabel != "" {
		lines = append(lines, endoLabel+" Atom numbers are 1-based positions in each SMILES.")
	}
	if len(or.Product) <= 90 && or.Product != "" {
		lines = append(lines, "Product: "+or.Product)
	}
	if dLevel.Degenerate || eLevel.Degenerate {
		lines = append(lines, "A degenerate frontier set is drawn as its total density (grey, no phase): no single member is privileged.")
	}
	y := by1 + lobeRadius*scale + 22
	for _, l := range wrap(lines, captionChars(cv)) {
		cv.text(0, y, l, textSize, "start", `fill="`+ink+`"`)
		y += lineHeight
	}
	legend(cv, 0, y+4, id, dLevel.Degenerate || eLevel.Degenerate)
	return cv.finish(title), nil
}

// rankWord names the orientation drawn: "Preferred" for the best, else its rank.
func rankWord(k, n int) string {
	if k == 0 {
		return "Preferred"
	}
	return fmt.Sprintf("Orientation %d of %d (not preferred)", k+1, n)
}

func labelSuffix(l string) string {
	if l == "" {
		return ""
	}
	return " (" + l + ")"
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

// drawFrontier draws the lobes of one frontier level of a partner; a degenerate set is drawn
// as its summed density without phase.
func drawFrontier(cv *canvas, f *figure, orb *huckel.Orbitals, fr fmo.Frontier, id string) {
	if orb == nil || fr.Index < 0 || fr.Index >= len(orb.Levels) {
		return
	}
	var lobes []lobe
	set := orb.DegenerateSet(fr.Index)
	for at := range f.m.Atoms {
		if !fr.Degenerate || len(set) == 1 {
			if c := orb.Coefficient(fr.Index, at); c != 0 {
				lobes = append(lobes, lobe{atom: at, c: c, phase: true})
			}
			continue
		}
		s := 0.0
		for _, li := range set {
			c := orb.Coefficient(li, at)
			s += c * c
		}
		if s > 0 { // mean density per member keeps the scale of one orbital
			lobes = append(lobes, lobe{atom: at, c: math.Sqrt(s / float64(len(set)))})
		}
	}
	f.drawLobes(cv, lobes, id)
}

// endoContact finds the secondary (endo) contact: a one-electron π centre bonded to a reacting
// dienophile atom (outside the reacting bond) and the inner diene atom next to the terminus
// that atom bonds to, choosing the pair with the largest product of frontier coefficients of
// the controlling pairing. It returns (-1, -1) when the dienophile has no conjugated
// substituent. The pair analysis (fmo) uses the same kind of contact for EndoOverlap.
func endoContact(diene, dienophile *fmo.Partner, p *fmo.Pair, or fmo.Orientation, e, f, dl, el int) (int, int) {
	da := or.DieneAtoms
	if len(da) != 4 || dienophile.Pi == nil || diene.Orb == nil || dienophile.Orb == nil {
		return -1, -1
	}
	best, bestD, bestW := -1, -1, 0.0
	for _, pr := range [][2]int{{e, da[1]}, {f, da[2]}} {
		x, inner := pr[0], pr[1]
		other := f
		if x == f {
			other = e
		}
		for _, nb := range dienophile.Active.Neighbors(x) {
			s := nb.To
			if s == other {
				continue
			}
			c := dienophile.Pi.CentreOf(s)
			if c < 0 || dienophile.Pi.Centres[c].Electrons != 1 {
				continue
			}
			w := math.Abs(coef(dienophile.Orb, el, s) * coef(diene.Orb, dl, inner))
			if w > bestW+1e-12 {
				best, bestD, bestW = s, inner, w
			}
		}
	}
	return best, bestD
}

func coef(o *huckel.Orbitals, level, atom int) float64 {
	if level < 0 || level >= len(o.Levels) {
		return 0
	}
	return o.Coefficient(level, atom)
}

// makeCis turns an acyclic diene drawn s-trans into s-cis by mirroring the part beyond the
// central bond across that bond's line (the reacting conformer is s-cis).
func makeCis(f *figure, da []int) {
	b, c := da[1], da[2]
	bi := f.m.BondBetween(b, c)
	if bi < 0 {
		return
	}
	for _, r := range f.coords.Rings {
		for k, x := range r {
			y := r[(k+1)%len(r)]
			if (x == b && y == c) || (x == c && y == b) {
				return // central bond in a ring: the ring fixes the conformation
			}
		}
	}
	pb, pc := f.pos[b], f.pos[c]
	side := func(p depict.Point) float64 { return (pc.X-pb.X)*(p.Y-pb.Y) - (pc.Y-pb.Y)*(p.X-pb.X) }
	if side(f.pos[da[0]])*side(f.pos[da[3]]) > 0 {
		return // already s-cis
	}
	// atoms on c's side of the b–c bond
	seen := make([]bool, len(f.pos))
	seen[b], seen[c] = true, true
	q := []int{c}
	for i := 0; i < len(q); i++ {
		for _, e := range f.m.Neighbors(q[i]) {
			if !seen[e.To] {
				seen[e.To] = true
				q = append(q, e.To)
			}
		}
	}
	if slices.Contains(q, b) {
		return
	}
	u := depict.Point{X: pc.X - pb.X, Y: pc.Y - pb.Y}
	L := math.Hypot(u.X, u.Y)
	u.X, u.Y = u.X/L, u.Y/L
	old := slices.Clone(f.pos)
	for _, i := range q {
		r := depict.Point{X: f.pos[i].X - pb.X, Y: f.pos[i].Y - pb.Y}
		t := r.X*u.X + r.Y*u.Y
		f.pos[i] = depict.Point{X: pb.X + 2*t*u.X - r.X, Y: pb.Y + 2*t*u.Y - r.Y}
	}
	if depict.Measure(f.m, f.pos).MinDistance < 0.5 { // the s-cis form crowds: keep s-trans
		copy(f.pos, old)
	}
}

// orient moves pos so that atom a sits at origin and atom b on the positive x axis.
func orient(pos []depict.Point, a, b int, origin depict.Point) {
	ang := math.Atan2(pos[b].Y-pos[a].Y, pos[b].X-pos[a].X)
	co, si := math.Cos(-ang), math.Sin(-ang)
	pa := pos[a]
	for i, p := range pos {
		x, y := p.X-pa.X, p.Y-pa.Y
		pos[i] = depict.Point{X: origin.X + x*co - y*si, Y: origin.Y + x*si + y*co}
	}
}

func shift(pos []depict.Point, d depict.Point) {
	for i := range pos {
		pos[i].X += d.X
		pos[i].Y += d.Y
	}
}

func mirrorY(pos []depict.Point) {
	for i := range pos {
		pos[i].Y = -pos[i].Y
	}
}

// flipIfNeeded mirrors the dienophile across the line of its reacting bond e–f so that the
// substituent sec (or, without one, the bulk of the molecule) is above (up) or below it.
func flipIfNeeded(pos []depict.Point, e, f, sec int, up bool) {
	y0 := pos[e].Y
	var s float64
	if sec >= 0 {
		s = pos[sec].Y - y0
	} else {
		s = meanY(pos, all(len(pos))) - y0
	}
	if (up && s < 0) || (!up && s > 0) {
		for i := range pos {
			pos[i].Y = 2*y0 - pos[i].Y
		}
	}
}

func lowY(pos []depict.Point) float64 {
	m := math.Inf(1)
	for _, p := range pos {
		m = math.Min(m, p.Y)
	}
	return m
}

func highY(pos []depict.Point) float64 {
	m := math.Inf(-1)
	for _, p := range pos {
		m = math.Max(m, p.Y)
	}
	return m
}

func meanY(pos []depict.Point, atoms []int) float64 {
	s := 0.0
	for _, i := range atoms {
		s += pos[i].Y
	}
	return s / float64(len(atoms))
}

func all(n int) []int {
	out := make([]int, n)
	for i := range out {
		out[i] = i
	}
	return out
}

func minDist(a, b []depict.Point) float64 {
	m := math.Inf(1)
	for _, p := range a {
		for _, q := range b {
			m = math.Min(m, math.Hypot(p.X-q.X, p.Y-q.Y))
		}
	}
	return m
}

// trimSeg shortens a segment by t pixels at both ends.
func trimSeg(x1, y1, x2, y2, t float64) (float64, float64, float64, float64) {
	dx, dy := x2-x1, y2-y1
	L := math.Hypot(dx, dy)
	if L < 3*t {
		return x1, y1, x2, y2
	}
	ux, uy := dx/L, dy/L
	return x1 + ux*t, y1 + uy*t, x2 - ux*t, y2 - uy*t
}

// gapText writes "; gap 0.965 |β|" and, with a calibration, "= 3.12 eV (calibration: name)".
func gapText(g fmo.Energy, cal string) string {
	s := "; gap " + fixed(g.Beta, 3) + " |β|"
	if cal != "" {
		s += " ≈ " + fixed(g.EV, 2) + " eV (calibration: " + cal + ")"
	}
	return s
}

// pairGeo is the arrangement of a pair picture in bond units (y up): both molecules laid
// out and moved into place, the reacting atoms, the endo contact and the frontier levels.
type pairGeo struct {
	top, bot       *figure
	a, d, e, f     int // diene termini and the dienophile atoms bonded to them
	sec, secDiene  int // endo contact atoms, -1 when none
	normal         bool
	dLevel, eLevel fmo.Frontier
	dWord, eWord   string
}

func pairGeometry(diene, dienophile *fmo.Partner, p *fmo.Pair, k int) (*pairGeo, error) {
	or := p.Orientations[k]
	normal := p.Demand == "normal" || p.Demand == "neutral" && p.GapNormal.Beta <= p.GapInverse.Beta
	dLevel, eLevel := p.DieneHOMO, p.DienophileLUMO
	dWord, eWord := "HOMO", "LUMO"
	if !normal {
		dLevel, eLevel = p.DieneLUMO, p.DienophileHOMO
		dWord, eWord = "LUMO", "HOMO"
	}

	top, err := newFigure(diene.Active)
	if err != nil {
		return nil, err
	}
	bot, err := newFigure(dienophile.Active)
	if err != nil {
		return nil, err
	}
	da := or.DieneAtoms
	a, d := da[0], da[len(da)-1]
	if len(da) == 4 {
		makeCis(top, da)
	}
	// diene: termini on a horizontal line, a on the left, the unit bulging upwards (y up)
	orient(top.pos, a, d, depict.Point{})
	// The unit bulges upwards (inner atoms above the termini line) unless that leaves much
	// more of the molecule hanging below the line, where the dienophile goes.
	inner := da[1 : len(da)-1]
	if meanY(top.pos, inner) < 0 {
		mirrorY(top.pos)
	}
	if lowY(top.pos) < -highY(top.pos)-0.3 {
		mirrorY(top.pos)
	}
	// dienophile: reacting bond parallel below, e under a and f under d
	e, f := or.DienophileAtoms[0], or.DienophileAtoms[1]
	for _, b := range or.Bonds {
		if b[0] == a {
			e = b[1]
		}
		if b[0] == d {
			f = b[1]
		}
	}
	mid := depict.Point{X: (top.pos[a].X + top.pos[d].X) / 2, Y: -approach}
	orient(bot.pos, e, f, depict.Point{})
	ef := bot.pos[f].X - bot.pos[e].X
	shift(bot.pos, depict.Point{X: mid.X - ef/2 - bot.pos[e].X, Y: mid.Y - bot.pos[e].Y})
	// endo: the dienophile's conjugated substituent tucked under the diene if that does not
	// crowd the diene; otherwise (and for exo or no preference) the bulk points away
	sec, secDiene := endoContact(diene, dienophile, p, or, e, f, dLevel.Index, eLevel.Index)
	wantUp := p.Endo != "no" && sec >= 0
	flipIfNeeded(bot.pos, e, f, sec, wantUp)
	if wantUp && minDist(top.pos, bot.pos) < clearance {
		flipIfNeeded(bot.pos, e, f, sec, false)
		wantUp = false
	}
	// still crowded (a ring diene whose other rings hang below the termini, as anthracene):
	// move the dienophile down until it clears the diene
	for k := 0; k < 60 && minDist(top.pos, bot.pos) < clearance; k++ {
		shift(bot.pos, depict.Point{Y: -0.25})
	}

	return &pairGeo{top: top, bot: bot, a: a, d: d, e: e, f: f, sec: sec, secDiene: secDiene,
		normal: normal, dLevel: dLevel, eLevel: eLevel, dWord: dWord, eWord: eWord}, nil
}
