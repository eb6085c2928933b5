package huckel

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"unicode/utf8"

	"cyclopair/huckel/errtext"

	"go.yaml.in/yaml/v3"

	"cyclopair/huckel/yamlfile"
)

// Params is a Hückel parameter set: Coulomb parameters h per centre type (α_X = α + h·β)
// and resonance parameters k per pair of centre types (β_XY = k·β), each with its source.
// Sets are data: presets ship YAML files (package presets) and users pass their own in the
// same format (see ParseParams).
//
// A Params built by ParseParams or Merge has its lookups precompiled into arrays; one built
// as a literal still works but H and K then scan the entry lists.
type Params struct {
	Name   string // short identifier, e.g. "streitwieser1961"
	Title  string // one-line human title
	Source string // bibliographic source of the set as a whole
	Notes  string // free text: conventions, what was assumed

	// Alkyl switches on the hyperconjugative heteroatom model: every sp3 carbon bonded to
	// a π centre becomes a centre of type Alkyl (2 e) with the set's h(Me) and k(C,Me).
	Alkyl bool
	// Omega is the ω-technique constant (0 = off), e.g. 1.4 (Wheland & Mann 1949;
	// Streitwieser 1961, ch. 4).
	Omega float64
	// Auxiliary is the auxiliary inductive parameter δ (0 = off): every carbon centre
	// π-bonded to a heteroatom centre X gets h_C += δ·h_X (Streitwieser 1961 recommends
	// δ = 0.1). Alkyl pseudo-atoms do not induce (their h models hyperconjugation).
	Auxiliary float64

	// HEntries and KEntries are the tables as written in the file.
	HEntries []HEntry
	KEntries []KEntry
	// KLike maps a centre type to the type whose k values it borrows when no entry names
	// it directly (e.g. C+, C− and C# use the values of C).
	KLike map[CentreType]CentreType
	// KFallback, when "geometric-mean", supplies k_XY = sqrt(k_CX·k_CY) for hetero pairs
	// without an entry (k_CX looked up between sp2 carbon and X). KFallbackSource says
	// where that rule comes from.
	KFallback       string
	KFallbackSource string

	// Base names the set this one is written against: a user file (or a preset variant)
	// with base: NAME overrides entries of that set (see Merge; resolved by package presets).
	Base string

	// Replace, in a user file, means "use this file alone" instead of overriding entries
	// of the base set (see Merge).
	Replace bool

	alkylSet, omegaSet, auxSet bool // the file set these explicitly (for Merge)

	compiled bool
	h        [numTypes]float64
	hok      [numTypes]bool
	k        [numTypes][numTypes][4]float64 // [a][b][order], order 0 = any
	kok      [numTypes][numTypes][4]bool
}

// HEntry is one Coulomb parameter.
type HEntry struct {
	Type   CentreType
	H      float64
	Source string
	Line   int // line in the file it was read from, 0 if built in code
}

// KEntry is one resonance parameter between centre types A and B. Order 0 applies to any
// Kekulé bond order; 1, 2 or 3 apply only to bonds of that order and win over order 0.
type KEntry struct {
	A, B   CentreType
	Order  int
	K      float64
	Source string
	Line   int
}

// KFallbackGeometricMean is the KFallback rule k_XY = sqrt(k_CX·k_CY).
const KFallbackGeometricMean = "geometric-mean"

// ErrParams is wrapped by every error about a parameter file's content.
var ErrParams = errors.New("invalid parameter set")

// maxParamsSize caps a parameter file (they are a few kB).
const maxParamsSize = 1 << 20

// Physical ranges ParseParams enforces (the basis is on ParseParams).
const (
	MaxAbsH = 5.0 // largest |h| of an h entry
	MaxK    = 3.0 // largest k of a k entry (k must also be > 0)
)

// maxNameRunes caps the length of a parameter-set name (it appears in every output).
const maxNameRunes = 100

type fileH struct {
	Type   string   `yaml:"type"`
	H      *float64 `yaml:"h"`
	Source string   `yaml:"source"`
}

type fileK struct {
	Types  []string `yaml:"types"`
	Order  int      `yaml:"order"`
	K      *float64 `yaml:"k"`
	Source string   `yaml:"source"`
}

