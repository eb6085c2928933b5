// Package yamlfile is the file-reading layer shared by every reader of user files
// (parameter sets, substrate files, calibration data and files, check sets): one positioned
// error and error list in the shape of go/scanner's, capped reading, a UTF-8 check, and the
// YAML node checks every reader needs (aliases, unknown keys, positions of fields).
//
// It knows no chemistry and imports nothing of this module, so huckel's parameter loader
// and the fmo readers can both use it.
package yamlfile

import (
	"cyclopair/huckel/errtext"
	"fmt"
	"strings"
)

// Error is one problem in a file, at a 1-based line and column (0 when the position is
// unknown). Error() reads
//
//	file: 7:15: path: what (hint)
//
// leaving out the position, the path and the hint when they are empty.
type Error struct {
	File      string
	Line, Col int
	Path      string // where in the document, e.g. "dienes[2].smiles" or a row's ID; may be empty
	Msg       string
	Hint      string
	Err       error // the sentinel callers test with errors.Is (e.g. huckel.ErrParams); may be nil
	Cause     error // underlying error (a *smiles.Error for bad SMILES), may be nil
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(errtext.Clip(e.File))
	if e.Line > 0 {
		fmt.Fprintf(&b, ": %d:%d", e.Line, e.Col)
	}
	b.WriteString(": ")
	if e.Path != "" {
		b.WriteString(e.Path)
		b.WriteString(": ")
	}
	b.WriteString(errtext.Escape(e.Msg))
	if e.Hint != "" {
		b.WriteString(" (" + e.Hint + ")")
	}
	return b.String()
}

// Unwrap exposes the sentinel and the cause to errors.Is and errors.As.
func (e *Error) Unwrap() []error {
	var out []error
	for _, x := range []error{e.Err, e.Cause} {
		if x != nil {
			out = append(out, x)
		}
	}
	return out
}

// ErrorList is a list of problems, itself an error ("first error (and N more errors)").
type ErrorList []*Error

func (l ErrorList) Error() string {
	switch len(l) {
	case 0:
		return "no errors"
	case 1:
		return l[0].Error()
	}
	return fmt.Sprintf("%s (and %d more errors)", l[0], len(l)-1)
}

// Err returns nil for an empty list, else the list.
func (l ErrorList) Err() error {
	if len(l) == 0 {
		return nil
	}
	return l
}

// Unwrap lets errors.Is and errors.As see every error of the list.
func (l ErrorList) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}
