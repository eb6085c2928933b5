package molfile

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"cyclopair/huckel/molecule"
)

// DefaultMaxRecordBytes is the size cap of one record (molfile plus data items) when
// Options.MaxRecordBytes is 0: a V2000 molfile of the largest size the format allows (999
// atoms and bonds) takes about 85 kB, so 1 MiB leaves room for V3000 records and data items
// while a file that is not an SD file at all (one endless line, a binary file) is refused
// after reading 1 MiB of it instead of filling memory.
const DefaultMaxRecordBytes = 1 << 20

// maxErrorsPerRecord is how many problems one record reports before the rest are dropped.
const maxErrorsPerRecord = 20

// Options control reading. The zero value (or a nil *Options) reads with the defaults.
type Options struct {
	// NameProp names an SD data item whose value (its first line, trimmed) becomes
	// Molecule.Name instead of the title line. A record without that item, or with an
	// empty value, keeps its title as the name.
	NameProp string
	// KeepHydrogens keeps every hydrogen atom of the file as an atom of the graph, as the
	// SMILES reader keeps [H] atoms. By default plain hydrogen atoms (neutral, no isotope,
	// no atom map, one single bond to an atom that is not hydrogen) are folded into their
	// neighbour's Atom.HCount, as if the file had left them implicit; see FoldHydrogens.
	KeepHydrogens bool
	// MaxRecordBytes caps the size of one record; 0 means DefaultMaxRecordBytes. A larger
	// record is skipped with an ErrTooLarge error and reading goes on after its "$$$$".
	MaxRecordBytes int
}

// Prop is one SD data item: the name between the angle brackets of its header line and
// the value lines, joined with "\n".
type Prop struct {
	Name, Value string
}

// Point3 is an atom position as written in the file (ångström by convention).
type Point3 struct{ X, Y, Z float64 }

// Record is one molecule read from a molfile or an SD file.
type Record struct {
	// Mol is the molecular graph, as the SMILES reader would build it: Kekulé bond orders,
	// charges, isotopes, atom maps, hydrogen counts. Atoms keep the file order (without
	// the folded hydrogens). Mol.Name is the title or the NameProp item; Mol.Source is
	// the Kekulé SMILES smiles.Write gives for the graph (its atom order is the writer's,
	// not the file's), and every Atom.Pos is -1. Atom.Aromatic and Bond.Aromatic mark
	// atoms and bonds written with bond type 4.
	Mol       *molecule.Molecule
	Title     string   // header line 1, trimmed
	Props     []Prop   // SD data items in file order
	Coords    []Point3 // one per atom of Mol, as written in the file
	FileAtoms []int    // one per atom of Mol: its 1-based atom number in the file
	Version   string   // "V2000" or "V3000"
	Index     int      // 1-based record number in the file
	Line      int      // 1-based line number of the record's title line
	Notes     []string // what was read and ignored (stereo marks, query fields, S-groups)
}

// Prop returns the value of the first data item called name.
func (r *Record) Prop(name string) (string, bool) {
	for _, p := range r.Props {
		if p.Name == name {
			return p.Value, true
		}
	}
	return "", false
}

// Reader reads the records of a molfile or an SD file one at a time, in the manner of
// encoding/csv: Read returns the next record, a record error (go on with the next Read),
// another error (stop), or io.EOF.
type Reader struct {
	br   *bufio.Reader
	opts Options
	line int   // lines consumed so far
	rec  int   // records returned so far
	err  error // sticky error of the underlying reader (io.EOF at the end)
	buf  []byte
	offs []int
}

// NewReader returns a reader of r with the given options (nil for the defaults).
func NewReader(r io.Reader, opts *Options) *Reader {
	rd := &Reader{br: bufio.NewReaderSize(r, 64<<10)}
	if opts != nil {
		rd.opts = *opts
	}
	if rd.opts.MaxRecordBytes <= 0 {
		rd.opts.MaxRecordBytes = DefaultMaxRecordBytes
	}
	return rd
}

