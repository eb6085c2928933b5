package fmo

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
	"cyclopair/huckel/yamlfile"
	"cyclopair/presets"

	"go.yaml.in/yaml/v3"
)

// A substrate file (YAML) describes one screen. See README ("Substrate files") for the full
// format; in short:
//
//	title: any text
//	dienes:                 # 4π partners: dienes, hetero-dienes, 1,3-dipoles
//	  - {name: cyclopentadiene, smiles: C1=CC=CC1}
//	  - preset: isoprene    # a named common substrate (presets/substrates.yaml)
//	  - {name: mapped, smiles: "[CH2:1]=CC=[CH2:2]", pin: [1, 2], notes: "…"}
//	dienophiles:
//	  - {name: acrolein, smiles: C=CC=O}
//	activations: [none, lewis, iminium]
//	amine: C1CCNC1                  # secondary amine for iminium activation (default pyrrolidine)
//	params: streitwieser1961        # or params_file: my-params.yaml (relative to this file)
//	calibration: default            # or a file from cyclopair calibrate --out (relative to this file)
//	filter: {demand: normal, min_regio_margin: 0.01, max_gap: 1.2, allowed_only: true}
//	rank_by: normal_gap             # none | gap | normal_gap | stabilization | regio_margin | score
//	top: 20
//
// Loading is strict: unknown keys, wrong types, aliases and anchors, non-UTF-8 text and files
// over the size cap are errors with file:line:column. Problems confined to one substrate
// (bad SMILES, unknown preset, a missing name) make that row bad; the other rows load.

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
	return out
}

