package ppp

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"cyclopair/huckel"
	"cyclopair/huckel/yamlfile"

	"go.yaml.in/yaml/v3"
)

// Two-centre repulsion formulas (Params.Gamma).
const (
	// GammaMatagaNishimoto is γ_ij = e²/(r_ij + a_ij), a_ij = 2e²/(γ_ii + γ_jj)
	// (N. Mataga, K. Nishimoto, Z. Phys. Chem. (Frankfurt) 1957, 13, 140).
	GammaMatagaNishimoto = "mataga-nishimoto"
	// GammaOhno is γ_ij = e²/sqrt(r_ij² + a_ij²), a_ij = 2e²/(γ_ii + γ_jj)
	// (K. Ohno, Theor. Chim. Acta 1964, 2, 219).
	GammaOhno = "ohno"
)

// E2 is e²/(4πε₀) in eV·Å (CODATA: 14.399 645 eV·Å; rounded as in the PPP literature to
// 14.397, the value 1 hartree·bohr = 27.2114 eV × 0.529177 Å).
const E2 = 27.211386 * 0.529177211

// BohrÅ is the Bohr radius in Å (CODATA 2018).
const BohrÅ = 0.529177211

// Centre holds the PPP parameters of one centre type.
type Centre struct {
	Type huckel.CentreType
	// IP is the valence-state ionisation potential (eV) of the state with one electron in
	// the π orbital: the core integral is U = −IP. For two-electron donors (pyrrole N,
	// ether O, halogens) it is the ionisation of the cation valence state (N⁺, O⁺ …), so
	// the isolated donor level lies at U + γ = −(IP − γ).
	IP float64
	// Gamma is the one-centre repulsion γ_ii (eV), Pariser's I − A.
	Gamma float64
	// Z is the core charge the centre's π core carries (the charge left when all its π
	// electrons are removed): 1 for C, pyridine N, carbonyl O, O⁻, N⁻; 2 for pyrrole N,
	// ether O, halogens, iminium N⁺, oxonium O⁺; 0 for trigonal B. Fractional values are
	// allowed (Lewis-acid-bound O).
	Z      float64
	Source string
	Line   int // line in the file, 0 if built in code
}

// Params is a PPP parameter set: one Centre entry per π centre type, the two-centre
// repulsion formula, the resonance-integral distance law and the geometry scale. Sets
// are YAML data (Parse); the built-in ones are embedded in package presets.
type Params struct {
	Name, Title, Source, Notes string

	// Gamma is GammaMatagaNishimoto or GammaOhno; GammaSource says why.
	Gamma       string
	GammaSource string

	// Beta0 (eV, negative) is the C–C resonance integral at distance R0 (Å). The distance
	// law is Mulliken's proportionality of β to the overlap integral of two carbon 2pπ
	// Slater orbitals of exponent Zeta: β(r) = Beta0·S(r)/S(R0), with
	// S = e^{−p}(1 + p + 2p²/5 + p³/15), p = Zeta·r/a₀ (R. S. Mulliken, C. A. Rieke,
	// D. Orloff, H. Orloff, J. Chem. Phys. 1949, 17, 1248). A π bond with Hückel
	// resonance parameter k (PiBond.K) gets β_ij = k·β(r_ij).
	Beta0, R0, Zeta float64
	BetaSource      string

	// BondLength (Å) scales the 2D layout of huckel/depict: the layout is multiplied so
	// that the mean distance over the π bonds is BondLength.
	BondLength     float64
	GeometrySource string

	// Base names the built-in set a user file overrides (see Merge); Replace means the file
	// stands alone.
	Base    string
	Replace bool

	Centres []Centre

	byType [numTypes]int // 1 + index into Centres, 0 = absent (compiled)
}

// numTypes is len(huckel.AllCentreTypes) (checked by TestParamsCoverAllTypes).
const numTypes = 26

func typeIndex(t huckel.CentreType) int { return slices.Index(huckel.AllCentreTypes, t) }

// Lookup returns the parameters of type t and whether the set has them.
func (p *Params) Lookup(t huckel.CentreType) (Centre, bool) {
	i := typeIndex(t)
	if i < 0 {
		return Centre{}, false
	}
	if k := p.byType[i]; k > 0 {
		return p.Centres[k-1], true
	}
	for _, c := range p.Centres { // a Params built as a literal
		if c.Type == t {
			return c, true
		}
	}
	return Centre{}, false
}

