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

// loadText reads a SMILES line file, or a CSV or TSV file (FormatOf and Format document
// the layouts). The format is chosen by the caller, never by sniffing the content.
func loadText(r io.Reader, name string, format Format, pinMax int, maxBytes int64) (subs []Substrate, bad yamlfile.ErrorList, err error) {
	data, err := readCapped(r, name, maxBytes)
	if err != nil {
		return nil, nil, err
	}
	if e := yamlfile.CheckUTF8(data, name, ErrNotUTF8); e != nil {
		return nil, nil, e
	}
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	isCSV := format == FormatCSV || format == FormatTSV
	names := map[string]int{}
	add := func(line, col int, nm, smi, notes string) {
		s := Substrate{Name: nm, SMILES: smi, Notes: notes, File: name, Line: line, Col: col}
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
		var cols *csvColumns // from the header row; nil: name,smiles records
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
			if format == FormatTSV {
				cr.Comma = '\t'
			}
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
			if first {
				first = false
				if cols = headerColumns(rec); cols != nil {
					continue
				}
			}
			if cols != nil {
				if len(rec) != len(cols.header) {
					bad = append(bad, &yamlfile.Error{File: name, Line: lineNo, Col: col, Msg: fmt.Sprintf("%d fields, want %d (as in the header row)", len(rec), len(cols.header)),
						Err: ErrBadValue})
					continue
				}
				nm := ""
				if cols.name >= 0 {
					nm = strings.TrimSpace(rec[cols.name])
				}
				_, scol := cr.FieldPos(cols.smiles)
				add(lineNo, scol, nm, strings.TrimSpace(rec[cols.smiles]), cols.notes(rec))
				continue
			}
			if len(rec) != 2 {
				bad = append(bad, &yamlfile.Error{File: name, Line: lineNo, Col: col, Msg: fmt.Sprintf("%d fields, want 2 (name,smiles)", len(rec)),
					Hint: "or start the file with a header row naming the smiles and name columns", Err: ErrBadValue})
				continue
			}
			_, scol := cr.FieldPos(1)
			add(lineNo, scol, strings.TrimSpace(rec[0]), strings.TrimSpace(rec[1]), "")
		}
		if err := sc.Err(); err != nil {
			return subs, bad, &yamlfile.Error{File: name, Msg: err.Error(), Err: ErrFileSyntax, Cause: err}
		}
		return subs, bad, nil
	}
	lineNo := 0
	sc := bufio.NewScanner(bytes.NewReader(data))
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
		add(lineNo, col, strings.TrimSpace(nm), smi, "")
	}
	if err := sc.Err(); err != nil {
		return subs, bad, &yamlfile.Error{File: name, Msg: err.Error(), Err: ErrFileSyntax, Cause: err}
	}
	return subs, bad, nil
}

// csvColumns is the layout a CSV or TSV header row gives: the SMILES column, the name
// column (-1 when absent) and the header of every column (the others become notes).
type csvColumns struct {
	header       []string
	smiles, name int
}

// headerColumns reads rec as a header row: it is one when a field says "smiles" (any case).
// It returns nil for a data row.
func headerColumns(rec []string) *csvColumns {
	c := &csvColumns{smiles: -1, name: -1}
	for i, h := range rec {
		h = strings.TrimSpace(h)
		c.header = append(c.header, h)
		switch strings.ToLower(h) {
		case "smiles":
			if c.smiles < 0 {
				c.smiles = i
			}
		case "name":
			if c.name < 0 {
				c.name = i
			}
		}
	}
	if c.smiles < 0 {
		return nil
	}
	return c
}

// notes joins the other columns of rec as "column: value; ..." (empty values left out),
// at most maxNotesBytes long.
func (c *csvColumns) notes(rec []string) string {
	var b strings.Builder
	for i, v := range rec {
		v = strings.TrimSpace(v)
		if i == c.smiles || i == c.name || v == "" {
			continue
		}
		if b.Len() > 0 {
			b.WriteString("; ")
		}
		b.WriteString(c.header[i] + ": " + v)
	}
	return clipNotes(b.String())
}

// clipNotes cuts notes to at most maxNotesBytes (at a character boundary, with "…").
func clipNotes(n string) string {
	if len(n) > maxNotesBytes {
		cut := maxNotesBytes
		for cut > 0 && !utf8.RuneStart(n[cut]) {
			cut--
		}
		n = n[:cut] + "…"
	}
	return n
}
