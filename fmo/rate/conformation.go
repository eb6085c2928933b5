package rate

import (
	"math"

	"cyclopair/huckel/molecule"
)

// Conformation is the diene conformation part of the descriptors, read from the molecular
// graph of the 4π partner and the four atoms a, b, c, d of its reacting unit (termini a and d,
// central bond b–c).
type Conformation struct {
	// SCis is log10 of the estimated fraction of the diene in the reactive s-cis (or gauche)
	// conformation at 25 °C: 0 for a diene locked s-cis by a ring through its central bond,
	// about −1.7 for an open-chain diene, lower with a (Z)-1-substituent, higher with a bulky
	// 2-substituent (see SCisFromGraph for every increment and its basis).
	SCis float64
	// Reach is d14 − 2.90 Å: the distance between the diene termini in the s-cis form minus
	// that of planar s-cis butadiene (the chord of a regular hexagon of 1.45 Å sides). Locked
	// dienes in five-membered rings come closer (−0.55 Å), in seven-membered rings stay
	// farther apart (+0.36 Å).
	Reach float64
	// Locked is true when a ring through the central bond b–c holds the s-cis form.
	Locked bool
	// RingSize is the size of the smallest ring holding all four diene atoms (0 if none).
	RingSize int
	// ZSubstituents counts heavy-atom substituents at a terminus cis to the central bond of
	// an open-chain diene ((Z)-1-substituents).
	ZSubstituents int
	// BulkyInner counts branched (tertiary or quaternary) substituents on the inner atoms b
	// and c of an open-chain diene.
	BulkyInner int
}

// Values of the conformation increments. Each is a free energy at 25 °C in kcal/mol; the
// descriptor is −ΔG/(2.303 RT). They are physical estimates with a stated basis, not fitted
// to the rate data; the rate model fits one coefficient on the sum.
const (
	// OpenChainSCisKcal: s-trans 1,3-butadiene lies about 2.5–3 kcal/mol below the gauche
	// (s-cis-like) form and a few per cent of gauche are present at room temperature
	// (M. E. Squillacote, R. S. Sheridan, O. L. Chapman, F. A. L. Anet, J. Am. Chem. Soc.
	// 1979, 101, 3657; from memory). 2.3 kcal/mol is a 2 % population at 25 °C.
	OpenChainSCisKcal = 2.3
	// ZTerminusKcal: a heavy-atom substituent at a terminus cis to the central bond (a
	// (Z)-1-substituent) meets the inner hydrogen of the other terminus in the s-cis form,
	// which raises it by a further 2.5–3 kcal/mol; such dienes react two to three powers of
	// ten slower than their (E) isomers (J. Sauer, R. Sustmann, Angew. Chem. Int. Ed. Engl.
	// 1980, 19, 779; D. Craig, J. J. Shipman, R. B. Fowler, J. Am. Chem. Soc. 1961, 83, 2885;
	// from memory). 2.7 kcal/mol is taken, one per such substituent.
	ZTerminusKcal = 2.7
	// BulkyInnerKcal: a branched 2-substituent (tert-butyl and the like) clashes with the
	// terminus hydrogen in the s-trans form and makes the s-cis/gauche form the major one;
	// 2-tert-butyl-1,3-butadiene reacts faster than isoprene although it is bulkier
	// (Sauer & Sustmann 1980, above; H. Scharf, H. Plum, J. Fleischhauer, W. Schleker,
	// Chem. Ber. 1979, 112, 862, on s-cis populations; from memory). It cancels the
	// open-chain s-trans preference (−2.3 kcal/mol); the total never goes below zero.
	BulkyInnerKcal = -2.3
	// ReferenceD14 is the 1,4-distance of planar s-cis butadiene, Å, and RingBond the mean
	// ring bond used for locked dienes (regular-polygon model; between C=C 1.34 and C–C
	// 1.50 Å; judgement, no source). R. Sustmann, M. Böhm, J. Sauer, Chem. Ber. 1979, 112,
	// 883, found log k2 of cyclic and cis-fixed dienes with TCNE and maleic anhydride linear
	// in the 1,4-distance (abstract read).
	RingBond     = 1.45
	ReferenceD14 = 2 * RingBond
)

// rtLn10 is 2.303·R·T at 25 °C in kcal/mol.
const rtLn10 = 2.302585 * 0.0019872 * 298.15