// Library is a loaded substrate file: the good rows of each list and the screen settings.
type Library struct {
	Source      string // file name as given ("-" for stdin)
	Title       string
	Dienes      []Substrate
	Dienophiles []Substrate
	Activations []string // mode names, in file order, without duplicates ("none" if absent)
	Params      string   // built-in parameter set name, "" for the default
	ParamsFile  string   // parameter file path as written in the file, "" if none
	Calibration string   // "default" (or "") or a calibration file path as written in the file
	Amine       string   // secondary amine SMILES for iminium activation, "" for the default (pyrrolidine)
	AmineMol    *molecule.Molecule
	Filter      Filter
	RankBy      RankKey // RankNormalGap when the file does not say
	Top         int     // 0 = all rows
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

// LoadOptions tunes LoadLibrary.
type LoadOptions struct {
	Name     string // file name used in messages ("-" for stdin); default "substrates"
	MaxBytes int64  // size cap; 0 means DefaultMaxFileBytes
	// Modes are the known activation modes (nil: Modes()).
	Modes []string
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

// LoadLibrary reads a YAML substrate file. It returns the library with every good row, the
// problems confined to single rows (bad), and a non-nil err when the file as a whole cannot
// be used (syntax, size, encoding, structure, bad settings); err is then a yamlfile.ErrorList or
// *yamlfile.Error and lib is nil.
func LoadLibrary(r io.Reader, o LoadOptions) (lib *Library, bad yamlfile.ErrorList, err error) {
	name := o.name()
	data, err := readCapped(r, name, o.MaxBytes)
	if err != nil {
		return nil, nil, err
	}
	return ParseLibrary(data, o)
}

// ParseLibrary is LoadLibrary on bytes already read (the size cap still applies).
func ParseLibrary(data []byte, o LoadOptions) (lib *Library, bad yamlfile.ErrorList, err error) {
	name := o.name()
	max := o.MaxBytes
	if max <= 0 {
		max = DefaultMaxFileBytes
	}
	if int64(len(data)) > max {
		return nil, nil, &yamlfile.Error{File: name, Msg: fmt.Sprintf("larger than %d bytes", max),
			Hint: "split the screen into several files, or use --shard", Err: ErrFileTooLarge}
	}
	if e := yamlfile.CheckUTF8(data, name, ErrNotUTF8); e != nil {
		return nil, nil, e
	}
	var doc, extra yaml.Node
	dec := yaml.NewDecoder(bytes.NewReader(data))
	if err := dec.Decode(&doc); err != nil && !errors.Is(err, io.EOF) {
		return nil, nil, yamlSyntaxError(name, err)
	}
	// A second document ("---") would be ignored silently by a plain Unmarshal.
	switch err := dec.Decode(&extra); {
	case err == nil:
		return nil, nil, &yamlfile.Error{File: name, Line: extra.Line, Col: extra.Column, Msg: "a second YAML document",
			Hint: "a substrate file is one document: remove the '---' line, or split the file", Err: ErrFileSyntax}
	case !errors.Is(err, io.EOF):
		return nil, nil, yamlSyntaxError(name, err)
	}
	w := &walker{file: name, modes: o.Modes}
	if w.modes == nil {
		w.modes = Modes()
	}
	lib = w.document(&doc)
	if len(w.fatal) > 0 {
		return nil, nil, w.fatal.Err()
	}
	// Second, independent check of the structure with the YAML library's strict decoder:
	// the walker above should already have caught every unknown key; this keeps the two in
	// step (a schema change that forgets the walker fails here, not silently). Rows the
	// walker already rejected would be reported twice, so the check runs on clean files.
	if len(w.bad) > 0 {
		lib.Source = name
		return lib, w.bad, nil
	}
	if err := strictDecode(data); err != nil {
		return nil, nil, &yamlfile.Error{File: name, Msg: err.Error(), Err: ErrUnknownKey}
	}
	lib.Source = name
	return lib, w.bad, nil
}

// yamlSyntaxError turns a yaml.v3 syntax error ("yaml: line 3: did not find expected key")
// into an Error with the line (yaml.v3 gives no column; its line is sometimes the line
// of the enclosing construct).
func yamlSyntaxError(name string, err error) *yamlfile.Error {
	msg := strings.TrimPrefix(err.Error(), "yaml: ")
	line := 0
	if rest, ok := strings.CutPrefix(msg, "line "); ok {
		if i := strings.IndexByte(rest, ':'); i > 0 {
			if n, e := strconv.Atoi(rest[:i]); e == nil {
				line = n
				msg = strings.TrimSpace(rest[i+1:])
			}
		}
	}
	return &yamlfile.Error{File: name, Line: line, Col: 1, Msg: "YAML syntax: " + msg,
		Hint: "check indentation and quoting near this line; quote SMILES that start with [ or contain #, : or spaces",
		Err:  ErrFileSyntax, Cause: err}
}

// fileSchema mirrors the substrate-file format for the strict decoder.
type fileSchema struct {
	Title       string        `yaml:"title"`
	Description string        `yaml:"description"`
	Dienes      []entrySchema `yaml:"dienes"`
	Dienophiles []entrySchema `yaml:"dienophiles"`
	Activations []string      `yaml:"activations"`
	Amine       string        `yaml:"amine"`
	Params      string        `yaml:"params"`
	ParamsFile  string        `yaml:"params_file"`
	Calibration string        `yaml:"calibration"`
	Filter      struct {
		Demand         string  `yaml:"demand"`
		MinRegioMargin float64 `yaml:"min_regio_margin"`
		MaxGap         float64 `yaml:"max_gap"`
		AllowedOnly    bool    `yaml:"allowed_only"`
	} `yaml:"filter"`
	RankBy string `yaml:"rank_by"`
	Top    int    `yaml:"top"`
}

type entrySchema struct {
	Name   string `yaml:"name"`
	SMILES string `yaml:"smiles"`
	Pin    []int  `yaml:"pin"`
	Notes  string `yaml:"notes"`
	Preset string `yaml:"preset"`
}

var (
	topKeys    = []string{"title", "description", "dienes", "dienophiles", "activations", "amine", "params", "params_file", "calibration", "filter", "rank_by", "top"}
	entryKeys  = []string{"name", "smiles", "pin", "notes", "preset"}
	filterKeys = []string{"demand", "min_regio_margin", "max_gap", "allowed_only"}
)

func strictDecode(data []byte) error {
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	var f fileSchema
	err := dec.Decode(&f)
	if errors.Is(err, io.EOF) {
		return nil
	}
	var te *yaml.TypeError
	if errors.As(err, &te) {
		// The walker accepts row-level type problems as bad rows; only unknown fields are
		// the strict decoder's business here.
		for _, m := range te.Errors {
			if strings.Contains(m, "not found in type") {
				return err
			}
		}
		return nil
	}
	return err
}

// walker validates the node tree against the schema and builds the Library.
type walker struct {
	file  string
	modes []string
	fatal yamlfile.ErrorList // whole-file problems
	bad   yamlfile.ErrorList // row problems
}

func (w *walker) errAt(n *yaml.Node, path string, kind error, msg, hint string) *yamlfile.Error {
	e := &yamlfile.Error{File: w.file, Path: path, Msg: msg, Hint: hint, Err: kind}
	if n != nil {
		e.Line, e.Col = n.Line, n.Column
	}
	return e
}

func (w *walker) fail(n *yaml.Node, path string, kind error, msg, hint string) {
	w.fatal = append(w.fatal, w.errAt(n, path, kind, msg, hint))
}

// kindName describes a node's kind for "wrong type" messages.
func kindName(n *yaml.Node) string {
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping"
	case yaml.SequenceNode:
		return "a list"
	case yaml.AliasNode:
		return "an alias"
	case yaml.ScalarNode:
		if n.Tag == "!!null" {
			return "nothing (null)"
		}
		return "a single value"
	}
	return "something else"
}

// noAlias reports an alias or anchor at n (aliases are never followed: an alias bomb costs
// nothing here).
func (w *walker) noAlias(n *yaml.Node, path string, errs *yamlfile.ErrorList) bool {
	if n.Kind == yaml.AliasNode || n.Anchor != "" {
		*errs = append(*errs, w.errAt(n, path, ErrAlias, "anchor or alias", "write the value out in full"))
		return false
	}
	return true
}

func (w *walker) document(doc *yaml.Node) *Library {
	lib := &Library{Set: map[string]bool{}, At: map[string][2]int{}}
	if doc.Kind == 0 || len(doc.Content) == 0 {
		w.fail(nil, "", ErrMissing, "empty file", "a substrate file needs at least dienes and dienophiles")
		return lib
	}
	root := doc.Content[0]
	if !w.noAlias(root, "", &w.fatal) {
		return lib
	}
	if root.Kind != yaml.MappingNode {
		w.fail(root, "", ErrWrongType, "the top level is "+kindName(root)+", want a mapping",
			"start with keys such as dienes: and dienophiles:")
		return lib
	}
	seen := map[string]*yaml.Node{}
	for i := 0; i+1 < len(root.Content); i += 2 {
		k, v := root.Content[i], root.Content[i+1]
		if !w.noAlias(k, "", &w.fatal) || !w.noAlias(v, k.Value, &w.fatal) {
			continue
		}
		if prev, dup := seen[k.Value]; dup {
			w.fail(k, k.Value, ErrBadValue, fmt.Sprintf("key given twice (first at line %d)", prev.Line), "keep one")
			continue
		}
		seen[k.Value] = k
		lib.Set[k.Value] = true
		lib.At[k.Value] = [2]int{v.Line, v.Column}
		switch k.Value {
		case "title", "description":
			if s, ok := w.str(v, k.Value, &w.fatal, 1000); ok && k.Value == "title" {
				lib.Title = s
			}
		case "dienes":
			lib.Dienes = w.list(v, "dienes", 4)
		case "dienophiles":
			lib.Dienophiles = w.list(v, "dienophiles", 2)
		case "activations":
			lib.Activations = w.activations(v)
		case "params":
			lib.Params, _ = w.str(v, k.Value, &w.fatal, 200)
		case "params_file":
			lib.ParamsFile, _ = w.str(v, k.Value, &w.fatal, 4096)
		case "calibration":
			lib.Calibration, _ = w.str(v, k.Value, &w.fatal, 4096)
		case "amine":
			if a, ok := w.str(v, k.Value, &w.fatal, maxSMILESBytes); ok {
				m, err := smiles.Parse(a)
				if err != nil {
					var se *smiles.Error
					fe := &yamlfile.Error{File: w.file, Line: v.Line, Col: v.Column, Path: "amine", Err: ErrBadSMILES, Cause: err,
						Msg: fmt.Sprintf("SMILES %q: %v", short(a), err)}
					if errors.As(err, &se) {
						fe.Col += scalarOffset(v, se.Pos)
						fe.Msg, fe.Hint = fmt.Sprintf("SMILES %q column %d: %s", short(a), se.Column(), se.Msg), se.Hint
					}
					w.fatal = append(w.fatal, fe)
				} else {
					lib.Amine, lib.AmineMol = a, m
				}
			}
		case "filter":
			lib.Filter = w.filter(v)
		case "rank_by":
			if s, ok := w.str(v, k.Value, &w.fatal, 100); ok {
				rk, err := ParseRankKey(s)
				if err != nil {
					w.fail(v, k.Value, ErrBadValue, err.Error(), "")
				}
				lib.RankBy = rk
			}
		case "top":
			if n, ok := w.int(v, k.Value, &w.fatal); ok {
				if n < 0 {
					w.fail(v, k.Value, ErrBadValue, "negative", "0 keeps every row")
				}
				lib.Top = n
			}
		default:
			w.fail(k, "", ErrUnknownKey, fmt.Sprintf("unknown key %q", k.Value),
				"known keys: "+strings.Join(topKeys, ", ")+suggest(k.Value, topKeys))
		}
	}
	if lib.Params != "" && lib.ParamsFile != "" {
		w.fail(seen["params_file"], "params_file", ErrBadValue, "both params and params_file given", "keep one")
	}
	for _, need := range []string{"dienes", "dienophiles"} {
		if seen[need] == nil {
			w.fail(root, "", ErrMissing, "no "+need+" list", "add "+need+": with at least one entry")
		}
	}
	if len(lib.Activations) == 0 {
		lib.Activations = []string{ActivateNone}
	}
	if !lib.Set["rank_by"] {
		lib.RankBy = RankNormalGap
	}
	return lib
}

// suggest returns ` (did you mean "x"?)` for a close known key, or "".
func suggest(got string, known []string) string {
	best, bestD := "", 3
	for _, k := range known {
		if d := editDistance(got, k); d < bestD {
			best, bestD = k, d
		}
	}
	if best == "" {
		return ""
	}
	return fmt.Sprintf("; did you mean %q?", best)
}

func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	if len(ra) > 64 || len(rb) > 64 {
		return 99
	}
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			c := 1
			if ra[i-1] == rb[j-1] {
				c = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+c)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// str reads a scalar as text (numbers are accepted as their text), at most maxLen bytes.
func (w *walker) str(n *yaml.Node, path string, errs *yamlfile.ErrorList, maxLen int) (string, bool) {
	if !w.noAlias(n, path, errs) {
		return "", false
	}
	if n.Kind != yaml.ScalarNode || n.Tag == "!!null" {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, "is "+kindName(n)+", want text", ""))
		return "", false
	}
	if len(n.Value) > maxLen {
		*errs = append(*errs, w.errAt(n, path, ErrBadValue, fmt.Sprintf("%d bytes long, the limit is %d", len(n.Value), maxLen), ""))
		return "", false
	}
	return n.Value, true
}

