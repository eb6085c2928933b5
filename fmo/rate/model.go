package rate

import (
	"bytes"
	"errors"
	"fmt"
	"math"

	"cyclopair/fmo"
	"cyclopair/huckel"
	"cyclopair/presets"

	"go.yaml.in/yaml/v3"
)

// Reference is the one reaction every predicted rate is relative to.
type Reference struct {
	Name       string `yaml:"name"`
	Diene      string `yaml:"diene"`
	Dienophile string `yaml:"dienophile"`
	Conditions string `yaml:"conditions"`
	Source     string `yaml:"source"`
}

// DefaultReference: cyclopentadiene + acrylonitrile in 1,4-dioxane at 20 °C, k2 about
// 1.0e-5 M^-1 s^-1 (J. Sauer, H. Wiest, A. Mielert, Chem. Ber. 1964, 97, 3183; from memory),
// the reference row of the series sauer1964-cpd.
var DefaultReference = Reference{
	Name:       "cyclopentadiene + acrylonitrile (1,4-dioxane, 20 °C)",
	Diene:      "C1=CCC=C1",
	Dienophile: "C=CC#N",
	Conditions: "1,4-dioxane, 20 °C, k2 about 1.0e-5 M^-1 s^-1",
	Source:     "J. Sauer, H. Wiest, A. Mielert, Chem. Ber. 1964, 97, 3183 (from memory)",
}

// Model is a fitted rate and ratio model (see the package doc for the formulas).
type Model struct {
	Reference  Reference
	RefVector  [NumTerms]float64 // descriptor vector of the reference pair
	Coef       [NumTerms]float64
	Fitted     [NumTerms]bool
	Cov        [NumTerms][NumTerms]float64 // of the fitted coefficients
	S2         float64                     // residual variance factor χ²/dof
	DOF, Rows  int
	ModelError float64 // τ, log10
	T          float64 // Student t quantile of IntervalLevel at DOF
	Series     []SeriesStat
	CVRMSE     float64 // leave-one-series-out RMSE over the rows of every fitted series, log10
	GapCVRMSE  float64 // the same for a gap-only line
	Checksum   string  // presets.KineticsChecksum of the data it was fitted on ("" for user data)
	Ratios     RatioModel
	// Domain is the applicability domain (domain.go); nil for a model file written before
	// it was stored, whose predictions are then never reported inside the domain.
	Domain *Domain
}

// Estimate is a predicted rate: log10 of k relative to the reference reaction and its
// prediction interval, with the applicability-domain verdict.
type Estimate struct {
	Log10KRel float64
	// Lo, Hi is the prediction interval: t·sqrt(s²τ² + gᵀCg) about the estimate (g the
	// descriptors minus the reference reaction's, C the coefficients' covariance: the
	// leverage-based interval of a weighted fit), and outside the domain its union with the
	// interval at the nearest point of the fitted ranges (domain.go).
	Lo, Hi float64
	Domain DomainCheck
}

// Predict returns the estimate for descriptors d.
func (m *Model) Predict(d *Descriptors) Estimate {
	v := d.Vector()
	y, half := m.predictVector(v)
	e := Estimate{Log10KRel: y, Lo: y - half, Hi: y + half, Domain: m.CheckDomain(d)}
	if !e.Domain.In && e.Domain.Clamped != v {
		yc, hc := m.predictVector(e.Domain.Clamped)
		e.Lo, e.Hi = min(e.Lo, yc-hc), max(e.Hi, yc+hc)
	}
	return e
}

// predictVector returns the central value and the half-width of the interval at descriptor
// vector v.
func (m *Model) predictVector(v [NumTerms]float64) (y, half float64) {
	var g [NumTerms]float64
	for j := range g {
		g[j] = v[j] - m.RefVector[j]
	}
	y = dot(m.Coef, g)
	q := 0.0
	for i := range NumTerms {
		for k := range NumTerms {
			q += g[i] * m.Cov[i][k] * g[k]
		}
	}
	return y, m.T * math.Sqrt(m.S2*m.ModelError*m.ModelError+q)
}