type fileParams struct {
	Name            string            `yaml:"name"`
	Title           string            `yaml:"title"`
	Source          string            `yaml:"source"`
	Notes           string            `yaml:"notes"`
	Alkyl           *bool             `yaml:"alkyl"`
	Omega           *float64          `yaml:"omega"`
	Auxiliary       *float64          `yaml:"auxiliary"`
	Replace         bool              `yaml:"replace"`
	Base            string            `yaml:"base"`
	KLike           map[string]string `yaml:"k_like"`
	KFallback       string            `yaml:"k_fallback"`
	KFallbackSource string            `yaml:"k_fallback_source"`
	H               []fileH           `yaml:"h"`
	K               []fileK           `yaml:"k"`
}

// ParseParams reads a parameter set in the YAML format of presets/params/*.yaml:
//
//	name: myset
//	title: One-line title
//	source: Author, Work, Year
//	alkyl: true          # hyperconjugative heteroatom model for sp3 C next to π centres
//	omega: 0             # ω-technique constant, 0 = off
//	auxiliary: 0         # auxiliary inductive parameter δ, 0 = off
//	k_like: {"C+": C}    # types that borrow another type's k values
//	k_fallback: geometric-mean
//	h:
//	  - {type: "N=", h: 0.5, source: "..."}
//	k:
//	  - {types: [C, "N="], k: 1.0, source: "..."}
//	  - {types: [C, C], order: 2, k: 1.1, source: "..."}   # order-specific
//
// Decoding is strict: unknown keys, unknown centre types, duplicate entries, missing
// values, non-finite numbers and numbers outside their physical range are errors of type
// *yamlfile.Error (wrapping ErrParams) with file:line:column. filename is used only in
// messages. Every entry needs a source.
//
// Ranges (checked so that a typo such as 1e308 or a sign slip fails with its line instead
// of printing 300-digit levels):
//   - h within ±MaxAbsH (5): h_X = (α_X − α_C)/β. The preset sets (Streitwieser 1961;
//     Van-Catledge 1980; each value with its source in presets/params) span −1.0
//     (trigonal B) to 3.0 (F), and --lewis-h caps the Lewis-acid-bound carbonyl O at 5;
//     beyond ±5 a centre sits more than 5|β| (about 12 eV with the default calibration's
//     slopes) from carbon's α, outside any atom these sets describe.
//   - k in (0, MaxK] (3): k_XY = β_XY/β_CC. Resonance integrals scale roughly with the
//     2pπ overlap (R. S. Mulliken, J. Phys. Chem. 1952, 56, 295 — from memory), and the
//     overlap of the shortest π bonds (triple bonds) is under twice that of benzene. The
//     preset sets use 0.2 to 1.1; values up to 2 for triple bonds appear in older tables
//     (from memory). k ≤ 0 would reverse or remove a bond's interaction and is an error.
//   - omega in [0, 5] and auxiliary in [0, 1] (typical 1.4 and 0.1, Streitwieser 1961).
//   - name and title are one line of printable text (name at most 100 characters); source
//     and notes may span lines but hold no other control characters.
func ParseParams(data []byte, filename string) (*Params, error) {
	if len(data) > maxParamsSize {
		return nil, &yamlfile.Error{File: filename, Msg: fmt.Sprintf("file is larger than %d bytes", maxParamsSize), Err: ErrParams}
	}
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return nil, &yamlfile.Error{File: filename, Msg: "not valid YAML: " + strings.TrimPrefix(err.Error(), "yaml: "), Err: ErrParams}
	}
	if len(root.Content) == 0 {
		return nil, &yamlfile.Error{File: filename, Msg: "empty file (expected a mapping with keys name, h, k)", Err: ErrParams}
	}
	if err := rejectAliases(&root, filename); err != nil {
		return nil, err
	}
	var fp fileParams
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(&fp); err != nil {
		line := 0
		msg := strings.TrimPrefix(err.Error(), "yaml: ")
		col := 1
		var te *yaml.TypeError
		if errors.As(err, &te) && len(te.Errors) > 0 {
			msg = te.Errors[0]
			fmt.Sscanf(msg, "line %d:", &line)
			if line > 0 {
				msg = strings.TrimSpace(msg[strings.Index(msg, ":")+1:])
			}
			msg, col = friendlyTypeError(&root, line, msg)
		}
		return nil, &yamlfile.Error{File: filename, Line: line, Col: col, Msg: msg, Err: ErrParams}
	}
	top := root.Content[0]
	if err := checkParamsText(&fp, top, filename); err != nil {
		return nil, err
	}
	p := &Params{
		Name: fp.Name, Title: fp.Title, Source: fp.Source, Notes: fp.Notes,
		Replace: fp.Replace, Base: fp.Base, KFallback: fp.KFallback, KFallbackSource: fp.KFallbackSource,
	}
	if fp.Alkyl != nil {
		p.Alkyl, p.alkylSet = *fp.Alkyl, true
	}
	if fp.Omega != nil {
		p.Omega, p.omegaSet = *fp.Omega, true
		if !finite(p.Omega) || p.Omega < 0 || p.Omega > 5 {
			n := yamlfile.Value(top, "omega")
			return nil, perr(filename, n, "omega must be between 0 and 5 (typical 1.4), got %g", p.Omega)
		}
	}
	if fp.Auxiliary != nil {
		p.Auxiliary, p.auxSet = *fp.Auxiliary, true
		if !finite(p.Auxiliary) || p.Auxiliary < 0 || p.Auxiliary > 1 {
			return nil, perr(filename, yamlfile.Value(top, "auxiliary"), "auxiliary must be between 0 and 1 (typical 0.1), got %g", p.Auxiliary)
		}
	}
	if p.KFallback != "" && p.KFallback != KFallbackGeometricMean {
		return nil, perr(filename, yamlfile.Value(top, "k_fallback"), "unknown k_fallback %s (the only rule is %q)", errtext.Quote(p.KFallback), KFallbackGeometricMean)
	}
	if len(fp.KLike) > 0 {
		p.KLike = make(map[CentreType]CentreType, len(fp.KLike))
		kl := yamlfile.Value(top, "k_like")
		for from, to := range fp.KLike {
			if typeIndex(CentreType(from)) < 0 {
				return nil, perr(filename, yamlfile.Key(kl, from), "k_like: unknown centre type %s (%s)", errtext.Quote(from), typeHint())
			}
			if typeIndex(CentreType(to)) < 0 {
				return nil, perr(filename, yamlfile.Value(kl, from), "k_like: unknown centre type %s (%s)", errtext.Quote(to), typeHint())
			}
			p.KLike[CentreType(from)] = CentreType(to)
		}
	}
	hseq := yamlfile.Value(top, "h")
	seenH := map[CentreType]bool{}
	for i, e := range fp.H {
		n := yamlfile.Item(hseq, i)
		t := CentreType(e.Type)
		if typeIndex(t) < 0 {
			return nil, perr(filename, yamlfile.Value(n, "type"), "h entry %d: unknown centre type %s (%s)", i+1, errtext.Quote(e.Type), typeHint())
		}
		if e.H == nil {
			return nil, perr(filename, n, "h entry %d (%s): missing value h", i+1, t)
		}
		if !finite(*e.H) || math.Abs(*e.H) > MaxAbsH {
			return nil, perr(filename, yamlfile.Value(n, "h"), "h entry %d (%s): h = %g is outside -%g…%g (the preset sets use -1 to 3)", i+1, t, *e.H, MaxAbsH, MaxAbsH)
		}
		if strings.TrimSpace(e.Source) == "" {
			return nil, perr(filename, n, "h entry %d (%s): missing source (say where the value comes from, or \"assumed: <rule>\")", i+1, t)
		}
		if seenH[t] {
			return nil, perr(filename, n, "h entry %d: duplicate entry for type %s", i+1, t)
		}
		seenH[t] = true
		p.HEntries = append(p.HEntries, HEntry{Type: t, H: *e.H, Source: e.Source, Line: lineOf(n)})
	}
	kseq := yamlfile.Value(top, "k")
	type kkey struct {
		a, b  CentreType
		order int
	}
	seenK := map[kkey]bool{}
	for i, e := range fp.K {
		n := yamlfile.Item(kseq, i)
		if len(e.Types) != 2 {
			return nil, perr(filename, n, "k entry %d: types must list exactly two centre types, got %d", i+1, len(e.Types))
		}
		a, b := CentreType(e.Types[0]), CentreType(e.Types[1])
		for _, t := range []CentreType{a, b} {
			if typeIndex(t) < 0 {
				return nil, perr(filename, yamlfile.Value(n, "types"), "k entry %d: unknown centre type %s (%s)", i+1, errtext.Quote(string(t)), typeHint())
			}
		}
		if e.Order < 0 || e.Order > 3 {
			return nil, perr(filename, yamlfile.Value(n, "order"), "k entry %d: order must be 1, 2 or 3 (or omitted for any order), got %d", i+1, e.Order)
		}
		if e.K == nil {
			return nil, perr(filename, n, "k entry %d (%s–%s): missing value k", i+1, a, b)
		}
		if !finite(*e.K) || *e.K <= 0 || *e.K > MaxK {
			return nil, perr(filename, yamlfile.Value(n, "k"), "k entry %d (%s–%s): k = %g must be in (0, %g] (the preset sets use 0.2 to 1.1)", i+1, a, b, *e.K, MaxK)
		}
		if strings.TrimSpace(e.Source) == "" {
			return nil, perr(filename, n, "k entry %d (%s–%s): missing source", i+1, a, b)
		}
		if typeIndex(a) > typeIndex(b) {
			a, b = b, a
		}
		key := kkey{a, b, e.Order}
		if seenK[key] {
			return nil, perr(filename, n, "k entry %d: duplicate entry for %s–%s (order %d)", i+1, a, b, e.Order)
		}
		seenK[key] = true
		p.KEntries = append(p.KEntries, KEntry{A: a, B: b, Order: e.Order, K: *e.K, Source: e.Source, Line: lineOf(n)})
	}
	if !p.Replace && p.Name == "" && len(p.HEntries) == 0 && len(p.KEntries) == 0 && !p.alkylSet && !p.omegaSet && !p.auxSet {
		return nil, &yamlfile.Error{File: filename, Msg: "no parameters found (expected keys h and k)", Err: ErrParams}
	}
	p.compile()
	return p, nil
}

