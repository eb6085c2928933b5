package presets

// The kinetics and selectivity set (presets/kinetics/rates.yaml and selectivity.yaml):
// published rate series and regio and endo:exo ratios of cycloadditions, each row with its
// source and confidence, for fitting and testing a rate model. See the header comments of the
// two files for the format and for how the values were gathered (mostly from memory).

import (
	"bytes"
	"crypto/sha256"
	_ "embed"
	"encoding/hex"
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"

	"go.yaml.in/yaml/v3"
)

//go:embed kinetics/rates.yaml
var kineticsRatesYAML []byte

//go:embed kinetics/selectivity.yaml
var kineticsSelectivityYAML []byte

// Names the kinetics errors and the checksum use for the two embedded files.
const (
	KineticsRatesName       = "presets/kinetics/rates.yaml"
	KineticsSelectivityName = "presets/kinetics/selectivity.yaml"
)

// Confidence words of the kinetics set (the same words as the check set's).
const (
	ConfidenceSourceFound = "source-found" // read in a source during the work that entered it
	ConfidenceFromMemory  = "from memory"  // recalled, not re-checked
)

// KineticsPartner is a named structure of the kinetics set.
type KineticsPartner struct {
	Name   string `yaml:"name"`
	SMILES string `yaml:"smiles"`
}

// RolePartner is a partner together with its role: "diene" (the 4π partner: diene,
// hetero-diene or 1,3-dipole) or "dienophile" (the 2π partner).
type RolePartner struct {
	Role   string `yaml:"role"`
	Name   string `yaml:"name"`
	SMILES string `yaml:"smiles"`
}

// Partner returns the name and SMILES without the role.
func (p RolePartner) Partner() KineticsPartner {
	return KineticsPartner{Name: p.Name, SMILES: p.SMILES}
}

// RateSeries is one series of rates.yaml: a fixed partner and rows that vary the other one
// (or the activation, or the solvent).
type RateSeries struct {
	ID, Title    string
	Kind         string // "series" (a published series, at least 5 rows) or "set" (a small comparison)
	Fixed        RolePartner
	Varied       string  // "diene", "dienophile", "activation" or "solvent"
	TemperatureC float64 // the series' temperature; rows may differ (RateRow.TemperatureC); valid only when HasTemperature
	// HasTemperature is false when the source read does not state the temperature (the file
	// then omits temperature_C rather than guessing one).
	HasTemperature bool
	Solvent        string // the series' solvent; rows may differ (RateRow.Solvent)
	Reference      string // name of the reference row
	Source         string
	Confidence     string
	Note           string
	// OutsideModel, when not empty, says why the series is listed and predicted but not
	// fitted: its rows differ in something the rate model's descriptors cannot represent
	// (the file's outside_model field; a series varying only the solvent is outside the
	// model without it).
	OutsideModel string
	Rows         []RateRow
	RefIndex     int // index of the reference row in Rows
}

// RateRow is one measured reaction of a series. The values are as entered (K2 or KRel, the
// other zero); Log10KRel and Log10K are computed by the loader.
type RateRow struct {
	Partner          KineticsPartner // the varied partner; its role is the other one than Fixed.Role
	Activation       string          // "none", "proton", "lewis" or "iminium"
	Catalyst         string          // the catalyst by class, "" for activation none
	K2               float64         // M^-1 s^-1 as entered, 0 when the row gives KRel
	KRel             float64         // relative to the series' reference as entered, 0 when the row gives K2
	UncertaintyLog10 float64         // uncertainty of log10 of the value as entered (1.0: order of magnitude)
	TemperatureC     float64         // effective (the row's or the series'); valid only when HasTemperature
	HasTemperature   bool            // false when neither the row nor the series states a temperature
	Solvent          string          // effective
	Source           string          // effective
	Confidence       string          // effective
	Note             string

	Log10KRel float64 // log10(k / k_reference); 0 for the reference row
	Log10K    float64 // log10(k2 / (M^-1 s^-1)); valid only when HasK
	HasK      bool    // true when the row or the series' reference gives k2
}

// Pair returns the row's reaction as (diene, dienophile) in the engine's role convention.
func (s *RateSeries) Pair(r RateRow) (diene, dienophile KineticsPartner) {
	if s.Fixed.Role == "diene" {
		return s.Fixed.Partner(), r.Partner
	}
	return r.Partner, s.Fixed.Partner()
}