func (w *walker) int(n *yaml.Node, path string, errs *yamlfile.ErrorList) (int, bool) {
	if !w.noAlias(n, path, errs) {
		return 0, false
	}
	if n.Kind != yaml.ScalarNode || n.Tag != "!!int" {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, fmt.Sprintf("is %s %q, want a whole number", kindName(n), short(n.Value)), ""))
		return 0, false
	}
	v, err := strconv.ParseInt(strings.ReplaceAll(n.Value, "_", ""), 0, 32)
	if err != nil {
		*errs = append(*errs, w.errAt(n, path, ErrBadValue, fmt.Sprintf("%q is out of range", short(n.Value)), ""))
		return 0, false
	}
	return int(v), true
}

func (w *walker) float(n *yaml.Node, path string, errs *yamlfile.ErrorList) (float64, bool) {
	if !w.noAlias(n, path, errs) {
		return 0, false
	}
	if n.Kind != yaml.ScalarNode || (n.Tag != "!!int" && n.Tag != "!!float") {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, fmt.Sprintf("is %s %q, want a number", kindName(n), short(n.Value)), ""))
		return 0, false
	}
	v, err := strconv.ParseFloat(strings.ReplaceAll(n.Value, "_", ""), 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		*errs = append(*errs, w.errAt(n, path, ErrBadValue, fmt.Sprintf("%q is not a finite number", short(n.Value)), ""))
		return 0, false
	}
	return v, true
}

