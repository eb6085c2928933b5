// Command cyclopair screens thermal cycloaddition partners with Hückel frontier-orbital theory.
// See README.md for the job it does and how far its answers can be trusted.
package main

import "os"

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