// Quick is Predict's central value for a QuickScore result, written out for the screening
// loop (no interval): Σ_j coef_j·(x_j − ref_j). Every term is either a diene-only quantity
// (conjugation loss, s-cis, reach), a dienophile-only one (its localisation, the Lewis-acid
// indicator) or the pair's controlling gap and frontier term, so an upper bound over a set
// of partners follows from per-partner bounds: the gap from the diene's HOMO and LUMO and
// the dienophile's, the rest term by term (see the package doc).
func (m *Model) Quick(q *fmo.Quick, conf *Conformation) float64 {
	c := &m.Coef
	r := &m.RefVector
	return c[TermGap]*(-min(q.GapNormal, q.GapInverse)-r[TermGap]) +
		c[TermFrontier]*(q.Frontier-r[TermFrontier]) +
		c[TermDieneConjugation]*(-q.DieneConjugationLoss-r[TermDieneConjugation]) +
		c[TermDienophileLocalization]*(-q.DienophileLocalization-r[TermDienophileLocalization]) +
		c[TermSCis]*(conf.SCis-r[TermSCis]) + c[TermReach]*(-conf.Reach-r[TermReach]) +
		c[TermLewis]*(lewisIndicator(q.Activation)-r[TermLewis])
}

// Annotate fills p.Rate, the orientation fractions and p.EndoFraction at temperature tempC
// (°C). diene is the 4π partner's molecule.
//
// Under another π method than Hückel (p.Method "ppp") Annotate leaves p unchanged: the
// model's coefficients are per Hückel |β| and PPP gaps are about three times larger, so its
// predictions would be orders of magnitude off (see ErrMethod).
func (m *Model) Annotate(p *fmo.Pair, diene *fmo.Partner, tempC float64) error {
	if !AppliesTo(p.Method) {
		return nil
	}
	d, err := FromPair(p, diene.Mol)
	if err != nil {
		return err
	}
	e := m.Predict(&d)
	p.Rate = &fmo.RateEstimate{Log10KRel: round6(e.Log10KRel), Interval: [2]float64{round6(e.Lo), round6(e.Hi)},
		Reference: m.Reference.Name, InDomain: e.Domain.In, DomainNote: e.Domain.Note()}
	if !math.IsNaN(e.Domain.Leverage) {
		h := round6(e.Domain.Leverage)
		p.Rate.Leverage = &h
	}
	m.Ratios.annotate(p, tempC)
	return nil
}

// ErrMethod says why the rate model is not applied under another π method than Hückel.
var ErrMethod = errors.New("the rate model is fitted on Hückel descriptors (gaps in Hückel |β|; PPP gaps are about 3× larger) and is not applied under --method ppp (rank by score, normal_gap, gap, stabilization or regio_margin, or use --method huckel)")

// AppliesTo reports whether the model applies to pairs computed with π method method
// ("huckel" or "" for Hückel).
func AppliesTo(method string) bool { return method == "" || method == huckel.MethodHuckel }

func round6(x float64) float64 { return math.Round(x*1e6) / 1e6 }

// ----------------------------------------------------------------------------- model files

type fileTerm struct {
	Name        string  `yaml:"name"`
	Coefficient float64 `yaml:"coefficient"`
	Fitted      bool    `yaml:"fitted"`
	Reference   float64 `yaml:"reference_value"`
	Meaning     string  `yaml:"meaning"`
}

