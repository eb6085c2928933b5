package errtext

import (
	"fmt"
)

// The functions below give a package's error list (a slice of its *Error type, modelled on
// go/scanner.ErrorList) its methods, so every reader's list reads and unwraps alike.

// ListText is the list's Error(): "no errors", the single error, or the first error
// followed by "(and N more error[s])".
func ListText[E error](l []E) string {
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

// ListErr is the list's Err(): nil for an empty list, the single error for a list of one,
// and the list itself otherwise.
func ListErr[L interface {
	~[]E
	error
}, E error](l L) error {
	switch len(l) {
	case 0:
		return nil
	case 1:
		return l[0]
	}
	return l
}

// ListUnwrap is the list's Unwrap(), so errors.Is and errors.As look at every error.
func ListUnwrap[E error](l []E) []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}
