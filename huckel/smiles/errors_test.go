package smiles

import (
	"errors"
	"strings"
	"testing"
)

// malformed is the corpus of bad inputs: each must give an *Error (possibly first of an
// ErrorList) wrapping the sentinel, at the column, with the message and hint fragments.
var malformed = []struct {
	in   string
	err  error
	col  int
	msg  string // fragment of Msg
	hint string // fragment of Hint
}{
	{"", ErrEmpty, 1, "empty input", "give a SMILES"},
	{"C1CC", ErrRingNotClosed, 2, "ring bond 1 never closed", "close it with a second '1'"},
	{"C%12CC", ErrRingNotClosed, 2, "ring bond %12 never closed", "second '%12'"},
	{"C1CC1C1", ErrRingNotClosed, 7, "ring bond 1 never closed", "remove it"},
	{"c1ccccc", ErrRingNotClosed, 2, "ring bond 1 never closed", ""},
	{"C(C", ErrSyntax, 4, "unclosed branch opened at column 2", "add ')'"},
	{"C1CC(C1", ErrSyntax, 8, "unclosed branch opened at column 5", "add ')'"},
	{"[Xx]", ErrUnknownElement, 2, "unknown element Xx", "element symbol"},
	{"Q", ErrUnknownElement, 1, "unknown element Q", ""},
	{"CCXx", ErrUnknownElement, 3, "unknown element Xx", ""},
	{"*C", ErrUnknownElement, 1, "wildcard", "real atom"},
	{"C[*]", ErrUnknownElement, 3, "wildcard", ""},
	{"[CH3]", ErrRadical, 1, "atom 1 [CH3] has an unpaired electron; radicals are not supported", "add H or a charge"},
	{"[CH2]C", ErrRadical, 1, "atom 1 [CH2] has an unpaired electron", "add H or a charge"},
	{"C[O]", ErrRadical, 2, "atom 2 [O] has an unpaired electron", ""},
	{"[O]", ErrRadical, 1, "atom 1 [O] has 2 unpaired electrons", ""},
	{"[NH4]", ErrRadical, 1, "[NH4] has an unpaired electron", ""},
	{"C[CH]C", ErrRadical, 2, "atom 2 [CH]", ""},
	{"c1ccnc1", ErrKekulize, 6, "aromatic ring cannot be kekulised", "[nH]"},
	{"c1cccc1", ErrKekulize, 6, "aromatic ring cannot be kekulised", ""},
	{"O=c1cccc[n]1", ErrKekulize, 5, "aromatic ring cannot be kekulised", ""},
	{"cC", ErrKekulize, 1, "aromatic atom 1 c is not in a ring", "capital letter"},
	{"[nH]", ErrKekulize, 1, "not in a ring", ""},
	{"C:C", ErrKekulize, 1, "aromatic bond ':' joins non-aromatic atom 1", "lowercase"},
	{"CC(C)(C)(C)C", ErrValence, 2, "atom 2 C has 5 bonds; C allows at most 4", "bond orders"},
	{"[CH5]", ErrValence, 1, "valence 5; neutral C allows at most 4", ""},
	{"C=[N+](=C)=C", ErrValence, 3, "N+ allows at most 4", ""},
	{"[C+5]", ErrValence, 1, "charge +5 is impossible for C", "check the charge"},
	{"[H+2]", ErrValence, 1, "impossible for H", ""},
	{"ClCl(C)C", ErrValence, 3, "Cl allows at most 1", "brackets"},
	{"C$C", ErrSyntax, 2, "quadruple bond", "'#'"},
	{"Na", ErrSyntax, 1, "element Na must be written in brackets", "[Na]"},
	{"CSi", ErrSyntax, 2, "element Si must be written in brackets", "[Si]"},
	{"CH4", ErrSyntax, 2, "hydrogen must be written in brackets", "[H]"},
	{"C)C", ErrSyntax, 2, "')' without a matching '('", ""},
	{"(C)C", ErrSyntax, 1, "branch '(' with no atom before it", ""},
	{"C()C", ErrSyntax, 2, "empty branch", ""},
	{"C((C))", ErrSyntax, 3, "'(' directly after '('", ""},
	{"C=(O)C", ErrSyntax, 2, "bond symbol '=' before '('", "inside the branch"},
	{"C(C=)C", ErrSyntax, 4, "bond symbol '=' has no atom after it", ""},
	{"C==C", ErrSyntax, 3, "two bond symbols in a row", ""},
	{"=CC", ErrSyntax, 1, "bond symbol '=' with no atom before it", ""},
	{"CC=", ErrSyntax, 3, "at the end has no atom after it", ""},
	{"C/C=C/", ErrSyntax, 6, "has no atom after it", ""},
	{"C..C", ErrSyntax, 3, "empty fragment before '.'", ""},
	{".C", ErrSyntax, 1, "empty fragment", ""},
	{"C.", ErrSyntax, 2, "'.' has no fragment after it", ""},
	{"C.=C", ErrSyntax, 3, "with no atom before it", ""},
	{"C.1CC1", ErrSyntax, 3, "ring bond 1 with no atom before it", ""},
	{"1CC", ErrSyntax, 1, "ring bond 1 with no atom before it", ""},
	{"C(1CC1)", ErrSyntax, 3, "ring bond 1 with no atom before it", ""},
	{"C11", ErrSyntax, 3, "closes on the atom that opened it", ""},
	{"C12CCCCC12", ErrSyntax, 10, "duplicates an existing bond", ""},
	{"C%1C", ErrSyntax, 2, "'%' must be followed by two digits", ""},
	{"C%(12CC", ErrSyntax, 2, "malformed ring number", ""},
	{"C%(123456)C", ErrSyntax, 2, "malformed ring number", ""},
	{"C=1CC#1", ErrSyntax, 6, "conflicting bond symbols '=' and '#'", ""},
	{"[C", ErrSyntax, 1, "never closed", "add ']'"},
	{"[CH4", ErrSyntax, 1, "never closed", ""},
	{"C[NH4+", ErrSyntax, 2, "never closed", ""},
	{"[CH4(C)", ErrSyntax, 1, "never closed", ""},
	{"[]", ErrSyntax, 2, "bracket atom without an element", ""},
	{"[Cx]", ErrSyntax, 3, "unexpected 'x' in bracket atom", "isotope"},
	{"[xe]", ErrSyntax, 2, "xe cannot be aromatic", ""},
	{"[C@TH]C", ErrSyntax, 6, "chirality class TH without a number", ""},
	{"[1234C]", ErrSyntax, 2, "isotope number too long", ""},
	{"[C:]", ErrSyntax, 3, "without a class number", ""},
	{"[CH123]", ErrSyntax, 4, "hydrogen count too large", ""},
	{"[C+123]", ErrSyntax, 4, "charge too large", ""},
	{"C]", ErrSyntax, 2, "']' without a matching '['", ""},
	{"C C", ErrSyntax, 2, "unexpected space", ""},
	{"CC\t", ErrSyntax, 3, "unexpected tab", ""},
	{"C\x00", ErrSyntax, 2, "unexpected byte 0x00", ""},
	{"C!C", ErrSyntax, 2, "unexpected '!'", ""},
	{"Cse1ccc1", ErrSyntax, 3, "unexpected 'e'", ""},
	{"CCé", ErrSyntax, 3, "unexpected byte 0xc3", ""},
	{"C%00", ErrRingNotClosed, 2, "ring bond %00 never closed", ""},
}

