package molfile

import (
	"math"
	"sort"
	"strconv"
	"strings"
)

// The V3000 connection table (BIOVIA, "CTfile Formats", Dassault Systèmes BIOVIA, 2020
// edition, chapter "The Extended Connection Table (V3000)"): every line starts "M  V30 ",
// a line ending in '-' continues on the next one, and the table is a nest of
// BEGIN/END blocks:
//
//	M  V30 BEGIN CTAB
//	M  V30 COUNTS na nb nsg n3d chiral
//	M  V30 BEGIN ATOM
//	M  V30 index type x y z aamap [CHG=n] [RAD=n] [MASS=n] [VAL=n] [CFG=n] ...
//	M  V30 END ATOM
//	M  V30 BEGIN BOND
//	M  V30 index type atom1 atom2 [CFG=n] ...
//	M  V30 END BOND
//	M  V30 END CTAB
//	M  END

const v30Prefix = "M  V30 "

// v30Line is one logical V3000 line with its continuations joined.
type v30Line struct {
	text string
	segs []v30Seg // where each physical piece of text came from
}

type v30Seg struct {
	off  int // offset in text
	line int // file line
	col  int // 1-based column of text[off] in that line
}

// pos maps an offset in the logical line to a file line and column.
func (l *v30Line) pos(off int) (int, int) {
	// the last segment starting at or before off
	k := sort.Search(len(l.segs), func(i int) bool { return l.segs[i].off > off }) - 1
	s := l.segs[max(k, 0)]
	return s.line, s.col + off - s.off
}

// v30At reads the logical line starting at record line i; next is the line after it.
// ok is false (with a problem recorded) when line i is not a V3000 line.
func (p *recParser) v30At(i int) (l v30Line, next int, ok bool) {
	var b strings.Builder
	for {
		if i >= p.nlines() {
			ln, col := p.endOfRecord()
			p.errorf(ln, col, ErrTruncated, "a V3000 table ends with \"M  V30 END CTAB\" and \"M  END\"; was the file cut off?", "record ends inside the V3000 connection table")
			return l, i, false
		}
		line := p.lineAt(i)
		ln := p.fileLine(i)
		if !strings.HasPrefix(line, v30Prefix) {
			if strings.HasPrefix(line, "M  END") {
				p.errorf(ln, 1, ErrTruncated, "a V3000 table ends with \"M  V30 END CTAB\" before \"M  END\"", "\"M  END\" inside the V3000 connection table")
			} else {
				p.errorf(ln, 1, ErrSyntax, "every line of a V3000 connection table starts with \"M  V30 \"", "expected a V3000 line, found %q", shorten(line, 30))
			}
			return l, i, false
		}
		content := strings.TrimRight(line[len(v30Prefix):], " ")
		l.segs = append(l.segs, v30Seg{off: b.Len(), line: ln, col: len(v30Prefix) + 1})
		i++
		if strings.HasSuffix(content, "-") {
			b.WriteString(content[:len(content)-1])
			continue
		}
		b.WriteString(content)
		l.text = b.String()
		return l, i, true
	}
}

// v30Tok is one token of a V3000 line: a word, a "quoted string" or a (parenthesised
// list), possibly after KEYWORD=.
type v30Tok struct {
	s   string
	off int
}

// tokens splits a logical V3000 line into tokens; ok is false after an unterminated quote
// or parenthesis (recorded).
func (p *recParser) tokens(l *v30Line) ([]v30Tok, bool) {
	var out []v30Tok
	s := l.text
	i := 0
	for i < len(s) {
		if s[i] == ' ' || s[i] == '\t' {
			i++
			continue
		}
		start := i
		depth := 0
		quoted := false
		for i < len(s) {
			c := s[i]
			switch {
			case quoted:
				if c == '"' {
					if i+1 < len(s) && s[i+1] == '"' {
						i++ // "" is a quote inside a quoted string
					} else {
						quoted = false
					}
				}
			case c == '"':
				quoted = true
			case c == '(':
				depth++
			case c == ')':
				depth--
			case (c == ' ' || c == '\t') && depth <= 0:
				goto done
			}
			i++
		}
	done:
		if quoted || depth > 0 {
			ln, col := l.pos(start)
			p.errorf(ln, col, ErrSyntax, "close the quote or parenthesis; a line ending in '-' continues on the next one", "unterminated %s", map[bool]string{true: "quoted string", false: "parenthesis"}[quoted])
			return nil, false
		}
		out = append(out, v30Tok{s: s[start:i], off: start})
	}
	return out, true
}

