package molfile

import (
	"errors"
	"fmt"
	"io"
	"strings"
	"testing"

	"cyclopair/huckel/smiles"
)

// at is one atom of a test record: symbol, charge code, valence field.
type at struct {
	sym      string
	ccc, vvv int
}

// v2 builds a V2000 record (without "$$$$"): title, atoms, bonds (a, b, type) and extra
// property lines before "M  END". Lines: 1 title, 2 program, 3 comment, 4 counts, then one
// line per atom and per bond.
func v2(title string, atoms []at, bonds [][3]int, props ...string) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s\n  test\n\n%3d%3d  0  0  0  0  0  0  0  0999 V2000\n", title, len(atoms), len(bonds))
	for i, a := range atoms {
		fmt.Fprintf(&b, "%10.4f%10.4f%10.4f %-3s 0%3d  0  0  0%3d  0  0  0  0  0  0\n", float64(i), 0.0, 0.0, a.sym, a.ccc, a.vvv)
	}
	for _, bd := range bonds {
		fmt.Fprintf(&b, "%3d%3d%3d  0\n", bd[0], bd[1], bd[2])
	}
	for _, p := range props {
		b.WriteString(p + "\n")
	}
	b.WriteString("M  END\n")
	return b.String()
}

func atoms(syms ...string) []at {
	out := make([]at, len(syms))
	for i, s := range syms {
		out[i] = at{sym: s}
	}
	return out
}

var (
	ethane  = v2("ethane", atoms("C", "C"), [][3]int{{1, 2, 1}})
	ethanol = v2("ethanol", atoms("C", "C", "O"), [][3]int{{1, 2, 1}, {2, 3, 1}})
	// pyridine with aromatic bonds
	pyridineArom = v2("pyridine", atoms("C", "C", "C", "N", "C", "C"),
		[][3]int{{1, 2, 4}, {2, 3, 4}, {3, 4, 4}, {4, 5, 4}, {5, 6, 4}, {6, 1, 4}})
)

// v3000Example has continuation lines, arbitrary atom indices, a quoted type, CHG, MASS,
// VAL, a bond stereo mark and an S-group.
var v3000Example = `acetate with extras
  test

  0  0  0     0  0            999 V3000
M  V30 BEGIN CTAB
M  V30 COUNTS 5 3 1 0 0
M  V30 BEGIN ATOM
M  V30 10 C 0 0 0 0
M  V30 20 "C" 1.5 0 0 3 MASS=13
M  V30 30 O 2 1 0 0 -
M  V30 CHG=-1
M  V30 40 O 2 -1 0 0
M  V30 50 Na 5 5 0 0 CHG=1 VAL=-1
M  V30 END ATOM
M  V30 BEGIN BOND
M  V30 1 1 10 20
M  V30 2 1 20 30 CFG=1
M  V30 3 2 20 -
M  V30 40
M  V30 END BOND
M  V30 BEGIN SGROUP
M  V30 1 SUP 1 ATOMS=(2 10 20) LABEL="Ac"
M  V30 END SGROUP
M  V30 END CTAB
M  END
> <ID>
A-1

$$$$
`

func readOne(t *testing.T, text string, opts *Options) *Record {
	t.Helper()
	recs, err := ReadAll(strings.NewReader(text), opts)
	if err != nil || len(recs) != 1 {
		t.Fatalf("%v (%d records)\n%s", err, len(recs), text)
	}
	return recs[0]
}

func TestReadBasics(t *testing.T) {
	r := readOne(t, ethanol, nil)
	if got := r.Mol.Source; got != "CCO" {
		t.Errorf("Source %q", got)
	}
	if r.Title != "ethanol" || r.Mol.Name != "ethanol" || r.Index != 1 || r.Line != 1 || r.Version != "V2000" {
		t.Errorf("record %+v", r)
	}
	if got := atomTokens(r.Mol); got != "C3 C2 O1" {
		t.Errorf("atoms %s", got)
	}
	for _, a := range r.Mol.Atoms {
		if a.Pos != -1 || a.Aromatic || a.Bracket {
			t.Errorf("atom %+v", a)
		}
	}
	if r.Coords[1] != (Point3{1, 0, 0}) || r.FileAtoms[2] != 3 {
		t.Errorf("coords %v, file atoms %v", r.Coords, r.FileAtoms)
	}
	// aromatic bonds are kekulised and keep the Aromatic flags
	p := readOne(t, pyridineArom, nil)
	if got, want := smiles.Canonical(p.Mol), smiles.Canonical(mustParse(t, "c1ccncc1")); got != want {
		t.Errorf("pyridine: %s, want %s", got, want)
	}
	for i, a := range p.Mol.Atoms {
		if !a.Aromatic || !p.Mol.Bonds[i].Aromatic {
			t.Errorf("pyridine atom or bond %d not marked aromatic", i+1)
		}
	}
}

