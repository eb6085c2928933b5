package substrates

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"cyclopair/huckel/smiles"
	"cyclopair/huckel/yamlfile"
)

// LoadList reads one side of a screen from a CSV file (name,smiles rows, an optional header
// row "name,smiles") or a plain text file (one SMILES per line, optionally followed by
// whitespace and a name; blank lines and lines starting with # are skipped). The format is
// CSV when the first data line contains a comma. Each bad row is returned in bad; the good
// rows load. err is non-nil only when the text cannot be read at all.
func LoadList(r io.Reader, name string, pinMax int, maxBytes int64) (subs []Substrate, bad yamlfile.ErrorList, err error) {
	data, err := readCapped(r, name, maxBytes)
	if err != nil {
		return nil, nil, err
	}
	if e := yamlfile.CheckUTF8(data, name, ErrNotUTF8); e != nil {
		return nil, nil, e
	}
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	isCSV := false
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(make([]byte, 0, 64<<10), len(data)+1)
	for sc.Scan() {
		l := strings.TrimSpace(sc.Text())
		if l == "" || strings.HasPrefix(l, "#") {
			continue
		}
		isCSV = strings.Contains(l, ",")
		break
	}
	names := map[string]int{}
	add := func(line, col int, nm, smi string) {
		s := Substrate{Name: nm, SMILES: smi, File: name, Line: line, Col: col}
		if s.Name == "" {
			s.Name = smi
		}
		fe := func(kind error, msg, hint string, c int) {
			bad = append(bad, &yamlfile.Error{File: name, Line: line, Col: c, Msg: msg, Hint: hint, Err: kind})
		}
		if e := checkName(s.Name); e != "" {
			fe(ErrBadValue, e, "", col)
			return
		}
		if len(smi) > maxSMILESBytes {
			fe(ErrBadValue, fmt.Sprintf("SMILES longer than %d bytes", maxSMILESBytes), "", col)
			return
		}
		if first, dup := names[s.Name]; dup {
			fe(ErrDuplicateName, fmt.Sprintf("name %q already used on line %d", short(s.Name), first), "make names unique", col)
			return
		}
		m, err := smiles.Parse(smi)
		if err != nil {
			e := badSMILES(name, line, col, fmt.Sprintf("%q", short(s.Name)), smi, err)
			if se := smilesErr(err); se != nil {
				e.Col += se.Pos
			}
			bad = append(bad, e)
			return
		}
		m.Name = s.Name
		s.Mol = m
		names[s.Name] = line
		subs = append(subs, s)
	}
	if isCSV {
		// One record per line: a malformed line (an unterminated quote, a stray quote) is
		// listed with its line and the reader goes on at the next line, so one bad quote
		// cannot swallow the rows after it. Quoted fields therefore cannot span lines
		// (a name or a SMILES never holds a line break).
		first := true
		lineNo := 0
		sc := bufio.NewScanner(bytes.NewReader(data))
		sc.Buffer(make([]byte, 0, 64<<10), len(data)+1)
		for sc.Scan() {
			lineNo++
			raw := sc.Text()
			if t := strings.TrimSpace(raw); t == "" || strings.HasPrefix(t, "#") {
				continue
			}
			cr := csv.NewReader(strings.NewReader(raw))
			cr.FieldsPerRecord = -1
			cr.TrimLeadingSpace = true
			rec, err := cr.Read()
			if err != nil {
				col := 1
				var pe *csv.ParseError
				if errors.As(err, &pe) {
					col = pe.Column
					err = pe.Err
				}
				bad = append(bad, &yamlfile.Error{File: name, Line: lineNo, Col: col, Msg: "CSV: " + err.Error() + "; row skipped",
					Hint: "quote fields that contain commas or quotes; a quoted field ends on its line", Err: ErrFileSyntax})
				if len(bad) > 1000 {
					return subs, bad, nil
				}
				continue
			}
			_, col := cr.FieldPos(0)
			if first && len(rec) >= 2 && strings.EqualFold(strings.TrimSpace(rec[0]), "name") && strings.EqualFold(strings.TrimSpace(rec[1]), "smiles") {
				first = false
				continue
			}
			first = false
			if len(rec) != 2 {
				bad = append(bad, &yamlfile.Error{File: name, Line: lineNo, Col: col, Msg: fmt.Sprintf("%d fields, want 2 (name,smiles)", len(rec)),
					Err: ErrBadValue})
				continue
			}
			_, scol := cr.FieldPos(1)
			add(lineNo, scol, strings.TrimSpace(rec[0]), strings.TrimSpace(rec[1]))
		}
		if err := sc.Err(); err != nil {
			return subs, bad, &yamlfile.Error{File: name, Msg: err.Error(), Err: ErrFileSyntax, Cause: err}
		}
		return subs, bad, nil
	}
	lineNo := 0
	sc = bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(make([]byte, 0, 64<<10), len(data)+1)
	for sc.Scan() {
		lineNo++
		raw := sc.Text()
		l := strings.TrimSpace(raw)
		if l == "" || strings.HasPrefix(l, "#") {
			continue
		}
		col := 1 + utf8.RuneCountInString(raw[:strings.Index(raw, l)])
		smi, nm, _ := strings.Cut(l, " ")
		if i := strings.IndexAny(smi, "\t"); i >= 0 {
			smi, nm = smi[:i], smi[i+1:]+" "+nm
		}
		add(lineNo, col, strings.TrimSpace(nm), smi)
	}
	if err := sc.Err(); err != nil {
		return subs, bad, &yamlfile.Error{File: name, Msg: err.Error(), Err: ErrFileSyntax, Cause: err}
	}
	return subs, bad, nil
}