func (w *walker) bool(n *yaml.Node, path string, errs *yamlfile.ErrorList) (bool, bool) {
	if !w.noAlias(n, path, errs) {
		return false, false
	}
	if n.Kind != yaml.ScalarNode || n.Tag != "!!bool" {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, fmt.Sprintf("is %s %q, want true or false", kindName(n), short(n.Value)), ""))
		return false, false
	}
	return n.Value == "true" || n.Value == "True" || n.Value == "TRUE", true
}

// short cuts a value for messages.
func short(s string) string {
	if len(s) <= 40 {
		return s
	}
	cut := 40
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return s[:cut] + "…"
}

func (w *walker) activations(n *yaml.Node) []string {
	if !w.noAlias(n, "activations", &w.fatal) {
		return nil
	}
	var items []*yaml.Node
	switch {
	case n.Kind == yaml.SequenceNode:
		items = n.Content
	case n.Kind == yaml.ScalarNode && n.Tag != "!!null":
		items = []*yaml.Node{n} // "activations: lewis" is a list of one
	default:
		w.fail(n, "activations", ErrWrongType, "is "+kindName(n)+", want a list of mode names", "e.g. [none, lewis]")
		return nil
	}
	var out []string
	for i, it := range items {
		path := fmt.Sprintf("activations[%d]", i)
		s, ok := w.str(it, path, &w.fatal, 100)
		if !ok {
			continue
		}
		s = strings.ToLower(strings.TrimSpace(s))
		if !slices.Contains(w.modes, s) {
			w.fail(it, path, ErrBadValue, fmt.Sprintf("unknown activation mode %q", short(s)),
				"known modes: "+strings.Join(w.modes, ", "))
			continue
		}
		if !slices.Contains(out, s) {
			out = append(out, s)
		}
	}
	return out
}