// ReferenceRow returns the series' reference row.
func (s *RateSeries) ReferenceRow() RateRow { return s.Rows[s.RefIndex] }

// SubstituentEffect is a Hammett reaction constant: log10 k = log10 k0 + Rho·σ for
// ring-substituted derivatives of Substituted reacting with Fixed.
type SubstituentEffect struct {
	ID           string
	Fixed        RolePartner
	Substituted  RolePartner
	Rho          float64
	TemperatureC float64
	Solvent      string
	Source       string
	Confidence   string
	Note         string
}

// Orientation is one regio-orientation: the two new σ bonds as [diene atom map, dienophile
// atom map] pairs (the check set's convention) and an informative label.
type Orientation struct {
	Bonds [][2]int `yaml:"bonds"`
	Label string   `yaml:"label"`
}

// RegioRatio is one measured regioisomer ratio of selectivity.yaml.
type RegioRatio struct {
	ID                string
	Diene, Dienophile KineticsPartner // SMILES carry the atom maps the bonds name
	Activation        string
	Catalyst          string
	TemperatureC      float64 // valid only when HasTemperature
	HasTemperature    bool
	Solvent           string
	Conditions        string
	Major, Minor      Orientation
	Ratio             [2]float64 // major, minor as published; zero when Single
	Single            bool       // only the major isomer was reported (a censored ratio)
	UncertaintyLog10  float64    // of log10(major/minor); 0 when Single
	Log10Ratio        float64    // log10(major/minor); NaN when Single
	Source            string
	Confidence        string
	Note              string
}

// EndoRatio is one measured endo:exo ratio of selectivity.yaml.
type EndoRatio struct {
	ID                string
	Diene, Dienophile KineticsPartner
	Activation        string
	Catalyst          string
	TemperatureC      float64 // valid only when HasTemperature
	HasTemperature    bool
	Solvent           string
	Conditions        string
	EndoGroup         string     // the substituent whose position names the isomer, "" when obvious
	Control           string     // "kinetic" or "thermodynamic"
	Ratio             [2]float64 // endo, exo as published; zero when given as a log10 or Single
	Single            string     // "endo" or "exo" when only that isomer was reported, else ""
	UncertaintyLog10  float64    // of log10(endo/exo); 0 when Single != ""
	Log10EndoExo      float64    // log10(endo/exo); NaN when Single != ""
	Source            string
	Confidence        string
	Note              string
}

// KineticsData is the parsed kinetics set.
type KineticsData struct {
	Series             []RateSeries
	SubstituentEffects []SubstituentEffect
	Regio              []RegioRatio
	Endo               []EndoRatio
}

// RateRowCount returns the number of rate rows over all series.
func (k *KineticsData) RateRowCount() int {
	n := 0
	for _, s := range k.Series {
		n += len(s.Rows)
	}
	return n
}

// SeriesByID returns the series with the given id.
func (k *KineticsData) SeriesByID(id string) (*RateSeries, bool) {
	for i := range k.Series {
		if k.Series[i].ID == id {
			return &k.Series[i], true
		}
	}
	return nil, false
}

var (
	kinOnce sync.Once
	kinData *KineticsData
	kinErr  error
)

// Kinetics returns the bundled kinetics set, parsed and checked once. The result is shared:
// do not modify it. An error means the embedded files are malformed (a build defect the
// tests catch).
func Kinetics() (*KineticsData, error) {
	kinOnce.Do(func() { kinData, kinErr = ParseKinetics(kineticsRatesYAML, kineticsSelectivityYAML) })
	return kinData, kinErr
}

// KineticsYAML returns copies of the two embedded files (rates.yaml, selectivity.yaml).
func KineticsYAML() (rates, selectivity []byte) {
	return bytes.Clone(kineticsRatesYAML), bytes.Clone(kineticsSelectivityYAML)
}

// KineticsChecksum returns the hex SHA-256 that identifies the bundled kinetics set, so a
// model fitted on it can record which data it saw. It hashes, for rates.yaml and then
// selectivity.yaml, the file name (KineticsRatesName, KineticsSelectivityName), a newline,
// the length in bytes in decimal, a newline and the bytes; any edit to either file changes it.
func KineticsChecksum() string {
	return kineticsChecksum(kineticsRatesYAML, kineticsSelectivityYAML)
}

