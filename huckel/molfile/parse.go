package molfile

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"cyclopair/huckel/smiles"
)

// rawAtom is an atom as the connection table gives it, before the chemistry.
type rawAtom struct {
	el       string // element symbol ("H" for D and T)
	iso      int    // isotope from D/T, M  ISO or MASS=
	massDiff int    // V2000 mass difference field
	chgCode  int    // V2000 charge field code
	charge   int    // from M  CHG or CHG=
	radical  int    // from M  RAD, RAD= (or charge code 4)
	val      int    // valence field: -1 not given, else the total valence (0 for "zero")
	mapn     int    // atom-atom mapping number
	x, y, z  float64
	line     int // file line of the atom
	col      int // column of the symbol
}

// rawBond is a bond as the connection table gives it.
type rawBond struct {
	a, b int // 0-based atom indices
	typ  int // 1, 2, 3 or 4
	line int
}

// ctab is a connection table being read.
type ctab struct {
	atoms          []rawAtom
	bonds          []rawBond
	index          map[int]int // V3000 atom index → position
	mChg, mIso     bool        // an M  CHG / M  RAD or M  ISO line was seen (V2000)
	version        string
	v3000          bool
	propsSeen      []string // M lines ignored, for the notes
	stereoIgnored  bool
	parityIgnored  bool
	queryIgnored   bool
	sgroupsIgnored bool
}

// recParser reads one record.
type recParser struct {
	text  string
	offs  []int // start of each line in text
	first int   // file line number of line 0
	index int   // record number
	opts  *Options
	title string
	errs  ErrorList
	full  bool // the error list is full; drop further problems
}

func (p *recParser) nlines() int { return len(p.offs) }

// lineAt returns line i of the record (0-based), without its '\n'.
func (p *recParser) lineAt(i int) string {
	end := len(p.text) - 1
	if i+1 < len(p.offs) {
		end = p.offs[i+1] - 1
	}
	return p.text[p.offs[i]:end]
}

// fileLine is the 1-based file line number of record line i.
func (p *recParser) fileLine(i int) int { return p.first + i }

// errorf records a problem at file line ln, column col.
func (p *recParser) errorf(ln, col int, sentinel error, hint, format string, args ...any) {
	if p.full {
		return
	}
	if len(p.errs) == maxErrorsPerRecord {
		p.full = true
		return
	}
	if col < 1 {
		col = 1
	}
	p.errs = append(p.errs, &Error{Record: p.index, Title: p.title, Line: ln, Col: col,
		Msg: fmt.Sprintf(format, args...), Hint: hint, Err: sentinel})
}

// atomErrorf records a problem about atom k (0-based) at file line ln, column col.
func (p *recParser) atomErrorf(k, ln, col int, sentinel error, hint, format string, args ...any) {
	n := len(p.errs)
	p.errorf(ln, col, sentinel, hint, format, args...)
	if len(p.errs) > n {
		p.errs[n].Atom = k + 1
	}
}

// fail records a problem after which the record cannot be read further; it returns the
// record's errors.
func (p *recParser) fail(ln, col int, sentinel error, hint, format string, args ...any) (*Record, error) {
	p.errorf(ln, col, sentinel, hint, format, args...)
	return nil, p.errors()
}

func (p *recParser) errors() error {
	slices.SortStableFunc(p.errs, func(a, b *Error) int {
		if a.Line != b.Line {
			return a.Line - b.Line
		}
		return a.Col - b.Col
	})
	return p.errs.Err()
}

// endOfRecord is the position reported for "the record ends too early": the last line.
func (p *recParser) endOfRecord() (ln, col int) {
	n := p.nlines()
	if n == 0 {
		return p.first, 1
	}
	return p.fileLine(n - 1), len(p.lineAt(n-1)) + 1
}

const headerHint = "a molfile starts with a title line, a program line, a comment line and the counts line"

