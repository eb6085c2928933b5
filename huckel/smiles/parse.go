// Package smiles reads and writes SMILES strings as molecule.Molecule graphs.
//
// # Reading
//
// Parse accepts the OpenSMILES language (Craig A. James et al., OpenSMILES specification,
// opensmiles.org) minus stereochemistry, which is read and dropped:
//
//   - the organic subset B C N O P S F Cl Br I and the aromatic b c n o p s, with implicit
//     hydrogens from the default valences (B 3, C 4, N 3/5, O 2, P 3/5, S 2/4/6, F Cl Br 1,
//     I 1/3/5);
//   - bracket atoms [isotope Element chirality Hn charge :class], with any element symbol,
//     aromatic c n o p s b se as te, charges written +, ++, +2, -, --, -2, and the atom
//     class kept as Atom.Map; chirality marks (@, @@, @TH1, ...) are accepted and ignored;
//   - branches, ring closures 0–9, %nn and %(n), bond symbols - = # : / \ (the directional
//     marks / and \ are kept in Bond.Stereo and otherwise read as single bonds), and
//     dot-separated fragments.
//
// Aromatic input is kekulised before Parse returns: every aromatic atom that needs a double
// bond (a pyridine-type n, a c, an [n+] with three neighbours; not a pyrrole-type [nH], o, s
// or [cH-]) gets exactly one, found as a perfect matching over those atoms (a greedy pass
// completed by Edmonds' blossom algorithm, so fused and odd-membered systems such as
// azulene, indole and purine work). Bond.Order is then 1, 2 or 3 everywhere; Atom.Aromatic
// and Bond.Aromatic only record how the input was written. An implicit bond between two
// aromatic atoms that lies in no ring (the biaryl bond of c1ccccc1c1ccccc1) is single.
//
// Implicit hydrogen counts follow the default valences after kekulisation: the smallest
// default valence that is at least the sum of bond orders. Bracket atoms of the main-group
// elements H B C N O F Si P S Cl Ge As Se Br Sb Te I are checked: bond orders plus the
// written hydrogens must be a valence of the isoelectronic neutral element (N+ bonds like
// C, O+ like N, C- like N, B- like C; period-2 atoms keep the octet, heavier ones may
// expand by twos). Short of that valence the atom has unpaired electrons (ErrRadical);
// beyond the largest it is ErrValence.
//
// Parse is safe for concurrent use; it keeps per-call work space in a sync.Pool, so the
// only allocations are those of the returned molecule (six: the Molecule, its Atoms and
// Bonds, and three for the adjacency lists).
//
// # Failure modes
//
// Parse never panics on any input. A problem yields an *Error carrying the 0-based byte
// offset, a message, a hint and one of the sentinels ErrEmpty, ErrTooLong, ErrSyntax,
// ErrUnknownElement, ErrRingNotClosed, ErrKekulize, ErrValence and ErrRadical. Input
// longer than MaxLength bytes (4,096; ParseOptions raises it) is refused with ErrTooLong
// before anything is allocated. Excerpt shows at most 100 characters of the input around
// the problem, with control characters escaped (package errtext). Where the
// reader can go on after a problem (unknown elements, unclosed rings and branches,
// several radical atoms) it collects every problem and returns them as an ErrorList;
// a single problem is returned as a bare *Error. In both cases errors.As(err, &e) with
// e *Error yields the first problem.
//
// Rejected on purpose: radicals and carbenes ([CH3], [CH2], [O]; there is no way to say
// "this electron is unpaired" in the later Hückel stages), the quadruple bond $, the
// wildcard atom *, valences above the allowed maximum (C with five bonds), and aromatic
// atoms outside rings. Metals and noble gases in brackets are accepted with the hydrogen
// count and charge as written and are not valence-checked.
//
// # Writing
//
// Write emits a Kekulé SMILES (uppercase atoms, explicit = and #) that Parse reads back to
// the same graph; Canonical emits one string per constitution whatever the atom order.
package smiles

import (
	"fmt"
	"slices"
	"strconv"
	"sync"

	"cyclopair/huckel/molecule"
)

// bond symbol codes kept while parsing
const (
	symNone   byte = 0
	symSingle byte = '-'
	symDouble byte = '='
	symTriple byte = '#'
	symArom   byte = ':'
	symUp     byte = '/'
	symDown   byte = '\\'
)

type pendingBond struct {
	sym byte
	pos int
}