func (w *walker) filter(n *yaml.Node) Filter {
	var f Filter
	if !w.noAlias(n, "filter", &w.fatal) {
		return f
	}
	if n.Kind != yaml.MappingNode {
		w.fail(n, "filter", ErrWrongType, "is "+kindName(n)+", want a mapping", "e.g. filter: {demand: normal}")
		return f
	}
	keys := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if !w.noAlias(k, "filter", &w.fatal) {
			continue
		}
		path := "filter." + k.Value
		if keys[k.Value] {
			w.fail(k, "filter", ErrBadValue, fmt.Sprintf("key %q given twice", short(k.Value)), "keep one")
			continue
		}
		keys[k.Value] = true
		switch k.Value {
		case "demand":
			if s, ok := w.str(v, path, &w.fatal, 100); ok {
				switch s {
				case "normal", "inverse", "neutral", "any", "":
					if s != "any" {
						f.Demand = s
					}
				default:
					w.fail(v, path, ErrBadValue, fmt.Sprintf("unknown demand %q", short(s)), "use normal, inverse, neutral or any")
				}
			}
		case "min_regio_margin":
			if x, ok := w.float(v, path, &w.fatal); ok {
				if x < 0 {
					w.fail(v, path, ErrBadValue, "negative", "margins are ≥ 0, in units of |β|")
				}
				f.MinRegioMargin = x
			}
		case "max_gap":
			if x, ok := w.float(v, path, &w.fatal); ok {
				if x <= 0 {
					w.fail(v, path, ErrBadValue, "must be positive", "gaps are > 0, in units of |β|")
				}
				f.MaxGap = x
			}
		case "allowed_only":
			f.AllowedOnly, _ = w.bool(v, path, &w.fatal)
		default:
			w.fail(k, "filter", ErrUnknownKey, fmt.Sprintf("unknown key %q", k.Value),
				"known keys: "+strings.Join(filterKeys, ", ")+suggest(k.Value, filterKeys))
		}
	}
	return f
}

