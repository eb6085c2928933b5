package molfile

import (
	"errors"
	"fmt"

	"cyclopair/huckel/errtext"
	"cyclopair/huckel/smiles"
)

// Sentinel errors. Every *Error wraps exactly one of them, so callers can ask
// errors.Is(err, molfile.ErrRadical) without looking at the message. The chemistry
// sentinels are the SMILES reader's own values, so one errors.Is check covers a molecule
// whether it came from SMILES or from a molfile.
var (
	ErrEmpty          = smiles.ErrEmpty          // a record with no text
	ErrSyntax         = smiles.ErrSyntax         // a line or field that does not follow the format
	ErrUnknownElement = smiles.ErrUnknownElement // an atom symbol that is no element
	ErrKekulize       = smiles.ErrKekulize       // aromatic bonds (type 4) without a Kekulé structure
	ErrValence        = smiles.ErrValence        // more bonds than the element allows, or an impossible charge
	ErrRadical        = smiles.ErrRadical        // unpaired electrons (M  RAD, charge code 4, RAD=, a short valence)
	ErrTruncated      = errors.New("truncated record")
	ErrUnsupported    = errors.New("unsupported feature")
	ErrTooLarge       = errors.New("record too large")
)

// Error is one problem in one record of a molfile or SD file.
//
// Error() reads "12:32: record 3 (aniline): atom 2: unknown element \"Xx\" (check the
// element symbol)": line and column first, then the record. It does not name the file, so
// a caller prefixes the file name and keeps the one-line form
// "cyclopair: FILE: 12:32: record 3 ...".
type Error struct {
	Record int    // 1-based record number in the file (the first molecule is record 1)
	Title  string // the record's title line (header line 1), "" when blank or not read yet
	Line   int    // 1-based line number in the file
	Col    int    // 1-based column (byte) in that line; 1 when the whole line is meant
	Atom   int    // 1-based number of the atom the problem is about (its place in the atom block), 0 if none
	Msg    string // what is wrong
	Hint   string // what to do about it; may be empty
	Err    error  // one of the Err* sentinels
}

// maxTitleInError is how much of a record title Error() repeats.
const maxTitleInError = 40

func (e *Error) Error() string {
	rec := fmt.Sprintf("record %d", e.Record)
	if t := e.Title; t != "" {
		if len(t) > maxTitleInError {
			t = truncateUTF8(t, maxTitleInError) + "..."
		}
		rec += " (" + t + ")"
	}
	s := fmt.Sprintf("%d:%d: %s: %s", e.Line, e.Col, rec, e.Msg)
	if e.Hint != "" {
		s += " (" + e.Hint + ")"
	}
	return s
}

// Unwrap returns the sentinel error.
func (e *Error) Unwrap() error { return e.Err }

// ErrorList is a list of record errors in file order, modelled on go/scanner.ErrorList.
// Reader.Read returns a single *Error when a record has one problem and an ErrorList when
// it has several; ReadAll returns the problems of all bad records as one list. In every
// case errors.As(err, &e) with e *Error finds the first problem, and errors.Is works with
// the sentinels.
type ErrorList []*Error

func (l ErrorList) Error() string { return errtext.ListText(l) }

// Err returns nil for an empty list, the single *Error for a list of one, and the list
// itself otherwise.
func (l ErrorList) Err() error { return errtext.ListErr(l) }

// Unwrap lets errors.Is and errors.As look at every error of the list.
func (l ErrorList) Unwrap() []error { return errtext.ListUnwrap(l) }

// Records returns the distinct record numbers named in the list, in order.
func (l ErrorList) Records() []int {
	var out []int
	for _, e := range l {
		if len(out) == 0 || out[len(out)-1] != e.Record {
			out = append(out, e.Record)
		}
	}
	return out
}