type ringOpen struct {
	num   int    // ring-closure number
	label string // as written: "1", "%12", "%(123)"
	atom  int    // atom it was opened on
	pos   int    // offset of the digit or '%'
	bond  pendingBond
}

// closure records a bond made by a ring closure, for the duplicate-bond check.
type closure struct {
	bond  int    // index in m.Bonds
	pos   int    // offset of the closing ring number
	label string // the ring number as written
}

type branchOpen struct {
	atom   int // atom the branch hangs from
	pos    int // offset of '('
	natoms int // atom count when the branch opened
}

// parser holds the state of one Parse call. Small fixed buffers keep the common case
// (a handful of open rings and branches) free of allocations.
type parser struct {
	src  string
	m    *molecule.Molecule
	errs ErrorList

	prev      int  // atom the next bond attaches to, -1 at the start of a fragment
	afterOpen bool // just after '(' (an atom or bond must follow)
	dotPos    int  // offset of a '.' still waiting for its atom, -1 otherwise
	bond      pendingBond
	bondSyms  []byte // symbol each bond was written with (parallel to m.Bonds)

	rings    []ringOpen
	ringBuf  [8]ringOpen
	closures []closure
	branches []branchOpen
	brBuf    [8]branchOpen

	hasAromatic bool
	bad         bool // a non-fatal error was recorded; skip the chemistry checks
	symBuf      [64]byte
	sc          scratch // work space for ring search and kekulisation, kept by the pool
}

// parserPool recycles parsers and their work space: in a batch, Parse then allocates only
// what the returned molecule owns.
var parserPool = sync.Pool{New: func() any { return new(parser) }}

// MaxLength is the longest SMILES, in bytes, that Parse accepts. 4,096 bytes is the cap
// the substrate-file loader puts on each SMILES (one limit for every way in: command
// line, stdin, files); it allows about 2,700 atoms, well beyond the largest π system the
// huckel package solves by default (huckel.DefaultMaxCentres = 500). Longer input fails
// with ErrTooLong before anything is allocated; ParseOptions.MaxLength raises the limit.
const MaxLength = 4096

// ParseOptions adjusts Parse. The zero value gives Parse's behaviour.
type ParseOptions struct {
	// MaxLength is the longest input accepted, in bytes; 0 (or less) means MaxLength.
	// Raise it for generated SMILES (the adduct of two large partners is longer than
	// either) or from a command-line flag (--max-smiles-length); math.MaxInt lifts it.
	// Reading is linear in the length, but the later stages are not (see package huckel).
	MaxLength int
}

// Parse reads one SMILES string of at most MaxLength bytes. The returned molecule has
// Source set to s, atoms in the order they appear in s (Atom.Pos is each atom's byte
// offset), Kekulé bond orders and hydrogen counts. On failure the molecule is nil and the
// error is an *Error or an ErrorList of *Error (see the package documentation).
func Parse(s string) (*molecule.Molecule, error) { return ParseOptions{}.Parse(s) }

// Parse is the package-level Parse with the options' length limit. A longer input fails
// with an *Error wrapping ErrTooLong at the first byte beyond the limit.
func (o ParseOptions) Parse(s string) (*molecule.Molecule, error) {
	if len(s) == 0 {
		return nil, &Error{Input: s, Pos: 0, Msg: "empty input", Hint: "give a SMILES such as C=CC=C", Err: ErrEmpty}
	}
	limit := o.MaxLength
	if limit <= 0 {
		limit = MaxLength
	}
	if len(s) > limit {
		return nil, &Error{Input: s, Pos: limit, Err: ErrTooLong,
			Msg:  fmt.Sprintf("SMILES of %d bytes is longer than the limit of %d bytes", len(s), limit),
			Hint: "shorten it, or raise the limit with --max-smiles-length"}
	}
	p := parserPool.Get().(*parser)
	defer p.release()
	p.src, p.prev, p.dotPos = s, -1, -1
	p.rings = p.ringBuf[:0]
	p.branches = p.brBuf[:0]
	p.bondSyms = p.bondSyms[:0]
	p.closures = p.closures[:0]
	if p.bondSyms == nil {
		p.bondSyms = p.symBuf[:0]
	}
	na, nb := estimateSize(s)
	p.m = &molecule.Molecule{
		Source: s,
		Atoms:  make([]molecule.Atom, 0, na),
		Bonds:  make([]molecule.Bond, 0, nb),
	}
	if p.scan() && !p.bad {
		p.m.Reindex()
		if p.noDuplicateBonds() {
			p.chemistry()
		}
	}
	if len(p.errs) > 0 {
		errs := p.errs
		slices.SortStableFunc(errs, func(a, b *Error) int { return a.Pos - b.Pos })
		return nil, errs.Err()
	}
	return p.m, nil
}