func kineticsChecksum(rates, selectivity []byte) string {
	h := sha256.New()
	for _, f := range []struct {
		name string
		data []byte
	}{{KineticsRatesName, rates}, {KineticsSelectivityName, selectivity}} {
		fmt.Fprintf(h, "%s\n%d\n", f.name, len(f.data))
		h.Write(f.data)
	}
	return hex.EncodeToString(h.Sum(nil))
}

// ---------------------------------------------------------------------------- raw file shapes

type rawRateRow struct {
	Name         string   `yaml:"name"`
	SMILES       string   `yaml:"smiles"`
	Activation   string   `yaml:"activation"`
	Catalyst     string   `yaml:"catalyst"`
	K2           *float64 `yaml:"k2"`
	KRel         *float64 `yaml:"k_rel"`
	Uncertainty  *float64 `yaml:"uncertainty_log10"`
	TemperatureC *float64 `yaml:"temperature_C"`
	Solvent      string   `yaml:"solvent"`
	Source       string   `yaml:"source"`
	Confidence   string   `yaml:"confidence"`
	Note         string   `yaml:"note"`
}

type rawSeries struct {
	ID           string       `yaml:"id"`
	Title        string       `yaml:"title"`
	Kind         string       `yaml:"kind"`
	Fixed        RolePartner  `yaml:"fixed"`
	Varied       string       `yaml:"varied"`
	TemperatureC *float64     `yaml:"temperature_C"`
	Solvent      string       `yaml:"solvent"`
	Reference    string       `yaml:"reference"`
	Source       string       `yaml:"source"`
	Confidence   string       `yaml:"confidence"`
	Note         string       `yaml:"note"`
	OutsideModel string       `yaml:"outside_model"`
	Rows         []rawRateRow `yaml:"rows"`
}

type rawSubstituent struct {
	ID           string      `yaml:"id"`
	Fixed        RolePartner `yaml:"fixed"`
	Substituted  RolePartner `yaml:"substituted"`
	Rho          *float64    `yaml:"rho"`
	TemperatureC *float64    `yaml:"temperature_C"`
	Solvent      string      `yaml:"solvent"`
	Source       string      `yaml:"source"`
	Confidence   string      `yaml:"confidence"`
	Note         string      `yaml:"note"`
}

type rawRates struct {
	Series             []rawSeries      `yaml:"series"`
	SubstituentEffects []rawSubstituent `yaml:"substituent_effects"`
}

type rawSelCommon struct {
	ID           string          `yaml:"id"`
	Diene        KineticsPartner `yaml:"diene"`
	Dienophile   KineticsPartner `yaml:"dienophile"`
	Activation   string          `yaml:"activation"`
	Catalyst     string          `yaml:"catalyst"`
	TemperatureC *float64        `yaml:"temperature_C"`
	Solvent      string          `yaml:"solvent"`
	Conditions   string          `yaml:"conditions"`
	Uncertainty  *float64        `yaml:"uncertainty_log10"`
	Source       string          `yaml:"source"`
	Confidence   string          `yaml:"confidence"`
	Note         string          `yaml:"note"`
}

type rawRegio struct {
	rawSelCommon `yaml:",inline"`
	Major        Orientation `yaml:"major"`
	Minor        Orientation `yaml:"minor"`
	Ratio        []float64   `yaml:"ratio"`
	Single       bool        `yaml:"single"`
}

type rawEndo struct {
	rawSelCommon `yaml:",inline"`
	EndoGroup    string    `yaml:"endo_group"`
	Control      string    `yaml:"control"`
	Ratio        []float64 `yaml:"ratio"`
	Log10Ratio   *float64  `yaml:"log10_ratio"`
	Single       string    `yaml:"single"`
}

type rawSelectivity struct {
	Regio []rawRegio `yaml:"regio"`
	Endo  []rawEndo  `yaml:"endo"`
}

// ---------------------------------------------------------------------------------- parsing

