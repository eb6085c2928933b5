package molfile

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// BondLength is the length, in ångström, of one depict bond unit in written coordinates:
// a C–C single bond is about 1.5 Å, and 2D molfiles drawn at that scale look right in any
// viewer (common practice, no source).
const BondLength = 1.5

// PropSMILES is the data item name this project uses for a molecule's SMILES (the Kekulé
// SMILES of smiles.Write). Data item names of our own are lowercase words joined by '_'
// with the prefix "cyclopair_", so they cannot be mistaken for another program's fields.
const PropSMILES = "cyclopair_smiles"

// ErrWrite is wrapped by every error of the writer: a molecule the V2000 format cannot
// hold (more than 999 atoms or bonds, an atom map above 999, a valence above 14, an
// element that is not one), or a data item that would not read back.
var ErrWrite = errors.New("cannot write molfile")

// maxTitle is the longest title line written (the CTfile line limit is 80 characters).
const maxTitle = 80

// Marshal returns m as a V2000 molfile, from its title line to "M  END\n". pos gives the
// 2D position of every atom in depict's bond-length units (depict.Layout(m).Pos), scaled
// by BondLength; nil lays m out with depict.Layout.
//
// What is written: the title line is m.Name (line breaks and tabs made spaces, cut to 80
// bytes); line 2 names the program and says 2D, with no date, so the output depends only
// on the molecule; line 3 is blank. Atoms follow m's order with x, y and z = 0, the element
// symbol, the charge both as the atom-block code (when within ±3) and on "M  CHG" lines,
// the atom map in the atom-atom mapping field, and the valence field only where the default
// valence model would not give the atom's hydrogen count back (always for metals and noble
// gases, whose implicit hydrogens readers disagree on). Isotopes go on "M  ISO" lines.
// Bonds follow m's order with their Kekulé orders 1-3 and no stereo; the Aromatic flags are
// not written. Hydrogen atoms of the graph are written as atoms.
func Marshal(m *molecule.Molecule, pos []depict.Point) ([]byte, error) {
	return appendMolfile(nil, m, pos)
}

// AppendSD appends one SD record to dst: the molfile of Marshal, then the data items in the
// order given, each as a header line ">  <NAME>", its value lines and a blank line, and
// the terminator "$$$$". A name must be non-empty printable text without '<' or '>'; a
// value may span lines (trailing line breaks are dropped) but must not contain a blank
// line, which would end it early, nor a line "$$$$".
func AppendSD(dst []byte, m *molecule.Molecule, pos []depict.Point, props []Prop) ([]byte, error) {
	start := len(dst)
	dst, err := appendMolfile(dst, m, pos)
	if err != nil {
		return dst[:start], err
	}
	for _, p := range props {
		val, err := checkProp(p)
		if err != nil {
			return dst[:start], err
		}
		dst = append(dst, ">  <"...)
		dst = append(dst, p.Name...)
		dst = append(dst, ">\n"...)
		if val != "" {
			dst = append(dst, val...)
			dst = append(dst, '\n')
		}
		dst = append(dst, '\n')
	}
	return append(dst, "$$$$\n"...), nil
}

// checkProp returns the value to write or why the item cannot be written.
func checkProp(p Prop) (string, error) {
	if p.Name == "" || strings.TrimSpace(p.Name) != p.Name || !utf8.ValidString(p.Name) ||
		strings.ContainsAny(p.Name, "<>") || strings.ContainsFunc(p.Name, isControl) {
		return "", fmt.Errorf("%w: data item name %q: use printable text without '<', '>' or surrounding spaces", ErrWrite, p.Name)
	}
	val := strings.TrimRight(p.Value, "\r\n")
	if !utf8.ValidString(val) || strings.ContainsRune(val, '\r') {
		return "", fmt.Errorf("%w: data item %s: value must be UTF-8 text with \\n line breaks", ErrWrite, p.Name)
	}
	if val == "" {
		return "", nil
	}
	for _, line := range strings.Split(val, "\n") {
		if strings.TrimSpace(line) == "" {
			return "", fmt.Errorf("%w: data item %s: a blank line inside the value would end it early", ErrWrite, p.Name)
		}
		if isTerminator([]byte(line)) {
			return "", fmt.Errorf("%w: data item %s: a value line \"$$$$\" would end the record", ErrWrite, p.Name)
		}
	}
	return val, nil
}