// release clears everything that belongs to the caller and returns p to the pool.
func (p *parser) release() {
	sc, syms, cl := p.sc, p.bondSyms, p.closures
	if cap(syms) > 1<<16 {
		syms, cl = nil, nil // do not keep huge buffers alive
		sc = scratch{}
	}
	*p = parser{sc: sc, bondSyms: syms[:0], closures: cl[:0]}
	parserPool.Put(p)
}

// estimateSize returns capacity hints for atoms and bonds: an upper bound on the atoms
// outside brackets plus brackets, and atoms plus ring-closure digits.
func estimateSize(s string) (atoms, bonds int) {
	inBracket := false
	rings := 0
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c == '[':
			inBracket = true
			atoms++
		case c == ']':
			inBracket = false
		case inBracket:
		case c >= 'A' && c <= 'Z', c == 'b', c == 'c', c == 'n', c == 'o', c == 'p', c == 's':
			atoms++
		case c >= '0' && c <= '9', c == '%':
			rings++
		}
	}
	return atoms, atoms + rings
}

func (p *parser) errorf(pos int, sentinel error, hint, format string, args ...any) {
	p.errs = append(p.errs, &Error{Input: p.src, Pos: pos, Msg: fmt.Sprintf(format, args...), Hint: hint, Err: sentinel})
}

// fail records a syntax error after which scanning cannot go on.
func (p *parser) fail(pos int, hint, format string, args ...any) bool {
	p.errorf(pos, ErrSyntax, hint, format, args...)
	return false
}

// quote shows one input byte in a message.
func quote(c byte) string {
	switch {
	case c == ' ':
		return "space"
	case c == '\t':
		return "tab"
	case c == '\n' || c == '\r':
		return "line break"
	case c < 0x20 || c >= 0x7f:
		return fmt.Sprintf("byte 0x%02x", c)
	}
	return "'" + string(c) + "'"
}

