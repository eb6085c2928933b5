// Package depict computes 2D coordinates for drawing a molecule: rings as regular polygons,
// fused rings sharing an edge, spiro rings sharing an atom, bridged systems best effort, chains
// in zig-zag, substituents spread evenly around their atom, separate fragments side by side.
//
// Contract:
//   - Every bond is laid out with length 1 (the unit of the returned coordinates); ring bonds
//     of bridged polycycles may deviate when no planar drawing with equal bonds exists (see
//     Quality and the known misses listed in testdata/depict/README.md).
//   - No two atoms of an ordinary substrate (up to about 60 heavy atoms) are closer than half a
//     bond length: a final relief pass turns and mirrors branches around acyclic bonds to
//     remove clashes.
//   - Output is deterministic: the same molecule gives bit-identical coordinates on every run
//     (no map iteration, no randomness); the result depends on atom and bond order only
//     through documented tie-breaks (lowest index first).
//   - An acyclic double bond with a '/' or '\' mark on a neighbour bond at each end is drawn
//     cis or trans as marked (F/C=C\F cis); unmarked double bonds make no E/Z claim.
//   - Implicit hydrogens (Atom.HCount) are not laid out; explicit hydrogen atoms in the graph
//     are ordinary atoms here.
//   - The y axis points up (chemist's convention); drawing code that writes SVG flips it.
//
// Failure modes: an empty molecule returns ErrEmpty; a molecule with more than MaxAtoms atoms
// returns ErrTooLarge. Layout never panics on a well-formed molecule.Molecule.
//
// The package imports only huckel/molecule; it knows nothing of π systems or orbitals.
package depict

import (
	"errors"
	"fmt"
	"math"

	"cyclopair/huckel/molecule"
)

// MaxAtoms is the largest molecule Layout accepts. The relief pass is quadratic in the atom
// count per step, so very large inputs are refused rather than left to run for minutes.
const MaxAtoms = 1000

// Sentinel errors returned (wrapped) by Layout.
var (
	ErrEmpty    = errors.New("molecule has no atoms")
	ErrTooLarge = errors.New("molecule too large to depict")
)

// Point is a 2D position in bond-length units, y up.
type Point struct{ X, Y float64 }

func (p Point) add(q Point) Point      { return Point{p.X + q.X, p.Y + q.Y} }
func (p Point) sub(q Point) Point      { return Point{p.X - q.X, p.Y - q.Y} }
func (p Point) scale(s float64) Point  { return Point{p.X * s, p.Y * s} }
func (p Point) dot(q Point) float64    { return p.X*q.X + p.Y*q.Y }
func (p Point) cross(q Point) float64  { return p.X*q.Y - p.Y*q.X }
func (p Point) norm() float64          { return math.Hypot(p.X, p.Y) }
func (p Point) dist(q Point) float64   { return math.Hypot(p.X-q.X, p.Y-q.Y) }
func (p Point) rot(c, s float64) Point { return Point{p.X*c - p.Y*s, p.X*s + p.Y*c} }
func (p Point) rotDeg(deg float64) Point {
	return p.rot(math.Cos(deg*math.Pi/180), math.Sin(deg*math.Pi/180))
}
func (p Point) unit() Point {
	n := p.norm()
	if n < 1e-12 {
		return Point{1, 0}
	}
	return Point{p.X / n, p.Y / n}
}

// Coords is a 2D depiction of a molecule.
type Coords struct {
	Pos []Point // one per atom, same indices as the molecule
	// Rings is the smallest set of smallest rings found, each as atom indices in ring order
	// (consecutive atoms bonded, last bonded to first), ordered by size then lowest atoms.
	// Drawing code uses it to put the second line of a ring double bond inside the ring.
	Rings [][]int
}

// Bounds returns the bounding box of the atom positions (min, max).
func (c *Coords) Bounds() (min, max Point) {
	if len(c.Pos) == 0 {
		return Point{}, Point{}
	}
	min, max = c.Pos[0], c.Pos[0]
	for _, p := range c.Pos[1:] {
		min.X, min.Y = math.Min(min.X, p.X), math.Min(min.Y, p.Y)
		max.X, max.Y = math.Max(max.X, p.X), math.Max(max.Y, p.Y)
	}
	return min, max
}

// RingCentre returns the centroid of the smallest ring containing bond a–b, and ok=false when
// the bond is in no ring.
func (c *Coords) RingCentre(a, b int) (Point, bool) {
	for _, r := range c.Rings { // sorted by size: the first hit is the smallest ring
		if ringHasBond(r, a, b) {
			var s Point
			for _, i := range r {
				s = s.add(c.Pos[i])
			}
			return s.scale(1 / float64(len(r))), true
		}
	}
	return Point{}, false
}

func ringHasBond(r []int, a, b int) bool {
	for k, i := range r {
		j := r[(k+1)%len(r)]
		if (i == a && j == b) || (i == b && j == a) {
			return true
		}
	}
	return false
}

// Quality measures a depiction against the layout contract.
type Quality struct {
	MinDistance      float64 // smallest distance between two atoms (any pair), bond units
	MinPair          [2]int  // the atoms at MinDistance
	MaxBondDeviation float64 // largest |length − 1| over all bonds
	WorstBond        int     // the bond at MaxBondDeviation, -1 without bonds
}