// ParseKinetics parses and checks a kinetics set given as the contents of rates.yaml and
// selectivity.yaml (Kinetics does this for the embedded files). Decoding is strict: unknown
// keys are errors. Every SMILES must parse, every row needs a source and a confidence word,
// values must be positive, ids unique, regio bonds must name atom maps that exist, and a
// series of kind "series" needs at least 5 rows. The first problem is returned as
// "file:line: id: what".
func ParseKinetics(rates, selectivity []byte) (*KineticsData, error) {
	var rr rawRates
	rLines, err := decodeStrict(rates, KineticsRatesName, &rr, "series", "substituent_effects")
	if err != nil {
		return nil, err
	}
	var rs rawSelectivity
	sLines, err := decodeStrict(selectivity, KineticsSelectivityName, &rs, "regio", "endo")
	if err != nil {
		return nil, err
	}
	if len(rr.Series) == 0 {
		return nil, fmt.Errorf("%s: no series (expected a top-level key series:)", KineticsRatesName)
	}
	c := &kinChecker{ids: map[string]bool{}}
	out := &KineticsData{}
	for i, s := range rr.Series {
		c.at(KineticsRatesName, rLines["series"], i, s.ID)
		if rs, ok := c.series(s); ok {
			out.Series = append(out.Series, rs)
		}
		if c.err != nil {
			return nil, c.err
		}
	}
	if out.SubstituentEffects, err = checkEach(c, KineticsRatesName, rLines["substituent_effects"], rr.SubstituentEffects,
		func(s rawSubstituent) string { return s.ID }, c.substituent); err != nil {
		return nil, err
	}
	if out.Regio, err = checkEach(c, KineticsSelectivityName, sLines["regio"], rs.Regio,
		func(r rawRegio) string { return r.ID }, c.regio); err != nil {
		return nil, err
	}
	if out.Endo, err = checkEach(c, KineticsSelectivityName, sLines["endo"], rs.Endo,
		func(e rawEndo) string { return e.ID }, c.endo); err != nil {
		return nil, err
	}
	if err := c.duplicates(out); err != nil {
		return nil, err
	}
	return out, nil
}

// checkEach checks the entries of one list of file in order with check, positioning c at
// each entry's line and id first, and stops at the first error.
func checkEach[R, T any](c *kinChecker, file string, lines []int, raw []R, id func(R) string, check func(R) T) ([]T, error) {
	var out []T
	for i, r := range raw {
		c.at(file, lines, i, id(r))
		out = append(out, check(r))
		if c.err != nil {
			return nil, c.err
		}
	}
	return out, nil
}

// decodeStrict decodes data into v with unknown keys rejected (aliases are refused too: the
// files are meant to be read as written) and returns the line of each item of the listed
// top-level sequences.
func decodeStrict(data []byte, file string, v any, lists ...string) (map[string][]int, error) {
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return nil, fmt.Errorf("%s: %s", file, oneLine(err))
	}
	if err := noAliases(&root, file); err != nil {
		return nil, err
	}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(v); err != nil {
		return nil, fmt.Errorf("%s: %s", file, oneLine(err))
	}
	lines := map[string][]int{}
	if len(root.Content) == 1 && root.Content[0].Kind == yaml.MappingNode {
		m := root.Content[0]
		for i := 0; i+1 < len(m.Content); i += 2 {
			for _, l := range lists {
				if m.Content[i].Value == l && m.Content[i+1].Kind == yaml.SequenceNode {
					for _, it := range m.Content[i+1].Content {
						lines[l] = append(lines[l], it.Line)
					}
				}
			}
		}
	}
	return lines, nil
}

func noAliases(n *yaml.Node, file string) error {
	if n.Kind == yaml.AliasNode || n.Anchor != "" {
		return fmt.Errorf("%s:%d:%d: anchors and aliases are not allowed (write the value out)", file, n.Line, n.Column)
	}
	for _, c := range n.Content {
		if err := noAliases(c, file); err != nil {
			return err
		}
	}
	return nil
}

func oneLine(err error) string { return strings.ReplaceAll(err.Error(), "\n", "; ") }

// kinChecker validates entries one at a time and keeps the first error with its position.
type kinChecker struct {
	file string
	line int
	id   string
	ids  map[string]bool
	err  error
}

func (c *kinChecker) at(file string, lines []int, i int, id string) {
	c.file, c.id, c.line = file, id, 0
	if i < len(lines) {
		c.line = lines[i]
	}
	switch {
	case id == "":
		c.failf("entry %d has no id", i+1)
	case c.ids[id]:
		c.failf("duplicate id (ids are unique across both files)")
	}
	c.ids[id] = true
}

func (c *kinChecker) failf(format string, args ...any) {
	if c.err != nil {
		return
	}
	pos := c.file
	if c.line > 0 {
		pos += ":" + strconv.Itoa(c.line)
	}
	id := c.id
	if id == "" {
		id = "(no id)"
	}
	c.err = fmt.Errorf("%s: %s: %s", pos, id, fmt.Sprintf(format, args...))
}