// TestChargesAndIsotopes: atom-block codes, M  CHG superseding them, M  ISO superseding
// mass differences, D and T, atom maps.
func TestChargesAndIsotopes(t *testing.T) {
	// N+ by charge code 3 with four methyls: no H
	text := v2("tetramethylammonium", []at{{sym: "N", ccc: 3}, {sym: "C"}, {sym: "C"}, {sym: "C"}, {sym: "C"}},
		[][3]int{{1, 2, 1}, {1, 3, 1}, {1, 4, 1}, {1, 5, 1}})
	if got := atomTokens(readOne(t, text, nil).Mol); got != "N0+1 C3 C3 C3 C3" {
		t.Errorf("charge code: %s", got)
	}
	// an M  CHG line makes every atom-block charge 0
	text = v2("x", []at{{sym: "N", ccc: 3}, {sym: "O"}}, nil, "M  CHG  1   2  -1")
	if got := atomTokens(readOne(t, text, nil).Mol); got != "N3 O1-1" {
		t.Errorf("M  CHG supersedes codes: %s", got)
	}
	// mass difference +1 on C (13C), superseded by M  ISO when present; D and T
	massDiff := strings.Replace(ethane, "C   0  0", "C   1  0", 1)
	if got := atomTokens(readOne(t, massDiff, nil).Mol); got != "13C3 C3" {
		t.Errorf("mass difference: %s", got)
	}
	withISO := strings.Replace(massDiff, "M  END", "M  ISO  1   2  14\nM  END", 1)
	if got := atomTokens(readOne(t, withISO, nil).Mol); got != "C3 14C3" {
		t.Errorf("M  ISO supersedes mass differences: %s", got)
	}
	dt := v2("x", atoms("C", "D", "T"), [][3]int{{1, 2, 1}, {1, 3, 1}})
	if got := atomTokens(readOne(t, dt, nil).Mol); got != "C2 2H0 3H0" {
		t.Errorf("D and T: %s", got)
	}
	// atom-atom mapping number in columns 61-63
	mapped := strings.Replace(ethane, "  0  0  0  0  0  0\n", "  0  0  0  7  0  0\n", 1)
	if got := atomTokens(readOne(t, mapped, nil).Mol); got != "C3:7 C3" {
		t.Errorf("atom map: %s", got)
	}
}

// TestHydrogens: explicit hydrogen atoms are folded unless kept; isotopic H stays.
func TestHydrogens(t *testing.T) {
	// C with H, H, H and D; an O-H
	text := v2("methanol-d1", atoms("C", "H", "H", "D", "O", "H"),
		[][3]int{{1, 2, 1}, {1, 3, 1}, {1, 4, 1}, {1, 5, 1}, {5, 6, 1}})
	r := readOne(t, text, nil)
	if got := atomTokens(r.Mol); got != "C2 2H0 O1" {
		t.Errorf("folded: %s", got)
	}
	if fmt.Sprint(r.FileAtoms) != "[1 4 5]" || len(r.Coords) != 3 || r.Coords[1].X != 3 {
		t.Errorf("file atoms %v, coords %v", r.FileAtoms, r.Coords)
	}
	if r.Mol.Source != "C([2H])O" {
		t.Errorf("Source %q", r.Mol.Source)
	}
	k := readOne(t, text, &Options{KeepHydrogens: true})
	if got := atomTokens(k.Mol); got != "C0 H0 H0 2H0 O0 H0" {
		t.Errorf("kept: %s", got)
	}
	// H2 and a bridging H are never folded
	h2 := v2("hydrogen", atoms("H", "H"), [][3]int{{1, 2, 1}})
	if got := atomTokens(readOne(t, h2, nil).Mol); got != "H0 H0" {
		t.Errorf("H2: %s", got)
	}
	// FoldHydrogens on a parsed SMILES
	m, kept := FoldHydrogens(mustParse(t, "[H]C([H])=O"))
	if atomTokens(m) != "C2 O0" || fmt.Sprint(kept) != "[1 3]" || m.Source != "C=O" {
		t.Errorf("FoldHydrogens: %s %v %q", atomTokens(m), kept, m.Source)
	}
}