// Read returns the next record. At the end of the input it returns (nil, io.EOF). A record
// that cannot be read gives (nil, err) with err an *Error or an ErrorList naming the
// record, its line and what is wrong; the reader has then moved past that record's "$$$$"
// and the next Read goes on with the following record. An error of the underlying
// io.Reader is returned as it is and ends reading.
func (r *Reader) Read() (*Record, error) {
	for {
		if r.err != nil && r.err != io.EOF {
			return nil, r.err
		}
		first := r.line + 1
		text, offs, tooBig, terminated, err := r.collect()
		if err != nil {
			r.err = err
			return nil, err
		}
		blank := strings.TrimSpace(text) == ""
		if !terminated && blank && !tooBig {
			r.err = io.EOF
			return nil, io.EOF
		}
		r.rec++
		if tooBig {
			return nil, &Error{Record: r.rec, Line: first, Col: 1, Err: ErrTooLarge,
				Msg:  fmt.Sprintf("record is larger than %d bytes", r.opts.MaxRecordBytes),
				Hint: "records end at a line \"$$$$\"; check that this is an SD file, or raise the size cap"}
		}
		if blank {
			return nil, &Error{Record: r.rec, Line: first, Col: 1, Err: ErrEmpty,
				Msg: "empty record", Hint: "remove the extra \"$$$$\" line"}
		}
		p := recParser{text: text, offs: offs, first: first, index: r.rec, opts: &r.opts}
		return p.parse()
	}
}

// collect reads the lines of one record, up to and without its "$$$$" line, into one
// string (lines joined by '\n', line breaks and trailing '\r' removed) and the offsets at
// which lines start. tooBig is set when the record passed the size cap (the text is then
// incomplete); terminated when a "$$$$" line ended it.
func (r *Reader) collect() (text string, offs []int, tooBig, terminated bool, err error) {
	buf := r.buf[:0]
	r.offs = r.offs[:0]
	limit := r.opts.MaxRecordBytes
	for {
		line, over, lerr := r.readLine(limit + 1)
		if lerr == io.EOF {
			break
		}
		if lerr != nil {
			return "", nil, false, false, lerr
		}
		r.line++
		if isTerminator(line) {
			terminated = true
			break
		}
		if tooBig {
			continue
		}
		if over || len(buf)+len(line)+1 > limit {
			tooBig = true
			continue
		}
		r.offs = append(r.offs, len(buf))
		buf = append(buf, line...)
		buf = append(buf, '\n')
	}
	if cap(buf) <= 1<<16 {
		r.buf = buf // keep small buffers for the next record
	}
	return string(buf), r.offs, tooBig, terminated, nil
}

// isTerminator reports whether line is an SD record separator "$$$$" (trailing blanks
// allowed).
func isTerminator(line []byte) bool {
	return len(line) >= 4 && string(line[:4]) == "$$$$" && len(bytes.TrimRight(line[4:], " \t")) == 0
}

// readLine returns the next line without its line break (and without a trailing '\r'). A
// line longer than limit is cut and reported with over. It returns io.EOF only when no
// byte is left.
func (r *Reader) readLine(limit int) (line []byte, over bool, err error) {
	if r.err == io.EOF {
		return nil, false, io.EOF
	}
	var acc []byte
	for {
		frag, e := r.br.ReadSlice('\n')
		if len(acc)+len(frag) > limit {
			over = true
			if room := limit - len(acc); room > 0 {
				acc = append(acc, frag[:room]...)
			}
		} else {
			acc = append(acc, frag...)
		}
		if e == bufio.ErrBufferFull {
			continue
		}
		if e != nil {
			if e != io.EOF {
				return nil, false, e
			}
			r.err = io.EOF
			if len(acc) == 0 && !over {
				return nil, false, io.EOF
			}
		}
		break
	}
	acc = bytes.TrimSuffix(acc, []byte{'\n'})
	acc = bytes.TrimSuffix(acc, []byte{'\r'})
	return acc, over, nil
}

// ReadAll reads every record of r. It keeps going after a bad record: the result holds the
// good records in file order and, when some records were bad, an ErrorList with their
// problems (ErrorList.Records lists the bad record numbers). An error of the underlying
// io.Reader stops reading and is returned with the records read so far.
func ReadAll(r io.Reader, opts *Options) ([]*Record, error) {
	rd := NewReader(r, opts)
	var out []*Record
	var errs ErrorList
	for {
		rec, err := rd.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var e *Error
			var l ErrorList
			switch {
			case errors.As(err, &l):
				errs = append(errs, l...)
			case errors.As(err, &e):
				errs = append(errs, e)
			default:
				return out, err
			}
			continue
		}
		out = append(out, rec)
	}
	return out, errs.Err()
}

// truncateUTF8 cuts s to at most n bytes without splitting a character.
func truncateUTF8(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n]
}

// cleanText makes a title or data value safe to carry around: invalid UTF-8 becomes U+FFFD.
func cleanText(s string) string {
	if utf8.ValidString(s) {
		return s
	}
	return strings.ToValidUTF8(s, "\uFFFD")
}