func (c *kinChecker) mol(what, s string) *molecule.Molecule {
	if s == "" {
		c.failf("%s: no SMILES", what)
		return nil
	}
	m, err := smiles.Parse(s)
	if err != nil {
		c.failf("%s: SMILES %q: %v", what, s, err)
		return nil
	}
	return m
}

func (c *kinChecker) partner(what string, p KineticsPartner) *molecule.Molecule {
	if p.Name == "" {
		c.failf("%s: no name", what)
	}
	return c.mol(what+" "+p.Name, p.SMILES)
}

func (c *kinChecker) role(what, r string) {
	if r != "diene" && r != "dienophile" {
		c.failf("%s: role %q (want diene or dienophile)", what, r)
	}
}

func (c *kinChecker) sourced(what, source, conf string) {
	if strings.TrimSpace(source) == "" {
		c.failf("%s: no source", what)
	}
	if conf != ConfidenceSourceFound && conf != ConfidenceFromMemory {
		c.failf("%s: confidence %q (want %q or %q)", what, conf, ConfidenceSourceFound, ConfidenceFromMemory)
	}
}

// activation normalises and checks an activation mode and its catalyst.
func (c *kinChecker) activation(what, act, catalyst string) string {
	if act == "" {
		act = "none"
	}
	switch act {
	case "none":
		if catalyst != "" {
			c.failf("%s: catalyst %q given with activation none", what, catalyst)
		}
	case "proton", "lewis", "iminium":
		if strings.TrimSpace(catalyst) == "" {
			c.failf("%s: activation %s needs a catalyst (name it by class)", what, act)
		}
	default:
		c.failf("%s: activation %q (want none, proton, lewis or iminium)", what, act)
	}
	return act
}

func (c *kinChecker) temperature(what string, t *float64) {
	if t != nil && (math.IsNaN(*t) || *t < -150 || *t > 500) {
		c.failf("%s: temperature_C %v out of range", what, *t)
	}
}

func (c *kinChecker) uncertainty(what string, u *float64) float64 {
	if u == nil {
		c.failf("%s: no uncertainty_log10 (give one; 1.0 for an order of magnitude)", what)
		return 0
	}
	if math.IsNaN(*u) || *u < 0 || *u > 3 {
		c.failf("%s: uncertainty_log10 %v out of range [0, 3]", what, *u)
	}
	return *u
}

func positive(v float64) bool { return v > 0 && !math.IsInf(v, 0) && !math.IsNaN(v) }

