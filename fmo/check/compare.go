package check

import (
	"fmt"
	"slices"
	"strings"

	"cyclopair/fmo/internal/stats"
	"cyclopair/huckel/smiles"
)

func invert(m map[int]int) map[int]int {
	out := make(map[int]int, len(m))
	for k, v := range m {
		out[v] = k
	}
	return out
}

func mapIdx(maps []int, m map[int]int) []int {
	out := make([]int, len(maps))
	for i, x := range maps {
		out[i] = m[x]
	}
	return out
}

// atomText names atom i by its map number (":5") when it has one, else by its index ("#7").
func atomText(i int, inv map[int]int) string {
	if inv == nil {
		return fmt.Sprintf(":%d", i)
	}
	if n, ok := inv[i]; ok {
		return fmt.Sprintf(":%d", n)
	}
	return fmt.Sprintf("#%d", i)
}

func bondText(b [][2]int, dInv, eInv map[int]int) string {
	parts := make([]string, len(b))
	for i, x := range b {
		parts[i] = atomText(x[0], dInv) + "–" + atomText(x[1], eInv)
	}
	return strings.Join(parts, ", ")
}

func atomsText(a []int, inv map[int]int) string {
	parts := make([]string, len(a))
	for i, x := range a {
		parts[i] = atomText(x, inv)
	}
	return strings.Join(parts, ",")
}

func sameBondSet(a, b [][2]int) bool {
	if len(a) != 2 || len(b) != 2 {
		return false
	}
	return (a[0] == b[0] && a[1] == b[1]) || (a[0] == b[1] && a[1] == b[0])
}

func sameSet(a, b []int) bool {
	x, y := slices.Clone(a), slices.Clone(b)
	slices.Sort(x)
	slices.Sort(y)
	return slices.Equal(x, y)
}

// sameMolecule compares two SMILES by their canonical forms (atom maps and stereo marks
// ignored); unparsable input never matches.
func sameMolecule(a, b string) bool {
	ca, err := canonicalNoMaps(a)
	if err != nil {
		return false
	}
	cb, err := canonicalNoMaps(b)
	return err == nil && ca == cb
}

// canonicalNoMaps returns smiles.Canonical of s with atom maps cleared.
func canonicalNoMaps(s string) (string, error) {
	m, err := smiles.Parse(s)
	if err != nil {
		return "", err
	}
	for i := range m.Atoms {
		m.Atoms[i].Map = 0
	}
	return smiles.Canonical(m), nil
}

// Spearman returns Spearman's rank correlation of x and y: the Pearson correlation of their
// ranks, tied values sharing the mean of the ranks they span (C. Spearman, Am. J. Psychol.
// 1904, 15, 72; the tie rule is the usual mid-rank convention). It panics if the lengths
// differ; NaN when either has no spread.
func Spearman(x, y []float64) float64 {
	if len(x) != len(y) {
		panic("check.Spearman: length mismatch")
	}
	return stats.Spearman(x, y, rankTol)
}

// rankTol: values closer than this share a rank (Hückel figures of molecules that differ
// only in stereochemistry are equal up to rounding).
const rankTol = 1e-9
