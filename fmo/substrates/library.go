// Package substrates reads the substrate lists of a screen: YAML substrate files, CSV
// (name,smiles) files and one-SMILES-per-line files. It returns plain data — rows with
// their parsed molecules and the screen settings as written — and positioned errors
// (*yamlfile.Error); it knows no orbital theory: the vocabularies it checks (activation
// modes, ranking keys) are passed in LoadOptions by package screen.
package substrates

import (
	"errors"
	"fmt"
	"io"

	"cyclopair/huckel"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/yamlfile"
)

// Sentinel errors of the substrate-file loader. Every *yamlfile.Error it returns wraps one of them.
var (
	ErrFileSyntax    = errors.New("unreadable substrate file")
	ErrFileTooLarge  = errors.New("substrate file too large")
	ErrNotUTF8       = errors.New("substrate file is not UTF-8")
	ErrAlias         = errors.New("YAML anchors and aliases are not allowed in substrate files")
	ErrUnknownKey    = errors.New("unknown key")
	ErrWrongType     = errors.New("wrong type")
	ErrMissing       = errors.New("missing value")
	ErrBadValue      = errors.New("bad value")
	ErrBadSMILES     = errors.New("bad SMILES")
	ErrUnknownPreset = errors.New("unknown substrate preset")
	ErrDuplicateName = errors.New("duplicate name")
)

// DefaultMaxFileBytes caps the size of a substrate file (and of a CSV or line file).
// Methods are the π method names a substrate file's method: key accepts (the names of
// huckel.Method implementations).
var Methods = []string{huckel.MethodHuckel, huckel.MethodPPP}

const DefaultMaxFileBytes = 16 << 20

// Limits on single values, so one huge scalar cannot flood memory or the terminal.
const (
	maxNameRunes   = 200
	maxSMILESBytes = 4096
	maxNotesBytes  = 4096
	maxRows        = 1 << 20 // per list
)

// Substrate is one row of a substrate list.
type Substrate struct {
	Name   string
	SMILES string
	Pin    []int // atom-map numbers that mark the reacting atoms (nil: let the analysis choose)
	Notes  string
	Preset string             // preset it came from, "" when written inline
	Mol    *molecule.Molecule // parsed, with atom maps outside Pin cleared when Pin is given
	File   string             // file it was read from
	Line   int                // 1-based line of the row (0 if unknown)
	Col    int
}

// Where is "file: line:col", for messages about the row.
func (s *Substrate) Where() string {
	if s.Line == 0 {
		return s.File
	}
	return fmt.Sprintf("%s: %d:%d", s.File, s.Line, s.Col)
}

// Filter selects pairs. The zero value keeps every pair.
type Filter struct {
	Demand         string  // "", "normal", "inverse" or "neutral"
	MinRegioMargin float64 // |β|; 0 keeps all
	MaxGap         float64 // controlling gap at most this, |β|; 0 = no limit
	AllowedOnly    bool    // keep only symmetry-allowed pairings
	// InDomain keeps only pairs whose predicted rate lies inside the rate model's
	// applicability domain (fmo/rate: not extrapolated).
	InDomain bool
}

// Describe lists the filters in force in words, in a fixed order.
func (f Filter) Describe() []string {
	var out []string
	if f.Demand != "" {
		out = append(out, "demand = "+f.Demand)
	}
	if f.MinRegioMargin > 0 {
		out = append(out, fmt.Sprintf("regio margin ≥ %.3f |β|", f.MinRegioMargin))
	}
	if f.MaxGap > 0 {
		out = append(out, fmt.Sprintf("controlling gap ≤ %.3f |β|", f.MaxGap))
	}
	if f.AllowedOnly {
		out = append(out, "symmetry-allowed only")
	}
	if f.InDomain {
		out = append(out, "rate inside the model's applicability domain only")
	}
	return out
}

// Library is a loaded substrate file: the good rows of each list and the screen settings.
type Library struct {
	Source      string // file name as given ("-" for stdin)
	Title       string
	Dienes      []Substrate
	Dienophiles []Substrate
	Activations []string // mode names, in file order, without duplicates (LoadOptions.Modes[0] if absent)
	Params      string   // built-in parameter set name, "" for the default
	ParamsFile  string   // parameter file path as written in the file, "" if none
	Calibration string   // "default" (or "") or a calibration file path as written in the file
	Method      string   // π method ("huckel" or "ppp"), "" when the file does not say
	PPPParams   string   // PPP parameter set name or file path as written in the file, "" if none
	Amine       string   // secondary amine SMILES for iminium activation, "" for the default (pyrrolidine)
	AmineMol    *molecule.Molecule
	Filter      Filter
	RankBy      string // ranking key, lower case (LoadOptions.RankKeys[0] when the file does not say)
	Top         int    // 0 = all rows
	// Set records which settings the file gave explicitly (so command-line flags can
	// override only what the user did not write, or report conflicts).
	Set map[string]bool
	// At holds the 1-based line and column of each top-level setting's value, for messages
	// about settings checked later (an unknown parameter set, a missing calibration file).
	At map[string][2]int
}

// Where returns "file: line:col" of a top-level setting's value, or the file name.
func (l *Library) Where(key string) string {
	if p, ok := l.At[key]; ok {
		return fmt.Sprintf("%s: %d:%d", l.Source, p[0], p[1])
	}
	return l.Source
}

// LoadOptions tunes LoadLibrary. Modes and RankKeys are the vocabularies of the screen
// (fmo.Modes() and screen.RankKeys); the reader checks names against them without knowing
// what they mean. Loading without them is a programmer error and panics.
type LoadOptions struct {
	Name     string // file name used in messages ("-" for stdin); default "substrates"
	MaxBytes int64  // size cap; 0 means DefaultMaxFileBytes
	// Modes are the known activation modes; the first is the default when a file names none.
	Modes []string
	// RankKeys are the known ranking keys, in the order messages list them; the first is the
	// default when a file does not say.
	RankKeys []string
}

func (o *LoadOptions) name() string {
	if o.Name == "" {
		return "substrates"
	}
	return o.Name
}

// readCapped reads all of r up to max bytes; more is ErrFileTooLarge.
func readCapped(r io.Reader, name string, max int64) ([]byte, error) {
	if max <= 0 {
		max = DefaultMaxFileBytes
	}
	data, tooLarge, err := yamlfile.ReadLimited(r, max)
	if err != nil {
		return nil, &yamlfile.Error{File: name, Msg: "cannot read: " + err.Error(), Err: ErrFileSyntax, Cause: err}
	}
	if tooLarge {
		return nil, &yamlfile.Error{File: name, Msg: fmt.Sprintf("larger than %d bytes", max),
			Hint: "split the screen into several files, or use --shard", Err: ErrFileTooLarge}
	}
	return data, nil
}
