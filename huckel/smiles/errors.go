package smiles

import (
	"errors"
	"fmt"
	"strings"
	"unicode/utf8"
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

// excerptWidth is the longest input line Excerpt prints before shortening it.
const excerptWidth = 60

// Excerpt returns two lines without a trailing newline: the input (shortened to a window
// around Pos with "..." marks when it is longer than 60 bytes) and a caret under Pos.
func (e *Error) Excerpt() string {
	s := e.Input
	pos := min(max(e.Pos, 0), len(s))
	start, end := 0, len(s)
	prefix, suffix := "", ""
	if len(s) > excerptWidth {
		start = max(pos-excerptWidth/2, 0)
		end = min(start+excerptWidth, len(s))
		start = max(end-excerptWidth, 0)
		if start > 0 {
			prefix = "..."
		}
		if end < len(s) {
			suffix = "..."
		}
	}
	var b strings.Builder
	b.WriteString(prefix)
	b.WriteString(s[start:end])
	b.WriteString(suffix)
	b.WriteByte('\n')
	b.WriteString(strings.Repeat(" ", len(prefix)+utf8.RuneCountInString(s[start:pos])))
	b.WriteByte('^')
	return b.String()
}

// ErrorList is a list of errors found in one input, in order of position, modelled on
// go/scanner.ErrorList. Parse returns a single *Error when it found one problem and an
// ErrorList when it found several; errors.As(err, &e) with e *Error finds the first in
// either case, and errors.Is works with the sentinels.
type ErrorList []*Error

func (l ErrorList) Error() string {
	switch len(l) {
	case 0:
		return "no errors"
	case 1:
		return l[0].Error()
	case 2:
		return fmt.Sprintf("%s (and 1 more error)", l[0])
	}
	return fmt.Sprintf("%s (and %d more errors)", l[0], len(l)-1)
}

// Err returns nil for an empty list, the single *Error for a list of one, and the list
// itself otherwise.
func (l ErrorList) Err() error {
	switch len(l) {
	case 0:
		return nil
	case 1:
		return l[0]
	}
	return l
}

// Unwrap lets errors.Is and errors.As look at every error of the list.
func (l ErrorList) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}
