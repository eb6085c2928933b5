package substrates

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"cyclopair/huckel/yamlfile"
)

// Format is the layout of a substrate list file. It is chosen by the file's extension
// (FormatOf) or named by the user (ParseFormat, the CLI's --input-format), never guessed
// from the content: a SMILES file whose names contain commas ("1,3-butadiene") is not CSV.
type Format string

// The list formats.
const (
	// FormatSMILES: one molecule per line, the SMILES, whitespace, then the rest of the line
	// as the name (spaces and commas included). Blank lines and lines starting with # are
	// skipped. Extensions .smi, .smiles, .txt; stdin ("-") when no format is named.
	FormatSMILES Format = "smiles"
	// FormatCSV: comma-separated values. With a header row naming a "smiles" column (and
	// optionally a "name" column), in any order; other columns become the row's notes
	// ("column: value; ..."). Without such a header each record is name,smiles. Extension .csv.
	FormatCSV Format = "csv"
	// FormatTSV is FormatCSV separated by tabs. Extensions .tsv, .tab.
	FormatTSV Format = "tsv"
	// FormatSD: MDL molfiles (V2000 or V3000), one or many records separated by "$$$$";
	// the name is the title line or the SD property named by ListOptions.NameField.
	// Extensions .sdf, .sd, .mol.
	FormatSD Format = "sdf"
)

// Formats lists the list formats in the order help texts show them.
var Formats = []Format{FormatSMILES, FormatCSV, FormatTSV, FormatSD}

// ErrUnknownFormat: a list file whose format is neither named nor known from its extension.
var ErrUnknownFormat = errors.New("unknown list format")

// ParseFormat accepts a format name as a user writes it: smiles (smi, txt), csv, tsv,
// sdf (sd, mol). Case and a leading dot are ignored.
func ParseFormat(s string) (Format, error) {
	switch strings.TrimPrefix(strings.ToLower(strings.TrimSpace(s)), ".") {
	case "smiles", "smi", "txt":
		return FormatSMILES, nil
	case "csv":
		return FormatCSV, nil
	case "tsv", "tab":
		return FormatTSV, nil
	case "sdf", "sd", "mol":
		return FormatSD, nil
	}
	return "", fmt.Errorf("%w %q (choose smiles, csv, tsv or sdf)", ErrUnknownFormat, s)
}

// FormatOf is the format of a list file named name, from its extension; "-" (stdin) is
// FormatSMILES. A name without a known extension is an *yamlfile.Error wrapping
// ErrUnknownFormat whose hint names --input-format.
func FormatOf(name string) (Format, error) {
	if name == "-" {
		return FormatSMILES, nil
	}
	ext := filepath.Ext(name)
	if ext != "" {
		if f, err := ParseFormat(ext); err == nil {
			return f, nil
		}
	}
	what := "no extension"
	if ext != "" {
		what = fmt.Sprintf("extension %q", ext)
	}
	return "", &yamlfile.Error{File: name, Msg: "cannot tell the list format from the file name (" + what + ")",
		Hint: "name it .smi, .csv, .tsv or .sdf, or give --input-format smiles|csv|tsv|sdf", Err: ErrUnknownFormat}
}

// ListOptions tune LoadListAs.
type ListOptions struct {
	// Format of the list; "" chooses it from the name (FormatOf).
	Format Format
	// NameField, for FormatSD, is the SD property that holds the name ("" uses the title
	// line). A record without the property falls back to its title line, then to the SMILES.
	NameField string
	// PinMax is the largest number of pinned atoms a row may have (4 for dienes, 2 for
	// dienophiles).
	PinMax int
	// MaxBytes caps the file size; 0 means DefaultMaxFileBytes.
	MaxBytes int64
}

// LoadList reads one side of a screen from a list file in the format its name says
// (FormatOf). Each bad row is returned in bad; the good rows load. err is non-nil only when
// the text cannot be read at all.
func LoadList(r io.Reader, name string, pinMax int, maxBytes int64) (subs []Substrate, bad yamlfile.ErrorList, err error) {
	return LoadListAs(r, name, ListOptions{PinMax: pinMax, MaxBytes: maxBytes})
}

// LoadListAs reads one side of a screen from a list in the format o.Format (or, when empty,
// the format its name says). Each bad row is returned in bad, with its line (and, for SD
// files, its record number); the good rows load. err is non-nil only when the text cannot be
// read at all.
func LoadListAs(r io.Reader, name string, o ListOptions) (subs []Substrate, bad yamlfile.ErrorList, err error) {
	f := o.Format
	if f == "" {
		if f, err = FormatOf(name); err != nil {
			return nil, nil, err
		}
	}
	switch f {
	case FormatSMILES, FormatCSV, FormatTSV:
		return loadText(r, name, f, o.PinMax, o.MaxBytes)
	case FormatSD:
		return loadSD(r, name, o)
	}
	return nil, nil, &yamlfile.Error{File: name, Msg: fmt.Sprintf("list format %q", string(f)),
		Hint: "choose smiles, csv, tsv or sdf", Err: ErrUnknownFormat}
}
