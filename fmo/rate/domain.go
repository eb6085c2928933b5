package rate

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// Applicability domain (issue 10). A prediction is inside the domain of the fitted model when
//
//  1. the perturbation regime holds: the controlling frontier gap is positive and the
//     preferred orientation used the second-order form (a negative gap means the donor's
//     HOMO lies above the acceptor's LUMO, electron transfer; a gap at or below the coupling
//     |γΣcc| switches the kernel to the first-order form; in both the gap descriptor no
//     longer measures what the fit weighed it for), by definition;
//  2. every descriptor the prediction uses (a fitted term, or a fixed term with a non-zero
//     coefficient) lies within the range it spans over the fitted rows (the bounding box of
//     the training set; for the 0/1 Lewis-acid indicator this says the category occurs in
//     the fitted data);
//  3. the leverage h = xᵀ(XᵀX)⁻¹x of the continuous fitted descriptors, with an intercept
//     column, X the fitted rows, is at most the warning leverage h* = 3p/n (p the columns of
//     X, n its rows): the Williams-plot criterion of A. Tropsha, P. Gramatica, V. K. Gombar,
//     QSAR Comb. Sci. 2003, 22, 69-77, "The importance of being earnest" (title, pages and its
//     applicability-domain section checked in a stored catalogue record; the 3p/n value itself
//     from memory). The 0/1 indicator stays out of the leverage:
//     with a handful of catalysed rows it would put every catalysed prediction, including the
//     fitted ones, above h*; criterion 2 covers it. Criterion 3 catches combinations the fit
//     has not seen although each descriptor is within its range.
//
// The fitted rows are those of every series in the model (InModel), reference rows included,
// as absolute descriptor vectors: the domain is where reactions were measured, while the fit
// itself works on within-series differences (whose covariance already widens the interval
// with the distance from the reference reaction).
//
// Outside the domain the interval widens: beyond the fitted range the model is trusted for
// the direction of each descriptor's effect, not for its size, so the interval becomes the
// union of the extrapolated interval and the interval at the nearest point of the fitted box
// (each out-of-range descriptor clamped to its fitted range). Rank order is not changed: a
// screen still ranks by the point estimate and flags the row (see DEVELOPERS.md).

// Domain is the stored applicability domain of a model.
type Domain struct {
	Rows int // n, fitted rows (absolute descriptor vectors)
	// Min and Max are each descriptor's range over the fitted rows, in the signed form of
	// Descriptors.Vector.
	Min, Max [NumTerms]float64
	// LevTerms are the descriptors of the leverage (after the intercept column), LevInv is
	// (XᵀX)⁻¹ of the design [1, x_LevTerms...] over the fitted rows.
	LevTerms []int
	LevInv   [][]float64
	// Warning is h* = 3p/n with p = len(LevTerms)+1.
	Warning float64
}

// WarningFactor is the 3 of the warning leverage h* = 3p/n (Tropsha, Gramatica, Gombar 2003;
// from memory).
const WarningFactor = 3.0

// rangeTermUsed reports whether descriptor j enters the model's predictions.
func (m *Model) rangeTermUsed(j int) bool { return m.Fitted[j] || m.Coef[j] != 0 }

// leverageTerms are the continuous fitted descriptors (the Lewis-acid indicator is categorical).
func leverageTerms(fitted [NumTerms]bool) []int {
	var out []int
	for j := range NumTerms {
		if fitted[j] && j != TermLewis {
			out = append(out, j)
		}
	}
	return out
}

