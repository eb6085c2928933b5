// Package check measures the pair theory of package fmo against the outside world: the
// literature check set (checkset.go loads it, validate.go runs it, compare.go compares
// outcomes and ranks series) and the x → eV calibration (calibrate.go: reading
// calibration data, fitting it, and reading and writing calibration files).
package check

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"

	"go.yaml.in/yaml/v3"

	"cyclopair/fmo"
	"cyclopair/huckel/smiles"
	"cyclopair/huckel/yamlfile"
	"cyclopair/presets/literature"
)

// Check-set categories.
const (
	CategoryRegio  = "regio"
	CategoryEndo   = "endo"
	CategoryDemand = "demand"
	CategorySite   = "site"
)

// Categories lists the case categories in report order.
func Categories() []string {
	return []string{CategoryRegio, CategorySite, CategoryEndo, CategoryDemand}
}

// Confidence values of a check-set entry.
const (
	ConfidenceSourceFound = "source-found"
	ConfidenceFromMemory  = "from memory"
)

// ErrCheckSet is wrapped by every error about a check-set file's content (a
// *yamlfile.Error with the file, line and column).
var ErrCheckSet = errors.New("invalid check set")

// CasePartner is one partner of a case: a name and a SMILES whose atom maps (atom classes)
// pin the atoms the expected outcome talks about. Validate removes the maps before the
// analysis, so they never restrict which sites the engine considers.
type CasePartner struct {
	Name   string `yaml:"name"`
	SMILES string `yaml:"smiles"`
}

// Expect is the observed outcome of a case, in the engine's terms. Atom numbers are atom-map
// numbers of the case SMILES.
type Expect struct {
	Bonds           [][2]int `yaml:"bonds"`            // regio: [diene map, dienophile map] × 2
	Product         string   `yaml:"product"`          // SMILES of the observed adduct
	Label           string   `yaml:"label"`            // ortho | meta | para
	Endo            string   `yaml:"endo"`             // endo | exo
	Demand          string   `yaml:"demand"`           // normal | inverse | neutral
	Sustmann        string   `yaml:"sustmann"`         // I | II | III
	DieneAtoms      []int    `yaml:"diene_atoms"`      // site: maps of the diene atoms forming bonds
	DienophileAtoms []int    `yaml:"dienophile_atoms"` // site: maps of the dienophile atoms forming bonds
}

// Case is one literature fact about one pair.
type Case struct {
	ID         string      `yaml:"id"`
	Category   string      `yaml:"category"`
	Diene      CasePartner `yaml:"diene"`
	Dienophile CasePartner `yaml:"dienophile"`
	Activation string      `yaml:"activation"`
	Expect     Expect      `yaml:"expect"`
	Observed   string      `yaml:"observed"`
	Source     string      `yaml:"source"`
	Confidence string      `yaml:"confidence"`
	// KnownMiss, when set, records that the method gets this case wrong and why.
	KnownMiss string `yaml:"known_miss"`
	Line      int    `yaml:"-"` // line of the case in its file
}

// SeriesMember is one 2π partner of a reactivity series with its measured rate constant.
type SeriesMember struct {
	Name   string  `yaml:"name"`
	SMILES string  `yaml:"smiles"`
	K      float64 `yaml:"k"` // second-order rate constant, L mol⁻¹ s⁻¹
}

// Reactivity figures a series can be ranked by.
const (
	FigureGapNormal     = "gap_normal"    // smaller normal gap = faster
	FigureStabilization = "stabilization" // larger stabilization of the preferred orientation = faster
)

// Series is a measured reactivity series: one 4π partner against several 2π partners.
type Series struct {
	ID         string         `yaml:"id"`
	Name       string         `yaml:"name"`
	Diene      CasePartner    `yaml:"diene"`
	Figure     string         `yaml:"figure"`
	MinRho     float64        `yaml:"min_rho"`
	Source     string         `yaml:"source"`
	Confidence string         `yaml:"confidence"`
	Members    []SeriesMember `yaml:"members"`
	KnownMiss  string         `yaml:"known_miss"`
	Line       int            `yaml:"-"`
}

// CheckSet is a loaded check-set file.
type CheckSet struct {
	File   string
	Cases  []Case   `yaml:"cases"`
	Series []Series `yaml:"series"`
}

// BundledCheckSet loads the check set shipped with cyclopair (presets/literature/cases.yaml).
func BundledCheckSet() (*CheckSet, error) {
	return LoadCheckSet(bytes.NewReader(literature.CasesYAML), literature.CasesName)
}