// Measure computes the Quality of positions pos for molecule m.
func Measure(m *molecule.Molecule, pos []Point) Quality {
	q := Quality{MinDistance: math.Inf(1), MinPair: [2]int{-1, -1}, WorstBond: -1}
	for i := range pos {
		for j := i + 1; j < len(pos); j++ {
			if d := pos[i].dist(pos[j]); d < q.MinDistance {
				q.MinDistance, q.MinPair = d, [2]int{i, j}
			}
		}
	}
	for bi, b := range m.Bonds {
		if dev := math.Abs(pos[b.A].dist(pos[b.B]) - 1); dev > q.MaxBondDeviation || q.WorstBond < 0 {
			q.MaxBondDeviation, q.WorstBond = dev, bi
		}
	}
	return q
}

// Layout computes 2D coordinates for every atom of m. See the package documentation for the
// contract.
func Layout(m *molecule.Molecule) (*Coords, error) {
	var w Workspace
	pos, err := w.LayoutInto(m, nil)
	if err != nil {
		return nil, err
	}
	return &Coords{Pos: pos, Rings: w.Rings()}, nil
}

// Workspace lays out molecule after molecule with buffers that grow but are never freed, so
// that, once warm, a layout of an ordinary substrate allocates nothing (bridged cages that
// need the trial constructions of their ring system and clash relief by branch moves still
// allocate). The coordinates are bit-identical to Layout's. The zero value is ready to use;
// a Workspace is not safe for concurrent use.
type Workspace struct {
	g  graph
	rs ringScratch
	l  layouter
}

// LayoutInto computes the coordinates of Layout(m) into pos, grown (reallocated) to
// len(m.Atoms) when too short, and returns it. Errors as Layout.
func (w *Workspace) LayoutInto(m *molecule.Molecule, pos []Point) ([]Point, error) {
	n := len(m.Atoms)
	if n == 0 {
		return nil, fmt.Errorf("depict: %w", ErrEmpty)
	}
	if n > MaxAtoms {
		return nil, fmt.Errorf("depict: %d atoms (limit %d): %w", n, MaxAtoms, ErrTooLarge)
	}
	if cap(pos) < n {
		pos = make([]Point, n)
	}
	pos = pos[:n]
	clear(pos)
	g := &w.g
	g.build(m)
	rings := g.sssr(&w.rs)
	l := &w.l
	l.g, l.m, l.pos = g, m, pos
	l.placed, l.turn = grow(l.placed, n), grow(l.turn, n)
	clear(l.placed)
	clear(l.turn)
	l.rings = rings
	l.buildSystems()
	l.ez = l.ezRules()
	xOffset := 0.0
	for ci, comp := range l.components() {
		l.layoutComponent(comp)
		l.applyEZ(comp)
		l.relieve(comp)
		normalizeOrientation(pos, comp)
		// place side by side, vertically centred on y = 0
		minX, maxX, minY, maxY := math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
		for _, i := range comp {
			p := pos[i]
			minX, maxX = math.Min(minX, p.X), math.Max(maxX, p.X)
			minY, maxY = math.Min(minY, p.Y), math.Max(maxY, p.Y)
		}
		dx := xOffset - minX
		if ci == 0 {
			dx = -minX
		}
		dy := -(minY + maxY) / 2
		for _, i := range comp {
			pos[i] = pos[i].add(Point{dx, dy})
		}
		xOffset = maxX + dx + fragmentGap
	}
	for i := range pos { // canonical zero: avoid "-0.00" in printed output
		pos[i] = Point{clean(pos[i].X), clean(pos[i].Y)}
	}
	l.m, l.pos = nil, nil // keep no reference to the caller's data
	return pos, nil
}

// Rings returns the smallest set of smallest rings of the last LayoutInto (as Coords.Rings),
// in buffers of w that the next call overwrites.
func (w *Workspace) Rings() [][]int {
	if len(w.l.rings) == 0 {
		return nil
	}
	return w.l.rings
}

// fragmentGap is the horizontal space between separate fragments, bond units.
const fragmentGap = 1.5

func clean(v float64) float64 {
	if math.Abs(v) < 1e-9 {
		return 0
	}
	return v
}

// normalizeOrientation turns a fragment so its long axis is horizontal. The angle is snapped
// to a multiple of 30° so hexagons stay in one of their two usual orientations.
func normalizeOrientation(pos []Point, comp []int) {
	if len(comp) < 3 {
		if len(comp) == 2 { // a diatomic: horizontal
			d := pos[comp[1]].sub(pos[comp[0]])
			a := math.Atan2(d.Y, d.X)
			rotateAbout(pos, comp, pos[comp[0]], -a)
		}
		return
	}
	var cx, cy float64
	for _, i := range comp {
		cx += pos[i].X
		cy += pos[i].Y
	}
	cx /= float64(len(comp))
	cy /= float64(len(comp))
	var sxx, syy, sxy float64
	for _, i := range comp {
		dx, dy := pos[i].X-cx, pos[i].Y-cy
		sxx += dx * dx
		syy += dy * dy
		sxy += dx * dy
	}
	// principal axis angle of the 2×2 covariance; skip near-isotropic shapes (benzene)
	disc := math.Hypot(sxx-syy, 2*sxy)
	if disc < 0.5*(sxx+syy) { // only clearly elongated shapes (λ1/λ2 > 3) are turned
		return
	}
	a := 0.5 * math.Atan2(2*sxy, sxx-syy)
	step := math.Pi / 6
	a = math.Round(a/step) * step
	if math.Abs(a) < 1e-12 {
		return
	}
	rotateAbout(pos, comp, Point{cx, cy}, -a)
}

func rotateAbout(pos []Point, atoms []int, c Point, ang float64) {
	co, si := math.Cos(ang), math.Sin(ang)
	for _, i := range atoms {
		pos[i] = pos[i].sub(c).rot(co, si).add(c)
	}
}
