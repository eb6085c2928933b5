package main

import (
	"bytes"
	"testing"

	"cyclopair/cmd/cyclopair/internal/golden"
)

// checkGolden compares got with testdata/<name> or rewrites it under -update
// (go test ./cmd/cyclopair -run TestX -update). Every command's output formats are pinned
// this way.
func checkGolden(t *testing.T, name string, got []byte) {
	t.Helper()
	golden.Check(t, name, got)
}

// runCLI runs the whole program in-process and returns stdout, stderr and the exit code.
func runCLI(t *testing.T, stdin string, args ...string) (string, string, int) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, bytes.NewBufferString(stdin), &out, &errb)
	return out.String(), errb.String(), code
}