// friendlyTypeError rewrites yaml.v3's decoder messages (which name Go types) in the
// file's own terms and finds the column of the offending key or value on that line.
func friendlyTypeError(root *yaml.Node, line int, msg string) (string, int) {
	where := map[string]string{
		"huckel.fileParams": "at the top level (keys: name, title, source, notes, alkyl, omega, replace, base, k_like, k_fallback, k_fallback_source, h, k)",
		"huckel.fileH":      "in an h entry (keys: type, h, source)",
		"huckel.fileK":      "in a k entry (keys: types, order, k, source)",
	}
	var token string
	if f, t, ok := strings.Cut(msg, " not found in type "); ok && strings.HasPrefix(f, "field ") {
		token = strings.TrimPrefix(f, "field ")
		if w, ok := where[t]; ok {
			msg = fmt.Sprintf("unknown key %s %s", errtext.Quote(token), w)
		}
	} else if i := strings.Index(msg, "`"); i >= 0 {
		if j := strings.Index(msg[i+1:], "`"); j >= 0 {
			token = msg[i+1 : i+1+j]
		}
		msg = strings.ReplaceAll(msg, "float64", "a number")
		msg = strings.ReplaceAll(msg, "bool", "true or false")
		msg = strings.ReplaceAll(msg, "[]huckel.fileH", "a list of h entries")
		msg = strings.ReplaceAll(msg, "[]huckel.fileK", "a list of k entries")
		msg = strings.ReplaceAll(msg, "[]string", "a list")
		msg = strings.ReplaceAll(msg, "map[string]string", "a mapping")
	}
	col := 1
	var walk func(n *yaml.Node) bool
	walk = func(n *yaml.Node) bool {
		if n.Line == line && n.Kind == yaml.ScalarNode && (token == "" || n.Value == token) {
			col = n.Column
			return true
		}
		for _, c := range n.Content {
			if walk(c) {
				return true
			}
		}
		return false
	}
	walk(root)
	return msg, col
}