func TestMalformed(t *testing.T) {
	if len(malformed) < 40 {
		t.Fatalf("corpus has %d entries, want at least 40", len(malformed))
	}
	for _, tc := range malformed {
		m, err := Parse(tc.in)
		if err == nil {
			t.Errorf("Parse(%q) = %s, want an error", tc.in, Write(m))
			continue
		}
		if m != nil {
			t.Errorf("Parse(%q) returned a molecule with its error", tc.in)
		}
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("Parse(%q): error %T is not an *Error", tc.in, err)
			continue
		}
		if !errors.Is(err, tc.err) {
			t.Errorf("Parse(%q) = %v, want sentinel %v", tc.in, err, tc.err)
		}
		if e.Column() != tc.col {
			t.Errorf("Parse(%q) = %v: column %d, want %d", tc.in, err, e.Column(), tc.col)
		}
		if !strings.Contains(e.Msg, tc.msg) {
			t.Errorf("Parse(%q): message %q lacks %q", tc.in, e.Msg, tc.msg)
		}
		if !strings.Contains(e.Hint, tc.hint) {
			t.Errorf("Parse(%q): hint %q lacks %q", tc.in, e.Hint, tc.hint)
		}
		if e.Hint == "" && e.Err != ErrRingNotClosed {
			t.Errorf("Parse(%q): no hint", tc.in)
		}
		if e.Input != tc.in {
			t.Errorf("Parse(%q): Error.Input = %q", tc.in, e.Input)
		}
		if len(tc.in) > 8 && strings.Contains(err.Error(), tc.in) {
			t.Errorf("Parse(%q): Error() %q repeats the input", tc.in, err.Error())
		}
		if !strings.HasPrefix(e.Error(), "column ") {
			t.Errorf("Parse(%q): Error() = %q, want it to start with the column", tc.in, e.Error())
		}
		lines := strings.Split(e.Excerpt(), "\n")
		if len(lines) != 2 || !strings.HasSuffix(lines[1], "^") {
			t.Errorf("Parse(%q): Excerpt() = %q", tc.in, e.Excerpt())
		}
	}
}