// list reads a substrate list. Problems inside one entry make that entry bad; a list that is
// not a list is a whole-file problem.
func (w *walker) list(n *yaml.Node, key string, pinMax int) []Substrate {
	if !w.noAlias(n, key, &w.fatal) {
		return nil
	}
	if n.Kind != yaml.SequenceNode {
		w.fail(n, key, ErrWrongType, "is "+kindName(n)+", want a list of {name, smiles} entries",
			"write each entry on a line starting with '- '")
		return nil
	}
	if len(n.Content) > maxRows {
		w.fail(n, key, ErrBadValue, fmt.Sprintf("%d entries, the limit is %d", len(n.Content), maxRows), "split the screen")
		return nil
	}
	var out []Substrate
	names := map[string]int{}
	for i, it := range n.Content {
		path := fmt.Sprintf("%s[%d]", key, i)
		s, ok := w.entry(it, path, pinMax)
		if !ok {
			continue
		}
		if first, dup := names[s.Name]; dup {
			w.bad = append(w.bad, w.errAt(it, path, ErrDuplicateName,
				fmt.Sprintf("name %q already used by %s[%d]", short(s.Name), key, first), "names identify rows in the report: make them unique"))
			continue
		}
		names[s.Name] = i
		out = append(out, s)
	}
	return out
}

func (w *walker) entry(n *yaml.Node, path string, pinMax int) (Substrate, bool) {
	s := Substrate{File: w.file, Line: n.Line, Col: n.Column}
	var errs yamlfile.ErrorList
	defer func() { w.bad = append(w.bad, errs...) }()
	if !w.noAlias(n, path, &errs) {
		return s, false
	}
	if n.Kind != yaml.MappingNode {
		errs = append(errs, w.errAt(n, path, ErrWrongType, "is "+kindName(n)+", want a mapping such as {name: x, smiles: C=C}",
			"or {preset: name} for a named common substrate"))
		return s, false
	}
	var smilesNode, pinNode, nameNode *yaml.Node
	keys := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if !w.noAlias(k, path, &errs) {
			continue
		}
		kp := path + "." + k.Value
		if keys[k.Value] {
			errs = append(errs, w.errAt(k, path, ErrBadValue, fmt.Sprintf("key %q given twice", short(k.Value)), "keep one"))
			continue
		}
		keys[k.Value] = true
		switch k.Value {
		case "name":
			nameNode = v
			s.Name, _ = w.str(v, kp, &errs, 4*maxNameRunes)
		case "smiles":
			smilesNode = v
			s.SMILES, _ = w.str(v, kp, &errs, maxSMILESBytes)
		case "notes":
			s.Notes, _ = w.str(v, kp, &errs, maxNotesBytes)
		case "preset":
			if p, ok := w.str(v, kp, &errs, 200); ok {
				s.Preset = p
				if sub, ok := presets.LookupSubstrate(p); ok {
					s.Preset = sub.Name
				} else {
					hint := "run 'cyclopair screen --list-presets' for the list"
					if sg := presets.SuggestSubstrates(p, 3); len(sg) > 0 {
						hint = "did you mean " + strings.Join(sg, " or ") + "?"
					}
					errs = append(errs, w.errAt(v, kp, ErrUnknownPreset, fmt.Sprintf("unknown substrate preset %q", short(p)), hint))
				}
			}
		case "pin":
			pinNode = v
			s.Pin = w.pins(v, kp, &errs)
		default:
			errs = append(errs, w.errAt(k, path, ErrUnknownKey, fmt.Sprintf("unknown key %q", short(k.Value)),
				"known keys: "+strings.Join(entryKeys, ", ")+suggest(k.Value, entryKeys)))
		}
	}
	if len(errs) > 0 {
		return s, false
	}
	if s.Preset != "" {
		sub, _ := presets.LookupSubstrate(s.Preset)
		if smilesNode != nil {
			errs = append(errs, w.errAt(smilesNode, path, ErrBadValue, "both preset and smiles given", "keep one"))
			return s, false
		}
		s.SMILES = sub.SMILES
		if s.Name == "" {
			s.Name = sub.Name
		}
		if s.Notes == "" {
			s.Notes = sub.Notes
		}
	}
	if s.SMILES == "" {
		errs = append(errs, w.errAt(n, path, ErrMissing, "no smiles", "add smiles: <SMILES>, or preset: <name>"))
		return s, false
	}
	if s.Name == "" {
		if nameNode != nil {
			errs = append(errs, w.errAt(nameNode, path+".name", ErrMissing, "empty name", ""))
			return s, false
		}
		s.Name = s.SMILES // a row without a name is named by its SMILES
	}
	if err := checkName(s.Name); err != "" {
		at := nameNode
		if at == nil {
			at = n
		}
		errs = append(errs, w.errAt(at, path+".name", ErrBadValue, err, ""))
		return s, false
	}
	m, err := smiles.Parse(s.SMILES)
	if err != nil {
		errs = append(errs, w.smilesError(smilesNode, n, path, s, err))
		return s, false
	}
	m.Name = s.Name
	if s.Pin != nil {
		if e, at := applyPin(m, s.Pin, pinMax); e != "" {
			where, wpath := pinNode, path+".pin"
			if at >= 0 && at < len(pinNode.Content) {
				where, wpath = pinNode.Content[at], fmt.Sprintf("%s.pin[%d]", path, at)
			}
			errs = append(errs, w.errAt(where, wpath, ErrBadValue, e,
				"pin lists the atom-map numbers (the :n in [CH2:1]) of the reacting atoms"))
			return s, false
		}
	}
	s.Mol = m
	return s, true
}