type fileModel struct {
	Format           string       `yaml:"format"`
	Reference        Reference    `yaml:"reference"`
	KineticsChecksum string       `yaml:"kinetics_checksum"`
	Terms            []fileTerm   `yaml:"terms"`
	Covariance       [][]float64  `yaml:"covariance"`
	ResidualFactor   float64      `yaml:"residual_factor"`
	ModelError       float64      `yaml:"model_error_log10"`
	Rows             int          `yaml:"difference_rows"`
	DOF              int          `yaml:"dof"`
	TQuantile        float64      `yaml:"t_quantile"`
	IntervalLevel    float64      `yaml:"interval_level"`
	CVRMSE           float64      `yaml:"cv_rmse_log10"`
	GapCVRMSE        float64      `yaml:"gap_baseline_cv_rmse_log10"`
	Series           []SeriesStat `yaml:"series"`
	Ratios           RatioModel   `yaml:"ratios"`
	// Domain is optional: files written before it was stored still load (their predictions
	// are then reported outside the domain, unchecked).
	Domain *fileDomain `yaml:"domain,omitempty"`
}

type fileRange struct {
	Term string  `yaml:"term"`
	Min  float64 `yaml:"min"`
	Max  float64 `yaml:"max"`
}

type fileDomain struct {
	Rows            int         `yaml:"rows"`
	Ranges          []fileRange `yaml:"ranges"`
	LeverageTerms   []string    `yaml:"leverage_terms"`
	LeverageMatrix  [][]float64 `yaml:"leverage_matrix"`
	WarningLeverage float64     `yaml:"warning_leverage"`
}

// FileFormat names the model-file format.
const FileFormat = "cyclopair-rate-model/2"

// Marshal writes the model as YAML, with header the comment lines put first.
func (m *Model) Marshal(header string) ([]byte, error) {
	f := fileModel{Format: FileFormat, Reference: m.Reference, KineticsChecksum: m.Checksum,
		ResidualFactor: r(m.S2), ModelError: m.ModelError, Rows: m.Rows, DOF: m.DOF, TQuantile: r(m.T),
		IntervalLevel: IntervalLevel, CVRMSE: r(m.CVRMSE), GapCVRMSE: r(m.GapCVRMSE), Ratios: m.Ratios}
	for j := range NumTerms {
		f.Terms = append(f.Terms, fileTerm{Name: Names[j], Coefficient: r(m.Coef[j]), Fitted: m.Fitted[j],
			Reference: r(m.RefVector[j]), Meaning: Explain[j]})
		row := make([]float64, NumTerms)
		for k := range NumTerms {
			row[k] = r(m.Cov[j][k])
		}
		f.Covariance = append(f.Covariance, row)
	}
	for _, s := range m.Series {
		s.Spearman, s.RMSE, s.GapRho, s.GapRMSE = r(s.Spearman), r(s.RMSE), r(s.GapRho), r(s.GapRMSE)
		f.Series = append(f.Series, s)
	}
	if d := m.Domain; d != nil {
		fd := &fileDomain{Rows: d.Rows, WarningLeverage: r(d.Warning)}
		for j := range NumTerms {
			fd.Ranges = append(fd.Ranges, fileRange{Term: Names[j], Min: r(d.Min[j]), Max: r(d.Max[j])})
		}
		for _, j := range d.LevTerms {
			fd.LeverageTerms = append(fd.LeverageTerms, Names[j])
		}
		for _, row := range d.LevInv {
			out := make([]float64, len(row))
			for k, x := range row {
				out[k] = roundSig(x)
			}
			fd.LeverageMatrix = append(fd.LeverageMatrix, out)
		}
		f.Domain = fd
	}
	var b bytes.Buffer
	b.WriteString(header)
	enc := yaml.NewEncoder(&b)
	enc.SetIndent(2)
	if err := enc.Encode(&f); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

func r(x float64) float64 { return math.Round(x*1e6) / 1e6 }

// roundSig rounds to 10 significant digits: (XᵀX)⁻¹ entries span several orders of
// magnitude, and the leverage is a difference of large terms.
func roundSig(x float64) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	e := math.Pow(10, 9-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*e) / e
}