// BuildDomain computes the domain of a model with fitted terms fitted from the rows of every
// series of obs in the model. Terms that do not vary over the rows are left out of the
// leverage (their range, a single value, still bounds them).
func BuildDomain(obs []SeriesObs, fitted [NumTerms]bool) (*Domain, error) {
	var rows [][NumTerms]float64
	for si := range obs {
		if !obs[si].InModel() {
			continue
		}
		for _, r := range obs[si].Rows {
			rows = append(rows, r.D.Vector())
		}
	}
	if len(rows) == 0 {
		return nil, fmt.Errorf("rate: no fitted rows for the applicability domain")
	}
	d := &Domain{Rows: len(rows)}
	for j := range NumTerms {
		d.Min[j], d.Max[j] = math.Inf(1), math.Inf(-1)
		for _, v := range rows {
			d.Min[j], d.Max[j] = min(d.Min[j], v[j]), max(d.Max[j], v[j])
		}
	}
	for _, j := range leverageTerms(fitted) {
		if d.Max[j]-d.Min[j] > 1e-9 {
			d.LevTerms = append(d.LevTerms, j)
		}
	}
	x := make([][]float64, len(rows))
	for i, v := range rows {
		x[i] = append([]float64{1}, pick(v, d.LevTerms)...)
	}
	inv, err := LeverageMatrix(x)
	if err != nil {
		// collinear descriptors on a user's small data set: the fit itself may still be
		// defined on the differences; keep the ranges and an intercept-only leverage (1/n,
		// never above 3/n) rather than refuse the fit
		d.LevTerms = nil
		inv = [][]float64{{1 / float64(len(rows))}}
	}
	d.LevInv = inv
	d.Warning = WarningFactor * float64(len(d.LevTerms)+1) / float64(len(rows))
	return d, nil
}

func pick(v [NumTerms]float64, terms []int) []float64 {
	out := make([]float64, len(terms))
	for i, j := range terms {
		out[i] = v[j]
	}
	return out
}

