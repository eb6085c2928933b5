package main

import (
	"io"
	"os"

	"golang.org/x/term"
)

// isTerminal reports whether w is an interactive terminal. Only *os.File can be one;
// buffers in tests and pipes in CI are not, so progress output stays off there.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	return term.IsTerminal(int(f.Fd()))
}