// ParseModel reads a model file written by Marshal (strict: unknown keys are errors).
func ParseModel(data []byte, name string) (*Model, error) {
	var f fileModel
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(&f); err != nil {
		return nil, fmt.Errorf("%s: %v (a rate model file written by cyclopair calibrate --rates)", name, err)
	}
	if f.Format != FileFormat {
		return nil, fmt.Errorf("%s: format %q, want %q", name, f.Format, FileFormat)
	}
	if len(f.Terms) != NumTerms || len(f.Covariance) != NumTerms {
		return nil, fmt.Errorf("%s: %d terms, want %d (%v)", name, len(f.Terms), NumTerms, Names)
	}
	m := &Model{Reference: f.Reference, Checksum: f.KineticsChecksum, S2: f.ResidualFactor, ModelError: f.ModelError,
		Rows: f.Rows, DOF: f.DOF, T: f.TQuantile, CVRMSE: f.CVRMSE, GapCVRMSE: f.GapCVRMSE, Series: f.Series, Ratios: f.Ratios}
	for j, t := range f.Terms {
		if t.Name != Names[j] {
			return nil, fmt.Errorf("%s: term %d is %q, want %q", name, j+1, t.Name, Names[j])
		}
		m.Coef[j], m.Fitted[j], m.RefVector[j] = t.Coefficient, t.Fitted, t.Reference
		if len(f.Covariance[j]) != NumTerms {
			return nil, fmt.Errorf("%s: covariance row %d has %d values, want %d", name, j+1, len(f.Covariance[j]), NumTerms)
		}
		copy(m.Cov[j][:], f.Covariance[j])
	}
	if m.T <= 0 || m.S2 < 0 {
		return nil, fmt.Errorf("%s: t_quantile must be positive and residual_factor not negative", name)
	}
	if f.Domain != nil {
		d, err := parseDomain(f.Domain)
		if err != nil {
			return nil, fmt.Errorf("%s: domain: %v", name, err)
		}
		m.Domain = d
	}
	return m, nil
}

func termIndex(name string) int {
	for j, n := range Names {
		if n == name {
			return j
		}
	}
	return -1
}

func parseDomain(f *fileDomain) (*Domain, error) {
	d := &Domain{Rows: f.Rows, Warning: f.WarningLeverage}
	if f.Rows <= 0 || !(f.WarningLeverage > 0) {
		return nil, fmt.Errorf("rows and warning_leverage must be positive")
	}
	if len(f.Ranges) != NumTerms {
		return nil, fmt.Errorf("%d ranges, want one per term (%v)", len(f.Ranges), Names)
	}
	for j, rg := range f.Ranges {
		if rg.Term != Names[j] {
			return nil, fmt.Errorf("range %d is %q, want %q", j+1, rg.Term, Names[j])
		}
		if !(rg.Min <= rg.Max) {
			return nil, fmt.Errorf("range of %s: min %g above max %g", rg.Term, rg.Min, rg.Max)
		}
		d.Min[j], d.Max[j] = rg.Min, rg.Max
	}
	for _, n := range f.LeverageTerms {
		j := termIndex(n)
		if j < 0 {
			return nil, fmt.Errorf("leverage term %q is not one of %v", n, Names)
		}
		d.LevTerms = append(d.LevTerms, j)
	}
	p := len(d.LevTerms) + 1
	if len(f.LeverageMatrix) != p {
		return nil, fmt.Errorf("leverage_matrix has %d rows, want %d (intercept and %d terms)", len(f.LeverageMatrix), p, p-1)
	}
	for i, row := range f.LeverageMatrix {
		if len(row) != p {
			return nil, fmt.Errorf("leverage_matrix row %d has %d values, want %d", i+1, len(row), p)
		}
		for _, x := range row {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return nil, fmt.Errorf("leverage_matrix row %d: not a finite number", i+1)
			}
		}
	}
	d.LevInv = f.LeverageMatrix
	return d, nil
}

// Default returns the bundled model (presets/kinetics/model.yaml), fitted on the bundled
// kinetics set.
func Default() (*Model, error) {
	return ParseModel(presets.RateModelYAML(), presets.RateModelName)
}

// ----------------------------------------------------------------------------- screen bounds

