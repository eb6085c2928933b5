package molfile

import (
	"bytes"
	"errors"
	"os"
	"strings"
	"testing"

	"cyclopair/huckel/depict"
	"cyclopair/huckel/smiles"
)

// fuzzSeeds adds every record of the fixture SD files and the texts of the unit tests.
func fuzzSeeds(f *testing.F) {
	for _, path := range []string{v2000Path, v3000Path, extraPath} {
		data, err := os.ReadFile(path)
		if err != nil {
			f.Fatal(err)
		}
		for _, rec := range strings.SplitAfter(string(data), "$$$$\n") {
			if strings.TrimSpace(rec) != "" {
				f.Add(rec)
			}
		}
	}
	for _, s := range []string{ethane, ethanol, pyridineArom, v3000Example, ethane + "$$$$\n" + ethanol, "$$$$\n", "C=CC=C\n"} {
		f.Add(s)
	}
}

var sentinels = []error{ErrEmpty, ErrSyntax, ErrUnknownElement, ErrKekulize, ErrValence, ErrRadical, ErrTruncated, ErrUnsupported, ErrTooLarge}

// FuzzRead: reading never panics; every problem is a positioned *Error inside the input
// wrapping one of the sentinels; every molecule read is a valid graph whose Source the
// SMILES reader accepts, and survives the writer and the reader unchanged.
func FuzzRead(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, s string) {
		if len(s) > 1<<16 {
			return
		}
		nlines := strings.Count(s, "\n") + 1
		recs, err := ReadAll(strings.NewReader(s), &Options{KeepHydrogens: true, MaxRecordBytes: 1 << 15})
		if err != nil {
			var l ErrorList
			if !errors.As(err, &l) {
				var e *Error
				if !errors.As(err, &e) {
					t.Fatalf("error %T %v", err, err)
				}
				l = ErrorList{e}
			}
			for _, e := range l {
				if e.Record < 1 || e.Line < 1 || e.Line > nlines || e.Col < 1 || e.Msg == "" {
					t.Fatalf("bad position or message: %+v", e)
				}
				found := false
				for _, s := range sentinels {
					found = found || e.Err == s
				}
				if !found {
					t.Fatalf("unknown sentinel in %v", e)
				}
			}
		}
		for _, r := range recs {
			m := r.Mol
			if len(r.Coords) != len(m.Atoms) || len(r.FileAtoms) != len(m.Atoms) || len(m.Atoms) == 0 {
				t.Fatalf("record %d: %d atoms, %d coordinates", r.Index, len(m.Atoms), len(r.Coords))
			}
			for _, b := range m.Bonds {
				if b.Order < 1 || b.Order > 3 {
					t.Fatalf("record %d: bond order %d", r.Index, b.Order)
				}
			}
			for _, a := range m.Atoms {
				if a.HCount < 0 || smiles.AtomicNumber(a.Element) == 0 {
					t.Fatalf("record %d: atom %+v", r.Index, a)
				}
			}
			back, err := smiles.Parse(m.Source)
			if err != nil {
				t.Fatalf("record %d: Source %q does not parse: %v", r.Index, m.Source, err)
			}
			if len(back.Atoms) != len(m.Atoms) {
				t.Fatalf("record %d: Source %q has %d atoms, the record %d", r.Index, m.Source, len(back.Atoms), len(m.Atoms))
			}
			if len(m.Atoms) > 999 || len(m.Bonds) > 999 {
				continue
			}
			pos := make([]depict.Point, len(m.Atoms))
			for i, c := range r.Coords {
				pos[i] = depict.Point{X: c.X / BondLength, Y: c.Y / BondLength}
			}
			b, err := Marshal(m, pos)
			if err != nil {
				if errors.Is(err, ErrWrite) && (strings.Contains(err.Error(), "does not fit") || strings.Contains(err.Error(), "atom map")) {
					continue // coordinates or maps beyond what V2000 holds
				}
				t.Fatalf("record %d: %v", r.Index, err)
			}
			again, err := ReadAll(bytes.NewReader(b), &Options{KeepHydrogens: true})
			if err != nil || len(again) != 1 {
				t.Fatalf("record %d: our output does not read back: %v\n%s", r.Index, err, b)
			}
			if d := sameGraph(m, again[0].Mol); d != "" {
				t.Fatalf("record %d: written and read back: %s\n%s", r.Index, d, b)
			}
		}
	})
}
