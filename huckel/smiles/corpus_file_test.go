package smiles

import (
	"flag"
	"os"
	"strconv"
	"strings"
	"testing"
)

var writeCorpus = flag.Bool("writecorpus", false, "rewrite ../../testdata/smiles/malformed.txt from the malformed table")

// corpusFile lists the inputs of the malformed table, one Go-quoted string per line, for the
// CLI tests in cmd/cyclopair (which check exit code 2 and the one-line error for each).
const corpusFile = "../../testdata/smiles/malformed.txt"

// TestMalformedCorpusFile keeps the shared file and the table in step: refresh with
// go test ./huckel/smiles -run TestMalformedCorpusFile -writecorpus.
func TestMalformedCorpusFile(t *testing.T) {
	var want strings.Builder
	want.WriteString("# Malformed SMILES, one Go-quoted string per line; generated from the malformed table in\n")
	want.WriteString("# huckel/smiles/errors_test.go by: go test ./huckel/smiles -run TestMalformedCorpusFile -writecorpus\n")
	for _, tc := range malformed {
		want.WriteString(strconv.Quote(tc.in) + "\n")
	}
	if *writeCorpus {
		if err := os.WriteFile(corpusFile, []byte(want.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	got, err := os.ReadFile(corpusFile)
	if err != nil {
		t.Fatal(err)
	}
	if string(got) != want.String() {
		t.Errorf("%s is out of step with the malformed table (rerun with -writecorpus)", corpusFile)
	}
}