// parse reads the record: header, connection table, properties, data items.
func (p *recParser) parse() (*Record, error) {
	n := p.nlines()
	if n > 0 {
		p.title = cleanText(strings.TrimSpace(p.lineAt(0)))
	}
	if n < 4 {
		ln, col := p.endOfRecord()
		return p.fail(ln, col, ErrTruncated, headerHint+"; is this an SD file or molfile?",
			"record ends after %d line%s, before the counts line", n, plural(n))
	}
	ct := &ctab{}
	next, ok := p.countsAndTable(ct)
	if !ok {
		return nil, p.errors()
	}
	next, ok = p.properties(ct, next)
	if !ok {
		return nil, p.errors()
	}
	props, ok := p.dataItems(next)
	if !ok {
		return nil, p.errors()
	}
	return p.build(ct, props)
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// countsAndTable reads the counts line (record line 3) and the connection table; it
// returns the index of the first line after the table.
func (p *recParser) countsAndTable(ct *ctab) (int, bool) {
	const ci = 3
	line := p.lineAt(ci)
	ln := p.fileLine(ci)
	const countsHint = "the counts line, line 4 of a molfile, holds the atom count in columns 1-3, the bond count in 4-6 and V2000 or V3000 in 35-39"
	version := ""
	if len(line) > 33 {
		version = strings.TrimSpace(line[33:min(len(line), 39)])
	}
	switch {
	case version == "", version == "V2000":
		ct.version = "V2000"
	case version == "V3000":
		ct.version = "V3000"
	case strings.Contains(line, "V3000"):
		ct.version = "V3000"
	case strings.Contains(line, "V2000"):
		ct.version = "V2000"
	default:
		p.errorf(ln, 34, ErrSyntax, countsHint, "counts line: unknown format version %q", version)
		return 0, false
	}
	ct.v3000 = ct.version == "V3000"
	natoms, ok1 := p.intField(line, 0, 3, ln, "counts line:", -1, "atom count", countsHint)
	nbonds, ok2 := p.intField(line, 3, 6, ln, "counts line:", -1, "bond count", countsHint)
	if !ok1 || !ok2 {
		return 0, false
	}
	if ct.v3000 {
		return p.v3000(ct, ci+1)
	}
	if natoms < 0 || nbonds < 0 {
		p.errorf(ln, 1, ErrSyntax, countsHint, "counts line: negative atom or bond count")
		return 0, false
	}
	if natoms == 0 {
		p.errorf(ln, 1, ErrEmpty, "a record must hold at least one atom", "counts line: no atoms")
		return 0, false
	}
	// obsolete or query fields that still decide how many lines follow the bond block
	nlists := lenientInt(line, 6, 9)
	nstext := lenientInt(line, 15, 18)
	i := ci + 1
	if avail := p.nlines() - i; avail < natoms+nbonds {
		ln, col := p.endOfRecord()
		what := "atom"
		got := avail
		if avail >= natoms {
			what, got = "bond", avail-natoms
		}
		p.errorf(ln, col, ErrTruncated, "check the counts line, or whether the file was cut off",
			"record ends in the %s block: the counts line (line %d) gives %d atoms and %d bonds, but the record has only %d %s line%s",
			what, p.fileLine(ci), natoms, nbonds, got, what, plural(got))
		return 0, false
	}
	ct.atoms = make([]rawAtom, 0, natoms)
	for k := 0; k < natoms; k++ {
		ct.atoms = append(ct.atoms, p.atomV2000(ct, k, i))
		i++
	}
	ct.bonds = make([]rawBond, 0, nbonds)
	for k := 0; k < nbonds; k++ {
		if b, ok := p.bondV2000(ct, k, i); ok {
			ct.bonds = append(ct.bonds, b)
		}
		i++
	}
	// the obsolete atom-list and stext blocks, when a writer still fills them; a property
	// line ends them early, in case the counts were set without the blocks
	for skip := nlists + 2*nstext; skip > 0 && i < p.nlines() && !strings.HasPrefix(p.lineAt(i), "M  "); skip-- {
		i++
	}
	if len(p.errs) > 0 {
		return 0, false
	}
	return i, true
}

// field returns line[a:b] trimmed, or "" where the line is shorter.
func field(line string, a, b int) string {
	if a >= len(line) {
		return ""
	}
	return strings.TrimSpace(line[a:min(b, len(line))])
}

// lenientInt reads an integer field, 0 when blank or not a number.
func lenientInt(line string, a, b int) int {
	v, err := strconv.Atoi(field(line, a, b))
	if err != nil {
		return 0
	}
	return v
}

// intField reads a fixed-column integer field (blank means 0) and reports a bad one as
// "<kind> <k+1>: <what> ..." ("<kind> <what> ..." when k < 0).
func (p *recParser) intField(line string, a, b, ln int, kind string, k int, what, hint string) (int, bool) {
	f := field(line, a, b)
	if f == "" {
		return 0, true
	}
	v, err := strconv.Atoi(f)
	if err != nil {
		if k >= 0 {
			kind = fmt.Sprintf("%s %d:", kind, k+1)
		}
		p.errorf(ln, a+1, ErrSyntax, hint, "%s %s %q is not a number in columns %d-%d", kind, what, f, a+1, b)
		return 0, false
	}
	return v, true
}

// chargeCodes maps the V2000 atom-block charge field to a charge (code 4 is a doublet
// radical and handled apart). CTfile formats: Dalby et al. 1992, atom block "ccc".
var chargeCodes = [8]int{0, 3, 2, 1, 0, -1, -2, -3}

const atomHint = "a V2000 atom line has x, y, z in columns 1-30, the symbol in 32-34, then mass difference, charge, ... in 3-column fields"

// atomV2000 reads atom k from record line i. Problems are recorded; the returned atom
// is usable for the rest of the pass either way.
func (p *recParser) atomV2000(ct *ctab, k, i int) rawAtom {
	line := p.lineAt(i)
	ln := p.fileLine(i)
	a := rawAtom{val: -1, line: ln, col: 32}
	if len(line) < 32 {
		p.errorf(ln, len(line)+1, ErrSyntax, atomHint, "atom %d: line too short for an atom line (%d characters)", k+1, len(line))
		return a
	}
	for c, dst := range []*float64{&a.x, &a.y, &a.z} {
		f := field(line, 10*c, 10*c+10)
		v, err := strconv.ParseFloat(f, 64)
		if err != nil || !finite(v) {
			p.errorf(ln, 10*c+1, ErrSyntax, atomHint, "atom %d: %c coordinate %q is not a number", k+1, "xyz"[c], f)
			return a
		}
		*dst = v
	}
	sym := field(line, 31, 34)
	a.el, a.iso = p.element(sym, ln, 32, k)
	get := func(from, to int, what string) int {
		v, _ := p.intField(line, from, to, ln, "atom", k, what, atomHint)
		return v
	}
	a.massDiff = get(34, 36, "mass difference")
	code := get(36, 39, "charge code")
	switch {
	case code < 0 || code > 7:
		p.errorf(ln, 37, ErrSyntax, "charge codes are 0 none, 1-3 for +3 to +1, 4 a doublet radical, 5-7 for -1 to -3", "atom %d: unknown charge code %d", k+1, code)
	default:
		a.chgCode = code
	}
	if get(39, 42, "stereo parity") != 0 {
		ct.parityIgnored = true
	}
	if get(42, 45, "hydrogen count") != 0 {
		ct.queryIgnored = true
	}
	switch v := get(48, 51, "valence"); {
	case v == 0:
	case v == 15:
		a.val = 0
	case v > 0 && v < 15:
		a.val = v
	default:
		p.errorf(ln, 49, ErrSyntax, "the valence field is 0 for the default, 1-14, or 15 for zero", "atom %d: valence field %d out of range", k+1, v)
	}
	a.mapn = get(60, 63, "atom-atom mapping number")
	if a.mapn < 0 {
		p.errorf(ln, 61, ErrSyntax, "atom maps are positive numbers", "atom %d: negative atom map %d", k+1, a.mapn)
	}
	return a
}

// element resolves an atom symbol: element symbols as in the periodic table, and D and T
// for hydrogen 2 and 3. It records a problem and returns "*" for anything else.
func (p *recParser) element(sym string, ln, col, k int) (el string, iso int) {
	switch sym {
	case "D":
		return "H", 2
	case "T":
		return "H", 3
	}
	if smiles.AtomicNumber(sym) > 0 {
		return sym, 0
	}
	const queryHint = "query atoms, atom lists and R-groups describe a search, not a molecule; give the structure with real elements"
	switch {
	case sym == "":
		p.atomErrorf(k, ln, col, ErrSyntax, atomHint, "atom %d: no atom symbol", k+1)
	case slices.Contains(querySymbols, sym):
		p.atomErrorf(k, ln, col, ErrUnsupported, queryHint, "atom %d: query or R-group atom %q is not supported", k+1, sym)
	case strings.HasPrefix(sym, "[") || strings.HasPrefix(sym, "NOT"):
		p.atomErrorf(k, ln, col, ErrUnsupported, queryHint, "atom %d: atom list %s is not supported", k+1, shorten(sym, 20))
	default:
		hint := "check the element symbol"
		if len(sym) <= 3 {
			if fixed := strings.ToUpper(sym[:1]) + strings.ToLower(sym[1:]); smiles.AtomicNumber(fixed) > 0 {
				hint = "element symbols are case-sensitive: write " + fixed
			}
		}
		p.atomErrorf(k, ln, col, ErrUnknownElement, hint, "atom %d: unknown element %q", k+1, shorten(sym, 20))
	}
	return "*", 0
}

// querySymbols are the atom symbols of queries and R-groups (CTfile formats, atom block
// and V3000 atom "type").
var querySymbols = []string{"A", "Q", "L", "*", "R", "R#", "LP", "AH", "QH", "X", "XH", "M", "MH", "Pol", "Mod"}

// bondTypeName names the query bond types 5-8 (CTfile formats, bond block "ttt") and the
// V3000 types 9 and 10.
func bondTypeName(t int) string {
	switch t {
	case 5:
		return "single or double"
	case 6:
		return "single or aromatic"
	case 7:
		return "double or aromatic"
	case 8:
		return "any"
	case 9:
		return "coordination"
	case 10:
		return "hydrogen"
	}
	return ""
}

// checkBondType records a problem for a bond type other than 1-4.
func (p *recParser) checkBondType(t, ln, col, k int, v3000 bool) bool {
	switch {
	case t >= 1 && t <= 4:
		return true
	case t >= 5 && t <= 8:
		p.errorf(ln, col, ErrUnsupported, "query bond types 5-8 describe a search, not a molecule; use types 1-4",
			"bond %d: query bond type %d (%s) is not supported", k+1, t, bondTypeName(t))
	case v3000 && (t == 9 || t == 10):
		p.errorf(ln, col, ErrUnsupported, "draw the bond as a single bond with charges, or leave it out",
			"bond %d: %s bond (type %d) is not supported", k+1, bondTypeName(t), t)
	default:
		p.errorf(ln, col, ErrSyntax, "bond types are 1 single, 2 double, 3 triple, 4 aromatic",
			"bond %d: unknown bond type %d", k+1, t)
	}
	return false
}

const bondHint = "a V2000 bond line has the two atom numbers in columns 1-3 and 4-6, the type in 7-9 and the stereo mark in 10-12"

// bondV2000 reads bond k from record line i.
func (p *recParser) bondV2000(ct *ctab, k, i int) (rawBond, bool) {
	line := p.lineAt(i)
	ln := p.fileLine(i)
	if len(line) < 9 {
		p.errorf(ln, len(line)+1, ErrSyntax, bondHint, "bond %d: line too short for a bond line (%d characters)", k+1, len(line))
		return rawBond{}, false
	}
	a, ok1 := p.intField(line, 0, 3, ln, "bond", k, "first atom", bondHint)
	b, ok2 := p.intField(line, 3, 6, ln, "bond", k, "second atom", bondHint)
	t, ok3 := p.intField(line, 6, 9, ln, "bond", k, "type", bondHint)
	st, ok4 := p.intField(line, 9, 12, ln, "bond", k, "stereo", bondHint)
	if !ok1 || !ok2 || !ok3 || !ok4 {
		return rawBond{}, false
	}
	if st != 0 {
		ct.stereoIgnored = true
	}
	if lenientInt(line, 15, 18) != 0 {
		ct.queryIgnored = true
	}
	return p.bondCommon(ct, k, a, b, t, ln, 1, 7)
}

// bondCommon checks the atoms and type of a bond (1-based atom numbers a, b).
func (p *recParser) bondCommon(ct *ctab, k, a, b, t, ln, atomCol, typeCol int) (rawBond, bool) {
	n := len(ct.atoms)
	if a < 1 || a > n || b < 1 || b > n {
		bad := a
		if a >= 1 && a <= n {
			bad = b
		}
		p.errorf(ln, atomCol, ErrSyntax, fmt.Sprintf("atoms are numbered 1 to %d in this record", n),
			"bond %d: atom %d does not exist", k+1, bad)
		return rawBond{}, false
	}
	if a == b {
		p.errorf(ln, atomCol, ErrSyntax, "a bond joins two different atoms", "bond %d joins atom %d to itself", k+1, a)
		return rawBond{}, false
	}
	if !p.checkBondType(t, ln, typeCol, k, ct.v3000) {
		return rawBond{}, false
	}
	return rawBond{a: a - 1, b: b - 1, typ: t, line: ln}, true
}

// properties reads the V2000 properties block from line i up to "M  END"; it returns the
// index of the line after "M  END".
func (p *recParser) properties(ct *ctab, i int) (int, bool) {
	for ; i < p.nlines(); i++ {
		line := p.lineAt(i)
		ln := p.fileLine(i)
		tag := line
		if len(tag) > 6 {
			tag = tag[:6]
		}
		switch {
		case strings.HasPrefix(line, "M  END"):
			return i + 1, len(p.errs) == 0
		case tag == "M  CHG", tag == "M  RAD", tag == "M  ISO":
			p.atomProperty(ct, tag, line, ln)
		case strings.HasPrefix(line, "A  "), strings.HasPrefix(line, "G  "):
			// atom alias and group abbreviation: the text is on the next line
			i++
			if line[0] == 'A' {
				ct.note(&ct.propsSeen, "atom aliases (A)")
			} else {
				ct.note(&ct.propsSeen, "group abbreviations (G)")
			}
		case strings.HasPrefix(line, "V  "):
			ct.note(&ct.propsSeen, "atom values (V)")
		case strings.HasPrefix(line, "S  SKP"):
			n, err := strconv.Atoi(strings.TrimSpace(line[6:]))
			if err != nil || n < 0 {
				p.errorf(ln, 7, ErrSyntax, "S  SKP gives the number of lines to skip", "bad S  SKP line")
				return 0, false
			}
			i += n
		case strings.HasPrefix(line, "M  V30"):
			if !ct.v3000 {
				p.errorf(ln, 1, ErrSyntax, "the counts line says V2000; V3000 files say V3000 in columns 35-39",
					"V3000 line in a V2000 record")
				return 0, false
			}
			ct.note(&ct.propsSeen, "M  V30 "+firstWords(line[6:], 2))
		case strings.HasPrefix(line, "M  "):
			t := strings.TrimSpace(tag)
			if isSgroupTag(t) {
				ct.sgroupsIgnored = true
			} else {
				ct.note(&ct.propsSeen, t)
			}
		case strings.HasPrefix(line, ">"), isTerminator([]byte(line)):
			p.errorf(ln, 1, ErrSyntax, "every molfile ends its properties block with a line \"M  END\"", "no \"M  END\" line before the data items")
			return 0, false
		default:
			hint := "property lines start with \"M  \", \"A  \", \"G  \", \"V  \" or \"S  SKP\""
			if !ct.v3000 && looksNumeric(line) {
				hint = "it looks like an atom or bond line: check the atom and bond counts on the counts line"
			}
			p.errorf(ln, 1, ErrSyntax, hint, "unexpected line in the properties block: %q", shorten(line, 30))
			return 0, false
		}
	}
	ln, col := p.endOfRecord()
	p.errorf(ln, col, ErrTruncated, "every molfile ends its connection table with a line \"M  END\"; was the file cut off?", "record ends before \"M  END\"")
	return 0, false
}

func isSgroupTag(t string) bool {
	if len(t) != 6 || !strings.HasPrefix(t, "M  S") {
		return false
	}
	switch t[3:] {
	case "STY", "SST", "SLB", "SCN", "SDS", "SAL", "SBL", "SPA", "SMT", "SCL", "SDI", "SBV", "SAP", "SDT", "SDD", "SCD", "SED", "SPL", "SNC", "SBT":
		return true
	}
	return false
}

// note adds s to a list of ignored things once.
func (ct *ctab) note(list *[]string, s string) {
	if !slices.Contains(*list, s) {
		*list = append(*list, s)
	}
}

func firstWords(s string, n int) string {
	f := strings.Fields(s)
	return strings.Join(f[:min(n, len(f))], " ")
}

func looksNumeric(s string) bool {
	f := strings.Fields(s)
	if len(f) < 3 {
		return false
	}
	for _, w := range f[:3] {
		if _, err := strconv.ParseFloat(w, 64); err != nil {
			return false
		}
	}
	return true
}

func shorten(s string, n int) string {
	if len(s) <= n {
		return s
	}
	return truncateUTF8(s, n) + "..."
}

// atomProperty reads an M  CHG, M  RAD or M  ISO line: a count of up to eight entries,
// then atom number and value for each (CTfile formats, properties block).
func (p *recParser) atomProperty(ct *ctab, tag, line string, ln int) {
	hint := fmt.Sprintf("the line reads %q, the number of entries, 1 to 8, then atom number and value for each", tag)
	f := strings.Fields(line[6:])
	if len(f) == 0 {
		p.errorf(ln, 7, ErrSyntax, hint, "%s line without an entry count", tag)
		return
	}
	n, err := strconv.Atoi(f[0])
	if err != nil || n < 1 || n > 8 {
		p.errorf(ln, 7, ErrSyntax, hint, "%s: bad entry count %q", tag, f[0])
		return
	}
	if len(f) != 1+2*n {
		p.errorf(ln, 7, ErrSyntax, hint, "%s: entry count %d but %d number%s follow", tag, n, len(f)-1, plural(len(f)-1))
		return
	}
	switch tag {
	case "M  CHG", "M  RAD":
		if !ct.mChg {
			// "M  CHG and M  RAD supersede all charge and radical values in the atom block"
			ct.mChg = true
			for k := range ct.atoms {
				ct.atoms[k].chgCode = 0
			}
		}
	case "M  ISO":
		ct.mIso = true
	}
	for e := 0; e < n; e++ {
		a, err1 := strconv.Atoi(f[1+2*e])
		v, err2 := strconv.Atoi(f[2+2*e])
		if err1 != nil || err2 != nil {
			p.errorf(ln, 7, ErrSyntax, hint, "%s: entry %d (%s %s) is not two numbers", tag, e+1, f[1+2*e], f[2+2*e])
			return
		}
		if a < 1 || a > len(ct.atoms) {
			p.errorf(ln, 7, ErrSyntax, fmt.Sprintf("atoms are numbered 1 to %d in this record", len(ct.atoms)), "%s: atom %d does not exist", tag, a)
			return
		}
		at := &ct.atoms[a-1]
		switch tag {
		case "M  CHG":
			if v < -15 || v > 15 {
				p.errorf(ln, 7, ErrSyntax, "charges run from -15 to +15", "%s: charge %d on atom %d out of range", tag, v, a)
				return
			}
			at.charge = v
		case "M  RAD":
			if v < 0 || v > 3 {
				p.errorf(ln, 7, ErrSyntax, "radical values are 0 none, 1 singlet, 2 doublet, 3 triplet", "%s: unknown radical value %d on atom %d", tag, v, a)
				return
			}
			at.radical = v
		case "M  ISO":
			if v < 1 || v > 999 {
				p.errorf(ln, 7, ErrSyntax, "M  ISO gives the mass number of the isotope", "%s: mass %d on atom %d out of range", tag, v, a)
				return
			}
			at.iso = v
		}
	}
}

// dataItems reads the SD data items from line i to the end of the record.
func (p *recParser) dataItems(i int) ([]Prop, bool) {
	var props []Prop
	for i < p.nlines() {
		line := p.lineAt(i)
		if strings.TrimSpace(line) == "" {
			i++
			continue
		}
		if line[0] != '>' {
			p.errorf(p.fileLine(i), 1, ErrSyntax, "after \"M  END\" come data items, each a header line \"> <NAME>\", value lines and a blank line, then \"$$$$\"",
				"expected a data item header, found %q", shorten(line, 30))
			return nil, false
		}
		name := ""
		if lt := strings.IndexByte(line, '<'); lt >= 0 {
			if gt := strings.IndexByte(line[lt+1:], '>'); gt >= 0 {
				name = line[lt+1 : lt+1+gt]
			} else {
				p.errorf(p.fileLine(i), lt+1, ErrSyntax, "a data item header reads \"> <NAME>\"", "data item name has no closing '>'")
				return nil, false
			}
		}
		i++
		start := i
		for i < p.nlines() && strings.TrimSpace(p.lineAt(i)) != "" {
			i++
		}
		val := ""
		if i > start {
			end := len(p.text) - 1
			if i < p.nlines() {
				end = p.offs[i] - 1
			}
			val = p.text[p.offs[start]:end]
		}
		props = append(props, Prop{Name: cleanText(name), Value: cleanText(val)})
	}
	return props, true
}

func finite(v float64) bool { return v-v == 0 }