// AlphaEV is the Fock diagonal of a neutral sp2 carbon with unit π population among
// neutral neighbours, U_C + γ_CC/2 (eV): the α of the x scale (see Orbitals.AlphaEV).
// It returns NaN when the set has no carbon entry.
func (p *Params) AlphaEV() float64 {
	c, ok := p.Lookup(huckel.CSp2)
	if !ok {
		return math.NaN()
	}
	return -c.IP + c.Gamma/2
}

// Beta returns the C–C resonance integral (eV) at distance r (Å) by the overlap law.
func (p *Params) Beta(r float64) float64 {
	return p.Beta0 * overlapPP(p.Zeta*r/BohrÅ) / overlapPP(p.Zeta*p.R0/BohrÅ)
}

// overlapPP is the overlap of two 2pπ Slater orbitals with equal exponents at reduced
// distance p = ζR/a₀ (Mulliken et al. 1949).
func overlapPP(p float64) float64 {
	return math.Exp(-p) * (1 + p + 2*p*p/5 + p*p*p/15)
}

// GammaIJ is the two-centre repulsion (eV) between centres with one-centre values gi and
// gj at distance r (Å) by the set's formula; r = 0 gives (gi + gj)/2.
func (p *Params) GammaIJ(gi, gj, r float64) float64 {
	a := 2 * E2 / (gi + gj)
	if p.Gamma == GammaOhno {
		return E2 / math.Sqrt(r*r+a*a)
	}
	return E2 / (r + a)
}

func (p *Params) compile() {
	p.byType = [numTypes]int{}
	for i, c := range p.Centres {
		p.byType[typeIndex(c.Type)] = i + 1
	}
}

type fileCentre struct {
	Type   string   `yaml:"type"`
	IP     *float64 `yaml:"ip"`
	Gamma  *float64 `yaml:"gamma"`
	Z      *float64 `yaml:"z"`
	Source string   `yaml:"source"`
}

type fileBeta struct {
	Value  *float64 `yaml:"value"`
	R0     *float64 `yaml:"r0"`
	Zeta   *float64 `yaml:"zeta"`
	Source string   `yaml:"source"`
}

type fileGeometry struct {
	BondLength *float64 `yaml:"bond_length"`
	Source     string   `yaml:"source"`
}

type fileParams struct {
	Name        string        `yaml:"name"`
	Title       string        `yaml:"title"`
	Source      string        `yaml:"source"`
	Notes       string        `yaml:"notes"`
	Base        string        `yaml:"base"`
	Replace     bool          `yaml:"replace"`
	Gamma       string        `yaml:"gamma"`
	GammaSource string        `yaml:"gamma_source"`
	Beta        *fileBeta     `yaml:"beta"`
	Geometry    *fileGeometry `yaml:"geometry"`
	Centres     []fileCentre  `yaml:"centres"`
}

// maxParamsSize caps a parameter file.
const maxParamsSize = 1 << 20

