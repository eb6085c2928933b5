package substrates

import (
	"errors"
	"strings"
	"testing"
)

// Issue 12: a SMILES file whose names contain commas and spaces (as real names do) was
// taken for CSV and every row failed. The format now comes from the extension.
func TestSMILESNamesWithCommas(t *testing.T) {
	src := "C=CC=C 1,3-butadiene\nC1=CC=CC1\tcyclopenta-1,3-diene, freshly cracked\nCC(=C)C(C)=C 2,3-dimethylbuta-1,3-diene\n"
	for _, name := range []string{"d.smi", "d.smiles", "d.txt", "-"} {
		subs, bad, err := LoadList(strings.NewReader(src), name, 4, 0)
		if err != nil || len(bad) > 0 {
			t.Fatalf("%s: err %v, bad %v", name, err, bad)
		}
		want := []string{"1,3-butadiene", "cyclopenta-1,3-diene, freshly cracked", "2,3-dimethylbuta-1,3-diene"}
		if len(subs) != len(want) {
			t.Fatalf("%s: %d rows, want %d", name, len(subs), len(want))
		}
		for i, w := range want {
			if subs[i].Name != w {
				t.Errorf("%s row %d: name %q, want %q", name, i, subs[i].Name, w)
			}
		}
	}
}

// A CSV header names the columns in any order; other columns become notes.
func TestCSVColumnsAnyOrder(t *testing.T) {
	srcs := map[string]string{
		"name first":   "name,smiles,supplier\n\"1,3-butadiene\",C=CC=C,ACME\ncpd,C1=CC=CC1,\n",
		"smiles first": "SMILES,supplier,Name\nC=CC=C,ACME,\"1,3-butadiene\"\nC1=CC=CC1,,cpd\n",
	}
	for label, src := range srcs {
		subs, bad, err := LoadList(strings.NewReader(src), "x.csv", 4, 0)
		if err != nil || len(bad) > 0 || len(subs) != 2 {
			t.Fatalf("%s: %d rows, err %v, bad %v", label, len(subs), err, bad)
		}
		if subs[0].Name != "1,3-butadiene" || subs[0].SMILES != "C=CC=C" || subs[1].Name != "cpd" {
			t.Errorf("%s: rows %+v", label, subs)
		}
		if !strings.EqualFold(subs[0].Notes, "supplier: ACME") || subs[1].Notes != "" {
			t.Errorf("%s: notes %q, %q", label, subs[0].Notes, subs[1].Notes)
		}
	}
	// TSV: the same with tabs; names may contain commas unquoted.
	subs, bad, err := LoadList(strings.NewReader("smiles\tname\nC=CC=C\t1,3-butadiene\n"), "x.tsv", 4, 0)
	if err != nil || len(bad) > 0 || len(subs) != 1 || subs[0].Name != "1,3-butadiene" {
		t.Fatalf("tsv: %+v %v %v", subs, bad, err)
	}
	// A row with the wrong field count is positioned and the others load.
	subs, bad, _ = LoadList(strings.NewReader("smiles,name\nC=C,a\nC=CC=C\nC=CC,b\n"), "x.csv", 4, 0)
	if len(subs) != 2 || len(bad) != 1 || !strings.Contains(bad[0].Error(), "x.csv: 3:1: 1 fields, want 2") {
		t.Errorf("short row: %d rows, bad %v", len(subs), bad)
	}
}

func TestFormatOf(t *testing.T) {
	for name, want := range map[string]Format{"a.smi": FormatSMILES, "A.SMILES": FormatSMILES, "b.txt": FormatSMILES,
		"-": FormatSMILES, "c.csv": FormatCSV, "d.tsv": FormatTSV, "e.sdf": FormatSD, "f.mol": FormatSD, "g.sd": FormatSD} {
		if got, err := FormatOf(name); err != nil || got != want {
			t.Errorf("FormatOf(%q) = %q, %v; want %q", name, got, err, want)
		}
	}
	for _, name := range []string{"list", "x.xlsx"} {
		_, err := FormatOf(name)
		if !errors.Is(err, ErrUnknownFormat) || !strings.Contains(err.Error(), "--input-format") {
			t.Errorf("FormatOf(%q): err %v", name, err)
		}
	}
	// A named format wins over the extension: a .txt file read as CSV.
	subs, bad, err := LoadListAs(strings.NewReader("name,smiles\nx,C=C\n"), "l.txt", ListOptions{Format: FormatCSV})
	if err != nil || len(bad) > 0 || len(subs) != 1 || subs[0].Name != "x" {
		t.Errorf("--input-format csv: %+v %v %v", subs, bad, err)
	}
	if _, err := ParseFormat("xml"); !errors.Is(err, ErrUnknownFormat) {
		t.Errorf("ParseFormat(xml): %v", err)
	}
}

// SD lists: names from the title or a data item, other items as notes, a bad record
// positioned (line, record number, title) while the others load.
func TestLoadSD(t *testing.T) {
	rec := func(title, body, props string) string {
		return title + "\n  test\n\n" + body + "M  END\n" + props + "$$$$\n"
	}
	ethene := "  2  1  0  0  0  0  0  0  0  0999 V2000\n" +
		"    0.0000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0\n" +
		"    1.5000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0\n" +
		"  1  2  2  0\n"
	bad := strings.Replace(ethene, " C   0", " Xx  0", 1)
	src := rec("CP-1", ethene, ">  <name>\nethene, the simplest\n\n>  <lot>\nA7\n\n") + rec("CP-2", bad, "") + rec("CP-3", ethene, "")
	subs, errs, err := LoadList(strings.NewReader(src), "l.sdf", 2, 0)
	if err != nil || len(subs) != 2 || len(errs) != 1 {
		t.Fatalf("rows %d, bad %v, err %v", len(subs), errs, err)
	}
	if subs[0].Name != "CP-1" || subs[0].SMILES != "C=C" || subs[0].Notes != "name: ethene, the simplest; lot: A7" || subs[0].Line != 1 || subs[1].Line != 25 {
		t.Errorf("row 1: %+v", subs[0])
	}
	if e := errs[0].Error(); !strings.HasPrefix(e, "l.sdf: 20:32: record 2 (CP-2): atom 1: unknown element") || !strings.Contains(e, "record 2 (CP-2)") || !errors.Is(errs[0], ErrBadStructure) {
		t.Errorf("bad record: %q", e)
	}
	subs, _, _ = LoadListAs(strings.NewReader(src), "l.sdf", ListOptions{NameField: "name"})
	if subs[0].Name != "ethene, the simplest" || subs[0].Notes != "lot: A7" || subs[1].Name != "CP-3" {
		t.Errorf("--name-field: %q %q %q", subs[0].Name, subs[0].Notes, subs[1].Name)
	}
}