func (c *kinChecker) series(s rawSeries) (RateSeries, bool) {
	out := RateSeries{ID: s.ID, Title: s.Title, Kind: s.Kind, Fixed: s.Fixed, Varied: s.Varied,
		Solvent: s.Solvent, Reference: s.Reference, Source: s.Source, Confidence: s.Confidence, Note: s.Note,
		OutsideModel: strings.TrimSpace(s.OutsideModel)}
	if s.Title == "" {
		c.failf("no title")
	}
	c.role("fixed", s.Fixed.Role)
	c.partner("fixed", s.Fixed.Partner())
	other := "dienophile"
	if s.Fixed.Role == "dienophile" {
		other = "diene"
	}
	switch s.Varied {
	case other, "activation", "solvent":
	default:
		c.failf("varied %q (want %s, activation or solvent with a fixed %s)", s.Varied, other, s.Fixed.Role)
	}
	if s.TemperatureC != nil {
		c.temperature("series", s.TemperatureC)
		out.TemperatureC, out.HasTemperature = *s.TemperatureC, true
	}
	if s.Solvent == "" {
		c.failf("no solvent")
	}
	c.sourced("series", s.Source, s.Confidence)
	switch s.Kind {
	case "series":
		if len(s.Rows) < 5 {
			c.failf("kind series with %d rows (a series needs at least 5; use kind set)", len(s.Rows))
		}
	case "set":
		if len(s.Rows) < 2 {
			c.failf("kind set with %d rows (needs at least 2)", len(s.Rows))
		}
	default:
		c.failf("kind %q (want series or set)", s.Kind)
	}
	out.RefIndex = -1
	for i, r := range s.Rows {
		what := fmt.Sprintf("row %d (%s)", i+1, r.Name)
		row := RateRow{Partner: KineticsPartner{Name: r.Name, SMILES: r.SMILES}, Catalyst: r.Catalyst,
			TemperatureC: out.TemperatureC, HasTemperature: out.HasTemperature, Solvent: s.Solvent, Source: s.Source, Confidence: s.Confidence, Note: r.Note}
		c.partner(what, row.Partner)
		row.Activation = c.activation(what, r.Activation, r.Catalyst)
		if r.TemperatureC != nil {
			c.temperature(what, r.TemperatureC)
			row.TemperatureC, row.HasTemperature = *r.TemperatureC, true
		}
		if r.Solvent != "" {
			row.Solvent = r.Solvent
		}
		if r.Source != "" {
			row.Source = r.Source
		}
		if r.Confidence != "" {
			row.Confidence = r.Confidence
		}
		c.sourced(what, row.Source, row.Confidence)
		switch {
		case (r.K2 == nil) == (r.KRel == nil):
			c.failf("%s: give exactly one of k2 and k_rel", what)
		case r.K2 != nil && !positive(*r.K2):
			c.failf("%s: k2 %v is not a positive number", what, *r.K2)
		case r.KRel != nil && !positive(*r.KRel):
			c.failf("%s: k_rel %v is not a positive number", what, *r.KRel)
		case r.K2 != nil:
			row.K2 = *r.K2
		default:
			row.KRel = *r.KRel
		}
		row.UncertaintyLog10 = c.uncertainty(what, r.Uncertainty)
		if r.Name == s.Reference && row.Activation == "none" && row.Solvent == s.Solvent {
			if out.RefIndex >= 0 {
				c.failf("two rows match reference %q", s.Reference)
			}
			out.RefIndex = i
		}
		out.Rows = append(out.Rows, row)
	}
	if c.err != nil {
		return out, false
	}
	if out.RefIndex < 0 {
		c.failf("reference %q names no row (the reference is the unactivated row in the series' solvent)", s.Reference)
		return out, false
	}
	ref := out.Rows[out.RefIndex]
	if ref.K2 == 0 && ref.KRel != 1 {
		c.failf("reference %q has k_rel %v (want 1 or a k2)", s.Reference, ref.KRel)
		return out, false
	}
	for i := range out.Rows {
		r := &out.Rows[i]
		switch {
		case i == out.RefIndex:
			r.Log10KRel = 0
		case r.KRel != 0:
			r.Log10KRel = math.Log10(r.KRel)
		case ref.K2 != 0:
			r.Log10KRel = math.Log10(r.K2) - math.Log10(ref.K2)
		default:
			c.failf("row %d (%s) gives k2 but the reference gives only k_rel", i+1, r.Partner.Name)
			return out, false
		}
		switch {
		case r.K2 != 0:
			r.Log10K, r.HasK = math.Log10(r.K2), true
		case ref.K2 != 0:
			r.Log10K, r.HasK = math.Log10(ref.K2)+r.Log10KRel, true
		}
	}
	return out, true
}

func (c *kinChecker) substituent(s rawSubstituent) SubstituentEffect {
	out := SubstituentEffect{ID: s.ID, Fixed: s.Fixed, Substituted: s.Substituted, Solvent: s.Solvent,
		Source: s.Source, Confidence: s.Confidence, Note: s.Note}
	c.role("fixed", s.Fixed.Role)
	c.role("substituted", s.Substituted.Role)
	if s.Fixed.Role == s.Substituted.Role {
		c.failf("fixed and substituted partners both have role %s", s.Fixed.Role)
	}
	c.partner("fixed", s.Fixed.Partner())
	c.partner("substituted", s.Substituted.Partner())
	if s.Rho == nil || math.IsNaN(*s.Rho) || math.IsInf(*s.Rho, 0) {
		c.failf("no rho")
	} else {
		out.Rho = *s.Rho
	}
	if s.TemperatureC == nil {
		c.failf("no temperature_C")
	} else {
		c.temperature("entry", s.TemperatureC)
		out.TemperatureC = *s.TemperatureC
	}
	c.sourced("entry", s.Source, s.Confidence)
	return out
}

// common checks what regio and endo entries share and returns the parsed partners.
func (c *kinChecker) common(r rawSelCommon) (diene, dienophile *molecule.Molecule, act string, t float64, hasT bool) {
	diene = c.partner("diene", r.Diene)
	dienophile = c.partner("dienophile", r.Dienophile)
	act = c.activation("entry", r.Activation, r.Catalyst)
	if r.TemperatureC != nil {
		c.temperature("entry", r.TemperatureC)
		t, hasT = *r.TemperatureC, true
	}
	if strings.TrimSpace(r.Conditions) == "" {
		c.failf("no conditions (say in words what is and is not known)")
	}
	c.sourced("entry", r.Source, r.Confidence)
	return diene, dienophile, act, t, hasT
}