// unquote removes the quotes of a "quoted" V3000 value.
func unquote(s string) string {
	if len(s) >= 2 && s[0] == '"' && s[len(s)-1] == '"' {
		return strings.ReplaceAll(s[1:len(s)-1], `""`, `"`)
	}
	return s
}

// v3000 reads a V3000 connection table starting at record line i; it returns the index of
// the line after "M  V30 END CTAB".
func (p *recParser) v3000(ct *ctab, i int) (int, bool) {
	l, i, ok := p.v30At(i)
	if !ok {
		return 0, false
	}
	if f := strings.Fields(l.text); len(f) < 2 || f[0] != "BEGIN" || f[1] != "CTAB" {
		ln, col := l.pos(0)
		p.errorf(ln, col, ErrSyntax, "a V3000 molfile's first table line is \"M  V30 BEGIN CTAB\"", "expected BEGIN CTAB, found %q", shorten(l.text, 30))
		return 0, false
	}
	natoms, nbonds := -1, -1
	sawAtoms := false
	for {
		l, next, ok := p.v30At(i)
		if !ok {
			return 0, false
		}
		i = next
		f := strings.Fields(l.text)
		ln, col := l.pos(0)
		if len(f) == 0 {
			continue
		}
		switch {
		case f[0] == "COUNTS":
			const hint = "the line reads COUNTS na nb nsg n3d chiral"
			if len(f) < 3 {
				p.errorf(ln, col, ErrSyntax, hint, "COUNTS line without atom and bond counts")
				return 0, false
			}
			var e1, e2 error
			natoms, e1 = strconv.Atoi(f[1])
			nbonds, e2 = strconv.Atoi(f[2])
			if e1 != nil || e2 != nil || natoms < 0 || nbonds < 0 {
				p.errorf(ln, col, ErrSyntax, hint, "COUNTS: bad atom or bond count (%s %s)", f[1], f[2])
				return 0, false
			}
			if natoms == 0 {
				p.errorf(ln, col, ErrEmpty, "a record must hold at least one atom", "COUNTS: no atoms")
				return 0, false
			}
			// each atom and bond takes at least one line: a count beyond the lines left
			// is a damaged file, and must not size an allocation
			if left := p.nlines() - i; natoms+nbonds > left {
				p.errorf(ln, col, ErrTruncated, "check the counts, or whether the file was cut off",
					"COUNTS gives %d atoms and %d bonds but only %d lines follow", natoms, nbonds, left)
				return 0, false
			}
		case len(f) >= 2 && f[0] == "BEGIN" && f[1] == "ATOM":
			if natoms < 0 {
				p.errorf(ln, col, ErrSyntax, "the COUNTS line comes before the atom block", "atom block before COUNTS")
				return 0, false
			}
			if i, ok = p.atomsV3000(ct, i, natoms); !ok {
				return 0, false
			}
			sawAtoms = true
		case len(f) >= 2 && f[0] == "BEGIN" && f[1] == "BOND":
			if !sawAtoms {
				p.errorf(ln, col, ErrSyntax, "the atom block comes before the bond block", "bond block before the atom block")
				return 0, false
			}
			if i, ok = p.bondsV3000(ct, i, nbonds); !ok {
				return 0, false
			}
		case len(f) >= 2 && f[0] == "BEGIN":
			// S-groups, 3D features, collections: read past them
			if f[1] == "SGROUP" {
				ct.sgroupsIgnored = true
			} else {
				ct.note(&ct.propsSeen, "V3000 "+f[1]+" block")
			}
			if i, ok = p.skipV30Block(i, f[1]); !ok {
				return 0, false
			}
		case f[0] == "LINKNODE":
			ct.queryIgnored = true
		case len(f) >= 2 && f[0] == "END" && f[1] == "CTAB":
			if !sawAtoms {
				p.errorf(ln, col, ErrEmpty, "a record must hold at least one atom", "V3000 connection table without an atom block")
				return 0, false
			}
			if len(ct.bonds) == 0 && nbonds > 0 && len(p.errs) == 0 {
				p.errorf(ln, col, ErrSyntax, "add the bond block or correct COUNTS", "COUNTS gives %d bonds but there is no bond block", nbonds)
			}
			return i, len(p.errs) == 0
		default:
			p.errorf(ln, col, ErrSyntax, "a V3000 connection table holds COUNTS and BEGIN/END blocks", "unexpected V3000 line %q", shorten(l.text, 30))
			return 0, false
		}
	}
}