// LeverageMatrix returns (XᵀX)⁻¹ for the design matrix x (rows of equal length).
func LeverageMatrix(x [][]float64) ([][]float64, error) {
	if len(x) == 0 {
		return nil, fmt.Errorf("rate: empty design matrix")
	}
	p := len(x[0])
	a := mat.NewSymDense(p, nil)
	for _, r := range x {
		for i := range p {
			for k := i; k < p; k++ {
				a.SetSym(i, k, a.At(i, k)+r[i]*r[k])
			}
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(a) {
		return nil, fmt.Errorf("rate: the domain descriptors are collinear on the fitted rows (XᵀX singular)")
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return nil, fmt.Errorf("rate: %w", err)
	}
	out := make([][]float64, p)
	for i := range p {
		out[i] = make([]float64, p)
		for k := range p {
			out[i][k] = inv.At(i, k)
		}
	}
	return out, nil
}

// Leverage returns xᵀ A x for a row x and A = (XᵀX)⁻¹ from LeverageMatrix.
func Leverage(a [][]float64, x []float64) float64 {
	h := 0.0
	for i := range x {
		for k := range x {
			h += x[i] * a[i][k] * x[k]
		}
	}
	return h
}

// leverageOf is the leverage of descriptor vector v in d.
func (d *Domain) leverageOf(v [NumTerms]float64) float64 {
	var x [NumTerms + 1]float64 // [1, v of the leverage terms], without allocating
	x[0] = 1
	n := 1
	for _, j := range d.LevTerms {
		x[n] = v[j]
		n++
	}
	return Leverage(d.LevInv, x[:n])
}

// DomainCheck is the applicability-domain verdict on one prediction.
type DomainCheck struct {
	In       bool
	Leverage float64 // NaN when the model carries no domain
	// Reasons says, one phrase each, why the prediction is outside ("" entries never).
	Reasons []string
	// Clamped is the descriptor vector moved to the nearest point of the fitted ranges.
	Clamped [NumTerms]float64
}

// Note joins the reasons into the one line the outputs print ("" inside the domain).
func (c *DomainCheck) Note() string {
	if c.In {
		return ""
	}
	return "extrapolated: " + strings.Join(c.Reasons, "; ")
}

// termWords names each descriptor in a note, with its unit, in the chemist's sign (the
// gap and the losses as positive quantities, not the negated model form).
var termWords = [NumTerms]struct {
	name string
	neg  bool
	unit string
}{
	{"controlling frontier gap", true, " |β|"},
	{"frontier term", false, " |β|"},
	{"diene conjugation loss", true, " |β|"},
	{"dienophile localisation", true, " |β|"},
	{"log10 s-cis population", false, ""},
	{"diene 1,4-distance offset (d14 − 2.90 Å)", true, " Å"},
	{"Lewis-acid indicator", false, ""},
}

// fmtTerm writes a descriptor value: three decimals, the 0/1 indicator as an integer.
func fmtTerm(j int, v float64) string {
	if j == TermLewis {
		return fmt.Sprintf("%g", v)
	}
	return trim3(v)
}

func termValue(j int, v float64) float64 {
	if termWords[j].neg {
		return -v
	}
	return v
}

// domainTol is the tolerance of the domain's range and leverage tests: the model file's
// rounding.
const domainTol = 1e-6

// Inside reports CheckDomain(d).In without building the reasons: no allocation, for the
// screen's in_domain filter, which asks it of every pair that passes the other filters.
func (m *Model) Inside(d *Descriptors) bool {
	if d.Gap <= 0 || d.FirstOrder || m.Domain == nil {
		return false
	}
	dom := m.Domain
	v := d.Vector()
	for j := range NumTerms {
		if m.rangeTermUsed(j) && !(v[j] >= dom.Min[j]-domainTol && v[j] <= dom.Max[j]+domainTol) {
			return false
		}
	}
	return len(dom.LevInv) == 0 || !(dom.leverageOf(v) > dom.Warning+domainTol)
}

// CheckDomain places descriptors d against the model's domain.
func (m *Model) CheckDomain(d *Descriptors) DomainCheck {
	v := d.Vector()
	c := DomainCheck{In: true, Leverage: math.NaN(), Clamped: v}
	switch {
	case d.Gap <= 0:
		c.Reasons = append(c.Reasons, fmt.Sprintf("negative frontier gap %.3f |β| (the donor's HOMO lies above the acceptor's LUMO: electron-transfer regime, perturbation theory does not apply)", d.Gap))
	case d.FirstOrder:
		c.Reasons = append(c.Reasons, fmt.Sprintf("frontier gap %.3f |β| at or below the orbital coupling (first-order regime, second-order perturbation theory does not apply)", d.Gap))
	}
	dom := m.Domain
	if dom == nil {
		c.Reasons = append(c.Reasons, "the rate model file carries no applicability domain (refit it with cyclopair calibrate --rates to store one)")
		c.In = false
		return c
	}
	const tol = domainTol
	for j := range NumTerms {
		if !m.rangeTermUsed(j) {
			continue
		}
		lo, hi := dom.Min[j], dom.Max[j]
		if v[j] >= lo-tol && v[j] <= hi+tol {
			continue
		}
		c.Clamped[j] = min(max(v[j], lo), hi)
		a, b := termValue(j, lo), termValue(j, hi)
		if a > b {
			a, b = b, a
		}
		w := termWords[j]
		c.Reasons = append(c.Reasons, fmt.Sprintf("%s %s%s outside the fitted range (%s to %s%s)", w.name,
			fmtTerm(j, termValue(j, v[j])), w.unit, fmtTerm(j, a), fmtTerm(j, b), w.unit))
	}
	if len(dom.LevInv) > 0 {
		c.Leverage = dom.leverageOf(v)
		if c.Leverage > dom.Warning+tol {
			c.Reasons = append(c.Reasons, fmt.Sprintf("leverage %.2f above the warning leverage %.2f (a combination of %s unlike the fitted rows)",
				c.Leverage, dom.Warning, levWords(dom.LevTerms)))
		}
	}
	c.In = len(c.Reasons) == 0
	return c
}

func levWords(terms []int) string {
	var w []string
	for _, j := range terms {
		w = append(w, termWords[j].name)
	}
	return strings.Join(w, ", ")
}

func trim3(x float64) string {
	s := fmt.Sprintf("%.3f", x)
	if s == "-0.000" {
		s = "0.000"
	}
	return s
}

// DomainRanges describes the fitted range of every descriptor the predictions use, in the
// chemist's sign ("controlling frontier gap 0.304 to 1.150 |β|"); nil without a domain.
func (m *Model) DomainRanges() []string {
	if m.Domain == nil {
		return nil
	}
	var out []string
	for j := range NumTerms {
		if !m.rangeTermUsed(j) {
			continue
		}
		a, b := termValue(j, m.Domain.Min[j]), termValue(j, m.Domain.Max[j])
		if a > b {
			a, b = b, a
		}
		out = append(out, fmt.Sprintf("%s %s to %s%s", termWords[j].name, fmtTerm(j, a), fmtTerm(j, b), termWords[j].unit))
	}
	return out
}

// DomainLeverageTerms names the descriptors of the domain's leverage; nil without a domain.
func (m *Model) DomainLeverageTerms() []string {
	if m.Domain == nil {
		return nil
	}
	var out []string
	for _, j := range m.Domain.LevTerms {
		out = append(out, termWords[j].name)
	}
	return out
}