// ConformationOf computes the conformation descriptors of diene unit atoms (a, b, c, d) of m.
// A unit of another length (1,3-dipoles) has no conformational question: zero descriptors.
func ConformationOf(m *molecule.Molecule, atoms []int) Conformation {
	var c Conformation
	if m == nil || len(atoms) != 4 {
		return c
	}
	a, b, cc, d := atoms[0], atoms[1], atoms[2], atoms[3]
	if n := smallestRingThrough(m, []int{a, b, cc, d}); n > 0 {
		c.Locked, c.RingSize = true, n
		c.Reach = polygonChord(min(n, 8)) - ReferenceD14
		return c
	}
	if smallestRingThrough(m, []int{b, cc}) > 0 {
		// central bond in a ring, termini outside it (1,2-dimethylenecycloalkanes): s-cis
		// held, 1,4-distance as in open-chain s-cis.
		c.Locked = true
		return c
	}
	g := OpenChainSCisKcal
	c.ZSubstituents = zSubstituents(m, a, b, cc) + zSubstituents(m, d, cc, b)
	g += float64(c.ZSubstituents) * ZTerminusKcal
	for _, x := range [2][2]int{{b, cc}, {cc, b}} {
		for _, e := range m.Neighbors(x[0]) {
			if e.To == a || e.To == d || e.To == x[1] {
				continue
			}
			if heavyDegree(m, e.To) >= 4 { // branched: C(C)(C)C, SiR3 bound to the diene
				c.BulkyInner++
			}
		}
	}
	g += float64(c.BulkyInner) * BulkyInnerKcal
	g = max(g, 0)
	c.SCis = -g / rtLn10
	return c
}

// Descriptor is the single conformation descriptor the model uses: SCis plus nothing else;
// Reach enters separately.
func polygonChord(n int) float64 {
	// chord spanning three sides of a regular n-gon of side RingBond
	r := RingBond / (2 * math.Sin(math.Pi/float64(n)))
	return 2 * r * math.Abs(math.Sin(3*math.Pi/float64(n)))
}

func heavyDegree(m *molecule.Molecule, i int) int {
	n := 0
	for _, e := range m.Neighbors(i) {
		if m.Atoms[e.To].Element != "H" {
			n++
		}
	}
	return n
}

// smallestRingThrough returns the size of the smallest ring (up to 8 atoms) containing the
// path given (consecutive atoms bonded), or 0: the shortest path from the last atom back to
// the first that avoids the path's other atoms.
func smallestRingThrough(m *molecule.Molecule, path []int) int {
	const maxRing = 8
	start, goal := path[len(path)-1], path[0]
	banned := map[int]bool{}
	for _, p := range path[1 : len(path)-1] {
		banned[p] = true
	}
	if len(path) == 2 {
		// a ring through the bond path[0]–path[1] not using that bond
		dist := bfs(m, start, goal, banned, [2]int{start, goal}, maxRing-1)
		if dist < 0 {
			return 0
		}
		return dist + 1
	}
	dist := bfs(m, start, goal, banned, [2]int{-1, -1}, maxRing-len(path)+1)
	if dist < 0 {
		return 0
	}
	return len(path) + dist - 1
}

// bfs is the length of the shortest path from s to t avoiding banned atoms and the edge
// skip, at most limit bonds; −1 if none.
func bfs(m *molecule.Molecule, s, t int, banned map[int]bool, skip [2]int, limit int) int {
	dist := map[int]int{s: 0}
	q := []int{s}
	for len(q) > 0 {
		x := q[0]
		q = q[1:]
		if dist[x] >= limit {
			continue
		}
		for _, e := range m.Neighbors(x) {
			y := e.To
			if banned[y] || (x == skip[0] && y == skip[1]) || (x == skip[1] && y == skip[0]) {
				continue
			}
			if _, ok := dist[y]; ok {
				continue
			}
			dist[y] = dist[x] + 1
			if y == t {
				return dist[y]
			}
			q = append(q, y)
		}
	}
	return -1
}

// zSubstituents counts heavy substituents X on terminus a (double bond a=b, b bonded to the
// inner atom c) that lie cis to c, read from the / and \ marks of the SMILES (OpenSMILES:
// F/C=C/F is trans, F/C=C\F cis). Without marks on both sides the geometry is unknown and
// taken as (E) (no hindrance), the common case of commercial dienes.
func zSubstituents(m *molecule.Molecule, a, b, c int) int {
	// σ(c, b) from the b–c bond, or from another neighbour y of b (then inverted)
	sb, okb := sigma(m, c, b)
	if !okb {
		for _, e := range m.Neighbors(b) {
			if e.To == a || e.To == c {
				continue
			}
			if s, ok := sigma(m, e.To, b); ok {
				sb, okb = -s, true
				break
			}
		}
	}
	n := 0
	for _, e := range m.Neighbors(a) {
		x := e.To
		if x == b || m.Atoms[x].Element == "H" {
			continue
		}
		if okb {
			if s, ok := sigma(m, x, a); ok && s == sb {
				n++
			}
		}
	}
	return n
}

// sigma is the side (±1) of neighbour n of double-bond atom d from the stereo mark of the
// bond n–d and the order the two atoms were written in.
func sigma(m *molecule.Molecule, n, d int) (int, bool) {
	bi := m.BondBetween(n, d)
	if bi < 0 {
		return 0, false
	}
	st := m.Bonds[bi].Stereo
	if st != '/' && st != '\\' {
		return 0, false
	}
	before := m.Atoms[n].Pos < m.Atoms[d].Pos
	if m.Atoms[n].Pos < 0 || m.Atoms[d].Pos < 0 {
		before = n < d
	}
	s := 1
	if st == '\\' {
		s = -1
	}
	if !before {
		s = -s
	}
	return s, true
}