// checkParamsText rejects control characters in the set's texts and an overlong name:
// they are printed in tables, headers and error messages.
func checkParamsText(fp *fileParams, top *yaml.Node, file string) error {
	for _, f := range []struct {
		key, v    string
		multiline bool
	}{
		{"name", fp.Name, false}, {"title", fp.Title, false},
		{"source", fp.Source, true}, {"notes", fp.Notes, true},
		{"k_fallback_source", fp.KFallbackSource, true},
	} {
		if bad, ok := controlChar(f.v, f.multiline); ok {
			return perr(file, yamlfile.Value(top, f.key), "%s contains the control character %s (write plain text)", f.key, errtext.Quote(string(bad)))
		}
	}
	if n := utf8.RuneCountInString(fp.Name); n > maxNameRunes {
		return perr(file, yamlfile.Value(top, "name"), "name is %d characters long; at most %d (it heads every output)", n, maxNameRunes)
	}
	for i, e := range fp.H {
		if bad, ok := controlChar(e.Source, true); ok {
			return perr(file, yamlfile.Value(yamlfile.Item(yamlfile.Value(top, "h"), i), "source"), "h entry %d: source contains the control character %s", i+1, errtext.Quote(string(bad)))
		}
	}
	for i, e := range fp.K {
		if bad, ok := controlChar(e.Source, true); ok {
			return perr(file, yamlfile.Value(yamlfile.Item(yamlfile.Value(top, "k"), i), "source"), "k entry %d: source contains the control character %s", i+1, errtext.Quote(string(bad)))
		}
	}
	return nil
}

