package main

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

// update rewrites the golden files under testdata/ instead of comparing with them:
//
//	go test ./cmd/cyclopair -run TestX -update
var update = flag.Bool("update", false, "rewrite golden files in testdata/")

// checkGolden compares got with testdata/<name> (line endings normalised) and rewrites the
// file when -update is set. Every command's output formats are pinned this way.
func checkGolden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run 'go test ./cmd/cyclopair -run %s -update' to create it)", err, t.Name())
	}
	norm := func(b []byte) []byte { return bytes.ReplaceAll(b, []byte("\r\n"), []byte("\n")) }
	if !bytes.Equal(norm(got), norm(want)) {
		t.Errorf("output differs from %s (rerun with -update if the change is intended)\n--- want\n%s\n--- got\n%s", path, want, got)
	}
}

// runCLI runs the whole program in-process and returns stdout, stderr and the exit code.
func runCLI(t *testing.T, stdin string, args ...string) (string, string, int) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, bytes.NewBufferString(stdin), &out, &errb)
	return out.String(), errb.String(), code
}