// scan walks the text once, building atoms and bonds. It returns false after a fatal
// syntax error.
func (p *parser) scan() bool {
	s := p.src
	i := 0
	for i < len(s) {
		c := s[i]
		switch c {
		case '(':
			switch {
			case p.prev < 0:
				return p.fail(i, "a branch must follow an atom, as in CC(C)C", "branch '(' with no atom before it")
			case p.afterOpen:
				return p.fail(i, "write one atom or bond after '(', as in CC(C)C", "'(' directly after '('")
			case p.bond.sym != symNone:
				return p.fail(p.bond.pos, "put the bond inside the branch, as in C(=O)C", "bond symbol %s before '('", quote(p.bond.sym))
			}
			p.branches = append(p.branches, branchOpen{atom: p.prev, pos: i, natoms: len(p.m.Atoms)})
			p.afterOpen = true
			i++
		case ')':
			if len(p.branches) == 0 {
				return p.fail(i, "remove it or add the matching '('", "')' without a matching '('")
			}
			top := p.branches[len(p.branches)-1]
			switch {
			case p.bond.sym != symNone:
				return p.fail(p.bond.pos, "add the atom the bond leads to, or remove the bond", "bond symbol %s has no atom after it", quote(p.bond.sym))
			case p.dotPos >= 0:
				return p.fail(p.dotPos, "remove the '.' or add a fragment after it", "'.' has no fragment after it")
			case len(p.m.Atoms) == top.natoms:
				return p.fail(top.pos, "remove the empty '()' or put atoms inside it", "empty branch")
			}
			p.branches = p.branches[:len(p.branches)-1]
			p.prev = top.atom
			p.afterOpen = false
			i++
		case '.':
			switch {
			case p.bond.sym != symNone:
				return p.fail(p.bond.pos, "a bond cannot lead into '.'; remove one of them", "bond symbol %s before '.'", quote(p.bond.sym))
			case p.prev < 0 && !p.afterOpen:
				return p.fail(i, "remove the extra '.'", "empty fragment before '.'")
			}
			p.prev = -1
			p.afterOpen = false
			p.dotPos = i
			i++
		case '-', '=', '#', ':', '/', '\\', '$':
			switch {
			case p.prev < 0:
				return p.fail(i, "a bond symbol goes between two atoms, as in C=C", "bond symbol %s with no atom before it", quote(c))
			case p.bond.sym != symNone:
				return p.fail(i, "keep one bond symbol between two atoms", "two bond symbols in a row (%s then %s)", quote(p.bond.sym), quote(c))
			case c == '$':
				return p.fail(i, "quadruple bonds are not supported; use '#' or a single bond", "quadruple bond '$'")
			}
			p.bond = pendingBond{sym: c, pos: i}
			i++
		case '%', '0', '1', '2', '3', '4', '5', '6', '7', '8', '9':
			var ok bool
			if i, ok = p.ringBond(i); !ok {
				return false
			}
		case '[':
			var ok bool
			if i, ok = p.bracketAtom(i); !ok {
				return false
			}
		default:
			var ok bool
			if i, ok = p.organicAtom(i); !ok {
				return false
			}
		}
	}
	end := len(s)
	if p.bond.sym != symNone {
		return p.fail(p.bond.pos, "add the atom the bond leads to, or remove the bond", "bond symbol %s at the end has no atom after it", quote(p.bond.sym))
	}
	if p.dotPos >= 0 {
		return p.fail(p.dotPos, "remove the '.' or add a fragment after it", "'.' has no fragment after it")
	}
	if p.afterOpen {
		return p.fail(end, "add the branch atoms and ')'", "input ends inside an empty branch")
	}
	for _, r := range p.rings {
		p.errorf(r.pos, ErrRingNotClosed, fmt.Sprintf("close it with a second '%s' or remove it", r.label), "ring bond %s never closed", r.label)
	}
	for j := len(p.branches) - 1; j >= 0; j-- {
		b := p.branches[j]
		p.errorf(end, ErrSyntax, "add ')' to close it", "unclosed branch opened at column %d", b.pos+1)
	}
	if len(p.rings) > 0 || len(p.branches) > 0 {
		p.bad = true
	}
	return true
}

// noDuplicateBonds reports a ring closure that joins two atoms already bonded (C1C1,
// C12CCCCC12) and returns false if it found one.
func (p *parser) noDuplicateBonds() bool {
	m := p.m
	for _, c := range p.closures {
		b := m.Bonds[c.bond]
		a, other := b.A, b.B
		if m.Degree(other) < m.Degree(a) {
			a, other = other, a
		}
		for _, e := range m.Neighbors(a) {
			if e.To == other && e.Bond < c.bond { // report the later bond of the pair
				return p.fail(c.pos, "two atoms can share only one bond; remove the ring number or use '=' for a double bond", "ring bond %s duplicates an existing bond", c.label)
			}
		}
	}
	return true
}

// ringLabel spells a ring-closure number as it would be written.
func ringLabel(n int) string {
	switch {
	case n < 10:
		return strconv.Itoa(n)
	case n < 100:
		return "%" + strconv.Itoa(n)
	}
	return "%(" + strconv.Itoa(n) + ")"
}

