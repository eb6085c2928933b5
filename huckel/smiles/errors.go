package smiles

import (
	"errors"
	"fmt"

	"cyclopair/huckel/errtext"
)

// Sentinel errors. Every *Error wraps exactly one of them, so callers can ask
// errors.Is(err, smiles.ErrRingNotClosed) without looking at the message.
var (
	ErrEmpty          = errors.New("empty input")
	ErrSyntax         = errors.New("syntax error")
	ErrUnknownElement = errors.New("unknown element")
	ErrRingNotClosed  = errors.New("ring bond not closed")
	ErrKekulize       = errors.New("aromatic ring cannot be kekulised")
	ErrValence        = errors.New("impossible valence")
	ErrRadical        = errors.New("radical not supported")
	// ErrTooLong: the input is longer than the length limit (MaxLength, or
	// ParseOptions.MaxLength); nothing of it was read.
	ErrTooLong = errors.New("SMILES too long")
)

// Error is one problem found in a SMILES string. Pos is a 0-based byte offset into Input
// (it may equal len(Input) for "missing something at the end" errors).
//
// Error() reads "column 7: ring bond 1 never closed (close it with a second '1' or remove
// it)"; it does not repeat Input, so a caller can prefix the SMILES and stay on one line.
type Error struct {
	Input string // the whole SMILES text
	Pos   int    // 0-based byte offset of the problem
	Msg   string // what is wrong
	Hint  string // what to do about it; may be empty
	Err   error  // one of the Err* sentinels
}

// Column is the 1-based column of the problem, counted in bytes (SMILES is ASCII; a stray
// non-ASCII character is reported at its first byte).
func (e *Error) Column() int { return e.Pos + 1 }

func (e *Error) Error() string {
	if e.Hint == "" {
		return fmt.Sprintf("column %d: %s", e.Column(), e.Msg)
	}
	return fmt.Sprintf("column %d: %s (%s)", e.Column(), e.Msg, e.Hint)
}

// Unwrap returns the sentinel error.
func (e *Error) Unwrap() error { return e.Err }

// Excerpt returns two lines without a trailing newline: the input and a caret under Pos.
// The input is shown as errtext.Excerpt shows it: control characters escaped (\x1b, \x00
// …), and an input longer than errtext.Width (100) characters cut to a window around Pos
// with "..." marks and its total length, so a message stays short whatever was typed.
func (e *Error) Excerpt() string { return errtext.Excerpt(e.Input, e.Pos) }

// ErrorList is a list of errors found in one input, in order of position, modelled on
// go/scanner.ErrorList. Parse returns a single *Error when it found one problem and an
// ErrorList when it found several; errors.As(err, &e) with e *Error finds the first in
// either case, and errors.Is works with the sentinels.
type ErrorList []*Error

func (l ErrorList) Error() string { return errtext.ListText(l) }

// Err returns nil for an empty list, the single *Error for a list of one, and the list
// itself otherwise.
func (l ErrorList) Err() error { return errtext.ListErr(l) }

// Unwrap lets errors.Is and errors.As look at every error of the list.
func (l ErrorList) Unwrap() []error { return errtext.ListUnwrap(l) }
