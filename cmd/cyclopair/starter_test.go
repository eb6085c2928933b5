package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"cyclopair/fmo/screen"
	"cyclopair/fmo/substrates"
)

// TestStarterLoads: the starter file loads with the substrate reader as printed, with no
// bad row, every built-in name it uses resolving, and it screens (exit 0).
func TestStarterLoads(t *testing.T) {
	out, errOut, code := runCLI(t, "", "starter")
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, errOut)
	}
	lib, bad, err := substrates.ParseLibrary([]byte(out), screen.FileOptions("my-screen.yaml"))
	if err != nil || len(bad) > 0 {
		t.Fatalf("starter file does not load: %v %v\n%s", err, bad, out)
	}
	if len(lib.Dienes) < 3 || len(lib.Dienophiles) < 3 {
		t.Errorf("starter file has %d dienes, %d dienophiles; want at least 3 each", len(lib.Dienes), len(lib.Dienophiles))
	}
	if !strings.Contains(out, "# ") || !strings.Contains(out, "preset:") || !strings.Contains(out, "pin:") {
		t.Error("starter file lacks comments, presets or a pinned row")
	}
	path := filepath.Join(t.TempDir(), "my-screen.yaml")
	if err := os.WriteFile(path, []byte(out), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code = runCLI(t, "", "screen", path, "--top", "3")
	if code != exitOK {
		t.Errorf("screening the starter file: exit %d\n%s", code, errOut)
	}
}

// TestVersion: --version prints one line "cyclopair <version>" and exits 0; in a test
// binary the build information has no module version, so the fallback "devel" shows.
func TestVersion(t *testing.T) {
	out, _, code := runCLI(t, "", "--version")
	if code != exitOK || !strings.HasPrefix(out, "cyclopair ") || strings.Count(out, "\n") != 1 {
		t.Fatalf("--version: exit %d, %q", code, out)
	}
	if v := version(); v == "" || !strings.Contains(v, "go1.") {
		t.Errorf("version() = %q; want a version and the Go release", v)
	}
}

// TestReadmeSelfContained: the README and the contributor guide point at no file outside the
// repository, keep the two set-up commands and name the install line, the starter file and
// --version (issue 9: a clone must be complete).
func TestReadmeSelfContained(t *testing.T) {
	for _, f := range []string{"../../README.md", "../../DEVELOPERS.md"} {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if strings.Contains(string(b), "../shared") || strings.Contains(string(b), "DESIGN.md") {
			t.Errorf("%s points outside the repository", f)
		}
	}
	b, _ := os.ReadFile("../../README.md")
	for _, want := range []string{"    go run ./cmd/cyclopair demo\n    go test ./...\n", "go install ./cmd/cyclopair", "cyclopair starter > my-screen.yaml", "cyclopair --version"} {
		if !strings.Contains(string(b), want) {
			t.Errorf("README lacks %q", want)
		}
	}
}