// TestV3000: continuation lines, arbitrary atom indices, quoted types, CHG/MASS/VAL, and
// blocks read past.
func TestV3000(t *testing.T) {
	text := v3000Example
	r := readOne(t, text, &Options{NameProp: "ID"})
	if got := atomTokens(r.Mol); got != "C3 13C0:3 O0-1 O0 Na0+1" {
		t.Errorf("atoms %s", got)
	}
	if r.Mol.Name != "A-1" || r.Title != "acetate with extras" || r.Version != "V3000" {
		t.Errorf("name %q title %q version %s", r.Mol.Name, r.Title, r.Version)
	}
	if len(r.Notes) != 2 || !strings.Contains(r.Notes[0], "stereo") || !strings.Contains(r.Notes[1], "S-groups") {
		t.Errorf("notes %q", r.Notes)
	}
}

// TestKeepsGoing: a bad record in the middle of an SD file gives the other records and an
// error naming the bad one, with file line numbers.
func TestKeepsGoing(t *testing.T) {
	bad := v2("bad one", atoms("C", "Xx"), [][3]int{{1, 2, 1}})
	file := ethane + "> <note>\nfirst\n\n$$$$\n" + bad + "$$$$\n" + ethanol + "$$$$\n"
	recs, err := ReadAll(strings.NewReader(file), nil)
	if len(recs) != 2 || recs[0].Title != "ethane" || recs[1].Title != "ethanol" || recs[1].Index != 3 {
		t.Fatalf("records %v", recs)
	}
	var e *Error
	if !errors.As(err, &e) || fmt.Sprint(ErrorList{e}.Records()) != "[2]" {
		t.Fatalf("errors %v", err)
	}
	// ethane: 8 lines + 3 data lines + $$$$ = 12; the bad record starts on line 13, its
	// second atom is on line 13+5 = 18
	want := `18:32: record 2 (bad one): atom 2: unknown element "Xx" (check the element symbol)`
	if got := err.Error(); got != want {
		t.Errorf("error\n got %s\nwant %s", got, want)
	}
	if !errors.Is(err, ErrUnknownElement) || !errors.Is(err, smiles.ErrUnknownElement) {
		t.Errorf("sentinel: %v", err)
	}
	if recs[1].Line != 13+8+1 {
		t.Errorf("third record starts on line %d", recs[1].Line)
	}
	// Read by Read: record, error, record, EOF
	rd := NewReader(strings.NewReader(file), nil)
	var seq []string
	for {
		rec, err := rd.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			seq = append(seq, "error")
			continue
		}
		seq = append(seq, rec.Title)
	}
	if fmt.Sprint(seq) != "[ethane error ethanol]" {
		t.Errorf("Read sequence %v", seq)
	}
}

// TestLayoutVariants: CRLF line ends, no final line end, no final "$$$$", blank lines
// after the last "$$$$", data items without a blank line before "$$$$".
func TestLayoutVariants(t *testing.T) {
	crlf := strings.ReplaceAll(ethane+"> <a>\nx\n\n$$$$\n", "\n", "\r\n")
	for name, text := range map[string]string{
		"crlf":            crlf,
		"no final eol":    strings.TrimSuffix(ethane, "\n"),
		"no terminator":   ethane + "> <a>\nx\n",
		"trailing blanks": ethane + "$$$$\n\n  \n",
		"tight":           ethane + "> <a>\nx\n$$$$\n",
	} {
		recs, err := ReadAll(strings.NewReader(text), nil)
		if err != nil || len(recs) != 1 || recs[0].Mol.Source != "CC" {
			t.Errorf("%s: %v %v", name, recs, err)
			continue
		}
		if v, ok := recs[0].Prop("a"); strings.Contains(text, "<a>") && (!ok || v != "x") {
			t.Errorf("%s: data item %q", name, v)
		}
	}
	// empty input: no records, no error
	if recs, err := ReadAll(strings.NewReader(""), nil); err != nil || len(recs) != 0 {
		t.Errorf("empty input: %v %v", recs, err)
	}
}

