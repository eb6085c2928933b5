package substrates

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"strings"

	"cyclopair/huckel/molfile"
	"cyclopair/huckel/yamlfile"
)

// ErrBadStructure wraps every bad record of an SD or molfile list (the *molfile.Error is
// the Cause: record number, title, line, column, atom).
var ErrBadStructure = errors.New("bad molfile record")

// loadSD reads an SD file or a single molfile with huckel/molfile: each record is a row
// named by its title line (or the SD property o.NameField; a record without it keeps its
// title, and an untitled one its SMILES), with the other SD properties as notes. The row's
// SMILES is the Kekulé SMILES of the graph read (molfile.Record: Mol.Source). A bad record
// is one bad row positioned at its line, with its record number; the others load.
func loadSD(r io.Reader, name string, o ListOptions) (subs []Substrate, bad yamlfile.ErrorList, err error) {
	data, err := readCapped(r, name, o.MaxBytes)
	if err != nil {
		return nil, nil, err
	}
	if e := yamlfile.CheckUTF8(data, name, ErrNotUTF8); e != nil {
		return nil, nil, e
	}
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	rd := molfile.NewReader(bytes.NewReader(data), &molfile.Options{NameProp: o.NameField})
	names := map[string]int{}
	for {
		rec, err := rd.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var list molfile.ErrorList
			var one *molfile.Error
			switch {
			case errors.As(err, &list):
			case errors.As(err, &one):
				list = molfile.ErrorList{one}
			default:
				return subs, bad, &yamlfile.Error{File: name, Msg: "cannot read: " + err.Error(), Err: ErrFileSyntax, Cause: err}
			}
			for _, e := range list {
				bad = append(bad, &yamlfile.Error{File: name, Line: e.Line, Col: e.Col, Path: recordPath(e.Record, e.Title),
					Msg: e.Msg, Hint: e.Hint, Err: ErrBadStructure, Cause: e})
			}
			if len(bad) > 1000 {
				return subs, bad, nil
			}
			continue
		}
		s := Substrate{Name: strings.TrimSpace(rec.Mol.Name), SMILES: rec.Mol.Source, Mol: rec.Mol, File: name, Line: rec.Line, Col: 1}
		if s.Name == "" {
			s.Name = s.SMILES
		}
		path := recordPath(rec.Index, rec.Title)
		fe := func(kind error, msg, hint string) {
			bad = append(bad, &yamlfile.Error{File: name, Line: rec.Line, Col: 1, Path: path, Msg: msg, Hint: hint, Err: kind})
		}
		if e := checkName(s.Name); e != "" {
			fe(ErrBadValue, e, "")
			continue
		}
		if first, dup := names[s.Name]; dup {
			fe(ErrDuplicateName, fmt.Sprintf("name %q already used by record %d", short(s.Name), first), "make names unique")
			continue
		}
		if len(subs) >= maxRows {
			fe(ErrBadValue, fmt.Sprintf("more than %d records", maxRows), "split the screen")
			break
		}
		var notes []string
		for _, p := range rec.Props {
			if p.Name == o.NameField || strings.TrimSpace(p.Value) == "" {
				continue
			}
			notes = append(notes, p.Name+": "+strings.ReplaceAll(strings.TrimSpace(p.Value), "\n", " "))
		}
		s.Notes = clipNotes(strings.Join(notes, "; "))
		rec.Mol.Name = s.Name
		names[s.Name] = rec.Index
		subs = append(subs, s)
	}
	return subs, bad, nil
}

// recordPath names a record in messages: "record 3 (aniline)".
func recordPath(index int, title string) string {
	if title = strings.TrimSpace(title); title != "" {
		return fmt.Sprintf("record %d (%s)", index, short(title))
	}
	return fmt.Sprintf("record %d", index)
}