// skipV30Block reads past the lines of a block up to its "END name".
func (p *recParser) skipV30Block(i int, name string) (int, bool) {
	for {
		l, next, ok := p.v30At(i)
		if !ok {
			return 0, false
		}
		i = next
		if f := strings.Fields(l.text); len(f) >= 2 && f[0] == "END" && f[1] == name {
			return i, true
		}
	}
}

// keyValue splits KEY=value.
func keyValue(t string) (key, val string, ok bool) {
	k, v, ok := strings.Cut(t, "=")
	if !ok || k == "" {
		return "", "", false
	}
	return strings.ToUpper(k), v, true
}

// maxMap is the largest atom map kept: the SMILES atom class has at most nine digits.
const maxMap = 999999999

const v30AtomHint = "a V3000 atom line reads: index type x y z aamap [CHG=n] [RAD=n] [MASS=n] [VAL=n] ..."

// atomsV3000 reads the atom block from line i up to "END ATOM".
func (p *recParser) atomsV3000(ct *ctab, i, natoms int) (int, bool) {
	ct.atoms = make([]rawAtom, 0, natoms)
	index := map[int]int{}
	for {
		l, next, ok := p.v30At(i)
		if !ok {
			return 0, false
		}
		i = next
		if f := strings.Fields(l.text); len(f) >= 2 && f[0] == "END" && f[1] == "ATOM" {
			if len(ct.atoms) != natoms {
				ln, col := l.pos(0)
				p.errorf(ln, col, ErrSyntax, "correct COUNTS or the atom block", "COUNTS gives %d atoms but the atom block has %d", natoms, len(ct.atoms))
			}
			ct.index = index
			return i, len(p.errs) == 0
		}
		k := len(ct.atoms)
		if k >= natoms {
			ln, col := l.pos(0)
			p.errorf(ln, col, ErrSyntax, "correct COUNTS or the atom block", "more atoms than COUNTS gives (%d)", natoms)
			return 0, false
		}
		toks, ok := p.tokens(&l)
		if !ok {
			return 0, false
		}
		ln, col := l.pos(0)
		if len(toks) < 6 {
			p.errorf(ln, col, ErrSyntax, v30AtomHint, "atom %d: %d fields, an atom line needs at least 6", k+1, len(toks))
			return 0, false
		}
		a := rawAtom{val: -1}
		idx, err := strconv.Atoi(toks[0].s)
		if err != nil || idx < 1 {
			p.errorf(ln, col, ErrSyntax, v30AtomHint, "atom %d: index %q is not a positive number", k+1, toks[0].s)
			return 0, false
		}
		if _, dup := index[idx]; dup {
			p.errorf(ln, col, ErrSyntax, "every atom has its own index", "atom %d: index %d used twice", k+1, idx)
			return 0, false
		}
		index[idx] = k
		a.line, a.col = l.pos(toks[1].off)
		a.el, a.iso = p.element(unquote(toks[1].s), a.line, a.col, k)
		for c, dst := range []*float64{&a.x, &a.y, &a.z} {
			v, err := strconv.ParseFloat(toks[2+c].s, 64)
			if err != nil || !finite(v) {
				tl, tc := l.pos(toks[2+c].off)
				p.errorf(tl, tc, ErrSyntax, v30AtomHint, "atom %d: %c coordinate %q is not a number", k+1, "xyz"[c], toks[2+c].s)
			}
			*dst = v
		}
		if a.mapn, err = strconv.Atoi(toks[5].s); err != nil || a.mapn < 0 || a.mapn > maxMap {
			tl, tc := l.pos(toks[5].off)
			p.errorf(tl, tc, ErrSyntax, v30AtomHint, "atom %d: atom map %q is not a number from 0 to 999999999", k+1, toks[5].s)
		}
		for _, t := range toks[6:] {
			p.atomKeyV3000(ct, &a, k, t, &l)
		}
		ct.atoms = append(ct.atoms, a)
	}
}