// ringBond reads a ring-closure number at s[i] and opens or closes that ring bond.
func (p *parser) ringBond(i int) (int, bool) {
	s := p.src
	start := i
	var num int
	if s[i] == '%' {
		switch {
		case i+1 < len(s) && s[i+1] == '(':
			j := i + 2
			for j < len(s) && s[j] >= '0' && s[j] <= '9' && j-i-2 < 5 {
				num = num*10 + int(s[j]-'0')
				j++
			}
			if j == i+2 || j >= len(s) || s[j] != ')' {
				return i, p.fail(start, "write %(n) with up to five digits, as in C%(123)CC%(123)", "malformed ring number after '%%('")
			}
			i = j + 1
		case i+2 < len(s) && isDigit(s[i+1]) && isDigit(s[i+2]):
			num = int(s[i+1]-'0')*10 + int(s[i+2]-'0')
			i += 3
		default:
			return i, p.fail(start, "'%' takes exactly two digits, as in C%10CC%10", "'%%' must be followed by two digits")
		}
	} else {
		num = int(s[i] - '0')
		i++
	}
	if p.prev < 0 || p.afterOpen {
		return i, p.fail(start, "a ring-closure number goes right after an atom, as in C1CCCCC1", "ring bond %s with no atom before it", ringLabel(num))
	}
	for k, r := range p.rings {
		if r.num != num {
			continue
		}
		// closing
		p.rings = append(p.rings[:k], p.rings[k+1:]...)
		sym := r.bond.sym
		if b := p.bond.sym; b != symNone {
			if sym != symNone && sym != b && !(isDirectional(sym) && isDirectional(b)) {
				return i, p.fail(p.bond.pos, "write the bond symbol at one end only, or the same at both", "ring bond %s has conflicting bond symbols %s and %s", ringLabel(num), quote(sym), quote(b))
			}
			if sym == symNone || isDirectional(sym) {
				sym = b
			}
		}
		p.bond = pendingBond{}
		if r.atom == p.prev {
			return i, p.fail(start, "a ring bond must join two different atoms", "ring bond %s closes on the atom that opened it", ringLabel(num))
		}
		// duplicate bonds are found after the scan, from the adjacency lists (a scan of
		// all bonds here would make long inputs quadratic)
		p.closures = append(p.closures, closure{bond: len(p.m.Bonds), pos: start, label: s[start:i]})
		p.addBond(r.atom, p.prev, sym)
		return i, true
	}
	p.rings = append(p.rings, ringOpen{num: num, label: s[start:i], atom: p.prev, pos: start, bond: p.bond})
	p.bond = pendingBond{}
	return i, true
}

func isDigit(c byte) bool       { return c >= '0' && c <= '9' }
func isDirectional(c byte) bool { return c == symUp || c == symDown }
func isUpper(c byte) bool       { return c >= 'A' && c <= 'Z' }
func isLower(c byte) bool       { return c >= 'a' && c <= 'z' }

// aromaticSymbol maps the aromatic (lowercase) spellings OpenSMILES allows to element
// symbols: the one-letter ones also outside brackets, the two-letter ones inside only.
var aromaticSymbol = map[string]string{
	"b": "B", "c": "C", "n": "N", "o": "O", "p": "P", "s": "S",
	"se": "Se", "as": "As", "te": "Te",
}

func isAromaticOrganic(c byte) bool {
	return c == 'b' || c == 'c' || c == 'n' || c == 'o' || c == 'p' || c == 's'
}

// addBond joins a and b with the bond written as sym (symNone when implicit).
func (p *parser) addBond(a, b int, sym byte) {
	bd := molecule.Bond{A: a, B: b, Order: 1}
	switch sym {
	case symDouble:
		bd.Order = 2
	case symTriple:
		bd.Order = 3
	case symArom:
		bd.Aromatic = true
		p.hasAromatic = true // so the kekulisation pass checks the bond
	case symUp, symDown:
		bd.Stereo = sym
		bd.Aromatic = p.m.Atoms[a].Aromatic && p.m.Atoms[b].Aromatic
	case symNone:
		bd.Aromatic = p.m.Atoms[a].Aromatic && p.m.Atoms[b].Aromatic
	}
	p.m.Bonds = append(p.m.Bonds, bd)
	p.bondSyms = append(p.bondSyms, sym)
}

// addAtom appends an atom and bonds it to the previous one.
func (p *parser) addAtom(a molecule.Atom) {
	idx := len(p.m.Atoms)
	p.m.Atoms = append(p.m.Atoms, a)
	if a.Aromatic {
		p.hasAromatic = true
	}
	if p.prev >= 0 {
		p.addBond(p.prev, idx, p.bond.sym)
	}
	p.prev = idx
	p.bond = pendingBond{}
	p.afterOpen = false
	p.dotPos = -1
}

