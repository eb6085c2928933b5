package main

import (
	"bufio"
	"os"
	"strconv"
	"strings"
	"testing"
)

// TestMalformedSMILESCorpus runs every input of the shared malformed-SMILES corpus
// (testdata/smiles/malformed.txt, kept in step with the reader's own table) through the
// commands that take SMILES: each must end with exit code 2, nothing on stdout, and a first
// stderr line "cyclopair: <input>: column N: <what> (<hint>)" — never a panic or a trace.
func TestMalformedSMILESCorpus(t *testing.T) {
	f, err := os.Open("../../testdata/smiles/malformed.txt")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var corpus []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || line == "" {
			continue
		}
		s, err := strconv.Unquote(line)
		if err != nil {
			t.Fatalf("corpus line %q: %v", line, err)
		}
		corpus = append(corpus, s)
	}
	if len(corpus) < 40 {
		t.Fatalf("corpus has %d inputs, want at least 40", len(corpus))
	}
	for _, in := range corpus {
		for _, args := range [][]string{
			{"orbitals", in},
			{"pair", "--diene", in, "--dienophile", "C=C"},
			{"pair", "--diene", "C=CC=C", "--dienophile", in},
			{"draw", in},
		} {
			out, errOut, code := runCLI(t, "", args...)
			if code != exitUsage {
				t.Errorf("%q: exit %d, want %d (stderr %q)", args, code, exitUsage, errOut)
			}
			if out != "" {
				t.Errorf("%q: stdout %q, want nothing", args, out)
			}
			first, _, _ := strings.Cut(errOut, "\n")
			if in == "" && args[0] == "pair" {
				// an empty flag value is a missing flag: a usage error without a column
				if !strings.Contains(first, "required") {
					t.Errorf("%q: first stderr line %q, want the required-flag message", args, first)
				}
				continue
			}
			if !strings.HasPrefix(first, "cyclopair: ") || !strings.Contains(first, "column ") || !strings.HasSuffix(first, ")") {
				t.Errorf("%q: first stderr line %q, want cyclopair: <input>: column N: <what> (<hint>)", args, first)
			}
			if strings.Contains(errOut, "goroutine ") || strings.Contains(errOut, "panic") {
				t.Errorf("%q: stack trace on stderr: %s", args, errOut)
			}
		}
	}
}
