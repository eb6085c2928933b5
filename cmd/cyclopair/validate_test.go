package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestValidateCLI pins the three output formats of 'cyclopair validate' on a three-case
// check set (one regio hit, one documented known miss, one demand hit).
func TestValidateCLI(t *testing.T) {
	cases := filepath.Join("testdata", "validate", "small.yaml")
	for _, format := range []string{"table", "json", "markdown"} {
		out, errOut, code := runCLI(t, "", "validate", "--cases", cases, "--format", format)
		if code != exitOK {
			t.Errorf("%s: exit %d\n%s", format, code, errOut)
		}
		ext := map[string]string{"table": "txt", "json": "json", "markdown": "md"}[format]
		checkGolden(t, "validate/small."+ext, []byte(out))
	}
}

// TestValidateBundledCLI: the shipped check set runs and agrees with its record (the
// per-case assertions are in package fmo).
func TestValidateBundledCLI(t *testing.T) {
	out, errOut, code := runCLI(t, "", "validate", "--format", "json", "--strict")
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, errOut)
	}
	var rep struct {
		Agrees     bool `json:"agrees_with_record"`
		Categories []struct {
			Category string `json:"category"`
			Total    int    `json:"total"`
		} `json:"categories"`
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	if !rep.Agrees || len(rep.Categories) != 4 {
		t.Errorf("agrees %v, %d categories", rep.Agrees, len(rep.Categories))
	}
}

// TestValidateStrict: a record that says "known miss" for a case the method gets right makes
// --strict exit 1 (so stale records are noticed); without --strict the run succeeds.
func TestValidateStrict(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("testdata", "validate", "small.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	stale := strings.Replace(string(data), "  confidence: from memory\n- id: endo-06", "  confidence: from memory\n  known_miss: \"stale record\"\n- id: endo-06", 1)
	path := filepath.Join(t.TempDir(), "stale.yaml")
	if err := os.WriteFile(path, []byte(stale), 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, code := runCLI(t, "", "validate", "--cases", path)
	if code != exitOK || !strings.Contains(out, "regio-01 [unexpected hit]") {
		t.Errorf("non-strict: exit %d\n%s", code, out)
	}
	_, errOut, code := runCLI(t, "", "validate", "--cases", path, "--strict")
	if code != exitPartial || !strings.Contains(errOut, "1 of 3 inputs failed") {
		t.Errorf("strict: exit %d, stderr %q", code, errOut)
	}
	bad := filepath.Join(t.TempDir(), "bad.yaml")
	if err := os.WriteFile(bad, []byte(strings.Replace(string(data), "category: regio", "category: regiox", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code = runCLI(t, "", "validate", "--cases", bad)
	if code != exitUsage || !strings.Contains(errOut, `bad.yaml: 5:13: regio-01: unknown category "regiox"`) {
		t.Errorf("bad check set: exit %d, stderr %q", code, errOut)
	}
}