// checkName rejects names that would break a report line.
func checkName(name string) string {
	if utf8.RuneCountInString(name) > maxNameRunes {
		return fmt.Sprintf("name longer than %d characters", maxNameRunes)
	}
	for _, r := range name {
		if unicode.IsControl(r) {
			return "name contains a control character (line break or tab)"
		}
	}
	return ""
}

func (w *walker) pins(n *yaml.Node, path string, errs *yamlfile.ErrorList) []int {
	if !w.noAlias(n, path, errs) {
		return nil
	}
	if n.Kind != yaml.SequenceNode {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, "is "+kindName(n)+", want a list of atom-map numbers", "e.g. pin: [1, 2]"))
		return nil
	}
	out := []int{}
	for i, it := range n.Content {
		v, ok := w.int(it, fmt.Sprintf("%s[%d]", path, i), errs)
		if !ok {
			return nil
		}
		if v < 1 {
			*errs = append(*errs, w.errAt(it, path, ErrBadValue, "atom-map numbers start at 1", ""))
			return nil
		}
		out = append(out, v)
	}
	return out
}

// applyPin keeps the atom maps listed in pin and clears the others, so site perception sees
// exactly the pinned atoms. It returns a message when a number is missing, repeated, or the
// count does not fit the list (at most pinMax atoms), with the index of the offending pin
// entry (-1 when the count is wrong).
func applyPin(m *molecule.Molecule, pin []int, pinMax int) (string, int) {
	if len(pin) < 2 || len(pin) > pinMax {
		return fmt.Sprintf("%d atoms pinned, want 2 to %d (the two termini, or the whole reacting unit)", len(pin), pinMax), -1
	}
	for i, p := range pin {
		if slices.Contains(pin[:i], p) {
			return fmt.Sprintf("atom map %d pinned twice", p), i
		}
		switch got := len(m.AtomByMap(p)); {
		case got == 0:
			return fmt.Sprintf("no atom carries map number %d in the SMILES", p), i
		case got > 1:
			return fmt.Sprintf("map number %d is on %d atoms", p, got), i
		}
	}
	for i := range m.Atoms {
		if !slices.Contains(pin, m.Atoms[i].Map) {
			m.Atoms[i].Map = 0
		}
	}
	return "", -1
}

