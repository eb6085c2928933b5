package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// notesKeys matches the partners' notes keys of a JSON Lines row.
var notesKeys = regexp.MustCompile(`"(diene|dienophile)_notes":"(?:[^"\\]|\\.)*",`)

// withoutNotes drops the partners' notes (the last two CSV columns, the two JSON keys) from
// a screen's CSV or JSON Lines output: the lists being compared hold the same molecules and
// names, but only some formats carry extra columns / data items as notes.
func withoutNotes(t *testing.T, format, out string) string {
	t.Helper()
	if format == "json" {
		return notesKeys.ReplaceAllString(out, "")
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatalf("reading the CSV output: %v", err)
	}
	var b strings.Builder
	w := csv.NewWriter(&b)
	if h := recs[0]; len(h) < 2 || h[len(h)-2] != "diene_notes" || h[len(h)-1] != "dienophile_notes" {
		t.Fatalf("CSV header does not end with the notes columns: %v", h)
	}
	for _, r := range recs {
		_ = w.Write(r[:len(r)-2])
	}
	w.Flush()
	return b.String()
}

// Issue 12: a .smi file whose names contain commas and spaces screens every row, and CSV
// files with the columns in either order give the same screen.
func TestScreenListFormats(t *testing.T) {
	base := []string{"screen", "--dienes", "../../testdata/lists/dienes.smi", "--format", "csv", "--rank-by", "none"}
	smi, errOut, code := runCLI(t, "", append(base, "--dienophiles", "../../testdata/lists/dienophiles.smi")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if n := strings.Count(smi, "\n"); n < 1+4*3 {
		t.Fatalf("%d lines, want a header and 12 pairs:\n%s", n, smi)
	}
	for _, name := range []string{"\"1,3-butadiene\"", "\"1-methoxybuta-1,3-diene, trans\"", "maleic anhydride"} {
		if !strings.Contains(smi, name) {
			t.Errorf("output lacks %s", name)
		}
	}
	strip := func(s string) string { // the source column names the files
		var out []string
		for _, l := range strings.Split(s, "\n") {
			out = append(out, strings.ReplaceAll(strings.ReplaceAll(l, "dienophiles.smi", "F"), "dienophiles_name_first.csv", "F"))
		}
		return strings.ReplaceAll(strings.Join(out, "\n"), "dienophiles.csv", "F")
	}
	for _, f := range []string{"dienophiles.csv", "dienophiles_name_first.csv"} {
		out, errOut, code := runCLI(t, "", append(base, "--dienophiles", "../../testdata/lists/"+f)...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", f, code, errOut)
		}
		if strip(withoutNotes(t, "csv", out)) != strip(withoutNotes(t, "csv", smi)) {
			t.Errorf("%s: screen differs from the SMILES file's:\n%s\nwant\n%s", f, out, smi)
		}
	}
	// --input-format overrides the extension; an unknown extension asks for it.
	_, errOut, code = runCLI(t, "", "screen", "--dienes", "../../testdata/lists/dienes.smi", "--dienophiles", "../../testdata/lists/dienophiles.csv", "--input-format", "smiles")
	if code == 0 {
		t.Errorf("CSV read as SMILES should fail its rows; stderr %s", errOut)
	}
	_, errOut, code = runCLI(t, "", "screen", "--dienes", "../../testdata/lists/dienes.smi", "--dienophiles", "../../testdata/lists/README.md")
	if code != 2 || !strings.Contains(errOut, "--input-format") {
		t.Errorf("unknown extension: exit %d, %s", code, errOut)
	}
	_, errOut, code = runCLI(t, "", append(base, "--dienophiles", "../../testdata/lists/dienophiles.smi", "--input-format", "xml")...)
	if code != 2 || !strings.Contains(errOut, "--input-format") {
		t.Errorf("bad --input-format: exit %d, %s", code, errOut)
	}
}

// Issue 12: a CSV list's extra columns are kept as the row's notes and reach the screen's
// rows: diene_notes/dienophile_notes keys in JSON Lines (omitted when empty), the last two
// CSV columns (empty cells when there are none).
func TestScreenListNotes(t *testing.T) {
	dir := t.TempDir()
	list := filepath.Join(dir, "dienophiles.csv")
	body := "supplier,smiles,name,lot\n" +
		"Acme Fine Chemicals,C=CC=O,acrolein,L-17\n" +
		"\"Fine, Pure & Co\",C=CC(=O)OC,methyl acrylate,\n"
	if err := os.WriteFile(list, []byte(body), 0o600); err != nil {
		t.Fatal(err)
	}
	args := []string{"screen", "--dienes", "../../testdata/lists/dienes.smi", "--dienophiles", list, "--rank-by", "none", "--top", "0"}
	out, errOut, code := runCLI(t, "", append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("json: exit %d: %s", code, errOut)
	}
	want := map[string]string{"acrolein": "supplier: Acme Fine Chemicals; lot: L-17", "methyl acrylate": "supplier: Fine, Pure & Co"}
	seen := map[string]int{}
	for _, line := range strings.Split(strings.TrimSpace(out), "\n") {
		var row map[string]any
		if err := json.Unmarshal([]byte(line), &row); err != nil {
			t.Fatalf("json row: %v\n%s", err, line)
		}
		name, _ := row["dienophile_name"].(string)
		if got, _ := row["dienophile_notes"].(string); got != want[name] {
			t.Errorf("json %s: dienophile_notes %q, want %q", name, got, want[name])
		}
		if _, ok := row["diene_notes"]; ok {
			t.Errorf("json %s: diene_notes present for a SMILES list without notes", name)
		}
		seen[name]++
	}
	if seen["acrolein"] == 0 || seen["methyl acrylate"] == 0 {
		t.Fatalf("json rows %v, want both dienophiles", seen)
	}
	out, errOut, code = runCLI(t, "", append(args, "--format", "csv")...)
	if code != 0 {
		t.Fatalf("csv: exit %d: %s", code, errOut)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	h := recs[0]
	n := len(h)
	if h[n-2] != "diene_notes" || h[n-1] != "dienophile_notes" {
		t.Fatalf("CSV header ends %v, want diene_notes,dienophile_notes", h[n-2:])
	}
	col := map[string]int{}
	for i, c := range h {
		col[c] = i
	}
	for _, r := range recs[1:] {
		name := r[col["dienophile_name"]]
		if r[n-1] != want[name] || r[n-2] != "" {
			t.Errorf("csv %s: notes %q, %q; want \"\", %q", name, r[n-2], r[n-1], want[name])
		}
	}
	if rows := len(recs) - 1; rows != seen["acrolein"]+seen["methyl acrylate"] {
		t.Errorf("csv has %d rows, json %d", rows, seen["acrolein"]+seen["methyl acrylate"])
	}
}

// Issue 12: an SD file of the same molecules (written by RDKit, scripts/gen_list_sdf.py;
// dienes V2000, dienophiles V3000) gives byte-identical screen output to the SMILES files,
// with the names from the <name> data item. The table's header names the input files, so
// the comparison is on the row formats (CSV, JSON Lines).
func TestScreenSDEqualsSMILES(t *testing.T) {
	for _, format := range []string{"csv", "json"} {
		smi, errA, codeA := runCLI(t, "", "screen", "--dienes", "../../testdata/lists/dienes.smi", "--dienophiles", "../../testdata/lists/dienophiles.smi",
			"--activate", "none,lewis", "--format", format)
		sdf, errB, codeB := runCLI(t, "", "screen", "--dienes", "../../testdata/lists/dienes.sdf", "--dienophiles", "../../testdata/lists/dienophiles.sdf",
			"--name-field", "name", "--activate", "none,lewis", "--format", format)
		if codeA != 0 || codeB != 0 {
			t.Fatalf("%s: exit %d %d: %s %s", format, codeA, codeB, errA, errB)
		}
		if withoutNotes(t, format, smi) != withoutNotes(t, format, sdf) || strings.Count(smi, "\n") < 24 {
			t.Errorf("%s: SD screen differs from the SMILES screen:\n%s\nwant\n%s", format, sdf, smi)
		}
	}
	// Without --name-field the title line names the rows.
	out, _, code := runCLI(t, "", "screen", "--dienes", "../../testdata/lists/dienes.sdf", "--dienophiles", "../../testdata/lists/dienophiles.sdf", "--format", "csv")
	if code != 0 || !strings.Contains(out, "CP-0001") || !strings.Contains(out, "CP-0007") {
		t.Errorf("titles as names: exit %d\n%s", code, out)
	}
}

// 'orbitals -' reads stdin with the same list reader when --input-format names a format:
// the SD file gives the output of the SMILES file (names from <name>).
func TestOrbitalsListFormats(t *testing.T) {
	read := func(p string) string {
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	smi, _, code := runCLI(t, read("../../testdata/lists/dienophiles.smi"), "orbitals", "-", "--format", "csv")
	if code != 0 || strings.Count(smi, "\n") != 4 {
		t.Fatalf("smiles: exit %d\n%s", code, smi)
	}
	for _, c := range [][]string{
		{"dienophiles.sdf", "--input-format", "sdf", "--name-field", "name"},
		{"dienophiles.csv", "--input-format", "csv"},
	} {
		out, errOut, code := runCLI(t, read("../../testdata/lists/"+c[0]), append([]string{"orbitals", "-", "--format", "csv"}, c[1:]...)...)
		if code != 0 || out != smi {
			t.Errorf("%s: exit %d %s\n%s\nwant\n%s", c[0], code, errOut, out, smi)
		}
	}
}