// organicAtom reads an atom of the organic subset (or reports what else is there).
func (p *parser) organicAtom(i int) (int, bool) {
	s := p.src
	c := s[i]
	var el string
	n := 1
	arom := false
	switch c {
	case 'C':
		el = "C"
		if i+1 < len(s) && s[i+1] == 'l' {
			el, n = "Cl", 2
		}
	case 'B':
		el = "B"
		if i+1 < len(s) && s[i+1] == 'r' {
			el, n = "Br", 2
		}
	case 'N':
		el = "N"
	case 'O':
		el = "O"
	case 'P':
		el = "P"
	case 'S':
		el = "S"
	case 'F':
		el = "F"
	case 'I':
		el = "I"
	default:
		if isAromaticOrganic(c) {
			el, arom = aromaticSymbol[s[i:i+1]], true
		}
	}
	if el != "" {
		// Two-letter elements outside the organic subset that start like one (Na, Sc, Sn,
		// Si, Se, Os, Co...) would otherwise read as an atom followed by a stray letter.
		if n == 1 && i+1 < len(s) && isLower(s[i+1]) && !isAromaticOrganic(s[i+1]) {
			if z, sym := lookupElement(s[i : i+2]); z > 0 {
				p.errorf(i, ErrSyntax, "elements outside B C N O P S F Cl Br I go in brackets: ["+sym+"]", "element %s must be written in brackets", sym)
				p.bad = true
				p.addAtom(molecule.Atom{Element: "*", Pos: i})
				return i + 2, true
			}
		}
		p.addAtom(molecule.Atom{Element: el, Aromatic: arom, Pos: i})
		return i + n, true
	}
	switch {
	case c == '*':
		p.errorf(i, ErrUnknownElement, "replace '*' with a real atom", "wildcard atom '*' is not supported")
		p.bad = true
		p.addAtom(molecule.Atom{Element: "*", Pos: i})
		return i + 1, true
	case c == 'H':
		p.errorf(i, ErrSyntax, "hydrogen goes in brackets: [H], or as a count like [NH4+]", "hydrogen must be written in brackets")
		p.bad = true
		p.addAtom(molecule.Atom{Element: "*", Pos: i})
		return i + 1, true
	case isUpper(c):
		n := 1
		if i+1 < len(s) && isLower(s[i+1]) {
			n = 2
		}
		if z, sym := lookupElement(s[i : i+n]); z > 0 {
			p.errorf(i, ErrSyntax, "elements outside B C N O P S F Cl Br I go in brackets: ["+sym+"]", "element %s must be written in brackets", sym)
		} else {
			p.errorf(i, ErrUnknownElement, "check the element symbol", "unknown element %s", s[i:i+n])
		}
		p.bad = true
		p.addAtom(molecule.Atom{Element: "*", Pos: i})
		return i + n, true
	case c == ']':
		return i, p.fail(i, "remove it or add the matching '['", "']' without a matching '['")
	case isLower(c):
		n := 1
		if i+1 < len(s) && isLower(s[i+1]) {
			n = 2
		}
		if z, _ := lookupElement(string(c-'a'+'A') + s[i+1:i+n]); z > 0 && n == 2 {
			return i, p.fail(i, "write aromatic "+s[i:i+n]+" in brackets, as in [se]", "aromatic %s must be written in brackets", s[i:i+n])
		}
		return i, p.fail(i, "aromatic atoms are b c n o p s; other elements start with a capital", "unexpected %s", quote(c))
	}
	return i, p.fail(i, "remove it; SMILES uses atoms, bonds - = # : / \\, ( ) for branches, digits for rings and '.'", "unexpected %s", quote(c))
}