func isControl(r rune) bool { return r < 0x20 || r == 0x7f }

// Writer writes SD records to an io.Writer.
type Writer struct {
	w   io.Writer
	buf []byte
}

// NewWriter returns a writer of SD records to w.
func NewWriter(w io.Writer) *Writer { return &Writer{w: w} }

// Write writes one SD record (see AppendSD). Nothing is written when the molecule or a data
// item cannot be written.
func (w *Writer) Write(m *molecule.Molecule, pos []depict.Point, props []Prop) error {
	var err error
	w.buf, err = AppendSD(w.buf[:0], m, pos, props)
	if err != nil {
		return err
	}
	_, err = w.w.Write(w.buf)
	return err
}

// appendMolfile appends the V2000 molfile of m.
func appendMolfile(dst []byte, m *molecule.Molecule, pos []depict.Point) ([]byte, error) {
	n := len(m.Atoms)
	if n == 0 {
		return dst, fmt.Errorf("%w: the molecule has no atoms", ErrWrite)
	}
	if n > 999 || len(m.Bonds) > 999 {
		return dst, fmt.Errorf("%w: %d atoms and %d bonds; V2000 holds at most 999 of each", ErrWrite, n, len(m.Bonds))
	}
	if pos == nil {
		c, err := depict.Layout(m)
		if err != nil {
			return dst, fmt.Errorf("%w: %w", ErrWrite, err)
		}
		pos = c.Pos
	}
	if len(pos) != n {
		return dst, fmt.Errorf("%w: %d positions for %d atoms", ErrWrite, len(pos), n)
	}
	for i, p := range pos {
		if !coordFits(p.X*BondLength) || !coordFits(p.Y*BondLength) {
			return dst, fmt.Errorf("%w: atom %d: position (%g, %g) does not fit the coordinate fields", ErrWrite, i+1, p.X, p.Y)
		}
	}
	valence := make([]int, n)
	for i, a := range m.Atoms {
		if smiles.AtomicNumber(a.Element) == 0 {
			return dst, fmt.Errorf("%w: atom %d: %q is not an element", ErrWrite, i+1, a.Element)
		}
		switch {
		case a.Charge < -15 || a.Charge > 15:
			return dst, fmt.Errorf("%w: atom %d: charge %d outside -15..15", ErrWrite, i+1, a.Charge)
		case a.Map < 0 || a.Map > 999:
			return dst, fmt.Errorf("%w: atom %d: atom map %d outside 0..999", ErrWrite, i+1, a.Map)
		case a.Isotope < 0 || a.Isotope > 999:
			return dst, fmt.Errorf("%w: atom %d: isotope %d outside 0..999", ErrWrite, i+1, a.Isotope)
		case a.HCount < 0:
			return dst, fmt.Errorf("%w: atom %d: negative hydrogen count", ErrWrite, i+1)
		}
		s := 0
		for _, e := range m.Neighbors(i) {
			o := m.Bonds[e.Bond].Order
			if o < 1 || o > 3 {
				return dst, fmt.Errorf("%w: bond %d has order %d; only Kekulé orders 1-3 are written", ErrWrite, e.Bond+1, o)
			}
			s += o
		}
		v, err := valenceField(a, s)
		if err != nil {
			return dst, fmt.Errorf("%w: atom %d: %w", ErrWrite, i+1, err)
		}
		valence[i] = v
	}
	dst = append(dst, cleanTitle(m.Name)...)
	dst = append(dst, "\n  cyclopr           2D\n\n"...)
	dst = fmt.Appendf(dst, "%3d%3d  0  0  0  0  0  0  0  0999 V2000\n", n, len(m.Bonds))
	for i, a := range m.Atoms {
		code := 0
		if a.Charge >= -3 && a.Charge <= 3 && a.Charge != 0 {
			code = 4 - a.Charge
		}
		dst = appendCoord(dst, pos[i].X*BondLength)
		dst = appendCoord(dst, pos[i].Y*BondLength)
		dst = appendCoord(dst, 0)
		dst = fmt.Appendf(dst, " %-3s 0%3d  0  0  0%3d  0  0  0%3d  0  0\n", a.Element, code, valence[i], a.Map)
	}
	for _, b := range m.Bonds {
		dst = fmt.Appendf(dst, "%3d%3d%3d  0\n", b.A+1, b.B+1, b.Order)
	}
	dst = appendAtomProps(dst, m, "M  CHG", func(a molecule.Atom) int { return a.Charge })
	dst = appendAtomProps(dst, m, "M  ISO", func(a molecule.Atom) int { return a.Isotope })
	return append(dst, "M  END\n"...), nil
}

