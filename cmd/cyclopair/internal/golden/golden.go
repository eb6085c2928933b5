// Package golden compares test output with golden files under the calling package's
// testdata/ directory, or rewrites them when the test binary runs with -update:
//
//	go test ./cmd/cyclopair/... -update
//
// It is imported only by tests; importing it registers the -update flag, so a test package
// that uses it must not define its own.
package golden

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

var update = flag.Bool("update", false, "rewrite golden files under testdata/ instead of comparing with them")

// Updating reports whether -update was given.
func Updating() bool { return *update }

// Check compares got with testdata/<name> (line endings normalised) and rewrites the file
// under -update. A missing file or a difference fails the test with both versions shown.
func Check(t testing.TB, name string, got []byte) {
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
		t.Fatalf("%v (rerun the test with -update to create it)", err)
	}
	norm := func(b []byte) []byte { return bytes.ReplaceAll(b, []byte("\r\n"), []byte("\n")) }
	if !bytes.Equal(norm(got), norm(want)) {
		t.Errorf("output differs from %s (rerun with -update if the change is intended)\n--- want\n%s\n--- got\n%s", path, want, got)
	}
}