// Parse reads a PPP parameter set in the YAML format of presets/ppp/*.yaml:
//
//	name: myset
//	gamma: mataga-nishimoto          # or ohno
//	gamma_source: "…"
//	beta: {value: -2.39, r0: 1.397, zeta: 1.625, source: "…"}
//	geometry: {bond_length: 1.40, source: "…"}
//	centres:
//	  - {type: C, ip: 11.16, gamma: 11.13, z: 1, source: "…"}
//
// A complete set needs gamma, beta and geometry; a user file with base: NAME (or none,
// meaning the default set) may give only the entries it overrides (see Merge). Decoding
// is strict: unknown keys and centre types, duplicates, missing values and sources, and
// values outside physical ranges are *yamlfile.Error values (wrapping
// huckel.ErrParams) with file:line:column. filename is used only in messages.
func Parse(data []byte, filename string) (*Params, error) {
	if len(data) > maxParamsSize {
		return nil, &yamlfile.Error{Err: huckel.ErrParams, File: filename, Msg: fmt.Sprintf("file is larger than %d bytes", maxParamsSize)}
	}
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return nil, &yamlfile.Error{Err: huckel.ErrParams, File: filename, Msg: "not valid YAML: " + strings.TrimPrefix(err.Error(), "yaml: ")}
	}
	if len(root.Content) == 0 {
		return nil, &yamlfile.Error{Err: huckel.ErrParams, File: filename, Msg: "empty file (expected a mapping with keys name, gamma, beta, geometry, centres)"}
	}
	if err := noAliases(&root, filename); err != nil {
		return nil, err
	}
	var fp fileParams
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(&fp); err != nil {
		line, msg := 0, strings.TrimPrefix(err.Error(), "yaml: ")
		var te *yaml.TypeError
		if errors.As(err, &te) && len(te.Errors) > 0 {
			msg = te.Errors[0]
			fmt.Sscanf(msg, "line %d:", &line)
			if line > 0 {
				msg = strings.TrimSpace(msg[strings.Index(msg, ":")+1:])
			}
			if f, ty, ok := strings.Cut(msg, " not found in type "); ok && strings.HasPrefix(f, "field ") {
				msg = fmt.Sprintf("unknown key %q in %s", strings.TrimPrefix(f, "field "), ty)
			}
			msg = strings.NewReplacer("ppp.fileParams", "the top level (keys: name, title, source, notes, base, replace, gamma, gamma_source, beta, geometry, centres)",
				"ppp.fileCentre", "a centres entry (keys: type, ip, gamma, z, source)",
				"ppp.fileBeta", "beta (keys: value, r0, zeta, source)",
				"ppp.fileGeometry", "geometry (keys: bond_length, source)",
				"*float64", "a number", "float64", "a number").Replace(msg)
		}
		return nil, &yamlfile.Error{Err: huckel.ErrParams, File: filename, Line: line, Col: 1, Msg: msg}
	}
	top := root.Content[0]
	p := &Params{Name: fp.Name, Title: fp.Title, Source: fp.Source, Notes: fp.Notes,
		Base: fp.Base, Replace: fp.Replace, Gamma: fp.Gamma, GammaSource: fp.GammaSource}
	switch p.Gamma {
	case "", GammaMatagaNishimoto, GammaOhno:
	default:
		return nil, at(filename, yamlfile.Value(top, "gamma"), "unknown gamma formula %q (use %s or %s)", p.Gamma, GammaMatagaNishimoto, GammaOhno)
	}
	if p.Gamma != "" && strings.TrimSpace(p.GammaSource) == "" {
		return nil, at(filename, yamlfile.Value(top, "gamma"), "gamma: missing gamma_source (say why this formula)")
	}
	if b := fp.Beta; b != nil {
		n := yamlfile.Value(top, "beta")
		if b.Value == nil || b.R0 == nil || b.Zeta == nil {
			return nil, at(filename, n, "beta needs value, r0 and zeta")
		}
		p.Beta0, p.R0, p.Zeta, p.BetaSource = *b.Value, *b.R0, *b.Zeta, b.Source
		if !(p.Beta0 < 0 && p.Beta0 > -10) || !(p.R0 > 0.5 && p.R0 < 3) || !(p.Zeta > 0.5 && p.Zeta < 5) {
			return nil, at(filename, n, "beta: value must be in (−10, 0) eV, r0 in (0.5, 3) Å, zeta in (0.5, 5); got %g, %g, %g", p.Beta0, p.R0, p.Zeta)
		}
		if strings.TrimSpace(b.Source) == "" {
			return nil, at(filename, n, "beta: missing source")
		}
	}
	if g := fp.Geometry; g != nil {
		n := yamlfile.Value(top, "geometry")
		if g.BondLength == nil || !(*g.BondLength > 0.8 && *g.BondLength < 2.5) {
			return nil, at(filename, n, "geometry: bond_length must be given, in (0.8, 2.5) Å")
		}
		if strings.TrimSpace(g.Source) == "" {
			return nil, at(filename, n, "geometry: missing source")
		}
		p.BondLength, p.GeometrySource = *g.BondLength, g.Source
	}
	seq := yamlfile.Value(top, "centres")
	seen := map[huckel.CentreType]bool{}
	for i, e := range fp.Centres {
		n := yamlfile.Item(seq, i)
		t := huckel.CentreType(e.Type)
		switch {
		case typeIndex(t) < 0:
			return nil, at(filename, yamlfile.Value(n, "type"), "centres entry %d: unknown centre type %q", i+1, e.Type)
		case e.IP == nil || e.Gamma == nil || e.Z == nil:
			return nil, at(filename, n, "centres entry %d (%s): needs ip, gamma and z", i+1, t)
		case !(*e.IP > 0 && *e.IP < 60):
			return nil, at(filename, yamlfile.Value(n, "ip"), "centres entry %d (%s): ip = %g eV is outside (0, 60)", i+1, t, *e.IP)
		case !(*e.Gamma > 1 && *e.Gamma < 40):
			return nil, at(filename, yamlfile.Value(n, "gamma"), "centres entry %d (%s): gamma = %g eV is outside (1, 40)", i+1, t, *e.Gamma)
		case !(*e.Z >= 0 && *e.Z <= 3):
			return nil, at(filename, yamlfile.Value(n, "z"), "centres entry %d (%s): z = %g is outside [0, 3]", i+1, t, *e.Z)
		case strings.TrimSpace(e.Source) == "":
			return nil, at(filename, n, "centres entry %d (%s): missing source (say where the values come from, or \"assumed: <rule>\")", i+1, t)
		case seen[t]:
			return nil, at(filename, n, "centres entry %d: duplicate entry for type %s", i+1, t)
		}
		seen[t] = true
		p.Centres = append(p.Centres, Centre{Type: t, IP: *e.IP, Gamma: *e.Gamma, Z: *e.Z, Source: e.Source, Line: n.Line})
	}
	if p.Name == "" && len(p.Centres) == 0 && fp.Beta == nil && fp.Geometry == nil && p.Gamma == "" {
		return nil, &yamlfile.Error{Err: huckel.ErrParams, File: filename, Msg: "no parameters found (expected keys gamma, beta, geometry, centres)"}
	}
	if p.Replace || (p.Base == "" && p.Name != "" && fp.Beta != nil) {
		if err := p.complete(filename); err != nil {
			return nil, err
		}
	}
	p.compile()
	return p, nil
}