func (c *kinChecker) regio(r rawRegio) RegioRatio {
	diene, dienophile, act, t, hasT := c.common(r.rawSelCommon)
	out := RegioRatio{ID: r.ID, Diene: r.Diene, Dienophile: r.Dienophile, Activation: act, Catalyst: r.Catalyst,
		TemperatureC: t, HasTemperature: hasT, Solvent: r.Solvent, Conditions: r.Conditions,
		Major: r.Major, Minor: r.Minor, Single: r.Single, Source: r.Source, Confidence: r.Confidence, Note: r.Note,
		Log10Ratio: math.NaN()}
	c.orientation("major", r.Major, diene, dienophile)
	c.orientation("minor", r.Minor, diene, dienophile)
	if c.err == nil && sameBonds(r.Major.Bonds, r.Minor.Bonds) {
		c.failf("major and minor orientations are the same")
	}
	if c.err == nil && !sameSite(r.Major.Bonds, r.Minor.Bonds) {
		c.failf("major and minor orientations use different atoms (they must be the two orientations of one site)")
	}
	switch {
	case r.Single && (len(r.Ratio) != 0 || r.Uncertainty != nil):
		c.failf("single: true with a ratio or uncertainty (give one or the other)")
	case r.Single:
	case len(r.Ratio) != 2 || !positive(r.Ratio[0]) || !positive(r.Ratio[1]):
		c.failf("ratio %v: want [major, minor], both positive (or single: true)", r.Ratio)
	case r.Ratio[0] < r.Ratio[1]:
		c.failf("ratio %v: the major isomer comes first", r.Ratio)
	default:
		out.Ratio = [2]float64{r.Ratio[0], r.Ratio[1]}
		out.Log10Ratio = math.Log10(r.Ratio[0] / r.Ratio[1])
		out.UncertaintyLog10 = c.uncertainty("entry", r.Uncertainty)
	}
	return out
}

func (c *kinChecker) orientation(what string, o Orientation, diene, dienophile *molecule.Molecule) {
	switch o.Label {
	case "", "ortho", "meta", "para":
	default:
		c.failf("%s: label %q (want ortho, meta, para or empty)", what, o.Label)
	}
	if len(o.Bonds) != 2 {
		c.failf("%s: %d bonds (want two [diene map, dienophile map] pairs)", what, len(o.Bonds))
		return
	}
	if diene == nil || dienophile == nil {
		return
	}
	for _, b := range o.Bonds {
		if n := len(diene.AtomByMap(b[0])); b[0] <= 0 || n != 1 {
			c.failf("%s: diene atom map %d is carried by %d atoms (want exactly one)", what, b[0], n)
		}
		if n := len(dienophile.AtomByMap(b[1])); b[1] <= 0 || n != 1 {
			c.failf("%s: dienophile atom map %d is carried by %d atoms (want exactly one)", what, b[1], n)
		}
	}
	if o.Bonds[0][0] == o.Bonds[1][0] || o.Bonds[0][1] == o.Bonds[1][1] {
		c.failf("%s: the two bonds share an atom", what)
	}
}

func sameBonds(a, b [][2]int) bool {
	return len(a) == 2 && len(b) == 2 && ((a[0] == b[0] && a[1] == b[1]) || (a[0] == b[1] && a[1] == b[0]))
}

func sameSite(a, b [][2]int) bool {
	if len(a) != 2 || len(b) != 2 {
		return false
	}
	pair := func(x, y int) [2]int { return [2]int{min(x, y), max(x, y)} }
	return pair(a[0][0], a[1][0]) == pair(b[0][0], b[1][0]) && pair(a[0][1], a[1][1]) == pair(b[0][1], b[1][1])
}