// atomKeyV3000 applies one KEY=value of an atom line.
func (p *recParser) atomKeyV3000(ct *ctab, a *rawAtom, k int, t v30Tok, l *v30Line) {
	key, val, ok := keyValue(t.s)
	tl, tc := l.pos(t.off)
	if !ok {
		switch strings.ToUpper(t.s) {
		case "STBOX", "INVRET", "EXACHG", "ATTCHPT":
			return
		}
		p.errorf(tl, tc, ErrSyntax, v30AtomHint, "atom %d: unexpected field %q", k+1, shorten(t.s, 20))
		return
	}
	num := func(lo, hi int, hint string) (int, bool) {
		v, err := strconv.Atoi(val)
		if err != nil {
			// some writers give MASS with decimals; an integral value is still a mass number
			f, ferr := strconv.ParseFloat(val, 64)
			if ferr != nil || f != math.Trunc(f) || math.Abs(f) > 1e6 {
				p.errorf(tl, tc, ErrSyntax, hint, "atom %d: %s=%s is not a whole number", k+1, key, shorten(val, 20))
				return 0, false
			}
			v = int(f)
		}
		if v < lo || v > hi {
			p.errorf(tl, tc, ErrSyntax, hint, "atom %d: %s=%d out of range", k+1, key, v)
			return 0, false
		}
		return v, true
	}
	switch key {
	case "CHG":
		if v, ok := num(-15, 15, "charges run from -15 to +15"); ok {
			a.charge = v
		}
	case "RAD":
		if v, ok := num(0, 3, "RAD is 0 none, 1 singlet, 2 doublet, 3 triplet"); ok {
			a.radical = v
		}
	case "MASS":
		if v, ok := num(1, 999, "MASS gives the mass number of the isotope"); ok {
			a.iso = v
		}
	case "VAL":
		if v, ok := num(-1, 14, "VAL is -1 for zero, 0 for the default, or 1-14"); ok {
			switch v {
			case -1:
				a.val = 0
			case 0:
			default:
				a.val = v
			}
		}
	case "CFG":
		if val != "0" {
			ct.parityIgnored = true
		}
	case "HCOUNT", "SUBST", "UNSAT", "RBCNT":
		if val != "0" {
			ct.queryIgnored = true
		}
	}
}

const v30BondHint = "a V3000 bond line reads: index type atom1 atom2 [CFG=n] ..."

// bondsV3000 reads the bond block from line i up to "END BOND".
func (p *recParser) bondsV3000(ct *ctab, i, nbonds int) (int, bool) {
	ct.bonds = make([]rawBond, 0, nbonds)
	k := 0
	for ; ; k++ {
		l, next, ok := p.v30At(i)
		if !ok {
			return 0, false
		}
		i = next
		ln, col := l.pos(0)
		if f := strings.Fields(l.text); len(f) >= 2 && f[0] == "END" && f[1] == "BOND" {
			if k != nbonds {
				p.errorf(ln, col, ErrSyntax, "correct COUNTS or the bond block", "COUNTS gives %d bonds but the bond block has %d", nbonds, k)
			}
			return i, len(p.errs) == 0
		}
		if k >= nbonds {
			p.errorf(ln, col, ErrSyntax, "correct COUNTS or the bond block", "more bonds than COUNTS gives (%d)", nbonds)
			return 0, false
		}
		toks, ok := p.tokens(&l)
		if !ok {
			return 0, false
		}
		if len(toks) < 4 {
			p.errorf(ln, col, ErrSyntax, v30BondHint, "bond %d: %d fields, a bond line needs at least 4", k+1, len(toks))
			return 0, false
		}
		var nums [3]int
		for c := range nums {
			v, err := strconv.Atoi(toks[1+c].s)
			if err != nil {
				tl, tc := l.pos(toks[1+c].off)
				p.errorf(tl, tc, ErrSyntax, v30BondHint, "bond %d: %q is not a number", k+1, toks[1+c].s)
				return 0, false
			}
			nums[c] = v
		}
		// atom numbers refer to atom indices; map them to positions (1-based for bondCommon)
		a, b := 0, 0
		if x, ok := ct.index[nums[1]]; ok {
			a = x + 1
		}
		if x, ok := ct.index[nums[2]]; ok {
			b = x + 1
		}
		if a == 0 || b == 0 {
			bad := nums[1]
			if a != 0 {
				bad = nums[2]
			}
			tl, tc := l.pos(toks[2].off)
			p.errorf(tl, tc, ErrSyntax, "a bond names atoms by their index in the atom block", "bond %d: no atom with index %d", k+1, bad)
			continue
		}
		for _, t := range toks[4:] {
			key, val, _ := keyValue(t.s)
			switch key {
			case "CFG":
				if val != "0" {
					ct.stereoIgnored = true
				}
			case "TOPO", "RXCTR":
				if val != "0" {
					ct.queryIgnored = true
				}
			case "ENDPTS", "ATTACH":
				tl, tc := l.pos(t.off)
				p.errorf(tl, tc, ErrUnsupported, "draw each bond to one atom", "bond %d: multi-centre bond (%s) is not supported", k+1, key)
			}
		}
		_, tc := l.pos(toks[1].off)
		_, ac := l.pos(toks[2].off)
		if bd, ok := p.bondCommon(ct, k, a, b, nums[0], ln, ac, tc); ok {
			ct.bonds = append(ct.bonds, bd)
		}
	}
}