// valenceField returns the V2000 valence field for atom a with bond orders adding up to s:
// 0 when the default valence model gives a.HCount back, else the total valence (15 for
// zero).
func valenceField(a molecule.Atom, s int) (int, error) {
	total := s + a.HCount
	vals, checked, ok := defaultValences(a.Element, a.Charge)
	if checked && ok {
		if v := nextValence(vals, s); v >= 0 && v-s == a.HCount {
			return 0, nil
		}
	}
	switch {
	case total == 0:
		return 15, nil
	case total > 14:
		return 0, fmt.Errorf("valence %d above 14 cannot be written", total)
	}
	return total, nil
}

// coordFits reports whether v can be written in a 10-column coordinate field with four
// decimals: from -9999.9999 to 99999.9999.
func coordFits(v float64) bool {
	return finite(v) && len(formatCoord(v)) <= 10
}

// formatCoord formats a coordinate with four decimals, -0.0000 as 0.0000.
func formatCoord(v float64) string {
	v = math.Round(v*1e4) / 1e4
	if v == 0 {
		v = 0 // drop the sign of -0
	}
	return strconv.FormatFloat(v, 'f', 4, 64)
}

// appendCoord writes one coordinate as %10.4f.
func appendCoord(dst []byte, v float64) []byte {
	s := formatCoord(v)
	for k := len(s); k < 10; k++ {
		dst = append(dst, ' ')
	}
	return append(dst, s...)
}

// appendAtomProps writes the nonzero values of get on lines of up to eight entries.
func appendAtomProps(dst []byte, m *molecule.Molecule, tag string, get func(molecule.Atom) int) []byte {
	var idx []int
	for i, a := range m.Atoms {
		if get(a) != 0 {
			idx = append(idx, i)
		}
	}
	for len(idx) > 0 {
		k := min(len(idx), 8)
		dst = fmt.Appendf(dst, "%s%3d", tag, k)
		for _, i := range idx[:k] {
			dst = fmt.Appendf(dst, " %3d %3d", i+1, get(m.Atoms[i]))
		}
		dst = append(dst, '\n')
		idx = idx[k:]
	}
	return dst
}

// cleanTitle makes a molecule name fit the title line.
func cleanTitle(s string) string {
	s = strings.ToValidUTF8(s, "\uFFFD")
	s = strings.Map(func(r rune) rune {
		if isControl(r) {
			return ' '
		}
		return r
	}, s)
	s = strings.TrimRight(truncateUTF8(s, maxTitle), " ")
	if isTerminator([]byte(s)) {
		s = "" // a title "$$$$" would end the record
	}
	return s
}