// Upper bounds of Quick over sets of partners, for exact top-K screening (fmo/screen). Quick
// is a sum of terms c_j·(x_j − ref_j), each monotone in its descriptor (falling where c_j < 0),
// so the sum is at most the sum of each term's maximum over the set: the diene's terms
// (conjugation loss, s-cis, reach) at the best of its units with both frontier levels (the
// only units QuickScore can prefer), the dienophile's (localisation, Lewis-acid indicator) at
// the best of its units, the gap term at the box's smallest (c ≥ 0) or largest controlling
// gap, the frontier term at the box's largest frontier value. Each bound also returns the
// sum of the absolute terms, from which the caller takes a rounding margin (Quick adds the
// same terms in another order).

// Bounded reports whether the pair terms can be bounded: the frontier term needs c ≥ 0
// (QuickBound gives the frontier value only an upper bound).
func (m *Model) Bounded() bool { return m.Coef[TermFrontier] >= 0 }

// DieneTermsMax returns the largest diene part of Quick over the units of diene with both
// frontier levels (conf parallel to diene.Units, as PartnerConformations gives it) and the
// largest sum of that part's absolute terms; −Inf, 0 when no unit qualifies.
func (m *Model) DieneTermsMax(diene *fmo.Partner, conf []Conformation) (v, abs float64) {
	c, r := &m.Coef, &m.RefVector
	v = math.Inf(-1)
	for i := range diene.Units {
		if !diene.UnitHasFrontier(i) || i >= len(conf) {
			continue
		}
		t0 := c[TermDieneConjugation] * (-diene.UnitConjugationLoss(i) - r[TermDieneConjugation])
		t1 := c[TermSCis] * (conf[i].SCis - r[TermSCis])
		t2 := c[TermReach] * (-conf[i].Reach - r[TermReach])
		v = max(v, t0+t1+t2)
		abs = max(abs, math.Abs(t0)+math.Abs(t1)+math.Abs(t2))
	}
	return v, abs
}

// DienophileTermsMax returns the largest dienophile part of Quick over the units of
// dienophile (one activated variant) with both frontier levels, and the largest sum of that
// part's absolute terms; −Inf, 0 when no unit qualifies.
func (m *Model) DienophileTermsMax(dienophile *fmo.Partner) (v, abs float64) {
	c, r := &m.Coef, &m.RefVector
	v = math.Inf(-1)
	t1 := c[TermLewis] * (lewisIndicator(dienophile.Activation) - r[TermLewis])
	for i := range dienophile.Units {
		if !dienophile.UnitHasFrontier(i) {
			continue
		}
		t0 := c[TermDienophileLocalization] * (-dienophile.UnitLocalization(i) - r[TermDienophileLocalization])
		v = max(v, t0+t1)
		abs = max(abs, math.Abs(t0)+math.Abs(t1))
	}
	return v, abs
}

// PairTermsMax returns the largest gap and frontier part of Quick over every pair the
// bound b holds, and the sum of those terms' largest absolute values.
func (m *Model) PairTermsMax(b *fmo.QuickBound) (v, abs float64) {
	c, r := &m.Coef, &m.RefVector
	g := b.Gap[0] // −gap is largest at the smallest gap
	if c[TermGap] < 0 {
		g = b.Gap[1]
	}
	tg := c[TermGap] * (-g - r[TermGap])
	tgAbs := max(math.Abs(c[TermGap]*(-b.Gap[0]-r[TermGap])), math.Abs(c[TermGap]*(-b.Gap[1]-r[TermGap])))
	tf, tfAbs := 0.0, 0.0
	if c[TermFrontier] != 0 {
		if c[TermFrontier] < 0 {
			return math.NaN(), math.NaN()
		}
		tf = c[TermFrontier] * (b.FrontierMax - r[TermFrontier])
		// |Frontier| is not bounded by the box; a frontier term makes the margin relative
		// to its upper value only, which the caller's absolute floor covers at these sizes.
		tfAbs = math.Abs(tf)
	}
	return tg + tf, tgAbs + tfAbs
}
