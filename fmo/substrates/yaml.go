package substrates

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"cyclopair/huckel/smiles"
	"cyclopair/huckel/yamlfile"
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
//	method: huckel                  # π method: huckel or ppp (PPP-SCF, eV by Koopmans' theorem)
//	ppp_params: ppp-hinze1962       # PPP parameter set name or file (relative to this file), with method: ppp
//	filter: {demand: normal, min_regio_margin: 0.01, max_gap: 1.2, allowed_only: true}
//	rank_by: rate                   # rate | none | gap | normal_gap | stabilization | regio_margin | score
//	top: 20
//
// Loading is strict: unknown keys, wrong types, aliases and anchors, non-UTF-8 text and files
// over the size cap are errors with file:line:column. Problems confined to one substrate
// (bad SMILES, unknown preset, a missing name) make that row bad; the other rows load.

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
	strictErr := strictDecode(data) // see below, before the walker
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
	if len(o.Modes) == 0 || len(o.RankKeys) == 0 {
		panic("substrates: LoadOptions without Modes or RankKeys")
	}
	// Second, independent check of the structure with the YAML library's strict decoder:
	// the walker below should already catch every unknown key; this keeps the two in step
	// (a schema change that forgets the walker fails here, not silently). Rows the walker
	// rejects would be reported twice, so its verdict counts only on clean files. It runs
	// first (above) so that its own parse tree is garbage before the file's tree is built: the
	// peak memory is one node tree plus the rows, not two trees (issue 14).
	w := &walker{file: name, modes: o.Modes, rankKeys: o.RankKeys}
	lib = w.document(&doc)
	if len(w.fatal) > 0 {
		return nil, nil, w.fatal.Err()
	}
	if len(w.bad) > 0 {
		lib.Source = name
		return lib, w.bad, nil
	}
	if strictErr != nil {
		return nil, nil, &yamlfile.Error{File: name, Msg: strictErr.Error(), Err: ErrUnknownKey}
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
	Method      string        `yaml:"method"`
	PPPParams   string        `yaml:"ppp_params"`
	Filter      struct {
		Demand         string  `yaml:"demand"`
		MinRegioMargin float64 `yaml:"min_regio_margin"`
		MaxGap         float64 `yaml:"max_gap"`
		AllowedOnly    bool    `yaml:"allowed_only"`
		InDomain       bool    `yaml:"in_domain"`
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
	topKeys    = []string{"title", "description", "dienes", "dienophiles", "activations", "amine", "params", "params_file", "calibration", "method", "ppp_params", "filter", "rank_by", "top"}
	entryKeys  = []string{"name", "smiles", "pin", "notes", "preset"}
	filterKeys = []string{"demand", "min_regio_margin", "max_gap", "allowed_only", "in_domain"}
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
	file     string
	modes    []string
	rankKeys []string
	fatal    yamlfile.ErrorList // whole-file problems
	bad      yamlfile.ErrorList // row problems
}

func (w *walker) errAt(n *yaml.Node, path string, kind error, msg, hint string) *yamlfile.Error {
	e := yamlfile.At(w.file, n, msg, kind)
	e.Path, e.Hint = path, hint
	return e
}

func (w *walker) fail(n *yaml.Node, path string, kind error, msg, hint string) {
	w.fatal = append(w.fatal, w.errAt(n, path, kind, msg, hint))
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
		case "method":
			if m, ok := w.str(v, k.Value, &w.fatal, 100); ok {
				m = strings.ToLower(strings.TrimSpace(m))
				if m != "" && !slices.Contains(Methods, m) {
					w.fail(v, k.Value, ErrBadValue, fmt.Sprintf("unknown π method %q (choose %s)", m, strings.Join(Methods, ", ")), "")
					m = ""
				}
				lib.Method = m
			}
		case "ppp_params":
			lib.PPPParams, _ = w.str(v, k.Value, &w.fatal, 4096)
		case "amine":
			if a, ok := w.str(v, k.Value, &w.fatal, maxSMILESBytes); ok {
				m, err := smiles.Parse(a)
				if err != nil {
					fe := badSMILES(w.file, v.Line, v.Column, "amine", a, err)
					if se := smilesErr(err); se != nil {
						fe.Col += scalarOffset(v, se.Pos)
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
				s = strings.ToLower(strings.TrimSpace(s))
				if s != "" && !slices.Contains(w.rankKeys, s) {
					w.fail(v, k.Value, ErrBadValue, fmt.Sprintf("unknown ranking key %q (choose %s)", s, strings.Join(w.rankKeys, ", ")), "")
					s = ""
				}
				lib.RankBy = s
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
		lib.Activations = []string{w.modes[0]}
	}
	if lib.RankBy == "" {
		lib.RankBy = w.rankKeys[0]
	}
	return lib
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
		case "in_domain":
			f.InDomain, _ = w.bool(v, path, &w.fatal)
		default:
			w.fail(k, "filter", ErrUnknownKey, fmt.Sprintf("unknown key %q", k.Value),
				"known keys: "+strings.Join(filterKeys, ", ")+suggest(k.Value, filterKeys))
		}
	}
	return f
}