// LoadCheckSet reads a check-set file (format: see presets/literature/cases.yaml). Decoding
// is strict: unknown keys, aliases, missing fields, unknown categories, confidences or
// outcome words, unparsable SMILES and atom maps that do not occur exactly once in their
// SMILES are errors of type *yamlfile.Error (wrapping ErrCheckSet) with file:line:column.
func LoadCheckSet(r io.Reader, filename string) (*CheckSet, error) {
	data, err := readCapped(r, filename, ErrCheckSet, "")
	if err != nil {
		return nil, err
	}
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return nil, &yamlfile.Error{File: filename, Msg: err.Error(), Err: ErrCheckSet}
	}
	if err := rejectAliasNodes(&root, filename); err != nil {
		return nil, err
	}
	if err := yamlfile.CheckKeys(&root, checkSetSchema, filename, "", ErrCheckSet); err != nil {
		return nil, err
	}
	set := &CheckSet{File: filename}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(set); err != nil {
		return nil, &yamlfile.Error{File: filename, Msg: strings.ReplaceAll(err.Error(), "\n", ";"), Err: ErrCheckSet}
	}
	set.File = filename
	// positions of list items
	var casesNode, seriesNode *yaml.Node
	if len(root.Content) == 1 && root.Content[0].Kind == yaml.MappingNode {
		m := root.Content[0]
		for i := 0; i+1 < len(m.Content); i += 2 {
			switch m.Content[i].Value {
			case "cases":
				casesNode = m.Content[i+1]
			case "series":
				seriesNode = m.Content[i+1]
			}
		}
	}
	at := func(n *yaml.Node, i int) *yaml.Node {
		if n != nil && n.Kind == yaml.SequenceNode && i < len(n.Content) {
			return n.Content[i]
		}
		return nil
	}
	if len(set.Cases) == 0 && len(set.Series) == 0 {
		return nil, &yamlfile.Error{File: filename, Msg: "no cases and no series (expected top-level keys cases: and series:)", Err: ErrCheckSet}
	}
	ids := map[string]bool{}
	for i := range set.Cases {
		n := at(casesNode, i)
		if n != nil {
			set.Cases[i].Line = n.Line
		}
		if err := checkCase(&set.Cases[i], n, filename, ids); err != nil {
			return nil, err
		}
	}
	for i := range set.Series {
		n := at(seriesNode, i)
		if n != nil {
			set.Series[i].Line = n.Line
		}
		if err := checkSeries(&set.Series[i], n, filename, ids); err != nil {
			return nil, err
		}
	}
	return set, nil
}

// checkSetSchema lists the keys each mapping of a check set may hold, by path shape.
var checkSetSchema = map[string][]string{
	"":                   {"cases", "series"},
	"cases[]":            {"id", "category", "diene", "dienophile", "activation", "expect", "observed", "source", "confidence", "known_miss"},
	"cases[].diene":      {"name", "smiles"},
	"cases[].dienophile": {"name", "smiles"},
	"cases[].expect":     {"bonds", "product", "label", "endo", "demand", "sustmann", "diene_atoms", "dienophile_atoms"},
	"series[]":           {"id", "name", "diene", "figure", "min_rho", "source", "confidence", "members", "known_miss"},
	"series[].diene":     {"name", "smiles"},
	"series[].members[]": {"name", "smiles", "k"},
}

func rejectAliasNodes(n *yaml.Node, file string) error {
	if a := yamlfile.FirstAlias(n); a != nil {
		return &yamlfile.Error{File: file, Line: a.Line, Col: a.Column, Msg: "YAML aliases are not allowed in a check set (write the value out)", Err: ErrCheckSet}
	}
	return nil
}