// controlChar returns the first control character of s (C0, DEL, C1; line feed and tab
// allowed when multiline), and whether there is one.
func controlChar(s string, multiline bool) (rune, bool) {
	for _, r := range s {
		if multiline && (r == '\n' || r == '\t') {
			continue
		}
		if r < 0x20 || r >= 0x7f && r < 0xa0 {
			return r, true
		}
	}
	return 0, false
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

func typeHint() string {
	names := make([]string, len(AllCentreTypes))
	for i, t := range AllCentreTypes {
		names[i] = string(t)
	}
	return "known types: " + strings.Join(names, " ")
}

func perr(file string, n *yaml.Node, format string, args ...any) *yamlfile.Error {
	return yamlfile.At(file, n, fmt.Sprintf(format, args...), ErrParams)
}

func lineOf(n *yaml.Node) int {
	if n == nil {
		return 0
	}
	return n.Line
}

func rejectAliases(n *yaml.Node, file string) error {
	if a := yamlfile.FirstAlias(n); a != nil {
		return perr(file, a, "YAML aliases are not allowed in parameter files (write the value out)")
	}
	return nil
}

// compile precomputes the lookup arrays (K resolves KLike and the fallback once, so a
// compiled lookup is an array read).
func (p *Params) compile() {
	p.compiled = false // kSlow below must scan the entry lists
	p.hok = [numTypes]bool{}
	for _, e := range p.HEntries {
		i := typeIndex(e.Type)
		p.h[i], p.hok[i] = e.H, true
	}
	for a := 0; a < numTypes; a++ {
		for b := 0; b < numTypes; b++ {
			for o := 0; o < 4; o++ {
				p.k[a][b][o], p.kok[a][b][o] = p.kSlow(AllCentreTypes[a], AllCentreTypes[b], o)
			}
		}
	}
	p.compiled = true
}

// H returns the Coulomb parameter h of type t and whether the set defines it.
func (p *Params) H(t CentreType) (float64, bool) {
	i := typeIndex(t)
	if i < 0 {
		return 0, false
	}
	if p.compiled {
		return p.h[i], p.hok[i]
	}
	for _, e := range p.HEntries {
		if e.Type == t {
			return e.H, true
		}
	}
	return 0, false
}

// K returns the resonance parameter k between types a and b for a bond of the given
// Kekulé order (1, 2, 3; 0 = unspecified) and whether the set defines it. Lookup order:
// an entry for (a, b, order); an entry for (a, b) of any order; the same with a and b
// replaced by their KLike types; finally the KFallback rule.
func (p *Params) K(a, b CentreType, order int) (float64, bool) {
	ia, ib := typeIndex(a), typeIndex(b)
	if ia < 0 || ib < 0 {
		return 0, false
	}
	if order < 0 || order > 3 {
		order = 0
	}
	if p.compiled {
		return p.k[ia][ib][order], p.kok[ia][ib][order]
	}
	return p.kSlow(a, b, order)
}

// kDirect looks up the entry lists only (no KLike, no fallback).
func (p *Params) kDirect(a, b CentreType, order int) (float64, bool) {
	var anyOrder float64
	found := false
	for _, e := range p.KEntries {
		if (e.A == a && e.B == b) || (e.A == b && e.B == a) {
			if order > 0 && e.Order == order {
				return e.K, true
			}
			if e.Order == 0 {
				anyOrder, found = e.K, true
			}
		}
	}
	return anyOrder, found
}

func (p *Params) like(t CentreType) CentreType {
	if l, ok := p.KLike[t]; ok {
		return l
	}
	return t
}

func (p *Params) kSlow(a, b CentreType, order int) (float64, bool) {
	if k, ok := p.kDirect(a, b, order); ok {
		return k, true
	}
	la, lb := p.like(a), p.like(b)
	if la != a || lb != b {
		if k, ok := p.kDirect(la, lb, order); ok {
			return k, true
		}
		if k, ok := p.kDirect(la, b, order); ok && la != a {
			return k, true
		}
		if k, ok := p.kDirect(a, lb, order); ok && lb != b {
			return k, true
		}
	}
	if p.KFallback == KFallbackGeometricMean && la != CSp2 && lb != CSp2 {
		ka, oka := p.kDirect(CSp2, la, 0)
		kb, okb := p.kDirect(CSp2, lb, 0)
		if oka && okb {
			return math.Sqrt(ka * kb), true
		}
	}
	return 0, false
}

// Merge returns a new set: a copy of p with every entry of over replacing the entry of p
// for the same type (h) or the same type pair and order (k), and over's scalar settings
// (name, title, source, alkyl, omega, k_like, k_fallback) replacing p's when over sets
// them. If over.Replace is true, the result is a copy of over alone. Neither input is
// modified.
func (p *Params) Merge(over *Params) *Params {
	if over.Replace {
		c := over.clone()
		c.compile()
		return c
	}
	c := p.clone()
	if over.Name != "" {
		c.Name = over.Name
	}
	if over.Title != "" {
		c.Title = over.Title
	}
	if over.Source != "" {
		c.Source = over.Source
	}
	c.Base = p.Base
	if over.Notes != "" {
		c.Notes = strings.TrimSpace(c.Notes + "\n" + over.Notes)
	}
	if over.alkylSet || (!over.compiled && over.Alkyl) {
		c.Alkyl, c.alkylSet = over.Alkyl, true
	}
	if over.omegaSet || (!over.compiled && over.Omega != 0) {
		c.Omega, c.omegaSet = over.Omega, true
	}
	if over.auxSet || (!over.compiled && over.Auxiliary != 0) {
		c.Auxiliary, c.auxSet = over.Auxiliary, true
	}
	if over.KFallback != "" {
		c.KFallback, c.KFallbackSource = over.KFallback, over.KFallbackSource
	}
	for t, l := range over.KLike {
		if c.KLike == nil {
			c.KLike = map[CentreType]CentreType{}
		}
		c.KLike[t] = l
	}
	for _, e := range over.HEntries {
		i := slices.IndexFunc(c.HEntries, func(x HEntry) bool { return x.Type == e.Type })
		if i >= 0 {
			c.HEntries[i] = e
		} else {
			c.HEntries = append(c.HEntries, e)
		}
	}
	for _, e := range over.KEntries {
		i := slices.IndexFunc(c.KEntries, func(x KEntry) bool {
			return x.Order == e.Order && ((x.A == e.A && x.B == e.B) || (x.A == e.B && x.B == e.A))
		})
		if i >= 0 {
			c.KEntries[i] = e
		} else {
			c.KEntries = append(c.KEntries, e)
		}
	}
	c.compile()
	return c
}

func (p *Params) clone() *Params {
	c := &Params{
		Name: p.Name, Title: p.Title, Source: p.Source, Notes: p.Notes,
		Alkyl: p.Alkyl, Omega: p.Omega, Base: p.Base, Replace: p.Replace, KFallback: p.KFallback, KFallbackSource: p.KFallbackSource,
		Auxiliary: p.Auxiliary, alkylSet: p.alkylSet, omegaSet: p.omegaSet, auxSet: p.auxSet,
	}
	c.HEntries = slices.Clone(p.HEntries)
	c.KEntries = slices.Clone(p.KEntries)
	if p.KLike != nil {
		c.KLike = make(map[CentreType]CentreType, len(p.KLike))
		for k, v := range p.KLike {
			c.KLike[k] = v
		}
	}
	return c
}

// Compile precomputes the lookup tables of a Params built as a literal. ParseParams and
// Merge call it themselves; call it again after editing the entry lists.
func (p *Params) Compile() { p.compile() }

// WithH returns a copy of p in which type t has Coulomb parameter h (with the given
// source), e.g. to vary the Lewis-acid strength through h(O=LA). p is not modified.
func (p *Params) WithH(t CentreType, h float64, source string) *Params {
	if typeIndex(t) < 0 {
		panic(fmt.Sprintf("huckel: WithH: unknown centre type %q", t))
	}
	return p.Merge(&Params{HEntries: []HEntry{{Type: t, H: h, Source: source}}, compiled: true})
}
