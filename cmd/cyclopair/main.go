// Command cyclopair screens thermal cycloaddition partners with Hückel frontier-orbital theory.
// See README.md for the job it does and how far its answers can be trusted.
package main

import (
	"io"
	"os"
)

func main() {
	var stdout io.Writer = os.Stdout
	if stdoutClosed() {
		stdout = closedWriter{}
	}
	os.Exit(run(os.Args[1:], os.Stdin, stdout, os.Stderr))
}