// TestObsoleteBlocks: the atom-list and stext counts skip their lines, but never a
// property line.
func TestObsoleteBlocks(t *testing.T) {
	withStext := strings.Replace(ethane, "  2  1  0  0  0  0  0  0  0  0999", "  2  1  0  0  0  1  0  0  0  0999", 1)
	withStext = strings.Replace(withStext, "M  END", "    1.0000    1.0000\nsome text\nM  END", 1)
	if r := readOne(t, withStext, nil); r.Mol.Source != "CC" {
		t.Errorf("stext block: %s", r.Mol.Source)
	}
	noBlock := strings.Replace(ethane, "  2  1  0  0  0  0  0  0  0  0999", "  2  1  1  0  0  0  0  0  0  0999", 1)
	if r := readOne(t, noBlock, nil); r.Mol.Source != "CC" {
		t.Errorf("atom-list count without a block: %s", r.Mol.Source)
	}
}

// TestRecordCap: a record beyond the size cap is skipped with ErrTooLarge; the next one
// is read.
func TestRecordCap(t *testing.T) {
	big := ethane + "> <blob>\n" + strings.Repeat("x", 500) + "\n\n"
	file := ethane + "$$$$\n" + big + "$$$$\n" + ethanol + "$$$$\n"
	recs, err := ReadAll(strings.NewReader(file), &Options{MaxRecordBytes: 300})
	if len(recs) != 2 || !errors.Is(err, ErrTooLarge) || !strings.HasPrefix(err.Error(), "10:1: record 2: record is larger than 300 bytes") {
		t.Errorf("records %d, error %v", len(recs), err)
	}
	// one endless line
	recs, err = ReadAll(strings.NewReader(strings.Repeat("y", 5000)), &Options{MaxRecordBytes: 1000})
	if len(recs) != 0 || !errors.Is(err, ErrTooLarge) {
		t.Errorf("endless line: %v %v", recs, err)
	}
}