// complete checks that a stand-alone set has everything the solver needs.
func (p *Params) complete(filename string) error {
	var miss []string
	if p.Gamma == "" {
		miss = append(miss, "gamma")
	}
	if p.Beta0 == 0 {
		miss = append(miss, "beta")
	}
	if p.BondLength == 0 {
		miss = append(miss, "geometry")
	}
	if !slices.ContainsFunc(p.Centres, func(c Centre) bool { return c.Type == huckel.CSp2 }) {
		miss = append(miss, "a centres entry for type C")
	}
	if len(miss) > 0 {
		return &yamlfile.Error{Err: huckel.ErrParams, File: filename, Msg: "incomplete parameter set: missing " + strings.Join(miss, ", ") + " (or write base: NAME to override a built-in set)"}
	}
	return nil
}

// Merge returns a copy of p with every setting and centre entry that over gives replacing
// p's (over.Replace: over alone). Neither input is modified.
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
	if over.Notes != "" {
		c.Notes = strings.TrimSpace(c.Notes + "\n" + over.Notes)
	}
	if over.Gamma != "" {
		c.Gamma, c.GammaSource = over.Gamma, over.GammaSource
	}
	if over.Beta0 != 0 {
		c.Beta0, c.R0, c.Zeta, c.BetaSource = over.Beta0, over.R0, over.Zeta, over.BetaSource
	}
	if over.BondLength != 0 {
		c.BondLength, c.GeometrySource = over.BondLength, over.GeometrySource
	}
	for _, e := range over.Centres {
		if i := slices.IndexFunc(c.Centres, func(x Centre) bool { return x.Type == e.Type }); i >= 0 {
			c.Centres[i] = e
		} else {
			c.Centres = append(c.Centres, e)
		}
	}
	c.compile()
	return c
}

func (p *Params) clone() *Params {
	c := *p
	c.Centres = slices.Clone(p.Centres)
	return &c
}

// WithCentre returns a copy of p in which type t has the given parameters (for model
// studies, e.g. the strength of a Lewis acid through the O=LA entry). p is not modified.
func (p *Params) WithCentre(e Centre) *Params {
	if typeIndex(e.Type) < 0 {
		panic(fmt.Sprintf("ppp: WithCentre: unknown centre type %q", e.Type))
	}
	return p.Merge(&Params{Centres: []Centre{e}})
}

func at(file string, n *yaml.Node, format string, args ...any) *yamlfile.Error {
	return yamlfile.At(file, n, fmt.Sprintf(format, args...), huckel.ErrParams)
}

func noAliases(n *yaml.Node, file string) error {
	if a := yamlfile.FirstAlias(n); a != nil {
		return at(file, a, "YAML aliases are not allowed in parameter files (write the value out)")
	}
	return nil
}

func init() {
	if len(huckel.AllCentreTypes) != numTypes {
		panic("ppp: numTypes does not match huckel.AllCentreTypes")
	}
}