func (c *kinChecker) endo(e rawEndo) EndoRatio {
	_, _, act, t, hasT := c.common(e.rawSelCommon)
	out := EndoRatio{ID: e.ID, Diene: e.Diene, Dienophile: e.Dienophile, Activation: act, Catalyst: e.Catalyst,
		TemperatureC: t, HasTemperature: hasT, Solvent: e.Solvent, Conditions: e.Conditions,
		EndoGroup: e.EndoGroup, Control: e.Control, Single: e.Single,
		Source: e.Source, Confidence: e.Confidence, Note: e.Note, Log10EndoExo: math.NaN()}
	if e.Control != "kinetic" && e.Control != "thermodynamic" {
		c.failf("control %q (want kinetic or thermodynamic)", e.Control)
	}
	given := 0
	if len(e.Ratio) != 0 {
		given++
	}
	if e.Log10Ratio != nil {
		given++
	}
	if e.Single != "" {
		given++
	}
	switch {
	case given != 1:
		c.failf("give exactly one of ratio, log10_ratio and single")
	case e.Single != "":
		if e.Single != "endo" && e.Single != "exo" {
			c.failf("single %q (want endo or exo)", e.Single)
		}
		if e.Uncertainty != nil {
			c.failf("single with an uncertainty (a censored entry has no ratio)")
		}
	case e.Log10Ratio != nil:
		if math.IsNaN(*e.Log10Ratio) || math.IsInf(*e.Log10Ratio, 0) {
			c.failf("log10_ratio %v is not a number", *e.Log10Ratio)
		}
		out.Log10EndoExo = *e.Log10Ratio
		out.UncertaintyLog10 = c.uncertainty("entry", e.Uncertainty)
	case len(e.Ratio) != 2 || !positive(e.Ratio[0]) || !positive(e.Ratio[1]):
		c.failf("ratio %v: want [endo, exo], both positive", e.Ratio)
	default:
		out.Ratio = [2]float64{e.Ratio[0], e.Ratio[1]}
		out.Log10EndoExo = math.Log10(e.Ratio[0] / e.Ratio[1])
		out.UncertaintyLog10 = c.uncertainty("entry", e.Uncertainty)
	}
	return out
}

// structureKey identifies a structure for duplicate checks: its canonical SMILES without
// atom maps, plus the SMILES as written when it carries (E)/(Z) marks, which the canonical
// form drops.
func structureKey(s string) string {
	m, err := smiles.Parse(s)
	if err != nil {
		return s
	}
	for i := range m.Atoms {
		m.Atoms[i].Map = 0
	}
	k := smiles.Canonical(m)
	if strings.ContainsAny(s, `/\`) {
		k += " " + s
	}
	return k
}

// duplicates rejects two rows of one series, or two selectivity entries, that describe the
// same reaction under the same activation, solvent and temperature.
func (c *kinChecker) duplicates(k *KineticsData) error {
	for _, s := range k.Series {
		seen := map[string]int{}
		for i, r := range s.Rows {
			temp := "?"
			if r.HasTemperature {
				temp = fmt.Sprintf("%g", r.TemperatureC)
			}
			key := fmt.Sprintf("%s|%s|%s|%s", structureKey(r.Partner.SMILES), r.Activation, r.Solvent, temp)
			if j, ok := seen[key]; ok {
				return fmt.Errorf("%s: %s: rows %d and %d are the same reaction under the same conditions", KineticsRatesName, s.ID, j+1, i+1)
			}
			seen[key] = i
		}
	}
	seen := map[string]string{}
	check := func(id, kind, diene, dienophile, act, solvent string, t float64, hasT bool) error {
		key := fmt.Sprintf("%s|%s|%s|%s|%s|%v|%g", kind, structureKey(diene), structureKey(dienophile), act, solvent, hasT, t)
		if other, ok := seen[key]; ok {
			return fmt.Errorf("%s: %s: the same entry as %s", KineticsSelectivityName, id, other)
		}
		seen[key] = id
		return nil
	}
	for _, r := range k.Regio {
		if err := check(r.ID, "regio", r.Diene.SMILES, r.Dienophile.SMILES, r.Activation, r.Solvent, r.TemperatureC, r.HasTemperature); err != nil {
			return err
		}
	}
	for _, e := range k.Endo {
		if err := check(e.ID, "endo", e.Diene.SMILES, e.Dienophile.SMILES, e.Activation, e.Solvent, e.TemperatureC, e.HasTemperature); err != nil {
			return err
		}
	}
	return nil
}

//go:embed kinetics/model.yaml
var rateModelYAML []byte

// RateModelName is the name of the bundled rate model file in messages.
const RateModelName = "presets/kinetics/model.yaml"

// RateModelYAML returns a copy of the bundled rate model (written by the fit in fmo/rate,
// parsed there; see `go test ./fmo/rate -run TestEmbeddedModel -update`).
func RateModelYAML() []byte { return bytes.Clone(rateModelYAML) }