func TestMalformed(t *testing.T) {
	header := "t\n  test\n\n"
	type tc struct {
		name string
		text string
		err  error
		pos  string // "line:col"
		msg  string
	}
	replaceLine := func(text string, n int, line string) string {
		lines := strings.Split(text, "\n")
		lines[n-1] = line
		return strings.Join(lines, "\n")
	}
	cases := []tc{
		{"not a molfile", "C=CC=C\n", ErrTruncated, "1:7", "record ends after 1 line, before the counts line"},
		{"counts not a number", replaceLine(ethane, 4, "abc  1  0  0  0  0  0  0  0  0999 V2000"), ErrSyntax, "4:1", `atom count "abc" is not a number`},
		{"unknown version", replaceLine(ethane, 4, "  2  1  0  0  0  0  0  0  0  0999 V4000"), ErrSyntax, "4:34", `unknown format version "V4000"`},
		{"no atoms", header + "  0  0  0  0  0  0  0  0  0  0999 V2000\nM  END\n", ErrEmpty, "4:1", "no atoms"},
		{"truncated atoms", header + "  3  0  0  0  0  0  0  0  0  0999 V2000\n    0.0000    0.0000    0.0000 C   0  0\n", ErrTruncated, "5:40", "record ends in the atom block"},
		{"coordinate", replaceLine(ethane, 5, "    0.0x00    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0"), ErrSyntax, "5:1", `x coordinate "0.0x00"`},
		{"unknown element", v2("t", atoms("C", "Xx"), nil), ErrUnknownElement, "6:32", `unknown element "Xx"`},
		{"case", v2("t", atoms("CL"), nil), ErrUnknownElement, "5:32", "write Cl"},
		{"query atom", v2("t", atoms("C", "A"), [][3]int{{1, 2, 1}}), ErrUnsupported, "6:32", `query or R-group atom "A"`},
		{"charge code", v2("t", []at{{sym: "C", ccc: 8}}, nil), ErrSyntax, "5:37", "unknown charge code 8"},
		{"bond atom", v2("t", atoms("C", "C"), [][3]int{{1, 3, 1}}), ErrSyntax, "7:1", "atom 3 does not exist"},
		{"self bond", v2("t", atoms("C", "C"), [][3]int{{1, 1, 1}}), ErrSyntax, "7:1", "joins atom 1 to itself"},
		{"duplicate bond", v2("t", atoms("C", "C"), [][3]int{{1, 2, 1}, {2, 1, 2}}), ErrSyntax, "8:1", "already joined by bond 1"},
		{"query bond", v2("t", atoms("C", "C"), [][3]int{{1, 2, 5}}), ErrUnsupported, "7:7", "query bond type 5"},
		{"bond type", v2("t", atoms("C", "C"), [][3]int{{1, 2, 9}}), ErrSyntax, "7:7", "unknown bond type 9"},
		{"M CHG count", v2("t", atoms("C", "C"), [][3]int{{1, 2, 1}}, "M  CHG  2   1   1"), ErrSyntax, "8:7", "entry count 2 but 2 numbers follow"},
		{"M CHG atom", v2("t", atoms("C", "C"), [][3]int{{1, 2, 1}}, "M  CHG  1   5   1"), ErrSyntax, "8:7", "atom 5 does not exist"},
		{"radical", v2("t", atoms("C", "C"), [][3]int{{1, 2, 1}}, "M  RAD  1   2   2"), ErrRadical, "6:32", "atom 2 C is a doublet radical"},
		{"radical code", v2("t", []at{{sym: "C", ccc: 4}}, nil), ErrRadical, "5:32", "doublet radical"},
		{"carbon five bonds", v2("t", atoms("C", "C", "C", "C", "C", "C"), [][3]int{{1, 2, 1}, {1, 3, 1}, {1, 4, 1}, {1, 5, 1}, {1, 6, 1}}), ErrValence, "5:32", "atom 1 C has bonds adding up to 5; C allows at most 4"},
		{"valence field", v2("t", []at{{sym: "O", vvv: 1}, {sym: "C"}, {sym: "C"}}, [][3]int{{1, 2, 1}, {1, 3, 1}}), ErrValence, "5:32", "valence field gives 1 but its bonds add up to 2"},
		{"impossible charge", v2("t", []at{{sym: "C"}}, nil, "M  CHG  1   1   5"), ErrValence, "5:32", "charge +5 is impossible for C"},
		{"no M END", strings.TrimSuffix(ethane, "M  END\n"), ErrTruncated, "7:13", `record ends before "M  END"`},
		{"M END before data", strings.Replace(ethane, "M  END\n", "> <a>\nx\n", 1), ErrSyntax, "8:1", `no "M  END" line before the data items`},
		{"too few bonds counted", replaceLine(ethanol, 4, "  3  1  0  0  0  0  0  0  0  0999 V2000"), ErrSyntax, "9:1", "check the atom and bond counts"},
		{"data header", ethane + "garbage\n", ErrSyntax, "9:1", "expected a data item header"},
		{"data name", ethane + "> <open\nx\n", ErrSyntax, "9:3", "no closing '>'"},
		{"pyrrole", v2("t", atoms("C", "C", "C", "N", "C"), [][3]int{{1, 2, 4}, {2, 3, 4}, {3, 4, 4}, {4, 5, 4}, {5, 1, 4}}), ErrKekulize, "", "if atom 4 N is a pyrrole-type N-H, draw that hydrogen as an atom"},
		{"aromatic chain", v2("t", atoms("C", "C"), [][3]int{{1, 2, 4}}), ErrKekulize, "7:1", "lies in no ring"},
		{"mass difference", strings.Replace(v2("t", atoms("Tc"), nil), "Tc  0", "Tc  1", 1), ErrUnsupported, "5:35", "Tc has no reference isotope"},
		{"V30 in V2000", strings.Replace(ethane, "M  END", "M  V30 BEGIN CTAB\nM  END", 1), ErrSyntax, "8:1", "V3000 line in a V2000 record"},
		{"empty record", "$$$$\n", ErrEmpty, "1:1", "empty record"},
	}
	v3 := func(body string) string {
		return header + "  0  0  0     0  0            999 V3000\nM  V30 BEGIN CTAB\n" + body + "M  V30 END CTAB\nM  END\n"
	}
	atomsV3 := "M  V30 COUNTS 2 1 0 0 0\nM  V30 BEGIN ATOM\nM  V30 1 C 0 0 0 0\nM  V30 2 C 1 0 0 0\nM  V30 END ATOM\n"
	cases = append(cases,
		tc{"V3000 no CTAB", header + "  0  0  0     0  0            999 V3000\nM  V30 COUNTS 1 0 0 0 0\nM  END\n", ErrSyntax, "5:8", "expected BEGIN CTAB"},
		tc{"V3000 quote", v3("M  V30 COUNTS 1 0 0 0 0\nM  V30 BEGIN ATOM\nM  V30 1 \"C 0 0 0 0\nM  V30 END ATOM\n"), ErrSyntax, "8:10", "unterminated quoted string"},
		tc{"V3000 counts", v3("M  V30 COUNTS 2 0 0 0 0\nM  V30 BEGIN ATOM\nM  V30 1 C 0 0 0 0\nM  V30 END ATOM\n"), ErrSyntax, "9:8", "COUNTS gives 2 atoms but the atom block has 1"},
		tc{"V3000 coordination", v3(atomsV3 + "M  V30 BEGIN BOND\nM  V30 1 9 1 2\nM  V30 END BOND\n"), ErrUnsupported, "12:10", "coordination bond (type 9)"},
		tc{"V3000 bond atom", v3(atomsV3 + "M  V30 BEGIN BOND\nM  V30 1 1 1 7\nM  V30 END BOND\n"), ErrSyntax, "12:12", "no atom with index 7"},
		tc{"V3000 atom list", v3("M  V30 COUNTS 1 0 0 0 0\nM  V30 BEGIN ATOM\nM  V30 1 [C,N] 0 0 0 0\nM  V30 END ATOM\n"), ErrUnsupported, "8:10", "atom list [C,N]"},
		tc{"V3000 radical", v3("M  V30 COUNTS 1 0 0 0 0\nM  V30 BEGIN ATOM\nM  V30 1 C 0 0 0 0 RAD=2\nM  V30 END ATOM\n"), ErrRadical, "8:10", "doublet radical"},
		tc{"V3000 cut off", header + "  0  0  0     0  0            999 V3000\nM  V30 BEGIN CTAB\nM  V30 COUNTS 1 0 0 0 0\nM  V30 BEGIN ATOM\n", ErrTruncated, "", "record ends inside the V3000 connection table"},
		tc{"V3000 M END", header + "  0  0  0     0  0            999 V3000\nM  V30 BEGIN CTAB\nM  V30 COUNTS 1 0 0 0 0\nM  V30 BEGIN ATOM\nM  END\n", ErrTruncated, "8:1", `"M  END" inside the V3000 connection table`},
	)
	for _, c := range cases {
		_, err := ReadAll(strings.NewReader(c.text), nil)
		if testing.Verbose() {
			t.Logf("%s: %v", c.name, err)
		}
		var e *Error
		switch {
		case err == nil:
			t.Errorf("%s: no error", c.name)
			continue
		case !errors.As(err, &e):
			t.Errorf("%s: %T %v", c.name, err, err)
			continue
		}
		if !errors.Is(err, c.err) {
			t.Errorf("%s: %v, want %v", c.name, err, c.err)
		}
		if pos := fmt.Sprintf("%d:%d", e.Line, e.Col); c.pos != "" && pos != c.pos {
			t.Errorf("%s: at %s, want %s: %v", c.name, pos, c.pos, err)
		}
		if !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%s: %q does not say %q", c.name, err.Error(), c.msg)
		}
		if e.Record != 1 || e.Hint == "" {
			t.Errorf("%s: record %d, hint %q", c.name, e.Record, e.Hint)
		}
	}
}