// smilesError places a SMILES error at its column inside the YAML scalar.
func (w *walker) smilesError(sn, entry *yaml.Node, path string, s Substrate, err error) *yamlfile.Error {
	var se *smiles.Error
	fe := &yamlfile.Error{File: w.file, Path: fmt.Sprintf("%s %q", path, short(s.Name)), Err: ErrBadSMILES, Cause: err}
	if errors.As(err, &se) {
		fe.Msg = fmt.Sprintf("SMILES %q column %d: %s", short(s.SMILES), se.Column(), se.Msg)
		fe.Hint = se.Hint
		var el smiles.ErrorList
		if errors.As(err, &el) && len(el) > 1 {
			fe.Msg += fmt.Sprintf(" (and %d more problems)", len(el)-1)
		}
	} else {
		fe.Msg = fmt.Sprintf("SMILES %q: %v", short(s.SMILES), err)
	}
	switch {
	case sn == nil: // from a preset: point at the entry
		fe.Line, fe.Col = entry.Line, entry.Column
		fe.Msg = "preset " + fe.Msg
	default:
		fe.Line, fe.Col = sn.Line, sn.Column
		if se != nil {
			fe.Col += scalarOffset(sn, se.Pos)
		}
	}
	return fe
}

// scalarOffset is the column offset of byte pos of a scalar's value from the scalar's start:
// past the opening quote, counting the escapes needed before pos. Block scalars (| and >)
// start on the next line, so their offset is not computed.
func scalarOffset(n *yaml.Node, pos int) int {
	v := n.Value
	pos = min(max(pos, 0), len(v))
	switch n.Style {
	case yaml.DoubleQuotedStyle:
		extra := strings.Count(v[:pos], `\`) + strings.Count(v[:pos], `"`)
		return 1 + utf8.RuneCountInString(v[:pos]) + extra
	case yaml.SingleQuotedStyle:
		return 1 + utf8.RuneCountInString(v[:pos]) + strings.Count(v[:pos], "'")
	case yaml.LiteralStyle, yaml.FoldedStyle:
		return 0
	}
	return utf8.RuneCountInString(v[:pos])
}

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
			e := &yamlfile.Error{File: name, Line: line, Col: col, Path: fmt.Sprintf("%q", short(s.Name)), Err: ErrBadSMILES, Cause: err}
			var se *smiles.Error
			if errors.As(err, &se) {
				e.Col = col + se.Pos
				e.Msg = fmt.Sprintf("SMILES %q column %d: %s", short(smi), se.Column(), se.Msg)
				e.Hint = se.Hint
			} else {
				e.Msg = fmt.Sprintf("SMILES %q: %v", short(smi), err)
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
		cr := csv.NewReader(bytes.NewReader(data))
		cr.FieldsPerRecord = -1
		cr.Comment = '#'
		cr.TrimLeadingSpace = true
		first := true
		for {
			rec, err := cr.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				var pe *csv.ParseError
				if errors.As(err, &pe) {
					bad = append(bad, &yamlfile.Error{File: name, Line: pe.Line, Col: pe.Column, Msg: "CSV: " + pe.Err.Error(),
						Hint: "quote fields that contain commas or quotes", Err: ErrFileSyntax, Cause: err})
					if len(bad) > 1000 {
						return subs, bad, nil
					}
					continue
				}
				return subs, bad, &yamlfile.Error{File: name, Msg: err.Error(), Err: ErrFileSyntax, Cause: err}
			}
			line, col := cr.FieldPos(0) // valid only for a record read without error
			if first && len(rec) >= 2 && strings.EqualFold(strings.TrimSpace(rec[0]), "name") && strings.EqualFold(strings.TrimSpace(rec[1]), "smiles") {
				first = false
				continue
			}
			first = false
			if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
				continue
			}
			if len(rec) != 2 {
				bad = append(bad, &yamlfile.Error{File: name, Line: line, Col: col, Msg: fmt.Sprintf("%d fields, want 2 (name,smiles)", len(rec)),
					Err: ErrBadValue})
				continue
			}
			_, scol := cr.FieldPos(1)
			add(line, scol, strings.TrimSpace(rec[0]), strings.TrimSpace(rec[1]))
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