func checkCase(c *Case, n *yaml.Node, file string, ids map[string]bool) error {
	fail := func(msg string, key ...string) error {
		l, col := yamlfile.FieldPos(n, key...)
		id := c.ID
		if id == "" {
			id = "case"
		}
		return &yamlfile.Error{File: file, Line: l, Col: col, Msg: id + ": " + msg, Err: ErrCheckSet}
	}
	if c.ID == "" {
		return fail("missing id")
	}
	if ids[c.ID] {
		return fail("duplicate id "+c.ID, "id")
	}
	ids[c.ID] = true
	if !slices.Contains(Categories(), c.Category) {
		return fail(fmt.Sprintf("unknown category %q (use one of %s)", c.Category, strings.Join(Categories(), ", ")), "category")
	}
	if c.Activation == "" {
		c.Activation = fmo.ActivateNone
	}
	if !slices.Contains(fmo.Modes(), c.Activation) {
		return fail(fmt.Sprintf("unknown activation %q (use one of %s)", c.Activation, strings.Join(fmo.Modes(), ", ")), "activation")
	}
	if c.Source == "" {
		return fail("missing source (authors, journal or book, year)")
	}
	if c.Confidence != ConfidenceSourceFound && c.Confidence != ConfidenceFromMemory {
		return fail(fmt.Sprintf("confidence %q must be %q or %q", c.Confidence, ConfidenceSourceFound, ConfidenceFromMemory), "confidence")
	}
	dm, err := caseMaps(c.Diene)
	if err != nil {
		return fail("diene: "+err.Error(), "diene", "smiles")
	}
	em, err := caseMaps(c.Dienophile)
	if err != nil {
		return fail("dienophile: "+err.Error(), "dienophile", "smiles")
	}
	needMap := func(maps map[int]int, ns []int, which string, key ...string) error {
		for _, x := range ns {
			if _, ok := maps[x]; !ok {
				return fail(fmt.Sprintf("atom map %d does not occur in the %s SMILES", x, which), key...)
			}
		}
		return nil
	}
	e := c.Expect
	switch c.Category {
	case CategoryRegio:
		if len(e.Bonds) != 2 {
			return fail("a regio case needs expect.bonds: two [diene map, dienophile map] pairs", "expect")
		}
		for _, b := range e.Bonds {
			if err := needMap(dm, b[:1], "diene", "expect", "bonds"); err != nil {
				return err
			}
			if err := needMap(em, b[1:], "dienophile", "expect", "bonds"); err != nil {
				return err
			}
		}
		if e.Label != "" && e.Label != "ortho" && e.Label != "meta" && e.Label != "para" {
			return fail(fmt.Sprintf("label %q must be ortho, meta or para", e.Label), "expect", "label")
		}
	case CategorySite:
		if len(e.DieneAtoms) == 0 && len(e.DienophileAtoms) == 0 {
			return fail("a site case needs expect.diene_atoms or expect.dienophile_atoms", "expect")
		}
		if err := needMap(dm, e.DieneAtoms, "diene", "expect", "diene_atoms"); err != nil {
			return err
		}
		if err := needMap(em, e.DienophileAtoms, "dienophile", "expect", "dienophile_atoms"); err != nil {
			return err
		}
	case CategoryEndo:
		if e.Endo != "endo" && e.Endo != "exo" {
			return fail(fmt.Sprintf("expect.endo %q must be endo or exo", e.Endo), "expect")
		}
	case CategoryDemand:
		if e.Demand != "normal" && e.Demand != "inverse" && e.Demand != "neutral" {
			return fail(fmt.Sprintf("expect.demand %q must be normal, inverse or neutral", e.Demand), "expect")
		}
		if e.Sustmann != "" && e.Sustmann != "I" && e.Sustmann != "II" && e.Sustmann != "III" {
			return fail(fmt.Sprintf("expect.sustmann %q must be I, II or III", e.Sustmann), "expect", "sustmann")
		}
	}
	if e.Product != "" {
		if _, err := smiles.Parse(e.Product); err != nil {
			return fail("expect.product: "+err.Error(), "expect", "product")
		}
	}
	return nil
}

func checkSeries(s *Series, n *yaml.Node, file string, ids map[string]bool) error {
	fail := func(msg string, key ...string) error {
		l, col := yamlfile.FieldPos(n, key...)
		return &yamlfile.Error{File: file, Line: l, Col: col, Msg: s.ID + ": " + msg, Err: ErrCheckSet}
	}
	if s.ID == "" {
		return fail("missing id")
	}
	if ids[s.ID] {
		return fail("duplicate id", "id")
	}
	ids[s.ID] = true
	if s.Figure != FigureGapNormal && s.Figure != FigureStabilization {
		return fail(fmt.Sprintf("figure %q must be %s or %s", s.Figure, FigureGapNormal, FigureStabilization), "figure")
	}
	if s.Source == "" {
		return fail("missing source")
	}
	if s.Confidence != ConfidenceSourceFound && s.Confidence != ConfidenceFromMemory {
		return fail(fmt.Sprintf("confidence %q must be %q or %q", s.Confidence, ConfidenceSourceFound, ConfidenceFromMemory), "confidence")
	}
	if len(s.Members) < 3 {
		return fail("a series needs at least 3 members", "members")
	}
	if _, err := smiles.Parse(s.Diene.SMILES); err != nil {
		return fail("diene: "+err.Error(), "diene", "smiles")
	}
	for _, m := range s.Members {
		if _, err := smiles.Parse(m.SMILES); err != nil {
			return fail(m.Name+": "+err.Error(), "members")
		}
		if !(m.K > 0) || math.IsInf(m.K, 0) {
			return fail(m.Name+": rate constant k must be a positive number", "members")
		}
	}
	return nil
}

// caseMaps parses a case partner and returns map number → atom index; a map number used on
// more than one atom is an error.
func caseMaps(p CasePartner) (map[int]int, error) {
	if p.SMILES == "" {
		return nil, errors.New("missing smiles")
	}
	m, err := smiles.Parse(p.SMILES)
	if err != nil {
		return nil, err
	}
	out := map[int]int{}
	for i, a := range m.Atoms {
		if a.Map == 0 {
			continue
		}
		if _, dup := out[a.Map]; dup {
			return nil, fmt.Errorf("atom map %d used twice", a.Map)
		}
		out[a.Map] = i
	}
	return out, nil
}