// bracketAtom reads [isotope? symbol chiral? hcount? charge? class?] at s[i] == '['.
func (p *parser) bracketAtom(i int) (int, bool) {
	s := p.src
	open := i
	j := i + 1
	const shape = "a bracket atom reads [isotope Element @ Hn charge :class], as in [13CH3+:1]"
	unexpected := func(j int) (int, bool) {
		if j >= len(s) {
			return j, p.fail(open, "add ']'", "bracket atom opened here is never closed")
		}
		if s[j] == ' ' || s[j] == '[' || s[j] == '(' || s[j] == ')' || s[j] == '.' || s[j] == '=' || s[j] == '#' {
			// most likely a missing ']'
			return j, p.fail(open, "add ']' to close the bracket atom", "bracket atom opened here is never closed (found %s)", quote(s[j]))
		}
		return j, p.fail(j, shape, "unexpected %s in bracket atom", quote(s[j]))
	}
	a := molecule.Atom{Pos: open, Bracket: true}
	// isotope
	if j < len(s) && isDigit(s[j]) {
		k := j
		v := 0
		for j < len(s) && isDigit(s[j]) {
			v = v*10 + int(s[j]-'0')
			j++
			if j-k > 3 {
				return j, p.fail(k, "mass numbers have at most three digits", "isotope number too long")
			}
		}
		a.Isotope = v
	}
	// element
	symPos := j
	if j >= len(s) {
		return unexpected(j)
	}
	c := s[j]
	switch {
	case c == '*':
		p.errorf(j, ErrUnknownElement, "replace '*' with a real atom", "wildcard atom '*' is not supported")
		p.bad = true
		a.Element = "*"
		j++
	case isUpper(c):
		if j+1 < len(s) && isLower(s[j+1]) {
			if z, sym := lookupElement(s[j : j+2]); z > 0 {
				a.Element = sym
				j += 2
				break
			}
		}
		if z, sym := lookupElement(s[j : j+1]); z > 0 {
			a.Element = sym
			j++
			break
		}
		n := 1
		if j+1 < len(s) && isLower(s[j+1]) {
			n = 2
		}
		p.errorf(j, ErrUnknownElement, "check the element symbol", "unknown element %s", s[j:j+n])
		p.bad = true
		a.Element = "*"
		j += n
	case isLower(c):
		two := ""
		if j+1 < len(s) && isLower(s[j+1]) {
			two = s[j : j+2]
		}
		if el, ok := aromaticSymbol[two]; ok {
			a.Element, j = el, j+2
		} else if el, ok := aromaticSymbol[s[j:j+1]]; ok {
			a.Element, j = el, j+1
		} else {
			n := 1
			if two != "" {
				n = 2
			}
			name := string(c-'a'+'A') + s[j+1:j+n]
			if z, _ := lookupElement(name); z > 0 {
				return j, p.fail(j, "only b c n o p s se as te can be aromatic; write the element with a capital", "%s cannot be aromatic", s[j:j+n])
			}
			p.errorf(j, ErrUnknownElement, "check the element symbol", "unknown element %s", s[j:j+n])
			p.bad = true
			a.Element = "*"
			j += n
		}
		a.Aromatic = true
	default:
		if c == ']' {
			return j, p.fail(symPos, "put an element symbol inside the brackets, as in [NH4+]", "bracket atom without an element")
		}
		return unexpected(j)
	}
	// chirality (ignored)
	if j < len(s) && s[j] == '@' {
		j++
		if j < len(s) && s[j] == '@' {
			j++
		} else if j+1 < len(s) && isUpper(s[j]) && isUpper(s[j+1]) {
			switch s[j : j+2] {
			case "TH", "AL", "SP", "TB", "OH":
				j += 2
				k := j
				for j < len(s) && isDigit(s[j]) && j-k < 2 {
					j++
				}
				if j == k {
					return j, p.fail(k, "write the class with its number, as in @TH1", "chirality class %s without a number", s[k-2:k])
				}
			}
		}
	}
	// hydrogens
	if j < len(s) && s[j] == 'H' {
		j++
		a.HCount = 1
		if j < len(s) && isDigit(s[j]) {
			k := j
			v := 0
			for j < len(s) && isDigit(s[j]) {
				v = v*10 + int(s[j]-'0')
				j++
				if j-k > 2 {
					return j, p.fail(k, "hydrogen counts have at most two digits", "hydrogen count too large")
				}
			}
			a.HCount = v
		}
	}
	// charge
	if j < len(s) && (s[j] == '+' || s[j] == '-') {
		sign := 1
		if s[j] == '-' {
			sign = -1
		}
		signc := s[j]
		j++
		if j < len(s) && isDigit(s[j]) {
			k := j
			v := 0
			for j < len(s) && isDigit(s[j]) {
				v = v*10 + int(s[j]-'0')
				j++
				if j-k > 2 {
					return j, p.fail(k, "charges have at most two digits", "charge too large")
				}
			}
			a.Charge = sign * v
		} else {
			v := 1
			for j < len(s) && s[j] == signc {
				v++
				j++
				if v > 15 {
					return j, p.fail(j, "write large charges with a number, as in [Fe+3]", "charge too large")
				}
			}
			a.Charge = sign * v
		}
	}
	// atom class
	if j < len(s) && s[j] == ':' {
		j++
		k := j
		v := 0
		for j < len(s) && isDigit(s[j]) {
			v = v*10 + int(s[j]-'0')
			j++
			if j-k > 9 {
				return j, p.fail(k, "atom classes have at most nine digits", "atom class too long")
			}
		}
		if j == k {
			return j, p.fail(k-1, "write the class number after ':', as in [CH3:1]", "':' in a bracket atom without a class number")
		}
		a.Map = v
	}
	if j >= len(s) || s[j] != ']' {
		return unexpected(j)
	}
	p.addAtom(a)
	return j + 1, true
}
