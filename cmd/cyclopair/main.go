// Command cyclopair screens thermal cycloaddition partners with Hückel frontier-orbital theory.
// See README.md for the job it does and how far its answers can be trusted.
package main

import "os"

func main() {
	// A standard output closed at start (`>&-`) is not detected: the Go runtime reopens a
	// closed descriptor 0–2 as /dev/null before main runs, and that cannot be told apart
	// from a caller that connects stdout to /dev/null on purpose (Python's
	// subprocess.DEVNULL, for one), which must stay a success.
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