func TestErrorList(t *testing.T) {
	_, err := Parse("[Xx]C1CC[Qq]")
	var list ErrorList
	if !errors.As(err, &list) {
		t.Fatalf("Parse gave %T %v, want an ErrorList", err, err)
	}
	if len(list) != 3 {
		t.Fatalf("got %d errors, want 3 (two unknown elements, one open ring): %v", len(list), list)
	}
	if !errors.Is(err, ErrUnknownElement) || !errors.Is(err, ErrRingNotClosed) {
		t.Errorf("errors.Is does not see both sentinels in %v", err)
	}
	var first *Error
	if !errors.As(err, &first) || first.Column() != 2 {
		t.Errorf("errors.As gives %v, want the first error at column 2", first)
	}
	const want = "column 2: unknown element Xx (check the element symbol) (and 2 more errors)"
	if err.Error() != want {
		t.Errorf("Error() = %q, want %q", err.Error(), want)
	}
	if (ErrorList{}).Err() != nil {
		t.Error("empty ErrorList.Err() is not nil")
	}

	_, err = Parse("[CH3].[CH3].[CH2]C.C[O]")
	if !errors.As(err, &list) || len(list) != 4 {
		t.Errorf("four radical atoms: got %v", err)
	}
}

func TestExcerpt(t *testing.T) {
	e := &Error{Input: "C1CC", Pos: 1}
	if got, want := e.Excerpt(), "C1CC\n ^"; got != want {
		t.Errorf("Excerpt() = %q, want %q", got, want)
	}
	long := strings.Repeat("C", 100) + "X" + strings.Repeat("C", 100)
	e = &Error{Input: long, Pos: 100}
	lines := strings.Split(e.Excerpt(), "\n")
	if len(lines) != 2 {
		t.Fatalf("Excerpt() = %q", e.Excerpt())
	}
	if !strings.HasPrefix(lines[0], "...") || !strings.HasSuffix(lines[0], "... (input of 201 characters)") {
		t.Errorf("long input not shortened with ... marks and its length: %q", lines[0])
	}
	if caret := strings.IndexByte(lines[1], '^'); caret < 0 || lines[0][caret] != 'X' {
		t.Errorf("caret does not point at X:\n%s", e.Excerpt())
	}
	e = &Error{Input: "C(C", Pos: 3}
	if got, want := e.Excerpt(), "C(C\n   ^"; got != want {
		t.Errorf("end-of-input Excerpt() = %q, want %q", got, want)
	}
}
